/* qv-cmd-displace.c — `quaver displace`: structures displaced along normal
 * modes, written into a directory with a manifest.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-cli-solve.h"
#include "qv-displacement.h"
#include "qv-element.h"
#include "qv-error.h"
#include "qv-json-writer.h"
#include "qv-manifest.h"
#include "qv-output-dir.h"
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

typedef struct {
  double multiple;
  gboolean given;
} TurningArg;

static gboolean
parse_turning (const char *name, const char *value, gpointer data, GError **error)
{
  TurningArg *t = data;
  char *end = NULL;

  t->given = TRUE;
  t->multiple = 1.0;
  if (value == NULL)
    return TRUE;
  t->multiple = g_ascii_strtod (value, &end);
  if (end == value || *end != '\0' || !isfinite (t->multiple) || t->multiple < 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "--turning-point takes a multiple of the turning point such as 1 or 0.5, got '%s'",
                   value);
      return FALSE;
    }
  return TRUE;
}

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
append_number (GString *s, double value)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  g_string_append (s, qv_json_format_double (buf, value == 0.0 ? 0.0 : value));
}

/* Comma-joined per-mode values for the comment line. */
typedef enum { F_MODE, F_WAVENUMBER, F_q, F_Q, F_DISP, F_ATOM, F_LEVEL, F_TP } Field;

static char *
joined (const QvDisplaced *d, const QvModeSet *modes, Field field)
{
  GString *s = g_string_new (NULL);

  for (guint i = 0; i < d->n_amplitudes; i++)
    {
      const QvAmplitude *a = &d->amplitudes[i];
      if (i > 0)
        g_string_append_c (s, ',');
      switch (field)
        {
        case F_MODE: g_string_append_printf (s, "%" G_GSIZE_FORMAT, a->mode + 1); break;
        case F_WAVENUMBER: append_number (s, qv_mode_set_wavenumber (modes, a->mode)); break;
        case F_q: append_number (s, a->q); break;
        case F_Q: append_number (s, a->Q); break;
        case F_DISP: append_number (s, a->max_displacement); break;
        case F_ATOM: g_string_append_printf (s, "%" G_GSIZE_FORMAT, a->max_atom + 1); break;
        case F_LEVEL: g_string_append_printf (s, "%u", a->level); break;
        case F_TP: append_number (s, a->turning_multiple); break;
        default: break;
        }
    }
  return g_string_free (s, FALSE);
}

static gboolean
all_defined (const QvDisplaced *d)
{
  for (guint i = 0; i < d->n_amplitudes; i++)
    if (!isfinite (d->amplitudes[i].q))
      return FALSE;
  return TRUE;
}

/* The file name of structure @s (one file per structure), or of the
 * single file (@s < 0). */
static char *
file_name (const QvDisplacementSet *set, const QvDisplaceRequest *r, gssize s)
{
  const gsize m0 = r->modes[0] + 1, m1 = r->modes[1] + 1;
  const int width = set->n_structures > 100 ? (set->n_structures > 1000 ? 5 : 3) : 2;
  const char *sign;

  if (s < 0)
    switch (r->kind)
      {
      case QV_DISPLACE_GRID:
        return g_strdup_printf ("modes%" G_GSIZE_FORMAT "-%" G_GSIZE_FORMAT "-grid.xyz", m0, m1);
      default:
        return g_strdup_printf ("mode%" G_GSIZE_FORMAT "-%s.xyz", m0, qv_displace_kind_name (r->kind));
      }
  sign = set->structures[s].amplitudes[0].Q < 0 ? "minus" : "plus";
  switch (r->kind)
    {
    case QV_DISPLACE_SCAN:
      return g_strdup_printf ("mode%" G_GSIZE_FORMAT "-scan-%0*" G_GSSIZE_FORMAT ".xyz", m0, width, s);
    case QV_DISPLACE_GRID:
      return g_strdup_printf ("modes%" G_GSIZE_FORMAT "-%" G_GSIZE_FORMAT "-grid-%0*u-%0*u.xyz",
                              m0, m1, width, (guint) ((gsize) s / r->points),
                              width, (guint) ((gsize) s % r->points));
    case QV_DISPLACE_LEVELS:
      return g_strdup_printf ("mode%" G_GSIZE_FORMAT "-v%u-%s.xyz", m0,
                              set->structures[s].amplitudes[0].level, sign);
    case QV_DISPLACE_ESCAPE:
      return g_strdup_printf ("mode%" G_GSIZE_FORMAT "-escape-%s.xyz", m0, sign);
    case QV_DISPLACE_PAIR:
    default:
      return g_strdup_printf ("mode%" G_GSIZE_FORMAT "-%s.xyz", m0, sign);
    }
}

/* The key=value pairs of structure @s's comment line; strings in @keep. */
static GArray *
comment_pairs (const QvDisplacementSet *set, const QvModeSet *modes, gsize s, GPtrArray *keep)
{
  const QvDisplaced *d = &set->structures[s];
  GArray *pairs = g_array_new (FALSE, FALSE, sizeof (QvXyzPair));
  const gboolean defined = all_defined (d);
#define ADD(k, v) G_STMT_START { char *v_ = (v); QvXyzPair p_ = { (k), v_ }; \
  g_ptr_array_add (keep, v_); g_array_append_val (pairs, p_); } G_STMT_END

  ADD ("kind", g_strdup (qv_displace_kind_name (set->kind)));
  ADD ("index", g_strdup_printf ("%" G_GSIZE_FORMAT, s));
  ADD ("mode", joined (d, modes, F_MODE));
  ADD ("wavenumber", joined (d, modes, F_WAVENUMBER));
  if (defined)
    ADD ("q", joined (d, modes, F_q));
  ADD ("Q", joined (d, modes, F_Q));
  ADD ("max_displacement", joined (d, modes, F_DISP));
  ADD ("max_atom", joined (d, modes, F_ATOM));
  if (defined)
    {
      ADD ("level", joined (d, modes, F_LEVEL));
      ADD ("turning_point", joined (d, modes, F_TP));
    }
  ADD ("units", g_strdup ("Q:u^1/2_A,max_displacement:A,wavenumber:cm^-1"));
#undef ADD
  return pairs;
}

static void
manifest_frame (QvManifestFrame *frame, const QvDisplacementSet *set, const QvModeSet *modes,
                gsize s)
{
  const QvDisplaced *d = &set->structures[s];

  for (guint i = 0; i < d->n_amplitudes; i++)
    {
      const QvAmplitude *a = &d->amplitudes[i];
      QvManifestAmplitude m = {
        .mode = (guint) a->mode + 1,
        .wavenumber = qv_mode_set_wavenumber (modes, a->mode),
        .q = a->q,
        .Q = a->Q,
        .max_displacement = a->max_displacement,
        .max_atom = (guint) a->max_atom + 1,
        .level = isfinite (a->turning_multiple) ? (gint) a->level : -1,
        .turning_multiple = a->turning_multiple,
      };
      qv_manifest_frame_add_amplitude (frame, &m);
    }
  qv_manifest_set_string (frame->fields, "kind", qv_displace_kind_name (set->kind));
  qv_manifest_set_integer (frame->fields, "structure", (gint64) s);
}

/* TRUE when a mass differs from its element's default (an isotope or a
 * typed mass): then the files carry a masses column so they read back with
 * the same masses. */
static gboolean
has_custom_masses (const QvStructure *s)
{
  for (gsize a = 0; a < s->n_atoms; a++)
    {
      const QvElement *e = qv_element_from_z (s->atoms[a].z);
      if (e == NULL || s->atoms[a].mass != e->isotope_mass)
        return TRUE;
    }
  return FALSE;
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
  g_autoptr(QvDisplacementSet) set = NULL;
  g_autoptr(QvManifest) manifest = NULL;
  g_autoptr(QvOutputDir) dir = NULL;
  g_autoptr(GArray) mode_list = g_array_new (FALSE, FALSE, sizeof (gsize));
  g_autoptr(GPtrArray) keep = g_ptr_array_new_with_free_func (g_free);
  g_autoptr(GArray) frames = g_array_new (FALSE, TRUE, sizeof (QvXyzFrame));
  g_autoptr(GPtrArray) pair_arrays = g_ptr_array_new_with_free_func ((GDestroyNotify) g_array_unref);
  g_auto(GStrv) original = g_strdupv (argv);
  char **mode_args = NULL, *modes_arg = NULL, *output = NULL, *format = NULL;
  double q = NAN, Q = NAN, angstrom = NAN;
  TurningArg turning = { 1.0, FALSE };
  gint64 level = 0, scan = -1, grid = -1;
  gboolean pair = FALSE, levels = FALSE, escape = FALSE, single = FALSE, force = FALSE;
  gboolean exact = FALSE, masses_column;
  QvDisplaceRequest request;
  QvXyzStyle style = QV_XYZ_EXTENDED;
  const char *geometry = NULL;
  int status = QV_EXIT_OK, n_units, n_kinds;
  gsize n_written = 0;
  GOptionGroup *group;
  GOptionEntry entries[] = {
    { "mode", 'n', 0, G_OPTION_ARG_STRING_ARRAY, &mode_args,
      "Mode to displace along, numbered from 1 as in 'quaver modes' (twice for --grid)", "N" },
    { "modes", 0, 0, G_OPTION_ARG_STRING, &modes_arg, "Two modes for --grid, e.g. 7,8", "N,M" },
    { "q", 0, 0, G_OPTION_ARG_DOUBLE, &q, "Amplitude as dimensionless q = Q sqrt(omega/hbar)", "A" },
    { "Q", 0, 0, G_OPTION_ARG_DOUBLE, &Q, "Amplitude as mass-weighted Q in u^1/2 A", "A" },
    { "max-displacement", 'd', 0, G_OPTION_ARG_DOUBLE, &angstrom,
      "Amplitude as the largest atomic displacement in A", "A" },
    { "turning-point", 't', G_OPTION_FLAG_OPTIONAL_ARG, G_OPTION_ARG_CALLBACK, (gpointer) parse_turning,
      "Amplitude as M turning points of level v (M = 1 if left out; write --turning-point=M)", "M" },
    { "level", 'v', 0, G_OPTION_ARG_INT64, &level,
      "Vibrational level v of the turning point (default 0; with --levels the highest)", "V" },
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
  group = g_option_group_new ("displace", "", "", &turning, NULL);
  g_option_group_add_entries (group, entries);
  g_option_context_set_main_group (context, group);
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

  if (argc == 3 && turning.given && !solve.demo && g_ascii_strtod (argv[2], NULL) != 0.0)
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

  n_units = !isnan (q) + !isnan (Q) + !isnan (angstrom) + turning.given;
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
  if (level < 0 || level > 1000)
    {
      status = usage (&error, "--level must be a whole number from 0 to 1000");
      goto out;
    }

  qv_displace_request_init (&request);
  request.kind = scan >= 0 ? QV_DISPLACE_SCAN : grid >= 0 ? QV_DISPLACE_GRID
                 : levels ? QV_DISPLACE_LEVELS : escape ? QV_DISPLACE_ESCAPE : QV_DISPLACE_PAIR;
  request.level = (guint) level;
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
  if (!isnan (q))
    request.unit = QV_AMPLITUDE_DIMENSIONLESS, request.value = q;
  else if (!isnan (Q))
    request.unit = QV_AMPLITUDE_MASS_WEIGHTED, request.value = Q;
  else if (!isnan (angstrom))
    request.unit = QV_AMPLITUDE_ANGSTROM, request.value = angstrom;
  else if (turning.given)
    request.unit = QV_AMPLITUDE_TURNING_POINT, request.value = turning.multiple;
  if (!isnan (request.value) && !(request.value >= 0 && isfinite (request.value)))
    {
      status = usage (&error, "the amplitude must be 0 or more: the structures go to both signs");
      goto out;
    }
  if (request.kind == QV_DISPLACE_LEVELS && n_units && !turning.given)
    {
      status = usage (&error, "--levels puts the structures at the turning points; the only "
                      "amplitude it takes is --turning-point=M (a multiple of them)");
      goto out;
    }

  modes = qv_cli_solve (&solve, geometry, &input, &error);
  if (modes == NULL)
    {
      status = qv_cli_fail ("displace", error);
      goto out;
    }
  for (guint i = 0; i < mode_list->len; i++)
    {
      const gsize k = g_array_index (mode_list, gsize, i);
      if (k < modes->n_modes && qv_mode_set_is_imaginary (modes, k)
          && (!isnan (q) || turning.given))
        {
          status = usage (&error, "mode %" G_GSIZE_FORMAT " is imaginary (%.1fi cm^-1): it has no "
                          "turning point, so %s does not apply; give the amplitude with --Q "
                          "(u^1/2 A) or --max-displacement (A)%s", k + 1,
                          fabs (qv_mode_set_wavenumber (modes, k)),
                          !isnan (q) ? "--q" : "--turning-point",
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

  set = qv_displace (input->structure, modes, &request, &error);
  if (set == NULL)
    {
      status = qv_cli_fail ("displace", error);
      goto out;
    }
  if (set->note)
    g_printerr ("quaver: note: %s\n", set->note);

  /* the manifest: what was asked and what was read */
  if (!qv_cli_solve_hash_inputs (&solve, geometry, input, manifest, &error))
    {
      status = qv_cli_fail ("displace", error);
      goto out;
    }
  manifest->n_atoms = input->structure->n_atoms;
  manifest->formula = qv_structure_formula (input->structure);
  manifest->periodic = qv_structure_is_periodic (input->structure);
  qv_manifest_set_string (manifest->options, "kind", qv_displace_kind_name (request.kind));
  {
    g_autofree char *list = g_strdup_printf ("%" G_GSIZE_FORMAT, request.modes[0] + 1);
    if (request.kind == QV_DISPLACE_GRID)
      {
        g_free (list);
        list = g_strdup_printf ("%" G_GSIZE_FORMAT ",%" G_GSIZE_FORMAT, request.modes[0] + 1,
                                request.modes[1] + 1);
      }
    qv_manifest_set_string (manifest->options, "modes", list);
  }
  if (isnan (request.value))
    qv_manifest_set_string (manifest->options, "amplitude", "default");
  else
    {
      qv_manifest_set_string (manifest->options, "amplitude_unit", qv_amplitude_unit_name (request.unit));
      qv_manifest_set_number (manifest->options, "amplitude", request.value);
    }
  qv_manifest_set_integer (manifest->options, "level", request.level);
  if (request.points)
    qv_manifest_set_integer (manifest->options, "points", request.points);
  qv_manifest_set_string (manifest->options, "format", style == QV_XYZ_PLAIN ? "xyz" : "extxyz");
  qv_manifest_set_boolean (manifest->options, "single_file", single);
  qv_manifest_set_string (manifest->options, "projection", qv_projection_name (modes->projection));
  qv_manifest_set_string (manifest->options, "masses",
                          input->mass_model == QV_MASS_AVERAGE ? "average" : "isotopic");
  if (set->note)
    qv_manifest_add_note (manifest, set->note);
  qv_manifest_add_note (manifest, "Cartesian displacement of atom a: dr_a = Q l_a / sqrt(m_a); "
                        "q = Q sqrt(omega/hbar); turning_point_multiple = Q / Q_tp(level), "
                        "Q_tp = sqrt((2 level + 1) hbar/omega)");

  /* frames */
  masses_column = style == QV_XYZ_EXTENDED && has_custom_masses (input->structure);
  for (gsize s = 0; s < set->n_structures; s++)
    {
      GArray *pairs = comment_pairs (set, modes, s, keep);
      QvXyzFrame f = {
        .style = style,
        .precision = exact ? QV_XYZ_EXACT : QV_XYZ_FIXED,
        .positions = set->structures[s].positions,
        .masses = masses_column,
        .pairs = (const QvXyzPair *) pairs->data,
        .n_pairs = pairs->len,
      };
      g_ptr_array_add (pair_arrays, pairs);
      g_array_append_val (frames, f);
    }

  dir = qv_output_dir_open (output, force, &error);
  if (dir == NULL)
    {
      status = qv_cli_fail ("displace", error);
      goto out;
    }
  printf ("# quaver displace: %" G_GSIZE_FORMAT " structure%s of %s along mode%s %s into %s\n",
          set->n_structures, set->n_structures == 1 ? "" : "s", input->name,
          request.kind == QV_DISPLACE_GRID ? "s" : "",
          ((QvManifestField *) qv_manifest_get (manifest->options, "modes"))->string, output);
  printf ("# %-32s %5s %10s %11s %10s %5s %4s %8s\n", "file", "mode", "q", "Q", "max disp",
          "atom", "v", "Q/Q_tp");
  printf ("# %-32s %5s %10s %11s %10s %5s %4s %8s\n", "", "", "", "u^1/2 A", "A", "", "", "");
  for (gsize s = 0; s < (single ? 1 : set->n_structures); s++)
    {
      g_autofree char *name = file_name (set, &request, single ? -1 : (gssize) s);
      const QvXyzFrame *first = &g_array_index (frames, QvXyzFrame, s);
      gsize n_frames = single ? set->n_structures : 1, length;
      g_autofree char *text = qv_xyz_format (input->structure, first, n_frames, &length);
      QvManifestFile *file;

      if (!qv_output_dir_write (dir, name, text, length, &error))
        {
          status = qv_cli_fail ("displace", error);
          g_printerr ("quaver: %" G_GSIZE_FORMAT " file%s written before the failure stay in %s; "
                      "no manifest.json was written, so the export is incomplete\n",
                      n_written, n_written == 1 ? "" : "s", output);
          goto out;
        }
      n_written++;
      file = qv_manifest_add_file (manifest, name, style == QV_XYZ_PLAIN ? "xyz" : "extxyz",
                                   text, length);
      for (gsize f = 0; f < n_frames; f++)
        {
          const gsize index = single ? f : s;
          manifest_frame (qv_manifest_file_add_frame (file), set, modes, index);
          print_row (f == 0 ? name : "", &set->structures[index]);
        }
    }
  {
    g_autofree char *json = qv_manifest_to_json (manifest);
    if (!qv_output_dir_write (dir, "manifest.json", json, strlen (json), &error))
      {
        status = qv_cli_fail ("displace", error);
        g_printerr ("quaver: the %" G_GSIZE_FORMAT " structure file%s stay in %s, but without "
                    "manifest.json the export is incomplete\n", n_written,
                    n_written == 1 ? "" : "s", output);
        goto out;
      }
  }
  printf ("# wrote %" G_GSIZE_FORMAT " file%s and manifest.json\n", n_written,
          n_written == 1 ? "" : "s");
  if (fflush (stdout) != 0)
    status = QV_EXIT_WRITE;

out:
  g_strfreev (mode_args); g_free (modes_arg); g_free (output); g_free (format);
  qv_cli_solve_args_clear (&solve);
  return status;
}
