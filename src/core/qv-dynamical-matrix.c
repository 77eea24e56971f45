/* qv-dynamical-matrix.c — D(q), zheevd over a thread pool.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <lapacke.h>
#include <complex.h>
#include <math.h>
#include <string.h>
#include "qv-dynamical-matrix.h"
#include "qv-error.h"
#include "qv-size.h"
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
  qv_dynamical_matrix_build_with (fc, NULL, NULL, q, d);
}

void
qv_dynamical_matrix_build_with (const QvForceConstants *fc, QvDynamicalTerm term, gpointer data,
                                const double q[3], double _Complex *d)
{
  gsize n = qv_force_constants_n_sites (fc), nb = 3 * n, nc = qv_force_constants_n_cells (fc);
  const double *m = qv_force_constants_masses (fc), *tau = qv_force_constants_positions (fc);
  int nmax = qv_force_constants_max_translation (fc), width = 2 * nmax + 1;
  double qc[3];
  /* e^{iq·(n·a + τ_κ' − τ_κ)} = Π_j z_j^{n_j} · s_κ' · conj(s_κ), with
   * z_j = e^{2πi q_j} and s_κ = e^{iq·τ_κ}: tables instead of a sine and
   * a cosine per image */
  double _Complex *table = g_new (double _Complex, 3 * (gsize) width);
  double _Complex *site = g_new (double _Complex, n);

  qv_dynamical_matrix_cartesian_q (qv_force_constants_cell (fc), q, qc);
  for (int j = 0; j < 3; j++)
    for (int k = -nmax; k <= nmax; k++)
      {
        double x = 2 * G_PI * q[j] * k;
        table[j * width + k + nmax] = cos (x) + I * sin (x);
      }
  for (gsize k = 0; k < n; k++)
    {
      double x = qc[0] * tau[3 * k] + qc[1] * tau[3 * k + 1] + qc[2] * tau[3 * k + 2];
      site[k] = cos (x) + I * sin (x);
    }
  memset (d, 0, nb * nb * sizeof *d);
  for (gsize c = 0; c < nc; c++)
    for (gsize k = 0; k < n; k++)
      for (gsize k2 = 0; k2 < n; k2++)
        {
          gsize n_images;
          const QvLatticeImage *im;
          const double *blk;
          double _Complex phase = 0;
          if (qv_force_constants_block_is_zero (fc, c, k, k2))
            continue;
          im = qv_force_constants_images (fc, c, k, k2, &n_images);
          blk = qv_force_constants_block (fc, c, k, k2);
          for (gsize i = 0; i < n_images; i++)
            phase += im[i].weight * table[im[i].n[0] + nmax] * table[width + im[i].n[1] + nmax]
                                  * table[2 * width + im[i].n[2] + nmax];
          phase *= site[k2] * conj (site[k]) / sqrt (m[k] * m[k2]);
          for (int a = 0; a < 3; a++)
            for (int b = 0; b < 3; b++)
              d[(3 * k + a) + (3 * k2 + b) * nb] += blk[3 * a + b] * phase;
        }
  g_free (table);
  g_free (site);
  if (term)
    term (q, d, data);
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
  QvDynamicalTerm term;
  gpointer term_data;
  const double *q;
  QvPhononSet *set;
  gsize chunk;
  gint done;            /* atomic: q points finished */
  gint cancelled;       /* atomic */
  GMutex lock;
  GCond cond;
  GError *error;        /* first failure, under lock */
} Job;

/* One worker's LAPACK buffers, sized once from the workspace query. Every
 * buffer handed to zheevd is padded: OpenBLAS 0.3.21's zgemv kernels
 * (inside zhetrd/zlatrd) were seen under valgrind to read up to a few
 * vector widths past the end of the arrays they are given (the eigenvalue
 * array among them), which crashed once a buffer ended at a page boundary. */
#define PAD 256

typedef struct {
  gsize nb;
  double _Complex *d, *work;
  double *w, *rwork;
  lapack_int *iwork, lwork, lrwork, liwork;
} Workspace;

static gboolean
workspace_init (Workspace *ws, gsize nb, gboolean vectors, GError **error)
{
  double _Complex qwork = 0;
  double qrwork = 0;
  lapack_int qiwork = 0, info;
  char job = vectors ? 'V' : 'N';

  memset (ws, 0, sizeof *ws);
  ws->nb = nb;
  ws->d = g_new0 (double _Complex, nb * nb + PAD);
  ws->w = g_new0 (double, nb + PAD);
  info = LAPACKE_zheevd_work (LAPACK_COL_MAJOR, job, 'U', (lapack_int) nb, ws->d, (lapack_int) nb,
                              ws->w, &qwork, -1, &qrwork, -1, &qiwork, -1);
  if (info != 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_SOLVER, "LAPACK zheevd workspace query failed (info %d)",
                   (int) info);
      return FALSE;
    }
  ws->lwork = MAX ((lapack_int) creal (qwork), (lapack_int) (2 * nb + (vectors ? nb * nb : 0)));
  ws->lrwork = MAX ((lapack_int) qrwork, (lapack_int) (vectors ? 1 + 5 * nb + 2 * nb * nb : nb));
  ws->liwork = MAX (qiwork, (lapack_int) (vectors ? 3 + 5 * nb : 1));
  ws->work = g_new0 (double _Complex, (gsize) ws->lwork + PAD);
  ws->rwork = g_new0 (double, (gsize) ws->lrwork + PAD);
  ws->iwork = g_new0 (lapack_int, (gsize) ws->liwork + PAD);
  return TRUE;
}

static void
workspace_clear (Workspace *ws)
{
  g_free (ws->d);
  g_free (ws->w);
  g_free (ws->work);
  g_free (ws->rwork);
  g_free (ws->iwork);
}

static gboolean
solve_one (Job *job, gsize k, Workspace *ws, GError **error)
{
  QvPhononSet *set = job->set;
  gsize nb = set->n_branches;
  double _Complex *d = ws->d;
  lapack_int info;

  qv_dynamical_matrix_build_with (job->fc, job->term, job->term_data, job->q + 3 * k, d);
  info = LAPACKE_zheevd_work (LAPACK_COL_MAJOR, set->eigenvectors ? 'V' : 'N', 'U',
                              (lapack_int) nb, d, (lapack_int) nb, ws->w, ws->work, ws->lwork,
                              ws->rwork, ws->lrwork, ws->iwork, ws->liwork);
  if (info != 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_SOLVER,
                   "LAPACK zheevd failed (info %d) at q = (%g %g %g)", (int) info,
                   job->q[3 * k], job->q[3 * k + 1], job->q[3 * k + 2]);
      return FALSE;
    }
  memcpy (set->eigenvalues + k * nb, ws->w, nb * sizeof (double));
  for (gsize b = 0; b < nb; b++)
    set->wavenumbers[k * nb + b] = qv_wavenumber_from_eigenvalue (ws->w[b]);
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
fail_job (Job *job, GError *error)
{
  g_mutex_lock (&job->lock);
  if (job->error == NULL)
    job->error = error;
  else
    g_error_free (error);
  g_mutex_unlock (&job->lock);
  g_atomic_int_set (&job->cancelled, 1);
}

static void
worker (gpointer data, gpointer user_data)
{
  Job *job = user_data;
  gsize start = GPOINTER_TO_SIZE (data) - 1, end = MIN (start + job->chunk, job->set->n_q);
  Workspace ws;
  GError *error = NULL;
  gboolean ready = workspace_init (&ws, job->set->n_branches, job->set->eigenvectors != NULL, &error);

  if (!ready)
    fail_job (job, error);
  for (gsize k = start; k < end; k++)
    {
      error = NULL;
      if (ready && !g_atomic_int_get (&job->cancelled) && !solve_one (job, k, &ws, &error))
        fail_job (job, error);
      g_mutex_lock (&job->lock);
      job->done++;
      g_cond_signal (&job->cond);
      g_mutex_unlock (&job->lock);
    }
  workspace_clear (&ws);
}

QvPhononSet *
qv_dynamical_matrix_solve (const QvForceConstants *fc, const double *q, gsize n_q,
                           gboolean want_vectors, guint n_threads, const QvProgress *progress,
                           GError **error)
{
  return qv_dynamical_matrix_solve_with (fc, NULL, NULL, q, n_q, want_vectors, n_threads,
                                         progress, error);
}

QvPhononSet *
qv_dynamical_matrix_solve_with (const QvForceConstants *fc, QvDynamicalTerm term, gpointer data,
                                const double *q, gsize n_q, gboolean want_vectors,
                                guint n_threads, const QvProgress *progress, GError **error)
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
  {
    /* the eigenvalues and wavenumbers of every q point, and the vectors */
    gsize values, vectors = 0;
    guint64 need;
    if (!qv_size_mul3 (n_q, nb, 2 * sizeof (double), &values)
        || (want_vectors && !qv_size_mul3 (n_q, nb * nb, sizeof (double _Complex), &vectors))
        || (need = (guint64) values + vectors) < values)
      {
        g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                     "%" G_GSIZE_FORMAT " q points of %" G_GSIZE_FORMAT " branches are too many "
                     "to count in bytes: use fewer q points", n_q, nb);
        return NULL;
      }
    if (!qv_size_check_memory (need, "the frequencies at these q points", error))
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
  job.term = term;
  job.term_data = data;
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
