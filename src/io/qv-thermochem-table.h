/* qv-thermochem-table.h — a molecule's gas-phase thermochemistry
 * (qv-gas-thermo.h) as `quaver thermo MOLECULE` prints it and the app's
 * Thermochemistry page saves it: text (a # header, the term table or a
 * sweep, the per-vibration table), CSV (the term table, the per-vibration
 * table, or one row per temperature) and JSON (all of it, with units).
 * Energies in kJ/mol, entropies and heat capacities in J/(K mol); the
 * JSON adds per-molecule values in eV.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-gas-thermo.h"

G_BEGIN_DECLS

typedef enum {
  QV_THERMOCHEM_TABLE_TEXT,
  QV_THERMOCHEM_TABLE_CSV,
  QV_THERMOCHEM_TABLE_JSON,
} QvThermochemTableFormat;

/* What a table says: the numbers and where they came from. */
typedef struct {
  const char *program;          /* "quaver thermo": the text header's first
                                   words, and with the version JSON "program" */
  const char *input;            /* the input file, or "demo" */
  const char *formula;
  const QvGasMolecule *mol;
  const QvGasThermoOptions *opt;
  const char *sigma_source;     /* "given", "from point group C2v", … */
  gboolean sweep;               /* @th is a sweep: one row per temperature */
  gsize n_t;
  const QvGasThermo *th;        /* n_t */
  const QvGasMode *modes;       /* mol->n_modes at th[0] (the per-vibration
                                   table), or NULL */
  char **notes;                 /* NULL-terminated, or NULL */
} QvThermochemReport;

/* The whole output in @format, newly allocated:
 *   text  the header, then the sweep or the term table at th[0], then the
 *         per-vibration table when @modes is given;
 *   csv   the sweep when @sweep, else the per-vibration table when @modes
 *         is given, else the term table;
 *   json  everything. */
char *qv_thermochem_table_write (const QvThermochemReport *report, QvThermochemTableFormat format);

/* "text", "csv" or "json" (any case); QV_ERROR_USAGE naming them otherwise. */
gboolean qv_thermochem_table_format_parse (const char *text, QvThermochemTableFormat *format,
                                           GError **error);

/* The published source of a soft-mode treatment, e.g. "Grimme, Chem. Eur.
 * J. 18, 9955 (2012)"; "harmonic oscillators" for none. */
const char *qv_thermochem_soft_reference (QvSoftModes soft);

/* The loud warning about imaginary modes left out (NULL without any):
 * "1 imaginary mode (down to 284.81i cm^-1) LEFT OUT of …". */
char *qv_thermochem_imaginary_warning (const QvGasMolecule *mol);

/* The notes a report carries, in this order: a symmetry number given that
 * differs from the point group's (@group_name: the core's name, or NULL
 * when no group was found; @group_sigma its σ; @sigma_given: the user gave
 * opt->symmetry_number), the imaginary warning, modes of zero wavenumber
 * and rigid-body modes left out, and real modes below 100 cm⁻¹ treated as
 * harmonic. NULL-terminated (g_strfreev). */
char **qv_thermochem_notes (const QvGasMolecule *mol, const QvGasThermoOptions *opt,
                            const char *group_name, guint group_sigma, gboolean sigma_given);

G_END_DECLS
