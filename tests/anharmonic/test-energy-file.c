/* test-energy-file.c — the NAME ENERGY reader: units against CODATA 2018
 * (Tiesinga et al., Rev. Mod. Phys. 93, 025010, 2021; the thermochemical
 * calorie 4.184 J exactly), typed here independently of qv-units.h, and
 * its messages for bad lines.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>
#include "qv-energy-file.h"
#include "qv-error.h"

static void
test_units (void **state)
{
  const double e = 1.602176634e-19, na = 6.02214076e23, h = 6.62607015e-34, c = 299792458.0;
  const struct { const char *text; double ev; } cases[] = {
    { "hartree", 27.211386245988 }, { "Eh", 27.211386245988 }, { "eV", 1.0 },
    { "kcal/mol", 4184.0 / na / e }, { "KJ/MOL", 1000.0 / na / e },
    { "cm^-1", h * c * 100.0 / e }, { "cm-1", h * c * 100.0 / e },
  };
  QvEnergyUnit u;
  GError *error = NULL;

  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      assert_true (qv_energy_unit_parse (cases[i].text, &u, NULL));
      assert_true (fabs (qv_energy_unit_to_ev (u) - cases[i].ev) <= 1e-14 * cases[i].ev);
    }
  assert_false (qv_energy_unit_parse ("Ry", &u, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
  assert_non_null (strstr (error->message, "kcal/mol"));
  g_clear_error (&error);
}

static void
expect_n (const char *text, gsize length, const char *message)
{
  GError *error = NULL;
  QvEnergyFile *f = qv_energy_file_read_data (text, length, "e.txt", &error);
  assert_null (f);
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  if (strstr (error->message, message) == NULL)
    fail_msg ("'%s' does not contain '%s'", error->message, message);
  g_clear_error (&error);
}

static void
expect (const char *text, const char *message)
{
  expect_n (text, strlen (text), message);
}

static void
test_read (void **state)
{
  const char text[] = "# energies\n a.xyz  -1.5 # first\r\nb,2.25\n\n  c 3e-1\n";
  g_autoptr(QvEnergyFile) f = qv_energy_file_read_data (text, strlen (text), "e.txt", NULL);
  const char *names[] = { "c.xyz", "a.xyz", "b.xyz" };
  const char *short_names[] = { "a.xyz", "b.xyz" };
  double v[3];
  GError *error = NULL;

  assert_non_null (f);
  assert_int_equal (f->entries->len, 3);
  assert_true (qv_energy_file_match (f, names, 3, v, NULL));
  assert_true (v[0] == 0.3 && v[1] == -1.5 && v[2] == 2.25);
  assert_int_equal (((QvEnergyEntry *) g_ptr_array_index (f->entries, 2))->line, 5);
  /* an entry no structure claims */
  assert_false (qv_energy_file_match (f, short_names, 2, v, &error));
  assert_non_null (strstr (error->message, "e.txt:5:1: 1 name is not in the manifest: 'c' (line 5)"));
  g_clear_error (&error);

  expect ("a 1\na 2\n", "e.txt:2:1: 'a' is given a second time (first on line 1)");
  expect ("a 1\nb inf\n", "e.txt:2:3: the energy of 'b' is not a finite number");
  expect ("a 1\nb NaN\n", "e.txt:2:3: the energy of 'b' is not a finite number");
  expect ("a 1.0x\n", "e.txt:1:3: the energy of 'a' is not a number");
  expect ("a\n", "e.txt:1:1: expected NAME ENERGY (two fields), found 1 field");
  expect ("# nothing\n\n", "e.txt: no NAME ENERGY lines");
  expect_n ("a 1\0\n", 5, "NUL");
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_units),
    cmocka_unit_test (test_read),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
