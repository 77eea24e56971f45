/* qv-cmd-compare.c — `quaver compare`: the overlap of two mode sets of the
 * same atoms, their best one-to-one matching and, on request, the
 * Duschinsky rotation and displacement between them.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-cli-solve.h"
#include "qv-config.h"
#include "qv-error.h"
#include "qv-json-writer.h"
#include "qv-comparison-table.h"
#include "qv-mode-comparison.h"

static const char compare_description[] =
  "Compares the normal modes of A with those of B: two isotopologues, two\n"
  "methods, or a Hessian before and after a change. A and B must have the same\n"
  "atoms in the same order; masses and positions may differ.\n"
  "\n"
  "Each side is what 'quaver modes' takes: a bundle (*.quaver.json), or a\n"
  "geometry with its Hessian given by --hessian-a / --hessian-b. Options that\n"
  "end in -a or -b apply to one side; the others (--hessian-units, --masses,\n"
  "--project, --hessian-layout) to both, and --hessian-units-a/-b override\n"
  "the units of one side. --demo uses the built-in demo (invented data) for\n"
  "both sides, so '--demo --isotope-b 9=2' compares it with its O-D form.\n"
  "\n"
  "What is computed:\n"
  "  1. B's structure is fitted onto A's (mass-weighted Kabsch fit, A's masses\n"
  "     as weights) and B's mode vectors are rotated with it (--no-align: off).\n"
  "  2. The overlap O_ij = |u_i(A) . u_j(B)| of unit mode vectors, by --overlap:\n"
  "       common-mass  B's Cartesian displacements weighted with A's masses\n"
  "                    (default; A's modes stay orthonormal, and with equal\n"
  "                    masses this is the plain mass-weighted overlap)\n"
  "       own-masses   each side's mass-weighted vectors l\n"
  "       cartesian    Cartesian displacement directions, mass-independent\n"
  "  3. The one-to-one matching with the largest total O^2 (Hungarian method).\n"
  "     Modes within --degeneracy cm^-1 of each other form a degenerate block,\n"
  "     matched by the subspace overlap (sum of O^2 over the two blocks, per\n"
  "     mode), which does not depend on the basis inside the block.\n"
  "  4. --duschinsky: Q_A = J Q_B + K with J = L_A^T L_B and\n"
  "     K = L_A^T M^1/2 (x_B - x_A) (u^1/2 A, and dimensionless with A's\n"
  "     frequencies). Needs the same masses on both sides.\n"
  "\n"
  "Formats: text (default; the matching table and a summary), csv (one row per\n"
  "mode of A: its match, then the whole overlap row), json (everything: the\n"
  "\"overlap\" matrix, the \"matching\", the alignment and \"duschinsky\").\n"
  "Wavenumbers are signed: negative means imaginary (shown as 'i' in text).\n"
  "Modes are numbered from 1 as in 'quaver modes'.\n"
  "\n"
  "Examples:\n"
  "  quaver compare mol.quaver.json mol.quaver.json --isotope-b 3=2\n"
  "  quaver compare hf.xyz mp2.xyz --hessian-a hf.hess --hessian-b mp2.hess -u hartree/bohr^2\n"
  "  quaver compare s0.quaver.json s1.quaver.json --duschinsky --format json -o dus.json\n"
  "  quaver compare --demo --isotope-b 9=2 --format csv\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.\n"
  "Harmonic modes are an approximation: validate them before relying on them.";

typedef struct {
  char *hessian_a, *hessian_b, *units, *units_a, *units_b, *layout, *masses, *projection;
  char **isotopes_a, **isotopes_b, **mass_a, **mass_b;
  gboolean demo;
} CompareInputs;

static void
side_args (const CompareInputs *in, gboolean b, QvCliSolveArgs *args)
{
  const char *units = b ? in->units_b : in->units_a;

  memset (args, 0, sizeof *args);
  args->all_modes = TRUE;
  args->demo = in->demo;
  args->hessian = g_strdup (b ? in->hessian_b : in->hessian_a);
  args->units = g_strdup (units ? units : in->units);
  args->layout = g_strdup (in->layout);
  args->masses = g_strdup (in->masses);
  args->projection = g_strdup (in->projection);
  args->isotopes = g_strdupv (b ? in->isotopes_b : in->isotopes_a);
  args->mass_overrides = g_strdupv (b ? in->mass_b : in->mass_a);
}

static char *
format_wavenumber (double nu)
{
  return nu < 0.0 ? g_strdup_printf ("%.2fi", -nu) : g_strdup_printf ("%.2f", nu);
}

static const char *
convention_note (QvOverlapConvention convention)
{
  switch (convention)
    {
    case QV_OVERLAP_OWN_MASSES: return "each side's mass-weighted vectors";
    case QV_OVERLAP_CARTESIAN: return "Cartesian displacement directions";
    case QV_OVERLAP_COMMON_MASS:
    default: return "B's displacements weighted with A's masses";
    }
}

static gsize
count_weak (const QvModeComparison *c)
{
  gsize weak = 0;
  for (gsize k = 0; k < qv_mode_comparison_n_pairs (c); k++)
    if (qv_mode_comparison_pair (c, k)->subspace_overlap < M_SQRT1_2)
      weak++;
  return weak;
}

static void
append_unmatched (GString *out, const QvModeComparison *c, gboolean b)
{
  gsize n = b ? qv_mode_comparison_n_modes_b (c) : qv_mode_comparison_n_modes_a (c);
  gboolean any = FALSE;

  for (gsize k = 0; k < n; k++)
    if ((b ? qv_mode_comparison_partner_of_b (c, k) : qv_mode_comparison_partner_of_a (c, k))
        == QV_COMPARISON_NONE)
      {
        g_string_append_printf (out, "%s%" G_GSIZE_FORMAT, any ? ", " : "", k + 1);
        any = TRUE;
      }
  if (!any)
    g_string_append (out, "none");
}

static char *
write_text (const QvModeComparison *c, const char *name_a, const char *name_b)
{
  GString *out = g_string_new (NULL);
  const QvComparisonOptions *o = qv_mode_comparison_options (c);
  gboolean any_degenerate = FALSE;
  gsize n_pairs = qv_mode_comparison_n_pairs (c), weakest = 0;

  g_string_append_printf (out, "# quaver %s: modes of A = %s (%" G_GSIZE_FORMAT ") against B = %s (%"
                          G_GSIZE_FORMAT ")\n", QV_VERSION, name_a, qv_mode_comparison_n_modes_a (c),
                          name_b, qv_mode_comparison_n_modes_b (c));
  g_string_append_printf (out, "# overlap: %s (%s)\n", qv_overlap_convention_name (o->convention),
                          convention_note (o->convention));
  if (o->align)
    g_string_append_printf (out, "# alignment: B fitted onto A (mass-weighted Kabsch), RMSD %.6f A\n",
                            qv_mode_comparison_rmsd (c));
  else
    g_string_append_printf (out, "# alignment: none (--no-align), mass-weighted RMSD %.6f A\n",
                            qv_mode_comparison_rmsd (c));
  g_string_append_printf (out, "# largest relative mass difference %.3g; degenerate blocks within %g cm^-1\n",
                          qv_mode_comparison_max_mass_difference (c), o->degeneracy);
  g_string_append (out, "mode A  wavenumber A  mode B  wavenumber B      shift  overlap\n"
                        "               cm^-1                 cm^-1      cm^-1\n");
  for (gsize k = 0; k < n_pairs; k++)
    {
      const QvModePair *p = qv_mode_comparison_pair (c, k);
      g_autofree char *na = format_wavenumber (p->wavenumber_a);
      g_autofree char *nb = format_wavenumber (p->wavenumber_b);

      g_string_append_printf (out, "%6" G_GSIZE_FORMAT "  %12s  %6" G_GSIZE_FORMAT "  %12s  %9.2f  %7.4f%s\n",
                              p->mode_a + 1, na, p->mode_b + 1, nb, p->shift, p->subspace_overlap,
                              p->degenerate ? "*" : "");
      any_degenerate |= p->degenerate;
      if (p->subspace_overlap < qv_mode_comparison_pair (c, weakest)->subspace_overlap)
        weakest = k;
    }
  if (any_degenerate)
    g_string_append (out, "* degenerate block: the overlap is the block's subspace overlap\n");
  g_string_append_printf (out, "summary: %" G_GSIZE_FORMAT " pairs, mean overlap %.4f",
                          n_pairs, qv_mode_comparison_mean_overlap (c));
  if (n_pairs)
    {
      const QvModePair *w = qv_mode_comparison_pair (c, weakest);
      g_string_append_printf (out, ", weakest %.4f (A %" G_GSIZE_FORMAT " with B %" G_GSIZE_FORMAT ")",
                              w->subspace_overlap, w->mode_a + 1, w->mode_b + 1);
    }
  g_string_append (out, "\nunmatched modes of A: ");
  append_unmatched (out, c, FALSE);
  g_string_append (out, "; of B: ");
  append_unmatched (out, c, TRUE);
  g_string_append_c (out, '\n');
  if (count_weak (c))
    g_string_append_printf (out, "note: %" G_GSIZE_FORMAT " pairs share less than half of their mode "
                            "(overlap below 0.7071): those modes mix differently in A and B\n",
                            count_weak (c));
  if (qv_mode_comparison_has_duschinsky (c))
    {
      const double *k = qv_mode_comparison_duschinsky_k (c);
      const double *kd = qv_mode_comparison_duschinsky_k_dimensionless (c);

      g_string_append (out, "Duschinsky displacement K (Q_A = J Q_B + K; J in --format json)\n"
                            "mode A     K/u^1/2 A   K dimensionless\n");
      for (gsize i = 0; i < qv_mode_comparison_n_modes_a (c); i++)
        {
          if (isfinite (kd[i]))
            g_string_append_printf (out, "%6" G_GSIZE_FORMAT "  %12.6f  %16.6f\n", i + 1, k[i], kd[i]);
          else
            g_string_append_printf (out, "%6" G_GSIZE_FORMAT "  %12.6f  %16s\n", i + 1, k[i], "-");
        }
    }
  return g_string_free (out, FALSE);
}


static void
json_side (QvJsonWriter *w, const char *key, const char *name, const QvStructure *s,
           const QvModeSet *m)
{
  g_autofree char *formula = qv_structure_formula (s);
  g_autofree double *nu = g_new (double, MAX (m->n_modes, 1));

  for (gsize k = 0; k < m->n_modes; k++)
    nu[k] = qv_mode_set_wavenumber (m, k);
  qv_json_begin_object (w, key);
  qv_json_string (w, "source", name);
  qv_json_string (w, "formula", formula);
  qv_json_int (w, "n_atoms", (gint64) s->n_atoms);
  qv_json_int (w, "n_modes", (gint64) m->n_modes);
  qv_json_numbers (w, "masses", m->masses, m->n_atoms);
  qv_json_numbers (w, "wavenumbers", nu, m->n_modes);
  qv_json_end_object (w);
}

static void
json_matrix (QvJsonWriter *w, const char *key, const double *rows, gsize n_rows, gsize n_cols)
{
  qv_json_begin_array (w, key);
  for (gsize i = 0; i < n_rows; i++)
    qv_json_numbers (w, NULL, rows + i * n_cols, n_cols);
  qv_json_end_array (w);
}

static void
json_unmatched (QvJsonWriter *w, const char *key, const QvModeComparison *c, gboolean b)
{
  gsize n = b ? qv_mode_comparison_n_modes_b (c) : qv_mode_comparison_n_modes_a (c);

  qv_json_begin_array (w, key);
  for (gsize k = 0; k < n; k++)
    if ((b ? qv_mode_comparison_partner_of_b (c, k) : qv_mode_comparison_partner_of_a (c, k))
        == QV_COMPARISON_NONE)
      qv_json_int (w, NULL, (gint64) k + 1);
  qv_json_end_array (w);
}

static char *
write_json (const QvModeComparison *c, const char *name_a, const QvInput *a, const QvModeSet *ma,
            const char *name_b, const QvInput *b, const QvModeSet *mb)
{
  QvJsonWriter *w = qv_json_writer_new ();
  const QvComparisonOptions *o = qv_mode_comparison_options (c);
  gsize n_a = qv_mode_comparison_n_modes_a (c), n_b = qv_mode_comparison_n_modes_b (c);

  qv_json_begin_object (w, NULL);
  qv_json_string (w, "program", "quaver " QV_VERSION);
  qv_json_string (w, "kind", "mode comparison");
  json_side (w, "a", name_a, a->structure, ma);
  json_side (w, "b", name_b, b->structure, mb);
  qv_json_string (w, "convention", qv_overlap_convention_name (o->convention));
  qv_json_string (w, "convention_note", convention_note (o->convention));
  qv_json_begin_object (w, "alignment");
  qv_json_bool (w, "aligned", o->align);
  json_matrix (w, "rotation", qv_mode_comparison_rotation (c), 3, 3);
  qv_json_number (w, "rmsd", qv_mode_comparison_rmsd (c));
  qv_json_string (w, "rmsd_unit", "A");
  qv_json_string (w, "weights", "masses of A");
  qv_json_end_object (w);
  qv_json_number (w, "max_relative_mass_difference", qv_mode_comparison_max_mass_difference (c));
  qv_json_number (w, "degeneracy_tolerance", o->degeneracy);
  qv_json_begin_array (w, "blocks_a");
  for (gsize i = 0; i < n_a; i++)
    qv_json_int (w, NULL, (gint64) qv_mode_comparison_block_a (c, i) + 1);
  qv_json_end_array (w);
  qv_json_begin_array (w, "blocks_b");
  for (gsize j = 0; j < n_b; j++)
    qv_json_int (w, NULL, (gint64) qv_mode_comparison_block_b (c, j) + 1);
  qv_json_end_array (w);
  json_matrix (w, "overlap", qv_mode_comparison_overlaps (c), n_a, n_b);
  qv_json_begin_array (w, "matching");
  for (gsize k = 0; k < qv_mode_comparison_n_pairs (c); k++)
    {
      const QvModePair *p = qv_mode_comparison_pair (c, k);
      qv_json_begin_object (w, NULL);
      qv_json_int (w, "mode_a", (gint64) p->mode_a + 1);
      qv_json_int (w, "mode_b", (gint64) p->mode_b + 1);
      qv_json_number (w, "wavenumber_a", p->wavenumber_a);
      qv_json_number (w, "wavenumber_b", p->wavenumber_b);
      qv_json_number (w, "shift", p->shift);
      qv_json_number (w, "overlap", p->overlap);
      qv_json_number (w, "subspace_overlap", p->subspace_overlap);
      qv_json_bool (w, "degenerate", p->degenerate);
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  json_unmatched (w, "unmatched_a", c, FALSE);
  json_unmatched (w, "unmatched_b", c, TRUE);
  qv_json_number (w, "mean_overlap", qv_mode_comparison_mean_overlap (c));
  if (qv_mode_comparison_has_duschinsky (c))
    {
      qv_json_begin_object (w, "duschinsky");
      qv_json_string (w, "relation", "Q_A = J Q_B + K");
      json_matrix (w, "J", qv_mode_comparison_duschinsky_j (c), n_a, n_b);
      qv_json_numbers (w, "K", qv_mode_comparison_duschinsky_k (c), n_a);
      qv_json_string (w, "K_unit", "u^1/2 A");
      qv_json_numbers (w, "K_dimensionless", qv_mode_comparison_duschinsky_k_dimensionless (c), n_a);
      qv_json_end_object (w);
    }
  qv_json_end_object (w);
  return qv_json_writer_finish (w);
}

static void
compare_inputs_clear (CompareInputs *in)
{
  g_free (in->hessian_a); g_free (in->hessian_b); g_free (in->units); g_free (in->units_a);
  g_free (in->units_b); g_free (in->layout); g_free (in->masses); g_free (in->projection);
  g_strfreev (in->isotopes_a); g_strfreev (in->isotopes_b);
  g_strfreev (in->mass_a); g_strfreev (in->mass_b);
}

/* "A: message" so the user knows which side was wrong, with the shared
 * reader's option names spelt as this command spells them for the side. */
static void
prefix_side (GError *error, const char *side)
{
  static const char *const names[] = { "--isotope ", "--mass ", "--hessian " };
  GString *text = g_string_new (error->message);

  for (guint k = 0; k < G_N_ELEMENTS (names); k++)
    {
      g_autofree char *spelt = g_strdup_printf ("%.*s-%c ", (int) strlen (names[k]) - 1, names[k],
                                                g_ascii_tolower (side[0]));
      g_string_replace (text, names[k], spelt, 0);
    }
  g_free (error->message);
  error->message = g_strdup_printf ("%s: %s", side, text->str);
  g_string_free (text, TRUE);
}

int
qv_cmd_compare (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  CompareInputs in = { 0 };
  QvCliSolveArgs args_a = { 0 }, args_b = { 0 };
  g_autoptr(QvInput) input_a = NULL;
  g_autoptr(QvInput) input_b = NULL;
  g_autoptr(QvModeSet) modes_a = NULL;
  g_autoptr(QvModeSet) modes_b = NULL;
  g_autoptr(QvModeComparison) comparison = NULL;
  g_autofree char *document = NULL;
  char *format = NULL, *output = NULL, *overlap = NULL;
  const char *geometry_a = NULL, *geometry_b = NULL, *name_a, *name_b;
  gboolean force = FALSE, duschinsky = FALSE, no_align = FALSE;
  double degeneracy = QV_COMPARISON_DEFAULT_DEGENERACY;
  QvComparisonOptions options;
  int status = QV_EXIT_OK;
  GOptionEntry entries[] = {
    { "hessian-a", 0, 0, G_OPTION_ARG_FILENAME, &in.hessian_a, "Hessian file of A (text or .npy)", "FILE" },
    { "hessian-b", 0, 0, G_OPTION_ARG_FILENAME, &in.hessian_b, "Hessian file of B (text or .npy)", "FILE" },
    { "hessian-units", 'u', 0, G_OPTION_ARG_STRING, &in.units,
      "Units of both Hessians: eV/A^2, hartree/bohr^2, kcal/mol/A^2, kJ/mol/A^2, mdyn/A, aJ/A^2, N/m", "UNIT" },
    { "hessian-units-a", 0, 0, G_OPTION_ARG_STRING, &in.units_a, "Units of A's Hessian (overrides -u)", "UNIT" },
    { "hessian-units-b", 0, 0, G_OPTION_ARG_STRING, &in.units_b, "Units of B's Hessian (overrides -u)", "UNIT" },
    { "hessian-layout", 0, 0, G_OPTION_ARG_STRING, &in.layout,
      "Text layout of both: auto (default), full, lower, upper", "LAYOUT" },
    { "project", 'p', 0, G_OPTION_ARG_STRING, &in.projection,
      "Rigid-body motion to remove on both sides: full (default), translations, none", "WHAT" },
    { "masses", 0, 0, G_OPTION_ARG_STRING, &in.masses,
      "isotopic (default) or average, on both sides", "MODEL" },
    { "isotope-a", 0, 0, G_OPTION_ARG_STRING_ARRAY, &in.isotopes_a,
      "An isotope on an atom of A, e.g. 3=2 (repeatable)", "ATOM=A" },
    { "isotope-b", 0, 0, G_OPTION_ARG_STRING_ARRAY, &in.isotopes_b,
      "An isotope on an atom of B, e.g. 3=2 (repeatable)", "ATOM=A" },
    { "mass-a", 0, 0, G_OPTION_ARG_STRING_ARRAY, &in.mass_a, "A mass in u on an atom of A (repeatable)", "ATOM=MASS" },
    { "mass-b", 0, 0, G_OPTION_ARG_STRING_ARRAY, &in.mass_b, "A mass in u on an atom of B (repeatable)", "ATOM=MASS" },
    { "demo", 0, 0, G_OPTION_ARG_NONE, &in.demo, "Use the built-in demo (invented data) for both A and B", NULL },
    { "overlap", 0, 0, G_OPTION_ARG_STRING, &overlap,
      "Overlap convention: common-mass (default), own-masses, cartesian", "HOW" },
    { "no-align", 0, 0, G_OPTION_ARG_NONE, &no_align, "Do not fit B's structure onto A's", NULL },
    { "degeneracy", 0, 0, G_OPTION_ARG_DOUBLE, &degeneracy,
      "Modes closer than this (cm^-1) form a degenerate block (default 0.1; 0: none)", "CM" },
    { "duschinsky", 'd', 0, G_OPTION_ARG_NONE, &duschinsky,
      "Also the Duschinsky matrix J and displacement K (same masses needed)", NULL },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format, "text (default), csv, json", "FORMAT" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "Write to FILE instead of standard output", "FILE" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Replace an existing output file", NULL },
    { NULL }
  };

  g_set_prgname ("quaver compare");
  context = g_option_context_new ("A B");
  g_option_context_set_summary (context, "The overlap and best matching of two mode sets of the same atoms.");
  g_option_context_set_description (context, compare_description);
  g_option_context_add_main_entries (context, entries, NULL);
  qv_comparison_options_init (&options);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    {
      status = qv_cli_fail ("compare", error);
      goto out;
    }
  if (in.demo && (in.hessian_a || in.hessian_b))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   "--demo brings its own Hessian: --hessian-a and --hessian-b go with files A and B");
      status = qv_cli_fail ("compare", error);
      goto out;
    }
  if (in.demo ? argc != 1 : argc != 3)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "%s",
                   in.demo ? "--demo is both A and B: give no files with it" :
                   argc < 3 ? "compare needs two inputs, A and B (bundles, or geometries with "
                              "--hessian-a and --hessian-b)" :
                   "compare takes two inputs, A and B; more were given");
      status = qv_cli_fail ("compare", error);
      goto out;
    }
  if (format && strcmp (format, "text") != 0 && strcmp (format, "csv") != 0
      && strcmp (format, "json") != 0)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   "--format takes text, csv or json, got '%s'", format);
      status = qv_cli_fail ("compare", error);
      goto out;
    }
  if (overlap && !qv_overlap_convention_parse (overlap, &options.convention, &error))
    {
      status = qv_cli_fail ("compare", error);
      goto out;
    }
  if (!(degeneracy >= 0.0 && degeneracy < 1e4))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   "--degeneracy must be a wavenumber from 0 to 10000 cm^-1, e.g. 0.1");
      status = qv_cli_fail ("compare", error);
      goto out;
    }
  options.degeneracy = degeneracy;
  options.align = !no_align;
  if (!in.demo)
    {
      geometry_a = argv[1];
      geometry_b = argv[2];
    }

  for (int side = 0; side < 2 && !in.demo; side++)
    {
      const char *geometry = side ? geometry_b : geometry_a;
      if (!qv_input_is_bundle (geometry) && (side ? in.hessian_b : in.hessian_a) == NULL)
        {
          g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                       "%s: %s is a geometry without a Hessian: pass --hessian-%s FILE and "
                       "--hessian-units UNIT, or give a bundle (*.quaver.json)",
                       side ? "B" : "A", geometry, side ? "b" : "a");
          status = qv_cli_fail ("compare", error);
          goto out;
        }
    }

  side_args (&in, FALSE, &args_a);
  side_args (&in, TRUE, &args_b);
  modes_a = qv_cli_solve (&args_a, geometry_a, &input_a, &error);
  if (modes_a == NULL)
    {
      prefix_side (error, "A");
      status = qv_cli_fail ("compare", error);
      goto out;
    }
  modes_b = qv_cli_solve (&args_b, geometry_b, &input_b, &error);
  if (modes_b == NULL)
    {
      prefix_side (error, "B");
      status = qv_cli_fail ("compare", error);
      goto out;
    }
  name_a = in.demo ? "demo" : geometry_a;
  name_b = in.demo ? "demo" : geometry_b;
  comparison = qv_mode_comparison_new (input_a->structure, modes_a, input_b->structure, modes_b,
                                       &options, &error);
  if (comparison == NULL)
    {
      g_prefix_error (&error, "%s and %s: ", name_a, name_b);
      status = qv_cli_fail ("compare", error);
      goto out;
    }
  if (duschinsky && !qv_mode_comparison_compute_duschinsky (comparison, &error))
    {
      status = qv_cli_fail ("compare", error);
      goto out;
    }
  if (format && strcmp (format, "csv") == 0)
    document = qv_comparison_table_csv (comparison);
  else if (format && strcmp (format, "json") == 0)
    document = write_json (comparison, name_a, input_a, modes_a, name_b, input_b, modes_b);
  else
    document = write_text (comparison, name_a, name_b);
  status = qv_cli_emit ("compare", output, document, force);

out:
  g_free (format); g_free (output); g_free (overlap);
  compare_inputs_clear (&in);
  qv_cli_solve_args_clear (&args_a);
  qv_cli_solve_args_clear (&args_b);
  return status;
}
