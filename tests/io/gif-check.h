/* gif-check.h — what the GIF writer's test and benchmark check it with: an
 * invented picture of shaded discs, a decoder that is not ours
 * (gdk-pixbuf's GdkPixbufAnimation), a walk over the GIF89a blocks written
 * from the specification, and PSNR.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

/* Frame @frame of @n_frames of an invented animation: a dozen shaded
 * discs (spheres lit from the upper left with a highlight, antialiased
 * edges) swinging through one period on a flat background, or on a
 * transparent one (straight alpha) with @transparent. RGBA, top row first;
 * g_free it. */
guint8 *gifc_discs_frame (int width, int height, guint frame, guint n_frames,
                          gboolean transparent);

/* Frames as gdk-pixbuf shows them: the iterator is started and advanced
 * by each frame's delay, up to @max_frames frames or until it reports the
 * last frame shown forever (delay -1: the loop count is used up). */
typedef struct {
  int width, height;
  guint n_frames;
  guint8 **rgba;    /* composited, RGBA, width × height × 4 each */
  int *delay_ms;
  gboolean ended;   /* the animation stopped before max_frames */
} GifcDecoded;

GifcDecoded *gifc_decode (const guint8 *data, gsize length, guint max_frames, GError **error);
void gifc_decoded_free (GifcDecoded *d);

/* Blocks of a GIF89a file, read as the specification lays them out. */
typedef struct {
  int left, top, width, height;
  int disposal;        /* from the graphics control extension before it */
  int delay_cs;
  int transparent;     /* index, or -1 */
} GifcImage;

typedef struct {
  int width, height;
  int global_colours;  /* entries of the global colour table, 0 if none */
  int loop_count;      /* NETSCAPE2.0 sub-block 1, or -1 when absent */
  guint n_images;
  GifcImage image[512];
} GifcLayout;

/* FALSE when the bytes do not follow the specification. */
gboolean gifc_layout (const guint8 *data, gsize length, GifcLayout *layout);

/* PSNR in dB over the R, G and B channels of two RGBA images (INFINITY when
 * equal); with @where_opaque only over pixels whose alpha in @a is ≥ 128. */
double gifc_psnr (const guint8 *a, const guint8 *b, int width, int height,
                  gboolean where_opaque);
