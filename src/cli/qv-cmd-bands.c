/* qv-cmd-bands.c — `quaver bands`: phonon dispersion along a path from a
 * primitive cell and the Hessian of one of its supercells.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-band-path.h"
#include "qv-cli.h"
#include "qv-cli-lattice.h"
#include "qv-nonanalytic.h"
#include "qv-config.h"
#include "qv-dynamical-matrix.h"
#include "qv-error.h"
#include "qv-force-constants.h"
#include "qv-hessian-file.h"
#include "qv-json-writer.h"
#include "qv-supercell.h"
#include "qv-units.h"
#include "qv-xyz.h"

static const char bands_description_head[] =
  "Phonon dispersion of a crystal: the force constants of a supercell are\n"
  "folded onto the PRIMITIVE cell (extended XYZ with Lattice=\"…\") and the\n"
  "dynamical matrix D(q) is solved along a path through the Brillouin zone.\n"
  "\n";

static const char bands_description_tail[] =
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
  char *path_arg = NULL, *format_arg = NULL, *output = NULL, *connect_arg = NULL;
  g_autofree double *solve_q = NULL;
  gint64 points = 201;
  double density = 0;
  gboolean force = FALSE;
  QvCliLatticeOptions lo;
  g_autoptr(QvCliLattice) lattice = NULL;
  g_autofree char *description = NULL;
  const QvSupercellMap *map;
  QvForceConstants *fc;
  g_autoptr(QvBandPath) path = NULL;
  g_autoptr(QvBandSampling) sampling = NULL;
  g_autoptr(QvPhononSet) set = NULL;
  g_autofree guint *order = NULL;
  g_autofree char *path_text = NULL;
  g_autoptr(GString) out = NULL;
  gboolean overlap = TRUE;
  QvCliLatticeFormat format = QV_CLI_LATTICE_TEXT;
  QvProgress progress = { qv_cli_progress, NULL };
  int status = QV_EXIT_OK;
  gsize nb;
  GOptionEntry entries[] = {
    { "path", 'p', 0, G_OPTION_ARG_STRING, &path_arg, "\"LABEL QA QB QC; …\" (default: by lattice)", "PATH" },
    { "points", 'n', 0, G_OPTION_ARG_INT64, &points, "About N q points along the path (default 201)", "N" },
    { "density", 0, 0, G_OPTION_ARG_DOUBLE, &density, "Points per 1/A instead of --points", "D" },
    { "connect", 0, 0, G_OPTION_ARG_STRING, &connect_arg, "overlap (default) or sort", "HOW" },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format_arg, "text (default), csv, json", "FORMAT" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "Write to FILE instead of standard output", "FILE" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Replace an existing output file", NULL },
    { NULL }
  };

  g_set_prgname ("quaver bands");
  context = g_option_context_new ("PRIMITIVE");
  g_option_context_set_summary (context, "Phonon dispersion along a path from a supercell Hessian.");
  description = g_strconcat (bands_description_head, qv_cli_lattice_help, bands_description_tail, NULL);
  g_option_context_set_description (context, description);
  if (!qv_cli_lattice_parse ("bands", context, &lo, entries, &argc, &argv, &error))
    goto fail;
  if (format_arg && !qv_cli_lattice_format_parse (format_arg, &format, &error))
    goto fail;
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
  if (points < 2 || points > 1000000 || density < 0 || density > 1e5)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "%s",
                   (points < 2 || points > 1000000) ? "--points must be from 2 to 1000000" :
                   "--density must be a positive number of points per 1/A");
      goto fail;
    }

  lattice = qv_cli_lattice_load ("bands", &lo, argv[1], &error);
  if (lattice == NULL)
    goto fail;
  map = lattice->map;
  fc = lattice->fc;

  path = path_arg ? qv_band_path_parse (path_arg, &error)
                  : qv_band_path_default (lattice->primitive->cell, 0, &error);
  if (path == NULL)
    goto fail;
  sampling = qv_band_path_sample (path, lattice->primitive->cell, (gsize) points, density, &error);
  if (sampling == NULL)
    goto fail;
  solve_q = g_memdup2 (sampling->q, 3 * sampling->n_q * sizeof (double));
  if (lattice->na)
    {
      /* Polar crystals: the non-analytic term (qv-nonanalytic.h, read by
       * qv-cli-lattice). At Γ itself it depends on the direction of
       * approach, so a path point at Γ is solved a step of 1e-6
       * (fractional) towards its neighbour on the same piece of the path;
       * its reported q stays Γ. */
      for (gsize k = 0; k < sampling->n_q; k++)
        {
          double *q = solve_q + 3 * k, d[3], norm = 0.0;
          gssize j;
          if (q[0] != 0.0 || q[1] != 0.0 || q[2] != 0.0)
            continue;
          j = (k + 1 < sampling->n_q && !sampling->restart[k + 1]) ? (gssize) k + 1
              : (k > 0 && !sampling->restart[k]) ? (gssize) k - 1 : -1;
          if (j < 0)
            continue;
          for (int c = 0; c < 3; c++)
            {
              d[c] = sampling->q[3 * j + c];
              norm += d[c] * d[c];
            }
          norm = sqrt (norm);
          for (int c = 0; c < 3; c++)
            q[c] = norm > 0.0 ? 1e-6 * d[c] / norm : 0.0;
        }
    }
  set = lattice->na
    ? qv_dynamical_matrix_solve_with (fc, qv_nonanalytic_add, lattice->na, solve_q, sampling->n_q, overlap,
                                      (guint) lo.threads, &progress, &error)
    : qv_dynamical_matrix_solve (fc, solve_q, sampling->n_q, overlap, (guint) lo.threads,
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

  if (format == QV_CLI_LATTICE_JSON)
    {
      QvJsonWriter *w = qv_json_writer_new ();
      double m[9];
      char *doc;
      qv_json_begin_object (w, NULL);
      qv_json_string (w, "program", "quaver bands " QV_VERSION);
      qv_json_string (w, "primitive", argv[1]);
      qv_json_string (w, "hessian", lo.hessian);
      qv_json_string (w, "hessian_units", qv_hessian_unit_name (lattice->unit));
      if (lo.born)
        qv_json_string (w, "born", lo.born);
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
      qv_json_bool (w, "sum_rule", !lo.no_sum_rule);
      qv_json_numbers (w, "gamma_acoustic_before_sum_rule", lattice->before, 3);
      qv_json_number (w, "largest_row_sum_removed", lattice->row_sum);
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
  if (format == QV_CLI_LATTICE_TEXT)
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
      g_string_append (out, lo.no_sum_rule ? "# acoustic at Gamma (no sum rule imposed):"
                                        : "# acoustic at Gamma before the sum rule:");
      for (int i = 0; i < 3; i++)
        {
          g_string_append_c (out, ' ');
          append_num (out, lattice->before[i], "%.4f");
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
      const char *sep = format == QV_CLI_LATTICE_CSV ? "," : " ";
      const char *label = label_at (sampling, k);
      append_num (out, sampling->distance[k], "%.6f");
      for (int i = 0; i < 3; i++)
        {
          g_string_append (out, sep);
          append_num (out, sampling->q[3 * k + i], "%.6f");
        }
      if (format == QV_CLI_LATTICE_CSV)
        g_string_append_printf (out, ",%s", label ? label : "");
      for (gsize b = 0; b < nb; b++)
        {
          g_string_append (out, sep);
          append_num (out, set->wavenumbers[k * nb + order[k * nb + b]], "%.4f");
        }
      if (format == QV_CLI_LATTICE_TEXT && label)
        g_string_append_printf (out, "  # %s", label);
      g_string_append_c (out, '\n');
    }
  status = qv_cli_emit ("bands", output, out->str, force);
  goto out;

fail:
  status = qv_cli_fail ("bands", error);
out:
  qv_cli_lattice_options_clear (&lo);
  g_free (path_arg); g_free (format_arg); g_free (output);
  g_free (connect_arg);
  return status;
}
