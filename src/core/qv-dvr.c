/* qv-dvr.c — sinc DVR (Colbert & Miller, J. Chem. Phys. 96, 1982, 1992).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <lapacke.h>
#include <math.h>
#include <string.h>
#include "qv-dvr.h"
#include "qv-error.h"
#include "qv-units.h"

double
qv_dvr_kinetic_prefactor (void)
{
  /* ħ²/(2 · 1 u · 1 Å²) in J, then in eV */
  return QV_HBAR * QV_HBAR / (2.0 * QV_ATOMIC_MASS * 1e-20) / QV_ELEMENTARY_CHARGE;
}

void
qv_dvr_grid_span (QvDvrGrid *grid, guint dim, const gsize n[], const double lo[],
                  const double hi[], gboolean walls)
{
  memset (grid, 0, sizeof *grid);
  grid->dim = dim;
  grid->walls = walls;
  for (guint d = 0; d < dim; d++)
    {
      grid->n[d] = n[d];
      if (walls)
        {
          grid->step[d] = (hi[d] - lo[d]) / (double) (n[d] + 1);
          grid->lo[d] = lo[d] + grid->step[d];
        }
      else
        {
          grid->lo[d] = lo[d];
          grid->step[d] = n[d] > 1 ? (hi[d] - lo[d]) / (double) (n[d] - 1) : 0.0;
        }
    }
}

gsize
qv_dvr_grid_size (const QvDvrGrid *grid)
{
  gsize size = 1;
  for (guint d = 0; d < grid->dim; d++)
    size *= grid->n[d];
  return size;
}

void
qv_dvr_grid_point (const QvDvrGrid *grid, gsize index, double *x)
{
  for (guint d = 0; d < grid->dim; d++)
    {
      x[d] = grid->lo[d] + (double) (index % grid->n[d]) * grid->step[d];
      index /= grid->n[d];
    }
}

void
qv_dvr_levels_free (QvDvrLevels *levels)
{
  if (levels == NULL)
    return;
  g_free (levels->energies);
  g_free (levels->vectors);
  g_free (levels);
}

void
qv_dvr_kinetic_matrix (gsize n, double step, double kinetic, gboolean walls, double *t)
{
  const double f = kinetic / (step * step);

  if (walls)
    {
      /* Colbert & Miller eq. (A6): the interval (a, b) with N = n + 1,
       * b − a = N·step, points i = 1..N−1 */
      const double N = (double) (n + 1);
      const double g = kinetic * G_PI * G_PI / (2.0 * N * N * step * step);
      for (gsize j = 0; j < n; j++)
        for (gsize i = 0; i < n; i++)
          {
            const double ii = (double) (i + 1), jj = (double) (j + 1);
            const double sign = ((i + j) % 2 == 0) ? 1.0 : -1.0;
            double value;
            if (i == j)
              {
                const double si = sin (G_PI * ii / N);
                value = (2.0 * N * N + 1.0) / 3.0 - 1.0 / (si * si);
              }
            else
              {
                const double sm = sin (G_PI * (ii - jj) / (2.0 * N));
                const double sp = sin (G_PI * (ii + jj) / (2.0 * N));
                value = 1.0 / (sm * sm) - 1.0 / (sp * sp);
              }
            t[i + n * j] = g * sign * value;
          }
      return;
    }
  for (gsize j = 0; j < n; j++)
    for (gsize i = 0; i < n; i++)
      {
        const double k = (double) i - (double) j;
        const double sign = ((i + j) % 2 == 0) ? 1.0 : -1.0;
        t[i + n * j] = i == j ? f * G_PI * G_PI / 3.0 : f * sign * 2.0 / (k * k);
      }
}

QvDvrLevels *
qv_dvr_solve (const QvDvrGrid *grid, const double *potential, double kinetic,
              gsize n_levels, GError **error)
{
  const gsize n = qv_dvr_grid_size (grid);
  g_autofree double *h = NULL, *t0 = NULL, *t1 = NULL, *work = NULL;
  g_autofree lapack_int *iwork = NULL, *isuppz = NULL;
  g_autoptr(QvDvrLevels) levels = NULL;
  lapack_int info, found = 0, lwork, liwork, iwork_query;
  double work_query;

  if (grid->dim < 1 || grid->dim > 2 || n < 2)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "a DVR grid has 1 or 2 axes and 2 or more points");
      return NULL;
    }
  if (n > QV_DVR_MAX_POINTS)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "a DVR grid of %" G_GSIZE_FORMAT
                   " points is more than this solves (up to %d)", n, QV_DVR_MAX_POINTS);
      return NULL;
    }
  if (n_levels < 1 || n_levels > n)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "asked for %" G_GSIZE_FORMAT
                   " levels on a grid of %" G_GSIZE_FORMAT " points", n_levels, n);
      return NULL;
    }
  h = g_try_malloc0 (sizeof (double) * n * n);
  if (h == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "not enough memory for a %" G_GSIZE_FORMAT
                   "-point DVR Hamiltonian", n);
      return NULL;
    }
  /* H = T0 ⊗ I + I ⊗ T1 + diag(V); index i0 + n0·i1 */
  {
    const gsize n0 = grid->n[0], n1 = grid->dim == 2 ? grid->n[1] : 1;
    t0 = g_new (double, n0 * n0);
    qv_dvr_kinetic_matrix (n0, grid->step[0], kinetic, grid->walls, t0);
    if (grid->dim == 2)
      {
        t1 = g_new (double, n1 * n1);
        qv_dvr_kinetic_matrix (n1, grid->step[1], kinetic, grid->walls, t1);
      }
    for (gsize j1 = 0; j1 < n1; j1++)
      for (gsize j0 = 0; j0 < n0; j0++)
        {
          const gsize col = j0 + n0 * j1;
          for (gsize i0 = 0; i0 < n0; i0++)
            h[(i0 + n0 * j1) + n * col] += t0[i0 + n0 * j0];
          if (t1)
            for (gsize i1 = 0; i1 < n1; i1++)
              h[(j0 + n0 * i1) + n * col] += t1[i1 + n1 * j1];
          h[col + n * col] += potential[col];
        }
  }
  for (gsize i = 0; i < n; i++)
    if (!isfinite (potential[i]))
      {
        g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "the potential is not finite at grid point %"
                     G_GSIZE_FORMAT, i + 1);
        return NULL;
      }

  levels = g_new0 (QvDvrLevels, 1);
  levels->grid = *grid;
  levels->n_points = n;
  levels->n_levels = n_levels;
  levels->energies = g_new (double, n);
  levels->vectors = g_try_malloc (sizeof (double) * n * n_levels);
  isuppz = g_new (lapack_int, 2 * n_levels);
  if (levels->vectors == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "not enough memory for the DVR eigenvectors");
      return NULL;
    }
  info = LAPACKE_dsyevr_work (LAPACK_COL_MAJOR, 'V', 'I', 'L', (lapack_int) n, h, (lapack_int) n,
                              0.0, 0.0, 1, (lapack_int) n_levels, LAPACKE_dlamch ('S'), &found,
                              levels->energies, levels->vectors, (lapack_int) n, isuppz,
                              &work_query, -1, &iwork_query, -1);
  if (info == 0)
    {
      lwork = (lapack_int) MAX (work_query, 26.0 * n);
      liwork = MAX (iwork_query, (lapack_int) (10 * n));
      work = g_new (double, lwork);
      iwork = g_new (lapack_int, liwork);
      info = LAPACKE_dsyevr_work (LAPACK_COL_MAJOR, 'V', 'I', 'L', (lapack_int) n, h,
                                  (lapack_int) n, 0.0, 0.0, 1, (lapack_int) n_levels,
                                  LAPACKE_dlamch ('S'), &found, levels->energies,
                                  levels->vectors, (lapack_int) n, isuppz, work, lwork, iwork,
                                  liwork);
    }
  if (info != 0 || (gsize) found != n_levels)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_SOLVER,
                   "the range eigensolver dsyevr failed on the DVR Hamiltonian (INFO = %d, %d of %"
                   G_GSIZE_FORMAT " levels found)", (int) info, (int) found, n_levels);
      return NULL;
    }
  levels->energies = g_realloc (levels->energies, sizeof (double) * n_levels);
  /* sign: largest-magnitude component positive (lowest index on ties) */
  for (gsize k = 0; k < n_levels; k++)
    {
      double *c = levels->vectors + n * k, best = 0.0;
      gsize at = 0;
      for (gsize i = 0; i < n; i++)
        if (fabs (c[i]) > best * (1.0 + 1e-12))
          best = fabs (c[i]), at = i;
      if (c[at] < 0)
        for (gsize i = 0; i < n; i++)
          c[i] = -c[i];
    }
  return g_steal_pointer (&levels);
}

double
qv_dvr_levels_mean (const QvDvrLevels *levels, gsize level, guint axis)
{
  const double *c = levels->vectors + levels->n_points * level;
  double sum = 0.0, x[2];

  for (gsize i = 0; i < levels->n_points; i++)
    {
      qv_dvr_grid_point (&levels->grid, i, x);
      sum += c[i] * c[i] * x[axis];
    }
  return sum;
}

double
qv_dvr_levels_wavefunction (const QvDvrLevels *levels, gsize level, gsize point)
{
  double cell = 1.0;

  g_return_val_if_fail (levels != NULL && level < levels->n_levels
                        && point < levels->n_points, NAN);
  for (guint d = 0; d < levels->grid.dim; d++)
    cell *= levels->grid.step[d];
  return levels->vectors[levels->n_points * level + point] / sqrt (cell);
}

double
qv_dvr_levels_coordinate_element (const QvDvrLevels *levels, gsize a, gsize b, guint axis)
{
  const double *ca = levels->vectors + levels->n_points * a;
  const double *cb = levels->vectors + levels->n_points * b;
  double sum = 0.0, x[2];

  for (gsize i = 0; i < levels->n_points; i++)
    {
      qv_dvr_grid_point (&levels->grid, i, x);
      sum += ca[i] * cb[i] * x[axis];
    }
  return sum;
}

double
qv_dvr_levels_edge_weight (const QvDvrLevels *levels, gsize level, double fraction)
{
  const QvDvrGrid *g = &levels->grid;
  const double *c = levels->vectors + levels->n_points * level;
  gsize band[2] = { 1, 1 };
  double sum = 0.0;

  for (guint d = 0; d < g->dim; d++)
    band[d] = MAX (1, (gsize) floor (fraction * (double) (g->n[d] - 1)));
  for (gsize i = 0; i < levels->n_points; i++)
    {
      gsize rest = i;
      gboolean edge = FALSE;
      for (guint d = 0; d < g->dim; d++)
        {
          const gsize k = rest % g->n[d];
          rest /= g->n[d];
          if (k < band[d] || k + band[d] >= g->n[d])
            edge = TRUE;
        }
      if (edge)
        sum += c[i] * c[i];
    }
  return sum;
}

void
qv_dvr_refine_options_init (QvDvrRefineOptions *options, guint dim)
{
  memset (options, 0, sizeof *options);
  options->dim = dim;
  options->n_levels = 1;
  /* 1e-6 cm⁻¹ as an energy: h·c·(100 cm⁻¹ per m⁻¹)/e */
  options->tolerance = 1e-6 * QV_PLANCK * QV_SPEED_OF_LIGHT * 100.0 / QV_ELEMENTARY_CHARGE;
  options->walls = TRUE;
  options->start_points = dim == 2 ? 15 : 33;
  options->max_points = dim == 2 ? 49 : 2049;
}

void
qv_dvr_refinement_free (QvDvrRefinement *refinement)
{
  if (refinement == NULL)
    return;
  qv_dvr_levels_free (refinement->levels);
  if (refinement->steps)
    g_array_unref (refinement->steps);
  g_free (refinement);
}

QvDvrRefinement *
qv_dvr_refine (const QvDvrRefineOptions *options, QvDvrPotential potential,
               gpointer user_data, double kinetic, GError **error)
{
  g_autoptr(QvDvrRefinement) r = g_new0 (QvDvrRefinement, 1);
  const guint dim = options->dim;
  gsize n = MAX (options->start_points, 3);
  const gsize max_n = MAX (options->max_points, n);

  if (dim < 1 || dim > 2)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "a DVR grid has 1 or 2 axes");
      return NULL;
    }
  for (guint d = 0; d < dim; d++)
    if (!(options->hi[d] > options->lo[d]) || !isfinite (options->hi[d] - options->lo[d]))
      {
        g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "the DVR interval of axis %u is empty", d + 1);
        return NULL;
      }
  r->steps = g_array_new (FALSE, FALSE, sizeof (QvDvrStep));
  for (;;)
    {
      QvDvrGrid grid;
      const gsize nn[2] = { n, n };
      g_autofree double *v = NULL;
      g_autoptr(QvDvrLevels) levels = NULL;
      QvDvrStep step = { { n, dim == 2 ? n : 0 }, { 0, 0 }, NAN };
      gsize size;
      double x[2];

      qv_dvr_grid_span (&grid, dim, nn, options->lo, options->hi, options->walls);
      size = qv_dvr_grid_size (&grid);
      if (size > QV_DVR_MAX_POINTS && r->levels)
        break;
      v = g_new (double, size);
      for (gsize i = 0; i < size; i++)
        {
          qv_dvr_grid_point (&grid, i, x);
          v[i] = potential (x, user_data);
        }
      levels = qv_dvr_solve (&grid, v, kinetic, MIN (options->n_levels, size), error);
      if (levels == NULL)
        return NULL;
      step.step[0] = grid.step[0];
      step.step[1] = dim == 2 ? grid.step[1] : 0.0;
      if (r->levels)
        {
          step.max_change = 0.0;
          for (gsize k = 0; k < levels->n_levels && k < r->levels->n_levels; k++)
            step.max_change = MAX (step.max_change,
                                   fabs (levels->energies[k] - r->levels->energies[k]));
        }
      g_array_append_val (r->steps, step);
      qv_dvr_levels_free (r->levels);
      r->levels = g_steal_pointer (&levels);
      if (!isnan (step.max_change) && step.max_change < options->tolerance)
        {
          r->converged = TRUE;
          break;
        }
      if (n >= max_n)
        break;
      n = MIN (max_n, (gsize) ceil ((double) n * 1.4));
    }
  return g_steal_pointer (&r);
}
