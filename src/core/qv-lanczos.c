/* qv-lanczos.c — see qv-lanczos.h. Block Lanczos with full
 * reorthogonalisation (Golub & Van Loan, Matrix Computations, 4th ed.,
 * §10.3.6); spectral transformation μ = 1/(λ − τ) (Ericsson & Ruhe, Math.
 * Comp. 35, 1251, 1980); inertia by Sylvester's law from a Bunch–Kaufman
 * LDLᵀ factorisation (LAPACK dsytrf).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <cblas.h>
#include <float.h>
#include <lapacke.h>
#include <math.h>
#include <string.h>
#include "qv-lanczos.h"

#define BLOCK 8
#define ESTIMATE_STEPS 40
#define SHIFT_TRIES 6

/* Mirror the strict lower triangle into the strict upper one (blocked). */
static void
mirror_lower (double *a, gsize n)
{
  enum { T = 64 };
  for (gsize jb = 0; jb < n; jb += T)
    for (gsize ib = jb; ib < n; ib += T)
      for (gsize j = jb; j < MIN (jb + T, n); j++)
        for (gsize i = MAX (ib, j + 1); i < MIN (ib + T, n); i++)
          a[j + i * n] = a[i + j * n];
}

/* Rebuild the lower triangle and the diagonal from the upper copy. */
static void
restore_lower (double *a, gsize n, const double *diag)
{
  enum { T = 64 };
  for (gsize jb = 0; jb < n; jb += T)
    for (gsize ib = jb; ib < n; ib += T)
      for (gsize j = jb; j < MIN (jb + T, n); j++)
        for (gsize i = MAX (ib, j + 1); i < MIN (ib + T, n); i++)
          a[i + j * n] = a[j + i * n];
  for (gsize i = 0; i < n; i++)
    a[i + i * n] = diag[i];
}

/* Lowest Ritz value of a short single-vector Lanczos run on A (full
 * symmetric in @a) and its residual bound: a cheap guess for the shift. */
static void
estimate_lowest (const double *a, gsize n, GRand *rand, double *theta, double *residual)
{
  const gsize steps = MIN (n, ESTIMATE_STEPS);
  g_autofree double *q = g_new (double, n * (steps + 1));
  g_autofree double *alpha = g_new0 (double, steps);
  g_autofree double *beta = g_new0 (double, steps);
  g_autofree double *d = g_new (double, steps);
  g_autofree double *e = g_new (double, steps);
  g_autofree double *s = g_new (double, steps * steps);
  gsize k = 0;
  double nrm;

  for (gsize i = 0; i < n; i++)
    q[i] = g_rand_double_range (rand, -1, 1);
  nrm = cblas_dnrm2 ((int) n, q, 1);
  cblas_dscal ((int) n, 1.0 / nrm, q, 1);
  for (k = 0; k < steps; k++)
    {
      double *v = q + (k + 1) * n;
      cblas_dsymv (CblasColMajor, CblasLower, (int) n, 1.0, a, (int) n, q + k * n, 1, 0.0, v, 1);
      alpha[k] = cblas_ddot ((int) n, v, 1, q + k * n, 1);
      for (int pass = 0; pass < 2; pass++)
        for (gsize j = 0; j <= k; j++)
          cblas_daxpy ((int) n, -cblas_ddot ((int) n, v, 1, q + j * n, 1), q + j * n, 1, v, 1);
      beta[k] = cblas_dnrm2 ((int) n, v, 1);
      if (beta[k] <= 1e-14 * fabs (alpha[k]) || k + 1 == steps)
        {
          k++;
          break;
        }
      cblas_dscal ((int) n, 1.0 / beta[k], v, 1);
    }
  memcpy (d, alpha, sizeof (double) * k);
  memcpy (e, beta, sizeof (double) * k);
  if (LAPACKE_dsteqr (LAPACK_COL_MAJOR, 'I', (int) k, d, e, s, (int) k) != 0)
    {
      *theta = alpha[0];
      *residual = INFINITY;
      return;
    }
  *theta = d[0];
  *residual = fabs (beta[k - 1] * s[(k - 1) + 0 * k]);
}

/* Number of negative eigenvalues of A − cI (Sylvester's law), A in the lower
 * triangle of @a, which is destroyed; −1 on failure. */
static gssize
count_below (double *a, gsize n, double c)
{
  g_autofree lapack_int *ipiv = g_new (lapack_int, n);
  gssize negative = 0;
  for (gsize i = 0; i < n; i++)
    a[i + i * n] -= c;
  if (LAPACKE_dsytrf (LAPACK_COL_MAJOR, 'L', (lapack_int) n, a, (lapack_int) n, ipiv) < 0)
    return -1;
  for (gsize i = 0; i < n; i++)
    {
      if (ipiv[i] > 0)
        {
          if (a[i + i * n] < 0)
            negative++;
        }
      else
        {
          /* a 2×2 block [[d11, d21], [d21, d22]] at rows i, i+1 */
          const double d11 = a[i + i * n], d22 = a[(i + 1) + (i + 1) * n];
          const double d21 = a[(i + 1) + i * n];
          const double det = d11 * d22 - d21 * d21;
          if (det < 0)
            negative += 1;
          else if (d11 + d22 < 0)
            negative += 2;
          i++;
        }
    }
  return negative;
}

/* The Lanczos part proper. @a holds the Cholesky factor of A − τI in its
 * lower triangle. Fills @mu (descending) and @x (n×m Ritz vectors of
 * (A − τI)⁻¹); returns FALSE when it does not converge. */
static gboolean
block_lanczos (const double *a, gsize n, gsize m, GRand *rand, double accuracy,
               double *mu, double *x)
{
  const gsize bs = MIN (BLOCK, n);
  const gsize max_dim = MIN (n, MAX (12 * m, 384) / bs * bs);
  g_autofree double *q = g_new0 (double, n * (max_dim + bs));
  const gsize ld = max_dim + bs;   /* T has room for the next R block */
  g_autofree double *t = g_new0 (double, ld * ld);
  g_autofree double *tt = g_new (double, max_dim * max_dim);
  g_autofree double *theta = g_new (double, max_dim);
  g_autofree double *h = g_new (double, bs * (max_dim + bs));
  double tau[BLOCK];
  gsize dim = 0;
  gboolean converged = FALSE;

  for (gsize i = 0; i < n * bs; i++)
    q[i] = g_rand_double_range (rand, -1, 1);
  LAPACKE_dgeqrf (LAPACK_COL_MAJOR, (int) n, (int) bs, q, (int) n, tau);
  LAPACKE_dorgqr (LAPACK_COL_MAJOR, (int) n, (int) bs, (int) bs, q, (int) n, tau);

  while (dim + bs <= max_dim && !converged)
    {
      double *qj = q + dim * n, *wv = q + (dim + bs) * n;
      gboolean breakdown = FALSE;

      /* W = (A − τI)⁻¹ Q_j */
      memcpy (wv, qj, sizeof (double) * n * bs);
      if (LAPACKE_dpotrs (LAPACK_COL_MAJOR, 'L', (int) n, (int) bs, a, (int) n, wv, (int) n) != 0)
        return FALSE;
      /* T_jj = Q_jᵀW and full reorthogonalisation against every block (twice:
       * "twice is enough", Parlett); the coefficients of the previous block
       * are T's off-diagonal block, which the recurrence already knows. */
      for (int pass = 0; pass < 2; pass++)
        {
          cblas_dgemm (CblasColMajor, CblasTrans, CblasNoTrans, (int) (dim + bs), (int) bs, (int) n,
                       1.0, q, (int) n, wv, (int) n, 0.0, h, (int) (dim + bs));
          cblas_dgemm (CblasColMajor, CblasNoTrans, CblasNoTrans, (int) n, (int) bs, (int) (dim + bs),
                       -1.0, q, (int) n, h, (int) (dim + bs), 1.0, wv, (int) n);
          if (pass == 0)
            for (gsize c = 0; c < bs; c++)
              for (gsize r = 0; r < bs; r++)
                t[(dim + r) + (dim + c) * ld] = h[(dim + r) + c * (dim + bs)];
        }
      /* symmetrise the diagonal block (rounding) */
      for (gsize c = 0; c < bs; c++)
        for (gsize r = 0; r < c; r++)
          {
            const double s = 0.5 * (t[(dim + r) + (dim + c) * ld] + t[(dim + c) + (dim + r) * ld]);
            t[(dim + r) + (dim + c) * ld] = t[(dim + c) + (dim + r) * ld] = s;
          }
      dim += bs;
      /* Q_{j+1} R = W (R also when the space is full: the residual
       * estimates need it) */
        {
          double rmax = 0.0;
          LAPACKE_dgeqrf (LAPACK_COL_MAJOR, (int) n, (int) bs, wv, (int) n, tau);
          for (gsize c = 0; c < bs; c++)
            for (gsize r = 0; r <= c; r++)
              {
                const double v = wv[r + c * n];
                t[(dim + r) + (dim - bs + c) * ld] = v;
                t[(dim - bs + c) + (dim + r) * ld] = v;
                rmax = MAX (rmax, fabs (v));
              }
          for (gsize c = 0; c < bs; c++)
            if (fabs (wv[c + c * n]) <= 1e-12 * MAX (rmax, DBL_MIN))
              breakdown = TRUE;
          LAPACKE_dorgqr (LAPACK_COL_MAJOR, (int) n, (int) bs, (int) bs, wv, (int) n, tau);
        }

      /* convergence: Ritz values of T and their residual estimates
       * ‖R_{j+1} S_last‖ relative to μ */
      /* the Ritz problem costs O(dim³): look every other block */
      if ((dim >= m + bs && (dim / bs) % 2 == 0) || breakdown || dim + bs > max_dim)
        {
          gsize good = 0;
          double worst = 0.0;
          for (gsize c = 0; c < dim; c++)
            memcpy (tt + c * dim, t + c * ld, sizeof (double) * dim);
          if (LAPACKE_dsyev (LAPACK_COL_MAJOR, 'V', 'L', (int) dim, tt, (int) dim, theta) != 0)
            return FALSE;
          /* dsyev sorts ascending: the largest μ are at the end */
          for (gsize i = 0; i < m && i < dim; i++)
            {
              const gsize col = dim - 1 - i;
              double res = 0.0;
              if (!(breakdown && dim == n))
                for (gsize r = 0; r < bs; r++)
                  {
                    double s = 0.0;
                    for (gsize c = r; c < bs; c++)   /* R is upper triangular */
                      s += t[(dim + r) + (dim - bs + c) * ld] * tt[(dim - bs + c) + col * dim];
                    res += s * s;
                  }
              if (sqrt (res) <= accuracy * fabs (theta[col]))
                good++;
              worst = MAX (worst, sqrt (res) / fabs (theta[col]));
            }
          /* a breakdown means the Krylov space is invariant: its Ritz
           * pairs are exact, but only if it is large enough */
          converged = good >= m || (breakdown && dim == n);
          g_debug ("lanczos: dimension %zu, %zu of %zu converged, worst relative residual %.2g",
                   (size_t) dim, (size_t) good, (size_t) m, worst);
          if (converged)
            {
              for (gsize i = 0; i < m; i++)
                {
                  const gsize col = dim - 1 - i;
                  mu[i] = theta[col];
                  cblas_dgemv (CblasColMajor, CblasNoTrans, (int) n, (int) dim, 1.0, q, (int) n,
                               tt + col * dim, 1, 0.0, x + i * n, 1);
                }
              return TRUE;
            }
          if (breakdown)
            return FALSE;
          /* hopeless (the shift is far from most wanted eigenvalues, as with
           * a strongly imaginary mode): stop early and let LAPACK do it */
          if (dim >= max_dim / 2 && good == 0 && worst > 1e-2)
            return FALSE;
        }
    }
  return FALSE;
}

gboolean
qv_lanczos_lowest (double *a, gsize n, gsize m, double *w, double *z)
{
  g_autoptr(GRand) rand = g_rand_new_with_seed (20261201);
  g_autofree double *diag = g_new (double, n);
  g_autofree double *mu = g_new (double, m);
  g_autofree double *y = NULL, *h = NULL, *lam = NULL;
  double theta, residual, shift, delta, anorm = 0.0, tol;
  gboolean factored = FALSE;
  gssize below;

  if (m == 0 || m >= n)
    return FALSE;
  for (gsize i = 0; i < n; i++)
    diag[i] = a[i + i * n];
  mirror_lower (a, n);
  for (gsize j = 0; j < n; j++)
    anorm = MAX (anorm, cblas_dasum ((int) n, a + j * n, 1));   /* ‖A‖₁ */
  if (!(anorm > 0) || !isfinite (anorm))
    return FALSE;

  /* τ below the lowest eigenvalue: from the estimate, lowered until the
   * Cholesky factorisation exists (then A − τI is positive definite). */
  g_debug ("lanczos: start");
  estimate_lowest (a, n, rand, &theta, &residual);
  g_debug ("lanczos: estimate %g ± %g", theta, residual);
  /* not too close either: with τ next to λ₁, (A − τI)⁻¹ is dominated by
   * one direction and rounding swamps the others (μ₁/μ_m is the condition
   * of the transformed problem) */
  delta = MAX (MIN (residual, anorm), MAX (0.1 * fabs (theta), 1e-6 * anorm));
  for (int attempt = 0; attempt < SHIFT_TRIES && !factored; attempt++)
    {
      shift = theta - delta;
      for (gsize i = 0; i < n; i++)
        a[i + i * n] = diag[i] - shift;
      factored = LAPACKE_dpotrf (LAPACK_COL_MAJOR, 'L', (lapack_int) n, a, (lapack_int) n) == 0;
      if (!factored)
        {
          restore_lower (a, n, diag);
          delta *= 4.0;
        }
    }
  if (!factored)
    {
      g_debug ("lanczos: no positive definite shift found below %g", theta);
      return FALSE;
    }

  /* Lanczos accuracy: a residual r of (A − τI)⁻¹ becomes about
   * ‖A − τI‖·r/μ on A, so ask for half the final tolerance below. */
  g_debug ("lanczos: factored at shift %g", shift);
  if (!block_lanczos (a, n, m, rand, 5.0 * sqrt ((double) n) * DBL_EPSILON, mu, z))
    {
      g_debug ("lanczos: no convergence (n = %zu, m = %zu, shift %g)", (size_t) n, (size_t) m, shift);
      restore_lower (a, n, diag);
      return FALSE;
    }

  g_debug ("lanczos: converged; Rayleigh–Ritz on A");
  /* Rayleigh–Ritz on A itself: Y = AZ, H = ZᵀY, rotate, check residuals. */
  restore_lower (a, n, diag);
  y = g_new (double, n * m);
  h = g_new (double, m * m);
  lam = g_new (double, m);
  cblas_dsymm (CblasColMajor, CblasLeft, CblasLower, (int) n, (int) m, 1.0, a, (int) n,
               z, (int) n, 0.0, y, (int) n);
  cblas_dgemm (CblasColMajor, CblasTrans, CblasNoTrans, (int) m, (int) m, (int) n, 1.0,
               z, (int) n, y, (int) n, 0.0, h, (int) m);
  if (LAPACKE_dsyev (LAPACK_COL_MAJOR, 'V', 'L', (int) m, h, (int) m, lam) != 0)
    return FALSE;
  {
    g_autofree double *zr = g_new (double, n * m);
    cblas_dgemm (CblasColMajor, CblasNoTrans, CblasNoTrans, (int) n, (int) m, (int) m, 1.0,
                 z, (int) n, h, (int) m, 0.0, zr, (int) n);
    cblas_dgemm (CblasColMajor, CblasNoTrans, CblasNoTrans, (int) n, (int) m, (int) m, 1.0,
                 y, (int) n, h, (int) m, 0.0, z, (int) n);   /* z ← AZS (scratch) */
    memcpy (y, z, sizeof (double) * n * m);
    memcpy (z, zr, sizeof (double) * n * m);
  }
  /* every residual ‖Az − λz‖ within 10√n ε‖A‖₁ (what a direct solver gives;
   * LAPACK Working Note 41's ratio then stays below 10) */
  tol = 10.0 * sqrt ((double) n) * DBL_EPSILON * anorm;
  for (gsize k = 0; k < m; k++)
    {
      cblas_daxpy ((int) n, -lam[k], z + k * n, 1, y + k * n, 1);
      const double res = cblas_dnrm2 ((int) n, y + k * n, 1);
      if (res > tol)
        {
          g_debug ("lanczos: residual of pair %zu is %.3g, above %.3g", (size_t) k, res, tol);
          return FALSE;
        }
    }
  /* No eigenvalue below the ones found was missed: A − cI, c just above
   * the largest, has exactly m negative eigenvalues (Sylvester). */
  {
    const double c = lam[m - 1] + 10.0 * tol;
    g_debug ("lanczos: inertia check");
    below = count_below (a, n, c);
    g_debug ("lanczos: done");
    restore_lower (a, n, diag);
    if (below != (gssize) m)
      {
        g_debug ("lanczos: %zd eigenvalues below %.17g, expected %zu", (ssize_t) below, c, (size_t) m);
        return FALSE;
      }
  }
  memcpy (w, lam, sizeof (double) * m);
  return TRUE;
}
