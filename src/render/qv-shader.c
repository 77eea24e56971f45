/* qv-shader.c — GLSL programs from the render GResource.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "qv-renderer.h"
#include "qv-renderer-private.h"

G_DEFINE_QUARK (qv-render-error-quark, qv_render_error)

GLuint
qv_shader_program_from_source (const char *vert_name, const char *vert_source,
                               const char *frag_name, const char *frag_source,
                               GError **error)
{
  g_set_error (error, QV_RENDER_ERROR, QV_RENDER_ERROR_SHADER, "not written yet");
  return 0;
}

GLuint
qv_shader_program_load (const char *name, GError **error)
{
  g_set_error (error, QV_RENDER_ERROR, QV_RENDER_ERROR_SHADER, "not written yet");
  return 0;
}
