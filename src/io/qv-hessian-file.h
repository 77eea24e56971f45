/* qv-hessian-file.h — Hessian matrices from plain text and NumPy .npy.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-hessian.h"

G_BEGIN_DECLS

/* Text: coordinate order x1 y1 z1 x2 …; 3N rows of 3N numbers, or a triangle
 * row by row (lower: 1, 2, …, n numbers; upper: n, n−1, …, 1); whitespace or
 * comma separated; '#' starts a comment; blank lines ignored. With
 * QV_HESSIAN_LAYOUT_AUTO the layout is detected from the row lengths and
 * fails (asking for an explicit layout) when they do not decide it; with an
 * explicit layout the numbers are read as one stream of the expected count,
 * whatever the line breaks. Numbers are decimal ("-1.5e-3", "+.5", "5.",
 * Fortran "1.0D+00"), parsed locale-independently and correctly rounded
 * (the same double as strtod); NaN, infinity, hexadecimal and numbers beyond
 * the range of a double are errors. Messages are "NAME:LINE:COL: …" (columns
 * count bytes). @n is the expected dimension (3 × atoms); 0 accepts any
 * square size. The result has both triangles filled and @layout set to what
 * was used (a full matrix is stored as it comes, row-major: see
 * qv-hessian.h). Values are left in the file's unit. Large texts are parsed
 * by two threads. QV_HESSIAN_LAYOUT_NPY reads @data as .npy. */
QvHessian *qv_hessian_read_text (const char *data, gsize length, const char *name,
                                 gsize n, QvHessianLayout layout, GError **error);

/* .npy version 1–3, dtype float64 ('<f8', '>f8' or native '=f8'), C or
 * Fortran order, shape (n, n). Anything else is a clear error naming @name.
 * The data are kept in file order (C order gives the transpose, harmless as
 * the solver symmetrizes); NaN or infinite elements are errors that give the
 * array's row and column (from 1). @layout of the result is
 * QV_HESSIAN_LAYOUT_NPY. */
QvHessian *qv_hessian_read_npy (const char *data, gsize length, const char *name,
                                gsize n, GError **error);

/* Reads a file: .npy by its magic bytes (the data go straight from the file
 * into the matrix; @layout is then ignored), otherwise text, streamed from the
 * file without holding all of it in memory (a text that fails is read again,
 * whole, to tell where). The file name does not matter. */
QvHessian *qv_hessian_read_file (const char *path, gsize n, QvHessianLayout layout,
                                 GError **error);

/* Where the data of a .npy Hessian lie, for readers that take only their
 * part of it (the distributed solver's blocks). */
typedef struct {
  gsize data_offset;           /* bytes before the first element */
  gsize dim;                   /* the array is dim × dim float64 */
  gboolean big_endian;
  gboolean fortran_order;      /* FALSE: C order, row by row */
} QvNpyLayout;

/* Reads only the header of the regular file @path and checks it as
 * qv_hessian_read_file would (dtype, shape, @n (0: any), and that the file
 * holds exactly the data the header promises). A text file is refused with
 * the advice to convert it (`quaver convert`). */
gboolean qv_hessian_probe_npy (const char *path, gsize n, QvNpyLayout *layout, GError **error);

G_END_DECLS
