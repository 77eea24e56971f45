/* qv-overlap-map.h — the overlap matrix of two mode sets as a heat map
 * (rows: A's modes from the top, columns: B's modes from the left) in the
 * style's perceptually uniform ramp, the matching outlined, a read-out of
 * the cell under the pointer.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-mode-comparison.h"

G_BEGIN_DECLS

#define QV_TYPE_OVERLAP_MAP (qv_overlap_map_get_type ())
G_DECLARE_FINAL_TYPE (QvOverlapMap, qv_overlap_map, QV, OVERLAP_MAP, GtkDrawingArea)

GtkWidget *qv_overlap_map_new (void);
/* Copies what it draws from @comparison (NULL clears). */
void qv_overlap_map_set_comparison (QvOverlapMap *self, const QvModeComparison *comparison);
/* The matrix drawn: n_a rows of n_b values, row-major (NULL when empty). */
const double *qv_overlap_map_get_matrix (QvOverlapMap *self, gsize *n_a, gsize *n_b);
/* B's partner of A's mode @i as outlined, or QV_COMPARISON_NONE. */
gsize qv_overlap_map_get_partner (QvOverlapMap *self, gsize i);
/* The cell under widget pixel (@x, @y): FALSE outside the matrix. */
gboolean qv_overlap_map_cell_at (QvOverlapMap *self, double x, double y, gsize *i, gsize *j);
/* The read-out for widget pixel (@x, @y) as the pointer there would show it
 * ("A 7 · 1043.2 cm⁻¹ | B 7 · 1040.1 cm⁻¹ | overlap 0.982, matched"), or
 * NULL outside the matrix. Also sets it as the current read-out. */
char *qv_overlap_map_hover (QvOverlapMap *self, double x, double y);

G_END_DECLS
