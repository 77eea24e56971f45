/* qv-units.c — unit names and conversion factors, computed from CODATA 2018.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-units.h"

typedef struct {
  const char *name;        /* canonical spelling */
  const char *ascii;       /* lower-case ASCII form used for matching */
} UnitName;

static const UnitName hessian_units[QV_HESSIAN_UNIT_COUNT] = {
  [QV_HESSIAN_UNIT_EV_A2]         = { "eV/A^2",         "ev/a^2" },
  [QV_HESSIAN_UNIT_HARTREE_BOHR2] = { "hartree/bohr^2", "hartree/bohr^2" },
  [QV_HESSIAN_UNIT_KCAL_MOL_A2]   = { "kcal/mol/A^2",   "kcal/mol/a^2" },
  [QV_HESSIAN_UNIT_KJ_MOL_A2]     = { "kJ/mol/A^2",     "kj/mol/a^2" },
  [QV_HESSIAN_UNIT_MDYN_A]        = { "mdyn/A",         "mdyn/a" },
  [QV_HESSIAN_UNIT_AJ_A2]         = { "aJ/A^2",         "aj/a^2" },
  [QV_HESSIAN_UNIT_N_M]           = { "N/m",            "n/m" },
};

/* Lower-cases ASCII and folds "Å" (U+00C5, also U+212B ANGSTROM SIGN) and
 * "å" to "a". */
static char *
fold_unit (const char *text)
{
  GString *out = g_string_new (NULL);
  for (const char *p = text; *p; )
    {
      const unsigned char c = (unsigned char) *p;
      if (c == 0xC3 && ((unsigned char) p[1] == 0x85 || (unsigned char) p[1] == 0xA5))
        { g_string_append_c (out, 'a'); p += 2; }
      else if (c == 0xE2 && (unsigned char) p[1] == 0x84 && (unsigned char) p[2] == 0xAB)
        { g_string_append_c (out, 'a'); p += 3; }
      else if (c == ' ')
        p++;
      else
        { g_string_append_c (out, g_ascii_tolower (*p)); p++; }
    }
  return g_string_free (out, FALSE);
}

const char *
qv_hessian_unit_list (void)
{
  return "eV/A^2, hartree/bohr^2, kcal/mol/A^2, kJ/mol/A^2, mdyn/A, aJ/A^2, N/m";
}

gboolean
qv_hessian_unit_parse (const char *text, QvHessianUnit *unit, GError **error)
{
  g_autofree char *folded = NULL;

  if (text == NULL || *text == '\0')
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "the Hessian's units must be stated; accepted: %s", qv_hessian_unit_list ());
      return FALSE;
    }
  folded = fold_unit (text);
  for (int i = 0; i < QV_HESSIAN_UNIT_COUNT; i++)
    if (strcmp (folded, hessian_units[i].ascii) == 0)
      {
        *unit = (QvHessianUnit) i;
        return TRUE;
      }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "unknown Hessian unit '%s'; accepted: %s", text, qv_hessian_unit_list ());
  return FALSE;
}

const char *
qv_hessian_unit_name (QvHessianUnit unit)
{
  g_return_val_if_fail (unit < QV_HESSIAN_UNIT_COUNT, "?");
  return hessian_units[unit].name;
}

double
qv_hessian_unit_to_ev_a2 (QvHessianUnit unit)
{
  const double joule_per_ev = QV_ELEMENTARY_CHARGE;
  switch (unit)
    {
    case QV_HESSIAN_UNIT_EV_A2:
      return 1.0;
    case QV_HESSIAN_UNIT_HARTREE_BOHR2:
      return QV_HARTREE_EV / (QV_BOHR_ANGSTROM * QV_BOHR_ANGSTROM);
    case QV_HESSIAN_UNIT_KCAL_MOL_A2:
      return 1000.0 * QV_CALORIE / QV_AVOGADRO / joule_per_ev;
    case QV_HESSIAN_UNIT_KJ_MOL_A2:
      return 1000.0 / QV_AVOGADRO / joule_per_ev;
    case QV_HESSIAN_UNIT_MDYN_A:
    case QV_HESSIAN_UNIT_AJ_A2:
      /* 1 mdyn/Å = 1e-8 N / 1e-10 m = 100 N/m = 1 aJ/Å² */
      return 1e-18 / joule_per_ev;
    case QV_HESSIAN_UNIT_N_M:
      /* 1 N/m = 1 J/m² = 1e-20 J/Å² */
      return 1e-20 / joule_per_ev;
    case QV_HESSIAN_UNIT_COUNT:
    default:
      break;
    }
  g_return_val_if_reached (NAN);
}

gboolean
qv_frequency_unit_parse (const char *text, QvFrequencyUnit *unit, GError **error)
{
  g_autofree char *folded = text ? fold_unit (text) : g_strdup ("");
  if (strcmp (folded, "cm-1") == 0 || strcmp (folded, "cm^-1") == 0 || strcmp (folded, "1/cm") == 0)
    *unit = QV_FREQUENCY_CM1;
  else if (strcmp (folded, "thz") == 0)
    *unit = QV_FREQUENCY_THZ;
  else if (strcmp (folded, "mev") == 0)
    *unit = QV_FREQUENCY_MEV;
  else
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "unknown frequency unit '%s'; accepted: cm-1, THz, meV", text ? text : "");
      return FALSE;
    }
  return TRUE;
}

const char *
qv_frequency_unit_name (QvFrequencyUnit unit)
{
  switch (unit)
    {
    case QV_FREQUENCY_CM1: return "cm^-1";
    case QV_FREQUENCY_THZ: return "THz";
    case QV_FREQUENCY_MEV: return "meV";
    default: return "?";
    }
}

double
qv_units_omega_per_root_eigenvalue (void)
{
  /* ω² = λ eV/(Å² u) in s⁻²: eV in J over (1e-20 m² · m_u kg). */
  return sqrt (QV_ELEMENTARY_CHARGE / (1e-20 * QV_ATOMIC_MASS));
}

double
qv_units_wavenumber_per_root_eigenvalue (void)
{
  /* ν̃ = ω / (2π c), c in cm/s. */
  return qv_units_omega_per_root_eigenvalue () / (2.0 * G_PI * QV_SPEED_OF_LIGHT * 100.0);
}

double
qv_units_ev_a2_per_mdyn_a (void)
{
  return qv_hessian_unit_to_ev_a2 (QV_HESSIAN_UNIT_MDYN_A);
}

double
qv_wavenumber_from_eigenvalue (double eigenvalue)
{
  const double w = sqrt (fabs (eigenvalue)) * qv_units_wavenumber_per_root_eigenvalue ();
  return eigenvalue < 0 ? -w : w;
}

double
qv_eigenvalue_from_wavenumber (double wavenumber)
{
  const double r = wavenumber / qv_units_wavenumber_per_root_eigenvalue ();
  return wavenumber < 0 ? -r * r : r * r;
}

double
qv_frequency_from_wavenumber (double wavenumber, QvFrequencyUnit unit)
{
  switch (unit)
    {
    case QV_FREQUENCY_CM1:
      return wavenumber;
    case QV_FREQUENCY_THZ:
      /* ν = c ν̃, c in cm/s, result in 1e12 Hz */
      return wavenumber * QV_SPEED_OF_LIGHT * 100.0 * 1e-12;
    case QV_FREQUENCY_MEV:
      /* E = h c ν̃ in J, over e for eV, ×1000 for meV */
      return wavenumber * QV_PLANCK * QV_SPEED_OF_LIGHT * 100.0 / QV_ELEMENTARY_CHARGE * 1000.0;
    default:
      return NAN;
    }
}
