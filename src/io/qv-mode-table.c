/* qv-mode-table.c
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-config.h"
#include "qv-element.h"
#include "qv-error.h"
#include "qv-json-writer.h"
#include "qv-mode-table.h"

gboolean
qv_table_format_parse (const char *text, QvTableFormat *format, GError **error)
{
  static const struct { const char *name; QvTableFormat f; } names[] = {
    { "text", QV_TABLE_TEXT }, { "csv", QV_TABLE_CSV },
    { "json", QV_TABLE_JSON }, { "markdown", QV_TABLE_MARKDOWN }, { "md", QV_TABLE_MARKDOWN },
  };
  for (gsize i = 0; i < G_N_ELEMENTS (names); i++)
    if (text && g_ascii_strcasecmp (text, names[i].name) == 0)
      {
        *format = names[i].f;
        return TRUE;
      }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "unknown format '%s'; accepted: text, csv, json, markdown", text ? text : "");
  return FALSE;
}

/* One row of the table, computed once for every format. */
typedef struct {
  double wavenumber;           /* signed cm⁻¹ */
  double shown;                /* |value| in the chosen unit */
  gboolean imaginary;
  double reduced_mass, force_constant, collectivity;
  QvTurningPoint tp;
  QvThermalAmplitude th;
  gsize main_atom;             /* largest participation */
  double main_share;
  gboolean has_mixing;
  double mix_translation, mix_rotation;
} Row;

static void
compute_row (const QvModeReport *r, gsize k, Row *row, double *participation)
{
  const QvModeSet *m = r->modes;
  row->wavenumber = qv_mode_set_wavenumber (m, k);
  row->imaginary = qv_mode_set_is_imaginary (m, k);
  row->shown = fabs (qv_frequency_from_wavenumber (row->wavenumber, r->unit));
  row->reduced_mass = qv_mode_set_reduced_mass (m, k);
  row->force_constant = qv_mode_set_force_constant (m, k);
  row->collectivity = qv_mode_set_collectivity (m, k);
  qv_mode_set_turning_point (m, k, r->level, &row->tp);
  qv_mode_set_thermal (m, k, r->temperature, &row->th);
  /* @participation (n_atoms) keeps the shares for the caller */
  qv_mode_set_participation (m, k, participation);
  row->main_atom = 0;
  for (gsize a = 1; a < m->n_atoms; a++)
    if (participation[a] > participation[row->main_atom])
      row->main_atom = a;
  row->main_share = participation[row->main_atom];
  row->has_mixing = qv_mode_set_rigid_mixing (m, k, &row->mix_translation, &row->mix_rotation);
}

/* "H9": element symbol and 1-based index. */
static void
atom_name (char *buf, gsize size, const QvStructure *s, gsize atom)
{
  const QvElement *e = qv_element_from_z (s->atoms[atom].z);
  g_snprintf (buf, size, "%s%" G_GSIZE_FORMAT, e ? e->symbol : "?", atom + 1);
}

/* Rounds away the sign of a value that prints as zero ("-0.00"). */
static double
tidy (double x, double resolution)
{
  return fabs (x) < 0.5 * resolution ? 0.0 : x;
}

static const char *
projection_description (const QvModeSet *m)
{
  if (m->projection == QV_PROJECTION_NONE)
    return m->has_hessian ? "none (rigid-body motion kept)" : "none (precomputed modes)";
  if (m->projection == QV_PROJECTION_TRANSLATIONS)
    return "translations";
  return m->linear ? "full (3 translations + 2 rotations, linear)"
                   : m->n_rotations == 3 ? "full (3 translations + 3 rotations)"
                   : "full (3 translations, no rotation: a single atom)";
}

static void
append_residuals (GString *out, const char *prefix, const QvModeSet *m)
{
  if (m->n_translations + m->n_rotations == 0 || !m->has_hessian)
    return;
  g_string_append_printf (out, "%srigid-body residuals (cm^-1):", prefix);
  if (m->n_translations)
    {
      g_string_append (out, " translations");
      for (guint i = 0; i < m->n_translations; i++)
        g_string_append_printf (out, " %.2f", tidy (m->translation_residuals[i], 0.01));
    }
  if (m->n_rotations)
    {
      g_string_append (out, "; rotations");
      for (guint i = 0; i < m->n_rotations; i++)
        g_string_append_printf (out, " %.2f", tidy (m->rotation_residuals[i], 0.01));
    }
  g_string_append (out, "\n");
}

static void
append_header (GString *out, const char *prefix, const QvModeReport *r)
{
  const QvModeSet *m = r->modes;
  g_autofree char *formula = qv_structure_formula (r->structure);

  g_string_append_printf (out, "%squaver %s: normal modes of %s (%" G_GSIZE_FORMAT " atoms)\n",
                          prefix, QV_VERSION, formula, r->structure->n_atoms);
  g_string_append_printf (out, "%sprojection: %s; %" G_GSIZE_FORMAT " vibrations", prefix,
                          projection_description (m), m->n_vibrations);
  if (m->lowest_only)
    g_string_append_printf (out, ", the lowest %" G_GSIZE_FORMAT " shown", m->n_modes);
  if (m->eigensolver)
    g_string_append_printf (out, " (eigensolver: %s)", m->eigensolver);
  g_string_append (out, "\n");
  if (m->has_hessian)
    g_string_append_printf (out, "%sHessian: %s, layout %s, units %s, asymmetry %.2g\n", prefix,
                            r->hessian_source ? r->hessian_source : "(given)",
                            qv_hessian_layout_name (r->layout),
                            r->hessian_units ? r->hessian_units : "eV/A^2", m->asymmetry);
  g_string_append_printf (out, "%smasses: %s; turning points at v = %u; thermal RMS at T = %g K\n",
                          prefix,
                          r->mass_model == QV_MASS_AVERAGE ? "standard atomic weights"
                                                           : "most abundant isotopes",
                          r->level, r->temperature);
  append_residuals (out, prefix, m);
  if (m->has_gradient)
    g_string_append_printf (out, "%sgradient norm: %.3g eV/A, largest atomic force %.3g eV/A\n",
                            prefix, m->gradient_norm, m->max_force);
}

static void
format_frequency (char *buf, gsize size, const Row *row, int decimals)
{
  g_snprintf (buf, size, "%.*f%s", decimals, row->shown, row->imaginary ? "i" : "");
}

static char *
format_text (const QvModeReport *r)
{
  g_autofree double *participation = g_new (double, MAX (r->modes->n_atoms, 1));
  const QvModeSet *m = r->modes;
  GString *out = g_string_new (NULL);
  g_auto(GStrv) warnings = qv_mode_set_warnings (m);
  const int decimals = r->unit == QV_FREQUENCY_CM1 ? 2 : 4;
  char qhead[32];

  append_header (out, "# ", r);
  for (char **w = warnings; *w; w++)
    g_string_append_printf (out, "warning: %s\n", *w);
  g_snprintf (qhead, sizeof qhead, "Q_tp(v=%u)", r->level);
  g_string_append_printf (out, "%5s %12s %9s %11s %10s %9s %5s %9s %11s %6s\n",
                          "mode", "frequency", "red.mass", "force const", qhead,
                          "max disp", "atom", "RMS(T)", "moves most", "rot.mix");
  g_string_append_printf (out, "%5s %12s %9s %11s %10s %9s %5s %9s %11s %6s\n",
                          "", qv_frequency_unit_name (r->unit), "u", "mdyn/A", "u^1/2 A",
                          "A", "", "A", "", "%");
  for (gsize k = 0; k < m->n_modes; k++)
    {
      Row row;
      char freq[40], q[24], d[24], atom[16], rms[24], main_atom[32], mix[16];
      compute_row (r, k, &row, participation);
      format_frequency (freq, sizeof freq, &row, decimals);
      if (row.tp.defined)
        {
          g_snprintf (q, sizeof q, "%.4f", row.tp.q);
          g_snprintf (d, sizeof d, "%.4f", row.tp.max_displacement);
          atom_name (atom, sizeof atom, r->structure, row.tp.max_atom);
        }
      else
        {
          g_strlcpy (q, "-", sizeof q);
          g_strlcpy (d, "-", sizeof d);
          g_strlcpy (atom, "-", sizeof atom);
        }
      if (row.th.defined)
        g_snprintf (rms, sizeof rms, "%.4f", row.th.max_rms_displacement);
      else
        g_strlcpy (rms, "-", sizeof rms);
      {
        char name[16];
        atom_name (name, sizeof name, r->structure, row.main_atom);
        g_snprintf (main_atom, sizeof main_atom, "%s %3.0f%%", name, 100.0 * row.main_share);
      }
      if (row.has_mixing)
        g_snprintf (mix, sizeof mix, "%.1f", tidy (100.0 * row.mix_rotation, 0.1));
      else
        g_strlcpy (mix, "-", sizeof mix);
      g_string_append_printf (out, "%5" G_GSIZE_FORMAT " %12s %9.4f %11.4f %10s %9s %5s %9s %11s %6s\n",
                              k + 1, freq, row.reduced_mass, row.force_constant, q, d, atom,
                              rms, main_atom, mix);
    }
  if (qv_mode_set_count_imaginary (m) > 0)
    g_string_append (out, "# 'i' marks an imaginary mode (negative curvature): it has no turning point\n");
  g_string_append (out, "# moves most: the atom with the largest share of the mode; rot.mix: rotation "
                        "the projection removed from the mode\n");
  return g_string_free (out, FALSE);
}

static char *
format_csv (const QvModeReport *r)
{
  g_autofree double *participation = g_new (double, MAX (r->modes->n_atoms, 1));
  const QvModeSet *m = r->modes;
  GString *out = g_string_new (NULL);
  g_string_append (out, "index,wavenumber_cm-1,imaginary,reduced_mass_u,force_constant_mdyn_per_A,"
                        "level,turning_point_Q_u^1/2_A,max_displacement_A,max_atom,"
                        "temperature_K,thermal_Q_rms_u^1/2_A,thermal_max_rms_A,collectivity,"
                        "translation_mixing,rotation_mixing\n");
  for (gsize k = 0; k < m->n_modes; k++)
    {
      Row row;
      compute_row (r, k, &row, participation);
      g_string_append_printf (out, "%" G_GSIZE_FORMAT ",%.6f,%s,%.8g,%.8g,%u,", k + 1,
                              row.wavenumber, row.imaginary ? "true" : "false",
                              row.reduced_mass, row.force_constant, r->level);
      if (row.tp.defined)
        g_string_append_printf (out, "%.8g,%.8g,%" G_GSIZE_FORMAT ",", row.tp.q,
                                row.tp.max_displacement, row.tp.max_atom + 1);
      else
        g_string_append (out, ",,,");
      g_string_append_printf (out, "%g,", r->temperature);
      if (row.th.defined)
        g_string_append_printf (out, "%.8g,%.8g,", row.th.q_rms, row.th.max_rms_displacement);
      else
        g_string_append (out, ",,");
      g_string_append_printf (out, "%.6f,", row.collectivity);
      if (row.has_mixing)
        g_string_append_printf (out, "%.6g,%.6g\n", row.mix_translation, row.mix_rotation);
      else
        g_string_append (out, ",\n");
    }
  return g_string_free (out, FALSE);
}

static char *
format_markdown (const QvModeReport *r)
{
  g_autofree double *participation = g_new (double, MAX (r->modes->n_atoms, 1));
  const QvModeSet *m = r->modes;
  GString *out = g_string_new (NULL);
  g_auto(GStrv) warnings = qv_mode_set_warnings (m);
  const int decimals = r->unit == QV_FREQUENCY_CM1 ? 1 : 3;

  append_header (out, "> ", r);
  for (char **w = warnings; *w; w++)
    g_string_append_printf (out, "> **warning:** %s\n", *w);
  g_string_append_printf (out, "\n| mode | frequency (%s) | reduced mass (u) | force constant (mdyn/Å) "
                               "| Q_tp at v = %u (u^½ Å) | largest displacement (Å) | atom "
                               "| moves most | rotation removed (%%) |\n",
                          qv_frequency_unit_name (r->unit), r->level);
  g_string_append (out, "|---:|---:|---:|---:|---:|---:|---:|---:|---:|\n");
  for (gsize k = 0; k < m->n_modes; k++)
    {
      Row row;
      char freq[40];
      compute_row (r, k, &row, participation);
      format_frequency (freq, sizeof freq, &row, decimals);
      g_string_append_printf (out, "| %" G_GSIZE_FORMAT " | %s | %.4f | %.4f | ", k + 1, freq,
                              row.reduced_mass, row.force_constant);
      if (row.tp.defined)
        {
          char atom[16];
          atom_name (atom, sizeof atom, r->structure, row.tp.max_atom);
          g_string_append_printf (out, "%.4f | %.4f | %s | ", row.tp.q, row.tp.max_displacement, atom);
        }
      else
        g_string_append (out, "— | — | — | ");
      {
        char name[16];
        atom_name (name, sizeof name, r->structure, row.main_atom);
        g_string_append_printf (out, "%s (%.0f %%) | ", name, 100.0 * row.main_share);
      }
      if (row.has_mixing)
        g_string_append_printf (out, "%.1f |\n", tidy (100.0 * row.mix_rotation, 0.1));
      else
        g_string_append (out, "— |\n");
    }
  return g_string_free (out, FALSE);
}

static void
number_or_null (QvJsonWriter *w, const char *key, gboolean defined, double value)
{
  if (defined)
    qv_json_number (w, key, value);
  else
    qv_json_null (w, key);
}

static void
atom_or_null (QvJsonWriter *w, const char *key, gboolean defined, gsize atom)
{
  if (defined)
    qv_json_int (w, key, (gint64) atom + 1);
  else
    qv_json_null (w, key);
}

static char *
format_json (const QvModeReport *r)
{
  static const char *units[][2] = {
    { "wavenumber", "cm^-1" }, { "eigenvalue", "eV/(A^2 u)" }, { "reduced_mass", "u" },
    { "force_constant", "mdyn/A" }, { "Q", "u^1/2 A" }, { "displacement", "A" },
    { "energy", "eV" }, { "temperature", "K" }, { "gradient", "eV/A" },
  };
  const QvModeSet *m = r->modes;
  QvJsonWriter *w = qv_json_writer_new ();
  g_autofree char *formula = qv_structure_formula (r->structure);
  g_autofree double *participation = g_new (double, MAX (m->n_atoms, 1));
  g_autofree double *cart = r->vectors ? g_new (double, 3 * m->n_atoms) : NULL;
  g_auto(GStrv) warnings = qv_mode_set_warnings (m);
  double residuals[6];
  guint nres = 0;

  qv_json_begin_object (w, NULL);
  qv_json_string (w, "program", "quaver " QV_VERSION);
  qv_json_begin_object (w, "units");
  for (gsize i = 0; i < G_N_ELEMENTS (units); i++)
    qv_json_string (w, units[i][0], units[i][1]);
  qv_json_end_object (w);
  qv_json_int (w, "natoms", (gint64) r->structure->n_atoms);
  qv_json_string (w, "formula", formula);
  qv_json_string (w, "projection", qv_projection_name (m->projection));
  qv_json_bool (w, "linear", m->linear);
  qv_json_string (w, "masses", r->mass_model == QV_MASS_AVERAGE ? "average" : "isotopic");
  if (m->has_hessian)
    {
      qv_json_begin_object (w, "hessian");
      qv_json_string (w, "source", r->hessian_source ? r->hessian_source : "");
      qv_json_string (w, "layout", qv_hessian_layout_name (r->layout));
      qv_json_string (w, "units", r->hessian_units ? r->hessian_units : "eV/A^2");
      qv_json_number (w, "asymmetry", m->asymmetry);
      qv_json_end_object (w);
    }
  if (m->has_gradient)
    {
      qv_json_number (w, "gradient_norm", m->gradient_norm);
      qv_json_number (w, "max_force", m->max_force);
    }
  for (guint i = 0; i < m->n_translations; i++)
    residuals[nres++] = m->translation_residuals[i];
  for (guint i = 0; i < m->n_rotations; i++)
    residuals[nres++] = m->rotation_residuals[i];
  qv_json_numbers (w, "rigid_body_residuals", residuals, m->has_hessian ? nres : 0);
  qv_json_begin_object (w, "rigid_body");
  qv_json_numbers (w, "translations", m->translation_residuals, m->has_hessian ? m->n_translations : 0);
  qv_json_numbers (w, "rotations", m->rotation_residuals, m->has_hessian ? m->n_rotations : 0);
  qv_json_end_object (w);
  qv_json_begin_array (w, "warnings");
  for (char **s = warnings; *s; s++)
    qv_json_string (w, NULL, *s);
  qv_json_end_array (w);
  qv_json_int (w, "level", r->level);
  qv_json_number (w, "temperature", r->temperature);
  qv_json_int (w, "n_vibrations", (gint64) m->n_vibrations);
  qv_json_string (w, "eigensolver", m->eigensolver);
  if (m->lowest_only)
    qv_json_int (w, "lowest", (gint64) m->n_modes);
  else
    qv_json_null (w, "lowest");

  qv_json_begin_array (w, "modes");
  for (gsize k = 0; k < m->n_modes; k++)
    {
      Row row;
      compute_row (r, k, &row, participation);
      qv_json_begin_object (w, NULL);
      qv_json_int (w, "index", (gint64) k + 1);
      qv_json_number (w, "wavenumber", row.wavenumber);
      qv_json_bool (w, "imaginary", row.imaginary);
      qv_json_number (w, "eigenvalue", m->eigenvalues[k]);
      qv_json_number (w, "reduced_mass", row.reduced_mass);
      qv_json_number (w, "force_constant", row.force_constant);
      qv_json_number (w, "collectivity", row.collectivity);
      if (row.has_mixing)
        {
          qv_json_begin_object (w, "rigid_body_mixing");
          qv_json_number (w, "translations", row.mix_translation);
          qv_json_number (w, "rotations", row.mix_rotation);
          qv_json_end_object (w);
        }
      qv_json_numbers (w, "participation", participation, m->n_atoms);

      qv_json_begin_object (w, "turning_point");
      qv_json_int (w, "v", r->level);
      number_or_null (w, "Q", row.tp.defined, row.tp.q);
      number_or_null (w, "max_displacement", row.tp.defined, row.tp.max_displacement);
      atom_or_null (w, "max_atom", row.tp.defined, row.tp.max_atom);
      number_or_null (w, "energy", row.tp.defined, row.tp.energy);
      qv_json_end_object (w);

      qv_json_begin_object (w, "thermal");
      qv_json_number (w, "T", r->temperature);
      number_or_null (w, "Q_rms", row.th.defined, row.th.q_rms);
      number_or_null (w, "max_rms_displacement", row.th.defined, row.th.max_rms_displacement);
      atom_or_null (w, "max_atom", row.th.defined, row.th.max_atom);
      qv_json_end_object (w);

      if (cart)
        {
          qv_mode_set_cartesian (m, k, cart);
          qv_json_numbers (w, "displacement", cart, 3 * m->n_atoms);
        }
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  qv_json_end_object (w);
  return qv_json_writer_finish (w);
}

char *
qv_mode_table_format (const QvModeReport *report, QvTableFormat format)
{
  switch (format)
    {
    case QV_TABLE_CSV: return format_csv (report);
    case QV_TABLE_JSON: return format_json (report);
    case QV_TABLE_MARKDOWN: return format_markdown (report);
    case QV_TABLE_TEXT:
    default: return format_text (report);
    }
}
