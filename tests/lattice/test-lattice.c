/* test-lattice.c — supercells, force constants, D(q) and band paths
 * (src/core/qv-supercell.c, qv-force-constants.c, qv-dynamical-matrix.c,
 * qv-band-path.c) against textbook closed forms and LAPACK on the whole
 * supercell.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <lapacke.h>
#include <complex.h>
#include <math.h>
#include <string.h>
#include "lattice-model.h"
#include "qv-band-path.h"
#include "qv-dynamical-matrix.h"
#include "qv-error.h"
#include "qv-force-constants.h"
#include "qv-supercell.h"
#include "qv-units.h"

/* Force constants of @primitive's spring model in the supercell @matrix,
 * with the sum rule applied. */
static QvForceConstants *
model_fc (const QvStructure *primitive, const int matrix[3][3], const LatticeShell *shells,
          gsize n_shells, QvSupercellMap **map_out)
{
  g_autoptr(GError) error = NULL;
  g_autoptr(QvStructure) sc = qv_supercell_build (primitive, matrix, &error);
  g_autoptr(QvHessian) h = NULL;
  g_autoptr(QvSupercellMap) map = NULL;
  QvForceConstants *fc;

  assert_non_null (sc);
  h = lattice_model_hessian (sc, shells, n_shells);
  map = qv_supercell_map (primitive, sc, 0, &error);
  if (map == NULL)
    fail_msg ("%s", error->message);
  fc = qv_force_constants_new (map, h, &error);
  assert_non_null (fc);
  /* a periodic model is exactly periodic */
  assert_true (qv_force_constants_periodicity (fc) < 1e-12);
  qv_force_constants_apply_sum_rule (fc, NULL);
  if (map_out)
    *map_out = g_steal_pointer (&map);
  return fc;
}

static QvPhononSet *
solve (const QvForceConstants *fc, const double *q, gsize n_q, gboolean vectors)
{
  g_autoptr(GError) error = NULL;
  QvPhononSet *set = qv_dynamical_matrix_solve (fc, q, n_q, vectors, 3, NULL, &error);
  if (set == NULL)
    fail_msg ("%s", error->message);
  return set;
}

static void
assert_close (double got, double want, double tol, const char *what)
{
  if (!(fabs (got - want) <= tol))
    fail_msg ("%s: got %.12g, expected %.12g (tolerance %.3g)", what, got, want, tol);
}

/* ------------------------------------------------------------------ */
/* Chains (Kittel, Introduction to Solid State Physics, 8th ed., ch. 4) */

/* A chain along x with spacing a and 10 Å of vacuum in y and z, built as a
 * 3-D crystal; springs only between chain neighbours. */
static QvStructure *
chain (double a, gsize n, const double *masses)
{
  double cell[3][3] = { { a, 0, 0 }, { 0, 10, 0 }, { 0, 0, 10 } };
  double r[6] = { 0, 0, 0, a / 2, 0, 0 };
  guint z[2] = { 6, 8 };
  return lattice_model_structure (cell, n, z, masses, r);
}

static void
test_monatomic_chain (void **state)
{
  /* ω(q) = 2√(C/M)|sin(qa/2)| (Kittel ch. 4, eq. 9), for the longitudinal
   * spring C_L and, by the same algebra, the transverse one C_T. */
  const double a = 2.5, m = 20.0, cl = 5.0, ct = 0.3;
  double masses[1] = { m };
  g_autoptr(QvStructure) p = chain (a, 1, masses);
  LatticeShell shell = { a, cl, ct, 0, 0 };
  int matrix[3][3] = { { 8, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 } };
  g_autoptr(QvForceConstants) fc = model_fc (p, matrix, &shell, 1, NULL);
  enum { N = 61 };
  double q[3 * N];
  g_autoptr(QvPhononSet) set = NULL;

  /* many q, most not commensurate with the 8-cell supercell: the model
   * reaches one neighbour, so D(q) is exact at every q */
  for (int k = 0; k < N; k++)
    {
      q[3 * k] = -0.5 + (double) k / (N - 1) + 0.0013 * (k % 3);
      q[3 * k + 1] = q[3 * k + 2] = 0;
    }
  set = solve (fc, q, N, FALSE);
  for (int k = 0; k < N; k++)
    {
      double s = sin (G_PI * q[3 * k]);      /* qa/2 = π f */
      double wl = qv_wavenumber_from_eigenvalue (4 * cl / m * s * s);
      double wt = qv_wavenumber_from_eigenvalue (4 * ct / m * s * s);
      const double *w = set->wavenumbers + 3 * k;
      assert_close (w[0], wt, 1e-9 * wl + 1e-7, "chain transverse 1");
      assert_close (w[1], wt, 1e-9 * wl + 1e-7, "chain transverse 2");
      assert_close (w[2], wl, 1e-9 * wl + 1e-7, "chain longitudinal");
    }
}

static void
test_diatomic_chain (void **state)
{
  /* Kittel ch. 4, eq. 18: ω² = C(1/M1 + 1/M2) ± C √((1/M1 + 1/M2)² −
   * 4 sin²(Ka/2)/(M1 M2)), nearest-neighbour springs C, repeat distance a. */
  const double a = 3.0, m1 = 12.0, m2 = 30.0, c = 4.0;
  double masses[2] = { m1, m2 };
  g_autoptr(QvStructure) p = chain (a, 2, masses);
  LatticeShell shell = { a / 2, c, 0, 0, 0 };
  int matrix[3][3] = { { 6, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 } };
  g_autoptr(QvForceConstants) fc = model_fc (p, matrix, &shell, 1, NULL);
  enum { N = 53 };
  double q[3 * N];
  g_autoptr(QvPhononSet) set = NULL;

  for (int k = 0; k < N; k++)
    {
      q[3 * k] = (double) k / (N - 1) * 0.5 + 0.0007 * (k % 2);
      q[3 * k + 1] = 0.003 * (k % 5 == 0);   /* off the chain axis: still 1-D */
      q[3 * k + 2] = 0;
    }
  set = solve (fc, q, N, FALSE);
  for (int k = 0; k < N; k++)
    {
      double s = sin (G_PI * q[3 * k]), sum = 1 / m1 + 1 / m2;
      double root = sqrt (sum * sum - 4 * s * s / (m1 * m2));
      double opt = qv_wavenumber_from_eigenvalue (c * (sum + root));
      double ac = qv_wavenumber_from_eigenvalue (c * (sum - root));
      const double *w = set->wavenumbers + 6 * k;
      /* no transverse springs: four branches at zero */
      for (int b = 0; b < 4; b++)
        assert_close (w[b], 0, 1e-5, "diatomic chain zero branch");
      assert_close (w[4], ac, 1e-9 * opt + 1e-6, "diatomic chain acoustic");
      assert_close (w[5], opt, 1e-9 * opt, "diatomic chain optical");
    }
}

/* ------------------------------------------------------------------ */
/* fcc with nearest-neighbour central springs                           */

static QvStructure *
fcc (double a, double m, double rotation[3][3])
{
  double cell[3][3] = { { 0, a / 2, a / 2 }, { a / 2, 0, a / 2 }, { a / 2, a / 2, 0 } };
  double r[3] = { 0, 0, 0 };
  guint z[1] = { 18 };
  if (rotation)
    {
      double c2[3][3];
      for (int i = 0; i < 3; i++)
        for (int x = 0; x < 3; x++)
          c2[i][x] = rotation[x][0] * cell[i][0] + rotation[x][1] * cell[i][1] + rotation[x][2] * cell[i][2];
      memcpy (cell, c2, sizeof cell);
    }
  return lattice_model_structure (cell, 1, z, &m, r);
}

/* D(q) = (C/M) Σ_δ (1 − cos q·δ) δ̂δ̂ᵀ over the 12 neighbours δ = (a/2)(±1,
 * ±1, 0) and permutations (Ashcroft & Mermin ch. 22 for the form, from
 * memory). At X = (2π/a)(1,0,0): q·δ = ±π for the 8 neighbours with δ_x ≠ 0,
 * 0 for the 4 with δ_x = 0, so D = (2C/M) Σ_{δ_x≠0} δ̂δ̂ᵀ = (C/M) diag(8, 4, 4).
 * At L = (π/a)(1,1,1): q·δ = ±π for the 6 neighbours ±(1,1,0), ±(1,0,1),
 * ±(0,1,1) (a/2), 0 for the others, so D = (C/M)[[4,2,2],[2,4,2],[2,2,4]],
 * eigenvalues 8C/M (along [111]) and 2C/M twice. REFERENCES.md lists them. */
static void
check_fcc_x_l (const QvForceConstants *fc, double c, double m)
{
  /* X = ½b1 + ½b3, L = ½(b1 + b2 + b3) for the primitive vectors above */
  double q[6] = { 0.5, 0, 0.5, 0.5, 0.5, 0.5 };
  g_autoptr(QvPhononSet) set = solve (fc, q, 2, FALSE);
  double x[3] = { 4, 4, 8 }, l[3] = { 2, 2, 8 };
  for (int b = 0; b < 3; b++)
    {
      assert_close (set->eigenvalues[b], x[b] * c / m, 1e-11, "fcc X");
      assert_close (set->eigenvalues[3 + b], l[b] * c / m, 1e-11, "fcc L");
    }
}

static void
test_fcc (void **state)
{
  const double a = 4.0, m = 40.0, c = 2.0;
  g_autoptr(QvStructure) p = fcc (a, m, NULL);
  LatticeShell shell = { a / sqrt (2), c, 0, 0, 0 };
  int diag3[3][3] = { { 3, 0, 0 }, { 0, 3, 0 }, { 0, 0, 3 } };
  /* the conventional cube (−a1+a2+a3 = (a,0,0)…) doubled: non-diagonal */
  int cube2[3][3] = { { -2, 2, 2 }, { 2, -2, 2 }, { 2, 2, -2 } };
  /* 2×2×2: neighbours ±a_i fall on the Wigner–Seitz boundary (equal
   * weights ½), a skewed general matrix: both must still be exact */
  int diag2[3][3] = { { 2, 0, 0 }, { 0, 2, 0 }, { 0, 0, 2 } };
  int skew[3][3] = { { 1, 2, 0 }, { 0, 3, 1 }, { 1, 0, 2 } };
  const int (*matrices[])[3] = { diag3, cube2, diag2, skew };

  for (gsize i = 0; i < G_N_ELEMENTS (matrices); i++)
    {
      g_autoptr(QvForceConstants) fc = model_fc (p, matrices[i], &shell, 1, NULL);
      double zero[3] = { 0, 0, 0 };
      g_autoptr(QvPhononSet) g = solve (fc, zero, 1, FALSE);
      if (i != 3)
        check_fcc_x_l (fc, c, m);
      /* three zero acoustic modes at Γ after the sum rule (a crystal has 3
         acoustic branches that go to zero at Γ: common practice) */
      for (int b = 0; b < 3; b++)
        assert_close (g->wavenumbers[b], 0, 1e-4, "fcc Γ");
    }
}

static void
test_sum_rule (void **state)
{
  /* Adding ε to every diagonal element of the supercell Hessian is
   * periodic but breaks the sum rule: D(Γ) gains ε/M on its diagonal, so
   * the acoustic eigenvalues before the correction are ε/M (three times).
   * After it: zeros, and Φ keeps Φ_{κα,κ'β}(L) = Φ_{κ'β,κα}(−L). */
  const double a = 4.0, m = 40.0, c = 2.0, eps = 0.05;
  g_autoptr(QvStructure) p = fcc (a, m, NULL);
  LatticeShell shell = { a / sqrt (2), c, 0, 0, 0 };
  int matrix[3][3] = { { 2, 0, 0 }, { 0, 3, 0 }, { 0, 0, 2 } };
  g_autoptr(GError) error = NULL;
  g_autoptr(QvStructure) sc = qv_supercell_build (p, matrix, &error);
  g_autoptr(QvHessian) h = lattice_model_hessian (sc, &shell, 1);
  g_autoptr(QvSupercellMap) map = qv_supercell_map (p, sc, 0, &error);
  g_autoptr(QvForceConstants) fc = NULL;
  double before[3], after[3];

  for (gsize i = 0; i < h->n; i++)
    h->data[i + i * h->n] += eps;
  fc = qv_force_constants_new (map, h, &error);
  assert_non_null (fc);
  qv_force_constants_apply_sum_rule (fc, before);
  for (int b = 0; b < 3; b++)
    assert_close (before[b], qv_wavenumber_from_eigenvalue (eps / m), 1e-9, "acoustic before");
  qv_force_constants_gamma_acoustic (fc, after);
  for (int b = 0; b < 3; b++)
    assert_close (after[b], 0, 1e-4, "acoustic after");
  for (gsize l = 0; l < qv_force_constants_n_cells (fc); l++)
    {
      const int *t = qv_force_constants_translation (fc, l);
      int minus[3] = { -t[0], -t[1], -t[2] };
      gsize l2 = qv_supercell_map_class (map, minus);
      const double *f = qv_force_constants_block (fc, l, 0, 0);
      const double *g = qv_force_constants_block (fc, l2, 0, 0);
      for (int x = 0; x < 3; x++)
        for (int y = 0; y < 3; y++)
          assert_close (f[3 * x + y], g[3 * y + x], 1e-14, "permutation symmetry");
    }
}

/* ------------------------------------------------------------------ */
/* The supercell at Γ is the union of D(q) over the commensurate q      */

static QvStructure *
rock_salt (double a, double rotation[3][3])
{
  double cell[3][3] = { { 0, a / 2, a / 2 }, { a / 2, 0, a / 2 }, { a / 2, a / 2, 0 } };
  double r[6] = { 0, 0, 0, a / 2, 0, 0 };
  guint z[2] = { 11, 17 };
  double m[2] = { 22.99, 35.45 };
  if (rotation)
    {
      double c2[3][3], r2[6];
      for (int i = 0; i < 3; i++)
        for (int x = 0; x < 3; x++)
          c2[i][x] = rotation[x][0] * cell[i][0] + rotation[x][1] * cell[i][1] + rotation[x][2] * cell[i][2];
      for (int i = 0; i < 2; i++)
        for (int x = 0; x < 3; x++)
          r2[3 * i + x] = rotation[x][0] * r[3 * i] + rotation[x][1] * r[3 * i + 1] + rotation[x][2] * r[3 * i + 2];
      memcpy (cell, c2, sizeof cell);
      memcpy (r, r2, sizeof r);
    }
  return lattice_model_structure (cell, 2, z, m, r);
}

static const LatticeShell salt_shells[] = {
  { 2.8, 3.0, 0.4, 0, 0 },                 /* Na–Cl at a/2 */
  { 2.8 * G_SQRT2, 0.6, 0.1, 11, 11 },     /* Na–Na at a/√2 */
  { 2.8 * G_SQRT2, 0.9, -0.05, 17, 17 },   /* Cl–Cl at a/√2 */
};

static void
check_union (const int matrix[3][3])
{
  g_autoptr(QvStructure) p = rock_salt (5.6, NULL);
  g_autoptr(GError) error = NULL;
  g_autoptr(QvStructure) sc = qv_supercell_build (p, matrix, &error);
  g_autoptr(QvHessian) h = lattice_model_hessian (sc, salt_shells, 3);
  g_autoptr(QvSupercellMap) map = qv_supercell_map (p, sc, 0, &error);
  g_autoptr(QvForceConstants) fc = qv_force_constants_new (map, h, &error);
  g_autofree double *q = qv_supercell_map_commensurate_q (map);
  g_autoptr(QvPhononSet) set = NULL;
  gsize n = h->n;
  g_autofree double *mw = g_new (double, n * n);
  g_autofree double *w = g_new (double, n);
  g_autofree double *u = g_new (double, n);

  qv_force_constants_apply_sum_rule (fc, NULL);
  /* the whole supercell at Γ: LAPACK on the mass-weighted Hessian (the
   * model obeys the sum rule, so its three translations are the zeros) */
  for (gsize i = 0; i < n; i++)
    for (gsize j = 0; j < n; j++)
      mw[i + j * n] = h->data[i + j * n] / sqrt (sc->atoms[i / 3].mass * sc->atoms[j / 3].mass);
  assert_int_equal (LAPACKE_dsyevd (LAPACK_COL_MAJOR, 'N', 'U', (lapack_int) n, mw, (lapack_int) n, w), 0);
  set = solve (fc, q, map->n_cells, FALSE);
  assert_int_equal (set->n_q * set->n_branches, n);
  memcpy (u, set->eigenvalues, n * sizeof (double));
  for (gsize i = 1; i < n; i++)       /* insertion sort of the union */
    for (gsize j = i; j > 0 && u[j - 1] > u[j]; j--)
      {
        double t = u[j];
        u[j] = u[j - 1];
        u[j - 1] = t;
      }
  for (gsize i = 0; i < n; i++)
    assert_close (u[i], w[i], 1e-11, "union of D(q) spectra vs the supercell at Γ");
}

static void
test_union (void **state)
{
  int diag2[3][3] = { { 2, 0, 0 }, { 0, 2, 0 }, { 0, 0, 2 } };
  int skew[3][3] = { { 1, 1, 0 }, { -1, 1, 0 }, { 0, 1, 2 } };
  int cube[3][3] = { { -1, 1, 1 }, { 1, -1, 1 }, { 1, 1, -1 } };
  int big[3][3] = { { 3, 0, 0 }, { 0, 2, 1 }, { 0, -1, 2 } };
  check_union (diag2);
  check_union (skew);
  check_union (cube);
  check_union (big);
}

/* ------------------------------------------------------------------ */
/* Shuffled atoms, rotated cells, wrong supercells                      */

static QvBandSampling *
default_sampling (const QvStructure *p, gsize n_points)
{
  g_autoptr(GError) error = NULL;
  g_autoptr(QvBandPath) path = qv_band_path_default (p->cell, 0, &error);
  if (path == NULL)
    fail_msg ("%s", error->message);
  return qv_band_path_sample (path, p->cell, n_points, 0, &error);
}

static void
test_shuffle_rotate (void **state)
{
  int matrix[3][3] = { { 3, 0, 0 }, { 0, 3, 0 }, { 0, 0, 3 } };
  double angle = 0.7, axis[3] = { 1 / sqrt (14), 2 / sqrt (14), 3 / sqrt (14) };
  double rot[3][3], c = cos (angle), s = sin (angle);
  g_autoptr(QvStructure) p = rock_salt (5.6, NULL);
  g_autoptr(QvForceConstants) fc0 = model_fc (p, matrix, salt_shells, 3, NULL);
  g_autoptr(QvBandSampling) path = default_sampling (p, 120);
  g_autoptr(QvPhononSet) ref = solve (fc0, path->q, path->n_q, FALSE);
  g_autoptr(GError) error = NULL;

  /* Rodrigues' rotation formula */
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      rot[i][j] = (i == j) * c + (1 - c) * axis[i] * axis[j]
                + s * ((i == 0 && j == 1) ? -axis[2] : (i == 1 && j == 0) ? axis[2]
                       : (i == 0 && j == 2) ? axis[1] : (i == 2 && j == 0) ? -axis[1]
                       : (i == 1 && j == 2) ? -axis[0] : (i == 2 && j == 1) ? axis[0] : 0);

  /* shuffled: a random permutation and random supercell translations,
   * the Hessian permuted with the atoms */
  {
    g_autoptr(QvStructure) sc = qv_supercell_build (p, matrix, &error);
    g_autoptr(QvHessian) h = lattice_model_hessian (sc, salt_shells, 3);
    g_autoptr(QvStructure) sh = qv_structure_copy (sc);
    g_autoptr(QvHessian) hs = qv_hessian_new (h->n, TRUE, NULL);
    g_autoptr(QvSupercellMap) map = NULL;
    g_autoptr(QvForceConstants) fc = NULL;
    g_autoptr(QvPhononSet) got = NULL;
    g_autoptr(GRand) rand = g_rand_new_with_seed (7);
    gsize n = sc->n_atoms, *perm = g_new (gsize, n);
    for (gsize i = 0; i < n; i++)
      perm[i] = i;
    for (gsize i = n - 1; i > 0; i--)
      {
        gsize j = (gsize) g_rand_int_range (rand, 0, (gint32) i + 1), t = perm[i];
        perm[i] = perm[j];
        perm[j] = t;
      }
    for (gsize i = 0; i < n; i++)
      {
        int shift = g_rand_int_range (rand, -1, 2);
        g_free (sh->atoms[i].label);
        sh->atoms[i] = sc->atoms[perm[i]];
        sh->atoms[i].label = NULL;
        for (int x = 0; x < 3; x++)
          sh->atoms[i].position[x] += shift * sc->cell[(i % 3)][x];
      }
    for (gsize i = 0; i < 3 * n; i++)
      for (gsize j = 0; j < 3 * n; j++)
        hs->data[i + j * 3 * n] = h->data[(3 * perm[i / 3] + i % 3) + (3 * perm[j / 3] + j % 3) * 3 * n];
    g_free (perm);
    map = qv_supercell_map (p, sh, 0, &error);
    assert_non_null (map);
    fc = qv_force_constants_new (map, hs, &error);
    qv_force_constants_apply_sum_rule (fc, NULL);
    got = solve (fc, path->q, path->n_q, FALSE);
    /* eigenvalues, eV/(Å² u): the wavenumber of a round-off zero at Γ is
       its square root */
    for (gsize i = 0; i < path->n_q * 6; i++)
      assert_close (got->eigenvalues[i], ref->eigenvalues[i], 1e-11, "shuffled supercell");
  }

  /* rotated: primitive and supercell turned together, the default path
   * found again from the rotated cell */
  {
    g_autoptr(QvStructure) pr = rock_salt (5.6, rot);
    g_autoptr(QvForceConstants) fc = model_fc (pr, matrix, salt_shells, 3, NULL);
    g_autoptr(QvBandSampling) rpath = default_sampling (pr, 120);
    g_autoptr(QvPhononSet) got = NULL;
    assert_int_equal (rpath->n_q, path->n_q);
    got = solve (fc, rpath->q, rpath->n_q, FALSE);
    for (gsize i = 0; i < path->n_q * 6; i++)
      assert_close (got->eigenvalues[i], ref->eigenvalues[i], 1e-11, "rotated cell");
    for (gsize i = 0; i < path->n_q; i++)
      assert_close (rpath->distance[i], path->distance[i], 1e-12, "rotated path distance");
  }
}

static void
test_wrong_supercell (void **state)
{
  g_autoptr(QvStructure) p = rock_salt (5.6, NULL);
  int matrix[3][3] = { { 2, 0, 0 }, { 0, 2, 0 }, { 0, 0, 2 } };
  g_autoptr(QvStructure) sc = qv_supercell_build (p, matrix, NULL);

  /* one atom fewer than 8 cells × 2 */
  {
    g_autoptr(QvStructure) s = qv_structure_copy (sc);
    g_autoptr(GError) error = NULL;
    g_autoptr(QvSupercellMap) map = NULL;
    s->n_atoms--;
    map = qv_supercell_map (p, s, 0, &error);
    s->n_atoms++;
    assert_null (map);
    assert_non_null (strstr (error->message, "wrong supercell size"));
    assert_non_null (strstr (error->message, "needs 16 atoms, but it has 15"));
  }
  /* a cell 1.5 times the primitive one */
  {
    g_autoptr(QvStructure) s = qv_structure_copy (sc);
    g_autoptr(GError) error = NULL;
    g_autoptr(QvSupercellMap) map = NULL;
    for (int i = 0; i < 3; i++)
      for (int x = 0; x < 3; x++)
        s->cell[i][x] *= 0.75;
    map = qv_supercell_map (p, s, 0, &error);
    assert_null (map);
    assert_non_null (strstr (error->message, "not an integer multiple"));
  }
  /* an atom moved by 0.2 Å: named */
  {
    g_autoptr(QvStructure) s = qv_structure_copy (sc);
    g_autoptr(GError) error = NULL;
    g_autoptr(QvSupercellMap) map = NULL;
    s->atoms[5].position[1] += 0.2;
    map = qv_supercell_map (p, s, 0, &error);
    assert_null (map);
    assert_non_null (strstr (error->message, "supercell atom 6 "));
    assert_non_null (strstr (error->message, "matches no primitive site"));
  }
  /* an atom duplicated in place of another */
  {
    g_autoptr(QvStructure) s = qv_structure_copy (sc);
    g_autoptr(GError) error = NULL;
    g_autoptr(QvSupercellMap) map = NULL;
    memcpy (s->atoms[4].position, s->atoms[2].position, sizeof s->atoms[4].position);
    map = qv_supercell_map (p, s, 0, &error);
    assert_null (map);
    assert_non_null (strstr (error->message, "supercell atoms 3 and 5 both sit"));
  }
  /* matrix text */
  {
    int m[3][3];
    g_autoptr(GError) error = NULL;
    assert_true (qv_supercell_matrix_parse ("2x3x4", m, NULL));
    assert_int_equal (m[1][1], 3);
    assert_int_equal (m[0][1], 0);
    assert_true (qv_supercell_matrix_parse ("-1 1 1, 1 -1 1, 1 1 -1", m, NULL));
    assert_int_equal (qv_supercell_matrix_det (m), 4);
    assert_false (qv_supercell_matrix_parse ("1 0 0, 0 1 0, 0 0 -1", m, &error));
    assert_non_null (strstr (error->message, "determinant -1"));
    g_clear_error (&error);
    assert_false (qv_supercell_matrix_parse ("2x2", m, &error));
    assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
  }
}

/* ------------------------------------------------------------------ */
/* A crossing followed by overlap                                        */

static void
test_crossing (void **state)
{
  /* A chain with longitudinal nearest-neighbour springs C_L and transverse
   * springs C_T1 (first) and C_T2 (second neighbours). By the chain algebra
   * of Kittel ch. 4 applied to each polarisation, ω_L² = (4C_L/M) sin²(qa/2),
   * ω_T² = (4/M)[C_T1 sin²(qa/2) + C_T2 sin²(qa)]. With C_T1 + 4C_T2 > C_L
   * the (twofold) transverse branch starts above the longitudinal one and
   * ends below it (C_T1 < C_L): they cross, allowed because the
   * polarisations are orthogonal by symmetry. */
  const double a = 2.5, m = 20.0, cl = 5.0, ct1 = 0.5, ct2 = 2.0;
  double masses[1] = { m };
  g_autoptr(QvStructure) p = chain (a, 1, masses);
  LatticeShell shells[2] = { { a, cl, ct1, 0, 0 }, { 2 * a, 0, ct2, 0, 0 } };
  int matrix[3][3] = { { 8, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 } };
  g_autoptr(QvForceConstants) fc = model_fc (p, matrix, shells, 2, NULL);
  g_autoptr(GError) error = NULL;
  g_autoptr(QvBandPath) path = qv_band_path_parse ("G 0 0 0; X 0.5 0 0", &error);
  g_autoptr(QvBandSampling) s = qv_band_path_sample (path, p->cell, 38, 0, &error);
  g_autoptr(QvPhononSet) set = NULL;
  g_autofree guint *order = NULL;
  gboolean sorted_swaps = FALSE;
  int n_transverse = 0;

  assert_non_null (s);
  set = solve (fc, s->q, s->n_q, TRUE);
  order = g_new (guint, s->n_q * 3);
  qv_band_connect (set, s->restart, order);
  for (int b = 0; b < 3; b++)
    {
      /* which closed form this branch follows, decided at the first q > 0 */
      int transverse = -1;
      for (gsize k = 1; k < s->n_q; k++)
        {
          double sn = sin (G_PI * s->q[3 * k]), s2 = sin (2 * G_PI * s->q[3 * k]);
          double wl = qv_wavenumber_from_eigenvalue (4 * cl / m * sn * sn);
          double wt = qv_wavenumber_from_eigenvalue (4 / m * (ct1 * sn * sn + ct2 * s2 * s2));
          double got = set->wavenumbers[k * 3 + order[k * 3 + b]];
          if (transverse < 0)
            transverse = fabs (got - wt) < fabs (got - wl);
          assert_close (got, transverse ? wt : wl, 1e-7 * wl + 1e-6, "connected branch");
        }
      n_transverse += transverse;
    }
  /* two transverse branches and one longitudinal, each followed throughout */
  assert_int_equal (n_transverse, 2);
  /* sorting by frequency would swap them: its top branch is transverse
   * next to Γ and longitudinal at X */
  {
    gsize k1 = 1, kx = s->n_q - 1;
    double sn = sin (G_PI * s->q[3 * k1]), s2 = sin (2 * G_PI * s->q[3 * k1]);
    double wt = qv_wavenumber_from_eigenvalue (4 / m * (ct1 * sn * sn + ct2 * s2 * s2));
    double wl = qv_wavenumber_from_eigenvalue (4 * cl / m);   /* sin²(π/2) = 1 at X */
    sorted_swaps = fabs (set->wavenumbers[3 * k1 + 2] - wt) < 1e-6
                && fabs (set->wavenumbers[3 * kx + 2] - wl) < 1e-6;
  }
  assert_true (sorted_swaps);
}

/* ------------------------------------------------------------------ */
/* Paths                                                                 */

static void
test_paths (void **state)
{
  g_autoptr(GError) error = NULL;
  g_autoptr(QvStructure) p = fcc (4.0, 40, NULL);
  g_autoptr(QvBandPath) path = qv_band_path_parse ("G 0 0 0; X 0.5 0 0.5 | K 0.375 0.375 0.75; G", &error);
  g_autoptr(QvBandSampling) s = NULL;
  g_autoptr(QvBandPath) def = NULL;
  double two_pi_a = 2 * G_PI / 4.0;

  assert_non_null (path);
  assert_int_equal (path->n_vertices, 4);
  assert_true (path->jump[2]);
  assert_false (path->jump[1]);
  assert_string_equal (path->labels[3], "G");
  s = qv_band_path_sample (path, p->cell, 50, 0, &error);
  assert_non_null (s);
  assert_int_equal (s->n_labels, 3);
  assert_string_equal (s->labels[1], "X|K");
  /* |Γ–X| = 2π/a: X = (2π/a)(0,1,0) in the fcc Brillouin zone (Setyawan &
     Curtarolo 2010, from memory); K = (2π/a)(3/4,3/4,0): |K–Γ| = 3√2/4·2π/a */
  assert_close (s->label_distance[1], two_pi_a, 1e-12, "Γ–X");
  assert_close (s->label_distance[2], two_pi_a * (1 + 0.75 * G_SQRT2), 1e-12, "…K–Γ");
  assert_true (s->restart[s->label_index[1]]);
  assert_close (s->distance[s->label_index[1] - 1], s->distance[s->label_index[1]], 0, "jump");

  /* the default fcc path in another primitive basis (a1+a2, a2, a3),
   * turned: the same Cartesian points, up to the turn */
  def = qv_band_path_default (p->cell, 0, &error);
  assert_non_null (def);
  assert_string_equal (def->lattice, "cF");
  /* in the paper's own setting the paper's coordinates come back:
   * Γ–X–W–K–Γ–L–U–W–L–K|U–X, X = (½, 0, ½), K = (3/8, 3/8, 3/4) */
  assert_int_equal (def->n_vertices, 12);
  assert_string_equal (def->labels[1], "X");
  assert_close (def->q[3], 0.5, 0, "X a");
  assert_close (def->q[4], 0, 0, "X b");
  assert_close (def->q[5], 0.5, 0, "X c");
  assert_string_equal (def->labels[3], "K");
  assert_close (def->q[11], 0.75, 0, "K c");
  assert_true (def->jump[10]);
  {
    double cell2[3][3];
    g_autoptr(QvBandPath) d2 = NULL;
    for (int x = 0; x < 3; x++)
      {
        cell2[0][x] = p->cell[0][x] + p->cell[1][x];
        cell2[1][x] = p->cell[1][x];
        cell2[2][x] = p->cell[2][x];
      }
    d2 = qv_band_path_default (cell2, 0, &error);
    assert_non_null (d2);
    assert_int_equal (d2->n_vertices, def->n_vertices);
    for (gsize v = 0; v < def->n_vertices; v++)
      {
        double q1[3], q2[3];
        qv_dynamical_matrix_cartesian_q (p->cell, def->q + 3 * v, q1);
        qv_dynamical_matrix_cartesian_q (cell2, d2->q + 3 * v, q2);
        /* the two bases describe the same lattice in the same frame; the
         * matched standard basis may differ by a point operation, so
         * compare lengths (the path's geometry) */
        assert_close (sqrt (q1[0] * q1[0] + q1[1] * q1[1] + q1[2] * q1[2]),
                      sqrt (q2[0] * q2[0] + q2[1] * q2[1] + q2[2] * q2[2]), 1e-10, "default path point");
        assert_string_equal (def->labels[v], d2->labels[v]);
      }
  }
  /* cubic P, I and hexagonal are recognised; a monoclinic cell is not */
  {
    double cp[3][3] = { { 3, 0, 0 }, { 0, 3, 0 }, { 0, 0, 3 } };
    double ci[3][3] = { { -1.5, 1.5, 1.5 }, { 1.5, -1.5, 1.5 }, { 1.5, 1.5, -1.5 } };
    double hp[3][3] = { { 3, 0, 0 }, { -1.5, 1.5 * sqrt (3), 0 }, { 0, 0, 5 } };
    double mono[3][3] = { { 3, 0, 0 }, { 0, 4, 0 }, { 1, 0, 5 } };
    g_autoptr(QvBandPath) a = qv_band_path_default (cp, 0, NULL);
    g_autoptr(QvBandPath) b = qv_band_path_default (ci, 0, NULL);
    g_autoptr(QvBandPath) c = qv_band_path_default (hp, 0, NULL);
    g_autoptr(QvBandPath) d = qv_band_path_default (mono, 0, &error);
    assert_string_equal (a->lattice, "cP");
    assert_string_equal (b->lattice, "cI");
    assert_string_equal (c->lattice, "hP");
    assert_null (d);
    /* hexagonal K at |K| = 4π/(3a), M at 2π/(√3 a) (from memory) */
    for (gsize v = 0; v < c->n_vertices; v++)
      {
        double qc[3];
        qv_dynamical_matrix_cartesian_q (hp, c->q + 3 * v, qc);
        if (strcmp (c->labels[v], "K") == 0)
          assert_close (sqrt (qc[0] * qc[0] + qc[1] * qc[1] + qc[2] * qc[2]), 4 * G_PI / 9, 1e-12, "hex K");
        if (strcmp (c->labels[v], "M") == 0)
          assert_close (sqrt (qc[0] * qc[0] + qc[1] * qc[1] + qc[2] * qc[2]), 2 * G_PI / (sqrt (3) * 3), 1e-12, "hex M");
      }
  }
  /* bad paths */
  {
    const char *bad[] = { "G 0 0 0", "G 0 0; X 0.5 0 0", "G 0 0 0; Y", "G 0 0 0; X 0.5 x 0", "0 0 0 0; X 1 0 0" };
    for (gsize i = 0; i < G_N_ELEMENTS (bad); i++)
      {
        g_autoptr(GError) e = NULL;
        g_autoptr(QvBandPath) b = qv_band_path_parse (bad[i], &e);
        assert_null (b);
        assert_true (g_error_matches (e, QV_ERROR, QV_ERROR_USAGE));
      }
  }
}

static void
test_eigenvector_phase (void **state)
{
  /* The stated convention: D(q) with e^{iq·(R+τ'−τ)}. For the diatomic
   * chain at q the optical eigenvector has components of opposite sign on
   * the two atoms at q → 0 (Kittel ch. 4: the atoms move against each
   * other), and D(q + G) = U D(q) U† with U = diag(e^{iG·τ_κ}), so the
   * frequencies repeat with the reciprocal lattice. */
  const double a = 3.0;
  double masses[2] = { 12.0, 30.0 };
  g_autoptr(QvStructure) p = chain (a, 2, masses);
  LatticeShell shell = { a / 2, 4.0, 1.0, 0, 0 };
  int matrix[3][3] = { { 6, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 } };
  g_autoptr(QvForceConstants) fc = model_fc (p, matrix, &shell, 1, NULL);
  double q[6] = { 0.01, 0, 0, 1.01, 0, 0 };
  g_autoptr(QvPhononSet) set = solve (fc, q, 2, TRUE);
  const double _Complex *opt = set->eigenvectors + 5 * 6;   /* top branch at q₀ */

  assert_true (creal (opt[0]) * creal (opt[3]) < 0);
  for (int b = 0; b < 6; b++)
    assert_close (set->wavenumbers[6 + b], set->wavenumbers[b], 1e-8, "periodic in q");
}

static void
test_assignment (void **state)
{
  /* Branch connection is the one-to-one assignment of largest total
   * overlap: checked against all 5! permutations (the definition) for
   * unitary bases mixed so strongly that no row has an overlap above ½,
   * which is where Kuhn–Munkres (not the shortcut) decides. */
  enum { NB = 5 };
  QvPhononSet set = { 0 };
  double _Complex vec[2 * NB * NB];
  guint order[2 * NB];
  g_autoptr(GRand) rand = g_rand_new_with_seed (3);
  int hard = 0;

  set.n_q = 2;
  set.n_branches = NB;
  set.eigenvectors = vec;
  for (int trial = 0; trial < 20; trial++)
    {
      double best = -1, got = 0;
      int perm[NB] = { 0, 1, 2, 3, 4 };
      /* q0: the unit vectors; q1: Gram–Schmidt of random complex vectors */
      memset (vec, 0, sizeof vec);
      for (int b = 0; b < NB; b++)
        vec[b * NB + b] = 1;
      for (int b = 0; b < NB; b++)
        {
          double _Complex *v = vec + NB * NB + b * NB;
          for (int r = 0; r < NB; r++)
            v[r] = g_rand_double_range (rand, -1, 1) + I * g_rand_double_range (rand, -1, 1);
          for (int c = 0; c < b; c++)
            {
              double _Complex *u = vec + NB * NB + c * NB, s = 0;
              for (int r = 0; r < NB; r++)
                s += conj (u[r]) * v[r];
              for (int r = 0; r < NB; r++)
                v[r] -= s * u[r];
            }
          double norm = 0;
          for (int r = 0; r < NB; r++)
            norm += creal (v[r] * conj (v[r]));
          for (int r = 0; r < NB; r++)
            v[r] /= sqrt (norm);
        }
      qv_band_connect (&set, NULL, order);
      for (int b = 0; b < NB; b++)
        {
          double top = 0;
          got += pow (cabs (vec[NB * NB + order[NB + b] * NB + b]), 2);
          for (int j = 0; j < NB; j++)
            top = MAX (top, pow (cabs (vec[NB * NB + j * NB + b]), 2));
          hard += top <= 0.5;
        }
      /* Heap's algorithm over all permutations */
      {
        int c[NB] = { 0 }, i = 0;
        for (;;)
          {
            double total = 0;
            for (int b = 0; b < NB; b++)
              total += pow (cabs (vec[NB * NB + perm[b] * NB + b]), 2);
            best = MAX (best, total);
            while (i < NB && c[i] >= i)
              c[i++] = 0;
            if (i >= NB)
              break;
            int j = (i % 2) ? c[i] : 0, t = perm[j];
            perm[j] = perm[i];
            perm[i] = t;
            c[i]++;
            i = 0;
          }
      }
      assert_close (got, best, 1e-12, "assignment of largest total overlap");
    }
  /* the random bases did reach the Kuhn–Munkres branch */
  assert_true (hard > 10);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_monatomic_chain),
    cmocka_unit_test (test_diatomic_chain),
    cmocka_unit_test (test_fcc),
    cmocka_unit_test (test_sum_rule),
    cmocka_unit_test (test_union),
    cmocka_unit_test (test_shuffle_rotate),
    cmocka_unit_test (test_wrong_supercell),
    cmocka_unit_test (test_crossing),
    cmocka_unit_test (test_paths),
    cmocka_unit_test (test_eigenvector_phase),
    cmocka_unit_test (test_assignment),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
