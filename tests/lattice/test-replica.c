/* test-replica.c — the replicated block of cells and a lattice mode's
 * complex field on it (src/core/qv-lattice-replica.c), and the crystal of
 * src/core/qv-crystal.c. The field is checked against the frozen-phonon
 * pattern of the same q (qv-frozen-phonon.c, itself checked against the
 * exact supercell Hessian in test-frozen.c): both follow the one phase
 * convention of docs/methods.md, so at every phase they must agree.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <complex.h>
#include <math.h>
#include <string.h>
#include "lattice-model.h"
#include "qv-crystal.h"
#include "qv-dynamical-matrix.h"
#include "qv-error.h"
#include "qv-frozen-phonon.h"
#include "qv-lattice-replica.h"
#include "qv-supercell.h"

/* An invented rock-salt spring model (a = 5.6 Å), as in test-frozen.c. */
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

static QvCrystal *
salt_crystal (const int reps, QvStructure **sc_out)
{
  int matrix[3][3] = { { reps, 0, 0 }, { 0, reps, 0 }, { 0, 0, reps } };
  g_autoptr(QvStructure) primitive = salt ();
  g_autoptr(QvHessian) h = NULL;
  GError *error = NULL;
  QvStructure *sc = qv_supercell_build (primitive, matrix, &error);
  QvCrystal *c;

  assert_non_null (sc);
  h = lattice_model_hessian (sc, shells, G_N_ELEMENTS (shells));
  c = qv_crystal_new (primitive, sc, 0, &error);
  assert_null (error);
  assert_non_null (c);
  assert_true (qv_crystal_set_hessian (c, h, TRUE, &error));
  *sc_out = sc;
  return c;
}

/* The block is qv_supercell_build's diagonal supercell, atom for atom. */
static void
test_block_order (void **state)
{
  g_autoptr(QvStructure) primitive = salt (), block = NULL, sc = NULL;
  int reps[3] = { 2, 3, 1 }, matrix[3][3] = { { 2, 0, 0 }, { 0, 3, 0 }, { 0, 0, 1 } };
  (void) state;

  block = qv_lattice_replica_new (primitive, reps, NULL);
  sc = qv_supercell_build (primitive, matrix, NULL);
  assert_non_null (block);
  assert_int_equal (block->n_atoms, 12);
  for (gsize i = 0; i < block->n_atoms; i++)
    for (int j = 0; j < 3; j++)
      assert_true (fabs (block->atoms[i].position[j] - sc->atoms[i].position[j]) < 1e-12);
  assert_true (block->has_cell);
  for (int j = 0; j < 3; j++)
    assert_true (fabs (block->cell[1][j] - 3 * primitive->cell[1][j]) < 1e-12);
}

/* At a q commensurate with the block, re cos φ − im sin φ is the frozen
 * phonon of phase φ (to one overall factor) for every φ and every branch. */
static void
test_field_matches_frozen_phonon (void **state)
{
  g_autoptr(QvStructure) sc = NULL;
  g_autoptr(QvCrystal) c = salt_crystal (4, &sc);
  const double qs[][3] = { { 0.25, 0, 0 }, { 0.5, 0.25, 0.75 }, { 0.5, 0.5, 0.5 } };
  int reps[3] = { 4, 4, 4 };
  gsize n = 3 * sc->n_atoms;
  g_autofree float *re = g_new (float, n), *im = g_new (float, n);
  (void) state;

  for (gsize k = 0; k < G_N_ELEMENTS (qs); k++)
    {
      g_autoptr(QvPhononSet) set = qv_dynamical_matrix_solve (c->fc, qs[k], 1, TRUE, 1, NULL,
                                                              NULL);
      assert_non_null (set);
      for (gsize b = 0; b < 6; b++)
        {
          double scale = qv_lattice_replica_field (c->primitive, reps, qs[k],
                                                   set->eigenvectors + b * 6, re, im);
          assert_true (scale > 0);
          for (double phi = 0; phi < 6.2; phi += 0.7)
            {
              QvFrozenRequest rq = { { qs[k][0], qs[k][1], qs[k][2] }, b, 1.0, QV_FROZEN_Q,
                                     phi };
              g_autoptr(QvFrozenPhonon) fp = NULL;
              double dot = 0, nf = 0, nr = 0;
              fp = qv_frozen_phonon_new (c->fc, c->map, sc, &rq, NULL);
              if (fp == NULL)   /* a real q at a phase where the pattern vanishes */
                continue;
              for (gsize i = 0; i < n; i++)
                {
                  double r = re[i] * cos (phi) - im[i] * sin (phi);
                  dot += r * fp->displacements[i];
                  nf += fp->displacements[i] * fp->displacements[i];
                  nr += r * r;
                }
              /* parallel, and in the ratio the two conventions give:
               * frozen = field / (scale √N) with A = 1 */
              assert_true (fabs (dot / sqrt (nf * nr) - 1) < 1e-5);
              assert_true (fabs (sqrt (nf) * scale * 8.0 / sqrt (nr) - 1) < 1e-5);
            }
        }
    }
}

/* The largest displacement over the block and a period is 1. */
static void
test_field_normalised (void **state)
{
  g_autoptr(QvStructure) sc = NULL;
  g_autoptr(QvCrystal) c = salt_crystal (2, &sc);
  const double q[3] = { 0.13, 0.29, 0.41 };   /* incommensurate, general */
  int reps[3] = { 3, 2, 2 };
  gsize n = 3 * 12 * 2;
  g_autofree float *re = g_new (float, n), *im = g_new (float, n);
  g_autoptr(QvPhononSet) set = qv_dynamical_matrix_solve (c->fc, q, 1, TRUE, 1, NULL, NULL);
  (void) state;

  for (gsize b = 0; b < 6; b++)
    {
      double big = 0;
      qv_lattice_replica_field (c->primitive, reps, q, set->eigenvectors + b * 6, re, im);
      for (int s = 0; s < 3600; s++)
        {
          double phi = 2 * G_PI * s / 3600.0;
          for (gsize i = 0; i < n; i += 3)
            {
              double l2 = 0;
              for (int j = 0; j < 3; j++)
                {
                  double u = re[i + j] * cos (phi) - im[i + j] * sin (phi);
                  l2 += u * u;
                }
              big = MAX (big, sqrt (l2));
            }
        }
      assert_true (big <= 1 + 1e-6);
      assert_true (big > 1 - 1e-5);
    }
}

/* At Γ the three acoustic modes move every atom alike. */
static void
test_gamma_acoustic_rigid (void **state)
{
  g_autoptr(QvStructure) sc = NULL;
  g_autoptr(QvCrystal) c = salt_crystal (2, &sc);
  const double q[3] = { 0, 0, 0 };
  int reps[3] = { 2, 2, 2 };
  gsize n = 3 * 16;
  g_autofree float *re = g_new (float, n), *im = g_new (float, n);
  g_autoptr(QvPhononSet) set = qv_dynamical_matrix_solve (c->fc, q, 1, TRUE, 1, NULL, NULL);
  (void) state;

  assert_true (fabs (set->wavenumbers[0]) < 1e-3);
  qv_lattice_replica_field (c->primitive, reps, q, set->eigenvectors, re, im);
  for (gsize i = 3; i < n; i++)
    {
      assert_true (fabs (re[i] - re[i % 3]) < 1e-5);
      assert_true (fabs (im[i] - im[i % 3]) < 1e-5);
    }
}

static void
test_refusals (void **state)
{
  g_autoptr(QvStructure) primitive = salt ();
  GError *error = NULL;
  int zero[3] = { 0, 1, 1 }, huge[3] = { 64, 64, 2 };
  (void) state;

  assert_null (qv_lattice_replica_new (primitive, zero, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
  g_clear_error (&error);
  assert_null (qv_lattice_replica_new (primitive, huge, &error));
  assert_non_null (strstr (error->message, "4096"));
  g_clear_error (&error);
}

/* The crystal reports the acoustic wavenumbers before the sum rule (zero
 * for an exact spring model) and refuses a supercell that does not fit. */
static void
test_crystal (void **state)
{
  g_autoptr(QvStructure) sc = NULL, primitive = salt ();
  g_autoptr(QvCrystal) c = salt_crystal (2, &sc);
  GError *error = NULL;
  (void) state;

  assert_true (c->sum_rule);
  assert_true (fabs (c->before[0]) < 1e-3 && fabs (c->before[2]) < 1e-3);
  assert_int_equal (qv_crystal_formula_units (c), 1);
  assert_int_equal (c->map->matrix[0][0], 2);

  /* one atom fewer: the count no longer fits n × det M */
  sc->n_atoms--;
  assert_null (qv_crystal_new (primitive, sc, 0, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  g_clear_error (&error);
  sc->n_atoms++;
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_block_order),
    cmocka_unit_test (test_field_matches_frozen_phonon),
    cmocka_unit_test (test_field_normalised),
    cmocka_unit_test (test_gamma_acoustic_rigid),
    cmocka_unit_test (test_refusals),
    cmocka_unit_test (test_crystal),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
