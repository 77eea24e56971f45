/* qv-test-util.c
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <cblas.h>
#include <float.h>
#include <math.h>
#include <string.h>
#include "qv-rigid-body.h"
#include "qv-test-util.h"

QvStructure *
qvt_structure (gsize n, const guint *z, const double *positions)
{
  QvStructure *s = qv_structure_new (n, NULL);
  for (gsize i = 0; i < n; i++)
    {
      assert_true (qv_structure_set_element (s, i, z[i], NULL));
      memcpy (s->atoms[i].position, positions + 3 * i, sizeof (double) * 3);
    }
  return s;
}

void
qvt_add_coordinate (QvHessian *h, const double *b, double k)
{
  for (gsize i = 0; i < h->n; i++)
    for (gsize j = 0; j < h->n; j++)
      h->data[i + j * h->n] += k * b[i] * b[j];
}

void
qvt_add_stretch (QvHessian *h, const QvStructure *s, gsize i, gsize j, double k)
{
  g_autofree double *b = g_new0 (double, h->n);
  double u[3], r = 0.0;
  for (int c = 0; c < 3; c++)
    {
      u[c] = s->atoms[j].position[c] - s->atoms[i].position[c];
      r += u[c] * u[c];
    }
  r = sqrt (r);
  for (int c = 0; c < 3; c++)
    {
      b[3 * j + c] = u[c] / r;
      b[3 * i + c] = -u[c] / r;
    }
  qvt_add_coordinate (h, b, k);
}

static double
norm1 (const double *a, gsize rows, gsize cols)
{
  double best = 0.0;
  for (gsize j = 0; j < cols; j++)
    {
      double s = 0.0;
      for (gsize i = 0; i < rows; i++)
        s += fabs (a[i + j * rows]);
      best = MAX (best, s);
    }
  return best;
}

QvModeSet *
qvt_solve_checked (const QvStructure *s, const QvHessian *h, const QvSolveOptions *options)
{
  const gsize n = h->n;
  g_autoptr(QvHessian) a = qv_hessian_copy (h, NULL);
  g_autoptr(QvHessian) work = qv_hessian_copy (h, NULL);
  g_autofree double *masses = qv_structure_masses (s);
  g_autofree double *pos = g_new (double, n);
  g_autoptr(QvRigidBody) rb = NULL;
  QvModeSet *modes;
  double *r, *g;
  double ratio_res, ratio_orth, anorm;
  QvProjection projection = options ? options->projection : QV_PROJECTION_FULL;

  modes = qv_solve (s, g_steal_pointer (&work), options, NULL, NULL);
  assert_non_null (modes);

  /* A = PKP + σVVᵀ, built from the public steps; on the vibrational
   * subspace this is PKP. */
  qv_hessian_symmetrize (a);
  qv_solver_mass_weight (a->data, s->n_atoms, masses);
  for (gsize i = 0; i < s->n_atoms; i++)
    memcpy (pos + 3 * i, s->atoms[i].position, sizeof (double) * 3);
  if (projection == QV_PROJECTION_FULL && qv_structure_is_periodic (s))
    projection = QV_PROJECTION_TRANSLATIONS;
  rb = qv_rigid_body_new (s->n_atoms, pos, masses, projection);
  qv_rigid_body_project (rb, a->data);
  for (gsize j = 0; j < n; j++)
    for (gsize i = 0; i < j; i++)
      a->data[i + j * n] = a->data[j + i * n];

  anorm = MAX (norm1 (a->data, n, n), DBL_MIN);
  r = g_new (double, n * modes->n_modes);
  cblas_dgemm (CblasColMajor, CblasNoTrans, CblasNoTrans, (int) n, (int) modes->n_modes, (int) n,
               1.0, a->data, (int) n, modes->vectors, (int) n, 0.0, r, (int) n);
  for (gsize k = 0; k < modes->n_modes; k++)
    for (gsize i = 0; i < n; i++)
      r[i + k * n] -= modes->eigenvalues[k] * modes->vectors[i + k * n];
  ratio_res = norm1 (r, n, modes->n_modes) / ((double) n * anorm * DBL_EPSILON);

  g = g_new (double, modes->n_modes * modes->n_modes);
  cblas_dgemm (CblasColMajor, CblasTrans, CblasNoTrans, (int) modes->n_modes, (int) modes->n_modes,
               (int) n, 1.0, modes->vectors, (int) n, modes->vectors, (int) n, 0.0, g,
               (int) modes->n_modes);
  for (gsize k = 0; k < modes->n_modes; k++)
    g[k + k * modes->n_modes] -= 1.0;
  ratio_orth = norm1 (g, modes->n_modes, modes->n_modes) / ((double) n * DBL_EPSILON);
  g_free (r);
  g_free (g);
  /* LAPACK Working Note 41: test ratios below the threshold 30 pass. */
  if (ratio_res >= 30.0 || ratio_orth >= 30.0)
    print_error ("acceptance ratios: residual %.3g, orthogonality %.3g (n = %zu)\n",
                 ratio_res, ratio_orth, (size_t) n);
  assert_true (ratio_res < 30.0);
  assert_true (ratio_orth < 30.0);
  return modes;
}

QvStructure *
qvt_random_molecule (gsize n, guint32 seed, double box)
{
  g_autoptr(GRand) rand = g_rand_new_with_seed (seed);
  QvStructure *s = qv_structure_new (n, NULL);
  static const guint elements[] = { 1, 6, 7, 8, 16 };
  for (gsize i = 0; i < n; i++)
    {
      qv_structure_set_element (s, i, elements[g_rand_int_range (rand, 0, 5)], NULL);
      for (int c = 0; c < 3; c++)
        s->atoms[i].position[c] = g_rand_double_range (rand, 0.0, box);
    }
  return s;
}

QvHessian *
qvt_spring_network (const QvStructure *s, guint32 seed, double cutoff, double kmin, double kmax)
{
  g_autoptr(GRand) rand = g_rand_new_with_seed (seed);
  QvHessian *h = qv_hessian_new (3 * s->n_atoms, TRUE, NULL);
  for (gsize i = 0; i < s->n_atoms; i++)
    for (gsize j = i + 1; j < s->n_atoms; j++)
      {
        double d2 = 0.0;
        for (int c = 0; c < 3; c++)
          d2 += pow (s->atoms[i].position[c] - s->atoms[j].position[c], 2);
        if (d2 < cutoff * cutoff)
          qvt_add_stretch (h, s, i, j, g_rand_double_range (rand, kmin, kmax));
      }
  return h;
}
