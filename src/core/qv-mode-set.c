/* qv-mode-set.c — per-mode quantities derived from the eigenpairs.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-mode-set.h"
#include "qv-oscillator.h"
#include "qv-units.h"

const char *
qv_projection_name (QvProjection projection)
{
  switch (projection)
    {
    case QV_PROJECTION_FULL: return "full";
    case QV_PROJECTION_TRANSLATIONS: return "translations";
    case QV_PROJECTION_NONE: return "none";
    default: return "?";
    }
}

gboolean
qv_projection_parse (const char *text, QvProjection *projection, GError **error)
{
  for (int p = QV_PROJECTION_FULL; p <= QV_PROJECTION_NONE; p++)
    if (text && g_ascii_strcasecmp (text, qv_projection_name ((QvProjection) p)) == 0)
      {
        *projection = (QvProjection) p;
        return TRUE;
      }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "unknown projection '%s'; accepted: full, translations, none", text ? text : "");
  return FALSE;
}

QvModeSet *
qv_mode_set_new (gsize n_atoms, const double *masses, gsize n_modes,
                 double *eigenvalues, double *vectors)
{
  QvModeSet *m = g_new0 (QvModeSet, 1);
  m->n_atoms = n_atoms;
  m->n_modes = n_modes;
  m->n_vibrations = n_modes;
  m->masses = g_memdup2 (masses, sizeof (double) * MAX (n_atoms, 1));
  m->eigenvalues = eigenvalues;
  m->vectors = vectors;
  return m;
}

QvModeSet *
qv_mode_set_new_from_cartesian (const QvStructure *structure, gsize n_modes,
                                const double *wavenumbers, const double *displacements,
                                GError **error)
{
  const gsize n = 3 * structure->n_atoms;
  g_autofree double *masses = qv_structure_masses (structure);
  double *values, *vectors;
  QvModeSet *m;

  if (n_modes > n)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "%" G_GSIZE_FORMAT " modes given for %" G_GSIZE_FORMAT
                   " atoms (at most 3N = %" G_GSIZE_FORMAT ")", n_modes, structure->n_atoms, n);
      return NULL;
    }
  values = g_new (double, MAX (n_modes, 1));
  vectors = g_new (double, MAX (n * n_modes, 1));
  for (gsize k = 0; k < n_modes; k++)
    {
      double norm = 0.0;
      if (!isfinite (wavenumbers[k]))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "mode %" G_GSIZE_FORMAT
                       ": wavenumber is not a finite number", k + 1);
          goto fail;
        }
      values[k] = qv_eigenvalue_from_wavenumber (wavenumbers[k]);
      for (gsize i = 0; i < n; i++)
        {
          const double x = displacements[k * n + i] * sqrt (masses[i / 3]);
          if (!isfinite (x))
            {
              g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "mode %" G_GSIZE_FORMAT
                           ": displacement %" G_GSIZE_FORMAT " is not a finite number", k + 1, i + 1);
              goto fail;
            }
          vectors[k * n + i] = x;
          norm += x * x;
        }
      if (!(norm > 0.0))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "mode %" G_GSIZE_FORMAT
                       ": the displacement vector is zero", k + 1);
          goto fail;
        }
      norm = 1.0 / sqrt (norm);
      for (gsize i = 0; i < n; i++)
        vectors[k * n + i] *= norm;
    }
  /* Sort by eigenvalue (imaginary first), as the solver does. Insertion
   * sort: mode counts are small and this keeps equal values in order. */
  for (gsize k = 1; k < n_modes; k++)
    for (gsize j = k; j > 0 && values[j - 1] > values[j]; j--)
      {
        double t = values[j]; values[j] = values[j - 1]; values[j - 1] = t;
        for (gsize i = 0; i < n; i++)
          {
            t = vectors[j * n + i];
            vectors[j * n + i] = vectors[(j - 1) * n + i];
            vectors[(j - 1) * n + i] = t;
          }
      }
  m = qv_mode_set_new (structure->n_atoms, masses, n_modes, values, vectors);
  m->projection = QV_PROJECTION_NONE;
  m->has_hessian = FALSE;
  return m;

fail:
  g_free (values);
  g_free (vectors);
  return NULL;
}

void
qv_mode_set_free (QvModeSet *modes)
{
  if (modes == NULL)
    return;
  g_free (modes->masses);
  g_free (modes->eigenvalues);
  g_free (modes->vectors);
  g_free (modes->rigid_mixing);
  g_free (modes);
}

const double *
qv_mode_set_vector (const QvModeSet *modes, gsize k)
{
  g_return_val_if_fail (k < modes->n_modes, NULL);
  return modes->vectors + k * 3 * modes->n_atoms;
}

double
qv_mode_set_wavenumber (const QvModeSet *modes, gsize k)
{
  return qv_wavenumber_from_eigenvalue (modes->eigenvalues[k]);
}

gboolean
qv_mode_set_is_imaginary (const QvModeSet *modes, gsize k)
{
  return modes->eigenvalues[k] < 0.0;
}

void
qv_mode_set_cartesian (const QvModeSet *modes, gsize k, double *out)
{
  const double *l = qv_mode_set_vector (modes, k);
  for (gsize a = 0; a < modes->n_atoms; a++)
    {
      const double s = 1.0 / sqrt (modes->masses[a]);
      for (int c = 0; c < 3; c++)
        out[3 * a + c] = l[3 * a + c] * s;
    }
}

double
qv_mode_set_reduced_mass (const QvModeSet *modes, gsize k)
{
  const double *l = qv_mode_set_vector (modes, k);
  double sum = 0.0;
  for (gsize a = 0; a < modes->n_atoms; a++)
    for (int c = 0; c < 3; c++)
      sum += l[3 * a + c] * l[3 * a + c] / modes->masses[a];
  return 1.0 / sum;
}

double
qv_mode_set_force_constant (const QvModeSet *modes, gsize k)
{
  /* μ [u] · ω² [eV/(Å² u)] = eV/Å², then to mdyn/Å. */
  return qv_mode_set_reduced_mass (modes, k) * modes->eigenvalues[k]
         / qv_units_ev_a2_per_mdyn_a ();
}

void
qv_mode_set_participation (const QvModeSet *modes, gsize k, double *out)
{
  const double *l = qv_mode_set_vector (modes, k);
  double total = 0.0;
  for (gsize a = 0; a < modes->n_atoms; a++)
    {
      out[a] = l[3 * a] * l[3 * a] + l[3 * a + 1] * l[3 * a + 1] + l[3 * a + 2] * l[3 * a + 2];
      total += out[a];
    }
  /* The vector is normalised; dividing removes rounding so the sum is 1. */
  if (total > 0)
    for (gsize a = 0; a < modes->n_atoms; a++)
      out[a] /= total;
}

double
qv_mode_set_collectivity (const QvModeSet *modes, gsize k)
{
  g_autofree double *p = g_new (double, MAX (modes->n_atoms, 1));
  double entropy = 0.0;
  qv_mode_set_participation (modes, k, p);
  for (gsize a = 0; a < modes->n_atoms; a++)
    if (p[a] > 0.0)
      entropy -= p[a] * log (p[a]);
  return exp (entropy) / (double) modes->n_atoms;
}

double
qv_mode_set_atom_displacement (const QvModeSet *modes, gsize k, gsize atom, double q)
{
  const double *l = qv_mode_set_vector (modes, k) + 3 * atom;

  g_return_val_if_fail (atom < modes->n_atoms, NAN);
  return fabs (q) * sqrt ((l[0] * l[0] + l[1] * l[1] + l[2] * l[2]) / modes->masses[atom]);
}

double
qv_mode_set_max_displacement (const QvModeSet *modes, gsize k, double q, gsize *atom)
{
  const double *l = qv_mode_set_vector (modes, k);
  double best = -1.0;
  gsize best_atom = 0;
  for (gsize a = 0; a < modes->n_atoms; a++)
    {
      const double d2 = (l[3 * a] * l[3 * a] + l[3 * a + 1] * l[3 * a + 1]
                         + l[3 * a + 2] * l[3 * a + 2]) / modes->masses[a];
      if (d2 > best)
        {
          best = d2;
          best_atom = a;
        }
    }
  if (atom)
    *atom = best_atom;
  return fabs (q) * sqrt (MAX (best, 0.0));
}

void
qv_mode_set_turning_point (const QvModeSet *modes, gsize k, guint v, QvTurningPoint *tp)
{
  const double lambda = modes->eigenvalues[k];
  memset (tp, 0, sizeof *tp);
  tp->v = v;
  tp->defined = lambda > 0.0;
  if (!tp->defined)
    {
      tp->q = tp->max_displacement = tp->energy = NAN;
      return;
    }
  tp->q = qv_oscillator_turning_point (lambda, v);
  tp->energy = qv_oscillator_level_energy (lambda, v);
  tp->max_displacement = qv_mode_set_max_displacement (modes, k, tp->q, &tp->max_atom);
}

double
qv_mode_set_display_amplitude (const QvModeSet *modes, gsize k, guint v, double multiple,
                               gboolean *from_turning_point)
{
  QvTurningPoint tp;
  double unit;

  qv_mode_set_turning_point (modes, k, v, &tp);
  if (from_turning_point)
    *from_turning_point = tp.defined;
  if (tp.defined)
    return multiple * tp.q;
  unit = qv_mode_set_max_displacement (modes, k, 1.0, NULL);
  return unit > 0.0 ? multiple * QV_DISPLAY_FALLBACK_DISPLACEMENT / unit : 0.0;
}

void
qv_mode_set_thermal (const QvModeSet *modes, gsize k, double temperature,
                     QvThermalAmplitude *th)
{
  const double lambda = modes->eigenvalues[k];
  memset (th, 0, sizeof *th);
  th->temperature = temperature;
  th->defined = lambda > 0.0;
  if (!th->defined)
    {
      th->q_rms = th->max_rms_displacement = NAN;
      return;
    }
  th->q_rms = sqrt (qv_oscillator_thermal_q2 (lambda, temperature));
  th->max_rms_displacement = qv_mode_set_max_displacement (modes, k, th->q_rms, &th->max_atom);
}

double
qv_mode_set_max_residual (const QvModeSet *modes)
{
  double m = 0.0;
  for (guint i = 0; i < modes->n_translations; i++)
    m = MAX (m, fabs (modes->translation_residuals[i]));
  for (guint i = 0; i < modes->n_rotations; i++)
    m = MAX (m, fabs (modes->rotation_residuals[i]));
  return m;
}

gboolean
qv_mode_set_rigid_mixing (const QvModeSet *modes, gsize k, double *translation,
                          double *rotation)
{
  if (modes->rigid_mixing == NULL || k >= modes->n_modes)
    {
      *translation = *rotation = NAN;
      return FALSE;
    }
  *translation = modes->rigid_mixing[2 * k];
  *rotation = modes->rigid_mixing[2 * k + 1];
  return TRUE;
}

gsize
qv_mode_set_count_imaginary (const QvModeSet *modes)
{
  gsize c = 0;
  for (gsize k = 0; k < modes->n_modes; k++)
    if (modes->eigenvalues[k] < 0.0)
      c++;
  return c;
}

char **
qv_mode_set_warnings (const QvModeSet *modes)
{
  GPtrArray *w = g_ptr_array_new ();
  double tmax = 0.0, rmax = 0.0;
  gsize n_imag = qv_mode_set_count_imaginary (modes);

  for (guint i = 0; i < modes->n_translations; i++)
    tmax = MAX (tmax, fabs (modes->translation_residuals[i]));
  for (guint i = 0; i < modes->n_rotations; i++)
    rmax = MAX (rmax, fabs (modes->rotation_residuals[i]));
  if (modes->has_hessian && tmax > QV_RESIDUAL_WARNING)
    g_ptr_array_add (w, g_strdup_printf (
      "translation residuals reach %.1f cm⁻¹: the Hessian does not conserve momentum "
      "(check the acoustic sum, numerical noise or a cut-off)", tmax));
  if (modes->has_hessian && rmax > QV_RESIDUAL_WARNING)
    g_ptr_array_add (w, g_strdup_printf (
      "rotation residuals reach %.1f cm⁻¹: the geometry is probably not a stationary point "
      "(re-optimise it; low modes may contain leaked rotation)", rmax));
  if (modes->has_gradient && modes->max_force > QV_FORCE_WARNING)
    g_ptr_array_add (w, g_strdup_printf (
      "the largest atomic force is %.3g eV/Å: the geometry is not a stationary point, so "
      "rotation leaks into the low modes (re-optimise it before trusting them)", modes->max_force));
  if (modes->rigid_mixing)
    {
      gsize worst = 0;
      double worst_mix = 0.0;
      for (gsize k = 0; k < modes->n_modes; k++)
        {
          const double mix = MAX (modes->rigid_mixing[2 * k], modes->rigid_mixing[2 * k + 1]);
          if (mix > worst_mix)
            {
              worst_mix = mix;
              worst = k;
            }
        }
      if (worst_mix > QV_MIXING_WARNING)
        g_ptr_array_add (w, g_strdup_printf (
          "mode %" G_GSIZE_FORMAT " (%.1f%s cm⁻¹) had %.1f%% rigid-body motion projected out: "
          "its frequency is unreliable until the geometry is converged",
          worst + 1, fabs (qv_mode_set_wavenumber (modes, worst)),
          qv_mode_set_is_imaginary (modes, worst) ? "i" : "", 100.0 * worst_mix));
    }
  if (modes->has_hessian && modes->asymmetry > QV_ASYMMETRY_WARNING)
    g_ptr_array_add (w, g_strdup_printf (
      "the Hessian is asymmetric by %.2g of its largest element: it was symmetrized; "
      "check the finite-difference step or the file's layout", modes->asymmetry));
  if (n_imag > 0)
    g_ptr_array_add (w, g_strdup_printf (
      "%" G_GSIZE_FORMAT " imaginary mode%s: the structure is not a minimum along %s",
      n_imag, n_imag == 1 ? "" : "s", n_imag == 1 ? "it" : "them"));
  g_ptr_array_add (w, NULL);
  return (char **) g_ptr_array_free (w, FALSE);
}
