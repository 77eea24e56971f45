/* qv-rigid-body.h — the mass-weighted rigid-body space (Eckart conditions)
 * and its removal from a mass-weighted Hessian by a shifted rank-2r update.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-mode-set.h"

G_BEGIN_DECLS

typedef struct {
  gsize n;                     /* 3N */
  guint n_translations;        /* 0 or 3 */
  guint n_rotations;           /* 0..3, from the rank of the rotations */
  double *basis;               /* n × (n_translations + n_rotations),
                                  column-major, orthonormal */
  /* Kept by qv_rigid_body_project_with_residuals for qv_rigid_body_mixing:
   * KV of the unprojected K (n × r) and C = VᵀKV (r × r). */
  double *kv;
  double c[36];
} QvRigidBody;

/* Relative rank tolerance for the rotation block: a pivoted-QR diagonal
 * below this times the largest is dropped (linear molecules, single atoms). */
#define QV_RIGID_BODY_RANK_TOLERANCE 1e-6

QvRigidBody *qv_rigid_body_new (gsize n_atoms, const double *positions,
                                const double *masses, QvProjection projection);
void qv_rigid_body_free (QvRigidBody *rb);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvRigidBody, qv_rigid_body_free)

guint qv_rigid_body_rank (const QvRigidBody *rb);

/* Eigenvalues (eV/(Å² u), ascending) of VᵀKV over the translation block and
 * the rotation block, for the mass-weighted K (lower triangle read). */
void qv_rigid_body_residuals (const QvRigidBody *rb, const double *k,
                              double translations[3], double rotations[3]);

/* K ← K − VWᵀ − WVᵀ + σVVᵀ with W = KV − ½V(VᵀKV), one dsyr2k on the lower
 * triangle; equals PKP + σVVᵀ, P = I − VVᵀ. Returns σ, chosen above a
 * Gershgorin bound of K so the rigid-body vectors become the top eigenpairs. */
double qv_rigid_body_project (const QvRigidBody *rb, double *k);

/* Both of the above from one KV product (what the solver calls); keeps KV
 * and VᵀKV in @rb for qv_rigid_body_mixing. */
double qv_rigid_body_project_with_residuals (QvRigidBody *rb, double *k,
                                             double translations[3], double rotations[3]);

/* The same update for a solver that holds K in pieces (the distributed
 * solver): @kv is KV (n × r, column-major) of the whole K, @gershgorin
 * max_i Σ_j |K_ij|. Keeps KV and VᵀKV for qv_rigid_body_mixing, gives the
 * residuals, and turns @kv into W′ so that K − VW′ᵀ − W′Vᵀ = PKP + σVVᵀ
 * (the caller applies it to its pieces). Returns σ. */
double qv_rigid_body_prepare_update (QvRigidBody *rb, double *kv, double gershgorin,
                                     double translations[3], double rotations[3]);

/* How much rigid-body motion the projection removed from a mode: for the
 * mass-weighted mode vector @l (eigenvalue @lambda of the projected K) and
 * each rigid-body direction j of the eigenbasis of VᵀKV within its block
 * (eigenvalue μ_j), the unprojected K couples them by b_j = v_jᵀKl. The
 * two-level mixing weight ½(1 − |Δ|/√(Δ² + 4b_j²)), Δ = λ − μ_j, is what
 * an unprojected solve would put of v_j into the mode (first order: (b/Δ)²).
 * Returns the sums over translations and over rotations, each clamped to 1.
 * Needs qv_rigid_body_project_with_residuals to have run. */
void qv_rigid_body_mixing (const QvRigidBody *rb, const double *l, double lambda,
                           double *translations, double *rotations);

G_END_DECLS
