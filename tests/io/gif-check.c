/* gif-check.c — see gif-check.h.
 *
 * References: the GIF89a specification (CompuServe, 1990) for the block
 * layout; the NETSCAPE2.0 application extension as browsers read it
 * (common practice: sub-block id 1, then a 16-bit little-endian loop
 * count, 0 = forever); PSNR = 10 log10(255² / MSE) (common practice).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <gdk-pixbuf/gdk-pixbuf.h>
#include <math.h>
#include <string.h>
#include "gif-check.h"

/* ---- the invented picture ---- */

typedef struct {
  double x, y, r;       /* fractions of the height, centre at rest */
  double ax, ay, phase; /* swing */
  guint8 rgb[3];
} Disc;

/* invented: colours, sizes and places chosen for this test */
static const Disc discs[] = {
  { 0.50, 0.50, 0.16, 0.03, 0.01, 0.0, { 120, 124, 132 } },
  { 0.28, 0.38, 0.11, -0.04, 0.02, 0.5, { 205, 60, 48 } },
  { 0.72, 0.36, 0.11, 0.04, 0.02, 0.5, { 205, 60, 48 } },
  { 0.30, 0.70, 0.10, -0.03, -0.03, 1.0, { 52, 88, 210 } },
  { 0.74, 0.70, 0.10, 0.03, -0.03, 1.0, { 52, 88, 210 } },
  { 0.16, 0.22, 0.06, -0.06, 0.04, 2.0, { 238, 238, 232 } },
  { 0.86, 0.20, 0.06, 0.06, 0.04, 2.0, { 238, 238, 232 } },
  { 0.12, 0.56, 0.06, -0.07, 0.00, 2.5, { 238, 238, 232 } },
  { 0.90, 0.58, 0.06, 0.07, 0.00, 2.5, { 238, 238, 232 } },
  { 0.50, 0.16, 0.08, 0.00, 0.05, 3.0, { 230, 190, 40 } },
  { 0.50, 0.86, 0.08, 0.00, -0.05, 3.0, { 70, 170, 80 } },
  { 0.40, 0.54, 0.05, 0.02, 0.05, 4.0, { 238, 238, 232 } },
};

guint8 *
gifc_discs_frame (int width, int height, guint frame, guint n_frames, gboolean transparent)
{
  guint8 *rgba = g_malloc ((gsize) width * (gsize) height * 4);
  const double s = height, t = 2 * G_PI * frame / MAX (n_frames, 1);
  const double aspect = (double) width / height;
  /* light from the upper left, towards the viewer; half vector for the
   * highlight (Blinn–Phong, from memory) */
  const double l[3] = { -0.45, -0.55, 0.70 }, ln = sqrt (l[0] * l[0] + l[1] * l[1] + l[2] * l[2]);
  double h[3] = { l[0] / ln, l[1] / ln, l[2] / ln + 1 };
  const double hn = sqrt (h[0] * h[0] + h[1] * h[1] + h[2] * h[2]);

  for (int k = 0; k < 3; k++)
    h[k] /= hn;
  for (gsize i = 0; i < (gsize) width * (gsize) height; i++)
    {
      guint8 *p = rgba + 4 * i;
      p[0] = 233;
      p[1] = 236;
      p[2] = 241;
      p[3] = transparent ? 0 : 255;
    }
  for (guint d = 0; d < G_N_ELEMENTS (discs); d++)
    {
      const Disc *c = &discs[d];
      const double cx = (c->x * aspect + c->ax * cos (t + c->phase)) * s;
      const double cy = (c->y + c->ay * sin (t + c->phase)) * s, r = c->r * s;
      const int x0 = MAX (0, (int) floor (cx - r - 1)), x1 = MIN (width - 1, (int) ceil (cx + r + 1));
      const int y0 = MAX (0, (int) floor (cy - r - 1)), y1 = MIN (height - 1, (int) ceil (cy + r + 1));
      for (int y = y0; y <= y1; y++)
        for (int x = x0; x <= x1; x++)
          {
            const double dx = (x + 0.5 - cx) / r, dy = (y + 0.5 - cy) / r;
            const double rho = sqrt (dx * dx + dy * dy);
            const double cover = CLAMP ((1 - rho) * r + 0.5, 0, 1);
            if (cover <= 0)
              continue;
            const double q = MIN (rho, 1.0), nz = sqrt (1 - q * q);
            const double nx = rho > 1 ? dx / rho : dx, ny = rho > 1 ? dy / rho : dy;
            const double diffuse = MAX (0, (nx * l[0] + ny * l[1] + nz * l[2]) / ln);
            const double spec = pow (MAX (0, nx * h[0] + ny * h[1] + nz * h[2]), 40);
            guint8 *p = rgba + 4 * ((gsize) y * (gsize) width + (gsize) x);
            for (int k = 0; k < 3; k++)
              {
                double v = c->rgb[k] * (0.22 + 0.78 * diffuse) + 255 * 0.45 * spec;
                v = MIN (v, 255);
                if (transparent && p[3] == 0)
                  p[k] = (guint8) (v + 0.5);
                else
                  p[k] = (guint8) (p[k] + (v - p[k]) * cover + 0.5);
              }
            if (transparent)
              p[3] = (guint8) MAX (p[3], (int) (255 * cover + 0.5));
          }
    }
  return rgba;
}

/* ---- gdk-pixbuf ---- */

static guint8 *
pixbuf_rgba (GdkPixbuf *pixbuf)
{
  const int w = gdk_pixbuf_get_width (pixbuf), h = gdk_pixbuf_get_height (pixbuf);
  const int stride = gdk_pixbuf_get_rowstride (pixbuf), nc = gdk_pixbuf_get_n_channels (pixbuf);
  const guint8 *src = gdk_pixbuf_read_pixels (pixbuf);
  guint8 *out = g_malloc ((gsize) w * (gsize) h * 4);

  for (int y = 0; y < h; y++)
    for (int x = 0; x < w; x++)
      {
        const guint8 *p = src + (gsize) y * (gsize) stride + (gsize) x * (gsize) nc;
        guint8 *o = out + 4 * ((gsize) y * (gsize) w + (gsize) x);
        o[0] = p[0];
        o[1] = p[1];
        o[2] = p[2];
        o[3] = nc == 4 ? p[3] : 255;
      }
  return out;
}

GifcDecoded *
gifc_decode (const guint8 *data, gsize length, guint max_frames, GError **error)
{
  g_autoptr (GdkPixbufLoader) loader = gdk_pixbuf_loader_new_with_type ("gif", error);
  GifcDecoded *d;

  if (loader == NULL)
    return NULL;
  if (!gdk_pixbuf_loader_write (loader, data, length, error)
      || !gdk_pixbuf_loader_close (loader, error))
    return NULL;
  GdkPixbufAnimation *anim = gdk_pixbuf_loader_get_animation (loader);
  if (anim == NULL)
    {
      g_set_error (error, GDK_PIXBUF_ERROR, GDK_PIXBUF_ERROR_FAILED, "no animation");
      return NULL;
    }
  d = g_new0 (GifcDecoded, 1);
  d->width = gdk_pixbuf_animation_get_width (anim);
  d->height = gdk_pixbuf_animation_get_height (anim);
  d->rgba = g_new0 (guint8 *, max_frames);
  d->delay_ms = g_new0 (int, max_frames);

  /* gdk-pixbuf's iterators take GTimeVal, deprecated by GLib but the only
   * way to step an animation */
  G_GNUC_BEGIN_IGNORE_DEPRECATIONS
  GTimeVal now = { 1000, 0 };
  g_autoptr (GdkPixbufAnimationIter) iter = gdk_pixbuf_animation_get_iter (anim, &now);
  while (d->n_frames < max_frames)
    {
      int delay = gdk_pixbuf_animation_iter_get_delay_time (iter);
      if (delay < 0)
        {
          d->ended = TRUE;
          break;
        }
      d->rgba[d->n_frames] = pixbuf_rgba (gdk_pixbuf_animation_iter_get_pixbuf (iter));
      d->delay_ms[d->n_frames] = delay;
      d->n_frames++;
      g_time_val_add (&now, (glong) delay * 1000);
      gdk_pixbuf_animation_iter_advance (iter, &now);
    }
  G_GNUC_END_IGNORE_DEPRECATIONS
  return d;
}

void
gifc_decoded_free (GifcDecoded *d)
{
  if (d == NULL)
    return;
  for (guint i = 0; i < d->n_frames; i++)
    g_free (d->rgba[i]);
  g_free (d->rgba);
  g_free (d->delay_ms);
  g_free (d);
}

/* ---- the specification's blocks ---- */

static gboolean
skip_sub_blocks (const guint8 *data, gsize length, gsize *at)
{
  while (*at < length)
    {
      guint n = data[(*at)++];
      if (n == 0)
        return TRUE;
      *at += n;
    }
  return FALSE;
}

gboolean
gifc_layout (const guint8 *data, gsize length, GifcLayout *g)
{
  gsize at = 13;
  int disposal = 0, delay = 0, transparent = -1;

  memset (g, 0, sizeof *g);
  g->loop_count = -1;
  if (length < 14 || memcmp (data, "GIF89a", 6) != 0)
    return FALSE;
  g->width = data[6] | data[7] << 8;
  g->height = data[8] | data[9] << 8;
  if (data[10] & 0x80)
    {
      g->global_colours = 1 << ((data[10] & 7) + 1);
      at += 3 * (gsize) g->global_colours;
    }
  while (at < length)
    {
      guint8 tag = data[at++];
      if (tag == 0x3B)
        return at == length;
      if (tag == 0x21 && at < length)
        {
          guint8 label = data[at++];
          if (label == 0xF9 && at + 6 <= length && data[at] == 4)
            {
              disposal = (data[at + 1] >> 2) & 7;
              delay = data[at + 2] | data[at + 3] << 8;
              transparent = (data[at + 1] & 1) ? data[at + 4] : -1;
              at += 5;
              if (data[at++] != 0)
                return FALSE;
            }
          else if (label == 0xFF && at + 12 <= length && data[at] == 11)
            {
              gboolean netscape = memcmp (data + at + 1, "NETSCAPE2.0", 11) == 0;
              at += 12;
              if (netscape && at + 4 <= length && data[at] == 3 && data[at + 1] == 1)
                g->loop_count = data[at + 2] | data[at + 3] << 8;
              if (!skip_sub_blocks (data, length, &at))
                return FALSE;
            }
          else if (!skip_sub_blocks (data, length, &at))
            return FALSE;
        }
      else if (tag == 0x2C && at + 10 <= length)
        {
          if (g->n_images == G_N_ELEMENTS (g->image))
            return FALSE;
          GifcImage *im = &g->image[g->n_images++];
          im->left = data[at] | data[at + 1] << 8;
          im->top = data[at + 2] | data[at + 3] << 8;
          im->width = data[at + 4] | data[at + 5] << 8;
          im->height = data[at + 6] | data[at + 7] << 8;
          guint8 packed = data[at + 8];
          at += 9;
          if (packed & 0x80)
            at += 3 * ((gsize) 1 << ((packed & 7) + 1));
          at++; /* LZW minimum code size */
          if (!skip_sub_blocks (data, length, &at))
            return FALSE;
          im->disposal = disposal;
          im->delay_cs = delay;
          im->transparent = transparent;
          disposal = delay = 0;
          transparent = -1;
        }
      else
        return FALSE;
    }
  return FALSE;
}

double
gifc_psnr (const guint8 *a, const guint8 *b, int width, int height, gboolean where_opaque)
{
  double sum = 0;
  gsize n = 0;

  for (gsize i = 0; i < (gsize) width * (gsize) height; i++)
    {
      if (where_opaque && a[4 * i + 3] < 128)
        continue;
      for (int k = 0; k < 3; k++)
        {
          double d = (double) a[4 * i + k] - b[4 * i + k];
          sum += d * d;
        }
      n += 3;
    }
  if (n == 0 || sum == 0)
    return INFINITY;
  return 10 * log10 (255.0 * 255.0 / (sum / n));
}
