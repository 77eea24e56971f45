/* test-element.c — unit tests of the element and isotope table.
 * The values compared with here are published ones; each check names its
 * source.  The full cross-check against python3-periodictable is
 * check_elements.py.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>

#include "qv-element.h"

/* Fails with a readable message when |got − want| > tol. */
static void
assert_near (double got, double want, double tol, const char *what)
{
  if (!(fabs (got - want) <= tol))
    fail_msg ("%s: got %.17g, want %.17g (tolerance %g)", what, got, want,
              tol);
}

static void
test_from_z (void **state G_GNUC_UNUSED)
{
  const QvElement *e;

  e = qv_element_from_z (1);
  assert_non_null (e);
  assert_int_equal (e->z, 1);
  assert_string_equal (e->symbol, "H");
  assert_string_equal (e->name, "hydrogen");
  assert_int_equal (e->mass_number, 1);
  assert_true (e->stable);
  /* 1H: NIST / AME2016, REFERENCES.md (memory). */
  assert_near (e->isotope_mass, 1.00782503223, 1e-11, "1H mass");

  e = qv_element_from_z (6);
  assert_non_null (e);
  assert_string_equal (e->symbol, "C");
  assert_int_equal (e->mass_number, 12);
  /* 12C is exactly 12 u by definition of the unit (SI brochure). */
  assert_true (e->isotope_mass == 12.0);

  e = qv_element_from_z (8);
  assert_non_null (e);
  assert_string_equal (e->symbol, "O");
  assert_int_equal (e->mass_number, 16);
  /* 16O: NIST / AME2016, REFERENCES.md (memory). */
  assert_near (e->isotope_mass, 15.99491461957, 1e-11, "16O mass");

  e = qv_element_from_z (QV_ELEMENT_MAX_Z);
  assert_non_null (e);
  assert_int_equal (e->z, 118);
  assert_string_equal (e->symbol, "Og");
  assert_false (e->stable);

  assert_null (qv_element_from_z (0));
  assert_null (qv_element_from_z (QV_ELEMENT_MAX_Z + 1));
  assert_null (qv_element_from_z (G_MAXUINT));
}

static void
test_from_symbol (void **state G_GNUC_UNUSED)
{
  static const char *const cl[] = { "Cl", "CL", "cl", "cL" };
  static const char *const unknown[] = {
    "Xx", "", "D", "T", " C", "C ", "Cla", "Uue", "Q", "1", "\xc3\xa9",
  };

  for (gsize i = 0; i < G_N_ELEMENTS (cl); i++)
    {
      const QvElement *e = qv_element_from_symbol (cl[i]);

      assert_non_null (e);
      assert_int_equal (e->z, 17);
    }
  assert_int_equal (qv_element_from_symbol ("c")->z, 6);
  assert_int_equal (qv_element_from_symbol ("C")->z, 6);
  assert_int_equal (qv_element_from_symbol ("co")->z, 27);
  assert_int_equal (qv_element_from_symbol ("CO")->z, 27);
  assert_int_equal (qv_element_from_symbol ("og")->z, 118);

  for (gsize i = 0; i < G_N_ELEMENTS (unknown); i++)
    if (qv_element_from_symbol (unknown[i]) != NULL)
      fail_msg ("symbol \"%s\" should be unknown", unknown[i]);
  assert_null (qv_element_from_symbol (NULL));

  /* Every symbol finds its own row, in any case. */
  for (guint z = 1; z <= QV_ELEMENT_MAX_Z; z++)
    {
      const QvElement *e = qv_element_from_z (z);
      char *up = g_ascii_strup (e->symbol, -1);
      char *down = g_ascii_strdown (e->symbol, -1);

      assert_ptr_equal (qv_element_from_symbol (e->symbol), e);
      assert_ptr_equal (qv_element_from_symbol (up), e);
      assert_ptr_equal (qv_element_from_symbol (down), e);
      g_free (up);
      g_free (down);
    }
}

/* Symbols are one capital and at most one more lower-case letter, names
 * lower-case ASCII, and no two rows share either (IUPAC naming rules). */
static void
test_symbols_and_names (void **state G_GNUC_UNUSED)
{
  for (guint z = 1; z <= QV_ELEMENT_MAX_Z; z++)
    {
      const QvElement *e = qv_element_from_z (z);
      gsize len = strlen (e->symbol);

      assert_int_equal (e->z, z);
      assert_true (len == 1 || len == 2);
      assert_true (g_ascii_isupper (e->symbol[0]));
      if (len == 2)
        assert_true (g_ascii_islower (e->symbol[1]));
      assert_true (strlen (e->name) >= 3);
      for (const char *p = e->name; *p; p++)
        assert_true (g_ascii_islower (*p));
      for (guint y = 1; y < z; y++)
        {
          const QvElement *f = qv_element_from_z (y);

          if (g_ascii_strcasecmp (e->symbol, f->symbol) == 0
              || strcmp (e->name, f->name) == 0)
            fail_msg ("z = %u and z = %u share a symbol or name", y, z);
        }
    }
  /* Spot checks of names (IUPAC spelling). */
  assert_string_equal (qv_element_from_z (13)->name, "aluminium");
  assert_string_equal (qv_element_from_z (16)->name, "sulfur");
  assert_string_equal (qv_element_from_z (55)->name, "caesium");
  assert_string_equal (qv_element_from_z (79)->symbol, "Au");
  assert_string_equal (qv_element_from_z (113)->symbol, "Nh");
  assert_string_equal (qv_element_from_z (117)->name, "tennessine");
}

static void
test_isotope_lookup (void **state G_GNUC_UNUSED)
{
  const QvIsotope *iso;

  /* 2H: 2.014 101 778 12 u, NIST / AME2016, REFERENCES.md (memory). */
  iso = qv_isotope_lookup (1, 2);
  assert_non_null (iso);
  assert_int_equal (iso->z, 1);
  assert_int_equal (iso->mass_number, 2);
  assert_near (iso->mass, 2.01410177812, 1e-11, "2H mass");
  /* 2H abundance 0.000115, CIAAW (Meija et al. 2016) (from memory). */
  assert_near (iso->abundance, 0.000115, 1e-9, "2H abundance");

  /* 3H: not in nature, so abundance 0 (header contract). */
  iso = qv_isotope_lookup (1, 3);
  assert_non_null (iso);
  assert_true (iso->abundance == 0.0);
  assert_true (iso->mass > 3.0 && iso->mass < 3.1);

  /* 13C: 13.003 354 835 07 u, REFERENCES.md (memory). */
  iso = qv_isotope_lookup (6, 13);
  assert_non_null (iso);
  assert_near (iso->mass, 13.00335483507, 1e-11, "13C mass");
  /* 18O: 17.999 159 612 86 u, REFERENCES.md (memory). */
  iso = qv_isotope_lookup (8, 18);
  assert_non_null (iso);
  assert_near (iso->mass, 17.99915961286, 1e-11, "18O mass");
  /* 15N: 15.000 108 898 88 u, NIST / AME2016 (from memory). */
  iso = qv_isotope_lookup (7, 15);
  assert_non_null (iso);
  assert_near (iso->mass, 15.00010889888, 1e-11, "15N mass");

  /* Masses of commonly used isotopes, NIST "Atomic Weights and Isotopic
     Compositions" / AME2016 (from memory; periodictable 1.6 only checks
     these to ~0.4 ppm because it carries the 1995 mass evaluation). */
  static const struct { guint z, a; double mass; } nist[] = {
    {  1,   1,   1.00782503223 }, {  6,  12,  12.0 },
    {  7,  14,  14.00307400443 }, {  8,  17,  16.99913175650 },
    {  9,  19,  18.99840316273 }, { 14,  28,  27.97692653465 },
    { 15,  31,  30.97376199842 }, { 16,  32,  31.9720711744 },
    { 17,  35,  34.968852682 },   { 17,  37,  36.965902602 },
    { 26,  56,  55.93493633 },    { 29,  63,  62.92959772 },
    { 35,  79,  78.9183376 },     { 35,  81,  80.9162897 },
    { 53, 127, 126.9044719 },     { 78, 195, 194.9647917 },
    { 79, 197, 196.96656879 },    { 82, 208, 207.9766525 },
    { 92, 238, 238.0507884 },
  };
  for (gsize i = 0; i < G_N_ELEMENTS (nist); i++)
    {
      char what[32];

      iso = qv_isotope_lookup (nist[i].z, nist[i].a);
      assert_non_null (iso);
      g_snprintf (what, sizeof what, "z = %u A = %u", nist[i].z, nist[i].a);
      assert_near (iso->mass, nist[i].mass, 1e-9, what);
    }

  /* The substitution isotopes the design asks for are all present. */
  static const guint wanted[][2] = {
    { 1, 2 }, { 1, 3 }, { 3, 6 }, { 5, 10 }, { 6, 13 }, { 7, 15 },
    { 8, 17 }, { 8, 18 }, { 12, 25 }, { 12, 26 }, { 14, 29 }, { 14, 30 },
    { 16, 33 }, { 16, 34 }, { 16, 36 }, { 17, 37 }, { 19, 40 }, { 19, 41 },
    { 20, 44 }, { 24, 53 }, { 26, 54 }, { 26, 57 }, { 29, 63 }, { 29, 65 },
    { 30, 66 }, { 30, 68 }, { 35, 79 }, { 35, 81 }, { 47, 107 },
    { 47, 109 }, { 51, 121 }, { 51, 123 }, { 75, 185 }, { 75, 187 },
    { 77, 191 }, { 77, 193 }, { 81, 203 }, { 81, 205 }, { 82, 204 },
    { 82, 206 }, { 82, 207 }, { 82, 208 }, { 92, 235 }, { 92, 238 },
  };
  for (gsize i = 0; i < G_N_ELEMENTS (wanted); i++)
    if (qv_isotope_lookup (wanted[i][0], wanted[i][1]) == NULL)
      fail_msg ("isotope z = %u, A = %u missing", wanted[i][0], wanted[i][1]);

  /* Not in the table: non-existent or not listed. */
  assert_null (qv_isotope_lookup (0, 0));
  assert_null (qv_isotope_lookup (0, 1));
  assert_null (qv_isotope_lookup (1, 0));
  assert_null (qv_isotope_lookup (1, 7));
  assert_null (qv_isotope_lookup (6, 1));
  assert_null (qv_isotope_lookup (119, 300));
  assert_null (qv_isotope_lookup (G_MAXUINT, G_MAXUINT));
}

static void
test_isotope_table_sorted (void **state G_GNUC_UNUSED)
{
  gsize n = 0;
  const QvIsotope *t = qv_isotope_table (&n);

  assert_non_null (t);
  assert_true (n > QV_ELEMENT_MAX_Z);
  assert_ptr_equal (qv_isotope_table (NULL), t);
  for (gsize i = 0; i < n; i++)
    {
      assert_true (t[i].z >= 1 && t[i].z <= QV_ELEMENT_MAX_Z);
      /* A nucleus has at least Z nucleons, and |mass − A| < 0.5 u for every
         known nuclide (mass excess/binding energy, common practice): this
         catches a wrong integer part. */
      assert_true (t[i].mass_number >= t[i].z);
      if (!(fabs (t[i].mass - t[i].mass_number) < 0.5))
        fail_msg ("z = %u A = %u: mass %.10g far from A", t[i].z,
                  t[i].mass_number, t[i].mass);
      assert_true (t[i].abundance >= 0.0 && t[i].abundance <= 1.0);
      if (i > 0)
        {
          gboolean ordered = t[i - 1].z < t[i].z
            || (t[i - 1].z == t[i].z
                && t[i - 1].mass_number < t[i].mass_number);
          if (!ordered)
            fail_msg ("isotope table out of order at index %" G_GSIZE_FORMAT " "
                      "(z = %u, A = %u)", i, t[i].z, t[i].mass_number);
          /* Within an element heavier isotopes are heavier. */
          if (t[i - 1].z == t[i].z)
            assert_true (t[i].mass > t[i - 1].mass);
        }
      /* The lookup finds exactly this row. */
      assert_ptr_equal (qv_isotope_lookup (t[i].z, t[i].mass_number), &t[i]);
    }
}

/* Element rows against the isotope table: the reference isotope is there,
 * with the same mass, and for elements with a natural composition it is the
 * most abundant one. */
static void
test_elements_vs_isotopes (void **state G_GNUC_UNUSED)
{
  gsize n = 0;
  const QvIsotope *t = qv_isotope_table (&n);
  guint n_natural = 0;

  for (guint z = 1; z <= QV_ELEMENT_MAX_Z; z++)
    {
      const QvElement *e = qv_element_from_z (z);
      const QvIsotope *ref = qv_isotope_lookup (z, e->mass_number);
      double sum = 0.0, max_ab = 0.0, weighted = 0.0;
      guint count = 0;

      if (ref == NULL)
        fail_msg ("z = %u: reference isotope A = %u not in isotope table", z,
                  e->mass_number);
      assert_true (isfinite (e->isotope_mass));
      assert_true (e->isotope_mass == ref->mass);

      for (gsize i = 0; i < n; i++)
        if (t[i].z == z)
          {
            count++;
            sum += t[i].abundance;
            weighted += t[i].abundance * t[i].mass;
            max_ab = MAX (max_ab, t[i].abundance);
          }
      assert_true (count >= 1);
      /* Fractions of one element cannot add up to more than 1. */
      if (sum > 1.0 + 1e-6)
        fail_msg ("z = %u: abundances sum to %.9g > 1", z, sum);

      if (z <= 94 && e->stable)
        {
          n_natural++;
          assert_true (ref->abundance > 0.0);
          assert_true (ref->abundance == max_ab);
          /* The table lists complete natural compositions; CIAAW's
             representative values sum to 1 within their last digit. */
          if (fabs (sum - 1.0) > 1e-4)
            fail_msg ("z = %u: abundances sum to %.9g, not 1", z, sum);
          /* Every element with a natural composition has a standard atomic
             weight, and the abundance-weighted mean isotope mass agrees with
             it (CIAAW derives one from the other).  2e-4 relative covers the
             rounding of the abridged values, their uncertainties (Mo 95.95
             ± 0.01) and the conventional values of the interval elements,
             which are not the mean of the representative composition
             (S 32.06 for [32.059, 32.076], mean 32.0648). */
          assert_true (isfinite (e->standard_weight));
          if (fabs (weighted / sum - e->standard_weight)
              > 2e-4 * e->standard_weight)
            fail_msg ("z = %u: mean isotope mass %.6f vs standard weight %g",
                      z, weighted / sum, e->standard_weight);
        }
      else
        {
          /* No natural composition: no standard weight and nothing
             abundant (CIAAW gives none for these). */
          assert_false (e->stable);
          assert_true (isnan (e->standard_weight));
          if (max_ab != 0.0)
            fail_msg ("z = %u has no natural composition but an abundance",
                      z);
        }
    }
  /* CIAAW gives isotopic compositions for 84 elements: 1–83 without Tc and
     Pm, plus Th, Pa, U (from memory). */
  assert_int_equal (n_natural, 84);
  assert_false (qv_element_from_z (43)->stable);
  assert_false (qv_element_from_z (61)->stable);
  assert_false (qv_element_from_z (84)->stable);
  assert_true (qv_element_from_z (83)->stable);
  assert_true (qv_element_from_z (92)->stable);
}

static void
test_standard_weights (void **state G_GNUC_UNUSED)
{
  /* CIAAW 2021 abridged/conventional values, REFERENCES.md (memory). */
  assert_near (qv_element_from_z (1)->standard_weight, 1.008, 1e-12, "H");
  assert_near (qv_element_from_z (6)->standard_weight, 12.011, 1e-12, "C");
  assert_near (qv_element_from_z (7)->standard_weight, 14.007, 1e-12, "N");
  assert_near (qv_element_from_z (8)->standard_weight, 15.999, 1e-12, "O");
  /* Further CIAAW 2021 abridged values (from memory). */
  assert_near (qv_element_from_z (17)->standard_weight, 35.45, 1e-12, "Cl");
  assert_near (qv_element_from_z (26)->standard_weight, 55.845, 1e-12, "Fe");
  assert_near (qv_element_from_z (92)->standard_weight, 238.03, 1e-12, "U");
  assert_true (isnan (qv_element_from_z (43)->standard_weight));
  assert_true (isnan (qv_element_from_z (118)->standard_weight));
}

static void
test_covalent_radii (void **state G_GNUC_UNUSED)
{
  /* Cordero et al., Dalton Trans. 2008, 2832 (from memory). */
  assert_near (qv_element_from_z (1)->covalent_radius, 0.31, 1e-12, "H");
  assert_near (qv_element_from_z (6)->covalent_radius, 0.76, 1e-12, "C sp3");
  assert_near (qv_element_from_z (8)->covalent_radius, 0.66, 1e-12, "O");
  assert_near (qv_element_from_z (26)->covalent_radius, 1.32, 1e-12,
               "Fe low spin");
  assert_near (qv_element_from_z (55)->covalent_radius, 2.44, 1e-12, "Cs");
  /* The paper covers Z ≤ 96 only. */
  for (guint z = 1; z <= QV_ELEMENT_MAX_Z; z++)
    {
      double r = qv_element_from_z (z)->covalent_radius;

      if (z <= 96)
        {
          if (!(r >= 0.25 && r <= 2.7))
            fail_msg ("z = %u: covalent radius %g out of range", z, r);
        }
      else if (!isnan (r))
        fail_msg ("z = %u: covalent radius %g, want NAN", z, r);
    }
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_from_z),
    cmocka_unit_test (test_from_symbol),
    cmocka_unit_test (test_symbols_and_names),
    cmocka_unit_test (test_isotope_lookup),
    cmocka_unit_test (test_isotope_table_sorted),
    cmocka_unit_test (test_elements_vs_isotopes),
    cmocka_unit_test (test_standard_weights),
    cmocka_unit_test (test_covalent_radii),
  };

  return cmocka_run_group_tests (tests, NULL, NULL);
}
