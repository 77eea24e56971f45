/* qv-cmd-table.c — `quaver table`: a mode table of chosen columns for papers
 * and reports.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-cli-solve.h"
#include "qv-error.h"
#include "qv-mode-table.h"
#include "qv-output.h"

static const char table_description[] =
  "Solves the harmonic normal modes of GEOMETRY (the same inputs and options\n"
  "as 'quaver modes') and prints a table of the columns you choose, one row\n"
  "per mode, with a caption that states the units, the masses, the level of\n"
  "the turning points, the temperature and any frequency scaling.\n"
  "\n"
  "Columns (--columns, comma separated, in the order given):\n"
  "  index                 mode number, from 1\n"
  "  wavenumber            cm^-1 (or --unit THz/meV), scaled by --scale; 'i' = imaginary\n"
  "  reduced-mass          u\n"
  "  force-constant        mdyn/A\n"
  "  turning-q             classical turning point Q_tp = sqrt((2v+1) hbar/omega), u^1/2 A\n"
  "  turning-displacement  largest atomic displacement at Q_tp (A) and its atom\n"
  "  thermal-rms           largest atomic RMS displacement at --temperature (A)\n"
  "  collectivity          exp(Shannon entropy of the participations)/N\n"
  "  top-atoms             the --top atoms with the largest share of the mode\n"
  "Default: " QV_TABLE_DEFAULT_COLUMNS ".\n"
  "\n"
  "--scale S multiplies the wavenumber column only (an empirical factor for\n"
  "comparing with experiment); the caption, the CSV header and the JSON say so.\n"
  "Formats: text (default), csv, markdown, latex (booktabs: needs\n"
  "\\usepackage{booktabs}), json.\n"
  "\n"
  "Examples:\n"
  "  quaver table --demo --format markdown\n"
  "  quaver table mol.quaver.json --format latex --scale 0.97 -o modes.tex\n"
  "  quaver table mol.xyz -H mol.hess -u hartree/bohr^2 --columns index,wavenumber,top-atoms --top 2\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.\n"
  "Harmonic modes are an approximation: validate them before relying on them.";

int
qv_cmd_table (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  QvCliSolveArgs solve = { 0 };
  g_autoptr(QvInput) input = NULL;
  g_autoptr(QvModeSet) modes = NULL;
  g_autofree char *document = NULL;
  char *format = NULL, *output = NULL, *unit = NULL, *columns_arg = NULL;
  gint64 level = 0, top = 3;
  double temperature = 298.15, scale = 1.0;
  gboolean force = FALSE;
  QvModeReport report = { 0 };
  QvTableFormat table_format = QV_TABLE_TEXT;
  QvTableColumn columns[QV_N_COLUMNS];
  QvTableLayout layout = { 0 };
  int status = QV_EXIT_OK;
  GOptionEntry entries[] = {
    { "columns", 'c', 0, G_OPTION_ARG_STRING, &columns_arg,
      "Columns, comma separated (default " QV_TABLE_DEFAULT_COLUMNS ")", "LIST" },
    { "scale", 's', 0, G_OPTION_ARG_DOUBLE, &scale,
      "Frequency scaling factor for the wavenumber column (default 1: none)", "S" },
    { "level", 'v', 0, G_OPTION_ARG_INT64, &level, "Vibrational level v of the turning points (default 0)", "V" },
    { "temperature", 'T', 0, G_OPTION_ARG_DOUBLE, &temperature,
      "Temperature of the thermal RMS column in K (default 298.15)", "T" },
    { "top", 0, 0, G_OPTION_ARG_INT64, &top, "Atoms listed by top-atoms (default 3)", "N" },
    { "unit", 0, 0, G_OPTION_ARG_STRING, &unit, "Frequency unit: cm-1 (default), THz, meV", "UNIT" },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format, "text (default), csv, markdown, latex, json", "FORMAT" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "Write to FILE instead of standard output", "FILE" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Replace an existing output file", NULL },
    { NULL }
  };

  g_set_prgname ("quaver table");
  context = g_option_context_new ("GEOMETRY");
  g_option_context_set_description (context, table_description);
  g_option_context_add_main_entries (context, entries, NULL);
  solve.offer_distributed = TRUE;
  qv_cli_solve_add_entries (context, &solve);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    {
      status = qv_cli_fail ("table", error);
      goto out;
    }
  if (argc > 2 || (argc == 2 && solve.demo) || (argc < 2 && !solve.demo))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   argc > 2 ? "table takes one GEOMETRY, got %d" :
                   solve.demo ? "--demo replaces GEOMETRY; give one or the other" :
                   "table needs a GEOMETRY file (or --demo)", argc - 1);
      status = qv_cli_fail ("table", error);
      goto out;
    }
  if ((format && !qv_table_format_parse (format, &table_format, &error))
      || (unit && !qv_frequency_unit_parse (unit, &report.unit, &error))
      || !qv_table_columns_parse (columns_arg ? columns_arg : QV_TABLE_DEFAULT_COLUMNS, columns,
                                  &layout.n_columns, &error))
    {
      status = qv_cli_fail ("table", error);
      goto out;
    }
  if (level < 0 || level > 10000 || !(temperature >= 0 && temperature < 1e7)
      || !(scale > 0 && scale < 10) || top < 1 || top > 1000)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "%s",
                   (level < 0 || level > 10000) ? "--level must be a whole number from 0 to 10000" :
                   !(temperature >= 0 && temperature < 1e7) ? "--temperature must be a temperature in K, 0 or more" :
                   !(scale > 0 && scale < 10) ? "--scale must be a positive factor such as 0.97" :
                   "--top must be a number of atoms from 1 to 1000");
      status = qv_cli_fail ("table", error);
      goto out;
    }

  for (gsize i = 0; i < layout.n_columns; i++)
    solve.want_symmetry |= columns[i] == QV_COLUMN_SYMMETRY;
  modes = qv_cli_solve (&solve, argc == 2 ? argv[1] : NULL, &input, &error);
  if (modes == NULL && error == NULL)
    goto out;   /* --distributed: rank 0 writes */
  if (modes == NULL)
    {
      status = qv_cli_fail ("table", error);
      goto out;
    }
  qv_cli_solve_report (&report, input, modes);
  qv_cli_solve_report_symmetry (&report, &solve);
  report.level = (guint) level;
  report.temperature = temperature;
  layout.report = &report;
  layout.columns = columns;
  layout.scale = scale;
  layout.top_atoms = (guint) top;
  document = qv_mode_table_columns (&layout, table_format);
  status = qv_cli_emit ("table", output, document, force);

out:
  g_free (format); g_free (output); g_free (unit); g_free (columns_arg);
  qv_cli_solve_args_clear (&solve);
  return status;
}
