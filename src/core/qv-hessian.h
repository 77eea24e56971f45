/* qv-hessian.h — a dense second-derivative matrix in memory.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-units.h"

G_BEGIN_DECLS

typedef enum {
  QV_HESSIAN_LAYOUT_AUTO,   /* detect from the row lengths */
  QV_HESSIAN_LAYOUT_FULL,
  QV_HESSIAN_LAYOUT_LOWER,  /* lower triangle row by row: 1, 2, …, n numbers */
  QV_HESSIAN_LAYOUT_UPPER,  /* upper triangle row by row: n, n-1, …, 1 */
  QV_HESSIAN_LAYOUT_NPY,    /* a NumPy .npy array */
} QvHessianLayout;

/* An n×n matrix, coordinate order x1 y1 z1 x2 …, stored column-major in one
 * block. Because the solver symmetrizes first, a reader may store a row-major
 * source as it comes (that is, the transpose): the result is the same, and
 * @transposed says so, for whatever writes the matrix out again (the
 * writers of qv-hessian-writer.h honour it). After reading, the readers fill
 * both triangles. Values in eV/Å² once the reader's caller has applied the
 * unit. */
typedef struct {
  gsize n;
  double *data;
  QvHessianLayout layout;   /* as read, for the report */
  gboolean transposed;      /* element (i, j) is data[i n + j] instead of
                               data[j n + i] (a full text or a C-order .npy
                               stored as it came) */
} QvHessian;

/* Overflow-checked allocation of n×n doubles (zeroed when @zero). Fails with
 * QV_ERROR_LIMIT and a message with the size when it cannot. */
QvHessian *qv_hessian_new (gsize n, gboolean zero, GError **error);
void qv_hessian_free (QvHessian *hessian);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvHessian, qv_hessian_free)
QvHessian *qv_hessian_copy (const QvHessian *hessian, GError **error);

/* Multiplies every element (unit conversion). */
void qv_hessian_scale (QvHessian *hessian, double factor);
/* Replaces H by (H + Hᵀ)/2 in place (then no longer @transposed) and returns max|H_ij − H_ji| / max|H|
 * (0 for a zero matrix). */
double qv_hessian_symmetrize (QvHessian *hessian);
/* Index of the first non-finite element, or -1 when all are finite. */
gssize qv_hessian_find_nonfinite (const QvHessian *hessian);

const char *qv_hessian_layout_name (QvHessianLayout layout);
gboolean qv_hessian_layout_parse (const char *text, QvHessianLayout *layout, GError **error);

G_END_DECLS
