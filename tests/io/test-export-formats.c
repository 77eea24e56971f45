/* test-export-formats.c — the small formats of the ensemble and stencil
 * exports: exact fixed-point numbers, plain force files, Hessian writers.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * References: glibc's printf "%.Nf" in the C locale (through
 * g_ascii_formatd), which rounds the exact binary value half to even, is the
 * reference for qv_fixed_format; force-unit factors are recomputed from
 * CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93, 025010, 2021: E_h =
 * 4.3597447222071e-18 J, a0 = 0.529177210903e-10 m, e = 1.602176634e-19 C,
 * N_A = 6.02214076e23, thermochemical calorie 4.184 J); the .npy layout is
 * the NumPy format description (numpy.lib.format, NEP 1). The Python cross
 * tests read the written .npy with numpy.load. */
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <setjmp.h>
#include <math.h>
#include <string.h>
#include <cmocka.h>
#include "qv-io-test.h"

#include <glib.h>
#include "qv-error.h"
#include "qv-fixed-format.h"
#include "qv-force-file.h"
#include "qv-hessian-file.h"
#include "qv-hessian-writer.h"

static guint64
splitmix64 (guint64 *s)
{
  guint64 z = (*s += G_GUINT64_CONSTANT (0x9E3779B97F4A7C15));
  z = (z ^ (z >> 30)) * G_GUINT64_CONSTANT (0xBF58476D1CE4E5B9);
  z = (z ^ (z >> 27)) * G_GUINT64_CONSTANT (0x94D049BB133111EB);
  return z ^ (z >> 31);
}

static void
check_fixed (double v, int d)
{
  char want[400], got[QV_FIXED_BUF_SIZE], format[8];
  gsize len;

  g_snprintf (format, sizeof format, "%%.%df", d);
  g_ascii_formatd (want, sizeof want, format, v);
  len = qv_fixed_format (got, v, d);
  if (strcmp (want, got) != 0)
    print_error ("%.17g with %d decimals: printf %s, qv_fixed_format %s\n", v, d, want, got);
  assert_string_equal (want, got);
  assert_int_equal (len, strlen (got));
}

static void
test_fixed_format (void **state)
{
  guint64 s = 2024;
  static const double special[] = {
    0.0, -0.0, 0.5, 1.5, 2.5, -2.5, 0.125, 0.375, 1e-11, -1e-11, 5e-11, 0.00048828125,
    1.00000000005, 999999.99999999995, 4.9406564584124654e-324, 2.2250738585072014e-308,
    9.2233720368547748e18, 1e300, -1.7976931348623157e308, 123456789.123456789,
  };

  for (gsize i = 0; i < G_N_ELEMENTS (special); i++)
    for (int d = 0; d <= QV_FIXED_MAX_DECIMALS; d++)
      check_fixed (special[i], d);
  check_fixed (INFINITY, 10);
  check_fixed (-INFINITY, 3);
  check_fixed (NAN, 10);
  for (int i = 0; i < 400000; i++)
    {
      const guint64 r = splitmix64 (&s);
      const int d = (int) (splitmix64 (&s) % (QV_FIXED_MAX_DECIMALS + 1));
      double v;

      switch (i % 4)
        {
        case 0:            /* any bit pattern */
          memcpy (&v, &r, sizeof v);
          if (!isfinite (v))
            continue;
          break;
        case 1:            /* coordinates */
          v = ((double) (r >> 11) * 0x1.0p-53 - 0.5) * 200.0;
          break;
        case 2:            /* exact binary fractions: many exact decimal ties */
          v = ldexp ((double) (r >> 20), -(int) (splitmix64 (&s) % 60));
          if (r & 1)
            v = -v;
          break;
        default:           /* near halfway at the 10th decimal */
          v = (double) (gint64) (r >> 40) * 1e-10 + 0.5e-10;
          break;
        }
      check_fixed (v, d);
    }
}

static void
test_force_units (void **state)
{
  const double e = 1.602176634e-19, eh = 4.3597447222071e-18, a0 = 0.529177210903, na = 6.02214076e23;
  const struct { const char *name; double factor; } cases[] = {
    { "eV/A", 1.0 },
    { "hartree/bohr", eh / e / a0 },
    { "Hartree/Bohr", eh / e / a0 },
    { "Ry/bohr", 0.5 * eh / e / a0 },
    { "kcal/mol/A", 4184.0 / na / e },
    { "kJ/mol/\xc3\x85", 1000.0 / na / e },
  };
  g_autoptr(GError) error = NULL;
  QvForceUnit u;

  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      assert_true (qv_force_unit_parse (cases[i].name, &u, NULL));
      assert_true (fabs (qv_force_unit_to_ev_a (u) / cases[i].factor - 1.0) < 1e-12);
    }
  assert_false (qv_force_unit_parse ("N", &u, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
  assert_non_null (strstr (error->message, "hartree/bohr"));
}

static void
test_force_file (void **state)
{
  static const char good[] =
    "# forces of an invented 3-atom structure\r\n"
    "1.0 -2.5e-3 +.5\r\n"
    "\n"
    "0,0 , 1.0D+01   # Fortran exponent, commas\n"
    "-1 2 3";
  struct { const char *text; const char *where; const char *what; } bad[] = {
    { "1 2 3\n4 5\n7 8 9\n", "f:2:4:", "2 numbers" },
    { "1 2 3\n4 5 6 7\n7 8 9\n", "f:2:7:", "more than 3" },
    { "1 2 3\n4 nan 6\n7 8 9\n", "f:2:3:", "not a finite" },
    { "1 2 3\n4 1e999 6\n7 8 9\n", "f:2:3:", "not a finite" },
    { "1 2 3\n4 x 6\n7 8 9\n", "f:2:3:", "expected a number, got 'x'" },
    { "1 2 3\n4 5 6\n", "f:2:", "2 lines of forces" },
    { "1 2 3\n4 5 6\n7 8 9\n1 1 1\n", "f:4:1:", "more lines" },
  };
  g_autoptr(GError) error = NULL;
  g_autofree double *f = qv_force_file_read_data (good, strlen (good), "f", 3, &error);
  const double want[9] = { 1.0, -2.5e-3, 0.5, 0.0, 0.0, 10.0, -1.0, 2.0, 3.0 };

  assert_non_null (f);
  for (int i = 0; i < 9; i++)
    assert_true (f[i] == want[i]);
  for (gsize i = 0; i < G_N_ELEMENTS (bad); i++)
    {
      g_autoptr(GError) err = NULL;
      double *r = qv_force_file_read_data (bad[i].text, strlen (bad[i].text), "f", 3, &err);
      assert_null (r);
      qvt_assert_input_error (err, bad[i].where, bad[i].what);
    }
}

static void
test_hessian_writers (void **state)
{
  const gsize n = 5;
  g_autoptr(QvHessian) h = qv_hessian_new (n, FALSE, NULL);
  g_autofree char *npy = NULL, *text = NULL;
  gsize npy_len, text_len;
  guint64 s = 7;

  for (gsize i = 0; i < n * n; i++)
    h->data[i] = ((double) (splitmix64 (&s) >> 11) * 0x1.0p-53 - 0.5) * 1e3;
  h->data[3] = 1.0 / 3.0;

  /* .npy: magic, version 1.0, header padded to 64 bytes ending in '\n'
   * (NEP 1), then row-major little-endian doubles. */
  npy = qv_hessian_format_npy (h, &npy_len);
  assert_memory_equal (npy, "\x93NUMPY\x01\x00", 8);
  {
    const gsize hl = (guchar) npy[8] | ((gsize) (guchar) npy[9] << 8);
    assert_int_equal ((10 + hl) % 64, 0);
    assert_int_equal (npy[10 + hl - 1], '\n');
    assert_non_null (g_strstr_len (npy + 10, (gssize) hl, "'descr': '<f8'"));
    assert_non_null (g_strstr_len (npy + 10, (gssize) hl, "'fortran_order': False"));
    assert_non_null (g_strstr_len (npy + 10, (gssize) hl, "'shape': (5, 5)"));
    assert_int_equal (npy_len, 10 + hl + n * n * 8);
    for (gsize i = 0; i < n; i++)
      for (gsize j = 0; j < n; j++)
        {
          guint64 bits;
          double v;
          memcpy (&bits, npy + 10 + hl + 8 * (i * n + j), 8);
          bits = GUINT64_FROM_LE (bits);
          memcpy (&v, &bits, 8);
          assert_true (v == h->data[j * n + i]);      /* element (i, j) */
        }
  }
  /* Text: comment lines, then row i = H_i1 … H_in, exact. */
  text = qv_hessian_format_text (h, "first line\nsecond", &text_len);
  assert_true (g_str_has_prefix (text, "# first line\n# second\n"));
  {
    g_autoptr(GError) error = NULL;
    g_autoptr(QvHessian) back = qv_hessian_read_text (text, text_len, "t", n, QV_HESSIAN_LAYOUT_FULL,
                                                      &error);
    assert_non_null (back);
    /* The reader keeps a full text as it comes (row-major, i.e. the
     * transpose in its column-major storage; qv-hessian.h). */
    for (gsize i = 0; i < n; i++)
      for (gsize j = 0; j < n; j++)
        assert_true (back->data[i * n + j] == h->data[j * n + i]);
  }
  assert_int_equal (qv_hessian_write_format_for ("a/b.NPY"), QV_HESSIAN_WRITE_NPY);
  assert_int_equal (qv_hessian_write_format_for ("b.npy.txt"), QV_HESSIAN_WRITE_TEXT);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_fixed_format),
    cmocka_unit_test (test_force_units),
    cmocka_unit_test (test_force_file),
    cmocka_unit_test (test_hessian_writers),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
