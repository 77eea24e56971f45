/* bench-read.c — benchmark (not a test): times qv_hessian_read_file.
 *
 *   bench-read [--atoms N] [--repeat R] [--json]           writes its own files
 *   bench-read [--repeat R] [--json] FILE...               times the given files
 *
 * Without FILE it writes a dense symmetric 3N×3N matrix (N = 1000 by
 * default; invented values of mixed sign and magnitude from a fixed seed) as
 * full text, every number '%.16e' (what numpy.savetxt writes with that
 * format), and as a .npy, into a temporary directory it removes afterwards,
 * then times reading each. Each file is read R times (default 3) and the best
 * time counts; the page cache is warm after the first read, as it is for
 * numpy.loadtxt in compare.py.
 *
 * When several files of the same size are given (or written) it also reports
 * the largest difference between the matrix of the first and the others:
 * '%.16e' has 17 significant digits, so text and .npy of one matrix must read
 * back identically (IEEE 754 round trip: 17 digits identify a double).
 * Exits 0 whenever it could run; speed targets are reported, not asserted.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib.h>
#include <glib/gstdio.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "bench-util.h"
#include "qv-hessian-file.h"

#define BENCH_SEED 0x2EADULL


/* Symmetric, magnitudes from about 30 down to 1e-6 eV/Å² as in a molecular
 * Hessian, both signs. Row-major and column-major are the same. */
static double *
random_symmetric (gsize n)
{
  double *a = g_new (double, n * n);
  guint64 state = BENCH_SEED;
  for (gsize j = 0; j < n; j++)
    for (gsize i = j; i < n; i++)
      {
        const double v = (2.0 * bench_uniform (&state) - 1.0) * 30.0 * pow (10.0, -6.0 * bench_uniform (&state));
        a[i + j * n] = a[j + i * n] = v;
      }
  return a;
}

static void
write_files (const char *dir, gsize n, char **text_path, char **npy_path)
{
  g_autofree double *a = random_symmetric (n);
  GString *header = g_string_new (NULL);
  const unsigned char magic[8] = { 0x93, 'N', 'U', 'M', 'P', 'Y', 1, 0 };
  unsigned char len[2];
  FILE *f;

  *text_path = g_build_filename (dir, "bench-read.txt", NULL);
  *npy_path = g_build_filename (dir, "bench-read.npy", NULL);
  /* The "C" locale is in effect (no setlocale): '.' is the decimal point. */
  f = fopen (*text_path, "w");
  if (f == NULL)
    bench_die ("cannot write %s", *text_path);
  for (gsize i = 0; i < n; i++)
    for (gsize j = 0; j < n; j++)
      fprintf (f, j + 1 < n ? "%.16e " : "%.16e\n", a[i + j * n]);
  if (fclose (f) != 0)
    bench_die ("cannot write %s", *text_path);

  g_string_append_printf (header, "{'descr': '<f8', 'fortran_order': False, 'shape': (%"
                          G_GSIZE_FORMAT ", %" G_GSIZE_FORMAT "), }", n, n);
  while ((10 + header->len + 1) % 64 != 0)
    g_string_append_c (header, ' ');
  g_string_append_c (header, '\n');
  len[0] = header->len & 0xff;
  len[1] = header->len >> 8;
  f = fopen (*npy_path, "wb");
  if (f == NULL || fwrite (magic, 1, 8, f) != 8 || fwrite (len, 1, 2, f) != 2
      || fwrite (header->str, 1, header->len, f) != header->len
      || fwrite (a, sizeof (double), n * n, f) != n * n || fclose (f) != 0)
    bench_die ("cannot write %s", *npy_path);
  g_string_free (header, TRUE);
}

int
main (int argc, char **argv)
{
  gint64 n_atoms = 1000, repeat = 3;
  gboolean json = FALSE;
  GOptionEntry entries[] = {
    { "atoms", 'n', 0, G_OPTION_ARG_INT64, &n_atoms, "Atoms of the matrix it writes (default 1000)", "N" },
    { "repeat", 'r', 0, G_OPTION_ARG_INT64, &repeat, "Reads of each file; the best counts (default 3)", "R" },
    { "json", 0, 0, G_OPTION_ARG_NONE, &json, "Also print one JSON line per file", NULL },
    { NULL }
  };
  g_autoptr(GOptionContext) context = g_option_context_new ("[FILE…] — time the Hessian reader");
  g_autoptr(GError) error = NULL;
  g_autoptr(GPtrArray) files = g_ptr_array_new_with_free_func (g_free);
  g_autofree char *tmpdir = NULL;
  g_autoptr(QvHessian) first = NULL;

  g_option_context_add_main_entries (context, entries, NULL);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    {
      g_printerr ("bench-read: %s\n", error->message);
      return 1;
    }
  if (n_atoms < 1 || n_atoms > 20000 || repeat < 1 || repeat > 100)
    {
      g_printerr ("bench-read: need 1 ≤ N ≤ 20000 atoms and 1 ≤ R ≤ 100 reads\n");
      return 1;
    }
  for (int i = 1; i < argc; i++)
    g_ptr_array_add (files, g_strdup (argv[i]));
  if (files->len == 0)
    {
      char *text_path, *npy_path;
      gint64 start = g_get_monotonic_time ();
      tmpdir = g_dir_make_tmp ("quaver-bench-read-XXXXXX", &error);
      if (tmpdir == NULL)
        bench_die ("%s", error->message);
      write_files (tmpdir, 3 * (gsize) n_atoms, &text_path, &npy_path);
      printf ("bench-read: wrote a %" G_GINT64_FORMAT "×%" G_GINT64_FORMAT " matrix as text and .npy in %.2f s\n",
              3 * n_atoms, 3 * n_atoms, (g_get_monotonic_time () - start) * 1e-6);
      g_ptr_array_add (files, text_path);
      g_ptr_array_add (files, npy_path);
    }

  for (guint f = 0; f < files->len; f++)
    {
      const char *path = files->pdata[f];
      GStatBuf st;
      double best = G_MAXDOUBLE, worst = 0.0, max_diff = -1.0;
      g_autoptr(QvHessian) h = NULL;

      if (g_stat (path, &st) != 0)
        {
          g_printerr ("bench-read: cannot stat %s\n", path);
          return 1;
        }
      for (gint64 r = 0; r < repeat; r++)
        {
          gint64 start = g_get_monotonic_time ();
          double t;
          g_clear_pointer (&h, qv_hessian_free);
          h = qv_hessian_read_file (path, 0, QV_HESSIAN_LAYOUT_AUTO, &error);
          t = (g_get_monotonic_time () - start) * 1e-6;
          if (h == NULL)
            {
              g_printerr ("bench-read: %s\n", error->message);
              return 1;
            }
          best = MIN (best, t);
          worst = MAX (worst, t);
        }
      if (first != NULL && first->n == h->n)
        {
          max_diff = 0.0;
          for (gsize i = 0; i < h->n * h->n; i++)
            max_diff = MAX (max_diff, fabs (h->data[i] - first->data[i]));
        }
      printf ("  %-40s %7.1f MB %" G_GSIZE_FORMAT "×%" G_GSIZE_FORMAT " %-5s best %.3f s (worst %.3f s), %.0f MB/s",
              path, st.st_size / 1e6, h->n, h->n, qv_hessian_layout_name (h->layout), best, worst,
              st.st_size / 1e6 / best);
      if (max_diff >= 0)
        printf (", max |difference| from the first file %.3g", max_diff);
      printf ("\n");
      if (json)
        printf ("JSON {\"file\": \"%s\", \"bytes\": %" G_GINT64_FORMAT ", \"n\": %" G_GSIZE_FORMAT
                ", \"layout\": \"%s\", \"repeat\": %" G_GINT64_FORMAT ", \"best_s\": %.6f, \"worst_s\": %.6f"
                ", \"max_diff_from_first\": %.6g}\n",
                path, (gint64) st.st_size, h->n, qv_hessian_layout_name (h->layout), repeat, best,
                worst, max_diff);
      if (first == NULL)
        first = g_steal_pointer (&h);
    }

  if (tmpdir)
    {
      for (guint f = 0; f < files->len; f++)
        g_unlink (files->pdata[f]);
      g_rmdir (tmpdir);
    }
  return 0;
}
