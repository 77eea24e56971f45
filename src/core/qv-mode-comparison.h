/* qv-mode-comparison.h — two mode sets of the same atoms side by side: the
 * overlap matrix after aligning B onto A, the best one-to-one matching of
 * the modes, and the Duschinsky rotation and displacement between them.
 *
 * Conventions (docs/methods.md, "Comparing mode sets"):
 *  - B's structure is rotated onto A's by the mass-weighted Kabsch fit
 *    (weights: A's masses; Kabsch, Acta Cryst. A32, 922, 1976) and its mode
 *    vectors are rotated with it, atom by atom.
 *  - The overlap of mode i of A and mode j of B is O_ij = |u_iᴬ · u_jᴮ| of
 *    unit vectors u chosen by QvOverlapConvention.
 *  - Degenerate modes (wavenumbers within a tolerance, chained) form blocks;
 *    matching uses the block's subspace overlap W_ij = Σ O²/max(|I|, |J|)
 *    over the block pair, which does not depend on the basis chosen inside
 *    a degenerate block.
 *  - The matching maximises Σ W over one-to-one pairs (Kuhn–Munkres; Kuhn,
 *    Naval Res. Logist. Q. 2, 83, 1955), then, inside each pair of blocks,
 *    Σ O² of the raw overlaps.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-assignment.h"
#include "qv-mode-set.h"
#include "qv-structure.h"

G_BEGIN_DECLS

typedef enum {
  /* B's Cartesian displacements mass-weighted with A's masses, normalised:
   * A's modes stay orthonormal, so Σ_i O_ij² ≤ 1 says how much of B's mode
   * A's modes hold. Equals the plain mass-weighted overlap when the masses
   * agree. The default. */
  QV_OVERLAP_COMMON_MASS,
  /* l_iᴬ · l_jᴮ, each set mass-weighted with its own masses. */
  QV_OVERLAP_OWN_MASSES,
  /* Cartesian displacement directions d = l/√m, each normalised: a purely
   * geometric comparison, independent of the masses (neither set is
   * orthonormal in it). */
  QV_OVERLAP_CARTESIAN,
} QvOverlapConvention;

const char *qv_overlap_convention_name (QvOverlapConvention convention);
/* "common-mass", "own-masses", "cartesian"; QV_ERROR_USAGE otherwise. */
gboolean qv_overlap_convention_parse (const char *text, QvOverlapConvention *convention,
                                      GError **error);

/* Wavenumber tolerance (cm⁻¹) below which neighbouring modes count as one
 * degenerate block (common practice: split degeneracies of converged
 * Hessians are far below 0.1 cm⁻¹). */
#define QV_COMPARISON_DEFAULT_DEGENERACY 0.1

typedef struct {
  QvOverlapConvention convention;
  gboolean align;              /* Kabsch-fit B onto A (default TRUE) */
  double degeneracy;           /* cm⁻¹, ≥ 0; 0 treats every mode alone */
} QvComparisonOptions;

void qv_comparison_options_init (QvComparisonOptions *options);

/* Index meaning "no partner". */
#define QV_COMPARISON_NONE QV_ASSIGNMENT_NONE

typedef struct {
  gsize mode_a, mode_b;        /* 0-based mode indices */
  double overlap;              /* O_ij, raw, in [0, 1] */
  double subspace_overlap;     /* √W_ij, equals @overlap outside degenerate blocks */
  double wavenumber_a, wavenumber_b;   /* signed cm⁻¹ (negative: imaginary) */
  double shift;                /* wavenumber_b − wavenumber_a, cm⁻¹ */
  gboolean degenerate;         /* either mode is in a block of more than one */
} QvModePair;

typedef struct _QvModeComparison QvModeComparison;

/* Compares @modes_b (of @structure_b) with @modes_a (of @structure_a). The
 * structures must have the same number of atoms with the same elements in
 * the same order (QV_ERROR_INPUT names the first atom that differs); masses
 * and positions may differ. Both mode sets need at least one mode. */
QvModeComparison *qv_mode_comparison_new (const QvStructure *structure_a,
                                          const QvModeSet *modes_a,
                                          const QvStructure *structure_b,
                                          const QvModeSet *modes_b,
                                          const QvComparisonOptions *options,
                                          GError **error);
void qv_mode_comparison_free (QvModeComparison *comparison);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvModeComparison, qv_mode_comparison_free)

const QvComparisonOptions *qv_mode_comparison_options (const QvModeComparison *c);
gsize qv_mode_comparison_n_modes_a (const QvModeComparison *c);
gsize qv_mode_comparison_n_modes_b (const QvModeComparison *c);

/* Signed wavenumbers (cm⁻¹, negative: imaginary) of A's mode i, B's mode j. */
double qv_mode_comparison_wavenumber_a (const QvModeComparison *c, gsize i);
double qv_mode_comparison_wavenumber_b (const QvModeComparison *c, gsize j);

/* The overlap matrix, row-major: n_modes_a rows (A's modes) of n_modes_b
 * values (B's modes); element [i·n_b + j] = O_ij. */
const double *qv_mode_comparison_overlaps (const QvModeComparison *c);
double qv_mode_comparison_overlap (const QvModeComparison *c, gsize i, gsize j);
/* √W_ij (see above); the same layout through this accessor. */
double qv_mode_comparison_subspace_overlap (const QvModeComparison *c, gsize i, gsize j);

/* Degenerate blocks: the block index of a mode (blocks numbered in mode
 * order from 0) and the number of blocks of each set. */
gsize qv_mode_comparison_block_a (const QvModeComparison *c, gsize i);
gsize qv_mode_comparison_block_b (const QvModeComparison *c, gsize j);
gsize qv_mode_comparison_n_blocks_a (const QvModeComparison *c);
gsize qv_mode_comparison_n_blocks_b (const QvModeComparison *c);

/* The matching: min(n_a, n_b) pairs in ascending order of mode_a. */
gsize qv_mode_comparison_n_pairs (const QvModeComparison *c);
const QvModePair *qv_mode_comparison_pair (const QvModeComparison *c, gsize k);
/* The partner of A's mode i in B (or B's mode j in A); QV_COMPARISON_NONE
 * when the larger set has no partner for it. */
gsize qv_mode_comparison_partner_of_a (const QvModeComparison *c, gsize i);
gsize qv_mode_comparison_partner_of_b (const QvModeComparison *c, gsize j);
/* Mean of the pairs' subspace overlaps. */
double qv_mode_comparison_mean_overlap (const QvModeComparison *c);

/* The alignment: B's positions x' = R (x − c_B) + c_A with the mass-weighted
 * centres c (A's masses as weights); R is row-major 3 × 3 (the identity
 * without alignment). RMSD is mass-weighted, Å, after the fit. */
const double *qv_mode_comparison_rotation (const QvModeComparison *c);
double qv_mode_comparison_rmsd (const QvModeComparison *c);
/* B's aligned positions, 3N Å. */
const double *qv_mode_comparison_aligned_positions_b (const QvModeComparison *c);

/* Largest relative mass difference |m_a − m_b|/m_a over the atoms. */
double qv_mode_comparison_max_mass_difference (const QvModeComparison *c);

/* Duschinsky: Q_A = J Q_B + K (Duschinsky, Acta Physicochim. URSS 7, 551,
 * 1937), with J = L_Aᵀ L_B (mass-weighted vectors, B rotated) and
 * K = L_Aᵀ M^½ (x_B − x_A) after the alignment (Sharp & Rosenstock, J. Chem.
 * Phys. 41, 3453, 1964). Needs the same masses on both sides (relative
 * difference at most QV_COMPARISON_SAME_MASS): fails with QV_ERROR_INPUT
 * naming the first atom that differs. Computed once, then kept. */
#define QV_COMPARISON_SAME_MASS 1e-9
gboolean qv_mode_comparison_compute_duschinsky (QvModeComparison *c, GError **error);
gboolean qv_mode_comparison_has_duschinsky (const QvModeComparison *c);
/* J, row-major n_a × n_b, signed. */
const double *qv_mode_comparison_duschinsky_j (const QvModeComparison *c);
/* K, n_a values in u^½ Å. */
const double *qv_mode_comparison_duschinsky_k (const QvModeComparison *c);
/* K_i √(ω_i/ħ) with A's ω_i: dimensionless; NAN for A's imaginary or zero
 * modes. n_a values. */
const double *qv_mode_comparison_duschinsky_k_dimensionless (const QvModeComparison *c);

G_END_DECLS
