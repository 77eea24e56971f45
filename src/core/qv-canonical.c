/* qv-canonical.c — reproducible eigenvectors (DESIGN §2, "canonical
 * output"). The basis of a degenerate subspace is rebuilt from its
 * projector, which any correct solver gives to rounding, so the result does
 * not depend on the BLAS kernel or on the order LAPACK happened to use.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-canonical.h"

#define TIE_TOLERANCE 1e-7

/* Rebuilds columns [0, g) of z (n×g, orthonormal) as the Gram–Schmidt basis
 * of the projections P e_i, i chosen greedily by the largest remaining
 * ‖P e_i‖². @work holds n + g·g doubles. */
static void
canonical_subspace (double *z, gsize n, gsize g, double *out, double *rho)
{
  for (gsize i = 0; i < n; i++)
    {
      double s = 0.0;
      for (gsize k = 0; k < g; k++)
        s += z[k * n + i] * z[k * n + i];
      rho[i] = s;
    }
  for (gsize b = 0; b < g; b++)
    {
      double best = -1.0, coeff_norm;
      gsize pick = 0;
      double *u = out + b * n;

      for (gsize i = 0; i < n; i++)
        best = MAX (best, rho[i]);
      for (gsize i = 0; i < n; i++)
        if (rho[i] >= best * (1.0 - TIE_TOLERANCE))
          {
            pick = i;
            break;
          }
      /* u = Z Zᵀ e_pick − B Bᵀ e_pick */
      for (gsize i = 0; i < n; i++)
        {
          double s = 0.0;
          for (gsize k = 0; k < g; k++)
            s += z[k * n + i] * z[k * n + pick];
          for (gsize k = 0; k < b; k++)
            s -= out[k * n + i] * out[k * n + pick];
          u[i] = s;
        }
      /* One more orthogonalisation pass against the new basis for
       * stability (the projector formula is exact only in exact arithmetic). */
      for (gsize k = 0; k < b; k++)
        {
          double d = 0.0;
          for (gsize i = 0; i < n; i++)
            d += out[k * n + i] * u[i];
          for (gsize i = 0; i < n; i++)
            u[i] -= d * out[k * n + i];
        }
      coeff_norm = 0.0;
      for (gsize i = 0; i < n; i++)
        coeff_norm += u[i] * u[i];
      coeff_norm = coeff_norm > 0 ? 1.0 / sqrt (coeff_norm) : 0.0;
      for (gsize i = 0; i < n; i++)
        u[i] *= coeff_norm;
      for (gsize i = 0; i < n; i++)
        rho[i] -= u[i] * u[i];
    }
  memcpy (z, out, sizeof (double) * n * g);
}

static void
canonical_sign (double *v, gsize n)
{
  double best = 0.0;
  gsize pick = 0;
  for (gsize i = 0; i < n; i++)
    best = MAX (best, fabs (v[i]));
  for (gsize i = 0; i < n; i++)
    if (fabs (v[i]) >= best * (1.0 - TIE_TOLERANCE))
      {
        pick = i;
        break;
      }
  if (v[pick] < 0)
    for (gsize i = 0; i < n; i++)
      v[i] = -v[i];
}

gsize
qv_canonicalize (double *vectors, gsize n, gsize m, const double *values,
                 double tolerance, gboolean last_group_open)
{
  gsize rotated = 0, start = 0;
  double *out = NULL, *rho = NULL;

  while (start < m)
    {
      gsize end = start + 1;
      while (end < m && values[end] - values[end - 1] <= tolerance)
        end++;
      if (end - start > 1 && !(last_group_open && end == m))
        {
          if (out == NULL)
            {
              out = g_new (double, n * MIN (m, 64));
              rho = g_new (double, n);
            }
          if (end - start <= 64)
            {
              canonical_subspace (vectors + start * n, n, end - start, out, rho);
              rotated++;
            }
        }
      start = end;
    }
  for (gsize k = 0; k < m; k++)
    canonical_sign (vectors + k * n, n);
  g_free (out);
  g_free (rho);
  return rotated;
}
