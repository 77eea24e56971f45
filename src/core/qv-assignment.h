/* qv-assignment.h — the assignment problem: the one-to-one matching of
 * rows to columns that maximises the total weight (mode sets compared, band
 * branches connected across q).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* A row left without a column. */
#define QV_ASSIGNMENT_NONE G_MAXSIZE

/* The matching of rows to columns of the row-major @n_rows × @n_cols
 * @weights that maximises the total weight (Kuhn–Munkres with potentials,
 * O(n²m); non-finite weights count as 0). @row_to_col receives n_rows
 * entries (QV_ASSIGNMENT_NONE for rows left over when n_rows > n_cols). */
void qv_assignment_maximise (const double *weights, gsize n_rows, gsize n_cols,
                             gsize *row_to_col);

G_END_DECLS
