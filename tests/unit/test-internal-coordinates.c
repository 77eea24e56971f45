/* test-internal-coordinates.c — perception of valence coordinates, their
 * Wilson B-matrix rows against numerical differentiation, and the mode
 * make-up on a small force field (src/core/qv-internal-coordinates.c,
 * src/core/qv-mode-character.c).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>
#include "qv-bonds.h"
#include "qv-error.h"
#include "qv-internal-coordinates.h"
#include "qv-mode-character.h"
#include "qv-test-util.h"

#define DEG (G_PI / 180.0)

static void
place (double *x, gsize atom, const double *from, double r, const double *dir)
{
  double n = sqrt (dir[0] * dir[0] + dir[1] * dir[1] + dir[2] * dir[2]);
  for (int c = 0; c < 3; c++)
    x[3 * atom + c] = from[c] + r * dir[c] / n;
}

/* An invented ethanol-like CH3–CH2–OH, staggered, from typical bond lengths
 * and angles (from memory: C–C 1.52 Å, C–O 1.43 Å, C–H 1.09 Å, O–H 0.96 Å,
 * tetrahedral 109.5°, C–O–H 108°). Atoms: C1, C2, O3, H4–H6 on C1, H7–H8 on
 * C2, H9 on O3. */
static QvStructure *
ethanol_like (void)
{
  const guint z[9] = { 6, 6, 8, 1, 1, 1, 1, 1, 1 };
  double x[27] = { 0 };
  double th = (180.0 - 109.5) * DEG;
  x[5] = 1.52;
  for (int h = 0; h < 3; h++)
    {
      double phi = 120.0 * h * DEG;
      double d[3] = { sin (th) * cos (phi), sin (th) * sin (phi), -cos (th) };
      place (x, 3 + (gsize) h, x, 1.09, d);
    }
  for (int h = 0; h < 3; h++)
    {
      double phi = (60.0 + 120.0 * h) * DEG;
      double d[3] = { sin (th) * cos (phi), sin (th) * sin (phi), cos (th) };
      place (x, h == 0 ? 2 : 5 + (gsize) h, x + 3, h == 0 ? 1.43 : 1.09, d);
    }
  {
    /* H9: 108° from C2 at O3, turned towards +z. */
    double e[3], p[3], d[3], n = 0.0, ez;
    for (int c = 0; c < 3; c++)
      e[c] = (x[6 + c] - x[3 + c]) / 1.43;
    ez = e[2];
    for (int c = 0; c < 3; c++)
      {
        p[c] = (c == 2 ? 1.0 : 0.0) - ez * e[c];
        n += p[c] * p[c];
      }
    for (int c = 0; c < 3; c++)
      d[c] = cos (72.0 * DEG) * e[c] + sin (72.0 * DEG) * p[c] / sqrt (n);
    place (x, 8, x + 6, 0.96, d);
  }
  return qvt_structure (9, z, x);
}

static gsize
count_family (const QvInternalCoordinates *ic, const char *family)
{
  gsize n = 0;
  for (gsize i = 0; i < ic->n_coordinates; i++)
    n += strcmp (ic->coordinates[i].family, family) == 0;
  return n;
}

static const QvInternalCoordinate *
find_name (const QvInternalCoordinates *ic, const char *name)
{
  for (gsize i = 0; i < ic->n_coordinates; i++)
    if (strcmp (ic->coordinates[i].name, name) == 0)
      return &ic->coordinates[i];
  return NULL;
}

/* Counts derived by hand from the bond graph (9 atoms; C1 and C2 have four
 * neighbours each, O3 two, every H one):
 *   bonds: C1–C2, C2–O3, 3 × C1–H, 2 × C2–H, O3–H9           = 8
 *   angles: C(4,2) = 6 at C1, 6 at C2, 1 at O3                = 13
 *     H–C–H: 3 at C1 + 1 at C2 = 4; H–C–C: 3 at C1 + 2 at C2 = 5;
 *     H–C–O: 2 at C2; C–C–O: 1; H–O–C: 1
 *   dihedrals about C1–C2: 3 other neighbours × 3 other neighbours = 9
 *     (6 H–C–C–H, 3 H–C–C–O); about C2–O3: 3 × 1 = 3 (1 H–O–C–C,
 *     2 H–C–O–H); about any X–H bond: none (H has no other neighbour)   = 12
 *   out-of-plane: no three-coordinate centre                  = 0
 * 33 coordinates for 3N − 6 = 21 vibrations. */
static void
test_ethanol_perception (void **state)
{
  g_autoptr(QvStructure) s = ethanol_like ();
  g_autoptr(GError) error = NULL;
  g_autoptr(QvInternalCoordinates) ic = qv_internal_coordinates_new (s, QV_BONDS_DEFAULT_TOLERANCE, &error);
  (void) state;

  assert_non_null (ic);
  assert_int_equal (qv_internal_coordinates_count (ic, QV_INTERNAL_STRETCH), 8);
  assert_int_equal (qv_internal_coordinates_count (ic, QV_INTERNAL_BEND), 13);
  assert_int_equal (qv_internal_coordinates_count (ic, QV_INTERNAL_LINEAR_BEND), 0);
  assert_int_equal (qv_internal_coordinates_count (ic, QV_INTERNAL_TORSION), 12);
  assert_int_equal (qv_internal_coordinates_count (ic, QV_INTERNAL_OUT_OF_PLANE), 0);
  assert_int_equal (ic->n_coordinates, 33);
  assert_int_equal (count_family (ic, "C\u2013H stretch"), 5);
  assert_int_equal (count_family (ic, "O\u2013H stretch"), 1);
  assert_int_equal (count_family (ic, "C\u2013C stretch"), 1);
  assert_int_equal (count_family (ic, "C\u2013O stretch"), 1);
  assert_int_equal (count_family (ic, "H\u2013C\u2013H bend"), 4);
  assert_int_equal (count_family (ic, "H\u2013C\u2013C bend"), 5);
  assert_int_equal (count_family (ic, "H\u2013C\u2013O bend"), 2);
  assert_int_equal (count_family (ic, "C\u2013C\u2013O bend"), 1);
  assert_int_equal (count_family (ic, "H\u2013O\u2013C bend"), 1);
  assert_int_equal (count_family (ic, "H\u2013C\u2013C\u2013H torsion"), 6);
  assert_int_equal (count_family (ic, "H\u2013C\u2013C\u2013O torsion"), 3);
  assert_int_equal (count_family (ic, "H\u2013O\u2013C\u2013C torsion"), 1);
  assert_int_equal (count_family (ic, "H\u2013C\u2013O\u2013H torsion"), 2);
  /* Names number atoms from 1; values are the geometry's own (built above). */
  {
    const QvInternalCoordinate *c = find_name (ic, "C1\u2013C2");
    assert_non_null (c);
    assert_true (fabs (c->value - 1.52) < 1e-12);
    c = find_name (ic, "C2\u2013O3\u2013H9");
    assert_non_null (c);
    assert_true (fabs (c->value - 108.0 * DEG) < 1e-9);
    c = find_name (ic, "H4\u2013C1\u2013C2\u2013O3");
    assert_non_null (c);
    /* O3 staggered 60° from H4 about C1–C2 (built so); the sign depends on
       the direction of view, the size does not. */
    assert_true (fabs (fabs (c->value) - 60.0 * DEG) < 1e-9);
  }
  assert_null (ic->notes[0]);
}

/* Four-point central differences (error O(h⁴)) of the coordinate's own
 * value, as an independent check on the analytic s-vectors. Torsion values
 * are unwrapped across ±π. */
static void
check_rows (const QvInternalCoordinate *c, const double *x0, gsize n_atoms, const char *what)
{
  const gsize n = 3 * n_atoms;
  const double h = 1e-4;
  g_autofree double *row = g_new (double, n);
  g_autofree double *dummy = g_new (double, n);
  g_autofree double *x = g_memdup2 (x0, n * sizeof (double));
  double v0 = qv_internal_coordinate_evaluate (c, x0, n_atoms, row);

  for (gsize q = 0; q < n; q++)
    {
      double f[4], steps[4] = { h, -h, 2 * h, -2 * h }, num;
      for (int t = 0; t < 4; t++)
        {
          x[q] = x0[q] + steps[t];
          f[t] = qv_internal_coordinate_evaluate (c, x, n_atoms, dummy) - v0;
          f[t] = remainder (f[t], 2.0 * G_PI);
          x[q] = x0[q];
        }
      num = (8.0 * (f[0] - f[1]) - (f[2] - f[3])) / (12.0 * h);
      if (fabs (num - row[q]) > 1e-8)
        print_error ("%s %s: d/dx[%zu] analytic %.12g numerical %.12g\n", what, c->name,
                     (size_t) q, row[q], num);
      assert_true (fabs (num - row[q]) <= 1e-8);
    }
}

static void
check_all_rows (const QvStructure *s, const char *what, gsize *kinds)
{
  g_autoptr(QvInternalCoordinates) ic = qv_internal_coordinates_new (s, QV_BONDS_DEFAULT_TOLERANCE, NULL);
  g_autofree double *x = g_new (double, 3 * s->n_atoms);

  assert_non_null (ic);
  for (gsize a = 0; a < s->n_atoms; a++)
    memcpy (x + 3 * a, s->atoms[a].position, sizeof (double) * 3);
  for (gsize i = 0; i < ic->n_coordinates; i++)
    {
      /* the stored row is the one evaluate gives */
      g_autofree double *row = g_new (double, 3 * s->n_atoms);
      qv_internal_coordinate_evaluate (&ic->coordinates[i], x, s->n_atoms, row);
      assert_memory_equal (row, qv_internal_coordinates_b_row (ic, i), 3 * s->n_atoms * sizeof (double));
      check_rows (&ic->coordinates[i], x, s->n_atoms, what);
      kinds[ic->coordinates[i].kind]++;
    }
}

/* A planar formaldehyde-like H2C=O (invented, slightly unequal C–H so no
 * symmetry helps): C1 planar three-coordinate → one out-of-plane angle. */
static QvStructure *
formaldehyde_like (double lift)
{
  const guint z[4] = { 6, 8, 1, 1 };
  double x[12] = { 0, 0, 0,  0, 0, 1.21,
                   1.10 * sin (121.5 * DEG), 0, 1.10 * cos (121.5 * DEG),
                   -1.11 * sin (121.0 * DEG), 0, 1.11 * cos (121.0 * DEG) };
  x[4] = lift;     /* O3 lifted out of the plane: not planar any more */
  return qvt_structure (4, z, x);
}

/* HCN-like, bent to 178° (invented): the angle is near-linear. */
static QvStructure *
hcn_like (void)
{
  const guint z[3] = { 1, 6, 7 };
  double x[9] = { 1.06 * sin (2.0 * DEG), 0.0, -1.06 * cos (2.0 * DEG), 0, 0, 0, 0, 0, 1.15 };
  return qvt_structure (3, z, x);
}

static void
test_b_rows_numerical (void **state)
{
  gsize kinds[5] = { 0 };
  g_autoptr(QvStructure) eth = ethanol_like ();
  g_autoptr(QvStructure) form = formaldehyde_like (0.0);
  g_autoptr(QvStructure) hcn = hcn_like ();
  (void) state;

  /* a distorted ethanol: no value sits at a special point */
  for (gsize a = 0; a < eth->n_atoms; a++)
    for (int c = 0; c < 3; c++)
      eth->atoms[a].position[c] += 0.03 * sin (1.7 * (double) a + 2.3 * c);
  check_all_rows (eth, "ethanol-like", kinds);
  check_all_rows (form, "formaldehyde-like", kinds);
  check_all_rows (hcn, "HCN-like", kinds);
  assert_true (kinds[QV_INTERNAL_STRETCH] == 8 + 3 + 2);
  assert_true (kinds[QV_INTERNAL_BEND] == 13 + 3);
  assert_true (kinds[QV_INTERNAL_TORSION] == 12);
  assert_true (kinds[QV_INTERNAL_OUT_OF_PLANE] == 1);
  assert_true (kinds[QV_INTERNAL_LINEAR_BEND] == 2);

  /* The out-of-plane row away from the plane (θ ≈ 4.7°), where tan θ terms
     of WDC's s-vectors matter: evaluated directly on a lifted geometry. */
  {
    g_autoptr(QvInternalCoordinates) ic = qv_internal_coordinates_new (form, QV_BONDS_DEFAULT_TOLERANCE, NULL);
    g_autoptr(QvStructure) lifted = formaldehyde_like (0.1);
    double x[12];
    const QvInternalCoordinate *oop = NULL;
    for (gsize i = 0; i < ic->n_coordinates; i++)
      if (ic->coordinates[i].kind == QV_INTERNAL_OUT_OF_PLANE)
        oop = &ic->coordinates[i];
    assert_non_null (oop);
    assert_string_equal (oop->name, "O2 out of H3\u2013C1\u2013H4");
    assert_string_equal (oop->family, "out-of-plane at C");
    assert_true (fabs (oop->value) < 1e-12);
    for (gsize a = 0; a < 4; a++)
      memcpy (x + 3 * a, lifted->atoms[a].position, sizeof (double) * 3);
    /* sin θ = 0.1/|C1O2| for O lifted ⟂ the molecular plane (y = 0) */
    assert_true (fabs (qv_internal_coordinate_evaluate (oop, x, 4, NULL)
                       - asin (0.1 / sqrt (1.21 * 1.21 + 0.01))) < 1e-12
                 || fabs (qv_internal_coordinate_evaluate (oop, x, 4, NULL)
                          + asin (0.1 / sqrt (1.21 * 1.21 + 0.01))) < 1e-12);
    check_rows (oop, x, 4, "lifted formaldehyde-like");
  }
  /* The near-linear angle is replaced by a pair of linear bends and says so. */
  {
    g_autoptr(QvInternalCoordinates) ic = qv_internal_coordinates_new (hcn, QV_BONDS_DEFAULT_TOLERANCE, NULL);
    assert_int_equal (qv_internal_coordinates_count (ic, QV_INTERNAL_BEND), 0);
    assert_int_equal (qv_internal_coordinates_count (ic, QV_INTERNAL_LINEAR_BEND), 2);
    assert_non_null (ic->notes[0]);
    assert_non_null (strstr (ic->notes[0], "near-linear"));
  }
}

/* H += Σ F_ij b_i b_jᵀ: the Cartesian Hessian of V = ½ Δqᵀ F Δq at its
 * minimum (WDC ch. 4; no gradient term). */
static void
add_force_field (QvHessian *h, const QvInternalCoordinates *ic, const double *f)
{
  const gsize nc = ic->n_coordinates, n = h->n;
  for (gsize i = 0; i < nc; i++)
    for (gsize j = 0; j < nc; j++)
      {
        const double *bi = qv_internal_coordinates_b_row (ic, i), *bj = qv_internal_coordinates_b_row (ic, j);
        for (gsize p = 0; p < n; p++)
          for (gsize q = 0; q < n; q++)
            h->data[p + q * n] += f[i * nc + j] * bi[p] * bj[q];
      }
}

/* Water-like (invented): 2 stretches + 1 bend = 3N − 6, a non-redundant
 * set, so B A = I and the internal force constants recovered from the
 * Hessian, Aᵀ (Bᵀ F B) A, are the force field's own F (WDC ch. 4). */
static void
test_water_make_up (void **state)
{
  const guint z[3] = { 8, 1, 1 };
  const double t = 104.5 * DEG / 2;
  const double x[9] = { 0.1, -0.2, 0.3, 0.1 + 0.96 * sin (t), -0.2, 0.3 + 0.96 * cos (t),
                        0.1 - 0.97 * sin (t), -0.2, 0.3 + 0.97 * cos (t) };
  g_autoptr(QvStructure) s = qvt_structure (3, z, x);
  g_autoptr(QvInternalCoordinates) ic = qv_internal_coordinates_new (s, QV_BONDS_DEFAULT_TOLERANCE, NULL);
  g_autoptr(QvHessian) h = qv_hessian_new (9, TRUE, NULL);
  g_autoptr(QvHessian) hcopy = NULL;
  g_autoptr(QvModeSet) modes = NULL;
  g_autoptr(QvModeCharacter) from_modes = NULL, from_h = NULL;
  g_autoptr(GError) error = NULL;
  QvSolveOptions o;
  /* stretches eV/Å², bend eV/rad², couplings eV/Å² and eV/(Å rad) */
  double f[9] = { 48.0, -0.6, 1.1,  -0.6, 47.0, 1.1,  1.1, 1.1, 4.4 };
  (void) state;

  assert_int_equal (ic->n_coordinates, 3);
  add_force_field (h, ic, f);
  hcopy = qv_hessian_new (9, FALSE, NULL);
  memcpy (hcopy->data, h->data, 81 * sizeof (double));
  qv_solve_options_init (&o);
  modes = qvt_solve_checked (s, h, &o);
  assert_int_equal (modes->n_modes, 3);

  from_modes = qv_mode_character_new (s, modes, NULL, &error);
  assert_non_null (from_modes);
  from_h = qv_mode_character_new (s, modes, hcopy->data, &error);
  assert_non_null (from_h);
  assert_int_equal (qv_mode_character_rank (from_h), 3);
  for (gsize i = 0; i < 3; i++)
    {
      const double fi = f[i * 3 + i];
      assert_true (fabs (qv_mode_character_force_constants (from_h)[i] - fi) < 1e-9 * fi);
      assert_true (fabs (qv_mode_character_force_constants (from_modes)[i] - fi) < 1e-9 * fi);
    }
  for (gsize k = 0; k < 3; k++)
    {
      double sum = 0.0, fsum = 0.0, diag = 0.0;
      const QvCharacterItem *fam;
      gsize nf = qv_mode_character_families (from_h, k, &fam);
      const double *sh = qv_mode_character_shares (from_h, k);
      const double *l = qv_mode_character_displacements (from_h, k);
      for (gsize i = 0; i < 3; i++)
        {
          sum += sh[i];
          diag += f[i * 4] * l[i] * l[i];
          assert_true (fabs (sh[i] - qv_mode_character_shares (from_modes, k)[i]) < 1e-9);
        }
      for (gsize i = 0; i < nf; i++)
        fsum += fam[i].share;
      assert_true (fabs (sum - 1.0) < 1e-12 && fabs (fsum - 1.0) < 1e-12);
      assert_true (nf == 2 && fam[0].share >= fam[1].share);
      /* normalised PED: share_i = F_ii L_i² / Σ_j F_jj L_j² (Morino & Kuchitsu 1952) */
      for (gsize i = 0; i < 3; i++)
        assert_true (fabs (sh[i] - f[i * 4] * l[i] * l[i] / diag) < 1e-12);
      assert_true (fabs (qv_mode_character_described (from_h, k) - 1.0) < 1e-9);
    }
  /* the bend is the lowest mode, the stretches the two highest (a
     water-like force field: light H on stiff bonds, soft angle) */
  {
    g_autofree char *low = qv_mode_character_summary (from_h, 0, 1);
    g_autofree char *high = qv_mode_character_summary (from_h, 2, 0);
    assert_true (g_str_has_prefix (low, "H\u2013O\u2013H bend "));
    assert_true (g_str_has_prefix (high, "O\u2013H stretch "));
    assert_non_null (strstr (high, " %"));
  }
}

/* Ethanol-like with an invented diagonal force field over all 33 perceived
 * coordinates (stretches 30 eV/Å², bends 3 eV/rad², torsions 0.2): the set
 * is redundant, and the two routes to F — Aᵀ H A from the Hessian, and
 * Σ λ_k (G⁺L_k)(G⁺L_k)ᵀ from the modes — are algebraically the same matrix
 * (header of qv-mode-character.h), so they must agree to rounding. */
static void
test_redundant_routes_agree (void **state)
{
  g_autoptr(QvStructure) s = ethanol_like ();
  g_autoptr(QvInternalCoordinates) ic = qv_internal_coordinates_new (s, QV_BONDS_DEFAULT_TOLERANCE, NULL);
  g_autoptr(QvHessian) h = qv_hessian_new (27, TRUE, NULL);
  g_autoptr(QvModeSet) modes = NULL;
  g_autoptr(QvModeCharacter) a = NULL, b = NULL;
  QvSolveOptions o;
  double fmax = 0.0;
  (void) state;

  for (gsize i = 0; i < ic->n_coordinates; i++)
    {
      QvInternalKind kind = ic->coordinates[i].kind;
      qvt_add_coordinate (h, qv_internal_coordinates_b_row (ic, i),
                          kind == QV_INTERNAL_STRETCH ? 30.0 : kind == QV_INTERNAL_BEND ? 3.0 : 0.2);
    }
  qv_solve_options_init (&o);
  modes = qvt_solve_checked (s, h, &o);
  assert_int_equal (modes->n_modes, 21);
  a = qv_mode_character_new (s, modes, h->data, NULL);
  b = qv_mode_character_new (s, modes, NULL, NULL);
  assert_non_null (a);
  assert_non_null (b);
  assert_int_equal (qv_mode_character_rank (a), 21);
  for (gsize i = 0; i < ic->n_coordinates; i++)
    fmax = MAX (fmax, fabs (qv_mode_character_force_constants (a)[i]));
  for (gsize i = 0; i < ic->n_coordinates; i++)
    assert_true (fabs (qv_mode_character_force_constants (a)[i]
                       - qv_mode_character_force_constants (b)[i]) < 1e-9 * fmax);
  for (gsize k = 0; k < 21; k++)
    {
      for (gsize i = 0; i < ic->n_coordinates; i++)
        assert_true (fabs (qv_mode_character_shares (a, k)[i] - qv_mode_character_shares (b, k)[i]) < 1e-9);
      assert_true (fabs (qv_mode_character_described (a, k) - 1.0) < 1e-9);
    }
  /* the six highest modes are the X–H stretches (light H on stiff bonds) */
  for (gsize k = 15; k < 21; k++)
    {
      const QvCharacterItem *fam;
      qv_mode_character_families (a, k, &fam);
      assert_true (g_str_has_suffix (fam[0].name, "\u2013H stretch") && fam[0].share > 0.9);
    }
}

static void
test_errors (void **state)
{
  const guint z[2] = { 18, 18 };
  const double x[6] = { 0, 0, 0, 0, 0, 5.0 };
  g_autoptr(QvStructure) s = qvt_structure (2, z, x);
  g_autoptr(QvHessian) h = qv_hessian_new (6, TRUE, NULL);
  g_autoptr(QvModeSet) modes = NULL;
  g_autoptr(GError) error = NULL;
  QvSolveOptions o;
  (void) state;

  qvt_add_stretch (h, s, 0, 1, 1.0);
  qv_solve_options_init (&o);
  modes = qvt_solve_checked (s, h, &o);
  /* 5 Å apart: no bond, nothing to describe with */
  assert_null (qv_mode_character_new (s, modes, NULL, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  assert_non_null (strstr (error->message, "no bonds"));
  g_clear_error (&error);
  /* a lowest-only set without a Hessian cannot give F */
  modes->lowest_only = TRUE;
  assert_null (qv_mode_character_new (s, modes, NULL, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
  assert_non_null (strstr (error->message, "--lowest"));
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_ethanol_perception),
    cmocka_unit_test (test_b_rows_numerical),
    cmocka_unit_test (test_water_make_up),
    cmocka_unit_test (test_redundant_routes_agree),
    cmocka_unit_test (test_errors),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
