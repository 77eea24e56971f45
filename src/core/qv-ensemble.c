/* qv-ensemble.c — harmonic Wigner sampling (see qv-ensemble.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <cblas.h>
#include <lapacke.h>
#include <math.h>
#include <string.h>
#include "qv-ensemble.h"
#include "qv-error.h"
#include "qv-oscillator.h"
#include "qv-random.h"
#include "qv-rigid-body.h"
#include "qv-units.h"

/* Samples per matrix product. One product [Q P] per block: BLAS packs the
 * mode matrix (3N × modes) once per call, so few wide calls beat many
 * narrow ones (64 samples per call took 1.5× as long for 1000 atoms); 256
 * keeps the scratch at 2 × 3N × 256 doubles and progress reports timely. */
#define BLOCK 256
/* A mode with more than this weight in the rigid-body space is one. */
#define RIGID_WEIGHT_LIMIT 0.5

const char *
qv_ensemble_mode_status_name (QvEnsembleModeStatus status)
{
  switch (status)
    {
    case QV_ENSEMBLE_MODE_SAMPLED: return "sampled";
    case QV_ENSEMBLE_MODE_IMAGINARY: return "imaginary";
    case QV_ENSEMBLE_MODE_ZERO: return "zero";
    case QV_ENSEMBLE_MODE_BELOW_CUTOFF: return "below-cutoff";
    case QV_ENSEMBLE_MODE_RIGID_BODY: return "rigid-body";
    default: return "?";
    }
}

void
qv_ensemble_options_init (QvEnsembleOptions *options)
{
  memset (options, 0, sizeof *options);
  options->temperature = 298.15;
}

/* Weight ‖Vᵀl_k‖² of every mode vector in the rigid-body space at r0. */
static void
rigid_weights (const QvStructure *s, const QvModeSet *modes, gboolean periodic,
               double *weight)
{
  const gsize n = 3 * s->n_atoms;
  g_autofree double *x = g_new (double, n);
  g_autoptr(QvRigidBody) rb = NULL;
  guint r;

  for (gsize a = 0; a < s->n_atoms; a++)
    memcpy (x + 3 * a, s->atoms[a].position, sizeof (double) * 3);
  rb = qv_rigid_body_new (s->n_atoms, x, modes->masses,
                          periodic ? QV_PROJECTION_TRANSLATIONS : QV_PROJECTION_FULL);
  r = qv_rigid_body_rank (rb);
  memset (weight, 0, sizeof (double) * modes->n_modes);
  if (r == 0 || modes->n_modes == 0)
    return;
  {
    g_autofree double *c = g_new (double, (gsize) r * modes->n_modes);
    cblas_dgemm (CblasColMajor, CblasTrans, CblasNoTrans, (int) r, (int) modes->n_modes,
                 (int) n, 1.0, rb->basis, (int) n, modes->vectors, (int) n, 0.0, c, (int) r);
    for (gsize k = 0; k < modes->n_modes; k++)
      for (guint j = 0; j < r; j++)
        weight[k] += c[k * r + j] * c[k * r + j];
  }
}

QvEnsemble *
qv_ensemble_new (const QvStructure *structure, const QvModeSet *modes,
                 const QvEnsembleOptions *options, GError **error)
{
  g_autoptr(QvEnsemble) e = NULL;
  /* √λ (√(eV/(Å² u))) → ω in rad/fs */
  const double omega_fs = qv_units_omega_per_root_eigenvalue () * 1e-15;

  if (!(options->temperature >= 0.0 && isfinite (options->temperature)))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "the temperature must be a finite number of kelvin, 0 or more");
      return NULL;
    }
  if (!(options->min_wavenumber >= 0.0 && isfinite (options->min_wavenumber)))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "the cut-off wavenumber must be a finite number of cm⁻¹, 0 or more");
      return NULL;
    }
  if (modes->n_atoms != structure->n_atoms)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "the modes are of %" G_GSIZE_FORMAT " atoms, the structure has %" G_GSIZE_FORMAT,
                   modes->n_atoms, structure->n_atoms);
      return NULL;
    }

  e = g_new0 (QvEnsemble, 1);
  e->structure = structure;
  e->modes = modes;
  e->options = *options;
  e->periodic = qv_structure_is_periodic (structure);
  e->status = g_new0 (QvEnsembleModeStatus, MAX (modes->n_modes, 1));
  e->sigma_q = g_new0 (double, MAX (modes->n_modes, 1));
  e->sigma_p = g_new0 (double, MAX (modes->n_modes, 1));
  e->rigid_weight = g_new0 (double, MAX (modes->n_modes, 1));
  rigid_weights (structure, modes, e->periodic, e->rigid_weight);

  for (gsize k = 0; k < modes->n_modes; k++)
    {
      const double lambda = modes->eigenvalues[k];
      QvEnsembleModeStatus st = QV_ENSEMBLE_MODE_SAMPLED;

      /* Rigid-body first: unprojected ones have eigenvalues ±rounding. */
      if (e->rigid_weight[k] > RIGID_WEIGHT_LIMIT)
        st = QV_ENSEMBLE_MODE_RIGID_BODY;
      else if (lambda < 0.0)
        st = QV_ENSEMBLE_MODE_IMAGINARY;
      else if (!(lambda > 0.0))
        st = QV_ENSEMBLE_MODE_ZERO;
      else if (qv_wavenumber_from_eigenvalue (lambda) < options->min_wavenumber)
        st = QV_ENSEMBLE_MODE_BELOW_CUTOFF;
      e->status[k] = st;
      if (st != QV_ENSEMBLE_MODE_SAMPLED)
        continue;
      e->sigma_q[k] = sqrt (qv_oscillator_thermal_q2 (lambda, options->temperature));
      /* ⟨P²⟩ = ω²⟨Q²⟩, ω in rad/fs: P in u^½ Å/fs. */
      e->sigma_p[k] = sqrt (lambda) * omega_fs * e->sigma_q[k];
      if (e->n_sampled == 0)
        e->first = k;
      e->last = k;
      e->n_sampled++;
    }
  if (e->n_sampled == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "no mode left to sample: all %" G_GSIZE_FORMAT " modes are imaginary, "
                   "zero, rigid-body or below the cut-off", modes->n_modes);
      return NULL;
    }
  return g_steal_pointer (&e);
}

void
qv_ensemble_free (QvEnsemble *ensemble)
{
  if (ensemble == NULL)
    return;
  g_free (ensemble->status);
  g_free (ensemble->sigma_q);
  g_free (ensemble->sigma_p);
  g_free (ensemble->rigid_weight);
  g_free (ensemble);
}

void
qv_ensemble_draw (const QvEnsemble *e, guint64 index, double *q, double *p)
{
  QvRandom rng;

  qv_random_init_stream (&rng, e->options.seed, index);
  /* Every mode takes its pair, sampled or not, so a mode's draws do not
   * depend on which other modes a cut-off leaves out. */
  for (gsize k = 0; k < e->modes->n_modes; k++)
    {
      double z1, z2;
      qv_random_normal_pair (&rng, &z1, &z2);
      q[k] = e->sigma_q[k] * z1;
      p[k] = e->sigma_p[k] * z2;
    }
}

static double
norm3 (const double v[3])
{
  return sqrt (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]);
}

/* Centre of mass, linear and angular momentum corrections of one sample
 * (positions @x and velocities @v, 3N each, already absolute). */
static void
correct_sample (const QvEnsemble *e, double *x, double *v, QvEnsembleStats *stats)
{
  const QvStructure *s = e->structure;
  const double *m = e->modes->masses;
  const gsize na = s->n_atoms;
  double total = 0.0, com0[3] = { 0 }, com[3] = { 0 }, p[3] = { 0 }, scale = 0.0;
  double lin_removed, ang_removed = 0.0, ang_left = 0.0;

  for (gsize a = 0; a < na; a++)
    {
      total += m[a];
      for (int c = 0; c < 3; c++)
        {
          com0[c] += m[a] * s->atoms[a].position[c];
          com[c] += m[a] * x[3 * a + c];
          p[c] += m[a] * v[3 * a + c];
        }
      scale += m[a] * norm3 (v + 3 * a);
    }
  for (int c = 0; c < 3; c++)
    {
      const double shift = (com[c] - com0[c]) / total;
      const double dv = p[c] / total;
      for (gsize a = 0; a < na; a++)
        {
          x[3 * a + c] -= shift;
          v[3 * a + c] -= dv;
        }
      com[c] = com0[c] / total;     /* the centre of mass of x from now on */
    }
  lin_removed = scale > 0.0 ? norm3 (p) / scale : 0.0;

  if (!e->periodic && na > 1)
    {
      double l[3] = { 0 }, inertia[9] = { 0 }, w[3], omega[3] = { 0 }, rscale = 0.0;

      for (gsize a = 0; a < na; a++)
        {
          const double r[3] = { x[3 * a] - com[0], x[3 * a + 1] - com[1], x[3 * a + 2] - com[2] };
          const double *va = v + 3 * a;
          const double r2 = r[0] * r[0] + r[1] * r[1] + r[2] * r[2];

          l[0] += m[a] * (r[1] * va[2] - r[2] * va[1]);
          l[1] += m[a] * (r[2] * va[0] - r[0] * va[2]);
          l[2] += m[a] * (r[0] * va[1] - r[1] * va[0]);
          for (int i = 0; i < 3; i++)
            for (int j = 0; j < 3; j++)
              inertia[i * 3 + j] += m[a] * ((i == j ? r2 : 0.0) - r[i] * r[j]);
          rscale += m[a] * sqrt (r2) * norm3 (va);
        }
      /* ω = I⁺L over the principal axes above the floor. */
      if (LAPACKE_dsyev (LAPACK_COL_MAJOR, 'V', 'U', 3, inertia, 3, w) == 0 && w[2] > 0.0)
        {
          for (int k = 0; k < 3; k++)
            {
              const double *u = inertia + 3 * k;
              const double lk = u[0] * l[0] + u[1] * l[1] + u[2] * l[2];
              if (w[k] > QV_ENSEMBLE_INERTIA_FLOOR * w[2])
                for (int c = 0; c < 3; c++)
                  omega[c] += lk / w[k] * u[c];
            }
          for (gsize a = 0; a < na; a++)
            {
              const double r[3] = { x[3 * a] - com[0], x[3 * a + 1] - com[1], x[3 * a + 2] - com[2] };
              v[3 * a] -= omega[1] * r[2] - omega[2] * r[1];
              v[3 * a + 1] -= omega[2] * r[0] - omega[0] * r[2];
              v[3 * a + 2] -= omega[0] * r[1] - omega[1] * r[0];
            }
          if (rscale > 0.0)
            {
              double left[3] = { 0 };
              for (gsize a = 0; a < na; a++)
                {
                  const double r[3] = { x[3 * a] - com[0], x[3 * a + 1] - com[1], x[3 * a + 2] - com[2] };
                  const double *va = v + 3 * a;
                  left[0] += m[a] * (r[1] * va[2] - r[2] * va[1]);
                  left[1] += m[a] * (r[2] * va[0] - r[0] * va[2]);
                  left[2] += m[a] * (r[0] * va[1] - r[1] * va[0]);
                }
              ang_removed = norm3 (l) / rscale;
              ang_left = norm3 (left) / rscale;
            }
        }
    }
  if (stats)
    {
      stats->n_samples++;
      stats->max_linear_removed = MAX (stats->max_linear_removed, lin_removed);
      stats->max_angular_removed = MAX (stats->max_angular_removed, ang_removed);
      stats->max_angular_left = MAX (stats->max_angular_left, ang_left);
    }
}

gboolean
qv_ensemble_generate (const QvEnsemble *e, gsize first, gsize count,
                      double *positions, double *velocities, QvEnsembleStats *stats,
                      const QvProgress *progress, GError **error)
{
  const QvModeSet *modes = e->modes;
  const QvStructure *s = e->structure;
  const gsize n = 3 * s->n_atoms;
  const gsize nm = modes->n_modes;
  const gsize mr = e->last - e->first + 1;     /* columns of the product */
  const double *lsub = modes->vectors + e->first * n;
  const gsize block = MIN ((gsize) BLOCK, MAX (count, (gsize) 1));
  /* [Q P] of the block side by side, and L [Q P] (3N × 2·block). */
  g_autofree double *z = g_try_new (double, mr * 2 * block);
  g_autofree double *out = g_try_new (double, n * 2 * block);
  g_autofree double *q = g_new (double, MAX (nm, 1));
  g_autofree double *p = g_new (double, MAX (nm, 1));
  g_autofree double *inv_sqrt_m = g_new (double, MAX (s->n_atoms, 1));

  if (z == NULL || out == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                   "not enough memory to sample %" G_GSIZE_FORMAT " modes of %" G_GSIZE_FORMAT " atoms",
                   mr, s->n_atoms);
      return FALSE;
    }
  for (gsize a = 0; a < s->n_atoms; a++)
    inv_sqrt_m[a] = 1.0 / sqrt (modes->masses[a]);

  for (gsize b0 = 0; b0 < count; b0 += block)
    {
      const gsize nb = MIN (block, count - b0);

      if (!qv_progress_report (progress, (double) b0 / (double) count, "sampling", error))
        return FALSE;
      for (gsize b = 0; b < nb; b++)
        {
          qv_ensemble_draw (e, first + b0 + b, q, p);
          memcpy (z + b * mr, q + e->first, sizeof (double) * mr);
          memcpy (z + (nb + b) * mr, p + e->first, sizeof (double) * mr);
        }
      /* Mass-weighted displacements and momenta, L [Q P] (3N × 2nb); then
       * divided by √m and shifted by r0 into the caller's arrays. */
      cblas_dgemm (CblasColMajor, CblasNoTrans, CblasNoTrans, (int) n, (int) (2 * nb), (int) mr,
                   1.0, lsub, (int) n, z, (int) mr, 0.0, out, (int) n);
      for (gsize b = 0; b < nb; b++)
        {
          double *x = positions + (b0 + b) * n, *v = velocities + (b0 + b) * n;
          const double *dx = out + b * n, *dv = out + (nb + b) * n;
          for (gsize a = 0; a < s->n_atoms; a++)
            for (int c = 0; c < 3; c++)
              {
                x[3 * a + c] = s->atoms[a].position[c] + dx[3 * a + c] * inv_sqrt_m[a];
                v[3 * a + c] = dv[3 * a + c] * inv_sqrt_m[a];
              }
          correct_sample (e, x, v, stats);
        }
    }
  return qv_progress_report (progress, 1.0, "sampling", error);
}

char **
qv_ensemble_warnings (const QvEnsemble *e)
{
  g_autoptr(GPtrArray) out = g_ptr_array_new ();
  const QvModeSet *modes = e->modes;
  g_autoptr(GString) imag = g_string_new (NULL);
  gsize n_imag = 0, n_cut = 0, n_rigid = 0, n_zero = 0;

  for (gsize k = 0; k < modes->n_modes; k++)
    switch (e->status[k])
      {
      case QV_ENSEMBLE_MODE_IMAGINARY:
        g_string_append_printf (imag, "%s%" G_GSIZE_FORMAT " (%.1fi cm⁻¹)", n_imag ? ", " : "",
                                k + 1, -qv_mode_set_wavenumber (modes, k));
        n_imag++;
        break;
      case QV_ENSEMBLE_MODE_BELOW_CUTOFF: n_cut++; break;
      case QV_ENSEMBLE_MODE_RIGID_BODY: n_rigid++; break;
      case QV_ENSEMBLE_MODE_ZERO: n_zero++; break;
      default: break;
      }
  if (n_imag)
    g_ptr_array_add (out, g_strdup_printf (
      "%" G_GSIZE_FORMAT " imaginary mode%s left out (no thermal distribution on a "
      "barrier): mode%s %s", n_imag, n_imag == 1 ? "" : "s", n_imag == 1 ? "" : "s", imag->str));
  if (n_cut)
    g_ptr_array_add (out, g_strdup_printf (
      "%" G_GSIZE_FORMAT " mode%s below %g cm⁻¹ left out (--min-wavenumber)",
      n_cut, n_cut == 1 ? "" : "s", e->options.min_wavenumber));
  if (n_zero)
    g_ptr_array_add (out, g_strdup_printf ("%" G_GSIZE_FORMAT " mode%s of zero frequency left out",
                                           n_zero, n_zero == 1 ? "" : "s"));
  if (n_rigid)
    g_ptr_array_add (out, g_strdup_printf (
      "%" G_GSIZE_FORMAT " rigid-body mode%s of the unprojected mode set left out; "
      "remaining rigid-body motion is removed from every sample",
      n_rigid, n_rigid == 1 ? "" : "s"));
  else if (modes->projection != QV_PROJECTION_FULL && !e->periodic)
    g_ptr_array_add (out, g_strdup (
      "the modes were solved without the full rigid-body projection: centre-of-mass "
      "motion and rotation are removed from every sample explicitly"));
  g_ptr_array_add (out, NULL);
  return (char **) g_ptr_array_steal (out, NULL);
}
