/* qv-scan-levels-table.c — the tables of quaver anharmonic (moved here from
 * the command so that the app's anharmonic window saves the same bytes).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-json-writer.h"
#include "qv-scan-levels-table.h"

static double
cm (double ev)
{
  return ev / qv_scan_ev_per_wavenumber ();
}

static void
num (GString *s, const char *format, double v)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  if (!isfinite (v))
    g_string_append (s, "-");
  else
    g_string_append (s, g_ascii_formatd (buf, sizeof buf, format, v + 0.0));
}

static const char *
fit_name (const QvScanPotential *p)
{
  if (qv_scan_potential_fit (p) == QV_SCAN_FIT_SPLINE)
    return qv_scan_potential_dim (p) == 2 ? "bicubic spline" : "natural cubic spline";
  return "polynomial";
}

static void
collect_warnings (QvScanLevelsReport *r)
{
  const QvScanLevels *l = r->levels;
  const QvDvrRefinement *ref = l->refinement;
  const QvDvrStep *last = &g_array_index (ref->steps, QvDvrStep, ref->steps->len - 1);
  g_autoptr(GString) above = g_string_new (NULL), edge = g_string_new (NULL);

  if (!ref->converged)
    g_ptr_array_add (r->warnings, g_strdup_printf (
      "the DVR grid did not converge: %" G_GSIZE_FORMAT " points per mode moved the levels by %.3g "
      "cm^-1 (target 1e-6); the levels carry that uncertainty", last->n[0], cm (last->max_change)));
  for (gsize k = 0; k < l->n_levels; k++)
    {
      if (l->levels[k].above_scan)
        g_string_append_printf (above, "%s%" G_GSIZE_FORMAT, above->len ? ", " : "", k);
      if (l->levels[k].edge_weight > QV_SCAN_EDGE_WEIGHT_LIMIT)
        g_string_append_printf (edge, "%s%" G_GSIZE_FORMAT, edge->len ? ", " : "", k);
    }
  if (above->len)
    g_ptr_array_add (r->warnings, g_strdup_printf (
      "level%s %s lie%s above the highest scanned energy: the scan is too short for them; "
      "extend it", strchr (above->str, ',') ? "s" : "", above->str,
      strchr (above->str, ',') ? "" : "s"));
  if (edge->len)
    g_ptr_array_add (r->warnings, g_strdup_printf (
      "the wavefunction of level%s %s has weight near the ends of the scanned range (over %g "
      "within %g%% of an end): the ends confine %s and push the energy up; extend the scan",
      strchr (edge->str, ',') ? "s" : "", edge->str, QV_SCAN_EDGE_WEIGHT_LIMIT,
      100 * QV_SCAN_EDGE_FRACTION, strchr (edge->str, ',') ? "them" : "it"));
  if (!l->minimum_inside)
    g_ptr_array_add (r->warnings, g_strdup (
      "the lowest energy is at an end of the scan: it does not bracket a minimum (is the "
      "structure optimised? is the mode imaginary?); the harmonic value is not meaningful"));
  if (r->dim == 1 && l->minima->len >= 2)
    {
      g_autoptr(GString) s = g_string_new (NULL);
      for (guint k = 0; k < l->minima->len; k++)
        {
          const QvScanMinimum *mn = &g_array_index (l->minima, QvScanMinimum, k);
          g_string_append_printf (s, "%sQ = %.5f u^1/2 A (%.2f cm^-1)", k ? ", " : "", mn->Q[0],
                                  cm (mn->energy));
        }
      g_ptr_array_add (r->warnings, g_strdup_printf (
        "a multiple well: %u minima, at %s; barrier %.2f cm^-1 between the two lowest; "
        "tunnelling splitting E_1 - E_0 = %.6g cm^-1%s; omega_e and omega_e x_e (a single-well "
        "formula) do not describe it", l->minima->len, s->str, cm (l->barrier), cm (l->splitting),
        l->levels[1].energy > l->barrier ? " (E_1 is above the barrier: not a tunnelling pair)" : ""));
    }
  if (qv_scan_potential_fit (r->potential) == QV_SCAN_FIT_POLYNOMIAL)
    {
      double rms, max;
      qv_scan_potential_residual (r->potential, &rms, &max);
      const double fundamental = r->dim == 1 ? l->fundamental : l->fundamentals[0];
      if (isfinite (fundamental) && max > 0.01 * fundamental)
        g_ptr_array_add (r->warnings, g_strdup_printf (
          "the polynomial misses a point by %.3g cm^-1, over 1%% of the %sfundamental: try another "
          "--degree or --spline", cm (max), r->dim == 1 ? "" : "lower "));
    }
  g_ptr_array_add (r->notes, g_strdup (
    "a rectilinear normal coordinate describes a torsion (or another large curvilinear motion) "
    "only at small amplitude"));
  g_ptr_array_add (r->notes, g_strdup_printf (
    "V(Q) is a %s inside the scanned range only (never extrapolated); the DVR grid spans that "
    "range", fit_name (r->potential)));
}

static char *
format_text (const QvScanLevelsReport *r)
{
  const QvScanLevels *l = r->levels;
  const QvDvrRefinement *ref = l->refinement;
  GString *s = g_string_new (NULL);
  double lo, hi, rms, max;

  qv_scan_potential_range (r->potential, 0, &lo, &hi);
  qv_scan_potential_residual (r->potential, &rms, &max);
  if (r->dim == 1)
    g_string_append_printf (s, "# quaver anharmonic: mode %u (harmonic %.2f cm^-1 in the manifest), "
                            "%u points, Q from %.5f to %.5f u^1/2 A\n", r->modes[0],
                            r->wavenumbers[0], r->n_points, lo, hi);
  else
    {
      double lo1, hi1;
      qv_scan_potential_range (r->potential, 1, &lo1, &hi1);
      g_string_append_printf (s, "# quaver anharmonic: modes %u and %u (harmonic %.2f and %.2f "
                              "cm^-1 in the manifest), a %u-point grid, Q1 from %.5f to %.5f, Q2 "
                              "from %.5f to %.5f u^1/2 A\n", r->modes[0], r->modes[1],
                              r->wavenumbers[0], r->wavenumbers[1], r->n_points, lo, hi, lo1, hi1);
    }
  g_string_append_printf (s, "# energies: %s\n", r->source);
  if (qv_scan_potential_fit (r->potential) == QV_SCAN_FIT_POLYNOMIAL)
    g_string_append_printf (s, "# V(Q): polynomial of %sdegree %u, residual at the points rms %.4g "
                            "cm^-1, largest %.4g cm^-1\n", r->dim == 2 ? "total " : "",
                            qv_scan_potential_degree (r->potential), cm (rms), cm (max));
  else
    g_string_append_printf (s, "# V(Q): %s through every point\n", fit_name (r->potential));
  if (r->dim == 1)
    g_string_append_printf (s, "# minimum at Q = %.6f u^1/2 A; harmonic wavenumber from the "
                            "curvature there: %.4f cm^-1\n", l->q_min[0], l->harmonic[0]);
  else
    g_string_append_printf (s, "# minimum at Q1 = %.6f, Q2 = %.6f u^1/2 A; harmonic wavenumbers "
                            "from the curvature there: %.4f and %.4f cm^-1\n", l->q_min[0],
                            l->q_min[1], l->harmonic[0], l->harmonic[1]);
  if (r->dim == 1)
    g_string_append_printf (s, "# %3s %14s %14s %12s %12s %12s %11s\n", "v", "E_v", "E_v-E_0",
                            "<Q>", "Q_tp-", "Q_tp+", "edge");
  else
    g_string_append_printf (s, "# %3s %14s %14s %12s %12s %11s\n", "v", "E_v", "E_v-E_0",
                            "<Q1>", "<Q2>", "edge");
  g_string_append_printf (s, "# %3s %14s %14s %12s %12s%s\n", "", "cm^-1", "cm^-1", "u^1/2 A",
                          "u^1/2 A", r->dim == 1 ? "      u^1/2 A" : "");
  for (gsize k = 0; k < l->n_levels; k++)
    {
      const QvScanLevel *v = &l->levels[k];
      g_string_append_printf (s, "  %3" G_GSIZE_FORMAT " ", k);
      {
        GString *t = g_string_new (NULL);
        num (t, "%.6f", cm (v->energy));
        g_string_append_printf (s, "%14s ", t->str);
        g_string_truncate (t, 0);
        num (t, "%.6f", cm (v->energy - l->levels[0].energy));
        g_string_append_printf (s, "%14s ", t->str);
        for (int c = 0; c < (r->dim == 1 ? 3 : 2); c++)
          {
            g_string_truncate (t, 0);
            num (t, "%.6f", r->dim == 1 ? (c == 0 ? v->mean[0] : v->turning[c - 1]) : v->mean[c]);
            g_string_append_printf (s, "%12s ", t->str);
          }
        g_string_truncate (t, 0);
        g_string_append_printf (t, "%.2e", v->edge_weight);
        g_string_append_printf (s, "%11s%s\n", t->str, v->above_scan ? "  above the scan" : "");
        g_string_free (t, TRUE);
      }
    }
  if (r->dim == 1)
    {
      g_string_append_printf (s, "# fundamental (E_1-E_0) %.6f cm^-1, first overtone (E_2-E_0) "
                              "%.6f cm^-1\n", cm (l->fundamental), cm (l->overtone));
      g_string_append_printf (s, "# omega_e %.6f cm^-1, anharmonicity constant omega_e x_e %.6f "
                              "cm^-1 (through E_0, E_1, E_2)\n", cm (l->omega_e),
                              cm (l->omega_e_x_e));
    }
  else
    for (int f = 0; f < 2; f++)
      g_string_append_printf (s, "# coupled fundamental %d: level %" G_GSIZE_FORMAT ", %.6f cm^-1, "
                              "mostly along Q%u (mode %u)\n", f + 1, l->fundamental_level[f],
                              cm (l->fundamentals[f]), l->fundamental_axis[f] + 1,
                              r->modes[l->fundamental_axis[f]]);
  g_string_append (s, "# DVR grid (points per mode, largest level change in cm^-1):");
  for (guint k = 0; k < ref->steps->len; k++)
    {
      const QvDvrStep *st = &g_array_index (ref->steps, QvDvrStep, k);
      if (isnan (st->max_change))
        g_string_append_printf (s, " %" G_GSIZE_FORMAT, st->n[0]);
      else
        g_string_append_printf (s, ", %" G_GSIZE_FORMAT " (%.2g)", st->n[0], cm (st->max_change));
    }
  g_string_append_printf (s, "; %s\n", ref->converged ? "converged to 1e-6 cm^-1" : "NOT converged");
  for (guint k = 0; k < r->warnings->len; k++)
    g_string_append_printf (s, "# warning: %s\n", (const char *) g_ptr_array_index (r->warnings, k));
  for (guint k = 0; k < r->notes->len; k++)
    g_string_append_printf (s, "# note: %s\n", (const char *) g_ptr_array_index (r->notes, k));
  return g_string_free (s, FALSE);
}

static char *
format_csv (const QvScanLevelsReport *r)
{
  const QvScanLevels *l = r->levels;
  GString *s = g_string_new (NULL);

  if (r->dim == 1)
    g_string_append (s, "v,energy_cm-1,above_ground_cm-1,mean_Q,turning_point_minus,"
                        "turning_point_plus,edge_weight,above_scan\n");
  else
    g_string_append (s, "v,energy_cm-1,above_ground_cm-1,mean_Q1,mean_Q2,edge_weight,above_scan\n");
  for (gsize k = 0; k < l->n_levels; k++)
    {
      const QvScanLevel *v = &l->levels[k];
      char buf[G_ASCII_DTOSTR_BUF_SIZE];
      const double cols[5] = { cm (v->energy), cm (v->energy - l->levels[0].energy), v->mean[0],
                               r->dim == 1 ? v->turning[0] : v->mean[1], v->turning[1] };
      g_string_append_printf (s, "%" G_GSIZE_FORMAT, k);
      for (int c = 0; c < (r->dim == 1 ? 5 : 4); c++)
        {
          g_string_append_c (s, ',');
          if (isfinite (cols[c]))
            g_string_append (s, qv_json_format_double (buf, cols[c]));
        }
      g_string_append_printf (s, ",%s,%s\n", qv_json_format_double (buf, v->edge_weight),
                              v->above_scan ? "true" : "false");
    }
  return g_string_free (s, FALSE);
}

static char *
format_json (const QvScanLevelsReport *r)
{
  const QvScanLevels *l = r->levels;
  const QvDvrRefinement *ref = l->refinement;
  QvJsonWriter *w = qv_json_writer_new ();
  double rms, max;

  qv_scan_potential_residual (r->potential, &rms, &max);
  qv_json_begin_object (w, NULL);
  qv_json_begin_object (w, "units");
  qv_json_string (w, "energy", "cm^-1");
  qv_json_string (w, "Q", "u^1/2 A");
  qv_json_end_object (w);
  qv_json_int (w, "dimension", r->dim);
  qv_json_begin_array (w, "modes");
  for (guint d = 0; d < r->dim; d++)
    {
      double lo, hi;
      qv_scan_potential_range (r->potential, d, &lo, &hi);
      qv_json_begin_object (w, NULL);
      qv_json_int (w, "mode", r->modes[d]);
      qv_json_number (w, "manifest_wavenumber", r->wavenumbers[d]);
      qv_json_number (w, "Q_min", lo);
      qv_json_number (w, "Q_max", hi);
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  qv_json_int (w, "points", r->n_points);
  qv_json_string (w, "energies", r->source);
  qv_json_begin_object (w, "potential");
  qv_json_string (w, "method", qv_scan_potential_fit (r->potential) == QV_SCAN_FIT_SPLINE
                  ? "spline" : "polynomial");
  if (qv_scan_potential_fit (r->potential) == QV_SCAN_FIT_POLYNOMIAL)
    qv_json_int (w, "degree", qv_scan_potential_degree (r->potential));
  qv_json_number (w, "residual_rms", cm (rms));
  qv_json_number (w, "residual_max", cm (max));
  qv_json_end_object (w);
  qv_json_begin_object (w, "minimum");
  qv_json_numbers (w, "Q", l->q_min, r->dim);
  qv_json_bool (w, "inside", l->minimum_inside);
  qv_json_end_object (w);
  qv_json_numbers (w, "harmonic_wavenumbers", l->harmonic, r->dim);
  qv_json_begin_array (w, "levels");
  for (gsize k = 0; k < l->n_levels; k++)
    {
      const QvScanLevel *v = &l->levels[k];
      qv_json_begin_object (w, NULL);
      qv_json_int (w, "v", (gint64) k);
      qv_json_number (w, "energy", cm (v->energy));
      qv_json_number (w, "above_ground", cm (v->energy - l->levels[0].energy));
      qv_json_numbers (w, "mean_Q", v->mean, r->dim);
      if (r->dim == 1)
        qv_json_numbers (w, "turning_points", v->turning, 2);
      qv_json_number (w, "edge_weight", v->edge_weight);
      qv_json_bool (w, "above_scan", v->above_scan);
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  if (r->dim == 1)
    {
      qv_json_number (w, "fundamental", cm (l->fundamental));
      qv_json_number (w, "overtone", cm (l->overtone));
      qv_json_number (w, "omega_e", cm (l->omega_e));
      qv_json_number (w, "omega_e_x_e", cm (l->omega_e_x_e));
      qv_json_begin_array (w, "minima");
      for (guint k = 0; k < l->minima->len; k++)
        {
          const QvScanMinimum *mn = &g_array_index (l->minima, QvScanMinimum, k);
          qv_json_begin_object (w, NULL);
          qv_json_number (w, "Q", mn->Q[0]);
          qv_json_number (w, "energy", cm (mn->energy));
          qv_json_end_object (w);
        }
      qv_json_end_array (w);
      if (l->minima->len >= 2)
        {
          qv_json_begin_object (w, "double_well");
          qv_json_number (w, "barrier", cm (l->barrier));
          qv_json_number (w, "splitting", cm (l->splitting));
          qv_json_end_object (w);
        }
      else
        qv_json_null (w, "double_well");
    }
  else
    {
      qv_json_begin_array (w, "fundamentals");
      for (int f = 0; f < 2; f++)
        {
          qv_json_begin_object (w, NULL);
          qv_json_int (w, "level", (gint64) l->fundamental_level[f]);
          qv_json_number (w, "wavenumber", cm (l->fundamentals[f]));
          qv_json_int (w, "mostly_mode", r->modes[l->fundamental_axis[f]]);
          qv_json_end_object (w);
        }
      qv_json_end_array (w);
    }
  qv_json_begin_object (w, "convergence");
  qv_json_number (w, "tolerance", 1e-6);
  qv_json_bool (w, "converged", ref->converged);
  qv_json_begin_array (w, "steps");
  for (guint k = 0; k < ref->steps->len; k++)
    {
      const QvDvrStep *st = &g_array_index (ref->steps, QvDvrStep, k);
      qv_json_begin_object (w, NULL);
      qv_json_int (w, "points", (gint64) st->n[0]);
      qv_json_number (w, "step", st->step[0]);
      qv_json_number (w, "max_change", cm (st->max_change));
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  qv_json_end_object (w);
  qv_json_begin_array (w, "warnings");
  for (guint k = 0; k < r->warnings->len; k++)
    qv_json_string (w, NULL, g_ptr_array_index (r->warnings, k));
  qv_json_end_array (w);
  qv_json_begin_array (w, "notes");
  for (guint k = 0; k < r->notes->len; k++)
    qv_json_string (w, NULL, g_ptr_array_index (r->notes, k));
  qv_json_end_array (w);
  qv_json_end_object (w);
  return qv_json_writer_finish (w);
}


double
qv_scan_levels_wavenumber (double ev)
{
  return cm (ev);
}

void
qv_scan_levels_report_init (QvScanLevelsReport *report, const QvScanEnergies *scan,
                            const QvScanPotential *potential, const QvScanLevels *levels)
{
  memset (report, 0, sizeof *report);
  report->potential = potential;
  report->levels = levels;
  report->dim = scan->dim;
  memcpy (report->modes, scan->modes, sizeof report->modes);
  memcpy (report->wavenumbers, scan->wavenumbers, sizeof report->wavenumbers);
  report->n_points = scan->points->len;
  report->source = scan->source;
  report->warnings = g_ptr_array_new_with_free_func (g_free);
  report->notes = g_ptr_array_new_with_free_func (g_free);
  collect_warnings (report);
}

void
qv_scan_levels_report_clear (QvScanLevelsReport *report)
{
  g_clear_pointer (&report->warnings, g_ptr_array_unref);
  g_clear_pointer (&report->notes, g_ptr_array_unref);
}

char *
qv_scan_levels_table_write (const QvScanLevelsReport *report, QvScanLevelsTableFormat format)
{
  switch (format)
    {
    case QV_SCAN_LEVELS_TABLE_CSV:
      return format_csv (report);
    case QV_SCAN_LEVELS_TABLE_JSON:
      return format_json (report);
    case QV_SCAN_LEVELS_TABLE_TEXT:
    default:
      return format_text (report);
    }
}
