/* qv-cmd-thermo.c — `quaver thermo`: harmonic thermal properties of a
 * crystal (F, U, S, Cv, ZPE against T) as sums over the modes of a q mesh;
 * optionally thermal U tensors and sound velocities.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include "qv-cli.h"
#include "qv-cli-lattice.h"
#include "qv-cli-plot.h"
#include "qv-config.h"
#include "qv-element.h"
#include "qv-error.h"
#include "qv-phonon-mesh.h"
#include "qv-phonon-table.h"
#include "qv-phonon-thermal.h"
#include "qv-supercell.h"
#include "qv-units.h"
#include "qv-xyz.h"
#ifdef QV_HAVE_RENDER
#include "qv-thermal-plot.h"
#endif

static const char thermo_head[] =
  "Harmonic thermal properties of a crystal: the force constants of a\n"
  "supercell are folded onto the PRIMITIVE cell (extended XYZ with\n"
  "Lattice=\"…\"), D(q) is solved on a Gamma-centred mesh (--mesh, default\n"
  "20x20x20) and F, U, S, Cv and the zero-point energy are summed over its\n"
  "modes (each q weighing 1/N_q; not from a smeared DOS):\n"
  "  ZPE = sum hbar w/2,   F = sum [hbar w/2 + kT ln(1 - exp(-hbar w/kT))],\n"
  "  S = sum k [x/(e^x - 1) - ln(1 - e^-x)],  Cv = sum k x^2 e^x/(e^x - 1)^2,\n"
  "  U = F + TS, x = hbar w/kT.\n"
  "The three acoustic modes at Gamma are left out; imaginary modes are\n"
  "counted, left out and reported.\n"
  "Units: per mole of formula units (kJ/mol, J/(K mol); the formula unit is\n"
  "the primitive cell's composition divided by the greatest common divisor of\n"
  "its element counts) and per primitive cell (eV, meV/K).\n"
  "A molecule (a bundle, XYZ without a cell, --demo) gets gas-phase\n"
  "thermochemistry instead: see 'quaver thermo --molecule --help'.\n"
  "\n";

static const char thermo_tail[] =
  "\n"
  "--adp adds the thermal mean-square displacement tensors (U_ij, A^2, the\n"
  "crystallographers' anisotropic displacement parameters) of every atom of\n"
  "the primitive cell at each T:\n"
  "  U_k = sum hbar/(2 N_q m_k w) coth(hbar w/2kT) Re[e_k e_k^+].\n"
  "--sound \"1 0 0; 1 1 0\" adds the sound velocities (m/s) of the three\n"
  "acoustic branches along each direction, given in fractional reciprocal\n"
  "coordinates (q = h b1 + k b2 + l b3) or, with --cartesian, as Cartesian\n"
  "vectors; from omega/|q| at |q| = 0.001 and 0.002 1/A, extrapolated to q = 0,\n"
  "with the departure from linearity reported.\n"
  "\n"
  "With --born the LO-TO term enters the sums and U tensors at every mesh\n"
  "point except Gamma itself, which has no direction of approach: that one\n"
  "point (weight 1/N_q) keeps the TO frequencies only. --sound uses the\n"
  "force constants alone.\n"
  "\n"
  "Output (--format): text (default), csv (no --sound), json (T, F, U, S,\n"
  "Cv, ZPE with their units, counts of modes left out, U tensors, sound).\n"
  "\n";

static const char thermo_examples[] =
  "\n"
  "Examples:\n"
  "  quaver thermo prim.xyz --supercell 4x4x4 -H fc.npy -u eV/A^2 --t-max 1000 --t-step 50\n"
  "  quaver thermo prim.xyz -S sc.xyz -H sc.hess -u eV/A^2 --adp --sound \"1 0 0; 1 1 1\" -f json\n"
  "  quaver thermo prim.xyz --supercell 4x4x4 -H fc.npy -u eV/A^2 -f csv -o thermo.csv --plot thermo.svg\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input,\n"
  "3 output not written.\n"
  "Harmonic phonons are an approximation: validate them before relying on them.";


static const char *
symbol (guint z)
{
  const QvElement *e = qv_element_from_z (z);
  return e ? e->symbol : "X";
}

/* A molecule: a bundle, or a geometry without a cell. Unreadable files are
 * left to the lattice input, which reports them. */
static gboolean
is_molecule (const char *path)
{
  g_autoptr(GPtrArray) frames = NULL;
  if (g_str_has_suffix (path, ".json"))
    return TRUE;
  if (g_str_has_suffix (path, ".cif") || g_str_has_suffix (path, ".CIF"))
    return FALSE;
  frames = qv_xyz_read_file (path, NULL);
  return frames && frames->len > 0 && !((QvStructure *) g_ptr_array_index (frames, 0))->has_cell;
}

static char *
formula (gsize n, const guint *z, gsize units)
{
  GString *s = g_string_new (NULL);
  for (gsize i = 0; i < n; i++)
    {
      gsize count = 0;
      gboolean seen = FALSE;
      for (gsize j = 0; j < i; j++)
        seen |= z[j] == z[i];
      if (seen)
        continue;
      for (gsize j = 0; j < n; j++)
        count += z[j] == z[i];
      g_string_append (s, symbol (z[i]));
      if (count / units > 1)
        g_string_append_printf (s, "%" G_GSIZE_FORMAT, count / units);
    }
  return g_string_free (s, FALSE);
}

/* "h k l; h k l" → 3 n doubles */
static double *
parse_directions (const char *text, gsize *n, GError **error)
{
  g_auto(GStrv) items = g_strsplit (text, ";", -1);
  GArray *out = g_array_new (FALSE, FALSE, sizeof (double));
  for (guint i = 0; items[i]; i++)
    {
      g_auto(GStrv) parts = NULL;
      double v[3];
      guint k = 0;
      char *item = g_strstrip (items[i]);
      if (*item == '\0')
        continue;
      parts = g_strsplit_set (item, " \t,", -1);
      for (guint j = 0; parts[j]; j++)
        {
          char *end;
          if (*parts[j] == '\0')
            continue;
          if (k == 3)
            goto bad;
          v[k++] = g_ascii_strtod (parts[j], &end);
          if (*end != '\0' || !isfinite (v[k - 1]))
            goto bad;
        }
      if (k != 3 || (v[0] == 0 && v[1] == 0 && v[2] == 0))
        goto bad;
      g_array_append_vals (out, v, 3);
      continue;
    bad:
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "--sound: direction '%s' not understood; write three numbers, not all zero, "
                   "directions separated by ';' (\"1 0 0; 1 1 0\")", item);
      g_array_free (out, TRUE);
      return NULL;
    }
  if (out->len == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "--sound needs at least one direction (\"1 0 0\")");
      g_array_free (out, TRUE);
      return NULL;
    }
  *n = out->len / 3;
  return (double *) g_array_free (out, FALSE);
}

typedef struct {
  gboolean ok;
  gboolean failed;
  char *message;
  QvSoundVelocity v;
  double given[3];
} Sound;

int
qv_cmd_thermo (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  char *mesh_arg = NULL, *format_arg = NULL, *output = NULL, *sound_arg = NULL;
  double t_min = 0, t_max = 1000, t_step = 50;
  gboolean force = FALSE, adp = FALSE, cartesian = FALSE;
  QvCliLatticeOptions lo;
  g_autoptr(QvCliLattice) lattice = NULL;
  g_autofree char *description = NULL, *formula_text = NULL;
  g_autoptr(QvPhononMesh) mesh = NULL;
  g_autoptr(QvPhononSet) set = NULL;
  g_autoptr(QvThermal) th = NULL;
  g_autofree char *table = NULL;
  g_autofree QvSoundTableEntry *sound_rows = NULL;
  QvCliPlot plot = { NULL };
  QvThermalTableInfo info;
  g_autofree double *t = NULL, *u = NULL, *dirs = NULL;
  g_autofree Sound *sound = NULL;
  gsize n_t, n_dirs = 0, n_sites, z_units;
  int n[3] = { 20, 20, 20 };
  QvCliLatticeFormat format = QV_CLI_LATTICE_TEXT;
  QvProgress progress = { qv_cli_progress, NULL };
  int status = QV_EXIT_OK;
  GOptionEntry entries[] = {
    { "mesh", 'm', 0, G_OPTION_ARG_STRING, &mesh_arg, "Gamma-centred q mesh NxMxL (default 20x20x20)", "MESH" },
    { "t-min", 0, 0, G_OPTION_ARG_DOUBLE, &t_min, "Lowest temperature, K (default 0)", "T" },
    { "t-max", 0, 0, G_OPTION_ARG_DOUBLE, &t_max, "Highest temperature, K (default 1000)", "T" },
    { "t-step", 0, 0, G_OPTION_ARG_DOUBLE, &t_step, "Temperature step, K (default 50)", "D" },
    { "adp", 0, 0, G_OPTION_ARG_NONE, &adp, "Add the U tensors (A^2) of every atom", NULL },
    { "sound", 0, 0, G_OPTION_ARG_STRING, &sound_arg, "Sound velocities along \"h k l; …\"", "DIRS" },
    { "cartesian", 0, 0, G_OPTION_ARG_NONE, &cartesian, "--sound directions are Cartesian", NULL },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format_arg, "text (default), csv, json", "FORMAT" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "Write to FILE instead of standard output", "FILE" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Replace an existing output file", NULL },
    QV_CLI_PLOT_ENTRIES (&plot),
    { NULL }
  };

  if (qv_cmd_thermo_is_molecule (argc, argv))
    return qv_cmd_thermo_molecule (argc, argv);
  g_set_prgname ("quaver thermo");
  context = g_option_context_new ("PRIMITIVE");
  g_option_context_set_summary (context, "Harmonic thermal properties of a crystal from a supercell Hessian.");
  description = g_strconcat (thermo_head, qv_cli_lattice_help, thermo_tail, qv_cli_plot_help,
                             thermo_examples, NULL);
  g_option_context_set_description (context, description);
  if (!qv_cli_lattice_parse ("thermo", context, &lo, entries, &argc, &argv, &error))
    goto fail;
  if (is_molecule (argv[1]))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   "%s is a molecule (no cell), but these options are a crystal's; see "
                   "'quaver thermo --molecule --help' for a molecule's", argv[1]);
      goto fail;
    }
  if (mesh_arg && !qv_phonon_mesh_parse (mesh_arg, n, &error))
    goto fail;
  if (format_arg && !qv_cli_lattice_format_parse (format_arg, &format, &error))
    goto fail;
  if (!qv_cli_plot_check (&plot, output, force, 900, 560, &error))
    goto fail;
  if (!(t_min >= 0 && t_max >= t_min && t_max <= 1e5 && t_step > 0 && (t_max - t_min) / t_step <= 100000))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   "temperatures: need 0 <= --t-min <= --t-max <= 100000 K and a positive --t-step "
                   "giving at most 100000 temperatures (got %g, %g, %g)", t_min, t_max, t_step);
      goto fail;
    }
  if (sound_arg && format == QV_CLI_LATTICE_CSV)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   "--sound is not a column of the temperature table: use --format text or json");
      goto fail;
    }
  if (cartesian && !sound_arg)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "--cartesian applies to --sound directions");
      goto fail;
    }
  if (sound_arg && !(dirs = parse_directions (sound_arg, &n_dirs, &error)))
    goto fail;
  n_t = (gsize) floor ((t_max - t_min) / t_step + 1e-9) + 1;
  t = g_new (double, n_t);
  for (gsize i = 0; i < n_t; i++)
    t[i] = t_min + (double) i * t_step;

  lattice = qv_cli_lattice_load ("thermo", &lo, argv[1], &error);
  if (lattice == NULL)
    goto fail;
  n_sites = lattice->map->n_primitive;
  mesh = qv_phonon_mesh_new (n, &error);
  if (mesh == NULL)
    goto fail;
  /* with --born the LO-TO term is added at every mesh q but Γ, where
   * lattice->na has no direction of approach (docs/methods.md) */
  set = qv_dynamical_matrix_solve_with (lattice->fc, lattice->na ? qv_nonanalytic_add : NULL,
                                        lattice->na, mesh->q, mesh->n_q, FALSE, (guint) lo.threads,
                                        &progress, &error);
  if (set == NULL)
    goto fail;
  th = qv_thermal_compute (mesh->n_q, set->n_branches, mesh->q, set->wavenumbers, TRUE, t, n_t);
  if (th->n_imaginary > 0)
    g_printerr ("quaver: warning: %" G_GSIZE_FORMAT " of the %" G_GSIZE_FORMAT " mesh modes are "
                "imaginary (down to %.2f cm^-1) and are left out of the sums: the structure is not "
                "at a minimum, or the force constants are not converged\n", th->n_imaginary,
                mesh->n_q * set->n_branches, th->most_imaginary);
  if (adp)
    {
      u = qv_thermal_displacements_with (lattice->fc, lattice->na ? qv_nonanalytic_add : NULL,
                                         lattice->na, mesh, t, n_t, TRUE, (guint) lo.threads,
                                         &progress, &error);
      if (u == NULL)
        goto fail;
    }
  if (n_dirs)
    {
      const double (*cell)[3] = qv_force_constants_cell (lattice->fc);
      double recip[3][3];
      qv_lattice_reciprocal (cell, recip);
      sound = g_new0 (Sound, n_dirs);
      for (gsize d = 0; d < n_dirs; d++)
        {
          double c[3] = { 0, 0, 0 };
          g_autoptr(GError) local = NULL;
          memcpy (sound[d].given, dirs + 3 * d, sizeof sound[d].given);
          for (int x = 0; x < 3; x++)
            c[x] = cartesian ? dirs[3 * d + x]
                             : dirs[3 * d] * recip[0][x] + dirs[3 * d + 1] * recip[1][x]
                               + dirs[3 * d + 2] * recip[2][x];
          sound[d].ok = qv_sound_velocity (lattice->fc, c, 0, &sound[d].v, &local);
          if (!sound[d].ok)
            {
              g_printerr ("quaver: warning: no sound velocity along (%g %g %g): %s\n",
                          dirs[3 * d], dirs[3 * d + 1], dirs[3 * d + 2], local->message);
              sound[d].message = g_strdup (local->message);
            }
          else if (MAX (sound[d].v.linearity[0], MAX (sound[d].v.linearity[1], sound[d].v.linearity[2])) > 1e-3)
            g_printerr ("quaver: warning: along (%g %g %g) omega/q changes by more than 0.1 %% "
                        "between |q| = 0.001 and 0.002 1/A: the acoustic branches are not linear "
                        "there (soft or crossing branches)\n", dirs[3 * d], dirs[3 * d + 1], dirs[3 * d + 2]);
        }
    }
  z_units = qv_thermal_formula_units (n_sites, lattice->map->z);
  formula_text = formula (n_sites, lattice->map->z, z_units);

  memset (&info, 0, sizeof info);
  info.source.program = "quaver thermo " QV_VERSION;
  info.source.primitive = argv[1];
  info.source.hessian = lo.hessian;
  info.source.born = lo.born;
  info.source.n_sites = n_sites;
  info.source.sum_rule = !lo.no_sum_rule;
  memcpy (info.mesh, n, sizeof info.mesh);
  info.n_q = mesh->n_q;
  info.formula = formula_text;
  info.formula_units = z_units;
  info.site_z = lattice->map->z;
  info.adp = u;
  if (sound)
    {
      sound_rows = g_new0 (QvSoundTableEntry, n_dirs);
      for (gsize d = 0; d < n_dirs; d++)
        {
          memcpy (sound_rows[d].given, sound[d].given, sizeof sound_rows[d].given);
          sound_rows[d].ok = sound[d].ok;
          sound_rows[d].message = sound[d].message;
          sound_rows[d].v = sound[d].v;
        }
      info.sound = sound_rows;
      info.n_sound = n_dirs;
    }
  info.sound_cartesian = cartesian;
  table = qv_phonon_table_thermal (&info, th, format == QV_CLI_LATTICE_JSON ? QV_PHONON_TABLE_JSON
                                   : format == QV_CLI_LATTICE_CSV ? QV_PHONON_TABLE_CSV
                                   : QV_PHONON_TABLE_TEXT);
  status = qv_cli_emit ("thermo", output, table, force);
  if (status != QV_EXIT_OK || plot.path == NULL)
    goto out;
#ifdef QV_HAVE_RENDER
  {
    QvThermalPlotOptions po;
    g_autofree char *base = g_path_get_basename (argv[1]);
    g_autofree char *title = g_strdup_printf ("%s \u2014 harmonic thermal properties per mole of %s, "
                                              "mesh %dx%dx%d", base, formula_text, n[0], n[1], n[2]);
    gboolean ok;

    qv_thermal_plot_options_init (&po);
    po.width = plot.width;
    po.height = plot.height;
    po.title = title;
    po.formula_units = z_units;
    if (plot.kind == QV_CLI_PLOT_SVG)
      {
        gsize length = 0;
        g_autofree char *svg = qv_thermal_plot_svg (th, &po, &length, &error);
        ok = svg && qv_cli_plot_write_svg (&plot, svg, length, force, &error);
      }
    else
      {
        g_autofree guint8 *rgba = qv_thermal_plot_rgba (th, &po, &error);
        const char *text[] = { "Title", title, "Source", argv[1], NULL };
        ok = rgba && qv_cli_plot_write_rgba (&plot, rgba, text, force, &error);
      }
    if (!ok)
      goto fail;
  }
#endif
  goto out;

fail:
  status = qv_cli_fail ("thermo", error);
out:
  if (sound)
    for (gsize d = 0; d < n_dirs; d++)
      g_free (sound[d].message);
  qv_cli_lattice_options_clear (&lo);
  g_free (mesh_arg); g_free (format_arg); g_free (output); g_free (sound_arg);
  qv_cli_plot_clear (&plot);
  return status;
}
