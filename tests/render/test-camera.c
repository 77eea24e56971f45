/* test-camera.c — the camera's math (no GL).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include "qv-camera.h"

static void
rotation (const QvCamera *c, mat4 r)
{
  glm_quat_mat4 ((float *) c->orientation, r);
}

static void
assert_orthonormal (const QvCamera *c)
{
  mat4 r;

  rotation (c, r);
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      {
        float d = r[i][0] * r[j][0] + r[i][1] * r[j][1] + r[i][2] * r[j][2];
        assert_true (fabsf (d - (i == j ? 1.0f : 0.0f)) < 1e-5f);
      }
  /* A rotation, not a reflection. */
  assert_true (fabsf (glm_mat4_det (r) - 1.0f) < 1e-5f);
}

static void
test_zoom_keeps_cursor_point (void **state)
{
  for (int proj = 0; proj < 2; proj++)
    {
      QvCamera c;
      vec3 o, d, back, hit;
      float x0, y0, x1, y1, t;
      mat4 r;

      qv_camera_init (&c);
      qv_camera_set_viewport (&c, 800, 600);
      qv_camera_set_projection (&c, proj ? QV_CAMERA_ORTHOGRAPHIC : QV_CAMERA_PERSPECTIVE);
      c.target[0] = 1.0f;
      c.target[1] = -2.0f;
      qv_camera_rotate_begin (&c, 400, 300);
      qv_camera_rotate_drag (&c, 470, 250);
      qv_camera_rotate_end (&c);
      /* The world point under pixel (610, 140) on the target plane. */
      qv_camera_ray (&c, 610, 140, o, d);
      rotation (&c, r);
      back[0] = r[0][2];
      back[1] = r[1][2];
      back[2] = r[2][2];
      t = ((c.target[0] - o[0]) * back[0] + (c.target[1] - o[1]) * back[1]
           + (c.target[2] - o[2]) * back[2]) / glm_vec3_dot (d, back);
      for (int k = 0; k < 3; k++)
        hit[k] = o[k] + t * d[k];
      assert_true (qv_camera_project (&c, hit, &x0, &y0, NULL));
      assert_true (fabsf (x0 - 610) < 0.01f && fabsf (y0 - 140) < 0.01f);
      for (int step = 0; step < 3; step++)
        {
          qv_camera_zoom_at (&c, 610, 140, step == 1 ? 0.6f : 1.7f);
          assert_true (qv_camera_project (&c, hit, &x1, &y1, NULL));
          assert_true (fabsf (x1 - 610) < 0.02f && fabsf (y1 - 140) < 0.02f);
        }
      /* Something else moved: the centre of the view is no longer the
       * same point. */
      assert_true (fabsf (c.target[0] - 1.0f) + fabsf (c.target[1] + 2.0f) > 0.1f);
    }
}

static void
test_fit_contains_points (void **state)
{
  GRand *rand = g_rand_new_with_seed (7);
  float pts[3 * 200];

  for (int i = 0; i < 3 * 200; i++)
    pts[i] = (float) g_rand_double_range (rand, -3.0, 9.0) * (i % 3 == 1 ? 2.5f : 1.0f);
  g_rand_free (rand);
  for (int proj = 0; proj < 2; proj++)
    for (int shape = 0; shape < 2; shape++)
      {
        QvCamera c;
        qv_camera_init (&c);
        qv_camera_set_viewport (&c, shape ? 400 : 1280, shape ? 900 : 600);
        qv_camera_set_projection (&c, proj ? QV_CAMERA_ORTHOGRAPHIC : QV_CAMERA_PERSPECTIVE);
        qv_camera_rotate_begin (&c, 100, 100);
        qv_camera_rotate_drag (&c, 300, 160);
        qv_camera_fit (&c, pts, 200, 1.0f);
        for (int i = 0; i < 200; i++)
          {
            float x, y, z;
            assert_true (qv_camera_project (&c, pts + 3 * i, &x, &y, &z));
            assert_true (x >= 0 && x <= c.width && y >= 0 && y <= c.height);
            assert_true (z > -1.0f && z < 1.0f);   /* between near and far */
          }
      }
}

/* Shoemake's arcball rotates by twice the angle between the two points on
 * the sphere, about their cross product (Shoemake, "ARCBALL", Graphics
 * Interface 1992; from memory). */
static void
test_arcball_angle (void **state)
{
  QvCamera c;
  const float x0 = 400, y0 = 300, x1 = 520, y1 = 230;
  float r = 300.0f;   /* half the smaller side */
  vec3 p0, p1, axis, v = { 0.3f, -0.2f, 0.9f }, rv;
  float expect, got;
  mat4 m;

  qv_camera_init (&c);
  qv_camera_set_viewport (&c, 800, 600);
  /* The two sphere points, from the definition. */
  p0[0] = (x0 - 400) / r; p0[1] = (300 - y0) / r;
  p0[2] = sqrtf (1 - p0[0] * p0[0] - p0[1] * p0[1]);
  p1[0] = (x1 - 400) / r; p1[1] = (300 - y1) / r;
  p1[2] = sqrtf (1 - p1[0] * p1[0] - p1[1] * p1[1]);
  expect = 2.0f * acosf (glm_vec3_dot (p0, p1));
  qv_camera_rotate_begin (&c, x0, y0);
  qv_camera_rotate_drag (&c, x1, y1);
  qv_camera_rotate_end (&c);
  assert_orthonormal (&c);
  /* A vector perpendicular to the axis turns by exactly that angle. */
  glm_vec3_cross (p0, p1, axis);
  glm_vec3_normalize (axis);
  glm_vec3_muladds (axis, -glm_vec3_dot (v, axis), v);
  glm_vec3_normalize (v);
  rotation (&c, m);
  glm_mat4_mulv3 (m, v, 0.0f, rv);
  got = acosf (CLAMP (glm_vec3_dot (v, rv), -1.0f, 1.0f));
  assert_true (fabsf (got - expect) < 1e-4f);
  /* The axis itself stays put. */
  glm_mat4_mulv3 (m, axis, 0.0f, rv);
  assert_true (glm_vec3_distance (rv, axis) < 1e-5f);
  /* Many drags keep it orthonormal. */
  qv_camera_rotate_begin (&c, 10, 10);
  for (int i = 0; i < 500; i++)
    qv_camera_rotate_drag (&c, 10 + i * 1.3f, 10 + (i % 37) * 9.0f);
  qv_camera_roll (&c, 0.7f);
  assert_orthonormal (&c);
}

/* Switching projection keeps the target plane where it was: a point on it
 * lands on the same pixel in both. */
static void
test_projection_switch (void **state)
{
  QvCamera c;
  float xp, yp, xo, yo, pt[3];
  mat4 r;

  qv_camera_init (&c);
  qv_camera_set_viewport (&c, 640, 480);
  qv_camera_rotate_begin (&c, 320, 240);
  qv_camera_rotate_drag (&c, 350, 200);
  rotation (&c, r);
  /* target + 1.7 right − 0.9 up: on the target plane. */
  for (int k = 0; k < 3; k++)
    pt[k] = c.target[k] + 1.7f * r[k][0] - 0.9f * r[k][1];
  assert_true (qv_camera_project (&c, pt, &xp, &yp, NULL));
  qv_camera_set_projection (&c, QV_CAMERA_ORTHOGRAPHIC);
  assert_true (qv_camera_project (&c, pt, &xo, &yo, NULL));
  assert_true (fabsf (xp - xo) < 0.01f && fabsf (yp - yo) < 0.01f);
}

/* Views along the axes: the axis points into the screen, orthonormal. */
static void
test_view_along (void **state)
{
  static const float dirs[6][3] = {
    { 1, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 }, { -1, 0, 0 }, { 0, -1, 0 }, { 0, 0, -1 },
  };
  for (int a = 0; a < 6; a++)
    {
      QvCamera c;
      float xc, yc, x, y, dc, d;
      float far[3];

      qv_camera_init (&c);
      qv_camera_set_viewport (&c, 500, 500);
      qv_camera_view_along (&c, (QvViewAxis) a);
      assert_orthonormal (&c);
      /* A point further along the axis is behind the target, same pixel. */
      for (int k = 0; k < 3; k++)
        far[k] = c.target[k] + 2.0f * dirs[a][k];
      assert_true (qv_camera_project (&c, c.target, &xc, &yc, &dc));
      assert_true (qv_camera_project (&c, far, &x, &y, &d));
      assert_true (fabsf (x - xc) < 1e-3f && fabsf (y - yc) < 1e-3f);
      assert_true (d > dc);
    }
}

/* Pan moves the scene with the pointer. */
static void
test_pan (void **state)
{
  QvCamera c;
  float x0, y0, x1, y1, p[3] = { 0.5f, 0.2f, -0.3f };

  qv_camera_init (&c);
  qv_camera_set_viewport (&c, 640, 480);
  assert_true (qv_camera_project (&c, c.target, &x0, &y0, NULL));
  memcpy (p, c.target, sizeof p);
  qv_camera_pan (&c, 35.0f, -20.0f);
  assert_true (qv_camera_project (&c, p, &x1, &y1, NULL));
  assert_true (fabsf (x1 - x0 - 35.0f) < 0.01f && fabsf (y1 - y0 + 20.0f) < 0.01f);
}

/* Picking spheres without GL: the nearest along the ray wins. */
static void
test_pick_math (void **state)
{
  QvCamera c;
  const float centres[9] = { 0, 0, 0, 0, 0, 2, 3, 0, 0 };
  const float radii[3] = { 0.5f, 0.5f, 0.5f };
  float x, y;

  for (int proj = 0; proj < 2; proj++)
    {
      qv_camera_init (&c);
      qv_camera_set_viewport (&c, 400, 400);
      qv_camera_set_projection (&c, proj ? QV_CAMERA_ORTHOGRAPHIC : QV_CAMERA_PERSPECTIVE);
      /* The eye is on +z: sphere 1 (z = 2) hides sphere 0. */
      assert_true (qv_camera_project (&c, centres, &x, &y, NULL));
      assert_int_equal (qv_camera_pick (&c, x, y, centres, radii, 3), 1);
      assert_true (qv_camera_project (&c, centres + 6, &x, &y, NULL));
      assert_int_equal (qv_camera_pick (&c, x, y, centres, radii, 3), 2);
      assert_int_equal (qv_camera_pick (&c, 2, 2, centres, radii, 3), -1);
    }
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_zoom_keeps_cursor_point),
    cmocka_unit_test (test_fit_contains_points),
    cmocka_unit_test (test_arcball_angle),
    cmocka_unit_test (test_projection_switch),
    cmocka_unit_test (test_view_along),
    cmocka_unit_test (test_pan),
    cmocka_unit_test (test_pick_math),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
