/* test-pick.c — picking what is on screen: the atom under a pixel, from
 * the renderer's positions at the current phase, against the drawn image.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>
#include "qv-render-test.h"
#include "qv-style.h"

#define W 320
#define H 320

static QvrContext *ctx;

/* Six atoms of different, well separated hues (N, O, S, P, Cl, F) on an
 * irregular arrangement, far enough apart that no bonds form. */
static const guint zs[6] = { 7, 8, 16, 15, 17, 9 };
static const double xyz[18] = {
  0.0, 0.0, 0.0,   2.6, 0.4, -0.5,   -2.2, 1.9, 0.8,
  0.7, -2.5, 1.6,  -1.0, -1.1, -2.7,  1.9, 2.4, 2.1,
};

static void
check_view (QvCamera *camera, const char *name)
{
  const float *pos, *radii;
  float bg[4];
  int checked = 0;

  qvr_render (ctx, camera);
  qvr_save (ctx, name);
  pos = qv_renderer_positions (ctx->renderer);
  radii = qv_renderer_radii (ctx->renderer);
  for (gsize i = 0; i < 6; i++)
    {
      float x, y, hue, chroma, want, wc, rgb[3];
      gssize hit;
      gboolean hidden = FALSE;
      const guint8 *p;

      assert_true (qv_camera_project (camera, pos + 3 * i, &x, &y, NULL));
      hit = qv_camera_pick (camera, x, y, pos, radii, 6);
      /* Whatever is picked is what the picture shows there. */
      assert_true (hit >= 0);
      p = qvr_pixel (ctx, (int) (x * W / camera->width), (int) (y * H / camera->height));
      for (int k = 0; k < 3; k++)
        rgb[k] = p[k] / 255.0f;
      qvr_hue (rgb, &hue, &chroma);
      qvr_hue (qv_style_element (zs[hit])->rgb, &want, &wc);
      if (qvr_hue_distance (hue, want) >= 15.0f)
        print_error ("%s: atom %zu picks %zd, pixel hue %.0f, its hue %.0f\n",
                     name, i, hit, hue, want);
      assert_true (qvr_hue_distance (hue, want) < 15.0f);
      /* Its own centre picks the atom unless a nearer one covers it. */
      for (gsize j = 0; j < 6; j++)
        if (j != i && (gssize) j == hit)
          hidden = TRUE;
      if (!hidden)
        {
          assert_int_equal (hit, (gssize) i);
          checked++;
        }
    }
  assert_true (checked >= 4);
  /* The corners are background and pick nothing. */
  qv_style_background (QV_BACKGROUND_LIGHT, bg);
  assert_int_equal (qv_camera_pick (camera, 1, 1, pos, radii, 6), -1);
  assert_int_equal (qv_camera_pick (camera, camera->width - 2, camera->height - 2, pos, radii, 6), -1);
}

static void
test_pick_views (void **state)
{
  g_autoptr(QvStructure) s = qvr_structure (6, zs, xyz);
  float pts[18];
  QvRenderOptions opt;
  char name[64];

  qv_render_options_init (&opt);
  opt.depth_cue = FALSE;
  opt.atom_scale = 1.6f;
  qv_renderer_set_options (ctx->renderer, &opt);
  qv_renderer_set_structure (ctx->renderer, s);
  assert_int_equal (qv_renderer_n_bonds (ctx->renderer), 0);
  for (int i = 0; i < 18; i++)
    pts[i] = (float) xyz[i];
  for (int proj = 0; proj < 2; proj++)
    for (int view = 0; view < 4; view++)
      {
        QvCamera camera;
        qv_camera_init (&camera);
        qv_camera_set_viewport (&camera, ctx->draw_width, ctx->draw_height);
        qv_camera_set_projection (&camera, proj ? QV_CAMERA_ORTHOGRAPHIC : QV_CAMERA_PERSPECTIVE);
        if (view < 3)
          qv_camera_view_along (&camera, (QvViewAxis) view);
        else
          {
            qv_camera_rotate_begin (&camera, 100, 120);
            qv_camera_rotate_drag (&camera, 190, 60);
          }
        qv_camera_fit (&camera, pts, 6, 1.5f);
        g_snprintf (name, sizeof name, "pick-%s-%d.ppm", proj ? "ortho" : "persp", view);
        check_view (&camera, name);
      }
}

/* Picking follows the animation: with a mode set, the positions are those
 * of the current phase. */
static void
test_pick_animated (void **state)
{
  g_autoptr(QvStructure) s = qvr_structure (6, zs, xyz);
  float re[18] = { 0 }, pts[18], x, y;
  QvCamera camera;
  const float *pos;

  qv_renderer_set_structure (ctx->renderer, s);
  re[0] = 1.0f;                       /* atom 0 moves along x */
  qv_renderer_set_mode (ctx->renderer, re, NULL, 1.2f);
  for (int i = 0; i < 18; i++)
    pts[i] = (float) xyz[i];
  qv_camera_init (&camera);
  qv_camera_set_viewport (&camera, ctx->draw_width, ctx->draw_height);
  qv_camera_fit (&camera, pts, 6, 2.0f);
  qv_renderer_set_phase (ctx->renderer, 0.0f);
  pos = qv_renderer_positions (ctx->renderer);
  assert_true (fabsf (pos[0] - 1.2f) < 1e-6f);
  assert_true (qv_camera_project (&camera, pos, &x, &y, NULL));
  assert_int_equal (qv_camera_pick (&camera, x, y, pos, qv_renderer_radii (ctx->renderer), 6), 0);
  /* Half a period later the atom is at −1.2: its old place is empty. */
  qv_renderer_set_phase (ctx->renderer, (float) G_PI);
  pos = qv_renderer_positions (ctx->renderer);
  assert_true (fabsf (pos[0] + 1.2f) < 1e-6f);
  assert_int_equal (qv_camera_pick (&camera, x, y, pos, qv_renderer_radii (ctx->renderer), 6), -1);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_pick_views),
    cmocka_unit_test (test_pick_animated),
  };
  int rc;

  ctx = qvr_context_new (W, H, 4, 1);
  rc = cmocka_run_group_tests (tests, NULL, NULL);
  qvr_context_free (ctx);
  return rc;
}
