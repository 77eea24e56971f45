/* qv-gas-thermo.c — ideal-gas, rigid-rotor, harmonic-oscillator
 * thermochemistry of a molecule with soft-mode treatments (see
 * qv-gas-thermo.h for the formulas and their sources).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <lapacke.h>
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-gas-thermo.h"
#include "qv-units.h"

#define KB_EV (QV_BOLTZMANN / QV_ELEMENTARY_CHARGE)          /* eV/K */
#define HC_CM (QV_PLANCK * QV_SPEED_OF_LIGHT * 100.0)        /* J per cm⁻¹ */
#define EV_PER_CM1 (HC_CM / QV_ELEMENTARY_CHARGE)            /* eV per cm⁻¹ */
#define PA_1BAR 1e5
#define PA_1ATM 101325.0
#define MOL_PER_M3_1M 1000.0                                 /* 1 mol/L */
#define U_A2_TO_KG_M2 (QV_ATOMIC_MASS * 1e-20)

static const char *const state_names[] = { "1bar", "1atm", "1M" };
static const char *const soft_names[] = { "none", "raise", "quasi-rrho" };
static const char *const rotor_names[] = { "atom", "linear", "nonlinear" };

const char *
qv_standard_state_name (QvStandardState state)
{
  return (guint) state < G_N_ELEMENTS (state_names) ? state_names[state] : "?";
}

gboolean
qv_standard_state_parse (const char *text, QvStandardState *state, GError **error)
{
  for (guint i = 0; i < G_N_ELEMENTS (state_names); i++)
    if (text && g_ascii_strcasecmp (text, state_names[i]) == 0)
      {
        *state = (QvStandardState) i;
        return TRUE;
      }
  if (text && (g_ascii_strcasecmp (text, "1mol/L") == 0 || g_ascii_strcasecmp (text, "1mol/l") == 0))
    {
      *state = QV_STANDARD_STATE_1M;
      return TRUE;
    }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "unknown standard state '%s'; accepted: 1bar (p = 100000 Pa, the default), "
               "1atm (p = 101325 Pa), 1M (c = 1 mol/L)", text ? text : "");
  return FALSE;
}

const char *
qv_soft_modes_name (QvSoftModes soft)
{
  return (guint) soft < G_N_ELEMENTS (soft_names) ? soft_names[soft] : "?";
}

gboolean
qv_soft_modes_parse (const char *text, QvSoftModes *soft, GError **error)
{
  for (guint i = 0; i < G_N_ELEMENTS (soft_names); i++)
    if (text && g_ascii_strcasecmp (text, soft_names[i]) == 0)
      {
        *soft = (QvSoftModes) i;
        return TRUE;
      }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "unknown soft-mode treatment '%s'; accepted: none (harmonic), raise (real modes "
               "below --cutoff raised to it, Ribeiro et al. 2011), quasi-rrho (entropy between "
               "oscillator and free rotor, Grimme 2012)", text ? text : "");
  return FALSE;
}

const char *
qv_rotor_name (QvRotor rotor)
{
  return (guint) rotor < G_N_ELEMENTS (rotor_names) ? rotor_names[rotor] : "?";
}

void
qv_gas_thermo_options_init (QvGasThermoOptions *o)
{
  memset (o, 0, sizeof *o);
  o->standard_state = QV_STANDARD_STATE_1BAR;
  o->symmetry_number = 1;
  o->degeneracy = 1;
  o->soft_modes = QV_SOFT_MODES_NONE;
  o->cutoff = QV_GAS_RAISE_CUTOFF;
  o->omega0 = QV_GAS_QRRHO_OMEGA0;
  o->alpha = QV_GAS_QRRHO_ALPHA;
  o->b_av = QV_GAS_QRRHO_B_AV;
  o->frequency_scale = 1.0;
}

gboolean
qv_gas_thermo_options_check (const QvGasThermoOptions *o, GError **error)
{
  const char *what = NULL;
  if ((guint) o->standard_state >= G_N_ELEMENTS (state_names))
    what = "the standard state is not one of 1bar, 1atm, 1M";
  else if (!(isfinite (o->pressure) && o->pressure >= 0 && o->pressure < 1e12))
    what = "the pressure must be above 0 Pa and finite";
  else if (o->symmetry_number < 1 || o->symmetry_number > 1000)
    what = "the symmetry number must be a whole number from 1 to 1000";
  else if (o->degeneracy < 1 || o->degeneracy > 1000)
    what = "the electronic degeneracy must be a whole number from 1 to 1000";
  else if ((guint) o->soft_modes >= G_N_ELEMENTS (soft_names))
    what = "the soft-mode treatment is not one of none, raise, quasi-rrho";
  else if (!(isfinite (o->cutoff) && o->cutoff >= 0 && o->cutoff <= 10000))
    what = "the cut-off must be a wavenumber from 0 to 10000 cm^-1";
  else if (!(isfinite (o->omega0) && o->omega0 > 0 && o->omega0 <= 10000))
    what = "omega0 must be a wavenumber above 0 and at most 10000 cm^-1";
  else if (!(isfinite (o->alpha) && o->alpha > 0 && o->alpha <= 100))
    what = "alpha must be above 0 and at most 100";
  else if (!(isfinite (o->b_av) && o->b_av > 0 && o->b_av < 1e-30))
    what = "B_av must be a moment of inertia above 0 and below 1e-30 kg m^2";
  else if (!(isfinite (o->frequency_scale) && o->frequency_scale > 0 && o->frequency_scale <= 10))
    what = "the frequency scale factor must be above 0 and at most 10";
  else if (!(isfinite (o->zpe_scale) && o->zpe_scale >= 0 && o->zpe_scale <= 10))
    what = "the ZPE scale factor must be above 0 and at most 10";
  else if (o->has_electronic_energy && !isfinite (o->electronic_energy))
    what = "the electronic energy must be a finite number";
  if (what)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s", what);
      return FALSE;
    }
  return TRUE;
}

double
qv_gas_kj_per_mol (void)
{
  return QV_ELEMENTARY_CHARGE * QV_AVOGADRO / 1000.0;
}

double
qv_gas_thermo_pressure (const QvGasThermoOptions *o, double t)
{
  if (o->pressure > 0)
    return o->pressure;
  switch (o->standard_state)
    {
    case QV_STANDARD_STATE_1ATM: return PA_1ATM;
    case QV_STANDARD_STATE_1M: return MOL_PER_M3_1M * QV_AVOGADRO * QV_BOLTZMANN * t;
    case QV_STANDARD_STATE_1BAR:
    default: return PA_1BAR;
    }
}

/* ---- the molecule ---- */

void
qv_gas_molecule_free (QvGasMolecule *m)
{
  if (m == NULL)
    return;
  g_free (m->wavenumbers);
  g_free (m->used);
  g_free (m);
}

static gboolean
principal_moments (QvGasMolecule *m, const double *r, const double *mass, GError **error)
{
  double com[3] = { 0, 0, 0 }, t[9] = { 0 }, w[3];
  lapack_int info;

  for (gsize a = 0; a < m->n_atoms; a++)
    for (int x = 0; x < 3; x++)
      com[x] += mass[a] * r[3 * a + x] / m->mass;
  for (gsize a = 0; a < m->n_atoms; a++)
    {
      double d[3] = { r[3 * a] - com[0], r[3 * a + 1] - com[1], r[3 * a + 2] - com[2] };
      double d2 = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
      for (int i = 0; i < 3; i++)
        for (int j = 0; j < 3; j++)
          t[3 * j + i] += mass[a] * ((i == j ? d2 : 0) - d[i] * d[j]);
    }
  info = LAPACKE_dsyev (LAPACK_COL_MAJOR, 'V', 'L', 3, t, 3, w);
  if (info != 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_SOLVER, "the inertia tensor could not be diagonalised "
                   "(LAPACK dsyev info %d)", (int) info);
      return FALSE;
    }
  for (int k = 0; k < 3; k++)
    m->moments[k] = MAX (w[k], 0.0);
  memcpy (m->axes, t, sizeof m->axes);
  return TRUE;
}

QvGasMolecule *
qv_gas_molecule_new (gsize n_atoms, const double *positions, const double *masses,
                     gsize n_modes, const double *wavenumbers, QvRotor rotor_hint, GError **error)
{
  g_autoptr(QvGasMolecule) m = g_new0 (QvGasMolecule, 1);
  gsize expected, n_rigid;

  if (n_atoms == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "the molecule has no atoms");
      return NULL;
    }
  m->n_atoms = n_atoms;
  for (gsize a = 0; a < n_atoms; a++)
    {
      if (!(isfinite (masses[a]) && masses[a] > 0))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "atom %" G_GSIZE_FORMAT ": the mass "
                       "must be a positive number of u", a + 1);
          return NULL;
        }
      for (int x = 0; x < 3; x++)
        if (!isfinite (positions[3 * a + x]))
          {
            g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "atom %" G_GSIZE_FORMAT ": the position "
                         "is not a finite number", a + 1);
            return NULL;
          }
      m->mass += masses[a];
    }
  if (!principal_moments (m, positions, masses, error))
    return NULL;
  if (n_atoms == 1)
    m->rotor = QV_ROTOR_ATOM;
  else if (!(m->moments[2] > 1e-8))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "the %" G_GSIZE_FORMAT " atoms all sit at one "
                   "point: no moment of inertia", n_atoms);
      return NULL;
    }
  else if (rotor_hint == QV_ROTOR_LINEAR || rotor_hint == QV_ROTOR_NONLINEAR)
    m->rotor = rotor_hint;
  else
    m->rotor = m->moments[0] < QV_GAS_LINEAR_TOLERANCE * m->moments[2] ? QV_ROTOR_LINEAR
                                                                        : QV_ROTOR_NONLINEAR;
  expected = m->rotor == QV_ROTOR_ATOM ? 0 : 3 * n_atoms - (m->rotor == QV_ROTOR_LINEAR ? 5 : 6);
  if (n_modes < expected)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "%" G_GSIZE_FORMAT " modes given; a %s molecule "
                   "of %" G_GSIZE_FORMAT " atoms has %" G_GSIZE_FORMAT " vibrations (3N-%d), and "
                   "the thermochemistry needs every one of them", n_modes,
                   qv_rotor_name (m->rotor), n_atoms, expected, m->rotor == QV_ROTOR_LINEAR ? 5 : 6);
      return NULL;
    }
  for (gsize k = 0; k < n_modes; k++)
    if (!isfinite (wavenumbers[k]))
      {
        g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "mode %" G_GSIZE_FORMAT ": the wavenumber is "
                     "not a finite number", k + 1);
        return NULL;
      }
  m->n_modes = n_modes;
  m->wavenumbers = g_memdup2 (wavenumbers, n_modes * sizeof (double));
  m->used = g_new (gboolean, MAX (n_modes, 1));
  for (gsize k = 0; k < n_modes; k++)
    m->used[k] = TRUE;
  /* extra modes: the smallest |ν̃| are rigid-body motion */
  n_rigid = n_modes - expected;
  for (gsize r = 0; r < n_rigid; r++)
    {
      gsize best = n_modes;
      for (gsize k = 0; k < n_modes; k++)
        if (m->used[k] && (best == n_modes || fabs (wavenumbers[k]) < fabs (wavenumbers[best])))
          best = k;
      m->used[best] = FALSE;
    }
  m->n_rigid = n_rigid;
  for (gsize k = 0; k < n_modes; k++)
    {
      if (!m->used[k])
        continue;
      if (wavenumbers[k] < 0)
        {
          m->used[k] = FALSE;
          m->n_imaginary++;
          m->most_imaginary = MIN (m->most_imaginary, wavenumbers[k]);
        }
      else if (wavenumbers[k] == 0)
        {
          m->used[k] = FALSE;
          m->n_zero++;
        }
      else
        m->n_vibrations++;
    }
  return g_steal_pointer (&m);
}

QvGasMolecule *
qv_gas_molecule_new_from_modes (const QvStructure *s, const QvModeSet *modes, GError **error)
{
  g_autofree double *r = NULL, *mass = NULL, *w = NULL;
  QvRotor hint = QV_ROTOR_ATOM;

  if (modes->lowest_only)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "thermochemistry needs every mode, not only "
                   "the lowest %" G_GSIZE_FORMAT, modes->n_modes);
      return NULL;
    }
  if (modes->n_atoms != s->n_atoms)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "the modes are of %" G_GSIZE_FORMAT " atoms, "
                   "the structure has %" G_GSIZE_FORMAT, modes->n_atoms, s->n_atoms);
      return NULL;
    }
  r = g_new (double, 3 * s->n_atoms);
  w = g_new (double, MAX (modes->n_modes, 1));
  for (gsize a = 0; a < s->n_atoms; a++)
    memcpy (r + 3 * a, s->atoms[a].position, 3 * sizeof (double));
  for (gsize k = 0; k < modes->n_modes; k++)
    w[k] = qv_mode_set_wavenumber (modes, k);
  /* the masses the modes were solved with; the solver's rank test decides
   * linearity when it removed the rotations */
  if (modes->projection == QV_PROJECTION_FULL && modes->has_hessian && s->n_atoms > 1)
    hint = modes->n_rotations == 2 ? QV_ROTOR_LINEAR : modes->n_rotations == 3 ? QV_ROTOR_NONLINEAR
                                                                                : QV_ROTOR_ATOM;
  return qv_gas_molecule_new (s->n_atoms, r, modes->masses, modes->n_modes, w, hint, error);
}

/* ---- the formulas ---- */

double
qv_gas_grimme_weight (double wavenumber, double omega0, double alpha)
{
  return 1.0 / (1.0 + pow (omega0 / wavenumber, alpha));
}

/* x = hcν̃/k_BT; S/k_B, U_th/(hcν̃), Cv/k_B of one oscillator, stable for
 * every x > 0 (written with e^{−x}) */
static void
oscillator (double x, double *s, double *u, double *cv)
{
  double em = exp (-x), d = -expm1 (-x);
  *s = x * em / d - log (d);
  *u = em / d;
  *cv = x * x * em / (d * d);
}

double
qv_gas_harmonic_entropy (double wavenumber, double t)
{
  double s, u, cv;
  oscillator (HC_CM * wavenumber / (QV_BOLTZMANN * t), &s, &u, &cv);
  return s * KB_EV;
}

double
qv_gas_free_rotor_entropy (double wavenumber, double t, double b_av)
{
  double nu = QV_SPEED_OF_LIGHT * 100.0 * wavenumber;           /* s⁻¹ */
  double mu = QV_PLANCK / (8 * G_PI * G_PI * nu);                /* kg m² */
  double mu_eff = mu * b_av / (mu + b_av);
  double arg = 8 * G_PI * G_PI * G_PI * mu_eff * QV_BOLTZMANN * t / (QV_PLANCK * QV_PLANCK);
  return KB_EV * (0.5 + 0.5 * log (arg));
}

static void
term_free_energy (QvGasTerm *term, double t)
{
  term->free_energy = term->enthalpy - t * term->entropy;
}

void
qv_gas_thermo_compute (const QvGasMolecule *m, const QvGasThermoOptions *o, double t,
                       QvGasThermo *out, QvGasMode *modes)
{
  const double kt = KB_EV * t;
  const double zpe_scale = o->zpe_scale > 0 ? o->zpe_scale : o->frequency_scale;
  double p = qv_gas_thermo_pressure (o, t), mass = m->mass * QV_ATOMIC_MASS, volume, lambda_arg;

  memset (out, 0, sizeof *out);
  out->temperature = t;
  out->pressure = p;

  /* translation: Sackur–Tetrode */
  volume = QV_BOLTZMANN * t / p;
  lambda_arg = 2 * G_PI * mass * QV_BOLTZMANN * t / (QV_PLANCK * QV_PLANCK);
  out->q_translation = 1.5 * log (lambda_arg) + log (volume);
  out->translation.energy = 1.5 * kt;
  out->translation.enthalpy = 2.5 * kt;
  out->translation.entropy = KB_EV * (out->q_translation + 2.5);
  out->translation.heat_capacity = 1.5 * KB_EV;
  term_free_energy (&out->translation, t);

  /* rotation: classical rigid rotor */
  if (m->rotor != QV_ROTOR_ATOM)
    {
      double theta[3];
      for (int k = 0; k < 3; k++)
        theta[k] = m->moments[k] > 0 ? QV_PLANCK * QV_PLANCK / (8 * G_PI * G_PI * m->moments[k]
                                                                 * U_A2_TO_KG_M2 * QV_BOLTZMANN)
                                     : 0;
      if (m->rotor == QV_ROTOR_LINEAR)
        {
          double i = 0.5 * (m->moments[1] + m->moments[2]) * U_A2_TO_KG_M2;
          double th = QV_PLANCK * QV_PLANCK / (8 * G_PI * G_PI * i * QV_BOLTZMANN);
          out->rotational_temperatures[2] = th;
          out->q_rotation = log (t / (o->symmetry_number * th));
          out->rotation.energy = kt;
          out->rotation.entropy = KB_EV * (out->q_rotation + 1);
          out->rotation.heat_capacity = KB_EV;
        }
      else
        {
          memcpy (out->rotational_temperatures, theta, sizeof theta);
          out->q_rotation = 0.5 * log (G_PI) - log ((double) o->symmetry_number)
                            + 0.5 * (3 * log (t) - log (theta[0]) - log (theta[1]) - log (theta[2]));
          out->rotation.energy = 1.5 * kt;
          out->rotation.entropy = KB_EV * (out->q_rotation + 1.5);
          out->rotation.heat_capacity = 1.5 * KB_EV;
        }
      out->rotation.enthalpy = out->rotation.energy;
      term_free_energy (&out->rotation, t);
    }

  /* vibration */
  for (gsize k = 0; k < m->n_modes; k++)
    {
      QvGasMode md = { 0 };
      md.mode = k;
      md.wavenumber = m->wavenumbers[k];
      md.used = m->used[k];
      md.scaled = m->wavenumbers[k] * o->frequency_scale;
      md.thermal = md.scaled;
      md.weight = 1;
      if (md.used)
        {
          double s, u, cv, x;
          if (o->soft_modes == QV_SOFT_MODES_RAISE && md.scaled < o->cutoff)
            md.thermal = o->cutoff;
          x = HC_CM * md.thermal / (QV_BOLTZMANN * t);
          oscillator (x, &s, &u, &cv);
          md.zpe = 0.5 * EV_PER_CM1 * m->wavenumbers[k] * zpe_scale;
          md.energy = md.zpe + EV_PER_CM1 * md.thermal * u;
          md.heat_capacity = KB_EV * cv;
          md.entropy_harmonic = md.thermal == md.scaled ? KB_EV * s
                                                        : qv_gas_harmonic_entropy (md.scaled, t);
          md.entropy = KB_EV * s;
          if (o->soft_modes == QV_SOFT_MODES_QUASI_RRHO)
            {
              md.weight = qv_gas_grimme_weight (md.scaled, o->omega0, o->alpha);
              md.entropy_free_rotor = qv_gas_free_rotor_entropy (md.scaled, t, o->b_av);
              md.entropy = md.weight * md.entropy_harmonic + (1 - md.weight) * md.entropy_free_rotor;
            }
          md.free_energy = md.energy - t * md.entropy;
          out->vibration.zpe += md.zpe;
          out->vibration.energy += md.energy;
          out->vibration.entropy += md.entropy;
          out->vibration.heat_capacity += md.heat_capacity;
        }
      if (modes)
        modes[k] = md;
    }
  out->vibration.enthalpy = out->vibration.energy;
  term_free_energy (&out->vibration, t);

  /* electronic: the ground state's degeneracy only */
  out->electronic.entropy = KB_EV * log ((double) o->degeneracy);
  term_free_energy (&out->electronic, t);

  out->total.zpe = out->vibration.zpe;
  out->total.energy = out->translation.energy + out->rotation.energy + out->vibration.energy;
  out->total.enthalpy = out->total.energy + kt;
  out->total.entropy = out->translation.entropy + out->rotation.entropy + out->vibration.entropy
                       + out->electronic.entropy;
  out->total.heat_capacity = out->translation.heat_capacity + out->rotation.heat_capacity
                             + out->vibration.heat_capacity;
  term_free_energy (&out->total, t);
  out->heat_capacity_p = out->total.heat_capacity + KB_EV;
  out->has_electronic_energy = o->has_electronic_energy;
  if (o->has_electronic_energy)
    {
      out->electronic_energy = o->electronic_energy;
      out->e_zpe = o->electronic_energy + out->total.zpe;
      out->e_enthalpy = o->electronic_energy + out->total.enthalpy;
      out->e_free_energy = o->electronic_energy + out->total.free_energy;
    }
}

void
qv_gas_thermo_sweep (const QvGasMolecule *m, const QvGasThermoOptions *o, const double *t,
                     gsize n_t, QvGasThermo *out)
{
  for (gsize i = 0; i < n_t; i++)
    qv_gas_thermo_compute (m, o, t[i], &out[i], NULL);
}
