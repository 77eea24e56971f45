/* qv-ensemble.h — thermal ensembles by harmonic Wigner sampling.
 *
 * At temperature T the Wigner distribution of a harmonic mode of angular
 * frequency ω is a product of two independent Gaussians in the mass-weighted
 * normal coordinate Q and its momentum P (Wigner, Phys. Rev. 40, 749, 1932):
 *   ⟨Q²⟩ = ħ/(2ω)·coth(ħω/2k_BT),   ⟨P²⟩ = ω²⟨Q²⟩ = (ħω/2)·coth(ħω/2k_BT).
 * Sample s draws (Q_k, P_k) for every sampled mode k and builds
 *   r_a = r0_a + Σ_k Q_k l_ak/√m_a   (Å),
 *   v_a =        Σ_k P_k l_ak/√m_a   (Å/fs),
 * with l_k the mass-weighted unit eigenvectors. Imaginary modes are always
 * left out; so are modes with zero eigenvalue, rigid-body modes and (on
 * request) real modes below a cut-off wavenumber.
 *
 * Reproducible: sample s uses stream s of the seed (qv-random.h), so it is
 * the same whatever N is, and its draws are the same numbers on every
 * machine; the coordinates then agree to the rounding of the mode vectors
 * and of the matrix product (BLAS), far below the digits written.
 *
 * Rigid-body motion: for a projected mode set the mode vectors are
 * orthogonal to the rigid-body space at r0, so the centre of mass does not
 * move and the total linear momentum and the angular momentum about r0 vanish
 * (Eckart, Phys. Rev. 47, 552, 1935). At the sampled geometry r the angular
 * momentum Σ m_a (r_a − c) × v_a is of second order, not zero; every sample
 * is therefore corrected explicitly: the centre of mass of r is put back at
 * that of r0, the total linear momentum is removed, and (non-periodic
 * structures) the angular momentum about the sample's centre of mass is
 * removed with the sample's inertia tensor, v_a −= ω × (r_a − c), I ω = L.
 * Principal moments below QV_ENSEMBLE_INERTIA_FLOOR × the largest (the axis
 * of a linear molecule) are left alone: removing the vibrational angular
 * momentum of degenerate bends about them would rewrite the bending
 * velocities. The same corrections make mode sets with no projection usable:
 * their rigid-body modes (more than half their weight in the rigid-body
 * space) are not sampled and any remaining admixture is removed per sample.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-mode-set.h"
#include "qv-progress.h"
#include "qv-structure.h"

G_BEGIN_DECLS

/* Principal moments of inertia below this fraction of the largest are not
 * used to remove angular momentum (see above). */
#define QV_ENSEMBLE_INERTIA_FLOOR 1e-2

typedef enum {
  QV_ENSEMBLE_MODE_SAMPLED,
  QV_ENSEMBLE_MODE_IMAGINARY,     /* λ < 0: no thermal distribution */
  QV_ENSEMBLE_MODE_ZERO,          /* λ = 0 */
  QV_ENSEMBLE_MODE_BELOW_CUTOFF,  /* real, below the cut-off wavenumber */
  QV_ENSEMBLE_MODE_RIGID_BODY,    /* mostly translation/rotation (unprojected) */
} QvEnsembleModeStatus;

/* "sampled", "imaginary", "zero", "below-cutoff", "rigid-body". */
const char *qv_ensemble_mode_status_name (QvEnsembleModeStatus status);

typedef struct {
  double temperature;          /* K, ≥ 0 (0: zero-point distribution) */
  guint64 seed;
  double min_wavenumber;       /* cm⁻¹; real modes below it are left out
                                  (0: none left out) */
} QvEnsembleOptions;

void qv_ensemble_options_init (QvEnsembleOptions *options);

/* A sampling plan: which modes, with which spreads. Read-only once made, so
 * any number of threads may call qv_ensemble_generate on it at once.
 * Borrows @structure and @modes, which must outlive it. */
typedef struct {
  const QvStructure *structure;
  const QvModeSet *modes;
  QvEnsembleOptions options;
  gboolean periodic;           /* no angular-momentum removal */
  gsize n_sampled;
  QvEnsembleModeStatus *status; /* n_modes of @modes */
  double *sigma_q;             /* n_modes: √⟨Q²⟩ in u^½ Å (0 when not sampled) */
  double *sigma_p;             /* n_modes: √⟨P²⟩ in u^½ Å/fs (0 when not sampled) */
  double *rigid_weight;        /* n_modes: weight of each vector in the
                                  rigid-body space at r0, [0, 1] */
  /* internal */
  gsize first, last;           /* range of sampled modes (inclusive) */
} QvEnsemble;

/* Fails with QV_ERROR_USAGE for a bad option (negative or non-finite
 * temperature or cut-off) and QV_ERROR_INPUT when the mode set does not fit
 * the structure or leaves no mode to sample. */
QvEnsemble *qv_ensemble_new (const QvStructure *structure, const QvModeSet *modes,
                             const QvEnsembleOptions *options, GError **error);
void qv_ensemble_free (QvEnsemble *ensemble);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvEnsemble, qv_ensemble_free)

/* What the per-sample corrections did, as maxima over the samples made
 * (relative: |ΔP| / Σ m|v| and |ΔL| / Σ m|r − c||v|). */
typedef struct {
  gsize n_samples;
  double max_linear_removed;
  double max_angular_removed;
  double max_angular_left;     /* after removal: only the floor above keeps any */
} QvEnsembleStats;

/* The draws of sample @index: Q_k and P_k (u^½ Å, u^½ Å/fs) for every mode
 * of the mode set (0 for modes not sampled); @q and @p hold n_modes each.
 * Mode k in ascending order takes the next polar pair (z1, z2):
 * Q_k = σ_Q,k z1, P_k = σ_P,k z2. */
void qv_ensemble_draw (const QvEnsemble *ensemble, guint64 index, double *q, double *p);

/* Samples @first … @first + @count − 1 into @positions and @velocities
 * (count × 3N each, sample after sample, Å and Å/fs). @stats (may be NULL)
 * is updated, not reset. Progress is reported every block of samples;
 * cancelling leaves the buffers partly written and fails with
 * QV_ERROR_CANCELLED. */
gboolean qv_ensemble_generate (const QvEnsemble *ensemble, gsize first, gsize count,
                               double *positions, double *velocities,
                               QvEnsembleStats *stats, const QvProgress *progress,
                               GError **error);

/* One line per thing the user should know (imaginary modes left out, by
 * number and wavenumber; modes below the cut-off; rigid-body modes of an
 * unprojected set). NULL-terminated, possibly empty. */
char **qv_ensemble_warnings (const QvEnsemble *ensemble);

G_END_DECLS
