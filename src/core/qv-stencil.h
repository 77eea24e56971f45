/* qv-stencil.h — a Hessian from forces by central differences.
 *
 * The stencil displaces every Cartesian coordinate i of the selected atoms
 * by +h and by −h (2 structures per coordinate, 6 per atom). From the forces
 * F (eV/Å) of those structures, row i of the Hessian is
 *   H_ij = −(F_j(+h e_i) − F_j(−h e_i)) / (2h),
 * with an error of order h² (Taylor expansion of the gradient; common
 * practice). The matrix is then symmetrised, (H + Hᵀ)/2, and the asymmetry
 * max|H_ij − H_ji| / max|H| before it is reported: it measures the noise of
 * the forces and the h² error.
 *
 * Selected atoms: with a subset, only the rows of the selected coordinates
 * are known. The assembly then returns the square block of the selected
 * coordinates only (3k × 3k for k atoms), which is the Hessian of the
 * selected atoms with every other atom held fixed (a partial Hessian); the
 * couplings to the unselected atoms are measured but not kept. It is not a
 * full Hessian and must not be used as one (the CLI says so and solves it
 * without rigid-body projection, which a frozen environment breaks).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-hessian.h"
#include "qv-progress.h"
#include "qv-structure.h"

G_BEGIN_DECLS

/* Default step in Å (common practice for central differences of forces:
 * 0.005–0.01 Å balances the h² error against force noise). */
#define QV_STENCIL_DEFAULT_STEP 0.01
/* Largest step accepted (Å): beyond it the harmonic picture is lost. */
#define QV_STENCIL_MAX_STEP 0.5

typedef struct {
  gsize n_atoms;               /* of the reference structure */
  double step;                 /* h, Å */
  gsize n_selected;
  gsize *atoms;                /* n_selected, 0-based, ascending, distinct */
  gsize n_displacements;       /* 6 × n_selected */
} QvStencil;

/* @atoms (0-based, any order, duplicates merged) or NULL for every atom.
 * Fails with QV_ERROR_USAGE for a step outside (0, QV_STENCIL_MAX_STEP] or an
 * atom out of range. */
QvStencil *qv_stencil_new (gsize n_atoms, double step, const gsize *atoms,
                           gsize n_selected, GError **error);
void qv_stencil_free (QvStencil *stencil);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvStencil, qv_stencil_free)

/* TRUE when every atom is selected (the assembly is a full Hessian). */
gboolean qv_stencil_is_complete (const QvStencil *stencil);

/* Displacement @d (0-based) moves @atom (0-based) along @axis (0, 1, 2) by
 * @sign × h; the order is atom by atom, x, y, z, + before −. */
void qv_stencil_displacement (const QvStencil *stencil, gsize d, gsize *atom,
                              int *axis, int *sign);
/* The positions (3N, Å) of displacement @d of @reference. */
void qv_stencil_positions (const QvStencil *stencil, const QvStructure *reference,
                           gsize d, double *positions);

/* Assembles from @forces (n_displacements × 3N, eV/Å, displacement after
 * displacement) the symmetrised Hessian (eV/Å²) of the selected coordinates,
 * 3·n_selected square; @asymmetry (may be NULL) gets max|H_ij − H_ji| / max|H|
 * before symmetrisation. A non-finite force is QV_ERROR_INPUT naming the
 * displacement. */
QvHessian *qv_stencil_assemble (const QvStencil *stencil, const double *forces,
                                double *asymmetry, const QvProgress *progress,
                                GError **error);

/* Parses an atom selection such as "1,3-5" (atoms count from 1; ranges
 * inclusive; spaces allowed) into 0-based indices (newly allocated, in the
 * order given). "all" selects every atom. Errors are QV_ERROR_USAGE naming
 * the bad part. */
gboolean qv_stencil_parse_atoms (const char *text, gsize n_atoms, gsize **atoms,
                                 gsize *n_selected, GError **error);
/* The selection as text, "1,3-5" (1-based), or "all" when complete. */
char *qv_stencil_format_atoms (const QvStencil *stencil);

/* A copy of @reference with only the selected atoms (masses, labels kept):
 * the structure that goes with the assembled block. */
QvStructure *qv_stencil_selected_structure (const QvStencil *stencil,
                                            const QvStructure *reference);

G_END_DECLS
