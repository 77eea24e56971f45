/* qv-hessian-writer.h — Hessian matrices to plain text and NumPy .npy, in
 * the forms qv-hessian-file.h reads back.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-hessian.h"

G_BEGIN_DECLS

typedef enum {
  QV_HESSIAN_WRITE_TEXT,       /* n rows of n numbers, '#' comment lines first */
  QV_HESSIAN_WRITE_NPY,        /* .npy version 1.0, '<f8', C order, (n, n) */
} QvHessianWriteFormat;

/* NPY for names ending in ".npy" (any case), text otherwise. */
QvHessianWriteFormat qv_hessian_write_format_for (const char *path);

/* Text: every element in the shortest spelling that reads back to the same
 * double, separated by single spaces; @comment (may be NULL, may hold several
 * lines) is written first with "# " before each line. Row i of the file is
 * H_i1 … H_in whatever the storage order (@transposed included). Newly allocated; @length may be
 * NULL. */
char *qv_hessian_format_text (const QvHessian *hessian, const char *comment, gsize *length);

/* .npy 1.0: magic, header {'descr': '<f8', 'fortran_order': False,
 * 'shape': (n, n), } padded with spaces to a multiple of 64 bytes and ended
 * by '\n' (the NumPy format's own rule), then the n² little-endian doubles
 * row by row: row i is H_i1 … H_in, as for the text (@transposed included). .npy has no room for a comment: state units elsewhere. */
char *qv_hessian_format_npy (const QvHessian *hessian, gsize *length);

/* Writes atomically through qv_output_write (an existing @path is refused
 * unless @force: QV_ERROR_WRITE). @comment is used by the text format only. */
gboolean qv_hessian_write_file (const char *path, const QvHessian *hessian,
                                QvHessianWriteFormat format, const char *comment,
                                gboolean force, GError **error);

G_END_DECLS
