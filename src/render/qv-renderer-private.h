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
/* The same with @defines (whole lines, e.g. "#define QV_FRINGE 1\n") put
 * right after the #version and #extension lines of both shaders (the
 * fragment shader also gets QV_FRAGMENT defined). */
GLuint qv_shader_program_load_defines (const char *name, const char *defines, GError **error);

G_END_DECLS

G_BEGIN_DECLS

/* Glyphs for atom labels (element symbols and digits) rasterised once with
 * pangocairo: red channel the glyph, green a halo around it. */
typedef struct {
  gboolean present;
  float uv[4];        /* u0 v0 u1 v1, v0 the top */
  float advance;      /* pen advance, in label heights */
  float pad;          /* halo margin on each side, in label heights */
} QvGlyph;

typedef struct {
  int width, height;  /* pixels */
  guint8 *rg;         /* width × height × 2, top row first */
  QvGlyph glyphs[128];
} QvLabelAtlas;

QvLabelAtlas *qv_label_atlas_new (void);
void qv_label_atlas_free (QvLabelAtlas *atlas);

G_END_DECLS
