/* test-canonical.c — the canonical basis of a degenerate subspace depends
 * only on the subspace (common practice for reproducible output; DESIGN §2).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <lapacke.h>
#include <math.h>
#include <string.h>
#include "qv-canonical.h"

/* n×m matrix with orthonormal columns from a random one (QR). */
static void
random_orthonormal (double *a, gsize n, gsize m, GRand *rand)
{
  g_autofree double *tau = g_new (double, m);
  for (gsize i = 0; i < n * m; i++)
    a[i] = g_rand_double_range (rand, -1, 1);
  LAPACKE_dgeqrf (LAPACK_COL_MAJOR, (int) n, (int) m, a, (int) n, tau);
  LAPACKE_dorgqr (LAPACK_COL_MAJOR, (int) n, (int) m, (int) m, a, (int) n, tau);
}

static void
test_rotation_invariance (void **state)
{
  enum { N = 12, M = 5 };
  g_autoptr(GRand) rand = g_rand_new_with_seed (7);
  double a[N * M], b[N * M], q[M * M];
  /* values: one single, a triple (within the tolerance), one single */
  const double sorted[M] = { 0.5, 1.0, 1.0 + 1e-12, 1.0 + 2e-12, 2.0 };

  random_orthonormal (a, N, M, rand);
  /* b: the same subspaces, the triple (columns 1..3) mixed by a random
   * orthogonal 3×3, the singles with flipped signs. */
  random_orthonormal (q, 3, 3, rand);
  memcpy (b, a, sizeof a);
  for (int c = 0; c < 3; c++)
    for (int i = 0; i < N; i++)
      {
        double s = 0;
        for (int k = 0; k < 3; k++)
          s += a[(1 + k) * N + i] * q[k + 3 * c];
        b[(1 + c) * N + i] = s;
      }
  for (int i = 0; i < N; i++)
    {
      b[i] = -b[i];
      b[4 * N + i] = -b[4 * N + i];
    }
  assert_int_equal (qv_canonicalize (a, N, M, sorted, 1e-9, FALSE), 1);
  assert_int_equal (qv_canonicalize (b, N, M, sorted, 1e-9, FALSE), 1);
  for (int i = 0; i < N * M; i++)
    assert_true (fabs (a[i] - b[i]) < 1e-12);
  /* still orthonormal */
  for (int x = 0; x < M; x++)
    for (int y = 0; y < M; y++)
      {
        double d = 0;
        for (int i = 0; i < N; i++)
          d += a[x * N + i] * a[y * N + i];
        assert_true (fabs (d - (x == y)) < 1e-13);
      }
}

static void
test_sign_rule (void **state)
{
  /* largest magnitude positive; a tie goes to the lowest index */
  double v[2 * 4] = { 0.1, -0.7, 0.2, 0.3,   0.5, 0.1, -0.5, 0.0 };
  const double w[2] = { 1.0, 2.0 };
  qv_canonicalize (v, 4, 2, w, 1e-9, FALSE);
  assert_true (v[1] > 0 && fabs (v[1] - 0.7) < 1e-15);
  assert_true (v[4] > 0 && v[6] < 0);
  v[4] = -0.5; v[6] = 0.5;
  qv_canonicalize (v, 4, 2, w, 1e-9, FALSE);
  assert_true (v[4] > 0);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_rotation_invariance),
    cmocka_unit_test (test_sign_rule),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
