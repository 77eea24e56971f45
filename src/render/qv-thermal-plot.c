/* qv-thermal-plot.c — cairo drawing of thermal properties against T.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-plot-private.h"
#include "qv-thermal-plot.h"

#define MARGIN_LEFT 74.0
#define MARGIN_RIGHT 96.0    /* the legends */
#define PANEL_GAP 18.0
#define PAD 0.06

void
qv_thermal_plot_options_init (QvThermalPlotOptions *o)
{
  memset (o, 0, sizeof *o);
  o->width = 900;
  o->height = 560;
  o->formula_units = 1;
}

const char *
qv_thermal_plot_unit (const QvThermalPlotOptions *o, QvThermalPanel panel)
{
  if (panel == QV_THERMAL_PANEL_ENERGY)
    return o->per_cell ? "eV/cell" : "kJ/mol";
  return o->per_cell ? "meV/(K cell)" : "J/(K mol)";
}

/* eV per cell (core) → plot units */
static double
energy_factor (const QvThermalPlotOptions *o)
{
  return o->per_cell ? 1.0 : qv_thermal_kj_per_mol (MAX (o->formula_units, (gsize) 1));
}

static double
entropy_factor (const QvThermalPlotOptions *o)
{
  return 1000.0 * energy_factor (o);
}

void
qv_thermal_plot_area (const QvThermalPlotOptions *o, QvThermalPanel panel, double *left,
                      double *top, double *right, double *bottom)
{
  const double t0 = QV_PLOT_MARGIN_TOP;
  const double b1 = MAX (t0 + 3.0 + PANEL_GAP, o->height - QV_PLOT_MARGIN_BOTTOM);
  const double h = 0.5 * (b1 - t0 - PANEL_GAP);
  *left = MARGIN_LEFT;
  *right = MAX (MARGIN_LEFT + 1.0, o->width - MARGIN_RIGHT);
  *top = panel == QV_THERMAL_PANEL_ENERGY ? t0 : t0 + h + PANEL_GAP;
  *bottom = *top + h;
}

static gboolean
has_table (const QvThermal *th)
{
  return th && th->n_t > 0 && th->t;
}

void
qv_thermal_plot_range (const QvThermal *th, const QvThermalPlotOptions *o, QvThermalPanel panel,
                       double *t_min, double *t_max, double *v_min, double *v_max)
{
  double t0 = 0.0, t1 = 1000.0, lo = G_MAXDOUBLE, hi = -G_MAXDOUBLE, span;
  if (o->has_range && o->t_max > o->t_min && isfinite (o->t_min) && isfinite (o->t_max))
    {
      t0 = o->t_min;
      t1 = o->t_max;
    }
  else if (has_table (th))
    {
      t0 = th->t[0];
      t1 = th->t[th->n_t - 1];
      if (!(t1 > t0))
        t1 = t0 + 1.0;
    }
  if (has_table (th))
    for (gsize i = 0; i < th->n_t; i++)
      {
        const double *cols[3];
        double f;
        int n;
        if (th->t[i] < t0 || th->t[i] > t1)
          continue;
        if (panel == QV_THERMAL_PANEL_ENERGY)
          {
            cols[0] = th->free_energy; cols[1] = th->energy; cols[2] = th->zpe;
            n = 3;
            f = energy_factor (o);
          }
        else
          {
            cols[0] = th->entropy; cols[1] = th->heat_capacity;
            n = 2;
            f = entropy_factor (o);
          }
        for (int c = 0; c < n; c++)
          if (isfinite (cols[c][i]))
            {
              lo = MIN (lo, cols[c][i] * f);
              hi = MAX (hi, cols[c][i] * f);
            }
      }
  if (lo > hi)
    {
      lo = 0.0;
      hi = 1.0;
    }
  if (panel == QV_THERMAL_PANEL_ENTROPY)
    lo = MIN (lo, 0.0);
  span = hi - lo;
  if (!(span > 0))
    span = MAX (fabs (hi), 1.0);
  *t_min = t0;
  *t_max = t1;
  *v_min = panel == QV_THERMAL_PANEL_ENTROPY && lo == 0.0 ? 0.0 : lo - PAD * span;
  *v_max = hi + PAD * span;
}

double
qv_thermal_plot_t_to_pixel (const QvThermal *th, const QvThermalPlotOptions *o, double t)
{
  double l, tp, r, b, t0, t1, v0, v1;
  qv_thermal_plot_area (o, QV_THERMAL_PANEL_ENERGY, &l, &tp, &r, &b);
  qv_thermal_plot_range (th, o, QV_THERMAL_PANEL_ENERGY, &t0, &t1, &v0, &v1);
  return l + (t - t0) / (t1 - t0) * (r - l);
}

double
qv_thermal_plot_pixel_to_t (const QvThermal *th, const QvThermalPlotOptions *o, double pixel)
{
  double l, tp, r, b, t0, t1, v0, v1;
  qv_thermal_plot_area (o, QV_THERMAL_PANEL_ENERGY, &l, &tp, &r, &b);
  qv_thermal_plot_range (th, o, QV_THERMAL_PANEL_ENERGY, &t0, &t1, &v0, &v1);
  return t0 + (pixel - l) / (r - l) * (t1 - t0);
}

double
qv_thermal_plot_value_to_pixel (const QvThermal *th, const QvThermalPlotOptions *o,
                                QvThermalPanel panel, double value)
{
  double l, tp, r, b, t0, t1, v0, v1;
  qv_thermal_plot_area (o, panel, &l, &tp, &r, &b);
  qv_thermal_plot_range (th, o, panel, &t0, &t1, &v0, &v1);
  return b - (value - v0) / (v1 - v0) * (b - tp);
}

double
qv_thermal_plot_pixel_to_value (const QvThermal *th, const QvThermalPlotOptions *o,
                                QvThermalPanel panel, double pixel)
{
  double l, tp, r, b, t0, t1, v0, v1;
  qv_thermal_plot_area (o, panel, &l, &tp, &r, &b);
  qv_thermal_plot_range (th, o, panel, &t0, &t1, &v0, &v1);
  return v0 + (b - pixel) / (b - tp) * (v1 - v0);
}

gboolean
qv_thermal_plot_value_at (const QvThermal *th, const QvThermalPlotOptions *o, double t,
                          QvThermalReadout *out)
{
  gsize i0 = 0;
  double u = 0.0;
  const double fe = energy_factor (o), fs = entropy_factor (o);

  if (!has_table (th) || !isfinite (t) || t < th->t[0] || t > th->t[th->n_t - 1])
    return FALSE;
  if (th->n_t > 1)
    {
      while (i0 + 2 < th->n_t && th->t[i0 + 1] <= t)
        i0++;
      u = th->t[i0 + 1] > th->t[i0] ? (t - th->t[i0]) / (th->t[i0 + 1] - th->t[i0]) : 0.0;
    }
#define AT(arr) (th->n_t == 1 ? (arr)[0] : (1.0 - u) * (arr)[i0] + u * (arr)[i0 + 1])
  out->t = t;
  out->free_energy = AT (th->free_energy) * fe;
  out->energy = AT (th->energy) * fe;
  out->zpe = AT (th->zpe) * fe;
  out->entropy = AT (th->entropy) * fs;
  out->heat_capacity = AT (th->heat_capacity) * fs;
#undef AT
  return TRUE;
}

gboolean
qv_thermal_plot_readout (const QvThermal *th, const QvThermalPlotOptions *o, double px, double py,
                         QvThermalPanel *panel, QvThermalReadout *out)
{
  for (int p = QV_THERMAL_PANEL_ENERGY; p <= QV_THERMAL_PANEL_ENTROPY; p++)
    {
      double l, t, r, b;
      QvThermalReadout local;
      qv_thermal_plot_area (o, (QvThermalPanel) p, &l, &t, &r, &b);
      if (!(px >= l && px <= r && py >= t && py <= b))
        continue;
      if (!qv_thermal_plot_value_at (th, o, qv_thermal_plot_pixel_to_t (th, o, px), out ? out : &local))
        return FALSE;
      if (panel)
        *panel = (QvThermalPanel) p;
      return TRUE;
    }
  return FALSE;
}

typedef struct {
  const QvThermal *th;
  const QvThermalPlotOptions *o;
} Plot;

static void
draw_panel (cairo_t *cr, PangoLayout *layout, const Plot *p, QvThermalPanel panel)
{
  const QvThermalPlotOptions *o = p->o;
  const QvThermal *th = p->th;
  const QvPlotPalette *pal = qv_plot_palette (o->dark);
  const gboolean energy = panel == QV_THERMAL_PANEL_ENERGY;
  const double f = energy ? energy_factor (o) : entropy_factor (o);
  struct { const char *name; const double *v; QvPlotRgb colour; gboolean dashed; } curves[3];
  double l, t, r, b, t0, t1, v0, v1;
  int n;
  char buf[64];

  qv_thermal_plot_area (o, panel, &l, &t, &r, &b);
  qv_thermal_plot_range (th, o, panel, &t0, &t1, &v0, &v1);
  if (energy)
    {
      curves[0].name = "F"; curves[0].v = th ? th->free_energy : NULL;
      curves[0].colour = pal->series[0]; curves[0].dashed = FALSE;
      curves[1].name = "U"; curves[1].v = th ? th->energy : NULL;
      curves[1].colour = pal->series[1]; curves[1].dashed = FALSE;
      curves[2].name = "ZPE"; curves[2].v = th ? th->zpe : NULL;
      curves[2].colour = pal->ink; curves[2].dashed = TRUE;
      n = 3;
    }
  else
    {
      curves[0].name = "S"; curves[0].v = th ? th->entropy : NULL;
      curves[0].colour = pal->series[2]; curves[0].dashed = FALSE;
      curves[1].name = "Cv"; curves[1].v = th ? th->heat_capacity : NULL;
      curves[1].colour = pal->series[5]; curves[1].dashed = FALSE;
      n = 2;
    }

  /* value ticks with a grid */
  cairo_set_line_width (cr, 1.0);
  {
    const double step = qv_plot_nice_step (v1 - v0, MAX (2.0, (b - t) / 50.0));
    for (double v = ceil (v0 / step - 1e-9) * step; v <= v1 + 1e-9 * step; v += step)
      {
        const double y = floor (b - (v - v0) / (v1 - v0) * (b - t)) + 0.5;
        qv_plot_set_rgb (cr, fabs (v) < 1e-9 * step ? pal->ink : pal->grid,
                         fabs (v) < 1e-9 * step ? 0.5 : 1.0);
        cairo_move_to (cr, l, y);
        cairo_line_to (cr, r, y);
        cairo_stroke (cr);
        qv_plot_set_rgb (cr, pal->ink, 1.0);
        cairo_move_to (cr, l, y);
        cairo_line_to (cr, l - 5, y);
        cairo_stroke (cr);
        qv_plot_format_tick (buf, sizeof buf, v, step, FALSE);
        qv_plot_text (cr, layout, buf, l - 8, y, 1.0, 0.5, NULL);
      }
  }
  /* temperature ticks; numbers under the lower panel only */
  {
    const double step = qv_plot_nice_step (t1 - t0, MAX (2.0, (r - l) / 90.0));
    for (double v = ceil (t0 / step - 1e-9) * step; v <= t1 + 1e-9 * step; v += step)
      {
        const double x = floor (l + (v - t0) / (t1 - t0) * (r - l)) + 0.5;
        qv_plot_set_rgb (cr, pal->grid, 1.0);
        cairo_move_to (cr, x, t);
        cairo_line_to (cr, x, b);
        cairo_stroke (cr);
        qv_plot_set_rgb (cr, pal->ink, 1.0);
        cairo_move_to (cr, x, b);
        cairo_line_to (cr, x, b + 5);
        cairo_stroke (cr);
        if (!energy)
          {
            qv_plot_format_tick (buf, sizeof buf, v, step, FALSE);
            qv_plot_text (cr, layout, buf, x, b + 8, 0.5, 0.0, NULL);
          }
      }
  }

  /* curves, clipped to the box */
  cairo_save (cr);
  cairo_rectangle (cr, l, t, r - l, b - t);
  cairo_clip (cr);
  cairo_set_line_join (cr, CAIRO_LINE_JOIN_ROUND);
  for (int c = 0; c < n && has_table (th); c++)
    {
      gboolean pen = FALSE;
      cairo_new_path (cr);
      for (gsize i = 0; i < th->n_t; i++)
        {
          const double x = l + (th->t[i] - t0) / (t1 - t0) * (r - l);
          const double y = b - (curves[c].v[i] * f - v0) / (v1 - v0) * (b - t);
          if (!isfinite (curves[c].v[i]))
            {
              pen = FALSE;
              continue;
            }
          if (pen)
            cairo_line_to (cr, x, y);
          else
            cairo_move_to (cr, x, y);
          pen = TRUE;
        }
      qv_plot_set_rgb (cr, curves[c].colour, curves[c].dashed ? 0.7 : 1.0);
      cairo_set_line_width (cr, curves[c].dashed ? 1.2 : 1.8);
      if (curves[c].dashed)
        cairo_set_dash (cr, (const double[]) { 5.0, 3.0 }, 2, 0.0);
      cairo_stroke (cr);
      cairo_set_dash (cr, NULL, 0, 0.0);
    }
  cairo_restore (cr);

  /* hover line */
  if (o->has_hover && o->hover_t >= t0 && o->hover_t <= t1)
    {
      const double x = l + (o->hover_t - t0) / (t1 - t0) * (r - l);
      qv_plot_set_rgb (cr, pal->mark, 1.0);
      cairo_set_line_width (cr, 1.5);
      cairo_move_to (cr, x, t);
      cairo_line_to (cr, x, b);
      cairo_stroke (cr);
    }

  /* frame, legend on the right, axis label */
  qv_plot_set_rgb (cr, pal->ink, 1.0);
  cairo_set_line_width (cr, 1.0);
  cairo_rectangle (cr, floor (l) + 0.5, floor (t) + 0.5, floor (r - l), floor (b - t));
  cairo_stroke (cr);
  for (int c = 0; c < n; c++)
    {
      const double y = t + 6 + c * (QV_PLOT_FONT_PX + 8);
      qv_plot_set_rgb (cr, curves[c].colour, curves[c].dashed ? 0.7 : 1.0);
      cairo_set_line_width (cr, 2.0);
      if (curves[c].dashed)
        cairo_set_dash (cr, (const double[]) { 5.0, 3.0 }, 2, 0.0);
      cairo_move_to (cr, r + 10, y + 0.5 * QV_PLOT_FONT_PX + 1);
      cairo_line_to (cr, r + 30, y + 0.5 * QV_PLOT_FONT_PX + 1);
      cairo_stroke (cr);
      cairo_set_dash (cr, NULL, 0, 0.0);
      qv_plot_set_rgb (cr, pal->ink, 1.0);
      qv_plot_text (cr, layout, curves[c].name, r + 36, y, 0.0, 0.0, NULL);
    }
  {
    g_autofree char *label = g_strdup_printf (energy ? "energy (%s)" : "S, Cv (%s)",
                                              qv_thermal_plot_unit (o, panel));
    const char *given = energy ? o->energy_label : o->entropy_label;
    cairo_save (cr);
    cairo_translate (cr, 16, 0.5 * (t + b));
    cairo_rotate (cr, -G_PI / 2);
    qv_plot_text (cr, layout, given ? given : label, 0, 0, 0.5, 0.5, NULL);
    cairo_restore (cr);
  }
  if (!energy)
    qv_plot_text (cr, layout, o->temperature_label ? o->temperature_label : "temperature (K)",
                  0.5 * (l + r), b + 26, 0.5, 0.0, NULL);
}

static void
draw_plot (cairo_t *cr, gconstpointer data)
{
  const Plot *p = data;
  const QvPlotPalette *pal = qv_plot_palette (p->o->dark);
  PangoLayout *layout;

  cairo_save (cr);
  if (!p->o->transparent)
    {
      qv_plot_set_rgb (cr, pal->paper, 1.0);
      cairo_paint (cr);
    }
  cairo_set_line_cap (cr, CAIRO_LINE_CAP_BUTT);
  layout = qv_plot_layout (cr);
  draw_panel (cr, layout, p, QV_THERMAL_PANEL_ENERGY);
  draw_panel (cr, layout, p, QV_THERMAL_PANEL_ENTROPY);
  if (p->o->title)
    {
      double l, t, r, b;
      qv_thermal_plot_area (p->o, QV_THERMAL_PANEL_ENERGY, &l, &t, &r, &b);
      qv_plot_set_rgb (cr, pal->ink, 1.0);
      qv_plot_text (cr, layout, p->o->title, l, t - 8, 0.0, 1.0, NULL);
    }
  g_object_unref (layout);
  cairo_restore (cr);
}

void
qv_thermal_plot_draw (cairo_t *cr, const QvThermal *th, const QvThermalPlotOptions *o)
{
  const Plot p = { th, o };
  draw_plot (cr, &p);
}

char *
qv_thermal_plot_svg (const QvThermal *th, const QvThermalPlotOptions *o, gsize *length,
                     GError **error)
{
  const Plot p = { th, o };
  if (!qv_plot_check_size ("thermal plot", o->width, o->height, 240, 240, error))
    return NULL;
  return qv_plot_svg (o->width, o->height, draw_plot, &p, length, error);
}

guint8 *
qv_thermal_plot_rgba (const QvThermal *th, const QvThermalPlotOptions *o, GError **error)
{
  const Plot p = { th, o };
  if (!qv_plot_check_size ("thermal plot", o->width, o->height, 240, 240, error))
    return NULL;
  return qv_plot_rgba (o->width, o->height, draw_plot, &p, error);
}
