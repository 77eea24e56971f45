/* qv-gif-writer.h — looping GIF animations (GIF89a) through giflib: one
 * global palette of at most 256 colours chosen for all frames together,
 * the NETSCAPE2.0 loop extension, and only the changed rectangle of each
 * frame after the first.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-progress.h"

G_BEGIN_DECLS

/* GIF stores sizes in 16 bits (GIF89a, "Logical Screen Descriptor"). */
#define QV_GIF_MAX_SIDE 65535
/* Largest width × height accepted (a 16384 × 16384 frame): the encoder
 * keeps two index planes of this many bytes. */
#define QV_GIF_MAX_PIXELS (G_GUINT64_CONSTANT (1) << 28)
/* Shortest frame delay written, hundredths of a second: browsers show
 * delays of 0 and 1 cs as 10 cs (common practice), so shorter delays are
 * raised to this. Callers that take a frame rate from the user should say
 * so when they ask for less. */
#define QV_GIF_MIN_DELAY_CS 2
/* Longest delay GIF can store (16 bits). */
#define QV_GIF_MAX_DELAY_CS 65535

typedef struct {
  int width, height;
  guint n_frames;
  /* n_frames pointers to width × height × 4 bytes: RGBA, top row first,
   * straight (not premultiplied) alpha, sRGB-encoded colour. */
  const guint8 *const *rgba;
  /* Delay after every frame, hundredths of a second; or, when delays_cs is
   * not NULL, one delay per frame (so that rounding can be spread and a
   * period lasts exactly what it should). Clamped to
   * [QV_GIF_MIN_DELAY_CS, QV_GIF_MAX_DELAY_CS]. */
  guint delay_cs;
  const guint *delays_cs;
  /* TRUE: pixels with alpha < 128 become one palette index reserved as the
   * transparent colour (graphics control extension), the others are drawn
   * opaque. Every frame is then written whole and cleared after its delay
   * (disposal "restore to background"). FALSE: alpha is ignored. */
  gboolean transparent;
  /* Times the animation plays in all; 0 plays it forever. Decoders read
   * the NETSCAPE2.0 count as repeats after the first play (browsers and
   * gdk-pixbuf, common practice), so N is written as N − 1, and 1 as no
   * extension at all. At most 65536. */
  guint loop_count;
  /* TRUE: an ordered (Bayer 8 × 8) dither before the palette lookup; it
   * stays put from frame to frame, so it neither flickers nor defeats the
   * changed-rectangle coding. Off by default: on smooth shading it
   * costs PSNR and file size (tests/bench/bench-gif.c measures both). */
  gboolean dither;
} QvGifFrames;

/* Encodes @frames as an animated GIF in memory (newly allocated, *@length
 * bytes; write it with qv_output_write). A palette of the exact colours is
 * used when all frames together have at most 256 (255 with transparency),
 * so few-colour pictures are lossless; otherwise a median-cut palette
 * refined by k-means over all frames, nearest colour per pixel in RGB.
 * Opaque frames after the first are written as the rectangle that changed
 * ("do not dispose"), its unchanged pixels as a spare transparent index
 * when that makes longer runs for LZW. Progress goes from 0 to 1
 * over palette and frames; cancelling fails with QV_ERROR_CANCELLED.
 * QV_ERROR_USAGE for no frames, a bad size or a missing frame,
 * QV_ERROR_LIMIT for a frame larger than GIF or this encoder allows,
 * QV_ERROR_WRITE when giflib fails. */
guint8 *qv_gif_encode (const QvGifFrames *frames, const QvProgress *progress,
                       gsize *length, GError **error);

G_END_DECLS
