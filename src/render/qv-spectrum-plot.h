/* qv-spectrum-plot.h — a spectrum drawn with cairo: axes with tick labels
 * in cm⁻¹, the envelope and its sticks, peaks labelled with their mode
 * numbers; as an SVG document or as RGBA pixels (no GTK, no files: the
 * caller writes them), and a hit test that turns a pixel into the mode of
 * the nearest peak, so a plot in the app can select modes.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <cairo.h>
#include <glib.h>
#include "qv-spectrum.h"

G_BEGIN_DECLS

#define QV_SPECTRUM_PLOT_MAX_SIDE 16384

typedef struct {
  int width, height;           /* pixels (SVG user units = px) */
  gboolean has_range;          /* else the spectrum's grid */
  double x_min, x_max;         /* cm⁻¹ shown */
  gboolean descending;         /* high wavenumbers on the left (an IR habit) */
  gboolean show_sticks, show_envelope;
  const char *title;           /* top left, or NULL */
  const char *envelope_label;  /* left axis, e.g. "km/mol per cm⁻¹" */
  const char *stick_label;     /* right axis, e.g. "km/mol" */
  guint n_labels;              /* the tallest sticks labelled with their mode
                                  number (1-based), overlapping ones left out */
  gint selected;               /* 0-based mode drawn highlighted, or −1 */
  gboolean transparent;        /* no background fill */
} QvSpectrumPlotOptions;

/* 900 × 500, sticks and envelope, ascending, 8 labels, nothing selected. */
void qv_spectrum_plot_options_init (QvSpectrumPlotOptions *options);

/* Draws onto @cr in a width × height box at the origin. */
void qv_spectrum_plot_draw (cairo_t *cr, const QvSpectrum *spectrum,
                            const QvSpectrumPlotOptions *options);
/* The plot as an SVG document (newly allocated, NUL-terminated, *@length
 * bytes without the NUL). QV_ERROR_USAGE for a bad size. */
char *qv_spectrum_plot_svg (const QvSpectrum *spectrum, const QvSpectrumPlotOptions *options,
                            gsize *length, GError **error);
/* The plot as straight-alpha RGBA, width × height × 4 bytes, top row first. */
guint8 *qv_spectrum_plot_rgba (const QvSpectrum *spectrum, const QvSpectrumPlotOptions *options,
                               GError **error);

/* The box of the data (pixels): left, top, right, bottom. */
void qv_spectrum_plot_area (const QvSpectrumPlotOptions *options, double *left, double *top,
                            double *right, double *bottom);
/* The pixel column of wavenumber @x, and back. */
double qv_spectrum_plot_x_to_pixel (const QvSpectrum *spectrum,
                                    const QvSpectrumPlotOptions *options, double x);
double qv_spectrum_plot_pixel_to_x (const QvSpectrum *spectrum,
                                    const QvSpectrumPlotOptions *options, double pixel);
/* The 0-based mode of the stick nearest to pixel column @pixel within
 * @tolerance pixels (the taller on a tie), or −1. Sticks outside the shown
 * range never match. */
gint qv_spectrum_plot_hit (const QvSpectrum *spectrum, const QvSpectrumPlotOptions *options,
                           double pixel, double tolerance);

G_END_DECLS
