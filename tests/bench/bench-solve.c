/* bench-solve.c — benchmark (not a test): times the normal-mode solver on a
 * reproducible system of N atoms (default 1000, i.e. a 3000×3000 Hessian).
 *
 * The system is invented for the benchmark: atoms on a jittered simple cubic
 * lattice (spacing 1.6 Å, jitter ±0.3 Å per coordinate) with an organic-like
 * composition (H 50 %, C 32 %, N 8 %, O 9 %, S 1 %), every pair of atoms
 * joined by a spring at its rest length with a force constant that falls off
 * as r⁻⁶ at long range, k(r) = K0 / (1 + (r/R0)⁶), K0 = 15 eV/Å², R0 = 1.6 Å.
 * The analytic Hessian of such a network (an elastic network model) is
 *   H_ab = −k uuᵀ (a ≠ b),   H_aa = Σ_b k uuᵀ,   u = (r_b − r_a)/|r_b − r_a|,
 * dense (every element non-zero, as from an electronic-structure code),
 * exactly symmetric, positive semi-definite, with exact rigid-body zero modes.
 * Fixed seed (splitmix64), so every run and every machine sees the same
 * matrix.
 *
 * Prints: generation time; the preparation stages timed one by one
 * (symmetrize, mass weight, rigid-body projection); LAPACKE_dsyevd alone on
 * the prepared matrix (the routine numpy.linalg.eigh calls) and, with
 * --lapack-stages, the steps inside it and inside dsyevr; the whole
 * qv_solve for all modes and with lowest = K, best of R runs each, with the
 * time of every stage of the best run taken from the solver's progress
 * reports. --json adds one JSON line for scripts (compare.py). --write DIR
 * writes DIR/bench-N.xyz and DIR/bench-N.npy (row-major float64) so other
 * programs can use the same system.
 *
 * Speed targets live in the issue and are reported, never asserted here: the
 * program exits 0 whenever it could run.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <cblas.h>
#include <lapacke.h>
#include <glib.h>
#include <glib/gstdio.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "bench-util.h"
#include "qv-element.h"
#include "qv-hessian.h"
#include "qv-rigid-body.h"
#include "qv-solver.h"
#include "qv-structure.h"
#include "qv-units.h"

#define BENCH_SEED 0x51A7E5ULL
#define BENCH_SPACING 1.6
#define BENCH_JITTER 0.3
#define BENCH_K0 15.0
#define BENCH_R0 1.6
#define MAX_STAGES 16


static double
seconds_since (gint64 start)
{
  return (double) (g_get_monotonic_time () - start) * 1e-6;
}

static guint
draw_element (guint64 *state)
{
  const double u = bench_uniform (state);
  return u < 0.50 ? 1 : u < 0.82 ? 6 : u < 0.90 ? 7 : u < 0.99 ? 8 : 16;
}

/* The system of the header comment. */
static QvStructure *
bench_system_new (gsize n_atoms, QvHessian **hessian_out)
{
  g_autoptr(GError) error = NULL;
  QvStructure *s = qv_structure_new (n_atoms, &error);
  QvHessian *h;
  const gsize n = 3 * n_atoms;
  guint64 state = BENCH_SEED;
  gsize side = 1;

  if (s == NULL)
    bench_die ("%s", error->message);
  h = qv_hessian_new (n, TRUE, &error);
  if (h == NULL)
    bench_die ("%s", error->message);
  while (side * side * side < n_atoms)
    side++;
  for (gsize a = 0; a < n_atoms; a++)
    {
      const gsize cell[3] = { a % side, (a / side) % side, a / (side * side) };
      for (int c = 0; c < 3; c++)
        s->atoms[a].position[c] = BENCH_SPACING * (double) cell[c]
                                  + BENCH_JITTER * (2.0 * bench_uniform (&state) - 1.0);
      if (!qv_structure_set_element (s, a, draw_element (&state), &error))
        bench_die ("%s", error->message);
    }

  /* Column-major; the blocks are symmetric, so is the matrix. */
  for (gsize a = 0; a < n_atoms; a++)
    for (gsize b = a + 1; b < n_atoms; b++)
      {
        const double *pa = s->atoms[a].position, *pb = s->atoms[b].position;
        const double dx = pb[0] - pa[0], dy = pb[1] - pa[1], dz = pb[2] - pa[2];
        const double d2 = dx * dx + dy * dy + dz * dz;
        const double d = sqrt (d2);
        const double x = d2 / (BENCH_R0 * BENCH_R0);
        const double k = BENCH_K0 / (1.0 + x * x * x);
        const double u[3] = { dx / d, dy / d, dz / d };
        double blk[3][3];
        /* One product per pair (i ≤ j), mirrored: exactly symmetric. */
        for (int i = 0; i < 3; i++)
          for (int j = i; j < 3; j++)
            blk[i][j] = blk[j][i] = k * u[i] * u[j];
        for (int i = 0; i < 3; i++)
          for (int j = 0; j < 3; j++)
            {
              h->data[(3 * a + i) + (3 * a + j) * n] += blk[i][j];
              h->data[(3 * b + i) + (3 * b + j) * n] += blk[i][j];
              h->data[(3 * a + i) + (3 * b + j) * n] = -blk[i][j];
              h->data[(3 * b + i) + (3 * a + j) * n] = -blk[i][j];
            }
      }
  h->layout = QV_HESSIAN_LAYOUT_NPY;
  *hessian_out = h;
  return s;
}

static void
write_system (const char *dir, const QvStructure *s, const QvHessian *h)
{
  g_autoptr(GError) error = NULL;
  g_autofree char *stem = g_strdup_printf ("bench-%" G_GSIZE_FORMAT, s->n_atoms);
  g_autofree char *xyz_path = g_strdup_printf ("%s/%s.xyz", dir, stem);
  g_autofree char *npy_path = g_strdup_printf ("%s/%s.npy", dir, stem);
  GString *xyz = g_string_new (NULL);
  GString *header = g_string_new (NULL);
  char buf[3][G_ASCII_DTOSTR_BUF_SIZE];
  FILE *f;

  g_mkdir_with_parents (dir, 0755);
  g_string_append_printf (xyz, "%" G_GSIZE_FORMAT "\nbench-solve system (invented), "
                          "%" G_GSIZE_FORMAT " atoms, seed %#llx\n",
                          s->n_atoms, s->n_atoms, (unsigned long long) BENCH_SEED);
  for (gsize a = 0; a < s->n_atoms; a++)
    {
      for (int c = 0; c < 3; c++)
        g_ascii_formatd (buf[c], sizeof buf[c], "%.17g", s->atoms[a].position[c]);
      g_string_append_printf (xyz, "%-2s %s %s %s\n", qv_element_from_z (s->atoms[a].z)->symbol,
                              buf[0], buf[1], buf[2]);
    }
  if (!g_file_set_contents (xyz_path, xyz->str, (gssize) xyz->len, &error))
    bench_die ("%s", error->message);
  g_string_free (xyz, TRUE);

  /* .npy version 1.0: magic, header length, a dict padded to 64 bytes. */
  g_string_append_printf (header, "{'descr': '<f8', 'fortran_order': False, 'shape': (%"
                          G_GSIZE_FORMAT ", %" G_GSIZE_FORMAT "), }", h->n, h->n);
  while ((10 + header->len + 1) % 64 != 0)
    g_string_append_c (header, ' ');
  g_string_append_c (header, '\n');
  f = fopen (npy_path, "wb");
  if (f == NULL)
    bench_die ("cannot write %s", npy_path);
  {
    const unsigned char magic[8] = { 0x93, 'N', 'U', 'M', 'P', 'Y', 1, 0 };
    const unsigned char len[2] = { header->len & 0xff, header->len >> 8 };
    /* The matrix is exactly symmetric: column-major equals row-major. */
    if (fwrite (magic, 1, 8, f) != 8 || fwrite (len, 1, 2, f) != 2
        || fwrite (header->str, 1, header->len, f) != header->len
        || fwrite (h->data, sizeof (double), h->n * h->n, f) != h->n * h->n
        || fclose (f) != 0)
      bench_die ("cannot write %s", npy_path);
  }
  g_string_free (header, TRUE);
  printf ("wrote %s and %s\n", xyz_path, npy_path);
}

/* Stage times of one qv_solve call, from its progress reports. */
typedef struct {
  gsize count;
  const char *stage[MAX_STAGES];
  gint64 at[MAX_STAGES];
} StageClock;

static gboolean
stage_clock_tick (double fraction, const char *stage, gpointer user_data)
{
  StageClock *clock = user_data;
  if (clock->count < MAX_STAGES)
    {
      clock->stage[clock->count] = stage;
      clock->at[clock->count] = g_get_monotonic_time ();
      clock->count++;
    }
  return TRUE;
}

typedef struct {
  double best, worst;
  StageClock clock;           /* of the best run */
  gint64 start, end;          /* of the best run */
  double min_wavenumber, max_wavenumber;
  double max_residual;
  gsize n_modes;
} SolveTiming;

static void
time_solve (const QvStructure *s, const QvHessian *h, gsize lowest, guint repeat,
            SolveTiming *t)
{
  memset (t, 0, sizeof *t);
  t->best = G_MAXDOUBLE;
  for (guint r = 0; r < repeat; r++)
    {
      g_autoptr(GError) error = NULL;
      QvHessian *copy = qv_hessian_copy (h, &error);
      QvSolveOptions options;
      StageClock clock = { 0 };
      QvProgress progress = { stage_clock_tick, &clock };
      QvModeSet *modes;
      gint64 start, end;

      if (copy == NULL)
        bench_die ("%s", error->message);
      qv_solve_options_init (&options);
      options.lowest = lowest;
      start = g_get_monotonic_time ();
      modes = qv_solve (s, copy, &options, &progress, &error);
      end = g_get_monotonic_time ();
      if (modes == NULL)
        bench_die ("qv_solve: %s", error->message);
      if ((end - start) * 1e-6 < t->best)
        {
          t->best = (end - start) * 1e-6;
          t->clock = clock;
          t->start = start;
          t->end = end;
        }
      t->worst = MAX (t->worst, (end - start) * 1e-6);
      t->n_modes = modes->n_modes;
      t->min_wavenumber = qv_mode_set_wavenumber (modes, 0);
      t->max_wavenumber = qv_mode_set_wavenumber (modes, modes->n_modes - 1);
      t->max_residual = qv_mode_set_max_residual (modes);
      qv_mode_set_free (modes);
    }
}

static void
print_stages (const char *title, const SolveTiming *t)
{
  printf ("  %s, stages of the best run (from the progress reports):\n", title);
  for (gsize i = 0; i < t->clock.count; i++)
    {
      const gint64 from = t->clock.at[i];
      const gint64 to = i + 1 < t->clock.count ? t->clock.at[i + 1] : t->end;
      printf ("    %-30s %8.3f s\n", t->clock.stage[i], (to - from) * 1e-6);
    }
  if (t->clock.count > 0)
    printf ("    %-30s %8.3f s\n", "(before the first report)", (t->clock.at[0] - t->start) * 1e-6);
}

static void
json_stages (GString *out, const char *key, const SolveTiming *t)
{
  g_string_append_printf (out, ", \"%s\": {\"best_s\": %.6f, \"worst_s\": %.6f, \"n_modes\": %"
                          G_GSIZE_FORMAT ", \"min_cm1\": %.6f, \"max_cm1\": %.6f, "
                          "\"max_residual_cm1\": %.6g, \"stages\": [",
                          key, t->best, t->worst, t->n_modes, t->min_wavenumber,
                          t->max_wavenumber, t->max_residual);
  for (gsize i = 0; i < t->clock.count; i++)
    {
      const gint64 to = i + 1 < t->clock.count ? t->clock.at[i + 1] : t->end;
      g_string_append_printf (out, "%s[\"%s\", %.6f]", i ? ", " : "", t->clock.stage[i],
                              (to - t->clock.at[i]) * 1e-6);
    }
  g_string_append (out, "]}");
}

int
main (int argc, char **argv)
{
  gint64 n_atoms = 1000, repeat = 3, lowest = 20;
  gboolean json = FALSE, skip_lapack = FALSE, lapack_stages = FALSE;
  char *write_dir = NULL;
  GOptionEntry entries[] = {
    { "atoms", 'n', 0, G_OPTION_ARG_INT64, &n_atoms, "Number of atoms (default 1000)", "N" },
    { "repeat", 'r', 0, G_OPTION_ARG_INT64, &repeat, "Runs of each solve; the best counts (default 3)", "R" },
    { "lowest", 'k', 0, G_OPTION_ARG_INT64, &lowest, "Modes of the range solve (default 20)", "K" },
    { "no-lapack", 0, 0, G_OPTION_ARG_NONE, &skip_lapack, "Skip timing dsyevd alone", NULL },
    { "lapack-stages", 0, 0, G_OPTION_ARG_NONE, &lapack_stages,
      "Also time the steps inside dsyevd and dsyevr (dsytrd, dstedc, dstemr, dormtr)", NULL },
    { "json", 0, 0, G_OPTION_ARG_NONE, &json, "Also print one JSON line of the figures", NULL },
    { "write", 'w', 0, G_OPTION_ARG_FILENAME, &write_dir,
      "Write DIR/bench-N.xyz and DIR/bench-N.npy, then exit", "DIR" },
    { NULL }
  };
  g_autoptr(GOptionContext) context = g_option_context_new ("[N] — time the normal-mode solver");
  g_autoptr(GError) error = NULL;
  g_autoptr(QvStructure) s = NULL;
  g_autoptr(QvHessian) h = NULL;
  g_autoptr(QvHessian) k = NULL;
  g_autoptr(QvRigidBody) rb = NULL;
  g_autofree double *masses = NULL;
  g_autofree double *positions = NULL;
  g_autofree double *w = NULL;
  SolveTiming full, part;
  double t_gen, t_sym, t_mass, t_rb, t_proj, t_lapack = 0.0;
  double translations[3], rotations[3];
  double t_trd = -1, t_stedc = -1, t_ormtr_all = -1, t_stemr = -1, t_ormtr_m = -1;
  const char *threads_env = g_getenv ("OPENBLAS_NUM_THREADS");
  gint64 start;
  gsize n;

  g_option_context_add_main_entries (context, entries, NULL);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    {
      g_printerr ("bench-solve: %s\n", error->message);
      return 1;
    }
  if (argc > 1)
    n_atoms = g_ascii_strtoll (argv[1], NULL, 10);
  if (n_atoms < 3 || n_atoms > 20000 || repeat < 1 || repeat > 100 || lowest < 1)
    {
      g_printerr ("bench-solve: need 3 ≤ N ≤ 20000 atoms, 1 ≤ R ≤ 100 runs, K ≥ 1\n");
      return 1;
    }
  n = 3 * (gsize) n_atoms;

  start = g_get_monotonic_time ();
  s = bench_system_new ((gsize) n_atoms, &h);
  t_gen = seconds_since (start);
  if (write_dir)
    {
      write_system (write_dir, s, h);
      g_free (write_dir);
      return 0;
    }

  printf ("bench-solve: %" G_GINT64_FORMAT " atoms (%" G_GSIZE_FORMAT "×%" G_GSIZE_FORMAT
          " Hessian, %.1f MiB), OpenBLAS %s, %d thread(s) (OPENBLAS_NUM_THREADS=%s), best of %"
          G_GINT64_FORMAT "\n", n_atoms, n, n, (double) n * n * 8 / 1048576.0,
          openblas_get_config (), openblas_get_num_threads (),
          threads_env ? threads_env : "unset", repeat);
  printf ("  %-32s %8.3f s\n", "generate the system", t_gen);

  /* The preparation stages one by one, on a copy, as qv_solve does them. */
  k = qv_hessian_copy (h, &error);
  if (k == NULL)
    bench_die ("%s", error->message);
  masses = qv_structure_masses (s);
  positions = g_new (double, n);
  for (gsize a = 0; a < (gsize) n_atoms; a++)
    memcpy (positions + 3 * a, s->atoms[a].position, sizeof (double) * 3);
  start = g_get_monotonic_time ();
  qv_hessian_symmetrize (k);
  t_sym = seconds_since (start);
  start = g_get_monotonic_time ();
  qv_solver_mass_weight (k->data, (gsize) n_atoms, masses);
  t_mass = seconds_since (start);
  start = g_get_monotonic_time ();
  rb = qv_rigid_body_new ((gsize) n_atoms, positions, masses, QV_PROJECTION_FULL);
  t_rb = seconds_since (start);
  start = g_get_monotonic_time ();
  qv_rigid_body_project_with_residuals (rb, k->data, translations, rotations);
  t_proj = seconds_since (start);
  printf ("  %-32s %8.3f s\n", "symmetrize", t_sym);
  printf ("  %-32s %8.3f s\n", "mass weight", t_mass);
  printf ("  %-32s %8.3f s\n", "rigid-body basis", t_rb);
  printf ("  %-32s %8.3f s\n", "projection (dsymm + dsyr2k)", t_proj);
  printf ("  %-32s %8.3f s\n", "preparation, total", t_sym + t_mass + t_rb + t_proj);

  /* LAPACKE_dsyevd alone, the routine numpy.linalg.eigh calls. */
  if (!skip_lapack)
    {
      t_lapack = G_MAXDOUBLE;
      w = g_new (double, n);
      for (gint64 r = 0; r < repeat; r++)
        {
          g_autoptr(QvHessian) a = qv_hessian_copy (k, &error);
          lapack_int info;
          if (a == NULL)
            bench_die ("%s", error->message);
          start = g_get_monotonic_time ();
          info = LAPACKE_dsyevd (LAPACK_COL_MAJOR, 'V', 'L', (lapack_int) n, a->data,
                                 (lapack_int) n, w);
          t_lapack = MIN (t_lapack, seconds_since (start));
          if (info != 0)
            bench_die ("dsyevd: INFO = %d", (int) info);
        }
      printf ("  %-32s %8.3f s\n", "LAPACKE_dsyevd alone (best)", t_lapack);
    }

  /* Inside the LAPACK drivers: the reduction to tridiagonal form that both
   * dsyevd and dsyevr start with, then what each does after it. */
  if (lapack_stages)
    {
      g_autoptr(QvHessian) a = qv_hessian_copy (k, &error);
      g_autofree double *d = g_new (double, n);
      g_autofree double *e = g_new (double, n);
      g_autofree double *tau = g_new (double, n);
      g_autofree double *d2 = g_new (double, n);
      g_autofree double *e2 = g_new (double, n);
      g_autofree double *wr = g_new (double, n);
      g_autofree double *zl = NULL;
      g_autofree lapack_int *isuppz = g_new (lapack_int, 2 * n);
      g_autoptr(QvHessian) zf = qv_hessian_new (n, FALSE, &error);
      const lapack_int m = (lapack_int) MIN ((gsize) lowest + 8, n);
      lapack_int found = 0;
      lapack_logical tryrac = 1;

      if (a == NULL || zf == NULL)
        bench_die ("%s", error->message);
      zl = g_new (double, n * (gsize) m);
      start = g_get_monotonic_time ();
      if (LAPACKE_dsytrd (LAPACK_COL_MAJOR, 'L', (lapack_int) n, a->data, (lapack_int) n, d, e, tau) != 0)
        bench_die ("dsytrd failed");
      t_trd = seconds_since (start);
      memcpy (d2, d, sizeof (double) * n);
      memcpy (e2, e, sizeof (double) * n);
      start = g_get_monotonic_time ();
      if (LAPACKE_dstedc (LAPACK_COL_MAJOR, 'I', (lapack_int) n, d2, e2, zf->data, (lapack_int) n) != 0)
        bench_die ("dstedc failed");
      t_stedc = seconds_since (start);
      start = g_get_monotonic_time ();
      if (LAPACKE_dormtr (LAPACK_COL_MAJOR, 'L', 'L', 'N', (lapack_int) n, (lapack_int) n, a->data,
                          (lapack_int) n, tau, zf->data, (lapack_int) n) != 0)
        bench_die ("dormtr failed");
      t_ormtr_all = seconds_since (start);
      memcpy (d2, d, sizeof (double) * n);
      memcpy (e2, e, sizeof (double) * n);
      start = g_get_monotonic_time ();
      if (LAPACKE_dstemr (LAPACK_COL_MAJOR, 'V', 'I', (lapack_int) n, d2, e2, 0.0, 0.0, 1, m, &found,
                          wr, zl, (lapack_int) n, m, isuppz, &tryrac) != 0)
        bench_die ("dstemr failed");
      t_stemr = seconds_since (start);
      start = g_get_monotonic_time ();
      if (LAPACKE_dormtr (LAPACK_COL_MAJOR, 'L', 'L', 'N', (lapack_int) n, m, a->data, (lapack_int) n,
                          tau, zl, (lapack_int) n) != 0)
        bench_die ("dormtr failed");
      t_ormtr_m = seconds_since (start);
      printf ("  inside the drivers (one run each):\n");
      printf ("    %-40s %8.3f s\n", "dsytrd (reduction to tridiagonal)", t_trd);
      printf ("    %-40s %8.3f s\n", "dstedc, all (dsyevd's next step)", t_stedc);
      printf ("    %-40s %8.3f s\n", "dormtr, all vectors (dsyevd's last)", t_ormtr_all);
      printf ("    %-34s %5d %8.3f s\n", "dstemr, lowest (dsyevr's next step)", (int) m, t_stemr);
      printf ("    %-34s %5d %8.3f s\n", "dormtr, vectors (dsyevr's last)", (int) m, t_ormtr_m);
    }

  time_solve (s, h, 0, (guint) repeat, &full);
  printf ("  %-32s %8.3f s (worst %.3f s), %" G_GSIZE_FORMAT " modes, %.1f … %.1f cm⁻¹\n",
          "qv_solve, all modes (best)", full.best, full.worst, full.n_modes,
          full.min_wavenumber, full.max_wavenumber);
  time_solve (s, h, (gsize) lowest, (guint) repeat, &part);
  printf ("  %-32s %8.3f s (worst %.3f s), %" G_GSIZE_FORMAT " modes, %.1f … %.1f cm⁻¹\n",
          "qv_solve, lowest K (best)", part.best, part.worst, part.n_modes,
          part.min_wavenumber, part.max_wavenumber);
  print_stages ("all modes", &full);
  print_stages ("lowest K", &part);
  printf ("  ratios: qv_solve all / dsyevd alone = %.3f; all / lowest K = %.2f\n",
          skip_lapack ? NAN : full.best / t_lapack, full.best / part.best);
  printf ("  largest rigid-body residual %.3g cm⁻¹\n", full.max_residual);

  if (json)
    {
      GString *out = g_string_new (NULL);
      g_string_append_printf (out, "{\"atoms\": %" G_GINT64_FORMAT ", \"n\": %" G_GSIZE_FORMAT
                              ", \"repeat\": %" G_GINT64_FORMAT ", \"lowest\": %" G_GINT64_FORMAT
                              ", \"openblas_threads\": %d, \"openblas_config\": \"%s\""
                              ", \"generate_s\": %.6f, \"symmetrize_s\": %.6f"
                              ", \"mass_weight_s\": %.6f, \"rigid_body_s\": %.6f"
                              ", \"projection_s\": %.6f, \"dsyevd_s\": %.6f",
                              n_atoms, n, repeat, lowest, openblas_get_num_threads (),
                              openblas_get_config (), t_gen, t_sym, t_mass, t_rb, t_proj,
                              skip_lapack ? -1.0 : t_lapack);
      g_string_append_printf (out, ", \"dsytrd_s\": %.6f, \"dstedc_s\": %.6f, \"dormtr_all_s\": %.6f"
                              ", \"dstemr_s\": %.6f, \"dormtr_lowest_s\": %.6f",
                              t_trd, t_stedc, t_ormtr_all, t_stemr, t_ormtr_m);
      json_stages (out, "full", &full);
      json_stages (out, "lowest", &part);
      g_string_append (out, "}");
      printf ("JSON %s\n", out->str);
      g_string_free (out, TRUE);
    }
  return 0;
}
