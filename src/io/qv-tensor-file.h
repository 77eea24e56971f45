/* qv-tensor-file.h — derivative tensors (atomic polar tensors, polarisability
 * derivatives) as plain text (docs/formats.md, "Derivative tensors").
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* Largest tensor file read, bytes. */
#define QV_TENSOR_FILE_MAX_BYTES ((gsize) 1 << 30)

/* Text of R rows, one per line, of 3N numbers each (columns x1 y1 z1 x2 …,
 * whitespace or comma separated); '#' starts a comment, blank lines are
 * ignored. R must be one of @row_counts (0-terminated, e.g. {3, 0} for
 * dipole derivatives or {6, 9, 0} for polarisability derivatives). Numbers
 * are decimal, C locale (Fortran "1.0D+00" accepted); NaN, infinity and
 * numbers beyond a double are errors. Values stay in the file's unit (the
 * caller states it). Messages are "NAME:LINE:COL: …" and say what was
 * expected. Returns R × 3N values, row-major, and R in @n_rows. */
double *qv_tensor_read_text (const char *data, gsize length, const char *name, gsize n_atoms,
                             const gsize *row_counts, const char *what, gsize *n_rows,
                             GError **error);
double *qv_tensor_read_file (const char *path, gsize n_atoms, const gsize *row_counts,
                             const char *what, gsize *n_rows, GError **error);

G_END_DECLS
