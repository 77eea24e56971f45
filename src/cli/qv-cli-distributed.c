/* qv-cli-distributed.c — MPI around a command, and the distributed solve.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdlib.h>
#include <string.h>
#include "qv-config.h"
#include "qv-cli.h"
#include "qv-cli-distributed.h"
#include "qv-error.h"
#ifdef QV_HAVE_MPI
#include <mpi.h>
#include "qv-block-layout.h"
#include "qv-block-matrix.h"
#include "qv-distributed-solver.h"
#include "qv-hessian-blocks.h"
#endif

static gboolean started;
static int rank;

gboolean
qv_cli_distributed_requested (int argc, char **argv)
{
  for (int i = 1; i < argc; i++)
    {
      if (strcmp (argv[i], "--") == 0)
        break;
      if (strcmp (argv[i], "--distributed") == 0)
        return TRUE;
    }
  return FALSE;
}

#ifdef QV_HAVE_MPI
static void
silent (const gchar *text)
{
  (void) text;
}

/* GOption's --help exits from inside the parse: finish MPI all the same,
 * or mpirun reports the ranks as failed. */
static void
finalize_at_exit (void)
{
  int finalized = 0;

  MPI_Finalized (&finalized);
  if (started && !finalized)
    MPI_Finalize ();
}
#endif

gboolean
qv_cli_distributed_begin (int *argc, char ***argv, GError **error)
{
#ifdef QV_HAVE_MPI
  MPI_Init (argc, argv);
  started = TRUE;
  atexit (finalize_at_exit);
  MPI_Comm_rank (MPI_COMM_WORLD, &rank);
  if (rank != 0)
    {
      g_set_print_handler (silent);
      g_set_printerr_handler (silent);
    }
  return TRUE;
#else
  (void) argc;
  (void) argv;
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "this quaver was built without MPI, so --distributed is not available; rebuild "
               "with 'meson setup -Dmpi=enabled' (Debian: libscalapack-openmpi-dev openmpi-bin; "
               "docs/cluster.md), or leave out --distributed to solve on this machine");
  return FALSE;
#endif
}

gboolean
qv_cli_distributed_is_root (void)
{
  return !started || rank == 0;
}

int
qv_cli_distributed_end (int status)
{
#ifdef QV_HAVE_MPI
  if (started)
    {
      int worst = status;

      MPI_Allreduce (&status, &worst, 1, MPI_INT, MPI_MAX, MPI_COMM_WORLD);
      MPI_Finalize ();
      started = FALSE;
      return worst;
    }
#endif
  return status;
}

QvModeSet *
qv_cli_distributed_solve (const QvStructure *structure, const char *path, double scale,
                          const QvSolveOptions *options, gsize block, GError **error)
{
#ifdef QV_HAVE_MPI
  QvProgress progress = { qv_cli_progress, NULL };
  g_autoptr(QvProcessGrid) grid = NULL;
  QvBlockMatrix *hessian;
  QvModeSet *modes;

  g_return_val_if_fail (started, NULL);
  grid = qv_process_grid_new ();
  if (block == 0)
    block = QV_BLOCK_LAYOUT_DEFAULT_BLOCK;
  g_printerr ("quaver: distributed over %d ranks (a %d × %d grid of %" G_GSIZE_FORMAT " × %"
              G_GSIZE_FORMAT " blocks)\n", grid->size, grid->rows, grid->cols, block, block);
  hessian = qv_hessian_blocks_read (path, 3 * structure->n_atoms, scale, grid, block, error);
  if (hessian == NULL)
    return NULL;
  modes = qv_distributed_solve (structure, hessian, options, &progress, error);
  return modes;
#else
  (void) structure; (void) path; (void) scale; (void) options; (void) block;
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "this quaver was built without MPI");
  return NULL;
#endif
}
