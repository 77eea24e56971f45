/* test-bonds.c — bond perception from covalent radii (src/core/qv-bonds.c).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>
#include "qv-bonds.h"
#include "qv-element.h"
#include "qv-structure.h"

/* Staggered ethane and a water molecule 6 Å away, built here from bond
 * lengths and angles (from memory, typical experimental values: C–C
 * 1.535 Å, C–H 1.094 Å, H–C–C 111.2°; O–H 0.958 Å, H–O–H 104.5°). By
 * chemistry ethane has 7 bonds (one C–C, six C–H) and water 2. */
static QvStructure *
ethane_and_water (void)
{
  QvStructure *s = qv_structure_new (11, NULL);
  double cc = 1.535, ch = 1.094, hcc = 111.2 * G_PI / 180.0;
  double oh = 0.958, hoh = 104.5 * G_PI / 180.0;
  gsize k = 0;

  qv_structure_set_element (s, k, 6, NULL);
  s->atoms[k].position[2] = 0.0;
  k++;
  qv_structure_set_element (s, k, 6, NULL);
  s->atoms[k].position[2] = cc;
  k++;
  for (int c = 0; c < 2; c++)
    for (int h = 0; h < 3; h++)
      {
        /* Staggered: the second methyl turned by 60°. */
        double phi = (2.0 * G_PI / 3.0) * h + (c ? G_PI / 3.0 : 0.0);
        double zc = c ? cc : 0.0, dir = c ? 1.0 : -1.0;
        qv_structure_set_element (s, k, 1, NULL);
        s->atoms[k].position[0] = ch * sin (hcc) * cos (phi);
        s->atoms[k].position[1] = ch * sin (hcc) * sin (phi);
        s->atoms[k].position[2] = zc - dir * ch * cos (hcc);
        k++;
      }
  qv_structure_set_element (s, k, 8, NULL);
  s->atoms[k].position[0] = 6.0;
  k++;
  for (int h = 0; h < 2; h++)
    {
      double a = (h ? 0.5 : -0.5) * hoh;
      qv_structure_set_element (s, k, 1, NULL);
      s->atoms[k].position[0] = 6.0 + oh * sin (a);
      s->atoms[k].position[1] = oh * cos (a);
      k++;
    }
  g_assert (k == 11);
  return s;
}

static void
test_molecules (void **state)
{
  g_autoptr(QvStructure) s = ethane_and_water ();
  gsize n = 0;
  g_autofree QvBond *b = qv_bonds_perceive (s, QV_BONDS_DEFAULT_TOLERANCE, &n);

  assert_int_equal (n, 9);
  /* Sorted: C0–C1, C0–H2..4, C1–H5..7, O8–H9, O8–H10. */
  assert_int_equal (b[0].a, 0);
  assert_int_equal (b[0].b, 1);
  for (int h = 0; h < 3; h++)
    {
      assert_int_equal (b[1 + h].a, 0);
      assert_int_equal (b[1 + h].b, 2 + h);
      assert_int_equal (b[4 + h].a, 1);
      assert_int_equal (b[4 + h].b, 5 + h);
    }
  assert_int_equal (b[7].a, 8);
  assert_int_equal (b[7].b, 9);
  assert_int_equal (b[8].a, 8);
  assert_int_equal (b[8].b, 10);
}

/* The criterion itself: two carbons (Cordero r = 0.76 Å) bond below
 * 1.52 × 1.15 = 1.748 Å and not above. */
static void
test_threshold (void **state)
{
  g_autoptr(QvStructure) s = qv_structure_new (2, NULL);
  gsize n = 0;
  QvBond *b;

  qv_structure_set_element (s, 0, 6, NULL);
  qv_structure_set_element (s, 1, 6, NULL);
  s->atoms[1].position[0] = 1.747;
  b = qv_bonds_perceive (s, 0.15, &n);
  assert_int_equal (n, 1);
  g_free (b);
  s->atoms[1].position[0] = 1.749;
  b = qv_bonds_perceive (s, 0.15, &n);
  assert_int_equal (n, 0);
  assert_null (b);
  /* A smaller tolerance drops it sooner. */
  s->atoms[1].position[0] = 1.60;
  b = qv_bonds_perceive (s, 0.0, &n);
  assert_int_equal (n, 0);
  g_free (b);
  assert_true (fabs (qv_bonds_radius (6) - 0.76) < 1e-12);
  assert_true (fabs (qv_bonds_radius (118) - QV_BONDS_FALLBACK_RADIUS) < 1e-12);
}

/* Periodic structures: no bond across the cell boundary (documented). */
static void
test_no_minimum_image (void **state)
{
  g_autoptr(QvStructure) s = qv_structure_new (2, NULL);
  gsize n = 0;
  g_autofree QvBond *b = NULL;

  s->has_cell = TRUE;
  s->pbc[0] = s->pbc[1] = s->pbc[2] = TRUE;
  for (int k = 0; k < 3; k++)
    s->cell[k][k] = 5.0;
  qv_structure_set_element (s, 0, 6, NULL);
  qv_structure_set_element (s, 1, 6, NULL);
  s->atoms[0].position[0] = 0.2;
  s->atoms[1].position[0] = 4.8;   /* 0.4 Å away through the face */
  b = qv_bonds_perceive (s, QV_BONDS_DEFAULT_TOLERANCE, &n);
  assert_int_equal (n, 0);
}

/* The cell list against the O(N²) definition on a random cloud. */
static void
test_against_brute_force (void **state)
{
  static const guint zs[] = { 1, 6, 7, 8, 16 };
  const gsize n = 2000;
  g_autofree double *pos = g_new (double, 3 * n);
  g_autofree double *radii = g_new (double, n);
  g_autofree QvBond *fast = NULL;
  GArray *slow = g_array_new (FALSE, FALSE, sizeof (QvBond));
  GRand *rand = g_rand_new_with_seed (20240517);
  gsize n_fast = 0;

  for (gsize i = 0; i < n; i++)
    {
      for (int k = 0; k < 3; k++)
        pos[3 * i + k] = g_rand_double_range (rand, -12.0, 12.0);
      radii[i] = qv_bonds_radius (zs[g_rand_int_range (rand, 0, G_N_ELEMENTS (zs))]);
    }
  g_rand_free (rand);
  fast = qv_bonds_perceive_points (pos, radii, n, QV_BONDS_DEFAULT_TOLERANCE, &n_fast);
  for (gsize i = 0; i < n; i++)
    for (gsize j = i + 1; j < n; j++)
      {
        double d = sqrt ((pos[3 * i] - pos[3 * j]) * (pos[3 * i] - pos[3 * j])
                         + (pos[3 * i + 1] - pos[3 * j + 1]) * (pos[3 * i + 1] - pos[3 * j + 1])
                         + (pos[3 * i + 2] - pos[3 * j + 2]) * (pos[3 * i + 2] - pos[3 * j + 2]));
        if (d > 0.0 && d < (radii[i] + radii[j]) * (1.0 + QV_BONDS_DEFAULT_TOLERANCE))
          {
            QvBond b = { (guint32) i, (guint32) j };
            g_array_append_val (slow, b);
          }
      }
  /* Dense enough that the comparison means something. */
  assert_true (slow->len > 500);
  assert_int_equal (n_fast, slow->len);
  assert_memory_equal (fast, slow->data, n_fast * sizeof (QvBond));
  g_array_free (slow, TRUE);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_molecules),
    cmocka_unit_test (test_threshold),
    cmocka_unit_test (test_no_minimum_image),
    cmocka_unit_test (test_against_brute_force),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
