/* qv-intensity.h — IR intensities and Raman activities of normal modes in
 * the double-harmonic approximation, from atomic polar tensors (dipole
 * derivatives) and polarisability derivatives (docs/methods.md,
 * "Intensities and spectra").
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-mode-set.h"

G_BEGIN_DECLS

/* Rows of the polarisability derivatives, in this order. */
typedef enum {
  QV_ALPHA_XX, QV_ALPHA_YY, QV_ALPHA_ZZ, QV_ALPHA_XY, QV_ALPHA_XZ, QV_ALPHA_YZ,
  QV_ALPHA_N_COMPONENTS
} QvAlphaComponent;

/* The derivative tensors of one structure, in the core's units. Rows are
 * stored one after another (row-major), 3N columns each, column j = 3a + c
 * for atom a (0-based) and Cartesian direction c. */
typedef struct {
  gsize n_atoms;
  double *dipole;              /* 3 × 3N: ∂μ_i/∂x_j in e (e·Å/Å), or NULL */
  double *polarizability;      /* 6 × 3N: ∂α_ab/∂x_j in Å² (volume
                                  polarisability Å³ per Å), rows
                                  xx, yy, zz, xy, xz, yz; or NULL */
  double polarizability_asymmetry;  /* 9-row input: max|∂α_ab − ∂α_ba| /
                                       max|∂α|, else 0 */
} QvDerivatives;

QvDerivatives *qv_derivatives_new (gsize n_atoms);
void qv_derivatives_free (QvDerivatives *derivatives);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvDerivatives, qv_derivatives_free)

/* Sets the dipole derivatives from 3 rows of 3N values in a unit whose
 * factor to e is @factor (copied). */
void qv_derivatives_set_dipole (QvDerivatives *derivatives, const double *rows, double factor);
/* Sets the polarisability derivatives from @n_rows (6: xx, yy, zz, xy, xz,
 * yz; or 9: xx, xy, xz, yx, yy, yz, zx, zy, zz) rows of 3N values in a unit
 * whose factor to Å² is @factor. Nine rows are symmetrised (ab and ba
 * averaged; the asymmetry is kept). FALSE for another row count. */
gboolean qv_derivatives_set_polarizability (QvDerivatives *derivatives, gsize n_rows,
                                            const double *rows, double factor);

/* Units of dipole derivatives: "e" (= "e*A/A" = "e*bohr/bohr" = "au", a
 * charge), "D/A", "D/bohr". Sets the factor to e; QV_ERROR_USAGE with the
 * accepted list otherwise. */
gboolean qv_dipole_derivative_unit_parse (const char *text, double *factor, GError **error);
/* Units of polarisability derivatives (volume polarisability per length):
 * "A^2" (Å³/Å; "A^3/A" too), "bohr^2" (a₀³/a₀, the atomic unit; "au" too). */
gboolean qv_polarizability_derivative_unit_parse (const char *text, double *factor,
                                                  GError **error);
const char *qv_dipole_derivative_unit_list (void);
const char *qv_polarizability_derivative_unit_list (void);

/* 1 e²/u of |∂μ/∂Q|² as an IR intensity in km/mol: N_A/(12 ε₀ c²) · e²/u
 * (≈ 974.88). */
double qv_intensity_ir_km_mol_per_e2_u (void);
/* 1 (D/Å)²/u in km/mol (≈ 42.2561, REFERENCES.md). */
double qv_intensity_ir_km_mol_per_d2_a2_u (void);

/* Raman conditions: laser line and temperature. */
typedef struct {
  double laser;                /* ν̃₀, cm⁻¹ (> 0) */
  double temperature;          /* K (0: no thermal population) */
} QvRamanConditions;

/* 532 nm as a wavenumber (common practice for a visible laser line). */
#define QV_RAMAN_DEFAULT_LASER (1e7 / 532.0)

typedef struct {
  double wavenumber;           /* cm⁻¹, signed (negative: imaginary), unscaled */
  gboolean defined;            /* FALSE for imaginary modes: no intensity */
  double dmu_dq[3];            /* ∂μ/∂Q, e/u^½ (with dipole derivatives) */
  double ir;                   /* km/mol */
  double alpha_mean;           /* α' = (α'_xx + α'_yy + α'_zz)/3, Å²/u^½ */
  double gamma2;               /* γ'², Å⁴/u */
  double raman_activity;       /* S = 45 α'² + 7 γ'², Å⁴/u */
  gboolean raman_defined;      /* a Stokes line exists: 0 < ν̃ < ν̃₀ */
  double raman_intensity;      /* dσ/dΩ, 10⁻³⁰ cm²/sr (see qv_intensity_raman_cross_section) */
} QvModeIntensity;

typedef struct {
  gsize n_modes;
  gboolean has_ir;
  gboolean has_raman;
  QvRamanConditions raman;
  double scale;                /* wavenumber scale used for the Raman intensities */
  QvModeIntensity *modes;      /* n_modes */
  gsize n_imaginary;           /* modes left without intensity */
} QvIntensities;

/* The intensities of every mode of @modes. @raman may be NULL (defaults:
 * QV_RAMAN_DEFAULT_LASER, 298.15 K). Raman intensities use the wavenumber
 * times @scale (the line's position; 1 for none). QV_ERROR_INPUT when the
 * tensors are for another number of atoms, or none is given. */
QvIntensities *qv_intensities_compute (const QvModeSet *modes, const QvDerivatives *derivatives,
                                       const QvRamanConditions *raman, double scale,
                                       GError **error);
void qv_intensities_free (QvIntensities *intensities);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvIntensities, qv_intensities_free)

/* The differential Raman cross-section of a Stokes line (Polavarapu, J.
 * Phys. Chem. 94, 8106, 1990; Long, The Raman Effect, Wiley, 2002):
 *   dσ/dΩ = (2π)⁴/45 · (ν̃₀ − ν̃)⁴ · h/(8π² c ν̃) · S / (1 − exp(−hcν̃/kT))
 * for 90° scattering of linearly polarised light (polarisation normal to
 * the scattering plane), both scattered polarisations collected; in
 * 10⁻³⁰ cm²/sr for ν̃, ν̃₀ in cm⁻¹ and S in Å⁴/u. NaN unless 0 < ν̃ < ν̃₀. */
double qv_intensity_raman_cross_section (double activity, double wavenumber, double laser,
                                         double temperature);

G_END_DECLS
