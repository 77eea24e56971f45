/* qv-mode-table.c — the mode report of `quaver modes` and the column tables
 * of `quaver table`.
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
    { "latex", QV_TABLE_LATEX }, { "tex", QV_TABLE_LATEX },
  };
  for (gsize i = 0; i < G_N_ELEMENTS (names); i++)
    if (text && g_ascii_strcasecmp (text, names[i].name) == 0)
      {
        *format = names[i].f;
        return TRUE;
      }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "unknown format '%s'; accepted: text, csv, json, markdown, latex", text ? text : "");
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

/* Mode k's species, or NULL when the report has no symmetry. */
static const QvModeSymmetry *
mode_symmetry (const QvModeReport *r, gsize k)
{
  return r->symmetry && k < r->symmetry->n_modes ? &r->symmetry->modes[k] : NULL;
}

/* "C3v (tolerance 0.01 A, symmetry number 3)" for headers. */
static void
append_point_group (GString *out, const char *prefix, const QvModeReport *r)
{
  const QvPointGroup *g;
  if (r->symmetry == NULL)
    return;
  g = r->symmetry->group;
  g_string_append_printf (out, "%spoint group: %s (tolerance %g A, largest deviation %.2g A, "
                          "symmetry number %u)\n", prefix, g->name, g->tolerance, g->max_deviation,
                          g->symmetry_number);
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
  append_point_group (out, "# ", r);
  for (char **w = warnings; *w; w++)
    g_string_append_printf (out, "warning: %s\n", *w);
  for (char **w = r->symmetry ? r->symmetry->warnings : NULL; w && *w; w++)
    g_string_append_printf (out, "warning: %s\n", *w);
  g_snprintf (qhead, sizeof qhead, "Q_tp(v=%u)", r->level);
  g_string_append_printf (out, "%5s %12s %9s %11s %10s %9s %5s %9s %11s %6s%s\n",
                          "mode", "frequency", "red.mass", "force const", qhead,
                          "max disp", "atom", "RMS(T)", "moves most", "rot.mix",
                          r->symmetry ? "  sym" : "");
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
      g_string_append_printf (out, "%5" G_GSIZE_FORMAT " %12s %9.4f %11.4f %10s %9s %5s %9s %11s %6s",
                              k + 1, freq, row.reduced_mass, row.force_constant, q, d, atom,
                              rms, main_atom, mix);
      if (mode_symmetry (r, k))
        g_string_append_printf (out, "  %s", mode_symmetry (r, k)->label);
      g_string_append_c (out, '\n');
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
  g_string_append_printf (out, "index,wavenumber_cm-1,imaginary,reduced_mass_u,force_constant_mdyn_per_A,"
                          "level,turning_point_Q_u^1/2_A,max_displacement_A,max_atom,"
                          "temperature_K,thermal_Q_rms_u^1/2_A,thermal_max_rms_A,collectivity,"
                          "translation_mixing,rotation_mixing%s\n",
                          r->symmetry ? ",symmetry" : "");
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
        g_string_append_printf (out, "%.6g,%.6g", row.mix_translation, row.mix_rotation);
      else
        g_string_append (out, ",");
      if (mode_symmetry (r, k))
        g_string_append_printf (out, ",%s", mode_symmetry (r, k)->label);
      g_string_append_c (out, '\n');
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
  append_point_group (out, "> ", r);
  for (char **w = warnings; *w; w++)
    g_string_append_printf (out, "> **warning:** %s\n", *w);
  for (char **w = r->symmetry ? r->symmetry->warnings : NULL; w && *w; w++)
    g_string_append_printf (out, "> **warning:** %s\n", *w);
  g_string_append_printf (out, "\n| mode | frequency (%s) | reduced mass (u) | force constant (mdyn/Å) "
                               "| Q_tp at v = %u (u^½ Å) | largest displacement (Å) | atom "
                               "| moves most | rotation removed (%%) |%s\n",
                          qv_frequency_unit_name (r->unit), r->level, r->symmetry ? " symmetry |" : "");
  g_string_append_printf (out, "|---:|---:|---:|---:|---:|---:|---:|---:|---:|%s\n",
                          r->symmetry ? ":---|" : "");
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
        g_string_append_printf (out, "%.1f |", tidy (100.0 * row.mix_rotation, 0.1));
      else
        g_string_append (out, "— |");
      if (mode_symmetry (r, k))
        g_string_append_printf (out, " %s |", mode_symmetry (r, k)->label);
      g_string_append_c (out, '\n');
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

/* The coordinate set of `modes --character`: names, kinds, families,
 * atoms (from 1), values and diagonal force constants. */
static void
write_internal_coordinates (QvJsonWriter *w, const QvModeCharacter *c)
{
  const QvInternalCoordinates *ic = qv_mode_character_coordinates (c);
  const double *f = qv_mode_character_force_constants (c);

  qv_json_begin_object (w, "internal_coordinates");
  qv_json_string (w, "method", QV_MODE_CHARACTER_METHOD);
  qv_json_string (w, "reference", QV_MODE_CHARACTER_REFERENCE);
  qv_json_int (w, "rank", (gint64) qv_mode_character_rank (c));
  qv_json_begin_array (w, "notes");
  for (char *const *s = qv_mode_character_notes (c); *s; s++)
    qv_json_string (w, NULL, *s);
  qv_json_end_array (w);
  qv_json_begin_array (w, "coordinates");
  for (gsize i = 0; i < ic->n_coordinates; i++)
    {
      const QvInternalCoordinate *q = &ic->coordinates[i];
      double atoms[4];
      for (guint a = 0; a < q->n_atoms; a++)
        atoms[a] = q->atoms[a] + 1.0;
      qv_json_begin_object (w, NULL);
      qv_json_int (w, "index", (gint64) i + 1);
      qv_json_string (w, "name", q->name);
      qv_json_string (w, "kind", qv_internal_kind_name (q->kind));
      qv_json_string (w, "family", q->family);
      qv_json_numbers (w, "atoms", atoms, q->n_atoms);
      qv_json_number (w, "value", q->value);
      qv_json_number (w, "force_constant", f[i]);
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  qv_json_end_object (w);
}

/* Mode k's make-up: families and coordinates, largest share first. */
static void
write_character (QvJsonWriter *w, const QvModeCharacter *c, gsize k)
{
  const QvCharacterItem *items;
  gsize n;

  qv_json_begin_object (w, "character");
  qv_json_string (w, "method", QV_MODE_CHARACTER_METHOD);
  qv_json_number (w, "described", qv_mode_character_described (c, k));
  qv_json_number (w, "diagonal_sum", qv_mode_character_diagonal_sum (c, k));
  qv_json_begin_array (w, "families");
  n = qv_mode_character_families (c, k, &items);
  for (gsize i = 0; i < n; i++)
    {
      qv_json_begin_object (w, NULL);
      qv_json_string (w, "name", items[i].name);
      qv_json_number (w, "share", items[i].share);
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  qv_json_begin_array (w, "coordinates");
  n = qv_mode_character_items (c, k, &items);
  for (gsize i = 0; i < n; i++)
    {
      qv_json_begin_object (w, NULL);
      qv_json_string (w, "name", items[i].name);
      qv_json_int (w, "index", (gint64) items[i].coordinate + 1);
      qv_json_number (w, "share", items[i].share);
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  qv_json_end_object (w);
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
  if (r->character)
    write_internal_coordinates (w, r->character);
  if (r->symmetry)
    {
      const QvPointGroup *g = r->symmetry->group;
      qv_json_begin_object (w, "point_group");
      qv_json_string (w, "name", g->name);
      qv_json_number (w, "tolerance", g->tolerance);
      qv_json_int (w, "symmetry_number", g->symmetry_number);
      qv_json_int (w, "order", (gint64) g->order);
      qv_json_number (w, "max_deviation", g->max_deviation);
      qv_json_bool (w, "labelled", r->symmetry->table != NULL);
      qv_json_begin_array (w, "warnings");
      for (char **s = r->symmetry->warnings; *s; s++)
        qv_json_string (w, NULL, *s);
      qv_json_end_array (w);
      qv_json_end_object (w);
    }

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

      if (r->character)
        write_character (w, r->character, k);
      if (mode_symmetry (r, k))
        {
          const QvModeSymmetry *ms = mode_symmetry (r, k);
          qv_json_begin_object (w, "symmetry");
          qv_json_string (w, "label", ms->label);
          if (ms->defined)
            {
              qv_json_bool (w, "ir_active", ms->ir_active);
              qv_json_bool (w, "raman_active", ms->raman_active);
            }
          else
            {
              qv_json_null (w, "ir_active");
              qv_json_null (w, "raman_active");
            }
          qv_json_int (w, "set_first", (gint64) ms->first + 1);
          qv_json_int (w, "set_size", (gint64) ms->size);
          qv_json_end_object (w);
        }
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
    case QV_TABLE_LATEX:
      {
        QvTableLayout layout = { .report = report };
        return qv_mode_table_columns (&layout, QV_TABLE_LATEX);
      }
    case QV_TABLE_TEXT:
    default: return format_text (report);
    }
}

/* ------------------------------------------------------------------------ */
/* Tables of chosen columns                                                 */
/* ------------------------------------------------------------------------ */

static const struct {
  const char *name;            /* as the command line spells it */
  const char *label;           /* for people */
  const char *csv;             /* CSV / JSON name */
  gboolean numeric;            /* right-aligned */
} columns_info[QV_N_COLUMNS] = {
  [QV_COLUMN_INDEX] = { "index", "mode", "index", TRUE },
  [QV_COLUMN_WAVENUMBER] = { "wavenumber", "wavenumber", "wavenumber", TRUE },
  [QV_COLUMN_REDUCED_MASS] = { "reduced-mass", "reduced mass", "reduced_mass", TRUE },
  [QV_COLUMN_FORCE_CONSTANT] = { "force-constant", "force constant", "force_constant", TRUE },
  [QV_COLUMN_TURNING_Q] = { "turning-q", "Q_tp", "turning_point_Q", TRUE },
  [QV_COLUMN_TURNING_DISPLACEMENT] = { "turning-displacement", "largest displacement",
                                       "turning_point_max_displacement", TRUE },
  [QV_COLUMN_THERMAL_RMS] = { "thermal-rms", "thermal RMS", "thermal_max_rms_displacement", TRUE },
  [QV_COLUMN_COLLECTIVITY] = { "collectivity", "collectivity", "collectivity", TRUE },
  [QV_COLUMN_TOP_ATOMS] = { "top-atoms", "most moving atoms", "top_atoms", FALSE },
  [QV_COLUMN_SYMMETRY] = { "symmetry", "symmetry", "symmetry", FALSE },
};

const char *
qv_table_column_name (QvTableColumn column)
{
  return column < QV_N_COLUMNS ? columns_info[column].name : "?";
}

gboolean
qv_table_columns_parse (const char *text, QvTableColumn *columns, gsize *n_columns,
                        GError **error)
{
  g_auto(GStrv) parts = g_strsplit (text ? text : "", ",", -1);
  gsize n = 0;

  for (char **p = parts; *p; p++)
    {
      const char *name = g_strstrip (*p);
      gint found = -1;

      if (*name == '\0')
        continue;
      for (gint c = 0; c < QV_N_COLUMNS; c++)
        if (g_ascii_strcasecmp (name, columns_info[c].name) == 0)
          found = c;
      if (found < 0)
        {
          GString *list = g_string_new (NULL);
          for (gint c = 0; c < QV_N_COLUMNS; c++)
            g_string_append_printf (list, "%s%s", c ? ", " : "", columns_info[c].name);
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "unknown column '%s'; accepted: %s",
                       name, list->str);
          g_string_free (list, TRUE);
          return FALSE;
        }
      for (gsize i = 0; i < n; i++)
        if (columns[i] == (QvTableColumn) found)
          {
            g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "column '%s' is asked for twice", name);
            return FALSE;
          }
      columns[n++] = (QvTableColumn) found;
    }
  if (n == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "no columns given; for example --columns %s",
                   QV_TABLE_DEFAULT_COLUMNS);
      return FALSE;
    }
  *n_columns = n;
  return TRUE;
}

/* Units of a column, per format (text/markdown, LaTeX, CSV names). */
static const char *
column_unit (const QvTableLayout *t, QvTableColumn c, QvTableFormat format)
{
  const gboolean tex = format == QV_TABLE_LATEX;
  switch (c)
    {
    case QV_COLUMN_WAVENUMBER:
      switch (t->report->unit)
        {
        case QV_FREQUENCY_THZ: return "THz";
        case QV_FREQUENCY_MEV: return "meV";
        default: return tex ? "cm$^{-1}$" : format == QV_TABLE_MARKDOWN ? "cm⁻¹" : "cm^-1";
        }
    case QV_COLUMN_REDUCED_MASS: return "u";
    case QV_COLUMN_FORCE_CONSTANT: return tex ? "mdyn/\\AA" : format == QV_TABLE_MARKDOWN ? "mdyn/Å" : "mdyn/A";
    case QV_COLUMN_TURNING_Q: return tex ? "u$^{1/2}$\\,\\AA" : format == QV_TABLE_MARKDOWN ? "u^½ Å" : "u^1/2 A";
    case QV_COLUMN_TURNING_DISPLACEMENT:
    case QV_COLUMN_THERMAL_RMS: return tex ? "\\AA" : format == QV_TABLE_MARKDOWN ? "Å" : "A";
    default: return "";
    }
}

static void
latex_escape (GString *out, const char *text)
{
  for (const char *p = text; *p; p++)
    switch (*p)
      {
      case '&': case '%': case '$': case '#': case '_': case '{': case '}':
        g_string_append_c (out, '\\');
        g_string_append_c (out, *p);
        break;
      case '~': g_string_append (out, "\\textasciitilde{}"); break;
      case '^': g_string_append (out, "\\textasciicircum{}"); break;
      case '\\': g_string_append (out, "\\textbackslash{}"); break;
      default: g_string_append_c (out, *p);
      }
}

static double
layout_scale (const QvTableLayout *t)
{
  return t->scale > 0.0 ? t->scale : 1.0;
}

/* What the numbers are, in one sentence or two. */
static char *
table_caption (const QvTableLayout *t, gboolean tex)
{
  const QvModeReport *r = t->report;
  g_autofree char *formula = qv_structure_formula (r->structure);
  GString *c = g_string_new (NULL);
  const double scale = layout_scale (t);
  gboolean wavenumbers = FALSE, tp = FALSE, thermal = FALSE, sym = FALSE;
  const QvTableColumn *cols = t->columns;

  for (gsize i = 0; i < t->n_columns; i++)
    {
      wavenumbers |= cols[i] == QV_COLUMN_WAVENUMBER;
      tp |= cols[i] == QV_COLUMN_TURNING_Q || cols[i] == QV_COLUMN_TURNING_DISPLACEMENT;
      thermal |= cols[i] == QV_COLUMN_THERMAL_RMS;
      sym |= cols[i] == QV_COLUMN_SYMMETRY;
    }
  g_string_append_printf (c, "Harmonic normal modes of %s (%" G_GSIZE_FORMAT " atoms, %s)",
                          formula, r->structure->n_atoms,
                          r->mass_model == QV_MASS_AVERAGE ? "standard atomic weights"
                                                           : "most abundant isotopes");
  if (wavenumbers && scale != 1.0)
    g_string_append_printf (c, "; wavenumbers scaled by %g (the other columns are unscaled)",
                            scale);
  else if (wavenumbers)
    g_string_append (c, "; wavenumbers unscaled");
  if (wavenumbers && qv_mode_set_count_imaginary (r->modes) > 0)
    g_string_append (c, "; i marks an imaginary mode");
  if (tp)
    g_string_append_printf (c, "; classical turning points of level v = %u", r->level);
  if (thermal)
    g_string_append_printf (c, "; thermal RMS displacement at T = %g K", r->temperature);
  if (sym && r->symmetry)
    g_string_append_printf (c, "; species of point group %s (found within %g A; ? where the "
                            "symmetry is broken)", r->symmetry->group->name, r->symmetry->group->tolerance);
  g_string_append (c, ".");
  if (tex)
    {
      GString *e = g_string_new (NULL);
      latex_escape (e, c->str);
      g_string_free (c, TRUE);
      return g_string_free (e, FALSE);
    }
  return g_string_free (c, FALSE);
}

typedef struct {
  Row row;
  double *participation;
  gsize *order;                /* atoms by participation, largest first */
} TableRow;

static gint
by_share (gconstpointer a, gconstpointer b, gpointer data)
{
  const double *shares = data;
  const double pa = shares[*(const gsize *) a], pb = shares[*(const gsize *) b];
  if (pa != pb)
    return pa > pb ? -1 : 1;
  return *(const gsize *) a < *(const gsize *) b ? -1 : 1;
}

static void
table_row (const QvTableLayout *t, gsize k, TableRow *tr)
{
  const gsize n = t->report->modes->n_atoms;
  compute_row (t->report, k, &tr->row, tr->participation);
  for (gsize a = 0; a < n; a++)
    tr->order[a] = a;
  /* ties go to the lower index */
  g_qsort_with_data (tr->order, (gint) n, sizeof (gsize), by_share, tr->participation);
}

/* A cell as people read it: "1594.6", "512.3i", "0.0734 (H2)", "—". */
static char *
cell_text (const QvTableLayout *t, const TableRow *tr, gsize k, QvTableColumn c,
           QvTableFormat format)
{
  const Row *row = &tr->row;
  const QvModeReport *r = t->report;
  const char *none = format == QV_TABLE_TEXT ? "-" : format == QV_TABLE_LATEX ? "---" : "—";
  const int decimals = r->unit == QV_FREQUENCY_CM1 ? 1 : 4;
  char atom[16];

  switch (c)
    {
    case QV_COLUMN_INDEX:
      return g_strdup_printf ("%" G_GSIZE_FORMAT, k + 1);
    case QV_COLUMN_WAVENUMBER:
      return g_strdup_printf ("%.*f%s", decimals, row->shown * layout_scale (t),
                              row->imaginary ? "i" : "");
    case QV_COLUMN_REDUCED_MASS:
      return g_strdup_printf ("%.4f", row->reduced_mass);
    case QV_COLUMN_FORCE_CONSTANT:
      return g_strdup_printf ("%.4f", row->force_constant);
    case QV_COLUMN_TURNING_Q:
      return row->tp.defined ? g_strdup_printf ("%.4f", row->tp.q) : g_strdup (none);
    case QV_COLUMN_TURNING_DISPLACEMENT:
      if (!row->tp.defined)
        return g_strdup (none);
      atom_name (atom, sizeof atom, r->structure, row->tp.max_atom);
      return g_strdup_printf ("%.4f (%s)", row->tp.max_displacement, atom);
    case QV_COLUMN_THERMAL_RMS:
      return row->th.defined ? g_strdup_printf ("%.4f", row->th.max_rms_displacement)
                             : g_strdup (none);
    case QV_COLUMN_COLLECTIVITY:
      return g_strdup_printf ("%.3f", row->collectivity);
    case QV_COLUMN_TOP_ATOMS:
      {
        GString *s = g_string_new (NULL);
        const guint top = MIN (t->top_atoms ? t->top_atoms : 3, (guint) r->modes->n_atoms);
        for (guint i = 0; i < top; i++)
          {
            atom_name (atom, sizeof atom, r->structure, tr->order[i]);
            g_string_append_printf (s, "%s%s %.0f%s", i ? ", " : "", atom,
                                    100.0 * tr->participation[tr->order[i]],
                                    format == QV_TABLE_LATEX ? "\\%" : "%");
          }
        return g_string_free (s, FALSE);
      }
    case QV_COLUMN_SYMMETRY:
      return mode_symmetry (r, k) ? g_strdup (mode_symmetry (r, k)->label) : g_strdup (none);
    default:
      return g_strdup ("");
    }
}

static char *
header_text (const QvTableLayout *t, QvTableColumn c, QvTableFormat format)
{
  const char *unit = column_unit (t, c, format);
  const char *label = columns_info[c].label;
  GString *s = g_string_new (NULL);

  if (format == QV_TABLE_LATEX)
    {
      if (c == QV_COLUMN_TURNING_Q)
        g_string_append (s, "$Q_\\mathrm{tp}$");
      else
        latex_escape (s, label);
    }
  else
    g_string_append (s, label);
  if (c == QV_COLUMN_TURNING_Q || c == QV_COLUMN_TURNING_DISPLACEMENT)
    g_string_append_printf (s, format == QV_TABLE_LATEX ? " ($v=%u$)" : " (v=%u)", t->report->level);
  if (*unit)
    g_string_append_printf (s, " (%s)", unit);
  return g_string_free (s, FALSE);
}

static char *
columns_csv (const QvTableLayout *t, TableRow *tr)
{
  const QvModeReport *r = t->report;
  GString *out = g_string_new (NULL);
  const double scale = layout_scale (t);

  for (gsize i = 0; i < t->n_columns; i++)
    {
      const QvTableColumn c = t->columns[i];
      if (i)
        g_string_append_c (out, ',');
      switch (c)
        {
        case QV_COLUMN_WAVENUMBER:
          g_string_append_printf (out, "wavenumber_%s", qv_frequency_unit_name (r->unit));
          if (scale != 1.0)
            g_string_append_printf (out, "_scaled_%g", scale);
          g_string_append (out, ",imaginary");
          break;
        case QV_COLUMN_REDUCED_MASS: g_string_append (out, "reduced_mass_u"); break;
        case QV_COLUMN_FORCE_CONSTANT: g_string_append (out, "force_constant_mdyn_per_A"); break;
        case QV_COLUMN_TURNING_Q:
          g_string_append_printf (out, "turning_point_Q_v%u_u^1/2_A", r->level); break;
        case QV_COLUMN_TURNING_DISPLACEMENT:
          g_string_append_printf (out, "turning_point_max_displacement_v%u_A,turning_point_max_atom",
                                  r->level); break;
        case QV_COLUMN_THERMAL_RMS:
          g_string_append_printf (out, "thermal_max_rms_displacement_%gK_A", r->temperature); break;
        default: g_string_append (out, columns_info[c].csv); break;
        }
    }
  g_string_append_c (out, '\n');
  for (gsize k = 0; k < r->modes->n_modes; k++)
    {
      table_row (t, k, tr);
      for (gsize i = 0; i < t->n_columns; i++)
        {
          const Row *row = &tr->row;
          if (i)
            g_string_append_c (out, ',');
          switch (t->columns[i])
            {
            case QV_COLUMN_INDEX: g_string_append_printf (out, "%" G_GSIZE_FORMAT, k + 1); break;
            case QV_COLUMN_WAVENUMBER:
              g_string_append_printf (out, "%.6f,%s",
                                      qv_frequency_from_wavenumber (row->wavenumber, r->unit) * scale,
                                      row->imaginary ? "true" : "false");
              break;
            case QV_COLUMN_REDUCED_MASS: g_string_append_printf (out, "%.8g", row->reduced_mass); break;
            case QV_COLUMN_FORCE_CONSTANT: g_string_append_printf (out, "%.8g", row->force_constant); break;
            case QV_COLUMN_TURNING_Q:
              if (row->tp.defined)
                g_string_append_printf (out, "%.8g", row->tp.q);
              break;
            case QV_COLUMN_TURNING_DISPLACEMENT:
              if (row->tp.defined)
                g_string_append_printf (out, "%.8g,%" G_GSIZE_FORMAT, row->tp.max_displacement,
                                        row->tp.max_atom + 1);
              else
                g_string_append_c (out, ',');
              break;
            case QV_COLUMN_THERMAL_RMS:
              if (row->th.defined)
                g_string_append_printf (out, "%.8g", row->th.max_rms_displacement);
              break;
            case QV_COLUMN_COLLECTIVITY: g_string_append_printf (out, "%.6f", row->collectivity); break;
            case QV_COLUMN_TOP_ATOMS:
              {
                g_autofree char *text = cell_text (t, tr, k, QV_COLUMN_TOP_ATOMS, QV_TABLE_CSV);
                g_string_append_printf (out, "\"%s\"", text);   /* no quotes inside */
              }
              break;
            case QV_COLUMN_SYMMETRY:
              if (mode_symmetry (r, k))
                g_string_append (out, mode_symmetry (r, k)->label);
              break;
            default: break;
            }
        }
      g_string_append_c (out, '\n');
    }
  return g_string_free (out, FALSE);
}

static char *
columns_json (const QvTableLayout *t, TableRow *tr)
{
  const QvModeReport *r = t->report;
  QvJsonWriter *w = qv_json_writer_new ();
  g_autofree char *caption = table_caption (t, FALSE);
  const double scale = layout_scale (t);

  qv_json_begin_object (w, NULL);
  qv_json_string (w, "program", "quaver " QV_VERSION);
  qv_json_string (w, "caption", caption);
  qv_json_number (w, "scale", scale);
  qv_json_string (w, "frequency_unit", qv_frequency_unit_name (r->unit));
  qv_json_int (w, "level", r->level);
  qv_json_number (w, "temperature", r->temperature);
  qv_json_string (w, "masses", r->mass_model == QV_MASS_AVERAGE ? "average" : "isotopic");
  qv_json_begin_array (w, "columns");
  for (gsize i = 0; i < t->n_columns; i++)
    qv_json_string (w, NULL, columns_info[t->columns[i]].name);
  qv_json_end_array (w);
  qv_json_begin_object (w, "units");
  for (gsize i = 0; i < t->n_columns; i++)
    if (*column_unit (t, t->columns[i], QV_TABLE_JSON))
      qv_json_string (w, columns_info[t->columns[i]].csv, column_unit (t, t->columns[i], QV_TABLE_JSON));
  qv_json_end_object (w);
  qv_json_begin_array (w, "modes");
  for (gsize k = 0; k < r->modes->n_modes; k++)
    {
      const Row *row = &tr->row;
      table_row (t, k, tr);
      qv_json_begin_object (w, NULL);
      for (gsize i = 0; i < t->n_columns; i++)
        switch (t->columns[i])
          {
          case QV_COLUMN_INDEX: qv_json_int (w, "index", (gint64) k + 1); break;
          case QV_COLUMN_WAVENUMBER:
            qv_json_number (w, "wavenumber", qv_frequency_from_wavenumber (row->wavenumber, r->unit) * scale);
            qv_json_number (w, "wavenumber_unscaled", qv_frequency_from_wavenumber (row->wavenumber, r->unit));
            qv_json_bool (w, "imaginary", row->imaginary);
            break;
          case QV_COLUMN_REDUCED_MASS: qv_json_number (w, "reduced_mass", row->reduced_mass); break;
          case QV_COLUMN_FORCE_CONSTANT: qv_json_number (w, "force_constant", row->force_constant); break;
          case QV_COLUMN_TURNING_Q: number_or_null (w, "turning_point_Q", row->tp.defined, row->tp.q); break;
          case QV_COLUMN_TURNING_DISPLACEMENT:
            number_or_null (w, "turning_point_max_displacement", row->tp.defined, row->tp.max_displacement);
            atom_or_null (w, "turning_point_max_atom", row->tp.defined, row->tp.max_atom);
            break;
          case QV_COLUMN_THERMAL_RMS:
            number_or_null (w, "thermal_max_rms_displacement", row->th.defined, row->th.max_rms_displacement);
            break;
          case QV_COLUMN_COLLECTIVITY: qv_json_number (w, "collectivity", row->collectivity); break;
          case QV_COLUMN_TOP_ATOMS:
            {
              const guint top = MIN (t->top_atoms ? t->top_atoms : 3, (guint) r->modes->n_atoms);
              qv_json_begin_array (w, "top_atoms");
              for (guint a = 0; a < top; a++)
                {
                  qv_json_begin_object (w, NULL);
                  qv_json_int (w, "atom", (gint64) tr->order[a] + 1);
                  qv_json_number (w, "participation", tr->participation[tr->order[a]]);
                  qv_json_end_object (w);
                }
              qv_json_end_array (w);
            }
            break;
          case QV_COLUMN_SYMMETRY:
            if (mode_symmetry (r, k))
              qv_json_string (w, "symmetry", mode_symmetry (r, k)->label);
            else
              qv_json_null (w, "symmetry");
            break;
          default: break;
          }
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  qv_json_end_object (w);
  return qv_json_writer_finish (w);
}

/* Text, Markdown and LaTeX: the cells first, then aligned output. */
static char *
columns_grid (const QvTableLayout *t, TableRow *tr, QvTableFormat format)
{
  const QvModeReport *r = t->report;
  const gsize nc = t->n_columns, nr = r->modes->n_modes;
  g_autoptr(GPtrArray) cells = g_ptr_array_new_with_free_func (g_free);
  g_autofree gsize *width = g_new0 (gsize, nc);
  g_autofree char *caption = table_caption (t, format == QV_TABLE_LATEX);
  GString *out = g_string_new (NULL);

  for (gsize i = 0; i < nc; i++)
    g_ptr_array_add (cells, header_text (t, t->columns[i], format));
  for (gsize k = 0; k < nr; k++)
    {
      table_row (t, k, tr);
      for (gsize i = 0; i < nc; i++)
        g_ptr_array_add (cells, cell_text (t, tr, k, t->columns[i], format));
    }
  for (gsize j = 0; j < cells->len; j++)
    width[j % nc] = MAX (width[j % nc], (gsize) g_utf8_strlen (cells->pdata[j], -1));

  if (format == QV_TABLE_TEXT)
    {
      g_string_append_printf (out, "# quaver %s: %s\n", QV_VERSION, caption);
    }
  else if (format == QV_TABLE_MARKDOWN)
    g_string_append_printf (out, "**Table.** %s\n\n", caption);
  else
    {
      g_string_append_printf (out, "%% quaver %s; needs \\usepackage{booktabs}\n", QV_VERSION);
      g_string_append (out, "\\begin{table}\n  \\centering\n");
      g_string_append_printf (out, "  \\caption{%s}\n", caption);
      g_string_append (out, "  \\begin{tabular}{");
      for (gsize i = 0; i < nc; i++)
        g_string_append_c (out, columns_info[t->columns[i]].numeric ? 'r' : 'l');
      g_string_append (out, "}\n    \\toprule\n");
    }

  for (gsize row = 0; row <= nr; row++)
    {
      if (format == QV_TABLE_MARKDOWN)
        g_string_append (out, "|");
      else if (format == QV_TABLE_LATEX)
        g_string_append (out, "    ");
      for (gsize i = 0; i < nc; i++)
        {
          const char *text = cells->pdata[row * nc + i];
          const gsize len = (gsize) g_utf8_strlen (text, -1);
          const gboolean right = columns_info[t->columns[i]].numeric;
          GString *cell = g_string_new (NULL);

          if (format == QV_TABLE_LATEX && row > 0 && t->columns[i] != QV_COLUMN_TOP_ATOMS)
            latex_escape (cell, text);
          else
            g_string_append (cell, text);
          if (format == QV_TABLE_MARKDOWN)
            g_string_append_printf (out, " %s |", cell->str);
          else
            {
              if (i > 0)
                g_string_append (out, format == QV_TABLE_LATEX ? " & " : "  ");
              if (right)
                for (gsize p = len; p < width[i]; p++)
                  g_string_append_c (out, ' ');
              g_string_append (out, cell->str);
              if (!right && i + 1 < nc)
                for (gsize p = len; p < width[i]; p++)
                  g_string_append_c (out, ' ');
            }
          g_string_free (cell, TRUE);
        }
      if (format == QV_TABLE_LATEX)
        g_string_append (out, " \\\\");
      g_string_append_c (out, '\n');
      if (row == 0 && format == QV_TABLE_MARKDOWN)
        {
          g_string_append (out, "|");
          for (gsize i = 0; i < nc; i++)
            g_string_append (out, columns_info[t->columns[i]].numeric ? "---:|" : ":---|");
          g_string_append_c (out, '\n');
        }
      else if (row == 0 && format == QV_TABLE_LATEX)
        g_string_append (out, "    \\midrule\n");
    }
  if (format == QV_TABLE_LATEX)
    g_string_append (out, "    \\bottomrule\n  \\end{tabular}\n\\end{table}\n");
  return g_string_free (out, FALSE);
}

char *
qv_mode_table_columns (const QvTableLayout *layout, QvTableFormat format)
{
  QvTableColumn defaults[QV_N_COLUMNS];
  QvTableLayout t = *layout;
  const gsize n = MAX (layout->report->modes->n_atoms, (gsize) 1);
  g_autofree double *participation = g_new (double, n);
  g_autofree gsize *order = g_new (gsize, n);
  TableRow tr = { .participation = participation, .order = order };

  if (t.columns == NULL || t.n_columns == 0)
    {
      gboolean ok = qv_table_columns_parse (QV_TABLE_DEFAULT_COLUMNS, defaults, &t.n_columns, NULL);
      g_assert (ok);
      t.columns = defaults;
    }
  switch (format)
    {
    case QV_TABLE_CSV: return columns_csv (&t, &tr);
    case QV_TABLE_JSON: return columns_json (&t, &tr);
    case QV_TABLE_MARKDOWN:
    case QV_TABLE_LATEX:
    case QV_TABLE_TEXT:
    default: return columns_grid (&t, &tr, format);
    }
}
