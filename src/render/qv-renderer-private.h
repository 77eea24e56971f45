/* qv-renderer-private.h — internals of the renderer shared by its files and
 * tests: shader compilation and the label atlas.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <epoxy/gl.h>
#include <glib.h>

G_BEGIN_DECLS

/* Compiles and links a program from two sources; the names (shader file
 * names) prefix every line of the compiler's log in the GError. Returns 0
 * on failure. */
GLuint qv_shader_program_from_source (const char *vert_name, const char *vert_source,
                                      const char *frag_name, const char *frag_source,
                                      GError **error);
/* The same from shaders/NAME.vert and shaders/NAME.frag in the render
 * resource, with shaders/common.glsl put after their #version line. */
GLuint qv_shader_program_load (const char *name, GError **error);

G_END_DECLS
