/* test-cull.c — occlusion culling (QvRenderOptions.occlusion_cull) leaves
 * the picture as it is: every structure, view, phase and edge treatment
 * drawn with culling must equal, pixel for pixel, the same frame drawn
 * without (the reference: the renderer drawing everything, itself checked
 * against geometry in test-render.c). Culling is conservative by
 * construction (qv-occlusion-private.h), so no tolerance is allowed; the
 * dense structures must also cull something, or the comparison would test
 * nothing.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include "qv-input.h"
#include "qv-render-test.h"
#include "qv-solver.h"

#define W 320
#define H 240

static QvrContext *ctx;

/* Atoms on a simple cubic grid, n per edge, @spacing Å apart, each moved
 * by up to ±@jitter Å (a fixed pseudo-random sequence), alternately carbon
 * and hydrogen (invented), and a smooth invented complex field. */
static QvStructure *
grid (int n, double spacing, double jitter, float **re, float **im)
{
  guint32 seed = 12345;
  gsize count = (gsize) n * n * n, i = 0;
  g_autofree guint *z = g_new (guint, count);
  g_autofree double *xyz = g_new (double, 3 * count);

  *re = g_new (float, 3 * count);
  *im = g_new (float, 3 * count);
  for (int a = 0; a < n; a++)
    for (int b = 0; b < n; b++)
      for (int c = 0; c < n; c++, i++)
        {
          z[i] = (a + b + c) % 2 ? 1 : 6;
          xyz[3 * i] = a * spacing;
          xyz[3 * i + 1] = b * spacing;
          xyz[3 * i + 2] = c * spacing;
          for (int k = 0; k < 3; k++)
            {
              seed = seed * 1664525u + 1013904223u;   /* Numerical Recipes' LCG */
              xyz[3 * i + k] += jitter * ((seed >> 8) / 8388608.0 - 1.0);
              (*re)[3 * i + k] = (float) (0.3 * sin (0.7 * a + 1.3 * k + 0.4 * c));
              (*im)[3 * i + k] = (float) (0.2 * cos (0.5 * b - 0.9 * k));
            }
        }
  return qvr_structure (count, z, xyz);
}

static void
camera_for (QvCamera *camera, const QvStructure *s, int view, gboolean ortho)
{
  g_autofree float *p = g_new (float, 3 * s->n_atoms);

  for (gsize i = 0; i < 3 * s->n_atoms; i++)
    p[i] = (float) s->atoms[i / 3].position[i % 3];
  qv_camera_init (camera);
  qv_camera_set_viewport (camera, ctx->draw_width, ctx->draw_height);
  if (view > 0)
    {
      /* Off-axis views, the second also zoomed in past the edges. */
      qv_camera_rotate_begin (camera, W * 0.5f, H * 0.5f);
      qv_camera_rotate_drag (camera, W * (0.5f + 0.11f * view), H * (0.5f - 0.07f * view));
      qv_camera_rotate_end (camera);
    }
  qv_camera_fit (camera, p, s->n_atoms, 1.0f);
  if (view == 2)
    qv_camera_zoom_at (camera, W * 0.4f, H * 0.6f, 2.2f);
  if (ortho)
    qv_camera_set_projection (camera, QV_CAMERA_ORTHOGRAPHIC);
}

/* Draws every combination with and without culling and compares; returns
 * the fewest atoms drawn (after culling) over them. */
static gsize
compare (const QvStructure *s, const float *re, const float *im, float atom_scale,
         const char *name)
{
  static const float phases[3] = { 0.0f, 1.3f, 2.9f };
  gsize n_px = (gsize) ctx->width * ctx->height * 4, fewest = G_MAXSIZE;
  g_autofree guint8 *reference = g_malloc (n_px);

  qv_renderer_set_structure (ctx->renderer, s);
  qv_renderer_set_mode (ctx->renderer, re, im, 1.0f);
  qv_renderer_set_highlight (ctx->renderer, (gssize) s->n_atoms / 2);
  for (int aa = 0; aa < 3; aa++)
    for (int view = 0; view < 3; view++)
      for (int ortho = 0; ortho < 2; ortho++)
        for (int ph = 0; ph < 3; ph++)
          {
            QvRenderOptions o;
            QvCamera camera;
            gsize drawn[3], differ = 0;

            qv_render_options_init (&o);
            o.atom_scale = atom_scale;
            o.antialias = aa == 1 ? QV_ANTIALIAS_EDGES : QV_ANTIALIAS_NONE;
            o.samples = aa == 2 ? 4 : 0;
            camera_for (&camera, s, view, ortho);
            qv_renderer_set_phase (ctx->renderer, phases[ph]);

            o.occlusion_cull = FALSE;
            qv_renderer_set_options (ctx->renderer, &o);
            qvr_render (ctx, &camera);
            memcpy (reference, ctx->rgba, n_px);
            qv_renderer_drawn_counts (ctx->renderer, drawn);
            assert_int_equal (drawn[0], s->n_atoms);

            o.occlusion_cull = TRUE;
            qv_renderer_set_options (ctx->renderer, &o);
            qvr_render (ctx, &camera);
            qv_renderer_drawn_counts (ctx->renderer, drawn);
            fewest = MIN (fewest, drawn[0]);
            for (gsize i = 0; i < n_px; i++)
              differ += reference[i] != ctx->rgba[i];
            if (differ > 0)
              {
                g_autofree char *file = g_strdup_printf ("cull-%s-%d-%d-%d-%d.ppm", name, aa, view, ortho, ph);
                qvr_save (ctx, file);
                print_error ("%s, aa %d, view %d, ortho %d, phase %g: %zu bytes differ (%zu of %zu atoms drawn)\n",
                             name, aa, view, ortho, (double) phases[ph], differ, drawn[0], s->n_atoms);
              }
            assert_int_equal (differ, 0);
          }
  return fewest;
}

/* The demo (ethanol, invented Hessian) with its highest mode. */
static void
test_demo (void **state)
{
  QvInputOptions io = { .demo = TRUE };
  QvSolveOptions so;
  GError *error = NULL;
  g_autoptr(QvInput) input = qv_input_load (&io, &error);
  g_autoptr(QvModeSet) modes = NULL;
  g_autofree double *cart = NULL;
  g_autofree float *re = NULL;
  gsize n, k;

  (void) state;
  assert_non_null (input);
  qv_solve_options_init (&so);
  modes = qv_solve (input->structure, g_steal_pointer (&input->hessian), &so, NULL, &error);
  assert_non_null (modes);
  n = input->structure->n_atoms;
  k = modes->n_modes - 1;
  cart = g_new (double, 3 * n);
  re = g_new (float, 3 * n);
  qv_mode_set_cartesian (modes, k, cart);
  for (gsize i = 0; i < 3 * n; i++)
    re[i] = (float) cart[i] * (float) qv_mode_set_display_amplitude (modes, k, 0, 1.0, NULL);
  compare (input->structure, re, NULL, 1.0f, "demo");
}

/* A dense grid (bonded neighbours, 1.5 Å): with space-filling radii most
 * of its inside is hidden, and must be culled; with the default radii too. */
static void
test_dense (void **state)
{
  g_autofree float *re = NULL, *im = NULL;
  g_autoptr(QvStructure) s = grid (9, 1.5, 0.0, &re, &im);

  (void) state;
  assert_true (compare (s, re, im, 2.5f, "dense-filled") < s->n_atoms * 3 / 4);
  compare (s, re, im, 1.0f, "dense");
}

/* The same disordered (±0.6 Å): depths no longer come in layers. */
static void
test_disordered (void **state)
{
  g_autofree float *re = NULL, *im = NULL;
  g_autoptr(QvStructure) s = grid (9, 1.5, 0.6, &re, &im);

  (void) state;
  assert_true (compare (s, re, im, 2.5f, "disordered-filled") < s->n_atoms * 3 / 4);
}

/* A sparse grid (4 Å, no bonds): everything shows, nothing may go. */
static void
test_sparse (void **state)
{
  g_autofree float *re = NULL, *im = NULL;
  g_autoptr(QvStructure) s = grid (6, 4.0, 0.0, &re, &im);

  (void) state;
  compare (s, re, im, 1.0f, "sparse");
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_demo),
    cmocka_unit_test (test_dense),
    cmocka_unit_test (test_disordered),
    cmocka_unit_test (test_sparse),
  };
  int failed;

  ctx = qvr_context_new (W, H, 0, 1);
  failed = cmocka_run_group_tests (tests, NULL, NULL);
  qvr_context_free (ctx);
  return failed;
}
