/* qv-force-constants.h — real-space force constants Φ_{κα,κ'β}(R_l) of a
 * crystal from a supercell Hessian, with the acoustic sum rule and the
 * Wigner–Seitz images that D(q) sums over.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-hessian.h"
#include "qv-supercell.h"

G_BEGIN_DECLS

/* Relative tolerance for "equidistant" Wigner–Seitz images. */
#define QV_WS_TOLERANCE 1e-5

typedef struct _QvForceConstants QvForceConstants;

/* One image of the vector R_l + T + τ_κ' − τ_κ (T a supercell lattice
 * vector), Cartesian Å, and its weight 1/(number of equidistant images). */
typedef struct {
  double r[3];
  int n[3];         /* R_l + T in primitive lattice vectors (integers), so that
                       r = n·a + τ_κ' − τ_κ */
  double weight;
} QvLatticeImage;

/* Φ_{κα,κ'β}(L) = (1/N_c) Σ_l H[(κ, l)α, (κ', l+L)β] over the N_c lattice
 * points l of the supercell, for each class L of translations modulo the
 * supercell (@hessian in eV/Å², 3N_s × 3N_s in the supercell's own atom
 * order, symmetrized on a copy first). Masses are the primitive sites'. */
QvForceConstants *qv_force_constants_new (const QvSupercellMap *map, const QvHessian *hessian,
                                          GError **error);
void qv_force_constants_free (QvForceConstants *fc);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvForceConstants, qv_force_constants_free)

gsize qv_force_constants_n_sites (const QvForceConstants *fc);
gsize qv_force_constants_n_cells (const QvForceConstants *fc);
/* The primitive cell (rows, Å), site positions τ (3n, Å) and masses (u). */
const double (*qv_force_constants_cell (const QvForceConstants *fc))[3];
const double *qv_force_constants_positions (const QvForceConstants *fc);
const double *qv_force_constants_masses (const QvForceConstants *fc);
/* The representative lattice translation of class @cell (integers, in
 * primitive lattice vectors). */
const int *qv_force_constants_translation (const QvForceConstants *fc, gsize cell);
/* Φ_{κα,κ'β}(L_cell) as a 3×3 row-major block [α][β], eV/Å². */
const double *qv_force_constants_block (const QvForceConstants *fc, gsize cell,
                                        gsize kappa, gsize kappa2);
/* The Wigner–Seitz images of R_L + τ_κ' − τ_κ: the shortest vectors of
 * that class modulo the supercell lattice, all those within
 * QV_WS_TOLERANCE (relative) of the shortest, each with weight 1/count. */
const QvLatticeImage *qv_force_constants_images (const QvForceConstants *fc, gsize cell,
                                                 gsize kappa, gsize kappa2, gsize *n_images);

/* TRUE when every element of Φ_{κ·,κ'·}(L_cell) is zero (D(q) skips it). */
gboolean qv_force_constants_block_is_zero (const QvForceConstants *fc, gsize cell,
                                           gsize kappa, gsize kappa2);
/* The largest |n_j| of any image, for tables of lattice phases. */
int qv_force_constants_max_translation (const QvForceConstants *fc);

/* max|H − Hᵀ| / max|H| of the Hessian as given. */
double qv_force_constants_asymmetry (const QvForceConstants *fc);
/* max over all supercell pairs of |H_ij − Φ(class)| / max|H|: how far the
 * Hessian is from the translation symmetry of the crystal (0 for an exact
 * periodic model; a few 10⁻³ is numerical noise of a typical calculation). */
double qv_force_constants_periodicity (const QvForceConstants *fc);

/* The acoustic sum rule Σ_{κ',L} Φ_{κα,κ'β}(L) = 0 imposed by the
 * orthogonal projection H' = P H P of the supercell force-constant matrix,
 * P = 1 − Σ_β t_β t_βᵀ with t_β the normalised uniform translation along
 * β: H' is the matrix nearest to H (Frobenius norm) that annihilates the
 * three translations from both sides, so it stays symmetric (Φ's
 * permutation symmetry Φ_{κα,κ'β}(L) = Φ_{κ'β,κα}(−L) is kept exactly) and
 * periodic, in one step. In terms of Φ it subtracts the row and column
 * sums spread evenly over the supercell; D(q) changes only at Γ for q
 * commensurate with the supercell. Fills @before (may be NULL) with the
 * three wavenumbers (cm⁻¹, negative = imaginary) of D(Γ) smallest in
 * magnitude before the correction, ascending. Returns the largest |row sum|
 * removed, eV/Å². */
double qv_force_constants_apply_sum_rule (QvForceConstants *fc, double before[3]);
/* The three wavenumbers of D(Γ) smallest in magnitude, as they are now. */
void qv_force_constants_gamma_acoustic (const QvForceConstants *fc, double wavenumbers[3]);

G_END_DECLS
