/* test-antialias.c — the edge treatments of the renderer compared with a
 * reference: the same scene drawn 4 × 4 supersampled and box-filtered (the
 * pixel's covered fraction, common practice for judging antialiasing).
 * Hard edges (QV_ANTIALIAS_NONE) must be off by up to a pixel's full
 * contrast along every silhouette; the analytic edges (the default) and
 * the renderer's own 4× multisampling must be close to the reference,
 * with no halos (which would show as large errors too).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>
#include "qv-input.h"
#include "qv-render-test.h"
#include "qv-solver.h"

#define W 240
#define H 180

static QvrContext *one, *reference;

typedef struct {
  double mean;        /* mean absolute difference per channel, 0..1 */
  gsize large;        /* pixels off by more than 0.2 in some channel */
} Error;

static Error
compare (const guint8 *a, const guint8 *b)
{
  Error e = { 0.0, 0 };

  for (gsize i = 0; i < (gsize) W * H; i++)
    {
      int worst = 0;
      for (int k = 0; k < 3; k++)
        {
          int d = abs ((int) a[4 * i + k] - (int) b[4 * i + k]);
          e.mean += d / 255.0;
          worst = MAX (worst, d);
        }
      if (worst > 0.2 * 255)
        e.large++;
    }
  e.mean /= 3.0 * W * H;
  return e;
}

/* The demo (ethanol) with its highest mode's arrows, turned so that atoms
 * overlap atoms and bonds, at a phase off the rest geometry. */
static void
scene (QvrContext *c, QvAntialias aa, int samples, guint8 *out)
{
  QvInputOptions io = { .demo = TRUE };
  QvSolveOptions so;
  GError *error = NULL;
  g_autoptr(QvInput) input = qv_input_load (&io, &error);
  g_autoptr(QvModeSet) modes = NULL;
  g_autofree double *cart = NULL;
  g_autofree float *re = NULL, *p = NULL;
  QvRenderOptions opt;
  QvCamera camera;
  gsize n, k;

  assert_non_null (input);
  qv_solve_options_init (&so);
  modes = qv_solve (input->structure, g_steal_pointer (&input->hessian), &so, NULL, &error);
  assert_non_null (modes);
  n = input->structure->n_atoms;
  k = modes->n_modes - 1;
  cart = g_new (double, 3 * n);
  re = g_new (float, 3 * n);
  p = g_new (float, 3 * n);
  qv_mode_set_cartesian (modes, k, cart);
  for (gsize i = 0; i < 3 * n; i++)
    {
      re[i] = (float) cart[i];
      p[i] = (float) input->structure->atoms[i / 3].position[i % 3];
    }

  qv_offscreen_make_current (c->offscreen);
  qv_render_options_init (&opt);
  opt.antialias = aa;
  opt.samples = samples;
  qv_renderer_set_options (c->renderer, &opt);
  qv_renderer_set_structure (c->renderer, input->structure);
  qv_renderer_set_mode (c->renderer, re, NULL,
                        (float) qv_mode_set_display_amplitude (modes, k, 0, 1.0, NULL));
  qv_renderer_set_phase (c->renderer, 0.7f);
  qv_camera_init (&camera);
  qv_camera_set_viewport (&camera, c->draw_width, c->draw_height);
  qv_camera_rotate_begin (&camera, camera.width * 0.5f, camera.height * 0.5f);
  qv_camera_rotate_drag (&camera, camera.width * 0.62f, camera.height * 0.41f);
  qv_camera_rotate_end (&camera);
  qv_camera_fit (&camera, p, n, 1.0f);
  camera.distance *= 0.6f;    /* closer: more silhouette pixels */
  qvr_render (c, &camera);
  memcpy (out, c->rgba, (gsize) W * H * 4);
}

static void
test_edges (void **state)
{
  g_autofree guint8 *ref = g_malloc ((gsize) W * H * 4);
  g_autofree guint8 *none = g_malloc ((gsize) W * H * 4);
  g_autofree guint8 *edges = g_malloc ((gsize) W * H * 4);
  g_autofree guint8 *msaa = g_malloc ((gsize) W * H * 4);
  Error e_none, e_edges, e_msaa;

  scene (reference, QV_ANTIALIAS_NONE, 0, ref);
  qvr_save (reference, "aa-reference.ppm");
  scene (one, QV_ANTIALIAS_NONE, 0, none);
  qvr_save (one, "aa-none.ppm");
  scene (one, QV_ANTIALIAS_EDGES, 0, edges);
  qvr_save (one, "aa-edges.ppm");
  scene (one, QV_ANTIALIAS_EDGES, 4, msaa);
  qvr_save (one, "aa-msaa4.ppm");

  e_none = compare (none, ref);
  e_edges = compare (edges, ref);
  e_msaa = compare (msaa, ref);
  g_test_message ("mean |error| none %.4f edges %.4f msaa4 %.4f; pixels off by > 0.2: %zu %zu %zu",
                  e_none.mean, e_edges.mean, e_msaa.mean, e_none.large, e_edges.large, e_msaa.large);
  fprintf (stderr, "mean |error| none %.4f edges %.4f msaa4 %.4f; pixels off by > 0.2: %zu %zu %zu\n",
           e_none.mean, e_edges.mean, e_msaa.mean, e_none.large, e_edges.large, e_msaa.large);
  /* Hard edges: many pixels far off along the silhouettes. */
  assert_true (e_none.large > 40);
  /* Analytic edges and 4× MSAA: a fraction of those, and a smaller mean. */
  assert_true (e_edges.large * 4 < e_none.large);
  assert_true (e_msaa.large * 4 < e_none.large);
  assert_true (e_edges.mean < 0.7 * e_none.mean);
  assert_true (e_msaa.mean < 0.7 * e_none.mean);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_edges),
  };
  int rc;

  reference = qvr_context_new (W, H, 0, 4);
  one = qvr_context_new (W, H, 0, 1);
  rc = cmocka_run_group_tests (tests, NULL, NULL);
  qvr_context_free (one);
  qvr_context_free (reference);
  return rc;
}
