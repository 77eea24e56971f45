/* bench-point-group.c — benchmark (not a test): point-group detection on
 * clusters of invented geometry, and averaging a Hessian over the group.
 *
 *   bench-point-group [--shells S] [--repeat R]
 *
 * The clusters are cubes of an fcc lattice (argon atoms, invented spacing
 * 1.9 Å) cut at ±S cells: Oh, and the same sites moved at random by up to
 * 0.5 Å (fixed seed): C1, whose search is all failed candidates. Times, best
 * of R (default 3): qv_point_group_detect for S = 3, 5, 7 (171, 665, 1687
 * atoms) and qv_point_group_symmetrize_hessian of a dense Hessian of the
 * 665-atom cube (48 operations). Exits 0 whenever it could run.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "bench-util.h"
#include "qv-point-group.h"

#define BENCH_SEED 0x5E11ULL

static QvStructure *
cube (int shells, gboolean shaken)
{
  guint64 state = BENCH_SEED;
  GArray *p = g_array_new (FALSE, FALSE, sizeof (double));
  for (int i = -shells; i <= shells; i++)
    for (int j = -shells; j <= shells; j++)
      for (int k = -shells; k <= shells; k++)
        if (((i + j + k) & 1) == 0)
          {
            double v[3] = { 1.9 * i, 1.9 * j, 1.9 * k };
            if (shaken)
              for (int q = 0; q < 3; q++)
                v[q] += bench_uniform (&state) - 0.5;
            g_array_append_vals (p, v, 3);
          }
  gsize n = p->len / 3;
  QvStructure *s = qv_structure_new (n, NULL);
  for (gsize a = 0; a < n; a++)
    {
      if (!qv_structure_set_element (s, a, 18, NULL))
        bench_die ("cannot set argon");
      for (int q = 0; q < 3; q++)
        s->atoms[a].position[q] = ((double *) p->data)[3 * a + q] + 0.3;   /* off the origin */
    }
  g_array_free (p, TRUE);
  return s;
}

int
main (int argc, char **argv)
{
  gint64 shells_max = 7, repeat = 3;
  GOptionEntry entries[] = {
    { "shells", 0, 0, G_OPTION_ARG_INT64, &shells_max, "Largest cube half-width in cells (default 7)", "S" },
    { "repeat", 0, 0, G_OPTION_ARG_INT64, &repeat, "Runs per figure, best kept (default 3)", "R" },
    { NULL }
  };
  g_autoptr(GOptionContext) ctx = g_option_context_new (NULL);
  g_autoptr(GError) error = NULL;
  g_set_prgname ("bench-point-group");
  g_option_context_add_main_entries (ctx, entries, NULL);
  if (!g_option_context_parse (ctx, &argc, &argv, &error))
    bench_die ("%s", error->message);
  if (shells_max < 1 || shells_max > 12 || repeat < 1)
    bench_die ("--shells must be 1 to 12 and --repeat at least 1");

  for (int shells = 3; shells <= shells_max; shells += 2)
    for (int shaken = 0; shaken < 2; shaken++)
      {
        g_autoptr(QvStructure) s = cube (shells, shaken);
        double best = G_MAXDOUBLE;
        char name[32] = "";
        for (gint64 r = 0; r < repeat; r++)
          {
            gint64 t0 = g_get_monotonic_time ();
            g_autoptr(QvPointGroup) g = qv_point_group_detect (s, 0, &error);
            double t = (g_get_monotonic_time () - t0) / 1e6;
            if (g == NULL)
              bench_die ("%s", error->message);
            g_strlcpy (name, g->name, sizeof name);
            best = MIN (best, t);
          }
        printf ("detect %5zu atoms (%s): %-3s %8.3f s\n", s->n_atoms, shaken ? "shaken" : "cube  ",
                name, best);
      }

  {
    g_autoptr(QvStructure) s = cube (5, FALSE);
    g_autoptr(QvPointGroup) g = qv_point_group_detect (s, 0, NULL);
    gsize dim = 3 * s->n_atoms;
    g_autoptr(QvHessian) h = qv_hessian_new (dim, TRUE, &error);
    guint64 state = BENCH_SEED;
    double best = G_MAXDOUBLE;
    if (h == NULL || g == NULL)
      bench_die ("no Hessian or group");
    for (gsize i = 0; i < dim; i++)
      for (gsize j = 0; j <= i; j++)
        h->data[i + j * dim] = h->data[j + i * dim] = bench_uniform (&state);
    for (gint64 r = 0; r < repeat; r++)
      {
        gint64 t0 = g_get_monotonic_time ();
        qv_point_group_symmetrize_hessian (g, h);
        best = MIN (best, (g_get_monotonic_time () - t0) / 1e6);
      }
    printf ("symmetrize Hessian %zu×%zu over %s (%zu operations): %.3f s\n", dim, dim, g->name,
            g->order, best);
  }
  return 0;
}
