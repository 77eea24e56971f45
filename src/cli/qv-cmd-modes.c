/* qv-cmd-modes.c — `quaver modes`: solve and print the mode table.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-cli-solve.h"
#include "qv-cli.h"
#include "qv-error.h"
#include "qv-mode-character.h"
#include "qv-mode-table.h"
#include "qv-npy-writer.h"
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
  "--character adds what each mode is made of: bonds, angles, dihedrals and\n"
  "out-of-plane angles are found from covalent radii, and each mode's normalised\n"
  "potential energy distribution over them (Morino & Kuchitsu 1952) is grouped\n"
  "into families, largest first (\"C-H stretch 82 %, H-C-H bend 11 %\"): one\n"
  "line per mode under the text table, a \"character\" object per mode and the\n"
  "\"internal_coordinates\" in JSON. It needs every mode (not --lowest).\n"
  "\n"
  "GEOMETRY is an XYZ or extended XYZ file (then --hessian and --hessian-units\n"
  "are required) or a Quaver bundle (*.quaver.json) that carries its Hessian.\n"
  "Atoms in --isotope and --mass count from 1.\n"
  "\n"
  "--distributed solves over the ranks of 'mpirun -n P' with ScaLAPACK (pdsyevd\n"
  "for every mode, pdsyevr for --lowest K) in a build with -Dmpi=enabled: each\n"
  "rank reads only its blocks of a .npy Hessian (convert text once with 'quaver\n"
  "convert'), rank 0 receives the vectors of the table's modes and writes the\n"
  "same table as a serial run. docs/cluster.md gives the memory per rank.\n"
  "\n"
  "Examples:\n"
  "  quaver modes --demo\n"
  "  quaver modes water.xyz --hessian water.hess --hessian-units hartree/bohr^2\n"
  "  quaver modes mol.quaver.json --level 2 --isotope 3=2 --format json -o modes.json\n"
  "  quaver modes big.xyz --hessian big.npy --hessian-units eV/A^2 --lowest 20\n"
  "  quaver modes --demo --character\n"
  "  quaver convert big.hess --atoms 1500 -o big.npy\n"
  "  mpirun -n 4 quaver modes big.xyz --hessian big.npy --hessian-units eV/A^2 --distributed\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.\n"
  "Harmonic modes are an approximation: validate them before relying on them.";

/* The text form of --character: the method, the coordinate set, then one
 * line per mode with its families, largest first. */
static char *
character_text (const QvModeCharacter *c, const QvModeSet *modes)
{
  const QvInternalCoordinates *ic = qv_mode_character_coordinates (c);
  GString *s = g_string_new ("\n# Internal-coordinate make-up: " QV_MODE_CHARACTER_METHOD "\n# ");

  g_string_append (s, QV_MODE_CHARACTER_REFERENCE);
  g_string_append_printf (s, "\n# %zu coordinates (%zu stretches, %zu bends, %zu linear bends, "
                          "%zu torsions, %zu out-of-plane), %zu independent\n",
                          ic->n_coordinates, qv_internal_coordinates_count (ic, QV_INTERNAL_STRETCH),
                          qv_internal_coordinates_count (ic, QV_INTERNAL_BEND),
                          qv_internal_coordinates_count (ic, QV_INTERNAL_LINEAR_BEND),
                          qv_internal_coordinates_count (ic, QV_INTERNAL_TORSION),
                          qv_internal_coordinates_count (ic, QV_INTERNAL_OUT_OF_PLANE),
                          qv_mode_character_rank (c));
  for (char *const *n = qv_mode_character_notes (c); *n; n++)
    g_string_append_printf (s, "# note: %s\n", *n);
  g_string_append (s, "# mode  wavenumber/cm-1  make-up (families of at least 0.5 %; "
                   "JSON lists every coordinate)\n");
  for (gsize k = 0; k < modes->n_modes; k++)
    {
      g_autofree char *line = qv_mode_character_summary (c, k, 0);
      double nu = qv_mode_set_wavenumber (modes, k);
      g_string_append_printf (s, "%6zu  %14.2f%s  %s\n", k + 1, fabs (nu),
                              qv_mode_set_is_imaginary (modes, k) ? "i" : " ", line);
    }
  return g_string_free (s, FALSE);
}

/* --save-vectors and --save-eigenvalues: the mode set's own numbers as
 * .npy, for scripts (and the distributed tests) that want every digit. */
static int
save_arrays (const QvModeSet *modes, const char *vectors, const char *eigenvalues, gboolean force)
{
  const gsize n = 3 * modes->n_atoms;
  g_autoptr(GError) error = NULL;

  for (int i = 0; i < 2; i++)
    {
      const char *path = i == 0 ? vectors : eigenvalues;
      g_autofree char *image = NULL;
      gsize length = 0;

      if (path == NULL)
        continue;
      /* row k of the vectors file is column k of the column-major set */
      image = i == 0 ? qv_npy_format (modes->vectors, modes->n_modes, n, n, 1, &length)
                     : qv_npy_format (modes->eigenvalues, modes->n_modes, 0, 1, 0, &length);
      if (!qv_output_write (path, image, length, force, &error))
        return qv_cli_fail ("modes", error);
    }
  return QV_EXIT_OK;
}

int
qv_cmd_modes (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  QvCliSolveArgs solve = { 0 };
  g_autoptr(QvInput) input = NULL;
  g_autoptr(QvModeSet) modes = NULL;
  g_autoptr(QvModeCharacter) make_up = NULL;
  g_autofree char *document = NULL;
  char *format = NULL, *output = NULL, *unit = NULL;
  char *save_vectors = NULL, *save_eigenvalues = NULL;
  gint64 level = 0;
  double temperature = 298.15;
  gboolean force = FALSE, vectors = FALSE, character = FALSE;
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
    { "character", 0, 0, G_OPTION_ARG_NONE, &character,
      "Each mode's make-up by internal coordinates (text and JSON)", NULL },
    { "save-vectors", 0, 0, G_OPTION_ARG_FILENAME, &save_vectors,
      "Also write the table's mode vectors to FILE as NumPy .npy (modes × 3N, mass weighted, orthonormal)", "FILE" },
    { "save-eigenvalues", 0, 0, G_OPTION_ARG_FILENAME, &save_eigenvalues,
      "Also write the table's eigenvalues to FILE as NumPy .npy (eV/(A^2 u))", "FILE" },
    { NULL }
  };

  g_set_prgname ("quaver modes");
  context = g_option_context_new ("GEOMETRY");
  g_option_context_set_description (context, modes_description);
  solve.offer_distributed = TRUE;
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
  if (character && table_format != QV_TABLE_TEXT && table_format != QV_TABLE_JSON)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   "--character is written with --format text or json; drop --character "
                   "or choose one of those");
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

  solve.want_symmetry = TRUE;
  modes = qv_cli_solve (&solve, argc == 2 ? argv[1] : NULL, &input, &error);
  if (modes == NULL && error == NULL)
    goto out;   /* --distributed: rank 0 writes */
  if (modes == NULL)
    {
      status = qv_cli_fail ("modes", error);
      goto out;
    }

  qv_cli_solve_report (&report, input, modes);
  qv_cli_solve_report_symmetry (&report, &solve);
  report.level = (guint) level;
  report.temperature = temperature;
  report.vectors = vectors;
  if (character)
    {
      make_up = qv_mode_character_new (input->structure, modes, NULL, &error);
      if (make_up == NULL)
        {
          status = qv_cli_fail ("modes", error);
          goto out;
        }
      report.character = make_up;
    }
  document = qv_mode_table_format (&report, table_format);
  if (character && table_format == QV_TABLE_TEXT)
    {
      g_autofree char *table = g_steal_pointer (&document);
      g_autofree char *extra = character_text (make_up, modes);
      document = g_strconcat (table, extra, NULL);
    }
  status = qv_cli_emit ("modes", output, document, force);
  if (status == QV_EXIT_OK && (save_vectors || save_eigenvalues))
    status = save_arrays (modes, save_vectors, save_eigenvalues, force);

out:
  g_free (format); g_free (output); g_free (unit);
  g_free (save_vectors); g_free (save_eigenvalues);
  qv_cli_solve_args_clear (&solve);
  return status;
}
