/* qv-nonanalytic.c — the non-analytic term of D(q) near Γ.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-dynamical-matrix.h"
#include "qv-error.h"
#include "qv-nonanalytic.h"
#include "qv-supercell.h"

struct _QvNonAnalytic {
  const QvForceConstants *fc;
  gsize n;
  double *born;            /* 9n, neutral */
  double epsilon[3][3];
  double volume;           /* Å³, primitive cell */
  double neutrality;
  gboolean has_direction;
  double direction[3];     /* unit */
};

void
qv_nonanalytic_free (QvNonAnalytic *na)
{
  if (na == NULL)
    return;
  g_free (na->born);
  g_free (na);
}

double
qv_nonanalytic_neutrality (const QvNonAnalytic *na)
{
  return na->neutrality;
}

QvNonAnalytic *
qv_nonanalytic_new (const QvForceConstants *fc, gsize n_sites, const double *born,
                    const double epsilon[3][3], GError **error)
{
  gsize n = qv_force_constants_n_sites (fc);
  g_autoptr(QvNonAnalytic) na = NULL;
  double scale = 0, det2, det3;
  const double (*e)[3] = epsilon;

  if (n_sites != n)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "Born charges are given for %" G_GSIZE_FORMAT " atoms, the primitive cell has %"
                   G_GSIZE_FORMAT ": give one 3x3 tensor per primitive atom, in its order",
                   n_sites, n);
      return NULL;
    }
  for (gsize i = 0; i < 9 * n; i++)
    if (!isfinite (born[i]))
      {
        g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                     "Born charge of atom %" G_GSIZE_FORMAT ", element %" G_GSIZE_FORMAT
                     " is not a finite number", i / 9 + 1, i % 9 + 1);
        return NULL;
      }
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      {
        if (!isfinite (e[i][j]))
          {
            g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                         "dielectric tensor element (%d, %d) is not a finite number", i + 1, j + 1);
            return NULL;
          }
        scale = MAX (scale, fabs (e[i][j]));
      }
  for (int i = 0; i < 3; i++)
    for (int j = i + 1; j < 3; j++)
      if (fabs (e[i][j] - e[j][i]) > 1e-6 * scale)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                       "the dielectric tensor is not symmetric: (%d, %d) = %g but (%d, %d) = %g",
                       i + 1, j + 1, e[i][j], j + 1, i + 1, e[j][i]);
          return NULL;
        }
  /* Sylvester's criterion: leading minors positive */
  det2 = e[0][0] * e[1][1] - e[0][1] * e[1][0];
  det3 = e[0][0] * (e[1][1] * e[2][2] - e[1][2] * e[2][1])
         - e[0][1] * (e[1][0] * e[2][2] - e[1][2] * e[2][0])
         + e[0][2] * (e[1][0] * e[2][1] - e[1][1] * e[2][0]);
  if (!(e[0][0] > 0 && det2 > 0 && det3 > 0))
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_INPUT,
                           "the dielectric tensor is not positive definite: epsilon_inf is the "
                           "relative high-frequency permittivity (e.g. 2.3 on the diagonal), "
                           "not its inverse or a susceptibility");
      return NULL;
    }

  na = g_new0 (QvNonAnalytic, 1);
  na->fc = fc;
  na->n = n;
  na->born = g_memdup2 (born, 9 * n * sizeof (double));
  memcpy (na->epsilon, epsilon, sizeof na->epsilon);
  na->volume = fabs (qv_lattice_volume (qv_force_constants_cell (fc)));
  for (int c = 0; c < 9; c++)
    {
      double s = 0;
      for (gsize k = 0; k < n; k++)
        s += born[9 * k + c];
      na->neutrality = MAX (na->neutrality, fabs (s));
      for (gsize k = 0; k < n; k++)
        na->born[9 * k + c] -= s / (double) n;
    }
  return g_steal_pointer (&na);
}

gboolean
qv_nonanalytic_set_gamma_direction (QvNonAnalytic *na, const double direction[3], GError **error)
{
  double len = sqrt (direction[0] * direction[0] + direction[1] * direction[1]
                     + direction[2] * direction[2]);
  if (!(len > 0) || !isfinite (len))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "the direction of approach to Gamma must be a non-zero vector (got %g %g %g)",
                   direction[0], direction[1], direction[2]);
      return FALSE;
    }
  for (int c = 0; c < 3; c++)
    na->direction[c] = direction[c] / len;
  na->has_direction = TRUE;
  return TRUE;
}

void
qv_nonanalytic_add (const double q[3], double _Complex *d, gpointer data)
{
  const QvNonAnalytic *na = data;
  const QvForceConstants *fc = na->fc;
  gsize n = na->n, nb = 3 * n, nc = qv_force_constants_n_cells (fc);
  const double *m = qv_force_constants_masses (fc);
  const double (*cell)[3] = qv_force_constants_cell (fc);
  double qc[3], len, dir[3], denom, pre;
  gboolean gamma = fabs (q[0]) < 1e-12 && fabs (q[1]) < 1e-12 && fabs (q[2]) < 1e-12;
  g_autofree double *qz = NULL;

  qv_dynamical_matrix_cartesian_q (cell, q, qc);
  len = sqrt (qc[0] * qc[0] + qc[1] * qc[1] + qc[2] * qc[2]);
  if (gamma || !(len > 0))
    {
      if (!na->has_direction)
        return;
      memcpy (dir, na->direction, sizeof dir);
    }
  else
    for (int c = 0; c < 3; c++)
      dir[c] = qc[c] / len;
  denom = 0;
  for (int a = 0; a < 3; a++)
    for (int b = 0; b < 3; b++)
      denom += dir[a] * na->epsilon[a][b] * dir[b];
  pre = QV_E2_OVER_EPSILON0_EV_A / (na->volume * denom);
  qz = g_new (double, nb);
  for (gsize k = 0; k < n; k++)
    for (int a = 0; a < 3; a++)
      {
        double s = 0;
        for (int g = 0; g < 3; g++)
          s += dir[g] * na->born[9 * k + 3 * g + a];
        qz[3 * k + a] = s;
      }
  for (gsize k = 0; k < n; k++)
    for (gsize k2 = 0; k2 < n; k2++)
      {
        /* (1/N_c) Σ_L Σ_images w e^{iq·(R_L+T+τ_κ'−τ_κ)}: 1 at Γ */
        double _Complex s = 0;
        if (gamma)
          s = 1;
        else
          {
            for (gsize c = 0; c < nc; c++)
              {
                gsize n_images;
                const QvLatticeImage *im = qv_force_constants_images (fc, c, k, k2, &n_images);
                for (gsize i = 0; i < n_images; i++)
                  {
                    double x = qc[0] * im[i].r[0] + qc[1] * im[i].r[1] + qc[2] * im[i].r[2];
                    s += im[i].weight * (cos (x) + I * sin (x));
                  }
              }
            s /= (double) nc;
          }
        s *= pre / sqrt (m[k] * m[k2]);
        for (int a = 0; a < 3; a++)
          for (int b = 0; b < 3; b++)
            d[(3 * k + a) + (3 * k2 + b) * nb] += qz[3 * k + a] * qz[3 * k2 + b] * s;
      }
}
