/* qv-dynamical-matrix.c — D(q), zheevd over a thread pool.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <lapacke.h>
#include <math.h>
#include <string.h>
#include "qv-dynamical-matrix.h"
#include "qv-error.h"
#include "qv-supercell.h"
#include "qv-units.h"

/* Present when the BLAS is OpenBLAS (weak: absent with another BLAS). */
extern void openblas_set_num_threads (int num_threads) __attribute__ ((weak));

void
qv_phonon_set_free (QvPhononSet *set)
{
  if (set == NULL)
    return;
  g_free (set->q);
  g_free (set->eigenvalues);
  g_free (set->wavenumbers);
  g_free (set->eigenvectors);
  g_free (set);
}

void
qv_dynamical_matrix_cartesian_q (const double cell[3][3], const double q[3], double out[3])
{
  double b[3][3];
  qv_lattice_reciprocal (cell, b);
  for (int c = 0; c < 3; c++)
    out[c] = q[0] * b[0][c] + q[1] * b[1][c] + q[2] * b[2][c];
}

void
qv_dynamical_matrix_build (const QvForceConstants *fc, const double q[3], double _Complex *d)
{
  gsize n = qv_force_constants_n_sites (fc), nb = 3 * n, nc = qv_force_constants_n_cells (fc);
  const double *m = qv_force_constants_masses (fc);
  double qc[3];

  qv_dynamical_matrix_cartesian_q (qv_force_constants_cell (fc), q, qc);
  memset (d, 0, nb * nb * sizeof *d);
  for (gsize c = 0; c < nc; c++)
    for (gsize k = 0; k < n; k++)
      for (gsize k2 = 0; k2 < n; k2++)
        {
          gsize n_images;
          const QvLatticeImage *im = qv_force_constants_images (fc, c, k, k2, &n_images);
          const double *blk = qv_force_constants_block (fc, c, k, k2);
          double _Complex phase = 0;
          double s = 1.0 / sqrt (m[k] * m[k2]);
          for (gsize i = 0; i < n_images; i++)
            {
              double x = qc[0] * im[i].r[0] + qc[1] * im[i].r[1] + qc[2] * im[i].r[2];
              phase += im[i].weight * (cos (x) + I * sin (x));
            }
          phase *= s;
          for (int a = 0; a < 3; a++)
            for (int b = 0; b < 3; b++)
              d[(3 * k + a) + (3 * k2 + b) * nb] += blk[3 * a + b] * phase;
        }
  for (gsize r = 0; r < nb; r++)
    {
      d[r + r * nb] = creal (d[r + r * nb]);
      for (gsize col = r + 1; col < nb; col++)
        {
          double _Complex v = 0.5 * (d[r + col * nb] + conj (d[col + r * nb]));
          d[r + col * nb] = v;
          d[col + r * nb] = conj (v);
        }
    }
}

typedef struct {
  const QvForceConstants *fc;
  const double *q;
  QvPhononSet *set;
  gsize chunk;
  gint done;            /* atomic: q points finished */
  gint cancelled;       /* atomic */
  GMutex lock;
  GCond cond;
  GError *error;        /* first failure, under lock */
} Job;

static gboolean
solve_one (Job *job, gsize k, double _Complex *d, GError **error)
{
  QvPhononSet *set = job->set;
  gsize nb = set->n_branches;
  double *w = set->eigenvalues + k * nb;
  lapack_int info;

  qv_dynamical_matrix_build (job->fc, job->q + 3 * k, d);
  info = LAPACKE_zheevd (LAPACK_COL_MAJOR, set->eigenvectors ? 'V' : 'N', 'U',
                         (lapack_int) nb, d, (lapack_int) nb, w);
  if (info != 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_SOLVER,
                   "LAPACK zheevd failed (info %d) at q = (%g %g %g)", (int) info,
                   job->q[3 * k], job->q[3 * k + 1], job->q[3 * k + 2]);
      return FALSE;
    }
  for (gsize b = 0; b < nb; b++)
    set->wavenumbers[k * nb + b] = qv_wavenumber_from_eigenvalue (w[b]);
  if (set->eigenvectors)
    for (gsize b = 0; b < nb; b++)
      {
        double _Complex *src = d + b * nb, *dst = set->eigenvectors + (k * nb + b) * nb, phase;
        gsize big = 0;
        for (gsize r = 1; r < nb; r++)
          if (cabs (src[r]) > cabs (src[big]) * (1 + 1e-8))
            big = r;
        phase = cabs (src[big]) > 0 ? conj (src[big]) / cabs (src[big]) : 1;
        for (gsize r = 0; r < nb; r++)
          dst[r] = src[r] * phase;
        dst[big] = creal (dst[big]);
      }
  return TRUE;
}

static void
worker (gpointer data, gpointer user_data)
{
  Job *job = user_data;
  gsize start = GPOINTER_TO_SIZE (data) - 1, end = MIN (start + job->chunk, job->set->n_q);
  gsize nb = job->set->n_branches;
  double _Complex *d = g_new (double _Complex, nb * nb);

  for (gsize k = start; k < end; k++)
    {
      GError *error = NULL;
      if (!g_atomic_int_get (&job->cancelled) && !solve_one (job, k, d, &error))
        {
          g_mutex_lock (&job->lock);
          if (job->error == NULL)
            job->error = error;
          else
            g_error_free (error);
          g_mutex_unlock (&job->lock);
          g_atomic_int_set (&job->cancelled, 1);
        }
      g_mutex_lock (&job->lock);
      job->done++;
      g_cond_signal (&job->cond);
      g_mutex_unlock (&job->lock);
    }
  g_free (d);
}

QvPhononSet *
qv_dynamical_matrix_solve (const QvForceConstants *fc, const double *q, gsize n_q,
                           gboolean want_vectors, guint n_threads, const QvProgress *progress,
                           GError **error)
{
  g_autoptr(QvPhononSet) set = g_new0 (QvPhononSet, 1);
  gsize nb = 3 * qv_force_constants_n_sites (fc);
  GThreadPool *pool;
  Job job = { 0 };
  GError *local = NULL;

  if (n_q == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "no q points to solve");
      return NULL;
    }
  if (want_vectors && (nb * nb > G_MAXSIZE / sizeof (double _Complex) / n_q || n_q * nb * nb > 500000000))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                   "eigenvectors at %" G_GSIZE_FORMAT " q points of %" G_GSIZE_FORMAT
                   " branches would not fit in memory: use fewer q points", n_q, nb);
      return NULL;
    }
  set->n_q = n_q;
  set->n_branches = nb;
  set->q = g_memdup2 (q, 3 * n_q * sizeof (double));
  set->eigenvalues = g_new (double, n_q * nb);
  set->wavenumbers = g_new (double, n_q * nb);
  set->eigenvectors = want_vectors ? g_new (double _Complex, n_q * nb * nb) : NULL;

  if (n_threads == 0)
    n_threads = (guint) MAX (1, g_get_num_processors ());
  n_threads = (guint) MIN ((gsize) n_threads, n_q);
  if (openblas_set_num_threads)
    openblas_set_num_threads (1);

  job.fc = fc;
  job.q = q;
  job.set = set;
  job.chunk = MAX ((gsize) 1, n_q / (8 * (gsize) n_threads));
  g_mutex_init (&job.lock);
  g_cond_init (&job.cond);
  pool = g_thread_pool_new (worker, &job, (gint) n_threads, FALSE, &local);
  if (pool == NULL)
    {
      g_mutex_clear (&job.lock);
      g_cond_clear (&job.cond);
      g_propagate_error (error, local);
      return NULL;
    }
  for (gsize start = 0; start < n_q; start += job.chunk)
    g_thread_pool_push (pool, GSIZE_TO_POINTER (start + 1), NULL);

  g_mutex_lock (&job.lock);
  while ((gsize) job.done < n_q)
    {
      gint64 until = g_get_monotonic_time () + 100 * G_TIME_SPAN_MILLISECOND;
      g_cond_wait_until (&job.cond, &job.lock, until);
      if (progress && progress->func && job.error == NULL && !g_atomic_int_get (&job.cancelled))
        {
          double fraction = (double) job.done / (double) n_q;
          g_mutex_unlock (&job.lock);
          if (!qv_progress_report (progress, fraction, "dynamical matrices", &local))
            g_atomic_int_set (&job.cancelled, 1);
          g_mutex_lock (&job.lock);
        }
    }
  g_mutex_unlock (&job.lock);
  g_thread_pool_free (pool, FALSE, TRUE);
  g_mutex_clear (&job.lock);
  g_cond_clear (&job.cond);
  if (job.error)
    {
      g_clear_error (&local);
      g_propagate_error (error, job.error);
      return NULL;
    }
  if (local)
    {
      g_propagate_error (error, local);
      return NULL;
    }
  return g_steal_pointer (&set);
}
