/* qv-cli-lattice.h — the input of the lattice commands (bands, dos,
 * thermo): a primitive cell, a supercell (its structure or its matrix) and
 * the supercell's Hessian, turned into force constants with the acoustic
 * sum rule.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-crystal.h"
#include "qv-force-constants.h"
#include "qv-hessian-file.h"
#include "qv-nonanalytic.h"
#include "qv-structure.h"
#include "qv-supercell.h"

G_BEGIN_DECLS

typedef struct {
  char *supercell_structure;
  char *supercell;
  char *hessian;
  char *units;
  char *layout;
  double tolerance;
  gboolean no_sum_rule;
  gint64 threads;
  char *born;                /* --born FILE: Born charges and eps_inf, or NULL */
} QvCliLatticeOptions;

/* Defaults (tolerance QV_SUPERCELL_DEFAULT_TOLERANCE, threads 0). */
void qv_cli_lattice_options_init (QvCliLatticeOptions *o);
void qv_cli_lattice_options_clear (QvCliLatticeOptions *o);
/* Adds --supercell-structure/-S, --supercell, --hessian/-H,
 * --hessian-units/-u, --hessian-layout, --no-sum-rule, --tolerance,
 * --threads and --born to the main group of @context, bound to @o (which must outlive
 * the parse). */
void qv_cli_lattice_add_entries (GOptionContext *context, QvCliLatticeOptions *o);
/* The description paragraph of those options, for help texts. */
extern const char qv_cli_lattice_help[];

/* The command line of a lattice command: initialises @o, puts the lattice
 * options and the command's own @entries in @context's main group, parses,
 * and checks that exactly one PRIMITIVE file is left (QV_ERROR_USAGE naming
 * @command otherwise). */
gboolean qv_cli_lattice_parse (const char *command, GOptionContext *context,
                               QvCliLatticeOptions *o, const GOptionEntry *entries,
                               int *argc, char ***argv, GError **error);

/* The tables of bands, dos and thermo. */
typedef enum {
  QV_CLI_LATTICE_TEXT,
  QV_CLI_LATTICE_CSV,
  QV_CLI_LATTICE_JSON,
} QvCliLatticeFormat;

/* "text", "csv" or "json" (any case); QV_ERROR_USAGE naming them otherwise. */
gboolean qv_cli_lattice_format_parse (const char *text, QvCliLatticeFormat *format,
                                      GError **error);

typedef struct {
  QvCrystal *crystal;        /* owns what the members below point to */
  QvStructure *primitive;
  QvSupercellMap *map;
  QvForceConstants *fc;
  QvHessianUnit unit;
  double before[3];          /* acoustic wavenumbers at Γ before the sum rule, cm⁻¹ */
  double row_sum;            /* largest row sum removed, eV/Å² */
  QvNonAnalytic *na;         /* the LO–TO term of --born (reads fc), NULL without it */
} QvCliLattice;

void qv_cli_lattice_free (QvCliLattice *lattice);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvCliLattice, qv_cli_lattice_free)

/* Reads the extended XYZ structure @path, which must have a cell
 * (QV_ERROR_INPUT naming @what otherwise; CIF is refused with a hint). */
QvStructure *qv_cli_lattice_read_structure (const char *command, const char *path,
                                            const char *what, GError **error);

/* Checks @o (QV_ERROR_USAGE naming @command), reads the primitive cell
 * @primitive_path, the supercell and the Hessian, builds the force
 * constants, imposes the sum rule unless --no-sum-rule, reads --born into
 * @na (qv-nonanalytic.h; no Γ direction set) and prints the notes of the
 * lattice commands (periodicity, acoustic wavenumbers, charge neutrality)
 * on stderr. */
QvCliLattice *qv_cli_lattice_load (const char *command, const QvCliLatticeOptions *o,
                                   const char *primitive_path, GError **error);

G_END_DECLS
