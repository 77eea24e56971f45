/* qv-dispersion-plot.c — cairo drawing of a phonon dispersion.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-dispersion-plot.h"
#include "qv-plot-private.h"

#define MARGIN_LEFT 74.0
#define MARGIN_RIGHT 18.0
/* A wavenumber below −(this share of the largest |ω|) counts as imaginary
 * when the range is taken from the data; smaller negative values are the
 * round-off of acoustic zeros at Γ. */
#define IMAGINARY_SHARE 1e-3
/* Padding of a range taken from the data, as a share of its span. */
#define PAD 0.05

void
qv_dispersion_plot_options_init (QvDispersionPlotOptions *o)
{
  memset (o, 0, sizeof *o);
  o->width = 900;
  o->height = 500;
  o->unit = QV_FREQUENCY_CM1;
  o->selected_q = o->selected_branch = -1;
  o->hover_q = o->hover_branch = -1;
}

void
qv_dispersion_plot_area (const QvDispersionPlotOptions *o, double *left, double *top,
                         double *right, double *bottom)
{
  *left = MARGIN_LEFT;
  *top = QV_PLOT_MARGIN_TOP;
  *right = MAX (MARGIN_LEFT + 1.0, o->width - MARGIN_RIGHT);
  *bottom = MAX (QV_PLOT_MARGIN_TOP + 1.0, o->height - QV_PLOT_MARGIN_BOTTOM);
}

void
qv_dispersion_plot_range (const QvBandSampling *s, gsize nb, const double *w,
                          const QvDispersionPlotOptions *o, double *y_min, double *y_max)
{
  double lo = G_MAXDOUBLE, hi = -G_MAXDOUBLE, big = 0.0, span;
  const gsize n = s ? s->n_q * nb : 0;

  if (o->has_range && o->y_max > o->y_min && isfinite (o->y_min) && isfinite (o->y_max))
    {
      *y_min = o->y_min;
      *y_max = o->y_max;
      return;
    }
  for (gsize i = 0; w && i < n; i++)
    if (isfinite (w[i]))
      {
        lo = MIN (lo, w[i]);
        hi = MAX (hi, w[i]);
        big = MAX (big, fabs (w[i]));
      }
  if (lo > hi)
    {
      *y_min = 0.0;
      *y_max = 100.0;
      return;
    }
  lo = lo < -IMAGINARY_SHARE * big ? lo : 0.0;
  hi = MAX (hi, 0.0);
  span = hi - lo;
  if (!(span > 0))
    span = 1.0;
  *y_max = hi + PAD * span;
  *y_min = lo < 0 ? lo - PAD * span : 0.0;
}

static void
x_range (const QvBandSampling *s, double *d0, double *d1)
{
  *d0 = s && s->n_q ? s->distance[0] : 0.0;
  *d1 = s && s->n_q ? s->distance[s->n_q - 1] : 1.0;
  if (!(*d1 > *d0))
    *d1 = *d0 + 1.0;
}

double
qv_dispersion_plot_x_to_pixel (const QvBandSampling *s, const QvDispersionPlotOptions *o,
                               double distance)
{
  double left, top, right, bottom, d0, d1;
  qv_dispersion_plot_area (o, &left, &top, &right, &bottom);
  x_range (s, &d0, &d1);
  return left + (distance - d0) / (d1 - d0) * (right - left);
}

double
qv_dispersion_plot_pixel_to_x (const QvBandSampling *s, const QvDispersionPlotOptions *o,
                               double pixel)
{
  double left, top, right, bottom, d0, d1;
  qv_dispersion_plot_area (o, &left, &top, &right, &bottom);
  x_range (s, &d0, &d1);
  return d0 + (pixel - left) / (right - left) * (d1 - d0);
}

static double
to_pixel (double v, double lo, double hi, double top, double bottom)
{
  return bottom - (v - lo) / (hi - lo) * (bottom - top);
}

double
qv_dispersion_plot_y_to_pixel (const QvBandSampling *s, gsize nb, const double *w,
                               const QvDispersionPlotOptions *o, double wavenumber)
{
  double left, top, right, bottom, lo, hi;
  qv_dispersion_plot_area (o, &left, &top, &right, &bottom);
  qv_dispersion_plot_range (s, nb, w, o, &lo, &hi);
  return to_pixel (wavenumber, lo, hi, top, bottom);
}

double
qv_dispersion_plot_pixel_to_y (const QvBandSampling *s, gsize nb, const double *w,
                               const QvDispersionPlotOptions *o, double pixel)
{
  double left, top, right, bottom, lo, hi;
  qv_dispersion_plot_area (o, &left, &top, &right, &bottom);
  qv_dispersion_plot_range (s, nb, w, o, &lo, &hi);
  return lo + (bottom - pixel) / (bottom - top) * (hi - lo);
}

gboolean
qv_dispersion_plot_point_to_pixel (const QvBandSampling *s, gsize nb, const double *w,
                                   const QvDispersionPlotOptions *o, gsize k, gsize b, double *px,
                                   double *py)
{
  if (s == NULL || w == NULL || k >= s->n_q || b >= nb || !isfinite (w[k * nb + b]))
    return FALSE;
  *px = qv_dispersion_plot_x_to_pixel (s, o, s->distance[k]);
  *py = qv_dispersion_plot_y_to_pixel (s, nb, w, o, w[k * nb + b]);
  return TRUE;
}

gboolean
qv_dispersion_plot_hit (const QvBandSampling *s, gsize nb, const double *w,
                        const QvDispersionPlotOptions *o, double px, double py,
                        double tolerance_px, gsize *q_index, gsize *branch)
{
  double left, top, right, bottom, lo, hi, d0, d1, best;
  gboolean found = FALSE;

  if (s == NULL || w == NULL || s->n_q == 0 || nb == 0 || !(tolerance_px >= 0))
    return FALSE;
  qv_dispersion_plot_area (o, &left, &top, &right, &bottom);
  qv_dispersion_plot_range (s, nb, w, o, &lo, &hi);
  x_range (s, &d0, &d1);
  best = tolerance_px * tolerance_px;
  for (gsize k = 0; k < s->n_q; k++)
    {
      const double x = left + (s->distance[k] - d0) / (d1 - d0) * (right - left);
      const double dx2 = (x - px) * (x - px);
      if (dx2 > best)
        continue;
      for (gsize b = 0; b < nb; b++)
        {
          const double v = w[k * nb + b];
          double y, d2;
          if (!isfinite (v) || v < lo || v > hi)
            continue;
          y = to_pixel (v, lo, hi, top, bottom);
          d2 = dx2 + (y - py) * (y - py);
          if (d2 < best || (!found && d2 <= best))
            {
              best = d2;
              found = TRUE;
              if (q_index)
                *q_index = k;
              if (branch)
                *branch = b;
            }
        }
    }
  return found;
}

char *
qv_dispersion_plot_label_text (const char *label)
{
  g_auto(GStrv) parts = g_strsplit (label ? label : "", "|", -1);
  for (guint i = 0; parts[i]; i++)
    {
      const char *p = g_strstrip (parts[i]);
      if (strcmp (p, "G") == 0 || g_ascii_strcasecmp (p, "Gamma") == 0
          || g_ascii_strcasecmp (p, "\\Gamma") == 0)
        {
          g_free (parts[i]);
          parts[i] = g_strdup ("\u0393");
        }
    }
  return g_strjoinv ("|", parts);
}

typedef struct {
  const QvBandSampling *s;
  gsize nb;
  const double *w;
  const QvDispersionPlotOptions *o;
} Plot;

/* One stroke per piece of the path: the sub-path of branch @b from q point
 * @k0 to @k1 (exclusive); points that are not finite break it. */
static gboolean
piece_path (cairo_t *cr, const Plot *p, gsize b, gsize k0, gsize k1, double lo, double hi,
            double top, double bottom, gboolean *negative)
{
  gboolean pen = FALSE, any = FALSE;
  cairo_new_path (cr);
  *negative = FALSE;
  for (gsize k = k0; k < k1; k++)
    {
      const double v = p->w[k * p->nb + b];
      double x, y;
      if (!isfinite (v))
        {
          pen = FALSE;
          continue;
        }
      x = qv_dispersion_plot_x_to_pixel (p->s, p->o, p->s->distance[k]);
      y = to_pixel (v, lo, hi, top, bottom);
      if (pen)
        {
          cairo_line_to (cr, x, y);
          any = TRUE;
        }
      else
        cairo_move_to (cr, x, y);
      pen = TRUE;
      *negative |= v < 0;
    }
  return any;
}

static gboolean
overlaps (const double *a, const double *b)
{
  return a[0] < b[0] + b[2] && b[0] < a[0] + a[2] && a[1] < b[1] + b[3] && b[1] < a[1] + a[3];
}

static void
draw_plot (cairo_t *cr, gconstpointer data)
{
  const Plot *p = data;
  const QvDispersionPlotOptions *o = p->o;
  const QvBandSampling *s = p->s;
  const QvPlotPalette *pal = qv_plot_palette (o->dark);
  const double f = qv_frequency_from_wavenumber (1.0, o->unit);
  double left, top, right, bottom, lo, hi, zero_px;
  PangoLayout *layout;
  char buf[64];

  qv_dispersion_plot_area (o, &left, &top, &right, &bottom);
  qv_dispersion_plot_range (s, p->nb, p->w, o, &lo, &hi);
  zero_px = to_pixel (0.0, lo, hi, top, bottom);

  cairo_save (cr);
  if (!o->transparent)
    {
      qv_plot_set_rgb (cr, pal->paper, 1.0);
      cairo_paint (cr);
    }
  layout = qv_plot_layout (cr);
  cairo_set_line_cap (cr, CAIRO_LINE_CAP_BUTT);

  /* the imaginary side, shaded */
  if (lo < 0)
    {
      qv_plot_set_rgb (cr, pal->imaginary, 0.06);
      cairo_rectangle (cr, left, MIN (zero_px, bottom), right - left,
                       bottom - MIN (zero_px, bottom));
      cairo_fill (cr);
    }

  /* frequency ticks in the axis unit, with a grid; negative values are
   * imaginary frequencies and read "50i" */
  {
    const double lo_u = lo * f, hi_u = hi * f;
    const double step = qv_plot_nice_step (hi_u - lo_u, MAX (2.0, (bottom - top) / 60.0));
    cairo_set_line_width (cr, 1.0);
    for (double v = ceil (lo_u / step - 1e-9) * step; v <= hi_u + 1e-9 * step; v += step)
      {
        const double y = floor (to_pixel (v, lo_u, hi_u, top, bottom)) + 0.5;
        if (fabs (v) > 1e-9 * step)
          {
            qv_plot_set_rgb (cr, pal->grid, 1.0);
            cairo_set_line_width (cr, 1.0);
            cairo_move_to (cr, left, y);
            cairo_line_to (cr, right, y);
            cairo_stroke (cr);
          }
        qv_plot_set_rgb (cr, pal->ink, 1.0);
        cairo_move_to (cr, left, y);
        cairo_line_to (cr, left - 5, y);
        cairo_stroke (cr);
        qv_plot_format_tick (buf, sizeof buf, v, step, TRUE);
        qv_plot_text (cr, layout, buf, left - 8, y, 1.0, 0.5, NULL);
      }
  }

  /* high-symmetry points: a line through the box and the label below it
   * (labels that would overlap a placed one are left out; the line stays) */
  if (s)
    {
      g_autoptr(GArray) boxes = g_array_new (FALSE, FALSE, sizeof (double) * 4);
      for (gsize i = 0; i < s->n_labels; i++)
        {
          const double x = qv_dispersion_plot_x_to_pixel (s, o, s->label_distance[i]);
          g_autofree char *text = qv_dispersion_plot_label_text (s->labels[i]);
          double box[4], tw, th;
          gboolean clash = FALSE;
          qv_plot_set_rgb (cr, pal->ink, 0.45);
          cairo_set_line_width (cr, 1.0);
          cairo_move_to (cr, x, top);
          cairo_line_to (cr, x, bottom);
          cairo_stroke (cr);
          qv_plot_text_size (layout, text, &tw, &th);
          box[0] = x - 0.5 * tw - 2; box[1] = bottom + 6; box[2] = tw + 4; box[3] = th;
          for (guint j = 0; j < boxes->len && !clash; j++)
            clash = overlaps (box, &g_array_index (boxes, double, 4 * j));
          if (clash)
            continue;
          g_array_append_vals (boxes, box, 1);
          qv_plot_set_rgb (cr, pal->ink, 1.0);
          qv_plot_text (cr, layout, text, x, bottom + 6, 0.5, 0.0, NULL);
        }
    }

  /* the branches, clipped to the box: one stroke per branch and piece of
   * the path; where the range shows imaginary values the piece is stroked
   * again below zero, dashed in the imaginary colour */
  cairo_save (cr);
  cairo_rectangle (cr, left, top, right - left, bottom - top);
  cairo_clip (cr);
  cairo_set_line_join (cr, CAIRO_LINE_JOIN_ROUND);
  cairo_set_line_width (cr, 1.5);
  if (s && p->w)
    for (gsize k0 = 0; k0 < s->n_q;)
      {
        gsize k1 = k0 + 1;
        while (k1 < s->n_q && !s->restart[k1])
          k1++;
        for (gsize b = 0; b < p->nb; b++)
          {
            gboolean negative;
            if (!piece_path (cr, p, b, k0, k1, lo, hi, top, bottom, &negative))
              continue;
            if (!(lo < 0 && negative))
              {
                qv_plot_set_rgb (cr, pal->branch, 1.0);
                cairo_stroke (cr);
                continue;
              }
            {
              cairo_path_t *path = cairo_copy_path (cr);
              cairo_save (cr);
              cairo_new_path (cr);
              cairo_rectangle (cr, left, top, right - left, zero_px - top);
              cairo_clip (cr);
              cairo_append_path (cr, path);
              qv_plot_set_rgb (cr, pal->branch, 1.0);
              cairo_stroke (cr);
              cairo_restore (cr);
              cairo_save (cr);
              cairo_new_path (cr);
              cairo_rectangle (cr, left, zero_px, right - left, bottom - zero_px);
              cairo_clip (cr);
              cairo_append_path (cr, path);
              qv_plot_set_rgb (cr, pal->imaginary, 1.0);
              cairo_set_dash (cr, (const double[]) { 4.0, 2.5 }, 2, 0.0);
              cairo_stroke (cr);
              cairo_restore (cr);
              cairo_path_destroy (path);
            }
          }
        k0 = k1;
      }
  cairo_new_path (cr);
  cairo_restore (cr);

  /* the zero line */
  if (lo < 0 && hi > 0)
    {
      qv_plot_set_rgb (cr, pal->ink, 0.75);
      cairo_set_line_width (cr, 1.0);
      cairo_move_to (cr, left, floor (zero_px) + 0.5);
      cairo_line_to (cr, right, floor (zero_px) + 0.5);
      cairo_stroke (cr);
    }

  /* hover ring and selected point */
  {
    double x, y;
    if (o->hover_q >= 0 && o->hover_branch >= 0
        && qv_dispersion_plot_point_to_pixel (s, p->nb, p->w, o, (gsize) o->hover_q,
                                              (gsize) o->hover_branch, &x, &y)
        && y >= top - 0.5 && y <= bottom + 0.5)
      {
        qv_plot_set_rgb (cr, pal->mark, 1.0);
        cairo_set_line_width (cr, 1.5);
        cairo_new_sub_path (cr);
        cairo_arc (cr, x, y, 6.0, 0, 2 * G_PI);
        cairo_stroke (cr);
      }
    if (o->selected_q >= 0 && o->selected_branch >= 0
        && qv_dispersion_plot_point_to_pixel (s, p->nb, p->w, o, (gsize) o->selected_q,
                                              (gsize) o->selected_branch, &x, &y)
        && y >= top - 0.5 && y <= bottom + 0.5)
      {
        cairo_new_sub_path (cr);
        cairo_arc (cr, x, y, 4.5, 0, 2 * G_PI);
        qv_plot_set_rgb (cr, pal->mark, 1.0);
        cairo_fill_preserve (cr);
        qv_plot_set_rgb (cr, pal->paper, 1.0);
        cairo_set_line_width (cr, 1.5);
        cairo_stroke (cr);
      }
  }

  /* the frame, the axis label, the title */
  qv_plot_set_rgb (cr, pal->ink, 1.0);
  cairo_set_line_width (cr, 1.0);
  cairo_rectangle (cr, floor (left) + 0.5, floor (top) + 0.5, floor (right - left),
                   floor (bottom - top));
  cairo_stroke (cr);
  cairo_save (cr);
  cairo_translate (cr, 16, 0.5 * (top + bottom));
  cairo_rotate (cr, -G_PI / 2);
  qv_plot_text (cr, layout, o->axis_label ? o->axis_label : qv_plot_unit_axis_label (o->unit),
                0, 0, 0.5, 0.5, NULL);
  cairo_restore (cr);
  if (o->title)
    qv_plot_text (cr, layout, o->title, left, top - 8, 0.0, 1.0, NULL);
  g_object_unref (layout);
  cairo_restore (cr);
}

void
qv_dispersion_plot_draw (cairo_t *cr, const QvBandSampling *s, gsize nb, const double *w,
                         const QvDispersionPlotOptions *o)
{
  const Plot p = { s, nb, w, o };
  draw_plot (cr, &p);
}

char *
qv_dispersion_plot_svg (const QvBandSampling *s, gsize nb, const double *w,
                        const QvDispersionPlotOptions *o, gsize *length, GError **error)
{
  const Plot p = { s, nb, w, o };
  if (!qv_plot_check_size ("dispersion plot", o->width, o->height, 200, 150, error))
    return NULL;
  return qv_plot_svg (o->width, o->height, draw_plot, &p, length, error);
}

guint8 *
qv_dispersion_plot_rgba (const QvBandSampling *s, gsize nb, const double *w,
                         const QvDispersionPlotOptions *o, GError **error)
{
  const Plot p = { s, nb, w, o };
  if (!qv_plot_check_size ("dispersion plot", o->width, o->height, 200, 150, error))
    return NULL;
  return qv_plot_rgba (o->width, o->height, draw_plot, &p, error);
}
