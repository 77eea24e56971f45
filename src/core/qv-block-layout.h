/* qv-block-layout.h — the 2-D block-cyclic layout of a matrix over a grid
 * of processes (the ScaLAPACK layout): the grid's shape for a rank count,
 * which global rows a process holds, and the memory each process needs for
 * the distributed normal-mode solve. Plain arithmetic, no MPI: the memory
 * model is also asked for process counts that are not running.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* Default square block size (rows = columns of a block): 64, common practice
 * for ScaLAPACK eigensolvers on current CPUs (docs/cluster.md). */
#define QV_BLOCK_LAYOUT_DEFAULT_BLOCK 64

/* The grid for @processes ranks: rows × cols = @processes, rows the largest
 * divisor not above √processes (as square as the count allows; a prime
 * count gives 1 × P). */
void qv_block_layout_grid (guint processes, guint *rows, guint *cols);

/* How many of @n global indices, dealt in blocks of @block round-robin over
 * @processes (the first block on process 0), process @coord holds (the
 * NUMROC of ScaLAPACK's TOOLS). */
gsize qv_block_layout_local_count (gsize n, gsize block, guint coord, guint processes);

/* The global index (from 0) of local index @local on process @coord
 * (INDXL2G, 0-based). */
gsize qv_block_layout_global_index (gsize local, gsize block, guint coord, guint processes);

/* The eigensolver's documented minimum workspace (doubles, ints) on process
 * (@row, @col): pdsyevd's when @vectors ≥ n (every mode), pdsyevr's for the
 * lowest @vectors. */
void qv_block_layout_eigen_workspace (gsize n, gsize block, guint rows, guint cols, guint row,
                                      guint col, gsize vectors, guint64 *lwork, guint64 *liwork);

/* Bytes the largest process of a rows × cols grid holds during the
 * distributed solve of an n × n Hessian with @vectors wanted eigenvectors
 * (n for all): the matrix and the eigenvector matrix (n × n blocks), the
 * eigensolver's workspace (pdsyevd's LWORK and LIWORK formulae for all
 * modes; pdsyevr's for a range), and the replicated rigid-body arrays.
 * Rank 0 also receives the wanted vectors: @root_bytes (may be NULL). */
guint64 qv_block_layout_solve_bytes (gsize n, gsize block, guint rows, guint cols,
                                     gsize vectors, guint64 *root_bytes);

G_END_DECLS
