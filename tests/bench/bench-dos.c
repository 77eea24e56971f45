/* bench-dos.c — the phonon DOS on a dense mesh: an invented 8-atom cell
 * (the rock-salt conventional cube, nearest- and next-nearest-neighbour
 * springs of our own), force constants from its 2×2×2 supercell, DOS by
 * linear tetrahedra with the partial DOS per element on an N×N×N mesh
 * (default 40, the issue's target: ≤ 10 s on 2 cores). Reports the time of
 * the solve-and-accumulate call and of the tetrahedra alone; never fails
 * on a figure.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "bench-util.h"
#include "lattice-model.h"
#include "qv-phonon-dos.h"
#include "qv-phonon-mesh.h"
#include "qv-supercell.h"

int
main (int argc, char **argv)
{
  gint64 n = 40, threads = 2, repeat = 1;
  gboolean gaussian = FALSE;
  g_autoptr(GOptionContext) ctx = g_option_context_new (NULL);
  g_autoptr(GError) error = NULL;
  GOptionEntry entries[] = {
    { "mesh", 0, 0, G_OPTION_ARG_INT64, &n, "N for an NxNxN mesh (default 40)", "N" },
    { "threads", 0, 0, G_OPTION_ARG_INT64, &threads, "Worker threads (default 2)", "T" },
    { "repeat", 0, 0, G_OPTION_ARG_INT64, &repeat, "Rounds (best is reported)", "R" },
    { "gaussian", 0, 0, G_OPTION_ARG_NONE, &gaussian, "Gaussian smearing (3 cm^-1) instead of tetrahedra", NULL },
    { NULL }
  };
  const double a = 5.6;
  double cell[3][3] = { { a, 0, 0 }, { 0, a, 0 }, { 0, 0, a } };
  double r[24];
  guint z[8];
  double m[8];
  int sc[3][3] = { { 2, 0, 0 }, { 0, 2, 0 }, { 0, 0, 2 } };
  LatticeShell shells[3] = {
    { a / 2, 2.0, 0.2, 0, 0 },
    { a / sqrt (2), 0.5, 0.05, 11, 11 },
    { a / sqrt (2), 0.3, 0.02, 17, 17 },
  };
  static const double f[4][3] = { { 0, 0, 0 }, { 0, .5, .5 }, { .5, 0, .5 }, { .5, .5, 0 } };
  g_autoptr(QvStructure) p = NULL;
  g_autoptr(QvStructure) s = NULL;
  g_autoptr(QvHessian) h = NULL;
  g_autoptr(QvSupercellMap) map = NULL;
  g_autoptr(QvForceConstants) fc = NULL;
  g_autoptr(QvPhononMesh) mesh = NULL;
  double best = G_MAXDOUBLE;
  int nn[3];

  g_set_prgname ("bench-dos");
  g_option_context_add_main_entries (ctx, entries, NULL);
  if (!g_option_context_parse (ctx, &argc, &argv, &error))
    bench_die ("%s", error->message);
  if (n < 1 || n > 200 || threads < 0 || repeat < 1)
    bench_die ("--mesh 1..200, --threads >= 0, --repeat >= 1");
  for (int i = 0; i < 4; i++)
    for (int k = 0; k < 2; k++)
      {
        int at = 2 * i + k;
        for (int x = 0; x < 3; x++)
          r[3 * at + x] = (f[i][x] + (k ? 0.5 : 0)) * a;
        z[at] = k ? 17 : 11;
        m[at] = k ? 35.453 : 22.98977;
      }
  /* keep the Cl sites inside the cube */
  for (int i = 0; i < 24; i++)
    r[i] = fmod (r[i], a);
  p = lattice_model_structure (cell, 8, z, m, r);
  s = qv_supercell_build (p, sc, &error);
  if (s == NULL)
    bench_die ("%s", error->message);
  h = lattice_model_hessian (s, shells, 3);
  map = qv_supercell_map (p, s, 0, &error);
  if (map == NULL)
    bench_die ("%s", error->message);
  fc = qv_force_constants_new (map, h, &error);
  if (fc == NULL)
    bench_die ("%s", error->message);
  qv_force_constants_apply_sum_rule (fc, NULL);
  nn[0] = nn[1] = nn[2] = (int) n;
  mesh = qv_phonon_mesh_new (nn, &error);
  if (mesh == NULL)
    bench_die ("%s", error->message);

  printf ("bench-dos: 8-atom cell, %dx%dx%d mesh (%" G_GSIZE_FORMAT " q, 24 branches), %d threads\n",
          nn[0], nn[1], nn[2], mesh->n_q, (int) threads);
  for (gint64 round = 0; round < repeat; round++)
    {
      QvDosOptions opt = { gaussian ? QV_DOS_GAUSSIAN : QV_DOS_TETRAHEDRON, 3.0, 1.0, 0, 0 };
      gint64 t0 = g_get_monotonic_time ();
      g_autoptr(QvPhononDos) dos = qv_phonon_dos_from_force_constants (fc, map->z, mesh, &opt,
                                                                       (guint) threads, NULL, &error);
      double secs = (g_get_monotonic_time () - t0) / 1e6, sum = 0;
      if (dos == NULL)
        bench_die ("%s", error->message);
      for (gsize b = 0; b < dos->n_points; b++)
        sum += dos->total[b] * dos->step;
      printf ("round %d: DOS (%s, partial per element) %.3f s; %" G_GSIZE_FORMAT
              " grid points, integral %.8f (3n = 24)\n", (int) round + 1, qv_dos_method_name (opt.method), secs, dos->n_points, sum);
      best = MIN (best, secs);
    }
  printf ("best: %.3f s (target <= 10 s on 2 cores)\n", best);
  return 0;
}
