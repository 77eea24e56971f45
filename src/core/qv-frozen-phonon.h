/* qv-frozen-phonon.h — a supercell displaced along one lattice mode at a
 * wave vector commensurate with it (a frozen phonon).
 *
 * Convention (docs/methods.md, "Lattice modes"; the one of D(q)): supercell
 * atom (l, κ) at R_l + τ_κ is displaced by
 *   u_lκ = Re[ A e^{iφ} e_κ(q) e^{iq·(R_l+τ_κ)} ] / √(N m_κ)
 * with e(q) the unit eigenvector of D(q) as qv_dynamical_matrix_solve
 * returns it (largest component real and positive), N the number of
 * primitive cells in the supercell, m_κ in u, A in √u·Å. The pattern is
 * real, so for q ≢ −q it holds q and −q together: started with zero
 * velocities it moves as a standing wave of the two, not as the running
 * wave at q alone.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once

#include <complex.h>
#include <glib.h>
#include "qv-crystal.h"
#include "qv-dynamical-matrix.h"
#include "qv-force-constants.h"
#include "qv-structure.h"
#include "qv-supercell.h"

G_BEGIN_DECLS

typedef enum {
  QV_FROZEN_LARGEST,   /* amplitude = the largest atomic displacement |u|, Å */
  QV_FROZEN_Q,         /* amplitude = A, √u·Å */
} QvFrozenAmplitude;

typedef struct {
  double q[3];                  /* fractional reciprocal, without 2π */
  gsize branch;                 /* 0-based, ascending order at q */
  double amplitude;             /* > 0, in @unit */
  QvFrozenAmplitude unit;
  double phase;                 /* φ, radians */
} QvFrozenRequest;

typedef struct {
  double q[3];
  gsize branch;
  double wavenumber;            /* cm⁻¹, negative = imaginary */
  double eigenvalue;            /* ω², eV/(Å² u) */
  double a;                     /* A, √u·Å */
  double largest;               /* the largest |u_lκ|, Å */
  double phase;                 /* φ, radians */
  gboolean standing;            /* q ≢ −q: the pattern holds ±q (see above) */
  gboolean degenerate;          /* another branch within 10⁻⁶ relative of ω²:
                                   the eigenvector is one choice in the subspace */
  gsize n_atoms;
  double _Complex *vector;      /* 3n: e(q) used */
  double *displacements;        /* 3 n_atoms, Å, in the supercell's atom order */
  QvStructure *structure;       /* the displaced supercell */
} QvFrozenPhonon;

void qv_frozen_phonon_free (QvFrozenPhonon *fp);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvFrozenPhonon, qv_frozen_phonon_free)

/* TRUE when e^{iq·A_i} = 1 for the supercell vectors A = M a, that is
 * when M f is integer (within 10⁻⁸); otherwise QV_ERROR_USAGE naming q,
 * M f and the supercell. */
gboolean qv_frozen_phonon_commensurate (const int matrix[3][3], const double q[3],
                                        GError **error);

/* TRUE when q ≡ −q modulo the reciprocal lattice (2f integer). */
gboolean qv_frozen_phonon_q_is_real (const double q[3]);

/* The frozen phonon of @request in @supercell, whose atoms @map matches
 * to @fc's primitive sites. Errors (QV_ERROR_USAGE): q not commensurate,
 * branch out of range, amplitude not positive and finite. */
QvFrozenPhonon *qv_frozen_phonon_new (const QvForceConstants *fc, const QvSupercellMap *map,
                                      const QvStructure *supercell,
                                      const QvFrozenRequest *request, GError **error);

/* qv_frozen_phonon_new with @term and @data added to D(q) (the LO–TO term
 * of a polar crystal, qv-nonanalytic.h; NULL: the same as _new). */
QvFrozenPhonon *qv_frozen_phonon_new_with (const QvForceConstants *fc, QvDynamicalTerm term,
                                           gpointer data, const QvSupercellMap *map,
                                           const QvStructure *supercell,
                                           const QvFrozenRequest *request, GError **error);

/* The smallest diagonal supercell (in primitive vectors) commensurate with
 * fractional @q, at most @max cells along each vector: n_i the least
 * positive integer with n_i q_i integer (within 10⁻⁸). QV_ERROR_USAGE
 * naming q otherwise. */
gboolean qv_frozen_phonon_diagonal_supercell (const double q[3], int max, int matrix[3][3],
                                              GError **error);

/* The frozen phonon of @request in @crystal (with its LO–TO term, if any):
 * in @supercell, the structure the crystal's map was made from (its atoms
 * in that order), when q is commensurate with it; otherwise in the
 * smallest diagonal supercell of at most @max cells along each vector
 * (qv_frozen_phonon_diagonal_supercell; atoms in qv_supercell_build's
 * order). @matrix (may be NULL) receives the supercell used, in primitive
 * vectors. Errors: QV_ERROR_USAGE as qv_frozen_phonon_new_with and
 * qv_frozen_phonon_diagonal_supercell; @crystal without force constants. */
QvFrozenPhonon *qv_frozen_phonon_new_in_crystal (const QvCrystal *crystal,
                                                 const QvStructure *supercell,
                                                 const QvFrozenRequest *request, int max,
                                                 int matrix[3][3], GError **error);

/* The complex amplitude z = A e^{iφ} of a displacement field @u (3 n_atoms,
 * Å) along the unit vector @e (3n) at q ≢ −q:
 *   z = (2/N) Σ_{lκ} √(N m_κ) e_κ*·u_lκ e^{−iq·(R_l+τ_κ)},
 * exact for a pattern of the form above (the −q part sums to zero). */
double _Complex qv_frozen_phonon_project (const QvSupercellMap *map, const double cell[3][3],
                                          const double q[3], const double _Complex *e,
                                          const double *u);

G_END_DECLS
