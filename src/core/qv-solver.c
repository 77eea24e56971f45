/* qv-solver.c — the normal-mode pipeline of DESIGN §2: symmetrize, mass
 * weight, remove rigid-body motion by a shifted low-rank update, solve with
 * LAPACK in column-major layout, and fix signs and degenerate bases.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <cblas.h>
#include <lapacke.h>
#include <math.h>
#include <string.h>
#include "qv-canonical.h"
#include "qv-error.h"
#include "qv-lanczos.h"
#include "qv-rigid-body.h"
#include "qv-solver.h"
#include "qv-size.h"
#include "qv-units.h"

/* Extra eigenpairs a range solve computes past the requested ones so a
 * degenerate set at the edge of the range is complete before it is made
 * canonical (molecular degeneracies are at most 5). */
#define RANGE_EXTRA 8

void
qv_solve_options_init (QvSolveOptions *options)
{
  memset (options, 0, sizeof *options);
  options->projection = QV_PROJECTION_FULL;
  options->degeneracy_tolerance = QV_SOLVE_DEFAULT_DEGENERACY;
}

const char *
qv_lowest_method_name (QvLowestMethod method)
{
  switch (method)
    {
    case QV_LOWEST_AUTO: return "auto";
    case QV_LOWEST_LAPACK: return "lapack";
    case QV_LOWEST_LANCZOS: return "lanczos";
    default: return "?";
    }
}

gboolean
qv_lowest_method_parse (const char *text, QvLowestMethod *method, GError **error)
{
  for (int i = QV_LOWEST_AUTO; i <= QV_LOWEST_LANCZOS; i++)
    if (text && g_ascii_strcasecmp (text, qv_lowest_method_name ((QvLowestMethod) i)) == 0)
      {
        *method = (QvLowestMethod) i;
        return TRUE;
      }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "unknown method '%s' for the lowest modes; accepted: auto, lapack, lanczos",
               text ? text : "");
  return FALSE;
}

gsize
qv_solver_max_full_dimension (void)
{
  /* dsyevd with eigenvectors needs LWORK = 1 + 6n + 2n² (LAPACK docs). */
  gsize n = 32000;
  while (1 + 6 * (n + 1) + 2 * (n + 1) * (n + 1) <= (gsize) G_MAXINT32)
    n++;
  return n;
}

void
qv_solver_mass_weight (double *matrix, gsize n_atoms, const double *masses)
{
  const gsize n = 3 * n_atoms;
  g_autofree double *s = g_new (double, MAX (n, 1));
  for (gsize i = 0; i < n; i++)
    s[i] = 1.0 / sqrt (masses[i / 3]);
  for (gsize j = 0; j < n; j++)
    {
      double *col = matrix + j * n;
      const double sj = s[j];
      for (gsize i = 0; i < n; i++)
        col[i] *= s[i] * sj;
    }
}

static double
gradient_norm (const QvStructure *structure, double *max_force)
{
  double s = 0.0;
  *max_force = 0.0;
  for (gsize a = 0; a < structure->n_atoms; a++)
    {
      const double *f = structure->forces + 3 * a;
      const double f2 = f[0] * f[0] + f[1] * f[1] + f[2] * f[2];
      s += f2;
      *max_force = MAX (*max_force, sqrt (f2));
    }
  return sqrt (s);
}

/* Re-orthonormalises (modified Gram–Schmidt, twice) the columns of each run of
 * close eigenvalues when they have lost orthogonality — MRRR (dsyevr) may,
 * inside tight clusters. Returns the worst |zᵢᵀzⱼ − δᵢⱼ| seen before. */
static double
repair_clusters (double *z, gsize n, gsize m, const double *w, double tolerance)
{
  double worst = 0.0;
  gsize start = 0;
  while (start < m)
    {
      gsize end = start + 1;
      while (end < m && w[end] - w[end - 1] <= tolerance)
        end++;
      if (end - start > 1)
        {
          double dev = 0.0;
          for (gsize a = start; a < end; a++)
            for (gsize b = start; b <= a; b++)
              {
                const double d = cblas_ddot ((int) n, z + a * n, 1, z + b * n, 1);
                dev = MAX (dev, fabs (d - (a == b ? 1.0 : 0.0)));
              }
          worst = MAX (worst, dev);
          if (dev > 1e-12)
            for (int pass = 0; pass < 2; pass++)
              for (gsize a = start; a < end; a++)
                {
                  for (gsize b = start; b < a; b++)
                    {
                      const double d = cblas_ddot ((int) n, z + b * n, 1, z + a * n, 1);
                      cblas_daxpy ((int) n, -d, z + b * n, 1, z + a * n, 1);
                    }
                  cblas_dscal ((int) n, 1.0 / cblas_dnrm2 ((int) n, z + a * n, 1), z + a * n, 1);
                }
        }
      start = end;
    }
  return worst;
}

static gboolean
solve_all (double *k, gsize n, double *w, GError **error)
{
  lapack_int info, lwork, liwork, iwork_query;
  double work_query;
  double *work;
  lapack_int *iwork;

  if (n > qv_solver_max_full_dimension ())
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                   "a %" G_GSIZE_FORMAT "×%" G_GSIZE_FORMAT " Hessian needs a LAPACK "
                   "workspace of 2n²+6n+1 = %.4g elements, beyond the 32-bit index of this "
                   "LAPACK (all modes work up to 3N = %" G_GSIZE_FORMAT "); ask for the lowest "
                   "modes only (--lowest K), which uses the range solver",
                   n, n, 2.0 * n * n + 6.0 * n + 1.0, qv_solver_max_full_dimension ());
      return FALSE;
    }
  info = LAPACKE_dsyevd_work (LAPACK_COL_MAJOR, 'V', 'L', (lapack_int) n, k, (lapack_int) n, w,
                              &work_query, -1, &iwork_query, -1);
  if (info != 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_SOLVER, "dsyevd workspace query failed (INFO = %d)", (int) info);
      return FALSE;
    }
  lwork = (lapack_int) MAX (work_query, 1.0 + 6.0 * n + 2.0 * n * n);
  liwork = MAX (iwork_query, (lapack_int) (3 + 5 * n));
  /* The matrix is already held; its workspace comes on top of it. */
  {
    g_autoptr(GError) local = NULL;
    if (!qv_size_check_matrix (n, (guint64) lwork * sizeof (double)
                                    + (guint64) liwork * sizeof (lapack_int),
                               "solving all modes (the matrix and its 2n²+6n+1 workspace)",
                               &local))
      {
        g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                     "%s; ask for the lowest modes only (--lowest K)", local->message);
        return FALSE;
      }
  }
  work = g_try_malloc (sizeof (double) * (gsize) lwork);
  iwork = g_try_malloc (sizeof (lapack_int) * (gsize) liwork);
  if (work == NULL || iwork == NULL)
    {
      g_free (work);
      g_free (iwork);
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                   "not enough memory for the eigensolver's workspace (%.1f MiB); "
                   "ask for the lowest modes only (--lowest K)", (double) lwork * 8.0 / 1048576.0);
      return FALSE;
    }
  info = LAPACKE_dsyevd_work (LAPACK_COL_MAJOR, 'V', 'L', (lapack_int) n, k, (lapack_int) n, w,
                              work, lwork, iwork, liwork);
  g_free (work);
  g_free (iwork);
  if (info != 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_SOLVER,
                   "the eigensolver dsyevd failed (INFO = %d)%s", (int) info,
                   info > 0 ? ": it did not converge; check the Hessian for huge or tiny values" : "");
      return FALSE;
    }
  return TRUE;
}

static double *
solve_lowest (double *k, gsize n, gsize m, double *w, GError **error)
{
  lapack_int info, found = 0, lwork, liwork, iwork_query;
  double work_query;
  double *z, *work;
  lapack_int *iwork, *isuppz;

  z = g_try_malloc (sizeof (double) * n * m);
  isuppz = g_new (lapack_int, 2 * MAX (m, 1));
  if (z == NULL)
    {
      g_free (isuppz);
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "not enough memory for %" G_GSIZE_FORMAT
                   " eigenvectors", m);
      return NULL;
    }
  info = LAPACKE_dsyevr_work (LAPACK_COL_MAJOR, 'V', 'I', 'L', (lapack_int) n, k, (lapack_int) n,
                              0.0, 0.0, 1, (lapack_int) m, LAPACKE_dlamch ('S'), &found, w, z,
                              (lapack_int) n, isuppz, &work_query, -1, &iwork_query, -1);
  if (info != 0)
    goto lapack_failed;
  lwork = (lapack_int) MAX (work_query, 26.0 * n);
  liwork = MAX (iwork_query, (lapack_int) (10 * n));
  work = g_new (double, lwork);
  iwork = g_new (lapack_int, liwork);
  info = LAPACKE_dsyevr_work (LAPACK_COL_MAJOR, 'V', 'I', 'L', (lapack_int) n, k, (lapack_int) n,
                              0.0, 0.0, 1, (lapack_int) m, LAPACKE_dlamch ('S'), &found, w, z,
                              (lapack_int) n, isuppz, work, lwork, iwork, liwork);
  g_free (work);
  g_free (iwork);
  if (info != 0 || (gsize) found != m)
    goto lapack_failed;
  g_free (isuppz);
  return z;

lapack_failed:
  g_set_error (error, QV_ERROR, QV_ERROR_SOLVER,
               "the range eigensolver dsyevr failed (INFO = %d, %d of %" G_GSIZE_FORMAT
               " eigenpairs found)", (int) info, (int) found, m);
  g_free (z);
  g_free (isuppz);
  return NULL;
}

QvRigidBody *
qv_solver_rigid_body (const QvStructure *structure, const double *masses, QvProjection requested,
                      QvProjection *used, GError **error)
{
  const gsize n_atoms = structure->n_atoms;
  g_autofree double *positions = g_new (double, MAX (3 * n_atoms, 1));

  for (gsize a = 0; a < n_atoms; a++)
    if (!(masses[a] > 0.0) || !isfinite (masses[a]))
      {
        g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "atom %" G_GSIZE_FORMAT " has mass %g; masses must be positive",
                     a + 1, masses[a]);
        return NULL;
      }
  /* A crystal has no rotational invariance: full means translations. */
  *used = requested;
  if (requested == QV_PROJECTION_FULL && qv_structure_is_periodic (structure))
    *used = QV_PROJECTION_TRANSLATIONS;
  for (gsize a = 0; a < n_atoms; a++)
    memcpy (positions + 3 * a, structure->atoms[a].position, sizeof (double) * 3);
  return qv_rigid_body_new (n_atoms, positions, masses, *used);
}

QvModeSet *
qv_solver_finish (const QvStructure *structure, const double *masses, const QvRigidBody *rb,
                  QvProjection projection, QvEigenpairs *pairs, double degeneracy_tolerance)
{
  const gsize n_atoms = structure->n_atoms, n = 3 * n_atoms;
  const gsize n_modes = pairs->n_modes, m_solved = pairs->m_solved;
  double *w = g_steal_pointer (&pairs->eigenvalues);
  double *vectors = g_steal_pointer (&pairs->vectors);
  const guint r = qv_rigid_body_rank (rb);
  double tol, max_abs = 0.0;
  QvModeSet *modes;

  for (gsize i = 0; i < m_solved; i++)
    max_abs = MAX (max_abs, fabs (w[i]));
  tol = (degeneracy_tolerance > 0 ? degeneracy_tolerance : QV_SOLVE_DEFAULT_DEGENERACY) * max_abs;
  repair_clusters (vectors, n, m_solved, w, tol);
  qv_canonicalize (vectors, n, m_solved, w, tol, pairs->lowest_only && m_solved < n - r);
  if (m_solved > n_modes)
    {
      vectors = g_realloc (vectors, sizeof (double) * n * MAX (n_modes, 1));
      w = g_realloc (w, sizeof (double) * MAX (n_modes, 1));
    }

  modes = qv_mode_set_new (n_atoms, masses, n_modes, w, vectors);
  modes->n_vibrations = n - r;
  modes->projection = projection;
  modes->n_translations = rb->n_translations;
  modes->n_rotations = rb->n_rotations;
  modes->linear = projection == QV_PROJECTION_FULL && rb->n_rotations == 2;
  for (int i = 0; i < 3; i++)
    {
      modes->translation_residuals[i] = qv_wavenumber_from_eigenvalue (pairs->translations[i]);
      modes->rotation_residuals[i] = qv_wavenumber_from_eigenvalue (pairs->rotations[i]);
    }
  if (r > 0)
    {
      modes->rigid_mixing = g_new (double, 2 * MAX (n_modes, 1));
      for (gsize k = 0; k < n_modes; k++)
        qv_rigid_body_mixing (rb, vectors + k * n, w[k], &modes->rigid_mixing[2 * k],
                              &modes->rigid_mixing[2 * k + 1]);
    }
  modes->has_hessian = TRUE;
  modes->asymmetry = pairs->asymmetry;
  modes->lowest_only = pairs->lowest_only;
  modes->eigensolver = pairs->eigensolver;
  if (structure->forces)
    {
      modes->has_gradient = TRUE;
      modes->gradient_norm = gradient_norm (structure, &modes->max_force);
    }
  return modes;
}

QvModeSet *
qv_solve (const QvStructure *structure, QvHessian *hessian,
          const QvSolveOptions *options, const QvProgress *progress, GError **error)
{
  const gsize n_atoms = structure->n_atoms, n = 3 * n_atoms;
  QvSolveOptions defaults;
  g_autofree double *masses = NULL;
  g_autoptr(QvRigidBody) rb = NULL;
  QvProjection projection;
  double asymmetry;
  double translations[3], rotations[3];
  double *w = NULL, *vectors = NULL;
  gsize r, n_vib, n_modes, m_solved;
  gboolean lowest_only;
  const char *eigensolver = "dsyevd";
  QvModeSet *modes;

  if (options == NULL)
    {
      qv_solve_options_init (&defaults);
      options = &defaults;
    }
  if (hessian->n != n || n_atoms == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "the Hessian is %" G_GSIZE_FORMAT "×%" G_GSIZE_FORMAT " but the structure has %"
                   G_GSIZE_FORMAT " atoms (expects %" G_GSIZE_FORMAT "×%" G_GSIZE_FORMAT ")",
                   hessian->n, hessian->n, n_atoms, n, n);
      goto fail;
    }
  if (qv_hessian_find_nonfinite (hessian) >= 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "the Hessian has a value that is not a finite number");
      goto fail;
    }

  if (!qv_progress_report (progress, 0.0, "symmetrizing", error))
    goto fail;
  asymmetry = qv_hessian_symmetrize (hessian);

  masses = qv_structure_masses (structure);
  rb = qv_solver_rigid_body (structure, masses, options->projection, &projection, error);
  if (rb == NULL)
    goto fail;
  if (!qv_progress_report (progress, 0.05, "mass weighting", error))
    goto fail;
  qv_solver_mass_weight (hessian->data, n_atoms, masses);
  r = qv_rigid_body_rank (rb);
  n_vib = n - r;

  if (!qv_progress_report (progress, 0.1, "removing rigid-body motion", error))
    goto fail;
  qv_rigid_body_project_with_residuals (rb, hessian->data, translations, rotations);

  lowest_only = options->lowest > 0 && options->lowest < n_vib;
  n_modes = lowest_only ? options->lowest : n_vib;
  if (!qv_progress_report (progress, 0.15, "solving the eigenproblem", error))
    goto fail;

  if (!lowest_only)
    {
      w = g_new (double, n);
      if (!solve_all (hessian->data, n, w, error))
        goto fail;
      /* The rigid-body vectors sit at the top (shift σ); the first n − r
       * columns are the vibrations, contiguous in column-major storage. */
      vectors = g_steal_pointer (&hessian->data);
      vectors = g_realloc (vectors, sizeof (double) * n * MAX (n_modes, 1));
      m_solved = n_modes;
    }
  else
    {
      gboolean lanczos;
      m_solved = MIN (n_modes + RANGE_EXTRA, n_vib);
      w = g_new (double, m_solved);
      lanczos = options->lowest_method == QV_LOWEST_LANCZOS
                || (options->lowest_method == QV_LOWEST_AUTO
                    && n >= QV_LANCZOS_MIN_DIMENSION && m_solved * 20 <= n);
      eigensolver = "dsyevr";
      if (lanczos)
        {
          vectors = g_try_malloc (sizeof (double) * n * m_solved);
          if (vectors && qv_lanczos_lowest (hessian->data, n, m_solved, w, vectors))
            eigensolver = "lanczos";
          else
            g_clear_pointer (&vectors, g_free);
        }
      if (vectors == NULL)
        vectors = solve_lowest (hessian->data, n, m_solved, w, error);
      if (vectors == NULL)
        goto fail;
      g_clear_pointer (&hessian->data, g_free);
    }
  qv_hessian_free (hessian);
  hessian = NULL;

  /* past the point of no return: a cancel request here is ignored */
  qv_progress_report (progress, 0.95, "making eigenvectors canonical", NULL);
  {
    QvEigenpairs pairs = {
      .eigenvalues = g_steal_pointer (&w), .vectors = g_steal_pointer (&vectors),
      .m_solved = m_solved, .n_modes = n_modes, .lowest_only = lowest_only,
      .eigensolver = eigensolver, .asymmetry = asymmetry,
    };
    memcpy (pairs.translations, translations, sizeof translations);
    memcpy (pairs.rotations, rotations, sizeof rotations);
    modes = qv_solver_finish (structure, masses, rb, projection, &pairs,
                              options->degeneracy_tolerance);
  }
  qv_progress_report (progress, 1.0, "done", NULL);
  return modes;

fail:
  g_free (w);
  g_free (vectors);
  qv_hessian_free (hessian);
  return NULL;
}
