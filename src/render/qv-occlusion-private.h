/* qv-occlusion-private.h — conservative occlusion culling on the CPU: a
 * depth bound per screen cell from the atoms' spheres, and the test whether
 * a sphere, bond or arrow is certainly hidden behind them. Used by
 * qv-renderer.c each frame; no GL.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

typedef struct _QvOcclusion QvOcclusion;

/* Screen cells of @cell × @cell pixels (1 = per pixel). */
QvOcclusion *qv_occlusion_new (int cell);
void qv_occlusion_free (QvOcclusion *occlusion);

/* Starts a frame: @proj the column-major projection matrix (perspective or
 * orthographic, symmetric as qv-camera.c makes them), the viewport
 * @width × @height pixels; every cell's bound is reset to "nothing in
 * front". */
void qv_occlusion_begin (QvOcclusion *occlusion, const float proj[16], int width, int height);

/* An opaque sphere at view-space centre @c (z < 0 in front of the eye),
 * radius @r, as an occluder. Its disc of radius r in the plane z = c.z,
 * centred on c, lies inside the sphere and projects to a circle; every
 * cell whose pixel centres all lie inside that circle (shrunk by a pixel)
 * sees the sphere's front surface at a view depth ≤ −c.z, which the cell
 * keeps if it is the nearest so far. Spheres reaching past the near or far
 * plane are left out. */
void qv_occlusion_add_sphere (QvOcclusion *occlusion, const float c[3], float r);

/* Whether everything within distance @pad of the view-space segment a–b
 * (a sphere: a = b) is certainly hidden: every pixel whose centre lies in
 * the projection of its bounding box (grown by @margin_px pixels) is in a
 * cell whose bound is nearer than the box's nearest point. Off-screen
 * counts as hidden; reaching the near plane never does. */
gboolean qv_occlusion_hidden (const QvOcclusion *occlusion, const float a[3], const float b[3],
                              float pad, float margin_px);

G_END_DECLS
