/* qv-render-test.h — shared helpers of the renderer tests: an offscreen
 * context or a skip, images, colours.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-camera.h"
#include "qv-offscreen.h"
#include "qv-renderer.h"
#include "qv-structure.h"

/* meson's exit code for a skipped test. */
#define QVR_SKIP 77

typedef struct {
  QvOffscreen *offscreen;
  QvRenderer *renderer;
  int width, height;          /* read-back size */
  int draw_width, draw_height;
  guint8 *rgba;
  const char *save_prefix;    /* put before qvr_save's names, or NULL */
} QvrContext;

/* Creates the context and renderer or exits 77 with a message when EGL's
 * surfaceless platform is missing; aborts on any other failure. */
QvrContext *qvr_context_new (int width, int height, int samples, int supersample);
void qvr_context_free (QvrContext *c);
/* Draws with @camera (its viewport set to the draw size) and reads back. */
void qvr_render (QvrContext *c, QvCamera *camera);
/* Pixel (x, y) of the read-back image, top row first. */
const guint8 *qvr_pixel (const QvrContext *c, int x, int y);
/* Writes the image as binary PPM into $QV_BUILD_ROOT/tests/render/NAME. */
void qvr_save (const QvrContext *c, const char *name);

/* Hue in degrees [0, 360) and chroma (max − min, 0..1) of an sRGB pixel. */
void qvr_hue (const float rgb[3], float *hue, float *chroma);
float qvr_hue_distance (float a, float b);
/* The pixel with the largest value (max channel) in a (2r+1)² box. */
void qvr_brightest (const QvrContext *c, int x, int y, int r, float rgb[3]);

/* A structure from atomic numbers and positions (Å). */
QvStructure *qvr_structure (gsize n, const guint *z, const double *xyz);
