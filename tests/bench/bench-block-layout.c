/* bench-block-layout.c — the memory model of the distributed solve
 * (qv_block_layout_solve_bytes): bytes on the busiest rank and on rank 0
 * for chosen atom counts and rank counts, printed as a Markdown table for
 * docs/cluster.md and docs/performance.md. A model, not a measurement:
 * bench_distributed.py sets it beside the peak memory it measures.
 *
 *   bench-block-layout [--block NB] [--lowest K] N_ATOMS... -- P...
 *
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "qv-block-layout.h"

int
main (int argc, char **argv)
{
  gsize block = QV_BLOCK_LAYOUT_DEFAULT_BLOCK, lowest = 0;
  GArray *atoms = g_array_new (FALSE, FALSE, sizeof (gsize));
  GArray *ranks = g_array_new (FALSE, FALSE, sizeof (guint));
  gboolean after = FALSE;

  for (int i = 1; i < argc; i++)
    {
      if (strcmp (argv[i], "--block") == 0 && i + 1 < argc)
        block = (gsize) strtoull (argv[++i], NULL, 10);
      else if (strcmp (argv[i], "--lowest") == 0 && i + 1 < argc)
        lowest = (gsize) strtoull (argv[++i], NULL, 10);
      else if (strcmp (argv[i], "--") == 0)
        after = TRUE;
      else if (after)
        {
          guint p = (guint) strtoul (argv[i], NULL, 10);
          g_array_append_val (ranks, p);
        }
      else
        {
          gsize n = (gsize) strtoull (argv[i], NULL, 10);
          g_array_append_val (atoms, n);
        }
    }
  if (atoms->len == 0 || ranks->len == 0 || block == 0)
    {
      fprintf (stderr, "usage: bench-block-layout [--block NB] [--lowest K] N_ATOMS... -- P...\n");
      return 1;
    }
  printf ("| atoms | 3N | modes | P | grid | busiest rank GiB | rank 0 receives GiB |\n");
  printf ("| ---: | ---: | ---: | ---: | :---: | ---: | ---: |\n");
  for (guint a = 0; a < atoms->len; a++)
    for (guint r = 0; r < ranks->len; r++)
      {
        const gsize n = 3 * g_array_index (atoms, gsize, a);
        const guint p = g_array_index (ranks, guint, r);
        const gsize vectors = lowest > 0 && lowest < n ? lowest : n;
        guint rows, cols;
        guint64 root = 0, bytes;
        char modes[32];

        qv_block_layout_grid (p, &rows, &cols);
        bytes = qv_block_layout_solve_bytes (n, block, rows, cols, vectors, &root);
        if (vectors >= n)
          g_strlcpy (modes, "all", sizeof modes);
        else
          g_snprintf (modes, sizeof modes, "%zu", vectors);
        printf ("| %zu | %zu | %s | %u | %u × %u | %.3f | %.3f |\n", n / 3, n, modes, p, rows, cols,
                (double) bytes / 1073741824.0, (double) root / 1073741824.0);
      }
  g_array_free (atoms, TRUE);
  g_array_free (ranks, TRUE);
  return 0;
}
