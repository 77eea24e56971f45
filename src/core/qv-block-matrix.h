/* qv-block-matrix.h — a matrix dealt in square blocks over a 2-D grid of
 * MPI ranks (the BLACS process grid and the ScaLAPACK block-cyclic layout,
 * qv-block-layout.h), and agreeing on errors across the ranks. Built with
 * -Dmpi=enabled only. Every function here is collective: all ranks call it.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

typedef struct {
  int context;                 /* BLACS context over all ranks, row-major:
                                  rank = row · cols + col (MPI's own order
                                  for distributed arrays, MPI_Type_create_darray) */
  int root_context;            /* a 1 × 1 grid of rank 0; -1 on the others */
  int rows, cols, row, col;
  int rank, size;
} QvProcessGrid;

/* The grid of every rank of MPI_COMM_WORLD (MPI initialised), shaped by
 * qv_block_layout_grid. */
QvProcessGrid *qv_process_grid_new (void);
void qv_process_grid_free (QvProcessGrid *grid);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvProcessGrid, qv_process_grid_free)

/* TRUE when every rank passes @ok. Otherwise every rank returns FALSE with
 * the same error in @error: the one of the lowest failing rank (which passes
 * it in @error), sent to all. */
gboolean qv_process_grid_agree (const QvProcessGrid *grid, gboolean ok, GError **error);

typedef struct {
  const QvProcessGrid *grid;
  gsize rows, cols;            /* global */
  gsize block;                 /* square blocks */
  gsize local_rows, local_cols;
  int desc[9];                 /* ScaLAPACK array descriptor */
  double *data;                /* local_rows × local_cols, column-major,
                                  leading dimension MAX (1, local_rows) */
} QvBlockMatrix;

/* Allocates this rank's part (uninitialised). Fails with QV_ERROR_LIMIT on
 * the rank short of memory, with the bytes asked; agreed across the ranks. */
QvBlockMatrix *qv_block_matrix_new (const QvProcessGrid *grid, gsize rows, gsize cols,
                                    gsize block, GError **error);
void qv_block_matrix_free (QvBlockMatrix *matrix);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvBlockMatrix, qv_block_matrix_free)

/* Global row (column) of a local one, from 0. */
gsize qv_block_matrix_global_row (const QvBlockMatrix *matrix, gsize local_row);
gsize qv_block_matrix_global_col (const QvBlockMatrix *matrix, gsize local_col);

/* Columns [first, first + count) gathered on rank 0 (pdgemr2d, a panel at a
 * time): a newly allocated rows × count column-major array there, NULL on
 * the other ranks. Fails (on every rank) when rank 0 cannot hold them. */
double *qv_block_matrix_gather_columns (const QvBlockMatrix *matrix, gsize first, gsize count,
                                        GError **error);

G_END_DECLS
