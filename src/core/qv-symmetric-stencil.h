/* qv-symmetric-stencil.h — the symmetry-reduced finite-difference stencil
 * of a periodic supercell: only symmetry-distinct (atom, direction)
 * displacements, ± each, and the whole force-constant matrix rebuilt from
 * their forces with the space-group operations.
 *
 * Choice: for each orbit of equivalent atoms (spglib), its representative
 * a and its site group G_a = {g : g a = a}; directions are taken from x,
 * y, z in that order and kept when they raise the rank of {S_g d : g ∈ G_a,
 * d kept} (S_g the Cartesian rotation), up to rank 3 — the usual greedy
 * choice of at most 3 independent directions (common practice). Each kept
 * direction is displaced by +h and −h.
 *
 * Rebuilding: the central difference of displacement (a, d) gives the rows
 * f_j = dᵀΦ_{aj} = −(F_j(+hd) − F_j(−hd)) / 2h for every atom j. An
 * operation g (S, atom map p) carries it to (S d)ᵀ Φ_{p(a) p(j)} = (S f_j)ᵀ.
 * For every atom b the equations of all (a, d, g) with p(a) = b are solved
 * by least squares for Φ_{b·}; the result is made symmetric, (Φ + Φᵀ)/2,
 * and averaged over the group, Φ ← (1/|G|) Σ_g S_gᵀ Φ_{p(i)p(j)} S_g.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once

#include <glib.h>
#include "qv-hessian.h"
#include "qv-structure.h"

G_BEGIN_DECLS

typedef struct _QvSymmetricStencil QvSymmetricStencil;

/* The stencil of @supercell (periodic, with a cell) with step @h (Å, in
 * (0, 0.5]) and spglib's @symprec (≤ 0: the default). QV_ERROR_USAGE for a
 * bad step, QV_ERROR_INPUT when spglib finds no group or an operation does
 * not map the atoms one to one. */
QvSymmetricStencil *qv_symmetric_stencil_new (const QvStructure *supercell, double step,
                                              double symprec, GError **error);
void qv_symmetric_stencil_free (QvSymmetricStencil *st);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvSymmetricStencil, qv_symmetric_stencil_free)

gsize qv_symmetric_stencil_n_atoms (const QvSymmetricStencil *st);
/* Displacements (2 per kept direction) and operations of the group found. */
gsize qv_symmetric_stencil_n_displacements (const QvSymmetricStencil *st);
gsize qv_symmetric_stencil_n_operations (const QvSymmetricStencil *st);
/* Displacement @d moves @atom by @sign × h along the unit Cartesian
 * @direction; order: orbit by orbit, direction by direction, + before −. */
void qv_symmetric_stencil_displacement (const QvSymmetricStencil *st, gsize d, gsize *atom,
                                        double direction[3], int *sign);
/* Positions (3N, Å) of displacement @d of @reference. */
void qv_symmetric_stencil_positions (const QvSymmetricStencil *st, const QvStructure *reference,
                                     gsize d, double *positions);
/* The supercell Hessian (eV/Å², 3N × 3N) from @forces (n_displacements ×
 * 3N, eV/Å, in displacement order); @spread (may be NULL) gets the largest
 * least-squares residual relative to max|f| (0 when the forces have the
 * group's symmetry exactly). A non-finite force is QV_ERROR_INPUT naming
 * the displacement. */
QvHessian *qv_symmetric_stencil_assemble (const QvSymmetricStencil *st, const double *forces,
                                          double *spread, GError **error);

G_END_DECLS
