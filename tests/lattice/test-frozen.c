/* test-frozen.c — frozen-phonon supercells (src/core/qv-frozen-phonon.c,
 * src/io/qv-export-frozen.c): written, read back, and their displacement
 * pattern checked against D(q) (LAPACK's own eigenvector) and against the
 * exact Hessian of the whole supercell.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <complex.h>
#include <lapacke.h>
#include <math.h>
#include <string.h>
#include <glib/gstdio.h>
#include "lattice-model.h"
#include "qv-crystal.h"
#include "qv-dynamical-matrix.h"
#include "qv-error.h"
#include "qv-export.h"
#include "qv-force-constants.h"
#include "qv-frozen-phonon.h"
#include "qv-manifest.h"
#include "qv-nonanalytic.h"
#include "qv-supercell.h"
#include "qv-xyz.h"

/* An invented rock-salt spring model (a = 5.6 Å). */
static QvStructure *
salt (void)
{
  const double a = 5.6;
  double cell[3][3] = { { 0, a / 2, a / 2 }, { a / 2, 0, a / 2 }, { a / 2, a / 2, 0 } };
  double r[6] = { 0, 0, 0, a / 2, 0, 0 };
  guint z[2] = { 11, 17 };
  double m[2] = { 22.99, 35.45 };
  return lattice_model_structure (cell, 2, z, m, r);
}

static const LatticeShell shells[] = {
  { 2.8, 3.0, 0.4, 0, 0 },
  { 2.8 * G_SQRT2, 0.6, 0.1, 11, 11 },
  { 2.8 * G_SQRT2, 0.9, -0.05, 17, 17 },
};

typedef struct {
  QvStructure *primitive, *sc;
  QvHessian *h;
  QvSupercellMap *map;
  QvForceConstants *fc;
  char *tmp;
} Fixture;

static int
setup (void **state)
{
  Fixture *f = g_new0 (Fixture, 1);
  int matrix[3][3] = { { 3, 0, 0 }, { 0, 3, 0 }, { 0, 0, 3 } };
  GError *error = NULL;
  f->primitive = salt ();
  f->sc = qv_supercell_build (f->primitive, matrix, &error);
  assert_non_null (f->sc);
  f->h = lattice_model_hessian (f->sc, shells, G_N_ELEMENTS (shells));
  f->map = qv_supercell_map (f->primitive, f->sc, 0, &error);
  assert_non_null (f->map);
  f->fc = qv_force_constants_new (f->map, f->h, &error);
  assert_non_null (f->fc);
  qv_force_constants_apply_sum_rule (f->fc, NULL);
  f->tmp = g_dir_make_tmp ("qv-frozen-XXXXXX", &error);
  assert_non_null (f->tmp);
  *state = f;
  return 0;
}

static void
remove_tree (const char *path)
{
  GDir *dir = g_dir_open (path, 0, NULL);
  const char *name;
  if (dir == NULL)
    return;
  while ((name = g_dir_read_name (dir)))
    {
      g_autofree char *child = g_build_filename (path, name, NULL);
      g_remove (child);
    }
  g_dir_close (dir);
  g_rmdir (path);
}

static int
teardown (void **state)
{
  Fixture *f = *state;
  remove_tree (f->tmp);
  g_free (f->tmp);
  qv_force_constants_free (f->fc);
  qv_supercell_map_free (f->map);
  qv_hessian_free (f->h);
  qv_structure_free (f->sc);
  qv_structure_free (f->primitive);
  g_free (f);
  return 0;
}

/* Eigenvector @branch of D(q) by LAPACKE_zheev (not the zheevd path of
 * qv_dynamical_matrix_solve), with the documented phase: largest
 * component real and positive. Returns ω². */
static double
lapack_vector (const QvForceConstants *fc, const double q[3], gsize branch, double _Complex *e)
{
  gsize nb = 3 * qv_force_constants_n_sites (fc), big = 0;
  g_autofree double _Complex *d = g_new (double _Complex, nb * nb);
  g_autofree double *w = g_new (double, nb);
  double _Complex ph;
  qv_dynamical_matrix_build (fc, q, d);
  assert_int_equal (LAPACKE_zheev (LAPACK_COL_MAJOR, 'V', 'U', (lapack_int) nb, d,
                                   (lapack_int) nb, w), 0);
  for (gsize b = 0; b < nb; b++)
    if (b != branch)
      assert_true (fabs (w[b] - w[branch]) > 1e-4 * fabs (w[branch]));   /* not degenerate */
  for (gsize r = 1; r < nb; r++)
    if (cabs (d[r + branch * nb]) > cabs (d[big + branch * nb]) * (1 + 1e-8))
      big = r;
  ph = conj (d[big + branch * nb]) / cabs (d[big + branch * nb]);
  for (gsize r = 0; r < nb; r++)
    e[r] = d[r + branch * nb] * ph;
  return w[branch];
}

static void
test_read_back (void **state)
{
  Fixture *f = *state;
  const double q[3] = { 1.0 / 3, 2.0 / 3, 0 };   /* commensurate with 3×3×3, q ≢ −q */
  const double phase = 0.7, largest = 0.05;
  gsize nb = 6, na = f->sc->n_atoms;
  g_autoptr(GError) error = NULL;
  QvFrozenRequest req = { { q[0], q[1], q[2] }, 4, largest, QV_FROZEN_LARGEST, phase };
  g_autoptr(QvFrozenPhonon) fp = qv_frozen_phonon_new (f->fc, f->map, f->sc, &req, &error);
  g_autoptr(QvExport) x = NULL;
  g_autoptr(GPtrArray) frames = NULL;
  g_autoptr(QvManifest) read = NULL;
  g_autofree char *xyz = g_build_filename (f->tmp, "frozen-phonon.xyz", NULL);
  g_autofree char *mpath = g_build_filename (f->tmp, "manifest.json", NULL);
  g_autofree double *u = g_new (double, 3 * na), *v = g_new (double, 3 * na);
  g_autofree double _Complex *e = g_new (double _Complex, nb);
  const QvStructure *back;
  double w2, big = 0, res = 0, norm = 0, got;
  double _Complex z;

  if (fp == NULL)
    fail_msg ("%s", error->message);
  assert_true (fp->standing);
  assert_false (fp->degenerate);
  x = qv_export_new_frozen (fp, NULL, qv_manifest_new ("frozen-phonon"), &error);
  if (x == NULL)
    fail_msg ("%s", error->message);
  assert_true (qv_export_write (x, f->tmp, FALSE, NULL, &error));

  frames = qv_xyz_read_file (xyz, &error);
  if (frames == NULL)
    fail_msg ("%s", error->message);
  assert_int_equal (frames->len, 1);
  back = g_ptr_array_index (frames, 0);
  assert_int_equal (back->n_atoms, na);
  assert_true (back->has_cell);
  for (int i = 0; i < 3; i++)
    for (int c = 0; c < 3; c++)
      assert_true (fabs (back->cell[i][c] - f->sc->cell[i][c]) < 1e-12);
  for (gsize i = 0; i < na; i++)
    {
      double l = 0;
      for (int a = 0; a < 3; a++)
        {
          u[3 * i + a] = back->atoms[i].position[a] - f->sc->atoms[i].position[a];
          l += u[3 * i + a] * u[3 * i + a];
        }
      big = MAX (big, sqrt (l));
    }
  /* the chosen largest displacement */
  assert_true (fabs (big - largest) < 1e-12);

  /* projected onto D(q)'s eigenvector from LAPACK: A e^{iφ} back */
  w2 = lapack_vector (f->fc, q, 4, e);
  z = qv_frozen_phonon_project (f->map, f->primitive->cell, q, e, u);
  print_message ("frozen phonon: |z| = %.12g (A = %.12g), arg z = %.12g (phase %.12g)\n",
                 cabs (z), fp->a, carg (z), phase);
  assert_true (fabs (cabs (z) - fp->a) < 1e-9 * fp->a);
  assert_true (fabs (carg (z) - phase) < 1e-9);
  assert_true (fabs (w2 - fp->eigenvalue) < 1e-10 * fabs (w2));
  /* every other branch at q and at −q is absent: the pattern lives in the
   * two-dimensional space of ±q of this branch */
  for (gsize b = 0; b < nb; b++)
    if (b != 4)
      {
        g_autofree double _Complex *o = g_new (double _Complex, nb);
        lapack_vector (f->fc, q, b, o);
        assert_true (cabs (qv_frozen_phonon_project (f->map, f->primitive->cell, q, o, u))
                     < 1e-9 * fp->a);
      }

  /* independent of D(q): √m u is an eigenvector of the supercell's own
   * mass-weighted Hessian (exact spring model) with eigenvalue ω² */
  for (gsize i = 0; i < 3 * na; i++)
    v[i] = u[i] * sqrt (f->sc->atoms[i / 3].mass);
  for (gsize i = 0; i < 3 * na; i++)
    {
      double s = 0;
      for (gsize j = 0; j < 3 * na; j++)
        s += f->h->data[i + j * na * 3] * v[j] / sqrt (f->sc->atoms[j / 3].mass);
      s /= sqrt (f->sc->atoms[i / 3].mass);
      res = MAX (res, fabs (s - w2 * v[i]));
      norm = MAX (norm, fabs (w2 * v[i]));
    }
  print_message ("frozen phonon: supercell residual |H u - w^2 u| / |w^2 u| = %.3g\n", res / norm);
  assert_true (res < 1e-9 * norm);

  /* the manifest records q, branch, wavenumber, amplitude and phase */
  read = qv_manifest_read_file (mpath, &error);
  if (read == NULL)
    fail_msg ("%s", error->message);
  assert_true (qv_manifest_get_number (read->parameters, "phase_rad", &got));
  assert_true (fabs (got - phase) < 1e-15);
  assert_true (qv_manifest_get_number (read->parameters, "wavenumber_cm-1", &got));
  assert_true (fabs (got - fp->wavenumber) < 1e-9);
  assert_true (qv_manifest_get_number (read->parameters, "amplitude_Q_sqrtu_A", &got));
  assert_true (fabs (got - fp->a) < 1e-12);
  assert_true (qv_manifest_get_number (read->parameters, "branch", &got));
  assert_true (got == 5);
  assert_string_equal (qv_manifest_get (read->parameters, "q")->string,
                       "0.33333333333333331 0.66666666666666663 0");
}

static void
test_amplitude_q (void **state)
{
  Fixture *f = *state;
  const double q[3] = { 0, 1.0 / 3, 1.0 / 3 };
  QvFrozenRequest req = { { q[0], q[1], q[2] }, 5, 0.3, QV_FROZEN_Q, -2.0 };
  g_autoptr(GError) error = NULL;
  g_autoptr(QvFrozenPhonon) fp = qv_frozen_phonon_new (f->fc, f->map, f->sc, &req, &error);
  double _Complex z;
  assert_non_null (fp);
  z = qv_frozen_phonon_project (f->map, f->primitive->cell, q, fp->vector, fp->displacements);
  assert_true (fabs (cabs (z) - 0.3) < 1e-12);
  assert_true (fabs (carg (z) + 2.0) < 1e-12);
  /* Σ m |u|² of a running-wave snapshot averages cos² to ½: A²/2 (q ≢ −q) */
  {
    double s = 0;
    for (gsize i = 0; i < f->sc->n_atoms; i++)
      for (int a = 0; a < 3; a++)
        s += f->sc->atoms[i].mass * fp->displacements[3 * i + a] * fp->displacements[3 * i + a];
    assert_true (fabs (s - 0.045) < 1e-12);
  }
}

static void
test_refused (void **state)
{
  Fixture *f = *state;
  QvFrozenRequest req = { { 0.25, 0, 0 }, 0, 0.05, QV_FROZEN_LARGEST, 0 };
  g_autoptr(GError) error = NULL;
  g_autoptr(QvFrozenPhonon) fp = qv_frozen_phonon_new (f->fc, f->map, f->sc, &req, &error);
  assert_null (fp);
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
  assert_non_null (strstr (error->message, "not commensurate"));
  g_clear_error (&error);
  req.q[0] = 1.0 / 3;
  req.branch = 6;
  assert_null (qv_frozen_phonon_new (f->fc, f->map, f->sc, &req, &error));
  assert_non_null (strstr (error->message, "1 to 6"));
  g_clear_error (&error);
  req.branch = 0;
  req.amplitude = -1;
  assert_null (qv_frozen_phonon_new (f->fc, f->map, f->sc, &req, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
  /* q ≡ −q at the zone boundary: not a standing-wave case */
  assert_true (qv_frozen_phonon_q_is_real ((double[3]) { 0.5, 0, -0.5 }));
  assert_false (qv_frozen_phonon_q_is_real ((double[3]) { 1.0 / 3, 0, 0 }));
}

/* With the LO–TO term (qv_frozen_phonon_new_with), the pattern follows the
 * eigenvector of D(q) + D^NA(q), built here by LAPACKE_zheev from
 * qv_dynamical_matrix_build_with; without a term it is _new's, bit for bit. */
static void
test_with_nonanalytic (void **state)
{
  Fixture *f = *state;
  /* invented rigid-ion charges ±1.1 e, eps_inf 2.4 */
  const double born[18] = { 1.1, 0, 0, 0, 1.1, 0, 0, 0, 1.1, -1.1, 0, 0, 0, -1.1, 0, 0, 0, -1.1 };
  const double eps[3][3] = { { 2.4, 0, 0 }, { 0, 2.4, 0 }, { 0, 0, 2.4 } };
  /* not commensurate with the force constants' 3×3×3 supercell, where the
   * interpolated term vanishes (qv-nonanalytic.h); a 6×1×1 cell for it */
  const double q[3] = { 1.0 / 6, 0, 0 };
  int m6[3][3] = { { 6, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 } };
  g_autoptr(QvStructure) sc6 = qv_supercell_build (f->primitive, m6, NULL);
  g_autoptr(QvSupercellMap) map6 = qv_supercell_map (f->primitive, sc6, 0, NULL);
  g_autoptr(QvNonAnalytic) na = qv_nonanalytic_new (f->fc, 2, born, eps, NULL);
  g_autoptr(QvPhononSet) plain_set = qv_dynamical_matrix_solve (f->fc, q, 1, FALSE, 1, NULL, NULL);
  g_autoptr(QvFrozenPhonon) plain = NULL, with = NULL, none = NULL;
  double _Complex d[36], dot = 0;
  double w[6], moved = 0;
  gsize lo = 0;

  assert_non_null (na);
  assert_non_null (plain_set);
  qv_dynamical_matrix_build_with (f->fc, qv_nonanalytic_add, na, q, d);
  assert_int_equal (LAPACKE_zheev (LAPACK_COL_MAJOR, 'V', 'U', 6, d, 6, w), 0);
  /* the branch the term moves most: the longitudinal optic one */
  for (gsize b = 0; b < 6; b++)
    if (fabs (w[b] - plain_set->eigenvalues[b]) > moved)
      {
        moved = fabs (w[b] - plain_set->eigenvalues[b]);
        lo = b;
      }
  assert_true (moved > 1e-3 * fabs (w[5]));
  {
    QvFrozenRequest rq = { { q[0], q[1], q[2] }, lo, 0.05, QV_FROZEN_LARGEST, 0.3 };
    plain = qv_frozen_phonon_new (f->fc, map6, sc6, &rq, NULL);
    none = qv_frozen_phonon_new_with (f->fc, NULL, NULL, map6, sc6, &rq, NULL);
    with = qv_frozen_phonon_new_with (f->fc, qv_nonanalytic_add, na, map6, sc6, &rq, NULL);
  }
  assert_non_null (plain);
  assert_non_null (with);
  /* no term: _new's pattern, bit for bit */
  assert_memory_equal (plain->displacements, none->displacements, 3 * plain->n_atoms * sizeof (double));
  /* with the term: LAPACK's eigenvalue of D + D^NA and the same vector up
   * to a phase, |<e_lapack|e_used>| = 1 */
  assert_true (fabs (w[lo] - with->eigenvalue) < 1e-9 * fabs (w[5]));
  for (int r = 0; r < 6; r++)
    dot += conj (d[r + (int) lo * 6]) * with->vector[r];
  assert_true (fabs (cabs (dot) - 1) < 1e-9);
}

/* The smallest diagonal supercell for a q: denominators per component. */
static void
test_diagonal_supercell (void **state)
{
  int m[3][3];
  const double q[3] = { 0.5, 0.25, 2.0 / 3 }, bad[3] = { 0.1234567, 0, 0 };
  GError *error = NULL;
  (void) state;

  assert_true (qv_frozen_phonon_diagonal_supercell (q, 12, m, NULL));
  assert_int_equal (m[0][0], 2);
  assert_int_equal (m[1][1], 4);
  assert_int_equal (m[2][2], 3);
  assert_int_equal (m[0][1], 0);
  assert_true (qv_frozen_phonon_commensurate (m, q, NULL));
  assert_false (qv_frozen_phonon_diagonal_supercell (bad, 12, m, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
  g_clear_error (&error);
}

/* A frozen phonon of a crystal (what the app writes): in the crystal's own
 * 3×3×3 supercell when q is commensurate with it, equal to the direct call
 * there; otherwise in the smallest diagonal supercell, where the pattern
 * obeys Bloch's condition u_lκ = e^{iq·R_l} u_0κ (±1 at the real q = X:
 * a standing wave) and the wavenumber is D(q)'s; a q no small cell fits is
 * refused. */
static void
test_in_crystal (void **state)
{
  Fixture *f = *state;
  g_autoptr(QvCrystal) c = NULL;
  GError *error = NULL;
  int m[3][3];

  c = qv_crystal_new (f->primitive, f->sc, 0, &error);
  assert_non_null (c);
  assert_true (qv_crystal_set_hessian (c, f->h, TRUE, &error));
  {
    QvFrozenRequest r = { { 1.0 / 3, 0, 2.0 / 3 }, 4, 0.05, QV_FROZEN_LARGEST, 0.3 };
    g_autoptr(QvFrozenPhonon) in = qv_frozen_phonon_new_in_crystal (c, f->sc, &r, 12, m, &error);
    g_autoptr(QvFrozenPhonon) direct = qv_frozen_phonon_new (f->fc, f->map, f->sc, &r, &error);
    assert_non_null (in);
    assert_non_null (direct);
    for (int i = 0; i < 3; i++)
      for (int j = 0; j < 3; j++)
        assert_int_equal (m[i][j], i == j ? 3 : 0);
    assert_int_equal (in->n_atoms, f->sc->n_atoms);
    for (gsize k = 0; k < 3 * in->n_atoms; k++)
      assert_true (fabs (in->displacements[k] - direct->displacements[k]) < 1e-12);
  }
  {
    /* X = (1/2, 0, 1/2): 3×3×3 does not fit it, 2×1×2 does */
    const double q[3] = { 0.5, 0, 0.5 };
    QvFrozenRequest r = { { 0.5, 0, 0.5 }, 5, 0.05, QV_FROZEN_LARGEST, 0 };
    g_autoptr(QvFrozenPhonon) fp = qv_frozen_phonon_new_in_crystal (c, f->sc, &r, 12, m, &error);
    g_autoptr(QvSupercellMap) map = NULL;
    g_autoptr(QvPhononSet) set = qv_dynamical_matrix_solve (c->fc, q, 1, FALSE, 1, NULL, NULL);
    gsize first[2] = { G_MAXSIZE, G_MAXSIZE };
    double largest = 0;

    assert_non_null (fp);
    assert_int_equal (m[0][0], 2);
    assert_int_equal (m[1][1], 1);
    assert_int_equal (m[2][2], 2);
    assert_int_equal (fp->n_atoms, 2 * 4);
    assert_true (fabs (fp->wavenumber - set->wavenumbers[5]) < 1e-9 * fabs (set->wavenumbers[5]));
    map = qv_supercell_map (f->primitive, fp->structure, 0.1, &error);
    assert_non_null (map);
    for (gsize a = 0; a < fp->n_atoms; a++)
      if (map->translation[3 * a] == 0 && map->translation[3 * a + 1] == 0
          && map->translation[3 * a + 2] == 0)
        first[map->site[a]] = a;
    assert_true (first[0] != G_MAXSIZE && first[1] != G_MAXSIZE);
    for (gsize a = 0; a < fp->n_atoms; a++)
      {
        const int *n = &map->translation[3 * a];
        const double sign = cos (2 * G_PI * (q[0] * n[0] + q[1] * n[1] + q[2] * n[2]));
        const gsize o = first[map->site[a]];
        for (int x = 0; x < 3; x++)
          {
            assert_true (fabs (fp->displacements[3 * a + x] - sign * fp->displacements[3 * o + x]) < 1e-12);
            largest = MAX (largest, fabs (fp->displacements[3 * a + x]));
          }
      }
    assert_true (fabs (largest - 0.05) < 1e-12);   /* the amplitude asked for */
  }
  {
    QvFrozenRequest r = { { 0.1234567, 0, 0 }, 0, 0.05, QV_FROZEN_LARGEST, 0 };
    assert_null (qv_frozen_phonon_new_in_crystal (c, f->sc, &r, 12, m, &error));
    assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
    g_clear_error (&error);
  }
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test_setup_teardown (test_read_back, setup, teardown),
    cmocka_unit_test_setup_teardown (test_amplitude_q, setup, teardown),
    cmocka_unit_test_setup_teardown (test_refused, setup, teardown),
    cmocka_unit_test_setup_teardown (test_with_nonanalytic, setup, teardown),
    cmocka_unit_test (test_diagonal_supercell),
    cmocka_unit_test_setup_teardown (test_in_crystal, setup, teardown),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
