/* qv-block-layout.c — block-cyclic index arithmetic and the memory model of
 * the distributed solve (docs/cluster.md).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include "qv-block-layout.h"

void
qv_block_layout_grid (guint processes, guint *rows, guint *cols)
{
  guint r = MAX (processes, 1);
  guint best = 1;

  for (guint d = 1; (guint64) d * d <= r; d++)
    if (r % d == 0)
      best = d;
  *rows = best;
  *cols = r / best;
}

gsize
qv_block_layout_local_count (gsize n, gsize block, guint coord, guint processes)
{
  const gsize blocks = n / block;            /* whole blocks */
  gsize count = (blocks / processes) * block;
  const gsize extra = blocks % processes;

  if (coord < extra)
    count += block;
  else if (coord == extra)
    count += n % block;
  return count;
}

gsize
qv_block_layout_global_index (gsize local, gsize block, guint coord, guint processes)
{
  return ((local / block) * processes + coord) * block + local % block;
}

void
qv_block_layout_eigen_workspace (gsize n, gsize block, guint rows, guint cols, guint row,
                                 guint col, gsize vectors, guint64 *lwork, guint64 *liwork)
{
  const guint64 np = qv_block_layout_local_count (n, block, row, rows);
  const guint64 nq = qv_block_layout_local_count (n, block, col, cols);
  /* Both solvers back-transform with PDORMTR, whose own minimum is
   * max(NB(NB−1)/2, (NP + NQ)·NB) + NB²; they hand it less than that when N
   * is small next to NB times the grid (seen with ScaLAPACK 2.2.1: N = 180,
   * NB = 64 on 2 × 2 printed "PDORMTR parameter number 16 had an illegal
   * value" and returned INFO = 0 with wrong vectors). It goes on top. */
  const guint64 ormtr = MAX ((guint64) block * (block - 1) / 2, (np + nq) * block)
                        + (guint64) block * block;

  if (vectors >= n)
    {
      /* pdsyevd: LWORK ≥ max(1 + 6N + 2·NP·NQ, TRILWMIN) + 2N with
       * TRILWMIN = 3N + max(NB·(NP + 1), 3·NB); LIWORK = 7N + 8·NPCOL + 2
       * (the routine's documentation, ScaLAPACK 2.2). */
      const guint64 trilwmin = 3 * (guint64) n + MAX (block * (np + 1), 3 * (guint64) block);
      *lwork = MAX (1 + 6 * (guint64) n + 2 * np * nq, trilwmin) + 2 * (guint64) n + ormtr;
      *liwork = 7 * (guint64) n + 8 * (guint64) cols + 2;
    }
  else
    {
      /* pdsyevr: LWORK ≥ 2 + 5N + max(18·NN, NP0·MQ0 + 2·NB²)
       *                  + (2 + ⌈NEIG/(NPROW·NPCOL)⌉)·NN,
       * NN = max(N, NB, 2), NP0 = NUMROC(N, NB, 0, 0, NPROW),
       * MQ0 = NUMROC(max(NEIG, NB, 2), NB, 0, 0, NPCOL);
       * LIWORK ≥ 12·NN + 2·max(10·NN, 8·NPROW·NPCOL + 4·NN) (the routine's
       * documentation, from memory; the solver takes the larger of this
       * and the routine's own answer). */
      const guint64 p = (guint64) rows * cols;
      const guint64 nn = MAX (MAX ((guint64) n, (guint64) block), 2);
      const guint64 np0 = qv_block_layout_local_count (n, block, 0, rows);
      const guint64 mq0 = qv_block_layout_local_count (MAX (MAX (vectors, block), 2), block, 0, cols);

      *lwork = 2 + 5 * (guint64) n + MAX (18 * nn, np0 * mq0 + 2 * (guint64) block * block)
               + (2 + (vectors + p - 1) / p) * nn + ormtr;
      *liwork = 12 * nn + 2 * MAX (10 * nn, 8 * p + 4 * nn);
    }
}

guint64
qv_block_layout_solve_bytes (gsize n, gsize block, guint rows, guint cols, gsize vectors,
                             guint64 *root_bytes)
{
  /* process (0, 0) holds the most: the first, never short, blocks */
  const guint64 np = qv_block_layout_local_count (n, block, 0, rows);
  const guint64 nq = qv_block_layout_local_count (n, block, 0, cols);
  guint64 lwork, liwork;

  qv_block_layout_eigen_workspace (n, block, rows, cols, 0, 0, vectors, &lwork, &liwork);
  if (root_bytes)
    *root_bytes = (guint64) n * MIN (vectors, n) * sizeof (double);
  /* the Hessian's blocks, the eigenvector blocks, the workspace, and the
   * replicated n × 6 rigid-body basis, KV and row sums */
  return (2 * np * nq + lwork) * sizeof (double) + liwork * sizeof (int)
         + (13 * (guint64) n) * sizeof (double);
}
