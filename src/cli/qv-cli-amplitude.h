/* qv-cli-amplitude.h — the amplitude options of the commands that move
 * atoms along a mode (displace, picture): --q, --Q, --max-displacement,
 * --turning-point[=M] and --level, spelt and checked in one place (private
 * to src/cli).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-displacement.h"

G_BEGIN_DECLS

typedef struct {
  double q, Q, angstrom;       /* NAN when not given */
  double multiple;             /* --turning-point=M */
  gboolean turning;            /* --turning-point given */
  gint64 level;                /* --level v */
} QvCliAmplitude;

/* A main group for @command (its callbacks get @amplitude) holding the five
 * options; the command adds its own entries to it. @level_help explains
 * --level for the command. */
GOptionGroup *qv_cli_amplitude_group (const char *command, QvCliAmplitude *amplitude,
                                      const char *level_help);
/* How many of the four units were given. */
int qv_cli_amplitude_n_units (const QvCliAmplitude *amplitude);
/* The unit and value given (FALSE when none was), after checking that only
 * one was, that it is 0 or more and that --level is 0…1000 (QV_ERROR_USAGE). */
gboolean qv_cli_amplitude_get (const QvCliAmplitude *amplitude, gboolean *given,
                               QvAmplitudeUnit *unit, double *value, GError **error);

G_END_DECLS
