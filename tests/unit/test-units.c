/* test-units.c — unit conversions recomputed from CODATA 2018 (Tiesinga et
 * al., Rev. Mod. Phys. 93, 025010, 2021) and the derived values listed in
 * REFERENCES.md.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-units.h"

/* CODATA 2018, typed here independently of qv-units.h. */
static const double c_light = 299792458.0;
static const double h_planck = 6.62607015e-34;
static const double e_charge = 1.602176634e-19;
static const double n_avogadro = 6.02214076e23;
static const double m_u = 1.66053906660e-27;
static const double e_hartree_ev = 27.211386245988;
static const double a0_angstrom = 0.529177210903;

#define assert_rel(a, b, tol) assert_true (fabs ((a) - (b)) <= (tol) * fabs (b))

static void
test_wavenumber_factor (void **state)
{
  /* ω = √(e/(1e-20 m_u)) for λ = 1 eV/(Å² u); ν̃ = ω/(2πc). */
  const double expected = sqrt (e_charge / (1e-20 * m_u)) / (2 * M_PI * c_light * 100.0);
  assert_rel (qv_units_wavenumber_per_root_eigenvalue (), expected, 1e-15);
  /* REFERENCES.md, derived: 521.470 898 cm⁻¹ (9 digits). */
  assert_rel (qv_units_wavenumber_per_root_eigenvalue (), 521.470898, 2e-9);
  assert_rel (qv_wavenumber_from_eigenvalue (4.0), 2 * expected, 1e-15);
  assert_rel (qv_wavenumber_from_eigenvalue (-4.0), -2 * expected, 1e-15);
  assert_rel (qv_eigenvalue_from_wavenumber (qv_wavenumber_from_eigenvalue (-2.5)), -2.5, 1e-15);
}

static void
test_hessian_units (void **state)
{
  /* REFERENCES.md: 1 mdyn/Å = 1 aJ/Å² = 100 N/m = 6.241 509 eV/Å². */
  assert_rel (qv_hessian_unit_to_ev_a2 (QV_HESSIAN_UNIT_MDYN_A), 6.241509, 1e-7);
  assert_rel (qv_units_ev_a2_per_mdyn_a (), 1e-18 / e_charge, 1e-15);
  assert_rel (qv_hessian_unit_to_ev_a2 (QV_HESSIAN_UNIT_AJ_A2), 1e-18 / e_charge, 1e-15);
  assert_rel (qv_hessian_unit_to_ev_a2 (QV_HESSIAN_UNIT_N_M) * 100.0,
              qv_hessian_unit_to_ev_a2 (QV_HESSIAN_UNIT_MDYN_A), 1e-15);
  assert_rel (qv_hessian_unit_to_ev_a2 (QV_HESSIAN_UNIT_HARTREE_BOHR2),
              e_hartree_ev / (a0_angstrom * a0_angstrom), 1e-15);
  /* thermochemical calorie 4.184 J exactly */
  assert_rel (qv_hessian_unit_to_ev_a2 (QV_HESSIAN_UNIT_KCAL_MOL_A2),
              4184.0 / n_avogadro / e_charge, 1e-15);
  assert_rel (qv_hessian_unit_to_ev_a2 (QV_HESSIAN_UNIT_KJ_MOL_A2),
              1000.0 / n_avogadro / e_charge, 1e-15);
  assert_rel (qv_hessian_unit_to_ev_a2 (QV_HESSIAN_UNIT_EV_A2), 1.0, 0);
}

static void
test_unit_spellings (void **state)
{
  static const struct { const char *text; QvHessianUnit unit; } ok[] = {
    { "eV/A^2", QV_HESSIAN_UNIT_EV_A2 }, { "EV/a^2", QV_HESSIAN_UNIT_EV_A2 },
    { "eV/Å^2", QV_HESSIAN_UNIT_EV_A2 }, { "hartree/bohr^2", QV_HESSIAN_UNIT_HARTREE_BOHR2 },
    { "Hartree/Bohr^2", QV_HESSIAN_UNIT_HARTREE_BOHR2 }, { "kcal/mol/A^2", QV_HESSIAN_UNIT_KCAL_MOL_A2 },
    { "kJ/mol/Å^2", QV_HESSIAN_UNIT_KJ_MOL_A2 }, { "mdyn/A", QV_HESSIAN_UNIT_MDYN_A },
    { "mdyn/Å", QV_HESSIAN_UNIT_MDYN_A }, { "aJ/A^2", QV_HESSIAN_UNIT_AJ_A2 }, { "N/m", QV_HESSIAN_UNIT_N_M },
  };
  for (gsize i = 0; i < G_N_ELEMENTS (ok); i++)
    {
      QvHessianUnit u = QV_HESSIAN_UNIT_COUNT;
      assert_true (qv_hessian_unit_parse (ok[i].text, &u, NULL));
      assert_int_equal (u, ok[i].unit);
    }
  {
    QvHessianUnit u;
    GError *error = NULL;
    assert_false (qv_hessian_unit_parse ("eV/nm^2", &u, &error));
    assert_non_null (error);
    assert_int_equal (error->code, QV_ERROR_USAGE);
    assert_non_null (strstr (error->message, "hartree/bohr^2"));
    assert_non_null (strstr (error->message, "eV/nm^2"));
    g_error_free (error);
  }
}

static void
test_frequency_units (void **state)
{
  /* ν = c ν̃: 1 cm⁻¹ = 0.0299792458 THz (c exact). */
  assert_rel (qv_frequency_from_wavenumber (1.0, QV_FREQUENCY_THZ), c_light * 100.0 * 1e-12, 1e-15);
  /* E = h c ν̃ / e; the familiar 1 eV ≈ 8065.544 cm⁻¹ (from memory). */
  assert_rel (qv_frequency_from_wavenumber (1.0, QV_FREQUENCY_MEV),
              h_planck * c_light * 100.0 / e_charge * 1000.0, 1e-15);
  assert_rel (1000.0 / qv_frequency_from_wavenumber (1.0, QV_FREQUENCY_MEV), 8065.544, 1e-6);
  assert_rel (qv_frequency_from_wavenumber (-100.0, QV_FREQUENCY_THZ), -2.99792458, 1e-15);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_wavenumber_factor),
    cmocka_unit_test (test_hessian_units),
    cmocka_unit_test (test_unit_spellings),
    cmocka_unit_test (test_frequency_units),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
