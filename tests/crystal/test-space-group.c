/* test-space-group.c — space groups, primitive and standard cells via spglib.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Sources of the expected values, beside each check:
 * - rock salt: Fm-3m, No. 225, point group m-3m, 48 × 4 = 192 operations in
 *   the conventional cell; fcc primitive vectors a/2 (0,1,1) … of length
 *   a/√2 and volume a³/4, one NaCl per primitive cell (Kittel, Introduction
 *   to Solid State Physics, ch. 1);
 * - P2_1/c is No. 14 with 4 operations (International Tables Vol. A, from
 *   memory); the hexagonal lattice with one atom is P6/mmm, No. 191, 24
 *   operations (ITA, from memory);
 * - that an operation maps the crystal onto itself and that a cell's rows
 *   are lattice vectors are checked by the test's own arithmetic. */
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <setjmp.h>
#include <math.h>
#include <string.h>
#include <cmocka.h>

#include <glib.h>
#include "qv-cif.h"
#include "qv-error.h"
#include "qv-space-group.h"

#define A_NACL 5.64

static QvStructure *
read_cif (const char *file)
{
  g_autofree char *path = g_build_filename (QV_CIF_TEST_DATA, file, NULL);
  g_autoptr(GError) error = NULL;
  QvStructure *s = qv_cif_read_file (path, NULL, &error);

  if (s == NULL)
    print_error ("%s\n", error->message);
  assert_non_null (s);
  return s;
}

static double
det3 (const double m[3][3])
{
  return m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1])
         - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0])
         + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0]);
}

/* Solves f C = r for f (rows of C are the lattice vectors), by Cramer. */
static void
to_fractional (const double cell[3][3], const double r[3], double f[3])
{
  double d = det3 (cell);
  for (int k = 0; k < 3; k++)
    {
      double m[3][3];
      memcpy (m, cell, sizeof m);
      for (int x = 0; x < 3; x++)
        m[k][x] = r[x];
      f[k] = det3 ((const double (*)[3]) m) / d;
    }
}

static double
length (const double v[3])
{
  return sqrt (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]);
}

/* Every row of @cell, in @lattice's fractional coordinates, is a multiple
 * of 1/@denominator; returns the largest deviation. */
static double
rows_off_lattice (const double cell[3][3], const double lattice[3][3], double denominator)
{
  double worst = 0.0;
  for (int i = 0; i < 3; i++)
    {
      double f[3];
      to_fractional (lattice, cell[i], f);
      for (int k = 0; k < 3; k++)
        worst = MAX (worst, fabs (f[k] * denominator - round (f[k] * denominator)));
    }
  return worst;
}

/* Each operation x' = R x + t (x a column of fractional coordinates) sends
 * every atom onto an atom of the same element, modulo lattice vectors. */
static void
assert_operations_map_crystal (const QvSpaceGroup *g, const QvStructure *s, double tol)
{
  g_autofree double *frac = g_new (double, 3 * s->n_atoms);

  for (gsize a = 0; a < s->n_atoms; a++)
    to_fractional (s->cell, s->atoms[a].position, frac + 3 * a);
  for (gsize k = 0; k < g->n_operations; k++)
    for (gsize a = 0; a < s->n_atoms; a++)
      {
        double y[3];
        gboolean found = FALSE;
        for (int i = 0; i < 3; i++)
          {
            y[i] = g->translations[k][i];
            for (int j = 0; j < 3; j++)
              y[i] += g->rotations[k][i][j] * frac[3 * a + j];
          }
        for (gsize b = 0; b < s->n_atoms && !found; b++)
          {
            double worst = 0.0;
            for (int i = 0; i < 3; i++)
              {
                double d = y[i] - frac[3 * b + i];
                worst = MAX (worst, fabs (d - round (d)));
              }
            found = worst < tol && s->atoms[b].z == s->atoms[a].z;
          }
        assert_true (found);
      }
}

static void
rotate_and_permute (QvStructure *s)
{
  /* Rodrigues rotation about (1, 2, 3)/√14 by 0.7 rad; atoms reversed. */
  double n[3] = { 1 / sqrt (14.0), 2 / sqrt (14.0), 3 / sqrt (14.0) };
  double c = cos (0.7), sn = sin (0.7), q[3][3];
  g_autofree QvAtom *copy = g_memdup2 (s->atoms, sizeof (QvAtom) * s->n_atoms);

  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      q[i][j] = (i == j ? c : 0.0) + (1 - c) * n[i] * n[j];
  q[0][1] -= sn * n[2]; q[0][2] += sn * n[1];
  q[1][0] += sn * n[2]; q[1][2] -= sn * n[0];
  q[2][0] -= sn * n[1]; q[2][1] += sn * n[0];

  for (gsize a = 0; a < s->n_atoms; a++)
    s->atoms[a] = copy[s->n_atoms - 1 - a];
  for (gsize k = 0; k < s->n_atoms + 3; k++)
    {
      /* The atoms' positions, then the three lattice vectors. */
      double *w = k < s->n_atoms ? s->atoms[k].position : s->cell[k - s->n_atoms], r[3];
      for (int i = 0; i < 3; i++)
        r[i] = q[i][0] * w[0] + q[i][1] * w[1] + q[i][2] * w[2];
      memcpy (w, r, sizeof r);
    }
}

/* ------------------------------------------------------------------ */

static void
test_rocksalt (void **state)
{
  g_autoptr(QvStructure) s = read_cif ("rocksalt.cif");
  g_autoptr(GError) error = NULL;
  g_autoptr(QvSpaceGroup) g = qv_space_group_find (s, 0.0, &error);
  double cube[3][3] = { { A_NACL, 0, 0 }, { 0, A_NACL, 0 }, { 0, 0, A_NACL } };

  assert_non_null (g);
  assert_int_equal (g->number, 225);                 /* Fm-3m (Kittel ch. 1; ITA) */
  assert_string_equal (g->international, "Fm-3m");
  assert_string_equal (g->point_group, "m-3m");
  assert_int_equal (g->n_operations, 192);           /* 48 × 4 centrings */
  assert_float_equal (g->symprec, QV_SPACE_GROUP_DEFAULT_SYMPREC, 0.0);
  assert_operations_map_crystal (g, s, 1e-9);

  /* Equivalent atoms: all Na one orbit, all Cl another. */
  assert_int_equal (g->n_atoms, 8);
  for (gsize a = 0; a < 8; a++)
    for (gsize b = 0; b < 8; b++)
      assert_true ((g->equivalent_atoms[a] == g->equivalent_atoms[b])
                   == (s->atoms[a].z == s->atoms[b].z));

  /* Primitive: one Na and one Cl, fcc vectors of length a/√2, volume a³/4,
   * each row half-integer in the cube's coordinates. */
  assert_int_equal (g->primitive->n_atoms, 2);
  assert_int_equal (g->primitive->atoms[0].z + g->primitive->atoms[1].z, 11 + 17);
  for (int i = 0; i < 3; i++)
    assert_float_equal (length (g->primitive->cell[i]), A_NACL / sqrt (2.0), 1e-9);
  assert_float_equal (fabs (det3 ((const double (*)[3]) g->primitive->cell)),
                      A_NACL * A_NACL * A_NACL / 4.0, 1e-9);
  assert_true (rows_off_lattice (g->primitive->cell, (const double (*)[3]) cube, 2.0) < 1e-9);
  assert_true (g->primitive->pbc[0] && g->primitive->has_cell);
  /* Masses travel with the atom types. */
  for (gsize a = 0; a < 2; a++)
    assert_float_equal (g->primitive->atoms[a].mass,
                        g->primitive->atoms[a].z == 11 ? s->atoms[0].mass : s->atoms[4].mass, 0.0);

  /* Standard conventional cell: the cube again, 8 atoms. */
  assert_int_equal (g->standardized->n_atoms, 8);
  assert_float_equal (fabs (det3 ((const double (*)[3]) g->standardized->cell)),
                      A_NACL * A_NACL * A_NACL, 1e-9);
  assert_true (rows_off_lattice (g->standardized->cell, (const double (*)[3]) cube, 1.0) < 1e-9);
}

/* A cell whose row matrix is not symmetric: a transposition anywhere
 * (rows handed to spglib as columns, or back) gives another lattice. */
static void
test_hexagonal_catches_transposition (void **state)
{
  const double a = 2.5, c = 4.1;
  g_autoptr(QvStructure) s = qv_structure_new (1, NULL);
  g_autoptr(GError) error = NULL;
  g_autoptr(QvSpaceGroup) g = NULL;
  double transposed[3][3];

  qv_structure_set_element (s, 0, 6, NULL);
  s->has_cell = TRUE;
  s->pbc[0] = s->pbc[1] = s->pbc[2] = TRUE;
  s->cell[0][0] = a;
  s->cell[1][0] = -a / 2;
  s->cell[1][1] = a * sqrt (3.0) / 2;
  s->cell[2][2] = c;
  s->atoms[0].position[0] = 0.3;     /* anywhere: one atom per cell */
  s->atoms[0].position[1] = 0.2;
  s->atoms[0].position[2] = 0.1;

  g = qv_space_group_find (s, 0.0, &error);
  assert_non_null (g);
  assert_int_equal (g->number, 191);                 /* P6/mmm (ITA, from memory) */
  assert_int_equal (g->n_operations, 24);
  /* The primitive cell's rows are a basis of the input lattice: integer
   * coordinates, |det| = 1. Transposed rows would not be. */
  assert_true (rows_off_lattice (g->primitive->cell, (const double (*)[3]) s->cell, 1.0) < 1e-9);
  assert_float_equal (fabs (det3 ((const double (*)[3]) g->primitive->cell)),
                      fabs (det3 ((const double (*)[3]) s->cell)), 1e-9);
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      transposed[i][j] = s->cell[j][i];
  assert_true (rows_off_lattice ((const double (*)[3]) transposed, (const double (*)[3]) s->cell, 1.0) > 0.1);
  assert_operations_map_crystal (g, s, 1e-9);

  /* The same atoms in the transposed cell are not hexagonal: the test above
   * would notice a transposition. */
  memcpy (s->cell, transposed, sizeof transposed);
  {
    g_autoptr(QvSpaceGroup) t = qv_space_group_find (s, 0.0, &error);
    assert_non_null (t);
    assert_int_not_equal (t->number, 191);
  }
}

static void
test_monoclinic (void **state)
{
  g_autoptr(QvStructure) s = read_cif ("monoclinic.cif");
  g_autoptr(GError) error = NULL;
  /* The file's coordinates have 4 decimals: a looser tolerance. */
  g_autoptr(QvSpaceGroup) g = qv_space_group_find (s, 1e-3, &error);

  if (g == NULL)
    print_error ("%s\n", error->message);
  assert_non_null (g);
  assert_int_equal (g->number, 14);                  /* P2_1/c (ITA, from memory) */
  assert_string_equal (g->international, "P2_1/c");
  assert_int_equal (g->n_operations, 4);
  assert_operations_map_crystal (g, s, 1e-9);
  for (gsize a = 0; a < s->n_atoms; a++)
    for (gsize b = 0; b < s->n_atoms; b++)
      assert_true ((g->equivalent_atoms[a] == g->equivalent_atoms[b])
                   == (s->atoms[a].z == s->atoms[b].z));
  assert_true (rows_off_lattice (g->primitive->cell, (const double (*)[3]) s->cell, 1.0) < 1e-9);
  assert_int_equal (g->primitive->n_atoms, 8);
}

/* A rotated frame and another atom order describe the same crystal. */
static void
test_rotated_permuted (void **state)
{
  const char *files[] = { "rocksalt.cif", "monoclinic.cif" };

  for (gsize f = 0; f < G_N_ELEMENTS (files); f++)
    {
      g_autoptr(QvStructure) s = read_cif (files[f]);
      g_autoptr(QvStructure) r = qv_structure_copy (s);
      g_autoptr(GError) error = NULL;
      g_autoptr(QvSpaceGroup) g0 = NULL, g1 = NULL;
      gsize n = s->n_atoms;

      rotate_and_permute (r);
      g0 = qv_space_group_find (s, 1e-3, &error);
      g1 = qv_space_group_find (r, 1e-3, &error);
      assert_non_null (g0);
      assert_non_null (g1);
      assert_int_equal (g0->number, g1->number);
      assert_int_equal (g0->n_operations, g1->n_operations);
      assert_string_equal (g0->international, g1->international);
      /* Same orbits, with atom a of s at n-1-a in r. */
      for (gsize a = 0; a < n; a++)
        for (gsize b = 0; b < n; b++)
          assert_true ((g0->equivalent_atoms[a] == g0->equivalent_atoms[b])
                       == (g1->equivalent_atoms[n - 1 - a] == g1->equivalent_atoms[n - 1 - b]));
      /* The primitive cell stays in the rotated frame, its rows lattice
       * vectors of the rotated lattice (half-integers for the fcc one). */
      assert_true (rows_off_lattice (g1->primitive->cell, (const double (*)[3]) r->cell, 2.0) < 1e-9);
      assert_int_equal (g0->primitive->n_atoms, g1->primitive->n_atoms);
      assert_operations_map_crystal (g1, r, 1e-8);
    }
}

static void
test_idealized (void **state)
{
  g_autoptr(QvStructure) s = read_cif ("rocksalt.cif");
  g_autoptr(GError) error = NULL;
  g_autoptr(QvStructure) prim = NULL;
  g_autoptr(QvStructure) conv = NULL;

  rotate_and_permute (s);
  prim = qv_space_group_primitive (s, 0.0, TRUE, &error);
  assert_non_null (prim);
  assert_int_equal (prim->n_atoms, 2);
  for (int i = 0; i < 3; i++)
    assert_float_equal (length (prim->cell[i]), A_NACL / sqrt (2.0), 1e-9);
  /* Idealised: the cube back along x, y, z (spglib's standard orientation). */
  conv = qv_space_group_standardized (s, 0.0, TRUE, &error);
  assert_non_null (conv);
  assert_int_equal (conv->n_atoms, 8);
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      assert_float_equal (conv->cell[i][j], i == j ? A_NACL : 0.0, 1e-9);
  /* Not idealised: still rotated. */
  g_clear_pointer (&conv, qv_structure_free);
  conv = qv_space_group_standardized (s, 0.0, FALSE, &error);
  assert_non_null (conv);
  assert_true (fabs (conv->cell[0][1]) > 0.1 || fabs (conv->cell[0][2]) > 0.1);
}

/* Atom types follow the masses: one 37Cl in rock salt breaks Fm-3m. */
static void
test_isotope_lowers_symmetry (void **state)
{
  g_autoptr(QvStructure) s = read_cif ("rocksalt.cif");
  g_autoptr(GError) error = NULL;
  g_autoptr(QvSpaceGroup) g = NULL;
  gsize cl = 0;

  while (s->atoms[cl].z != 17)
    cl++;
  assert_true (qv_structure_set_isotope (s, cl, 37, &error));
  g = qv_space_group_find (s, 0.0, &error);
  assert_non_null (g);
  assert_int_not_equal (g->number, 225);
  assert_true (g->n_operations < 192);
  assert_operations_map_crystal (g, s, 1e-9);
}

static void
test_errors (void **state)
{
  g_autoptr(QvStructure) s = read_cif ("rocksalt.cif");
  g_autoptr(GError) error = NULL;

  s->pbc[2] = FALSE;
  assert_null (qv_space_group_find (s, 0.0, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  assert_non_null (strstr (error->message, "periodic in all three directions"));
  g_clear_error (&error);

  /* Two atoms on one spot: spglib refuses, and says why. */
  s->pbc[2] = TRUE;
  memcpy (s->atoms[1].position, s->atoms[0].position, sizeof s->atoms[0].position);
  assert_null (qv_space_group_find (s, 0.0, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  assert_non_null (strstr (error->message, "spglib could not find the space group"));
}

/* Calls from several threads at once: the lock keeps spglib's global
 * state consistent, each thread gets the right answer. */
static gpointer
worker (gpointer data)
{
  const QvStructure *s = data;
  for (int i = 0; i < 3; i++)
    {
      QvSpaceGroup *g = qv_space_group_find (s, 0.0, NULL);
      QvStructure *p = qv_space_group_primitive (s, 0.0, FALSE, NULL);
      gboolean ok = g != NULL && g->number == 225 && p != NULL && p->n_atoms == 2;
      qv_space_group_free (g);
      qv_structure_free (p);
      if (!ok)
        return GINT_TO_POINTER (0);
    }
  return GINT_TO_POINTER (1);
}

static void
test_threads (void **state)
{
  g_autoptr(QvStructure) s = read_cif ("rocksalt.cif");
  GThread *threads[4];

  for (int i = 0; i < 4; i++)
    threads[i] = g_thread_new ("spg", worker, s);
  for (int i = 0; i < 4; i++)
    assert_int_equal (GPOINTER_TO_INT (g_thread_join (threads[i])), 1);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_rocksalt),
    cmocka_unit_test (test_hexagonal_catches_transposition),
    cmocka_unit_test (test_monoclinic),
    cmocka_unit_test (test_rotated_permuted),
    cmocka_unit_test (test_idealized),
    cmocka_unit_test (test_isotope_lowers_symmetry),
    cmocka_unit_test (test_errors),
    cmocka_unit_test (test_threads),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
