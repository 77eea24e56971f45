/* bench-gif.c — qv_gif_encode on the invented shaded-disc animation of
 * tests/io/gif-check.c (issue 4: a 60-frame 800 × 600 GIF of the demo in
 * at most 10 s with rendering, which takes about 0.5 s of it). Measures and
 * reports; never fails on a figure.
 *
 *   bench-gif [--frames N] [--width W] [--height H] [--repeat R]
 *
 * For the default coding, the ordered dither and the transparent
 * background: encode time (best of R), file size, the share of the frame
 * area stored (changed rectangles), and the worst and mean PSNR of the
 * frames as gdk-pixbuf decodes them. Beside it, giflib's own quantiser
 * (GifQuantizeBuffer, median cut on a 5-bit-per-channel histogram) run
 * over all frames stacked into one image, as the global palette the issue
 * names first: its time and the PSNR of its mapping.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <gif_lib.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "bench-util.h"
#include "gif-check.h"
#include "qv-gif-writer.h"

static double
seconds (void)
{
  return g_get_monotonic_time () / 1e6;
}

static void
run (const char *label, guint8 **rgba, int w, int h, guint n, int repeat, gboolean dither,
     gboolean transparent)
{
  QvGifFrames f = { w, h, n, (const guint8 *const *) rgba, 4, NULL, transparent, 0, dither };
  g_autofree guint8 *gif = NULL;
  gsize length = 0;
  double best = G_MAXDOUBLE;

  for (int r = 0; r < repeat; r++)
    {
      g_autoptr (GError) error = NULL;
      g_clear_pointer (&gif, g_free);
      double t0 = seconds ();
      gif = qv_gif_encode (&f, NULL, &length, &error);
      double t = seconds () - t0;
      if (gif == NULL)
        bench_die ("qv_gif_encode: %s", error->message);
      best = MIN (best, t);
    }

  GifcLayout layout;
  double area = 0;
  if (gifc_layout (gif, length, &layout))
    for (guint i = 0; i < layout.n_images; i++)
      area += (double) layout.image[i].width * layout.image[i].height;

  g_autoptr (GError) error = NULL;
  GifcDecoded *d = gifc_decode (gif, length, n, &error);
  if (d == NULL || d->n_frames != n)
    bench_die ("gdk-pixbuf could not decode the %s GIF: %s", label,
               error ? error->message : "wrong frame count");
  double worst = INFINITY, mean = 0;
  for (guint i = 0; i < n; i++)
    {
      double p = gifc_psnr (rgba[i], d->rgba[i], w, h, transparent);
      worst = MIN (worst, p);
      mean += p / n;
    }
  gifc_decoded_free (d);
  printf ("%-12s encode %6.3f s  %9zu bytes (%.1f kB/frame)  area stored %5.1f %%  "
          "PSNR worst %.2f dB mean %.2f dB\n",
          label, best, length, length / 1024.0 / n, 100.0 * area / ((double) n * w * h), worst,
          mean);
}

/* giflib's quantiser on all frames as one tall image: one global palette */
static void
giflib_quantiser (guint8 **rgba, int w, int h, guint n)
{
  const gsize per = (gsize) w * (gsize) h, all = per * n;
  g_autofree GifByteType *r = g_malloc (all), *g = g_malloc (all), *b = g_malloc (all);
  g_autofree GifByteType *out = g_malloc (all);
  GifColorType map[256];
  int size = 256;

  double t0 = seconds ();
  for (guint f = 0; f < n; f++)
    for (gsize i = 0; i < per; i++)
      {
        r[f * per + i] = rgba[f][4 * i];
        g[f * per + i] = rgba[f][4 * i + 1];
        b[f * per + i] = rgba[f][4 * i + 2];
      }
  if (GifQuantizeBuffer ((unsigned) w, (unsigned) (h * (int) n), &size, r, g, b, out, map)
      == GIF_ERROR)
    bench_die ("GifQuantizeBuffer failed");
  double t = seconds () - t0;

  double worst = INFINITY, mean = 0;
  g_autofree guint8 *img = g_malloc (per * 4);
  for (guint f = 0; f < n; f++)
    {
      for (gsize i = 0; i < per; i++)
        {
          const GifColorType *c = &map[out[f * per + i]];
          img[4 * i] = c->Red;
          img[4 * i + 1] = c->Green;
          img[4 * i + 2] = c->Blue;
          img[4 * i + 3] = 255;
        }
      double p = gifc_psnr (rgba[f], img, w, h, FALSE);
      worst = MIN (worst, p);
      mean += p / n;
    }
  printf ("%-12s quantise %6.3f s (palette and mapping only, %d colours)  "
          "PSNR worst %.2f dB mean %.2f dB\n",
          "giflib", t, size, worst, mean);
}

int
main (int argc, char **argv)
{
  int frames = 60, width = 800, height = 600, repeat = 3;
  GOptionEntry entries[] = {
    { "frames", 0, 0, G_OPTION_ARG_INT, &frames, "frames (60)", "N" },
    { "width", 0, 0, G_OPTION_ARG_INT, &width, "width (800)", "W" },
    { "height", 0, 0, G_OPTION_ARG_INT, &height, "height (600)", "H" },
    { "repeat", 0, 0, G_OPTION_ARG_INT, &repeat, "best of R encodes (3)", "R" },
    { NULL },
  };
  g_autoptr (GOptionContext) context = g_option_context_new ("— GIF encoding benchmark");
  g_autoptr (GError) error = NULL;

  g_set_prgname ("bench-gif");
  g_option_context_add_main_entries (context, entries, NULL);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    bench_die ("%s", error->message);
  if (frames < 1 || width < 1 || height < 1 || repeat < 1)
    bench_die ("--frames, --width, --height and --repeat must be positive");

  guint n = (guint) frames;
  g_autofree guint8 **opaque = g_new (guint8 *, n);
  g_autofree guint8 **clear = g_new (guint8 *, n);
  double t0 = seconds ();
  for (guint i = 0; i < n; i++)
    opaque[i] = gifc_discs_frame (width, height, i, n, FALSE);
  printf ("%u frames %d x %d of invented shaded discs (drawn in %.2f s)\n", n, width, height,
          seconds () - t0);
  for (guint i = 0; i < n; i++)
    clear[i] = gifc_discs_frame (width, height, i, n, TRUE);

  run ("default", opaque, width, height, n, repeat, FALSE, FALSE);
  run ("dither", opaque, width, height, n, repeat, TRUE, FALSE);
  run ("transparent", clear, width, height, n, repeat, FALSE, TRUE);
  giflib_quantiser (opaque, width, height, n);

  for (guint i = 0; i < n; i++)
    {
      g_free (opaque[i]);
      g_free (clear[i]);
    }
  return 0;
}
