/* qv-units.h — CODATA 2018 constants and the unit conversions at the edges.
 * Inside the core: Å, u, eV, Hessian eV/Å², eigenvalues eV/(Å² u).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93, 025010, 2021). */
#define QV_SPEED_OF_LIGHT   299792458.0           /* m/s, exact */
#define QV_PLANCK           6.62607015e-34        /* J s, exact */
#define QV_HBAR             (QV_PLANCK / (2.0 * G_PI))
#define QV_ELEMENTARY_CHARGE 1.602176634e-19      /* C, exact */
#define QV_BOLTZMANN        1.380649e-23          /* J/K, exact */
#define QV_AVOGADRO         6.02214076e23         /* 1/mol, exact */
#define QV_ATOMIC_MASS      1.66053906660e-27     /* kg */
#define QV_HARTREE_EV       27.211386245988       /* eV */
#define QV_BOHR_ANGSTROM    0.529177210903        /* Å */
#define QV_CALORIE          4.184                 /* J, thermochemical */

typedef enum {
  QV_HESSIAN_UNIT_EV_A2,
  QV_HESSIAN_UNIT_HARTREE_BOHR2,
  QV_HESSIAN_UNIT_KCAL_MOL_A2,
  QV_HESSIAN_UNIT_KJ_MOL_A2,
  QV_HESSIAN_UNIT_MDYN_A,
  QV_HESSIAN_UNIT_AJ_A2,
  QV_HESSIAN_UNIT_N_M,
  QV_HESSIAN_UNIT_COUNT
} QvHessianUnit;

/* Parses the spellings of DESIGN §5 ("eV/A^2", "hartree/bohr^2",
 * "kcal/mol/A^2", "kJ/mol/A^2", "mdyn/A", "aJ/A^2", "N/m"), case-insensitive,
 * "Å" accepted for "A". An unknown spelling fails with QV_ERROR_USAGE and a
 * message that lists the accepted ones. */
gboolean qv_hessian_unit_parse (const char *text, QvHessianUnit *unit, GError **error);
const char *qv_hessian_unit_name (QvHessianUnit unit);
/* Factor f such that value_in_unit * f = value in eV/Å². */
double qv_hessian_unit_to_ev_a2 (QvHessianUnit unit);
/* The accepted spellings, comma separated, for help texts. */
const char *qv_hessian_unit_list (void);

typedef enum {
  QV_FREQUENCY_CM1,
  QV_FREQUENCY_THZ,
  QV_FREQUENCY_MEV,
} QvFrequencyUnit;

gboolean qv_frequency_unit_parse (const char *text, QvFrequencyUnit *unit, GError **error);
const char *qv_frequency_unit_name (QvFrequencyUnit unit);

/* √(eV/(Å² u)) expressed as a wavenumber in cm⁻¹ (≈ 521.470898). */
double qv_units_wavenumber_per_root_eigenvalue (void);
/* √(eV/(Å² u)) as an angular frequency in rad/s. */
double qv_units_omega_per_root_eigenvalue (void);
/* 1 mdyn/Å in eV/Å² (≈ 6.241509). */
double qv_units_ev_a2_per_mdyn_a (void);

/* Signed wavenumber (cm⁻¹) of a mass-weighted eigenvalue (eV/(Å² u)):
 * sign(λ)·√|λ|·conversion. Negative means imaginary. */
double qv_wavenumber_from_eigenvalue (double eigenvalue);
double qv_eigenvalue_from_wavenumber (double wavenumber);
/* Converts a signed wavenumber in cm⁻¹ to @unit (sign kept). */
double qv_frequency_from_wavenumber (double wavenumber, QvFrequencyUnit unit);

G_END_DECLS
