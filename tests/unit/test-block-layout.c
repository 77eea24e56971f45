/* test-block-layout.c — the block-cyclic layout arithmetic (qv-block-layout.h)
 * against dealing the blocks out one by one, as the ScaLAPACK Users' Guide
 * (Blackford et al., SIAM 1997, §4.3) describes the layout; the grid shapes;
 * and the memory model's pdsyevd workspace against its documented formula
 * evaluated by hand.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <glib.h>
#include "qv-block-layout.h"

/* Deals global index g to process (g / block) mod processes. */
static void
test_dealing (void **state)
{
  (void) state;
  for (gsize n = 1; n <= 200; n += 7)
    for (gsize block = 1; block <= 70; block += 3)
      for (guint processes = 1; processes <= 7; processes++)
        {
          gsize total = 0;
          for (guint p = 0; p < processes; p++)
            {
              const gsize count = qv_block_layout_local_count (n, block, p, processes);
              gsize local = 0;
              for (gsize g = 0; g < n; g++)
                if ((g / block) % processes == p)
                  {
                    /* the l-th index this process holds is g */
                    assert_int_equal (qv_block_layout_global_index (local, block, p, processes), g);
                    local++;
                  }
              assert_int_equal (count, local);
              total += count;
            }
          assert_int_equal (total, n);
        }
}

static void
test_grid (void **state)
{
  static const guint cases[][3] = {
    { 1, 1, 1 }, { 2, 1, 2 }, { 3, 1, 3 }, { 4, 2, 2 }, { 6, 2, 3 }, { 8, 2, 4 },
    { 12, 3, 4 }, { 16, 4, 4 }, { 64, 8, 8 }, { 256, 16, 16 }, { 7, 1, 7 }, { 18, 3, 6 },
  };
  (void) state;
  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      guint rows, cols;
      qv_block_layout_grid (cases[i][0], &rows, &cols);
      assert_int_equal (rows, cases[i][1]);
      assert_int_equal (cols, cases[i][2]);
    }
}

/* n = 4500, NB = 64 on 2 × 2: 70 whole blocks split 35/35 and the short
 * 20-row block goes to process 0, so NP = NQ = 35·64 + 20 = 2260 (worked by
 * hand); the workspace from pdsyevd's documented formula. */
static void
test_workspace (void **state)
{
  guint64 lwork, liwork;
  const guint64 np = 2260, n = 4500, nb = 64;
  (void) state;
  assert_int_equal (qv_block_layout_local_count (4500, 64, 0, 2), np);
  assert_int_equal (qv_block_layout_local_count (4500, 64, 1, 2), 4500 - np);
  qv_block_layout_eigen_workspace (4500, 64, 2, 2, 0, 0, 4500, &lwork, &liwork);
  /* max(1 + 6N + 2·NP·NQ, 3N + max(NB(NP+1), 3NB)) + 2N, plus PDORMTR's
   * max(NB(NB−1)/2, (NP+NQ)·NB) + NB² */
  assert_int_equal (lwork, (1 + 6 * n + 2 * np * np) + 2 * n + (2 * np * nb + nb * nb));
  assert_int_equal (liwork, 7 * n + 8 * 2 + 2);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_dealing),
    cmocka_unit_test (test_grid),
    cmocka_unit_test (test_workspace),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
