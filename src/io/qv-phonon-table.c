/* qv-phonon-table.c — text, CSV and JSON tables of bands, DOS and thermal
 * properties (qv-phonon-table.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <string.h>
#include "qv-element.h"
#include "qv-error.h"
#include "qv-json-writer.h"
#include "qv-phonon-table.h"

gboolean
qv_phonon_table_format_parse (const char *text, QvPhononTableFormat *format, GError **error)
{
  static const char *const names[] = { "text", "csv", "json" };
  for (gsize i = 0; i < G_N_ELEMENTS (names); i++)
    if (text && g_ascii_strcasecmp (text, names[i]) == 0)
      {
        *format = (QvPhononTableFormat) i;
        return TRUE;
      }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "unknown format '%s'; accepted: text, csv, json",
               text ? text : "");
  return FALSE;
}

static void
append_num (GString *s, double v, const char *format)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  g_string_append (s, g_ascii_formatd (buf, sizeof buf, format, v + 0.0));
}

static const char *
symbol (guint z)
{
  const QvElement *e = qv_element_from_z (z);
  return e ? e->symbol : "X";
}

static const char *
or_dash (const char *s)
{
  return s ? s : "-";
}

/* ---- bands ---- */

static const char *
label_at (const QvBandSampling *s, gsize k)
{
  for (gsize i = 0; i < s->n_labels; i++)
    if (s->label_index[i] == k)
      return s->labels[i];
  return NULL;
}

static char *
bands_json (const QvBandTableInfo *info, const QvBandSampling *s, gsize nb, const double *w)
{
  QvJsonWriter *jw = qv_json_writer_new ();
  double m[9];

  qv_json_begin_object (jw, NULL);
  qv_json_string (jw, "program", info->source.program);
  qv_json_string (jw, "primitive", info->source.primitive);
  qv_json_string (jw, "hessian", info->source.hessian);
  qv_json_string (jw, "hessian_units", info->source.hessian_units);
  if (info->source.born)
    qv_json_string (jw, "born", info->source.born);
  for (int i = 0; i < 9; i++)
    m[i] = info->supercell[i / 3][i % 3];
  qv_json_numbers (jw, "supercell_matrix", m, 9);
  qv_json_int (jw, "n_sites", (gint64) info->source.n_sites);
  qv_json_int (jw, "n_branches", (gint64) nb);
  if (info->lattice)
    qv_json_string (jw, "lattice", info->lattice);
  else
    qv_json_null (jw, "lattice");
  qv_json_string (jw, "path", info->path);
  qv_json_string (jw, "q_convention",
                  "fractional reciprocal coordinates without 2 pi: q = sum_i q_i b_i, a_i.b_j = 2 pi delta_ij");
  qv_json_string (jw, "distance_unit", "1/angstrom (with 2 pi)");
  qv_json_string (jw, "wavenumber_unit", "cm^-1 (negative: imaginary)");
  qv_json_string (jw, "phase_convention", "D(q) = sum_l Phi(l) exp(i q.(R_l + tau_k' - tau_k)) / sqrt(m_k m_k')");
  qv_json_string (jw, "connection", info->overlap ? "eigenvector overlap" : "ascending at each q");
  qv_json_bool (jw, "sum_rule", info->source.sum_rule);
  qv_json_numbers (jw, "gamma_acoustic_before_sum_rule", info->gamma_acoustic, 3);
  qv_json_number (jw, "largest_row_sum_removed", info->row_sum_removed);
  qv_json_number (jw, "periodicity_residual", info->periodicity_residual);
  qv_json_begin_array (jw, "labels");
  for (gsize i = 0; i < s->n_labels; i++)
    {
      qv_json_begin_object (jw, NULL);
      qv_json_string (jw, "label", s->labels[i]);
      qv_json_number (jw, "distance", s->label_distance[i]);
      qv_json_int (jw, "index", (gint64) s->label_index[i]);
      qv_json_end_object (jw);
    }
  qv_json_end_array (jw);
  qv_json_begin_array (jw, "points");
  for (gsize k = 0; k < s->n_q; k++)
    {
      qv_json_begin_object (jw, NULL);
      qv_json_numbers (jw, "q", s->q + 3 * k, 3);
      qv_json_number (jw, "distance", s->distance[k]);
      qv_json_numbers (jw, "wavenumbers", w + k * nb, nb);
      qv_json_end_object (jw);
    }
  qv_json_end_array (jw);
  qv_json_end_object (jw);
  return qv_json_writer_finish (jw);
}

char *
qv_phonon_table_bands (const QvBandTableInfo *info, const QvBandSampling *s, gsize nb,
                       const double *w, QvPhononTableFormat format)
{
  GString *out;
  const int (*m)[3] = info->supercell;

  if (format == QV_PHONON_TABLE_JSON)
    return bands_json (info, s, nb, w);
  out = g_string_new (NULL);
  if (format == QV_PHONON_TABLE_TEXT)
    {
      g_string_append_printf (out, "# quaver bands: %s, %" G_GSIZE_FORMAT " sites, supercell "
                              "[%d %d %d; %d %d %d; %d %d %d] (%" G_GSIZE_FORMAT " cells), lattice %s\n",
                              or_dash (info->source.primitive), info->source.n_sites, m[0][0], m[0][1],
                              m[0][2], m[1][0], m[1][1], m[1][2], m[2][0], m[2][1], m[2][2],
                              info->n_cells, info->lattice ? info->lattice : "(user path)");
      g_string_append_printf (out, "# path: %s\n", or_dash (info->path));
      g_string_append (out, "# q: fractional reciprocal coordinates (q = qa b1 + qb b2 + qc b3, "
                            "a_i.b_j = 2 pi delta_ij); distance: 1/A with 2 pi\n");
      g_string_append_printf (out, "# wavenumbers: cm^-1, negative = imaginary; branches %s\n",
                              info->overlap ? "connected by eigenvector overlap" : "in ascending order at each q");
      g_string_append (out, info->source.sum_rule ? "# acoustic at Gamma before the sum rule:"
                                                  : "# acoustic at Gamma (no sum rule imposed):");
      for (int i = 0; i < 3; i++)
        {
          g_string_append_c (out, ' ');
          append_num (out, info->gamma_acoustic[i], "%.4f");
        }
      g_string_append (out, " cm^-1\n# labels:");
      for (gsize i = 0; i < s->n_labels; i++)
        {
          g_string_append_printf (out, " %s ", s->labels[i]);
          append_num (out, s->label_distance[i], "%.6f");
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
  for (gsize k = 0; k < s->n_q; k++)
    {
      const char *sep = format == QV_PHONON_TABLE_CSV ? "," : " ";
      const char *label = label_at (s, k);
      append_num (out, s->distance[k], "%.6f");
      for (int i = 0; i < 3; i++)
        {
          g_string_append (out, sep);
          append_num (out, s->q[3 * k + i], "%.6f");
        }
      if (format == QV_PHONON_TABLE_CSV)
        g_string_append_printf (out, ",%s", label ? label : "");
      for (gsize b = 0; b < nb; b++)
        {
          g_string_append (out, sep);
          append_num (out, w[k * nb + b], "%.4f");
        }
      if (format == QV_PHONON_TABLE_TEXT && label)
        g_string_append_printf (out, "  # %s", label);
      g_string_append_c (out, '\n');
    }
  return g_string_free (out, FALSE);
}

/* ---- DOS ---- */

static char *
dos_json (const QvDosTableInfo *info, const QvPhononDos *dos)
{
  const double per_cm1 = qv_frequency_from_wavenumber (1.0, info->unit);
  const char *unit = qv_frequency_unit_name (info->unit);
  QvJsonWriter *w = qv_json_writer_new ();
  g_autofree double *x = g_new (double, MAX (dos->n_points, 1));
  g_autofree double *y = g_new (double, MAX (dos->n_points, 1));
  const double mesh_d[3] = { dos->mesh[0], dos->mesh[1], dos->mesh[2] };
  g_autofree char *dos_unit = g_strdup_printf ("states per %s per primitive cell", unit);

  qv_json_begin_object (w, NULL);
  qv_json_string (w, "program", info->source.program);
  qv_json_string (w, "primitive", info->source.primitive);
  qv_json_string (w, "hessian", info->source.hessian);
  if (info->source.born)
    {
      qv_json_string (w, "born", info->source.born);
      qv_json_string (w, "nonanalytic_at_gamma",
                      "left out: no direction of approach (TO only at q = 0, weight 1/N_q)");
    }
  qv_json_string (w, "method", qv_dos_method_name (dos->method));
  if (dos->method == QV_DOS_GAUSSIAN)
    qv_json_number (w, "sigma", dos->sigma * per_cm1);
  else
    qv_json_null (w, "sigma");
  qv_json_numbers (w, "mesh", mesh_d, 3);
  qv_json_string (w, "mesh_kind", "Gamma-centred, no symmetry reduction");
  qv_json_int (w, "n_q", (gint64) info->n_q);
  qv_json_int (w, "n_sites", (gint64) info->source.n_sites);
  qv_json_number (w, "states_per_cell", 3.0 * info->source.n_sites);
  qv_json_string (w, "frequency_unit", unit);
  qv_json_string (w, "dos_unit", dos_unit);
  qv_json_bool (w, "sum_rule", info->source.sum_rule);
  qv_json_number (w, "step", dos->step * per_cm1);
  for (gsize b = 0; b < dos->n_points; b++)
    {
      x[b] = dos->omega[b] * per_cm1;
      y[b] = dos->total[b] / per_cm1;
    }
  qv_json_numbers (w, "frequency", x, dos->n_points);
  qv_json_numbers (w, "total", y, dos->n_points);
  qv_json_begin_object (w, "partial");
  for (gsize g = 0; g < dos->n_groups; g++)
    {
      for (gsize b = 0; b < dos->n_points; b++)
        y[b] = dos->partial[g * dos->n_points + b] / per_cm1;
      qv_json_numbers (w, symbol (dos->z[g]), y, dos->n_points);
    }
  qv_json_end_object (w);
  qv_json_end_object (w);
  return qv_json_writer_finish (w);
}

char *
qv_phonon_table_dos (const QvDosTableInfo *info, const QvPhononDos *dos, QvPhononTableFormat format)
{
  const double per_cm1 = qv_frequency_from_wavenumber (1.0, info->unit);
  const char *unit = qv_frequency_unit_name (info->unit);
  GString *out;

  if (format == QV_PHONON_TABLE_JSON)
    return dos_json (info, dos);
  out = g_string_new (NULL);
  if (format == QV_PHONON_TABLE_TEXT)
    {
      g_string_append_printf (out, "# quaver dos: %s, %" G_GSIZE_FORMAT " sites, mesh %dx%dx%d "
                              "(Gamma-centred, %" G_GSIZE_FORMAT " q), method %s",
                              or_dash (info->source.primitive), info->source.n_sites, dos->mesh[0],
                              dos->mesh[1], dos->mesh[2], info->n_q, qv_dos_method_name (dos->method));
      if (dos->method == QV_DOS_GAUSSIAN)
        {
          g_string_append (out, ", sigma ");
          append_num (out, dos->sigma * per_cm1, "%.6g");
          g_string_append_printf (out, " %s", unit);
        }
      g_string_append_printf (out, "\n# DOS: states per %s per primitive cell; integrates to 3n = %"
                              G_GSIZE_FORMAT "; negative frequencies are imaginary\n",
                              unit, 3 * info->source.n_sites);
      if (info->source.born)
        g_string_append_printf (out, "# Born charges from %s: the LO-TO term is added at every q "
                                "except Gamma itself, which has no direction of approach (TO only "
                                "at that one point, weight 1/N_q)\n", info->source.born);
      g_string_append_printf (out, "# frequency_%s total", unit);
      for (gsize g = 0; g < dos->n_groups; g++)
        g_string_append_printf (out, " %s", symbol (dos->z[g]));
      g_string_append_c (out, '\n');
    }
  else
    {
      g_string_append_printf (out, "frequency_%s,total", unit);
      for (gsize g = 0; g < dos->n_groups; g++)
        g_string_append_printf (out, ",%s", symbol (dos->z[g]));
      g_string_append_c (out, '\n');
    }
  for (gsize b = 0; b < dos->n_points; b++)
    {
      const char *sep = format == QV_PHONON_TABLE_CSV ? "," : " ";
      append_num (out, dos->omega[b] * per_cm1, "%.6f");
      g_string_append (out, sep);
      append_num (out, dos->total[b] / per_cm1, "%.8e");
      for (gsize g = 0; g < dos->n_groups; g++)
        {
          g_string_append (out, sep);
          append_num (out, dos->partial[g * dos->n_points + b] / per_cm1, "%.8e");
        }
      g_string_append_c (out, '\n');
    }
  return g_string_free (out, FALSE);
}

/* ---- thermal properties ---- */

static char *
thermal_json (const QvThermalTableInfo *info, const QvThermal *th)
{
  const double kj = qv_thermal_kj_per_mol (MAX (info->formula_units, (gsize) 1));
  const gsize n_t = th->n_t, n_sites = info->source.n_sites;
  QvJsonWriter *w = qv_json_writer_new ();
  g_autofree double *col = g_new (double, MAX (n_t, 1));
  const double mesh_d[3] = { info->mesh[0], info->mesh[1], info->mesh[2] };
  const struct { const char *key; const double *v; double f; } cols[] = {
    { "F", th->free_energy, kj }, { "U", th->energy, kj }, { "S", th->entropy, kj * 1000 },
    { "Cv", th->heat_capacity, kj * 1000 }, { "ZPE", th->zpe, kj },
  };

  qv_json_begin_object (w, NULL);
  qv_json_string (w, "program", info->source.program);
  qv_json_string (w, "primitive", info->source.primitive);
  qv_json_string (w, "hessian", info->source.hessian);
  if (info->source.born)
    {
      qv_json_string (w, "born", info->source.born);
      qv_json_string (w, "nonanalytic_at_gamma",
                      "left out: no direction of approach (TO only at q = 0, weight 1/N_q)");
    }
  qv_json_numbers (w, "mesh", mesh_d, 3);
  qv_json_string (w, "mesh_kind", "Gamma-centred, no symmetry reduction");
  qv_json_int (w, "n_q", (gint64) info->n_q);
  qv_json_int (w, "n_sites", (gint64) n_sites);
  qv_json_string (w, "formula_unit", info->formula);
  qv_json_int (w, "formula_units_per_cell", (gint64) info->formula_units);
  qv_json_bool (w, "sum_rule", info->source.sum_rule);
  qv_json_int (w, "modes_summed", (gint64) th->n_modes);
  qv_json_int (w, "gamma_acoustic_left_out", (gint64) th->n_gamma_skipped);
  qv_json_int (w, "imaginary_left_out", (gint64) th->n_imaginary);
  qv_json_int (w, "zero_left_out", (gint64) th->n_zero);
  qv_json_number (w, "most_imaginary_cm-1", th->most_imaginary);
  qv_json_begin_object (w, "units");
  qv_json_string (w, "T", "K");
  qv_json_string (w, "F", "kJ/mol (per mole of formula units)");
  qv_json_string (w, "U", "kJ/mol (per mole of formula units)");
  qv_json_string (w, "ZPE", "kJ/mol (per mole of formula units)");
  qv_json_string (w, "S", "J/(K mol) (per mole of formula units)");
  qv_json_string (w, "Cv", "J/(K mol) (per mole of formula units)");
  qv_json_string (w, "per_cell", "eV for F, U, ZPE and eV/K for S, Cv, per primitive cell");
  qv_json_string (w, "adp", "angstrom^2, Cartesian U_ij");
  qv_json_string (w, "sound", "m/s");
  qv_json_end_object (w);
  qv_json_numbers (w, "T", th->t, n_t);
  for (gsize c = 0; c < G_N_ELEMENTS (cols); c++)
    {
      for (gsize i = 0; i < n_t; i++)
        col[i] = cols[c].v[i] * cols[c].f;
      qv_json_numbers (w, cols[c].key, col, n_t);
    }
  qv_json_begin_object (w, "per_cell");
  for (gsize c = 0; c < G_N_ELEMENTS (cols); c++)
    qv_json_numbers (w, cols[c].key, cols[c].v, n_t);
  qv_json_end_object (w);
  if (info->adp)
    {
      qv_json_begin_array (w, "adp");
      for (gsize s = 0; s < n_sites; s++)
        {
          qv_json_begin_object (w, NULL);
          qv_json_int (w, "site", (gint64) s + 1);
          qv_json_string (w, "element", symbol (info->site_z ? info->site_z[s] : 0));
          qv_json_begin_array (w, "U");
          for (gsize i = 0; i < n_t; i++)
            qv_json_numbers (w, NULL, info->adp + (i * n_sites + s) * 9, 9);
          qv_json_end_array (w);
          for (gsize i = 0; i < n_t; i++)
            {
              const double *m = info->adp + (i * n_sites + s) * 9;
              col[i] = (m[0] + m[4] + m[8]) / 3;
            }
          qv_json_numbers (w, "U_iso", col, n_t);
          qv_json_end_object (w);
        }
      qv_json_end_array (w);
    }
  if (info->sound)
    {
      qv_json_begin_array (w, "sound");
      for (gsize d = 0; d < info->n_sound; d++)
        {
          const QvSoundTableEntry *e = &info->sound[d];
          qv_json_begin_object (w, NULL);
          qv_json_numbers (w, "direction", e->given, 3);
          qv_json_string (w, "direction_kind", info->sound_cartesian ? "cartesian" : "fractional reciprocal");
          if (e->ok)
            {
              qv_json_numbers (w, "cartesian_unit", e->v.direction, 3);
              qv_json_numbers (w, "velocity", e->v.velocity, 3);
              qv_json_numbers (w, "linearity", e->v.linearity, 3);
              qv_json_numbers (w, "longitudinal_fraction", e->v.longitudinal, 3);
            }
          else
            qv_json_string (w, "error", e->message);
          qv_json_end_object (w);
        }
      qv_json_end_array (w);
    }
  qv_json_end_object (w);
  return qv_json_writer_finish (w);
}

char *
qv_phonon_table_thermal (const QvThermalTableInfo *info, const QvThermal *th,
                         QvPhononTableFormat format)
{
  const double kj = qv_thermal_kj_per_mol (MAX (info->formula_units, (gsize) 1));
  const gsize n_sites = info->source.n_sites;
  const double *u = info->adp;
  GString *out;

  if (format == QV_PHONON_TABLE_JSON)
    return thermal_json (info, th);
  out = g_string_new (NULL);
  if (format == QV_PHONON_TABLE_TEXT)
    {
      g_string_append_printf (out, "# quaver thermo: %s, %" G_GSIZE_FORMAT " sites, formula unit %s "
                              "(%" G_GSIZE_FORMAT " per cell), mesh %dx%dx%d (Gamma-centred, %"
                              G_GSIZE_FORMAT " q)\n", or_dash (info->source.primitive), n_sites,
                              or_dash (info->formula), info->formula_units, info->mesh[0],
                              info->mesh[1], info->mesh[2], info->n_q);
      g_string_append_printf (out, "# modes summed %" G_GSIZE_FORMAT "; left out: %" G_GSIZE_FORMAT
                              " acoustic at Gamma, %" G_GSIZE_FORMAT " imaginary, %" G_GSIZE_FORMAT " zero\n",
                              th->n_modes, th->n_gamma_skipped, th->n_imaginary, th->n_zero);
      if (info->source.born)
        g_string_append_printf (out, "# Born charges from %s: the LO-TO term is added at every q "
                                "except Gamma itself, which has no direction of approach (TO only "
                                "at that one point, weight 1/N_q); --sound from the force constants "
                                "alone\n", info->source.born);
      g_string_append (out, "# per mole of formula units: F, U, ZPE in kJ/mol; S, Cv in J/(K mol). "
                            "Per primitive cell: F, U, ZPE in eV; S, Cv in meV/K\n");
      for (gsize d = 0; info->sound && d < info->n_sound; d++)
        {
          const QvSoundTableEntry *e = &info->sound[d];
          g_string_append_printf (out, "# sound along (%g %g %g)%s: ", e->given[0], e->given[1],
                                  e->given[2], info->sound_cartesian ? " Cartesian" : "");
          if (!e->ok)
            g_string_append_printf (out, "none (%s)\n", or_dash (e->message));
          else
            {
              for (int b = 0; b < 3; b++)
                {
                  append_num (out, e->v.velocity[b], "%.1f");
                  g_string_append (out, b < 2 ? " " : " m/s; longitudinal fraction");
                }
              for (int b = 0; b < 3; b++)
                {
                  g_string_append_c (out, ' ');
                  append_num (out, e->v.longitudinal[b], "%.3f");
                }
              g_string_append_c (out, '\n');
            }
        }
      g_string_append (out, "# T_K F_kJ/mol U_kJ/mol S_J/(K.mol) Cv_J/(K.mol) ZPE_kJ/mol F_eV/cell "
                            "U_eV/cell S_meV/(K.cell) Cv_meV/(K.cell)");
    }
  else
    g_string_append (out, "T_K,F_kJ/mol,U_kJ/mol,S_J/(K.mol),Cv_J/(K.mol),ZPE_kJ/mol,F_eV/cell,"
                          "U_eV/cell,S_meV/(K.cell),Cv_meV/(K.cell)");
  if (u)
    for (gsize s = 0; s < n_sites; s++)
      {
        static const char *names[] = { "U11", "U22", "U33", "U12", "U13", "U23" };
        for (int c = 0; c < 6; c++)
          g_string_append_printf (out, "%s%s_%s%" G_GSIZE_FORMAT "_A^2", format == QV_PHONON_TABLE_CSV ? "," : " ",
                                  names[c], symbol (info->site_z ? info->site_z[s] : 0), s + 1);
      }
  g_string_append_c (out, '\n');
  for (gsize i = 0; i < th->n_t; i++)
    {
      const char *sep = format == QV_PHONON_TABLE_CSV ? "," : " ";
      const double row[10] = { th->t[i], th->free_energy[i] * kj, th->energy[i] * kj,
                               th->entropy[i] * kj * 1000, th->heat_capacity[i] * kj * 1000,
                               th->zpe[i] * kj, th->free_energy[i], th->energy[i],
                               th->entropy[i] * 1000, th->heat_capacity[i] * 1000 };
      for (int c = 0; c < 10; c++)
        {
          if (c)
            g_string_append (out, sep);
          append_num (out, row[c], c == 0 ? "%.4f" : "%.8g");
        }
      if (u)
        for (gsize s = 0; s < n_sites; s++)
          {
            const double *m = u + (i * n_sites + s) * 9;
            const double v[6] = { m[0], m[4], m[8], m[1], m[2], m[5] };
            for (int c = 0; c < 6; c++)
              {
                g_string_append (out, sep);
                append_num (out, v[c], "%.8g");
              }
          }
      g_string_append_c (out, '\n');
    }
  return g_string_free (out, FALSE);
}
