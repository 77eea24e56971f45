/* test-render.c — the renderer drawn offscreen (EGL surfaceless, no
 * display) and checked pixel by pixel.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include "qv-input.h"
#include "qv-renderer-private.h"
#include "qv-render-test.h"
#include "qv-solver.h"
#include "qv-style.h"

#define W 320
#define H 240

static QvrContext *ctx;
/* The edge treatment every test draws with (main's second argument). */
static QvAntialias test_aa = QV_ANTIALIAS_NONE;

static void
options_init (QvRenderOptions *o)
{
  qv_render_options_init (o);
  o->antialias = test_aa;
}

static float
colour_distance (const guint8 *p, const float rgb[3])
{
  float d = 0.0f;
  for (int k = 0; k < 3; k++)
    d = MAX (d, fabsf (p[k] / 255.0f - rgb[k]));
  return d;
}

static void
default_options (void)
{
  QvRenderOptions o;
  options_init (&o);
  qv_renderer_set_options (ctx->renderer, &o);
}

/* The demo with one of its modes, as the app shows it. */
typedef struct {
  QvInput *input;
  QvModeSet *modes;
} Demo;

static void
demo_load (Demo *d)
{
  QvInputOptions io = { .demo = TRUE };
  QvSolveOptions so;
  GError *error = NULL;

  d->input = qv_input_load (&io, &error);
  assert_non_null (d->input);
  qv_solve_options_init (&so);
  d->modes = qv_solve (d->input->structure, g_steal_pointer (&d->input->hessian), &so,
                       NULL, &error);
  assert_non_null (d->modes);
}

static void
demo_free (Demo *d)
{
  qv_mode_set_free (d->modes);
  qv_input_free (d->input);
}

static void
demo_camera (const QvStructure *s, QvCamera *camera)
{
  g_autofree float *p = g_new (float, 3 * s->n_atoms);

  for (gsize i = 0; i < 3 * s->n_atoms; i++)
    p[i] = (float) s->atoms[i / 3].position[i % 3];
  qv_camera_init (camera);
  qv_camera_set_viewport (camera, ctx->draw_width, ctx->draw_height);
  qv_camera_fit (camera, p, s->n_atoms, 1.0f);
}

/* Background at the corners; the oxygen's own hue at its projected centre
 * (shading changes lightness, not hue); hydrogen light. */
static void
test_demo_colours (void **state)
{
  Demo d;
  QvCamera camera;
  float bg[4], rgb[3], hue, chroma, ohue, ochroma, x, y;
  const float *o;

  default_options ();
  demo_load (&d);
  qv_renderer_set_structure (ctx->renderer, d.input->structure);
  assert_int_equal (qv_renderer_n_atoms (ctx->renderer), 9);
  /* Ethanol: C–C, C–O, O–H and five C–H (chemistry). */
  assert_int_equal (qv_renderer_n_bonds (ctx->renderer), 8);
  demo_camera (d.input->structure, &camera);
  qvr_render (ctx, &camera);
  qvr_save (ctx, "demo-light.ppm");

  qv_style_background (QV_BACKGROUND_LIGHT, bg);
  assert_true (colour_distance (qvr_pixel (ctx, 0, 0), bg) < 1.5f / 255);
  assert_true (colour_distance (qvr_pixel (ctx, W - 1, 0), bg) < 1.5f / 255);
  assert_true (colour_distance (qvr_pixel (ctx, 0, H - 1), bg) < 1.5f / 255);
  assert_true (colour_distance (qvr_pixel (ctx, W - 1, H - 1), bg) < 1.5f / 255);

  /* Atom 3 (index 2) is the oxygen: the pixel at its projected centre
   * (lit, away from the highlight). */
  o = qv_style_element (8)->rgb;
  qvr_hue (o, &ohue, &ochroma);
  assert_true (qv_camera_project (&camera, qv_renderer_positions (ctx->renderer) + 6, &x, &y, NULL));
  qvr_brightest (ctx, (int) (x * W / camera.width), (int) (y * H / camera.height), 0, rgb);
  qvr_hue (rgb, &hue, &chroma);
  assert_true (qvr_hue_distance (hue, ohue) < 10.0f);
  assert_true (chroma > 0.4f);
  /* A hydrogen (index 3) is nearly white at its brightest. */
  assert_true (qv_camera_project (&camera, qv_renderer_positions (ctx->renderer) + 9, &x, &y, NULL));
  qvr_brightest (ctx, (int) (x * W / camera.width), (int) (y * H / camera.height), 3, rgb);
  assert_true (MIN (rgb[0], MIN (rgb[1], rgb[2])) > 0.8f);

  /* The dark background is dark at the corners. */
  {
    QvRenderOptions opt = *qv_renderer_get_options (ctx->renderer);
    opt.background = QV_BACKGROUND_DARK;
    qv_renderer_set_options (ctx->renderer, &opt);
    qvr_render (ctx, &camera);
    qvr_save (ctx, "demo-dark.ppm");
    qv_style_background (QV_BACKGROUND_DARK, bg);
    assert_true (colour_distance (qvr_pixel (ctx, 0, 0), bg) < 1.5f / 255);
  }
  demo_free (&d);
}

static gsize
count_different (const guint8 *a, const guint8 *b, gsize n)
{
  gsize diff = 0;
  for (gsize i = 0; i < n; i++)
    if (abs (a[4 * i] - b[4 * i]) + abs (a[4 * i + 1] - b[4 * i + 1]) + abs (a[4 * i + 2] - b[4 * i + 2]) > 24)
      diff++;
  return diff;
}

/* A mode animates: phase 0 (full displacement) and π/2 (rest) differ, and
 * the CPU positions follow r₀ + A·Re·cos φ. */
static void
test_demo_animation (void **state)
{
  Demo d;
  QvCamera camera;
  gsize n, k;
  g_autofree double *cart = NULL;
  g_autofree float *re = NULL;
  g_autofree guint8 *first = NULL;
  double amp;
  const float *pos;

  default_options ();
  demo_load (&d);
  n = d.input->structure->n_atoms;
  k = d.modes->n_modes - 1;               /* the highest: an X–H stretch */
  cart = g_new (double, 3 * n);
  re = g_new (float, 3 * n);
  qv_mode_set_cartesian (d.modes, k, cart);
  amp = qv_mode_set_display_amplitude (d.modes, k, 0, 2.0, NULL);
  for (gsize i = 0; i < 3 * n; i++)
    re[i] = (float) cart[i];
  qv_renderer_set_structure (ctx->renderer, d.input->structure);
  qv_renderer_set_mode (ctx->renderer, re, NULL, (float) amp);
  demo_camera (d.input->structure, &camera);

  qv_renderer_set_phase (ctx->renderer, 0.0f);
  pos = qv_renderer_positions (ctx->renderer);
  for (gsize i = 0; i < 3 * n; i++)
    assert_true (fabs (pos[i] - (d.input->structure->atoms[i / 3].position[i % 3] + amp * cart[i])) < 1e-4);
  qvr_render (ctx, &camera);
  qvr_save (ctx, "demo-phase0.ppm");
  first = g_memdup2 (ctx->rgba, (gsize) W * H * 4);

  qv_renderer_set_phase (ctx->renderer, (float) G_PI_2);
  pos = qv_renderer_positions (ctx->renderer);
  for (gsize i = 0; i < 3 * n; i++)
    assert_true (fabs (pos[i] - d.input->structure->atoms[i / 3].position[i % 3]) < 1e-4);
  qvr_render (ctx, &camera);
  qvr_save (ctx, "demo-phase90.ppm");
  assert_true (count_different (first, ctx->rgba, (gsize) W * H) > 100);

  /* The same phase gives the same picture. */
  qv_renderer_set_phase (ctx->renderer, 0.0f);
  qvr_render (ctx, &camera);
  assert_int_equal (count_different (first, ctx->rgba, (gsize) W * H), 0);
  demo_free (&d);
}

/* Two overlapping spheres: the nearer one's colour wins where they
 * overlap, whichever is drawn first (true per-pixel depth). */
static void
test_depth_order (void **state)
{
  QvRenderOptions opt;
  QvCamera camera;

  options_init (&opt);
  opt.bonds = FALSE;
  opt.depth_cue = FALSE;
  qv_renderer_set_options (ctx->renderer, &opt);
  for (int order = 0; order < 2; order++)
    for (int front = 0; front < 2; front++)
      {
        /* Oxygen (red) and sulfur (yellow); the overlap is at x = 0.25. */
        const guint z[2] = { order ? 16 : 8, order ? 8 : 16 };
        double zo = front == 0 ? 0.6 : -0.6;   /* the camera looks down −z */
        double xyz[6] = { 0, 0, 0, 0.5, 0, 0 };
        g_autoptr(QvStructure) s = NULL;
        float p[3] = { 0.25f, 0.0f, 0.0f }, x, y, rgb[3], hue, chroma, want, wc;
        guint near_z;

        xyz[3 * (order ? 0 : 1) + 2] = zo;      /* sulfur moves */
        s = qvr_structure (2, z, xyz);
        near_z = front == 0 ? 16 : 8;
        qv_renderer_set_structure (ctx->renderer, s);
        qv_camera_init (&camera);
        camera.distance = 6.0f;
        camera.scene_radius = 2.0f;
        qv_camera_set_viewport (&camera, ctx->draw_width, ctx->draw_height);
        qvr_render (ctx, &camera);
        if (order == 0 && front == 0)
          qvr_save (ctx, "depth-order.ppm");
        /* The overlap pixel at the projection of the sulfur side point. */
        p[2] = 0.0f;
        assert_true (qv_camera_project (&camera, p, &x, &y, NULL));
        qvr_brightest (ctx, (int) (x * W / camera.width), (int) (y * H / camera.height), 1, rgb);
        qvr_hue (rgb, &hue, &chroma);
        qvr_hue (qv_style_element (near_z)->rgb, &want, &wc);
        if (qvr_hue_distance (hue, want) >= 8.0f)
          print_error ("order %d front %d: hue %.1f, expected %.1f\n", order, front, hue, want);
        assert_true (qvr_hue_distance (hue, want) < 8.0f);
      }
}

/* Bonds are split at the midpoint: the carbon half grey, the oxygen half
 * red. */
static void
test_bond_split (void **state)
{
  static const guint z[2] = { 6, 8 };
  const double xyz[6] = { -0.715, 0, 0, 0.715, 0, 0 };   /* C–O 1.43 Å */
  g_autoptr(QvStructure) s = qvr_structure (2, z, xyz);
  QvRenderOptions opt;
  QvCamera camera;
  float x, y, rgb[3], hue, chroma, ohue, oc;

  options_init (&opt);
  opt.atom_scale = 0.4f;
  opt.depth_cue = FALSE;
  qv_renderer_set_options (ctx->renderer, &opt);
  qv_renderer_set_structure (ctx->renderer, s);
  assert_int_equal (qv_renderer_n_bonds (ctx->renderer), 1);
  qv_camera_init (&camera);
  camera.distance = 5.0f;
  camera.scene_radius = 2.0f;
  qv_camera_set_viewport (&camera, ctx->draw_width, ctx->draw_height);
  qvr_render (ctx, &camera);
  qvr_save (ctx, "bond-split.ppm");
  qvr_hue (qv_style_element (8)->rgb, &ohue, &oc);
  assert_true (qv_camera_project (&camera, (float[3]) { -0.3f, 0, 0 }, &x, &y, NULL));
  qvr_brightest (ctx, (int) (x * W / camera.width), (int) (y * H / camera.height), 1, rgb);
  qvr_hue (rgb, &hue, &chroma);
  assert_true (chroma < 0.12f);                       /* carbon grey */
  assert_true (qv_camera_project (&camera, (float[3]) { 0.3f, 0, 0 }, &x, &y, NULL));
  qvr_brightest (ctx, (int) (x * W / camera.width), (int) (y * H / camera.height), 1, rgb);
  qvr_hue (rgb, &hue, &chroma);
  assert_true (chroma > 0.3f && qvr_hue_distance (hue, ohue) < 10.0f);

  /* Without bonds the middle shows the background. */
  opt.bonds = FALSE;
  qv_renderer_set_options (ctx->renderer, &opt);
  qvr_render (ctx, &camera);
  {
    float bg[4];
    qv_style_background (opt.background, bg);
    assert_true (qv_camera_project (&camera, (float[3]) { 0.0f, 0, 0 }, &x, &y, NULL));
    assert_true (colour_distance (qvr_pixel (ctx, (int) (x * W / camera.width),
                                             (int) (y * H / camera.height)), bg) < 2.0f / 255);
  }
}

/* An arrow in the accent colour along the displacement, hidden below the
 * threshold. */
static void
test_arrows (void **state)
{
  static const guint z[1] = { 6 };
  const double xyz[3] = { 0, 0, 0 };
  g_autoptr(QvStructure) s = qvr_structure (1, z, xyz);
  const float re[3] = { 1.0f, 0.0f, 0.0f };
  QvRenderOptions opt;
  QvCamera camera;
  float x, y, rgb[3], accent[3], hue, chroma, ahue, ac, bg[4];
  int px, py;

  options_init (&opt);
  opt.depth_cue = FALSE;
  opt.arrow_scale = 2.0f;
  qv_renderer_set_options (ctx->renderer, &opt);
  qv_renderer_set_structure (ctx->renderer, s);
  qv_renderer_set_mode (ctx->renderer, re, NULL, 0.5f);   /* 0.5 Å: a 1 Å arrow */
  qv_renderer_set_phase (ctx->renderer, (float) G_PI_2);  /* atom at rest */
  qv_camera_init (&camera);
  camera.distance = 6.0f;
  camera.scene_radius = 2.0f;
  qv_camera_set_viewport (&camera, ctx->draw_width, ctx->draw_height);
  qvr_render (ctx, &camera);
  qvr_save (ctx, "arrow.ppm");
  qv_style_arrow (opt.background, accent);
  qvr_hue (accent, &ahue, &ac);
  /* The shaft, past the sphere's surface (radius 0.43 Å, arrow from 0.85 r). */
  assert_true (qv_camera_project (&camera, (float[3]) { 0.6f, 0, 0 }, &x, &y, NULL));
  px = (int) (x * W / camera.width);
  py = (int) (y * H / camera.height);
  qvr_brightest (ctx, px, py, 0, rgb);
  qvr_hue (rgb, &hue, &chroma);
  assert_true (qvr_hue_distance (hue, ahue) < 12.0f && chroma > 0.25f);
  /* Nothing beyond its tip at 0.85·0.43 + 1.0 Å. */
  assert_true (qv_camera_project (&camera, (float[3]) { 1.55f, 0, 0 }, &x, &y, NULL));
  qv_style_background (opt.background, bg);
  assert_true (colour_distance (qvr_pixel (ctx, (int) (x * W / camera.width),
                                           (int) (y * H / camera.height)), bg) < 2.0f / 255);
  /* Below the threshold: no arrow. */
  opt.arrow_threshold = 0.6f;
  qv_renderer_set_options (ctx->renderer, &opt);
  qvr_render (ctx, &camera);
  assert_true (colour_distance (qvr_pixel (ctx, px, py), bg) < 2.0f / 255);
}

/* Cell edges in the foreground colour. */
static void
test_cell (void **state)
{
  static const guint z[1] = { 14 };
  const double xyz[3] = { 2.5, 2.5, 2.5 };
  g_autoptr(QvStructure) s = qvr_structure (1, z, xyz);
  QvRenderOptions opt;
  QvCamera camera;
  float fg[3], x, y, best = 1.0f;
  const float pts[6] = { 0, 0, 0, 5, 5, 5 };

  s->has_cell = TRUE;
  for (int k = 0; k < 3; k++)
    s->cell[k][k] = 5.0;
  options_init (&opt);
  opt.depth_cue = FALSE;
  qv_renderer_set_options (ctx->renderer, &opt);
  qv_renderer_set_structure (ctx->renderer, s);
  qv_camera_init (&camera);
  qv_camera_set_viewport (&camera, ctx->draw_width, ctx->draw_height);
  qv_camera_fit (&camera, pts, 2, 0.5f);
  qv_camera_rotate_begin (&camera, camera.width * 0.5f, camera.height * 0.5f);
  qv_camera_rotate_drag (&camera, camera.width * 0.62f, camera.height * 0.58f);
  qv_camera_rotate_end (&camera);
  qvr_render (ctx, &camera);
  qvr_save (ctx, "cell.ppm");
  qv_style_foreground (opt.background, fg);
  /* The middle of the edge from the origin along a. */
  assert_true (qv_camera_project (&camera, (float[3]) { 2.5f, 0, 0 }, &x, &y, NULL));
  for (int j = -1; j <= 1; j++)
    for (int i = -1; i <= 1; i++)
      best = MIN (best, colour_distance (qvr_pixel (ctx, (int) (x * W / camera.width) + i,
                                                    (int) (y * H / camera.height) + j), fg));
  assert_true (best < 0.25f);
}

/* Labels: the picture changes where the label is, and the label's ink is
 * the foreground colour. */
static void
test_labels (void **state)
{
  static const guint z[1] = { 8 };
  const double xyz[3] = { 0, 0, 0 };
  g_autoptr(QvStructure) s = qvr_structure (1, z, xyz);
  g_autofree guint8 *plain = NULL;
  QvRenderOptions opt;
  QvCamera camera;
  float fg[3], best = 1.0f;

  options_init (&opt);
  qv_renderer_set_options (ctx->renderer, &opt);
  qv_renderer_set_structure (ctx->renderer, s);
  qv_camera_init (&camera);
  camera.distance = 4.0f;
  camera.scene_radius = 1.0f;
  qv_camera_set_viewport (&camera, ctx->draw_width, ctx->draw_height);
  qvr_render (ctx, &camera);
  plain = g_memdup2 (ctx->rgba, (gsize) W * H * 4);
  opt.labels = TRUE;
  qv_renderer_set_options (ctx->renderer, &opt);
  qvr_render (ctx, &camera);
  qvr_save (ctx, "label.ppm");
  assert_true (count_different (plain, ctx->rgba, (gsize) W * H) > 20);
  qv_style_foreground (opt.background, fg);
  for (int j = -8; j <= 8; j++)
    for (int i = -12; i <= 12; i++)
      best = MIN (best, colour_distance (qvr_pixel (ctx, W / 2 + i, H / 2 + j), fg));
  assert_true (best < 0.1f);
}

/* A shader that does not compile: the message names the file and the
 * line of the error. */
static void
test_shader_error (void **state)
{
  static const char vert[] =
    "#version 330 core\n"
    "void main () { gl_Position = vec4 (0.0); }\n";
  static const char frag[] =
    "#version 330 core\n"
    "out vec4 c;\n"
    "void main () {\n"
    "  c = vec4 (undeclared_thing, 1.0);\n"
    "}\n";
  GError *error = NULL;
  GLuint p;

  p = qv_shader_program_from_source ("good.vert", vert, "broken.frag", frag, &error);
  assert_int_equal (p, 0);
  assert_non_null (error);
  assert_true (g_error_matches (error, QV_RENDER_ERROR, QV_RENDER_ERROR_SHADER));
  g_test_message ("%s", error->message);
  assert_non_null (strstr (error->message, "broken.frag:4:"));
  assert_non_null (strstr (error->message, "undeclared_thing"));
  g_clear_error (&error);
  p = qv_shader_program_from_source ("good.vert", vert, "good.frag",
                                     "#version 330 core\nout vec4 c;\nvoid main () { c = vec4 (1.0); }\n",
                                     &error);
  assert_true (p != 0);
  assert_null (error);
  glDeleteProgram (p);
}

/* With arguments: that many MSAA samples in the offscreen framebuffer, and
 * "edges" for the analytic antialiasing on a one-sample framebuffer. */
int
main (int argc, char **argv)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_demo_colours),
    cmocka_unit_test (test_demo_animation),
    cmocka_unit_test (test_depth_order),
    cmocka_unit_test (test_bond_split),
    cmocka_unit_test (test_arrows),
    cmocka_unit_test (test_cell),
    cmocka_unit_test (test_labels),
    cmocka_unit_test (test_shader_error),
  };
  int rc;

  ctx = qvr_context_new (W, H, argc > 1 ? atoi (argv[1]) : 4, 1);
  if (argc > 2 && strcmp (argv[2], "edges") == 0)
    test_aa = QV_ANTIALIAS_EDGES;
  if (argc > 1)
    ctx->save_prefix = "1x-";
  g_print ("GL renderer: %s, %d samples\n", qv_offscreen_renderer_name (ctx->offscreen),
           argc > 1 ? atoi (argv[1]) : 4);
  rc = cmocka_run_group_tests (tests, NULL, NULL);
  qvr_context_free (ctx);
  return rc;
}
