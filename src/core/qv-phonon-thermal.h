/* qv-phonon-thermal.h — harmonic thermal properties of a crystal as sums
 * over the modes of a q mesh, thermal mean-square displacements (U
 * tensors) and sound velocities from the acoustic slopes at Γ.
 *
 * Per primitive cell, with x = ħω/k_BT and every mesh point weighing 1/N_q
 * (any textbook of statistical mechanics, e.g. McQuarrie, Statistical
 * Mechanics, ch. 11; Ashcroft & Mermin ch. 23, from memory):
 *   ZPE = Σ ħω/2
 *   U   = Σ ħω (½ + n),            n = 1/(e^x − 1)
 *   F   = Σ [ħω/2 + k_BT ln(1 − e^{−x})]
 *   S   = Σ k_B [x n − ln(1 − e^{−x})]
 *   Cv  = Σ k_B x² e^x/(e^x − 1)²
 * The three acoustic modes at Γ (zero frequency) are left out when asked;
 * modes with ω < 0 (imaginary) are counted and left out.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-dynamical-matrix.h"
#include "qv-phonon-mesh.h"

G_BEGIN_DECLS

typedef struct {
  gsize n_t;
  double *t;              /* K */
  double *zpe;            /* n_t copies, eV / cell */
  double *energy;         /* U, eV / cell */
  double *free_energy;    /* F, eV / cell */
  double *entropy;        /* S, eV/K / cell */
  double *heat_capacity;  /* Cv, eV/K / cell */
  gsize n_modes;          /* modes summed */
  gsize n_gamma_skipped;  /* acoustic modes at Γ left out */
  gsize n_imaginary;      /* ω < 0 left out (not counting those at Γ skipped) */
  gsize n_zero;           /* ω = 0 exactly elsewhere, left out */
  double most_imaginary;  /* the most negative wavenumber left out, cm⁻¹ (0: none) */
  gsize n_q;
} QvThermal;

void qv_thermal_free (QvThermal *thermal);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvThermal, qv_thermal_free)

/* Sums over the @n_q × @nb signed wavenumbers @w (cm⁻¹) at the mesh points
 * @q (fractional, 3 n_q; Γ recognised as q = 0 exactly). With
 * @skip_gamma_acoustic the three modes of smallest |ω| at Γ are left out.
 * @t: @n_t temperatures ≥ 0 K (T = 0 gives F = U = ZPE, S = Cv = 0). */
QvThermal *qv_thermal_compute (gsize n_q, gsize nb, const double *q, const double *w,
                               gboolean skip_gamma_acoustic, const double *t, gsize n_t);

/* Which modes of q point @k (nb wavenumbers @w, fractional @q) enter the
 * sums: the same rule as qv_thermal_compute; fills @use (nb). */
void qv_thermal_select_modes (const double q[3], gsize nb, const double *w,
                              gboolean skip_gamma_acoustic, gboolean *use);

/* 1 eV per cell in kJ per mole of formula units, with @z formula units in
 * the cell (e N_A / 1000 / z). */
double qv_thermal_kj_per_mol (gsize z);

/* The number of formula units in a cell of @n sites with atomic numbers
 * @site_z: the greatest common divisor of the element counts. */
gsize qv_thermal_formula_units (gsize n, const guint *site_z);

/* Anisotropic mean-square displacements (Å²) of each primitive site at
 * each temperature, from the mesh (eigenvectors solved in chunks):
 *   U_κ(T) = (ħ / (N_q m_κ)) Σ_{qν} (n_qν + ½)/ω_qν Re[e_κ(qν) e_κ(qν)†]
 *          = Σ ħ/(2 N_q m_κ ω) coth(ħω/2k_BT) Re[e e†],
 * the 3×3 Cartesian U_ij of crystallography's ADPs (⟨u_i u_j⟩). Modes as in
 * qv_thermal_compute. Returns n_t × n_sites × 9 (row-major per tensor). */
double *qv_thermal_displacements (const QvForceConstants *fc, const QvPhononMesh *mesh,
                                  const double *t, gsize n_t, gboolean skip_gamma_acoustic,
                                  guint n_threads, const QvProgress *progress, GError **error);

/* qv_thermal_displacements with @term and @data added to every D(q)
 * (qv_phonon_mesh_solve_with; NULL: the same, bit for bit). */
double *qv_thermal_displacements_with (const QvForceConstants *fc, QvDynamicalTerm term,
                                       gpointer data, const QvPhononMesh *mesh,
                                       const double *t, gsize n_t, gboolean skip_gamma_acoustic,
                                       guint n_threads, const QvProgress *progress,
                                       GError **error);

typedef struct {
  double direction[3];    /* unit Cartesian direction of q */
  double velocity[3];     /* m/s of the three acoustic branches, ascending */
  double linearity[3];    /* |v(δ) − v(2δ)| / v(δ): departure from a straight line */
  double longitudinal[3]; /* Σ_κ |ê·e_κ|²: 1 for a purely longitudinal mode */
  double dq;              /* δ, Å⁻¹ (with 2π) */
} QvSoundVelocity;

/* Sound velocities along the Cartesian direction @direction (any length >
 * 0): the three lowest branches at |q| = δ and 2δ (@dq Å⁻¹, ≤ 0: 10⁻³),
 * v = ω/|q|, extrapolated to q → 0 as (4 v(δ) − v(2δ))/3 (the error of
 * ω/q is even in q). QV_ERROR_INPUT when an acoustic branch is imaginary
 * or zero there. */
gboolean qv_sound_velocity (const QvForceConstants *fc, const double direction[3], double dq,
                            QvSoundVelocity *out, GError **error);

G_END_DECLS
