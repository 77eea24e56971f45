/* qv-cmd-displace.c — `quaver displace`: structures displaced along normal
 * modes, written into a directory with a manifest.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-cli-amplitude.h"
#include "qv-cli-solve.h"
#include "qv-displacement.h"
#include "qv-error.h"
#include "qv-export.h"
#include "qv-manifest.h"
#include "qv-xyz.h"

static const char displace_description[] =
  "Writes copies of GEOMETRY pushed along one or two normal modes, for the\n"
  "next calculation: a pair at -A and +A (the default), a scan of N points\n"
  "from -A to +A, an N x N grid over two modes, the classical turning points\n"
  "of the levels 0..v, or an 'escape' pair along an imaginary mode (the usual\n"
  "start for re-optimising off a saddle point or for a reaction path).\n"
  "\n"
  "Modes are numbered from 1 as in 'quaver modes' (lowest first, imaginary\n"
  "modes first of all). The atom a of the structure moves by\n"
  "    dr_a = Q * l_a / sqrt(m_a)\n"
  "where l is the mass-weighted unit mode vector. Give the amplitude A in one\n"
  "of four units:\n"
  "  --Q A                  mass-weighted normal coordinate, u^1/2 A\n"
  "  --q A                  dimensionless q = Q sqrt(omega/hbar)\n"
  "  --max-displacement A   the atom that moves most moves A angstrom\n"
  "  --turning-point[=M]    M times the classical turning point\n"
  "                         Q_tp = sqrt((2v+1) hbar/omega) of level --level v\n"
  "                         (M = 1 when left out; note the '=')\n"
  "Without one, real modes go to one turning point of level v; the escape pair\n"
  "goes 0.1 A on the atom that moves most (the note in the output says why).\n"
  "Imaginary modes have no turning point, so --q and --turning-point do not\n"
  "apply to them: use --Q or --max-displacement.\n"
  "\n"
  "Output: -o DIR, a new or empty directory (an existing non-empty one only\n"
  "with --force). One file per structure, or --single-file for one\n"
  "multi-frame XYZ. Each structure's comment line carries the mode, q, Q, the\n"
  "largest atomic displacement in A and the level; DIR/manifest.json lists\n"
  "every file with its amplitudes in all units and the SHA-256 of the inputs,\n"
  "and is written last: a directory without it is an export that failed.\n"
  "Periodic structures keep their cell (extended XYZ Lattice and pbc).\n"
  "\n"
  "Examples:\n"
  "  quaver displace --demo --mode 1 -o pair\n"
  "  quaver displace mol.xyz -H mol.hess -u eV/A^2 --mode 7 --scan 11 --q 2 -o scan7\n"
  "  quaver displace mol.quaver.json --modes 7,8 --grid 5 --max-displacement 0.05 -o grid\n"
  "  quaver displace mol.quaver.json --mode 9 --levels --level 3 --single-file -o tp9\n"
  "  quaver displace ts.quaver.json --mode 1 --escape -o escape\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.\n"
  "Harmonic displacements are an approximation: validate them before relying on them.";

/* "7", "7,8" or several --mode options: 1-based numbers into @out. */
static gboolean
parse_modes (char **mode_args, const char *modes_arg, GArray *out, GError **error)
{
  g_autoptr(GPtrArray) parts = g_ptr_array_new_with_free_func (g_free);

  for (char **p = mode_args; p && *p; p++)
    g_ptr_array_add (parts, g_strdup (*p));
  if (modes_arg)
    {
      g_auto(GStrv) split = g_strsplit (modes_arg, ",", -1);
      for (char **p = split; *p; p++)
        g_ptr_array_add (parts, g_strdup (g_strstrip (*p)));
    }
  for (guint i = 0; i < parts->len; i++)
    {
      const char *text = parts->pdata[i];
      char *end = NULL;
      guint64 v = g_ascii_strtoull (text, &end, 10);

      if (end == text || *end != '\0' || v < 1 || v > G_MAXUINT)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "a mode is a number from 1 (as in 'quaver modes'), got '%s'", text);
          return FALSE;
        }
      {
        gsize k = (gsize) v - 1;
        g_array_append_val (out, k);
      }
    }
  return TRUE;
}

static void
print_row (const char *name, const QvDisplaced *d)
{
  for (guint i = 0; i < d->n_amplitudes; i++)
    {
      const QvAmplitude *a = &d->amplitudes[i];
      char q[32], tp[32];

      if (isfinite (a->q))
        g_snprintf (q, sizeof q, "%.4f", a->q);
      else
        g_strlcpy (q, "-", sizeof q);
      if (isfinite (a->turning_multiple))
        g_snprintf (tp, sizeof tp, "%.4f", a->turning_multiple);
      else
        g_strlcpy (tp, "-", sizeof tp);
      char v[16];

      if (isfinite (a->turning_multiple))
        g_snprintf (v, sizeof v, "%u", a->level);
      else
        g_strlcpy (v, "-", sizeof v);
      printf ("%-34s %5" G_GSIZE_FORMAT " %10s %11.6f %10.6f %5" G_GSIZE_FORMAT " %4s %8s\n",
              i == 0 ? name : "", a->mode + 1, q, a->Q, a->max_displacement, a->max_atom + 1,
              v, tp);
    }
}

static int
usage (GError **error, const char *format, ...) G_GNUC_PRINTF (2, 3);

static int
usage (GError **error, const char *format, ...)
{
  va_list args;
  g_autofree char *message = NULL;
  va_start (args, format);
  message = g_strdup_vprintf (format, args);
  va_end (args);
  g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE, message);
  return qv_cli_fail ("displace", *error);
}

int
qv_cmd_displace (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  QvCliSolveArgs solve = { 0 };
  g_autoptr(QvInput) input = NULL;
  g_autoptr(QvModeSet) modes = NULL;
  g_autoptr(QvExport) export_ = NULL;
  const QvDisplacementSet *set = NULL;
  g_autoptr(QvManifest) manifest = NULL;
  g_autoptr(GArray) mode_list = g_array_new (FALSE, FALSE, sizeof (gsize));
  g_auto(GStrv) original = g_strdupv (argv);
  char **mode_args = NULL, *modes_arg = NULL, *output = NULL, *format = NULL;
  QvCliAmplitude amp;
  gint64 scan = -1, grid = -1;
  gboolean pair = FALSE, levels = FALSE, escape = FALSE, single = FALSE, force = FALSE;
  gboolean exact = FALSE;
  QvDisplaceRequest request;
  QvExportFormat xformat;
  QvXyzStyle style = QV_XYZ_EXTENDED;
  const char *geometry = NULL;
  int status = QV_EXIT_OK, n_units, n_kinds;
  GOptionGroup *group;
  GOptionEntry entries[] = {
    { "mode", 'n', 0, G_OPTION_ARG_STRING_ARRAY, &mode_args,
      "Mode to displace along, numbered from 1 as in 'quaver modes' (twice for --grid)", "N" },
    { "modes", 0, 0, G_OPTION_ARG_STRING, &modes_arg, "Two modes for --grid, e.g. 7,8", "N,M" },
    { "pair", 0, 0, G_OPTION_ARG_NONE, &pair, "Two structures, -A and +A (the default)", NULL },
    { "scan", 0, 0, G_OPTION_ARG_INT64, &scan, "N points from -A to +A, N odd so 0 is one", "N" },
    { "grid", 0, 0, G_OPTION_ARG_INT64, &grid, "N x N points over two modes, each -A to +A, N odd", "N" },
    { "levels", 0, 0, G_OPTION_ARG_NONE, &levels, "The turning points -Q_tp, +Q_tp of levels 0..v", NULL },
    { "escape", 0, 0, G_OPTION_ARG_NONE, &escape,
      "A pair along an imaginary mode (default 0.1 A on the atom that moves most)", NULL },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "Directory to write into (new or empty)", "DIR" },
    { "single-file", 0, 0, G_OPTION_ARG_NONE, &single, "All structures in one multi-frame XYZ file", NULL },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format,
      "extxyz (default: extended XYZ with the cell) or xyz (plain; molecules only)", "FORMAT" },
    { "exact", 0, 0, G_OPTION_ARG_NONE, &exact,
      "Coordinates with 17 significant digits (default: 10 decimals)", NULL },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Write into a non-empty directory, replacing files", NULL },
    { NULL }
  };

  g_set_prgname ("quaver displace");
  context = g_option_context_new ("GEOMETRY -o DIR");
  g_option_context_set_description (context, displace_description);
  group = qv_cli_amplitude_group ("displace", &amp, "Vibrational level v of the turning point "
                                  "(default 0; with --levels the highest)");
  g_option_group_add_entries (group, entries);
  g_option_context_set_main_group (context, group);
  solve.offer_distributed = TRUE;
  qv_cli_solve_add_entries (context, &solve);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    {
      status = qv_cli_fail ("displace", error);
      goto out;
    }

  /* the command line as given, for the manifest */
  manifest = qv_manifest_new ("displace");
  for (char **p = original + 1; *p; p++)
    qv_manifest_add_argument (manifest, *p);

  if (argc == 3 && amp.turning && !solve.demo && g_ascii_strtod (argv[2], NULL) != 0.0)
    {
      status = usage (&error, "'%s' after --turning-point is taken as a file; write "
                      "--turning-point=%s", argv[2], argv[2]);
      goto out;
    }
  if (argc > 2 || (argc == 2 && solve.demo) || (argc < 2 && !solve.demo))
    {
      status = usage (&error, argc > 2 ? "displace takes one GEOMETRY, got %d" :
                      solve.demo ? "--demo replaces GEOMETRY; give one or the other" :
                      "displace needs a GEOMETRY file (or --demo)", argc - 1);
      goto out;
    }
  geometry = argc == 2 ? argv[1] : NULL;
  if (output == NULL)
    {
      status = usage (&error, "displace needs -o DIR, the directory to write the structures into");
      goto out;
    }
  if (format)
    {
      if (g_ascii_strcasecmp (format, "xyz") == 0)
        style = QV_XYZ_PLAIN;
      else if (g_ascii_strcasecmp (format, "extxyz") != 0)
        {
          status = usage (&error, "unknown format '%s'; accepted: extxyz, xyz", format);
          goto out;
        }
    }
  if (!parse_modes (mode_args, modes_arg, mode_list, &error))
    {
      status = qv_cli_fail ("displace", error);
      goto out;
    }

  n_units = !isnan (amp.q) + !isnan (amp.Q) + !isnan (amp.angstrom) + amp.turning;
  n_kinds = pair + (scan >= 0) + (grid >= 0) + levels + escape;
  if (n_units > 1)
    {
      status = usage (&error, "give one amplitude: --q, --Q, --max-displacement or "
                      "--turning-point (they are the same amplitude in different units)");
      goto out;
    }
  if (n_kinds > 1)
    {
      status = usage (&error, "choose one kind of output: --pair, --scan N, --grid N, --levels "
                      "or --escape");
      goto out;
    }
  if (amp.level < 0 || amp.level > 1000)
    {
      status = usage (&error, "--level must be a whole number from 0 to 1000");
      goto out;
    }

  qv_displace_request_init (&request);
  request.kind = scan >= 0 ? QV_DISPLACE_SCAN : grid >= 0 ? QV_DISPLACE_GRID
                 : levels ? QV_DISPLACE_LEVELS : escape ? QV_DISPLACE_ESCAPE : QV_DISPLACE_PAIR;
  request.level = (guint) amp.level;
  if (scan >= 0 || grid >= 0)
    {
      gint64 n = scan >= 0 ? scan : grid;
      const char *opt = scan >= 0 ? "scan" : "grid";
      if (n < 3)
        {
          status = usage (&error, "--%s needs at least 3 points (-A, 0, +A), got %" G_GINT64_FORMAT
                          "; give --%s 3 or more (odd)", opt, n, opt);
          goto out;
        }
      if (n % 2 == 0)
        {
          status = usage (&error, "--%s needs an odd number of points so that 0 is one of them, "
                          "got %" G_GINT64_FORMAT "; use %" G_GINT64_FORMAT " or %" G_GINT64_FORMAT,
                          opt, n, n - 1, n + 1);
          goto out;
        }
      if (n > 100001)
        {
          status = usage (&error, "--%s %" G_GINT64_FORMAT " is more points than this writes "
                          "(up to 100001)", opt, n);
          goto out;
        }
      request.points = (guint) n;
    }
  if (mode_list->len == 0)
    {
      status = usage (&error, "give the mode to displace along: --mode N (numbered from 1 as "
                      "in 'quaver modes')%s", grid >= 0 ? ", twice for --grid, or --modes N,M" : "");
      goto out;
    }
  if (request.kind == QV_DISPLACE_GRID && mode_list->len != 2)
    {
      status = usage (&error, "--grid needs two modes (--modes N,M), got %u", mode_list->len);
      goto out;
    }
  if (request.kind != QV_DISPLACE_GRID && mode_list->len != 1)
    {
      status = usage (&error, "--%s takes one mode, got %u; for two modes use --grid N",
                      qv_displace_kind_name (request.kind), mode_list->len);
      goto out;
    }
  request.modes[0] = g_array_index (mode_list, gsize, 0);
  if (mode_list->len > 1)
    request.modes[1] = g_array_index (mode_list, gsize, 1);
  if (!isnan (amp.q))
    request.unit = QV_AMPLITUDE_DIMENSIONLESS, request.value = amp.q;
  else if (!isnan (amp.Q))
    request.unit = QV_AMPLITUDE_MASS_WEIGHTED, request.value = amp.Q;
  else if (!isnan (amp.angstrom))
    request.unit = QV_AMPLITUDE_ANGSTROM, request.value = amp.angstrom;
  else if (amp.turning)
    request.unit = QV_AMPLITUDE_TURNING_POINT, request.value = amp.multiple;
  if (!isnan (request.value) && !(request.value >= 0 && isfinite (request.value)))
    {
      status = usage (&error, "the amplitude must be 0 or more: the structures go to both signs");
      goto out;
    }
  if (request.kind == QV_DISPLACE_LEVELS && n_units && !amp.turning)
    {
      status = usage (&error, "--levels puts the structures at the turning points; the only "
                      "amplitude it takes is --turning-point=M (a multiple of them)");
      goto out;
    }

  modes = qv_cli_solve (&solve, geometry, &input, &error);
  if (modes == NULL && error == NULL)
    goto out;   /* --distributed: rank 0 writes */
  if (modes == NULL)
    {
      status = qv_cli_fail ("displace", error);
      goto out;
    }
  for (guint i = 0; i < mode_list->len; i++)
    {
      const gsize k = g_array_index (mode_list, gsize, i);
      if (k < modes->n_modes && qv_mode_set_is_imaginary (modes, k)
          && (!isnan (amp.q) || amp.turning))
        {
          status = usage (&error, "mode %" G_GSIZE_FORMAT " is imaginary (%.1fi cm^-1): it has no "
                          "turning point, so %s does not apply; give the amplitude with --Q "
                          "(u^1/2 A) or --max-displacement (A)%s", k + 1,
                          fabs (qv_mode_set_wavenumber (modes, k)),
                          !isnan (amp.q) ? "--q" : "--turning-point",
                          escape ? "" : ", or use --escape");
          goto out;
        }
    }
  if (n_units == 0 && request.kind != QV_DISPLACE_ESCAPE && request.kind != QV_DISPLACE_LEVELS
      && request.modes[0] < modes->n_modes && qv_mode_set_is_imaginary (modes, request.modes[0]))
    {
      status = usage (&error, "mode %" G_GSIZE_FORMAT " is imaginary (%.1fi cm^-1) and has no "
                      "turning point to take as the default amplitude; give --Q A or "
                      "--max-displacement A, or use --escape to step off the saddle point",
                      request.modes[0] + 1, fabs (qv_mode_set_wavenumber (modes, request.modes[0])));
      goto out;
    }
  if (style == QV_XYZ_PLAIN && qv_structure_is_periodic (input->structure))
    {
      status = usage (&error, "%s is periodic and plain XYZ has no cell; use --format extxyz "
                      "(the default)", input->name);
      goto out;
    }

  /* the manifest: what was asked and what was read */
  if (!qv_cli_solve_hash_inputs (&solve, geometry, input, manifest, &error))
    {
      status = qv_cli_fail ("displace", error);
      goto out;
    }
  qv_export_format_init (&xformat);
  xformat.style = style;
  xformat.single_file = single;
  xformat.exact = exact;
  export_ = qv_export_new_displace (input->structure, modes, input->mass_model, &request,
                                    &xformat, g_steal_pointer (&manifest), &error);
  if (export_ == NULL)
    {
      status = qv_cli_fail ("displace", error);
      goto out;
    }
  set = qv_export_displacement_set (export_);
  if (set->note)
    g_printerr ("quaver: note: %s\n", set->note);
  if (!qv_export_write (export_, output, force, NULL, &error))
    {
      status = qv_cli_fail ("displace", error);
      goto out;
    }

  printf ("# quaver displace: %" G_GSIZE_FORMAT " structure%s of %s along mode%s %s into %s\n",
          set->n_structures, set->n_structures == 1 ? "" : "s", input->name,
          request.kind == QV_DISPLACE_GRID ? "s" : "",
          ((QvManifestField *) qv_manifest_get (qv_export_manifest (export_)->options, "modes"))->string,
          output);
  printf ("# %-32s %5s %10s %11s %10s %5s %4s %8s\n", "file", "mode", "q", "Q", "max disp",
          "atom", "v", "Q/Q_tp");
  printf ("# %-32s %5s %10s %11s %10s %5s %4s %8s\n", "", "", "", "u^1/2 A", "A", "", "", "");
  for (gsize s = 0; s < set->n_structures; s++)
    {
      const char *name = qv_export_structure_file (export_, s);
      const gboolean first = s == 0 || strcmp (name, qv_export_structure_file (export_, s - 1)) != 0;
      print_row (first ? name : "", &set->structures[s]);
    }
  printf ("# wrote %" G_GSIZE_FORMAT " file%s and manifest.json\n", qv_export_n_files (export_),
          qv_export_n_files (export_) == 1 ? "" : "s");
  if (fflush (stdout) != 0)
    status = QV_EXIT_WRITE;

out:
  g_strfreev (mode_args); g_free (modes_arg); g_free (output); g_free (format);
  qv_cli_solve_args_clear (&solve);
  return status;
}
