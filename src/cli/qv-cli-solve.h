/* qv-cli-solve.h — the input and solver options `quaver modes` takes, for
 * the commands that start from the same modes (table, displace), and the
 * read-then-solve path they share (private to src/cli).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-cli.h"
#include "qv-manifest.h"
#include "qv-mode-set.h"
#include "qv-mode-table.h"
#include "qv-point-group.h"
#include "qv-symmetry-modes.h"

G_BEGIN_DECLS

typedef struct {
  char *hessian, *units, *layout, *masses, *projection, *method;
  char **isotopes, **mass_overrides;
  gint64 lowest;
  gboolean demo;
  gboolean all_modes;   /* set before adding the entries: the command needs
                           every mode, so --lowest is not offered */
  double symmetry_tolerance;   /* --symmetry-tolerance, Å (0: the default) */
  gboolean symmetrize;         /* --symmetrize: average geometry and Hessian
                                  over the point group before solving */
  gboolean distributed;        /* --distributed: every MPI rank solves its
                                  blocks (qv-cli-distributed.h) */
  gint64 block_size;           /* --block-size (0: the default) */
  gboolean offer_distributed;  /* set before adding the entries: the command
                                  offers --distributed (modes, table,
                                  displace, picture) */
  gboolean want_symmetry;      /* set by the command: find the point group and
                                  label the modes (modes, table) */
  QvPointGroup *point_group;   /* out: the group found, or NULL */
  QvSymmetryReport *symmetry;  /* out: each mode's species, or NULL */
} QvCliSolveArgs;

/* Adds --hessian, --hessian-units, --hessian-layout, --project, --lowest,
 * --lowest-method, --masses, --isotope, --mass, --demo,
 * --symmetry-tolerance, --symmetrize, --distributed and --block-size (spelt and explained as in `quaver
 * modes`) to @context's main group. */
void qv_cli_solve_add_entries (GOptionContext *context, QvCliSolveArgs *args);

/* Reads @geometry (NULL with --demo) and solves (or takes the bundle's
 * precomputed modes). @input receives what was read (structure, names).
 * With --distributed: NULL without error on MPI ranks other than 0. */
QvModeSet *qv_cli_solve (QvCliSolveArgs *args, const char *geometry, QvInput **input,
                         GError **error);

/* The SHA-256 of every input (geometry or bundle, Hessian file, or the
 * demo's bytes) into @manifest. */
gboolean qv_cli_solve_hash_inputs (const QvCliSolveArgs *args, const char *geometry,
                                   const QvInput *input, QvManifest *manifest, GError **error);

/* The mode-table report of what qv_cli_solve read and solved. */
void qv_cli_solve_report (QvModeReport *report, const QvInput *input, const QvModeSet *modes);
/* The point group and species qv_cli_solve found (want_symmetry) into
 * @report. */
void qv_cli_solve_report_symmetry (QvModeReport *report, const QvCliSolveArgs *args);

void qv_cli_solve_args_clear (QvCliSolveArgs *args);

G_END_DECLS
