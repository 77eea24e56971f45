/* qv-distributed-solver.c — DESIGN §2's pipeline over MPI + ScaLAPACK.
 * The rigid-body basis V (3N × r, r ≤ 6) and the products KV are small and
 * replicated; the matrix itself never leaves its blocks.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <cblas.h>
#include <math.h>
#include <mpi.h>
#include <string.h>
#include "qv-block-layout.h"
#include "qv-distributed-solver.h"
#include "qv-error.h"
#include "qv-rigid-body.h"
#include "qv-scalapack-private.h"
#include "qv-size.h"

/* As in qv-solver.c: pairs past a range so an edge degenerate set is whole. */
#define RANGE_EXTRA 8

static void
report (const QvBlockMatrix *k, const QvProgress *progress, double fraction, const char *stage)
{
  if (k->grid->rank == 0)
    qv_progress_report (progress, fraction, stage, NULL);
}

/* H ← ½(H + Hᵀ) with pdtran into @work (same layout); returns
 * max|H_ij − H_ji| / max|H| over all ranks. */
static double
symmetrize (QvBlockMatrix *h, QvBlockMatrix *work)
{
  const gsize count = h->local_rows * h->local_cols;
  const int n = (int) h->rows, one = 1;
  const double alpha = 1.0, beta = -1.0;
  double local[2] = { 0.0, 0.0 }, global[2];

  memcpy (work->data, h->data, sizeof (double) * count);
  /* work ← Hᵀ − H */
  pdtran_ (&n, &n, &alpha, h->data, &one, &one, h->desc, &beta, work->data, &one, &one, work->desc);
  for (gsize i = 0; i < count; i++)
    {
      local[0] = MAX (local[0], fabs (work->data[i]));
      local[1] = MAX (local[1], fabs (h->data[i]));
      h->data[i] += 0.5 * work->data[i];
    }
  MPI_Allreduce (local, global, 2, MPI_DOUBLE, MPI_MAX, MPI_COMM_WORLD);
  return global[1] > 0.0 ? global[0] / global[1] : 0.0;
}

static void
mass_weight (QvBlockMatrix *k, const double *scale)
{
  for (gsize jl = 0; jl < k->local_cols; jl++)
    {
      const double sj = scale[qv_block_matrix_global_col (k, jl)];
      double *col = k->data + jl * k->local_rows;

      for (gsize il = 0; il < k->local_rows; il++)
        col[il] *= scale[qv_block_matrix_global_row (k, il)] * sj;
    }
}

/* The rows of the replicated n × r @full that this rank's local rows (or
 * columns) are: a local × r column-major copy. */
static double *
local_slice (const QvBlockMatrix *k, const double *full, guint r, gboolean columns)
{
  const gsize n = k->rows, count = columns ? k->local_cols : k->local_rows;
  double *out = g_new (double, MAX (count * r, 1));

  for (guint c = 0; c < r; c++)
    for (gsize l = 0; l < count; l++)
      out[l + c * count] = full[(columns ? qv_block_matrix_global_col (k, l)
                                         : qv_block_matrix_global_row (k, l)) + c * n];
  return out;
}

/* K ← PKP + σVVᵀ (qv_rigid_body_prepare_update's factor applied to the local
 * blocks), keeping KV in @rb for the mixing weights. */
static void
project (QvBlockMatrix *k, QvRigidBody *rb, double translations[3], double rotations[3])
{
  const gsize n = k->rows, mr = k->local_rows, nc = k->local_cols;
  const guint r = qv_rigid_body_rank (rb);
  g_autofree double *v_cols = NULL, *v_rows = NULL, *w_cols = NULL, *w_rows = NULL;
  g_autofree double *part = g_new0 (double, n * r), *kv = g_new (double, n * r);
  g_autofree double *row_part = g_new0 (double, n), *row_sum = g_new (double, n);
  g_autofree double *local_kv = g_new0 (double, MAX (mr * r, 1));
  double gershgorin = 0.0;

  for (int i = 0; i < 3; i++)
    translations[i] = rotations[i] = 0.0;
  if (r == 0)
    return;
  /* KV: this rank's blocks times the matching rows of V, summed over ranks */
  v_cols = local_slice (k, rb->basis, r, TRUE);
  if (mr > 0 && nc > 0)
    cblas_dgemm (CblasColMajor, CblasNoTrans, CblasNoTrans, (int) mr, (int) r, (int) nc, 1.0,
                 k->data, (int) mr, v_cols, (int) nc, 0.0, local_kv, (int) mr);
  for (guint c = 0; c < r; c++)
    for (gsize il = 0; il < mr; il++)
      part[qv_block_matrix_global_row (k, il) + c * n] = local_kv[il + c * mr];
  /* Gershgorin: Σ_j |K_ij| per global row */
  for (gsize jl = 0; jl < nc; jl++)
    for (gsize il = 0; il < mr; il++)
      row_part[qv_block_matrix_global_row (k, il)] += fabs (k->data[il + jl * mr]);
  MPI_Allreduce (part, kv, (int) (n * r), MPI_DOUBLE, MPI_SUM, MPI_COMM_WORLD);
  MPI_Allreduce (row_part, row_sum, (int) n, MPI_DOUBLE, MPI_SUM, MPI_COMM_WORLD);
  for (gsize i = 0; i < n; i++)
    gershgorin = MAX (gershgorin, row_sum[i]);

  qv_rigid_body_prepare_update (rb, kv, gershgorin, translations, rotations);
  /* K ← K − V W′ᵀ − W′ Vᵀ on the local blocks */
  v_rows = local_slice (k, rb->basis, r, FALSE);
  w_rows = local_slice (k, kv, r, FALSE);
  w_cols = local_slice (k, kv, r, TRUE);
  if (mr > 0 && nc > 0)
    {
      cblas_dgemm (CblasColMajor, CblasNoTrans, CblasTrans, (int) mr, (int) nc, (int) r, -1.0,
                   v_rows, (int) mr, w_cols, (int) nc, 1.0, k->data, (int) mr);
      cblas_dgemm (CblasColMajor, CblasNoTrans, CblasTrans, (int) mr, (int) nc, (int) r, -1.0,
                   w_rows, (int) mr, v_cols, (int) nc, 1.0, k->data, (int) mr);
    }
}

/* Eigenvalues into @w (n, replicated) and eigenvectors into @z. */
static gboolean
eigensolve (QvBlockMatrix *k, QvBlockMatrix *z, gsize wanted, gboolean all, double *w,
            GError **error)
{
  const int n = (int) k->rows, one = 1, query = -1;
  int info = 0, lwork, liwork, iwork_query = 0, found = 0, found_z = 0;
  const int iu = (int) wanted;
  const double zero = 0.0;
  double work_query = 0.0;
  double *work;
  int *iwork;
  gboolean ok;

  if (all)
    pdsyevd_ ("V", "L", &n, k->data, &one, &one, k->desc, w, z->data, &one, &one, z->desc,
              &work_query, &query, &iwork_query, &query, &info, 1, 1);
  else
    pdsyevr_ ("V", "I", "L", &n, k->data, &one, &one, k->desc, &zero, &zero, &one, &iu, &found,
              &found_z, w, z->data, &one, &one, z->desc, &work_query, &query, &iwork_query,
              &query, &info, 1, 1, 1);
  if (info != 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_SOLVER, "the %s workspace query failed (INFO = %d)",
                   all ? "pdsyevd" : "pdsyevr", info);
      return qv_process_grid_agree (k->grid, FALSE, error);
    }
  /* pdsyevd's answer to the query can be short of what its PDORMTR step
   * then asks (seen with ScaLAPACK 2.2.1): take the documented minimum,
   * with PDORMTR's own on top (qv-block-layout.c), when it is larger. */
  {
    guint64 doc_lwork, doc_liwork;

    qv_block_layout_eigen_workspace (k->rows, k->block, (guint) k->grid->rows,
                                     (guint) k->grid->cols, (guint) k->grid->row,
                                     (guint) k->grid->col, all ? k->rows : wanted, &doc_lwork,
                                     &doc_liwork);
    lwork = (int) MIN (MAX (work_query, (double) doc_lwork), (double) G_MAXINT32);
    liwork = (int) MIN (MAX ((guint64) MAX (iwork_query, 1), doc_liwork), (guint64) G_MAXINT32);
  }
  work = g_try_malloc (sizeof (double) * (gsize) lwork);
  iwork = g_try_malloc (sizeof (int) * (gsize) liwork);
  if (work == NULL || iwork == NULL)
    g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                 "rank %d cannot hold the eigensolver's workspace (%.1f MiB); run on more ranks",
                 k->grid->rank, (double) lwork * 8.0 / 1048576.0);
  ok = qv_process_grid_agree (k->grid, work != NULL && iwork != NULL, error);
  if (ok)
    {
      if (all)
        pdsyevd_ ("V", "L", &n, k->data, &one, &one, k->desc, w, z->data, &one, &one, z->desc,
                  work, &lwork, iwork, &liwork, &info, 1, 1);
      else
        pdsyevr_ ("V", "I", "L", &n, k->data, &one, &one, k->desc, &zero, &zero, &one, &iu,
                  &found, &found_z, w, z->data, &one, &one, z->desc, work, &lwork, iwork, &liwork,
                  &info, 1, 1, 1);
      if (info != 0 || (!all && (found != iu || found_z != iu)))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_SOLVER,
                       "the eigensolver %s failed (INFO = %d%s)%s", all ? "pdsyevd" : "pdsyevr",
                       info, all ? "" : ", fewer eigenpairs than asked",
                       info > 0 ? ": it did not converge; check the Hessian for huge or tiny values" : "");
          ok = FALSE;
        }
      /* INFO is the same on every rank; agree all the same */
      ok = qv_process_grid_agree (k->grid, ok, error);
    }
  g_free (work);
  g_free (iwork);
  return ok;
}

QvModeSet *
qv_distributed_solve (const QvStructure *structure, QvBlockMatrix *hessian,
                      const QvSolveOptions *options, const QvProgress *progress, GError **error)
{
  const QvProcessGrid *grid = hessian->grid;
  const gsize n_atoms = structure->n_atoms, n = 3 * n_atoms;
  g_autoptr(QvBlockMatrix) k = hessian;
  g_autoptr(QvBlockMatrix) z = NULL;
  g_autoptr(QvRigidBody) rb = NULL;
  g_autofree double *masses = NULL, *scale = NULL, *w = NULL;
  g_autofree double *vectors = NULL;
  QvSolveOptions defaults;
  QvProjection projection;
  QvEigenpairs pairs = { 0 };
  double asymmetry;
  gsize n_vib, n_modes, m_solved, m_range;
  gboolean lowest_only, all;

  if (options == NULL)
    {
      qv_solve_options_init (&defaults);
      options = &defaults;
    }
  if (k->rows != n || k->cols != n || n_atoms == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "the Hessian is %" G_GSIZE_FORMAT "×%" G_GSIZE_FORMAT " but the structure has %"
                   G_GSIZE_FORMAT " atoms (expects %" G_GSIZE_FORMAT "×%" G_GSIZE_FORMAT ")",
                   k->rows, k->cols, n_atoms, n, n);
      return NULL;
    }
  masses = qv_structure_masses (structure);
  rb = qv_solver_rigid_body (structure, masses, options->projection, &projection, error);
  if (rb == NULL)
    return NULL;
  n_vib = n - qv_rigid_body_rank (rb);
  lowest_only = options->lowest > 0 && options->lowest < n_vib;
  n_modes = lowest_only ? options->lowest : n_vib;
  m_solved = lowest_only ? MIN (n_modes + RANGE_EXTRA, n_vib) : n_modes;

  /* Rank 0 receives the vectors of the modes it writes: refuse now, not
   * after the solve, when that cannot fit beside its own blocks. */
  {
    gboolean fits = TRUE;

    if (grid->rank == 0)
      {
        g_autofree char *what = g_strdup_printf (
          "rank 0 receiving the vectors of %" G_GSIZE_FORMAT " modes (3N × %" G_GSIZE_FORMAT
          ") beside its blocks", m_solved, m_solved);
        const guint64 own = 2 * (guint64) k->local_rows * k->local_cols * sizeof (double);

        GError *local = NULL;

        fits = qv_size_check_memory ((guint64) n * m_solved * sizeof (double) + own, what, &local);
        if (!fits)
          {
            g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "%s; the table of every mode needs every "
                         "vector on rank 0: ask for the lowest modes only (--lowest K)",
                         local->message);
            g_error_free (local);
          }
      }
    if (!qv_process_grid_agree (grid, fits, error))
      return NULL;
  }

  /* The second matrix: workspace of the symmetrization, then the vectors. */
  z = qv_block_matrix_new (grid, n, n, k->block, error);
  if (z == NULL)
    return NULL;
  report (k, progress, 0.0, "symmetrizing");
  asymmetry = symmetrize (k, z);

  report (k, progress, 0.05, "mass weighting");
  scale = g_new (double, n);
  for (gsize i = 0; i < n; i++)
    scale[i] = 1.0 / sqrt (masses[i / 3]);
  mass_weight (k, scale);

  report (k, progress, 0.1, "removing rigid-body motion");
  project (k, rb, pairs.translations, pairs.rotations);

  /* pdsyevr asks for at least one block of pairs: with fewer than NB its
   * back-transformation (PDORMTR) refuses its workspace and the vectors come
   * out wrong with INFO = 0 (seen with ScaLAPACK 2.2.1, N = 180, NB = 64,
   * 20 pairs, on 1 and 4 ranks). When that reaches the rigid-body pairs at
   * the top, every pair is cheaper. */
  m_range = MAX (m_solved, k->block);
  all = !lowest_only || m_range >= n_vib;
  report (k, progress, 0.15, "solving the eigenproblem");
  w = g_new (double, n);
  if (!eigensolve (k, z, all ? n : m_range, all, w, error))
    return NULL;
  g_clear_pointer (&k, qv_block_matrix_free);

  report (z, progress, 0.9, "gathering the mode vectors on rank 0");
  {
    GError *local = NULL;

    vectors = qv_block_matrix_gather_columns (z, 0, m_solved, &local);
    if (local != NULL)   /* on every rank: the gather agrees */
      {
        g_propagate_error (error, local);
        return NULL;
      }
  }
  if (grid->rank != 0)
    return NULL;

  qv_progress_report (progress, 0.95, "making eigenvectors canonical", NULL);
  pairs.eigenvalues = g_memdup2 (w, sizeof (double) * MAX (m_solved, 1));
  pairs.vectors = g_steal_pointer (&vectors);
  pairs.m_solved = m_solved;
  pairs.n_modes = n_modes;
  pairs.lowest_only = lowest_only;
  pairs.eigensolver = all ? "pdsyevd" : "pdsyevr";
  pairs.asymmetry = asymmetry;
  {
    QvModeSet *modes = qv_solver_finish (structure, masses, rb, projection, &pairs,
                                         options->degeneracy_tolerance);
    qv_progress_report (progress, 1.0, "done", NULL);
    return modes;
  }
}
