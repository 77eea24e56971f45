/* qv-dos-plot.c — cairo drawing of a phonon density of states.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-dos-plot.h"
#include "qv-element.h"
#include "qv-plot-private.h"

#define MARGIN_LEFT 74.0
#define MARGIN_LEFT_BARE 12.0
#define MARGIN_RIGHT 18.0
#define HEADROOM 1.08

void
qv_dos_plot_options_init (QvDosPlotOptions *o)
{
  memset (o, 0, sizeof *o);
  o->width = 900;
  o->height = 500;
  o->unit = QV_FREQUENCY_CM1;
}

void
qv_dos_plot_area (const QvDosPlotOptions *o, double *left, double *top, double *right,
                  double *bottom)
{
  const double ml = (o->horizontal && o->hide_frequency_labels) ? MARGIN_LEFT_BARE : MARGIN_LEFT;
  *left = ml;
  *top = QV_PLOT_MARGIN_TOP;
  *right = MAX (ml + 1.0, o->width - MARGIN_RIGHT);
  *bottom = MAX (QV_PLOT_MARGIN_TOP + 1.0, o->height - QV_PLOT_MARGIN_BOTTOM);
}

static gboolean
has_grid (const QvPhononDos *dos)
{
  return dos && dos->n_points > 0 && dos->omega && dos->total;
}

void
qv_dos_plot_range (const QvPhononDos *dos, const QvDosPlotOptions *o, double *f_min,
                   double *f_max, double *dos_max)
{
  double lo = 0.0, hi = 100.0, top = 0.0;
  if (o->has_range && o->x_max > o->x_min && isfinite (o->x_min) && isfinite (o->x_max))
    {
      lo = o->x_min;
      hi = o->x_max;
    }
  else if (has_grid (dos))
    {
      lo = dos->omega[0];
      hi = dos->omega[dos->n_points - 1];
      if (!(hi > lo))
        hi = lo + 1.0;
    }
  if (o->has_dos_max && o->dos_max > 0 && isfinite (o->dos_max))
    top = o->dos_max;
  else if (has_grid (dos))
    {
      for (gsize i = 0; i < dos->n_points; i++)
        if (dos->omega[i] >= lo && dos->omega[i] <= hi && isfinite (dos->total[i]))
          top = MAX (top, o->hide_total ? 0.0 : dos->total[i]);
      if (!o->hide_partial && dos->partial)
        for (gsize g = 0; g < dos->n_groups; g++)
          for (gsize i = 0; i < dos->n_points; i++)
            if (dos->omega[i] >= lo && dos->omega[i] <= hi && isfinite (dos->partial[g * dos->n_points + i]))
              top = MAX (top, dos->partial[g * dos->n_points + i]);
      top *= HEADROOM;
    }
  if (!(top > 0))
    top = 1.0;
  *f_min = lo;
  *f_max = hi;
  *dos_max = top;
}

double
qv_dos_plot_frequency_to_pixel (const QvPhononDos *dos, const QvDosPlotOptions *o, double f)
{
  double l, t, r, b, lo, hi, top;
  qv_dos_plot_area (o, &l, &t, &r, &b);
  qv_dos_plot_range (dos, o, &lo, &hi, &top);
  return o->horizontal ? b - (f - lo) / (hi - lo) * (b - t) : l + (f - lo) / (hi - lo) * (r - l);
}

double
qv_dos_plot_pixel_to_frequency (const QvPhononDos *dos, const QvDosPlotOptions *o, double pixel)
{
  double l, t, r, b, lo, hi, top;
  qv_dos_plot_area (o, &l, &t, &r, &b);
  qv_dos_plot_range (dos, o, &lo, &hi, &top);
  return o->horizontal ? lo + (b - pixel) / (b - t) * (hi - lo)
                       : lo + (pixel - l) / (r - l) * (hi - lo);
}

double
qv_dos_plot_value_to_pixel (const QvPhononDos *dos, const QvDosPlotOptions *o, double v)
{
  double l, t, r, b, lo, hi, top;
  qv_dos_plot_area (o, &l, &t, &r, &b);
  qv_dos_plot_range (dos, o, &lo, &hi, &top);
  return o->horizontal ? l + v / top * (r - l) : b - v / top * (b - t);
}

double
qv_dos_plot_pixel_to_value (const QvPhononDos *dos, const QvDosPlotOptions *o, double pixel)
{
  double l, t, r, b, lo, hi, top;
  qv_dos_plot_area (o, &l, &t, &r, &b);
  qv_dos_plot_range (dos, o, &lo, &hi, &top);
  return o->horizontal ? (pixel - l) / (r - l) * top : (b - pixel) / (b - t) * top;
}

void
qv_dos_plot_value_at (const QvPhononDos *dos, double f, double *total, double *partial)
{
  gsize i0 = 0;
  double u = 0.0;
  gboolean inside = FALSE;

  if (has_grid (dos) && isfinite (f))
    {
      const gsize n = dos->n_points;
      if (n == 1)
        inside = fabs (f - dos->omega[0]) <= 0.5 * MAX (dos->step, 0.0);
      else if (f >= dos->omega[0] && f <= dos->omega[n - 1])
        {
          const double x = (f - dos->omega[0]) / (dos->omega[n - 1] - dos->omega[0]) * (double) (n - 1);
          i0 = (gsize) MIN (floor (x), (double) (n - 2));
          u = x - (double) i0;
          inside = TRUE;
        }
    }
#define AT(arr) (dos->n_points == 1 ? (arr)[0] : (1.0 - u) * (arr)[i0] + u * (arr)[i0 + 1])
  if (total)
    *total = inside ? AT (dos->total) : 0.0;
  if (partial && dos)
    for (gsize g = 0; g < dos->n_groups; g++)
      partial[g] = inside && dos->partial ? AT (dos->partial + g * dos->n_points) : 0.0;
#undef AT
}

gboolean
qv_dos_plot_readout (const QvPhononDos *dos, const QvDosPlotOptions *o, double px, double py,
                     double *frequency, double *total, double *partial)
{
  double l, t, r, b, f;
  qv_dos_plot_area (o, &l, &t, &r, &b);
  if (!(px >= l && px <= r && py >= t && py <= b))
    return FALSE;
  f = qv_dos_plot_pixel_to_frequency (dos, o, o->horizontal ? py : px);
  if (frequency)
    *frequency = f;
  qv_dos_plot_value_at (dos, f, total, partial);
  return TRUE;
}

static const char *
symbol (guint z)
{
  const QvElement *e = qv_element_from_z (z);
  return e ? e->symbol : "X";
}

typedef struct {
  const QvPhononDos *dos;
  const QvDosPlotOptions *o;
  double l, t, r, b, lo, hi, top;
} Plot;

/* (frequency, value) → pixel */
static void
to_xy (const Plot *p, double f, double v, double *x, double *y)
{
  const double fu = (f - p->lo) / (p->hi - p->lo), vu = v / p->top;
  if (p->o->horizontal)
    {
      *x = p->l + vu * (p->r - p->l);
      *y = p->b - fu * (p->b - p->t);
    }
  else
    {
      *x = p->l + fu * (p->r - p->l);
      *y = p->b - vu * (p->b - p->t);
    }
}

static void
curve (cairo_t *cr, const Plot *p, const double *values, gboolean closed)
{
  const QvPhononDos *dos = p->dos;
  double x, y;
  cairo_new_path (cr);
  if (closed)
    {
      to_xy (p, dos->omega[0], 0.0, &x, &y);
      cairo_move_to (cr, x, y);
    }
  for (gsize i = 0; i < dos->n_points; i++)
    {
      to_xy (p, dos->omega[i], isfinite (values[i]) ? values[i] : 0.0, &x, &y);
      cairo_line_to (cr, x, y);
    }
  if (closed)
    {
      to_xy (p, dos->omega[dos->n_points - 1], 0.0, &x, &y);
      cairo_line_to (cr, x, y);
      cairo_close_path (cr);
    }
}

static void
draw_plot (cairo_t *cr, gconstpointer data)
{
  Plot p = { .dos = ((const Plot *) data)->dos, .o = ((const Plot *) data)->o };
  const QvDosPlotOptions *o = p.o;
  const QvPhononDos *dos = p.dos;
  const QvPlotPalette *pal = qv_plot_palette (o->dark);
  const double f = qv_frequency_from_wavenumber (1.0, o->unit);
  const gboolean hz = o->horizontal;
  PangoLayout *layout;
  char buf[64];
  double zx, zy;

  qv_dos_plot_area (o, &p.l, &p.t, &p.r, &p.b);
  qv_dos_plot_range (dos, o, &p.lo, &p.hi, &p.top);

  cairo_save (cr);
  if (!o->transparent)
    {
      qv_plot_set_rgb (cr, pal->paper, 1.0);
      cairo_paint (cr);
    }
  layout = qv_plot_layout (cr);
  cairo_set_line_cap (cr, CAIRO_LINE_CAP_BUTT);
  cairo_set_line_width (cr, 1.0);

  /* the imaginary side */
  to_xy (&p, 0.0, 0.0, &zx, &zy);
  if (p.lo < 0)
    {
      qv_plot_set_rgb (cr, pal->imaginary, 0.06);
      if (hz)
        cairo_rectangle (cr, p.l, MIN (zy, p.b), p.r - p.l, p.b - MIN (zy, p.b));
      else
        cairo_rectangle (cr, p.l, p.t, MAX (zx, p.l) - p.l, p.b - p.t);
      cairo_fill (cr);
    }

  /* frequency ticks (with a grid), in the axis unit */
  {
    const double lo_u = p.lo * f, hi_u = p.hi * f;
    const double len = hz ? p.b - p.t : p.r - p.l;
    const double step = qv_plot_nice_step (hi_u - lo_u, MAX (2.0, len / (hz ? 60.0 : 90.0)));
    for (double v = ceil (lo_u / step - 1e-9) * step; v <= hi_u + 1e-9 * step; v += step)
      {
        double x, y;
        to_xy (&p, v / f, 0.0, &x, &y);
        x = floor (x) + 0.5;
        y = floor (y) + 0.5;
        if (fabs (v) > 1e-9 * step)
          {
            qv_plot_set_rgb (cr, pal->grid, 1.0);
            if (hz)
              {
                cairo_move_to (cr, p.l, y);
                cairo_line_to (cr, p.r, y);
              }
            else
              {
                cairo_move_to (cr, x, p.t);
                cairo_line_to (cr, x, p.b);
              }
            cairo_stroke (cr);
          }
        qv_plot_set_rgb (cr, pal->ink, 1.0);
        if (hz)
          {
            cairo_move_to (cr, p.l, y);
            cairo_line_to (cr, p.l - 5, y);
          }
        else
          {
            cairo_move_to (cr, x, p.b);
            cairo_line_to (cr, x, p.b + 5);
          }
        cairo_stroke (cr);
        if (o->hide_frequency_labels)
          continue;
        qv_plot_format_tick (buf, sizeof buf, v, step, TRUE);
        if (hz)
          qv_plot_text (cr, layout, buf, p.l - 8, y, 1.0, 0.5, NULL);
        else
          qv_plot_text (cr, layout, buf, x, p.b + 8, 0.5, 0.0, NULL);
      }
  }

  /* DOS ticks, per the axis unit */
  {
    const double top_u = p.top / f;
    const double len = hz ? p.r - p.l : p.b - p.t;
    const double step = qv_plot_nice_step (top_u, MAX (1.0, len / (hz ? 70.0 : 60.0)));
    for (double v = 0.0; v <= top_u * (1.0 + 1e-9); v += step)
      {
        double x, y;
        to_xy (&p, p.lo, v * f, &x, &y);
        x = floor (x) + 0.5;
        y = floor (y) + 0.5;
        qv_plot_set_rgb (cr, pal->ink, 1.0);
        if (hz)
          {
            cairo_move_to (cr, x, p.b);
            cairo_line_to (cr, x, p.b + 5);
          }
        else
          {
            cairo_move_to (cr, p.l, y);
            cairo_line_to (cr, p.l - 5, y);
          }
        cairo_stroke (cr);
        qv_plot_format_tick (buf, sizeof buf, v, step, FALSE);
        if (hz)
          qv_plot_text (cr, layout, buf, x, p.b + 8, 0.5, 0.0, NULL);
        else
          qv_plot_text (cr, layout, buf, p.l - 8, y, 1.0, 0.5, NULL);
      }
  }

  /* the curves, clipped to the box: the total filled, the partials as lines */
  cairo_save (cr);
  cairo_rectangle (cr, p.l, p.t, p.r - p.l, p.b - p.t);
  cairo_clip (cr);
  cairo_set_line_join (cr, CAIRO_LINE_JOIN_ROUND);
  if (has_grid (dos))
    {
      if (!o->hide_total)
        {
          curve (cr, &p, dos->total, TRUE);
          qv_plot_set_rgb (cr, pal->branch, 0.14);
          cairo_fill (cr);
          curve (cr, &p, dos->total, FALSE);
          qv_plot_set_rgb (cr, pal->branch, 1.0);
          cairo_set_line_width (cr, 1.6);
          cairo_stroke (cr);
        }
      if (!o->hide_partial && dos->partial)
        for (gsize g = 0; g < dos->n_groups; g++)
          {
            curve (cr, &p, dos->partial + g * dos->n_points, FALSE);
            qv_plot_set_rgb (cr, pal->series[g % QV_PLOT_N_SERIES], 1.0);
            cairo_set_line_width (cr, 1.3);
            cairo_stroke (cr);
          }
    }
  cairo_restore (cr);

  /* zero line, hover line */
  cairo_set_line_width (cr, 1.0);
  if (p.lo < 0 && p.hi > 0)
    {
      qv_plot_set_rgb (cr, pal->ink, 0.75);
      if (hz)
        {
          cairo_move_to (cr, p.l, floor (zy) + 0.5);
          cairo_line_to (cr, p.r, floor (zy) + 0.5);
        }
      else
        {
          cairo_move_to (cr, floor (zx) + 0.5, p.t);
          cairo_line_to (cr, floor (zx) + 0.5, p.b);
        }
      cairo_stroke (cr);
    }
  if (o->has_hover && o->hover_frequency >= p.lo && o->hover_frequency <= p.hi)
    {
      double x, y;
      to_xy (&p, o->hover_frequency, 0.0, &x, &y);
      qv_plot_set_rgb (cr, pal->mark, 1.0);
      cairo_set_line_width (cr, 1.5);
      if (hz)
        {
          cairo_move_to (cr, p.l, y);
          cairo_line_to (cr, p.r, y);
        }
      else
        {
          cairo_move_to (cr, x, p.t);
          cairo_line_to (cr, x, p.b);
        }
      cairo_stroke (cr);
    }

  /* legend, top right inside the box: total, then each element */
  if (has_grid (dos) && !(o->hide_partial && o->hide_total))
    {
      const char *total_word = o->total_label ? o->total_label : "total";
      double y = p.t + 8, w = 0, tw, th;
      const gsize n = (o->hide_total ? 0 : 1) + (o->hide_partial || !dos->partial ? 0 : dos->n_groups);
      for (gsize i = 0; i < n; i++)
        {
          const gsize g = o->hide_total ? i : i - 1;
          qv_plot_text_size (layout, (!o->hide_total && i == 0) ? total_word : symbol (dos->z[g]), &tw, &th);
          w = MAX (w, tw);
        }
      for (gsize i = 0; i < n; i++)
        {
          const gboolean is_total = !o->hide_total && i == 0;
          const gsize g = o->hide_total ? i : i - 1;
          const double x = p.r - 8 - w;
          qv_plot_set_rgb (cr, is_total ? pal->branch : pal->series[g % QV_PLOT_N_SERIES], 1.0);
          cairo_set_line_width (cr, is_total ? 3.0 : 2.0);
          cairo_move_to (cr, x - 26, y + 0.5 * QV_PLOT_FONT_PX + 1);
          cairo_line_to (cr, x - 6, y + 0.5 * QV_PLOT_FONT_PX + 1);
          cairo_stroke (cr);
          qv_plot_set_rgb (cr, pal->ink, 1.0);
          qv_plot_text (cr, layout, is_total ? total_word : symbol (dos->z[g]), x, y, 0.0, 0.0, NULL);
          y += QV_PLOT_FONT_PX + 6;
        }
    }

  /* frame, axis labels, title */
  qv_plot_set_rgb (cr, pal->ink, 1.0);
  cairo_set_line_width (cr, 1.0);
  cairo_rectangle (cr, floor (p.l) + 0.5, floor (p.t) + 0.5, floor (p.r - p.l), floor (p.b - p.t));
  cairo_stroke (cr);
  {
    g_autofree char *dos_label = g_strdup_printf ("DOS (states/%s/cell)", qv_plot_unit_symbol (o->unit));
    const char *fl = o->frequency_label ? o->frequency_label : qv_plot_unit_axis_label (o->unit);
    const char *dl = o->dos_label ? o->dos_label : dos_label;
    if (hz)
      {
        qv_plot_text (cr, layout, dl, 0.5 * (p.l + p.r), p.b + 26, 0.5, 0.0, NULL);
        if (!o->hide_frequency_labels)
          {
            cairo_save (cr);
            cairo_translate (cr, 16, 0.5 * (p.t + p.b));
            cairo_rotate (cr, -G_PI / 2);
            qv_plot_text (cr, layout, fl, 0, 0, 0.5, 0.5, NULL);
            cairo_restore (cr);
          }
      }
    else
      {
        qv_plot_text (cr, layout, fl, 0.5 * (p.l + p.r), p.b + 26, 0.5, 0.0, NULL);
        cairo_save (cr);
        cairo_translate (cr, 16, 0.5 * (p.t + p.b));
        cairo_rotate (cr, -G_PI / 2);
        qv_plot_text (cr, layout, dl, 0, 0, 0.5, 0.5, NULL);
        cairo_restore (cr);
      }
  }
  if (o->title)
    qv_plot_text (cr, layout, o->title, p.l, p.t - 8, 0.0, 1.0, NULL);
  g_object_unref (layout);
  cairo_restore (cr);
}

void
qv_dos_plot_draw (cairo_t *cr, const QvPhononDos *dos, const QvDosPlotOptions *o)
{
  const Plot p = { .dos = dos, .o = o };
  draw_plot (cr, &p);
}

static gboolean
check (const QvDosPlotOptions *o, GError **error)
{
  return qv_plot_check_size ("DOS plot", o->width, o->height, o->horizontal ? 100 : 200, 150, error);
}

char *
qv_dos_plot_svg (const QvPhononDos *dos, const QvDosPlotOptions *o, gsize *length, GError **error)
{
  const Plot p = { .dos = dos, .o = o };
  if (!check (o, error))
    return NULL;
  return qv_plot_svg (o->width, o->height, draw_plot, &p, length, error);
}

guint8 *
qv_dos_plot_rgba (const QvPhononDos *dos, const QvDosPlotOptions *o, GError **error)
{
  const Plot p = { .dos = dos, .o = o };
  if (!check (o, error))
    return NULL;
  return qv_plot_rgba (o->width, o->height, draw_plot, &p, error);
}
