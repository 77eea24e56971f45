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
#include "qv-json-writer.h"
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

/* ---- writing ---- */

typedef enum { FORMAT_TEXT, FORMAT_CSV, FORMAT_JSON } Format;

static void
num (GString *s, double v, const char *format)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  g_string_append (s, g_ascii_formatd (buf, sizeof buf, format, v + 0.0));
}

/* the columns of a term, in kJ/mol and J/(K mol) */
static void
term_values (const QvGasTerm *t, double out[6])
{
  const double kj = qv_gas_kj_per_mol ();
  out[0] = t->zpe * kj;
  out[1] = t->energy * kj;
  out[2] = t->enthalpy * kj;
  out[3] = t->entropy * kj * 1000;
  out[4] = t->heat_capacity * kj * 1000;
  out[5] = t->free_energy * kj;
}

static const char *const term_columns[] = {
  "ZPE_kJ/mol", "U_kJ/mol", "H_kJ/mol", "S_J/(K.mol)", "Cv_J/(K.mol)", "G_kJ/mol",
};

typedef struct {
  const char *input;
  char *formula;
  const QvGasMolecule *mol;
  const QvGasThermoOptions *opt;
  const char *sigma_source;     /* "given", or the point group's name */
  gboolean sweep;
  gsize n_t;
  const QvGasThermo *th;        /* n_t */
  const QvGasMode *modes;       /* n_modes at th[0], or NULL */
  char **notes;                 /* NULL-terminated */
} Report;

static const char *
soft_reference (QvSoftModes soft)
{
  switch (soft)
    {
    case QV_SOFT_MODES_RAISE:
      return "Ribeiro, Marenich, Cramer & Truhlar, J. Phys. Chem. B 115, 14556 (2011)";
    case QV_SOFT_MODES_QUASI_RRHO:
      return "Grimme, Chem. Eur. J. 18, 9955 (2012)";
    case QV_SOFT_MODES_NONE:
    default:
      return "harmonic oscillators";
    }
}

static char *
soft_summary (const QvGasThermoOptions *o)
{
  switch (o->soft_modes)
    {
    case QV_SOFT_MODES_RAISE:
      return g_strdup_printf ("raise: real wavenumbers below %g cm^-1 raised to it in U_thermal, "
                              "Cv and S (ZPE unchanged); %s", o->cutoff, soft_reference (o->soft_modes));
    case QV_SOFT_MODES_QUASI_RRHO:
      return g_strdup_printf ("quasi-rrho: S = w S_HO + (1-w) S_free-rotor, w = 1/(1+(%g/nu)^%g), "
                              "B_av = %g kg m^2; energies and Cv harmonic; %s", o->omega0, o->alpha,
                              o->b_av, soft_reference (o->soft_modes));
    case QV_SOFT_MODES_NONE:
    default:
      return g_strdup ("none: harmonic oscillators for every mode");
    }
}

static char *
state_summary (const QvGasThermoOptions *o, double t)
{
  if (o->pressure > 0)
    return g_strdup_printf ("p = %g Pa (given)", o->pressure);
  if (o->standard_state == QV_STANDARD_STATE_1M)
    return g_strdup_printf ("standard state 1 mol/L (V = 1/(1000 N_A) m^3; p = cRT = %.1f Pa at %g K)",
                            qv_gas_thermo_pressure (o, t), t);
  return g_strdup_printf ("standard state %s (p = %g Pa)",
                          o->standard_state == QV_STANDARD_STATE_1ATM ? "1 atm" : "1 bar",
                          qv_gas_thermo_pressure (o, t));
}

static void
text_header (GString *s, const Report *r)
{
  const QvGasMolecule *m = r->mol;
  const QvGasThermo *th = &r->th[0];
  g_autofree char *soft = soft_summary (r->opt);
  g_autofree char *state = state_summary (r->opt, th->temperature);

  g_string_append_printf (s, "# quaver thermo (molecule): %s, %s, %" G_GSIZE_FORMAT " atoms, mass ",
                          r->input, r->formula, m->n_atoms);
  num (s, m->mass, "%.6f");
  g_string_append (s, " u\n# ideal gas, rigid rotor, harmonic oscillator: an approximation; "
                      "validate it, above all the soft modes' share\n");
  g_string_append_printf (s, "# rotor: %s", qv_rotor_name (m->rotor));
  if (m->rotor != QV_ROTOR_ATOM)
    {
      g_string_append_printf (s, ", symmetry number %u (%s), principal moments", r->opt->symmetry_number,
                              r->sigma_source);
      for (int k = m->rotor == QV_ROTOR_LINEAR ? 2 : 0; k < 3; k++)
        {
          g_string_append_c (s, ' ');
          num (s, m->moments[k], "%.6f");
        }
      g_string_append (s, " u A^2, rotational temperatures");
      for (int k = m->rotor == QV_ROTOR_LINEAR ? 2 : 0; k < 3; k++)
        {
          g_string_append_c (s, ' ');
          num (s, th->rotational_temperatures[k], "%.6g");
        }
      g_string_append (s, " K");
    }
  g_string_append_c (s, '\n');
  g_string_append_printf (s, "# %s; electronic degeneracy %u\n", state, r->opt->degeneracy);
  g_string_append_printf (s, "# vibrations: %" G_GSIZE_FORMAT " summed; left out: %" G_GSIZE_FORMAT
                          " imaginary", m->n_vibrations, m->n_imaginary);
  if (m->n_imaginary)
    {
      g_string_append (s, " (down to ");
      num (s, -m->most_imaginary, "%.2f");
      g_string_append (s, "i cm^-1)");
    }
  g_string_append_printf (s, ", %" G_GSIZE_FORMAT " zero, %" G_GSIZE_FORMAT " rigid-body\n",
                          m->n_zero, m->n_rigid);
  g_string_append_printf (s, "# soft modes: %s\n", soft);
  g_string_append (s, "# scale factors: frequencies ");
  num (s, r->opt->frequency_scale, "%.6g");
  g_string_append (s, ", ZPE ");
  num (s, r->opt->zpe_scale > 0 ? r->opt->zpe_scale : r->opt->frequency_scale, "%.6g");
  g_string_append (s, r->opt->zpe_scale > 0 ? " (given)\n" : " (the frequency scale)\n");
  for (char **n = r->notes; n && *n; n++)
    g_string_append_printf (s, "# note: %s\n", *n);
}

static void
text_terms (GString *s, const QvGasThermo *th)
{
  const struct { const char *name; const QvGasTerm *t; } rows[] = {
    { "translation", &th->translation }, { "rotation", &th->rotation },
    { "vibration", &th->vibration }, { "electronic", &th->electronic }, { "total", &th->total },
  };
  const double kj = qv_gas_kj_per_mol ();

  g_string_append (s, "# T = ");
  num (s, th->temperature, "%.4f");
  g_string_append (s, " K, p = ");
  num (s, th->pressure, "%.6g");
  g_string_append (s, " Pa\n");
  g_string_append_printf (s, "%-12s", "term");
  for (int c = 0; c < 6; c++)
    g_string_append_printf (s, " %14s", term_columns[c]);
  g_string_append_c (s, '\n');
  for (gsize i = 0; i < G_N_ELEMENTS (rows); i++)
    {
      double v[6];
      term_values (rows[i].t, v);
      g_string_append_printf (s, "%-12s", rows[i].name);
      for (int c = 0; c < 6; c++)
        {
          char buf[G_ASCII_DTOSTR_BUF_SIZE];
          g_string_append_printf (s, " %14s", g_ascii_formatd (buf, sizeof buf, "%.6f", v[c] + 0.0));
        }
      g_string_append_c (s, '\n');
    }
  g_string_append (s, "# Cp = ");
  num (s, th->heat_capacity_p * kj * 1000, "%.6f");
  g_string_append (s, " J/(K mol)\n");
  if (th->has_electronic_energy)
    {
      const struct { const char *name; double v; } sums[] = {
        { "E_el", th->electronic_energy }, { "E_el + ZPE", th->e_zpe },
        { "E_el + H", th->e_enthalpy }, { "E_el + G", th->e_free_energy },
      };
      for (gsize i = 0; i < G_N_ELEMENTS (sums); i++)
        {
          g_string_append_printf (s, "# %-10s = ", sums[i].name);
          num (s, sums[i].v / QV_HARTREE_EV, "%.8f");
          g_string_append (s, " hartree = ");
          num (s, sums[i].v * kj, "%.4f");
          g_string_append (s, " kJ/mol\n");
        }
    }
}

static const char *const mode_columns[] = {
  "mode", "wavenumber_cm-1", "thermal_cm-1", "weight", "ZPE_kJ/mol", "U_kJ/mol", "S_J/(K.mol)",
  "S_%vib", "Cv_J/(K.mol)", "G_kJ/mol", "S_HO_J/(K.mol)", "S_FR_J/(K.mol)",
};

static void
mode_row (GString *s, const QvGasMode *md, double s_vib, gboolean csv)
{
  const double kj = qv_gas_kj_per_mol ();
  double v[10] = { md->thermal, md->weight, md->zpe * kj, md->energy * kj, md->entropy * kj * 1000,
                   s_vib > 0 ? 100 * md->entropy / s_vib : 0, md->heat_capacity * kj * 1000,
                   md->free_energy * kj, md->entropy_harmonic * kj * 1000,
                   md->entropy_free_rotor * kj * 1000 };
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  const char *sep = csv ? "," : " ";

  g_string_append_printf (s, csv ? "%" G_GSIZE_FORMAT : "%6" G_GSIZE_FORMAT, md->mode + 1);
  g_ascii_formatd (buf, sizeof buf, "%.4f", fabs (md->wavenumber) + 0.0);
  if (md->wavenumber < 0)
    strcat (buf, "i");
  g_string_append_printf (s, csv ? ",%s" : " %16s", buf);
  if (!md->used)
    {
      const char *why = md->wavenumber < 0 ? "left out (imaginary)" : "left out";
      if (csv)
        g_string_append (s, ",,,,,,,,,,");
      else
        g_string_append_printf (s, " %s", why);
      g_string_append_c (s, '\n');
      return;
    }
  for (int c = 0; c < 10; c++)
    {
      g_ascii_formatd (buf, sizeof buf, c == 1 ? "%.4f" : "%.6f", v[c] + 0.0);
      g_string_append_printf (s, csv ? "%s%s" : "%s%14s", sep, buf);
    }
  g_string_append_c (s, '\n');
}

static void
mode_table (GString *s, const Report *r, gboolean csv)
{
  for (guint c = 0; c < G_N_ELEMENTS (mode_columns); c++)
    {
      if (csv)
        g_string_append_printf (s, "%s%s", c ? "," : "", mode_columns[c]);
      else
        g_string_append_printf (s, c == 0 ? "%6s" : c == 1 ? " %16s" : " %14s", mode_columns[c]);
    }
  g_string_append_c (s, '\n');
  for (gsize k = 0; k < r->mol->n_modes; k++)
    mode_row (s, &r->modes[k], r->th[0].vibration.entropy, csv);
}

static const char *const sweep_columns[] = {
  "T_K", "p_Pa", "ZPE_kJ/mol", "U_kJ/mol", "H_kJ/mol", "S_J/(K.mol)", "Cv_J/(K.mol)",
  "Cp_J/(K.mol)", "G_kJ/mol", "S_trans_J/(K.mol)", "S_rot_J/(K.mol)", "S_vib_J/(K.mol)",
  "E_el+H_hartree", "E_el+G_hartree",
};

static void
sweep_table (GString *s, const Report *r, gboolean csv)
{
  const double kj = qv_gas_kj_per_mol ();
  const guint n_col = r->opt->has_electronic_energy ? 14 : 12;
  for (guint c = 0; c < n_col; c++)
    g_string_append_printf (s, "%s%s", c ? (csv ? "," : " ") : (csv ? "" : "# "), sweep_columns[c]);
  g_string_append_c (s, '\n');
  for (gsize i = 0; i < r->n_t; i++)
    {
      const QvGasThermo *th = &r->th[i];
      double v[14] = { th->temperature, th->pressure, th->total.zpe * kj, th->total.energy * kj,
                       th->total.enthalpy * kj, th->total.entropy * kj * 1000,
                       th->total.heat_capacity * kj * 1000, th->heat_capacity_p * kj * 1000,
                       th->total.free_energy * kj, th->translation.entropy * kj * 1000,
                       th->rotation.entropy * kj * 1000, th->vibration.entropy * kj * 1000,
                       th->e_enthalpy / QV_HARTREE_EV, th->e_free_energy / QV_HARTREE_EV };
      for (guint c = 0; c < n_col; c++)
        {
          if (c)
            g_string_append (s, csv ? "," : " ");
          num (s, v[c], c == 0 ? "%.4f" : c == 1 ? "%.6g" : c >= 12 ? "%.10f" : "%.6f");
        }
      g_string_append_c (s, '\n');
    }
}

static void
json_term (QvJsonWriter *w, const char *key, const QvGasTerm *t)
{
  double v[6];
  term_values (t, v);
  qv_json_begin_object (w, key);
  qv_json_number (w, "ZPE", v[0]);
  qv_json_number (w, "U", v[1]);
  qv_json_number (w, "H", v[2]);
  qv_json_number (w, "S", v[3]);
  qv_json_number (w, "Cv", v[4]);
  qv_json_number (w, "G", v[5]);
  qv_json_end_object (w);
}

static char *
json_report (const Report *r)
{
  QvJsonWriter *w = qv_json_writer_new ();
  const QvGasMolecule *m = r->mol;
  const QvGasThermoOptions *o = r->opt;
  const double kj = qv_gas_kj_per_mol ();

  qv_json_begin_object (w, NULL);
  qv_json_string (w, "program", "quaver thermo " QV_VERSION);
  qv_json_string (w, "kind", "molecule");
  qv_json_string (w, "input", r->input);
  qv_json_string (w, "model", "ideal gas, rigid rotor, harmonic oscillator (an approximation)");
  qv_json_begin_object (w, "units");
  qv_json_string (w, "energy", "kJ/mol");
  qv_json_string (w, "entropy", "J/(K mol)");
  qv_json_string (w, "heat_capacity", "J/(K mol)");
  qv_json_string (w, "T", "K");
  qv_json_string (w, "pressure", "Pa");
  qv_json_string (w, "wavenumber", "cm^-1");
  qv_json_string (w, "moments", "u A^2");
  qv_json_string (w, "electronic_sums", "hartree");
  qv_json_end_object (w);
  qv_json_string (w, "formula", r->formula);
  qv_json_int (w, "natoms", (gint64) m->n_atoms);
  qv_json_number (w, "mass", m->mass);
  qv_json_string (w, "rotor", qv_rotor_name (m->rotor));
  qv_json_numbers (w, "moments", m->moments, 3);
  qv_json_int (w, "symmetry_number", o->symmetry_number);
  qv_json_string (w, "symmetry_number_from", r->sigma_source);
  qv_json_int (w, "electronic_degeneracy", o->degeneracy);
  qv_json_string (w, "standard_state", o->pressure > 0 ? "pressure given"
                  : qv_standard_state_name (o->standard_state));
  qv_json_begin_object (w, "soft_modes");
  qv_json_string (w, "treatment", qv_soft_modes_name (o->soft_modes));
  qv_json_string (w, "reference", soft_reference (o->soft_modes));
  if (o->soft_modes == QV_SOFT_MODES_RAISE)
    {
      qv_json_number (w, "cutoff", o->cutoff);
      qv_json_string (w, "changes", "thermal energy, Cv and S (ZPE keeps the computed wavenumber)");
    }
  else if (o->soft_modes == QV_SOFT_MODES_QUASI_RRHO)
    {
      qv_json_number (w, "omega0", o->omega0);
      qv_json_number (w, "alpha", o->alpha);
      qv_json_number (w, "b_av_kg_m2", o->b_av);
      qv_json_string (w, "changes", "S only (energies and Cv harmonic)");
    }
  qv_json_end_object (w);
  qv_json_number (w, "frequency_scale", o->frequency_scale);
  qv_json_number (w, "zpe_scale", o->zpe_scale > 0 ? o->zpe_scale : o->frequency_scale);
  qv_json_int (w, "vibrations_summed", (gint64) m->n_vibrations);
  qv_json_int (w, "imaginary_left_out", (gint64) m->n_imaginary);
  qv_json_int (w, "zero_left_out", (gint64) m->n_zero);
  qv_json_int (w, "rigid_left_out", (gint64) m->n_rigid);
  qv_json_number (w, "most_imaginary", m->most_imaginary);
  if (o->has_electronic_energy)
    qv_json_number (w, "electronic_energy", o->electronic_energy / QV_HARTREE_EV);
  qv_json_begin_array (w, "notes");
  for (char **n = r->notes; n && *n; n++)
    qv_json_string (w, NULL, *n);
  qv_json_end_array (w);
  qv_json_begin_array (w, "temperatures");
  for (gsize i = 0; i < r->n_t; i++)
    {
      const QvGasThermo *th = &r->th[i];
      qv_json_begin_object (w, NULL);
      qv_json_number (w, "T", th->temperature);
      qv_json_number (w, "pressure", th->pressure);
      json_term (w, "translation", &th->translation);
      json_term (w, "rotation", &th->rotation);
      json_term (w, "vibration", &th->vibration);
      json_term (w, "electronic", &th->electronic);
      json_term (w, "total", &th->total);
      qv_json_number (w, "Cp", th->heat_capacity_p * kj * 1000);
      qv_json_number (w, "ln_q_translation", th->q_translation);
      qv_json_number (w, "ln_q_rotation", th->q_rotation);
      qv_json_numbers (w, "rotational_temperatures", th->rotational_temperatures, 3);
      if (th->has_electronic_energy)
        {
          qv_json_number (w, "E_el+ZPE", th->e_zpe / QV_HARTREE_EV);
          qv_json_number (w, "E_el+H", th->e_enthalpy / QV_HARTREE_EV);
          qv_json_number (w, "E_el+G", th->e_free_energy / QV_HARTREE_EV);
        }
      qv_json_begin_object (w, "per_molecule_eV");
      qv_json_number (w, "ZPE", th->total.zpe);
      qv_json_number (w, "U", th->total.energy);
      qv_json_number (w, "H", th->total.enthalpy);
      qv_json_number (w, "S_per_K", th->total.entropy);
      qv_json_number (w, "G", th->total.free_energy);
      qv_json_end_object (w);
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  if (r->modes)
    {
      qv_json_number (w, "per_mode_T", r->th[0].temperature);
      qv_json_begin_array (w, "modes");
      for (gsize k = 0; k < m->n_modes; k++)
        {
          const QvGasMode *md = &r->modes[k];
          qv_json_begin_object (w, NULL);
          qv_json_int (w, "index", (gint64) k + 1);
          qv_json_number (w, "wavenumber", md->wavenumber);
          qv_json_bool (w, "imaginary", md->wavenumber < 0);
          qv_json_bool (w, "used", md->used);
          if (md->used)
            {
              qv_json_number (w, "scaled", md->scaled);
              qv_json_number (w, "thermal", md->thermal);
              qv_json_number (w, "weight", md->weight);
              qv_json_number (w, "ZPE", md->zpe * kj);
              qv_json_number (w, "U", md->energy * kj);
              qv_json_number (w, "S", md->entropy * kj * 1000);
              qv_json_number (w, "S_fraction", r->th[0].vibration.entropy > 0
                                                ? md->entropy / r->th[0].vibration.entropy : 0);
              qv_json_number (w, "Cv", md->heat_capacity * kj * 1000);
              qv_json_number (w, "G", md->free_energy * kj);
              qv_json_number (w, "S_harmonic", md->entropy_harmonic * kj * 1000);
              qv_json_number (w, "S_free_rotor", md->entropy_free_rotor * kj * 1000);
            }
          qv_json_end_object (w);
        }
      qv_json_end_array (w);
    }
  qv_json_end_object (w);
  return qv_json_writer_finish (w);
}

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
  g_autoptr(GPtrArray) notes = g_ptr_array_new_with_free_func (g_free);
  g_autofree QvGasThermo *th = NULL;
  g_autofree QvGasMode *per = NULL;
  g_autofree double *t = NULL;
  g_autofree char *doc = NULL, *sigma_source = NULL;
  char *format_arg = NULL, *output = NULL, *pressure_arg = NULL, *state_arg = NULL,
       *sigma_arg = NULL, *soft_arg = NULL, *energy_arg = NULL;
  double temperature = NAN, t_min = NAN, t_max = NAN, t_step = NAN;
  double cutoff = NAN, omega0 = NAN, alpha = NAN, b_av = NAN, scale = NAN, zpe_scale = NAN;
  gint64 degeneracy = 1;
  gboolean force = FALSE, per_mode = FALSE, molecule_flag = FALSE;
  QvGasThermoOptions opt;
  Format format = FORMAT_TEXT;
  QvProjection projection = QV_PROJECTION_FULL;
  gsize n_t = 1;
  Report r = { 0 };
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
  if (format_arg)
    {
      static const char *const names[] = { "text", "csv", "json" };
      guint i;
      for (i = 0; i < 3 && g_ascii_strcasecmp (format_arg, names[i]) != 0; i++)
        ;
      if (i == 3)
        {
          g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "unknown format '%s'; accepted: text, csv, json",
                       format_arg);
          goto fail;
        }
      format = (Format) i;
    }
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
  else if (solve.point_group && solve.point_group->symmetry_number != opt.symmetry_number)
    g_ptr_array_add (notes, g_strdup_printf ("the point group %s has symmetry number %u; %u is used as given",
                                             solve.point_group->name, solve.point_group->symmetry_number,
                                             opt.symmetry_number));

  /* warnings the user must see */
  {
    g_auto(GStrv) warnings = qv_mode_set_warnings (modes);
    for (char **w = warnings; *w; w++)
      g_printerr ("quaver: warning: %s\n", *w);
  }
  if (mol->n_imaginary)
    {
      g_autofree char *msg = g_strdup_printf (
        "%" G_GSIZE_FORMAT " imaginary mode%s (down to %.2fi cm^-1) LEFT OUT of the thermochemistry: "
        "the structure is not a minimum (a transition state, or an unconverged geometry), and these "
        "numbers are not those of a stable species", mol->n_imaginary, mol->n_imaginary > 1 ? "s" : "",
        -mol->most_imaginary);
      g_printerr ("quaver: WARNING: %s\n", msg);
      g_ptr_array_add (notes, g_steal_pointer (&msg));
    }
  if (mol->n_zero)
    g_ptr_array_add (notes, g_strdup_printf ("%" G_GSIZE_FORMAT " mode%s of exactly zero wavenumber left out",
                                             mol->n_zero, mol->n_zero > 1 ? "s" : ""));
  if (mol->n_rigid)
    g_ptr_array_add (notes, g_strdup_printf ("the mode set has %" G_GSIZE_FORMAT " modes more than the "
                                             "vibrations; the %" G_GSIZE_FORMAT " smallest in |wavenumber| "
                                             "are taken as rigid-body motion and left out",
                                             mol->n_rigid, mol->n_rigid));
  {
    gsize n_soft = 0;
    double lowest = INFINITY;
    for (gsize k = 0; k < mol->n_modes; k++)
      if (mol->used[k] && mol->wavenumbers[k] * opt.frequency_scale < QV_GAS_RAISE_CUTOFF)
        {
          n_soft++;
          lowest = MIN (lowest, mol->wavenumbers[k] * opt.frequency_scale);
        }
    if (n_soft && opt.soft_modes == QV_SOFT_MODES_NONE)
      g_ptr_array_add (notes, g_strdup_printf ("%" G_GSIZE_FORMAT " real mode%s below 100 cm^-1 (lowest "
                                               "%.2f cm^-1) treated as harmonic: see --per-mode for "
                                               "their share and --soft-modes raise or quasi-rrho",
                                               n_soft, n_soft > 1 ? "s" : "", lowest));
  }
  g_ptr_array_add (notes, NULL);

  th = g_new0 (QvGasThermo, n_t);
  if (per_mode)
    {
      per = g_new0 (QvGasMode, MAX (mol->n_modes, 1));
      qv_gas_thermo_compute (mol, &opt, t[0], &th[0], per);
    }
  else
    qv_gas_thermo_sweep (mol, &opt, t, n_t, th);

  r.input = solve.demo ? "demo" : argv[1];
  r.formula = qv_structure_formula (input->structure);
  r.mol = mol;
  r.opt = &opt;
  r.sigma_source = sigma_source;
  r.n_t = n_t;
  r.th = th;
  r.modes = per;
  r.notes = (char **) notes->pdata;

  if (format == FORMAT_JSON)
    doc = json_report (&r);
  else
    {
      GString *s = g_string_new (NULL);
      if (format == FORMAT_TEXT)
        {
          text_header (s, &r);
          if (r.sweep)
            sweep_table (s, &r, FALSE);
          else
            text_terms (s, &th[0]);
          if (per)
            {
              g_string_append (s, "\n# per vibration at T = ");
              num (s, th[0].temperature, "%.4f");
              g_string_append (s, " K (S_%vib: share of the vibrational entropy; weight: quasi-rrho w)\n");
              mode_table (s, &r, FALSE);
            }
        }
      else if (r.sweep)
        sweep_table (s, &r, TRUE);
      else if (per)
        mode_table (s, &r, TRUE);
      else
        {
          const struct { const char *name; const QvGasTerm *tt; } rows[] = {
            { "translation", &th[0].translation }, { "rotation", &th[0].rotation },
            { "vibration", &th[0].vibration }, { "electronic", &th[0].electronic },
            { "total", &th[0].total },
          };
          g_string_append (s, "term,T_K,p_Pa");
          for (int c = 0; c < 6; c++)
            g_string_append_printf (s, ",%s", term_columns[c]);
          g_string_append_c (s, '\n');
          for (gsize i = 0; i < G_N_ELEMENTS (rows); i++)
            {
              double v[6];
              term_values (rows[i].tt, v);
              g_string_append_printf (s, "%s,", rows[i].name);
              num (s, th[0].temperature, "%.4f");
              g_string_append_c (s, ',');
              num (s, th[0].pressure, "%.6g");
              for (int c = 0; c < 6; c++)
                {
                  g_string_append_c (s, ',');
                  num (s, v[c], "%.6f");
                }
              g_string_append_c (s, '\n');
            }
        }
      doc = g_string_free (s, FALSE);
    }
  status = qv_cli_emit ("thermo", output, doc, force);
  g_free (r.formula);
  goto out;

fail:
  status = qv_cli_fail ("thermo --molecule", error);
out:
  qv_cli_solve_args_clear (&solve);
  g_free (format_arg); g_free (output); g_free (pressure_arg); g_free (state_arg);
  g_free (sigma_arg); g_free (soft_arg); g_free (energy_arg);
  return status;
}
