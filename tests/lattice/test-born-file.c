/* test-born-file.c — the text reader of Born charges and ε∞
 * (src/io/qv-born-file.c): values as written, errors with file:line:col.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <string.h>
#include "qv-born-file.h"
#include "qv-bundle.h"
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

/* "born_charges" and "dielectric_tensor" in a bundle (two atoms, invented). */
#define BUNDLE_HEAD \
  "{\"format\": \"quaver-bundle\", \"version\": 1,\n" \
  " \"structure\": {\"atoms\": [{\"element\": \"Na\", \"position\": [0, 0, 0]},\n" \
  "                              {\"element\": \"Cl\", \"position\": [2.8, 0, 0]}]},\n" \
  " \"hessian\": {\"units\": \"eV/A^2\", \"layout\": \"lower\", \"data\": [[1], [0, 1], [0, 0, 1], " \
  "[0, 0, 0, 1], [0, 0, 0, 0, 1], [0, 0, 0, 0, 0, 1]]}"
#define BORN \
  ",\n \"born_charges\": {\"units\": \"e\", \"data\": [[[1.1, 0, 0], [0, 1.1, 0], [0, 0, 1.2]],\n" \
  "                                          [[-1.1, 0, 0], [0, -1.1, 0], [0, 0, -1.2]]]}"
#define EPS ",\n \"dielectric_tensor\": {\"units\": \"relative\", \"data\": [[2.3, 0, 0], [0, 2.3, 0], [0, 0, 2.5]]}"

static void
expect_bundle_error (const char *text, const char *what)
{
  g_autoptr(GError) error = NULL;
  g_autoptr(QvBundle) b = qv_bundle_read_data (text, strlen (text), "x.quaver.json", &error);
  assert_null (b);
  if (strstr (error->message, what) == NULL || !g_str_has_prefix (error->message, "x.quaver.json:"))
    fail_msg ("message '%s' (wanted '%s')", error->message, what);
}

static void
test_bundle (void **state)
{
  const char *good = BUNDLE_HEAD BORN EPS "}";
  g_autoptr(GError) error = NULL;
  g_autoptr(QvBundle) b = qv_bundle_read_data (good, strlen (good), "x.quaver.json", &error);
  g_autoptr(QvBundle) none = NULL;
  const char *plain = BUNDLE_HEAD "}";
  (void) state;
  if (b == NULL)
    fail_msg ("%s", error->message);
  assert_non_null (b->born_charges);
  assert_true (b->has_dielectric);
  assert_true (b->born_charges[0] == 1.1 && b->born_charges[8] == 1.2 && b->born_charges[17] == -1.2);
  assert_true (b->dielectric_tensor[2][2] == 2.5 && b->dielectric_tensor[0][1] == 0);
  none = qv_bundle_read_data (plain, strlen (plain), "x.quaver.json", &error);
  assert_non_null (none);
  assert_null (none->born_charges);
  assert_false (none->has_dielectric);

  expect_bundle_error (BUNDLE_HEAD BORN "}", "dielectric_tensor");
  expect_bundle_error (BUNDLE_HEAD EPS "}", "born_charges");
  expect_bundle_error (BUNDLE_HEAD ",\n \"born_charges\": {\"units\": \"C\", \"data\": []}" EPS "}",
                       "expected \"e\"");
  expect_bundle_error (BUNDLE_HEAD ",\n \"born_charges\": {\"units\": \"e\", \"data\": "
                       "[[[1, 0, 0], [0, 1, 0], [0, 0, 1]]]}" EPS "}", "one 3x3 tensor per atom (2), found 1");
  expect_bundle_error (BUNDLE_HEAD BORN ",\n \"dielectric_tensor\": {\"units\": \"relative\", "
                       "\"data\": [[2.3, 0], [0, 2.3, 0], [0, 0, 2.5]]}}", "expected 3 numbers");
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_good),
    cmocka_unit_test (test_bad),
    cmocka_unit_test (test_bundle),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
