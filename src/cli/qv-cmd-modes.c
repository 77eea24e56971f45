/* qv-cmd-modes.c — `quaver modes`: solve and print the mode table.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdio.h>
#include <string.h>
#include "qv-cli-solve.h"
#include "qv-cli.h"
#include "qv-error.h"
#include "qv-mode-table.h"
#include "qv-output.h"
#include "qv-solver.h"

static const char modes_description[] =
  "Solves the harmonic normal modes of GEOMETRY and prints one row per mode:\n"
  "wavenumber (imaginary modes marked 'i'), reduced mass, force constant, the\n"
  "classical turning point Q_tp = sqrt((2v+1) hbar/omega) of level v with the\n"
  "largest Cartesian displacement it causes and its atom, the largest thermal\n"
  "RMS displacement at T, the atom that moves most (its share of the mode),\n"
  "and how much rotation the rigid-body projection removed from the mode.\n"
  "The header states the units, the Hessian's layout and units, the\n"
  "projection and the rigid-body residuals; warnings say when the geometry or\n"
  "the Hessian looks unconverged. CSV and JSON add the collectivity, the\n"
  "participation of every atom and (--vectors) the displacement vectors.\n"
  "\n"
  "GEOMETRY is an XYZ or extended XYZ file (then --hessian and --hessian-units\n"
  "are required) or a Quaver bundle (*.quaver.json) that carries its Hessian.\n"
  "Atoms in --isotope and --mass count from 1.\n"
  "\n"
  "Examples:\n"
  "  quaver modes --demo\n"
  "  quaver modes water.xyz --hessian water.hess --hessian-units hartree/bohr^2\n"
  "  quaver modes mol.quaver.json --level 2 --isotope 3=2 --format json -o modes.json\n"
  "  quaver modes big.xyz --hessian big.npy --hessian-units eV/A^2 --lowest 20\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.\n"
  "Harmonic modes are an approximation: validate them before relying on them.";

int
qv_cmd_modes (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  QvCliSolveArgs solve = { 0 };
  g_autoptr(QvInput) input = NULL;
  g_autoptr(QvModeSet) modes = NULL;
  g_autofree char *document = NULL;
  char *format = NULL, *output = NULL, *unit = NULL;
  gint64 level = 0;
  double temperature = 298.15;
  gboolean force = FALSE, vectors = FALSE;
  QvModeReport report = { 0 };
  QvTableFormat table_format = QV_TABLE_TEXT;
  int status = QV_EXIT_OK;
  GOptionEntry entries[] = {
    { "level", 'v', 0, G_OPTION_ARG_INT64, &level, "Vibrational level v of the turning points (default 0)", "V" },
    { "temperature", 'T', 0, G_OPTION_ARG_DOUBLE, &temperature,
      "Temperature of the thermal RMS amplitude in K (default 298.15)", "T" },
    { "unit", 0, 0, G_OPTION_ARG_STRING, &unit, "Frequency column of text tables: cm-1 (default), THz, meV", "UNIT" },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format, "text (default), csv, json, markdown, latex", "FORMAT" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "Write to FILE instead of standard output", "FILE" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Replace an existing output file", NULL },
    { "vectors", 0, 0, G_OPTION_ARG_NONE, &vectors, "JSON: include each mode's Cartesian displacement vector", NULL },
    { NULL }
  };

  g_set_prgname ("quaver modes");
  context = g_option_context_new ("GEOMETRY");
  g_option_context_set_description (context, modes_description);
  qv_cli_solve_add_entries (context, &solve);
  g_option_context_add_main_entries (context, entries, NULL);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    {
      status = qv_cli_fail ("modes", error);
      goto out;
    }
  if (argc > 2 || (argc == 2 && solve.demo) || (argc < 2 && !solve.demo))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   argc > 2 ? "modes takes one GEOMETRY, got %d" :
                   solve.demo ? "--demo replaces GEOMETRY; give one or the other" :
                   "modes needs a GEOMETRY file (or --demo)", argc - 1);
      status = qv_cli_fail ("modes", error);
      goto out;
    }
  if ((format && !qv_table_format_parse (format, &table_format, &error))
      || (unit && !qv_frequency_unit_parse (unit, &report.unit, &error)))
    {
      status = qv_cli_fail ("modes", error);
      goto out;
    }
  if (level < 0 || level > 10000 || !(temperature >= 0 && temperature < 1e7))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   (level < 0 || level > 10000) ? "--level must be a whole number from 0 to 10000" :
                   "--temperature must be a temperature in K, 0 or more");
      status = qv_cli_fail ("modes", error);
      goto out;
    }

  modes = qv_cli_solve (&solve, argc == 2 ? argv[1] : NULL, &input, &error);
  if (modes == NULL)
    {
      status = qv_cli_fail ("modes", error);
      goto out;
    }

  qv_cli_solve_report (&report, input, modes);
  report.level = (guint) level;
  report.temperature = temperature;
  report.vectors = vectors;
  document = qv_mode_table_format (&report, table_format);
  status = qv_cli_emit ("modes", output, document, force);

out:
  g_free (format); g_free (output); g_free (unit);
  qv_cli_solve_args_clear (&solve);
  return status;
}
