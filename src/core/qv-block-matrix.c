/* qv-block-matrix.c — block-cyclic matrices over the BLACS grid of every MPI
 * rank, and errors agreed across the ranks.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <mpi.h>
#include <string.h>
#include "qv-block-layout.h"
#include "qv-block-matrix.h"
#include "qv-error.h"
#include "qv-scalapack-private.h"

/* Columns gathered on rank 0 per pdgemr2d call: bounds its buffers. */
#define GATHER_PANEL 256

QvProcessGrid *
qv_process_grid_new (void)
{
  QvProcessGrid *grid = g_new0 (QvProcessGrid, 1);
  guint rows, cols;

  MPI_Comm_rank (MPI_COMM_WORLD, &grid->rank);
  MPI_Comm_size (MPI_COMM_WORLD, &grid->size);
  qv_block_layout_grid ((guint) grid->size, &rows, &cols);
  Cblacs_get (-1, 0, &grid->context);
  Cblacs_gridinit (&grid->context, "Row", (int) rows, (int) cols);
  Cblacs_gridinfo (grid->context, &grid->rows, &grid->cols, &grid->row, &grid->col);
  Cblacs_get (-1, 0, &grid->root_context);
  Cblacs_gridinit (&grid->root_context, "Row", 1, 1);
  if (grid->rank != 0)
    grid->root_context = -1;
  return grid;
}

void
qv_process_grid_free (QvProcessGrid *grid)
{
  if (grid == NULL)
    return;
  if (grid->root_context >= 0)
    Cblacs_gridexit (grid->root_context);
  Cblacs_gridexit (grid->context);
  g_free (grid);
}

gboolean
qv_process_grid_agree (const QvProcessGrid *grid, gboolean ok, GError **error)
{
  int mine = ok ? grid->size : grid->rank, first = grid->size;
  int code = QV_ERROR_SOLVER, length = 0;
  g_autofree char *message = NULL;

  MPI_Allreduce (&mine, &first, 1, MPI_INT, MPI_MIN, MPI_COMM_WORLD);
  if (first == grid->size)
    return TRUE;
  if (grid->rank == first)
    {
      const GError *e = error ? *error : NULL;

      code = e ? e->code : QV_ERROR_SOLVER;
      message = g_strdup (e ? e->message : "a rank failed without saying why");
      length = (int) strlen (message) + 1;
    }
  MPI_Bcast (&code, 1, MPI_INT, first, MPI_COMM_WORLD);
  MPI_Bcast (&length, 1, MPI_INT, first, MPI_COMM_WORLD);
  if (grid->rank != first)
    message = g_malloc0 ((gsize) MAX (length, 1));
  MPI_Bcast (message, length, MPI_CHAR, first, MPI_COMM_WORLD);
  if (grid->rank != first && error)
    {
      g_clear_error (error);
      g_set_error_literal (error, QV_ERROR, code, message);
    }
  return FALSE;
}

QvBlockMatrix *
qv_block_matrix_new (const QvProcessGrid *grid, gsize rows, gsize cols, gsize block,
                     GError **error)
{
  g_autoptr(QvBlockMatrix) m = g_new0 (QvBlockMatrix, 1);
  const int zero = 0;
  int info = 0, mi, ni, bi, lld;

  m->grid = grid;
  m->rows = rows;
  m->cols = cols;
  m->block = block;
  m->local_rows = qv_block_layout_local_count (rows, block, (guint) grid->row, (guint) grid->rows);
  m->local_cols = qv_block_layout_local_count (cols, block, (guint) grid->col, (guint) grid->cols);
  mi = (int) rows;
  ni = (int) cols;
  bi = (int) block;
  lld = (int) MAX (m->local_rows, 1);
  descinit_ (m->desc, &mi, &ni, &bi, &bi, &zero, &zero, &grid->context, &lld, &info);
  m->data = g_try_malloc (sizeof (double) * MAX (m->local_rows * m->local_cols, 1));
  if (m->data == NULL)
    g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                 "rank %d cannot hold its %" G_GSIZE_FORMAT " × %" G_GSIZE_FORMAT " part of a %"
                 G_GSIZE_FORMAT " × %" G_GSIZE_FORMAT " matrix (%.1f MiB); run on more ranks "
                 "(docs/cluster.md gives the memory per rank)", grid->rank, m->local_rows,
                 m->local_cols, rows, cols,
                 (double) m->local_rows * (double) m->local_cols * 8.0 / 1048576.0);
  if (!qv_process_grid_agree (grid, m->data != NULL, error))
    return NULL;
  return g_steal_pointer (&m);
}

void
qv_block_matrix_free (QvBlockMatrix *matrix)
{
  if (matrix == NULL)
    return;
  g_free (matrix->data);
  g_free (matrix);
}

gsize
qv_block_matrix_global_row (const QvBlockMatrix *m, gsize local_row)
{
  return qv_block_layout_global_index (local_row, m->block, (guint) m->grid->row,
                                       (guint) m->grid->rows);
}

gsize
qv_block_matrix_global_col (const QvBlockMatrix *m, gsize local_col)
{
  return qv_block_layout_global_index (local_col, m->block, (guint) m->grid->col,
                                       (guint) m->grid->cols);
}

double *
qv_block_matrix_gather_columns (const QvBlockMatrix *m, gsize first, gsize count,
                                GError **error)
{
  const QvProcessGrid *grid = m->grid;
  const gboolean root = grid->rank == 0;
  double *out = NULL, dummy = 0.0;
  const int one = 1, zero = 0;

  if (root)
    {
      out = g_try_malloc (sizeof (double) * MAX (m->rows * count, 1));
      if (out == NULL)
        g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                     "rank 0 cannot hold the %" G_GSIZE_FORMAT " mode vectors it writes "
                     "(%.1f MiB); ask for fewer modes (--lowest K)", count,
                     (double) m->rows * (double) count * 8.0 / 1048576.0);
    }
  if (!qv_process_grid_agree (grid, !root || out != NULL, error))
    return NULL;

  for (gsize done = 0; done < count; done += GATHER_PANEL)
    {
      const int mi = (int) m->rows, ni = (int) MIN (GATHER_PANEL, count - done);
      const int ja = (int) (first + done + 1), bi = (int) m->block;
      int desc[9] = { 0 }, info = 0, lld = (int) MAX (m->rows, 1);

      if (root)
        descinit_ (desc, &mi, &ni, &bi, &bi, &zero, &zero, &grid->root_context, &lld, &info);
      else
        desc[1] = -1;   /* not in the target's context */
      pdgemr2d_ (&mi, &ni, m->data, &one, &ja, m->desc, root ? out + done * m->rows : &dummy,
                 &one, &one, desc, &grid->context);
    }
  return out;
}
