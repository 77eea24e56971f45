/* test-dvr.c — the sinc DVR (Colbert & Miller, J. Chem. Phys. 96, 1982,
 * 1992) and the scan potential against closed forms: harmonic oscillator
 * levels E_v = ħω(v+½) and turning points Q_tp = √((2v+1)ħ/ω) (Griffiths,
 * Introduction to Quantum Mechanics, ch. 2); Morse levels
 * E_v = ħω(v+½) − [ħω(v+½)]²/(4D) (Morse, Phys. Rev. 34, 57, 1929); two
 * coupled harmonic coordinates V = ½Σω_i²Q_i² + cQ₁Q₂ with ω² the
 * eigenvalues of [[ω₁², c], [c, ω₂²]] (any classical-mechanics text on small
 * oscillations, e.g. Goldstein, Classical Mechanics, ch. 6); a symmetric
 * double well, whose two lowest levels split by tunnelling, less for a
 * higher barrier (common practice; e.g. Griffiths, problem on the double
 * delta well).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>
#include "qv-dvr.h"
#include "qv-error.h"
#include "qv-scan-potential.h"

/* CODATA 2018, typed independently of qv-units.h. */
static const double hbar = 6.62607015e-34 / (2 * M_PI);
static const double e_charge = 1.602176634e-19;
static const double m_u = 1.66053906660e-27;
static const double h_planck = 6.62607015e-34;
static const double c_light = 299792458.0;

#define assert_rel(a, b, tol) G_STMT_START { \
  const double a_ = (a), b_ = (b); \
  if (!(fabs (a_ - b_) <= (tol) * fabs (b_))) \
    fail_msg ("%s = %.15g, expected %.15g (relative %.3g > %.3g)", #a, a_, b_, \
              fabs (a_ - b_) / fabs (b_), (double) (tol)); } G_STMT_END
#define assert_abs(a, b, tol) G_STMT_START { \
  const double a_ = (a), b_ = (b); \
  if (!(fabs (a_ - b_) <= (tol))) \
    fail_msg ("%s = %.15g, expected %.15g (off by %.3g > %.3g)", #a, a_, b_, \
              fabs (a_ - b_), (double) (tol)); } G_STMT_END

/* ħω in eV of a mass-weighted curvature λ in eV/(Å² u). */
static double
hbar_omega (double lambda)
{
  return hbar * sqrt (lambda * e_charge / (1e-20 * m_u)) / e_charge;
}

/* ħ/ω in u Å² (the scale of Q²) from λ. */
static double
hbar_over_omega (double lambda)
{
  const double omega = sqrt (lambda * e_charge / (1e-20 * m_u));
  return hbar / omega / (m_u * 1e-20);
}

static double
ev_per_cm1 (void)
{
  return h_planck * c_light * 100.0 / e_charge;
}

static void
test_kinetic_prefactor (void **state)
{
  /* ħ²/(2 u Å²) in eV */
  assert_rel (qv_dvr_kinetic_prefactor (), hbar * hbar / (2 * m_u * 1e-20) / e_charge, 1e-14);
}

typedef struct { double lambda; } Harmonic;

static double
harmonic (const double *x, gpointer data)
{
  const Harmonic *h = data;
  return 0.5 * h->lambda * x[0] * x[0];
}

static void
test_harmonic_levels (void **state)
{
  /* λ = 30 eV/(Å² u) (about 2860 cm⁻¹) and 0.5 (a soft 370 cm⁻¹ mode),
   * on the free line (eq. A7) and between walls far out (eq. A6) */
  const double lambdas[] = { 30.0, 0.5 };

  for (gsize c = 0; c < 2 * G_N_ELEMENTS (lambdas); c++)
    {
      Harmonic h = { lambdas[c / 2] };
      const gboolean walls = c % 2;
      const double hw = hbar_omega (h.lambda);
      const double qtp = sqrt (9 * hbar_over_omega (h.lambda));    /* v = 4 */
      const gsize n = 161;
      const double lo = -3.5 * qtp, hi = 3.5 * qtp;
      QvDvrGrid grid;
      g_autofree double *v = g_new (double, n);
      g_autoptr(QvDvrLevels) levels = NULL;
      g_autoptr(GError) error = NULL;

      qv_dvr_grid_span (&grid, 1, &n, &lo, &hi, walls);
      /* the points: on the ends, or strictly inside the walls */
      assert_abs (grid.lo[0] + (double) (n - 1) * grid.step[0] + (walls ? grid.step[0] : 0), hi, 1e-14);
      assert_abs (grid.lo[0] - (walls ? grid.step[0] : 0), lo, 1e-14);
      for (gsize i = 0; i < n; i++)
        {
          double x;
          qv_dvr_grid_point (&grid, i, &x);
          v[i] = harmonic (&x, &h);
        }
      levels = qv_dvr_solve (&grid, v, qv_dvr_kinetic_prefactor (), 8, &error);
      assert_non_null (levels);
      for (guint k = 0; k < 8; k++)
        {
          assert_rel (levels->energies[k], hw * (k + 0.5), 1e-8);
          /* ⟨Q⟩ = 0 by symmetry; normalised vectors; tiny edge weight */
          assert_abs (qv_dvr_levels_mean (levels, k, 0), 0.0, 1e-10 * qtp);
          {
            double norm = 0.0;
            for (gsize i = 0; i < n; i++)
              norm += levels->vectors[i + n * k] * levels->vectors[i + n * k];
            assert_abs (norm, 1.0, 1e-12);
          }
          assert_true (qv_dvr_levels_edge_weight (levels, k, 0.05) < 1e-8);
        }
      /* the wavefunctions on the grid: ψ_0 = (α/π)^¼ exp(−αQ²/2) and
       * ψ_1 = (α/π)^¼ √(2α) Q exp(−αQ²/2), α = ω/ħ (Griffiths, Introduction
       * to Quantum Mechanics, eqs. 2.59 and 2.63, from memory); ψ_0 comes
       * out positive (its largest component), ψ_1's sign is a tie, so its
       * magnitude is compared */
      {
        const double alpha = 1.0 / hbar_over_omega (h.lambda);
        const double peak = pow (alpha / M_PI, 0.25);
        double norm = 0.0;
        for (gsize i = 0; i < n; i++)
          {
            double x;
            qv_dvr_grid_point (&grid, i, &x);
            const double g = peak * exp (-0.5 * alpha * x * x);
            assert_abs (qv_dvr_levels_wavefunction (levels, 0, i), g, 1e-7 * peak);
            assert_abs (fabs (qv_dvr_levels_wavefunction (levels, 1, i)),
                        fabs (sqrt (2 * alpha) * x * g), 1e-7 * peak);
            norm += pow (qv_dvr_levels_wavefunction (levels, 3, i), 2) * grid.step[0];
          }
        assert_abs (norm, 1.0, 1e-12);
      }
      /* ⟨0|Q|1⟩² = ħ/(2ω) (ladder operators; Griffiths ch. 2) */
      {
        const double m01 = qv_dvr_levels_coordinate_element (levels, 0, 1, 0);
        assert_rel (m01 * m01, hbar_over_omega (h.lambda) / 2, 1e-8);
      }
    }
}

/* With walls and no potential: the particle in a box of length L,
 * E_k = ħ²π²k²/(2L²), k = 1, 2, … (Griffiths ch. 2), which the (a, b) DVR
 * of Colbert & Miller reproduces exactly (its basis is the box's sines). */
static void
test_box_levels (void **state)
{
  const gsize n = 40;
  const double lo = -0.3, hi = 0.9, L = hi - lo;
  QvDvrGrid grid;
  g_autofree double *v = g_new0 (double, n);
  g_autoptr(QvDvrLevels) levels = NULL;

  qv_dvr_grid_span (&grid, 1, &n, &lo, &hi, TRUE);
  levels = qv_dvr_solve (&grid, v, qv_dvr_kinetic_prefactor (), 6, NULL);
  assert_non_null (levels);
  for (guint k = 0; k < 6; k++)
    assert_rel (levels->energies[k], hbar * hbar * M_PI * M_PI * (k + 1) * (k + 1)
                                     / (2 * m_u * L * L * 1e-20) / e_charge, 1e-10);
}

/* A box too small: the ground state presses on the walls and the edge
 * weight says so. */
static void
test_edge_weight (void **state)
{
  Harmonic h = { 1.0 };
  const double qtp = sqrt (hbar_over_omega (h.lambda));
  const gsize n = 41;
  const double lo = -1.0 * qtp, hi = 1.0 * qtp;
  QvDvrGrid grid;
  g_autofree double *v = g_new (double, n);
  g_autoptr(QvDvrLevels) levels = NULL;

  qv_dvr_grid_span (&grid, 1, &n, &lo, &hi, FALSE);
  for (gsize i = 0; i < n; i++)
    {
      double x;
      qv_dvr_grid_point (&grid, i, &x);
      v[i] = harmonic (&x, &h);
    }
  levels = qv_dvr_solve (&grid, v, qv_dvr_kinetic_prefactor (), 3, NULL);
  assert_non_null (levels);
  assert_true (qv_dvr_levels_edge_weight (levels, 0, 0.05) > 1e-3);
  /* confinement raises the level (variational) */
  assert_true (levels->energies[0] > hbar_omega (h.lambda) / 2 * 1.01);
}

typedef struct { double D, a, q0; } Morse;

static double
morse (const double *x, gpointer data)
{
  const Morse *m = data;
  const double e = 1.0 - exp (-m->a * (x[0] - m->q0));
  return m->D * e * e;
}

/* Morse closed form: E_v = ħω(v+½) − [ħω(v+½)]²/(4D), ω = a√(2D/μ), μ = 1. */
static double
morse_level (const Morse *m, guint v)
{
  const double hw = hbar_omega (2.0 * m->D * m->a * m->a);
  const double x = hw * (v + 0.5);
  return x - x * x / (4.0 * m->D);
}

static const Morse morse_model = { 4.5, 1.9, 0.1 };   /* invented: D = 4.5 eV */

static void
test_morse_dvr_and_refinement (void **state)
{
  QvDvrRefineOptions o;
  g_autoptr(QvDvrRefinement) r = NULL;
  g_autoptr(GError) error = NULL;
  Morse m = morse_model;

  qv_dvr_refine_options_init (&o, 1);
  /* default tolerance: 1e-6 cm⁻¹ */
  assert_rel (o.tolerance, 1e-6 * ev_per_cm1 (), 1e-12);
  o.lo[0] = -0.5;
  o.hi[0] = 2.2;
  o.n_levels = 6;
  o.start_points = 25;
  r = qv_dvr_refine (&o, morse, &m, qv_dvr_kinetic_prefactor (), &error);
  assert_non_null (r);
  assert_true (r->converged);
  for (guint v = 0; v < 6; v++)
    assert_rel (r->levels->energies[v], morse_level (&m, v), 1e-8);

  /* the convergence report: grids grow, span [lo, hi] exactly, and each
   * step's change is the largest level difference of the two grids, solved
   * again here; the last is below the tolerance, the one before not */
  assert_true (r->steps->len >= 3);
  assert_true (isnan (g_array_index (r->steps, QvDvrStep, 0).max_change));
  for (guint s = 1; s < r->steps->len; s++)
    {
      const QvDvrStep *a = &g_array_index (r->steps, QvDvrStep, s - 1);
      const QvDvrStep *b = &g_array_index (r->steps, QvDvrStep, s);
      g_autoptr(QvDvrLevels) la = NULL, lb = NULL;
      QvDvrGrid ga, gb;
      double worst = 0.0;

      assert_true (b->n[0] > a->n[0]);
      assert_abs (o.lo[0] + (double) (b->n[0] + 1) * b->step[0], o.hi[0], 1e-12);
      qv_dvr_grid_span (&ga, 1, a->n, o.lo, o.hi, TRUE);
      qv_dvr_grid_span (&gb, 1, b->n, o.lo, o.hi, TRUE);
      {
        g_autofree double *va = g_new (double, a->n[0]), *vb = g_new (double, b->n[0]);
        for (gsize i = 0; i < a->n[0]; i++)
          {
            double x;
            qv_dvr_grid_point (&ga, i, &x);
            va[i] = morse (&x, &m);
          }
        for (gsize i = 0; i < b->n[0]; i++)
          {
            double x;
            qv_dvr_grid_point (&gb, i, &x);
            vb[i] = morse (&x, &m);
          }
        la = qv_dvr_solve (&ga, va, qv_dvr_kinetic_prefactor (), 6, NULL);
        lb = qv_dvr_solve (&gb, vb, qv_dvr_kinetic_prefactor (), 6, NULL);
      }
      for (guint v = 0; v < 6; v++)
        worst = MAX (worst, fabs (la->energies[v] - lb->energies[v]));
      assert_abs (b->max_change, worst, 1e-13);
      if (s + 1 < r->steps->len)
        assert_true (b->max_change >= o.tolerance);
      else
        assert_true (b->max_change < o.tolerance);
    }

  /* a cap too low to converge is reported as such */
  {
    g_autoptr(QvDvrRefinement) capped = NULL;
    o.start_points = 9;
    o.max_points = 13;
    capped = qv_dvr_refine (&o, morse, &m, qv_dvr_kinetic_prefactor (), NULL);
    assert_non_null (capped);
    assert_false (capped->converged);
    assert_int_equal (g_array_index (capped->steps, QvDvrStep, capped->steps->len - 1).n[0], 13);
  }
}

/* The Morse potential sampled like a scan (N points, energies only),
 * interpolated, solved. The interpolation error bounds the agreement: a
 * natural spline through 61 points and a degree-14 polynomial through 41
 * both stay within 0.05 cm⁻¹ of the closed form for v ≤ 4 here (measured
 * with this test; the DVR itself is exact to 1e-8, above). */
static void
test_morse_scan (void **state)
{
  Morse m = morse_model;
  const double cm = ev_per_cm1 ();
  const struct { QvScanFit fit; gsize n; guint degree; } cases[] = {
    { QV_SCAN_FIT_SPLINE, 61, 0 },
    { QV_SCAN_FIT_POLYNOMIAL, 41, 14 },
  };

  for (gsize c = 0; c < G_N_ELEMENTS (cases); c++)
    {
      const gsize n = cases[c].n;
      g_autofree double *q = g_new (double, n), *v = g_new (double, n);
      g_autoptr(QvScanPotential) p = NULL;
      g_autoptr(QvScanLevels) l = NULL;
      g_autoptr(GError) error = NULL;
      const double hw = hbar_omega (2.0 * m.D * m.a * m.a);

      for (gsize i = 0; i < n; i++)
        {
          q[i] = -0.45 + 2.4 * (double) i / (double) (n - 1);
          /* an absolute energy offset, as from an electronic-structure code */
          v[i] = -2000.0 + morse (&q[i], &m);
        }
      p = qv_scan_potential_new_1d (q, v, n, cases[c].fit, cases[c].degree, &error);
      assert_non_null (p);
      l = qv_scan_potential_solve (p, 5, 0, 0, &error);
      if (l == NULL)
        fail_msg ("%s", error->message);
      assert_true (l->refinement->converged);
      assert_true (l->minimum_inside);
      assert_int_equal (l->minima->len, 1);
      assert_abs (l->q_min[0], m.q0, 1e-4);
      assert_abs (l->v_min, -2000.0, 1e-5);   /* 0.08 cm⁻¹: interpolation */
      for (guint k = 0; k < 5; k++)
        {
          assert_abs (l->levels[k].energy / cm, morse_level (&m, k) / cm, 0.05);
          assert_false (l->levels[k].above_scan);
          assert_true (l->levels[k].edge_weight < QV_SCAN_EDGE_WEIGHT_LIMIT);
          /* ⟨Q⟩ grows with v: the well is softer outwards */
          if (k > 0)
            assert_true (l->levels[k].mean[0] > l->levels[k - 1].mean[0]);
          /* the turning points bracket the well: V(Q_tp) = E_v in closed form */
          {
            double x = l->levels[k].turning[0], y = l->levels[k].turning[1];
            assert_true (x < m.q0 && y > m.q0);
            assert_abs (morse (&x, &m) / cm, morse_level (&m, k) / cm, 0.1);
            assert_abs (morse (&y, &m) / cm, morse_level (&m, k) / cm, 0.1);
          }
        }
      /* the harmonic value from the curvature: V'' = 2Da² */
      assert_rel (l->curvature[0], 2.0 * m.D * m.a * m.a, 1e-3);
      /* ω_e x_e = (ħω)²/(4D) and ω_e = ħω for a Morse oscillator (Morse 1929) */
      assert_abs (l->omega_e_x_e / cm, hw * hw / (4 * m.D) / cm, 0.05);
      assert_abs (l->omega_e / cm, hw / cm, 0.1);
      assert_abs (l->fundamental / cm, (morse_level (&m, 1) - morse_level (&m, 0)) / cm, 0.05);
      assert_abs (l->overtone / cm, (morse_level (&m, 2) - morse_level (&m, 0)) / cm, 0.05);
      if (cases[c].fit == QV_SCAN_FIT_SPLINE)
        {
          double rms, max;
          qv_scan_potential_residual (p, &rms, &max);
          assert_abs (rms, 0.0, 1e-12);
        }
    }
}

/* The harmonic potential sampled like a scan and fitted with a quadratic:
 * exact, so the levels, curvature and turning points of the closed form. */
static void
test_harmonic_scan (void **state)
{
  const double lambda = 12.0;
  const gsize n = 11;
  const double qtp4 = sqrt (9 * hbar_over_omega (lambda));
  double q[11], v[11];
  g_autoptr(QvScanPotential) p = NULL;
  g_autoptr(QvScanLevels) l = NULL;
  double rms, max;

  for (gsize i = 0; i < n; i++)
    {
      q[i] = -3.0 * qtp4 + 6.0 * qtp4 * (double) i / (double) (n - 1);
      v[i] = 0.5 * lambda * q[i] * q[i] + 0.25;
    }
  p = qv_scan_potential_new_1d (q, v, n, QV_SCAN_FIT_POLYNOMIAL, 2, NULL);
  assert_non_null (p);
  qv_scan_potential_residual (p, &rms, &max);
  assert_true (max < 1e-12);
  l = qv_scan_potential_solve (p, 5, 0, 0, NULL);
  assert_non_null (l);
  assert_rel (l->curvature[0], lambda, 1e-6);
  for (guint k = 0; k < 5; k++)
    {
      const double qtp = sqrt ((2 * k + 1) * hbar_over_omega (lambda));
      assert_rel (l->levels[k].energy, hbar_omega (lambda) * (k + 0.5), 1e-8);
      assert_rel (l->levels[k].turning[1], qtp, 1e-9);
      assert_rel (-l->levels[k].turning[0], qtp, 1e-9);
    }
  assert_abs (l->omega_e_x_e / ev_per_cm1 (), 0.0, 1e-5);
}

static double
double_well_splitting (double barrier, GArray *minima_out)
{
  /* V = B((Q/a)² − 1)², minima at ±a, barrier B at 0 */
  const double a = 0.5;
  const gsize n = 81;
  double q[81], v[81];
  g_autoptr(QvScanPotential) p = NULL;
  g_autoptr(QvScanLevels) l = NULL;

  for (gsize i = 0; i < n; i++)
    {
      double t;
      q[i] = -1.1 + 2.2 * (double) i / (double) (n - 1);
      t = (q[i] / a) * (q[i] / a) - 1.0;
      v[i] = barrier * t * t;
    }
  p = qv_scan_potential_new_1d (q, v, n, QV_SCAN_FIT_POLYNOMIAL, 4, NULL);
  assert_non_null (p);
  l = qv_scan_potential_solve (p, 4, 0, 0, NULL);
  assert_non_null (l);
  assert_int_equal (l->minima->len, 2);
  assert_abs (g_array_index (l->minima, QvScanMinimum, 0).Q[0], -a, 1e-6);
  assert_abs (g_array_index (l->minima, QvScanMinimum, 1).Q[0], a, 1e-6);
  assert_rel (l->barrier, barrier, 1e-6);
  assert_rel (l->splitting, l->levels[1].energy - l->levels[0].energy, 1e-15);
  /* the pair of the lowest doublet lies far closer together than the next
   * gap when the barrier is well above the ground level */
  if (minima_out)
    g_array_append_vals (minima_out, l->minima->data, l->minima->len);
  return l->splitting;
}

static void
test_double_well (void **state)
{
  const double cm = ev_per_cm1 ();
  const double barriers[] = { 800 * cm, 1600 * cm, 3200 * cm };
  double last = G_MAXDOUBLE;

  for (gsize b = 0; b < G_N_ELEMENTS (barriers); b++)
    {
      const double s = double_well_splitting (barriers[b], NULL);
      assert_true (s > 0);
      assert_true (s < last);
      last = s;
    }
  /* a single well is not reported as a double one */
  {
    Morse m = morse_model;
    double q[31], v[31];
    g_autoptr(QvScanPotential) p = NULL;
    g_autoptr(QvScanLevels) l = NULL;
    for (gsize i = 0; i < 31; i++)
      q[i] = -0.45 + 2.4 * (double) i / 30.0, v[i] = morse (&q[i], &m);
    p = qv_scan_potential_new_1d (q, v, 31, QV_SCAN_FIT_SPLINE, 0, NULL);
    l = qv_scan_potential_solve (p, 3, 0, 0, NULL);
    assert_int_equal (l->minima->len, 1);
    assert_true (isnan (l->splitting));
  }
}

/* V = ½(λ₁Q₁² + λ₂Q₂²) + cQ₁Q₂ on a 9 × 9 grid, fitted exactly by a
 * quadratic: the fundamentals are ħ√μ± with μ± the eigenvalues of
 * [[λ₁, c], [c, λ₂]]. */
static void
test_coupled_2d (void **state)
{
  const double l1 = 20.0, l2 = 12.0, c = 4.0;
  const double tr = l1 + l2, det = l1 * l2 - c * c;
  const double mu_lo = tr / 2 - sqrt (tr * tr / 4 - det), mu_hi = tr / 2 + sqrt (tr * tr / 4 - det);
  const gsize n = 9;
  double q0[9], q1[9], v[81];
  g_autoptr(QvScanPotential) p = NULL;
  g_autoptr(QvScanLevels) l = NULL;
  g_autoptr(GError) error = NULL;
  const double w0 = sqrt (7 * hbar_over_omega (mu_lo));   /* v = 3 turning point, softer */

  for (gsize i = 0; i < n; i++)
    {
      q0[i] = -1.8 * w0 + 3.6 * w0 * (double) i / (double) (n - 1);
      q1[i] = -2.0 * w0 + 4.0 * w0 * (double) i / (double) (n - 1);
    }
  for (gsize j = 0; j < n; j++)
    for (gsize i = 0; i < n; i++)
      v[i + n * j] = 0.5 * (l1 * q0[i] * q0[i] + l2 * q1[j] * q1[j]) + c * q0[i] * q1[j];
  p = qv_scan_potential_new_2d (q0, n, q1, n, v, QV_SCAN_FIT_POLYNOMIAL, 2, &error);
  assert_non_null (p);
  l = qv_scan_potential_solve (p, 6, 0, 0, &error);
  if (l == NULL)
    fail_msg ("%s", error->message);
  assert_true (l->refinement->converged);
  assert_rel (l->curvature[0], mu_lo, 1e-6);
  assert_rel (l->curvature[1], mu_hi, 1e-6);
  assert_rel (l->levels[0].energy, 0.5 * (hbar_omega (mu_lo) + hbar_omega (mu_hi)), 1e-8);
  assert_rel (l->fundamentals[0], hbar_omega (mu_lo), 1e-8);
  assert_rel (l->fundamentals[1], hbar_omega (mu_hi), 1e-8);
  assert_abs (l->q_min[0], 0.0, 1e-6);
  assert_abs (l->q_min[1], 0.0, 1e-6);

  /* the bicubic spline through the same grid gives nearly the same */
  {
    g_autoptr(QvScanPotential) ps = qv_scan_potential_new_2d (q0, n, q1, n, v, QV_SCAN_FIT_SPLINE, 0, NULL);
    g_autoptr(QvScanLevels) ls = qv_scan_potential_solve (ps, 6, 1e-2 * ev_per_cm1 (), 45, NULL);
    assert_non_null (ls);
    assert_abs (ls->fundamentals[0] / ev_per_cm1 (), hbar_omega (mu_lo) / ev_per_cm1 (), 5.0);
    assert_abs (ls->fundamentals[1] / ev_per_cm1 (), hbar_omega (mu_hi) / ev_per_cm1 (), 5.0);
  }
}

static void
test_bad_input (void **state)
{
  double q[4] = { 0, 1, 1, 2 }, v[4] = { 1, 0, 0, 1 };
  GError *error = NULL;

  assert_null (qv_scan_potential_new_1d (q, v, 4, QV_SCAN_FIT_SPLINE, 0, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  g_clear_error (&error);
  q[2] = 1.5;
  v[1] = NAN;
  assert_null (qv_scan_potential_new_1d (q, v, 4, QV_SCAN_FIT_SPLINE, 0, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  g_clear_error (&error);
  v[1] = 0;
  assert_null (qv_scan_potential_new_1d (q, v, 4, QV_SCAN_FIT_POLYNOMIAL, 4, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
  g_clear_error (&error);
  assert_null (qv_scan_potential_new_1d (q, v, 2, QV_SCAN_FIT_SPLINE, 0, &error));
  g_clear_error (&error);
}

int
main (int argc, char **argv)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_kinetic_prefactor),
    cmocka_unit_test (test_harmonic_levels),
    cmocka_unit_test (test_box_levels),
    cmocka_unit_test (test_edge_weight),
    cmocka_unit_test (test_morse_dvr_and_refinement),
    cmocka_unit_test (test_morse_scan),
    cmocka_unit_test (test_harmonic_scan),
    cmocka_unit_test (test_double_well),
    cmocka_unit_test (test_coupled_2d),
    cmocka_unit_test (test_bad_input),
  };
  if (argc > 1)
    cmocka_set_test_filter (argv[1]);
  return cmocka_run_group_tests (tests, NULL, NULL);
}
