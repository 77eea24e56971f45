/* qv-rigid-body.c — the rigid-body space of DESIGN §2: translations and
 * rotations about the centre of mass, mass weighted (Eckart, Phys. Rev. 47,
 * 552, 1935), orthonormalised by pivoted QR with a rank tolerance so linear,
 * near-linear and single-atom cases need no inertia test.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <cblas.h>
#include <lapacke.h>
#include <math.h>
#include <string.h>
#include "qv-rigid-body.h"

QvRigidBody *
qv_rigid_body_new (gsize n_atoms, const double *positions, const double *masses,
                   QvProjection projection)
{
  const gsize n = 3 * n_atoms;
  QvRigidBody *rb = g_new0 (QvRigidBody, 1);
  double total = 0.0, com[3] = { 0, 0, 0 };

  rb->n = n;
  rb->basis = g_new0 (double, MAX (n * 6, 1));
  if (projection == QV_PROJECTION_NONE || n_atoms == 0)
    return rb;

  for (gsize a = 0; a < n_atoms; a++)
    {
      total += masses[a];
      for (int c = 0; c < 3; c++)
        com[c] += masses[a] * positions[3 * a + c];
    }
  for (int c = 0; c < 3; c++)
    com[c] /= total;

  /* Translations: √m_a / √M along each axis — already orthonormal. */
  for (int c = 0; c < 3; c++)
    for (gsize a = 0; a < n_atoms; a++)
      rb->basis[c * n + 3 * a + c] = sqrt (masses[a] / total);
  rb->n_translations = 3;

  if (projection == QV_PROJECTION_FULL)
    {
      double *rot = rb->basis + 3 * n;
      double tau[3];
      lapack_int jpvt[3] = { 0, 0, 0 };
      guint rank = 0;
      double r11;

      /* √m_a (e_β × r_a): rotation about axis β through the COM. */
      for (gsize a = 0; a < n_atoms; a++)
        {
          const double sm = sqrt (masses[a]);
          const double x = positions[3 * a] - com[0];
          const double y = positions[3 * a + 1] - com[1];
          const double z = positions[3 * a + 2] - com[2];
          /* e_x × r = (0, −z, y); e_y × r = (z, 0, −x); e_z × r = (−y, x, 0) */
          rot[0 * n + 3 * a + 1] = -z * sm;
          rot[0 * n + 3 * a + 2] = y * sm;
          rot[1 * n + 3 * a + 0] = z * sm;
          rot[1 * n + 3 * a + 2] = -x * sm;
          rot[2 * n + 3 * a + 0] = -y * sm;
          rot[2 * n + 3 * a + 1] = x * sm;
        }
      /* Orthogonal to the translations in exact arithmetic; one
       * Gram–Schmidt pass removes the rounding. */
      for (int b = 0; b < 3; b++)
        for (int t = 0; t < 3; t++)
          {
            const double d = cblas_ddot ((int) n, rb->basis + t * n, 1, rot + b * n, 1);
            cblas_daxpy ((int) n, -d, rb->basis + t * n, 1, rot + b * n, 1);
          }
      if (LAPACKE_dgeqp3 (LAPACK_COL_MAJOR, (lapack_int) n, 3, rot, (lapack_int) n, jpvt, tau) == 0)
        {
          r11 = fabs (rot[0]);
          /* Absolute floor: a spread below 1e-8 Å·√u is a point. */
          if (r11 > 1e-8 * sqrt (total))
            {
              rank = 1;
              for (int k = 1; k < 3 && (gsize) k < n; k++)
                if (fabs (rot[k * n + k]) > QV_RIGID_BODY_RANK_TOLERANCE * r11)
                  rank++;
                else
                  break;
            }
          if (rank > 0)
            LAPACKE_dorgqr (LAPACK_COL_MAJOR, (lapack_int) n, (lapack_int) rank,
                            (lapack_int) rank, rot, (lapack_int) n, tau);
        }
      memset (rot + rank * n, 0, sizeof (double) * n * (3 - rank));
      rb->n_rotations = rank;
    }
  return rb;
}

void
qv_rigid_body_free (QvRigidBody *rb)
{
  if (rb == NULL)
    return;
  g_free (rb->basis);
  g_free (rb->kv);
  g_free (rb);
}

guint
qv_rigid_body_rank (const QvRigidBody *rb)
{
  return rb->n_translations + rb->n_rotations;
}

/* KV (n×r) and C = VᵀKV (r×r) from the lower triangle of K. */
static void
rigid_body_products (const QvRigidBody *rb, const double *k, double *kv, double *c)
{
  const int n = (int) rb->n, r = (int) qv_rigid_body_rank (rb);
  cblas_dsymm (CblasColMajor, CblasLeft, CblasLower, n, r, 1.0, k, n,
               rb->basis, n, 0.0, kv, n);
  cblas_dgemm (CblasColMajor, CblasTrans, CblasNoTrans, r, r, n, 1.0,
               rb->basis, n, kv, n, 0.0, c, r);
}

/* Eigenvalues of the diagonal block [off, off+m) of the r×r matrix C. */
static void
block_eigenvalues (const double *c, int r, int off, int m, double *out)
{
  double block[9], w[3];
  for (int j = 0; j < m; j++)
    for (int i = 0; i < m; i++)
      block[i + j * m] = c[(off + i) + (off + j) * r];
  if (m > 0 && LAPACKE_dsyev (LAPACK_COL_MAJOR, 'N', 'L', m, block, m, w) == 0)
    memcpy (out, w, sizeof (double) * m);
}

static void
residuals_from_products (const QvRigidBody *rb, const double *c,
                         double translations[3], double rotations[3])
{
  const int r = (int) qv_rigid_body_rank (rb);
  for (int i = 0; i < 3; i++)
    translations[i] = rotations[i] = 0.0;
  block_eigenvalues (c, r, 0, (int) rb->n_translations, translations);
  block_eigenvalues (c, r, (int) rb->n_translations, (int) rb->n_rotations, rotations);
}

void
qv_rigid_body_residuals (const QvRigidBody *rb, const double *k,
                         double translations[3], double rotations[3])
{
  const guint r = qv_rigid_body_rank (rb);
  g_autofree double *kv = g_new (double, MAX (rb->n * r, 1));
  double c[36];

  for (int i = 0; i < 3; i++)
    translations[i] = rotations[i] = 0.0;
  if (r == 0)
    return;
  rigid_body_products (rb, k, kv, c);
  residuals_from_products (rb, c, translations, rotations);
}

/* Gershgorin: max over rows of Σ_j |K_ij|, from the lower triangle. */
static double
gershgorin_bound (const double *k, gsize n)
{
  g_autofree double *row = g_new0 (double, MAX (n, 1));
  double best = 0.0;
  for (gsize j = 0; j < n; j++)
    {
      const double *col = k + j * n;
      double s = fabs (col[j]);
      for (gsize i = j + 1; i < n; i++)
        {
          const double x = fabs (col[i]);
          s += x;
          row[i] += x;
        }
      row[j] += s;
    }
  for (gsize i = 0; i < n; i++)
    best = MAX (best, row[i]);
  return best;
}

/* σ above the Gershgorin bound of K, and kv (KV) turned into
 * W′ = KV − ½V(VᵀKV) − ½σV, so that K − VW′ᵀ − W′Vᵀ = K − VWᵀ − WVᵀ + σVVᵀ. */
static double
shifted_factor (const QvRigidBody *rb, double gershgorin, double *kv, const double *c)
{
  const int n = (int) rb->n, r = (int) qv_rigid_body_rank (rb);
  double sigma = 1.05 * gershgorin;

  if (!(sigma > 0.0))
    sigma = 1.0;
  cblas_dgemm (CblasColMajor, CblasNoTrans, CblasNoTrans, n, r, r, -0.5,
               rb->basis, n, c, r, 1.0, kv, n);
  cblas_daxpy (n * r, -0.5 * sigma, rb->basis, 1, kv, 1);
  return sigma;
}

static double
project_with_products (const QvRigidBody *rb, double *k, double *kv, const double *c)
{
  const int n = (int) rb->n, r = (int) qv_rigid_body_rank (rb);
  const double sigma = shifted_factor (rb, gershgorin_bound (k, rb->n), kv, c);

  cblas_dsyr2k (CblasColMajor, CblasLower, CblasNoTrans, n, r, -1.0,
                rb->basis, n, kv, n, 1.0, k, n);
  return sigma;
}

double
qv_rigid_body_project (const QvRigidBody *rb, double *k)
{
  const guint r = qv_rigid_body_rank (rb);
  g_autofree double *kv = NULL;
  double c[36];

  if (r == 0)
    return 0.0;
  kv = g_new (double, rb->n * r);
  rigid_body_products (rb, k, kv, c);
  return project_with_products (rb, k, kv, c);
}

double
qv_rigid_body_project_with_residuals (QvRigidBody *rb, double *k,
                                      double translations[3], double rotations[3])
{
  const guint r = qv_rigid_body_rank (rb);
  g_autofree double *kv = NULL;

  for (int i = 0; i < 3; i++)
    translations[i] = rotations[i] = 0.0;
  if (r == 0)
    return 0.0;
  kv = g_new (double, rb->n * r);
  rigid_body_products (rb, k, kv, rb->c);
  residuals_from_products (rb, rb->c, translations, rotations);
  g_free (rb->kv);
  rb->kv = g_memdup2 (kv, sizeof (double) * rb->n * r);
  return project_with_products (rb, k, kv, rb->c);
}

/* Mixing weights of one block [off, off + m) of the rigid-body space. */
static double
block_mixing (const QvRigidBody *rb, const double *l, double lambda, int off, int m)
{
  const int n = (int) rb->n, r = (int) qv_rigid_body_rank (rb);
  double q[9], mu[3], b[3], total = 0.0;

  if (m == 0)
    return 0.0;
  for (int j = 0; j < m; j++)
    for (int i = 0; i < m; i++)
      q[i + j * m] = rb->c[(off + i) + (off + j) * r];
  if (LAPACKE_dsyev (LAPACK_COL_MAJOR, 'V', 'L', m, q, m, mu) != 0)
    return NAN;
  /* b = Qᵀ (KV)ᵀ l over the block: couplings in the block's eigenbasis */
  for (int j = 0; j < m; j++)
    {
      b[j] = 0.0;
      for (int i = 0; i < m; i++)
        b[j] += q[i + j * m] * cblas_ddot (n, rb->kv + (off + i) * n, 1, l, 1);
    }
  for (int j = 0; j < m; j++)
    {
      const double delta = fabs (lambda - mu[j]);
      const double root = sqrt (delta * delta + 4.0 * b[j] * b[j]);
      /* ½(1 − |Δ|/r) written without the cancellation: 2b²/(r(r + |Δ|)) */
      if (root > 0.0)
        total += 2.0 * b[j] * b[j] / (root * (root + delta));
    }
  return MIN (total, 1.0);
}

void
qv_rigid_body_mixing (const QvRigidBody *rb, const double *l, double lambda,
                      double *translations, double *rotations)
{
  *translations = *rotations = 0.0;
  if (rb->kv == NULL)
    return;
  *translations = block_mixing (rb, l, lambda, 0, (int) rb->n_translations);
  *rotations = block_mixing (rb, l, lambda, (int) rb->n_translations, (int) rb->n_rotations);
}

double
qv_rigid_body_prepare_update (QvRigidBody *rb, double *kv, double gershgorin,
                              double translations[3], double rotations[3])
{
  const int n = (int) rb->n, r = (int) qv_rigid_body_rank (rb);

  for (int i = 0; i < 3; i++)
    translations[i] = rotations[i] = 0.0;
  if (r == 0)
    return 0.0;
  cblas_dgemm (CblasColMajor, CblasTrans, CblasNoTrans, r, r, n, 1.0,
               rb->basis, n, kv, n, 0.0, rb->c, r);
  residuals_from_products (rb, rb->c, translations, rotations);
  g_free (rb->kv);
  rb->kv = g_memdup2 (kv, sizeof (double) * rb->n * (gsize) r);
  return shifted_factor (rb, gershgorin, kv, rb->c);
}
