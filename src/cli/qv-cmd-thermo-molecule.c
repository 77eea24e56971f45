/* qv-cmd-thermo-molecule.c — `quaver thermo MOLECULE`: ideal-gas, rigid-
 * rotor, harmonic-oscillator thermochemistry of a molecule, with the
 * soft-mode treatments of qv-gas-thermo.h, a per-vibration table and a
 * temperature sweep. `quaver thermo` hands a molecule (a bundle, an XYZ
 * file without a cell, --demo or --molecule) to qv_cmd_thermo_molecule.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include "qv-cli-solve.h"
#include "qv-cli.h"
#include "qv-config.h"
#include "qv-error.h"
#include "qv-gas-thermo.h"
#include "qv-thermochem-table.h"
#include "qv-units.h"
#include "qv-xyz.h"

static const char molecule_description[] =
  "Thermochemistry of a molecule as an ideal gas of rigid rotors with harmonic\n"
  "vibrations, from the modes `quaver modes` solves (same input options):\n"
  "  translation  Sackur-Tetrode: S = R[ln((2 pi m kT/h^2)^(3/2) kT/p) + 5/2]\n"
  "  rotation     rigid rotor from the principal moments of inertia, with the\n"
  "               symmetry number sigma; linear molecules have two moments;\n"
  "               an atom has none\n"
  "  vibration    harmonic oscillators: ZPE = hc nu/2, U, S, Cv per mode\n"
  "  electronic   S = R ln g (--degeneracy g, e.g. the spin multiplicity)\n"
  "and H = U + RT, G = H - TS, Cp = Cv + R (McQuarrie, Statistical Mechanics).\n"
  "ZPE, U, H and G are thermal corrections measured from the bottom of the\n"
  "well; --electronic-energy adds E_el + ZPE, E_el + H and E_el + G.\n"
  "\n"
  "Standard state: 1 bar (default); --standard-state 1atm, or 1M (1 mol/L:\n"
  "the translational volume is 1/(1000 N_A) m^3, for solution free energies);\n"
  "--pressure sets any pressure instead (with a unit: Pa, kPa, MPa, bar, atm).\n"
  "The symmetry number is found from the point group (--symmetry-tolerance)\n"
  "unless --symmetry-number gives it; it lowers S_rot by R ln sigma.\n"
  "\n"
  "Imaginary modes are LEFT OUT, with a warning: a structure with one is not a\n"
  "minimum and its free energy is not that of a stable species. Modes beyond\n"
  "3N-6 (3N-5 linear) in a precomputed mode set are taken, smallest first, as\n"
  "rigid-body motion and left out.\n"
  "\n"
  "Soft modes: the harmonic entropy of a mode grows without bound as its\n"
  "wavenumber goes to zero, so low modes (torsions, hindered rotors) can carry\n"
  "a large, unreliable share of S and G. --soft-modes chooses:\n"
  "  none        plain harmonic oscillators (default)\n"
  "  raise       real wavenumbers below --cutoff (default 100 cm^-1) are raised\n"
  "              to it in the thermal energy, Cv and S; the zero-point energy\n"
  "              keeps the computed wavenumber (Ribeiro, Marenich, Cramer &\n"
  "              Truhlar, J. Phys. Chem. B 115, 14556 (2011))\n"
  "  quasi-rrho  S of each mode = w S_oscillator + (1 - w) S_free-rotor, with\n"
  "              w = 1/(1 + (omega0/omega)^alpha) and a free rotor of moment\n"
  "              mu' = mu B_av/(mu + B_av), mu = h/(8 pi^2 nu); energies and Cv\n"
  "              stay harmonic (Grimme, Chem. Eur. J. 18, 9955 (2012);\n"
  "              --omega0 100 cm^-1, --alpha 4, --b-av 1e-44 kg m^2 as there)\n"
  "\n"
  "Scale factors: --scale multiplies every wavenumber before anything else\n"
  "(thermal terms and ZPE; raise and quasi-rrho see the scaled value);\n"
  "--zpe-scale, when given, is used for the ZPE instead.\n"
  "\n"
  "--per-mode adds each vibration's share of ZPE, U, S (and its percentage of\n"
  "S_vib), Cv and G at the temperature, so you see what a suspicious mode\n"
  "contributes. --t-min/--t-max/--t-step give a sweep: one row per T.\n"
  "\n"
  "Output (--format): text (default), csv (the term table; with --per-mode\n"
  "the per-vibration table; with a sweep one row per T), json (all of it,\n"
  "with units and per-molecule values in eV). Energies in kJ/mol, entropies\n"
  "and heat capacities in J/(K mol).\n"
  "\n"
  "Examples:\n"
  "  quaver thermo mol.quaver.json\n"
  "  quaver thermo mol.xyz -H mol.hess -u hartree/bohr^2 -T 350 --pressure 2bar\n"
  "  quaver thermo mol.quaver.json --soft-modes quasi-rrho --per-mode\n"
  "  quaver thermo mol.quaver.json --scale 0.97 --electronic-energy \"-154.0921 hartree\"\n"
  "  quaver thermo mol.quaver.json --t-min 100 --t-max 1000 --t-step 10 -f csv -o sweep.csv\n"
  "  quaver thermo --demo --standard-state 1M --symmetry-number 1\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.\n"
  "Ideal gas, rigid rotor and harmonic oscillator are approximations (no\n"
  "anharmonicity, no hindered rotors, no conformer mixture): validate the\n"
  "numbers, above all the soft modes' share, before relying on them.";

/* ---- dispatch from `quaver thermo` ---- */

/* Options of either thermo command that take a value (so the word after
 * them is not the input file). */
static gboolean
takes_value (const char *arg)
{
  static const char *const names[] = {
    "-S", "--supercell-structure", "--supercell", "-H", "--hessian", "-u", "--hessian-units",
    "--hessian-layout", "--tolerance", "--threads", "--born", "-m", "--mesh", "--t-min", "--t-max",
    "--t-step", "--sound", "-f", "--format", "-o", "--output", "-p", "--project", "--masses", "-i",
    "--isotope", "--mass", "--symmetry-tolerance", "-T", "--temperature", "--pressure",
    "--standard-state", "--symmetry-number", "--degeneracy", "--soft-modes", "--cutoff", "--omega0",
    "--alpha", "--b-av", "--scale", "--zpe-scale", "--electronic-energy",
  };
  for (guint i = 0; i < G_N_ELEMENTS (names); i++)
    if (strcmp (arg, names[i]) == 0)
      return TRUE;
  return FALSE;
}

static gboolean
looks_like_molecule (const char *path)
{
  g_autoptr(GPtrArray) frames = NULL;
  if (!g_file_test (path, G_FILE_TEST_IS_REGULAR))
    return FALSE;
  if (g_str_has_suffix (path, ".json"))
    {
      /* a bundle says so near its start; other JSON (an old output) is not input */
      g_autofree char *head = NULL;
      gsize len = 0;
      g_autoptr(GMappedFile) map = g_mapped_file_new (path, FALSE, NULL);
      if (map == NULL)
        return FALSE;
      len = MIN (g_mapped_file_get_length (map), 4096);
      head = g_strndup (g_mapped_file_get_contents (map), len);
      return strstr (head, "quaver-bundle") != NULL;
    }
  if (g_str_has_suffix (path, ".cif") || g_str_has_suffix (path, ".CIF"))
    return FALSE;
  frames = qv_xyz_read_file (path, NULL);
  return frames && frames->len > 0 && !((QvStructure *) g_ptr_array_index (frames, 0))->has_cell;
}

gboolean
qv_cmd_thermo_is_molecule (int argc, char **argv)
{
  for (int i = 1; i < argc && strcmp (argv[i], "--") != 0; i++)
    if (strcmp (argv[i], "--molecule") == 0 || strcmp (argv[i], "--demo") == 0)
      return TRUE;
  for (int i = 1; i < argc; i++)
    {
      const char *a = argv[i];
      if (strcmp (a, "--") == 0)
        return i + 1 < argc && looks_like_molecule (argv[i + 1]);
      if (a[0] == '-' && a[1] != '\0')
        {
          if (strchr (a, '=') == NULL && takes_value (a))
            i++;
          continue;
        }
      return looks_like_molecule (a);
    }
  return FALSE;
}

/* ---- quantities with units ---- */

typedef struct {
  const char *name;
  double factor;
} Unit;

/* "VALUE UNIT" or "VALUEUNIT" → value × factor; the unit is required. */
static gboolean
parse_quantity (const char *option, const char *text, const Unit *units, gsize n_units,
                double *out, GError **error)
{
  char *end = NULL;
  double v = g_ascii_strtod (text, &end);
  GString *list = g_string_new (NULL);

  if (end != text && isfinite (v))
    {
      while (*end == ' ' || *end == '\t')
        end++;
      for (gsize i = 0; i < n_units; i++)
        if (g_ascii_strcasecmp (end, units[i].name) == 0)
          {
            *out = v * units[i].factor;
            g_string_free (list, TRUE);
            return TRUE;
          }
    }
  for (gsize i = 0; i < n_units; i++)
    g_string_append_printf (list, "%s%s", i ? ", " : "", units[i].name);
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s: '%s' is not a number with a unit; write "
               "e.g. \"%s%s\" (units: %s)", option, text, n_units && units[0].factor > 0 ? "1 " : "",
               units[0].name, list->str);
  g_string_free (list, TRUE);
  return FALSE;
}

static const Unit pressure_units[] = {
  { "bar", 1e5 }, { "Pa", 1 }, { "kPa", 1e3 }, { "MPa", 1e6 }, { "atm", 101325 },
};

static const Unit energy_units[] = {
  { "hartree", QV_HARTREE_EV }, { "Eh", QV_HARTREE_EV }, { "eV", 1 },
  { "kJ/mol", 1000.0 / (QV_ELEMENTARY_CHARGE * QV_AVOGADRO) },
  { "kcal/mol", 1000.0 * QV_CALORIE / (QV_ELEMENTARY_CHARGE * QV_AVOGADRO) },
};

/* ---- the command ---- */

int
qv_cmd_thermo_molecule (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  QvCliSolveArgs solve = { 0 };
  g_autoptr(QvInput) input = NULL;
  g_autoptr(QvModeSet) modes = NULL;
  g_autoptr(QvGasMolecule) mol = NULL;
  g_auto(GStrv) notes = NULL;
  g_autofree QvGasThermo *th = NULL;
  g_autofree QvGasMode *per = NULL;
  g_autofree double *t = NULL;
  g_autofree char *doc = NULL, *sigma_source = NULL, *formula = NULL;
  char *format_arg = NULL, *output = NULL, *pressure_arg = NULL, *state_arg = NULL,
       *sigma_arg = NULL, *soft_arg = NULL, *energy_arg = NULL;
  double temperature = NAN, t_min = NAN, t_max = NAN, t_step = NAN;
  double cutoff = NAN, omega0 = NAN, alpha = NAN, b_av = NAN, scale = NAN, zpe_scale = NAN;
  gint64 degeneracy = 1;
  gboolean force = FALSE, per_mode = FALSE, molecule_flag = FALSE;
  QvGasThermoOptions opt;
  QvThermochemTableFormat format = QV_THERMOCHEM_TABLE_TEXT;
  QvProjection projection = QV_PROJECTION_FULL;
  gsize n_t = 1;
  QvThermochemReport r = { 0 };
  int status = QV_EXIT_OK;
  GOptionEntry entries[] = {
    { "molecule", 0, 0, G_OPTION_ARG_NONE, &molecule_flag,
      "Treat the input as a molecule (implied by a bundle, XYZ without a cell or --demo)", NULL },
    { "temperature", 'T', 0, G_OPTION_ARG_DOUBLE, &temperature, "Temperature in K (default 298.15)", "T" },
    { "t-min", 0, 0, G_OPTION_ARG_DOUBLE, &t_min, "Sweep: lowest temperature, K (default 100)", "T" },
    { "t-max", 0, 0, G_OPTION_ARG_DOUBLE, &t_max, "Sweep: highest temperature, K (default 1000)", "T" },
    { "t-step", 0, 0, G_OPTION_ARG_DOUBLE, &t_step, "Sweep: temperature step, K (default 100)", "D" },
    { "pressure", 0, 0, G_OPTION_ARG_STRING, &pressure_arg,
      "Pressure with a unit (Pa, kPa, MPa, bar, atm), instead of the standard state", "P" },
    { "standard-state", 0, 0, G_OPTION_ARG_STRING, &state_arg, "1bar (default), 1atm or 1M (1 mol/L)", "STATE" },
    { "symmetry-number", 0, 0, G_OPTION_ARG_STRING, &sigma_arg,
      "Rotational symmetry number sigma, or auto (default: from the point group)", "SIGMA" },
    { "degeneracy", 0, 0, G_OPTION_ARG_INT64, &degeneracy,
      "Electronic ground-state degeneracy g, e.g. the spin multiplicity (default 1)", "G" },
    { "soft-modes", 0, 0, G_OPTION_ARG_STRING, &soft_arg,
      "Soft-mode treatment: none (default), raise, quasi-rrho", "HOW" },
    { "cutoff", 0, 0, G_OPTION_ARG_DOUBLE, &cutoff, "raise: cut-off in cm^-1 (default 100)", "NU" },
    { "omega0", 0, 0, G_OPTION_ARG_DOUBLE, &omega0, "quasi-rrho: omega0 in cm^-1 (default 100)", "NU" },
    { "alpha", 0, 0, G_OPTION_ARG_DOUBLE, &alpha, "quasi-rrho: exponent alpha (default 4)", "A" },
    { "b-av", 0, 0, G_OPTION_ARG_DOUBLE, &b_av, "quasi-rrho: B_av in kg m^2 (default 1e-44)", "I" },
    { "scale", 0, 0, G_OPTION_ARG_DOUBLE, &scale, "Frequency scale factor (default 1)", "F" },
    { "zpe-scale", 0, 0, G_OPTION_ARG_DOUBLE, &zpe_scale,
      "Scale factor for the ZPE only (default: --scale)", "F" },
    { "electronic-energy", 0, 0, G_OPTION_ARG_STRING, &energy_arg,
      "Electronic energy with a unit (hartree, eV, kJ/mol, kcal/mol)", "E" },
    { "per-mode", 0, 0, G_OPTION_ARG_NONE, &per_mode, "Add each vibration's share (one temperature)", NULL },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format_arg, "text (default), csv, json", "FORMAT" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "Write to FILE instead of standard output", "FILE" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Replace an existing output file", NULL },
    { NULL }
  };

  g_set_prgname ("quaver thermo");
  context = g_option_context_new ("MOLECULE");
  g_option_context_set_summary (context, "Gas-phase thermochemistry of a molecule (ideal gas, rigid "
                                "rotor, harmonic oscillator) with soft-mode treatments.");
  g_option_context_set_description (context, molecule_description);
  solve.all_modes = TRUE;
  qv_cli_solve_add_entries (context, &solve);
  g_option_context_add_main_entries (context, entries, NULL);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    {
      if (g_error_matches (error, G_OPTION_ERROR, G_OPTION_ERROR_UNKNOWN_OPTION))
        g_prefix_error (&error, "the input is a molecule (no cell), so 'thermo' computes its "
                        "gas-phase thermochemistry, which has no such option (crystal options "
                        "need a PRIMITIVE cell): ");
      goto fail;
    }
  if (argc > 2 || (argc == 2 && solve.demo) || (argc < 2 && !solve.demo))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   argc > 2 ? "thermo takes one MOLECULE, got %d" :
                   solve.demo ? "--demo replaces MOLECULE; give one or the other" :
                   "thermo needs a MOLECULE (bundle, or XYZ with --hessian), or --demo", argc - 1);
      goto fail;
    }

  qv_gas_thermo_options_init (&opt);
  if (format_arg && !qv_thermochem_table_format_parse (format_arg, &format, &error))
    goto fail;
  if (solve.projection && !qv_projection_parse (solve.projection, &projection, &error))
    goto fail;
  if (projection != QV_PROJECTION_FULL)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "--project %s: gas-phase thermochemistry counts "
                   "translations and rotations apart from the vibrations, so they must be projected "
                   "out (--project full, the default)", solve.projection);
      goto fail;
    }
  if (pressure_arg && state_arg)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "--pressure and --standard-state both set the "
                   "reference of the translational entropy; give one of them");
      goto fail;
    }
  if (pressure_arg && !parse_quantity ("--pressure", pressure_arg, pressure_units,
                                       G_N_ELEMENTS (pressure_units), &opt.pressure, &error))
    goto fail;
  if (pressure_arg && !(opt.pressure > 0))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "--pressure must be above 0 (got '%s')", pressure_arg);
      goto fail;
    }
  if (state_arg && !qv_standard_state_parse (state_arg, &opt.standard_state, &error))
    goto fail;
  if (soft_arg && !qv_soft_modes_parse (soft_arg, &opt.soft_modes, &error))
    goto fail;
  if ((!isnan (cutoff) && opt.soft_modes != QV_SOFT_MODES_RAISE)
      || ((!isnan (omega0) || !isnan (alpha) || !isnan (b_av)) && opt.soft_modes != QV_SOFT_MODES_QUASI_RRHO))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, !isnan (cutoff)
                   ? "--cutoff belongs to --soft-modes raise"
                   : "--omega0, --alpha and --b-av belong to --soft-modes quasi-rrho");
      goto fail;
    }
  if (!isnan (cutoff)) opt.cutoff = cutoff;
  if (!isnan (omega0)) opt.omega0 = omega0;
  if (!isnan (alpha)) opt.alpha = alpha;
  if (!isnan (b_av)) opt.b_av = b_av;
  if (!isnan (scale)) opt.frequency_scale = scale;
  if (!isnan (zpe_scale))
    {
      if (!(zpe_scale > 0))
        {
          g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "--zpe-scale must be above 0");
          goto fail;
        }
      opt.zpe_scale = zpe_scale;
    }
  if (degeneracy < 1 || degeneracy > 1000)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "--degeneracy must be a whole number from 1 to 1000");
      goto fail;
    }
  opt.degeneracy = (guint) degeneracy;
  if (energy_arg)
    {
      if (!parse_quantity ("--electronic-energy", energy_arg, energy_units, G_N_ELEMENTS (energy_units),
                           &opt.electronic_energy, &error))
        goto fail;
      opt.has_electronic_energy = TRUE;
    }
  if (sigma_arg && g_ascii_strcasecmp (sigma_arg, "auto") != 0)
    {
      char *end = NULL;
      guint64 v = g_ascii_strtoull (sigma_arg, &end, 10);
      if (end == sigma_arg || *end != '\0' || v < 1 || v > 1000)
        {
          g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "--symmetry-number takes a whole number from 1 "
                       "to 1000 or auto, got '%s'", sigma_arg);
          goto fail;
        }
      opt.symmetry_number = (guint) v;
      sigma_source = g_strdup ("given");
    }
  if (!qv_gas_thermo_options_check (&opt, &error))
    {
      g_prefix_error (&error, "options: ");
      goto fail;
    }

  /* temperatures */
  if (!isnan (t_min) || !isnan (t_max) || !isnan (t_step))
    {
      if (!isnan (temperature))
        {
          g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "--temperature is one temperature; "
                       "--t-min/--t-max/--t-step a sweep: give one or the other");
          goto fail;
        }
      if (isnan (t_min)) t_min = 100;
      if (isnan (t_max)) t_max = 1000;
      if (isnan (t_step)) t_step = 100;
      if (!(t_min > 0 && t_max >= t_min && t_max <= 1e5 && t_step > 0
            && (t_max - t_min) / t_step <= 100000))
        {
          g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "temperatures: need 0 < --t-min <= --t-max "
                       "<= 100000 K and a positive --t-step giving at most 100001 temperatures (got %g, "
                       "%g, %g); the ideal-gas entropy diverges at 0 K", t_min, t_max, t_step);
          goto fail;
        }
      n_t = (gsize) floor ((t_max - t_min) / t_step + 1e-9) + 1;
      r.sweep = TRUE;
      if (per_mode)
        {
          g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "--per-mode is a table at one temperature: "
                       "use --temperature with it, not a sweep");
          goto fail;
        }
    }
  else
    {
      if (isnan (temperature))
        temperature = 298.15;
      if (!(temperature > 0 && temperature <= 1e5))
        {
          g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "--temperature must be above 0 K and at most "
                       "100000 K (the ideal-gas entropy diverges at 0 K), got %g", temperature);
          goto fail;
        }
    }
  t = g_new (double, n_t);
  for (gsize i = 0; i < n_t; i++)
    t[i] = r.sweep ? t_min + (double) i * t_step : temperature;

  /* the modes */
  solve.want_symmetry = sigma_source == NULL;
  modes = qv_cli_solve (&solve, argc == 2 ? argv[1] : NULL, &input, &error);
  if (modes == NULL)
    goto fail;
  mol = qv_gas_molecule_new_from_modes (input->structure, modes, &error);
  if (mol == NULL)
    goto fail;
  if (sigma_source == NULL)
    {
      if (solve.point_group)
        {
          opt.symmetry_number = solve.point_group->symmetry_number;
          sigma_source = g_strdup_printf ("from point group %s", solve.point_group->name);
        }
      else
        {
          opt.symmetry_number = 1;
          sigma_source = g_strdup ("no point group found: 1 assumed");
          if (mol->rotor != QV_ROTOR_ATOM)
            g_printerr ("quaver: warning: no point group found, so the symmetry number is taken as 1; "
                        "give --symmetry-number if the molecule has rotational symmetry\n");
        }
    }

  /* warnings the user must see */
  {
    g_auto(GStrv) warnings = qv_mode_set_warnings (modes);
    for (char **w = warnings; *w; w++)
      g_printerr ("quaver: warning: %s\n", *w);
  }
  {
    g_autofree char *warning = qv_thermochem_imaginary_warning (mol);
    if (warning)
      g_printerr ("quaver: WARNING: %s\n", warning);
  }
  notes = qv_thermochem_notes (mol, &opt, solve.point_group ? solve.point_group->name : NULL,
                               solve.point_group ? solve.point_group->symmetry_number : 0,
                               g_strcmp0 (sigma_source, "given") == 0);

  th = g_new0 (QvGasThermo, n_t);
  if (per_mode)
    {
      per = g_new0 (QvGasMode, MAX (mol->n_modes, 1));
      qv_gas_thermo_compute (mol, &opt, t[0], &th[0], per);
    }
  else
    qv_gas_thermo_sweep (mol, &opt, t, n_t, th);

  r.program = "quaver thermo";
  r.input = solve.demo ? "demo" : argv[1];
  r.formula = formula = qv_structure_formula (input->structure);
  r.mol = mol;
  r.opt = &opt;
  r.sigma_source = sigma_source;
  r.n_t = n_t;
  r.th = th;
  r.modes = per;
  r.notes = notes;
  doc = qv_thermochem_table_write (&r, format);
  status = qv_cli_emit ("thermo", output, doc, force);
  goto out;

fail:
  status = qv_cli_fail ("thermo --molecule", error);
out:
  qv_cli_solve_args_clear (&solve);
  g_free (format_arg); g_free (output); g_free (pressure_arg); g_free (state_arg);
  g_free (sigma_arg); g_free (soft_arg); g_free (energy_arg);
  return status;
}
