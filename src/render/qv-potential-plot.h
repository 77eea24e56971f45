/* qv-potential-plot.h — the potential of a scan along one normal mode and
 * its vibrational levels, drawn with cairo: V(Q) (the fitted polynomial or
 * spline over the scanned range, the scan's points as markers), the
 * harmonic parabola from the curvature at the minimum, each level E_v as a
 * horizontal line between its classical turning points, and each
 * wavefunction ψ_v(Q) drawn about its level (scaled for visibility, the
 * scale written in the plot); both minima and the barrier of a double
 * well. Q in u^½ Å on the horizontal axis, energy in cm⁻¹ above the
 * potential's minimum on the vertical one. SVG or RGBA (no GTK, no files),
 * pixel ↔ data conversions and a read-out for a pointer.
 *
 * Data: the 1-D potential and levels of qv-scan-potential.h; the levels'
 * refinement carries the DVR eigenvectors on the finest grid
 * (qv_dvr_levels_wavefunction). Energies passed in and out are cm⁻¹ above
 * the minimum (QvScanLevels.v_min).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <cairo.h>
#include <glib.h>
#include "qv-scan-potential.h"

G_BEGIN_DECLS

typedef struct {
  const QvScanPotential *potential;   /* one-dimensional */
  const QvScanLevels *levels;
  gsize n_points;                     /* the scan's points (markers), or 0 */
  const double *Q;                    /* u^½ Å */
  const double *V;                    /* eV, absolute as the scan gave them */
} QvPotentialPlotData;

typedef struct {
  int width, height;                  /* pixels (SVG user units = px) */
  gboolean transparent;
  gboolean dark;
  const char *title;                  /* top left, or NULL */
  gboolean hide_parabola, hide_wavefunctions, hide_points;
  gboolean has_range;                 /* else 0 … above the highest level */
  double e_max;                       /*   cm⁻¹ */
  gint selected_level;                /* drawn heavier; −1: none */
} QvPotentialPlotOptions;

/* 900 × 560, everything shown, range from the levels, nothing selected. */
void qv_potential_plot_options_init (QvPotentialPlotOptions *options);

void qv_potential_plot_draw (cairo_t *cr, const QvPotentialPlotData *data,
                             const QvPotentialPlotOptions *options);
/* QV_ERROR_USAGE for a size outside 200–16384 × 150–16384 or a potential
 * that is not one-dimensional. */
char *qv_potential_plot_svg (const QvPotentialPlotData *data, const QvPotentialPlotOptions *options,
                             gsize *length, GError **error);
guint8 *qv_potential_plot_rgba (const QvPotentialPlotData *data,
                                const QvPotentialPlotOptions *options, GError **error);

/* The box of the data (pixels): left, top, right, bottom. */
void qv_potential_plot_area (const QvPotentialPlotOptions *options, double *left, double *top,
                             double *right, double *bottom);
/* The energy range shown, cm⁻¹ above the minimum: 0 (or the options') to
 * the highest level plus half a spacing. */
void qv_potential_plot_range (const QvPotentialPlotData *data, const QvPotentialPlotOptions *options,
                              double *e_min, double *e_max);
/* Q (u^½ Å) ↔ pixel column: the scanned range spans the box. */
double qv_potential_plot_q_to_pixel (const QvPotentialPlotData *data,
                                     const QvPotentialPlotOptions *options, double Q);
double qv_potential_plot_pixel_to_q (const QvPotentialPlotData *data,
                                     const QvPotentialPlotOptions *options, double px);
/* Energy (cm⁻¹ above the minimum) ↔ pixel row. */
double qv_potential_plot_energy_to_pixel (const QvPotentialPlotData *data,
                                          const QvPotentialPlotOptions *options, double e);
double qv_potential_plot_pixel_to_energy (const QvPotentialPlotData *data,
                                          const QvPotentialPlotOptions *options, double py);

/* The factor the wavefunctions are drawn with: ψ_v(Q) is plotted as
 * E_v + scale·ψ_v(Q), @scale in cm⁻¹ per (u^½ Å)^−½, chosen so that the
 * ground state's peak is 40 % of the fundamental. */
double qv_potential_plot_wavefunction_scale (const QvPotentialPlotData *data);

typedef struct {
  double Q;                           /* under the pointer, u^½ Å */
  double energy;                      /* the pointer's height, cm⁻¹ */
  double V;                           /* V(Q), cm⁻¹ above the minimum */
  gsize level;                        /* the level nearest in energy */
  double level_energy;                /* its E_v, cm⁻¹ */
} QvPotentialPlotReadout;

/* FALSE when (@px, @py) is outside the box. */
gboolean qv_potential_plot_readout (const QvPotentialPlotData *data,
                                    const QvPotentialPlotOptions *options, double px, double py,
                                    QvPotentialPlotReadout *readout);

G_END_DECLS
