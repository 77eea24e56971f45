/* test-spectrum.c — line shapes, grids and the envelope's integral
 * (qv-spectrum), the intensity constants and unit factors (qv-intensity).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include "qv-error.h"
#include "qv-intensity.h"
#include "qv-spectrum.h"

#define assert_rel(a, b, tol) assert_true (fabs ((a) - (b)) <= (tol) * fabs (b))

/* Cumulative distributions of the normalised line shapes (closed forms, from
 * memory: the Cauchy CDF ½ + arctan(2x/Γ)/π, the normal CDF ½(1 + erf(x/σ√2))). */
static double
cdf (QvLineShape shape, double fwhm, double x)
{
  if (shape == QV_LINE_GAUSSIAN)
    {
      const double sigma = fwhm / sqrt (8.0 * log (2.0));
      return 0.5 * (1.0 + erf (x / (sigma * sqrt (2.0))));
    }
  return 0.5 + atan (2.0 * x / fwhm) / M_PI;
}

static void
test_line_shape_normalised (void **state)
{
  const QvLineShape shapes[] = { QV_LINE_LORENTZIAN, QV_LINE_GAUSSIAN };
  for (int s = 0; s < 2; s++)
    for (double fwhm = 2.0; fwhm <= 40.0; fwhm *= 2.2)
      {
        /* half maximum at ±FWHM/2 (the definition of the width) */
        const double peak = qv_line_shape_value (shapes[s], fwhm, 0.0);
        assert_rel (qv_line_shape_value (shapes[s], fwhm, 0.5 * fwhm), 0.5 * peak, 1e-13);
        assert_rel (qv_line_shape_value (shapes[s], fwhm, -0.5 * fwhm), 0.5 * peak, 1e-13);
        /* Simpson over ±L against the CDF difference */
        {
          const int n = 12000;                     /* even: Simpson */
          const double L = 30.0 * fwhm, h = 2.0 * L / n;
          double sum = 0.0;
          for (int i = 0; i <= n; i++)
            sum += (i == 0 || i == n ? 1 : (i % 2 ? 4 : 2))
                   * qv_line_shape_value (shapes[s], fwhm, -L + i * h);
          sum *= h / 3.0;
          assert_rel (sum, cdf (shapes[s], fwhm, L) - cdf (shapes[s], fwhm, -L), 1e-9);
        }
      }
}

static void
test_envelope_integral (void **state)
{
  const double pos[] = { 500.0, 512.0, 1650.0, 3000.0 };
  const double h[] = { 10.0, 4.0, 60.0, NAN };        /* a NaN stick is left out */
  const guint modes[] = { 6, 7, 8, 9 };
  const QvLineShape shapes[] = { QV_LINE_LORENTZIAN, QV_LINE_GAUSSIAN };

  for (int s = 0; s < 2; s++)
    {
      QvSpectrumOptions o;
      g_autoptr(QvSpectrum) sp = NULL;
      g_autoptr(GError) error = NULL;
      double inside = 0.0, integral;

      qv_spectrum_options_init (&o);
      o.shape = shapes[s];
      o.fwhm = 8.0;
      o.has_range = TRUE;
      o.start = 100.0;
      o.stop = 2600.0;
      o.step = 0.4;
      sp = qv_spectrum_new (4, pos, h, modes, &o, &error);
      assert_non_null (sp);
      assert_int_equal (sp->n_sticks, 3);
      assert_int_equal (sp->stick_mode[2], 8);
      assert_int_equal (sp->n_points, 6251);
      assert_rel (qv_spectrum_stop (sp), 2600.0, 1e-12);
      assert_rel (qv_spectrum_stick_sum (sp), 74.0, 1e-15);
      for (int k = 0; k < 3; k++)
        inside += h[k] * (cdf (o.shape, o.fwhm, o.stop - pos[k]) - cdf (o.shape, o.fwhm, o.start - pos[k]));
      integral = qv_spectrum_integral (sp);
      /* trapezoid error ≤ h²/12 ∫|f''| (≈ 1e-4 relative here, both shapes) */
      assert_rel (integral, inside, 2e-4);
      /* and the truncation: a Lorentzian loses ~Γ/(2πD) per side */
      if (o.shape == QV_LINE_GAUSSIAN)
        assert_rel (integral, 74.0, 2e-4);
      else
        assert_true (integral < 74.0 && integral > 74.0 * 0.99);
    }
}

static void
test_default_grid (void **state)
{
  const double pos[] = { 1234.0 };
  const double h[] = { 1.0 };
  QvSpectrumOptions o;
  g_autoptr(QvSpectrum) sp = NULL;

  qv_spectrum_options_init (&o);
  sp = qv_spectrum_new (1, pos, h, NULL, &o, NULL);
  assert_non_null (sp);
  /* 0 to 1234 + 10 × 10, rounded up to 100; step min(1, FWHM/10) = 1 */
  assert_true (sp->start == 0.0 && sp->step == 1.0);
  assert_rel (qv_spectrum_stop (sp), 1400.0, 1e-15);
  assert_int_equal (sp->n_points, 1401);
}

static void
test_bad_options (void **state)
{
  const double pos[] = { 100.0 }, h[] = { 1.0 };
  QvSpectrumOptions o;
  GError *error = NULL;

  qv_spectrum_options_init (&o);
  o.fwhm = 0;
  assert_null (qv_spectrum_new (1, pos, h, NULL, &o, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
  g_clear_error (&error);
  qv_spectrum_options_init (&o);
  o.has_range = TRUE;
  o.start = 10;
  o.stop = 5;
  assert_null (qv_spectrum_new (1, pos, h, NULL, &o, &error));
  g_clear_error (&error);
  qv_spectrum_options_init (&o);
  o.step = 1e-9;
  assert_null (qv_spectrum_new (1, pos, h, NULL, &o, &error));
  assert_non_null (strstr (error->message, "points"));
  g_clear_error (&error);
}

static void
test_constants (void **state)
{
  /* CODATA 2018 typed independently: N_A/(12 ε₀ c²) · (10⁻²¹/c C)²/(10⁻²⁰ m² · m_u) */
  const double c = 299792458.0, eps0 = 8.8541878128e-12, na = 6.02214076e23;
  const double mu = 1.66053906660e-27, e = 1.602176634e-19;
  const double debye = 1e-21 / c;
  const double per_d2 = na / (12 * eps0 * c * c) * (debye / 1e-10) * (debye / 1e-10) / mu / 1000;
  assert_rel (qv_intensity_ir_km_mol_per_d2_a2_u (), per_d2, 1e-14);
  /* REFERENCES.md: 1 (D/Å)²/u = 42.2561 km/mol */
  assert_true (fabs (qv_intensity_ir_km_mol_per_d2_a2_u () - 42.2561) < 1e-4);
  assert_rel (qv_intensity_ir_km_mol_per_e2_u (), na / (12 * eps0 * c * c) * e * e / mu / 1000, 1e-14);
}

static void
test_units (void **state)
{
  double f = 0;
  g_autoptr(GError) error = NULL;
  assert_true (qv_dipole_derivative_unit_parse ("e", &f, NULL) && f == 1.0);
  assert_true (qv_dipole_derivative_unit_parse ("e*bohr/bohr", &f, NULL) && f == 1.0);
  /* 1 D = 10⁻²¹/c C m; e·Å = 1.602176634e-29 C m */
  assert_true (qv_dipole_derivative_unit_parse ("D/\xc3\x85", &f, NULL));
  assert_rel (f, 1e-21 / 299792458.0 / 1.602176634e-29, 1e-14);
  assert_true (qv_dipole_derivative_unit_parse ("d/bohr", &f, NULL));
  assert_rel (f, 1e-21 / 299792458.0 / 1.602176634e-29 / 0.529177210903, 1e-14);
  assert_true (qv_polarizability_derivative_unit_parse ("bohr^2", &f, NULL));
  assert_rel (f, 0.529177210903 * 0.529177210903, 1e-15);
  assert_false (qv_dipole_derivative_unit_parse ("C*m", &f, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
  assert_non_null (strstr (error->message, "D/A"));
}

static void
test_raman_cross_section (void **state)
{
  /* Polavarapu 1990, evaluated by hand in SI: ν̃₀ = 20000, ν̃ = 1000 cm⁻¹,
   * S = 1 Å⁴/u, T = 0 (no thermal factor). */
  const double h = 6.62607015e-34, c = 299792458.0, mu = 1.66053906660e-27;
  const double nu = 1000 * 100.0, nu0 = 20000 * 100.0;
  const double sigma = pow (2 * M_PI, 4) / 45 * pow (nu0 - nu, 4) * h / (8 * M_PI * M_PI * c * nu)
                       * 1e-40 / mu;
  assert_rel (qv_intensity_raman_cross_section (1.0, 1000.0, 20000.0, 0.0), sigma * 1e4 / 1e-30, 1e-13);
  /* the Stokes thermal factor 1/(1 − exp(−hcν̃/kT)) */
  {
    const double kt = 1.380649e-23 * 300.0;
    const double bose = 1.0 / (1.0 - exp (-h * c * nu / kt));
    assert_rel (qv_intensity_raman_cross_section (1.0, 1000.0, 20000.0, 300.0),
                sigma * bose * 1e4 / 1e-30, 1e-13);
  }
  assert_true (isnan (qv_intensity_raman_cross_section (1.0, 21000.0, 20000.0, 300.0)));
  assert_true (isnan (qv_intensity_raman_cross_section (1.0, -50.0, 20000.0, 300.0)));
}

static void
test_nine_rows_symmetrised (void **state)
{
  /* one atom: 9 rows of 3 columns; xy and yx differ, their mean is kept */
  double rows[27];
  g_autoptr(QvDerivatives) d = qv_derivatives_new (1);
  for (int i = 0; i < 27; i++)
    rows[i] = i;
  assert_false (qv_derivatives_set_polarizability (d, 7, rows, 1.0));
  assert_true (qv_derivatives_set_polarizability (d, 9, rows, 2.0));
  /* xy = rows 1 (xy) and 3 (yx): (3 + 9)/2 × 2 at column 0 */
  assert_rel (d->polarizability[QV_ALPHA_XY * 3 + 0], 12.0, 1e-15);
  /* yy is row 4 */
  assert_rel (d->polarizability[QV_ALPHA_YY * 3 + 1], 2 * 13.0, 1e-15);
  /* yz: rows 5 and 7 → (15 + 21)/2 = 18 at column 0 */
  assert_rel (d->polarizability[QV_ALPHA_YZ * 3 + 0], 36.0, 1e-15);
  /* asymmetry: max |ab − ba| = |xz − zx| = 12 over max |value| 26 */
  assert_rel (d->polarizability_asymmetry, 12.0 / 26.0, 1e-15);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_line_shape_normalised),
    cmocka_unit_test (test_envelope_integral),
    cmocka_unit_test (test_default_grid),
    cmocka_unit_test (test_bad_options),
    cmocka_unit_test (test_constants),
    cmocka_unit_test (test_units),
    cmocka_unit_test (test_raman_cross_section),
    cmocka_unit_test (test_nine_rows_symmetrised),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
