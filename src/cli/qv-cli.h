/* qv-cli.h — shared pieces of the headless commands (private to src/cli).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-input.h"
#include "qv-mode-set.h"
#include "qv-structure.h"

G_BEGIN_DECLS

enum {
  QV_EXIT_OK = 0,
  QV_EXIT_USAGE = 1,
  QV_EXIT_INPUT = 2,
  QV_EXIT_WRITE = 3,
};

/* Prints "quaver: message" (and a hint for usage errors) and returns the
 * exit code that fits the error. */
int qv_cli_fail (const char *command, GError *error);
/* qv_cli_fail of a usage error (QV_ERROR_USAGE) made from @format. */
int qv_cli_fail_usage (const char *command, const char *format, ...) G_GNUC_PRINTF (2, 3);

/* What a command reads: a geometry with a Hessian, or a bundle, with the
 * mass options applied. */
typedef struct {
  const char *geometry;         /* path, or NULL with demo */
  gboolean demo;
  const char *hessian;
  const char *hessian_units;
  const char *hessian_layout;
  const char *masses;           /* isotopic | average */
  char **isotopes;              /* ATOM=MASSNUMBER */
  char **mass_overrides;        /* ATOM=VALUE */
  gboolean all_modes;           /* refuse, before reading the Hessian, a size
                                   the all-modes solver cannot take */
  gboolean hessian_deferred;    /* see QvInputOptions */
} QvCliInputOptions;

QvInput *qv_cli_input_load (const QvCliInputOptions *options, GError **error);

/* Writes @text to @path atomically (refusing to replace a file unless
 * @force), or to standard output when @path is NULL; returns the exit
 * status, after printing what went wrong. */
int qv_cli_emit (const char *command, const char *path, const char *text, gboolean force);

/* Progress lines on stderr when it is a terminal. */
gboolean qv_cli_progress (double fraction, const char *stage, gpointer user_data);

int qv_cmd_modes (int argc, char **argv);
int qv_cmd_ensemble (int argc, char **argv);
int qv_cmd_stencil (int argc, char **argv);
int qv_cmd_collect (int argc, char **argv);
int qv_cmd_displace (int argc, char **argv);
int qv_cmd_anharmonic (int argc, char **argv);
int qv_cmd_table (int argc, char **argv);
int qv_cmd_bands (int argc, char **argv);
int qv_cmd_dos (int argc, char **argv);
int qv_cmd_thermo (int argc, char **argv);
/* `quaver thermo` of a molecule (qv-cmd-thermo-molecule.c); TRUE when argv
 * names one (a bundle, XYZ without a cell, --demo or --molecule). */
int qv_cmd_thermo_molecule (int argc, char **argv);
gboolean qv_cmd_thermo_is_molecule (int argc, char **argv);
int qv_cmd_frozen (int argc, char **argv);
int qv_cmd_spectrum (int argc, char **argv);
int qv_cmd_compare (int argc, char **argv);
int qv_cmd_convert (int argc, char **argv);
int qv_cmd_picture (int argc, char **argv);   /* builds with the renderer only */

G_END_DECLS
