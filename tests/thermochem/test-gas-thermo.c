/* test-gas-thermo.c — src/core/qv-gas-thermo.c against textbook closed forms
 * (McQuarrie, Statistical Mechanics, chs. 5, 8, 10 — from memory), the
 * published standard entropy of argon and the definitions of the soft-mode
 * treatments (Ribeiro et al., J. Phys. Chem. B 115, 14556 (2011); Grimme,
 * Chem. Eur. J. 18, 9955 (2012)). The closed forms are written out here
 * again with CODATA 2018 constants of their own, not taken from the code.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-gas-thermo.h"

/* CODATA 2018 (REFERENCES.md), exact SI values and m_u */
#define H_PLANCK 6.62607015e-34
#define KB 1.380649e-23
#define NA 6.02214076e23
#define EV 1.602176634e-19
#define MU 1.66053906660e-27
#define C_LIGHT 299792458.0
#define R_GAS (KB * NA)
/* eV/K per molecule → J/(K mol) */
#define S_MOL (EV * NA)

static void
assert_close (double got, double want, double tol, const char *what)
{
  if (!(fabs (got - want) <= tol))
    fail_msg ("%s: got %.12g, expected %.12g (tolerance %.3g)", what, got, want, tol);
}

/* harmonic oscillator entropy in J/(K mol) (McQuarrie ch. 10, from memory):
 * S/R = x/(e^x − 1) − ln(1 − e^−x) */
static double
s_ho (double nu_cm, double t)
{
  double x = H_PLANCK * C_LIGHT * 100 * nu_cm / (KB * t);
  return R_GAS * (x / (exp (x) - 1) - log (1 - exp (-x)));
}

static QvGasMolecule *
atom (double mass)
{
  g_autoptr(GError) error = NULL;
  double r[3] = { 0.1, -0.2, 0.3 };
  QvGasMolecule *m = qv_gas_molecule_new (1, r, &mass, 0, NULL, QV_ROTOR_ATOM, &error);
  assert_non_null (m);
  return m;
}

/* Argon at 298.15 K, 1 bar, standard atomic weight 39.948 (CIAAW, memory):
 * Sackur–Tetrode written out, and the published standard entropy
 * 154.846 J/(K mol) (CODATA Key Values for Thermodynamics, Cox, Wagman &
 * Medvedev 1989; also NIST-JANAF — from memory). */
static void
test_argon (void **state)
{
  g_autoptr(QvGasMolecule) m = atom (39.948);
  QvGasThermoOptions o;
  QvGasThermo th;
  double t = 298.15, p = 1e5, mass = 39.948 * MU;
  double st = R_GAS * (log (pow (2 * G_PI * mass * KB * t / (H_PLANCK * H_PLANCK), 1.5) * KB * t / p) + 2.5);

  qv_gas_thermo_options_init (&o);
  qv_gas_thermo_compute (m, &o, t, &th, NULL);
  assert_int_equal (m->rotor, QV_ROTOR_ATOM);
  assert_close (th.translation.entropy * S_MOL, st, 1e-9 * st, "Sackur-Tetrode");
  assert_close (th.total.entropy * S_MOL, 154.846, 0.003, "published S(Ar, 1 bar)");
  assert_close (th.rotation.entropy, 0, 0, "an atom has no rotation");
  assert_close (th.vibration.entropy, 0, 0, "an atom has no vibration");
  /* U = 3/2 RT, H = 5/2 RT, Cv = 3/2 R, Cp = 5/2 R */
  assert_close (th.total.energy * S_MOL, 1.5 * R_GAS * t, 1e-9, "U");
  assert_close (th.total.enthalpy * S_MOL, 2.5 * R_GAS * t, 1e-9, "H");
  assert_close (th.total.heat_capacity * S_MOL, 1.5 * R_GAS, 1e-12, "Cv");
  assert_close (th.heat_capacity_p * S_MOL, 2.5 * R_GAS, 1e-12, "Cp");
  assert_close (th.total.free_energy, th.total.enthalpy - t * th.total.entropy, 1e-15, "G = H - TS");
  /* 1 atm lowers S by R ln(101325/100000); 1 M (V = 1/(1000 N_A) m³) by
   * R ln(p°/(c° R T)) with c° = 1000 mol/m³ */
  o.standard_state = QV_STANDARD_STATE_1ATM;
  {
    QvGasThermo a;
    qv_gas_thermo_compute (m, &o, t, &a, NULL);
    assert_close ((th.total.entropy - a.total.entropy) * S_MOL, R_GAS * log (101325.0 / 1e5), 1e-9, "1 atm");
    o.standard_state = QV_STANDARD_STATE_1M;
    qv_gas_thermo_compute (m, &o, t, &a, NULL);
    assert_close ((th.total.entropy - a.total.entropy) * S_MOL, R_GAS * log (1000.0 * R_GAS * t / 1e5),
                  1e-9, "1 mol/L");
    o.standard_state = QV_STANDARD_STATE_1BAR;
    o.pressure = 2e5;
    qv_gas_thermo_compute (m, &o, t, &a, NULL);
    assert_close ((th.total.entropy - a.total.entropy) * S_MOL, R_GAS * log (2.0), 1e-9, "p = 2 bar");
  }
  o.pressure = 0;
  o.degeneracy = 3;
  {
    QvGasThermo a;
    qv_gas_thermo_compute (m, &o, t, &a, NULL);
    assert_close ((a.total.entropy - th.total.entropy) * S_MOL, R_GAS * log (3.0), 1e-9, "S_el = R ln g");
  }
}

/* Grimme 2012: w = 1/(1 + (ω0/ω)^α) is 0.5 at ω0 and 1/17 = 0.0588 at ω0/2 (α = 4). */
static void
test_grimme_weight (void **state)
{
  assert_close (qv_gas_grimme_weight (100, 100, 4), 0.5, 1e-15, "w(100)");
  assert_close (qv_gas_grimme_weight (50, 100, 4), 0.0588, 5e-5, "w(50) as printed in REFERENCES.md");
  assert_close (qv_gas_grimme_weight (50, 100, 4), 1.0 / 17.0, 1e-15, "w(50) = 1/17");
}

/* A diatomic along z: linear rotor, one vibration; homonuclear σ = 2. */
static QvGasMolecule *
diatomic (double m1, double m2, double d, double nu, GError **error)
{
  double r[6] = { 0, 0, 0, 0, 0, d }, m[2] = { m1, m2 };
  return qv_gas_molecule_new (2, r, m, 1, &nu, QV_ROTOR_ATOM, error);
}

static void
test_linear_rotor (void **state)
{
  g_autoptr(GError) error = NULL;
  g_autoptr(QvGasMolecule) m = diatomic (14.003074004, 14.003074004, 1.0977, 2358.6, &error);
  QvGasThermoOptions o;
  QvGasThermo th1, th2;
  double t = 298.15, mu_r = 14.003074004 / 2 * MU, i = mu_r * 1.0977e-10 * 1.0977e-10;
  double theta = H_PLANCK * H_PLANCK / (8 * G_PI * G_PI * i * KB);

  assert_non_null (m);
  assert_int_equal (m->rotor, QV_ROTOR_LINEAR);
  assert_int_equal (m->n_vibrations, 1);
  qv_gas_thermo_options_init (&o);
  qv_gas_thermo_compute (m, &o, t, &th1, NULL);
  o.symmetry_number = 2;
  qv_gas_thermo_compute (m, &o, t, &th2, NULL);
  /* linear rigid rotor (McQuarrie ch. 6): q = T/(σΘ), S = R(ln q + 1), U = RT */
  assert_close (th1.rotation.entropy * S_MOL, R_GAS * (log (t / theta) + 1), 1e-9, "S_rot linear");
  assert_close (th2.rotation.entropy * S_MOL, R_GAS * (log (t / (2 * theta)) + 1), 1e-9, "S_rot linear, sigma 2");
  assert_close (th1.rotation.energy * S_MOL, R_GAS * t, 1e-9, "U_rot linear");
  assert_close (th1.rotation.heat_capacity * S_MOL, R_GAS, 1e-12, "Cv_rot linear");
  assert_close (th1.rotational_temperatures[2], theta, 1e-9 * theta, "Theta_rot");
  /* vibration: the one harmonic stretch */
  assert_close (th1.vibration.entropy * S_MOL, s_ho (2358.6, t), 1e-9, "S_vib");
  assert_close (th1.vibration.zpe, 0.5 * H_PLANCK * C_LIGHT * 100 * 2358.6 / EV, 1e-15, "ZPE");
}

/* A nonlinear rotor: S = R[ln(√π/σ · √(T³/(Θ_AΘ_BΘ_C))) + 3/2], U = 3/2 RT;
 * a water-like triangle (invented geometry) with the moments computed here. */
static void
test_nonlinear_rotor (void **state)
{
  g_autoptr(GError) error = NULL;
  double r[9] = { 0, 0, 0.1173, 0, 0.7572, -0.4692, 0, -0.7572, -0.4692 };
  double m[3] = { 15.99491461957, 1.00782503223, 1.00782503223 };
  double nu[3] = { 1595, 3657, 3756 };
  g_autoptr(QvGasMolecule) mol = qv_gas_molecule_new (3, r, m, 3, nu, QV_ROTOR_ATOM, &error);
  QvGasThermoOptions o;
  QvGasThermo th;
  double t = 500, com[3] = { 0 }, tot = 0, in[3][3] = { { 0 } }, prod, theta_prod, sv = 0;

  assert_non_null (mol);
  assert_int_equal (mol->rotor, QV_ROTOR_NONLINEAR);
  for (int a = 0; a < 3; a++)
    {
      tot += m[a];
      for (int x = 0; x < 3; x++)
        com[x] += m[a] * r[3 * a + x];
    }
  for (int x = 0; x < 3; x++)
    com[x] /= tot;
  for (int a = 0; a < 3; a++)
    {
      double d[3] = { r[3 * a] - com[0], r[3 * a + 1] - com[1], r[3 * a + 2] - com[2] };
      double d2 = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
      for (int i = 0; i < 3; i++)
        for (int j = 0; j < 3; j++)
          in[i][j] += m[a] * ((i == j) * d2 - d[i] * d[j]);
    }
  /* det of the inertia tensor = product of the principal moments (u Å²)³ */
  prod = in[0][0] * (in[1][1] * in[2][2] - in[1][2] * in[2][1])
         - in[0][1] * (in[1][0] * in[2][2] - in[1][2] * in[2][0])
         + in[0][2] * (in[1][0] * in[2][1] - in[1][1] * in[2][0]);
  assert_close (mol->moments[0] * mol->moments[1] * mol->moments[2], prod, 1e-10 * prod, "I_A I_B I_C");
  theta_prod = pow (H_PLANCK * H_PLANCK / (8 * G_PI * G_PI * KB * MU * 1e-20), 3) / prod;
  qv_gas_thermo_options_init (&o);
  o.symmetry_number = 2;
  qv_gas_thermo_compute (mol, &o, t, &th, NULL);
  assert_close (th.rotation.entropy * S_MOL,
                R_GAS * (log (sqrt (G_PI) / 2 * sqrt (t * t * t / theta_prod)) + 1.5), 1e-9, "S_rot");
  assert_close (th.rotation.energy * S_MOL, 1.5 * R_GAS * t, 1e-9, "U_rot");
  for (int k = 0; k < 3; k++)
    sv += s_ho (nu[k], t);
  assert_close (th.vibration.entropy * S_MOL, sv, 1e-9, "S_vib sum");
}

/* Per-mode shares sum to the vibration term; a sweep equals single calls;
 * the oscillator's high-T limit (Cv → R, U_th → RT, McQuarrie). */
static void
test_modes_and_sweep (void **state)
{
  g_autoptr(GError) error = NULL;
  double r[9] = { 0, 0, 0.1173, 0, 0.7572, -0.4692, 0, -0.7572, -0.4692 };
  double m[3] = { 15.99, 1.008, 1.008 };
  double nu[6] = { 1.0e-3, -2.0, 3.0, 40, 800, -150 };    /* 3 rigid-like, 1 imaginary */
  g_autoptr(QvGasMolecule) mol = qv_gas_molecule_new (3, r, m, 6, nu, QV_ROTOR_ATOM, &error);
  QvGasThermoOptions o;
  QvGasThermo th, sw[3];
  QvGasMode md[6];
  double ts[3] = { 10, 298.15, 5000 }, s = 0, z = 0, g = 0, cv = 0;

  assert_non_null (mol);
  assert_int_equal (mol->n_rigid, 3);          /* the three smallest |ν| */
  assert_int_equal (mol->n_imaginary, 1);
  assert_int_equal (mol->n_vibrations, 2);
  assert_close (mol->most_imaginary, -150, 0, "most imaginary");
  assert_false (mol->used[0] || mol->used[1] || mol->used[2] || mol->used[5]);
  qv_gas_thermo_options_init (&o);
  qv_gas_thermo_compute (mol, &o, 298.15, &th, md);
  for (int k = 0; k < 6; k++)
    {
      s += md[k].entropy;
      z += md[k].zpe;
      g += md[k].free_energy;
      cv += md[k].heat_capacity;
    }
  assert_close (s, th.vibration.entropy, 1e-18, "sum S");
  assert_close (z, th.vibration.zpe, 1e-15, "sum ZPE");
  assert_close (g, th.vibration.free_energy, 1e-14, "sum G");
  assert_close (cv, th.vibration.heat_capacity, 1e-18, "sum Cv");
  assert_close (md[5].entropy, 0, 0, "imaginary left out");
  qv_gas_thermo_sweep (mol, &o, ts, 3, sw);
  assert_close (sw[1].total.free_energy, th.total.free_energy, 0, "sweep = single");
  /* 40 cm⁻¹ at 5000 K: x ≈ 0.0115; Cv/R = 1 − x²/12 + …, U_th = RT(1 − x/2 + x²/12) */
  {
    double x = H_PLANCK * C_LIGHT * 100 * 40 / (KB * 5000);
    QvGasMode hi[6];
    qv_gas_thermo_compute (mol, &o, 5000, &th, hi);
    assert_close (hi[3].heat_capacity * S_MOL, R_GAS * (1 - x * x / 12), 1e-9, "Cv high T");
    assert_close ((hi[3].energy - hi[3].zpe) * S_MOL, R_GAS * 5000 * (1 - x / 2 + x * x / 12), 1e-5,
                  "U_th high T");
  }
  /* at 1 K the 800 cm⁻¹ mode is frozen: S and Cv underflow to 0 without NaN */
  {
    QvGasMode lo[6];
    qv_gas_thermo_compute (mol, &o, 1, &th, lo);
    assert_true (isfinite (lo[4].entropy) && lo[4].entropy >= 0 && lo[4].entropy < 1e-300);
    assert_true (isfinite (th.total.free_energy));
  }
}

/* Soft modes: the three treatments agree for a stiff mode; a 50 cm⁻¹ mode at
 * 298.15 K gets S_HO, S_HO(100 cm⁻¹) and Grimme's mix, each written out here. */
static void
test_soft_modes (void **state)
{
  g_autoptr(GError) error = NULL;
  g_autoptr(QvGasMolecule) stiff = diatomic (12, 15.99491461957, 1.128, 2143, &error);
  g_autoptr(QvGasMolecule) soft = diatomic (12, 15.99491461957, 1.128, 50, &error);
  QvGasThermoOptions o;
  QvGasThermo h, r, q;
  QvGasMode mh, mr, mq;
  double t = 298.15;

  assert_non_null (stiff);
  assert_non_null (soft);
  qv_gas_thermo_options_init (&o);
  qv_gas_thermo_compute (stiff, &o, t, &h, NULL);
  o.soft_modes = QV_SOFT_MODES_RAISE;
  qv_gas_thermo_compute (stiff, &o, t, &r, NULL);
  o.soft_modes = QV_SOFT_MODES_QUASI_RRHO;
  qv_gas_thermo_compute (stiff, &o, t, &q, NULL);
  assert_close (r.total.free_energy, h.total.free_energy, 0, "raise = harmonic for 2143 cm^-1");
  assert_close (r.total.entropy, h.total.entropy, 0, "raise S");
  /* 1 − w = 4.7e-6 at 2143 cm⁻¹ and |S_FR − S_HO| < 1 J/(K mol) there, so
   * the mix is the harmonic S to within 5e-6 J/(K mol) (of a total ~200) */
  assert_close (q.vibration.entropy * S_MOL, h.vibration.entropy * S_MOL, 5e-6, "quasi-rrho = harmonic S");
  assert_close (q.total.entropy, h.total.entropy, 1e-7 * h.total.entropy, "quasi-rrho total S");
  assert_close (q.total.enthalpy, h.total.enthalpy, 0, "quasi-rrho keeps H");

  /* the 50 cm⁻¹ mode */
  o.soft_modes = QV_SOFT_MODES_NONE;
  qv_gas_thermo_compute (soft, &o, t, &h, &mh);
  o.soft_modes = QV_SOFT_MODES_RAISE;
  qv_gas_thermo_compute (soft, &o, t, &r, &mr);
  o.soft_modes = QV_SOFT_MODES_QUASI_RRHO;
  qv_gas_thermo_compute (soft, &o, t, &q, &mq);
  assert_close (mh.entropy * S_MOL, s_ho (50, t), 1e-9, "S_HO(50)");
  assert_close (mr.entropy * S_MOL, s_ho (100, t), 1e-9, "raised: S_HO(100)");
  assert_close (mr.zpe, mh.zpe, 0, "raise keeps the ZPE");
  assert_close (mr.thermal, 100, 0, "raised to the cut-off");
  {
    /* Grimme 2012: μ = h/(8π²ν), μ' = μB/(μ+B), S_R = R[½ + ln √(8π³μ'kT/h²)] */
    double nu = C_LIGHT * 100 * 50, mu = H_PLANCK / (8 * G_PI * G_PI * nu), b = 1e-44;
    double mup = mu * b / (mu + b);
    double sr = R_GAS * (0.5 + log (sqrt (8 * pow (G_PI, 3) * mup * KB * t / (H_PLANCK * H_PLANCK))));
    double w = 1.0 / 17.0;
    assert_close (mq.entropy_free_rotor * S_MOL, sr, 1e-9, "S_free-rotor(50)");
    assert_close (mq.entropy * S_MOL, w * s_ho (50, t) + (1 - w) * sr, 1e-9, "quasi-RRHO S(50)");
    assert_close (mq.energy, mh.energy, 0, "quasi-rrho keeps U");
    assert_close (mq.heat_capacity, mh.heat_capacity, 0, "quasi-rrho keeps Cv");
  }
}

/* Scale factors: --scale on every wavenumber, --zpe-scale on the ZPE alone. */
static void
test_scale (void **state)
{
  g_autoptr(GError) error = NULL;
  g_autoptr(QvGasMolecule) m = diatomic (1.00782503223, 1.00782503223, 0.7414, 4401, &error);
  QvGasThermoOptions o;
  QvGasMode a, b;
  QvGasThermo th;
  double hc = H_PLANCK * C_LIGHT * 100 / EV;

  qv_gas_thermo_options_init (&o);
  o.frequency_scale = 0.95;
  qv_gas_thermo_compute (m, &o, 1500, &th, &a);
  assert_close (a.zpe, 0.5 * hc * 4401 * 0.95, 1e-15, "ZPE with the frequency scale");
  assert_close (a.entropy * S_MOL, s_ho (4401 * 0.95, 1500), 1e-9, "S with the frequency scale");
  o.zpe_scale = 0.9;
  qv_gas_thermo_compute (m, &o, 1500, &th, &b);
  assert_close (b.zpe, 0.5 * hc * 4401 * 0.9, 1e-15, "ZPE with its own scale");
  assert_close (b.entropy, a.entropy, 0, "S keeps the frequency scale");
  assert_close (b.energy - b.zpe, a.energy - a.zpe, 1e-15, "U_th keeps the frequency scale");
  o.has_electronic_energy = TRUE;
  o.electronic_energy = -31.5;
  qv_gas_thermo_compute (m, &o, 1500, &th, NULL);
  assert_close (th.e_free_energy, -31.5 + th.total.free_energy, 1e-12, "E_el + G");
  assert_close (th.e_zpe, -31.5 + th.total.zpe, 1e-12, "E_el + ZPE");
}

static void
test_bad_input (void **state)
{
  g_autoptr(GError) error = NULL;
  double r[6] = { 0, 0, 0, 0, 0, 1 }, m[2] = { 1, 1 }, nu[1] = { NAN };
  QvGasThermoOptions o;
  QvGasMolecule *mol;

  mol = qv_gas_molecule_new (2, r, m, 0, nu, QV_ROTOR_ATOM, &error);
  assert_null (mol);
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  assert_non_null (strstr (error->message, "1 vibrations"));
  g_clear_error (&error);
  mol = qv_gas_molecule_new (2, r, m, 1, nu, QV_ROTOR_ATOM, &error);
  assert_null (mol);
  assert_non_null (strstr (error->message, "not a finite"));
  g_clear_error (&error);
  r[5] = 0;
  nu[0] = 100;
  mol = qv_gas_molecule_new (2, r, m, 1, nu, QV_ROTOR_ATOM, &error);
  assert_null (mol);
  assert_non_null (strstr (error->message, "one point"));
  g_clear_error (&error);

  qv_gas_thermo_options_init (&o);
  assert_true (qv_gas_thermo_options_check (&o, NULL));
  o.symmetry_number = 0;
  assert_false (qv_gas_thermo_options_check (&o, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
  g_clear_error (&error);
  qv_gas_thermo_options_init (&o);
  o.frequency_scale = -1;
  assert_false (qv_gas_thermo_options_check (&o, NULL));
  qv_gas_thermo_options_init (&o);
  o.b_av = 0;
  assert_false (qv_gas_thermo_options_check (&o, NULL));
  {
    QvStandardState s;
    QvSoftModes sm;
    assert_true (qv_standard_state_parse ("1M", &s, NULL) && s == QV_STANDARD_STATE_1M);
    assert_true (qv_soft_modes_parse ("quasi-rrho", &sm, NULL) && sm == QV_SOFT_MODES_QUASI_RRHO);
    assert_false (qv_soft_modes_parse ("grim", &sm, &error));
    assert_non_null (strstr (error->message, "quasi-rrho"));
  }
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_argon),
    cmocka_unit_test (test_grimme_weight),
    cmocka_unit_test (test_linear_rotor),
    cmocka_unit_test (test_nonlinear_rotor),
    cmocka_unit_test (test_modes_and_sweep),
    cmocka_unit_test (test_soft_modes),
    cmocka_unit_test (test_scale),
    cmocka_unit_test (test_bad_input),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
