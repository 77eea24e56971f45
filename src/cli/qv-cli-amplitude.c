/* qv-cli-amplitude.c — the amplitude options shared by displace and picture.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include "qv-cli-amplitude.h"
#include "qv-error.h"

static gboolean
parse_turning (const char *name, const char *value, gpointer data, GError **error)
{
  QvCliAmplitude *a = data;
  char *end = NULL;

  a->turning = TRUE;
  a->multiple = 1.0;
  if (value == NULL)
    return TRUE;
  a->multiple = g_ascii_strtod (value, &end);
  if (end == value || *end != '\0' || !isfinite (a->multiple) || a->multiple < 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "--turning-point takes a multiple of the turning point such as 1 or 0.5, got '%s'",
                   value);
      return FALSE;
    }
  return TRUE;
}

GOptionGroup *
qv_cli_amplitude_group (const char *command, QvCliAmplitude *a, const char *level_help)
{
  GOptionGroup *group = g_option_group_new (command, "", "", a, NULL);
  const GOptionEntry entries[] = {
    { "q", 0, 0, G_OPTION_ARG_DOUBLE, &a->q, "Amplitude as dimensionless q = Q sqrt(omega/hbar)", "A" },
    { "Q", 0, 0, G_OPTION_ARG_DOUBLE, &a->Q, "Amplitude as mass-weighted Q in u^1/2 A", "A" },
    { "max-displacement", 'd', 0, G_OPTION_ARG_DOUBLE, &a->angstrom,
      "Amplitude as the largest atomic displacement in A", "A" },
    { "turning-point", 't', G_OPTION_FLAG_OPTIONAL_ARG, G_OPTION_ARG_CALLBACK, (gpointer) parse_turning,
      "Amplitude as M turning points of level v (M = 1 if left out; write --turning-point=M)", "M" },
    { "level", 'v', 0, G_OPTION_ARG_INT64, &a->level, level_help, "V" },
    { NULL }
  };

  a->q = a->Q = a->angstrom = NAN;
  a->multiple = 1.0;
  a->turning = FALSE;
  a->level = 0;
  g_option_group_add_entries (group, entries);
  return group;
}

int
qv_cli_amplitude_n_units (const QvCliAmplitude *a)
{
  return !isnan (a->q) + !isnan (a->Q) + !isnan (a->angstrom) + a->turning;
}

gboolean
qv_cli_amplitude_get (const QvCliAmplitude *a, gboolean *given, QvAmplitudeUnit *unit,
                      double *value, GError **error)
{
  *given = FALSE;
  if (qv_cli_amplitude_n_units (a) > 1)
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE,
                           "give one amplitude: --q, --Q, --max-displacement or --turning-point "
                           "(they are the same amplitude in different units)");
      return FALSE;
    }
  if (a->level < 0 || a->level > 1000)
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE,
                           "--level must be a whole number from 0 to 1000");
      return FALSE;
    }
  if (!isnan (a->q))
    *unit = QV_AMPLITUDE_DIMENSIONLESS, *value = a->q;
  else if (!isnan (a->Q))
    *unit = QV_AMPLITUDE_MASS_WEIGHTED, *value = a->Q;
  else if (!isnan (a->angstrom))
    *unit = QV_AMPLITUDE_ANGSTROM, *value = a->angstrom;
  else if (a->turning)
    *unit = QV_AMPLITUDE_TURNING_POINT, *value = a->multiple;
  else
    return TRUE;
  *given = TRUE;
  if (!(*value >= 0 && isfinite (*value)))
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE,
                           "the amplitude must be 0 or more: the structures go to both signs");
      return FALSE;
    }
  return TRUE;
}
