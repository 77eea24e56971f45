/* qv-spectrum.h — a line spectrum: sticks at (scaled) wavenumbers and their
 * envelope, broadened with normalised Lorentzian or Gaussian line shapes on
 * an even grid, so that the envelope integrates to the sum of the sticks.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

typedef enum {
  QV_LINE_LORENTZIAN,
  QV_LINE_GAUSSIAN,
} QvLineShape;

gboolean qv_line_shape_parse (const char *text, QvLineShape *shape, GError **error);
const char *qv_line_shape_name (QvLineShape shape);

/* Broadening defaults (common practice for condensed-phase-like spectra). */
#define QV_SPECTRUM_DEFAULT_FWHM 10.0          /* cm⁻¹ */
/* Without a range the grid runs from 0 to the highest stick plus this many
 * FWHM, rounded up to 100 cm⁻¹. */
#define QV_SPECTRUM_RANGE_MARGIN 10.0
/* Largest number of grid points. */
#define QV_SPECTRUM_MAX_POINTS 10000000
/* Largest number of Lorentzian evaluations (lines × grid points) one
 * spectrum may take (a few seconds); Gaussians are evaluated within 40 σ. */
#define QV_SPECTRUM_MAX_WORK 2e9

typedef struct {
  QvLineShape shape;
  double fwhm;                 /* cm⁻¹, > 0 */
  gboolean has_range;          /* else chosen from the sticks */
  double start, stop;          /* cm⁻¹, start < stop */
  double step;                 /* cm⁻¹; 0: min(1, FWHM/10) */
} QvSpectrumOptions;

void qv_spectrum_options_init (QvSpectrumOptions *options);

typedef struct {
  QvLineShape shape;
  double fwhm;
  gsize n_sticks;
  double *stick_position;      /* cm⁻¹ (already scaled) */
  double *stick_height;        /* the intensity (km/mol, Å⁴/u, …) */
  guint *stick_mode;           /* 0-based mode index of each stick */
  gsize n_points;
  double start, step;          /* grid x_i = start + i·step */
  double *envelope;            /* n_points, intensity per cm⁻¹ */
} QvSpectrum;

/* The normalised line shape of @fwhm at offset @dx (both cm⁻¹), in cm:
 * Lorentzian (Γ/2π)/(dx² + Γ²/4), Gaussian exp(−dx²/2σ²)/(σ√2π) with
 * σ = Γ/√(8 ln 2). Each integrates to 1 over the real line. */
double qv_line_shape_value (QvLineShape shape, double fwhm, double dx);

/* A spectrum of @n sticks (positions cm⁻¹, heights, mode indices; NaN
 * heights are left out). QV_ERROR_USAGE for a bad width, range or step, or a
 * grid above QV_SPECTRUM_MAX_POINTS. */
QvSpectrum *qv_spectrum_new (gsize n, const double *positions, const double *heights,
                             const guint *modes, const QvSpectrumOptions *options,
                             GError **error);
void qv_spectrum_free (QvSpectrum *spectrum);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvSpectrum, qv_spectrum_free)

double qv_spectrum_x (const QvSpectrum *spectrum, gsize i);
double qv_spectrum_stop (const QvSpectrum *spectrum);
/* Trapezoidal integral of the envelope over the grid. */
double qv_spectrum_integral (const QvSpectrum *spectrum);
/* Σ stick heights. */
double qv_spectrum_stick_sum (const QvSpectrum *spectrum);
/* Largest envelope value and largest stick height. */
double qv_spectrum_max_envelope (const QvSpectrum *spectrum);
double qv_spectrum_max_stick (const QvSpectrum *spectrum);

G_END_DECLS
