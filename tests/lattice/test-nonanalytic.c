/* test-nonanalytic.c — the non-analytic correction (LO–TO splitting,
 * src/core/qv-nonanalytic.c) in a rigid-ion rock-salt model against the
 * closed form of Born & Huang.
 *
 * Derivation (SI). A diatomic ionic crystal, charges ±Ze, masses m1, m2,
 * cell volume Ω. In the optical mode at q → 0 the ions move against each
 * other with relative displacement w = u1 − u2, reduced mass μ = m1 m2 /
 * (m1 + m2); the polarisation is P = Z e w / Ω. A longitudinal wave (w ∥
 * q) carries the macroscopic field E = −P/(ε0 ε∞) (D = ε0 ε∞ E + P = 0), a
 * transverse one none. The extra force on ion 1 is Z e E, so
 *   μ ẅ = −μ ω_TO² w − Z² e² w / (ε0 ε∞ Ω),
 *   ω_LO² − ω_TO² = Z² e² / (ε0 ε∞ Ω μ)
 * (Born & Huang, Dynamical Theory of Crystal Lattices, 1954, §7; Kittel,
 * Introduction to Solid State Physics, ch. 14 — from memory), and the TO
 * and acoustic frequencies are unchanged. For an anisotropic ε∞ the ε∞ of
 * the formula is q̂·ε∞·q̂ (common practice, the same derivation with
 * D·q̂ = 0).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>
#include "lattice-model.h"
#include "qv-dynamical-matrix.h"
#include "qv-error.h"
#include "qv-force-constants.h"
#include "qv-nonanalytic.h"
#include "qv-supercell.h"

/* SI constants, CODATA 2018, typed here from the tables (not from
 * qv-units.h): e, ε0, u, c. */
#define E_SI 1.602176634e-19
#define EPS0_SI 8.8541878128e-12
#define U_SI 1.66053906660e-27
#define C_SI 299792458.0

static const double A = 5.6, M1 = 22.99, M2 = 35.45;

static QvStructure *
salt (void)
{
  double cell[3][3] = { { 0, A / 2, A / 2 }, { A / 2, 0, A / 2 }, { A / 2, A / 2, 0 } };
  double r[6] = { 0, 0, 0, A / 2, 0, 0 };
  guint z[2] = { 11, 17 };
  double m[2] = { M1, M2 };
  return lattice_model_structure (cell, 2, z, m, r);
}

/* invented springs */
static const LatticeShell shells[] = {
  { 2.8, 3.0, 0.4, 0, 0 },
  { 2.8 * G_SQRT2, 0.6, 0.1, 11, 11 },
  { 2.8 * G_SQRT2, 0.9, -0.05, 17, 17 },
};

static QvForceConstants *
model_fc (void)
{
  int matrix[3][3] = { { 2, 0, 0 }, { 0, 2, 0 }, { 0, 0, 2 } };
  g_autoptr(GError) error = NULL;
  g_autoptr(QvStructure) p = salt ();
  g_autoptr(QvStructure) sc = qv_supercell_build (p, matrix, &error);
  g_autoptr(QvHessian) h = lattice_model_hessian (sc, shells, G_N_ELEMENTS (shells));
  g_autoptr(QvSupercellMap) map = qv_supercell_map (p, sc, 0, &error);
  QvForceConstants *fc;
  assert_non_null (map);
  fc = qv_force_constants_new (map, h, &error);
  assert_non_null (fc);
  qv_force_constants_apply_sum_rule (fc, NULL);
  return fc;
}

static void
charges (double z1, double z2, double *born)
{
  memset (born, 0, 18 * sizeof *born);
  for (int a = 0; a < 3; a++)
    {
      born[3 * a + a] = z1;
      born[9 + 3 * a + a] = z2;
    }
}

static QvPhononSet *
solve (const QvForceConstants *fc, QvNonAnalytic *na, const double q[3])
{
  g_autoptr(GError) error = NULL;
  QvPhononSet *s = qv_dynamical_matrix_solve_with (fc, na ? qv_nonanalytic_add : NULL, na, q, 1,
                                                   FALSE, 1, NULL, &error);
  if (s == NULL)
    fail_msg ("%s", error->message);
  return s;
}

/* ω_LO² − ω_TO² of the closed form, in cm⁻² (ν̃ = ω / (2π c)). */
static double
closed_form (double z, double eps)
{
  double omega = A * A * A / 4 * 1e-30;                    /* fcc primitive cell, m³ */
  double mu = M1 * M2 / (M1 + M2) * U_SI;
  double w2 = z * z * E_SI * E_SI / (EPS0_SI * eps * omega * mu);   /* s⁻² */
  double k = 2 * G_PI * C_SI * 100;                        /* rad/s per cm⁻¹ */
  return w2 / (k * k);
}

static void
test_gamma_splitting (void **state)
{
  g_autoptr(QvForceConstants) fc = model_fc ();
  const double z = 1.1, gamma[3] = { 0, 0, 0 };
  double born[18], eps[3][3] = { { 2.3, 0, 0 }, { 0, 2.3, 0 }, { 0, 0, 2.3 } };
  g_autoptr(GError) error = NULL;
  g_autoptr(QvNonAnalytic) na = NULL;
  g_autoptr(QvPhononSet) plain = NULL, nodir = NULL, split = NULL;
  double want, got;

  (void) state;
  charges (z, -z, born);
  na = qv_nonanalytic_new (fc, 2, born, eps, &error);
  assert_non_null (na);
  assert_true (qv_nonanalytic_neutrality (na) < 1e-15);
  plain = solve (fc, NULL, gamma);
  /* no direction set: Γ is left alone */
  nodir = solve (fc, na, gamma);
  for (int b = 0; b < 6; b++)
    assert_true (fabs (nodir->wavenumbers[b] - plain->wavenumbers[b]) < 1e-9);
  assert_true (qv_nonanalytic_set_gamma_direction (na, (double[3]) { 1, 0, 0 }, &error));
  split = solve (fc, na, gamma);
  /* TO (two) and the three acoustic modes unchanged */
  /* the acoustic modes stay at zero (a few 10⁻⁶ cm⁻¹ of rounding) and
   * the two TO modes are unchanged */
  for (int b = 0; b < 3; b++)
    assert_true (fabs (split->wavenumbers[b]) < 1e-4);
  for (int b = 3; b < 5; b++)
    assert_true (fabs (split->wavenumbers[b] - plain->wavenumbers[b]) < 1e-9);
  assert_true (fabs (plain->wavenumbers[5] - plain->wavenumbers[4]) < 1e-9);   /* cubic: TO = LO before */
  want = closed_form (z, 2.3);
  got = split->wavenumbers[5] * split->wavenumbers[5] - plain->wavenumbers[4] * plain->wavenumbers[4];
  print_message ("LO-TO at Gamma: TO %.6f, LO %.6f cm-1; LO^2-TO^2 %.6f (closed form %.6f) cm-2\n",
                 plain->wavenumbers[4], split->wavenumbers[5], got, want);
  assert_true (fabs (got - want) < 1e-9 * want);
}

static void
test_anisotropic_near_gamma (void **state)
{
  g_autoptr(QvForceConstants) fc = model_fc ();
  /* fractional (t, t, 0) is b1 + b2 ∝ ẑ for this cell */
  const double t = 1e-4, q[3] = { t, t, 0 }, z = 0.9;
  double born[18], eps[3][3] = { { 2.0, 0, 0 }, { 0, 2.5, 0 }, { 0, 0, 3.0 } };
  g_autoptr(GError) error = NULL;
  g_autoptr(QvNonAnalytic) na = NULL;
  g_autoptr(QvPhononSet) plain = NULL, split = NULL;
  double want, got;

  (void) state;
  charges (z, -z, born);
  na = qv_nonanalytic_new (fc, 2, born, eps, &error);
  assert_non_null (na);
  plain = solve (fc, NULL, q);
  split = solve (fc, na, q);
  /* TA (0, 1) and TO (3, 4) unchanged; the LA mode (2) is not: the
   * constant force constant of the interpolation changes the LA slope at
   * O(q²) like ω², a property of the scheme (reported, not tested) */
  for (int b = 0; b < 2; b++)
    assert_true (fabs (split->wavenumbers[b] - plain->wavenumbers[b]) < 1e-6);
  print_message ("LA at q = 1e-4: %.9f -> %.9f cm-1\n", plain->wavenumbers[2], split->wavenumbers[2]);
  /* at q ≠ 0 the analytic optical modes are already split by O(q²): the
   * two TO modes of the corrected D are two of the three, the LO the
   * third one raised */
  {
    int lo = 3;
    double far = -1;
    for (int b = 3; b < 5; b++)
      {
        double nearest = G_MAXDOUBLE;
        for (int c = 3; c < 6; c++)
          nearest = MIN (nearest, fabs (split->wavenumbers[b] - plain->wavenumbers[c]));
        assert_true (nearest < 1e-6);
      }
    for (int c = 3; c < 6; c++)
      {
        double d = MIN (fabs (split->wavenumbers[3] - plain->wavenumbers[c]),
                        fabs (split->wavenumbers[4] - plain->wavenumbers[c]));
        if (d > far)
          {
            far = d;
            lo = c;
          }
      }
    print_message ("optical before %.9f %.9f %.9f, after %.9f %.9f %.9f cm-1\n",
                   plain->wavenumbers[3], plain->wavenumbers[4], plain->wavenumbers[5],
                   split->wavenumbers[3], split->wavenumbers[4], split->wavenumbers[5]);
    want = closed_form (z, 3.0);   /* q̂·ε∞·q̂ = ε_zz */
    got = split->wavenumbers[5] * split->wavenumbers[5] - plain->wavenumbers[lo] * plain->wavenumbers[lo];
  }
  print_message ("LO-TO at q = 1e-4 (b1+b2): %.6f cm-2 (closed form at Gamma %.6f)\n", got, want);
  /* the interpolated term tends to its Γ value as q → 0: O(q²) from the
   * lattice sum, here ~10⁻⁷ */
  assert_true (fabs (got - want) < 1e-5 * want);
}

static void
test_vanishes_at_commensurate (void **state)
{
  g_autoptr(QvForceConstants) fc = model_fc ();
  double born[18], eps[3][3] = { { 2.3, 0, 0 }, { 0, 2.3, 0 }, { 0, 0, 2.3 } };
  const double qs[3][3] = { { 0.5, 0, 0 }, { 0.5, 0.5, 0 }, { 0, 0.5, 0.5 } };
  g_autoptr(GError) error = NULL;
  g_autoptr(QvNonAnalytic) na = NULL;

  (void) state;
  charges (1.1, -1.1, born);
  na = qv_nonanalytic_new (fc, 2, born, eps, &error);
  assert_non_null (na);
  /* Wang et al.'s term is a constant force constant over the supercell:
   * Σ_L e^{iq·R_L} = 0 at the other commensurate q, so D(q) is unchanged
   * there (the supercell's own forces stay exact) */
  for (int k = 0; k < 3; k++)
    {
      g_autoptr(QvPhononSet) plain = solve (fc, NULL, qs[k]);
      g_autoptr(QvPhononSet) with = solve (fc, na, qs[k]);
      for (int b = 0; b < 6; b++)
        assert_true (fabs (with->wavenumbers[b] - plain->wavenumbers[b]) < 1e-8);
    }
}

static void
test_input_checks (void **state)
{
  g_autoptr(QvForceConstants) fc = model_fc ();
  double born[18], eps[3][3] = { { 2.3, 0, 0 }, { 0, 2.3, 0 }, { 0, 0, 2.3 } };
  double bad[3][3] = { { 2.3, 0, 0 }, { 0, -1, 0 }, { 0, 0, 2.3 } };
  double asym[3][3] = { { 2.3, 0.1, 0 }, { 0, 2.3, 0 }, { 0, 0, 2.3 } };
  g_autoptr(GError) error = NULL;
  g_autoptr(QvNonAnalytic) na = NULL;

  (void) state;
  charges (1.1, -1.0, born);
  na = qv_nonanalytic_new (fc, 2, born, eps, &error);
  assert_non_null (na);
  /* Σ Z = 0.1 on the diagonal, removed */
  assert_true (fabs (qv_nonanalytic_neutrality (na) - 0.1) < 1e-12);
  assert_null (qv_nonanalytic_new (fc, 3, born, eps, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  assert_non_null (strstr (error->message, "primitive cell has 2"));
  g_clear_error (&error);
  assert_null (qv_nonanalytic_new (fc, 2, born, bad, &error));
  assert_non_null (strstr (error->message, "positive definite"));
  g_clear_error (&error);
  assert_null (qv_nonanalytic_new (fc, 2, born, asym, &error));
  assert_non_null (strstr (error->message, "not symmetric"));
  g_clear_error (&error);
  born[4] = NAN;
  assert_null (qv_nonanalytic_new (fc, 2, born, eps, &error));
  g_clear_error (&error);
  assert_false (qv_nonanalytic_set_gamma_direction (na, (double[3]) { 0, 0, 0 }, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_gamma_splitting),
    cmocka_unit_test (test_anisotropic_near_gamma),
    cmocka_unit_test (test_vanishes_at_commensurate),
    cmocka_unit_test (test_input_checks),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
