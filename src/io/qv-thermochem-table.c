/* qv-thermochem-table.c — the tables of a molecule's gas-phase
 * thermochemistry, as `quaver thermo MOLECULE` prints them and the app's
 * Thermochemistry page saves them. Moved from src/cli/qv-cmd-thermo-molecule.c
 * unchanged, so the command's output stays byte for byte what it was.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-config.h"
#include "qv-error.h"
#include "qv-json-writer.h"
#include "qv-thermochem-table.h"
#include "qv-units.h"

typedef QvThermochemReport Report;

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

const char *
qv_thermochem_soft_reference (QvSoftModes soft)
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
                              "Cv and S (ZPE unchanged); %s", o->cutoff, qv_thermochem_soft_reference (o->soft_modes));
    case QV_SOFT_MODES_QUASI_RRHO:
      return g_strdup_printf ("quasi-rrho: S = w S_HO + (1-w) S_free-rotor, w = 1/(1+(%g/nu)^%g), "
                              "B_av = %g kg m^2; energies and Cv harmonic; %s", o->omega0, o->alpha,
                              o->b_av, qv_thermochem_soft_reference (o->soft_modes));
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

  g_string_append_printf (s, "# %s (molecule): %s, %s, %" G_GSIZE_FORMAT " atoms, mass ",
                          r->program, r->input, r->formula, m->n_atoms);
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

  g_autofree char *program = g_strdup_printf ("%s " QV_VERSION, r->program);

  qv_json_begin_object (w, NULL);
  qv_json_string (w, "program", program);
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
  qv_json_string (w, "reference", qv_thermochem_soft_reference (o->soft_modes));
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

/* ---- the document ---- */

static void
csv_terms (GString *s, const QvGasThermo *th)
{
  const struct { const char *name; const QvGasTerm *tt; } rows[] = {
    { "translation", &th->translation }, { "rotation", &th->rotation },
    { "vibration", &th->vibration }, { "electronic", &th->electronic },
    { "total", &th->total },
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
      num (s, th->temperature, "%.4f");
      g_string_append_c (s, ',');
      num (s, th->pressure, "%.6g");
      for (int c = 0; c < 6; c++)
        {
          g_string_append_c (s, ',');
          num (s, v[c], "%.6f");
        }
      g_string_append_c (s, '\n');
    }
}

char *
qv_thermochem_table_write (const QvThermochemReport *r, QvThermochemTableFormat format)
{
  GString *s;

  if (format == QV_THERMOCHEM_TABLE_JSON)
    return json_report (r);
  s = g_string_new (NULL);
  if (format == QV_THERMOCHEM_TABLE_TEXT)
    {
      text_header (s, r);
      if (r->sweep)
        sweep_table (s, r, FALSE);
      else
        text_terms (s, &r->th[0]);
      if (r->modes)
        {
          g_string_append (s, "\n# per vibration at T = ");
          num (s, r->th[0].temperature, "%.4f");
          g_string_append (s, " K (S_%vib: share of the vibrational entropy; weight: quasi-rrho w)\n");
          mode_table (s, r, FALSE);
        }
    }
  else if (r->sweep)
    sweep_table (s, r, TRUE);
  else if (r->modes)
    mode_table (s, r, TRUE);
  else
    csv_terms (s, &r->th[0]);
  return g_string_free (s, FALSE);
}

gboolean
qv_thermochem_table_format_parse (const char *text, QvThermochemTableFormat *format, GError **error)
{
  static const char *const names[] = { "text", "csv", "json" };

  for (guint i = 0; i < G_N_ELEMENTS (names); i++)
    if (text && g_ascii_strcasecmp (text, names[i]) == 0)
      {
        *format = (QvThermochemTableFormat) i;
        return TRUE;
      }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "unknown format '%s'; accepted: text, csv, json",
               text ? text : "");
  return FALSE;
}

/* ---- notes ---- */

char *
qv_thermochem_imaginary_warning (const QvGasMolecule *mol)
{
  if (mol->n_imaginary == 0)
    return NULL;
  return g_strdup_printf (
    "%" G_GSIZE_FORMAT " imaginary mode%s (down to %.2fi cm^-1) LEFT OUT of the thermochemistry: "
    "the structure is not a minimum (a transition state, or an unconverged geometry), and these "
    "numbers are not those of a stable species", mol->n_imaginary, mol->n_imaginary > 1 ? "s" : "",
    -mol->most_imaginary);
}

char **
qv_thermochem_notes (const QvGasMolecule *mol, const QvGasThermoOptions *opt,
                     const char *group_name, guint group_sigma, gboolean sigma_given)
{
  GPtrArray *notes = g_ptr_array_new ();
  char *imaginary = qv_thermochem_imaginary_warning (mol);

  if (sigma_given && group_name && group_sigma != opt->symmetry_number)
    g_ptr_array_add (notes, g_strdup_printf ("the point group %s has symmetry number %u; %u is used as given",
                                             group_name, group_sigma, opt->symmetry_number));
  if (imaginary)
    g_ptr_array_add (notes, imaginary);
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
      if (mol->used[k] && mol->wavenumbers[k] * opt->frequency_scale < QV_GAS_RAISE_CUTOFF)
        {
          n_soft++;
          lowest = MIN (lowest, mol->wavenumbers[k] * opt->frequency_scale);
        }
    if (n_soft && opt->soft_modes == QV_SOFT_MODES_NONE)
      g_ptr_array_add (notes, g_strdup_printf ("%" G_GSIZE_FORMAT " real mode%s below 100 cm^-1 (lowest "
                                               "%.2f cm^-1) treated as harmonic: see --per-mode for "
                                               "their share and --soft-modes raise or quasi-rrho",
                                               n_soft, n_soft > 1 ? "s" : "", lowest));
  }
  g_ptr_array_add (notes, NULL);
  return (char **) g_ptr_array_free (notes, FALSE);
}
