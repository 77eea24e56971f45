/* test-oscillator.c — harmonic-oscillator closed forms: E_v = ħω(v+½),
 * Q_tp = √((2v+1)ħ/ω), ⟨Q²⟩ = ħ/(2ω)coth(ħω/2k_BT) (Griffiths, Introduction
 * to Quantum Mechanics, ch. 2; McQuarrie, Statistical Mechanics).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include "qv-mode-set.h"
#include "qv-oscillator.h"
#include "qv-units.h"

/* CODATA 2018, typed independently. */
static const double hbar = 6.62607015e-34 / (2 * M_PI);
static const double e_charge = 1.602176634e-19;
static const double k_b = 1.380649e-23;
static const double m_u = 1.66053906660e-27;

#define assert_rel(a, b, tol) assert_true (fabs ((a) - (b)) <= (tol) * fabs (b))

static const double lambdas[] = { 1e-4, 0.0123, 1.0, 7.5, 45.0 };   /* eV/(Å² u) */

static double
omega_of (double lambda)
{
  return sqrt (lambda * e_charge / (1e-20 * m_u));
}

static void
test_turning_point_energy (void **state)
{
  for (gsize i = 0; i < G_N_ELEMENTS (lambdas); i++)
    for (guint v = 0; v <= 50; v += 7)
      {
        const double l = lambdas[i];
        const double q = qv_oscillator_turning_point (l, v);
        const double e = qv_oscillator_level_energy (l, v);
        /* At the classical turning point all energy is potential: ½ω²Q² = E_v. */
        assert_rel (qv_oscillator_potential (l, q), e, 4e-15);
        /* E_v = ħω(v+½), with ħ and ω recomputed here (SI, then to eV). */
        assert_rel (e, hbar * omega_of (l) * (v + 0.5) / e_charge, 1e-14);
        /* Dimensionless turning point q = ±√(2v+1). */
        assert_rel (qv_oscillator_dimensionless (l, q), sqrt (2.0 * v + 1.0), 1e-14);
      }
  /* REFERENCES.md derived value ħ/m_u = 6.350 780e12 Å²/s: in u Å²,
   * Q_tp(v=0)² = ħ/ω = (ħ/m_u)/ω, here for ω = 1e14 s⁻¹. */
  {
    const double omega = 1e14;
    const double lambda = omega * omega * 1e-20 * m_u / e_charge;
    assert_rel (pow (qv_oscillator_turning_point (lambda, 0), 2), 6.350780e12 / omega, 2e-7);
  }
  assert_true (isnan (qv_oscillator_turning_point (-1.0, 0)));
  assert_true (isnan (qv_oscillator_turning_point (0.0, 3)));
  assert_true (isnan (qv_oscillator_thermal_q2 (-2.0, 300)));
}

static void
test_thermal (void **state)
{
  for (gsize i = 0; i < G_N_ELEMENTS (lambdas); i++)
    {
      const double l = lambdas[i];
      const double w = omega_of (l);
      const double half = hbar / (2 * w) / (m_u * 1e-20);   /* ħ/2ω in u Å² */
      /* T = 0: the ground state, ⟨Q²⟩ = ħ/2ω = Q_tp(v=0)²/2. */
      assert_rel (qv_oscillator_thermal_q2 (l, 0.0), half, 1e-14);
      assert_rel (qv_oscillator_thermal_q2 (l, 0.0), pow (qv_oscillator_turning_point (l, 0), 2) / 2, 1e-14);
      for (double t = 1.0; t < 1e6; t *= 3.7)
        {
          /* Bose–Einstein form ⟨Q²⟩ = (ħ/ω)(n̄ + ½), n̄ = 1/(e^{ħω/kT} − 1):
           * an independent spelling of the coth form (McQuarrie). */
          const double x = hbar * w / (k_b * t);
          const double nbar = 1.0 / expm1 (x);
          assert_rel (qv_oscillator_thermal_q2 (l, t), 2 * half * (nbar + 0.5), 1e-12);
        }
      /* High T: equipartition ⟨Q²⟩ → k_BT/ω² (classical limit), with the
       * first correction x·coth x ≈ 1 + x²/3 for x = ħω/2kT. */
      {
        const double t = hbar * w / (2 * k_b * 0.01);   /* x = 0.01 */
        const double classical = k_b * t / e_charge / l;
        const double x = hbar * w / (2 * k_b * t);
        const double ratio = qv_oscillator_thermal_q2 (l, t) / classical;
        assert_true (ratio > 1.0);
        assert_true (fabs (ratio - (1 + x * x / 3)) < x * x * x * x);
      }
    }
}

/* The amplitude the app animates with: a multiple of the closed-form turning
 * point above, or a fixed largest displacement for an imaginary mode. A
 * diatomic-like pair of masses 1 and 4 u with the mode vector along x. */
static void
test_display_amplitude (void **state)
{
  const double masses[2] = { 1.0, 4.0 };
  double *eigenvalues = g_new (double, 2);
  double *vectors = g_new0 (double, 12);
  const double s5 = sqrt (5.0);
  g_autoptr(QvModeSet) modes = NULL;
  gboolean from_tp = FALSE;
  double q;

  (void) state;
  eigenvalues[0] = -0.5;   /* imaginary */
  eigenvalues[1] = 7.5;
  /* l = (√m₂, −√m₁)/√(m₁+m₂) along x: the relative coordinate. */
  vectors[0] = 2.0 / s5; vectors[3] = -1.0 / s5;
  vectors[6] = 2.0 / s5; vectors[9] = -1.0 / s5;
  modes = qv_mode_set_new (2, masses, 2, eigenvalues, vectors);

  for (guint v = 0; v < 4; v++)
    {
      const double w = omega_of (7.5);
      const double q_tp = sqrt ((2 * v + 1) * hbar / w / (m_u * 1e-20));
      q = qv_mode_set_display_amplitude (modes, 1, v, 1.5, &from_tp);
      assert_true (from_tp);
      assert_rel (q, 1.5 * q_tp, 1e-12);
    }
  q = qv_mode_set_display_amplitude (modes, 0, 3, 2.0, &from_tp);
  assert_false (from_tp);
  /* Largest displacement: atom 1 (mass 1) moves |l|/√m = 2/√5 per unit Q. */
  assert_rel (q * 2.0 / s5, 2.0 * QV_DISPLAY_FALLBACK_DISPLACEMENT, 1e-14);
  /* Per atom |Q|·|l_a|/√m_a: 2/√5 per unit Q for the light atom; the centre
   * of mass stays put (m₁d₁ = m₂d₂), so d₁/d₂ = m₂/m₁ = 4. */
  assert_rel (qv_mode_set_atom_displacement (modes, 1, 0, -0.3), 0.3 * 2.0 / s5, 1e-14);
  assert_rel (qv_mode_set_atom_displacement (modes, 1, 0, 0.3)
              / qv_mode_set_atom_displacement (modes, 1, 1, 0.3), 4.0, 1e-14);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_turning_point_energy),
    cmocka_unit_test (test_thermal),
    cmocka_unit_test (test_display_amplitude),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
