/* test-born-file.c — the text reader of Born charges and ε∞
 * (src/io/qv-born-file.c): values as written, errors with file:line:col.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <string.h>
#include "qv-born-file.h"
#include "qv-error.h"

static void
test_good (void **state)
{
  const char *text = "# invented rock-salt values\n"
                     "born\n 1.1 0 0\n 0 1.1 0\n 0 0 1.1   # Na\n"
                     "-1.1, 0, 0\n0 -1.1 0\n0 0 -1.25e0\r\n"
                     "\n"
                     "Dielectric\n2.3 0 0.1\n0 2.3 0\n0.1 0 2.4\n";
  g_autoptr(GError) error = NULL;
  g_autoptr(QvBornCharges) b = qv_born_charges_read_data (text, strlen (text), "nacl.born", &error);
  (void) state;
  if (b == NULL)
    fail_msg ("%s", error->message);
  assert_int_equal (b->n_atoms, 2);
  assert_true (b->born[0] == 1.1 && b->born[4] == 1.1 && b->born[9] == -1.1 && b->born[17] == -1.25);
  assert_true (b->epsilon[0][2] == 0.1 && b->epsilon[2][0] == 0.1 && b->epsilon[2][2] == 2.4);
}

static void
expect_error (const char *text, const char *where, const char *what)
{
  g_autoptr(GError) error = NULL;
  g_autoptr(QvBornCharges) b = qv_born_charges_read_data (text, strlen (text), "x.born", &error);
  assert_null (b);
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  if (!g_str_has_prefix (error->message, where) || strstr (error->message, what) == NULL)
    fail_msg ("message '%s' (wanted '%s' … '%s')", error->message, where, what);
}

static void
test_bad (void **state)
{
  (void) state;
  expect_error ("dielectric 1 0 0 0 1 0 0 0 1\nborn 1 0 0 0 1 0 0 0 1x\n", "x.born:2:22:", "expected a number");
  expect_error ("dielectric 1 0 0 0 1 0 0 0 1\nborn 1 0 0 0 1 0 0 0\n", "x.born:2:", "9 numbers per atom");
  expect_error ("dielectric 1 0 0 0 1 0 0 0\nborn 1 0 0 0 1 0 0 0 1\n", "x.born:1:", "needs 9 numbers");
  expect_error ("born 1 0 0 0 1 0 0 0 1\n", "x.born:", "no 'dielectric'");
  expect_error ("1 2\n", "x.born:1:1:", "before any section");
  expect_error ("dielectric 1 0 0 0 1 0 0 0 1\nborn 1 0 0 0 1 0 0 0 1\nborn\n", "x.born:3:1:", "second time");
  expect_error ("epsilon 1\n", "x.born:1:1:", "unknown word 'epsilon'");
  expect_error ("dielectric 1 0 0 0 1 0 0 0 1 1e999\n", "x.born:1:", "expected a number");
  expect_error ("dielectric 1 0 0 0 1 0 0 0 1 5\n", "x.born:1:", "tenth");
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_good),
    cmocka_unit_test (test_bad),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
