/* test-gif-writer.c — qv_gif_encode checked from outside: gdk-pixbuf's GIF
 * loader (GdkPixbufAnimation and its iterator) decodes every file, and the
 * GIF89a specification's block layout (CompuServe 1990) is walked by
 * gif-check.c, which is not the encoder's code.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <setjmp.h>
#include <math.h>
#include <string.h>
#include <cmocka.h>

#include <glib.h>
#include "gif-check.h"
#include "qv-error.h"
#include "qv-gif-writer.h"

typedef struct {
  guint n;
  guint8 **rgba;
} Frames;

static Frames *
discs (int w, int h, guint n, gboolean transparent)
{
  Frames *f = g_new0 (Frames, 1);
  f->n = n;
  f->rgba = g_new0 (guint8 *, n);
  for (guint i = 0; i < n; i++)
    f->rgba[i] = gifc_discs_frame (w, h, i, n, transparent);
  return f;
}

static void
frames_free (Frames *f)
{
  for (guint i = 0; i < f->n; i++)
    g_free (f->rgba[i]);
  g_free (f->rgba);
  g_free (f);
}

static guint8 *
encode (const QvGifFrames *f, gsize *length)
{
  g_autoptr (GError) error = NULL;
  guint8 *gif = qv_gif_encode (f, NULL, length, &error);
  if (gif == NULL)
    print_error ("qv_gif_encode: %s\n", error->message);
  assert_non_null (gif);
  return gif;
}

/* Shaded discs swinging through one period: size, frames, delays, looping
 * and PSNR as gdk-pixbuf shows them. */
static void
test_discs_loop_forever (void **state)
{
  const int w = 320, h = 240;
  const guint n = 24;
  Frames *src = discs (w, h, n, FALSE);
  QvGifFrames f = { w, h, n, (const guint8 *const *) src->rgba, 4, NULL, FALSE, 0, FALSE };
  gsize length;
  g_autofree guint8 *gif = encode (&f, &length);
  GifcLayout layout;
  g_autoptr (GError) error = NULL;

  /* three periods: a GIF that loops forever never reports delay -1 */
  GifcDecoded *d = gifc_decode (gif, length, 3 * n, &error);
  assert_non_null (d);
  assert_int_equal (d->width, w);
  assert_int_equal (d->height, h);
  assert_int_equal (d->n_frames, 3 * n);
  assert_false (d->ended);
  double worst = INFINITY;
  for (guint i = 0; i < d->n_frames; i++)
    {
      /* 4 cs = 40 ms (GIF89a: delay in hundredths of a second) */
      assert_int_equal (d->delay_ms[i], 40);
      double psnr = gifc_psnr (src->rgba[i % n], d->rgba[i], w, h, FALSE);
      worst = MIN (worst, psnr);
      /* issue 4: at least 30 dB against the RGB frames */
      assert_true (psnr >= 30.0);
      if (i >= n)
        assert_memory_equal (d->rgba[i], d->rgba[i - n], (gsize) w * h * 4);
    }
  print_message ("discs %dx%d, %u frames: %zu bytes, worst PSNR %.2f dB\n", w, h, n, length,
                 worst);

  /* GIF89a: one global colour table, no local ones; NETSCAPE2.0 count 0 */
  assert_true (gifc_layout (gif, length, &layout));
  assert_int_equal (layout.width, w);
  assert_int_equal (layout.height, h);
  assert_int_equal (layout.global_colours, 256);
  assert_int_equal (layout.loop_count, 0);
  assert_int_equal (layout.n_images, n);
  /* the frames after the first are the rectangle that changed, not drawn
   * over by disposal (GIF89a disposal method 1, "do not dispose") */
  gsize area = 0;
  for (guint i = 0; i < n; i++)
    {
      assert_int_equal (layout.image[i].disposal, 1);
      /* none in the first frame; later ones may mark unchanged pixels */
      if (i == 0)
        assert_int_equal (layout.image[i].transparent, -1);
      else
        assert_true (layout.image[i].transparent < layout.global_colours);
      assert_true (layout.image[i].left + layout.image[i].width <= w);
      assert_true (layout.image[i].top + layout.image[i].height <= h);
      area += (gsize) layout.image[i].width * layout.image[i].height;
    }
  assert_int_equal (layout.image[0].width, w);
  assert_int_equal (layout.image[0].height, h);
  assert_true (area < (gsize) n * w * h);
  gifc_decoded_free (d);
  frames_free (src);
}

/* Plays as gdk-pixbuf counts them: 1 → once, without the NETSCAPE2.0
 * extension; 3 → three times, stored as 2 repeats. */
static void
test_loop_count (void **state)
{
  const int w = 64, h = 48;
  const guint n = 5;
  Frames *src = discs (w, h, n, FALSE);

  for (guint loops = 1; loops <= 3; loops += 2)
    {
      QvGifFrames f = { w, h, n, (const guint8 *const *) src->rgba, 3, NULL, FALSE, loops, FALSE };
      gsize length;
      g_autofree guint8 *gif = encode (&f, &length);
      g_autoptr (GError) error = NULL;
      GifcLayout layout;

      assert_true (gifc_layout (gif, length, &layout));
      assert_int_equal (layout.loop_count, loops == 1 ? -1 : (int) loops - 1);
      GifcDecoded *d = gifc_decode (gif, length, 10 * n, &error);
      assert_non_null (d);
      assert_true (d->ended);
      assert_int_equal (d->n_frames, loops * n);
      gifc_decoded_free (d);
    }
  frames_free (src);
}

/* Delays: 0 and 1 cs are raised to 2 (browsers show them as 10 cs, common
 * practice); one delay per frame when given. */
static void
test_delays (void **state)
{
  const int w = 16, h = 16;
  const guint n = 4;
  Frames *src = discs (w, h, n, FALSE);
  const guint per_frame[4] = { 0, 1, 7, 250 };
  GifcLayout layout;

  for (guint asked = 0; asked <= 1; asked++)
    {
      QvGifFrames f = { w, h, n, (const guint8 *const *) src->rgba, asked, NULL, FALSE, 0, FALSE };
      gsize length;
      g_autofree guint8 *gif = encode (&f, &length);
      assert_true (gifc_layout (gif, length, &layout));
      for (guint i = 0; i < n; i++)
        assert_int_equal (layout.image[i].delay_cs, QV_GIF_MIN_DELAY_CS);
    }
  QvGifFrames f = { w, h, n, (const guint8 *const *) src->rgba, 5, per_frame, FALSE, 1, FALSE };
  gsize length;
  g_autofree guint8 *gif = encode (&f, &length);
  g_autoptr (GError) error = NULL;
  GifcDecoded *d = gifc_decode (gif, length, 2 * n, &error);
  assert_non_null (d);
  assert_int_equal (d->n_frames, n);
  /* gdk-pixbuf reads 100 ms for a stored 0: the 20 ms seen here is the
   * clamped 2 cs */
  assert_int_equal (d->delay_ms[0], 20);
  assert_int_equal (d->delay_ms[1], 20);
  assert_int_equal (d->delay_ms[2], 70);
  assert_int_equal (d->delay_ms[3], 2500);
  gifc_decoded_free (d);
  frames_free (src);
}

/* Two colours one step apart (one histogram cell) come back exactly, and
 * so do 256 colours; 257 are no longer exact but close. */
static void
test_few_colours_exact (void **state)
{
  const int w = 37, h = 23;
  g_autofree guint8 *a = g_malloc (w * h * 4), *b = g_malloc (w * h * 4);
  const guint8 *frames[2] = { a, b };

  for (int i = 0; i < w * h; i++)
    {
      guint8 *p = a + 4 * i, *q = b + 4 * i;
      gboolean one = ((i % w) * 7 + (i / w) * 3) % 5 < 2;
      p[0] = one ? 11 : 10;
      p[1] = 20;
      p[2] = 30;
      p[3] = 255;
      memcpy (q, p, 4);
      if (i % w > 20 && i / w > 10)
        q[0] = one ? 10 : 11;
    }
  QvGifFrames f = { w, h, 2, frames, 10, NULL, FALSE, 0, FALSE };
  gsize length;
  g_autofree guint8 *gif = encode (&f, &length);
  g_autoptr (GError) error = NULL;
  GifcLayout layout;
  GifcDecoded *d = gifc_decode (gif, length, 2, &error);
  assert_non_null (d);
  assert_memory_equal (d->rgba[0], a, w * h * 4);
  assert_memory_equal (d->rgba[1], b, w * h * 4);
  gifc_decoded_free (d);
  assert_true (gifc_layout (gif, length, &layout));
  /* the two colours and the index for unchanged pixels: a table of 4
   * (GIF89a: 2^(n+1) entries) */
  assert_int_equal (layout.global_colours, 4);
  /* only the changed corner is stored for the second frame */
  assert_int_equal (layout.image[1].left, 21);
  assert_int_equal (layout.image[1].top, 11);
  assert_int_equal (layout.image[1].width, w - 21);
  assert_int_equal (layout.image[1].height, h - 11);

  for (guint colours = 256; colours <= 257; colours++)
    {
      g_autofree guint8 *c = g_malloc (w * h * 4);
      for (int i = 0; i < w * h; i++)
        {
          guint v = (guint) i % colours;
          c[4 * i] = (guint8) (v * 37);
          c[4 * i + 1] = (guint8) (v / 7 * 11);
          c[4 * i + 2] = (guint8) (v % 3 * 100 + v / 256);
          c[4 * i + 3] = 255;
        }
      const guint8 *one[1] = { c };
      QvGifFrames g = { w, h, 1, one, 10, NULL, FALSE, 0, FALSE };
      gsize n;
      g_autofree guint8 *bytes = encode (&g, &n);
      GifcDecoded *e = gifc_decode (bytes, n, 1, &error);
      assert_non_null (e);
      double psnr = gifc_psnr (c, e->rgba[0], w, h, FALSE);
      print_message ("%u colours: PSNR %.2f dB\n", colours, psnr);
      if (colours == 256)
        assert_true (isinf (psnr));
      else
        assert_true (psnr >= 30.0 && !isinf (psnr));
      gifc_decoded_free (e);
    }
}

/* Without dither every pixel gets the nearest palette colour (squared RGB
 * distance): no colour the decoded picture uses anywhere is nearer to the
 * original pixel than the one it got. Random colours, fixed seed
 * (splitmix64: Steele, Lea & Flood, OOPSLA 2014). */
static void
test_nearest_colour (void **state)
{
  const int w = 96, h = 64;
  g_autofree guint8 *c = g_malloc (w * h * 4);
  guint64 seed = 42;

  for (int i = 0; i < w * h; i++)
    {
      guint64 z = (seed += G_GUINT64_CONSTANT (0x9E3779B97F4A7C15));
      z = (z ^ (z >> 30)) * G_GUINT64_CONSTANT (0xBF58476D1CE4E5B9);
      z = (z ^ (z >> 27)) * G_GUINT64_CONSTANT (0x94D049BB133111EB);
      z ^= z >> 31;
      c[4 * i] = (guint8) z;
      c[4 * i + 1] = (guint8) (z >> 8);
      c[4 * i + 2] = (guint8) (z >> 16);
      c[4 * i + 3] = 255;
    }
  const guint8 *one[1] = { c };
  QvGifFrames f = { w, h, 1, one, 10, NULL, FALSE, 0, FALSE };
  gsize length;
  g_autofree guint8 *gif = encode (&f, &length);
  g_autoptr (GError) error = NULL;
  GifcDecoded *d = gifc_decode (gif, length, 1, &error);
  assert_non_null (d);

  g_autoptr (GHashTable) used = g_hash_table_new (NULL, NULL);
  for (int i = 0; i < w * h; i++)
    {
      const guint8 *p = d->rgba[0] + 4 * i;
      g_hash_table_add (used, GUINT_TO_POINTER ((guint) p[0] << 16 | (guint) p[1] << 8 | p[2]));
    }
  assert_true (g_hash_table_size (used) > 200);
  guint n_used = 0;
  g_autofree gpointer *keys = g_hash_table_get_keys_as_array (used, &n_used);
  g_autofree guint *colours = g_new (guint, n_used);
  for (guint j = 0; j < n_used; j++)
    colours[j] = GPOINTER_TO_UINT (keys[j]);
  for (int i = 0; i < w * h; i++)
    {
      const guint8 *o = c + 4 * i, *p = d->rgba[0] + 4 * i;
      int got = 0, best = G_MAXINT;
      for (int k = 0; k < 3; k++)
        got += (o[k] - p[k]) * (o[k] - p[k]);
      for (guint j = 0; j < n_used; j++)
        {
          int dr = o[0] - (int) (colours[j] >> 16), dg = o[1] - (int) ((colours[j] >> 8) & 255);
          int db = o[2] - (int) (colours[j] & 255);
          best = MIN (best, dr * dr + dg * dg + db * db);
        }
      assert_int_equal (got, best);
    }
  gifc_decoded_free (d);
}

/* Transparent background: alpha < 128 becomes the reserved index, shown
 * transparent by gdk-pixbuf in every frame (whole frames, "restore to
 * background"); the rest is opaque and close to the original. */
static void
test_transparent (void **state)
{
  const int w = 160, h = 120;
  const guint n = 8;
  Frames *src = discs (w, h, n, TRUE);
  QvGifFrames f = { w, h, n, (const guint8 *const *) src->rgba, 5, NULL, TRUE, 0, FALSE };
  gsize length;
  g_autofree guint8 *gif = encode (&f, &length);
  g_autoptr (GError) error = NULL;
  GifcLayout layout;
  GifcDecoded *d = gifc_decode (gif, length, n, &error);
  double worst = INFINITY;

  assert_non_null (d);
  assert_int_equal (d->n_frames, n);
  for (guint i = 0; i < n; i++)
    {
      for (int p = 0; p < w * h; p++)
        assert_int_equal (d->rgba[i][4 * p + 3], src->rgba[i][4 * p + 3] >= 128 ? 255 : 0);
      double psnr = gifc_psnr (src->rgba[i], d->rgba[i], w, h, TRUE);
      worst = MIN (worst, psnr);
      assert_true (psnr >= 30.0);
    }
  print_message ("transparent %dx%d: worst PSNR %.2f dB (opaque pixels)\n", w, h, worst);
  assert_true (gifc_layout (gif, length, &layout));
  for (guint i = 0; i < n; i++)
    {
      /* GIF89a disposal method 2, "restore to background" */
      assert_int_equal (layout.image[i].disposal, 2);
      assert_int_equal (layout.image[i].transparent, 255);
    }
  gifc_decoded_free (d);
  frames_free (src);
}

/* The ordered dither still decodes and stays within the 30 dB. */
static void
test_dither (void **state)
{
  const int w = 200, h = 150;
  const guint n = 6;
  Frames *src = discs (w, h, n, FALSE);
  QvGifFrames f = { w, h, n, (const guint8 *const *) src->rgba, 5, NULL, FALSE, 0, TRUE };
  gsize length;
  g_autofree guint8 *gif = encode (&f, &length);
  g_autoptr (GError) error = NULL;
  GifcDecoded *d = gifc_decode (gif, length, n, &error);
  GifcLayout layout;
  double worst = INFINITY;
  guint marked = 0;

  assert_non_null (d);
  assert_int_equal (d->n_frames, n);
  for (guint i = 0; i < n; i++)
    worst = MIN (worst, gifc_psnr (src->rgba[i], d->rgba[i], w, h, FALSE));
  /* under the dither, later frames mark unchanged pixels transparent: the
   * PSNR above is then also a check of gdk-pixbuf's compositing of them */
  assert_true (gifc_layout (gif, length, &layout));
  for (guint i = 1; i < n; i++)
    marked += layout.image[i].transparent >= 0;
  assert_true (marked > 0);
  print_message ("dithered %dx%d: %zu bytes, worst PSNR %.2f dB\n", w, h, length, worst);
  assert_true (worst >= 30.0);
  gifc_decoded_free (d);
  frames_free (src);
}

/* Odd sizes: a single pixel, one column, one frame. */
static void
test_odd_sizes (void **state)
{
  const int sizes[3][2] = { { 1, 1 }, { 1, 300 }, { 300, 1 } };

  for (int s = 0; s < 3; s++)
    {
      const int w = sizes[s][0], h = sizes[s][1];
      Frames *src = discs (w, h, 3, FALSE);
      QvGifFrames f = { w, h, 3, (const guint8 *const *) src->rgba, 2, NULL, FALSE, 0, FALSE };
      gsize length;
      g_autofree guint8 *gif = encode (&f, &length);
      g_autoptr (GError) error = NULL;
      GifcDecoded *d = gifc_decode (gif, length, 3, &error);
      assert_non_null (d);
      assert_int_equal (d->width, w);
      assert_int_equal (d->height, h);
      assert_int_equal (d->n_frames, 3);
      for (guint i = 0; i < 3; i++)
        assert_true (gifc_psnr (src->rgba[i], d->rgba[i], w, h, FALSE) >= 30.0);
      gifc_decoded_free (d);
      frames_free (src);
    }
}

static void
expect_error (const QvGifFrames *f, int code, const char *fragment)
{
  g_autoptr (GError) error = NULL;
  gsize length = 99;
  guint8 *gif = qv_gif_encode (f, NULL, &length, &error);

  assert_null (gif);
  assert_int_equal (length, 0);
  assert_non_null (error);
  if (!g_error_matches (error, QV_ERROR, code) || strstr (error->message, fragment) == NULL)
    print_error ("message: %s\nwanted: %s\n", error->message, fragment);
  assert_true (g_error_matches (error, QV_ERROR, code));
  assert_non_null (strstr (error->message, fragment));
}

static void
test_errors (void **state)
{
  guint8 pixel[4] = { 1, 2, 3, 255 };
  const guint8 *one[1] = { pixel }, *none[1] = { NULL };

  QvGifFrames f = { 1, 1, 0, one, 5, NULL, FALSE, 0, FALSE };
  expect_error (&f, QV_ERROR_USAGE, "at least one frame");
  f.n_frames = 1;
  f.width = 0;
  expect_error (&f, QV_ERROR_USAGE, "at least 1 x 1 pixels, not 0 x 1");
  f.width = -5;
  expect_error (&f, QV_ERROR_USAGE, "not -5 x 1");
  /* GIF89a: 16-bit logical screen sizes */
  f.width = 65536;
  expect_error (&f, QV_ERROR_LIMIT, "at most 65535 pixels");
  /* within 16 bits, but 4 GiB a frame: refused before any pixel is read */
  f.width = 65535;
  f.height = 65535;
  expect_error (&f, QV_ERROR_LIMIT, "make the picture smaller");
  f.width = f.height = 1;
  f.rgba = none;
  expect_error (&f, QV_ERROR_USAGE, "frame 1 of 1 has no pixels");
  f.rgba = one;
  f.loop_count = 65537;
  expect_error (&f, QV_ERROR_USAGE, "65536 times");
}

typedef struct {
  double last;
  guint calls, stop_at;
} Seen;

static gboolean
on_progress (double fraction, const char *stage, gpointer data)
{
  Seen *seen = data;
  assert_true (fraction >= seen->last && fraction <= 1.0);
  seen->last = fraction;
  return ++seen->calls != seen->stop_at;
}

static void
test_progress_and_cancel (void **state)
{
  const int w = 40, h = 30;
  const guint n = 10;
  Frames *src = discs (w, h, n, FALSE);
  QvGifFrames f = { w, h, n, (const guint8 *const *) src->rgba, 5, NULL, FALSE, 0, FALSE };
  Seen seen = { 0, 0, 0 };
  QvProgress progress = { on_progress, &seen };
  gsize length;
  g_autoptr (GError) error = NULL;
  g_autofree guint8 *gif = qv_gif_encode (&f, &progress, &length, &error);

  assert_non_null (gif);
  assert_true (seen.calls >= n);
  assert_true (seen.last == 1.0);

  for (guint stop = 1; stop <= seen.calls; stop += seen.calls - 1)
    {
      Seen again = { 0, 0, stop };
      QvProgress cancel = { on_progress, &again };
      g_autoptr (GError) cancelled = NULL;
      assert_null (qv_gif_encode (&f, &cancel, &length, &cancelled));
      assert_true (g_error_matches (cancelled, QV_ERROR, QV_ERROR_CANCELLED));
    }
  frames_free (src);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_discs_loop_forever),
    cmocka_unit_test (test_loop_count),
    cmocka_unit_test (test_delays),
    cmocka_unit_test (test_few_colours_exact),
    cmocka_unit_test (test_nearest_colour),
    cmocka_unit_test (test_transparent),
    cmocka_unit_test (test_dither),
    cmocka_unit_test (test_odd_sizes),
    cmocka_unit_test (test_errors),
    cmocka_unit_test (test_progress_and_cancel),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
