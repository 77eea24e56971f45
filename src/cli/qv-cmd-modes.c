/* qv-cmd-modes.c — `quaver modes`: solve and print the mode table.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdio.h>
#include <string.h>
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
  QvCliInputOptions io = { 0 };
  g_autoptr(QvInput) input = NULL;
  QvSolveOptions solve;
  QvProgress progress = { qv_cli_progress, NULL };
  g_autoptr(QvModeSet) modes = NULL;
  g_autofree char *document = NULL;
  char *projection = NULL, *format = NULL, *output = NULL, *unit = NULL;
  char *hessian = NULL, *units = NULL, *layout = NULL, *masses = NULL, *method = NULL;
  char **isotopes = NULL, **mass_overrides = NULL;
  gint64 lowest = 0, level = 0;
  double temperature = 298.15;
  gboolean force = FALSE, demo = FALSE, vectors = FALSE;
  QvModeReport report = { 0 };
  QvTableFormat table_format = QV_TABLE_TEXT;
  int status = QV_EXIT_OK;
  GOptionEntry entries[] = {
    { "hessian", 'H', 0, G_OPTION_ARG_FILENAME, &hessian, "Hessian file: text or NumPy .npy", "FILE" },
    { "hessian-units", 'u', 0, G_OPTION_ARG_STRING, &units,
      "Units of the Hessian: eV/A^2, hartree/bohr^2, kcal/mol/A^2, kJ/mol/A^2, mdyn/A, aJ/A^2, N/m", "UNIT" },
    { "hessian-layout", 0, 0, G_OPTION_ARG_STRING, &layout,
      "Text layout: auto (default, from the row lengths), full, lower, upper", "LAYOUT" },
    { "project", 'p', 0, G_OPTION_ARG_STRING, &projection,
      "Rigid-body motion to remove: full (default), translations, none", "WHAT" },
    { "lowest", 'k', 0, G_OPTION_ARG_INT64, &lowest, "Solve only the lowest K modes (faster)", "K" },
    { "lowest-method", 0, 0, G_OPTION_ARG_STRING, &method,
      "How --lowest solves: auto (default), lapack (dsyevr), lanczos (shift-invert, checked, falls back to lapack)", "HOW" },
    { "level", 'v', 0, G_OPTION_ARG_INT64, &level, "Vibrational level v of the turning points (default 0)", "V" },
    { "temperature", 'T', 0, G_OPTION_ARG_DOUBLE, &temperature,
      "Temperature of the thermal RMS amplitude in K (default 298.15)", "T" },
    { "masses", 0, 0, G_OPTION_ARG_STRING, &masses,
      "isotopic (most abundant isotope, default) or average (standard atomic weights)", "MODEL" },
    { "isotope", 'i', 0, G_OPTION_ARG_STRING_ARRAY, &isotopes,
      "Give an atom an isotope, e.g. 3=2 for deuterium on atom 3 (repeatable)", "ATOM=A" },
    { "mass", 'm', 0, G_OPTION_ARG_STRING_ARRAY, &mass_overrides,
      "Give an atom a mass in u (repeatable)", "ATOM=MASS" },
    { "unit", 0, 0, G_OPTION_ARG_STRING, &unit, "Frequency column of text tables: cm-1 (default), THz, meV", "UNIT" },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format, "text (default), csv, json, markdown", "FORMAT" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "Write to FILE instead of standard output", "FILE" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Replace an existing output file", NULL },
    { "vectors", 0, 0, G_OPTION_ARG_NONE, &vectors, "JSON: include each mode's Cartesian displacement vector", NULL },
    { "demo", 0, 0, G_OPTION_ARG_NONE, &demo, "Use the built-in demo (invented data) as input", NULL },
    { NULL }
  };

  qv_solve_options_init (&solve);
  g_set_prgname ("quaver modes");
  context = g_option_context_new ("GEOMETRY");
  g_option_context_set_description (context, modes_description);
  g_option_context_add_main_entries (context, entries, NULL);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    {
      status = qv_cli_fail ("modes", error);
      goto out;
    }
  if (argc > 2 || (argc == 2 && demo) || (argc < 2 && !demo))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   argc > 2 ? "modes takes one GEOMETRY, got %d" :
                   demo ? "--demo replaces GEOMETRY; give one or the other" :
                   "modes needs a GEOMETRY file (or --demo)", argc - 1);
      status = qv_cli_fail ("modes", error);
      goto out;
    }
  if ((projection && !qv_projection_parse (projection, &solve.projection, &error))
      || (format && !qv_table_format_parse (format, &table_format, &error))
      || (unit && !qv_frequency_unit_parse (unit, &report.unit, &error))
      || (method && !qv_lowest_method_parse (method, &solve.lowest_method, &error)))
    {
      status = qv_cli_fail ("modes", error);
      goto out;
    }
  if (lowest < 0 || level < 0 || level > 10000 || !(temperature >= 0 && temperature < 1e7))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   lowest < 0 ? "--lowest must be a positive number of modes" :
                   (level < 0 || level > 10000) ? "--level must be a whole number from 0 to 10000" :
                   "--temperature must be a temperature in K, 0 or more");
      status = qv_cli_fail ("modes", error);
      goto out;
    }

  io.geometry = argc == 2 ? argv[1] : NULL;
  io.demo = demo;
  io.hessian = hessian;
  io.hessian_units = units;
  io.hessian_layout = layout;
  io.masses = masses;
  io.isotopes = isotopes;
  io.mass_overrides = mass_overrides;
  io.all_modes = lowest == 0;
  input = qv_cli_input_load (&io, &error);
  if (input == NULL)
    {
      status = qv_cli_fail ("modes", error);
      goto out;
    }

  if (input->hessian)
    {
      solve.lowest = (gsize) lowest;
      modes = qv_solve (input->structure, g_steal_pointer (&input->hessian), &solve, &progress, &error);
      if (modes == NULL)
        {
          status = qv_cli_fail ("modes", error);
          goto out;
        }
    }
  else
    modes = g_steal_pointer (&input->modes);

  report.structure = input->structure;
  report.modes = modes;
  report.level = (guint) level;
  report.temperature = temperature;
  report.vectors = vectors;
  report.hessian_source = input->hessian_source;
  report.hessian_units = input->hessian_units;
  report.layout = input->layout;
  report.mass_model = input->mass_model;
  document = qv_mode_table_format (&report, table_format);

  if (output)
    {
      if (!qv_output_write (output, document, strlen (document), force, &error))
        status = qv_cli_fail ("modes", error);
    }
  else if (fputs (document, stdout) < 0 || fflush (stdout) != 0)
    {
      g_printerr ("quaver: cannot write to standard output\n");
      status = QV_EXIT_WRITE;
    }

out:
  g_free (projection); g_free (format); g_free (output); g_free (unit);
  g_free (hessian); g_free (units); g_free (layout); g_free (masses); g_free (method);
  g_strfreev (isotopes); g_strfreev (mass_overrides);
  return status;
}
