/* qv-scan-potential.h — a potential V(Q) along one mass-weighted normal
 * coordinate (or V(Q1, Q2) on a grid of two) from the energies of a scan,
 * as a least-squares polynomial or a natural cubic spline (bicubic on a
 * grid), never evaluated outside the scanned range; and the vibrational
 * levels on it from the sinc DVR (qv-dvr.h): levels, fundamental and
 * overtone, the harmonic value from the curvature at the minimum, the
 * anharmonicity constant, ⟨Q⟩ and turning points, double wells.
 *
 * Q in u^½ Å, energies in eV throughout.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-dvr.h"

G_BEGIN_DECLS

typedef enum {
  QV_SCAN_FIT_POLYNOMIAL,  /* least squares in Chebyshev polynomials of the
                              scaled coordinate; in 2-D of total degree ≤ d */
  QV_SCAN_FIT_SPLINE,      /* natural cubic spline through every point
                              (2-D: tensor product, bicubic) */
} QvScanFit;

/* Highest polynomial degree accepted. */
#define QV_SCAN_MAX_DEGREE 16
/* Wavefunction weight within this fraction of the range from an edge above
 * which a level is flagged. */
#define QV_SCAN_EDGE_FRACTION 0.05
#define QV_SCAN_EDGE_WEIGHT_LIMIT 1e-4

typedef struct _QvScanPotential QvScanPotential;

/* The default polynomial degree for @n_points points (1-D) or an n0 × n1
 * grid (2-D): leaves at least one degree of freedom for the residual. */
guint qv_scan_default_degree (guint dim, const gsize n[]);

/* 1-D: @n points (Q ascending or not, all distinct) with energies @V.
 * @degree is used for QV_SCAN_FIT_POLYNOMIAL (0 = the default).
 * QV_ERROR_INPUT for fewer than 3 points, repeated Q, non-finite values;
 * QV_ERROR_USAGE for a degree the points cannot determine. */
QvScanPotential *qv_scan_potential_new_1d (const double *Q, const double *V, gsize n,
                                           QvScanFit fit, guint degree, GError **error);
/* 2-D: axes @Q0 (n0 values, ascending) and @Q1 (n1, ascending), @V at
 * (Q0[i], Q1[j]) in V[i + n0·j]. */
QvScanPotential *qv_scan_potential_new_2d (const double *Q0, gsize n0, const double *Q1,
                                           gsize n1, const double *V, QvScanFit fit,
                                           guint degree, GError **error);
void qv_scan_potential_free (QvScanPotential *potential);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvScanPotential, qv_scan_potential_free)

guint qv_scan_potential_dim (const QvScanPotential *potential);
QvScanFit qv_scan_potential_fit (const QvScanPotential *potential);
guint qv_scan_potential_degree (const QvScanPotential *potential);
/* The scanned range of @axis. */
void qv_scan_potential_range (const QvScanPotential *potential, guint axis, double *lo,
                              double *hi);
/* The fit's residual at the points, rms and largest magnitude (0 for a
 * spline, which goes through them). */
void qv_scan_potential_residual (const QvScanPotential *potential, double *rms, double *max);
/* The highest and lowest energy among the points. */
double qv_scan_potential_highest_point (const QvScanPotential *potential);
double qv_scan_potential_lowest_point (const QvScanPotential *potential);
/* V at @x (dim values), clamped into the scanned range: the potential is
 * never extrapolated. */
double qv_scan_potential_eval (const QvScanPotential *potential, const double *x);

typedef struct {
  double energy;           /* above the potential's minimum */
  double mean[2];          /* ⟨Q⟩ per axis */
  double turning[2];       /* 1-D: outermost classical turning points, NAN
                              where V stays below E up to the scan's end */
  double edge_weight;      /* qv_dvr_levels_edge_weight, QV_SCAN_EDGE_FRACTION */
  gboolean above_scan;     /* above the highest scanned energy */
} QvScanLevel;

typedef struct {
  double Q[2];
  double energy;           /* above the global minimum */
} QvScanMinimum;

typedef struct {
  guint dim;
  double v_min;            /* the interpolant's global minimum, absolute */
  double q_min[2];
  gboolean minimum_inside; /* FALSE when the lowest V is at the scan's edge */
  double curvature[2];     /* eigenvalues of V'' at the minimum, eV/(u Å²),
                              ascending (1-D: [0]) */
  double harmonic[2];      /* the same as signed wavenumbers, cm⁻¹ */
  gsize n_levels;
  QvScanLevel *levels;
  /* 1-D: E1 − E0, E2 − E0, and from E_v = ω_e(v+½) − ω_e x_e (v+½)²
   * through the lowest three levels: ω_e x_e = (2ν01 − ν02)/2,
   * ω_e = ν01 + 2 ω_e x_e. eV; NAN with fewer levels. */
  double fundamental, overtone, omega_e, omega_e_x_e;
  /* 2-D: the two levels with the largest Σ_axis ⟨ψ_k|Q_axis|ψ_0⟩² (the
   * one-quantum states), by energy: their index, E_k − E_0 (eV), and the
   * axis whose matrix element dominates. */
  gsize fundamental_level[2];
  double fundamentals[2];
  guint fundamental_axis[2];
  /* 1-D minima of the interpolant (more than one: a multiple well), by Q;
   * barrier: the highest V between the two lowest, above the global
   * minimum; splitting E1 − E0 (eV). */
  GArray *minima;          /* QvScanMinimum */
  double barrier;
  double splitting;
  QvDvrRefinement *refinement;
} QvScanLevels;

void qv_scan_levels_free (QvScanLevels *levels);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvScanLevels, qv_scan_levels_free)

/* The lowest @n_levels (≥ 3) on @potential, DVR grids refined until the
 * levels move less than @tolerance eV (≤ 0: 1e-6 cm⁻¹); @max_points per
 * axis, 0 for the default of qv_dvr_refine_options_init. */
QvScanLevels *qv_scan_potential_solve (const QvScanPotential *potential, gsize n_levels,
                                       double tolerance, gsize max_points, GError **error);

/* Energy unit: 1 cm⁻¹ in eV (h·c·100/e, CODATA 2018). */
double qv_scan_ev_per_wavenumber (void);

G_END_DECLS
