/* qv-camera.c — arcball, zoom, pan, fit, projections and picking.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-camera.h"

#define QV_CAMERA_DEFAULT_FOV (30.0f * (float) G_PI / 180.0f)
#define QV_CAMERA_MIN_DISTANCE 0.05f

void
qv_camera_init (QvCamera *camera)
{
  memset (camera, 0, sizeof *camera);
  glm_quat_identity (camera->orientation);
  camera->distance = 20.0f;
  camera->fov_y = QV_CAMERA_DEFAULT_FOV;
  camera->projection = QV_CAMERA_PERSPECTIVE;
  camera->width = 1;
  camera->height = 1;
  camera->scene_radius = 5.0f;
  glm_quat_identity (camera->drag_orientation);
}

void
qv_camera_set_viewport (QvCamera *camera, int width, int height)
{
  camera->width = MAX (width, 1);
  camera->height = MAX (height, 1);
}

static float
aspect (const QvCamera *camera)
{
  return (float) camera->width / (float) camera->height;
}

/* Half the view height at the target, Å: the same for both projections. */
static float
half_height (const QvCamera *camera)
{
  return camera->distance * tanf (camera->fov_y * 0.5f);
}

void
qv_camera_fit (QvCamera *camera, const float *points, gsize n, float padding)
{
  vec3 lo = { 0, 0, 0 }, hi = { 0, 0, 0 };
  float r2 = 0.0f, radius, half;

  for (gsize i = 0; i < n; i++)
    for (int k = 0; k < 3; k++)
      {
        float v = points[3 * i + k];
        if (i == 0 || v < lo[k])
          lo[k] = v;
        if (i == 0 || v > hi[k])
          hi[k] = v;
      }
  glm_vec3_center (lo, hi, camera->target);
  for (gsize i = 0; i < n; i++)
    {
      vec3 p = { points[3 * i], points[3 * i + 1], points[3 * i + 2] };
      r2 = MAX (r2, glm_vec3_distance2 (p, camera->target));
    }
  radius = sqrtf (r2) + MAX (padding, 0.0f);
  if (radius < 0.5f)
    radius = 0.5f;
  /* The bounding sphere fits the narrower of the two view angles: seen
   * from distance d a sphere of radius R subtends asin(R/d). The same
   * distance leaves the orthographic half-extent d·tan ≥ R. */
  half = camera->fov_y * 0.5f;
  if (aspect (camera) < 1.0f)
    half = atanf (tanf (half) * aspect (camera));
  camera->distance = radius / sinf (half);
  camera->scene_radius = radius;
}

void
qv_camera_view_along (QvCamera *camera, QvViewAxis axis)
{
  /* Rows of the world → view rotation: right, up, back (towards the eye),
   * with right × up = back. z is up except when looking along ±z. */
  static const float axes[6][3][3] = {
    { { 0, -1, 0 }, { 0, 0, 1 }, { -1, 0, 0 } },  /* looking along +x */
    { { 1, 0, 0 }, { 0, 0, 1 }, { 0, -1, 0 } },   /* +y */
    { { -1, 0, 0 }, { 0, 1, 0 }, { 0, 0, -1 } },  /* +z */
    { { 0, 1, 0 }, { 0, 0, 1 }, { 1, 0, 0 } },    /* −x */
    { { -1, 0, 0 }, { 0, 0, 1 }, { 0, 1, 0 } },   /* −y */
    { { 1, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 } },    /* −z: the initial view */
  };
  mat3 m;

  /* cglm matrices are column-major, m[column][row]. */
  for (int r = 0; r < 3; r++)
    for (int c = 0; c < 3; c++)
      m[c][r] = axes[axis][r][c];
  glm_mat3_quat (m, camera->orientation);
  glm_quat_normalize (camera->orientation);
}

void
qv_camera_set_projection (QvCamera *camera, QvCameraProjection projection)
{
  /* Both projections derive their scale from distance and fov_y, so the
   * target plane keeps its size: nothing else to do. */
  camera->projection = projection;
}

/* Shoemake's arcball: a pixel on the unit sphere over the viewport. */
static void
arcball_point (const QvCamera *camera, float x, float y, vec3 p)
{
  float r = 0.5f * (float) MIN (camera->width, camera->height);
  float d2;

  p[0] = (x - 0.5f * (float) camera->width) / r;
  p[1] = (0.5f * (float) camera->height - y) / r;
  d2 = p[0] * p[0] + p[1] * p[1];
  if (d2 <= 1.0f)
    p[2] = sqrtf (1.0f - d2);
  else
    {
      float s = 1.0f / sqrtf (d2);
      p[0] *= s;
      p[1] *= s;
      p[2] = 0.0f;
    }
}

void
qv_camera_rotate_begin (QvCamera *camera, float x, float y)
{
  camera->dragging = TRUE;
  arcball_point (camera, x, y, camera->drag_start);
  glm_quat_copy (camera->orientation, camera->drag_orientation);
}

void
qv_camera_rotate_drag (QvCamera *camera, float x, float y)
{
  vec3 p, axis;
  versor q;

  if (!camera->dragging)
    return;
  arcball_point (camera, x, y, p);
  /* q = p·p0* as quaternions: [p0 × p, p0 · p], a rotation by twice the
   * angle between the two points (Shoemake 1992), in view space. */
  glm_vec3_cross (camera->drag_start, p, axis);
  glm_quat_init (q, axis[0], axis[1], axis[2], glm_vec3_dot (camera->drag_start, p));
  glm_quat_normalize (q);
  glm_quat_mul (q, camera->drag_orientation, camera->orientation);
  glm_quat_normalize (camera->orientation);
}

void
qv_camera_rotate_end (QvCamera *camera)
{
  camera->dragging = FALSE;
}

void
qv_camera_roll (QvCamera *camera, float angle)
{
  versor q, r;

  glm_quatv (q, angle, (vec3) { 0, 0, 1 });
  glm_quat_mul (q, camera->orientation, r);
  glm_quat_normalize_to (r, camera->orientation);
}

/* The view axes in world space (columns of the inverse rotation). */
static void
view_axes (const QvCamera *camera, vec3 right, vec3 up, vec3 back)
{
  mat4 r;

  glm_quat_mat4 ((float *) camera->orientation, r);
  /* Row i of the rotation is view axis i in world coordinates. */
  for (int k = 0; k < 3; k++)
    {
      right[k] = r[k][0];
      up[k] = r[k][1];
      back[k] = r[k][2];
    }
}

void
qv_camera_zoom_at (QvCamera *camera, float x, float y, float factor)
{
  vec3 origin, dir, right, up, back, hit, offset;
  float t, denom, d;

  if (!(factor > 0.0f) || !isfinite (factor))
    return;
  d = MAX (camera->distance / factor, QV_CAMERA_MIN_DISTANCE);
  factor = camera->distance / d;
  /* The point under the cursor on the plane through the target facing the
   * viewer; moving the target towards it by (1 − 1/f) keeps it in place,
   * because both projections scale with the distance. */
  qv_camera_ray (camera, x, y, origin, dir);
  view_axes (camera, right, up, back);
  denom = glm_vec3_dot (dir, back);
  if (fabsf (denom) < 1e-6f)
    return;
  glm_vec3_sub (camera->target, origin, offset);
  t = glm_vec3_dot (offset, back) / denom;
  glm_vec3_scale (dir, t, hit);
  glm_vec3_add (origin, hit, hit);
  glm_vec3_sub (hit, camera->target, offset);
  glm_vec3_muladds (offset, 1.0f - 1.0f / factor, camera->target);
  camera->distance = d;
}

void
qv_camera_pan (QvCamera *camera, float dx, float dy)
{
  vec3 right, up, back;
  float s = 2.0f * half_height (camera) / (float) camera->height;

  view_axes (camera, right, up, back);
  glm_vec3_muladds (right, -dx * s, camera->target);
  glm_vec3_muladds (up, dy * s, camera->target);
}

void
qv_camera_view_matrix (const QvCamera *camera, mat4 view)
{
  mat4 rot;

  glm_translate_make (view, (vec3) { 0, 0, -camera->distance });
  glm_quat_mat4 ((float *) camera->orientation, rot);
  glm_mat4_mul (view, rot, view);
  glm_translate (view, (vec3) { -camera->target[0], -camera->target[1],
                                -camera->target[2] });
}

static void
near_far (const QvCamera *camera, float *znear, float *zfar)
{
  float r = MAX (camera->scene_radius, 0.5f) * 1.5f + 1.0f;

  *zfar = camera->distance + r;
  if (camera->projection == QV_CAMERA_ORTHOGRAPHIC)
    *znear = camera->distance - r;   /* may be negative: fine for ortho */
  else
    *znear = MAX (camera->distance - r, MAX (0.002f * *zfar, 0.01f));
}

void
qv_camera_projection_matrix (const QvCamera *camera, mat4 projection)
{
  float zn, zf;

  near_far (camera, &zn, &zf);
  if (camera->projection == QV_CAMERA_ORTHOGRAPHIC)
    {
      float h = half_height (camera), w = h * aspect (camera);
      glm_ortho (-w, w, -h, h, zn, zf, projection);
    }
  else
    glm_perspective (camera->fov_y, aspect (camera), zn, zf, projection);
}

gboolean
qv_camera_project (const QvCamera *camera, const float world[3],
                   float *x, float *y, float *depth)
{
  mat4 v, p, vp;
  vec4 w = { world[0], world[1], world[2], 1.0f }, c;

  qv_camera_view_matrix (camera, v);
  qv_camera_projection_matrix (camera, p);
  glm_mat4_mul (p, v, vp);
  glm_mat4_mulv (vp, w, c);
  if (c[3] <= 1e-12f)
    return FALSE;
  if (x)
    *x = (c[0] / c[3] + 1.0f) * 0.5f * (float) camera->width;
  if (y)
    *y = (1.0f - c[1] / c[3]) * 0.5f * (float) camera->height;
  if (depth)
    *depth = c[2] / c[3];
  return TRUE;
}

void
qv_camera_ray (const QvCamera *camera, float x, float y, vec3 origin, vec3 direction)
{
  vec3 right, up, back, eye;
  float nx = 2.0f * x / (float) camera->width - 1.0f;
  float ny = 1.0f - 2.0f * y / (float) camera->height;
  float h = half_height (camera), w = h * aspect (camera);

  view_axes (camera, right, up, back);
  glm_vec3_copy ((float *) camera->target, eye);
  glm_vec3_muladds (back, camera->distance, eye);
  if (camera->projection == QV_CAMERA_ORTHOGRAPHIC)
    {
      float zn, zf;
      /* Parallel rays start on the near plane (which may lie behind the
       * eye), so everything drawn can be hit. */
      near_far (camera, &zn, &zf);
      glm_vec3_copy (eye, origin);
      glm_vec3_muladds (back, -zn, origin);
      glm_vec3_muladds (right, nx * w, origin);
      glm_vec3_muladds (up, ny * h, origin);
      glm_vec3_negate_to (back, direction);
    }
  else
    {
      float d = camera->distance;
      glm_vec3_copy (eye, origin);
      glm_vec3_scale (right, nx * w / d, direction);
      glm_vec3_muladds (up, ny * h / d, direction);
      glm_vec3_muladds (back, -1.0f, direction);
      glm_vec3_normalize (direction);
    }
}

gssize
qv_camera_pick (const QvCamera *camera, float x, float y, const float *centres,
                const float *radii, gsize n)
{
  vec3 o, d;
  gssize best = -1;
  float best_t = INFINITY;

  qv_camera_ray (camera, x, y, o, d);
  for (gsize i = 0; i < n; i++)
    {
      vec3 c = { centres[3 * i] - o[0], centres[3 * i + 1] - o[1], centres[3 * i + 2] - o[2] };
      float b = glm_vec3_dot (c, d);
      float disc = b * b - glm_vec3_norm2 (c) + radii[i] * radii[i];
      float t;

      if (disc < 0.0f)
        continue;
      t = b - sqrtf (disc);          /* entry point */
      if (t < 0.0f)
        {
          if (b + sqrtf (disc) < 0.0f)
            continue;                 /* behind the ray's origin */
          t = 0.0f;                   /* origin inside the sphere */
        }
      if (t < best_t)
        {
          best_t = t;
          best = (gssize) i;
        }
    }
  return best;
}
