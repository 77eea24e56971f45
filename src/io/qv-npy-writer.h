/* qv-npy-writer.h — arrays of doubles as NumPy .npy (format 1.0, '<f8',
 * C order): Hessians, and mode vectors and eigenvalues for scripts.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* A newly allocated .npy image of the @rows × @cols array whose element
 * (i, j) is @data[i · @row_stride + j · @col_stride] (@cols = 0: the 1-D
 * array of @rows elements @data[i · @row_stride]). The header is padded with
 * spaces to a multiple of 64 bytes and ends in '\n' (the format's rule);
 * the data follow little-endian, row by row. */
char *qv_npy_format (const double *data, gsize rows, gsize cols, gsize row_stride,
                     gsize col_stride, gsize *length);

G_END_DECLS
