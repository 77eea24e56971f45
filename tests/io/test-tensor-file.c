/* test-tensor-file.c — derivative tensors as text (qv-tensor-file): values
 * against the C library's strtod (glibc), and every error with its
 * "NAME:LINE[:COL]:" place. The numbers are invented.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <stdlib.h>
#include <string.h>
#include <cmocka.h>
#include "qv-io-test.h"

#include <glib.h>
#include "qv-tensor-file.h"

static const gsize DIPOLE_ROWS[] = { 3, 0 };
static const gsize ALPHA_ROWS[] = { 6, 9, 0 };

static double *
read_text (const char *text, gsize n_atoms, const gsize *rows, gsize *n_rows, GError **error)
{
  return qv_tensor_read_text (text, strlen (text), "t.apt", n_atoms, rows, "dipole derivatives",
                              n_rows, error);
}

static void
test_good (void **state)
{
  const char *text =
    "# invented: one atom\n"
    "\n"
    "  -0.5  1e-3, 2.5D+00   # Fortran exponent\n"
    "0 +.25 -7.\n"
    "\t1.0e+1 3 4\r\n";
  const char *numbers[] = { "-0.5", "1e-3", "2.5e+00", "0", "+.25", "-7.", "1.0e+1", "3", "4" };
  gsize n_rows = 0;
  g_autoptr(GError) error = NULL;
  g_autofree double *v = read_text (text, 1, DIPOLE_ROWS, &n_rows, &error);

  assert_null (error);
  assert_non_null (v);
  assert_int_equal (n_rows, 3);
  for (int i = 0; i < 9; i++)
    assert_true (v[i] == strtod (numbers[i], NULL));
}

static void
test_rows_six_or_nine (void **state)
{
  GString *six = g_string_new (NULL), *nine;
  gsize n_rows = 0;
  GError *error = NULL;
  double *v;

  for (int r = 0; r < 6; r++)
    g_string_append_printf (six, "%d 1 2 3 4 5\n", r);
  nine = g_string_new (six->str);
  for (int r = 6; r < 9; r++)
    g_string_append_printf (nine, "%d 1 2 3 4 5\n", r);
  v = read_text (six->str, 2, ALPHA_ROWS, &n_rows, &error);
  assert_non_null (v);
  assert_int_equal (n_rows, 6);
  assert_true (v[5 * 6] == 5.0);
  g_free (v);
  v = read_text (nine->str, 2, ALPHA_ROWS, &n_rows, &error);
  assert_non_null (v);
  assert_int_equal (n_rows, 9);
  g_free (v);
  /* seven rows: neither */
  g_string_append (six, "1 1 1 1 1 1\n");
  assert_null (read_text (six->str, 2, ALPHA_ROWS, &n_rows, &error));
  qvt_assert_input_error (error, "t.apt:7:", "found 7 rows");
  assert_non_null (strstr (error->message, "6 or 9"));
  g_clear_error (&error);
  g_string_free (six, TRUE);
  g_string_free (nine, TRUE);
}

static void
test_errors (void **state)
{
  static const struct { const char *text; const char *where; const char *fragment; } cases[] = {
    { "1 2 3\n4 5 6\n", "t.apt:2:", "found 2 rows" },
    { "", "t.apt: ", "found 0 rows" },
    { "1 2 3\n4 5\n7 8 9\n", "t.apt:2:", "expected 3N = 3 numbers on this row" },
    { "1 2 3 4\n", "t.apt:1:7:", "more than 3N = 3 numbers" },
    { "1 2 3\n4 5 6\n7 8 9\n1 2 3\n", "t.apt:4:1:", "more than 3 rows" },
    { "1 2 3\n4 nan 6\n7 8 9\n", "t.apt:2:3:", "NaN and infinity" },
    { "1 2 3\n4 5 -Inf\n7 8 9\n", "t.apt:2:5:", "NaN and infinity" },
    { "1 2 3\n4 5 6\n7 x8 9\n", "t.apt:3:3:", "\"x8\" is not a number" },
    { "1 2 3\n4 5 6\n7 0x8 9\n", "t.apt:3:3:", "is not a number" },
    { "1 2 3\n4 5 6\n7 1e999 9\n", "t.apt:3:3:", "beyond the range of a double" },
  };
  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      GError *error = NULL;
      gsize n_rows = 0;
      assert_null (read_text (cases[i].text, 1, DIPOLE_ROWS, &n_rows, &error));
      qvt_assert_input_error (error, cases[i].where, cases[i].fragment);
      g_clear_error (&error);
    }
}

static void
test_missing_file (void **state)
{
  GError *error = NULL;
  gsize n_rows;
  assert_null (qv_tensor_read_file ("/nonexistent/t.apt", 1, DIPOLE_ROWS, "dipole derivatives",
                                    &n_rows, &error));
  qvt_assert_input_error (error, "/nonexistent/t.apt:", "");
  g_clear_error (&error);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_good),
    cmocka_unit_test (test_rows_six_or_nine),
    cmocka_unit_test (test_errors),
    cmocka_unit_test (test_missing_file),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
