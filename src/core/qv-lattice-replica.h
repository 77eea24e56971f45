/* qv-lattice-replica.h — a block of n₁ × n₂ × n₃ primitive cells and the
 * complex displacement field of one lattice mode over it, for animating a
 * mode at any q (commensurate with the block or not).
 *
 * Convention (docs/methods.md, "Lattice modes"; the one of D(q)): atom
 * (l, κ) at R_l + τ_κ moves as
 *   u_lκ(t) = Re[ e_κ(q) e^{i(q·(R_l+τ_κ) − ωt)} ] / √m_κ
 * so with r(φ) = r₀ + A (re cos φ − im sin φ), φ = ωt, the field is
 *   re + i·im = e_κ(q) e^{iq·(R_l+τ_κ)} / √m_κ.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-structure.h"

G_BEGIN_DECLS

#define QV_LATTICE_REPLICA_MAX_CELLS 4096

/* The block of @reps[0] × @reps[1] × @reps[2] cells of @primitive (which
 * must have a cell), in the order of qv_supercell_build for the diagonal
 * matrix: atom l·n + κ. Its cell is the block's (n₁a, n₂b, n₃c), periodic.
 * QV_ERROR_USAGE when a count is < 1 or the block has more than
 * QV_LATTICE_REPLICA_MAX_CELLS cells. */
QvStructure *qv_lattice_replica_new (const QvStructure *primitive, const int reps[3],
                                     GError **error);

/* The field of the unit eigenvector @e (3n complex, component 3κ+α, as
 * qv_dynamical_matrix_solve gives it) at fractional q @q (without 2π) on
 * the block: @re and @im get 3 n₁n₂n₃ n values each, in Å per unit
 * amplitude, scaled so that the largest |u_lκ| over the block and over a
 * period is 1 (the field as a whole is scaled; phases and ratios kept).
 * @primitive gives τ_κ, the masses and the cell. Returns the scale applied
 * to the convention above (Å per √u·Å of A), 0 for an all-zero field. */
double qv_lattice_replica_field (const QvStructure *primitive, const int reps[3],
                                 const double q[3], const double _Complex *e,
                                 float *re, float *im);

G_END_DECLS
