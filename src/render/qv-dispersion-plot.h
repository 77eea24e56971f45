/* qv-dispersion-plot.h — phonon dispersion drawn with cairo: the branches
 * along a sampled path through the Brillouin zone (broken where the path
 * jumps), the labelled high-symmetry points as vertical lines, the zero
 * line with imaginary parts (negative wavenumbers) below it drawn apart, a
 * frequency axis in cm⁻¹, THz or meV; as an SVG document or as RGBA pixels
 * (no GTK, no files: the caller writes them), and a hit test that turns a
 * pixel into the nearest (q point, branch), so a plot in the app can select
 * a lattice mode.
 *
 * Data: @sampling from qv_band_path_sample, @wavenumbers n_q × n_branches in
 * cm⁻¹ in connected order (branch b at q point k is wavenumbers[k·nb + b],
 * as qv_band_connect orders them), negative = imaginary. All wavenumbers
 * passed in and out of this API are cm⁻¹, whatever unit the axis shows.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <cairo.h>
#include <glib.h>
#include "qv-band-path.h"
#include "qv-units.h"

G_BEGIN_DECLS

typedef struct {
  int width, height;           /* pixels (SVG user units = px) */
  gboolean transparent;        /* no background fill */
  gboolean dark;               /* the dark palette (light ink on a dark ground) */
  const char *title;           /* top left, or NULL */
  gboolean has_range;          /* else from the data: 0 (or the most imaginary */
  double y_min, y_max;         /*   value) to the highest, padded; cm⁻¹ */
  QvFrequencyUnit unit;        /* of the axis ticks and label */
  const char *axis_label;      /* NULL: "wavenumber (cm⁻¹)", "frequency (THz)" or
                                  "energy (meV)" (not translated, as the spectrum plot) */
  gint selected_q, selected_branch;   /* a marked point; −1: none */
  gint hover_q, hover_branch;         /* a ring; −1: none */
} QvDispersionPlotOptions;

/* 900 × 500, cm⁻¹, range from the data, nothing selected or hovered. */
void qv_dispersion_plot_options_init (QvDispersionPlotOptions *options);

/* Draws onto @cr in a width × height box at the origin. */
void qv_dispersion_plot_draw (cairo_t *cr, const QvBandSampling *sampling, gsize n_branches,
                              const double *wavenumbers, const QvDispersionPlotOptions *options);
/* The plot as an SVG document (newly allocated, NUL-terminated, *@length
 * bytes without the NUL). QV_ERROR_USAGE for a size outside 200–16384 ×
 * 150–16384. */
char *qv_dispersion_plot_svg (const QvBandSampling *sampling, gsize n_branches,
                              const double *wavenumbers, const QvDispersionPlotOptions *options,
                              gsize *length, GError **error);
/* The plot as straight-alpha RGBA, width × height × 4 bytes, top row first. */
guint8 *qv_dispersion_plot_rgba (const QvBandSampling *sampling, gsize n_branches,
                                 const double *wavenumbers,
                                 const QvDispersionPlotOptions *options, GError **error);

/* The box of the data (pixels): left, top, right, bottom. The top and
 * bottom margins are those of a QvDosPlotOptions.horizontal DOS plot of the
 * same height, so the two frequency axes line up side by side. */
void qv_dispersion_plot_area (const QvDispersionPlotOptions *options, double *left, double *top,
                              double *right, double *bottom);
/* The wavenumber range shown (cm⁻¹): the options' range, or the data's. */
void qv_dispersion_plot_range (const QvBandSampling *sampling, gsize n_branches,
                               const double *wavenumbers, const QvDispersionPlotOptions *options,
                               double *y_min, double *y_max);
/* Path distance (Å⁻¹, as QvBandSampling.distance) ↔ pixel column. The path's
 * first and last distances are at the box's left and right edges. */
double qv_dispersion_plot_x_to_pixel (const QvBandSampling *sampling,
                                      const QvDispersionPlotOptions *options, double distance);
double qv_dispersion_plot_pixel_to_x (const QvBandSampling *sampling,
                                      const QvDispersionPlotOptions *options, double pixel);
/* Wavenumber (cm⁻¹) ↔ pixel row (linear; the range's ends at the box's
 * bottom and top edges). */
double qv_dispersion_plot_y_to_pixel (const QvBandSampling *sampling, gsize n_branches,
                                      const double *wavenumbers,
                                      const QvDispersionPlotOptions *options, double wavenumber);
double qv_dispersion_plot_pixel_to_y (const QvBandSampling *sampling, gsize n_branches,
                                      const double *wavenumbers,
                                      const QvDispersionPlotOptions *options, double pixel);
/* The pixel of branch @branch at q point @q_index. FALSE when out of range
 * or the value is not finite. */
gboolean qv_dispersion_plot_point_to_pixel (const QvBandSampling *sampling, gsize n_branches,
                                            const double *wavenumbers,
                                            const QvDispersionPlotOptions *options,
                                            gsize q_index, gsize branch, double *px, double *py);
/* The (q point, branch) whose sample is nearest to pixel (@px, @py), if it
 * is within @tolerance_px pixels (Euclidean); points outside the shown
 * range never match; on a tie the lower q index, then the lower branch. */
gboolean qv_dispersion_plot_hit (const QvBandSampling *sampling, gsize n_branches,
                                 const double *wavenumbers,
                                 const QvDispersionPlotOptions *options, double px, double py,
                                 double tolerance_px, gsize *q_index, gsize *branch);

/* The label as drawn: "G" and "Gamma" become "Γ", also in "X|G". Newly
 * allocated. */
char *qv_dispersion_plot_label_text (const char *label);

G_END_DECLS
