/* qv-renderer.c — a structure and one animated mode with OpenGL 3.3 core:
 * ray-cast impostor spheres, cylinders and arrows, cell edges and labels,
 * one draw call each (two with analytic antialiasing). Not instanced:
 * llvmpipe (the floor, no GPU) runs its whole vertex pipeline once per
 * instance, so each impostor is a quad of four indexed vertices whose
 * index gives the atom, bond or arrow. The atoms' rest positions and
 * displacement field live in a texture buffer uploaded once per mode; per
 * frame only the phase changes (one small uniform block) — and, with
 * occlusion culling on (QvRenderOptions.occlusion_cull, off by default), one
 * small list of the impostors not certainly hidden (4 bytes each, at most
 * one per atom, bond and arrow), found on the CPU by qv-occlusion.c from
 * the positions at the phase (as picking uses them) and uploaded with
 * glBufferSubData: the quads then read their atom, bond or arrow through
 * it (u_list, shaders/common.glsl). Hidden impostors are never shaded;
 * what is drawn is the same, pixel for pixel (tests/render/test-cull.c).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <epoxy/gl.h>
#include <math.h>
#include <string.h>
#include "qv-bonds.h"
#include "qv-element.h"
#include "qv-occlusion-private.h"
#include "qv-renderer.h"
#include "qv-renderer-private.h"

/* The impostors come twice: as they are, and for the second pass of the
 * analytic antialiasing (QV_FRINGE: no gl_FragDepth, so that llvmpipe
 * depth-tests before shading and skips the covered inside). */
enum {
  PROG_SPHERE, PROG_CYLINDER, PROG_ARROW, PROG_LINE, PROG_LABEL,
  PROG_SPHERE_FRINGE, PROG_CYLINDER_FRINGE, PROG_ARROW_FRINGE, PROG_COVER, N_PROGRAMS
};
#define FRINGE (PROG_SPHERE_FRINGE - PROG_SPHERE)
static const char *const program_names[N_PROGRAMS] = {
  "sphere", "cylinder", "arrow", "line", "label", "sphere", "cylinder", "arrow", "cover",
};

/* Occlusion culling's screen cells, pixels (see qv-occlusion-private.h). */
#define OCCLUSION_CELL 1
/* Pixels an impostor's fragments may reach past its geometry (the
 * coverage ramp and the antialiasing margin are at most 1.25). */
#define OCCLUSION_MARGIN_PX 2.0f
/* The arrows' largest head radius, Å (HEAD in shaders/arrow.vert). */
#define ARROW_HEAD_RADIUS 0.14f

/* Edge treatments, the QV_AA_* of shaders/common.glsl. */
enum { AA_COVERAGE, AA_SOLID, AA_INNER, AA_FRINGE, AA_MASKED };

/* Mirrors the std140 block Frame in shaders/common.glsl. */
typedef struct {
  float view[16];
  float proj[16];
  float light[4];
  float bg[4];
  float fg[4];
  float accent[4];
  float cue[4];
  float viewport[4];
  float phase;
  float atom_scale;
  float bond_radius;
  gint32 highlight;
  float ortho;
  float label_px;
  float arrow_scale;
  float cos_phase, sin_phase;
  float px_scale;
  float pad[2];
} FrameBlock;

G_STATIC_ASSERT (sizeof (FrameBlock) == 272);

typedef struct {
  guint32 atom;
  float uv[4];
  float offset[2];
} LabelGlyph;

struct _QvRenderer {
  GLuint programs[N_PROGRAMS];
  GLint aa_location[N_PROGRAMS];            /* u_aa, −1 where unused */
  GLint list_location[N_PROGRAMS];          /* u_list_base, −1 where unused */
  GLuint ubo;
  GLuint atom_buffer, atom_texture;       /* 3 RGBA32F texels per atom */
  GLuint colour_buffer, colour_texture;   /* 1 RGBA8 texel per atom */
  GLuint quad_vao, quad_indices;           /* 0 1 2 2 1 3 + 4q per quad */
  gsize n_quads;                            /* how many the indices cover */
  GLuint bond_buffer, bond_texture;         /* RG32UI: the two atoms */
  GLuint arrow_buffer, arrow_texture;       /* R32UI: atoms */
  GLuint list_buffer, list_texture;         /* R32UI: this frame's culled lists */
  gsize list_capacity;                      /* entries the buffer holds */
  GLuint msaa_fbo, msaa_colour, msaa_depth; /* options.samples > 0 */
  int msaa_width, msaa_height, msaa_samples;
  GLuint cell_vao, cell_buffer;
  GLuint label_vao, label_buffer, atlas_texture;
  QvLabelAtlas *atlas;

  gsize n_atoms, n_bonds, n_arrows, n_label_glyphs;
  gboolean has_cell;
  QvBond *bonds;               /* n_bonds, as perceived */
  guint32 *arrow_atoms;        /* n_arrows: the atom of each arrow */
  /* Occlusion culling: the lists [atoms | bonds | arrows] of this frame. */
  QvOcclusion *occlusion;
  float *view_positions;       /* 3N, view space */
  guint32 *list;
  gsize list_alloc;
  gsize n_listed[3];           /* atoms, bonds, arrows drawn; when !listed: all */
  gboolean listed;
  guint *z;
  float *rest;                 /* 3N, Å */
  float *re, *im;              /* 3N, Å, amplitude included; NULL: none */
  float *style_radii;          /* N, from the style table */
  float *radii;                /* N, as drawn */
  float *participation;        /* N in [0, 1] relative to the largest, or NULL */
  float *positions;            /* 3N at the current phase, on demand */
  gboolean positions_valid;
  float centre[3], extent;     /* bounding sphere, for depth cueing */
  float phase;
  gssize highlight;
  QvRenderOptions options;
};

void
qv_render_options_init (QvRenderOptions *options)
{
  *options = (QvRenderOptions) {
    .bonds = TRUE,
    .arrows = TRUE,
    .cell = TRUE,
    .labels = FALSE,
    .colouring = QV_COLOUR_ELEMENT,
    .background = QV_BACKGROUND_LIGHT,
    .atom_scale = 1.0f,
    .arrow_scale = 2.5f,
    .arrow_threshold = 0.02f,
    .depth_cue = TRUE,
    .bond_radius = 0.13f,
    .antialias = QV_ANTIALIAS_NONE,
    .samples = 0,
    .occlusion_cull = FALSE,
    .transparent = FALSE,
    .ghost_alpha = 0.0f,
    .ghost_phase = 0.0f,
  };
}

static void
setup_program (GLuint program)
{
  GLuint block = glGetUniformBlockIndex (program, "Frame");

  if (block != GL_INVALID_INDEX)
    glUniformBlockBinding (program, block, 0);
  glUseProgram (program);
  glUniform1i (glGetUniformLocation (program, "u_atoms"), 0);
  glUniform1i (glGetUniformLocation (program, "u_colours"), 1);
  glUniform1i (glGetUniformLocation (program, "u_atlas"), 2);
  glUniform1i (glGetUniformLocation (program, "u_bonds"), 3);
  glUniform1i (glGetUniformLocation (program, "u_arrows"), 4);
  glUniform1i (glGetUniformLocation (program, "u_list"), 5);
  glUseProgram (0);
}

/* A texture buffer of @format over a new buffer object. */
static void
texture_buffer (GLuint *buffer, GLuint *texture, GLenum format)
{
  glGenBuffers (1, buffer);
  glBindBuffer (GL_TEXTURE_BUFFER, *buffer);
  glBufferData (GL_TEXTURE_BUFFER, 16, NULL, GL_STATIC_DRAW);
  glGenTextures (1, texture);
  glBindTexture (GL_TEXTURE_BUFFER, *texture);
  glTexBuffer (GL_TEXTURE_BUFFER, format, *buffer);
  glBindTexture (GL_TEXTURE_BUFFER, 0);
  glBindBuffer (GL_TEXTURE_BUFFER, 0);
}

static void
fill_texture_buffer (GLuint buffer, GLuint texture, GLenum format, gsize size, const void *data)
{
  guint8 small[16] = { 0 };

  /* Never an empty buffer; a short one is padded, not over-read. */
  if (size < sizeof small)
    {
      if (data && size)
        memcpy (small, data, size);
      data = small;
      size = sizeof small;
    }
  glBindBuffer (GL_TEXTURE_BUFFER, buffer);
  glBufferData (GL_TEXTURE_BUFFER, size, data, GL_STATIC_DRAW);
  glBindTexture (GL_TEXTURE_BUFFER, texture);
  glTexBuffer (GL_TEXTURE_BUFFER, format, buffer);
  glBindTexture (GL_TEXTURE_BUFFER, 0);
  glBindBuffer (GL_TEXTURE_BUFFER, 0);
}

/* Indices for at least @n quads of four vertices: two triangles each. */
static void
ensure_quads (QvRenderer *r, gsize n)
{
  gsize cap = MAX (r->n_quads, 256);
  guint32 *idx;

  if (n <= r->n_quads)
    return;
  while (cap < n)
    cap *= 2;
  idx = g_new (guint32, 6 * cap);
  for (gsize q = 0; q < cap; q++)
    {
      static const guint32 pattern[6] = { 0, 1, 2, 2, 1, 3 };
      for (int k = 0; k < 6; k++)
        idx[6 * q + k] = (guint32) (4 * q) + pattern[k];
    }
  glBindVertexArray (r->quad_vao);
  glBufferData (GL_ELEMENT_ARRAY_BUFFER, sizeof (guint32) * 6 * cap, idx, GL_STATIC_DRAW);
  glBindVertexArray (0);
  g_free (idx);
  r->n_quads = cap;
}

QvRenderer *
qv_renderer_new (GError **error)
{
  QvRenderer *r = g_new0 (QvRenderer, 1);

  for (int p = 0; p < N_PROGRAMS; p++)
    {
      r->programs[p] = qv_shader_program_load_defines (program_names[p],
                                                       p >= PROG_SPHERE_FRINGE
                                                       && p <= PROG_ARROW_FRINGE
                                                       ? "#define QV_FRINGE 1\n" : NULL,
                                                       error);
      if (r->programs[p] == 0)
        {
          qv_renderer_free (r);
          return NULL;
        }
      setup_program (r->programs[p]);
      r->aa_location[p] = glGetUniformLocation (r->programs[p], "u_aa");
      r->list_location[p] = glGetUniformLocation (r->programs[p], "u_list_base");
    }
  qv_render_options_init (&r->options);
  r->highlight = -1;

  glGenBuffers (1, &r->ubo);
  glBindBuffer (GL_UNIFORM_BUFFER, r->ubo);
  glBufferData (GL_UNIFORM_BUFFER, sizeof (FrameBlock), NULL, GL_DYNAMIC_DRAW);

  glGenBuffers (1, &r->atom_buffer);
  glBindBuffer (GL_TEXTURE_BUFFER, r->atom_buffer);
  glBufferData (GL_TEXTURE_BUFFER, 48, NULL, GL_STATIC_DRAW);
  glGenTextures (1, &r->atom_texture);
  glBindTexture (GL_TEXTURE_BUFFER, r->atom_texture);
  glTexBuffer (GL_TEXTURE_BUFFER, GL_RGBA32F, r->atom_buffer);
  glGenBuffers (1, &r->colour_buffer);
  glBindBuffer (GL_TEXTURE_BUFFER, r->colour_buffer);
  glBufferData (GL_TEXTURE_BUFFER, 4, NULL, GL_STATIC_DRAW);
  glGenTextures (1, &r->colour_texture);
  glBindTexture (GL_TEXTURE_BUFFER, r->colour_texture);
  glTexBuffer (GL_TEXTURE_BUFFER, GL_RGBA8, r->colour_buffer);
  glBindTexture (GL_TEXTURE_BUFFER, 0);

  glGenVertexArrays (1, &r->quad_vao);
  glBindVertexArray (r->quad_vao);
  glGenBuffers (1, &r->quad_indices);
  glBindBuffer (GL_ELEMENT_ARRAY_BUFFER, r->quad_indices);
  glBindVertexArray (0);
  ensure_quads (r, 256);

  texture_buffer (&r->bond_buffer, &r->bond_texture, GL_RG32UI);
  texture_buffer (&r->arrow_buffer, &r->arrow_texture, GL_R32UI);
  texture_buffer (&r->list_buffer, &r->list_texture, GL_R32UI);
  r->occlusion = qv_occlusion_new (OCCLUSION_CELL);

  glGenVertexArrays (1, &r->cell_vao);
  glBindVertexArray (r->cell_vao);
  glGenBuffers (1, &r->cell_buffer);
  glBindBuffer (GL_ARRAY_BUFFER, r->cell_buffer);
  glBufferData (GL_ARRAY_BUFFER, 24 * 3 * sizeof (float), NULL, GL_STATIC_DRAW);
  glEnableVertexAttribArray (0);
  glVertexAttribPointer (0, 3, GL_FLOAT, GL_FALSE, 12, NULL);

  glGenVertexArrays (1, &r->label_vao);
  glBindVertexArray (r->label_vao);
  glGenBuffers (1, &r->label_buffer);
  glBindBuffer (GL_ARRAY_BUFFER, r->label_buffer);
  glBufferData (GL_ARRAY_BUFFER, sizeof (LabelGlyph), NULL, GL_STATIC_DRAW);
  glEnableVertexAttribArray (0);
  glVertexAttribIPointer (0, 1, GL_UNSIGNED_INT, sizeof (LabelGlyph), NULL);
  glEnableVertexAttribArray (1);
  glVertexAttribPointer (1, 4, GL_FLOAT, GL_FALSE, sizeof (LabelGlyph),
                         (void *) G_STRUCT_OFFSET (LabelGlyph, uv));
  glEnableVertexAttribArray (2);
  glVertexAttribPointer (2, 2, GL_FLOAT, GL_FALSE, sizeof (LabelGlyph),
                         (void *) G_STRUCT_OFFSET (LabelGlyph, offset));
  glBindVertexArray (0);
  glBindBuffer (GL_ARRAY_BUFFER, 0);
  return r;
}

void
qv_renderer_free (QvRenderer *r)
{
  GLuint buffers[10], vaos[4], textures[6], rbs[2];

  if (r == NULL)
    return;
  for (int p = 0; p < N_PROGRAMS; p++)
    if (r->programs[p])
      glDeleteProgram (r->programs[p]);
  buffers[0] = r->ubo;
  buffers[1] = r->atom_buffer;
  buffers[2] = r->colour_buffer;
  buffers[3] = r->bond_buffer;
  buffers[4] = 0;
  buffers[5] = r->quad_indices;
  buffers[6] = r->arrow_buffer;
  buffers[7] = r->cell_buffer;
  buffers[8] = r->label_buffer;
  buffers[9] = r->list_buffer;
  glDeleteBuffers (10, buffers);
  vaos[0] = r->quad_vao;
  vaos[1] = 0;
  vaos[2] = r->cell_vao;
  vaos[3] = r->label_vao;
  glDeleteVertexArrays (4, vaos);
  textures[0] = r->atom_texture;
  textures[1] = r->colour_texture;
  textures[2] = r->atlas_texture;
  textures[3] = r->bond_texture;
  textures[4] = r->arrow_texture;
  textures[5] = r->list_texture;
  glDeleteTextures (6, textures);
  rbs[0] = r->msaa_colour;
  rbs[1] = r->msaa_depth;
  glDeleteRenderbuffers (2, rbs);
  if (r->msaa_fbo)
    glDeleteFramebuffers (1, &r->msaa_fbo);
  qv_label_atlas_free (r->atlas);
  g_free (r->z);
  g_free (r->rest);
  g_free (r->re);
  g_free (r->im);
  g_free (r->style_radii);
  g_free (r->radii);
  g_free (r->participation);
  g_free (r->positions);
  g_free (r->view_positions);
  g_free (r->bonds);
  g_free (r->arrow_atoms);
  g_free (r->list);
  qv_occlusion_free (r->occlusion);
  g_free (r);
}

/* The atom buffer: (rest, style radius), (Re, 0), (Im, 0) per atom. */
static void
upload_atoms (QvRenderer *r)
{
  gsize n = r->n_atoms;
  float *data = g_new0 (float, 12 * MAX (n, 1));

  for (gsize i = 0; i < n; i++)
    {
      float *t = data + 12 * i;
      memcpy (t, r->rest + 3 * i, 3 * sizeof (float));
      t[3] = r->style_radii[i];
      if (r->re)
        memcpy (t + 4, r->re + 3 * i, 3 * sizeof (float));
      if (r->im)
        memcpy (t + 8, r->im + 3 * i, 3 * sizeof (float));
    }
  glBindBuffer (GL_TEXTURE_BUFFER, r->atom_buffer);
  glBufferData (GL_TEXTURE_BUFFER, 48 * MAX (n, 1), data, GL_STATIC_DRAW);
  glBindTexture (GL_TEXTURE_BUFFER, r->atom_texture);
  glTexBuffer (GL_TEXTURE_BUFFER, GL_RGBA32F, r->atom_buffer);
  glBindTexture (GL_TEXTURE_BUFFER, 0);
  glBindBuffer (GL_TEXTURE_BUFFER, 0);
  g_free (data);
}

static void
upload_colours (QvRenderer *r)
{
  gsize n = r->n_atoms;
  guint8 *data = g_new0 (guint8, 4 * MAX (n, 1));

  for (gsize i = 0; i < n; i++)
    {
      float rgb[3];
      if (r->options.colouring == QV_COLOUR_PARTICIPATION && r->participation)
        qv_style_ramp (r->participation[i], rgb);
      else
        memcpy (rgb, qv_style_element (r->z[i])->rgb, sizeof rgb);
      for (int k = 0; k < 3; k++)
        data[4 * i + k] = (guint8) lroundf (CLAMP (rgb[k], 0.0f, 1.0f) * 255.0f);
      data[4 * i + 3] = 255;
    }
  glBindBuffer (GL_TEXTURE_BUFFER, r->colour_buffer);
  glBufferData (GL_TEXTURE_BUFFER, 4 * MAX (n, 1), data, GL_STATIC_DRAW);
  glBindTexture (GL_TEXTURE_BUFFER, r->colour_texture);
  glTexBuffer (GL_TEXTURE_BUFFER, GL_RGBA8, r->colour_buffer);
  glBindTexture (GL_TEXTURE_BUFFER, 0);
  glBindBuffer (GL_TEXTURE_BUFFER, 0);
  g_free (data);
}

/* Atoms whose displacement reaches the threshold get an arrow. */
static void
upload_arrows (QvRenderer *r)
{
  g_autofree guint32 *list = g_new (guint32, MAX (r->n_atoms, 1));
  float t2 = r->options.arrow_threshold * r->options.arrow_threshold;

  r->n_arrows = 0;
  if (r->re)
    for (gsize i = 0; i < r->n_atoms; i++)
      {
        const float *d = r->re + 3 * i;
        float a2 = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
        if (a2 > 0.0f && a2 >= t2)
          list[r->n_arrows++] = (guint32) i;
      }
  fill_texture_buffer (r->arrow_buffer, r->arrow_texture, GL_R32UI, 4 * r->n_arrows, list);
  ensure_quads (r, r->n_arrows);
  g_free (r->arrow_atoms);
  r->arrow_atoms = g_steal_pointer (&list);
}

static void
update_radii (QvRenderer *r)
{
  for (gsize i = 0; i < r->n_atoms; i++)
    r->radii[i] = r->style_radii[i] * r->options.atom_scale;
}

/* Labels: element symbol and 1-based index, one instance per glyph. */
static void
upload_labels (QvRenderer *r)
{
  GArray *glyphs = g_array_new (FALSE, FALSE, sizeof (LabelGlyph));

  if (r->atlas == NULL)
    {
      r->atlas = qv_label_atlas_new ();
      glGenTextures (1, &r->atlas_texture);
      glBindTexture (GL_TEXTURE_2D, r->atlas_texture);
      glPixelStorei (GL_UNPACK_ALIGNMENT, 1);
      glTexImage2D (GL_TEXTURE_2D, 0, GL_RG8, r->atlas->width, r->atlas->height, 0,
                    GL_RG, GL_UNSIGNED_BYTE, r->atlas->rg);
      glTexParameteri (GL_TEXTURE_2D, GL_TEXTURE_MIN_FILTER, GL_LINEAR_MIPMAP_LINEAR);
      glTexParameteri (GL_TEXTURE_2D, GL_TEXTURE_MAG_FILTER, GL_LINEAR);
      glTexParameteri (GL_TEXTURE_2D, GL_TEXTURE_WRAP_S, GL_CLAMP_TO_EDGE);
      glTexParameteri (GL_TEXTURE_2D, GL_TEXTURE_WRAP_T, GL_CLAMP_TO_EDGE);
      glGenerateMipmap (GL_TEXTURE_2D);
      glBindTexture (GL_TEXTURE_2D, 0);
    }
  for (gsize i = 0; i < r->n_atoms; i++)
    {
      const QvElement *e = qv_element_from_z (r->z[i]);
      char text[32];
      float width = 0.0f, pen;

      g_snprintf (text, sizeof text, "%s%" G_GSIZE_FORMAT, e ? e->symbol : "X", i + 1);
      for (const char *c = text; *c; c++)
        if ((guchar) *c < 128 && r->atlas->glyphs[(guchar) *c].present)
          width += r->atlas->glyphs[(guchar) *c].advance;
      pen = -0.5f * width;
      for (const char *c = text; *c; c++)
        {
          const QvGlyph *g;
          LabelGlyph lg;
          if ((guchar) *c >= 128 || !r->atlas->glyphs[(guchar) *c].present)
            continue;
          g = &r->atlas->glyphs[(guchar) *c];
          lg.atom = (guint32) i;
          memcpy (lg.uv, g->uv, sizeof lg.uv);
          lg.offset[0] = pen - g->pad;
          lg.offset[1] = g->advance + 2.0f * g->pad;
          for (int v = 0; v < 6; v++)
            g_array_append_val (glyphs, lg);
          pen += g->advance;
        }
    }
  r->n_label_glyphs = glyphs->len / 6;
  glBindBuffer (GL_ARRAY_BUFFER, r->label_buffer);
  glBufferData (GL_ARRAY_BUFFER, sizeof (LabelGlyph) * MAX (glyphs->len, 1),
                glyphs->len ? glyphs->data : NULL, GL_STATIC_DRAW);
  glBindBuffer (GL_ARRAY_BUFFER, 0);
  g_array_free (glyphs, TRUE);
}

static void
update_bounds (QvRenderer *r)
{
  float lo[3] = { 0, 0, 0 }, hi[3] = { 0, 0, 0 }, r2 = 0.0f;

  for (gsize i = 0; i < r->n_atoms; i++)
    for (int k = 0; k < 3; k++)
      {
        float v = r->rest[3 * i + k];
        lo[k] = i == 0 ? v : MIN (lo[k], v);
        hi[k] = i == 0 ? v : MAX (hi[k], v);
      }
  for (int k = 0; k < 3; k++)
    r->centre[k] = 0.5f * (lo[k] + hi[k]);
  for (gsize i = 0; i < r->n_atoms; i++)
    {
      float d2 = 0.0f;
      for (int k = 0; k < 3; k++)
        d2 += (r->rest[3 * i + k] - r->centre[k]) * (r->rest[3 * i + k] - r->centre[k]);
      r2 = MAX (r2, d2);
    }
  r->extent = sqrtf (r2) + 1.0f;
}

void
qv_renderer_set_structure (QvRenderer *r, const QvStructure *structure)
{
  gsize n = structure->n_atoms, n_bonds = 0;
  g_autofree QvBond *bonds = NULL;
  float cell[24 * 3];

  g_free (r->z);
  g_free (r->rest);
  g_free (r->style_radii);
  g_free (r->radii);
  g_free (r->positions);
  g_free (r->view_positions);
  g_clear_pointer (&r->bonds, g_free);
  g_clear_pointer (&r->re, g_free);
  g_clear_pointer (&r->im, g_free);
  g_clear_pointer (&r->participation, g_free);
  r->n_atoms = n;
  r->z = g_new (guint, MAX (n, 1));
  r->rest = g_new (float, 3 * MAX (n, 1));
  r->style_radii = g_new (float, MAX (n, 1));
  r->radii = g_new (float, MAX (n, 1));
  r->positions = g_new (float, 3 * MAX (n, 1));
  r->view_positions = g_new (float, 3 * MAX (n, 1));
  r->positions_valid = FALSE;
  r->highlight = -1;
  for (gsize i = 0; i < n; i++)
    {
      r->z[i] = structure->atoms[i].z;
      for (int k = 0; k < 3; k++)
        r->rest[3 * i + k] = (float) structure->atoms[i].position[k];
      r->style_radii[i] = qv_style_element (r->z[i])->radius;
    }
  update_radii (r);
  update_bounds (r);
  upload_atoms (r);
  upload_colours (r);
  upload_arrows (r);

  bonds = qv_bonds_perceive (structure, QV_BONDS_DEFAULT_TOLERANCE, &n_bonds);
  r->n_bonds = n_bonds;
  ensure_quads (r, MAX (n, n_bonds));
  fill_texture_buffer (r->bond_buffer, r->bond_texture, GL_RG32UI, sizeof (QvBond) * n_bonds, bonds);
  r->bonds = g_steal_pointer (&bonds);

  /* Cell edges: the 12 edges between the corners i·a + j·b + k·c. */
  r->has_cell = structure->has_cell;
  if (r->has_cell)
    {
      int m = 0;
      for (int c0 = 0; c0 < 8; c0++)
        for (int axis = 0; axis < 3; axis++)
          {
            int c1 = c0 | (1 << axis);
            if (c1 == c0)
              continue;
            for (int end = 0; end < 2; end++)
              {
                int c = end ? c1 : c0;
                for (int k = 0; k < 3; k++)
                  {
                    double v = 0.0;
                    for (int row = 0; row < 3; row++)
                      if (c & (1 << row))
                        v += structure->cell[row][k];
                    cell[3 * m + k] = (float) v;
                  }
                m++;
              }
          }
      g_assert (m == 24);
      glBindBuffer (GL_ARRAY_BUFFER, r->cell_buffer);
      glBufferData (GL_ARRAY_BUFFER, sizeof cell, cell, GL_STATIC_DRAW);
    }
  glBindBuffer (GL_ARRAY_BUFFER, 0);
  r->n_label_glyphs = 0;
  if (r->options.labels)
    upload_labels (r);
}

void
qv_renderer_set_mode (QvRenderer *r, const float *re, const float *im, float amplitude)
{
  gsize n3 = 3 * r->n_atoms;

  g_clear_pointer (&r->re, g_free);
  g_clear_pointer (&r->im, g_free);
  if (re && r->n_atoms > 0)
    {
      r->re = g_new (float, n3);
      for (gsize i = 0; i < n3; i++)
        r->re[i] = re[i] * amplitude;
      if (im)
        {
          r->im = g_new (float, n3);
          for (gsize i = 0; i < n3; i++)
            r->im[i] = im[i] * amplitude;
        }
    }
  r->positions_valid = FALSE;
  upload_atoms (r);
  upload_arrows (r);
}

void
qv_renderer_set_participation (QvRenderer *r, const float *participation)
{
  float max = 0.0f;

  g_clear_pointer (&r->participation, g_free);
  if (participation && r->n_atoms > 0)
    {
      r->participation = g_memdup2 (participation, sizeof (float) * r->n_atoms);
      for (gsize i = 0; i < r->n_atoms; i++)
        if (isfinite (participation[i]))
          max = MAX (max, participation[i]);
      for (gsize i = 0; i < r->n_atoms; i++)
        r->participation[i] = max > 0.0f && isfinite (participation[i])
                              ? participation[i] / max : 0.0f;
    }
  upload_colours (r);
}

void
qv_renderer_set_phase (QvRenderer *r, float phase)
{
  if (phase != r->phase)
    r->positions_valid = FALSE;
  r->phase = phase;
}

void
qv_renderer_set_options (QvRenderer *r, const QvRenderOptions *options)
{
  QvRenderOptions old = r->options;

  r->options = *options;
  if (!(r->options.atom_scale > 0.0f))
    r->options.atom_scale = 1.0f;
  if (!(r->options.bond_radius > 0.0f))
    r->options.bond_radius = 0.13f;
  r->options.samples = r->options.samples <= 0 ? 0 : r->options.samples <= 2 ? 2 : 4;
  r->options.ghost_alpha = isfinite (r->options.ghost_alpha)
                           ? CLAMP (r->options.ghost_alpha, 0.0f, 1.0f) : 0.0f;
  if (!isfinite (r->options.ghost_phase))
    r->options.ghost_phase = 0.0f;
  if (old.colouring != r->options.colouring && r->n_atoms > 0)
    upload_colours (r);
  if (old.arrow_threshold != r->options.arrow_threshold)
    upload_arrows (r);
  if (old.atom_scale != r->options.atom_scale)
    update_radii (r);
  if (r->options.labels && !old.labels && r->n_atoms > 0)
    upload_labels (r);
}

const QvRenderOptions *
qv_renderer_get_options (const QvRenderer *r)
{
  return &r->options;
}

void
qv_renderer_set_highlight (QvRenderer *r, gssize atom)
{
  r->highlight = atom >= 0 && (gsize) atom < r->n_atoms ? atom : -1;
}

static void
fill_frame (QvRenderer *r, const QvCamera *camera, FrameBlock *f)
{
  mat4 view, proj;
  vec4 c = { r->centre[0], r->centre[1], r->centre[2], 1.0f }, cv;
  float light[3] = { -0.40f, 0.55f, 0.73f }, norm;

  qv_camera_view_matrix (camera, view);
  qv_camera_projection_matrix (camera, proj);
  memcpy (f->view, view, sizeof f->view);
  memcpy (f->proj, proj, sizeof f->proj);
  norm = sqrtf (light[0] * light[0] + light[1] * light[1] + light[2] * light[2]);
  for (int k = 0; k < 3; k++)
    f->light[k] = light[k] / norm;
  f->light[3] = 0.24f;
  qv_style_background (r->options.background, f->bg);
  qv_style_foreground (r->options.background, f->fg);
  qv_style_arrow (r->options.background, f->accent);
  f->fg[3] = f->accent[3] = 1.0f;
  /* Depth cueing from a little before the scene's centre to its back. */
  glm_mat4_mulv (view, c, cv);
  f->cue[0] = -cv[2] - 0.3f * r->extent;
  f->cue[1] = -cv[2] + r->extent;
  f->cue[2] = r->options.depth_cue ? 0.5f : 0.0f;
  f->viewport[0] = (float) camera->width;
  f->viewport[1] = (float) camera->height;
  f->viewport[2] = 1.0f / (float) camera->width;
  f->viewport[3] = 1.0f / (float) camera->height;
  f->phase = r->phase;
  f->atom_scale = r->options.atom_scale;
  f->bond_radius = r->options.bond_radius;
  f->highlight = (gint32) r->highlight;
  f->ortho = camera->projection == QV_CAMERA_ORTHOGRAPHIC ? 1.0f : 0.0f;
  f->label_px = CLAMP ((float) camera->height / 34.0f, 16.0f, 96.0f);
  f->arrow_scale = r->options.arrow_scale;
  f->cos_phase = cosf (r->phase);
  f->sin_phase = sinf (r->phase);
  f->px_scale = 2.0f / (proj[1][1] * (float) camera->height);
}

/* The renderer's own multisampled framebuffer (options.samples), sized
 * @w × @h; FALSE when it cannot be made (then it draws directly). */
static gboolean
ensure_msaa (QvRenderer *r, int w, int h)
{
  GLint max_samples = 0;
  int samples;

  glGetIntegerv (GL_MAX_SAMPLES, &max_samples);
  samples = MIN (r->options.samples, max_samples);
  if (samples <= 0)
    return FALSE;
  if (r->msaa_fbo && r->msaa_width == w && r->msaa_height == h && r->msaa_samples == samples)
    return TRUE;
  if (r->msaa_fbo == 0)
    {
      glGenFramebuffers (1, &r->msaa_fbo);
      glGenRenderbuffers (1, &r->msaa_colour);
      glGenRenderbuffers (1, &r->msaa_depth);
    }
  glBindRenderbuffer (GL_RENDERBUFFER, r->msaa_colour);
  glRenderbufferStorageMultisample (GL_RENDERBUFFER, samples, GL_RGBA8, w, h);
  glBindRenderbuffer (GL_RENDERBUFFER, r->msaa_depth);
  glRenderbufferStorageMultisample (GL_RENDERBUFFER, samples, GL_DEPTH_COMPONENT24, w, h);
  glBindRenderbuffer (GL_RENDERBUFFER, 0);
  glBindFramebuffer (GL_DRAW_FRAMEBUFFER, r->msaa_fbo);
  glFramebufferRenderbuffer (GL_DRAW_FRAMEBUFFER, GL_COLOR_ATTACHMENT0, GL_RENDERBUFFER, r->msaa_colour);
  glFramebufferRenderbuffer (GL_DRAW_FRAMEBUFFER, GL_DEPTH_ATTACHMENT, GL_RENDERBUFFER, r->msaa_depth);
  if (glCheckFramebufferStatus (GL_DRAW_FRAMEBUFFER) != GL_FRAMEBUFFER_COMPLETE)
    {
      g_warning ("the renderer's %d× multisampled framebuffer is incomplete; drawing without", samples);
      r->options.samples = 0;
      return FALSE;
    }
  r->msaa_width = w;
  r->msaa_height = h;
  r->msaa_samples = samples;
  return TRUE;
}

/* The lists of what to draw (r->n_listed, r->list): with culling, the
 * atoms, bonds and arrows not certainly hidden behind the atoms' spheres,
 * uploaded; without, all of them. */
static void
cull (QvRenderer *r, const FrameBlock *f)
{
  const float *p, *v = f->view;
  float *vp = r->view_positions;
  gsize need = r->n_atoms + r->n_bonds + r->n_arrows, m = 0;

  r->n_listed[0] = r->n_atoms;
  r->n_listed[1] = r->n_bonds;
  r->n_listed[2] = r->n_arrows;
  r->listed = r->options.occlusion_cull && r->n_atoms > 0;
  if (!r->listed)
    return;
  if (need > r->list_alloc)
    {
      g_free (r->list);
      r->list = g_new (guint32, need);
      r->list_alloc = need;
    }
  p = qv_renderer_positions (r);
  for (gsize i = 0; i < r->n_atoms; i++)
    for (int k = 0; k < 3; k++)
      vp[3 * i + k] = v[k] * p[3 * i] + v[4 + k] * p[3 * i + 1] + v[8 + k] * p[3 * i + 2] + v[12 + k];
  qv_occlusion_begin (r->occlusion, f->proj, (int) f->viewport[0], (int) f->viewport[1]);
  for (gsize i = 0; i < r->n_atoms; i++)
    qv_occlusion_add_sphere (r->occlusion, vp + 3 * i, r->radii[i]);

  for (gsize i = 0; i < r->n_atoms; i++)
    if (!qv_occlusion_hidden (r->occlusion, vp + 3 * i, vp + 3 * i, r->radii[i], OCCLUSION_MARGIN_PX))
      r->list[m++] = (guint32) i;
  r->n_listed[0] = m;
  r->n_listed[1] = 0;
  if (r->options.bonds)
    for (gsize b = 0; b < r->n_bonds; b++)
      {
        /* The whole axis between the centres, fattened by the radius:
         * it holds the drawn part. */
        const float *a0 = vp + 3 * r->bonds[b].a, *b0 = vp + 3 * r->bonds[b].b;
        if (!qv_occlusion_hidden (r->occlusion, a0, b0, r->options.bond_radius, OCCLUSION_MARGIN_PX))
          {
            r->list[m++] = (guint32) b;
            r->n_listed[1]++;
          }
      }
  r->n_listed[2] = 0;
  if (r->options.arrows && r->re)
    for (gsize j = 0; j < r->n_arrows; j++)
      {
        /* As shaders/arrow.vert places it: from 0.85 of the radius along
         * the Re field, u_arrow_scale × its length long. */
        gsize i = r->arrow_atoms[j];
        const float *d = r->re + 3 * i;
        float amp = sqrtf (d[0] * d[0] + d[1] * d[1] + d[2] * d[2]), ends[2][3], w[2][3];
        float along[2];
        if (!(amp > 0.0f))
          continue;   /* arrow.vert draws a degenerate quad: nothing */
        along[0] = 0.85f * r->radii[i];
        along[1] = along[0] + r->options.arrow_scale * amp;
        for (int e = 0; e < 2; e++)
          for (int k = 0; k < 3; k++)
            w[e][k] = p[3 * i + k] + d[k] / amp * along[e];
        for (int e = 0; e < 2; e++)
          for (int k = 0; k < 3; k++)
            ends[e][k] = v[k] * w[e][0] + v[4 + k] * w[e][1] + v[8 + k] * w[e][2] + v[12 + k];
        if (!qv_occlusion_hidden (r->occlusion, ends[0], ends[1], ARROW_HEAD_RADIUS, OCCLUSION_MARGIN_PX))
          {
            r->list[m++] = (guint32) j;
            r->n_listed[2]++;
          }
      }

  if (m > r->list_capacity || r->list_capacity == 0)
    {
      r->list_capacity = MAX (need, 4);
      fill_texture_buffer (r->list_buffer, r->list_texture, GL_R32UI, 4 * r->list_capacity, NULL);
    }
  if (m > 0)
    {
      glBindBuffer (GL_TEXTURE_BUFFER, r->list_buffer);
      glBufferSubData (GL_TEXTURE_BUFFER, 0, 4 * m, r->list);
      glBindBuffer (GL_TEXTURE_BUFFER, 0);
    }
}

/* The impostors (spheres, bonds and, unless @ghost, arrows) with edge
 * treatment @aa: this frame's culled lists, or for the ghost (drawn at
 * another phase, which the lists do not describe) all of them. */
static void
draw_impostor_set (QvRenderer *r, int aa, gboolean ghost)
{
  int shift = aa == AA_FRINGE ? FRINGE : 0;

  glBindVertexArray (r->quad_vao);
  const int kinds[3] = { PROG_SPHERE, PROG_CYLINDER, PROG_ARROW };
  const gboolean on[3] = { TRUE, r->options.bonds, r->options.arrows && !ghost };
  const gsize all[3] = { r->n_atoms, r->n_bonds, r->n_arrows };
  const gboolean listed = r->listed && !ghost;
  gsize base = 0;

  for (int k = 0; k < 3; k++)
    {
      int p = kinds[k] + shift;
      gsize count = listed ? r->n_listed[k] : all[k];
      if (on[k] && count > 0)
        {
          glUseProgram (r->programs[p]);
          glUniform1i (r->aa_location[p], aa);
          glUniform1i (r->list_location[p], listed ? (GLint) base : -1);
          glDrawElements (GL_TRIANGLES, 6 * (GLsizei) count, GL_UNSIGNED_INT, NULL);
        }
      base += r->n_listed[k];
    }
}

static void
draw_impostors (QvRenderer *r, int aa)
{
  draw_impostor_set (r, aa, FALSE);
}

/* The ghost: atoms and bonds at options.ghost_phase, blended at
 * options.ghost_alpha over what is drawn. A depth-only pass first leaves
 * the ghost's nearest surface in the depth buffer wherever it is in front
 * of the opaque picture; the colour pass then blends only that surface
 * (equal depth, the same shaders and inputs), so overlapping ghost atoms
 * and bonds do not stack up, and a ghost behind an opaque atom stays
 * hidden. Edges: when multisampled the depth pass picks the samples by
 * alpha-to-coverage and the colour pass, which writes alpha 1, reaches only
 * those (AA_MASKED: the fragment's alpha is then free for the blend, which
 * uses the constant ghost alpha); hard otherwise. Leaves @frame (the main
 * phase) in the uniform block. */
static void
draw_ghost (QvRenderer *r, const FrameBlock *frame, gboolean multisampled)
{
  FrameBlock g = *frame;
  const int aa = multisampled ? AA_COVERAGE : AA_SOLID;
  const float alpha = r->options.ghost_alpha;

  g.phase = r->options.ghost_phase;
  /* aa for the depth pass; the colour pass below. */
  g.cos_phase = cosf (g.phase);
  g.sin_phase = sinf (g.phase);
  g.highlight = -1;
  glBindBuffer (GL_UNIFORM_BUFFER, r->ubo);
  glBufferSubData (GL_UNIFORM_BUFFER, 0, sizeof g, &g);

  if (multisampled)
    glEnable (GL_SAMPLE_ALPHA_TO_COVERAGE);
  glColorMask (GL_FALSE, GL_FALSE, GL_FALSE, GL_FALSE);
  glDepthMask (GL_TRUE);
  glDepthFunc (GL_LESS);
  draw_impostor_set (r, aa, TRUE);

  glColorMask (GL_TRUE, GL_TRUE, GL_TRUE, r->options.transparent ? GL_TRUE : GL_FALSE);
  glDepthMask (GL_FALSE);
  glDepthFunc (GL_EQUAL);
  glDisable (GL_SAMPLE_ALPHA_TO_COVERAGE);
  glEnable (GL_BLEND);
  glBlendColor (0.0f, 0.0f, 0.0f, alpha);
  /* Porter–Duff over, the source being colour × alpha (straight): the
   * result is premultiplied, as the transparent framebuffer holds it. */
  glBlendFuncSeparate (GL_CONSTANT_ALPHA, GL_ONE_MINUS_CONSTANT_ALPHA,
                       GL_CONSTANT_ALPHA, GL_ONE_MINUS_CONSTANT_ALPHA);
  draw_impostor_set (r, multisampled ? AA_MASKED : AA_SOLID, TRUE);
  glDisable (GL_BLEND);
  glDepthFunc (GL_LESS);
  glDepthMask (GL_TRUE);

  glBufferSubData (GL_UNIFORM_BUFFER, 0, sizeof *frame, frame);
}

void
qv_renderer_draw (QvRenderer *r, const QvCamera *camera)
{
  FrameBlock frame;
  GLint sample_buffers = 0, target = 0;
  gboolean own_msaa;

  fill_frame (r, camera, &frame);
  glGetIntegerv (GL_DRAW_FRAMEBUFFER_BINDING, &target);
  own_msaa = r->options.samples > 0 && ensure_msaa (r, camera->width, camera->height);
  if (own_msaa)
    glBindFramebuffer (GL_DRAW_FRAMEBUFFER, r->msaa_fbo);
  glViewport (0, 0, camera->width, camera->height);
  if (r->options.transparent)
    glClearColor (0.0f, 0.0f, 0.0f, 0.0f);
  else
    glClearColor (frame.bg[0], frame.bg[1], frame.bg[2], frame.bg[3]);
  glColorMask (GL_TRUE, GL_TRUE, GL_TRUE, GL_TRUE);
  glDepthMask (GL_TRUE);
  glClear (GL_COLOR_BUFFER_BIT | GL_DEPTH_BUFFER_BIT);
  if (r->n_atoms == 0)
    goto resolve;

  cull (r, &frame);
  glBindBuffer (GL_UNIFORM_BUFFER, r->ubo);
  glBufferSubData (GL_UNIFORM_BUFFER, 0, sizeof frame, &frame);
  glBindBufferBase (GL_UNIFORM_BUFFER, 0, r->ubo);
  glActiveTexture (GL_TEXTURE0);
  glBindTexture (GL_TEXTURE_BUFFER, r->atom_texture);
  glActiveTexture (GL_TEXTURE1);
  glBindTexture (GL_TEXTURE_BUFFER, r->colour_texture);
  glActiveTexture (GL_TEXTURE2);
  glBindTexture (GL_TEXTURE_2D, r->atlas_texture);
  glActiveTexture (GL_TEXTURE3);
  glBindTexture (GL_TEXTURE_BUFFER, r->bond_texture);
  glActiveTexture (GL_TEXTURE4);
  glBindTexture (GL_TEXTURE_BUFFER, r->arrow_texture);
  glActiveTexture (GL_TEXTURE5);
  glBindTexture (GL_TEXTURE_BUFFER, r->list_texture);
  glActiveTexture (GL_TEXTURE0);

  glEnable (GL_DEPTH_TEST);
  glDepthFunc (GL_LESS);
  glDisable (GL_BLEND);
  glDisable (GL_CULL_FACE);
  /* On an opaque background its alpha stays as cleared: edge fragments
   * carry coverage in alpha, not transparency. On a transparent one the
   * coverage is written too (samples: alpha 1 where covered; blended
   * edges: over, below), so the framebuffer holds premultiplied colour. */
  glColorMask (GL_TRUE, GL_TRUE, GL_TRUE, r->options.transparent ? GL_TRUE : GL_FALSE);

  if (r->options.cell && r->has_cell)
    {
      glUseProgram (r->programs[PROG_LINE]);
      glBindVertexArray (r->cell_vao);
      glDrawArrays (GL_LINES, 0, 24);
    }

  glGetIntegerv (GL_SAMPLE_BUFFERS, &sample_buffers);
  if (sample_buffers > 0)
    {
      /* Multisampled: the edges' coverage goes to the samples. */
      glEnable (GL_SAMPLE_ALPHA_TO_COVERAGE);
      draw_impostors (r, AA_COVERAGE);
      glDisable (GL_SAMPLE_ALPHA_TO_COVERAGE);
      if (r->options.transparent)
        {
          /* The covered samples hold the coverage estimate in alpha (which
           * alpha-to-coverage already spent on choosing them): make them
           * opaque. GL_SAMPLE_ALPHA_TO_ONE should, but on llvmpipe (Mesa
           * 22.3) the samples kept the estimate: test-figure measured
           * fringes 49/255 off with it. */
          glColorMask (GL_FALSE, GL_FALSE, GL_FALSE, GL_TRUE);
          glDepthMask (GL_FALSE);
          glDepthFunc (GL_GREATER);
          glUseProgram (r->programs[PROG_COVER]);
          glBindVertexArray (r->quad_vao);
          glDrawArrays (GL_TRIANGLES, 0, 3);
          glDepthFunc (GL_LESS);
          glDepthMask (GL_TRUE);
          glColorMask (GL_TRUE, GL_TRUE, GL_TRUE, GL_TRUE);
        }
    }
  else if (r->options.antialias == QV_ANTIALIAS_NONE)
    draw_impostors (r, AA_SOLID);
  else
    {
      /* Fully covered pixels first, opaque; then the partly covered ones
       * blended over whatever the first pass left behind them, without
       * writing depth: right whatever the drawing order. */
      draw_impostors (r, AA_INNER);
      glEnable (GL_BLEND);
      glBlendFuncSeparate (GL_SRC_ALPHA, GL_ONE_MINUS_SRC_ALPHA, GL_ONE, GL_ONE_MINUS_SRC_ALPHA);
      glDepthMask (GL_FALSE);
      draw_impostors (r, AA_FRINGE);
      glDepthMask (GL_TRUE);
      glDisable (GL_BLEND);
    }

  if (r->options.labels && r->n_label_glyphs > 0)
    {
      glEnable (GL_BLEND);
      glBlendFuncSeparate (GL_SRC_ALPHA, GL_ONE_MINUS_SRC_ALPHA, GL_ONE, GL_ONE_MINUS_SRC_ALPHA);
      glDepthMask (GL_FALSE);
      glUseProgram (r->programs[PROG_LABEL]);
      glBindVertexArray (r->label_vao);
      glDrawArrays (GL_TRIANGLES, 0, 6 * (GLsizei) r->n_label_glyphs);
      glDepthMask (GL_TRUE);
      glDisable (GL_BLEND);
    }
  /* The ghost after the labels: where it passes in front of an atom it
   * veils that atom's label too, as it veils the atom. */
  if (r->options.ghost_alpha > 0.0f)
    draw_ghost (r, &frame, sample_buffers > 0);
  glColorMask (GL_TRUE, GL_TRUE, GL_TRUE, GL_TRUE);
  glBindVertexArray (0);
  glUseProgram (0);

resolve:
  if (own_msaa)
    {
      glBindFramebuffer (GL_READ_FRAMEBUFFER, r->msaa_fbo);
      glBindFramebuffer (GL_DRAW_FRAMEBUFFER, (GLuint) target);
      glBlitFramebuffer (0, 0, camera->width, camera->height, 0, 0, camera->width, camera->height,
                         GL_COLOR_BUFFER_BIT, GL_NEAREST);
      glBindFramebuffer (GL_FRAMEBUFFER, (GLuint) target);
    }
}

const float *
qv_renderer_positions (QvRenderer *r)
{
  if (!r->positions_valid)
    {
      float c = cosf (r->phase), s = sinf (r->phase);
      for (gsize i = 0; i < 3 * r->n_atoms; i++)
        r->positions[i] = r->rest[i] + (r->re ? r->re[i] * c : 0.0f)
                          - (r->im ? r->im[i] * s : 0.0f);
      r->positions_valid = TRUE;
    }
  return r->positions;
}

const float *
qv_renderer_radii (const QvRenderer *r)
{
  return r->radii;
}

gsize
qv_renderer_n_atoms (const QvRenderer *r)
{
  return r->n_atoms;
}

gsize
qv_renderer_n_bonds (const QvRenderer *r)
{
  return r->n_bonds;
}

void
qv_renderer_drawn_counts (const QvRenderer *r, gsize counts[3])
{
  for (int k = 0; k < 3; k++)
    counts[k] = r->n_listed[k];
}
