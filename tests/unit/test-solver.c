/* test-solver.c — the normal-mode solver against closed forms.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <lapacke.h>
#include "qv-error.h"
#include "qv-rigid-body.h"
#include "qv-solver.h"
#include "qv-test-util.h"
#include "qv-units.h"

/* NIST isotope masses (REFERENCES.md; AME2016): */
static const double m_c = 12.0, m_o = 15.99491461957, m_s = 31.97207117;  /* 32S from memory */

/* √(eV/(Å² u)) in cm⁻¹, recomputed from CODATA 2018 here. */
static double
cm1 (double lambda)
{
  const double f = sqrt (1.602176634e-19 / (1e-20 * 1.66053906660e-27)) / (2 * M_PI * 299792458.0 * 100.0);
  return (lambda < 0 ? -1 : 1) * sqrt (fabs (lambda)) * f;
}

#define assert_rel(a, b, tol) \
  do { double a_ = (a), b_ = (b); \
       if (!(fabs (a_ - b_) <= (tol) * fabs (b_))) \
         print_error ("%s = %.17g, expected %.17g\n", #a, a_, b_); \
       assert_true (fabs (a_ - b_) <= (tol) * fabs (b_)); } while (0)

static void
test_diatomic (void **state)
{
  /* ω = √(k/μ), μ = m₁m₂/(m₁+m₂) (any mechanics text). */
  static const guint z[] = { 6, 8 };
  const double pos[] = { 0, 0, 0,  0.1, 0.2, 1.128 };
  const double k = 118.0;   /* eV/Å², an invented CO-like bond */
  g_autoptr(QvStructure) s = qvt_structure (2, z, pos);
  g_autoptr(QvHessian) h = qv_hessian_new (6, TRUE, NULL);
  g_autoptr(QvModeSet) m = NULL;
  const double mu = m_c * m_o / (m_c + m_o);

  qvt_add_stretch (h, s, 0, 1, k);
  m = qvt_solve_checked (s, h, NULL);
  assert_int_equal (m->n_modes, 1);
  assert_true (m->linear);
  assert_int_equal (m->n_rotations, 2);
  assert_rel (m->eigenvalues[0], k / mu, 1e-13);
  assert_rel (qv_mode_set_wavenumber (m, 0), cm1 (k / mu), 1e-13);
  /* The mode's reduced mass μ' = 1/Σ(l²/m) = 1/|d|² (DESIGN §2) is that of
   * the Cartesian displacement normalised to 1. For the stretch,
   * d_C = −(m_O/M)s, d_O = (m_C/M)s with Σm d² = 1 ⇒ s² = 1/μ, so
   * μ' = μM²/(m_C² + m_O²) — not the classical μ, which is a statement
   * about the relative coordinate. Force constant k' = μ'ω² (mdyn/Å;
   * 1 mdyn/Å = 6.241509 eV/Å², REFERENCES.md). */
  {
    const double big_m = m_c + m_o;
    const double mu_mode = mu * big_m * big_m / (m_c * m_c + m_o * m_o);
    assert_rel (qv_mode_set_reduced_mass (m, 0), mu_mode, 1e-13);
    assert_rel (qv_mode_set_force_constant (m, 0), mu_mode * (k / mu) / 6.241509, 1e-7);
  }
  for (int i = 0; i < 3; i++)
    assert_true (fabs (m->translation_residuals[i]) < 1e-4);
  for (guint i = 0; i < m->n_rotations; i++)
    assert_true (fabs (m->rotation_residuals[i]) < 1e-4);
}

/* Linear symmetric O=C=O with two stretch springs k and a linear bend k_b.
 * Stretches: ω_s² = k/m_O, ω_a² = (k/m_O)(1 + 2m_O/m_C) (Goldstein, Poole &
 * Safko, Classical Mechanics, 3rd ed., §6.4). Bend: Wilson GF method
 * (Wilson, Decius & Cross, Molecular Vibrations, 1955), λ = k_b·G with the
 * linear-bend G element 1/(r₁²m₁) + 1/(r₂²m₃) + (1/r₁ + 1/r₂)²/m₂. */
static void
test_linear_triatomic (void **state)
{
  static const guint z[] = { 8, 6, 8 };
  const double r = 1.16;
  const double pos[] = { 0, 0, -r,  0, 0, 0,  0, 0, r };
  const double k = 100.0, kb = 3.0;
  g_autoptr(QvStructure) s = qvt_structure (3, z, pos);
  g_autoptr(QvHessian) h = qv_hessian_new (9, TRUE, NULL);
  g_autoptr(QvModeSet) m = NULL;
  double b[9];
  const double g_bend = 2.0 / (r * r * m_o) + pow (2.0 / r, 2) / m_c;

  qvt_add_stretch (h, s, 0, 1, k);
  qvt_add_stretch (h, s, 1, 2, k);
  for (int axis = 0; axis < 2; axis++)
    {
      memset (b, 0, sizeof b);
      b[0 + axis] = 1.0 / r;
      b[6 + axis] = 1.0 / r;
      b[3 + axis] = -2.0 / r;
      qvt_add_coordinate (h, b, kb);
    }
  m = qvt_solve_checked (s, h, NULL);
  assert_int_equal (m->n_modes, 4);     /* 3N − 5 */
  assert_true (m->linear);
  assert_rel (m->eigenvalues[0], kb * g_bend, 1e-12);
  assert_rel (m->eigenvalues[1], kb * g_bend, 1e-12);
  assert_rel (m->eigenvalues[2], k / m_o, 1e-12);
  assert_rel (m->eigenvalues[3], k / m_o * (1 + 2 * m_o / m_c), 1e-12);
  /* the symmetric stretch leaves the carbon at rest */
  assert_true (fabs (qv_mode_set_vector (m, 2)[5]) < 1e-10);
}

/* A random spring network solved whole and for its lowest K must agree:
 * values, and vectors after the canonical choice. */
static void
compare_lowest_with (const QvStructure *s, const QvHessian *h, gsize k, QvLowestMethod method,
                     gboolean expect_lanczos)
{
  QvSolveOptions o;
  g_autoptr(QvModeSet) all = NULL, low = NULL;
  const gsize n = h->n;

  qv_solve_options_init (&o);
  all = qvt_solve_checked (s, h, &o);
  o.lowest = k;
  o.lowest_method = method;
  low = qvt_solve_checked (s, h, &o);
  assert_true (low->lowest_only);
  assert_int_equal (low->n_modes, k);
  /* LAPACK was asked for: LAPACK ran. Lanczos may hand over to LAPACK when
   * it cannot prove its result (a 14-fold zero eigenvalue defeats a block
   * of 8): the answer must be right either way, and where Lanczos is
   * expected to succeed it must have been the one that ran. */
  if (method == QV_LOWEST_LAPACK)
    assert_string_equal (low->eigensolver, "dsyevr");
  else if (expect_lanczos)
    assert_string_equal (low->eigensolver, "lanczos");
  for (gsize i = 0; i < k; i++)
    {
      const double scale = fabs (all->eigenvalues[all->n_modes - 1]);
      assert_true (fabs (all->eigenvalues[i] - low->eigenvalues[i]) < 1e-11 * scale);
      for (gsize c = 0; c < n; c++)
        {
          const double d = fabs (qv_mode_set_vector (all, i)[c] - qv_mode_set_vector (low, i)[c]);
          if (d >= 1e-7)
            print_error ("%s: mode %zu coordinate %zu differs by %.3g\n",
                         qv_lowest_method_name (method), (size_t) i, (size_t) c, d);
          assert_true (d < 1e-7);
        }
    }
}

/* A solve of the lowest K must agree with the full solve — values, and
 * vectors after the canonical choice — with LAPACK's range solver and with
 * the shift-invert Lanczos path. */
static void
compare_lowest (const QvStructure *s, const QvHessian *h, gsize k)
{
  compare_lowest_with (s, h, k, QV_LOWEST_LAPACK, FALSE);
  compare_lowest_with (s, h, k, QV_LOWEST_LANCZOS, FALSE);
}

/* Shift-invert Lanczos where it is meant to work: a connected 100-atom
 * network (no zero vibrations), with imaginary modes, and two identical
 * copies side by side (every mode exactly twice: degenerate pairs). */
static void
test_lowest_lanczos (void **state)
{
  g_autoptr(QvStructure) s = qvt_random_molecule (100, 5, 8.0);
  g_autoptr(QvHessian) h = qvt_spring_network (s, 6, 3.0, 5.0, 40.0);
  compare_lowest_with (s, h, 20, QV_LOWEST_LANCZOS, TRUE);
  /* a soft imaginary mode (a slightly unstable spring), as at a shallow
   * saddle: Lanczos keeps the run */
  qvt_add_stretch (h, s, 0, 1, -6.0);
  compare_lowest_with (s, h, 12, QV_LOWEST_LANCZOS, TRUE);
  /* strongly imaginary modes put the shift far below the others, and the
   * Krylov space would have to grow too large: Lanczos hands over to
   * LAPACK, and the result must still be right */
  qvt_add_stretch (h, s, 10, 11, -80.0);
  qvt_add_stretch (h, s, 20, 21, -60.0);
  compare_lowest_with (s, h, 12, QV_LOWEST_LANCZOS, FALSE);
  {
    g_autoptr(QvStructure) one = qvt_random_molecule (50, 7, 6.5);
    g_autoptr(QvHessian) h1 = qvt_spring_network (one, 8, 3.0, 5.0, 40.0);
    g_autoptr(QvStructure) two = qv_structure_new (100, NULL);
    g_autoptr(QvHessian) h2 = qv_hessian_new (300, TRUE, NULL);
    for (gsize c = 0; c < 2; c++)
      for (gsize a = 0; a < 50; a++)
        {
          two->atoms[c * 50 + a] = one->atoms[a];
          two->atoms[c * 50 + a].label = NULL;
          two->atoms[c * 50 + a].position[0] += 40.0 * c;
        }
    for (gsize c = 0; c < 2; c++)
      for (gsize j = 0; j < 150; j++)
        for (gsize i = 0; i < 150; i++)
          h2->data[(150 * c + i) + (150 * c + j) * 300] = h1->data[i + j * 150];
    compare_lowest_with (two, h2, 16, QV_LOWEST_LANCZOS, TRUE);
  }
}

static void
test_lowest_matches_full (void **state)
{
  g_autoptr(QvStructure) s = qvt_random_molecule (30, 11, 6.0);
  g_autoptr(QvHessian) h = qvt_spring_network (s, 12, 2.6, 5.0, 40.0);
  compare_lowest (s, h, 10);
}

static void
test_lowest_with_imaginary (void **state)
{
  g_autoptr(QvStructure) s = qvt_random_molecule (25, 21, 5.0);
  g_autoptr(QvHessian) h = qvt_spring_network (s, 22, 2.6, 5.0, 40.0);
  g_autoptr(QvModeSet) m = NULL;
  /* two springs with negative stiffness: unstable directions */
  qvt_add_stretch (h, s, 0, 1, -60.0);
  qvt_add_stretch (h, s, 2, 3, -45.0);
  m = qvt_solve_checked (s, h, NULL);
  assert_true (qv_mode_set_count_imaginary (m) >= 1);
  assert_true (m->eigenvalues[0] < 0);
  compare_lowest (s, h, 6);
}

static void
test_lowest_with_zero_modes (void **state)
{
  /* Bent triatomic with two stretch springs and no bend term: one genuine
   * zero vibration besides the six rigid-body motions (common practice). */
  static const guint z[] = { 1, 8, 1 };
  const double pos[] = { 0.76, 0.59, 0,  0, 0, 0,  -0.76, 0.59, 0 };
  g_autoptr(QvStructure) s = qvt_structure (3, z, pos);
  g_autoptr(QvHessian) h = qv_hessian_new (9, TRUE, NULL);
  g_autoptr(QvModeSet) m = NULL;
  qvt_add_stretch (h, s, 0, 1, 50.0);
  qvt_add_stretch (h, s, 1, 2, 50.0);
  m = qvt_solve_checked (s, h, NULL);
  assert_int_equal (m->n_modes, 3);
  assert_true (fabs (qv_mode_set_wavenumber (m, 0)) < 1e-3);
  assert_true (qv_mode_set_wavenumber (m, 1) > 1000);
  compare_lowest (s, h, 1);
  compare_lowest (s, h, 2);
}

static void
test_projection_choices (void **state)
{
  g_autoptr(QvStructure) s = qvt_random_molecule (8, 31, 3.0);
  g_autoptr(QvHessian) h = qvt_spring_network (s, 32, 3.0, 5.0, 40.0);
  QvSolveOptions o;
  g_autoptr(QvModeSet) none = NULL, trans = NULL;

  qv_solve_options_init (&o);
  o.projection = QV_PROJECTION_NONE;
  none = qvt_solve_checked (s, h, &o);
  assert_int_equal (none->n_modes, 24);
  /* the six rigid-body motions stay, at ≈ 0 */
  {
    int near_zero = 0;
    for (gsize i = 0; i < none->n_modes; i++)
      if (fabs (qv_mode_set_wavenumber (none, i)) < 1e-3)
        near_zero++;
    assert_int_equal (near_zero, 6);
  }
  o.projection = QV_PROJECTION_TRANSLATIONS;
  trans = qvt_solve_checked (s, h, &o);
  assert_int_equal (trans->n_modes, 21);
  assert_int_equal (trans->n_rotations, 0);

  /* a periodic structure never projects rotations */
  s->pbc[0] = s->pbc[1] = s->pbc[2] = TRUE;
  {
    g_autoptr(QvModeSet) p = qvt_solve_checked (s, h, NULL);
    assert_int_equal (p->projection, QV_PROJECTION_TRANSLATIONS);
    assert_int_equal (p->n_modes, 21);
  }
}

static void
test_single_atom (void **state)
{
  static const guint z[] = { 18 };
  const double pos[] = { 1, 2, 3 };
  g_autoptr(QvStructure) s = qvt_structure (1, z, pos);
  g_autoptr(QvHessian) h = qv_hessian_new (3, TRUE, NULL);
  g_autoptr(QvModeSet) m = qv_solve (s, g_steal_pointer (&h), NULL, NULL, NULL);
  assert_non_null (m);
  assert_int_equal (m->n_modes, 0);
  assert_int_equal (m->n_rotations, 0);
}

/* Residual of a non-stationary geometry: a rotation-invariant potential
 * evaluated off its minimum (a stretched spring pair: the Hessian of
 * ½k(r − r₀)² at r ≠ r₀ has a term k(1 − r₀/r)(I − uuᵀ) that is not
 * invariant under rotation of the coordinates alone). */
static void
test_rotation_residual_off_minimum (void **state)
{
  static const guint z[] = { 6, 8 };
  const double pos[] = { 0, 0, 0,  0, 0, 1.3 };
  g_autoptr(QvStructure) s = qvt_structure (2, z, pos);
  g_autoptr(QvHessian) h = qv_hessian_new (6, TRUE, NULL);
  g_autoptr(QvModeSet) m = NULL;
  const double k = 118.0, r = 1.3, r0 = 1.128;
  const double t = k * (1 - r0 / r);
  double b[6];
  qvt_add_stretch (h, s, 0, 1, k);
  for (int axis = 0; axis < 2; axis++)
    {
      memset (b, 0, sizeof b);
      b[axis] = -1; b[3 + axis] = 1;
      qvt_add_coordinate (h, b, t);
    }
  m = qvt_solve_checked (s, h, NULL);
  /* A rigid rotation by θ moves the atoms perpendicular to the bond by θ
   * times their distance from the centre of mass; its Rayleigh quotient
   * δxᵀHδx / δxᵀMδx = tθ²r² / (θ²μr²) = t/μ, μ the reduced mass. */
  {
    const double mu = m_c * m_o / (m_c + m_o);
    assert_rel (m->rotation_residuals[0], cm1 (t / mu), 1e-10);
    assert_rel (m->rotation_residuals[1], cm1 (t / mu), 1e-10);
    assert_true (fabs (m->translation_residuals[0]) < 1e-4);
    assert_true (qv_mode_set_max_residual (m) > QV_RESIDUAL_WARNING);
  }
  {
    g_auto(GStrv) w = qv_mode_set_warnings (m);
    assert_non_null (w[0]);
    assert_non_null (strstr (w[0], "rotation"));
  }
}

/* Canonical output does not depend on the atom order. */
static void
check_permutation (const QvStructure *s, const QvHessian *h, const gsize *perm)
{
  const gsize na = s->n_atoms, n = 3 * na;
  g_autoptr(QvStructure) p = qv_structure_copy (s);
  g_autoptr(QvHessian) hp = qv_hessian_new (n, TRUE, NULL);
  g_autoptr(QvModeSet) a = qvt_solve_checked (s, h, NULL);
  g_autoptr(QvModeSet) b = NULL;

  for (gsize i = 0; i < na; i++)
    p->atoms[i] = s->atoms[perm[i]];
  for (gsize i = 0; i < n; i++)
    for (gsize j = 0; j < n; j++)
      hp->data[i + j * n] = h->data[(3 * perm[i / 3] + i % 3) + (3 * perm[j / 3] + j % 3) * n];
  b = qvt_solve_checked (p, hp, NULL);
  for (gsize i = 0; i < na; i++)
    p->atoms[i].label = NULL;   /* shared with s */
  assert_int_equal (a->n_modes, b->n_modes);
  for (gsize k = 0; k < a->n_modes; k++)
    for (gsize i = 0; i < na; i++)
      for (int c = 0; c < 3; c++)
        {
          const double x = qv_mode_set_vector (a, k)[3 * perm[i] + c];
          const double y = qv_mode_set_vector (b, k)[3 * i + c];
          if (fabs (x - y) > 1e-8)
            print_error ("mode %zu atom %zu: %.12g vs %.12g\n", (size_t) k, (size_t) i, x, y);
          assert_true (fabs (x - y) < 1e-8);
        }
}

static void
test_permutation_invariance (void **state)
{
  /* a non-degenerate random network */
  {
    g_autoptr(QvStructure) s = qvt_random_molecule (12, 41, 4.0);
    g_autoptr(QvHessian) h = qvt_spring_network (s, 42, 3.0, 5.0, 40.0);
    const gsize perm[12] = { 5, 2, 11, 0, 7, 1, 9, 3, 10, 4, 8, 6 };
    check_permutation (s, h, perm);
  }
  /* linear O=C=S with a degenerate bend pair */
  {
    static const guint z[] = { 8, 6, 16 };
    const double pos[] = { 0, 0, -1.16,  0, 0, 0,  0, 0, 1.56 };
    g_autoptr(QvStructure) s = qvt_structure (3, z, pos);
    g_autoptr(QvHessian) h = qv_hessian_new (9, TRUE, NULL);
    const gsize perm[3] = { 2, 0, 1 };
    double b[9];
    qvt_add_stretch (h, s, 0, 1, 100.0);
    qvt_add_stretch (h, s, 1, 2, 50.0);
    for (int axis = 0; axis < 2; axis++)
      {
        memset (b, 0, sizeof b);
        b[axis] = 1 / 1.16; b[6 + axis] = 1 / 1.56; b[3 + axis] = -(1 / 1.16 + 1 / 1.56);
        qvt_add_coordinate (h, b, 2.0);
      }
    check_permutation (s, h, perm);
    (void) m_s;
  }
}

static void
test_bad_input (void **state)
{
  g_autoptr(QvStructure) s = qvt_random_molecule (3, 1, 2.0);
  QvHessian *h = qv_hessian_new (6, TRUE, NULL);
  GError *error = NULL;
  assert_null (qv_solve (s, h, NULL, NULL, &error));
  assert_int_equal (error->code, QV_ERROR_INPUT);
  g_clear_error (&error);
  h = qv_hessian_new (9, TRUE, NULL);
  h->data[4] = NAN;
  assert_null (qv_solve (s, h, NULL, NULL, &error));
  assert_int_equal (error->code, QV_ERROR_INPUT);
  g_clear_error (&error);
  /* LAPACK's dsyevd workspace 1 + 6n + 2n² (dsyevd documentation) must fit
   * a 32-bit integer: the largest n is 32766. */
  assert_int_equal (qv_solver_max_full_dimension (), 32766);
}

/* Rigid-body mixing (qv_rigid_body_mixing) against two independent routes:
 * (1) its definition, the weight on v_j of the eigenvector of the 2×2
 *     matrix [[λ, b], [b, μ]] nearest λ, found here by LAPACK dsyev;
 * (2) physics: an unprojected solve (projection none) of a Hessian that is
 *     not rotation-invariant puts rotation into the modes; to first order
 *     the rotation content |V_Rᵀ l|² of each mode equals the predicted
 *     mixing Σ (b_j/Δ_j)² (Rayleigh–Schrödinger perturbation theory). */
static void
test_rigid_mixing (void **state)
{
  g_autoptr(QvStructure) s = qvt_random_molecule (10, 51, 3.5);
  g_autoptr(QvHessian) h = qvt_spring_network (s, 52, 3.0, 5.0, 40.0);
  g_autoptr(QvModeSet) proj = NULL, none = NULL;
  QvSolveOptions o;
  const gsize n = h->n;
  double b[9];
  int checked = 0;

  /* soft springs make low modes; a weak external tether on two atoms
   * breaks rotational invariance (an "unconverged" Hessian) */
  memset (b, 0, sizeof b);
  for (gsize i = 0; i < n; i++)
    for (gsize j = 0; j < n; j++)
      h->data[i + j * n] *= 0.05;
  h->data[1 + 1 * n] += 0.02;
  h->data[(3 * 5 + 2) + (3 * 5 + 2) * n] += 0.015;
  qv_solve_options_init (&o);
  proj = qvt_solve_checked (s, h, &o);
  o.projection = QV_PROJECTION_NONE;
  none = qvt_solve_checked (s, h, &o);
  assert_non_null (proj->rigid_mixing);
  assert_null (none->rigid_mixing);

  {
    g_autofree double *masses = qv_structure_masses (s);
    g_autofree double *pos = g_new (double, n);
    g_autoptr(QvRigidBody) rb = NULL;
    g_autoptr(QvHessian) k = qv_hessian_copy (h, NULL);
    double tr[3], rot[3];

    for (gsize a = 0; a < s->n_atoms; a++)
      memcpy (pos + 3 * a, s->atoms[a].position, sizeof (double) * 3);
    qv_hessian_symmetrize (k);
    qv_solver_mass_weight (k->data, s->n_atoms, masses);
    rb = qv_rigid_body_new (s->n_atoms, pos, masses, QV_PROJECTION_FULL);
    /* the unprojected K for route (2), before projection destroys it */
    {
      g_autoptr(QvHessian) kfull = qv_hessian_copy (k, NULL);
      qv_rigid_body_project_with_residuals (rb, k->data, tr, rot);

      for (gsize m = 0; m < proj->n_modes; m++)
        {
          const double *l = qv_mode_set_vector (proj, m);
          const double lambda = proj->eigenvalues[m];
          double mt, mr, expected_r = 0.0, pt = 0.0;
          double cblk[9], mu[3];
          qv_rigid_body_mixing (rb, l, lambda, &mt, &mr);
          assert_true (fabs (mt - proj->rigid_mixing[2 * m]) < 1e-15);
          assert_true (fabs (mr - proj->rigid_mixing[2 * m + 1]) < 1e-15);

          /* route (1): rotation block eigenbasis, couplings, 2×2 solves */
          for (int x = 0; x < 3; x++)
            for (int y = 0; y < 3; y++)
              {
                double sum = 0.0;
                for (gsize i = 0; i < n; i++)
                  for (gsize j = 0; j < n; j++)
                    sum += rb->basis[(3 + x) * n + i] * kfull->data[i + j * n] * rb->basis[(3 + y) * n + j];
                cblk[x + 3 * y] = sum;
              }
          assert_int_equal (LAPACKE_dsyev (LAPACK_COL_MAJOR, 'V', 'L', 3, cblk, 3, mu), 0);
          for (int jj = 0; jj < 3; jj++)
            {
              double coupling = 0.0, two[4], w2[2];
              for (gsize i = 0; i < n; i++)
                {
                  double vi = 0.0, kl = 0.0;
                  for (int x = 0; x < 3; x++)
                    vi += rb->basis[(3 + x) * n + i] * cblk[x + 3 * jj];
                  for (gsize j = 0; j < n; j++)
                    kl += kfull->data[i + j * n] * l[j];
                  coupling += vi * kl;
                }
              two[0] = lambda; two[1] = coupling; two[2] = coupling; two[3] = mu[jj];
              assert_int_equal (LAPACKE_dsyev (LAPACK_COL_MAJOR, 'V', 'L', 2, two, 2, w2), 0);
              /* the eigenvector nearest λ: its second component squared */
              expected_r += fabs (w2[0] - lambda) < fabs (w2[1] - lambda) ? two[1] * two[1] : two[3] * two[3];
            }
          /* relative: tiny mixings must not cancel to zero */
          assert_true (fabs (mr - MIN (expected_r, 1.0)) <= 1e-6 * expected_r);
          assert_true (mr > 0.0);

          /* route (2): rotation content of the matching unprojected mode */
          if (mr > 1e-6 && mr < 1e-2)
            {
              gsize best = 0;
              double best_overlap = -1.0;
              for (gsize q = 0; q < none->n_modes; q++)
                {
                  double ov = 0.0;
                  for (gsize i = 0; i < n; i++)
                    ov += l[i] * qv_mode_set_vector (none, q)[i];
                  if (fabs (ov) > best_overlap)
                    {
                      best_overlap = fabs (ov);
                      best = q;
                    }
                }
              for (int x = 0; x < 3; x++)
                {
                  double ov = 0.0;
                  for (gsize i = 0; i < n; i++)
                    ov += rb->basis[(3 + x) * n + i] * qv_mode_set_vector (none, best)[i];
                  pt += ov * ov;
                }
              if (getenv ("QVT_VERBOSE") || fabs (pt - mr) > 0.05 * mr)
                print_error ("mode %zu: predicted rotation mixing %.4g, unprojected solve %.4g\n",
                             (size_t) m, mr, pt);
              assert_true (fabs (pt - mr) <= 0.05 * mr);
              checked++;
            }
        }
    }
  }
  /* the set-up must exercise route (2) */
  assert_true (checked >= 3);
}

/* A weak coupling b between a mode (λ = 1) and one rotation (μ = 0) mixes
 * them by b²(1 − 2b² + …) (the two-level closed form): for b = 1e-10 the
 * weight 1e-20 must come out, not cancel to 0. */
static void
test_rigid_mixing_weak (void **state)
{
  g_autoptr(QvStructure) s = qvt_random_molecule (3, 61, 2.0);
  g_autofree double *masses = qv_structure_masses (s);
  double pos[9], l[9] = { 0 }, t, r;
  g_autoptr(QvRigidBody) rb = NULL;
  const double b = 1e-10;

  for (gsize a = 0; a < 3; a++)
    memcpy (pos + 3 * a, s->atoms[a].position, sizeof (double) * 3);
  rb = qv_rigid_body_new (3, pos, masses, QV_PROJECTION_FULL);
  assert_int_equal (qv_rigid_body_rank (rb), 6);
  l[4] = 1.0;
  rb->kv = g_new0 (double, 9 * 6);
  rb->kv[3 * 9 + 4] = b;            /* first rotation column: (KV)ᵀl = b */
  memset (rb->c, 0, sizeof rb->c);  /* VᵀKV = 0: μ = 0 */
  qv_rigid_body_mixing (rb, l, 1.0, &t, &r);
  assert_true (t == 0.0);
  assert_true (fabs (r - b * b) <= 1e-6 * b * b);
}

static gboolean
cancel_at_solve (double fraction, const char *stage, gpointer data)
{
  return strcmp (stage, "solving the eigenproblem") != 0;
}

static void
test_cancel (void **state)
{
  g_autoptr(QvStructure) s = qvt_random_molecule (10, 3, 3.0);
  QvHessian *h = qvt_spring_network (s, 4, 3.0, 5.0, 40.0);
  QvProgress p = { cancel_at_solve, NULL };
  GError *error = NULL;
  assert_null (qv_solve (s, h, NULL, &p, &error));
  assert_int_equal (error->code, QV_ERROR_CANCELLED);
  g_clear_error (&error);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_diatomic),
    cmocka_unit_test (test_linear_triatomic),
    cmocka_unit_test (test_lowest_matches_full),
    cmocka_unit_test (test_lowest_with_imaginary),
    cmocka_unit_test (test_lowest_with_zero_modes),
    cmocka_unit_test (test_lowest_lanczos),
    cmocka_unit_test (test_projection_choices),
    cmocka_unit_test (test_single_atom),
    cmocka_unit_test (test_rotation_residual_off_minimum),
    cmocka_unit_test (test_permutation_invariance),
    cmocka_unit_test (test_bad_input),
    cmocka_unit_test (test_cancel),
    cmocka_unit_test (test_rigid_mixing),
    cmocka_unit_test (test_rigid_mixing_weak),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
