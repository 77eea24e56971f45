/* qv-hessian-blocks.c — a .npy Hessian read block-cyclically with MPI-IO.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <mpi.h>
#include "qv-error.h"
#include "qv-hessian-blocks.h"
#include "qv-hessian-file.h"
#include "qv-io-error.h"

static gboolean
mpi_failed (int code, const char *path, const char *what, GError **error)
{
  char text[MPI_MAX_ERROR_STRING];
  int length = 0;

  if (code == MPI_SUCCESS)
    return FALSE;
  MPI_Error_string (code, text, &length);
  qv_io_error (error, path, 0, 0, "%s: %.*s", what, length, text);
  return TRUE;
}

QvBlockMatrix *
qv_hessian_blocks_read (const char *path, gsize n, double scale, const QvProcessGrid *grid,
                        gsize block, GError **error)
{
  g_autoptr(QvBlockMatrix) m = NULL;
  QvNpyLayout layout = { 0 };
  MPI_Datatype view = MPI_DATATYPE_NULL, column = MPI_DATATYPE_NULL;
  MPI_File file = MPI_FILE_NULL;
  gboolean ok;
  guint64 first_bad = G_MAXUINT64, global_bad = G_MAXUINT64;

  ok = qv_hessian_probe_npy (path, n, &layout, error);
  if (!qv_process_grid_agree (grid, ok, error))
    return NULL;
  m = qv_block_matrix_new (grid, n, n, block, error);
  if (m == NULL)
    return NULL;

  /* The file as MPI sees it: an n × n array of doubles in Fortran order
   * (a C-order file is then its transpose), dealt in block × block tiles
   * over the rows × cols grid — exactly ScaLAPACK's layout, with the local
   * tiles arriving column-major. */
  {
    int sizes[2] = { (int) n, (int) n };
    int distribs[2] = { MPI_DISTRIBUTE_CYCLIC, MPI_DISTRIBUTE_CYCLIC };
    int dargs[2] = { (int) block, (int) block };
    int psizes[2] = { grid->rows, grid->cols };
    int code;

    code = MPI_Type_create_darray (grid->size, grid->rank, 2, sizes, distribs, dargs, psizes,
                                   MPI_ORDER_FORTRAN, MPI_DOUBLE, &view);
    ok = !mpi_failed (code, path, "cannot describe the blocks", error);
    if (ok)
      {
        MPI_Type_commit (&view);
        /* one local column at a time keeps the count within an int */
        MPI_Type_contiguous ((int) MAX (m->local_rows, 1), MPI_DOUBLE, &column);
        MPI_Type_commit (&column);
        code = MPI_File_open (MPI_COMM_WORLD, path, MPI_MODE_RDONLY, MPI_INFO_NULL, &file);
        ok = !mpi_failed (code, path, "cannot open", error);
      }
  }
  /* MPI_File_open is collective: it fails on every rank or none */
  if (ok)
    {
      MPI_Status status;
      int code = MPI_File_set_view (file, (MPI_Offset) layout.data_offset, MPI_DOUBLE, view,
                                    "native", MPI_INFO_NULL);
      if (!mpi_failed (code, path, "cannot read its blocks", error))
        {
          code = MPI_File_read_all (file, m->data, m->local_rows > 0 ? (int) m->local_cols : 0,
                                    column, &status);
          ok = !mpi_failed (code, path, "cannot read its blocks", error);
        }
      else
        ok = FALSE;
      MPI_File_close (&file);
    }
  if (view != MPI_DATATYPE_NULL)
    MPI_Type_free (&view);
  if (column != MPI_DATATYPE_NULL)
    MPI_Type_free (&column);
  if (!qv_process_grid_agree (grid, ok, error))
    return NULL;

  /* Byte order, the first non-finite element (in file order), the unit. */
  for (gsize jl = 0; jl < m->local_cols; jl++)
    {
      const guint64 gj = qv_block_matrix_global_col (m, jl);
      double *col = m->data + jl * m->local_rows;

      for (gsize il = 0; il < m->local_rows; il++)
        {
          if (layout.big_endian != (G_BYTE_ORDER == G_BIG_ENDIAN))
            {
              guint64 *u = (guint64 *) (void *) (col + il);
              *u = GUINT64_SWAP_LE_BE (*u);
            }
          if (!isfinite (col[il]))
            {
              const guint64 gi = qv_block_matrix_global_row (m, il);
              first_bad = MIN (first_bad, gi + gj * (guint64) n);
            }
          col[il] *= scale;
        }
    }
  MPI_Allreduce (&first_bad, &global_bad, 1, MPI_UINT64_T, MPI_MIN, MPI_COMM_WORLD);
  if (global_bad != G_MAXUINT64)
    {
      /* position i + j·n in the file: Fortran (row i, column j); C-order
       * files swap the two */
      const guint64 a = global_bad % n, b = global_bad / n;
      const guint64 row = layout.fortran_order ? a : b, col = layout.fortran_order ? b : a;

      qv_io_error (error, path, 0, 0, "element (row %" G_GUINT64_FORMAT ", column %"
                   G_GUINT64_FORMAT ") of the .npy array is not a finite number",
                   row + 1, col + 1);
      return NULL;
    }
  return g_steal_pointer (&m);
}
