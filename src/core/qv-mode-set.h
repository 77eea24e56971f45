/* qv-mode-set.h — the normal modes of one structure and their diagnostics.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-structure.h"

G_BEGIN_DECLS

typedef enum {
  QV_PROJECTION_FULL,          /* 3 translations + rotations about the COM */
  QV_PROJECTION_TRANSLATIONS,  /* slabs, Γ-point supercells */
  QV_PROJECTION_NONE,
} QvProjection;

const char *qv_projection_name (QvProjection projection);
gboolean qv_projection_parse (const char *text, QvProjection *projection, GError **error);

typedef struct {
  gsize n_atoms;
  gsize n_modes;               /* columns of @vectors */
  gsize n_vibrations;          /* 3N − rank of the rigid-body space */
  double *masses;              /* n_atoms, u, the masses used */
  double *eigenvalues;         /* n_modes, eV/(Å² u), ascending */
  double *vectors;             /* 3N × n_modes, column-major, mass-weighted,
                                  orthonormal, canonical signs and bases */
  QvProjection projection;
  gboolean linear;             /* rotation rank 2 */
  guint n_translations;
  guint n_rotations;
  double translation_residuals[3];  /* signed wavenumbers, cm⁻¹ */
  double rotation_residuals[3];
  gboolean has_hessian;        /* FALSE for a precomputed mode set */
  double asymmetry;            /* max|H_ij − H_ji| / max|H| */
  gboolean has_gradient;
  double gradient_norm;        /* eV/Å, from the structure's forces */
  gboolean lowest_only;        /* only the lowest n_modes were solved */
  const char *eigensolver;     /* static: "dsyevd", "dsyevr", "lanczos", or
                                  NULL for precomputed modes */
  double max_force;            /* eV/Å, largest atomic force (has_gradient) */
  double *rigid_mixing;        /* 2 × n_modes: [translation, rotation] weight
                                  of rigid-body motion the projection removed
                                  from each mode (qv_rigid_body_mixing), or
                                  NULL (no Hessian, or no projection) */
} QvModeSet;

/* Takes ownership of @eigenvalues and @vectors (g_malloc'd). */
QvModeSet *qv_mode_set_new (gsize n_atoms, const double *masses, gsize n_modes,
                            double *eigenvalues, double *vectors);
/* A mode set from wavenumbers (cm⁻¹, negative = imaginary) and Cartesian
 * displacement vectors (3N each, any normalisation) for users who have modes
 * but no Hessian. The vectors are mass-weighted and normalised; fails with
 * QV_ERROR_INPUT for zero vectors or non-finite values. */
QvModeSet *qv_mode_set_new_from_cartesian (const QvStructure *structure, gsize n_modes,
                                           const double *wavenumbers,
                                           const double *displacements,
                                           GError **error);
void qv_mode_set_free (QvModeSet *modes);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvModeSet, qv_mode_set_free)

/* Column k of the mass-weighted vectors (3N doubles). */
const double *qv_mode_set_vector (const QvModeSet *modes, gsize k);
/* Signed wavenumber in cm⁻¹ (negative: imaginary). */
double qv_mode_set_wavenumber (const QvModeSet *modes, gsize k);
gboolean qv_mode_set_is_imaginary (const QvModeSet *modes, gsize k);
/* Cartesian displacement d_a = l_a/√m_a for unit Q (Å per u^½ Å); @out 3N. */
void qv_mode_set_cartesian (const QvModeSet *modes, gsize k, double *out);
/* μ = 1/Σ(l²/m) in u. */
double qv_mode_set_reduced_mass (const QvModeSet *modes, gsize k);
/* k = μω² in mdyn/Å (negative for imaginary modes). */
double qv_mode_set_force_constant (const QvModeSet *modes, gsize k);
/* p_a = |l_a|², n_atoms values that sum to 1; @out n_atoms. */
void qv_mode_set_participation (const QvModeSet *modes, gsize k, double *out);
/* exp(−Σ p ln p)/N, in (0, 1]. */
double qv_mode_set_collectivity (const QvModeSet *modes, gsize k);
/* |Q·l_a|/√m_a of one atom (0-based), Å. */
double qv_mode_set_atom_displacement (const QvModeSet *modes, gsize k, gsize atom, double q);
/* Largest |Q·l_a|/√m_a over atoms for a given Q; returns Å, atom in @atom
 * (0-based). */
double qv_mode_set_max_displacement (const QvModeSet *modes, gsize k, double q,
                                     gsize *atom);

typedef struct {
  guint v;
  gboolean defined;            /* FALSE for imaginary or zero modes */
  double q;                    /* u^½ Å */
  double max_displacement;     /* Å */
  gsize max_atom;              /* 0-based */
  double energy;               /* E_v, eV */
} QvTurningPoint;

void qv_mode_set_turning_point (const QvModeSet *modes, gsize k, guint v,
                                QvTurningPoint *tp);

/* Largest atomic displacement (Å) used to show a mode that has no turning
 * point (imaginary or zero): visible, yet small against bond lengths
 * (common practice for viewing such modes). */
#define QV_DISPLAY_FALLBACK_DISPLACEMENT 0.25

/* The Q (u^½ Å) that shows mode k at @multiple times its classical turning
 * point at level @v; for a mode without one, the Q whose largest atomic
 * displacement is @multiple × QV_DISPLAY_FALLBACK_DISPLACEMENT. Sets
 * @from_turning_point to say which (may be NULL). */
double qv_mode_set_display_amplitude (const QvModeSet *modes, gsize k, guint v,
                                      double multiple, gboolean *from_turning_point);

typedef struct {
  double temperature;          /* K */
  gboolean defined;
  double q_rms;                /* √⟨Q²⟩, u^½ Å */
  double max_rms_displacement; /* Å, largest atomic RMS displacement */
  gsize max_atom;
} QvThermalAmplitude;

void qv_mode_set_thermal (const QvModeSet *modes, gsize k, double temperature,
                          QvThermalAmplitude *th);

/* The largest absolute rigid-body residual (cm⁻¹) over translations and
 * rotations. */
double qv_mode_set_max_residual (const QvModeSet *modes);

/* Rigid-body residuals above this (cm⁻¹) mean the geometry or the Hessian
 * is not converged (common practice: a few cm⁻¹ is normal). */
#define QV_RESIDUAL_WARNING 10.0
/* Relative Hessian asymmetry above this is worth a warning (common
 * practice for finite-difference Hessians, which reach ~1e-4). */
#define QV_ASYMMETRY_WARNING 1e-3
/* A largest atomic force above this (eV/Å) means the geometry is not a
 * converged stationary point (common practice: optimisers stop near
 * 0.01–0.05 eV/Å). */
#define QV_FORCE_WARNING 0.025
/* A mode with more rotational or translational mixing than this is flagged. */
#define QV_MIXING_WARNING 0.01

/* Warnings a user should see beside the table, each one line with what it
 * means (NULL-terminated; empty when there is nothing to say). */
char **qv_mode_set_warnings (const QvModeSet *modes);
/* Rigid-body mixing of mode k: translation and rotation weights in [0, 1];
 * FALSE when the mode set has none. */
gboolean qv_mode_set_rigid_mixing (const QvModeSet *modes, gsize k,
                                   double *translation, double *rotation);
/* Number of imaginary modes. */
gsize qv_mode_set_count_imaginary (const QvModeSet *modes);

G_END_DECLS
