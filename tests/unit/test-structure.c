/* test-structure.c — structures, masses and formulas.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-structure.h"

static void
test_masses (void **state)
{
  g_autoptr(QvStructure) s = qv_structure_new (3, NULL);
  GError *error = NULL;

  qv_structure_set_element (s, 0, 8, NULL);
  qv_structure_set_element (s, 1, 1, NULL);
  qv_structure_set_element (s, 2, 1, NULL);
  /* NIST (AME2016): 16O 15.994 914 619 57, 1H 1.007 825 032 23, 2H
   * 2.014 101 778 12 (REFERENCES.md, marked from memory there). */
  assert_true (fabs (s->atoms[0].mass - 15.99491461957) < 1e-9);
  assert_true (fabs (s->atoms[1].mass - 1.00782503223) < 1e-9);
  assert_int_equal (s->atoms[0].mass_number, 16);
  assert_true (qv_structure_set_isotope (s, 1, 2, NULL));
  assert_true (fabs (s->atoms[1].mass - 2.01410177812) < 1e-9);
  assert_false (qv_structure_set_isotope (s, 1, 7, &error));
  assert_non_null (strstr (error->message, "no isotope 7 of H"));
  g_clear_error (&error);
  assert_false (qv_structure_set_mass (s, 2, -1.0, &error));
  g_clear_error (&error);
  assert_false (qv_structure_set_mass (s, 2, NAN, &error));
  g_clear_error (&error);
  assert_true (qv_structure_set_mass (s, 2, 3.5, NULL));
  assert_int_equal (s->atoms[2].mass_number, 0);
  /* IUPAC CIAAW conventional weights (from memory): H 1.008, O 15.999. */
  qv_structure_apply_mass_model (s, QV_MASS_AVERAGE);
  assert_true (fabs (s->atoms[0].mass - 15.999) < 1e-3);
  assert_true (fabs (s->atoms[1].mass - 1.008) < 1e-3);
  qv_structure_apply_mass_model (s, QV_MASS_ISOTOPIC);
  assert_true (fabs (s->atoms[2].mass - 1.00782503223) < 1e-9);
  assert_false (qv_structure_set_element (s, 0, 119, &error));
  g_clear_error (&error);
}

static void
test_formula_and_com (void **state)
{
  /* Hill order (common practice): C, H, then alphabetical. */
  static const guint z[] = { 8, 6, 1, 1, 6, 17, 1 };
  g_autoptr(QvStructure) s = qv_structure_new (G_N_ELEMENTS (z), NULL);
  g_autofree char *f = NULL;
  g_autoptr(QvStructure) w = qv_structure_new (3, NULL);
  g_autofree char *fw = NULL;
  double com[3];

  for (gsize i = 0; i < G_N_ELEMENTS (z); i++)
    qv_structure_set_element (s, i, z[i], NULL);
  f = qv_structure_formula (s);
  assert_string_equal (f, "C2H3ClO");
  qv_structure_set_element (w, 0, 8, NULL);
  fw = qv_structure_formula (w);
  assert_string_equal (fw, "H2O");

  w->atoms[0].position[2] = 1.0;
  qv_structure_center_of_mass (w, com);
  assert_true (fabs (com[2] - w->atoms[0].mass / qv_structure_total_mass (w)) < 1e-15);
  assert_null (qv_structure_new (G_MAXSIZE / 2, NULL));
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_masses),
    cmocka_unit_test (test_formula_and_com),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
