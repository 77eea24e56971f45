/* qv-intensity.c — double-harmonic IR intensities and Raman activities.
 *
 * IR: the integrated absorption coefficient of a fundamental,
 *   A = N_A / (12 ε₀ c²) · |∂μ/∂Q|²   (SI; Q mass-weighted),
 * (e.g. Wilson, Decius & Cross, Molecular Vibrations, 1955; the usual
 * conversion 1 (D/Å)²/u = 42.2561 km/mol follows from it).
 * Raman: the invariants of the polarisability derivative ∂α/∂Q, α' (mean)
 * and γ'² (anisotropy), and the activity S = 45 α'² + 7 γ'² (Long, The Raman
 * Effect, Wiley, 2002).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-intensity.h"
#include "qv-units.h"

/* Vacuum permittivity, CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93,
 * 025010, 2021), F/m. */
#define EPSILON_0 8.8541878128e-12
/* The debye: 10⁻²¹ C m² / s ÷ c, in C m. */
#define DEBYE (1e-21 / QV_SPEED_OF_LIGHT)

QvDerivatives *
qv_derivatives_new (gsize n_atoms)
{
  QvDerivatives *d = g_new0 (QvDerivatives, 1);
  d->n_atoms = n_atoms;
  return d;
}

void
qv_derivatives_free (QvDerivatives *d)
{
  if (d == NULL)
    return;
  g_free (d->dipole);
  g_free (d->polarizability);
  g_free (d);
}

void
qv_derivatives_set_dipole (QvDerivatives *d, const double *rows, double factor)
{
  const gsize n = 3 * d->n_atoms;
  g_free (d->dipole);
  d->dipole = g_new (double, 3 * n);
  for (gsize i = 0; i < 3 * n; i++)
    d->dipole[i] = rows[i] * factor;
}

gboolean
qv_derivatives_set_polarizability (QvDerivatives *d, gsize n_rows, const double *rows,
                                   double factor)
{
  const gsize n = 3 * d->n_atoms;
  /* 9-row order xx xy xz / yx yy yz / zx zy zz: row index 3a + b. */
  static const int from9[QV_ALPHA_N_COMPONENTS][2] = {
    { 0, 0 }, { 4, 4 }, { 8, 8 }, { 1, 3 }, { 2, 6 }, { 5, 7 }
  };
  double *p;
  double max_abs = 0.0, max_diff = 0.0;

  if (n_rows != 6 && n_rows != 9)
    return FALSE;
  p = g_new (double, QV_ALPHA_N_COMPONENTS * n);
  if (n_rows == 6)
    for (gsize i = 0; i < QV_ALPHA_N_COMPONENTS * n; i++)
      p[i] = rows[i] * factor;
  else
    {
      for (int c = 0; c < QV_ALPHA_N_COMPONENTS; c++)
        for (gsize j = 0; j < n; j++)
          {
            const double u = rows[from9[c][0] * n + j], v = rows[from9[c][1] * n + j];
            p[c * n + j] = 0.5 * (u + v) * factor;
            max_diff = MAX (max_diff, fabs (u - v));
          }
      for (gsize i = 0; i < 9 * n; i++)
        max_abs = MAX (max_abs, fabs (rows[i]));
    }
  g_free (d->polarizability);
  d->polarizability = p;
  d->polarizability_asymmetry = max_abs > 0 ? max_diff / max_abs : 0.0;
  return TRUE;
}

typedef struct {
  const char *name;
  double factor;
} UnitName;

static gboolean
parse_unit (const UnitName *table, gsize n, const char *list, const char *what, const char *text,
            double *factor, GError **error)
{
  g_autofree char *canon = NULL;
  GString *s = g_string_new (NULL);

  /* "Å" for "A", case-insensitive, spaces ignored */
  for (const char *p = text; *p; p++)
    if (strncmp (p, "\xc3\x85", 2) == 0)
      {
        g_string_append_c (s, 'a');
        p++;
      }
    else if (*p != ' ')
      g_string_append_c (s, g_ascii_tolower (*p));
  canon = g_string_free (s, FALSE);
  for (gsize i = 0; i < n; i++)
    if (g_ascii_strcasecmp (canon, table[i].name) == 0)
      {
        *factor = table[i].factor;
        return TRUE;
      }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "unknown unit \"%s\" for %s; use one of: %s",
               text, what, list);
  return FALSE;
}

const char *
qv_dipole_derivative_unit_list (void)
{
  return "e (= e*A/A = e*bohr/bohr = au), D/A, D/bohr";
}

const char *
qv_polarizability_derivative_unit_list (void)
{
  return "A^2 (= A^3/A, volume polarisability per length), bohr^2 (= bohr^3/bohr = au)";
}

gboolean
qv_dipole_derivative_unit_parse (const char *text, double *factor, GError **error)
{
  /* 1 D/Å = DEBYE / (e · 1e-10 m) e */
  const double d_a = DEBYE / (QV_ELEMENTARY_CHARGE * 1e-10);
  const UnitName table[] = {
    { "e", 1.0 }, { "e*a/a", 1.0 }, { "e*bohr/bohr", 1.0 }, { "au", 1.0 },
    { "d/a", d_a }, { "d/bohr", d_a / QV_BOHR_ANGSTROM },
  };
  return parse_unit (table, G_N_ELEMENTS (table), qv_dipole_derivative_unit_list (),
                     "dipole derivatives", text, factor, error);
}

gboolean
qv_polarizability_derivative_unit_parse (const char *text, double *factor, GError **error)
{
  const double b2 = QV_BOHR_ANGSTROM * QV_BOHR_ANGSTROM;
  const UnitName table[] = {
    { "a^2", 1.0 }, { "a^3/a", 1.0 }, { "bohr^2", b2 }, { "bohr^3/bohr", b2 }, { "au", b2 },
  };
  return parse_unit (table, G_N_ELEMENTS (table), qv_polarizability_derivative_unit_list (),
                     "polarizability derivatives", text, factor, error);
}

double
qv_intensity_ir_km_mol_per_e2_u (void)
{
  const double e2_u = QV_ELEMENTARY_CHARGE * QV_ELEMENTARY_CHARGE / QV_ATOMIC_MASS;  /* C²/kg */
  return QV_AVOGADRO / (12.0 * EPSILON_0 * QV_SPEED_OF_LIGHT * QV_SPEED_OF_LIGHT) * e2_u / 1000.0;
}

double
qv_intensity_ir_km_mol_per_d2_a2_u (void)
{
  const double d_a = DEBYE / (QV_ELEMENTARY_CHARGE * 1e-10);
  return qv_intensity_ir_km_mol_per_e2_u () * d_a * d_a;
}

double
qv_intensity_raman_cross_section (double activity, double wavenumber, double laser,
                                  double temperature)
{
  const double nu = wavenumber * 100.0, nu0 = laser * 100.0;   /* m⁻¹ */
  const double s_si = activity * 1e-40 / QV_ATOMIC_MASS;        /* m⁴/kg */
  double bose = 1.0, sigma;

  if (!(wavenumber > 0 && wavenumber < laser) || !isfinite (activity))
    return NAN;
  if (temperature > 0)
    bose = 1.0 / -expm1 (-QV_PLANCK * QV_SPEED_OF_LIGHT * nu / (QV_BOLTZMANN * temperature));
  sigma = pow (2.0 * G_PI, 4) / 45.0 * pow (nu0 - nu, 4)
          * QV_PLANCK / (8.0 * G_PI * G_PI * QV_SPEED_OF_LIGHT * nu) * s_si * bose;  /* m²/sr */
  return sigma * 1e4 / 1e-30;
}

QvIntensities *
qv_intensities_compute (const QvModeSet *modes, const QvDerivatives *d,
                        const QvRamanConditions *raman, double scale, GError **error)
{
  const gsize n = 3 * modes->n_atoms;
  const double ir_factor = qv_intensity_ir_km_mol_per_e2_u ();
  g_autofree double *cart = g_new (double, n);
  QvIntensities *out;

  if (d == NULL || (d->dipole == NULL && d->polarizability == NULL))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "no dipole or polarizability derivatives: intensities need at least one");
      return NULL;
    }
  if (d->n_atoms != modes->n_atoms)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "the derivative tensors are for %" G_GSIZE_FORMAT " atoms, the structure has %"
                   G_GSIZE_FORMAT, d->n_atoms, modes->n_atoms);
      return NULL;
    }
  out = g_new0 (QvIntensities, 1);
  out->n_modes = modes->n_modes;
  out->has_ir = d->dipole != NULL;
  out->has_raman = d->polarizability != NULL;
  out->raman.laser = raman ? raman->laser : QV_RAMAN_DEFAULT_LASER;
  out->raman.temperature = raman ? raman->temperature : 298.15;
  out->scale = scale > 0 ? scale : 1.0;
  out->modes = g_new0 (QvModeIntensity, modes->n_modes);
  for (gsize k = 0; k < modes->n_modes; k++)
    {
      QvModeIntensity *mi = &out->modes[k];
      double a[QV_ALPHA_N_COMPONENTS] = { 0 };

      mi->wavenumber = qv_mode_set_wavenumber (modes, k);
      mi->defined = !qv_mode_set_is_imaginary (modes, k);
      mi->raman_intensity = NAN;
      if (!mi->defined)
        {
          out->n_imaginary++;
          mi->ir = mi->raman_activity = NAN;
          continue;
        }
      /* d_j = l_j/√m_j: ∂/∂Q = Σ_j (∂/∂x_j) d_j */
      qv_mode_set_cartesian (modes, k, cart);
      if (d->dipole)
        {
          double sum = 0.0;
          for (int i = 0; i < 3; i++)
            {
              double v = 0.0;
              for (gsize j = 0; j < n; j++)
                v += d->dipole[i * n + j] * cart[j];
              mi->dmu_dq[i] = v;
              sum += v * v;
            }
          mi->ir = ir_factor * sum;
        }
      else
        mi->ir = NAN;
      if (d->polarizability)
        {
          double xx, yy, zz, xy, xz, yz;
          for (int c = 0; c < QV_ALPHA_N_COMPONENTS; c++)
            for (gsize j = 0; j < n; j++)
              a[c] += d->polarizability[c * n + j] * cart[j];
          xx = a[QV_ALPHA_XX]; yy = a[QV_ALPHA_YY]; zz = a[QV_ALPHA_ZZ];
          xy = a[QV_ALPHA_XY]; xz = a[QV_ALPHA_XZ]; yz = a[QV_ALPHA_YZ];
          mi->alpha_mean = (xx + yy + zz) / 3.0;
          mi->gamma2 = 0.5 * ((xx - yy) * (xx - yy) + (yy - zz) * (yy - zz) + (zz - xx) * (zz - xx)
                              + 6.0 * (xy * xy + xz * xz + yz * yz));
          mi->raman_activity = 45.0 * mi->alpha_mean * mi->alpha_mean + 7.0 * mi->gamma2;
          mi->raman_intensity = qv_intensity_raman_cross_section (
            mi->raman_activity, mi->wavenumber * out->scale, out->raman.laser,
            out->raman.temperature);
          mi->raman_defined = isfinite (mi->raman_intensity);
        }
      else
        mi->raman_activity = NAN;
    }
  return out;
}

void
qv_intensities_free (QvIntensities *in)
{
  if (in == NULL)
    return;
  g_free (in->modes);
  g_free (in);
}
