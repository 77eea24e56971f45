/* test-figure.c — still pictures: the renderer's transparent background
 * and ghost overlay checked pixel by pixel against Porter–Duff compositing,
 * and the SVG figure (qv-svg-figure.h) checked against the PNG of the same
 * view and against projective geometry. Invented structures only.
 *
 * With the arguments `svg FILE` it writes the SVG of an invented molecule
 * (no GL) for test_svg_figure.py and exits.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include "qv-error.h"
#include "qv-render-test.h"
#include "qv-style.h"
#include "qv-svg-figure.h"

#define W 240
#define H 180
#define SS 2

static QvrContext *ctx;

/* ---- SVG reading (GMarkup) ---------------------------------------- */

typedef struct {
  char *element;     /* circle, polygon, … */
  char *class;
  char *id;
  double cx, cy, r;
  double opacity;
  gsize order;       /* position in the document */
} Shape;

typedef struct {
  GPtrArray *shapes;
  gboolean background;
  char *background_fill;
  int width, height;
} Svg;

static void
shape_free (gpointer p)
{
  Shape *s = p;
  g_free (s->element);
  g_free (s->class);
  g_free (s->id);
  g_free (s);
}

static void
svg_start (GMarkupParseContext *context, const char *name, const char **names,
           const char **values, gpointer data, GError **error)
{
  Svg *svg = data;
  Shape *s;

  if (strcmp (name, "svg") == 0)
    {
      for (int k = 0; names[k]; k++)
        if (strcmp (names[k], "width") == 0)
          svg->width = atoi (values[k]);
        else if (strcmp (names[k], "height") == 0)
          svg->height = atoi (values[k]);
      return;
    }
  if (strcmp (name, "rect") == 0)
    {
      for (int k = 0; names[k]; k++)
        if (strcmp (names[k], "id") == 0 && strcmp (values[k], "background") == 0)
          svg->background = TRUE;
        else if (strcmp (names[k], "fill") == 0)
          svg->background_fill = g_strdup (values[k]);
      return;
    }
  if (strcmp (name, "circle") != 0 && strcmp (name, "polygon") != 0 && strcmp (name, "line") != 0)
    return;
  s = g_new0 (Shape, 1);
  s->element = g_strdup (name);
  s->opacity = 1.0;
  s->order = svg->shapes->len;
  for (int k = 0; names[k]; k++)
    {
      if (strcmp (names[k], "class") == 0)
        s->class = g_strdup (values[k]);
      else if (strcmp (names[k], "id") == 0)
        s->id = g_strdup (values[k]);
      else if (strcmp (names[k], "cx") == 0)
        s->cx = g_ascii_strtod (values[k], NULL);
      else if (strcmp (names[k], "cy") == 0)
        s->cy = g_ascii_strtod (values[k], NULL);
      else if (strcmp (names[k], "r") == 0)
        s->r = g_ascii_strtod (values[k], NULL);
      else if (strcmp (names[k], "opacity") == 0)
        s->opacity = g_ascii_strtod (values[k], NULL);
    }
  g_ptr_array_add (svg->shapes, s);
}

/* Parses with GLib's XML subset parser (well-formedness: any error fails
 * the test). */
static void
svg_parse (Svg *svg, const char *text, gsize length)
{
  static const GMarkupParser parser = { svg_start, NULL, NULL, NULL, NULL };
  GMarkupParseContext *mc;
  GError *error = NULL;

  memset (svg, 0, sizeof *svg);
  svg->shapes = g_ptr_array_new_with_free_func (shape_free);
  mc = g_markup_parse_context_new (&parser, 0, svg, NULL);
  if (!g_markup_parse_context_parse (mc, text, (gssize) length, &error)
      || !g_markup_parse_context_end_parse (mc, &error))
    fail_msg ("the SVG is not well-formed XML: %s", error->message);
  g_markup_parse_context_free (mc);
}

static void
svg_clear (Svg *svg)
{
  g_ptr_array_free (svg->shapes, TRUE);
  g_free (svg->background_fill);
}

static const Shape *
svg_find (const Svg *svg, const char *id)
{
  for (guint j = 0; j < svg->shapes->len; j++)
    {
      const Shape *s = svg->shapes->pdata[j];
      if (s->id && strcmp (s->id, id) == 0)
        return s;
    }
  return NULL;
}

static guint
svg_count (const Svg *svg, const char *element, const char *class)
{
  guint n = 0;
  for (guint j = 0; j < svg->shapes->len; j++)
    {
      const Shape *s = svg->shapes->pdata[j];
      if (strcmp (s->element, element) == 0 && s->class && strcmp (s->class, class) == 0)
        n++;
    }
  return n;
}

static char *
render_svg (const QvSvgFigure *fig, const QvCamera *camera, const QvRenderOptions *o, gsize *len)
{
  GError *error = NULL;
  char *text = qv_svg_figure_render (fig, camera, o, len, &error);
  if (text == NULL)
    fail_msg ("SVG figure: %s", error->message);
  assert_int_equal (strlen (text), *len);
  return text;
}

/* ---- scenes --------------------------------------------------------- */

/* Five invented atoms 3.5 Å or more apart (no bonds: the covalent radii
 * sum to well under that), at different depths and off the axis. */
static QvStructure *
separated (void)
{
  static const guint z[] = { 8, 6, 1, 7, 16 };
  static const double xyz[] = {
    0.0, 0.0, 0.0,
    3.6, 1.0, -1.5,
    -3.4, 2.2, 1.0,
    -2.8, -2.6, -2.0,
    3.0, -2.8, 1.5,
  };
  return qvr_structure (G_N_ELEMENTS (z), z, xyz);
}

static void
fit (const QvStructure *s, QvCamera *camera, int width, int height)
{
  g_autofree float *p = g_new (float, 3 * s->n_atoms);

  for (gsize i = 0; i < 3 * s->n_atoms; i++)
    p[i] = (float) s->atoms[i / 3].position[i % 3];
  qv_camera_init (camera);
  qv_camera_set_viewport (camera, width, height);
  qv_camera_fit (camera, p, s->n_atoms, 1.0f);
}

static float *
rest_positions (const QvStructure *s)
{
  float *p = g_new (float, 3 * s->n_atoms);
  for (gsize i = 0; i < 3 * s->n_atoms; i++)
    p[i] = (float) s->atoms[i / 3].position[i % 3];
  return p;
}

static void
render (QvCamera *camera, const QvRenderOptions *o, guint8 *out)
{
  qv_renderer_set_options (ctx->renderer, o);
  qvr_render (ctx, camera);
  memcpy (out, ctx->rgba, (gsize) W * H * 4);
}

/* ---- the transparent background ------------------------------------- */

/* A PNG with a transparent background must composite over the background
 * colour into the opaque picture: C = α·c + (1 − α)·B per channel, Porter
 * and Duff, "Compositing Digital Images" (1984), the over operator. A
 * straight-alpha image whose edges still hold premultiplied colour (dark
 * fringes) or the background's colour (light fringes) fails it along every
 * silhouette. */
static void
test_transparent_composites (void **state)
{
  g_autoptr (QvStructure) s = separated ();
  g_autofree guint8 *opaque = g_malloc ((gsize) W * H * 4);
  g_autofree guint8 *clear = g_malloc ((gsize) W * H * 4);
  static const struct { int samples; QvAntialias aa; const char *name; } variants[] = {
    { 4, QV_ANTIALIAS_NONE, "4x multisampled" },
    { 0, QV_ANTIALIAS_EDGES, "analytic edges" },
    { 0, QV_ANTIALIAS_NONE, "hard edges" },
  };
  QvCamera camera;

  qv_renderer_set_structure (ctx->renderer, s);
  fit (s, &camera, ctx->draw_width, ctx->draw_height);
  for (gsize v = 0; v < G_N_ELEMENTS (variants); v++)
    for (int theme = 0; theme < 2; theme++)
      {
        QvRenderOptions o;
        float bg[4];
        int worst = 0, edges = 0, inside = 0;

        qv_render_options_init (&o);
        o.samples = variants[v].samples;
        o.antialias = variants[v].aa;
        o.background = theme ? QV_BACKGROUND_DARK : QV_BACKGROUND_LIGHT;
        o.atom_scale = 2.0f;   /* larger discs: more edge and inside */
        qv_style_background (o.background, bg);
        render (&camera, &o, opaque);
        o.transparent = TRUE;
        render (&camera, &o, clear);

        /* Corners: nothing there. */
        assert_int_equal (clear[3], 0);
        assert_int_equal (clear[((gsize) H * W - 1) * 4 + 3], 0);
        for (gsize p = 0; p < (gsize) W * H; p++)
          {
            const guint8 *c = clear + 4 * p, *q = opaque + 4 * p;
            double a = c[3] / 255.0;
            /* Opaque pictures stay opaque. */
            assert_int_equal (q[3], 255);
            for (int k = 0; k < 3; k++)
              {
                double composite = a * c[k] / 255.0 + (1.0 - a) * bg[k];
                int err = (int) lround (fabs (composite * 255.0 - q[k]));
                if (err > worst && g_getenv ("QV_TEST_DEBUG"))
                  g_print ("    pixel %d,%d: clear %d %d %d %d opaque %d %d %d\n",
                           (int) (p % W), (int) (p / W), c[0], c[1], c[2], c[3], q[0], q[1], q[2]);
                worst = MAX (worst, err);
              }
            if (c[3] > 0 && c[3] < 255)
              edges++;
            if (c[3] == 255)
              inside++;
          }
        g_print ("  transparent, %s, %s background: %d edge pixels, %d opaque, "
                 "largest compositing error %d/255\n", variants[v].name,
                 theme ? "dark" : "light", edges, inside, worst);
        /* 8-bit rounding of premultiplied colour, un-premultiplied and
         * composited again: a couple of levels. */
        assert_true (worst <= 3);
        assert_true (inside > 1000);
        /* Supersampling (SS × SS) always leaves partly covered pixels. */
        assert_true (edges > 100);
      }
}

/* ---- the ghost overlay ------------------------------------------------ */

/* One invented oxygen whose mode moves it by @d (Å) at the + extreme
 * (phase 0); drawn at rest (phase π/2) with the ghost at phase 0. */
static void
ghost_scene (QvCamera *camera, const float d[3])
{
  static const guint z[] = { 8 };
  static const double xyz[] = { 0.0, 0.0, 0.0 };
  g_autoptr (QvStructure) s = qvr_structure (1, z, xyz);
  const float pts[6] = { 0, 0, 0, d[0], d[1], d[2] };

  qv_renderer_set_structure (ctx->renderer, s);
  qv_renderer_set_mode (ctx->renderer, d, NULL, 1.0f);
  qv_camera_init (camera);
  qv_camera_set_viewport (camera, ctx->draw_width, ctx->draw_height);
  qv_camera_fit (camera, pts, 2, 1.5f);
}

static int
pixel_error (const guint8 *p, const double expect[3])
{
  int worst = 0;
  for (int k = 0; k < 3; k++)
    worst = MAX (worst, (int) lround (fabs (p[k] - expect[k] * 255.0)));
  return worst;
}

/* The picture pixel (x, y) of a world point. */
static void
pixel_of (const QvCamera *camera, const float w[3], int *x, int *y)
{
  float fx, fy;
  assert_true (qv_camera_project (camera, w, &fx, &fy, NULL));
  *x = (int) floorf (fx / SS);
  *y = (int) floorf (fy / SS);
}

/* Where only the ghost is, the pixel is the over operator (Porter–Duff
 * 1984) of the ghost's opaque colour at alpha A on the background:
 * A·S + (1 − A)·B, S the same atom drawn opaque at the ghost's phase.
 * Where the ghost lies behind the opaque atom it leaves the pixel alone;
 * where it lies in front, A·S + (1 − A)·M over the opaque atom's M. */
static void
test_ghost_blends (void **state)
{
  g_autofree guint8 *ghost = g_malloc ((gsize) W * H * 4);
  g_autofree guint8 *main_only = g_malloc ((gsize) W * H * 4);
  g_autofree guint8 *displaced = g_malloc ((gsize) W * H * 4);
  const float alpha = 0.35f, origin[3] = { 0, 0, 0 };
  const int sample_counts[2] = { 4, 0 };

  for (int v = 0; v < 2; v++)
    {
      QvRenderOptions o;
      QvCamera camera;
      float bg[4];
      int x, y, e;
      const guint8 *p;
      double expect[3];

      qv_render_options_init (&o);
      o.samples = sample_counts[v];
      o.arrows = FALSE;
      o.depth_cue = FALSE;
      qv_style_background (o.background, bg);

      /* Sideways by 3 Å: the two discs apart. */
      {
        const float d[3] = { 3.0f, 0.0f, 0.0f };
        ghost_scene (&camera, d);
        qv_renderer_set_phase (ctx->renderer, (float) G_PI_2);
        render (&camera, &o, main_only);
        qv_renderer_set_phase (ctx->renderer, 0.0f);
        render (&camera, &o, displaced);
        qv_renderer_set_phase (ctx->renderer, (float) G_PI_2);
        o.ghost_alpha = alpha;
        o.ghost_phase = 0.0f;
        render (&camera, &o, ghost);
        o.ghost_alpha = 0.0f;

        pixel_of (&camera, d, &x, &y);
        p = displaced + ((gsize) y * W + x) * 4;
        for (int k = 0; k < 3; k++)
          expect[k] = alpha * p[k] / 255.0 + (1.0 - alpha) * bg[k];
        e = pixel_error (ghost + ((gsize) y * W + x) * 4, expect);
        g_print ("  ghost (renderer samples %d) alone on the background: off by %d/255\n", o.samples, e);
        assert_true (e <= 2);
        /* The ghost must differ from the background there (it is drawn). */
        for (int k = 0; k < 3; k++)
          expect[k] = bg[k];
        assert_true (pixel_error (ghost + ((gsize) y * W + x) * 4, expect) >= 10);
        /* The opaque atom untouched. */
        pixel_of (&camera, origin, &x, &y);
        assert_memory_equal (ghost + ((gsize) y * W + x) * 4, main_only + ((gsize) y * W + x) * 4, 4);

        /* Transparent: the ghost alone has alpha A and its own colour. */
        o.transparent = TRUE;
        o.ghost_alpha = alpha;
        render (&camera, &o, ghost);
        o.ghost_alpha = 0.0f;
        o.transparent = FALSE;
        pixel_of (&camera, d, &x, &y);
        {
          const guint8 *g = ghost + ((gsize) y * W + x) * 4;
          const guint8 *sp = displaced + ((gsize) y * W + x) * 4;
          assert_true (abs (g[3] - (int) lround (alpha * 255.0)) <= 1);
          for (int k = 0; k < 3; k++)
            assert_true (abs (g[k] - sp[k]) <= 3);
        }
      }

      /* Straight away from the eye (the camera looks along −z) and a
       * little sideways: hidden behind the atom, showing as a crescent. */
      {
        const float d[3] = { 0.5f, 0.0f, -2.0f };
        ghost_scene (&camera, d);
        qv_renderer_set_phase (ctx->renderer, (float) G_PI_2);
        render (&camera, &o, main_only);
        o.ghost_alpha = alpha;
        render (&camera, &o, ghost);
        o.ghost_alpha = 0.0f;
        pixel_of (&camera, origin, &x, &y);
        assert_memory_equal (ghost + ((gsize) y * W + x) * 4, main_only + ((gsize) y * W + x) * 4, 4);
      }

      /* Straight towards the eye: in front, blended over the atom. */
      {
        const float d[3] = { 0.0f, 0.0f, 1.0f };
        ghost_scene (&camera, d);
        qv_renderer_set_phase (ctx->renderer, (float) G_PI_2);
        render (&camera, &o, main_only);
        qv_renderer_set_phase (ctx->renderer, 0.0f);
        render (&camera, &o, displaced);
        qv_renderer_set_phase (ctx->renderer, (float) G_PI_2);
        o.ghost_alpha = alpha;
        render (&camera, &o, ghost);
        o.ghost_alpha = 0.0f;
        pixel_of (&camera, origin, &x, &y);
        {
          const guint8 *m = main_only + ((gsize) y * W + x) * 4;
          const guint8 *sp = displaced + ((gsize) y * W + x) * 4;
          for (int k = 0; k < 3; k++)
            expect[k] = (alpha * sp[k] + (1.0 - alpha) * m[k]) / 255.0;
          e = pixel_error (ghost + ((gsize) y * W + x) * 4, expect);
          g_print ("  ghost (renderer samples %d) in front of the atom: off by %d/255\n", o.samples, e);
          assert_true (e <= 2);
        }
      }
    }
}

/* Two ghost atoms that overlap each other are blended once where they
 * overlap (only the nearer surface), not twice. */
static void
test_ghost_overlap_once (void **state)
{
  static const guint z[] = { 8, 8 };
  static const double xyz[] = { -3.0, 0.0, 0.0, 3.0, 0.0, -1.0 };
  g_autoptr (QvStructure) s = qvr_structure (2, z, xyz);
  /* Both move to nearly the same place at the + extreme: 0.4 Å apart
   * sideways, the second 1 Å behind. */
  const float d[6] = { 2.75f, 0.0f, 0.0f, -2.85f, 0.0f, 0.0f };
  const float where[3] = { -0.05f, 0.0f, 0.0f };
  g_autofree guint8 *ghost = g_malloc ((gsize) W * H * 4);
  g_autofree guint8 *displaced = g_malloc ((gsize) W * H * 4);
  QvRenderOptions o;
  QvCamera camera;
  float bg[4];
  double expect[3];
  int x, y, e;

  qv_render_options_init (&o);
  o.samples = 4;
  o.arrows = FALSE;
  o.depth_cue = FALSE;
  o.bonds = FALSE;
  qv_style_background (o.background, bg);
  qv_renderer_set_structure (ctx->renderer, s);
  qv_renderer_set_mode (ctx->renderer, d, NULL, 1.0f);
  fit (s, &camera, ctx->draw_width, ctx->draw_height);
  qv_renderer_set_phase (ctx->renderer, 0.0f);
  render (&camera, &o, displaced);
  qv_renderer_set_phase (ctx->renderer, (float) G_PI_2);
  o.ghost_alpha = 0.5f;
  render (&camera, &o, ghost);
  /* A point inside both ghost discs: the front one's colour, once. */
  {
    const float w[3] = { where[0], where[1], where[2] };
    pixel_of (&camera, w, &x, &y);
  }
  for (int k = 0; k < 3; k++)
    expect[k] = 0.5 * displaced[((gsize) y * W + x) * 4 + k] / 255.0 + 0.5 * bg[k];
  e = pixel_error (ghost + ((gsize) y * W + x) * 4, expect);
  g_print ("  overlapping ghosts: off by %d/255 from one blend\n", e);
  assert_true (e <= 2);
}

/* ---- the SVG figure --------------------------------------------------- */

/* Each atom's disc in the SVG against the PNG of the same view: the
 * centroid of the PNG's alpha around it (transparent background, atoms
 * far apart) within 0.5 px of the disc's centre, and the alpha's area
 * (π r², the disc's area) within 0.5 px of its radius. */
static void
check_svg_against_png (QvCameraProjection projection)
{
  g_autoptr (QvStructure) s = separated ();
  g_autofree float *pos = rest_positions (s);
  QvSvgFigure fig = { .structure = s, .positions = pos };
  g_autofree char *text = NULL;
  QvRenderOptions o;
  QvCamera camera, picture;
  gsize len;
  Svg svg;
  double worst_c = 0.0, worst_r = 0.0;

  qv_renderer_set_structure (ctx->renderer, s);
  qv_renderer_set_phase (ctx->renderer, 0.0f);
  fit (s, &camera, ctx->draw_width, ctx->draw_height);
  qv_camera_set_projection (&camera, projection);
  qv_render_options_init (&o);
  o.transparent = TRUE;
  o.samples = 4;
  qv_renderer_set_options (ctx->renderer, &o);
  qvr_render (ctx, &camera);

  picture = camera;
  qv_camera_set_viewport (&picture, W, H);
  text = render_svg (&fig, &picture, &o, &len);
  svg_parse (&svg, text, len);
  assert_int_equal (svg.width, W);
  assert_int_equal (svg.height, H);
  assert_false (svg.background);
  /* One disc per atom, no more. */
  assert_int_equal (svg_count (&svg, "circle", "atom"), s->n_atoms);
  for (gsize i = 0; i < s->n_atoms; i++)
    {
      char id[32];
      const Shape *c;
      double sa = 0.0, sx = 0.0, sy = 0.0;
      int reach;

      g_snprintf (id, sizeof id, "atom-%" G_GSIZE_FORMAT, i + 1);
      c = svg_find (&svg, id);
      assert_non_null (c);
      reach = (int) ceil (c->r) + 3;
      for (int y = (int) c->cy - reach; y <= (int) c->cy + reach; y++)
        for (int x = (int) c->cx - reach; x <= (int) c->cx + reach; x++)
          {
            double a;
            if (x < 0 || y < 0 || x >= W || y >= H)
              continue;
            a = qvr_pixel (ctx, x, y)[3] / 255.0;
            /* pixel (x, y) covers [x, x + 1) × [y, y + 1) (qv-camera.h) */
            sa += a;
            sx += a * (x + 0.5);
            sy += a * (y + 0.5);
          }
      assert_true (sa > 0.0);
      worst_c = MAX (worst_c, hypot (sx / sa - c->cx, sy / sa - c->cy));
      worst_r = MAX (worst_r, fabs (sqrt (sa / G_PI) - c->r));
    }
  g_print ("  SVG vs PNG (%s): centres within %.3f px, radii within %.3f px\n",
           projection == QV_CAMERA_ORTHOGRAPHIC ? "orthographic" : "perspective", worst_c, worst_r);
  assert_true (worst_c <= 0.5);
  assert_true (worst_r <= 0.5);
  svg_clear (&svg);
}

static void
test_svg_matches_png (void **state)
{
  check_svg_against_png (QV_CAMERA_PERSPECTIVE);
  check_svg_against_png (QV_CAMERA_ORTHOGRAPHIC);
}

/* A sphere of radius r at distance d on the axis of a pinhole camera of
 * focal length F (pixels) images as a disc of radius F·r/√(d² − r²): the
 * tangent cone's half-angle is asin(r/d) (projective geometry, e.g. Hartley
 * and Zisserman, "Multiple View Geometry", the image of a quadric). */
static void
test_svg_disc_radius (void **state)
{
  static const guint z[] = { 6 };
  static const double xyz[] = { 0.0, 0.0, 0.0 };
  g_autoptr (QvStructure) s = qvr_structure (1, z, xyz);
  QvSvgFigure fig = { .structure = s };
  g_autofree char *text = NULL;
  QvRenderOptions o;
  QvCamera camera;
  gsize len;
  Svg svg;
  const Shape *c;
  double r = qv_style_element (6)->radius * 2.0, d, f, expect;

  qv_camera_init (&camera);
  qv_camera_set_viewport (&camera, W, H);
  camera.distance = 6.0f;
  qv_render_options_init (&o);
  o.atom_scale = 2.0f;
  text = render_svg (&fig, &camera, &o, &len);
  svg_parse (&svg, text, len);
  c = svg_find (&svg, "atom-1");
  assert_non_null (c);
  d = camera.distance;
  f = 0.5 * H / tan (0.5 * camera.fov_y);
  expect = f * r / sqrt (d * d - r * r);
  assert_true (fabs (c->r - expect) < 0.01);
  assert_true (fabs (c->cx - 0.5 * W) < 0.01 && fabs (c->cy - 0.5 * H) < 0.01);
  /* Opaque: the background rectangle in the style's colour. */
  assert_true (svg.background);
  {
    float bg[4];
    char hex[8];
    qv_style_background (QV_BACKGROUND_LIGHT, bg);
    g_snprintf (hex, sizeof hex, "#%02x%02x%02x", (int) lroundf (bg[0] * 255),
                (int) lroundf (bg[1] * 255), (int) lroundf (bg[2] * 255));
    assert_string_equal (svg.background_fill, hex);
  }
  svg_clear (&svg);
}

/* Painter's algorithm: an atom hidden behind another comes first in the
 * document, and a bond half pointing at the eye comes after its atom;
 * atoms behind the eye or off the picture have no disc. */
static void
test_svg_depth_order (void **state)
{
  /* Looking along −z: atom 1 (front, z = 2) covers atom 2 (z = −2) and
   * atom 3 bonds to atom 1 from in front of it (z = 3). Atom 4 is
   * behind the eye, atom 5 far off to the side. */
  static const guint z[] = { 8, 6, 1, 6, 6 };
  static const double xyz[] = {
    0.0, 0.0, 2.0,
    0.3, 0.0, -2.0,
    0.0, 0.5, 2.85,
    0.0, 0.0, 40.0,
    200.0, 0.0, 0.0,
  };
  g_autoptr (QvStructure) s = qvr_structure (G_N_ELEMENTS (z), z, xyz);
  QvSvgFigure fig = { .structure = s };
  g_autofree char *text = NULL;
  QvRenderOptions o;
  QvCamera camera;
  gsize len;
  Svg svg;
  const Shape *front, *back, *bond, *h;

  qv_camera_init (&camera);
  qv_camera_set_viewport (&camera, W, H);
  camera.distance = 15.0f;
  camera.scene_radius = 6.0f;
  qv_render_options_init (&o);
  o.transparent = TRUE;
  text = render_svg (&fig, &camera, &o, &len);
  svg_parse (&svg, text, len);
  front = svg_find (&svg, "atom-1");
  back = svg_find (&svg, "atom-2");
  h = svg_find (&svg, "atom-3");
  bond = svg_find (&svg, "bond-1-3-at-1");
  assert_non_null (front);
  assert_non_null (back);
  assert_non_null (h);
  assert_non_null (bond);
  /* The discs overlap in the picture: the order matters. */
  assert_true (hypot (front->cx - back->cx, front->cy - back->cy) < front->r + back->r);
  assert_true (back->order < front->order);
  assert_true (front->order < bond->order);
  assert_true (bond->order < h->order);
  assert_null (svg_find (&svg, "atom-4"));
  assert_null (svg_find (&svg, "atom-5"));
  assert_int_equal (svg_count (&svg, "circle", "atom"), 3);
  svg_clear (&svg);
}

/* The ghost: one more disc per atom, translucent, sorted with the rest;
 * arrows drawn where the displacement reaches the threshold only. */
static void
test_svg_ghost_and_arrows (void **state)
{
  static const guint z[] = { 8, 1, 1 };
  static const double xyz[] = { 0.0, 0.0, 0.0, 0.76, 0.59, 0.0, -0.76, 0.59, 0.0 };
  g_autoptr (QvStructure) s = qvr_structure (3, z, xyz);
  g_autofree float *pos = rest_positions (s);
  float arrows[9] = { 0.0f, -0.05f, 0.0f, 0.01f, 0.0f, 0.0f, 0.0f, 0.3f, 0.0f };
  float ghost[9];
  QvSvgFigure fig = { .structure = s, .positions = pos, .arrows = arrows, .ghost_positions = ghost };
  g_autofree char *text = NULL;
  QvRenderOptions o;
  QvCamera camera;
  gsize len;
  Svg svg;

  for (int k = 0; k < 9; k++)
    ghost[k] = pos[k] + arrows[k];
  fit (s, &camera, W, H);
  qv_render_options_init (&o);
  o.ghost_alpha = 0.35f;
  text = render_svg (&fig, &camera, &o, &len);
  svg_parse (&svg, text, len);
  assert_int_equal (svg_count (&svg, "circle", "atom"), 3);
  assert_int_equal (svg_count (&svg, "circle", "ghost"), 3);
  assert_true (fabs (svg_find (&svg, "ghost-2")->opacity - 0.35) < 1e-6);
  assert_true (fabs (svg_find (&svg, "atom-2")->opacity - 1.0) < 1e-6);
  /* Two O–H bonds, two halves each, and again for the ghost. */
  assert_int_equal (svg_count (&svg, "polygon", "bond"), 4);
  assert_int_equal (svg_count (&svg, "polygon", "bond ghost"), 4);
  /* 0.05 and 0.3 Å reach the default 0.02 Å threshold, 0.01 Å does not. */
  assert_int_equal (svg_count (&svg, "polygon", "arrow"), 2);
  assert_non_null (svg_find (&svg, "arrow-1"));
  assert_null (svg_find (&svg, "arrow-2"));
  svg_clear (&svg);
  g_clear_pointer (&text, g_free);

  /* Off: none of them. */
  o.ghost_alpha = 0.0f;
  o.arrows = FALSE;
  o.bonds = FALSE;
  text = render_svg (&fig, &camera, &o, &len);
  svg_parse (&svg, text, len);
  assert_int_equal (svg_count (&svg, "circle", "ghost"), 0);
  assert_int_equal (svg_count (&svg, "polygon", "arrow"), 0);
  assert_int_equal (svg_count (&svg, "polygon", "bond"), 0);
  svg_clear (&svg);
}

static void
test_svg_bad_input (void **state)
{
  static const guint z[] = { 8, 1 };
  static const double xyz[] = { 0.0, 0.0, 0.0, 0.96, 0.0, 0.0 };
  g_autoptr (QvStructure) s = qvr_structure (2, z, xyz);
  float pos[6] = { 0, 0, 0, 0.96f, NAN, 0 };
  QvSvgFigure fig = { .structure = s, .positions = pos };
  QvRenderOptions o;
  QvCamera camera;
  GError *error = NULL;
  gsize len = 0;

  qv_camera_init (&camera);
  qv_camera_set_viewport (&camera, W, H);
  qv_render_options_init (&o);
  assert_null (qv_svg_figure_render (&fig, &camera, &o, &len, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  assert_non_null (strstr (error->message, "atom 2"));
  g_clear_error (&error);
  pos[4] = 0.0f;
  camera.width = 0;
  assert_null (qv_svg_figure_render (&fig, &camera, &o, &len, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  g_clear_error (&error);
}

/* An invented water-like molecule with a mode, labels and a cell, for the
 * Python check (test_svg_figure.py). */
static int
write_sample (const char *path)
{
  static const guint z[] = { 8, 1, 1, 6, 1 };
  static const double xyz[] = {
    0.0, 0.0, 0.0, 0.76, 0.59, 0.0, -0.76, 0.59, 0.0, 0.2, -1.35, 0.4, 1.1, -1.8, 0.5,
  };
  g_autoptr (QvStructure) s = qvr_structure (G_N_ELEMENTS (z), z, xyz);
  g_autofree float *pos = rest_positions (s);
  float arrows[15] = { 0, -0.06f, 0, 0.3f, 0.2f, 0, -0.3f, 0.2f, 0.1f, 0, 0.1f, 0, 0.2f, 0, 0 };
  float ghost[15];
  QvSvgFigure fig = { .structure = s, .positions = pos, .arrows = arrows, .ghost_positions = ghost };
  g_autofree char *text = NULL;
  QvRenderOptions o;
  QvCamera camera;
  GError *error = NULL;
  gsize len;

  s->has_cell = TRUE;
  for (int a = 0; a < 3; a++)
    for (int k = 0; k < 3; k++)
      s->cell[a][k] = a == k ? 3.0 : 0.0;
  for (int k = 0; k < 15; k++)
    ghost[k] = pos[k] + arrows[k];
  qv_camera_init (&camera);
  qv_camera_set_viewport (&camera, 640, 480);
  qv_camera_fit (&camera, pos, s->n_atoms, 2.5f);
  qv_camera_roll (&camera, 0.3f);
  qv_render_options_init (&o);
  o.labels = TRUE;
  o.ghost_alpha = 0.35f;
  text = qv_svg_figure_render (&fig, &camera, &o, &len, &error);
  if (text == NULL || !g_file_set_contents (path, text, (gssize) len, &error))
    {
      g_printerr ("%s\n", error->message);
      return 1;
    }
  return 0;
}

/* main's first argument: the context's own samples (0: single-sample,
 * the renderer's multisampling by its option; 4: a multisampled
 * framebuffer, as `quaver picture` draws into). */
static int context_samples = 0;

static int
setup (void **state)
{
  ctx = qvr_context_new (W, H, context_samples, SS);
  return 0;
}

static int
teardown (void **state)
{
  qvr_context_free (ctx);
  return 0;
}

int
main (int argc, char **argv)
{
  const struct CMUnitTest svg_tests[] = {
    cmocka_unit_test (test_svg_disc_radius),
    cmocka_unit_test (test_svg_depth_order),
    cmocka_unit_test (test_svg_ghost_and_arrows),
    cmocka_unit_test (test_svg_bad_input),
  };
  const struct CMUnitTest gl_tests[] = {
    cmocka_unit_test (test_transparent_composites),
    cmocka_unit_test (test_ghost_blends),
    cmocka_unit_test (test_ghost_overlap_once),
    cmocka_unit_test (test_svg_matches_png),
  };
  int failed;

  if (argc == 3 && strcmp (argv[1], "svg") == 0)
    return write_sample (argv[2]);
  if (argc >= 2)
    context_samples = atoi (argv[1]);
  /* The SVG checks need no GL: run them before the context (which may
   * skip the whole program). */
  failed = cmocka_run_group_tests_name ("svg", svg_tests, NULL, NULL);
  if (failed)
    return failed;
  return cmocka_run_group_tests_name ("gl", gl_tests, setup, teardown);
}
