/* qv-phonon-thermal.c — thermal properties, U tensors and sound velocities
 * of a crystal from its modes (see qv-phonon-thermal.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <complex.h>
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-phonon-thermal.h"
#include "qv-units.h"

/* ħω in eV for a wavenumber in cm⁻¹, k_B in eV/K */
#define EV_PER_CM1 (QV_PLANCK * QV_SPEED_OF_LIGHT * 100.0 / QV_ELEMENTARY_CHARGE)
#define KB_EV (QV_BOLTZMANN / QV_ELEMENTARY_CHARGE)

void
qv_thermal_free (QvThermal *th)
{
  if (th == NULL)
    return;
  g_free (th->t);
  g_free (th->zpe);
  g_free (th->energy);
  g_free (th->free_energy);
  g_free (th->entropy);
  g_free (th->heat_capacity);
  g_free (th);
}

static gboolean
is_gamma (const double q[3])
{
  return q[0] == 0 && q[1] == 0 && q[2] == 0;
}

/* The three modes smallest in |ω| at Γ (indices into w), ascending |ω|. */
static void
gamma_acoustic (gsize nb, const double *w, gsize out[3])
{
  for (int r = 0; r < 3; r++)
    {
      gsize best = nb;
      for (gsize b = 0; b < nb; b++)
        {
          gboolean taken = FALSE;
          for (int s = 0; s < r; s++)
            taken |= out[s] == b;
          if (!taken && (best == nb || fabs (w[b]) < fabs (w[best])))
            best = b;
        }
      out[r] = best;
    }
}

/* classification: 1 summed, 0 zero, −1 imaginary, −2 Γ acoustic skipped */
static void
classify (const double q[3], gsize nb, const double *w, gboolean skip, int *kind)
{
  for (gsize b = 0; b < nb; b++)
    kind[b] = w[b] > 0 ? 1 : w[b] < 0 ? -1 : 0;
  if (skip && is_gamma (q) && nb >= 3)
    {
      gsize ac[3];
      gamma_acoustic (nb, w, ac);
      for (int r = 0; r < 3; r++)
        kind[ac[r]] = -2;
    }
}

void
qv_thermal_select_modes (const double q[3], gsize nb, const double *w,
                         gboolean skip_gamma_acoustic, gboolean *use)
{
  g_autofree int *kind = g_new (int, nb);
  classify (q, nb, w, skip_gamma_acoustic, kind);
  for (gsize b = 0; b < nb; b++)
    use[b] = kind[b] == 1;
}

QvThermal *
qv_thermal_compute (gsize n_q, gsize nb, const double *q, const double *w,
                    gboolean skip_gamma_acoustic, const double *t, gsize n_t)
{
  QvThermal *th = g_new0 (QvThermal, 1);
  g_autofree int *kind = g_new (int, nb);
  double inv = 1.0 / (double) n_q;

  th->n_t = n_t;
  th->n_q = n_q;
  th->t = g_memdup2 (t, n_t * sizeof (double));
  th->zpe = g_new0 (double, n_t);
  th->energy = g_new0 (double, n_t);
  th->free_energy = g_new0 (double, n_t);
  th->entropy = g_new0 (double, n_t);
  th->heat_capacity = g_new0 (double, n_t);
  for (gsize k = 0; k < n_q; k++)
    {
      classify (q + 3 * k, nb, w + k * nb, skip_gamma_acoustic, kind);
      for (gsize b = 0; b < nb; b++)
        {
          double e = w[k * nb + b] * EV_PER_CM1;     /* ħω, eV */
          switch (kind[b])
            {
            case -2: th->n_gamma_skipped++; continue;
            case -1:
              th->n_imaginary++;
              th->most_imaginary = MIN (th->most_imaginary, w[k * nb + b]);
              continue;
            case 0: th->n_zero++; continue;
            default: break;
            }
          th->n_modes++;
          for (gsize i = 0; i < n_t; i++)
            {
              double kt = KB_EV * t[i], x, n, l;
              th->zpe[i] += 0.5 * e * inv;
              if (!(kt > 0) || e / kt > 700)
                {
                  th->energy[i] += 0.5 * e * inv;
                  th->free_energy[i] += 0.5 * e * inv;
                  continue;
                }
              x = e / kt;
              n = 1.0 / expm1 (x);
              l = log1p (-exp (-x));                  /* ln(1 − e^{−x}) */
              th->energy[i] += e * (0.5 + n) * inv;
              th->free_energy[i] += (0.5 * e + kt * l) * inv;
              th->entropy[i] += KB_EV * (x * n - l) * inv;
              /* x² e^x/(e^x − 1)² = x² n (n + 1) */
              th->heat_capacity[i] += KB_EV * x * x * n * (n + 1) * inv;
            }
        }
    }
  return th;
}

double
qv_thermal_kj_per_mol (gsize z)
{
  return QV_ELEMENTARY_CHARGE * QV_AVOGADRO / 1000.0 / (double) z;
}

gsize
qv_thermal_formula_units (gsize n, const guint *site_z)
{
  gsize g = 0;
  for (gsize s = 0; s < n; s++)
    {
      gsize count = 0, a, b;
      gboolean seen = FALSE;
      for (gsize r = 0; r < s; r++)
        seen |= site_z[r] == site_z[s];
      if (seen)
        continue;
      for (gsize r = 0; r < n; r++)
        count += site_z[r] == site_z[s];
      a = g; b = count;
      while (b) { gsize c = a % b; a = b; b = c; }
      g = a;
    }
  return g ? g : 1;
}

typedef struct {
  gsize n_sites, n_t;
  const double *t;
  const double *masses;
  gboolean skip;
  double *u;            /* n_t × n_sites × 9, unnormalised sums */
} UJob;

static gboolean
u_chunk (const QvPhononSet *set, gsize start, gpointer user_data, GError **error)
{
  UJob *job = user_data;
  gsize nb = set->n_branches;
  g_autofree int *kind = g_new (int, nb);
  /* ħ/(2 m_u ω) in Å² for ω in rad/s */
  const double pre = QV_HBAR / (2 * QV_ATOMIC_MASS) * 1e20;
  (void) start; (void) error;

  for (gsize k = 0; k < set->n_q; k++)
    {
      classify (set->q + 3 * k, nb, set->wavenumbers + k * nb, job->skip, kind);
      for (gsize b = 0; b < nb; b++)
        {
          double wn = set->wavenumbers[k * nb + b];
          double omega = 2 * G_PI * QV_SPEED_OF_LIGHT * 100.0 * wn;
          double e = wn * EV_PER_CM1;
          const double _Complex *v = set->eigenvectors + (k * nb + b) * nb;
          if (kind[b] != 1)
            continue;
          for (gsize s = 0; s < job->n_sites; s++)
            {
              double ee[9], base = pre / (job->masses[s] * omega);
              for (int i = 0; i < 3; i++)
                for (int j = 0; j < 3; j++)
                  ee[3 * i + j] = creal (v[3 * s + i] * conj (v[3 * s + j]));
              for (gsize it = 0; it < job->n_t; it++)
                {
                  double kt = KB_EV * job->t[it];
                  double c = (kt > 0 && e / kt < 700) ? 1.0 / tanh (0.5 * e / kt) : 1.0;
                  double *u = job->u + (it * job->n_sites + s) * 9;
                  for (int m = 0; m < 9; m++)
                    u[m] += base * c * ee[m];
                }
            }
        }
    }
  return TRUE;
}

double *
qv_thermal_displacements (const QvForceConstants *fc, const QvPhononMesh *mesh,
                          const double *t, gsize n_t, gboolean skip_gamma_acoustic,
                          guint n_threads, const QvProgress *progress, GError **error)
{
  return qv_thermal_displacements_with (fc, NULL, NULL, mesh, t, n_t, skip_gamma_acoustic,
                                        n_threads, progress, error);
}

double *
qv_thermal_displacements_with (const QvForceConstants *fc, QvDynamicalTerm term, gpointer data,
                               const QvPhononMesh *mesh, const double *t, gsize n_t,
                               gboolean skip_gamma_acoustic, guint n_threads,
                               const QvProgress *progress, GError **error)
{
  gsize n = qv_force_constants_n_sites (fc);
  UJob job = { n, n_t, t, qv_force_constants_masses (fc), skip_gamma_acoustic,
               g_new0 (double, n_t * n * 9) };
  if (!qv_phonon_mesh_solve_with (fc, term, data, mesh, TRUE, 0, n_threads, u_chunk, &job,
                                  progress, error))
    {
      g_free (job.u);
      return NULL;
    }
  for (gsize i = 0; i < n_t * n * 9; i++)
    job.u[i] /= (double) mesh->n_q;
  return job.u;
}

gboolean
qv_sound_velocity (const QvForceConstants *fc, const double direction[3], double dq,
                   QvSoundVelocity *out, GError **error)
{
  const double (*cell)[3] = qv_force_constants_cell (fc);
  double len = sqrt (direction[0] * direction[0] + direction[1] * direction[1]
                     + direction[2] * direction[2]);
  double q[6], v[2][3];
  gsize nb = 3 * qv_force_constants_n_sites (fc);
  g_autoptr(QvPhononSet) set = NULL;

  if (!(len > 0) || !isfinite (len))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "a sound-velocity direction must be a non-zero vector");
      return FALSE;
    }
  if (!(dq > 0))
    dq = 1e-3;
  memset (out, 0, sizeof *out);
  out->dq = dq;
  for (int x = 0; x < 3; x++)
    out->direction[x] = direction[x] / len;
  /* fractional f_i = q·a_i / 2π for the Cartesian q = s δ ê */
  for (int s = 0; s < 2; s++)
    for (int i = 0; i < 3; i++)
      {
        double dot = 0;
        for (int x = 0; x < 3; x++)
          dot += cell[i][x] * out->direction[x];
        q[3 * s + i] = (s + 1) * dq * dot / (2 * G_PI);
      }
  set = qv_dynamical_matrix_solve (fc, q, 2, TRUE, 1, NULL, error);
  if (set == NULL)
    return FALSE;
  for (int s = 0; s < 2; s++)
    for (int b = 0; b < 3; b++)
      {
        double wn = set->wavenumbers[s * nb + b];
        if (!(wn > 0))
          {
            g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                         "acoustic branch %d is %s (%.4g cm^-1) at |q| = %g 1/A along (%.4f %.4f %.4f): "
                         "no sound velocity; check the force constants (sum rule, convergence)",
                         b + 1, wn < 0 ? "imaginary" : "zero", wn, (s + 1) * dq,
                         out->direction[0], out->direction[1], out->direction[2]);
            return FALSE;
          }
        /* ω (rad/s) / |q| (1/m) */
        v[s][b] = 2 * G_PI * QV_SPEED_OF_LIGHT * 100.0 * wn / ((s + 1) * dq * 1e10);
      }
  for (int b = 0; b < 3; b++)
    {
      const double _Complex *e = set->eigenvectors + (gsize) b * nb;
      double l = 0;
      out->velocity[b] = (4 * v[0][b] - v[1][b]) / 3;
      out->linearity[b] = fabs (v[0][b] - v[1][b]) / v[0][b];
      for (gsize s = 0; s < nb / 3; s++)
        {
          double _Complex d = 0;
          for (int x = 0; x < 3; x++)
            d += out->direction[x] * e[3 * s + x];
          l += creal (d) * creal (d) + cimag (d) * cimag (d);
        }
      out->longitudinal[b] = l;
    }
  return TRUE;
}
