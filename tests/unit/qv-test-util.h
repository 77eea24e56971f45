/* qv-test-util.h — model Hessians and LAPACK acceptance checks for tests.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-hessian.h"
#include "qv-mode-set.h"
#include "qv-solver.h"
#include "qv-structure.h"

/* A structure from symbols ("O", "C", …) and positions (Å). */
QvStructure *qvt_structure (gsize n, const guint *z, const double *positions);

/* Adds ½k(r − r0)² at r = r0 for the bond i–j: H += k u uᵀ on the blocks. */
void qvt_add_stretch (QvHessian *h, const QvStructure *s, gsize i, gsize j, double k);
/* Adds ½k s² for a general internal coordinate with Wilson row @b (3N). */
void qvt_add_coordinate (QvHessian *h, const double *b, double k);

/* Solves a copy of @h and checks the LAPACK Working Note 41 acceptance
 * ratios ‖AZ − ZΛ‖₁/(n‖A‖₁ε) and ‖ZᵀZ − I‖₁/(nε) < 30 against the projected
 * matrix rebuilt independently of the solver's in-place path. */
QvModeSet *qvt_solve_checked (const QvStructure *s, const QvHessian *h,
                              const QvSolveOptions *options);

/* Random positions in a box, fixed seed (GRand). */
QvStructure *qvt_random_molecule (gsize n, guint32 seed, double box);
/* Springs between all pairs closer than @cutoff, k in [kmin, kmax]. */
QvHessian *qvt_spring_network (const QvStructure *s, guint32 seed, double cutoff,
                               double kmin, double kmax);
