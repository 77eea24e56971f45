/* qv-picture.c — pictures and animations of a mode, offscreen.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-offscreen.h"
#include "qv-picture.h"
#include "qv-svg-figure.h"

void
qv_picture_request_init (QvPictureRequest *r, const QvStructure *structure)
{
  memset (r, 0, sizeof *r);
  r->structure = structure;
  r->max_displacement = 0.5;
  qv_camera_init (&r->camera);
  qv_render_options_init (&r->options);
  r->options.arrows = TRUE;
  r->options.bonds = TRUE;
  r->options.cell = TRUE;
  r->options.antialias = QV_ANTIALIAS_EDGES;
  r->width = 1200;
  r->height = 900;
  r->supersample = 2;
  r->phase = G_PI / 2;
  r->n_frames = 30;
  qv_picture_fit_camera (r);
}

/* Å per unit Q of every atom (3N floats) and the Q that moves the atom
 * that moves most by max_displacement; NULL without a mode. */
static float *
mode_field (const QvPictureRequest *r, double *Q, double *largest)
{
  const gsize n = r->structure->n_atoms;
  g_autofree double *d = NULL;
  float *f;
  double best = 0.0;

  *Q = 0.0;
  *largest = 0.0;
  if (r->modes == NULL || r->mode >= r->modes->n_modes || r->modes->n_atoms != n)
    return NULL;
  d = g_new (double, 3 * n);
  qv_mode_set_cartesian (r->modes, r->mode, d);
  f = g_new (float, 3 * n);
  for (gsize i = 0; i < 3 * n; i++)
    f[i] = (float) d[i];
  for (gsize a = 0; a < n; a++)
    best = MAX (best, d[3 * a] * d[3 * a] + d[3 * a + 1] * d[3 * a + 1] + d[3 * a + 2] * d[3 * a + 2]);
  if (best > 0.0)
    {
      *Q = fabs (r->max_displacement) / sqrt (best);
      *largest = fabs (r->max_displacement);
    }
  return f;
}

void
qv_picture_frame_positions_at (const QvPictureRequest *r, double phase, double *positions)
{
  const gsize n = r->structure->n_atoms;
  const double c = cos (phase);
  g_autofree double *d = NULL;
  double best = 0.0, Q = 0.0;

  for (gsize a = 0; a < n; a++)
    memcpy (positions + 3 * a, r->structure->atoms[a].position, 3 * sizeof (double));
  if (r->modes == NULL || r->mode >= r->modes->n_modes || r->modes->n_atoms != n)
    return;
  /* in double, as the core's displacements: these frames are written out */
  d = g_new (double, 3 * n);
  qv_mode_set_cartesian (r->modes, r->mode, d);
  for (gsize a = 0; a < n; a++)
    best = MAX (best, d[3 * a] * d[3 * a] + d[3 * a + 1] * d[3 * a + 1] + d[3 * a + 2] * d[3 * a + 2]);
  if (best > 0.0)
    Q = fabs (r->max_displacement) / sqrt (best);
  for (gsize i = 0; i < 3 * n; i++)
    positions[i] += Q * c * d[i];
}

void
qv_picture_frame_positions (const QvPictureRequest *r, guint k, double *positions)
{
  const guint n = MAX (r->n_frames, 1u);
  qv_picture_frame_positions_at (r, 2.0 * G_PI * (double) k / (double) n, positions);
}

/* A point the frame must hold, with the room it needs around it (Å). */
typedef struct {
  double p[3];
  double pad;
} FitPoint;

void
qv_picture_fit_camera (QvPictureRequest *r)
{
  const gsize n = r->structure ? r->structure->n_atoms : 0;
  g_autofree double *plus = g_new (double, 3 * MAX (n, 1));
  g_autofree double *minus = g_new (double, 3 * MAX (n, 1));
  g_autofree double *d = NULL;
  g_autoptr(GArray) pts = g_array_new (FALSE, FALSE, sizeof (FitPoint));
  mat4 view, inverse;
  float lo[2] = { 0, 0 }, hi[2] = { 0, 0 };
  double t, aspect, dist = 0.0, depth = 0.0, largest = 0.0;
  const double margin = 0.25;   /* Å of air around everything drawn */

  qv_camera_set_viewport (&r->camera, MAX (r->width, 1), MAX (r->height, 1));
  if (n == 0)
    return;
  qv_picture_frame_positions_at (r, 0.0, plus);
  qv_picture_frame_positions_at (r, G_PI, minus);
  if (r->options.arrows && r->modes && r->mode < r->modes->n_modes && r->modes->n_atoms == n)
    {
      d = g_new (double, 3 * n);
      qv_mode_set_cartesian (r->modes, r->mode, d);
      for (gsize a = 0; a < n; a++)
        largest = MAX (largest, sqrt (d[3 * a] * d[3 * a] + d[3 * a + 1] * d[3 * a + 1]
                                      + d[3 * a + 2] * d[3 * a + 2]));
    }
  for (gsize a = 0; a < n; a++)
    {
      const double radius = qv_style_element (r->structure->atoms[a].z)->radius
                            * (r->options.atom_scale > 0 ? r->options.atom_scale : 1.0f);
      FitPoint f;
      for (int k = 0; k < 3; k++)
        f.p[k] = plus[3 * a + k];
      f.pad = radius + margin;
      g_array_append_val (pts, f);
      for (int k = 0; k < 3; k++)
        f.p[k] = minus[3 * a + k];
      g_array_append_val (pts, f);
      if (d && largest > 0.0)
        {
          /* the arrow's tip: from 0.85 of the radius (qv-renderer), as long
           * as its share of the longest arrow */
          const double *u = d + 3 * a;
          const double len = sqrt (u[0] * u[0] + u[1] * u[1] + u[2] * u[2]);
          if (len >= QV_PICTURE_ARROW_MIN_SHARE * largest)
            {
              const double reach = 0.85 * radius + QV_PICTURE_ARROW_LONGEST * len / largest;
              for (int k = 0; k < 3; k++)
                f.p[k] = r->structure->atoms[a].position[k] + u[k] / len * reach;
              f.pad = 0.15 + margin;   /* the cone's half-width */
              g_array_append_val (pts, f);
            }
        }
    }

  /* The frame's centre: the middle of the padded extent across the view. */
  r->camera.target[0] = r->camera.target[1] = r->camera.target[2] = 0.0f;
  r->camera.distance = 1.0f;
  qv_camera_view_matrix (&r->camera, view);
  for (guint i = 0; i < pts->len; i++)
    {
      const FitPoint *f = &g_array_index (pts, FitPoint, i);
      vec4 w = { (float) f->p[0], (float) f->p[1], (float) f->p[2], 1.0f }, v;
      glm_mat4_mulv (view, w, v);
      for (int k = 0; k < 2; k++)
        {
          if (i == 0 || v[k] - f->pad < lo[k])
            lo[k] = v[k] - (float) f->pad;
          if (i == 0 || v[k] + f->pad > hi[k])
            hi[k] = v[k] + (float) f->pad;
        }
    }
  {
    vec4 c = { (lo[0] + hi[0]) / 2, (lo[1] + hi[1]) / 2, 0.0f, 1.0f }, w;
    /* depth: the centre of the points along the view axis */
    double zsum = 0.0;
    for (guint i = 0; i < pts->len; i++)
      {
        const FitPoint *f = &g_array_index (pts, FitPoint, i);
        vec4 pw = { (float) f->p[0], (float) f->p[1], (float) f->p[2], 1.0f }, v;
        glm_mat4_mulv (view, pw, v);
        zsum += v[2];
      }
    c[2] = (float) (zsum / pts->len);
    glm_mat4_inv (view, inverse);
    glm_mat4_mulv (inverse, c, w);
    glm_vec3_copy (w, r->camera.target);
  }

  /* The nearest distance at which every padded point is inside the frame:
   * in perspective a point at view depth z (towards the eye) and offset x,
   * y needs d − z ≥ (|y| + pad)/t and (|x| + pad)/(t·aspect); in
   * orthographic d·t is the half-height. */
  aspect = (double) MAX (r->width, 1) / (double) MAX (r->height, 1);
  t = tan (r->camera.fov_y / 2);
  r->camera.distance = 1.0f;
  qv_camera_view_matrix (&r->camera, view);
  for (guint i = 0; i < pts->len; i++)
    {
      const FitPoint *f = &g_array_index (pts, FitPoint, i);
      vec4 w = { (float) f->p[0], (float) f->p[1], (float) f->p[2], 1.0f }, v;
      double need;
      glm_mat4_mulv (view, w, v);
      /* view space has the eye at +distance on z: undo the 1 Å used here */
      v[2] += 1.0f;
      need = MAX ((fabs (v[1]) + f->pad) / t, (fabs (v[0]) + f->pad) / (t * aspect));
      if (r->camera.projection == QV_CAMERA_PERSPECTIVE)
        need += v[2] + f->pad;
      dist = MAX (dist, need);
      depth = MAX (depth, fabs (v[2]) + f->pad);
    }
  r->camera.distance = (float) MAX (dist, 1.0);
  r->camera.scene_radius = (float) sqrt (depth * depth
                                         + (hi[0] - lo[0]) * (hi[0] - lo[0]) / 4
                                         + (hi[1] - lo[1]) * (hi[1] - lo[1]) / 4);
}

typedef struct {
  QvOffscreen *offscreen;
  QvRenderer *renderer;
  QvCamera camera;
} Scene;

static void
scene_clear (Scene *s)
{
  if (s->renderer)
    {
      qv_offscreen_make_current (s->offscreen);
      qv_renderer_free (s->renderer);
    }
  qv_offscreen_free (s->offscreen);
}

static gboolean
check_request (const QvPictureRequest *r, GError **error)
{
  if (r->structure == NULL || r->structure->n_atoms == 0)
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE, "there is no structure to draw");
      return FALSE;
    }
  if (r->width < 16 || r->height < 16 || r->width > QV_PICTURE_MAX_SIDE
      || r->height > QV_PICTURE_MAX_SIDE)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "a picture must be 16 to %d pixels wide and "
                   "high, not %d x %d", QV_PICTURE_MAX_SIDE, r->width, r->height);
      return FALSE;
    }
  if (r->supersample < 1 || r->supersample > 4
      || (gint64) r->width * r->supersample > QV_PICTURE_MAX_SIDE
      || (gint64) r->height * r->supersample > QV_PICTURE_MAX_SIDE)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "supersampling takes 1 to 4, and the "
                   "enlarged picture (%d x %d) must stay within %d pixels",
                   r->width * r->supersample, r->height * r->supersample, QV_PICTURE_MAX_SIDE);
      return FALSE;
    }
  if (!(r->max_displacement >= 0 && isfinite (r->max_displacement)))
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE, "the amplitude must be a finite "
                           "number of angstrom, 0 or more");
      return FALSE;
    }
  return TRUE;
}

/* The request's options with the arrows scaled to the mode as the app's
 * view scales them; the mode field and its Q into @field and @Q. */
static void
picture_options (const QvPictureRequest *r, QvRenderOptions *options, float **field, double *Q)
{
  double largest;

  *options = r->options;
  *field = mode_field (r, Q, &largest);
  if (largest > 0.0)
    {
      options->arrow_scale = (float) (QV_PICTURE_ARROW_LONGEST / largest);
      options->arrow_threshold = (float) (QV_PICTURE_ARROW_MIN_SHARE * largest);
    }
  else
    options->arrows = FALSE;
}

static gboolean
scene_init (Scene *s, const QvPictureRequest *r, GError **error)
{
  double Q;
  g_autofree float *field = NULL;
  QvRenderOptions options;
  int w, h;

  memset (s, 0, sizeof *s);
  if (!check_request (r, error))
    return FALSE;
  /* 4× MSAA where the GL has it, on top of the supersampling */
  s->offscreen = qv_offscreen_new (r->width, r->height, 4, r->supersample, error);
  if (s->offscreen == NULL)
    return FALSE;
  s->renderer = qv_renderer_new (error);
  if (s->renderer == NULL)
    {
      scene_clear (s);
      return FALSE;
    }
  qv_renderer_set_structure (s->renderer, r->structure);
  picture_options (r, &options, &field, &Q);
  qv_renderer_set_mode (s->renderer, field, NULL, (float) Q);
  /* the framebuffer is multisampled already */
  options.samples = 0;
  qv_renderer_set_options (s->renderer, &options);
  qv_offscreen_begin (s->offscreen, &w, &h);
  s->camera = r->camera;
  qv_camera_set_viewport (&s->camera, w, h);
  return TRUE;
}

static guint8 *
scene_draw (Scene *s, const QvPictureRequest *r, double phase)
{
  guint8 *rgba = g_malloc ((gsize) r->width * (gsize) r->height * 4);
  int w, h;

  qv_offscreen_make_current (s->offscreen);
  qv_offscreen_begin (s->offscreen, &w, &h);
  qv_renderer_set_phase (s->renderer, (float) phase);
  qv_renderer_draw (s->renderer, &s->camera);
  qv_offscreen_read (s->offscreen, rgba);
  return rgba;
}

guint8 *
qv_picture_render (const QvPictureRequest *r, GError **error)
{
  Scene s;
  guint8 *rgba;

  if (!scene_init (&s, r, error))
    return NULL;
  rgba = scene_draw (&s, r, r->phase);
  scene_clear (&s);
  return rgba;
}

guint8 **
qv_picture_render_frames (const QvPictureRequest *r, const QvProgress *progress, GError **error)
{
  Scene s;
  const guint n = r->n_frames;
  guint8 **frames;

  if (n < 2 || n > QV_PICTURE_MAX_FRAMES)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "an animation takes 2 to %d frames, not %u",
                   QV_PICTURE_MAX_FRAMES, n);
      return NULL;
    }
  if (!scene_init (&s, r, error))
    return NULL;
  frames = g_new0 (guint8 *, n + 1);
  for (guint k = 0; k < n; k++)
    {
      frames[k] = scene_draw (&s, r, 2.0 * G_PI * (double) k / (double) n);
      if (!qv_progress_report (progress, (double) (k + 1) / (double) n, "drawing frames", error))
        {
          g_strfreev ((char **) frames);
          frames = NULL;
          break;
        }
    }
  scene_clear (&s);
  return frames;
}

char *
qv_picture_svg (const QvPictureRequest *r, gsize *length, GError **error)
{
  const gsize n = r->structure ? r->structure->n_atoms : 0;
  g_autofree float *field = NULL, *at = NULL, *arrows = NULL, *ghost = NULL;
  g_autofree double *x = NULL;
  QvRenderOptions options;
  QvSvgFigure figure = { 0 };
  QvCamera camera;
  double Q;

  if (!check_request (r, error))
    return NULL;
  picture_options (r, &options, &field, &Q);
  x = g_new (double, 3 * n);
  at = g_new (float, 3 * n);
  qv_picture_frame_positions_at (r, r->phase, x);
  for (gsize i = 0; i < 3 * n; i++)
    at[i] = (float) x[i];
  if (field && options.arrows)
    {
      /* the arrows show the displacement of the + extreme, as in GL */
      arrows = g_new (float, 3 * n);
      for (gsize i = 0; i < 3 * n; i++)
        arrows[i] = (float) Q * field[i];
    }
  if (field && options.ghost_alpha > 0.0f)
    {
      ghost = g_new (float, 3 * n);
      qv_picture_frame_positions_at (r, options.ghost_phase, x);
      for (gsize i = 0; i < 3 * n; i++)
        ghost[i] = (float) x[i];
    }
  figure.structure = r->structure;
  figure.positions = at;
  figure.arrows = arrows;
  figure.ghost_positions = ghost;
  camera = r->camera;
  qv_camera_set_viewport (&camera, r->width, r->height);
  return qv_svg_figure_render (&figure, &camera, &options, length, error);
}
