/* qv-cmd-bands.c — `quaver bands`: phonon dispersion along a path from a
 * primitive cell and the Hessian of one of its supercells.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-band-path.h"
#include "qv-cli.h"
#include "qv-cli-lattice.h"
#include "qv-cli-plot.h"
#include "qv-nonanalytic.h"
#include "qv-config.h"
#include "qv-dynamical-matrix.h"
#include "qv-error.h"
#include "qv-force-constants.h"
#include "qv-hessian-file.h"
#include "qv-phonon-table.h"
#include "qv-supercell.h"
#include "qv-units.h"
#include "qv-xyz.h"
#ifdef QV_HAVE_RENDER
#include "qv-dispersion-plot.h"
#endif

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
  "\n";

static const char bands_examples[] =
  "\n"
  "Examples:\n"
  "  quaver bands prim.xyz --supercell-structure sc.xyz -H sc.hess -u eV/A^2\n"
  "  quaver bands prim.xyz --supercell 4x4x4 -H fc.npy -u hartree/bohr^2 -f json -o bands.json\n"
  "  quaver bands prim.xyz -S sc.xyz -H sc.hess -u eV/A^2 \\\n"
  "      --path \"G 0 0 0; X 0.5 0 0.5; W 0.5 0.25 0.75 | K 0.375 0.375 0.75; G\" --points 300\n"
  "  quaver bands prim.xyz -S sc.xyz -H sc.hess -u eV/A^2 -f csv -o bands.csv --plot bands.svg\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.\n"
  "Harmonic phonons are an approximation: validate them before relying on them.";


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
  g_autofree double *connected = NULL;
  g_autofree char *table = NULL;
  QvCliPlot plot = { NULL };
  QvBandTableInfo info;
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
    QV_CLI_PLOT_ENTRIES (&plot),
    { NULL }
  };

  g_set_prgname ("quaver bands");
  context = g_option_context_new ("PRIMITIVE");
  g_option_context_set_summary (context, "Phonon dispersion along a path from a supercell Hessian.");
  description = g_strconcat (bands_description_head, qv_cli_lattice_help, bands_description_tail,
                             qv_cli_plot_help, bands_examples, NULL);
  g_option_context_set_description (context, description);
  if (!qv_cli_lattice_parse ("bands", context, &lo, entries, &argc, &argv, &error))
    goto fail;
  if (format_arg && !qv_cli_lattice_format_parse (format_arg, &format, &error))
    goto fail;
  if (!qv_cli_plot_check (&plot, output, force, 900, 500, &error))
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
  /* Polar crystals: the non-analytic term (qv-nonanalytic.h, read by
   * qv-cli-lattice) depends at Γ on the direction of approach, so a path
   * point at Γ is solved 1e-6 (fractional) towards its neighbour on the
   * same piece of the path; its reported q stays Γ. */
  solve_q = lattice->na ? qv_band_sampling_solve_points (sampling, 1e-6)
                        : g_memdup2 (sampling->q, 3 * sampling->n_q * sizeof (double));
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
  /* the wavenumbers in connected order, for the table and the figure alike */
  connected = g_new (double, sampling->n_q * nb);
  for (gsize k = 0; k < sampling->n_q; k++)
    for (gsize b = 0; b < nb; b++)
      connected[k * nb + b] = set->wavenumbers[k * nb + order[k * nb + b]];

  memset (&info, 0, sizeof info);
  info.source.program = "quaver bands " QV_VERSION;
  info.source.primitive = argv[1];
  info.source.hessian = lo.hessian;
  info.source.hessian_units = qv_hessian_unit_name (lattice->unit);
  info.source.born = lo.born;
  info.source.n_sites = map->n_primitive;
  info.source.sum_rule = !lo.no_sum_rule;
  memcpy (info.supercell, map->matrix, sizeof info.supercell);
  info.n_cells = map->n_cells;
  info.lattice = path->lattice;
  info.path = path_text;
  info.overlap = overlap;
  memcpy (info.gamma_acoustic, lattice->before, sizeof info.gamma_acoustic);
  info.row_sum_removed = lattice->row_sum;
  info.periodicity_residual = qv_force_constants_periodicity (fc);
  table = qv_phonon_table_bands (&info, sampling, nb, connected, format == QV_CLI_LATTICE_JSON ? QV_PHONON_TABLE_JSON
                                 : format == QV_CLI_LATTICE_CSV ? QV_PHONON_TABLE_CSV : QV_PHONON_TABLE_TEXT);
  status = qv_cli_emit ("bands", output, table, force);
  if (status != QV_EXIT_OK || plot.path == NULL)
    goto out;
#ifdef QV_HAVE_RENDER
  {
    QvDispersionPlotOptions po;
    g_autofree char *base = g_path_get_basename (argv[1]);
    g_autofree char *title = g_strdup_printf ("%s \u2014 phonon dispersion%s", base,
                                              lo.born ? " (with the LO-TO term)" : "");
    gboolean ok;

    qv_dispersion_plot_options_init (&po);
    po.width = plot.width;
    po.height = plot.height;
    po.title = title;
    if (plot.kind == QV_CLI_PLOT_SVG)
      {
        gsize length = 0;
        g_autofree char *svg = qv_dispersion_plot_svg (sampling, nb, connected, &po, &length, &error);
        ok = svg && qv_cli_plot_write_svg (&plot, svg, length, force, &error);
      }
    else
      {
        g_autofree guint8 *rgba = qv_dispersion_plot_rgba (sampling, nb, connected, &po, &error);
        const char *text[] = { "Title", title, "Source", argv[1], "Path", path_text, NULL };
        ok = rgba && qv_cli_plot_write_rgba (&plot, rgba, text, force, &error);
      }
    if (!ok)
      goto fail;
  }
#endif
  goto out;

fail:
  status = qv_cli_fail ("bands", error);
out:
  qv_cli_lattice_options_clear (&lo);
  g_free (path_arg); g_free (format_arg); g_free (output);
  g_free (connect_arg);
  qv_cli_plot_clear (&plot);
  return status;
}
