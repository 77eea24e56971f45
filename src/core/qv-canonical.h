/* qv-canonical.h — a reproducible choice of eigenvectors: sign and
 * degenerate-subspace basis fixed from the subspace itself, not from the
 * LAPACK kernel that produced it.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* @vectors: n × m column-major orthonormal, @values ascending. Groups runs of
 * values within @tolerance (absolute) and, inside each group, replaces the
 * basis by the Gram–Schmidt orthonormalisation of the projections of unit
 * coordinate vectors chosen greedily by largest remaining norm (ties within
 * 1e-9 relative go to the lowest index). Then every vector's largest-magnitude
 * component is made positive (ties to the lowest index). Groups that touch
 * column m−1 when @last_group_open is TRUE (a partial range solve) are left
 * unrotated but signed. Returns the number of groups rotated. */
gsize qv_canonicalize (double *vectors, gsize n, gsize m, const double *values,
                       double tolerance, gboolean last_group_open);

G_END_DECLS
