/* qv-lanczos.h — the lowest eigenpairs of a large symmetric matrix without
 * the tridiagonal reduction: shift-invert block Lanczos on (A − τI)⁻¹ with a
 * Cholesky factor, τ below the lowest eigenvalue, then a Rayleigh–Ritz step
 * on A, a residual check and a Sylvester-inertia count (LDLᵀ) that proves
 * no eigenvalue below the ones returned was missed.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* @a: n×n column-major with its lower triangle valid; the strict upper
 * triangle is used as scratch. On success returns TRUE with the lowest @m
 * eigenvalues ascending in @w and orthonormal eigenvectors in @z (n×m). On
 * FALSE (no convergence, or a check failed) @w is untouched and a direct
 * solver can take over. Either way @a's lower triangle holds A again. */
gboolean qv_lanczos_lowest (double *a, gsize n, gsize m, double *w, double *z);

G_END_DECLS
