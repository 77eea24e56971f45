/* qv-displacement.h — amplitudes along normal modes in the four units users
 * think in, and the displaced geometries an export writes (pairs, scans,
 * two-mode grids, turning points of levels 0…v, escape pairs along an
 * imaginary mode).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-mode-set.h"
#include "qv-structure.h"

G_BEGIN_DECLS

typedef enum {
  QV_AMPLITUDE_DIMENSIONLESS,  /* q = Q·√(ω/ħ); real modes only */
  QV_AMPLITUDE_MASS_WEIGHTED,  /* Q in u^½ Å */
  QV_AMPLITUDE_ANGSTROM,       /* largest atomic displacement, Å */
  QV_AMPLITUDE_TURNING_POINT,  /* multiples of Q_tp at level v; real modes only */
} QvAmplitudeUnit;

const char *qv_amplitude_unit_name (QvAmplitudeUnit unit);

/* One mode's amplitude in every unit. Q, q, max_displacement and
 * turning_multiple carry the same sign. */
typedef struct {
  gsize mode;                  /* 0-based column of the mode set */
  double Q;                    /* u^½ Å */
  double q;                    /* NAN for imaginary and zero modes */
  double max_displacement;     /* Å, signed as Q */
  gsize max_atom;              /* 0-based */
  guint level;                 /* v the turning multiple refers to */
  double turning_multiple;     /* Q/Q_tp(v), NAN without a turning point */
} QvAmplitude;

/* Fills @out for @value in @unit (@level is the v of turning-point units and
 * of the turning_multiple reported). Fails with QV_ERROR_USAGE when @k is
 * out of range, @value is not finite, or q / turning-point units are asked
 * of a mode without a turning point (imaginary or zero: the message says to
 * give Q or Å), or an Å amplitude of a mode that moves no atom. */
gboolean qv_amplitude_convert (const QvModeSet *modes, gsize k, QvAmplitudeUnit unit,
                               double value, guint level, QvAmplitude *out,
                               GError **error);

/* @out (3N) = the structure's positions + Σ Q_i·l_i/√m for @n amplitudes.
 * The cell, if any, is not touched (periodic structures keep it). */
void qv_displace_positions (const QvStructure *structure, const QvModeSet *modes,
                            const QvAmplitude *amplitudes, gsize n, double *out);

typedef enum {
  QV_DISPLACE_PAIR,            /* −A, +A */
  QV_DISPLACE_SCAN,            /* n points −A … +A, n odd so 0 is one */
  QV_DISPLACE_GRID,            /* n × n over two modes, each −A … +A */
  QV_DISPLACE_LEVELS,          /* ±(multiple × Q_tp(v)) for v = 0 … level */
  QV_DISPLACE_ESCAPE,          /* −A, +A along an imaginary mode */
} QvDisplaceKind;

const char *qv_displace_kind_name (QvDisplaceKind kind);

/* The escape pair's default: the largest atomic displacement, Å. Stepping
 * ~0.1 Å off a saddle point along the imaginary mode before re-optimising
 * is common practice: large against optimiser noise and the curvature's
 * reach, small against bond lengths so the step stays on the same reaction
 * path. */
#define QV_ESCAPE_DEFAULT_DISPLACEMENT 0.1

typedef struct {
  QvDisplaceKind kind;
  gsize modes[2];              /* 0-based; modes[1] for GRID only */
  QvAmplitudeUnit unit;
  double value;                /* A ≥ 0 in @unit; NAN picks the default: one
                                  turning point at @level for real modes,
                                  QV_ESCAPE_DEFAULT_DISPLACEMENT Å for ESCAPE
                                  (other kinds of imaginary modes need a
                                  value) */
  guint level;                 /* v (LEVELS: the highest level) */
  guint points;                /* SCAN, GRID: points per mode, odd, ≥ 3 */
} QvDisplaceRequest;

void qv_displace_request_init (QvDisplaceRequest *request);

typedef struct {
  guint n_amplitudes;          /* 1, or 2 for a grid */
  QvAmplitude amplitudes[2];
  double *positions;           /* 3N Å */
} QvDisplaced;

typedef struct {
  QvDisplaceKind kind;
  gsize n_atoms;
  gsize n_structures;
  QvDisplaced *structures;     /* in order: increasing amplitude; a grid by
                                  rows of the first mode, the second fastest;
                                  levels v = 0, 1, … each −, + */
  char *note;                  /* what the user should know about a default
                                  chosen here (escape amplitude), or NULL */
} QvDisplacementSet;

/* The structures of @request. QV_ERROR_USAGE for a bad request (mode out of
 * range, even or too few points, a grid of one mode or the same mode twice,
 * ESCAPE of a real mode, LEVELS of an imaginary one, q or turning-point
 * units of an imaginary mode, a negative amplitude); each message says what
 * to change. */
QvDisplacementSet *qv_displace (const QvStructure *structure, const QvModeSet *modes,
                                const QvDisplaceRequest *request, GError **error);
void qv_displacement_set_free (QvDisplacementSet *set);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvDisplacementSet, qv_displacement_set_free)

G_END_DECLS
