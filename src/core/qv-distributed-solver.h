/* qv-distributed-solver.h — the normal-mode pipeline of qv-solver.h on a
 * Hessian dealt in blocks over MPI ranks: symmetrize, mass weight, remove
 * rigid-body motion by the same shifted low-rank update (applied block by
 * block), solve with ScaLAPACK (pdsyevd for every mode, pdsyevr for the
 * lowest K), and gather only the wanted vectors on rank 0, where
 * qv_solver_finish makes them canonical as the serial solver does. Built
 * with -Dmpi=enabled only; collective (every rank calls it).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-block-matrix.h"
#include "qv-mode-set.h"
#include "qv-progress.h"
#include "qv-solver.h"
#include "qv-structure.h"

G_BEGIN_DECLS

/* @hessian: the 3N × 3N Hessian in eV/Å² (any symmetry), consumed (freed).
 * Every rank passes the same @structure and @options (lowest > 0: the
 * lowest K by pdsyevr; lowest_method is not used). Returns the mode set on
 * rank 0 and NULL without error on the others; on failure NULL on every rank
 * with the same error. @progress is reported on rank 0. */
QvModeSet *qv_distributed_solve (const QvStructure *structure, QvBlockMatrix *hessian,
                                 const QvSolveOptions *options, const QvProgress *progress,
                                 GError **error);

G_END_DECLS
