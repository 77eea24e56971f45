/* qv-oscillator.c — harmonic oscillator closed forms (Griffiths,
 * Introduction to Quantum Mechanics, ch. 2; McQuarrie, Statistical
 * Mechanics, for the thermal average).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include "qv-oscillator.h"
#include "qv-units.h"

double
qv_oscillator_hbar_ev_s (void)
{
  return QV_HBAR / QV_ELEMENTARY_CHARGE;
}

/* ω in s⁻¹ for λ in eV/(Å² u). */
static double
omega_si (double eigenvalue)
{
  return sqrt (eigenvalue) * qv_units_omega_per_root_eigenvalue ();
}

/* ħ/ω in u Å². */
static double
hbar_over_omega (double eigenvalue)
{
  return QV_HBAR / omega_si (eigenvalue) / (QV_ATOMIC_MASS * 1e-20);
}

double
qv_oscillator_level_energy (double eigenvalue, guint v)
{
  if (!(eigenvalue > 0))
    return NAN;
  return qv_oscillator_hbar_ev_s () * omega_si (eigenvalue) * (v + 0.5);
}

double
qv_oscillator_turning_point (double eigenvalue, guint v)
{
  if (!(eigenvalue > 0))
    return NAN;
  return sqrt ((2.0 * v + 1.0) * hbar_over_omega (eigenvalue));
}

double
qv_oscillator_potential (double eigenvalue, double q)
{
  /* ½ω²Q² with ω² = λ in eV/(Å² u) and Q in u^½ Å gives eV. */
  return 0.5 * eigenvalue * q * q;
}

double
qv_oscillator_dimensionless (double eigenvalue, double q)
{
  if (!(eigenvalue > 0))
    return NAN;
  return q / sqrt (hbar_over_omega (eigenvalue));
}

double
qv_oscillator_thermal_q2 (double eigenvalue, double temperature)
{
  double x;

  if (!(eigenvalue > 0) || !(temperature >= 0))
    return NAN;
  if (temperature == 0.0)
    return 0.5 * hbar_over_omega (eigenvalue);
  /* x = ħω / 2k_BT; coth x = 1/tanh x, stable for large x (tanh → 1). */
  x = QV_HBAR * omega_si (eigenvalue) / (2.0 * QV_BOLTZMANN * temperature);
  return 0.5 * hbar_over_omega (eigenvalue) / tanh (x);
}
