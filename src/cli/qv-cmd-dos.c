/* qv-cmd-dos.c — `quaver dos`: phonon density of states of a crystal on a
 * Γ-centred q mesh, total and per element.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-cli.h"
#include "qv-cli-lattice.h"
#include "qv-cli-plot.h"
#include "qv-config.h"
#include "qv-error.h"
#include "qv-phonon-dos.h"
#include "qv-phonon-mesh.h"
#include "qv-phonon-table.h"
#include "qv-units.h"
#ifdef QV_HAVE_RENDER
#include "qv-dos-plot.h"
#endif

static const char dos_head[] =
  "Phonon density of states of a crystal: the force constants of a supercell\n"
  "are folded onto the PRIMITIVE cell (extended XYZ with Lattice=\"…\") and\n"
  "D(q) is solved on a Gamma-centred mesh (--mesh NxMxL, default 20x20x20).\n"
  "\n";

static const char dos_tail[] =
  "\n"
  "Methods: tetrahedron (default; the linear tetrahedron method, each grid\n"
  "value the exact number of states in its bin over the bin width) or\n"
  "gaussian (each mode a normalised Gaussian of standard deviation --sigma).\n"
  "The DOS is in states per frequency unit per primitive cell and integrates\n"
  "to 3n for n atoms in the primitive cell. The partial DOS of an element\n"
  "weighs each mode by the squared eigenvector on that element's atoms; the\n"
  "partial DOS add up to the total. Negative frequencies are imaginary modes.\n"
  "\n"
  "--unit chooses cm-1 (default), THz or meV for the grid, --sigma, --step,\n"
  "--min and --max (default range: the modes', padded by 5 sigma).\n"
  "\n"
  "With --born the LO-TO term enters every mesh point except Gamma itself,\n"
  "which has no direction of approach: that one point (weight 1/N_q) keeps\n"
  "the TO frequencies only.\n"
  "\n"
  "Output (--format): text (default; columns frequency, total, one per\n"
  "element), csv, json (grid, total, partial per element, method, mesh).\n"
  "\n";

static const char dos_examples[] =
  "\n"
  "Examples:\n"
  "  quaver dos prim.xyz --supercell 4x4x4 -H fc.npy -u eV/A^2 --mesh 24x24x24\n"
  "  quaver dos prim.xyz -S sc.xyz -H sc.hess -u eV/A^2 --method gaussian --sigma 3 -f json -o dos.json\n"
  "  quaver dos prim.xyz --supercell 4x4x4 -H fc.npy -u eV/A^2 --unit THz --plot dos.png --plot-size 1200x600\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.\n"
  "Harmonic phonons are an approximation: validate them before relying on them.";


int
qv_cmd_dos (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  char *mesh_arg = NULL, *method_arg = NULL, *unit_arg = NULL, *format_arg = NULL, *output = NULL;
  double sigma = -1, step = 0, wmin = 0, wmax = 0;
  gboolean force = FALSE;
  QvCliLatticeOptions lo;
  g_autoptr(QvCliLattice) lattice = NULL;
  g_autofree char *description = NULL;
  g_autoptr(QvPhononMesh) mesh = NULL;
  g_autoptr(QvPhononDos) dos = NULL;
  g_autofree char *table = NULL;
  QvCliPlot plot = { NULL };
  QvDosTableInfo info;
  int n[3] = { 20, 20, 20 };
  QvDosOptions opt = { QV_DOS_TETRAHEDRON, 0, 0, 0, 0 };
  QvFrequencyUnit unit = QV_FREQUENCY_CM1;
  QvCliLatticeFormat format = QV_CLI_LATTICE_TEXT;
  QvProgress progress = { qv_cli_progress, NULL };
  int status = QV_EXIT_OK;
  double per_cm1;    /* the unit per cm⁻¹ */
  GOptionEntry entries[] = {
    { "mesh", 'm', 0, G_OPTION_ARG_STRING, &mesh_arg, "Gamma-centred q mesh NxMxL (default 20x20x20)", "MESH" },
    { "method", 0, 0, G_OPTION_ARG_STRING, &method_arg, "tetrahedron (default) or gaussian", "METHOD" },
    { "sigma", 0, 0, G_OPTION_ARG_DOUBLE, &sigma, "Gaussian standard deviation (default 5 cm^-1)", "S" },
    { "step", 0, 0, G_OPTION_ARG_DOUBLE, &step, "Grid step (default: range / 1000)", "D" },
    { "min", 0, 0, G_OPTION_ARG_DOUBLE, &wmin, "Lowest frequency of the grid", "W" },
    { "max", 0, 0, G_OPTION_ARG_DOUBLE, &wmax, "Highest frequency of the grid", "W" },
    { "unit", 0, 0, G_OPTION_ARG_STRING, &unit_arg, "cm-1 (default), THz or meV", "UNIT" },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format_arg, "text (default), csv, json", "FORMAT" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "Write to FILE instead of standard output", "FILE" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Replace an existing output file", NULL },
    QV_CLI_PLOT_ENTRIES (&plot),
    { NULL }
  };

  g_set_prgname ("quaver dos");
  context = g_option_context_new ("PRIMITIVE");
  g_option_context_set_summary (context, "Phonon density of states on a q mesh from a supercell Hessian.");
  description = g_strconcat (dos_head, qv_cli_lattice_help, dos_tail, qv_cli_plot_help, dos_examples,
                             NULL);
  g_option_context_set_description (context, description);
  if (!qv_cli_lattice_parse ("dos", context, &lo, entries, &argc, &argv, &error))
    goto fail;
  if ((mesh_arg && !qv_phonon_mesh_parse (mesh_arg, n, &error))
      || (method_arg && !qv_dos_method_parse (method_arg, &opt.method, &error))
      || (unit_arg && !qv_frequency_unit_parse (unit_arg, &unit, &error)))
    goto fail;
  if (format_arg && !qv_cli_lattice_format_parse (format_arg, &format, &error))
    goto fail;
  if (!qv_cli_plot_check (&plot, output, force, 900, 500, &error))
    goto fail;
  per_cm1 = qv_frequency_from_wavenumber (1.0, unit);
  if (sigma != -1 && !(sigma > 0 && isfinite (sigma)))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "--sigma must be a positive width in %s",
                   qv_frequency_unit_name (unit));
      goto fail;
    }
  if (sigma != -1 && opt.method != QV_DOS_GAUSSIAN)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "--sigma applies to --method gaussian only");
      goto fail;
    }
  if (step < 0 || !isfinite (step) || ((wmin != 0 || wmax != 0) && !(wmax > wmin)))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "%s", step < 0 || !isfinite (step)
                   ? "--step must be a positive frequency step"
                   : "--max must be above --min (both in the --unit)");
      goto fail;
    }
  opt.sigma = (sigma == -1 ? 5.0 * per_cm1 : sigma) / per_cm1;
  opt.step = step / per_cm1;
  opt.omega_min = wmin / per_cm1;
  opt.omega_max = wmax / per_cm1;

  lattice = qv_cli_lattice_load ("dos", &lo, argv[1], &error);
  if (lattice == NULL)
    goto fail;
  mesh = qv_phonon_mesh_new (n, &error);
  if (mesh == NULL)
    goto fail;
  /* with --born the LO-TO term is added at every mesh q but Γ, where
   * lattice->na has no direction of approach (docs/methods.md) */
  dos = qv_phonon_dos_from_force_constants_with (lattice->fc,
                                                 lattice->na ? qv_nonanalytic_add : NULL,
                                                 lattice->na, lattice->map->z, mesh, &opt,
                                                 (guint) lo.threads, &progress, &error);
  if (dos == NULL)
    goto fail;

  memset (&info, 0, sizeof info);
  info.source.program = "quaver dos " QV_VERSION;
  info.source.primitive = argv[1];
  info.source.hessian = lo.hessian;
  info.source.born = lo.born;
  info.source.n_sites = lattice->map->n_primitive;
  info.source.sum_rule = !lo.no_sum_rule;
  info.n_q = mesh->n_q;
  info.unit = unit;
  table = qv_phonon_table_dos (&info, dos, format == QV_CLI_LATTICE_JSON ? QV_PHONON_TABLE_JSON
                               : format == QV_CLI_LATTICE_CSV ? QV_PHONON_TABLE_CSV : QV_PHONON_TABLE_TEXT);
  status = qv_cli_emit ("dos", output, table, force);
  if (status != QV_EXIT_OK || plot.path == NULL)
    goto out;
#ifdef QV_HAVE_RENDER
  {
    QvDosPlotOptions po;
    g_autofree char *base = g_path_get_basename (argv[1]);
    g_autofree char *title = g_strdup_printf ("%s \u2014 phonon density of states, %s, mesh %dx%dx%d",
                                              base, qv_dos_method_name (dos->method), n[0], n[1], n[2]);
    gboolean ok;

    qv_dos_plot_options_init (&po);
    po.width = plot.width;
    po.height = plot.height;
    po.title = title;
    po.unit = unit;
    if (plot.kind == QV_CLI_PLOT_SVG)
      {
        gsize length = 0;
        g_autofree char *svg = qv_dos_plot_svg (dos, &po, &length, &error);
        ok = svg && qv_cli_plot_write_svg (&plot, svg, length, force, &error);
      }
    else
      {
        g_autofree guint8 *rgba = qv_dos_plot_rgba (dos, &po, &error);
        const char *text[] = { "Title", title, "Source", argv[1], NULL };
        ok = rgba && qv_cli_plot_write_rgba (&plot, rgba, text, force, &error);
      }
    if (!ok)
      goto fail;
  }
#endif
  goto out;

fail:
  status = qv_cli_fail ("dos", error);
out:
  qv_cli_lattice_options_clear (&lo);
  g_free (mesh_arg); g_free (method_arg); g_free (unit_arg); g_free (format_arg); g_free (output);
  qv_cli_plot_clear (&plot);
  return status;
}
