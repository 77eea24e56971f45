/* qv-hessian-blocks.h — each MPI rank reads only its blocks of a .npy
 * Hessian (MPI-IO, one collective read through a distributed-array file
 * view), so no rank ever holds the whole matrix. Built with -Dmpi=enabled
 * only; collective.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-block-matrix.h"

G_BEGIN_DECLS

/* Reads the n × n .npy Hessian at @path (n = 3 × atoms, checked by every
 * rank from the header as qv_hessian_read_file would) into a new block
 * matrix of @grid with @block-sized blocks, each element times @scale (the
 * unit conversion to eV/Å²). C-order files arrive transposed, which the
 * solver's symmetrization makes harmless (as in the serial reader). NaN or
 * infinite elements are errors naming the first one's row and column. */
QvBlockMatrix *qv_hessian_blocks_read (const char *path, gsize n, double scale,
                                       const QvProcessGrid *grid, gsize block, GError **error);

G_END_DECLS
