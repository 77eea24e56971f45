/* test-ensemble.c — properties of the sampling core the cross tests cannot
 * see from outside: thread safety, independence of the sample range,
 * cancellation, and the stencil's bookkeeping.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Reference values: the Wigner spreads are compared with the closed forms
 * of qv-oscillator.h (Wigner, Phys. Rev. 40, 749, 1932; the cross test
 * tests/cross/test_ensemble.py checks those against scipy.constants); the
 * central difference of a quadratic potential is exact up to rounding
 * (Taylor expansion: the h² term is the third derivative, zero here). */
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <setjmp.h>
#include <math.h>
#include <string.h>
#include <cmocka.h>

#include <glib.h>
#include "qv-ensemble.h"
#include "qv-error.h"
#include "qv-oscillator.h"
#include "qv-random.h"
#include "qv-stencil.h"
#include "qv-test-util.h"

typedef struct {
  QvStructure *s;
  QvModeSet *modes;
  QvEnsemble *e;
} Fixture;

static int
setup (void **state)
{
  Fixture *f = g_new0 (Fixture, 1);
  g_autoptr(QvHessian) h = NULL;
  QvSolveOptions so;
  QvEnsembleOptions eo;

  f->s = qvt_random_molecule (12, 77, 4.0);
  h = qvt_spring_network (f->s, 78, 3.0, 5.0, 40.0);
  qv_solve_options_init (&so);
  f->modes = qvt_solve_checked (f->s, h, &so);
  qv_ensemble_options_init (&eo);
  eo.temperature = 500.0;
  eo.seed = 99;
  f->e = qv_ensemble_new (f->s, f->modes, &eo, NULL);
  assert_non_null (f->e);
  *state = f;
  return 0;
}

static int
teardown (void **state)
{
  Fixture *f = *state;
  qv_ensemble_free (f->e);
  qv_mode_set_free (f->modes);
  qv_structure_free (f->s);
  g_free (f);
  return 0;
}

typedef struct {
  const QvEnsemble *e;
  gsize first, count;
  double *x, *v;
} Job;

static gpointer
run_job (gpointer data)
{
  Job *j = data;
  g_assert_true (qv_ensemble_generate (j->e, j->first, j->count, j->x, j->v, NULL, NULL, NULL));
  return NULL;
}

/* Four threads on one plan give what one thread gives, and sample s is the
 * same inside a long run and on its own. */
static void
test_threads_and_ranges (void **state)
{
  Fixture *f = *state;
  const gsize n = 3 * f->s->n_atoms, count = 300;
  g_autofree double *x = g_new (double, n * count), *v = g_new (double, n * count);
  g_autofree double *xt = g_new (double, n * count), *vt = g_new (double, n * count);
  double x1[3 * 12], v1[3 * 12];
  GThread *threads[4];
  Job jobs[4];

  assert_true (qv_ensemble_generate (f->e, 0, count, x, v, NULL, NULL, NULL));
  for (int t = 0; t < 4; t++)
    {
      jobs[t] = (Job) { f->e, (gsize) t * 75, 75, xt + (gsize) t * 75 * n, vt + (gsize) t * 75 * n };
      threads[t] = g_thread_new ("sampler", run_job, &jobs[t]);
    }
  for (int t = 0; t < 4; t++)
    g_thread_join (threads[t]);
  for (gsize k = 0; k < n * count; k++)
    {
      assert_true (fabs (xt[k] - x[k]) <= 1e-12 * (1.0 + fabs (x[k])));
      assert_true (fabs (vt[k] - v[k]) <= 1e-12 * (1.0 + fabs (v[k])));
    }
  assert_true (qv_ensemble_generate (f->e, 211, 1, x1, v1, NULL, NULL, NULL));
  for (gsize k = 0; k < n; k++)
    {
      assert_true (fabs (x1[k] - x[211 * n + k]) <= 1e-12 * (1.0 + fabs (x1[k])));
      assert_true (fabs (v1[k] - v[211 * n + k]) <= 1e-12 * (1.0 + fabs (v1[k])));
    }
}

/* The spreads are the closed forms: σ_Q² = ⟨Q²⟩ and σ_P = ω σ_Q, ω in rad/fs. */
static void
test_spreads (void **state)
{
  Fixture *f = *state;
  for (gsize k = 0; k < f->modes->n_modes; k++)
    {
      const double lambda = f->modes->eigenvalues[k];
      const double q2 = qv_oscillator_thermal_q2 (lambda, 500.0);
      const double omega_fs = sqrt (lambda) * sqrt (QV_ELEMENTARY_CHARGE / (1e-20 * QV_ATOMIC_MASS)) * 1e-15;
      assert_int_equal (f->e->status[k], QV_ENSEMBLE_MODE_SAMPLED);
      assert_true (fabs (f->e->sigma_q[k] * f->e->sigma_q[k] / q2 - 1.0) < 1e-12);
      assert_true (fabs (f->e->sigma_p[k] / (omega_fs * f->e->sigma_q[k]) - 1.0) < 1e-12);
    }
}

static gboolean
cancel_at_half (double fraction, const char *stage, gpointer data)
{
  (*(int *) data)++;
  return fraction < 0.5;
}

static void
test_cancel (void **state)
{
  Fixture *f = *state;
  const gsize n = 3 * f->s->n_atoms, count = 1024;
  g_autofree double *x = g_new (double, n * count), *v = g_new (double, n * count);
  g_autoptr(GError) error = NULL;
  int calls = 0;
  QvProgress p = { cancel_at_half, &calls };

  assert_false (qv_ensemble_generate (f->e, 0, count, x, v, NULL, &p, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_CANCELLED));
  assert_true (calls >= 2);
}

static void
test_bad_options (void **state)
{
  Fixture *f = *state;
  QvEnsembleOptions eo;
  g_autoptr(GError) e1 = NULL, e2 = NULL, e3 = NULL;

  qv_ensemble_options_init (&eo);
  eo.temperature = -1.0;
  assert_null (qv_ensemble_new (f->s, f->modes, &eo, &e1));
  assert_true (g_error_matches (e1, QV_ERROR, QV_ERROR_USAGE));
  eo.temperature = 300.0;
  eo.min_wavenumber = NAN;
  assert_null (qv_ensemble_new (f->s, f->modes, &eo, &e2));
  assert_true (g_error_matches (e2, QV_ERROR, QV_ERROR_USAGE));
  eo.min_wavenumber = 1e9;           /* every mode below it */
  assert_null (qv_ensemble_new (f->s, f->modes, &eo, &e3));
  assert_true (g_error_matches (e3, QV_ERROR, QV_ERROR_INPUT));
}

/* Central differences of the forces of a quadratic potential E = ½xᵀAx
 * (F = −Ax) give A back up to rounding, for all atoms and for a subset. */
static void
test_stencil_quadratic (void **state)
{
  Fixture *f = *state;
  const gsize na = f->s->n_atoms, n = 3 * na;
  g_autoptr(QvHessian) a = qvt_spring_network (f->s, 5, 3.0, 5.0, 40.0);
  const gsize subset[] = { 7, 2, 2, 9 };
  double asym;

  for (int pass = 0; pass < 2; pass++)
    {
      g_autoptr(QvStencil) st = qv_stencil_new (na, 0.01, pass ? subset : NULL, pass ? 4 : 0, NULL);
      g_autofree double *forces = g_new (double, st->n_displacements * n);
      g_autofree double *x = g_new (double, n);
      g_autoptr(QvHessian) h = NULL;

      assert_int_equal (st->n_selected, pass ? 3 : na);    /* duplicates merged */
      for (gsize d = 0; d < st->n_displacements; d++)
        {
          qv_stencil_positions (st, f->s, d, x);
          for (gsize i = 0; i < n; i++)
            {
              double fi = 0.0;
              for (gsize j = 0; j < n; j++)
                fi -= a->data[j * n + i] * (x[j] - f->s->atoms[j / 3].position[j % 3]);
              forces[d * n + i] = fi;
            }
        }
      h = qv_stencil_assemble (st, forces, &asym, NULL, NULL);
      assert_non_null (h);
      assert_int_equal (h->n, 3 * st->n_selected);
      assert_true (asym < 1e-12);
      for (gsize r = 0; r < h->n; r++)
        for (gsize c = 0; c < h->n; c++)
          {
            const gsize i = 3 * st->atoms[r / 3] + r % 3, j = 3 * st->atoms[c / 3] + c % 3;
            assert_true (fabs (h->data[c * h->n + r] - a->data[j * n + i]) < 1e-9);
          }
      if (pass)
        {
          g_autofree char *text = qv_stencil_format_atoms (st);
          assert_string_equal (text, "3,8,10");
        }
    }
}

static void
test_atom_lists (void **state)
{
  g_autofree gsize *atoms = NULL;
  gsize n = 0;
  const char *bad[] = { "", "0", "1,,2", "3-1", "1-x", "-2", "11", "2-11", "a" };

  assert_true (qv_stencil_parse_atoms (" 1, 3-5 ,10", 10, &atoms, &n, NULL));
  assert_int_equal (n, 5);
  assert_int_equal (atoms[0], 0);
  assert_int_equal (atoms[1], 2);
  assert_int_equal (atoms[3], 4);
  assert_int_equal (atoms[4], 9);
  for (gsize i = 0; i < G_N_ELEMENTS (bad); i++)
    {
      g_autoptr(GError) error = NULL;
      g_autofree gsize *none = NULL;
      assert_false (qv_stencil_parse_atoms (bad[i], 10, &none, &n, &error));
      assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
    }
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_threads_and_ranges),
    cmocka_unit_test (test_spreads),
    cmocka_unit_test (test_cancel),
    cmocka_unit_test (test_bad_options),
    cmocka_unit_test (test_stencil_quadratic),
    cmocka_unit_test (test_atom_lists),
  };
  return cmocka_run_group_tests (tests, setup, teardown);
}
