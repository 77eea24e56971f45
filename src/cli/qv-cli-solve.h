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

G_BEGIN_DECLS

typedef struct {
  char *hessian, *units, *layout, *masses, *projection, *method;
  char **isotopes, **mass_overrides;
  gint64 lowest;
  gboolean demo;
  gboolean all_modes;   /* set before adding the entries: the command needs
                           every mode, so --lowest is not offered */
} QvCliSolveArgs;

/* Adds --hessian, --hessian-units, --hessian-layout, --project, --lowest,
 * --lowest-method, --masses, --isotope, --mass and --demo (spelt and
 * explained as in `quaver modes`) to @context's main group. */
void qv_cli_solve_add_entries (GOptionContext *context, QvCliSolveArgs *args);

/* Reads @geometry (NULL with --demo) and solves (or takes the bundle's
 * precomputed modes). @input receives what was read (structure, names). */
QvModeSet *qv_cli_solve (QvCliSolveArgs *args, const char *geometry, QvInput **input,
                         GError **error);

/* The SHA-256 of every input (geometry or bundle, Hessian file, or the
 * demo's bytes) into @manifest. */
gboolean qv_cli_solve_hash_inputs (const QvCliSolveArgs *args, const char *geometry,
                                   const QvInput *input, QvManifest *manifest, GError **error);

/* The mode-table report of what qv_cli_solve read and solved. */
void qv_cli_solve_report (QvModeReport *report, const QvInput *input, const QvModeSet *modes);

void qv_cli_solve_args_clear (QvCliSolveArgs *args);

G_END_DECLS
