/* qv-cli-distributed.h — `--distributed`: the command run by every rank of
 * `mpirun -n P quaver modes …`, MPI started and ended around it, only rank 0
 * speaking (private to src/cli). Without -Dmpi=enabled the option is
 * refused with what to do instead.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-mode-set.h"
#include "qv-solver.h"
#include "qv-structure.h"

G_BEGIN_DECLS

/* TRUE when @argv holds --distributed (looked up before the options are
 * parsed, so MPI starts first and only rank 0 reports usage errors). */
gboolean qv_cli_distributed_requested (int argc, char **argv);

/* Starts MPI and silences g_print/g_printerr on ranks other than 0.
 * QV_ERROR_USAGE when this build has no MPI. */
gboolean qv_cli_distributed_begin (int *argc, char ***argv, GError **error);

/* FALSE on ranks other than 0 of a distributed run; TRUE otherwise. */
gboolean qv_cli_distributed_is_root (void);

/* The largest @status of all ranks (so mpirun and every rank agree), after
 * MPI is finalised; @status itself when MPI was not started. */
int qv_cli_distributed_end (int status);

/* Reads the .npy Hessian at @path (each rank its blocks), times @scale to
 * eV/Å², and solves it over all ranks in @block-sized blocks (0: the
 * default). The mode set on rank 0, NULL without error on the others. */
QvModeSet *qv_cli_distributed_solve (const QvStructure *structure, const char *path,
                                     double scale, const QvSolveOptions *options, gsize block,
                                     GError **error);

G_END_DECLS
