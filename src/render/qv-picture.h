/* qv-picture.h — still pictures and animations of one normal mode, drawn
 * offscreen (no window, no display): raster frames from the GL renderer,
 * the SVG figure of the same view, and the frames of one period for a GIF
 * or a multi-frame XYZ. `quaver picture` and the app's export pane share
 * it, so a figure made from the command line and one made in the app with
 * the same view are the same picture.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-camera.h"
#include "qv-mode-set.h"
#include "qv-progress.h"
#include "qv-renderer.h"
#include "qv-structure.h"

G_BEGIN_DECLS

/* The longest arrow of a mode, Å, whatever the amplitude, and the share of
 * the largest displacement below which an atom gets no arrow (presentation
 * only; the app's view uses the same). */
#define QV_PICTURE_ARROW_LONGEST 1.4
#define QV_PICTURE_ARROW_MIN_SHARE 0.05
/* Largest side of a picture (and of its supersampled drawing), pixels. */
#define QV_PICTURE_MAX_SIDE 8192
#define QV_PICTURE_MAX_FRAMES 1000

typedef struct {
  const QvStructure *structure;
  const QvModeSet *modes;      /* NULL: the structure at rest, no arrows */
  gsize mode;                  /* 0-based column of @modes */
  double max_displacement;     /* Å of the atom that moves most at the
                                  extreme of the motion (> 0) */
  QvCamera camera;             /* orientation, target, distance, projection;
                                  the viewport is set from width × height */
  QvRenderOptions options;     /* arrows, bonds, labels, background,
                                  transparent, ghost_alpha… */
  int width, height;           /* pixels of the result */
  int supersample;             /* 1–4: render larger and downsample */
  double phase;                /* radians, for a still (0: the + extreme;
                                  π/2: at rest) */
  guint n_frames;              /* animation: frames of one period (≥ 2) */
} QvPictureRequest;

/* Defaults: 1200 × 900, supersample 2, edge antialiasing, bonds, arrows and
 * cell, phase π/2 (at rest, with arrows), 0.5 Å, 30 frames, the camera along
 * its initial axis fitted by qv_picture_fit_camera. */
void qv_picture_request_init (QvPictureRequest *request, const QvStructure *structure);
/* Fits request->camera to the structure and its motion (every atom at both
 * extremes stays in view), keeping the orientation and projection. */
void qv_picture_fit_camera (QvPictureRequest *request);

/* One straight-alpha RGBA image, width × height × 4 bytes, top row first
 * (newly allocated). QV_RENDER_ERROR when no offscreen GL context can be
 * made (the message says what is missing). */
guint8 *qv_picture_render (const QvPictureRequest *request, GError **error);
/* n_frames images of one period, phase 2πk/n_frames (k = 0 … n−1), in a
 * NULL-terminated array of newly allocated images; @progress per frame. */
guint8 **qv_picture_render_frames (const QvPictureRequest *request,
                                   const QvProgress *progress, GError **error);
/* The SVG document of the same view at request->phase (newly allocated,
 * *@length bytes). */
char *qv_picture_svg (const QvPictureRequest *request, gsize *length, GError **error);
/* The positions (3N Å) of frame @k of n_frames (phase 2πk/n_frames), for a
 * multi-frame XYZ; and at any phase. */
void qv_picture_frame_positions (const QvPictureRequest *request, guint k, double *positions);
void qv_picture_frame_positions_at (const QvPictureRequest *request, double phase,
                                    double *positions);

G_END_DECLS
