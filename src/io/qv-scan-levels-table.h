/* qv-scan-levels-table.h — the vibrational levels on a scan's potential
 * (qv-scan-potential.h) as `quaver anharmonic` prints them and the app's
 * anharmonic window saves them: text (a # header, the level table, the
 * fundamental and overtone, the DVR grids, warnings and notes), CSV (the
 * level table) and JSON (all of it, with units); energies in cm⁻¹, Q in
 * u^½ Å. The warnings (a level above the scan, weight at the edge, a grid
 * that did not converge, a minimum at the scan's end, a multiple well, a
 * poor fit) and the notes (the torsion caveat, no extrapolation) are
 * collected here once for both front ends.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-scan-energies.h"
#include "qv-scan-potential.h"

G_BEGIN_DECLS

typedef enum {
  QV_SCAN_LEVELS_TABLE_TEXT,
  QV_SCAN_LEVELS_TABLE_CSV,
  QV_SCAN_LEVELS_TABLE_JSON,
} QvScanLevelsTableFormat;

typedef struct {
  const QvScanPotential *potential;   /* borrowed */
  const QvScanLevels *levels;         /* borrowed */
  guint dim;
  guint modes[2];
  double wavenumbers[2];              /* harmonic, from the manifest */
  guint n_points;
  const char *source;                 /* where the energies came from (borrowed) */
  GPtrArray *warnings;                /* char*, owned */
  GPtrArray *notes;                   /* char*, owned */
} QvScanLevelsReport;

/* Fills @report from @scan, @potential and @levels (all borrowed, they
 * must outlive it) and collects its warnings and notes. */
void qv_scan_levels_report_init (QvScanLevelsReport *report, const QvScanEnergies *scan,
                                 const QvScanPotential *potential, const QvScanLevels *levels);
void qv_scan_levels_report_clear (QvScanLevelsReport *report);

/* The output in @format, newly allocated. */
char *qv_scan_levels_table_write (const QvScanLevelsReport *report, QvScanLevelsTableFormat format);

/* eV → cm⁻¹ as the tables convert. */
double qv_scan_levels_wavenumber (double ev);

G_END_DECLS
