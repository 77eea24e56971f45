/* test-dos.c — phonon DOS, thermal properties, sound velocities and U
 * tensors (src/core/qv-phonon-mesh.c, qv-phonon-dos.c, qv-phonon-thermal.c)
 * against textbook closed forms.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>
#include "lattice-model.h"
#include "qv-dynamical-matrix.h"
#include "qv-error.h"
#include "qv-force-constants.h"
#include "qv-phonon-dos.h"
#include "qv-phonon-mesh.h"
#include "qv-phonon-thermal.h"
#include "qv-supercell.h"
#include "qv-units.h"

/* CODATA 2018 (REFERENCES.md), recomputed here rather than taken from qv-units */
#define HBAR (6.62607015e-34 / (2 * G_PI))
#define KB 1.380649e-23
#define EV 1.602176634e-19
#define MU 1.66053906660e-27
#define C_LIGHT 299792458.0

static void
assert_close (double got, double want, double tol, const char *what)
{
  if (!(fabs (got - want) <= tol))
    fail_msg ("%s: got %.12g, expected %.12g (tolerance %.3g)", what, got, want, tol);
}

/* ω (rad/s) of √(k/m) for k in eV/Å², m in u */
static double
omega_si (double k, double m)
{
  return sqrt (k * EV / 1e-20 / (m * MU));
}

/* cm⁻¹ of an angular frequency */
static double
to_cm1 (double omega)
{
  return omega / (2 * G_PI * C_LIGHT * 100);
}

static QvForceConstants *
model_fc (const QvStructure *primitive, const int matrix[3][3], const LatticeShell *shells,
          gsize n_shells, gboolean sum_rule)
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
  if (sum_rule)
    qv_force_constants_apply_sum_rule (fc, NULL);
  return fc;
}

/* fcc, one atom, nearest-neighbour springs C (longitudinal only) */
static QvForceConstants *
fcc_fc (double a, double m, double c)
{
  double cell[3][3] = { { 0, a / 2, a / 2 }, { a / 2, 0, a / 2 }, { a / 2, a / 2, 0 } };
  double r[3] = { 0, 0, 0 };
  guint z[1] = { 18 };
  int sc[3][3] = { { 3, 0, 0 }, { 0, 3, 0 }, { 0, 0, 3 } };
  LatticeShell shell = { a / sqrt (2), c, 0, 0, 0 };
  g_autoptr(QvStructure) p = lattice_model_structure (cell, 1, z, &m, r);
  return model_fc (p, sc, &shell, 1, TRUE);
}

/* monatomic chain along x (spacing a, 10 Å of vacuum), springs to its two
 * neighbours: longitudinal cl, transverse ct */
static QvForceConstants *
chain_fc (double a, double m, double cl, double ct)
{
  double cell[3][3] = { { a, 0, 0 }, { 0, 10, 0 }, { 0, 0, 10 } };
  double r[3] = { 0, 0, 0 };
  guint z[1] = { 6 };
  int sc[3][3] = { { 4, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 } };
  LatticeShell shell = { a, cl, ct, 0, 0 };
  g_autoptr(QvStructure) p = lattice_model_structure (cell, 1, z, &m, r);
  return model_fc (p, sc, &shell, 1, TRUE);
}

static QvPhononDos *
dos_of (const QvForceConstants *fc, const int n[3], QvDosMethod method, double sigma, double step)
{
  g_autoptr(GError) error = NULL;
  g_autoptr(QvPhononMesh) mesh = qv_phonon_mesh_new (n, &error);
  guint z[8] = { 18, 18, 18, 18, 18, 18, 18, 18 };
  QvDosOptions opt = { method, sigma, step, 0, 0 };
  QvPhononDos *dos;
  assert_non_null (mesh);
  dos = qv_phonon_dos_from_force_constants (fc, z, mesh, &opt, 2, NULL, &error);
  if (dos == NULL)
    fail_msg ("%s", error->message);
  return dos;
}

static void
test_mesh (void **state)
{
  g_autoptr(GError) error = NULL;
  int n[3];
  (void) state;
  assert_true (qv_phonon_mesh_parse ("4x5x6", n, &error));
  assert_int_equal (n[0], 4); assert_int_equal (n[1], 5); assert_int_equal (n[2], 6);
  assert_true (qv_phonon_mesh_parse ("7", n, &error));
  assert_int_equal (n[2], 7);
  assert_false (qv_phonon_mesh_parse ("4x0x2", n, &error));
  g_clear_error (&error);
  assert_false (qv_phonon_mesh_parse ("4x4", n, &error));
  g_assert_error (error, QV_ERROR, QV_ERROR_USAGE);
  g_clear_error (&error);
  {
    int m[3] = { 4, 3, 2 };
    g_autoptr(QvPhononMesh) mesh = qv_phonon_mesh_new (m, &error);
    /* Γ-centred: index 0 is Γ, components in (−½, ½], each q has −q on the mesh */
    assert_int_equal (mesh->n_q, 24);
    assert_true (mesh->q[0] == 0 && mesh->q[1] == 0 && mesh->q[2] == 0);
    for (gsize k = 0; k < mesh->n_q; k++)
      for (int c = 0; c < 3; c++)
        assert_true (mesh->q[3 * k + c] > -0.5 && mesh->q[3 * k + c] <= 0.5);
    assert_close (mesh->q[3 * qv_phonon_mesh_index (mesh, 2, 1, 1) + 0], 0.5, 0, "fold");
    assert_close (mesh->q[3 * qv_phonon_mesh_index (mesh, 3, 1, 1) + 0], -0.25, 0, "fold");
    assert_close (mesh->q[3 * qv_phonon_mesh_index (mesh, -1, 4, 3) + 1], 1.0 / 3, 1e-15, "wrap");
  }
}

/* ∫ g dω = 3n states per cell (the normalisation the DOS is defined with),
 * both methods, fcc nearest-neighbour model. */
static void
test_dos_normalisation (void **state)
{
  g_autoptr(QvForceConstants) fc = fcc_fc (4.0, 40, 2.0);
  int n[3] = { 12, 12, 12 };
  (void) state;
  for (int method = 0; method < 2; method++)
    {
      g_autoptr(QvPhononDos) dos = dos_of (fc, n, method == 0 ? QV_DOS_TETRAHEDRON : QV_DOS_GAUSSIAN,
                                           5.0, 0.5);
      double sum = 0, part = 0;
      for (gsize b = 0; b < dos->n_points; b++)
        {
          sum += dos->total[b] * dos->step;
          part += dos->partial[b] * dos->step;
          assert_true (dos->total[b] >= -1e-12);
        }
      /* tetrahedron: exact bin counts; Gaussian: the grid covers ±5σ, the
         trapezoid-like sum of a Gaussian with step σ/10 is exact to ≪ 10⁻⁶ */
      assert_close (sum, 3.0, method == 0 ? 1e-9 : 1e-5, "∫ g dω = 3n");
      assert_int_equal (dos->n_groups, 1);
      assert_close (part, sum, 1e-9, "partial sums to total");
    }
}

/* Monatomic chain (Kittel ch. 5, "Density of states in one dimension"):
 * per branch g(ω) = (2/π)/√(ω_max² − ω²), ω_max = 2√(C/M); the number of
 * states below ω is (2/π) arcsin(ω/ω_max), so a bin [ω₁, ω₂] holds
 * (2/π)(arcsin(ω₂/ω_max) − arcsin(ω₁/ω_max)). All three branches have the
 * same C here. */
static void
test_chain_dos (void **state)
{
  const double a = 2.5, m = 12, c = 3.0;
  g_autoptr(QvForceConstants) fc = chain_fc (a, m, c, c);
  int n[3] = { 1000, 1, 1 };
  g_autoptr(QvPhononDos) dos = dos_of (fc, n, QV_DOS_TETRAHEDRON, 0, 2.0);
  double wmax = to_cm1 (2 * omega_si (c, m));
  double worst = 0;
  (void) state;
  for (gsize b = 0; b < dos->n_points; b++)
    {
      double lo = dos->omega[b] - dos->step / 2, hi = dos->omega[b] + dos->step / 2, want;
      if (lo < 0.05 * wmax || hi > 0.95 * wmax)
        continue;
      want = 3 * (2 / G_PI) * (asin (hi / wmax) - asin (lo / wmax)) / dos->step;
      worst = MAX (worst, fabs (dos->total[b] / want - 1));
    }
  /* the linear interpolation between 1000 points: errors ≲ 10⁻⁴ away from the edge */
  if (worst > 2e-3)
    fail_msg ("chain DOS departs from (2/π)/√(ω_max² − ω²) by %.3g (relative)", worst);
  print_message ("chain DOS: largest relative departure %.2e in 0.05–0.95 ω_max\n", worst);
}

/* A band with a known edge: ω(q) = ω₀ + W Σ_i (1 − cos 2π q_i) (simple-cubic
 * cosine band in fractional q, zone volume 1). Near the bottom ω − ω₀ ≈
 * 2π²W|q|², so (free-particle counting, Ashcroft & Mermin ch. 2 / 8, van
 * Hove M₀ edge, common practice) the states below ω are (4π/3)(ε/α)^{3/2}
 * and g = 2π √ε / α^{3/2}, α = 2π²W, ε = ω − ω₀; nothing below ω₀, and by
 * symmetry the top edge ω₀ + 6W mirrors the bottom one. */
static void
test_band_edge (void **state)
{
  int n[3] = { 48, 48, 48 };
  g_autoptr(GError) error = NULL;
  g_autoptr(QvPhononMesh) mesh = qv_phonon_mesh_new (n, &error);
  double recip[3][3] = { { 1, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 } };
  const double w0 = 100, W = 50, alpha = 2 * G_PI * G_PI * W;
  g_autofree double *w = g_new (double, mesh->n_q);
  QvDosOptions opt = { QV_DOS_TETRAHEDRON, 0, 0.25, w0 - 10, w0 + 6 * W + 10 };
  g_autoptr(QvPhononDos) dos = NULL;
  double sum = 0;
  (void) state;
  for (gsize k = 0; k < mesh->n_q; k++)
    {
      w[k] = w0;
      for (int c = 0; c < 3; c++)
        w[k] += W * (1 - cos (2 * G_PI * mesh->q[3 * k + c]));
    }
  dos = qv_phonon_dos_compute (mesh, recip, 1, w, NULL, 0, NULL, &opt, &error);
  assert_non_null (dos);
  for (gsize b = 0; b < dos->n_points; b++)
    {
      double lo = dos->omega[b] - dos->step / 2, hi = dos->omega[b] + dos->step / 2;
      sum += dos->total[b] * dos->step;
      if (hi <= w0 || lo >= w0 + 6 * W)
        assert_close (dos->total[b], 0, 0, "no states outside the band");
    }
  assert_close (sum, 1, 1e-9, "one band, one state");
  /* the number of states below ω₀ + ε: for fixed (q_x, q_y) the q_z with
     W(1 − cos 2πq_z) < r, r = ε − W(2 − cos 2πq_x − cos 2πq_y), have measure
     arccos(1 − r/W)/π (0 ≤ r ≤ 2W), so N(ε) is a 2-D integral of a closed
     form, done here by the midpoint rule on 1500² points, independently of
     the tetrahedra. Near the edge also N ≈ (4π/3)(ε/α)^{3/2}(1 + 0.15 ε/W)
     (the q⁴ term of the cosine, angular mean of Σq_i⁴ = 3|q|⁴/5, derived
     here). */
  for (int e = 0; e < 3; e++)
    {
      double eps = (e == 0 ? 0.3 : e == 1 ? 1.5 : 3.0) * W, count = 0, want = 0;
      const int g = 1500;
      for (gsize b = 0; b < dos->n_points && dos->omega[b] < w0 + eps; b++)
        count += dos->total[b] * dos->step;
      for (int i = 0; i < g; i++)
        for (int j = 0; j < g; j++)
          {
            double r = eps - W * (2 - cos (2 * G_PI * (i + 0.5) / g) - cos (2 * G_PI * (j + 0.5) / g));
            if (r <= 0)
              continue;
            want += (r >= 2 * W ? 1 : acos (1 - r / W) / G_PI) / ((double) g * g);
          }
      print_message ("band: N(ω₀ + %.1fW) = %.6g, quadrature %.6g, edge series %.6g\n", eps / W,
                     count, want,
                     4 * G_PI / 3 * pow (eps / alpha, 1.5) * (1 + 0.15 * eps / W));
      /* a 48³ mesh; ε = 0.3 W is 6 mesh spacings from Γ */
      assert_close (count / want, 1, e == 0 ? 0.03 : 3e-3, "states below ω₀ + ε");
    }
}

/* Dulong–Petit (Kittel ch. 5; Ashcroft & Mermin ch. 23): Cv → 3n k_B when
 * k_BT ≫ ħω_max; per mode Cv/k_B = 1 − x²/12 + O(x⁴), so at x_max = 0.05
 * the shortfall is below 2.1 × 10⁻⁴. */
static void
test_dulong_petit (void **state)
{
  g_autoptr(GError) error = NULL;
  g_autoptr(QvForceConstants) fc = fcc_fc (4.0, 40, 2.0);
  int n[3] = { 10, 10, 10 };
  g_autoptr(QvPhononMesh) mesh = qv_phonon_mesh_new (n, &error);
  g_autoptr(QvPhononSet) set = qv_dynamical_matrix_solve (fc, mesh->q, mesh->n_q, FALSE, 2, NULL, &error);
  double wmax = 0, t[2];
  g_autoptr(QvThermal) th = NULL;
  double kb_ev = KB / EV;
  (void) state;
  for (gsize i = 0; i < mesh->n_q * 3; i++)
    wmax = MAX (wmax, set->wavenumbers[i]);
  /* T with ħω_max/k_BT = 0.05 */
  t[0] = HBAR * 2 * G_PI * C_LIGHT * 100 * wmax / KB / 0.05;
  t[1] = t[0] * 10;
  th = qv_thermal_compute (mesh->n_q, 3, mesh->q, set->wavenumbers, TRUE, t, 2);
  assert_int_equal (th->n_gamma_skipped, 3);
  assert_int_equal (th->n_imaginary, 0);
  /* the three Γ modes are left out: 3 − 3/N_q modes per cell */
  {
    double full = 3.0 * (mesh->n_q - 1) / mesh->n_q;
    double r0 = th->heat_capacity[0] / (full * kb_ev), r1 = th->heat_capacity[1] / (full * kb_ev);
    print_message ("Dulong-Petit: Cv/(3 k_B) = %.6f at x_max = 0.05, %.8f at 0.005\n", r0, r1);
    assert_true (r0 < 1 && r0 > 1 - 0.05 * 0.05 / 12);
    assert_true (r1 < 1 && r1 > 1 - 0.005 * 0.005 / 12);
  }
}

/* Debye T³ law at low T (Kittel ch. 5): Cv ∝ T³ when k_BT ≪ ħω_max.
 * The mesh sum of Cv is the trapezoid rule of a periodic integrand that is
 * analytic in q (Tr f(D(q)) with f(x²) = (x/2)²/sinh²(x/2), whose nearest
 * poles are at ħω = 2πi k_BT), so it converges exponentially once the
 * mesh spacing is well below 2πk_BT/(ħ v); the test checks it against a
 * coarser mesh: a 48³ mesh is converged to 10⁻³ from T = Θ/50 up
 * (Θ = ħω_max/k_B; at Θ/100 it is not, 13 % between 30³ and 40³). The range
 * Θ/50 … Θ/25 is where the dispersion correction (∝ T², Ashcroft & Mermin
 * ch. 23) lifts the log-log slope by a few per cent only. */
static void
test_debye_t3 (void **state)
{
  g_autoptr(GError) error = NULL;
  g_autoptr(QvForceConstants) fc = fcc_fc (4.0, 40, 2.0);
  int n48[3] = { 48, 48, 48 }, n36[3] = { 36, 36, 36 };
  g_autoptr(QvPhononMesh) m40 = qv_phonon_mesh_new (n48, &error);
  g_autoptr(QvPhononMesh) m30 = qv_phonon_mesh_new (n36, &error);
  g_autoptr(QvPhononSet) s40 = qv_dynamical_matrix_solve (fc, m40->q, m40->n_q, FALSE, 2, NULL, &error);
  g_autoptr(QvPhononSet) s30 = qv_dynamical_matrix_solve (fc, m30->q, m30->n_q, FALSE, 2, NULL, &error);
  double wmax = 0, theta, t[6];
  g_autoptr(QvThermal) a = NULL;
  g_autoptr(QvThermal) b = NULL;
  double sx = 0, sy = 0, sxx = 0, sxy = 0, slope;
  (void) state;
  for (gsize i = 0; i < s30->n_q * 3; i++)
    wmax = MAX (wmax, s30->wavenumbers[i]);
  theta = HBAR * 2 * G_PI * C_LIGHT * 100 * wmax / KB;
  for (int i = 0; i < 6; i++)
    t[i] = theta / 50 * pow (2.0, i / 5.0);        /* Θ/50 … Θ/25 */
  a = qv_thermal_compute (m40->n_q, 3, m40->q, s40->wavenumbers, TRUE, t, 6);
  b = qv_thermal_compute (m30->n_q, 3, m30->q, s30->wavenumbers, TRUE, t, 6);
  for (int i = 0; i < 6; i++)
    {
      /* the three acoustic modes at Γ are left out of the sums; as the
         trapezoid rule's Γ term they would add their x → 0 limit, k_B each,
         divided by N_q — at T ≈ Θ/100 that is 3 % of Cv, so it is put back
         here to see the convergence and the T³ law of the integral */
      double ca = a->heat_capacity[i] + 3 * KB / EV / (double) m40->n_q;
      double cb = b->heat_capacity[i] + 3 * KB / EV / (double) m30->n_q;
      double x = log (t[i]), y = log (ca);
      print_message ("T = %.3f K: Cv = %.6e (48^3), %.6e (36^3) eV/K, without the Γ term %.6e\n",
                     t[i], ca, cb, a->heat_capacity[i]);
      assert_close (cb / ca, 1, 1e-3, "mesh converged");
      sx += x; sy += y; sxx += x * x; sxy += x * y;
    }
  slope = (6 * sxy - sx * sy) / (6 * sxx - sx * sx);
  print_message ("Debye T^3: log-log slope of Cv over Θ/50..Θ/25 = %.4f (Θ = %.1f K)\n", slope, theta);
  /* dispersion only adds to Cv/T³ (C = AT³ + BT⁵ + …, B > 0 for a lattice
     whose branches bend down, Ashcroft & Mermin ch. 23): the slope is
     above 3 and close to it this far below Θ */
  assert_true (slope > 3.0 && slope < 3.2);
  /* the T³ coefficient itself against the sound velocities (Debye's
     long-wavelength limit, Ashcroft & Mermin eq. 23.30, from memory):
     per cell A = (2π²/15) k_B⁴/ħ³ · V · Σ_ν ⟨v_ν⁻³⟩ over directions, the
     average over 2000 directions of a Fibonacci sphere (common practice);
     A and B from a least-squares fit of Cv/T³ = A + B T² */
  {
    const int nd = 2000;
    double avg = 0, st = 0, st2 = 0, sy2 = 0, sty = 0, fit_a, debye, vol;
    const double (*cell)[3] = qv_force_constants_cell (fc);
    for (int i = 0; i < nd; i++)
      {
        double zc = 1 - (2.0 * i + 1) / nd, rr = sqrt (1 - zc * zc), ph = i * G_PI * (3 - sqrt (5.0));
        double dir[3] = { rr * cos (ph), rr * sin (ph), zc };
        QvSoundVelocity sv;
        assert_true (qv_sound_velocity (fc, dir, 0, &sv, &error));
        for (int br = 0; br < 3; br++)
          avg += pow (sv.velocity[br], -3) / nd;
      }
    for (int i = 0; i < 6; i++)
      {
        double ca = a->heat_capacity[i] + 3 * KB / EV / (double) m40->n_q;
        double x = t[i] * t[i], y = ca / pow (t[i], 3);
        st += x; st2 += x * x; sy2 += y; sty += x * y;
      }
    fit_a = (sy2 * st2 - st * sty) / (6 * st2 - st * st);
    vol = fabs (qv_lattice_volume (cell)) * 1e-30;
    debye = 2 * G_PI * G_PI / 15 * pow (KB, 4) / pow (HBAR, 3) * vol * avg / EV;
    print_message ("T^3 coefficient: fit %.6e, from sound velocities %.6e eV/K^4\n", fit_a, debye);
    /* 0.9 % apart here; the two-term fit leaves out the T⁷ term */
    assert_close (fit_a / debye, 1, 0.015, "Debye T³ coefficient");
  }
}

/* Long-wavelength limit of the chain (Kittel ch. 4): ω ≈ a√(C/M) q, so the
 * sound velocity is a√(C/M), longitudinal with C_L, transverse with C_T. */
static void
test_chain_sound (void **state)
{
  g_autoptr(GError) error = NULL;
  const double a = 2.5, m = 12, cl = 3.0, ct = 0.7;
  g_autoptr(QvForceConstants) fc = chain_fc (a, m, cl, ct);
  double dir[3] = { 1, 0, 0 };
  QvSoundVelocity sv;
  double vl = a * 1e-10 * omega_si (cl, m), vt = a * 1e-10 * omega_si (ct, m);
  (void) state;
  assert_true (qv_sound_velocity (fc, dir, 0, &sv, &error));
  print_message ("chain sound: %.4f %.4f %.4f m/s (a√(C/M): %.4f, %.4f); linearity %.2e\n",
                 sv.velocity[0], sv.velocity[1], sv.velocity[2], vt, vl, sv.linearity[2]);
  assert_close (sv.velocity[0], vt, 1e-6 * vt, "transverse a√(C_T/M)");
  assert_close (sv.velocity[1], vt, 1e-6 * vt, "transverse a√(C_T/M)");
  assert_close (sv.velocity[2], vl, 1e-6 * vl, "longitudinal a√(C_L/M)");
  assert_close (sv.longitudinal[2], 1, 1e-9, "longitudinal polarisation");
  assert_close (sv.longitudinal[0], 0, 1e-9, "transverse polarisation");
  /* ω/q = v(1 − (qa)²/24): at qa = 2.5 × 10⁻³ the two steps differ by ~8 × 10⁻⁷ */
  assert_true (sv.linearity[2] < 1e-5);
  assert_false (qv_sound_velocity (fc, (double[3]) { 0, 0, 0 }, 0, &sv, &error));
  g_assert_error (error, QV_ERROR, QV_ERROR_USAGE);
}

/* Einstein model: every atom on its own spring k (the Hessian is k on the
 * diagonal), so every mode has ω = √(k/m) of its atom and
 * U = ħ/(2mω) coth(ħω/2k_BT) I (REFERENCES.md: thermal ⟨x²⟩ of the
 * oscillator, McQuarrie). No sum rule (it would remove the springs), no Γ
 * modes left out. */
static void
test_einstein_u (void **state)
{
  g_autoptr(GError) error = NULL;
  double cell[3][3] = { { 3, 0, 0 }, { 0, 3.5, 0 }, { 0.5, 0, 4 } };
  double r[6] = { 0, 0, 0, 1.5, 1.7, 2.0 };
  guint z[2] = { 6, 8 };
  double m[2] = { 12.0, 16.0 }, k[2] = { 4.0, 9.0 }, t[3] = { 0, 50, 700 };
  int sc[3][3] = { { 2, 0, 0 }, { 0, 2, 0 }, { 0, 0, 2 } };
  g_autoptr(QvStructure) p = lattice_model_structure (cell, 2, z, m, r);
  g_autoptr(QvStructure) s = qv_supercell_build (p, sc, &error);
  g_autoptr(QvHessian) h = qv_hessian_new (3 * s->n_atoms, TRUE, &error);
  g_autoptr(QvSupercellMap) map = qv_supercell_map (p, s, 0, &error);
  g_autoptr(QvForceConstants) fc = NULL;
  int nm[3] = { 3, 3, 2 };
  g_autoptr(QvPhononMesh) mesh = qv_phonon_mesh_new (nm, &error);
  g_autofree double *u = NULL;
  (void) state;
  for (gsize i = 0; i < s->n_atoms; i++)
    for (int a = 0; a < 3; a++)
      h->data[(3 * i + a) * h->n + 3 * i + a] = k[i % 2];
  fc = qv_force_constants_new (map, h, &error);
  assert_non_null (fc);
  u = qv_thermal_displacements (fc, mesh, t, 3, FALSE, 2, NULL, &error);
  assert_non_null (u);
  for (int it = 0; it < 3; it++)
    for (int site = 0; site < 2; site++)
      {
        double w = omega_si (k[site], m[site]);
        double x = HBAR * w / (KB * t[it]);
        double want = HBAR / (2 * m[site] * MU * w) * (t[it] > 0 ? 1 / tanh (x / 2) : 1) * 1e20;
        const double *ut = u + (it * 2 + site) * 9;
        for (int i = 0; i < 3; i++)
          for (int j = 0; j < 3; j++)
            assert_close (ut[3 * i + j], i == j ? want : 0, 1e-9 * want, "Einstein U");
      }
  print_message ("Einstein U(C, 700 K) = %.6f A^2\n", u[(2 * 2) * 9]);
}

/* Thermal sums against the closed forms of one oscillator (McQuarrie ch.
 * 11): with every mode at ω, F = ħω/2 + kT ln(1 − e^{−x}), S = k[x/(e^x − 1)
 * − ln(1 − e^{−x})], Cv = k x² e^x/(e^x − 1)²; imaginary modes counted and
 * left out; formula units. */
static void
test_thermal_closed_form (void **state)
{
  double q[6] = { 0, 0, 0, 0.25, 0, 0 }, w[6] = { 0.01, -0.02, 0.03, 200, 200, -15 };
  double t[2] = { 0, 300 };
  g_autoptr(QvThermal) th = qv_thermal_compute (2, 3, q, w, TRUE, t, 2);
  double e = HBAR * 2 * G_PI * C_LIGHT * 100 * 200, x = e / (KB * 300);
  guint zz[6] = { 11, 17, 11, 17, 8, 8 };
  (void) state;
  assert_int_equal (th->n_gamma_skipped, 3);
  assert_int_equal (th->n_imaginary, 1);
  assert_close (th->most_imaginary, -15, 0, "most imaginary");
  assert_int_equal (th->n_modes, 2);
  /* two modes at 200 cm⁻¹ on a mesh of two points: one mode per cell */
  assert_close (th->zpe[0] * EV, e / 2, 1e-12 * e, "ZPE");
  assert_close (th->free_energy[0], th->zpe[0], 0, "F(0) = ZPE");
  assert_close (th->free_energy[1] * EV, e / 2 + KB * 300 * log (1 - exp (-x)), 1e-12 * e, "F");
  assert_close (th->entropy[1] * EV, KB * (x / expm1 (x) - log (1 - exp (-x))), 1e-12 * KB, "S");
  assert_close (th->heat_capacity[1] * EV, KB * x * x * exp (x) / pow (expm1 (x), 2), 1e-12 * KB, "Cv");
  assert_close (th->energy[1], th->free_energy[1] + 300 * th->entropy[1], 1e-12, "U = F + TS");
  assert_int_equal (qv_thermal_formula_units (6, zz), 2);
  assert_close (qv_thermal_kj_per_mol (1), 96.48533212, 1e-6, "1 eV = 96.485 kJ/mol");
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_mesh),
    cmocka_unit_test (test_dos_normalisation),
    cmocka_unit_test (test_chain_dos),
    cmocka_unit_test (test_band_edge),
    cmocka_unit_test (test_thermal_closed_form),
    cmocka_unit_test (test_dulong_petit),
    cmocka_unit_test (test_debye_t3),
    cmocka_unit_test (test_chain_sound),
    cmocka_unit_test (test_einstein_u),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
