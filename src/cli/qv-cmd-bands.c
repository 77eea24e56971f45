/* qv-cmd-bands.c — `quaver bands`: phonon dispersion along a path from a
 * primitive cell and the Hessian of one of its supercells.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-band-path.h"
#include "qv-cli.h"
#include "qv-config.h"
#include "qv-dynamical-matrix.h"
#include "qv-error.h"
#include "qv-force-constants.h"
#include "qv-hessian-file.h"
#include "qv-json-writer.h"
#include "qv-supercell.h"
#include "qv-units.h"
#include "qv-xyz.h"

static const char bands_description[] =
  "Phonon dispersion of a crystal: the force constants of a supercell are\n"
  "folded onto the PRIMITIVE cell (extended XYZ with Lattice=\"…\") and the\n"
  "dynamical matrix D(q) is solved along a path through the Brillouin zone.\n"
  "\n"
  "The supercell and its Hessian (3N x 3N for its N atoms, in its own atom\n"
  "order, x1 y1 z1 x2 …) come either as\n"
  "  --supercell-structure FILE   the supercell's extended XYZ: atoms in any\n"
  "                               order, each matched to a primitive site and a\n"
  "                               lattice translation by position (--tolerance)\n"
  "or as\n"
  "  --supercell NxMxL            (or nine integers, rows = supercell vectors\n"
  "                               in primitive vectors) when the Hessian's atoms\n"
  "                               are in the standard order: lattice points\n"
  "                               (n1 n2 n3) with n3 fastest, and inside each\n"
  "                               point the primitive atoms in file order.\n"
  "The acoustic sum rule is imposed (a projection that keeps the force\n"
  "constants symmetric); the acoustic wavenumbers at Gamma before it are\n"
  "reported. --no-sum-rule leaves the force constants as read.\n"
  "\n"
  "Path: points \"LABEL QA QB QC\" in fractional reciprocal coordinates\n"
  "without 2 pi (q = QA b1 + QB b2 + QC b3, a_i.b_j = 2 pi delta_ij),\n"
  "separated by ';' (joined) or '|' (a jump). Without --path, cubic P, F, I\n"
  "and hexagonal lattices get the path of Setyawan & Curtarolo, Comput.\n"
  "Mater. Sci. 49, 299 (2010) (G stands for Gamma). Distances along the path\n"
  "are in 1/A with the 2 pi. Branches are connected from one q to the next by\n"
  "eigenvector overlap, so crossings are followed (--connect sort: ascending\n"
  "order at every q instead).\n"
  "\n"
  "Output (--format): text (default; columns distance, q, branches), csv,\n"
  "json (per q point: q, distance, wavenumbers of every branch in cm^-1;\n"
  "plus the labels and their distances). Negative wavenumbers are imaginary.\n"
  "\n"
  "Examples:\n"
  "  quaver bands prim.xyz --supercell-structure sc.xyz -H sc.hess -u eV/A^2\n"
  "  quaver bands prim.xyz --supercell 4x4x4 -H fc.npy -u hartree/bohr^2 -f json -o bands.json\n"
  "  quaver bands prim.xyz -S sc.xyz -H sc.hess -u eV/A^2 \\\n"
  "      --path \"G 0 0 0; X 0.5 0 0.5; W 0.5 0.25 0.75 | K 0.375 0.375 0.75; G\" --points 300\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.\n"
  "Harmonic phonons are an approximation: validate them before relying on them.";

typedef enum { FORMAT_TEXT, FORMAT_CSV, FORMAT_JSON } Format;

static QvStructure *
read_structure (const char *path, const char *what, GError **error)
{
  g_autoptr(GPtrArray) frames = NULL;
  QvStructure *s;
  const char *dot = strrchr (path, '.');

  if (dot && g_ascii_strcasecmp (dot, ".cif") == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "%s: CIF is not read by 'bands' yet; write the %s as extended XYZ with "
                   "Lattice=\"ax ay az bx by bz cx cy cz\"", path, what);
      return NULL;
    }
  frames = qv_xyz_read_file (path, error);
  if (frames == NULL)
    return NULL;
  s = qv_structure_copy (g_ptr_array_index (frames, 0));
  if (!s->has_cell)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "%s: the %s has no cell; add Lattice=\"ax ay az bx by bz cx cy cz\" (Å) to its "
                   "comment line (extended XYZ)", path, what);
      qv_structure_free (s);
      return NULL;
    }
  return s;
}

static char *
fmt (double v, const char *format)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  return g_strdup (g_ascii_formatd (buf, sizeof buf, format, v + 0.0));
}

static void
append_num (GString *s, double v, const char *format)
{
  g_autofree char *t = fmt (v, format);
  g_string_append (s, t);
}

static char *
label_at (const QvBandSampling *s, gsize k)
{
  for (gsize i = 0; i < s->n_labels; i++)
    if (s->label_index[i] == k)
      return s->labels[i];
  return NULL;
}

int
qv_cmd_bands (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  char *supercell_structure = NULL, *hessian = NULL, *units = NULL, *layout_arg = NULL,
       *supercell_arg = NULL, *path_arg = NULL, *format_arg = NULL, *output = NULL,
       *connect_arg = NULL;
  gint64 points = 201, threads = 0;
  double density = 0, tolerance = QV_SUPERCELL_DEFAULT_TOLERANCE;
  gboolean force = FALSE, no_sum_rule = FALSE;
  g_autoptr(QvStructure) primitive = NULL;
  g_autoptr(QvStructure) supercell = NULL;
  g_autoptr(QvHessian) h = NULL;
  g_autoptr(QvSupercellMap) map = NULL;
  g_autoptr(QvForceConstants) fc = NULL;
  g_autoptr(QvBandPath) path = NULL;
  g_autoptr(QvBandSampling) sampling = NULL;
  g_autoptr(QvPhononSet) set = NULL;
  g_autofree guint *order = NULL;
  g_autofree char *path_text = NULL;
  g_autoptr(GString) out = NULL;
  double before[3] = { NAN, NAN, NAN }, row_sum = 0;
  int matrix[3][3];
  gboolean have_matrix = FALSE, overlap = TRUE;
  QvHessianUnit unit;
  QvHessianLayout layout = QV_HESSIAN_LAYOUT_AUTO;
  Format format = FORMAT_TEXT;
  QvProgress progress = { qv_cli_progress, NULL };
  int status = QV_EXIT_OK;
  gsize nb;
  GOptionEntry entries[] = {
    { "supercell-structure", 'S', 0, G_OPTION_ARG_FILENAME, &supercell_structure,
      "The supercell's structure (extended XYZ), atoms in the Hessian's order", "FILE" },
    { "supercell", 0, 0, G_OPTION_ARG_STRING, &supercell_arg,
      "Supercell matrix NxMxL or 9 integers (standard atom order without -S)", "MATRIX" },
    { "hessian", 'H', 0, G_OPTION_ARG_FILENAME, &hessian, "The supercell's Hessian (text or .npy)", "FILE" },
    { "hessian-units", 'u', 0, G_OPTION_ARG_STRING, &units, "Units of the Hessian (eV/A^2, hartree/bohr^2, …)", "UNIT" },
    { "hessian-layout", 0, 0, G_OPTION_ARG_STRING, &layout_arg, "full, lower or upper (default: detected)", "LAYOUT" },
    { "path", 'p', 0, G_OPTION_ARG_STRING, &path_arg, "\"LABEL QA QB QC; …\" (default: by lattice)", "PATH" },
    { "points", 'n', 0, G_OPTION_ARG_INT64, &points, "About N q points along the path (default 201)", "N" },
    { "density", 0, 0, G_OPTION_ARG_DOUBLE, &density, "Points per 1/A instead of --points", "D" },
    { "connect", 0, 0, G_OPTION_ARG_STRING, &connect_arg, "overlap (default) or sort", "HOW" },
    { "no-sum-rule", 0, 0, G_OPTION_ARG_NONE, &no_sum_rule, "Do not impose the acoustic sum rule", NULL },
    { "tolerance", 0, 0, G_OPTION_ARG_DOUBLE, &tolerance,
      "Relative position tolerance for matching atoms (default 0.001)", "T" },
    { "threads", 0, 0, G_OPTION_ARG_INT64, &threads, "Worker threads (default: one per processor)", "N" },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format_arg, "text (default), csv, json", "FORMAT" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "Write to FILE instead of standard output", "FILE" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Replace an existing output file", NULL },
    { NULL }
  };

  g_set_prgname ("quaver bands");
  context = g_option_context_new ("PRIMITIVE");
  g_option_context_set_summary (context, "Phonon dispersion along a path from a supercell Hessian.");
  g_option_context_set_description (context, bands_description);
  g_option_context_add_main_entries (context, entries, NULL);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    goto fail;

  if (argc != 2)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, argc < 2
                   ? "bands needs the PRIMITIVE cell (extended XYZ with Lattice=\"…\")"
                   : "bands takes one PRIMITIVE file, got %d", argc - 1);
      goto fail;
    }
  if (hessian == NULL || units == NULL)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, hessian == NULL
                   ? "bands needs the supercell's Hessian: --hessian FILE --hessian-units UNIT"
                   : "--hessian needs --hessian-units (one of %s): units are never guessed",
                   qv_hessian_unit_list ());
      goto fail;
    }
  if (supercell_structure == NULL && supercell_arg == NULL)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   "say which supercell the Hessian belongs to: --supercell-structure FILE, or "
                   "--supercell NxMxL when its atoms are in the standard order");
      goto fail;
    }
  if (!qv_hessian_unit_parse (units, &unit, &error)
      || (layout_arg && !qv_hessian_layout_parse (layout_arg, &layout, &error))
      || (supercell_arg && !(have_matrix = qv_supercell_matrix_parse (supercell_arg, matrix, &error))))
    goto fail;
  if (format_arg)
    {
      if (g_ascii_strcasecmp (format_arg, "text") == 0)
        format = FORMAT_TEXT;
      else if (g_ascii_strcasecmp (format_arg, "csv") == 0)
        format = FORMAT_CSV;
      else if (g_ascii_strcasecmp (format_arg, "json") == 0)
        format = FORMAT_JSON;
      else
        {
          g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                       "unknown format '%s'; accepted: text, csv, json", format_arg);
          goto fail;
        }
    }
  if (connect_arg)
    {
      if (g_ascii_strcasecmp (connect_arg, "sort") == 0)
        overlap = FALSE;
      else if (g_ascii_strcasecmp (connect_arg, "overlap") != 0)
        {
          g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                       "--connect takes overlap or sort, got '%s'", connect_arg);
          goto fail;
        }
    }
  if (points < 2 || points > 1000000 || density < 0 || density > 1e5 || threads < 0 || threads > 1024
      || !(tolerance > 0 && tolerance < 0.5))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "%s",
                   (points < 2 || points > 1000000) ? "--points must be from 2 to 1000000" :
                   (density < 0 || density > 1e5) ? "--density must be a positive number of points per 1/A" :
                   (threads < 0 || threads > 1024) ? "--threads must be from 0 (automatic) to 1024" :
                   "--tolerance must be a small positive fraction such as 0.001");
      goto fail;
    }

  primitive = read_structure (argv[1], "primitive cell", &error);
  if (primitive == NULL)
    goto fail;
  if (supercell_structure)
    supercell = read_structure (supercell_structure, "supercell", &error);
  else
    supercell = qv_supercell_build (primitive, matrix, &error);
  if (supercell == NULL)
    goto fail;
  map = qv_supercell_map (primitive, supercell, tolerance, &error);
  if (map == NULL)
    {
      g_prefix_error (&error, "%s: ", supercell_structure ? supercell_structure : argv[1]);
      goto fail;
    }
  if (have_matrix && memcmp (matrix, map->matrix, sizeof matrix) != 0)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_INPUT,
                   "%s is the supercell [%d %d %d; %d %d %d; %d %d %d] of the primitive cell, not "
                   "--supercell %s: drop --supercell or give the matching one", supercell_structure,
                   map->matrix[0][0], map->matrix[0][1], map->matrix[0][2], map->matrix[1][0],
                   map->matrix[1][1], map->matrix[1][2], map->matrix[2][0], map->matrix[2][1],
                   map->matrix[2][2], supercell_arg);
      goto fail;
    }
  h = qv_hessian_read_file (hessian, 3 * supercell->n_atoms, layout, &error);
  if (h == NULL)
    goto fail;
  qv_hessian_scale (h, qv_hessian_unit_to_ev_a2 (unit));
  fc = qv_force_constants_new (map, h, &error);
  if (fc == NULL)
    {
      g_prefix_error (&error, "%s: ", hessian);
      goto fail;
    }
  if (qv_force_constants_periodicity (fc) > 1e-3)
    g_printerr ("quaver: note: %s departs from the crystal's translation symmetry by %.2g "
                "(largest difference between equivalent pairs / largest element); the force "
                "constants average over the equivalent pairs\n", hessian,
                qv_force_constants_periodicity (fc));
  if (!no_sum_rule)
    row_sum = qv_force_constants_apply_sum_rule (fc, before);
  else
    qv_force_constants_gamma_acoustic (fc, before);
  if (fabs (before[0]) > 10 || fabs (before[2]) > 10)
    g_printerr ("quaver: note: the acoustic modes at Gamma are at %.1f, %.1f, %.1f cm^-1 %s; "
                "tens of cm^-1 mean the Hessian or the geometry is not converged (or the "
                "supercell is too small)\n", before[0], before[1], before[2],
                no_sum_rule ? "(no sum rule imposed)" : "before the sum rule");

  path = path_arg ? qv_band_path_parse (path_arg, &error)
                  : qv_band_path_default (primitive->cell, 0, &error);
  if (path == NULL)
    goto fail;
  sampling = qv_band_path_sample (path, primitive->cell, (gsize) points, density, &error);
  if (sampling == NULL)
    goto fail;
  set = qv_dynamical_matrix_solve (fc, sampling->q, sampling->n_q, overlap, (guint) threads,
                                   &progress, &error);
  if (set == NULL)
    goto fail;
  nb = set->n_branches;
  order = g_new (guint, sampling->n_q * nb);
  if (overlap)
    qv_band_connect (set, sampling->restart, order);
  else
    for (gsize i = 0; i < sampling->n_q * nb; i++)
      order[i] = (guint) (i % nb);
  path_text = qv_band_path_to_string (path);

  if (format == FORMAT_JSON)
    {
      QvJsonWriter *w = qv_json_writer_new ();
      double m[9];
      char *doc;
      qv_json_begin_object (w, NULL);
      qv_json_string (w, "program", "quaver bands " QV_VERSION);
      qv_json_string (w, "primitive", argv[1]);
      qv_json_string (w, "hessian", hessian);
      qv_json_string (w, "hessian_units", qv_hessian_unit_name (unit));
      for (int i = 0; i < 9; i++)
        m[i] = map->matrix[i / 3][i % 3];
      qv_json_numbers (w, "supercell_matrix", m, 9);
      qv_json_int (w, "n_sites", (gint64) map->n_primitive);
      qv_json_int (w, "n_branches", (gint64) nb);
      if (path->lattice)
        qv_json_string (w, "lattice", path->lattice);
      else
        qv_json_null (w, "lattice");
      qv_json_string (w, "path", path_text);
      qv_json_string (w, "q_convention",
                      "fractional reciprocal coordinates without 2 pi: q = sum_i q_i b_i, a_i.b_j = 2 pi delta_ij");
      qv_json_string (w, "distance_unit", "1/angstrom (with 2 pi)");
      qv_json_string (w, "wavenumber_unit", "cm^-1 (negative: imaginary)");
      qv_json_string (w, "phase_convention", "D(q) = sum_l Phi(l) exp(i q.(R_l + tau_k' - tau_k)) / sqrt(m_k m_k')");
      qv_json_string (w, "connection", overlap ? "eigenvector overlap" : "ascending at each q");
      qv_json_bool (w, "sum_rule", !no_sum_rule);
      qv_json_numbers (w, "gamma_acoustic_before_sum_rule", before, 3);
      qv_json_number (w, "largest_row_sum_removed", row_sum);
      qv_json_number (w, "periodicity_residual", qv_force_constants_periodicity (fc));
      qv_json_begin_array (w, "labels");
      for (gsize i = 0; i < sampling->n_labels; i++)
        {
          qv_json_begin_object (w, NULL);
          qv_json_string (w, "label", sampling->labels[i]);
          qv_json_number (w, "distance", sampling->label_distance[i]);
          qv_json_int (w, "index", (gint64) sampling->label_index[i]);
          qv_json_end_object (w);
        }
      qv_json_end_array (w);
      qv_json_begin_array (w, "points");
      {
        g_autofree double *row = g_new (double, nb);
        for (gsize k = 0; k < sampling->n_q; k++)
          {
            for (gsize b = 0; b < nb; b++)
              row[b] = set->wavenumbers[k * nb + order[k * nb + b]];
            qv_json_begin_object (w, NULL);
            qv_json_numbers (w, "q", sampling->q + 3 * k, 3);
            qv_json_number (w, "distance", sampling->distance[k]);
            qv_json_numbers (w, "wavenumbers", row, nb);
            qv_json_end_object (w);
          }
      }
      qv_json_end_array (w);
      qv_json_end_object (w);
      doc = qv_json_writer_finish (w);
      status = qv_cli_emit ("bands", output, doc, force);
      g_free (doc);
      goto out;
    }

  out = g_string_new (NULL);
  if (format == FORMAT_TEXT)
    {
      g_string_append_printf (out, "# quaver bands: %s, %" G_GSIZE_FORMAT " sites, supercell "
                              "[%d %d %d; %d %d %d; %d %d %d] (%" G_GSIZE_FORMAT " cells), lattice %s\n",
                              argv[1], map->n_primitive, map->matrix[0][0], map->matrix[0][1],
                              map->matrix[0][2], map->matrix[1][0], map->matrix[1][1], map->matrix[1][2],
                              map->matrix[2][0], map->matrix[2][1], map->matrix[2][2], map->n_cells,
                              path->lattice ? path->lattice : "(user path)");
      g_string_append_printf (out, "# path: %s\n", path_text);
      g_string_append (out, "# q: fractional reciprocal coordinates (q = qa b1 + qb b2 + qc b3, "
                            "a_i.b_j = 2 pi delta_ij); distance: 1/A with 2 pi\n");
      g_string_append_printf (out, "# wavenumbers: cm^-1, negative = imaginary; branches %s\n",
                              overlap ? "connected by eigenvector overlap" : "in ascending order at each q");
      g_string_append (out, no_sum_rule ? "# acoustic at Gamma (no sum rule imposed):"
                                        : "# acoustic at Gamma before the sum rule:");
      for (int i = 0; i < 3; i++)
        {
          g_string_append_c (out, ' ');
          append_num (out, before[i], "%.4f");
        }
      g_string_append (out, " cm^-1\n# labels:");
      for (gsize i = 0; i < sampling->n_labels; i++)
        {
          g_string_append_printf (out, " %s ", sampling->labels[i]);
          append_num (out, sampling->label_distance[i], "%.6f");
        }
      g_string_append (out, "\n# distance qa qb qc");
      for (gsize b = 0; b < nb; b++)
        g_string_append_printf (out, " w%" G_GSIZE_FORMAT, b + 1);
      g_string_append_c (out, '\n');
    }
  else
    {
      g_string_append (out, "distance_1/A,qa,qb,qc,label");
      for (gsize b = 0; b < nb; b++)
        g_string_append_printf (out, ",branch_%" G_GSIZE_FORMAT "_cm-1", b + 1);
      g_string_append_c (out, '\n');
    }
  for (gsize k = 0; k < sampling->n_q; k++)
    {
      const char *sep = format == FORMAT_CSV ? "," : " ";
      const char *label = label_at (sampling, k);
      append_num (out, sampling->distance[k], "%.6f");
      for (int i = 0; i < 3; i++)
        {
          g_string_append (out, sep);
          append_num (out, sampling->q[3 * k + i], "%.6f");
        }
      if (format == FORMAT_CSV)
        g_string_append_printf (out, ",%s", label ? label : "");
      for (gsize b = 0; b < nb; b++)
        {
          g_string_append (out, sep);
          append_num (out, set->wavenumbers[k * nb + order[k * nb + b]], "%.4f");
        }
      if (format == FORMAT_TEXT && label)
        g_string_append_printf (out, "  # %s", label);
      g_string_append_c (out, '\n');
    }
  status = qv_cli_emit ("bands", output, out->str, force);
  goto out;

fail:
  status = qv_cli_fail ("bands", error);
out:
  g_free (supercell_structure); g_free (hessian); g_free (units); g_free (layout_arg);
  g_free (supercell_arg); g_free (path_arg); g_free (format_arg); g_free (output);
  g_free (connect_arg);
  return status;
}
