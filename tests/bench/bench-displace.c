/* bench-displace.c — benchmark (not a test): writing a scan along one mode
 * of a 1000-atom structure, as `quaver displace --scan` does after the solve.
 *
 *   bench-displace [--atoms N] [--points P] [--repeat R]
 *
 * The structure (carbon, nitrogen, oxygen and hydrogen atoms at invented
 * positions in a box) and its mode set (invented: a few random unit
 * mass-weighted vectors with positive eigenvalues) come from a fixed seed;
 * the solve is benchmarked by bench-solve. Times, best of R (default 3):
 * qv_displace (amplitudes and positions), the extended XYZ text
 * (qv_xyz_format), the manifest, and the atomic writes into a fresh
 * directory (fsync per file), for one multi-frame file and for one file per
 * structure. P must be odd (0 is one of the points): the default 101 is the
 * "100-point scan" of the target (issue 4: <= 1 s). Exits 0 whenever it
 * could run; speed targets are reported, not asserted.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib.h>
#include <glib/gstdio.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "bench-util.h"
#include "qv-displacement.h"
#include "qv-manifest.h"
#include "qv-output-dir.h"
#include "qv-xyz.h"

#define BENCH_SEED 0xD15CULL
#define N_MODES 4

static void
remove_tree (const char *path)
{
  GDir *dir = g_dir_open (path, 0, NULL);
  const char *name;
  if (dir == NULL)
    return;
  while ((name = g_dir_read_name (dir)) != NULL)
    {
      g_autofree char *p = g_build_filename (path, name, NULL);
      g_unlink (p);
    }
  g_dir_close (dir);
  g_rmdir (path);
}

/* One export as the command does it; returns seconds per stage in @t. */
static void
export_once (const QvStructure *s, const QvModeSet *m, guint points, gboolean single,
             const char *target, double t[4])
{
  QvDisplaceRequest r;
  g_autoptr(QvDisplacementSet) set = NULL;
  g_autoptr(QvManifest) man = qv_manifest_new ("displace");
  g_autoptr(QvOutputDir) dir = NULL;
  g_autoptr(GError) error = NULL;
  g_autoptr(GTimer) timer = g_timer_new ();
  g_autofree QvXyzFrame *frames = NULL;
  g_autofree char *json = NULL;
  double t_format = 0, t_write = 0;

  qv_displace_request_init (&r);
  r.kind = QV_DISPLACE_SCAN;
  r.points = points;
  r.unit = QV_AMPLITUDE_MASS_WEIGHTED;
  r.value = 0.5;
  set = qv_displace (s, m, &r, &error);
  if (set == NULL)
    bench_die ("%s", error->message);
  t[0] = g_timer_elapsed (timer, NULL);

  frames = g_new0 (QvXyzFrame, set->n_structures);
  for (gsize i = 0; i < set->n_structures; i++)
    {
      frames[i].style = QV_XYZ_EXTENDED;
      frames[i].positions = set->structures[i].positions;
    }
  dir = qv_output_dir_open (target, FALSE, &error);
  if (dir == NULL)
    bench_die ("%s", error->message);
  for (gsize i = 0; i < (single ? 1 : set->n_structures); i++)
    {
      g_autofree char *name = g_strdup_printf ("scan-%03zu.xyz", i);
      gsize length;
      g_autofree char *text = NULL;
      QvManifestFile *file;

      g_timer_start (timer);
      text = qv_xyz_format (s, frames + i, single ? set->n_structures : 1, &length);
      file = qv_manifest_add_file (man, name, "extxyz", text, length);
      for (gsize f = 0; f < (single ? set->n_structures : 1); f++)
        {
          QvManifestFrame *fr = qv_manifest_file_add_frame (file);
          QvManifestAmplitude a = { .mode = 1, .Q = set->structures[single ? f : i].amplitudes[0].Q };
          qv_manifest_frame_add_amplitude (fr, &a);
        }
      t_format += g_timer_elapsed (timer, NULL);
      g_timer_start (timer);
      if (!qv_output_dir_write (dir, name, text, length, &error))
        bench_die ("%s", error->message);
      t_write += g_timer_elapsed (timer, NULL);
    }
  g_timer_start (timer);
  json = qv_manifest_to_json (man);
  if (!qv_output_dir_write (dir, "manifest.json", json, strlen (json), &error))
    bench_die ("%s", error->message);
  t[2] = g_timer_elapsed (timer, NULL);
  t[1] = t_format;
  t[3] = t_write;
}

int
main (int argc, char **argv)
{
  gint64 atoms = 1000, points = 101, repeat = 3;
  GOptionEntry entries[] = {
    { "atoms", 0, 0, G_OPTION_ARG_INT64, &atoms, "Atoms (default 1000)", "N" },
    { "points", 0, 0, G_OPTION_ARG_INT64, &points, "Scan points, odd (default 101)", "P" },
    { "repeat", 0, 0, G_OPTION_ARG_INT64, &repeat, "Rounds, best counts (default 3)", "R" },
    { NULL }
  };
  g_autoptr(GOptionContext) context = g_option_context_new (NULL);
  g_autoptr(GError) error = NULL;
  g_autoptr(QvStructure) s = NULL;
  g_autoptr(QvModeSet) m = NULL;
  g_autofree char *tmp = NULL;
  static const guint elements[] = { 6, 7, 8, 1 };
  guint64 state = BENCH_SEED;
  double *values, *vectors;

  g_set_prgname ("bench-displace");
  g_option_context_add_main_entries (context, entries, NULL);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    bench_die ("%s", error->message);
  if (atoms < 1 || points < 3 || points % 2 == 0 || repeat < 1)
    bench_die ("--atoms >= 1, --points odd >= 3, --repeat >= 1");

  s = qv_structure_new ((gsize) atoms, &error);
  for (gsize a = 0; a < (gsize) atoms; a++)
    {
      qv_structure_set_element (s, a, elements[(gsize) (4 * bench_uniform (&state)) % 4], NULL);
      for (int k = 0; k < 3; k++)
        s->atoms[a].position[k] = 30.0 * bench_uniform (&state) - 15.0;
    }
  values = g_new (double, N_MODES);
  vectors = g_new (double, 3 * (gsize) atoms * N_MODES);
  for (gsize k = 0; k < N_MODES; k++)
    {
      double norm = 0;
      values[k] = 0.01 * (double) (k + 1);
      for (gsize c = 0; c < 3 * (gsize) atoms; c++)
        {
          double v = 2.0 * bench_uniform (&state) - 1.0;
          vectors[c + k * 3 * (gsize) atoms] = v;
          norm += v * v;
        }
      for (gsize c = 0; c < 3 * (gsize) atoms; c++)
        vectors[c + k * 3 * (gsize) atoms] /= sqrt (norm);
    }
  {
    g_autofree double *masses = qv_structure_masses (s);
    m = qv_mode_set_new ((gsize) atoms, masses, N_MODES, values, vectors);
  }

  tmp = g_dir_make_tmp ("qv-bench-displace-XXXXXX", &error);
  if (tmp == NULL)
    bench_die ("%s", error->message);
  printf ("bench-displace: %" G_GINT64_FORMAT " atoms, a %" G_GINT64_FORMAT "-point scan, best of %"
          G_GINT64_FORMAT " (temporary directory %s)\n", atoms, points, repeat, tmp);
  for (int single = 1; single >= 0; single--)
    {
      double best[4] = { INFINITY, INFINITY, INFINITY, INFINITY }, best_total = INFINITY;
      for (gint64 r = 0; r < repeat; r++)
        {
          g_autofree char *target = g_build_filename (tmp, single ? "single" : "files", NULL);
          double t[4], total;
          export_once (s, m, (guint) points, single, target, t);
          total = t[0] + t[1] + t[2] + t[3];
          for (int i = 0; i < 4; i++)
            best[i] = MIN (best[i], t[i]);
          best_total = MIN (best_total, total);
          remove_tree (target);
        }
      printf ("  %-26s total %.3f s (target <= 1 s): displace %.3f, XYZ text %.3f, "
              "manifest %.3f, atomic writes %.3f\n",
              single ? "one multi-frame file:" : "one file per structure:", best_total,
              best[0], best[1], best[2], best[3]);
    }
  g_rmdir (tmp);
  return 0;
}
