/* qv-displacement.c — amplitudes in four units and displaced geometries.
 * Cartesian displacement of atom a along mode k at amplitude Q:
 * Δr_a = Q·l_a/√m_a (DESIGN §2); q = Q·√(ω/ħ); Q_tp(v) = √((2v+1)ħ/ω).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-displacement.h"
#include "qv-error.h"
#include "qv-oscillator.h"

const char *
qv_amplitude_unit_name (QvAmplitudeUnit unit)
{
  switch (unit)
    {
    case QV_AMPLITUDE_DIMENSIONLESS: return "q";
    case QV_AMPLITUDE_MASS_WEIGHTED: return "Q";
    case QV_AMPLITUDE_ANGSTROM: return "max-displacement";
    case QV_AMPLITUDE_TURNING_POINT: return "turning-point";
    default: return "?";
    }
}

const char *
qv_displace_kind_name (QvDisplaceKind kind)
{
  switch (kind)
    {
    case QV_DISPLACE_PAIR: return "pair";
    case QV_DISPLACE_SCAN: return "scan";
    case QV_DISPLACE_GRID: return "grid";
    case QV_DISPLACE_LEVELS: return "levels";
    case QV_DISPLACE_ESCAPE: return "escape";
    default: return "?";
    }
}

static gboolean
check_mode (const QvModeSet *modes, gsize k, GError **error)
{
  if (k < modes->n_modes)
    return TRUE;
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "there is no mode %" G_GSIZE_FORMAT "; the modes count from 1 to %" G_GSIZE_FORMAT
               " (see 'quaver modes')", k + 1, modes->n_modes);
  return FALSE;
}

/* "512.3i cm^-1" or "1594.6 cm^-1". */
static char *
describe_mode (const QvModeSet *modes, gsize k)
{
  const double nu = qv_mode_set_wavenumber (modes, k);
  return g_strdup_printf ("mode %" G_GSIZE_FORMAT " (%.1f%s cm^-1)", k + 1, fabs (nu),
                          nu < 0 ? "i" : "");
}

gboolean
qv_amplitude_convert (const QvModeSet *modes, gsize k, QvAmplitudeUnit unit, double value,
                      guint level, QvAmplitude *out, GError **error)
{
  double lambda, q_tp, per_q, d_unit;
  gsize atom = 0;

  if (!check_mode (modes, k, error))
    return FALSE;
  if (!isfinite (value))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "the amplitude must be a finite number");
      return FALSE;
    }
  lambda = modes->eigenvalues[k];
  q_tp = qv_oscillator_turning_point (lambda, level);          /* NAN for λ ≤ 0 */
  per_q = qv_oscillator_dimensionless (lambda, 1.0);            /* q per unit Q */
  d_unit = qv_mode_set_max_displacement (modes, k, 1.0, &atom); /* Å per unit Q */

  if ((unit == QV_AMPLITUDE_DIMENSIONLESS || unit == QV_AMPLITUDE_TURNING_POINT)
      && !(lambda > 0.0 && isfinite (q_tp)))
    {
      g_autofree char *what = describe_mode (modes, k);
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "%s is %s: it has no turning point, so a %s amplitude is undefined; "
                   "give the amplitude as Q (u^1/2 A) or as the largest atomic "
                   "displacement (A) instead", what, lambda < 0 ? "imaginary" : "a zero mode",
                   unit == QV_AMPLITUDE_DIMENSIONLESS ? "dimensionless (q)" : "turning-point");
      return FALSE;
    }
  if (unit == QV_AMPLITUDE_ANGSTROM && !(d_unit > 0.0))
    {
      g_autofree char *what = describe_mode (modes, k);
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s moves no atom; give the amplitude as Q",
                   what);
      return FALSE;
    }

  memset (out, 0, sizeof *out);
  out->mode = k;
  out->level = level;
  switch (unit)
    {
    case QV_AMPLITUDE_DIMENSIONLESS: out->Q = value / per_q; break;
    case QV_AMPLITUDE_MASS_WEIGHTED: out->Q = value; break;
    case QV_AMPLITUDE_ANGSTROM: out->Q = value / d_unit; break;
    case QV_AMPLITUDE_TURNING_POINT: out->Q = value * q_tp; break;
    default:
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "unknown amplitude unit");
      return FALSE;
    }
  /* the given unit exactly, the others derived from Q */
  out->q = unit == QV_AMPLITUDE_DIMENSIONLESS ? value
           : lambda > 0.0 ? out->Q * per_q : NAN;
  out->max_displacement = unit == QV_AMPLITUDE_ANGSTROM ? value : out->Q * d_unit;
  out->max_atom = atom;
  out->turning_multiple = unit == QV_AMPLITUDE_TURNING_POINT ? value
                          : isfinite (q_tp) ? out->Q / q_tp : NAN;
  return TRUE;
}

void
qv_displace_positions (const QvStructure *structure, const QvModeSet *modes,
                       const QvAmplitude *amplitudes, gsize n, double *out)
{
  const gsize n3 = 3 * structure->n_atoms;

  for (gsize a = 0; a < structure->n_atoms; a++)
    memcpy (out + 3 * a, structure->atoms[a].position, 3 * sizeof (double));
  for (gsize i = 0; i < n; i++)
    {
      const double *l = qv_mode_set_vector (modes, amplitudes[i].mode);
      const double Q = amplitudes[i].Q;

      for (gsize c = 0; c < n3; c++)
        out[c] += Q * l[c] / sqrt (modes->masses[c / 3]);
    }
}

void
qv_displace_request_init (QvDisplaceRequest *request)
{
  memset (request, 0, sizeof *request);
  request->kind = QV_DISPLACE_PAIR;
  request->unit = QV_AMPLITUDE_TURNING_POINT;
  request->value = NAN;
  request->points = 0;
}

void
qv_displacement_set_free (QvDisplacementSet *set)
{
  if (set == NULL)
    return;
  for (gsize i = 0; i < set->n_structures; i++)
    g_free (set->structures[i].positions);
  g_free (set->structures);
  g_free (set->note);
  g_free (set);
}

/* Unit and value of the amplitude for mode @k: the request's, or the
 * kind's default. */
static gboolean
resolve_amplitude (const QvModeSet *modes, gsize k, const QvDisplaceRequest *r,
                   QvAmplitudeUnit *unit, double *value, char **note, GError **error)
{
  const gboolean imaginary = qv_mode_set_is_imaginary (modes, k);

  if (!isnan (r->value))
    {
      if (!(isfinite (r->value) && r->value >= 0.0))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "the amplitude must be a number of 0 or more (the structures go to "
                       "both signs)");
          return FALSE;
        }
      *unit = r->unit;
      *value = r->value;
      return TRUE;
    }
  if (r->kind == QV_DISPLACE_ESCAPE)
    {
      *unit = QV_AMPLITUDE_ANGSTROM;
      *value = QV_ESCAPE_DEFAULT_DISPLACEMENT;
      if (note && *note == NULL)
        *note = g_strdup_printf (
          "escape amplitude: largest atomic displacement %.2f A (the default). Stepping "
          "about 0.1 A off a saddle point along its imaginary mode before re-optimising "
          "is common practice: well above optimiser noise, well below bond lengths, so "
          "each side relaxes into its own valley. Set it with a Q or an A amplitude.",
          QV_ESCAPE_DEFAULT_DISPLACEMENT);
      return TRUE;
    }
  if (imaginary)
    {
      g_autofree char *what = describe_mode (modes, k);
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "%s is imaginary and has no turning point to take as the default "
                   "amplitude; give Q (u^1/2 A) or the largest atomic displacement (A), or "
                   "use the escape pair", what);
      return FALSE;
    }
  *unit = QV_AMPLITUDE_TURNING_POINT;
  *value = 1.0;
  return TRUE;
}

static double *
positions_for (const QvStructure *s, const double *const *d, const QvAmplitude *amp, guint n)
{
  const gsize n3 = 3 * s->n_atoms;
  double *x = g_new (double, n3);

  for (gsize a = 0; a < s->n_atoms; a++)
    memcpy (x + 3 * a, s->atoms[a].position, 3 * sizeof (double));
  for (guint i = 0; i < n; i++)
    for (gsize c = 0; c < n3; c++)
      x[c] += amp[i].Q * d[i][c];
  return x;
}

QvDisplacementSet *
qv_displace (const QvStructure *structure, const QvModeSet *modes,
             const QvDisplaceRequest *r, GError **error)
{
  g_autoptr(QvDisplacementSet) set = g_new0 (QvDisplacementSet, 1);
  g_autofree double *d0 = NULL, *d1 = NULL;
  const double *d[2];
  const guint n_modes = r->kind == QV_DISPLACE_GRID ? 2 : 1;
  QvAmplitudeUnit unit[2];
  double value[2];
  gsize count;

  g_return_val_if_fail (structure->n_atoms == modes->n_atoms, NULL);
  set->kind = r->kind;
  set->n_atoms = structure->n_atoms;

  for (guint i = 0; i < n_modes; i++)
    if (!check_mode (modes, r->modes[i], error))
      return NULL;
  if (r->kind == QV_DISPLACE_GRID && r->modes[0] == r->modes[1])
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "a grid needs two different modes; mode %" G_GSIZE_FORMAT " was given twice",
                   r->modes[0] + 1);
      return NULL;
    }
  if (r->kind == QV_DISPLACE_SCAN || r->kind == QV_DISPLACE_GRID)
    {
      if (r->points < 3 || r->points % 2 == 0)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       r->points < 3 ? "a %s needs at least 3 points per mode (−A, 0, +A); got %u"
                                     : "a %s needs an odd number of points per mode so that 0 is "
                                       "one of them; got %u, use %u or %u",
                       qv_displace_kind_name (r->kind), r->points, r->points - 1, r->points + 1);
          return NULL;
        }
      if (r->points > 100001)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "%u points per mode is more than this writes (100001)", r->points);
          return NULL;
        }
    }
  if (r->kind == QV_DISPLACE_ESCAPE && !qv_mode_set_is_imaginary (modes, r->modes[0]))
    {
      g_autofree char *what = describe_mode (modes, r->modes[0]);
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "%s is not imaginary; the escape pair follows an imaginary mode off a "
                   "saddle point (for a real mode use a pair or a scan)", what);
      return NULL;
    }
  if (r->kind == QV_DISPLACE_LEVELS)
    {
      if (!(modes->eigenvalues[r->modes[0]] > 0.0))
        {
          g_autofree char *what = describe_mode (modes, r->modes[0]);
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "%s has no turning points (it is imaginary or zero); use the escape "
                       "pair or a pair with a Q or A amplitude", what);
          return NULL;
        }
      if (!isnan (r->value) && r->unit != QV_AMPLITUDE_TURNING_POINT)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "the levels are placed at their turning points; the only amplitude they "
                       "take is a multiple of the turning point");
          return NULL;
        }
      if (r->level > 1000)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "levels 0 to %u is more than this writes (up to level 1000)", r->level);
          return NULL;
        }
    }

  for (guint i = 0; i < n_modes; i++)
    if (!resolve_amplitude (modes, r->modes[i], r, &unit[i], &value[i], &set->note, error))
      return NULL;

  d0 = g_new (double, 3 * structure->n_atoms);
  qv_mode_set_cartesian (modes, r->modes[0], d0);
  d[0] = d0;
  if (n_modes == 2)
    {
      d1 = g_new (double, 3 * structure->n_atoms);
      qv_mode_set_cartesian (modes, r->modes[1], d1);
      d[1] = d1;
    }

  switch (r->kind)
    {
    case QV_DISPLACE_SCAN: count = r->points; break;
    case QV_DISPLACE_GRID: count = (gsize) r->points * r->points; break;
    case QV_DISPLACE_LEVELS: count = 2 * ((gsize) r->level + 1); break;
    case QV_DISPLACE_PAIR:
    case QV_DISPLACE_ESCAPE:
    default: count = 2; break;
    }
  set->structures = g_new0 (QvDisplaced, count);

  for (gsize s = 0; s < count; s++)
    {
      QvDisplaced *out = &set->structures[s];
      double frac[2] = { 0.0, 0.0 };
      guint level = r->level;

      switch (r->kind)
        {
        case QV_DISPLACE_SCAN:
          /* −1 … +1 with the middle point exactly 0 */
          frac[0] = (double) (2 * (gint64) s - (gint64) (r->points - 1)) / (double) (r->points - 1);
          break;
        case QV_DISPLACE_GRID:
          {
            const gsize i = s / r->points, j = s % r->points;
            frac[0] = (double) (2 * (gint64) i - (gint64) (r->points - 1)) / (double) (r->points - 1);
            frac[1] = (double) (2 * (gint64) j - (gint64) (r->points - 1)) / (double) (r->points - 1);
          }
          break;
        case QV_DISPLACE_LEVELS:
          level = (guint) (s / 2);
          frac[0] = s % 2 == 0 ? -1.0 : 1.0;
          break;
        default:
          frac[0] = s % 2 == 0 ? -1.0 : 1.0;
          break;
        }
      out->n_amplitudes = n_modes;
      for (guint i = 0; i < n_modes; i++)
        if (!qv_amplitude_convert (modes, r->modes[i], unit[i], frac[i] * value[i], level,
                                   &out->amplitudes[i], error))
          {
            set->n_structures = s;   /* free what was filled */
            return NULL;
          }
      out->positions = positions_for (structure, d, out->amplitudes, n_modes);
      set->n_structures = s + 1;
    }
  return g_steal_pointer (&set);
}
