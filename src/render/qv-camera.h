/* qv-camera.h — the view onto a structure: arcball rotation, zoom to the
 * cursor, pan, fit, orthographic or perspective projection, picking.
 * Pure math (cglm), no GL: the GUI and the offscreen backend share it.
 * Window coordinates are in pixels with the origin at the top left.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include <cglm/cglm.h>

G_BEGIN_DECLS

typedef enum {
  QV_CAMERA_PERSPECTIVE,
  QV_CAMERA_ORTHOGRAPHIC,
} QvCameraProjection;

typedef enum {
  QV_VIEW_ALONG_X, QV_VIEW_ALONG_Y, QV_VIEW_ALONG_Z,
  QV_VIEW_ALONG_MINUS_X, QV_VIEW_ALONG_MINUS_Y, QV_VIEW_ALONG_MINUS_Z,
} QvViewAxis;

typedef struct {
  vec3 target;            /* Å, the point the camera looks at */
  versor orientation;     /* world → view rotation */
  float distance;         /* Å from target to eye */
  float fov_y;            /* radians, perspective */
  QvCameraProjection projection;
  int width, height;      /* viewport, pixels */
  float scene_radius;     /* Å, for near/far planes */
  /* arcball drag state */
  gboolean dragging;
  vec3 drag_start;
  versor drag_orientation;
} QvCamera;

void qv_camera_init (QvCamera *camera);
void qv_camera_set_viewport (QvCamera *camera, int width, int height);
/* Looks at the centre of the bounding sphere of @n points (xyz triples) and
 * sets the distance so that every point, padded by @padding Å, is visible. */
void qv_camera_fit (QvCamera *camera, const float *points, gsize n, float padding);
void qv_camera_view_along (QvCamera *camera, QvViewAxis axis);
/* The orthographic view shows a half-height of distance·tan(fov_y/2) at the
 * target, the same as the perspective view there, so switching does not
 * jump. */
void qv_camera_set_projection (QvCamera *camera, QvCameraProjection projection);

/* Arcball (Shoemake): begin at a pixel, drag to another, end. */
void qv_camera_rotate_begin (QvCamera *camera, float x, float y);
void qv_camera_rotate_drag (QvCamera *camera, float x, float y);
void qv_camera_rotate_end (QvCamera *camera);
/* Rotates about the view axis (touchpad/keys), radians. */
void qv_camera_roll (QvCamera *camera, float angle);
/* Zooms by @factor (> 1 closer) keeping the world point under pixel (x, y)
 * fixed on screen. */
void qv_camera_zoom_at (QvCamera *camera, float x, float y, float factor);
/* Moves the scene by a pixel offset. */
void qv_camera_pan (QvCamera *camera, float dx, float dy);

void qv_camera_view_matrix (const QvCamera *camera, mat4 view);
void qv_camera_projection_matrix (const QvCamera *camera, mat4 projection);
/* World point → window pixel (x right, y down) and NDC depth in [−1, 1];
 * FALSE when behind the eye. */
gboolean qv_camera_project (const QvCamera *camera, const float world[3],
                            float *x, float *y, float *depth);
/* The ray through a pixel: origin and unit direction in world space. */
void qv_camera_ray (const QvCamera *camera, float x, float y, vec3 origin, vec3 direction);

/* The sphere (centre xyz, radius) nearest the eye under pixel (x, y), or −1.
 * @centres holds 3n floats, @radii n floats. */
gssize qv_camera_pick (const QvCamera *camera, float x, float y, const float *centres,
                       const float *radii, gsize n);

G_END_DECLS
