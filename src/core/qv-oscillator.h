/* qv-oscillator.h — closed forms of the one-dimensional harmonic oscillator
 * in the mass-weighted normal coordinate Q (u^½ Å). ω is given through the
 * mass-weighted eigenvalue λ in eV/(Å² u), so ω = √λ in √(eV/(Å² u)).
 * Textbook forms (Griffiths, Introduction to Quantum Mechanics; McQuarrie,
 * Statistical Mechanics).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* ħ in eV·s / √(eV/(Å² u))⁻¹ … the factor such that ħ/ω in u Å² is
 * qv_oscillator_hbar_u_a2() / √λ for λ in eV/(Å² u). */
double qv_oscillator_hbar_ev_s (void);

/* E_v = ħω(v + ½) in eV. λ must be > 0. */
double qv_oscillator_level_energy (double eigenvalue, guint v);
/* Q_tp = √((2v+1)ħ/ω) in u^½ Å; NAN for λ ≤ 0 (no turning point). */
double qv_oscillator_turning_point (double eigenvalue, guint v);
/* Potential energy ½ω²Q² in eV for Q in u^½ Å. */
double qv_oscillator_potential (double eigenvalue, double q);
/* q = Q·√(ω/ħ) (dimensionless). */
double qv_oscillator_dimensionless (double eigenvalue, double q);
/* ⟨Q²⟩ = ħ/(2ω)·coth(ħω/2k_BT) in u Å²; T in K, T = 0 gives ħ/(2ω).
 * NAN for λ ≤ 0. */
double qv_oscillator_thermal_q2 (double eigenvalue, double temperature);

G_END_DECLS
