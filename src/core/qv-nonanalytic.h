/* qv-nonanalytic.h — the non-analytic term of D(q) near Γ in polar
 * crystals (LO–TO splitting) from Born effective charges and the
 * high-frequency dielectric tensor.
 *
 * Term (SI; Cochran & Cowley, J. Phys. Chem. Solids 23, 447, 1962; the
 * q → 0 limit of Gonze & Lee, Phys. Rev. B 55, 10355, 1997, eq. (60) in
 * its Gaussian-unit form 4π/Ω — both from memory):
 *   D^NA_{κα,κ'β}(q̂) = e² (q̂·Z_κ)_α (q̂·Z_κ')_β / (ε0 Ω q̂·ε∞·q̂ √(m_κ m_κ'))
 * with (q̂·Z_κ)_α = Σ_γ q̂_γ Z_{κ,γα}: the first index of Z* is the field
 * (or polarisation) direction, the second the displacement, Z_{κ,γα} =
 * Ω/e ∂P_γ/∂u_κα = (1/e) ∂F_κα/∂E_γ. Away from Γ it is spread over the
 * supercell as the interpolation of Wang et al., J. Phys.: Condens. Matter
 * 22, 202201 (2010) (from memory): a constant force constant D^NA(q̂)/N_c
 * added to every lattice vector of the supercell, summed with the same
 * Wigner–Seitz images and phases as Φ, so that the term is D^NA(q̂) at
 * q → 0 and vanishes at the other q commensurate with the supercell.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once

#include <complex.h>
#include <glib.h>
#include "qv-force-constants.h"

G_BEGIN_DECLS

/* e²/ε0 in eV·Å (CODATA 2018: e = 1.602176634e-19 C, ε0 = 8.8541878128e-12 F/m). */
#define QV_E2_OVER_EPSILON0_EV_A (1.602176634e-19 / 8.8541878128e-12 * 1e10)

typedef struct _QvNonAnalytic QvNonAnalytic;

/* @born: 9n values, Z*_κ as a row-major 3×3 [γ field][α displacement] per
 * site in the order of the force constants' sites, units of e; @epsilon:
 * ε∞ (relative, dimensionless), symmetric positive definite. The charges
 * are made neutral (Σ_κ Z*_κ = 0) by subtracting their mean, common
 * practice; the largest element removed is qv_nonanalytic_neutrality.
 * QV_ERROR_INPUT for a non-finite value, an asymmetric (10⁻⁶ relative) or
 * not positive definite ε∞, or a site count that differs from @fc's. */
QvNonAnalytic *qv_nonanalytic_new (const QvForceConstants *fc, gsize n_sites,
                                   const double *born, const double epsilon[3][3],
                                   GError **error);
void qv_nonanalytic_free (QvNonAnalytic *na);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvNonAnalytic, qv_nonanalytic_free)

/* max |Σ_κ Z*_κ| element removed by the neutrality correction, e. */
double qv_nonanalytic_neutrality (const QvNonAnalytic *na);

/* The direction (Cartesian, any length > 0) along which Γ itself is
 * approached; until one is set, D(Γ) gets no term (the TO-only Γ). */
gboolean qv_nonanalytic_set_gamma_direction (QvNonAnalytic *na, const double direction[3],
                                             GError **error);

/* Adds the term at fractional @q (qv-dynamical-matrix.h conventions) to
 * @d (3n × 3n, column-major, eV/(Å² u)). Thread-safe (reads @na only);
 * usable as a QvDynamicalTerm with @na as its data. */
void qv_nonanalytic_add (const double q[3], double _Complex *d, gpointer na);

G_END_DECLS
