/* qv-assignment.c — the assignment problem (best one-to-one matching).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include "qv-assignment.h"

/* ------------------------------------------------------------------------
 * The assignment problem: Kuhn's Hungarian method (Naval Res. Logist. Q. 2,
 * 83, 1955; Munkres, J. SIAM 5, 32, 1957) in its shortest-augmenting-path
 * form with row and column potentials, O(n²m) for n ≤ m. Minimises the
 * cost −weight.
 * ---------------------------------------------------------------------- */

static void
assign_min (const double *cost, gsize n, gsize m, gboolean transposed, gsize *row_to_col)
{
  /* cost(i, j) for rows 1..n, columns 1..m (1-based as in the method's
   * usual statement; index 0 is the virtual start column). */
#define COST(i, j) (transposed ? cost[((j) - 1) * n + ((i) - 1)] : cost[((i) - 1) * m + ((j) - 1)])
  double *u = g_new0 (double, n + 1), *v = g_new0 (double, m + 1), *minv = g_new (double, m + 1);
  gsize *p = g_new0 (gsize, m + 1), *way = g_new0 (gsize, m + 1);
  gboolean *used = g_new (gboolean, m + 1);

  for (gsize i = 1; i <= n; i++)
    {
      gsize j0 = 0;

      p[0] = i;
      for (gsize j = 0; j <= m; j++)
        {
          minv[j] = INFINITY;
          used[j] = FALSE;
        }
      do
        {
          gsize i0 = p[j0], j1 = 0;
          double delta = INFINITY;

          used[j0] = TRUE;
          for (gsize j = 1; j <= m; j++)
            if (!used[j])
              {
                double cur = COST (i0, j) - u[i0] - v[j];
                if (cur < minv[j])
                  {
                    minv[j] = cur;
                    way[j] = j0;
                  }
                if (minv[j] < delta || j1 == 0)
                  {
                    delta = minv[j];
                    j1 = j;
                  }
              }
          for (gsize j = 0; j <= m; j++)
            if (used[j])
              {
                u[p[j]] += delta;
                v[j] -= delta;
              }
            else
              minv[j] -= delta;
          j0 = j1;
        }
      while (p[j0] != 0);
      do
        {
          gsize j1 = way[j0];
          p[j0] = p[j1];
          j0 = j1;
        }
      while (j0 != 0);
    }
  for (gsize i = 0; i < n; i++)
    row_to_col[i] = QV_ASSIGNMENT_NONE;
  for (gsize j = 1; j <= m; j++)
    if (p[j] != 0)
      row_to_col[p[j] - 1] = j - 1;
#undef COST
  g_free (u); g_free (v); g_free (minv); g_free (p); g_free (way); g_free (used);
}

void
qv_assignment_maximise (const double *weights, gsize n_rows, gsize n_cols, gsize *row_to_col)
{
  gsize nm = n_rows * n_cols;
  double *cost;

  for (gsize i = 0; i < n_rows; i++)
    row_to_col[i] = QV_ASSIGNMENT_NONE;
  if (n_rows == 0 || n_cols == 0)
    return;
  cost = g_new (double, nm);
  for (gsize k = 0; k < nm; k++)
    cost[k] = isfinite (weights[k]) ? -weights[k] : 0.0;
  if (n_rows <= n_cols)
    assign_min (cost, n_rows, n_cols, FALSE, row_to_col);
  else
    {
      /* more rows than columns: solve the transpose (columns to rows) */
      gsize *col_to_row = g_new (gsize, n_cols);

      assign_min (cost, n_cols, n_rows, TRUE, col_to_row);
      for (gsize j = 0; j < n_cols; j++)
        if (col_to_row[j] != QV_ASSIGNMENT_NONE)
          row_to_col[col_to_row[j]] = j;
      g_free (col_to_row);
    }
  g_free (cost);
}

