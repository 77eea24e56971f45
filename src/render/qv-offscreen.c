/* qv-offscreen.c — EGL surfaceless context and framebuffer (in progress).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "qv-offscreen.h"
#include "qv-renderer.h"

QvOffscreen *
qv_offscreen_new (int width, int height, int samples, int supersample, GError **error)
{
  g_set_error (error, QV_RENDER_ERROR, QV_RENDER_ERROR_CONTEXT, "not written yet");
  return NULL;
}
void qv_offscreen_free (QvOffscreen *offscreen) {}
void qv_offscreen_make_current (QvOffscreen *offscreen) {}
void qv_offscreen_begin (QvOffscreen *offscreen, int *draw_width, int *draw_height) {}
void qv_offscreen_read (QvOffscreen *offscreen, guint8 *rgba) {}
const char *qv_offscreen_renderer_name (QvOffscreen *offscreen) { return NULL; }
