/* qv-offscreen.h — an OpenGL 3.3 core context with no window: EGL on Mesa's
 * surfaceless platform and a multisampled framebuffer (≤ 4× samples, more
 * quality by rendering larger and downsampling), read back to memory. For
 * tests, benchmarks and `quaver picture`.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

typedef struct _QvOffscreen QvOffscreen;

/* Creates the context (current on the calling thread) and a framebuffer of
 * @width × @height pixels with @samples (0, 2 or 4) MSAA samples and a
 * @supersample factor (1–4) by which it renders larger and downsamples.
 * Fails with a message that says what is missing (no EGL, no surfaceless
 * platform, no GL 3.3 core). */
QvOffscreen *qv_offscreen_new (int width, int height, int samples, int supersample,
                               GError **error);
void qv_offscreen_free (QvOffscreen *offscreen);
void qv_offscreen_make_current (QvOffscreen *offscreen);
/* Binds the framebuffer to draw into; its size is width×supersample. */
void qv_offscreen_begin (QvOffscreen *offscreen, int *draw_width, int *draw_height);
/* Resolves and downsamples; @rgba receives width × height × 4 bytes, top row
 * first, straight alpha (the framebuffer is read as premultiplied, which
 * it is: see QvRenderOptions.transparent). */
void qv_offscreen_read (QvOffscreen *offscreen, guint8 *rgba);
/* The GL_RENDERER string, for reports. */
const char *qv_offscreen_renderer_name (QvOffscreen *offscreen);

G_END_DECLS
