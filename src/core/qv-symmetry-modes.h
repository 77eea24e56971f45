/* qv-symmetry-modes.h — the irreducible representation of each normal mode
 * (each degenerate set), its IR and Raman activity, and degenerate bases
 * aligned with the symmetry elements.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-character-table.h"
#include "qv-mode-set.h"
#include "qv-point-group.h"

G_BEGIN_DECLS

typedef struct {
  char *label;                 /* Mulliken label ("E'", "A1g"), a sum for an
                                  accidental degeneracy ("A1 + E"), or "?" */
  gboolean defined;            /* FALSE for "?" */
  gboolean ir_active, raman_active;
  gsize first, size;           /* the degenerate set: modes first … first+size−1 */
  double residual;             /* largest distance of a multiplicity from a
                                  whole number (0 for exact symmetry) */
} QvModeSymmetry;

/* Multiplicities within this of a whole number count as whole. */
#define QV_SYMMETRY_INTEGRAL_TOLERANCE 0.1

typedef struct {
  const QvPointGroup *group;   /* borrowed */
  const QvCharacterTable *table;  /* NULL when the data has none */
  gsize n_modes;
  QvModeSymmetry *modes;
  char **warnings;             /* NULL-terminated, one line each */
} QvSymmetryReport;

/* Labels every mode of @modes, found for the structure @group was found
 * for. Modes whose wavenumbers lie within max(1 cm⁻¹, 0.2 %) of each other
 * are tried as one set, smallest first, until the characters of the set
 * reduce to whole multiplicities. A mode that no set makes whole is "?"
 * with a warning (its symmetry is broken beyond the tolerance). Never fails:
 * a group without a table gives "?" for every mode and one warning. */
QvSymmetryReport *qv_symmetry_report_new (const QvPointGroup *group, const QvModeSet *modes);
void qv_symmetry_report_free (QvSymmetryReport *report);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvSymmetryReport, qv_symmetry_report_free)

/* Characters χ(g) = Σ_k l_kᵀ T_g l_k of modes first … first+n−1 for every
 * operation (T_g: R_g on each atom's block, moved to the image atom);
 * @chi[group->order]. */
void qv_symmetry_mode_characters (const QvPointGroup *group, const QvModeSet *modes,
                                  gsize first, gsize n, double *chi);

/* Rotates the basis of every degenerate set of @report (label defined) so
 * that it diagonalises a chain of commuting involutions (C2, σ, i) taken in
 * the table's class order, each used where it is not a multiple of the
 * identity on what the earlier ones left together, larger eigenvalue first:
 * in C3v the first E vector is symmetric, the second antisymmetric under
 * σv(xz); in Td a T2 set comes out along x, y, z (eigenvectors of C2(z),
 * C2(x), C2(y)). Largest component made positive; the vectors stay
 * orthonormal. Returns the number of sets changed. */
gsize qv_symmetry_align_degenerate (const QvSymmetryReport *report, QvModeSet *modes);

G_END_DECLS
