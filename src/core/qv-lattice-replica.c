/* qv-lattice-replica.c — the replicated block and a mode's field on it.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <complex.h>
#include <math.h>
#include "qv-dynamical-matrix.h"
#include "qv-error.h"
#include "qv-lattice-replica.h"
#include "qv-supercell.h"

static gboolean
reps_valid (const int reps[3], GError **error)
{
  gint64 cells = 1;
  for (int i = 0; i < 3; i++)
    {
      if (reps[i] < 1 || reps[i] > QV_LATTICE_REPLICA_MAX_CELLS)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "a replica needs 1 to %d cells along each axis, got %d × %d × %d",
                       QV_LATTICE_REPLICA_MAX_CELLS, reps[0], reps[1], reps[2]);
          return FALSE;
        }
      cells *= reps[i];
    }
  if (cells > QV_LATTICE_REPLICA_MAX_CELLS)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "a replica of %d × %d × %d cells is more than the %d cells shown at once",
                   reps[0], reps[1], reps[2], QV_LATTICE_REPLICA_MAX_CELLS);
      return FALSE;
    }
  return TRUE;
}

QvStructure *
qv_lattice_replica_new (const QvStructure *primitive, const int reps[3], GError **error)
{
  int matrix[3][3] = { { reps[0], 0, 0 }, { 0, reps[1], 0 }, { 0, 0, reps[2] } };

  if (!reps_valid (reps, error))
    return NULL;
  if (!primitive->has_cell)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "the structure has no cell to replicate");
      return NULL;
    }
  return qv_supercell_build (primitive, matrix, error);
}

double
qv_lattice_replica_field (const QvStructure *primitive, const int reps[3], const double q[3],
                          const double _Complex *e, float *re, float *im)
{
  gsize n = primitive->n_atoms, i = 0, total;
  double qc[3], big2 = 0, scale;
  double _Complex *u;

  qv_dynamical_matrix_cartesian_q (primitive->cell, q, qc);
  total = 3 * n * (gsize) reps[0] * (gsize) reps[1] * (gsize) reps[2];
  u = g_new (double _Complex, total);
  /* same order as qv_supercell_build: n1 slowest, then n2, n3, then κ */
  for (int a = 0; a < reps[0]; a++)
    for (int b = 0; b < reps[1]; b++)
      for (int c = 0; c < reps[2]; c++)
        for (gsize k = 0; k < n; k++, i++)
          {
            double x = 0, w = 1.0 / sqrt (primitive->atoms[k].mass), len2 = 0;
            double _Complex p, vv = 0;
            for (int j = 0; j < 3; j++)
              x += qc[j] * (a * primitive->cell[0][j] + b * primitive->cell[1][j]
                            + c * primitive->cell[2][j] + primitive->atoms[k].position[j]);
            p = (cos (x) + I * sin (x)) * w;
            for (int j = 0; j < 3; j++)
              {
                u[3 * i + j] = e[3 * k + j] * p;
                len2 += creal (u[3 * i + j] * conj (u[3 * i + j]));
                vv += u[3 * i + j] * u[3 * i + j];
              }
            /* over a period, max_φ |Re[v e^{−iφ}]|² = (|v|² + |v·v|)/2 (the
             * ellipse's semi-major axis squared) */
            big2 = MAX (big2, 0.5 * (len2 + cabs (vv)));
          }
  scale = big2 > 0 ? 1.0 / sqrt (big2) : 0;
  for (gsize j = 0; j < total; j++)
    {
      re[j] = (float) (creal (u[j]) * scale);
      im[j] = (float) (cimag (u[j]) * scale);
    }
  g_free (u);
  return scale;
}
