/* qv-potential-plot.c — cairo drawing of a scan's potential, its levels
 * and wavefunctions.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-plot-private.h"
#include "qv-potential-plot.h"

#define MARGIN_LEFT 74.0
#define MARGIN_RIGHT 18.0
#define CURVE_SAMPLES 400
/* The ground state's drawn peak as a share of the fundamental. */
#define PSI_SHARE 0.4

void
qv_potential_plot_options_init (QvPotentialPlotOptions *o)
{
  memset (o, 0, sizeof *o);
  o->width = 900;
  o->height = 560;
  o->selected_level = -1;
}

void
qv_potential_plot_area (const QvPotentialPlotOptions *o, double *left, double *top,
                        double *right, double *bottom)
{
  *left = MARGIN_LEFT;
  *top = QV_PLOT_MARGIN_TOP;
  *right = MAX (MARGIN_LEFT + 1.0, o->width - MARGIN_RIGHT);
  *bottom = MAX (QV_PLOT_MARGIN_TOP + 1.0, o->height - QV_PLOT_MARGIN_BOTTOM);
}

static double
cm (double ev)
{
  return ev / qv_scan_ev_per_wavenumber ();
}

void
qv_potential_plot_range (const QvPotentialPlotData *d, const QvPotentialPlotOptions *o,
                         double *e_min, double *e_max)
{
  const QvScanLevels *l = d->levels;
  *e_min = 0.0;
  if (o->has_range && o->e_max > 0 && isfinite (o->e_max))
    {
      *e_max = o->e_max;
      return;
    }
  if (l && l->n_levels >= 2)
    {
      const double top = cm (l->levels[l->n_levels - 1].energy);
      const double gap = top - cm (l->levels[l->n_levels - 2].energy);
      *e_max = top + MAX (0.5 * gap, 0.05 * top);
    }
  else
    *e_max = 100.0;
  if (!(*e_max > 0))
    *e_max = 100.0;
}

static void
q_range (const QvPotentialPlotData *d, double *lo, double *hi)
{
  *lo = -1.0;
  *hi = 1.0;
  if (d->potential)
    qv_scan_potential_range (d->potential, 0, lo, hi);
  if (!(*hi > *lo))
    *hi = *lo + 1.0;
}

double
qv_potential_plot_q_to_pixel (const QvPotentialPlotData *d, const QvPotentialPlotOptions *o,
                              double Q)
{
  double left, top, right, bottom, lo, hi;
  qv_potential_plot_area (o, &left, &top, &right, &bottom);
  q_range (d, &lo, &hi);
  return left + (Q - lo) / (hi - lo) * (right - left);
}

double
qv_potential_plot_pixel_to_q (const QvPotentialPlotData *d, const QvPotentialPlotOptions *o,
                              double px)
{
  double left, top, right, bottom, lo, hi;
  qv_potential_plot_area (o, &left, &top, &right, &bottom);
  q_range (d, &lo, &hi);
  return lo + (px - left) / (right - left) * (hi - lo);
}

double
qv_potential_plot_energy_to_pixel (const QvPotentialPlotData *d,
                                   const QvPotentialPlotOptions *o, double e)
{
  double left, top, right, bottom, lo, hi;
  qv_potential_plot_area (o, &left, &top, &right, &bottom);
  qv_potential_plot_range (d, o, &lo, &hi);
  return bottom - (e - lo) / (hi - lo) * (bottom - top);
}

double
qv_potential_plot_pixel_to_energy (const QvPotentialPlotData *d,
                                   const QvPotentialPlotOptions *o, double py)
{
  double left, top, right, bottom, lo, hi;
  qv_potential_plot_area (o, &left, &top, &right, &bottom);
  qv_potential_plot_range (d, o, &lo, &hi);
  return lo + (bottom - py) / (bottom - top) * (hi - lo);
}

static const QvDvrLevels *
dvr (const QvPotentialPlotData *d)
{
  if (d->levels == NULL || d->levels->refinement == NULL)
    return NULL;
  return d->levels->refinement->levels;
}

double
qv_potential_plot_wavefunction_scale (const QvPotentialPlotData *d)
{
  const QvDvrLevels *g = dvr (d);
  double peak = 0.0;
  if (g == NULL || g->n_levels < 1 || d->levels->n_levels < 2)
    return 0.0;
  for (gsize i = 0; i < g->n_points; i++)
    peak = MAX (peak, fabs (qv_dvr_levels_wavefunction (g, 0, i)));
  if (!(peak > 0) || !isfinite (d->levels->fundamental))
    return 0.0;
  return PSI_SHARE * cm (d->levels->fundamental) / peak;
}

gboolean
qv_potential_plot_readout (const QvPotentialPlotData *d, const QvPotentialPlotOptions *o,
                           double px, double py, QvPotentialPlotReadout *r)
{
  double left, top, right, bottom, x;
  const QvScanLevels *l = d->levels;

  qv_potential_plot_area (o, &left, &top, &right, &bottom);
  if (px < left || px > right || py < top || py > bottom || d->potential == NULL || l == NULL)
    return FALSE;
  r->Q = qv_potential_plot_pixel_to_q (d, o, px);
  r->energy = qv_potential_plot_pixel_to_energy (d, o, py);
  x = r->Q;
  r->V = cm (qv_scan_potential_eval (d->potential, &x) - l->v_min);
  r->level = 0;
  for (gsize k = 1; k < l->n_levels; k++)
    if (fabs (cm (l->levels[k].energy) - r->energy)
        < fabs (cm (l->levels[r->level].energy) - r->energy))
      r->level = k;
  r->level_energy = l->n_levels ? cm (l->levels[r->level].energy) : NAN;
  return TRUE;
}

static void
level_colour (cairo_t *cr, const QvPlotPalette *pal, gsize k, double alpha)
{
  qv_plot_set_rgb (cr, pal->series[k % QV_PLOT_N_SERIES], alpha);
}

static void
draw_plot (cairo_t *cr, gconstpointer data)
{
  const QvPotentialPlotData *d = ((const QvPotentialPlotData *const *) data)[0];
  const QvPotentialPlotOptions *o = ((const QvPotentialPlotOptions *const *) data)[1];
  const QvPlotPalette *pal = qv_plot_palette (o->dark);
  const QvScanLevels *l = d->levels;
  const QvDvrLevels *g = dvr (d);
  double left, top, right, bottom, e_lo, e_hi, q_lo, q_hi;
  PangoLayout *layout;
  char buf[128];

  qv_potential_plot_area (o, &left, &top, &right, &bottom);
  qv_potential_plot_range (d, o, &e_lo, &e_hi);
  q_range (d, &q_lo, &q_hi);

  cairo_save (cr);
  if (!o->transparent)
    {
      qv_plot_set_rgb (cr, pal->paper, 1.0);
      cairo_paint (cr);
    }
  layout = qv_plot_layout (cr);
  cairo_set_line_width (cr, 1.0);

  /* energy ticks with a grid */
  {
    const double step = qv_plot_nice_step (e_hi - e_lo, MAX (2.0, (bottom - top) / 60.0));
    for (double v = ceil (e_lo / step - 1e-9) * step; v <= e_hi + 1e-9 * step; v += step)
      {
        const double y = floor (qv_potential_plot_energy_to_pixel (d, o, v)) + 0.5;
        qv_plot_set_rgb (cr, pal->grid, 1.0);
        cairo_move_to (cr, left, y);
        cairo_line_to (cr, right, y);
        cairo_stroke (cr);
        qv_plot_set_rgb (cr, pal->ink, 1.0);
        cairo_move_to (cr, left, y);
        cairo_line_to (cr, left - 5, y);
        cairo_stroke (cr);
        qv_plot_format_tick (buf, sizeof buf, v, step, FALSE);
        qv_plot_text (cr, layout, buf, left - 8, y, 1.0, 0.5, NULL);
      }
  }
  /* Q ticks */
  {
    const double step = qv_plot_nice_step (q_hi - q_lo, MAX (2.0, (right - left) / 90.0));
    for (double v = ceil (q_lo / step - 1e-9) * step; v <= q_hi + 1e-9 * step; v += step)
      {
        const double x = floor (qv_potential_plot_q_to_pixel (d, o, v)) + 0.5;
        qv_plot_set_rgb (cr, pal->ink, 1.0);
        cairo_move_to (cr, x, bottom);
        cairo_line_to (cr, x, bottom + 5);
        cairo_stroke (cr);
        qv_plot_format_tick (buf, sizeof buf, v, step, FALSE);
        qv_plot_text (cr, layout, buf, x, bottom + 7, 0.5, 0.0, NULL);
      }
  }

  cairo_save (cr);
  cairo_rectangle (cr, left, top, right - left, bottom - top);
  cairo_clip (cr);
  cairo_set_line_join (cr, CAIRO_LINE_JOIN_ROUND);

  if (d->potential && l)
    {
      /* the harmonic parabola from the curvature at the minimum, dashed */
      if (!o->hide_parabola && l->curvature[0] > 0)
        {
          cairo_new_path (cr);
          for (int i = 0; i <= CURVE_SAMPLES; i++)
            {
              const double q = q_lo + (q_hi - q_lo) * i / CURVE_SAMPLES;
              const double e = cm (0.5 * l->curvature[0] * (q - l->q_min[0]) * (q - l->q_min[0]));
              const double y = qv_potential_plot_energy_to_pixel (d, o, MIN (e, 4 * e_hi));
              if (i == 0)
                cairo_move_to (cr, qv_potential_plot_q_to_pixel (d, o, q), y);
              else
                cairo_line_to (cr, qv_potential_plot_q_to_pixel (d, o, q), y);
            }
          qv_plot_set_rgb (cr, pal->ink, 0.55);
          cairo_set_line_width (cr, 1.2);
          cairo_set_dash (cr, (const double[]) { 5.0, 4.0 }, 2, 0.0);
          cairo_stroke (cr);
          cairo_set_dash (cr, NULL, 0, 0.0);
        }

      /* a double well: the barrier between the two lowest minima */
      if (l->minima && l->minima->len >= 2 && l->barrier > 0)
        {
          const double y = floor (qv_potential_plot_energy_to_pixel (d, o, cm (l->barrier))) + 0.5;
          qv_plot_set_rgb (cr, pal->imaginary, 0.9);
          cairo_set_line_width (cr, 1.0);
          cairo_set_dash (cr, (const double[]) { 2.0, 3.0 }, 2, 0.0);
          cairo_move_to (cr, left, y);
          cairo_line_to (cr, right, y);
          cairo_stroke (cr);
          cairo_set_dash (cr, NULL, 0, 0.0);
          g_snprintf (buf, sizeof buf, "barrier %.1f cm\u207b\u00b9, splitting %.4g cm\u207b\u00b9",
                      cm (l->barrier), cm (l->splitting));
          qv_plot_text (cr, layout, buf, right - 6, y - 3, 1.0, 1.0, NULL);
        }

      /* the levels between their turning points, and the wavefunctions */
      {
        const double scale = o->hide_wavefunctions ? 0.0 : qv_potential_plot_wavefunction_scale (d);
        for (gsize k = 0; k < l->n_levels; k++)
          {
            const QvScanLevel *v = &l->levels[k];
            const double e = cm (v->energy);
            const double y = qv_potential_plot_energy_to_pixel (d, o, e);
            const double a = isfinite (v->turning[0]) ? v->turning[0] : q_lo;
            const double b = isfinite (v->turning[1]) ? v->turning[1] : q_hi;
            const gboolean selected = o->selected_level == (gint) k;

            if (scale > 0 && g && k < g->n_levels)
              {
                double x[2];
                cairo_new_path (cr);
                for (gsize i = 0; i < g->n_points; i++)
                  {
                    qv_dvr_grid_point (&g->grid, i, x);
                    const double py = qv_potential_plot_energy_to_pixel (
                      d, o, e + scale * qv_dvr_levels_wavefunction (g, k, i));
                    if (i == 0)
                      cairo_move_to (cr, qv_potential_plot_q_to_pixel (d, o, x[0]), py);
                    else
                      cairo_line_to (cr, qv_potential_plot_q_to_pixel (d, o, x[0]), py);
                  }
                level_colour (cr, pal, k, selected ? 1.0 : 0.75);
                cairo_set_line_width (cr, selected ? 1.8 : 1.1);
                cairo_stroke (cr);
              }
            level_colour (cr, pal, k, 1.0);
            cairo_set_line_width (cr, selected ? 2.6 : 1.6);
            cairo_move_to (cr, qv_potential_plot_q_to_pixel (d, o, a), y);
            cairo_line_to (cr, qv_potential_plot_q_to_pixel (d, o, b), y);
            cairo_stroke (cr);
            g_snprintf (buf, sizeof buf, "v=%" G_GSIZE_FORMAT, k);
            qv_plot_text (cr, layout, buf, qv_potential_plot_q_to_pixel (d, o, b) + 4, y, 0.0,
                          0.5, NULL);
          }
      }

      /* V(Q) */
      cairo_new_path (cr);
      for (int i = 0; i <= CURVE_SAMPLES; i++)
        {
          double q = q_lo + (q_hi - q_lo) * i / CURVE_SAMPLES;
          const double e = cm (qv_scan_potential_eval (d->potential, &q) - l->v_min);
          const double y = qv_potential_plot_energy_to_pixel (d, o, MIN (e, 4 * e_hi));
          if (i == 0)
            cairo_move_to (cr, qv_potential_plot_q_to_pixel (d, o, q), y);
          else
            cairo_line_to (cr, qv_potential_plot_q_to_pixel (d, o, q), y);
        }
      qv_plot_set_rgb (cr, pal->branch, 1.0);
      cairo_set_line_width (cr, 2.0);
      cairo_stroke (cr);

      /* the minima of a multiple well, as triangles under the curve */
      if (l->minima && l->minima->len >= 2)
        for (guint k = 0; k < l->minima->len; k++)
          {
            const QvScanMinimum *mn = &g_array_index (l->minima, QvScanMinimum, k);
            const double x = qv_potential_plot_q_to_pixel (d, o, mn->Q[0]);
            const double y = qv_potential_plot_energy_to_pixel (d, o, cm (mn->energy));
            cairo_move_to (cr, x, y + 3);
            cairo_line_to (cr, x - 5, y + 11);
            cairo_line_to (cr, x + 5, y + 11);
            cairo_close_path (cr);
            qv_plot_set_rgb (cr, pal->imaginary, 1.0);
            cairo_fill (cr);
          }

      /* the scan's points */
      if (!o->hide_points && d->Q && d->V)
        for (gsize i = 0; i < d->n_points; i++)
          {
            const double x = qv_potential_plot_q_to_pixel (d, o, d->Q[i]);
            const double y = qv_potential_plot_energy_to_pixel (d, o, cm (d->V[i] - l->v_min));
            cairo_new_sub_path (cr);
            cairo_arc (cr, x, y, 3.0, 0, 2 * G_PI);
            qv_plot_set_rgb (cr, pal->paper, 1.0);
            cairo_fill_preserve (cr);
            qv_plot_set_rgb (cr, pal->branch, 1.0);
            cairo_set_line_width (cr, 1.2);
            cairo_stroke (cr);
          }
    }
  cairo_restore (cr);

  /* frame, axis labels, title, the wavefunction scale */
  qv_plot_set_rgb (cr, pal->ink, 1.0);
  cairo_set_line_width (cr, 1.0);
  cairo_rectangle (cr, floor (left) + 0.5, floor (top) + 0.5, floor (right - left),
                   floor (bottom - top));
  cairo_stroke (cr);
  qv_plot_text (cr, layout, "Q (u\u00bd \u00c5)", 0.5 * (left + right), bottom + 26, 0.5, 0.0,
                NULL);
  cairo_save (cr);
  cairo_translate (cr, 16, 0.5 * (top + bottom));
  cairo_rotate (cr, -G_PI / 2);
  qv_plot_text (cr, layout, "energy above the minimum (cm\u207b\u00b9)", 0, 0, 0.5, 0.5, NULL);
  cairo_restore (cr);
  if (o->title)
    qv_plot_text (cr, layout, o->title, left, top - 8, 0.0, 1.0, NULL);
  if (!o->hide_wavefunctions && qv_potential_plot_wavefunction_scale (d) > 0)
    {
      g_snprintf (buf, sizeof buf, "\u03c8_v drawn at E_v, scale %.4g cm\u207b\u00b9 per "
                  "(u\u00bd \u00c5)\u207b\u00bd; dashed: harmonic",
                  qv_potential_plot_wavefunction_scale (d));
      qv_plot_text (cr, layout, buf, right, top - 8, 1.0, 1.0, NULL);
    }
  g_object_unref (layout);
  cairo_restore (cr);
}

void
qv_potential_plot_draw (cairo_t *cr, const QvPotentialPlotData *d, const QvPotentialPlotOptions *o)
{
  gconstpointer pair[2] = { d, o };
  draw_plot (cr, pair);
}

static gboolean
check (const QvPotentialPlotData *d, const QvPotentialPlotOptions *o, GError **error)
{
  if (d->potential == NULL || qv_scan_potential_dim (d->potential) != 1 || d->levels == NULL)
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE,
                           "the potential plot draws a scan along one mode");
      return FALSE;
    }
  return qv_plot_check_size ("potential plot", o->width, o->height, 200, 150, error);
}

char *
qv_potential_plot_svg (const QvPotentialPlotData *d, const QvPotentialPlotOptions *o,
                       gsize *length, GError **error)
{
  gconstpointer pair[2] = { d, o };
  if (!check (d, o, error))
    return NULL;
  return qv_plot_svg (o->width, o->height, draw_plot, pair, length, error);
}

guint8 *
qv_potential_plot_rgba (const QvPotentialPlotData *d, const QvPotentialPlotOptions *o,
                        GError **error)
{
  gconstpointer pair[2] = { d, o };
  if (!check (d, o, error))
    return NULL;
  return qv_plot_rgba (o->width, o->height, draw_plot, pair, error);
}
