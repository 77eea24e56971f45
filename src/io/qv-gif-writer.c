/* qv-gif-writer.c — animated GIF encoding with giflib into memory.
 *
 * The palette: one pass over every pixel of every frame fills a histogram
 * of 2¹⁸ cells (6 bits per channel) that keeps each cell's exact colour
 * sum, so a cell stands for its pixels by their mean, and counts the exact
 * colours as long as there are few enough to use them as the palette.
 * Otherwise median cut (Heckbert, "Color image quantization for frame
 * buffer display", SIGGRAPH 1982), splitting the box of largest squared
 * error where the split leaves the least, then Lloyd's k-means iterations
 * on the cells. Distances are plain RGB squared differences: the error the
 * PSNR of the frames measures. Pixels are mapped to the nearest entry
 * through a lazily filled 2²⁴ table, so each distinct colour is searched
 * once.
 *
 * Layout (GIF89a specification, CompuServe 1990): header and logical
 * screen with the global colour table, the NETSCAPE2.0 application
 * extension (sub-block 1: repeat count, little endian; common practice, it
 * is not in the specification), then per frame a
 * graphics control extension (disposal, delay, transparent index) and an
 * image descriptor with LZW data, which giflib writes.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <gif_lib.h>
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-gif-writer.h"

#define CELL_BITS 6
#define N_CELLS (1u << (3 * CELL_BITS))
#define MAX_COLOURS 256
#define KMEANS_ITERATIONS 12

typedef struct {
  guint64 n, r, g, b;
} Cell;

/* a histogram cell as a point: its pixels' mean colour and their number */
typedef struct {
  double c[3];
  double w;
} Point;

typedef double Vec3[3];
typedef double Vec4[4];

typedef struct {
  guint lo, hi; /* points [lo, hi) */
  double sse;
} Box;

typedef struct {
  guint8 rgb[MAX_COLOURS][3];
  guint n;
} Palette;

static inline guint
cell_of (const guint8 *p)
{
  return ((guint) (p[0] >> (8 - CELL_BITS)) << (2 * CELL_BITS))
         | ((guint) (p[1] >> (8 - CELL_BITS)) << CELL_BITS) | (guint) (p[2] >> (8 - CELL_BITS));
}

static inline guint32
rgb24 (const guint8 *p)
{
  return ((guint32) p[0] << 16) | ((guint32) p[1] << 8) | p[2];
}

/* ---- exact colours, while there are few ---- */

typedef struct {
  guint32 key[1024]; /* colour + 1; 0 is empty */
  guint n, limit;
  gboolean overflow;
} ExactSet;

static void
exact_add (ExactSet *set, guint32 colour)
{
  guint32 key = colour + 1;
  guint h = (colour * 2654435761u) >> 22;

  if (set->overflow)
    return;
  while (set->key[h] != 0)
    {
      if (set->key[h] == key)
        return;
      h = (h + 1) & 1023;
    }
  if (set->n == set->limit)
    {
      set->overflow = TRUE;
      return;
    }
  set->key[h] = key;
  set->n++;
}

/* ---- median cut ---- */

static int
compare_points (gconstpointer a, gconstpointer b, gpointer data)
{
  const int axis = GPOINTER_TO_INT (data);
  double x = ((const Point *) a)->c[axis], y = ((const Point *) b)->c[axis];
  return (x > y) - (x < y);
}

static double
box_sse (const Point *pt, guint lo, guint hi, double mean[3])
{
  double w = 0, s[3] = { 0, 0, 0 }, q = 0;

  for (guint i = lo; i < hi; i++)
    {
      w += pt[i].w;
      for (int k = 0; k < 3; k++)
        {
          s[k] += pt[i].w * pt[i].c[k];
          q += pt[i].w * pt[i].c[k] * pt[i].c[k];
        }
    }
  double sse = q;
  for (int k = 0; k < 3; k++)
    {
      mean[k] = w > 0 ? s[k] / w : 0;
      sse -= w > 0 ? s[k] * s[k] / w : 0;
    }
  return MAX (sse, 0.0);
}

/* Splits @box where the two halves' squared errors add up to the least,
 * along the axis of largest spread; FALSE when it holds one point. */
static gboolean
split_box (Point *pt, Box *box, Box *out)
{
  guint n = box->hi - box->lo;
  double mean[3], var[3] = { 0, 0, 0 };

  if (n < 2)
    return FALSE;
  box_sse (pt, box->lo, box->hi, mean);
  for (guint i = box->lo; i < box->hi; i++)
    for (int k = 0; k < 3; k++)
      var[k] += pt[i].w * (pt[i].c[k] - mean[k]) * (pt[i].c[k] - mean[k]);
  int axis = var[1] >= var[0] ? (var[2] > var[1] ? 2 : 1) : (var[2] > var[0] ? 2 : 0);
  g_qsort_with_data (pt + box->lo, (gint) n, sizeof *pt, compare_points, GINT_TO_POINTER (axis));

  /* prefix sums give each split's squared error in one sweep */
  double tw = 0, ts[3] = { 0, 0, 0 }, tq = 0;
  for (guint i = box->lo; i < box->hi; i++)
    {
      tw += pt[i].w;
      for (int k = 0; k < 3; k++)
        {
          ts[k] += pt[i].w * pt[i].c[k];
          tq += pt[i].w * pt[i].c[k] * pt[i].c[k];
        }
    }
  double lw = 0, ls[3] = { 0, 0, 0 }, lq = 0, best = G_MAXDOUBLE;
  guint best_at = box->lo + 1;
  for (guint i = box->lo; i + 1 < box->hi; i++)
    {
      lw += pt[i].w;
      for (int k = 0; k < 3; k++)
        {
          ls[k] += pt[i].w * pt[i].c[k];
          lq += pt[i].w * pt[i].c[k] * pt[i].c[k];
        }
      double rw = tw - lw, e = tq;
      for (int k = 0; k < 3; k++)
        e -= ls[k] * ls[k] / lw + (rw > 0 ? (ts[k] - ls[k]) * (ts[k] - ls[k]) / rw : 0);
      if (e < best)
        {
          best = e;
          best_at = i + 1;
        }
    }
  out->lo = best_at;
  out->hi = box->hi;
  box->hi = best_at;
  box->sse = box_sse (pt, box->lo, box->hi, mean);
  out->sse = box_sse (pt, out->lo, out->hi, mean);
  return TRUE;
}

static guint
nearest (const Vec3 *centre, guint k, const double *c)
{
  guint best = 0;
  double best_d = G_MAXDOUBLE;

  for (guint j = 0; j < k; j++)
    {
      double d0 = c[0] - centre[j][0], d = d0 * d0;
      if (d >= best_d)
        continue;
      double d1 = c[1] - centre[j][1];
      d += d1 * d1;
      if (d >= best_d)
        continue;
      double d2 = c[2] - centre[j][2];
      d += d2 * d2;
      if (d < best_d)
        {
          best_d = d;
          best = j;
        }
    }
  return best;
}

static void
median_cut (Point *pt, guint n_points, guint want, Palette *palette)
{
  g_autofree Box *box = g_new (Box, want);
  g_autofree Vec3 *centre = g_new (Vec3, want);
  g_autofree Vec4 *sum = g_new (Vec4, want);
  guint n_box = 1;
  double mean[3];

  box[0].lo = 0;
  box[0].hi = n_points;
  box[0].sse = box_sse (pt, 0, n_points, mean);
  while (n_box < want)
    {
      guint worst = 0;
      for (guint i = 1; i < n_box; i++)
        if (box[i].sse > box[worst].sse)
          worst = i;
      if (box[worst].sse <= 0 || !split_box (pt, &box[worst], &box[n_box]))
        break;
      n_box++;
    }
  for (guint i = 0; i < n_box; i++)
    box_sse (pt, box[i].lo, box[i].hi, centre[i]);

  /* Lloyd's iterations on the cells, weighted by their pixel counts */
  double last = G_MAXDOUBLE;
  for (int it = 0; it < KMEANS_ITERATIONS; it++)
    {
      double total = 0;
      memset (sum, 0, sizeof (Vec4) * n_box);
      for (guint i = 0; i < n_points; i++)
        {
          guint j = nearest ((const Vec3 *) centre, n_box, pt[i].c);
          for (int k = 0; k < 3; k++)
            {
              double d = pt[i].c[k] - centre[j][k];
              total += pt[i].w * d * d;
              sum[j][k] += pt[i].w * pt[i].c[k];
            }
          sum[j][3] += pt[i].w;
        }
      for (guint j = 0; j < n_box; j++)
        if (sum[j][3] > 0)
          for (int k = 0; k < 3; k++)
            centre[j][k] = sum[j][k] / sum[j][3];
      if (last - total <= 1e-4 * total)
        break;
      last = total;
    }
  for (guint j = 0; j < n_box; j++)
    for (int k = 0; k < 3; k++)
      palette->rgb[j][k] = (guint8) CLAMP ((int) (centre[j][k] + 0.5), 0, 255);
  palette->n = n_box;
}

/* ---- mapping ---- */

/* The palette sorted by r + g + b: a colour's distance to an entry is at
 * least |Δ(r + g + b)| / √3, so the search walks out from the colour's own
 * sum and stops on each side once that bound passes the best found. */
typedef struct {
  const Palette *palette;
  guint8 *index;    /* 2²⁴ entries */
  guint32 *known;   /* 2²⁴ bits */
  int sum[MAX_COLOURS];
  guint8 entry[MAX_COLOURS];
  guint8 first[3 * 255 + 2]; /* first sorted position with sum ≥ s */
} Map;

static void
map_init (Map *map, const Palette *palette)
{
  guint n = 0;

  map->palette = palette;
  for (int total = 0; total <= 3 * 255; total++)
    {
      map->first[total] = (guint8) MIN (n, MAX_COLOURS - 1);
      for (guint j = 0; j < palette->n; j++)
        if (palette->rgb[j][0] + palette->rgb[j][1] + palette->rgb[j][2] == total)
          {
            map->sum[n] = total;
            map->entry[n++] = (guint8) j;
          }
    }
}

static inline guint8
map_colour (Map *map, guint32 c)
{
  if (map->known[c >> 5] & (1u << (c & 31)))
    return map->index[c];

  const int r = (int) (c >> 16), g = (int) ((c >> 8) & 255), b = (int) (c & 255);
  const Palette *p = map->palette;
  const int n = (int) p->n, total = r + g + b;
  int best_d = 3 * 255 * 255 + 1, hi = map->first[total]; /* above any distance */
  guint best = map->entry[0];
  if (hi >= n || map->sum[hi] < total)
    hi = n; /* every sum is below (first[] holds at most 255) */
  int lo = hi - 1;
  while (best_d > 0 && (lo >= 0 || hi < n))
    {
      for (int side = 0; side < 2; side++)
        {
          int *at = side ? &hi : &lo;
          if (*at < 0 || *at >= n)
            continue;
          const int ds = map->sum[*at] - total;
          if (ds * ds >= 3 * best_d)
            {
              *at = side ? n : -1;
              continue;
            }
          const guint8 *q = p->rgb[map->entry[*at]];
          const int dr = r - q[0], dg = g - q[1], db = b - q[2];
          const int d = dr * dr + dg * dg + db * db;
          if (d < best_d)
            {
              best_d = d;
              best = map->entry[*at];
            }
          *at += side ? 1 : -1;
        }
    }
  map->index[c] = (guint8) best;
  map->known[c >> 5] |= 1u << (c & 31);
  return (guint8) best;
}

/* Bayer's 8 × 8 threshold matrix (Bayer, "An optimum method for two-level
 * rendition of continuous-tone pictures", 1973), built by recursion. */
static int
bayer8 (int x, int y)
{
  int v = 0;
  for (int bit = 2; bit >= 0; bit--)
    {
      int xb = (x >> (2 - bit)) & 1, yb = (y >> (2 - bit)) & 1;
      v |= ((xb ^ yb) | (yb << 1)) << (2 * bit);
    }
  return v;
}

static void
map_frame (Map *map, const guint8 *rgba, int width, int height, gboolean transparent,
           guint8 transparent_index, const signed char *dither, guint8 *out)
{
  guint32 last = G_MAXUINT32;
  guint8 last_index = 0;

  for (int y = 0; y < height; y++)
    {
      const guint8 *p = rgba + (gsize) y * (gsize) width * 4;
      guint8 *o = out + (gsize) y * (gsize) width;
      const signed char *row = dither ? dither + 8 * (y & 7) : NULL;
      for (int x = 0; x < width; x++, p += 4)
        {
          if (transparent && p[3] < 128)
            {
              o[x] = transparent_index;
              continue;
            }
          guint32 c;
          if (row)
            {
              int t = row[x & 7];
              c = ((guint32) CLAMP (p[0] + t, 0, 255) << 16)
                  | ((guint32) CLAMP (p[1] + t, 0, 255) << 8) | (guint32) CLAMP (p[2] + t, 0, 255);
            }
          else
            c = rgb24 (p);
          if (c != last)
            {
              last = c;
              last_index = map_colour (map, c);
            }
          o[x] = last_index;
        }
    }
}

/* ---- giflib ---- */

static int
sink_write (GifFileType *gif, const GifByteType *data, int length)
{
  GByteArray *bytes = gif->UserData;

  if (length < 0 || (guint64) bytes->len + (guint64) length > G_MAXUINT)
    return 0;
  g_byte_array_append (bytes, data, (guint) length);
  return length;
}

static gboolean
gif_failed (int code, const char *what, GError **error)
{
  const char *why = GifErrorString (code);
  g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "could not encode the GIF (%s): %s", what,
               why ? why : "unknown giflib error");
  return FALSE;
}

/* @plays as decoders count: 0 forever, otherwise the first play and
 * plays − 1 repeats; one play needs no extension. */
static gboolean
put_loop (GifFileType *gif, guint plays, GError **error)
{
  const guint repeats = plays == 0 ? 0 : plays - 1;
  GifByteType app[11], sub[3] = { 1, (GifByteType) (repeats & 255), (GifByteType) (repeats >> 8) };

  if (plays == 1)
    return TRUE;

  memcpy (app, "NETSCAPE2.0", 11);
  if (EGifPutExtensionLeader (gif, APPLICATION_EXT_FUNC_CODE) == GIF_ERROR
      || EGifPutExtensionBlock (gif, 11, app) == GIF_ERROR
      || EGifPutExtensionBlock (gif, 3, sub) == GIF_ERROR
      || EGifPutExtensionTrailer (gif) == GIF_ERROR)
    return gif_failed (gif->Error, "loop extension", error);
  return TRUE;
}

/* Writes a frame whole, or with @previous the rectangle that changed, in
 * which pixels left as they were may become @unchanged when it is ≥ 0 (the
 * graphics control extension's transparent index). LZW codes long runs of
 * one index best: that is done only when it leaves fewer changes of index
 * along the rows than the pixels themselves (on smooth shading it mostly
 * does not; under a dither it does). */
static gboolean
put_frame (GifFileType *gif, const guint8 *index, const guint8 *previous, int width, int height,
           int disposal, guint delay, int transparent_index, int unchanged, guint8 *line,
           GError **error)
{
  GraphicsControlBlock gcb = { disposal, false, (int) delay, transparent_index };
  GifByteType ext[4];
  int x0 = 0, y0 = 0, x1 = width, y1 = height;

  if (previous)
    {
      /* the rectangle of changed pixels; one unchanged pixel when none */
      const gsize w = (gsize) width;
      while (y0 < height && memcmp (index + y0 * w, previous + y0 * w, w) == 0)
        y0++;
      if (y0 == height)
        {
          y0 = x0 = 0;
          y1 = x1 = 1;
        }
      else
        {
          while (memcmp (index + (y1 - 1) * w, previous + (y1 - 1) * w, w) == 0)
            y1--;
          x0 = width;
          x1 = 0;
          for (int y = y0; y < y1; y++)
            {
              const guint8 *a = index + y * w, *b = previous + y * w;
              int l = 0, r = width;
              while (l < x0 && a[l] == b[l])
                l++;
              while (r > MAX (x1, l) && a[r - 1] == b[r - 1])
                r--;
              x0 = MIN (x0, l);
              x1 = MAX (x1, r);
            }
        }
    }
  if (previous && unchanged >= 0)
    {
      gsize plain = 0, masked = 0;
      for (int y = y0; y < y1; y++)
        {
          const guint8 *a = index + (gsize) y * (gsize) width, *b = previous + (gsize) y * (gsize) width;
          int last_masked = -1;
          for (int x = x0; x < x1; x++)
            {
              int m = a[x] == b[x] ? unchanged : a[x];
              plain += x > x0 && a[x] != a[x - 1];
              masked += x > x0 && m != last_masked;
              last_masked = m;
            }
        }
      if (masked < plain)
        gcb.TransparentColor = unchanged;
      else
        unchanged = -1;
    }
  EGifGCBToExtension (&gcb, ext);
  if (EGifPutExtension (gif, GRAPHICS_EXT_FUNC_CODE, 4, ext) == GIF_ERROR
      || EGifPutImageDesc (gif, x0, y0, x1 - x0, y1 - y0, false, NULL) == GIF_ERROR)
    return gif_failed (gif->Error, "frame header", error);
  for (int y = y0; y < y1; y++)
    {
      const gsize at = (gsize) y * (gsize) width + (gsize) x0;
      GifPixelType *row = (GifPixelType *) index + at;
      if (previous && unchanged >= 0)
        {
          for (int x = 0; x < x1 - x0; x++)
            line[x] = index[at + x] == previous[at + x] ? (guint8) unchanged : index[at + x];
          row = line;
        }
      if (EGifPutLine (gif, row, x1 - x0) == GIF_ERROR)
        return gif_failed (gif->Error, "pixels", error);
    }
  return TRUE;
}

/* ---- the palette of all frames ---- */

static gboolean
choose_palette (const QvGifFrames *f, const QvProgress *progress, Palette *palette,
                GError **error)
{
  const gsize n = (gsize) f->width * (gsize) f->height;
  /* one index stays free for transparency: the background, or the pixels a
   * frame leaves as they were; 256 exact colours are kept all the same */
  const guint want = MAX_COLOURS - 1;
  g_autofree Cell *cell = g_try_new0 (Cell, N_CELLS);
  g_autofree ExactSet *exact = g_new0 (ExactSet, 1);

  if (cell == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "out of memory for the GIF palette");
      return FALSE;
    }
  exact->limit = f->transparent ? want : MAX_COLOURS;
  for (guint fr = 0; fr < f->n_frames; fr++)
    {
      const guint8 *rgba = f->rgba[fr];
      guint32 run_colour = 0;
      guint64 run = 0;
      for (gsize i = 0; i <= n; i++)
        {
          const guint8 *p = rgba + 4 * i;
          gboolean skip = i < n && f->transparent && p[3] < 128;
          guint32 c = i < n ? rgb24 (p) : 0;
          if (skip)
            continue;
          if (run && i < n && c == run_colour)
            {
              run++;
              continue;
            }
          if (run)
            {
              guint8 q[3] = { (guint8) (run_colour >> 16), (guint8) (run_colour >> 8),
                              (guint8) run_colour };
              Cell *e = &cell[cell_of (q)];
              e->n += run;
              e->r += run * q[0];
              e->g += run * q[1];
              e->b += run * q[2];
              exact_add (exact, run_colour);
            }
          run_colour = c;
          run = i < n ? 1 : 0;
        }
      if (!qv_progress_report (progress, 0.3 * (fr + 1) / f->n_frames, "palette", error))
        return FALSE;
    }

  if (!exact->overflow)
    {
      palette->n = 0;
      for (guint h = 0; h < G_N_ELEMENTS (exact->key); h++)
        if (exact->key[h])
          {
            guint32 c = exact->key[h] - 1;
            palette->rgb[palette->n][0] = (guint8) (c >> 16);
            palette->rgb[palette->n][1] = (guint8) (c >> 8);
            palette->rgb[palette->n][2] = (guint8) c;
            palette->n++;
          }
      return TRUE;
    }

  guint n_points = 0;
  for (guint i = 0; i < N_CELLS; i++)
    n_points += cell[i].n > 0;
  g_autofree Point *pt = g_new (Point, n_points);
  n_points = 0;
  for (guint i = 0; i < N_CELLS; i++)
    if (cell[i].n)
      {
        double w = (double) cell[i].n;
        pt[n_points].c[0] = (double) cell[i].r / w;
        pt[n_points].c[1] = (double) cell[i].g / w;
        pt[n_points].c[2] = (double) cell[i].b / w;
        pt[n_points].w = w;
        n_points++;
      }
  median_cut (pt, n_points, want, palette);
  return TRUE;
}

static gboolean
check_frames (const QvGifFrames *f, GError **error)
{
  if (f->n_frames == 0 || f->rgba == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "a GIF needs at least one frame");
      return FALSE;
    }
  if (f->width < 1 || f->height < 1)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "a GIF frame must be at least 1 x 1 pixels, not %d x %d", f->width, f->height);
      return FALSE;
    }
  if (f->width > QV_GIF_MAX_SIDE || f->height > QV_GIF_MAX_SIDE)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                   "a GIF frame is at most %d pixels wide and high (16-bit sizes), not %d x %d",
                   QV_GIF_MAX_SIDE, f->width, f->height);
      return FALSE;
    }
  if ((guint64) f->width * (guint64) f->height > QV_GIF_MAX_PIXELS)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                   "a %d x %d GIF frame has more than %" G_GUINT64_FORMAT
                   " pixels; make the picture smaller", f->width, f->height, QV_GIF_MAX_PIXELS);
      return FALSE;
    }
  if (f->loop_count > 65536)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "a GIF plays 0 (forever) to 65536 times (loop count), not %u", f->loop_count);
      return FALSE;
    }
  for (guint i = 0; i < f->n_frames; i++)
    if (f->rgba[i] == NULL)
      {
        g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "GIF frame %u of %u has no pixels", i + 1,
                     f->n_frames);
        return FALSE;
      }
  return TRUE;
}

guint8 *
qv_gif_encode (const QvGifFrames *f, const QvProgress *progress, gsize *length, GError **error)
{
  const gsize n = (gsize) f->width * (gsize) f->height;
  Palette palette = { { { 0 } }, 0 };
  Map map = { 0 };
  g_autofree guint8 *plane = NULL, *previous = NULL, *line = NULL;
  signed char dither[64];
  GByteArray *bytes = NULL;
  GifFileType *gif = NULL;
  ColorMapObject *colours = NULL;
  gboolean ok = FALSE;
  int code = 0;

  *length = 0;
  if (!check_frames (f, error) || !choose_palette (f, progress, &palette, error))
    return NULL;

  map_init (&map, &palette);
  const int transparent_index = f->transparent ? (int) palette.n : NO_TRANSPARENT_COLOR;
  const int unchanged = !f->transparent && palette.n < MAX_COLOURS ? (int) palette.n : -1;
  const guint used = palette.n + (transparent_index >= 0 || unchanged >= 0 ? 1 : 0);
  int bits = 1;
  while ((1u << bits) < used)
    bits++;
  /* ±8 levels, symmetric about 0: about the spacing of a palette fitted to
   * smooth shading (measured in tests/bench/bench-gif.c) */
  for (int i = 0; i < 64; i++)
    dither[i] = (signed char) lround ((2 * bayer8 (i % 8, i / 8) - 63) / 8.0);

  plane = g_try_malloc (n);
  line = g_malloc ((gsize) f->width);
  previous = f->transparent ? NULL : g_try_malloc (n);
  map.index = g_try_malloc (1u << 24);
  map.known = g_try_malloc0 ((1u << 24) / 8);
  if (plane == NULL || (!f->transparent && previous == NULL) || map.index == NULL
      || map.known == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "out of memory for a %d x %d GIF", f->width,
                   f->height);
      goto out;
    }

  colours = GifMakeMapObject (1 << bits, NULL);
  if (colours == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "out of memory for the GIF palette");
      goto out;
    }
  for (guint j = 0; j < palette.n; j++)
    {
      colours->Colors[j].Red = palette.rgb[j][0];
      colours->Colors[j].Green = palette.rgb[j][1];
      colours->Colors[j].Blue = palette.rgb[j][2];
    }

  bytes = g_byte_array_new ();
  gif = EGifOpen (bytes, sink_write, &code);
  if (gif == NULL)
    {
      gif_failed (code, "start", error);
      goto out;
    }
  EGifSetGifVersion (gif, true);
  if (EGifPutScreenDesc (gif, f->width, f->height, 8,
                         f->transparent ? transparent_index : 0, colours) == GIF_ERROR)
    {
      gif_failed (gif->Error, "screen", error);
      goto out;
    }
  if (!put_loop (gif, f->loop_count, error))
    goto out;

  for (guint fr = 0; fr < f->n_frames; fr++)
    {
      guint delay = f->delays_cs ? f->delays_cs[fr] : f->delay_cs;
      delay = CLAMP (delay, QV_GIF_MIN_DELAY_CS, QV_GIF_MAX_DELAY_CS);
      map_frame (&map, f->rgba[fr], f->width, f->height, f->transparent,
                 (guint8) MAX (transparent_index, 0), f->dither ? dither : NULL, plane);
      if (!put_frame (gif, plane, fr > 0 ? previous : NULL, f->width, f->height,
                      f->transparent ? DISPOSE_BACKGROUND : DISPOSE_DO_NOT, delay,
                      transparent_index, unchanged, line, error))
        goto out;
      if (previous)
        {
          guint8 *t = previous;
          previous = plane;
          plane = t;
        }
      if (!qv_progress_report (progress, 0.3 + 0.7 * (fr + 1) / f->n_frames, "frames", error))
        goto out;
    }
  ok = TRUE;

out:
  if (gif && EGifCloseFile (gif, &code) == GIF_ERROR && ok)
    ok = gif_failed (code, "end", error);
  if (colours)
    GifFreeMapObject (colours);
  g_free (map.index);
  g_free (map.known);
  if (!ok)
    {
      if (bytes)
        g_byte_array_free (bytes, TRUE);
      return NULL;
    }
  *length = bytes->len;
  return g_byte_array_free (bytes, FALSE);
}
