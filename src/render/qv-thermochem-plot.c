/* qv-thermochem-plot.c — cairo drawing of a molecule's thermochemistry
 * against T.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-plot-private.h"
#include "qv-thermochem-plot.h"

#define MARGIN_LEFT 74.0
#define MARGIN_RIGHT 96.0    /* the legends */
#define PANEL_GAP 18.0
#define PAD 0.06

/* The curves, in plot units. */
enum { CURVE_H, CURVE_G, CURVE_ZPE, CURVE_S, CURVE_S_VIB, CURVE_CP, N_CURVES };

static double
curve_value (const QvGasThermo *th, int curve)
{
  const double kj = qv_gas_kj_per_mol ();
  switch (curve)
    {
    case CURVE_H: return th->total.enthalpy * kj;
    case CURVE_G: return th->total.free_energy * kj;
    case CURVE_ZPE: return th->total.zpe * kj;
    case CURVE_S: return th->total.entropy * kj * 1000.0;
    case CURVE_S_VIB: return th->vibration.entropy * kj * 1000.0;
    case CURVE_CP: return th->heat_capacity_p * kj * 1000.0;
    default: return NAN;
    }
}

void
qv_thermochem_plot_options_init (QvThermochemPlotOptions *o)
{
  memset (o, 0, sizeof *o);
  o->width = 900;
  o->height = 560;
}

const char *
qv_thermochem_plot_unit (QvThermochemPanel panel)
{
  return panel == QV_THERMOCHEM_PANEL_ENERGY ? "kJ/mol" : "J/(K mol)";
}

void
qv_thermochem_plot_area (const QvThermochemPlotOptions *o, QvThermochemPanel panel, double *left,
                         double *top, double *right, double *bottom)
{
  const double t0 = QV_PLOT_MARGIN_TOP;
  const double b1 = MAX (t0 + 3.0 + PANEL_GAP, o->height - QV_PLOT_MARGIN_BOTTOM);
  const double h = 0.5 * (b1 - t0 - PANEL_GAP);
  *left = MARGIN_LEFT;
  *right = MAX (MARGIN_LEFT + 1.0, o->width - MARGIN_RIGHT);
  *top = panel == QV_THERMOCHEM_PANEL_ENERGY ? t0 : t0 + h + PANEL_GAP;
  *bottom = *top + h;
}

static void
panel_curves (QvThermochemPanel panel, int *first, int *last)
{
  *first = panel == QV_THERMOCHEM_PANEL_ENERGY ? CURVE_H : CURVE_S;
  *last = panel == QV_THERMOCHEM_PANEL_ENERGY ? CURVE_ZPE : CURVE_CP;
}

void
qv_thermochem_plot_range (const QvGasThermo *sweep, gsize n, const QvThermochemPlotOptions *o,
                          QvThermochemPanel panel, double *t_min, double *t_max, double *v_min,
                          double *v_max)
{
  double t0 = 0.0, t1 = 1000.0, lo = G_MAXDOUBLE, hi = -G_MAXDOUBLE, span;
  int first, last;

  panel_curves (panel, &first, &last);
  if (o->has_range && o->t_max > o->t_min && isfinite (o->t_min) && isfinite (o->t_max))
    {
      t0 = o->t_min;
      t1 = o->t_max;
    }
  else if (sweep && n > 0)
    {
      t0 = sweep[0].temperature;
      t1 = sweep[n - 1].temperature;
      if (!(t1 > t0))
        t1 = t0 + 1.0;
    }
  for (gsize i = 0; sweep && i < n; i++)
    {
      if (sweep[i].temperature < t0 || sweep[i].temperature > t1)
        continue;
      for (int c = first; c <= last; c++)
        {
          const double v = curve_value (&sweep[i], c);
          if (isfinite (v))
            {
              lo = MIN (lo, v);
              hi = MAX (hi, v);
            }
        }
    }
  if (lo > hi)
    {
      lo = 0.0;
      hi = 1.0;
    }
  /* entropies and heat capacities are positive: their axis starts at 0 */
  if (panel == QV_THERMOCHEM_PANEL_ENTROPY)
    lo = MIN (lo, 0.0);
  span = hi - lo;
  if (!(span > 0))
    span = MAX (fabs (hi), 1.0);
  *t_min = t0;
  *t_max = t1;
  *v_min = panel == QV_THERMOCHEM_PANEL_ENTROPY && lo == 0.0 ? 0.0 : lo - PAD * span;
  *v_max = hi + PAD * span;
}

double
qv_thermochem_plot_t_to_pixel (const QvGasThermo *sweep, gsize n, const QvThermochemPlotOptions *o,
                               double t)
{
  double l, tp, r, b, t0, t1, v0, v1;
  qv_thermochem_plot_area (o, QV_THERMOCHEM_PANEL_ENERGY, &l, &tp, &r, &b);
  qv_thermochem_plot_range (sweep, n, o, QV_THERMOCHEM_PANEL_ENERGY, &t0, &t1, &v0, &v1);
  return l + (t - t0) / (t1 - t0) * (r - l);
}

double
qv_thermochem_plot_pixel_to_t (const QvGasThermo *sweep, gsize n, const QvThermochemPlotOptions *o,
                               double pixel)
{
  double l, tp, r, b, t0, t1, v0, v1;
  qv_thermochem_plot_area (o, QV_THERMOCHEM_PANEL_ENERGY, &l, &tp, &r, &b);
  qv_thermochem_plot_range (sweep, n, o, QV_THERMOCHEM_PANEL_ENERGY, &t0, &t1, &v0, &v1);
  return t0 + (pixel - l) / (r - l) * (t1 - t0);
}

double
qv_thermochem_plot_value_to_pixel (const QvGasThermo *sweep, gsize n,
                                   const QvThermochemPlotOptions *o, QvThermochemPanel panel,
                                   double value)
{
  double l, tp, r, b, t0, t1, v0, v1;
  qv_thermochem_plot_area (o, panel, &l, &tp, &r, &b);
  qv_thermochem_plot_range (sweep, n, o, panel, &t0, &t1, &v0, &v1);
  return b - (value - v0) / (v1 - v0) * (b - tp);
}

double
qv_thermochem_plot_pixel_to_value (const QvGasThermo *sweep, gsize n,
                                   const QvThermochemPlotOptions *o, QvThermochemPanel panel,
                                   double pixel)
{
  double l, tp, r, b, t0, t1, v0, v1;
  qv_thermochem_plot_area (o, panel, &l, &tp, &r, &b);
  qv_thermochem_plot_range (sweep, n, o, panel, &t0, &t1, &v0, &v1);
  return v0 + (b - pixel) / (b - tp) * (v1 - v0);
}

gboolean
qv_thermochem_plot_value_at (const QvGasThermo *sweep, gsize n, double t, QvThermochemReadout *out)
{
  gsize i0 = 0;
  double u = 0.0, v[N_CURVES];

  if (sweep == NULL || n == 0 || !isfinite (t) || t < sweep[0].temperature
      || t > sweep[n - 1].temperature)
    return FALSE;
  if (n > 1)
    {
      while (i0 + 2 < n && sweep[i0 + 1].temperature <= t)
        i0++;
      u = sweep[i0 + 1].temperature > sweep[i0].temperature
          ? (t - sweep[i0].temperature) / (sweep[i0 + 1].temperature - sweep[i0].temperature) : 0.0;
    }
  for (int c = 0; c < N_CURVES; c++)
    v[c] = n == 1 ? curve_value (&sweep[0], c)
                  : (1.0 - u) * curve_value (&sweep[i0], c) + u * curve_value (&sweep[i0 + 1], c);
  out->t = t;
  out->enthalpy = v[CURVE_H];
  out->free_energy = v[CURVE_G];
  out->zpe = v[CURVE_ZPE];
  out->entropy = v[CURVE_S];
  out->entropy_vibration = v[CURVE_S_VIB];
  out->heat_capacity_p = v[CURVE_CP];
  return TRUE;
}

gboolean
qv_thermochem_plot_readout (const QvGasThermo *sweep, gsize n, const QvThermochemPlotOptions *o,
                            double px, double py, QvThermochemPanel *panel,
                            QvThermochemReadout *out)
{
  for (int p = QV_THERMOCHEM_PANEL_ENERGY; p <= QV_THERMOCHEM_PANEL_ENTROPY; p++)
    {
      double l, t, r, b;
      QvThermochemReadout local;
      qv_thermochem_plot_area (o, (QvThermochemPanel) p, &l, &t, &r, &b);
      if (!(px >= l && px <= r && py >= t && py <= b))
        continue;
      if (!qv_thermochem_plot_value_at (sweep, n, qv_thermochem_plot_pixel_to_t (sweep, n, o, px),
                                        out ? out : &local))
        return FALSE;
      if (panel)
        *panel = (QvThermochemPanel) p;
      return TRUE;
    }
  return FALSE;
}

typedef struct {
  const QvGasThermo *sweep;
  gsize n;
  const QvThermochemPlotOptions *o;
} Plot;

static void
vertical_line (cairo_t *cr, double x, double top, double bottom, QvPlotRgb colour, gboolean dashed)
{
  qv_plot_set_rgb (cr, colour, 1.0);
  cairo_set_line_width (cr, 1.5);
  if (dashed)
    cairo_set_dash (cr, (const double[]) { 4.0, 3.0 }, 2, 0.0);
  cairo_move_to (cr, x, top);
  cairo_line_to (cr, x, bottom);
  cairo_stroke (cr);
  cairo_set_dash (cr, NULL, 0, 0.0);
}

static void
draw_panel (cairo_t *cr, PangoLayout *layout, const Plot *p, QvThermochemPanel panel)
{
  const QvThermochemPlotOptions *o = p->o;
  const QvPlotPalette *pal = qv_plot_palette (o->dark);
  const gboolean energy = panel == QV_THERMOCHEM_PANEL_ENERGY;
  struct { const char *name; int curve; QvPlotRgb colour; gboolean dashed; } curves[3];
  double l, t, r, b, t0, t1, v0, v1;
  const int n = 3;
  char buf[64];

  qv_thermochem_plot_area (o, panel, &l, &t, &r, &b);
  qv_thermochem_plot_range (p->sweep, p->n, o, panel, &t0, &t1, &v0, &v1);
  if (energy)
    {
      curves[0].name = "H"; curves[0].curve = CURVE_H;
      curves[0].colour = pal->series[1]; curves[0].dashed = FALSE;
      curves[1].name = "G"; curves[1].curve = CURVE_G;
      curves[1].colour = pal->series[0]; curves[1].dashed = FALSE;
      curves[2].name = "ZPE"; curves[2].curve = CURVE_ZPE;
      curves[2].colour = pal->ink; curves[2].dashed = TRUE;
    }
  else
    {
      curves[0].name = "S"; curves[0].curve = CURVE_S;
      curves[0].colour = pal->series[2]; curves[0].dashed = FALSE;
      curves[1].name = "S vib"; curves[1].curve = CURVE_S_VIB;
      curves[1].colour = pal->series[2]; curves[1].dashed = TRUE;
      curves[2].name = "Cp"; curves[2].curve = CURVE_CP;
      curves[2].colour = pal->series[5]; curves[2].dashed = FALSE;
    }

  /* value ticks with a grid; the zero line darker */
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
  for (int c = 0; c < n && p->sweep; c++)
    {
      gboolean pen = FALSE;
      cairo_new_path (cr);
      for (gsize i = 0; i < p->n; i++)
        {
          const double value = curve_value (&p->sweep[i], curves[c].curve);
          const double x = l + (p->sweep[i].temperature - t0) / (t1 - t0) * (r - l);
          const double y = b - (value - v0) / (v1 - v0) * (b - t);
          if (!isfinite (value))
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
      qv_plot_set_rgb (cr, curves[c].colour, curves[c].dashed ? 0.75 : 1.0);
      cairo_set_line_width (cr, curves[c].dashed ? 1.3 : 1.8);
      if (curves[c].dashed)
        cairo_set_dash (cr, (const double[]) { 5.0, 3.0 }, 2, 0.0);
      cairo_stroke (cr);
      cairo_set_dash (cr, NULL, 0, 0.0);
    }
  cairo_restore (cr);

  /* the tables' temperature (dashed) and the pointer's (solid) */
  if (o->has_marker && o->marker_t >= t0 && o->marker_t <= t1)
    vertical_line (cr, l + (o->marker_t - t0) / (t1 - t0) * (r - l), t, b, pal->mark, TRUE);
  if (o->has_hover && o->hover_t >= t0 && o->hover_t <= t1)
    vertical_line (cr, l + (o->hover_t - t0) / (t1 - t0) * (r - l), t, b, pal->mark, FALSE);

  /* frame, legend on the right, axis label */
  qv_plot_set_rgb (cr, pal->ink, 1.0);
  cairo_set_line_width (cr, 1.0);
  cairo_rectangle (cr, floor (l) + 0.5, floor (t) + 0.5, floor (r - l), floor (b - t));
  cairo_stroke (cr);
  for (int c = 0; c < n; c++)
    {
      const double y = t + 6 + c * (QV_PLOT_FONT_PX + 8);
      qv_plot_set_rgb (cr, curves[c].colour, curves[c].dashed ? 0.75 : 1.0);
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
    /* the unit alone: the legend names the curves, and a short label
     * fits beside a short panel */
    const char *label = qv_thermochem_plot_unit (panel);
    cairo_save (cr);
    cairo_translate (cr, 16, 0.5 * (t + b));
    cairo_rotate (cr, -G_PI / 2);
    qv_plot_text (cr, layout, label, 0, 0, 0.5, 0.5, NULL);
    cairo_restore (cr);
  }
  if (!energy)
    qv_plot_text (cr, layout, "temperature (K)", 0.5 * (l + r), b + 26, 0.5, 0.0, NULL);
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
  draw_panel (cr, layout, p, QV_THERMOCHEM_PANEL_ENERGY);
  draw_panel (cr, layout, p, QV_THERMOCHEM_PANEL_ENTROPY);
  if (p->o->title)
    {
      double l, t, r, b;
      qv_thermochem_plot_area (p->o, QV_THERMOCHEM_PANEL_ENERGY, &l, &t, &r, &b);
      qv_plot_set_rgb (cr, pal->ink, 1.0);
      qv_plot_text (cr, layout, p->o->title, l, t - 8, 0.0, 1.0, NULL);
    }
  g_object_unref (layout);
  cairo_restore (cr);
}

void
qv_thermochem_plot_draw (cairo_t *cr, const QvGasThermo *sweep, gsize n,
                         const QvThermochemPlotOptions *o)
{
  const Plot p = { sweep, n, o };
  draw_plot (cr, &p);
}

char *
qv_thermochem_plot_svg (const QvGasThermo *sweep, gsize n, const QvThermochemPlotOptions *o,
                        gsize *length, GError **error)
{
  const Plot p = { sweep, n, o };
  if (!qv_plot_check_size ("thermochemistry plot", o->width, o->height, 240, 240, error))
    return NULL;
  return qv_plot_svg (o->width, o->height, draw_plot, &p, length, error);
}

guint8 *
qv_thermochem_plot_rgba (const QvGasThermo *sweep, gsize n, const QvThermochemPlotOptions *o,
                         GError **error)
{
  const Plot p = { sweep, n, o };
  if (!qv_plot_check_size ("thermochemistry plot", o->width, o->height, 240, 240, error))
    return NULL;
  return qv_plot_rgba (o->width, o->height, draw_plot, &p, error);
}
