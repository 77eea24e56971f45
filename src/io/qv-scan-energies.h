/* qv-scan-energies.h — a scan (or a two-mode grid) that `quaver displace`
 * wrote, with the energies that came back for its structures: the manifest
 * says which mode(s) and which Q each structure has; the energies are the
 * energy= of each extended XYZ file (whose positions are checked against
 * the scan's line or plane) or the lines of a NAME ENERGY file
 * (qv-energy-file.h). Every structure needs exactly one finite energy;
 * errors name the file and line. From the points, V(Q) (qv-scan-potential.h).
 * `quaver anharmonic` and the app's anharmonic window read scans here.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-energy-file.h"
#include "qv-manifest.h"
#include "qv-scan-potential.h"

G_BEGIN_DECLS

/* Default largest distance (Å) of an atom from the straight line (plane for
 * a grid) the scan moves it along: above the rounding of codes that print
 * 6 decimals, far below any step of a scan. */
#define QV_SCAN_GEOMETRY_TOLERANCE 1e-4

typedef struct {
  const char *energies;        /* a NAME ENERGY file, or NULL: energy= of each XYZ */
  gboolean unit_given;         /* @unit was stated (required with @energies;
                                  without, energy= is in eV) */
  QvEnergyUnit unit;
  double geometry_tolerance;   /* Å, QV_SCAN_GEOMETRY_TOLERANCE by default */
} QvScanEnergiesOptions;

void qv_scan_energies_options_init (QvScanEnergiesOptions *options);

typedef struct {
  char *name;                  /* as an energy file names it (FILE, or FILE@K
                                  for frame K of a multi-frame file) */
  char *file;                  /* the manifest's file */
  guint frame;
  guint n_frames;              /* frames of its file */
  double Q[2];                 /* u^½ Å */
  double energy;               /* eV, absolute as given */
} QvScanPoint;

typedef struct {
  char *manifest_path;         /* the manifest.json read */
  QvManifest *manifest;
  guint dim;                   /* 1: a scan, 2: a grid */
  guint modes[2];              /* 1-based */
  double wavenumbers[2];       /* the manifest's harmonic values, cm⁻¹ */
  GArray *points;              /* QvScanPoint, in manifest order */
  char *source;                /* where the energies came from, for reports */
} QvScanEnergies;

void qv_scan_energies_free (QvScanEnergies *scan);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvScanEnergies, qv_scan_energies_free)

/* @manifest: manifest.json or its folder. QV_ERROR_INPUT "FILE:LINE: …"
 * for a manifest that is not a displace scan or grid, fewer than 3
 * structures, a missing structure file, a frame without energy= or with a
 * non-finite one, atoms in another order or off the scan's line by more
 * than the tolerance, and every error of qv_energy_file_read and
 * qv_energy_file_match; QV_ERROR_LIMIT when the geometry check does not
 * fit in memory. */
QvScanEnergies *qv_scan_energies_read (const char *manifest, const QvScanEnergiesOptions *options,
                                       GError **error);

/* TRUE when every structure file of the scan exists and carries energy= on
 * its comment lines (so no energy file is needed); reads only the comment
 * lines' keys through the XYZ reader. */
gboolean qv_scan_energies_have_xyz_energies (const char *manifest);

/* V(Q) through the points (1-D) or on the grid (2-D: every (Q1, Q2) pair
 * exactly once, else QV_ERROR_INPUT naming the manifest); @degree 0 is
 * the default of qv_scan_default_degree. */
QvScanPotential *qv_scan_energies_potential (const QvScanEnergies *scan, QvScanFit fit,
                                             guint degree, GError **error);

G_END_DECLS
