/* test-mode-comparison.c — the assignment solver against exhaustive search
 * (the definition of the assignment problem: the best of all one-to-one
 * maps), square and rectangular, with ties.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <math.h>
#include <string.h>
#include <cmocka.h>
#include "qv-mode-comparison.h"
#include "qv-random.h"

/* Best total over every injective map of the smaller side into the larger,
 * by recursion over the rows (n_rows ≤ n_cols). */
static double
brute (const double *w, gsize n_rows, gsize n_cols, gsize row, gboolean *used)
{
  double best = -INFINITY;

  if (row == n_rows)
    return 0.0;
  for (gsize j = 0; j < n_cols; j++)
    if (!used[j])
      {
        double t;
        used[j] = TRUE;
        t = w[row * n_cols + j] + brute (w, n_rows, n_cols, row + 1, used);
        used[j] = FALSE;
        best = MAX (best, t);
      }
  return best;
}

static void
check_one (const double *w, gsize n_rows, gsize n_cols)
{
  gsize *map = g_new (gsize, n_rows);
  gboolean *used = g_new0 (gboolean, MAX (n_rows, n_cols));
  double got = 0.0, best;
  gsize matched = 0;
  double *wt = NULL;

  qv_assignment_maximise (w, n_rows, n_cols, map);
  for (gsize i = 0; i < n_rows; i++)
    if (map[i] != QV_COMPARISON_NONE)
      {
        assert_true (map[i] < n_cols);
        assert_false (used[map[i]]);          /* one-to-one */
        used[map[i]] = TRUE;
        got += w[i * n_cols + map[i]];
        matched++;
      }
  assert_int_equal (matched, MIN (n_rows, n_cols));
  memset (used, 0, sizeof (gboolean) * MAX (n_rows, n_cols));
  if (n_rows <= n_cols)
    best = brute (w, n_rows, n_cols, 0, used);
  else
    {
      wt = g_new (double, n_rows * n_cols);
      for (gsize i = 0; i < n_rows; i++)
        for (gsize j = 0; j < n_cols; j++)
          wt[j * n_rows + i] = w[i * n_cols + j];
      best = brute (wt, n_cols, n_rows, 0, used);
    }
  assert_true (fabs (got - best) <= 1e-12 * MAX (1.0, fabs (best)));
  g_free (wt);
  g_free (map);
  g_free (used);
}

static void
test_random_against_exhaustive (void **state)
{
  QvRandom rng;
  (void) state;

  qv_random_init (&rng, 20261202);
  for (int trial = 0; trial < 400; trial++)
    {
      gsize n_rows = 1 + qv_random_next (&rng) % 6, n_cols = 1 + qv_random_next (&rng) % 6;
      double *w = g_new (double, n_rows * n_cols);
      gboolean ties = trial % 3 == 0;

      for (gsize k = 0; k < n_rows * n_cols; k++)
        /* every third matrix from a few levels only: many ties */
        w[k] = ties ? (double) (qv_random_next (&rng) % 3) : qv_random_uniform (&rng);
      check_one (w, n_rows, n_cols);
      g_free (w);
    }
}

static void
test_identity_and_permutation (void **state)
{
  double w[16] = { 0 };
  gsize map[4];
  const gsize perm[4] = { 2, 0, 3, 1 };
  (void) state;

  for (gsize i = 0; i < 4; i++)
    w[i * 4 + perm[i]] = 1.0;
  qv_assignment_maximise (w, 4, 4, map);
  for (gsize i = 0; i < 4; i++)
    assert_int_equal (map[i], perm[i]);
  /* all equal: any answer is optimal, and it must still be one-to-one */
  for (gsize k = 0; k < 16; k++)
    w[k] = 0.5;
  check_one (w, 4, 4);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_random_against_exhaustive),
    cmocka_unit_test (test_identity_and_permutation),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
