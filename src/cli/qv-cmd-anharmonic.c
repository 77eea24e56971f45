/* qv-cmd-anharmonic.c — `quaver anharmonic`: vibrational levels on the
 * potential of a scan (or a two-mode grid) that `quaver displace` wrote,
 * from the energies the user's electronic-structure code computed for it.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-cli.h"
#include "qv-energy-file.h"
#include "qv-error.h"
#include "qv-scan-energies.h"
#include "qv-scan-levels-table.h"
#include "qv-scan-potential.h"

static const char anharmonic_description[] =
  "Vibrational levels along a normal mode beyond the harmonic approximation.\n"
  "MANIFEST is the manifest.json (or its directory) of a scan along one mode\n"
  "('quaver displace --scan N') or of a grid over two ('--grid N'); the\n"
  "energies of its structures come back from your electronic-structure code\n"
  "either as energy= on the comment line of each extended XYZ file (eV, the\n"
  "extended XYZ convention, unless --energy-units says otherwise) or, with\n"
  "--energies FILE, as lines 'NAME ENERGY' ('#' starts a comment) in the unit\n"
  "given by --energy-units (required then: hartree, eV, kcal/mol, kJ/mol,\n"
  "cm^-1). NAME is the structure's file name in the manifest, with or without\n"
  "'.xyz'; for a multi-frame file, FILE@K for frame K (from 0). Every\n"
  "structure needs exactly one energy; missing, repeated, unknown or\n"
  "non-finite ones are named, and an XYZ file whose atoms are off the line of\n"
  "the scan (more than --geometry-tolerance A) is refused (exit 2).\n"
  "\n"
  "V(Q) along the mass-weighted normal coordinate Q (u^1/2 A, the Q of the\n"
  "manifest) is a least-squares polynomial (--degree N; default from the\n"
  "number of points, leaving at least one for the residual, which is\n"
  "reported) or a natural cubic spline through the points (--spline; bicubic\n"
  "on a grid). It is never extrapolated: the grid of the solver stays inside\n"
  "the scanned range. The Schroedinger equation in Q (unit mass) is solved\n"
  "with the sinc DVR of Colbert & Miller (J. Chem. Phys. 96, 1982, 1992) on\n"
  "grids refined until the levels change by less than 1e-6 cm^-1. The\n"
  "wavefunctions vanish at the ends of the scan (the DVR of a finite\n"
  "interval): a level that reaches them is a level of that box, and flagged.\n"
  "\n"
  "Reported: the levels E_0..E_n (--levels, default 6) above the minimum of\n"
  "V, the anharmonic fundamental E_1-E_0 and first overtone E_2-E_0, the\n"
  "harmonic wavenumber from the curvature at the minimum, omega_e and the\n"
  "anharmonicity constant omega_e x_e from E_v = omega_e (v+1/2) -\n"
  "omega_e x_e (v+1/2)^2 through the lowest three levels, and per level <Q>,\n"
  "the outer classical turning points and the weight of the wavefunction near\n"
  "the grid's edge. Warnings: a level above the highest scanned energy or\n"
  "with weight at the edge (the scan is too short), a grid that did not\n"
  "converge, a minimum at the scan's end, a double well (both minima, the\n"
  "barrier and the tunnelling splitting E_1-E_0 are reported). For a grid:\n"
  "the coupled fundamentals, the two levels most strongly linked to the\n"
  "ground state through Q1 and Q2, and the harmonic values from the 2x2\n"
  "curvature at the minimum.\n"
  "\n"
  "A rectilinear normal coordinate describes a torsion or another large\n"
  "curvilinear motion only at small amplitude.\n"
  "\n"
  "Output (--format): text (default), csv (the level table), json (all).\n"
  "-o FILE writes it atomically (an existing file only with --force).\n"
  "\n"
  "Examples:\n"
  "  quaver displace mol.quaver.json --mode 7 --scan 15 --q 4 -o scan7\n"
  "  (run the structures, add energy=... to each comment line)\n"
  "  quaver anharmonic scan7\n"
  "  quaver anharmonic scan7/manifest.json --energies scan7.txt --energy-units hartree\n"
  "  quaver anharmonic grid --energies e.txt --energy-units eV --spline -f json -o grid.json\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.\n"
  "The levels are only as good as the energies, the coordinate and the fit:\n"
  "validate them before relying on them.";



int
qv_cmd_anharmonic (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  char *energies = NULL, *units_arg = NULL, *format_arg = NULL, *output = NULL;
  gint degree = 0, n_levels = 6;
  double geometry_tolerance = QV_SCAN_GEOMETRY_TOLERANCE;
  gboolean spline = FALSE, force = FALSE;
  QvEnergyUnit unit = QV_ENERGY_UNIT_EV;
  g_autofree char *text = NULL;
  g_autoptr(QvScanEnergies) scan = NULL;
  g_autoptr(QvScanPotential) potential = NULL;
  g_autoptr(QvScanLevels) levels = NULL;
  QvScanEnergiesOptions scan_options;
  QvScanLevelsReport report = { 0 };
  QvScanLevelsTableFormat format = QV_SCAN_LEVELS_TABLE_TEXT;
  int status = QV_EXIT_OK;
  GOptionEntry entries[] = {
    { "energies", 'e', 0, G_OPTION_ARG_FILENAME, &energies,
      "Energies as 'NAME ENERGY' lines (default: energy= of each XYZ file)", "FILE" },
    { "energy-units", 'u', 0, G_OPTION_ARG_STRING, &units_arg,
      "Unit of the energies: hartree, eV, kcal/mol, kJ/mol, cm^-1", "UNIT" },
    { "degree", 'd', 0, G_OPTION_ARG_INT, &degree,
      "Polynomial degree of V(Q) (default from the number of points)", "N" },
    { "spline", 0, 0, G_OPTION_ARG_NONE, &spline,
      "A natural cubic spline through the points instead (bicubic on a grid)", NULL },
    { "levels", 0, 0, G_OPTION_ARG_INT, &n_levels, "Levels to report, from v = 0 (default 6)", "N" },
    { "geometry-tolerance", 0, 0, G_OPTION_ARG_DOUBLE, &geometry_tolerance,
      "Largest distance (A) of an atom from the scan's line (default 1e-4)", "A" },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format_arg, "text (default), csv or json", "FORMAT" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "Write to FILE instead of standard output",
      "FILE" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Replace an existing output file", NULL },
    { NULL }
  };

  g_set_prgname ("quaver anharmonic");
  context = g_option_context_new ("MANIFEST");
  g_option_context_set_summary (context, "Anharmonic vibrational levels on the potential of a "
                                "scan or a two-mode grid.");
  g_option_context_set_description (context, anharmonic_description);
  g_option_context_add_main_entries (context, entries, NULL);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    {
      status = qv_cli_fail ("anharmonic", error);
      goto out;
    }
  if (argc != 2)
    {
      status = qv_cli_fail_usage ("anharmonic", argc < 2 ? "anharmonic needs the MANIFEST of a scan (manifest.json or its "
                      "directory)" : "anharmonic takes one MANIFEST, got %d", argc - 1);
      goto out;
    }
  if (format_arg)
    {
      if (g_ascii_strcasecmp (format_arg, "csv") == 0)
        format = QV_SCAN_LEVELS_TABLE_CSV;
      else if (g_ascii_strcasecmp (format_arg, "json") == 0)
        format = QV_SCAN_LEVELS_TABLE_JSON;
      else if (g_ascii_strcasecmp (format_arg, "text") != 0)
        {
          status = qv_cli_fail_usage ("anharmonic", "unknown format '%s'; accepted: text, csv, json", format_arg);
          goto out;
        }
    }
  if (spline && degree)
    {
      status = qv_cli_fail_usage ("anharmonic", "give --degree N or --spline, not both");
      goto out;
    }
  if (degree && (degree < 2 || degree > QV_SCAN_MAX_DEGREE))
    {
      status = qv_cli_fail_usage ("anharmonic", "--degree must be from 2 to %d, got %d", QV_SCAN_MAX_DEGREE, degree);
      goto out;
    }
  if (n_levels < 3 || n_levels > 200)
    {
      status = qv_cli_fail_usage ("anharmonic", "--levels must be from 3 to 200 (the fundamental and overtone need three), "
                      "got %d", n_levels);
      goto out;
    }
  if (!(geometry_tolerance > 0) || !isfinite (geometry_tolerance))
    {
      status = qv_cli_fail_usage ("anharmonic", "--geometry-tolerance must be a positive distance in A");
      goto out;
    }
  if (units_arg && !qv_energy_unit_parse (units_arg, &unit, &error))
    {
      status = qv_cli_fail ("anharmonic", error);
      goto out;
    }
  if (energies && units_arg == NULL)
    {
      status = qv_cli_fail_usage ("anharmonic", "--energies needs --energy-units (%s): the unit is never guessed",
                      qv_energy_unit_list ());
      goto out;
    }

  /* the manifest, its structures and their energies (qv-scan-energies.h) */
  qv_scan_energies_options_init (&scan_options);
  scan_options.energies = energies;
  scan_options.unit_given = units_arg != NULL;
  scan_options.unit = unit;
  scan_options.geometry_tolerance = geometry_tolerance;
  scan = qv_scan_energies_read (argv[1], &scan_options, &error);
  if (scan == NULL)
    {
      status = qv_cli_fail ("anharmonic", error);
      goto out;
    }

  /* V(Q) and the levels */
  potential = qv_scan_energies_potential (scan, spline ? QV_SCAN_FIT_SPLINE
                                          : QV_SCAN_FIT_POLYNOMIAL, (guint) degree, &error);
  if (potential == NULL)
    {
      status = qv_cli_fail ("anharmonic", error);
      goto out;
    }
  levels = qv_scan_potential_solve (potential, (gsize) n_levels, 0, 0, &error);
  if (levels == NULL)
    {
      status = qv_cli_fail ("anharmonic", error);
      goto out;
    }

  qv_scan_levels_report_init (&report, scan, potential, levels);
  for (guint k = 0; k < report.warnings->len; k++)
    g_printerr ("quaver: warning: %s\n", (const char *) g_ptr_array_index (report.warnings, k));
  text = qv_scan_levels_table_write (&report, format);
  status = qv_cli_emit ("anharmonic", output, text, force);
  qv_scan_levels_report_clear (&report);

out:
  g_free (energies); g_free (units_arg); g_free (format_arg); g_free (output);
  return status;
}
