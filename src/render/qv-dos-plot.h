/* qv-dos-plot.h — a phonon density of states drawn with cairo: the total
 * DOS filled, the partial DOS of each element as lines with a legend of
 * element symbols, the frequency axis in cm⁻¹, THz or meV, imaginary
 * frequencies (negative) on a shaded side; frequency along the bottom, or
 * upwards (`horizontal`) to stand beside a dispersion plot of the same
 * height with the frequency axes lined up. As SVG or RGBA like
 * qv-dispersion-plot.h, and a read-out that turns a pixel into a frequency
 * and the DOS there.
 *
 * Values in and out are the core's (qv-phonon-dos.h): frequencies in cm⁻¹,
 * DOS in states per cm⁻¹ per primitive cell; the axes show @unit (the DOS
 * then per that unit).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <cairo.h>
#include <glib.h>
#include "qv-phonon-dos.h"
#include "qv-units.h"

G_BEGIN_DECLS

typedef struct {
  int width, height;           /* pixels */
  gboolean transparent;        /* no background fill */
  gboolean dark;               /* the dark palette */
  const char *title;           /* top left, or NULL */
  gboolean has_range;          /* else the DOS grid's first to last point */
  double x_min, x_max;         /* frequency range shown, cm⁻¹ (give a dispersion
                                  plot's qv_dispersion_plot_range to line up) */
  gboolean has_dos_max;        /* else the largest value shown, padded */
  double dos_max;              /* states per cm⁻¹ per cell */
  QvFrequencyUnit unit;        /* of the frequency axis and the DOS */
  gboolean horizontal;         /* frequency upwards, DOS to the right: beside a
                                  dispersion plot of the same height, the top and
                                  bottom of the two boxes coincide */
  gboolean hide_frequency_labels;  /* ticks without numbers or axis label (beside
                                      a dispersion plot that has them) */
  gboolean hide_total, hide_partial;
  const char *frequency_label; /* NULL: "wavenumber (cm⁻¹)" etc. (not translated) */
  const char *dos_label;       /* NULL: "DOS (states/cm⁻¹/cell)" etc. */
  gboolean has_hover;          /* a marker line at hover_frequency (cm⁻¹) */
  double hover_frequency;
  const char *total_label;     /* the legend's total, NULL: "total" (element
                                  symbols stay as they are) */
} QvDosPlotOptions;

/* 900 × 500, cm⁻¹, total and partial, frequency along the bottom. */
void qv_dos_plot_options_init (QvDosPlotOptions *options);

void qv_dos_plot_draw (cairo_t *cr, const QvPhononDos *dos, const QvDosPlotOptions *options);
/* QV_ERROR_USAGE for a size outside 200–16384 × 150–16384 (horizontal:
 * 100–16384 wide). */
char *qv_dos_plot_svg (const QvPhononDos *dos, const QvDosPlotOptions *options, gsize *length,
                       GError **error);
guint8 *qv_dos_plot_rgba (const QvPhononDos *dos, const QvDosPlotOptions *options,
                          GError **error);

/* The box of the data (pixels). */
void qv_dos_plot_area (const QvDosPlotOptions *options, double *left, double *top,
                       double *right, double *bottom);
/* The frequency range (cm⁻¹) and the DOS at the far edge (states/cm⁻¹/cell). */
void qv_dos_plot_range (const QvPhononDos *dos, const QvDosPlotOptions *options,
                        double *f_min, double *f_max, double *dos_max);
/* Frequency (cm⁻¹) ↔ pixel along the frequency axis: a column, or a row
 * when horizontal. */
double qv_dos_plot_frequency_to_pixel (const QvPhononDos *dos, const QvDosPlotOptions *options,
                                       double frequency);
double qv_dos_plot_pixel_to_frequency (const QvPhononDos *dos, const QvDosPlotOptions *options,
                                       double pixel);
/* DOS (states/cm⁻¹/cell) ↔ pixel along the DOS axis: a row, or a column
 * when horizontal. */
double qv_dos_plot_value_to_pixel (const QvPhononDos *dos, const QvDosPlotOptions *options,
                                   double value);
double qv_dos_plot_pixel_to_value (const QvPhononDos *dos, const QvDosPlotOptions *options,
                                   double pixel);
/* The DOS at a frequency (cm⁻¹), linear between grid points, 0 outside the
 * grid: total into *@total, each element's (n_groups) into @partial when
 * given. */
void qv_dos_plot_value_at (const QvPhononDos *dos, double frequency, double *total,
                           double *partial);
/* The read-out under pixel (@px, @py): FALSE outside the data box; else the
 * frequency (cm⁻¹) there and the DOS at it (qv_dos_plot_value_at). */
gboolean qv_dos_plot_readout (const QvPhononDos *dos, const QvDosPlotOptions *options, double px,
                              double py, double *frequency, double *total, double *partial);

G_END_DECLS
