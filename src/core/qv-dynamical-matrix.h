/* qv-dynamical-matrix.h — D(q) of a crystal and its solution at any q.
 *
 * Convention (docs/methods.md, "Lattice modes"):
 *   D_{κα,κ'β}(q) = Σ_l Σ_images w · Φ_{κα,κ'β}(R_l) e^{iq·(R_l+T+τ_κ'−τ_κ)} / √(m_κ m_κ')
 * with the phase of the full atom-to-atom vector; an eigenvector e(q)
 * gives the displacement u_{lκ}(t) = Re[e_κ e^{i(q·(R_l+τ_κ)−ωt)}] /
 * √(N m_κ). q is given in fractional reciprocal coordinates: q = Σ f_i
 * b_i with a_i·b_j = 2π δ_ij (so f = (½, 0, 0) is half of b_1).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
/* double _Complex is the C99 type; <complex.h> (and its macro I) is left to
 * the files that compute with it. */
#include <glib.h>
#include "qv-force-constants.h"
#include "qv-progress.h"

G_BEGIN_DECLS

typedef struct {
  gsize n_q;
  gsize n_branches;               /* 3n */
  double *q;                      /* 3 n_q, fractional reciprocal */
  double *eigenvalues;            /* n_q × n_branches, eV/(Å² u), ascending per q */
  double *wavenumbers;            /* n_q × n_branches, cm⁻¹, negative = imaginary */
  double _Complex *eigenvectors;  /* NULL, or n_q × n_branches vectors of n_branches:
                                     vector b at q k is eigenvectors + (k·nb + b)·nb,
                                     component 3κ+α, unit norm, largest component
                                     real and positive */
} QvPhononSet;

void qv_phonon_set_free (QvPhononSet *set);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvPhononSet, qv_phonon_set_free)

/* Fills @d (nb × nb, column-major: element (r, c) at d[r + c·nb], r = 3κ+α)
 * with D(q) in eV/(Å² u), made exactly Hermitian. @q fractional. */
void qv_dynamical_matrix_build (const QvForceConstants *fc, const double q[3], double _Complex *d);

/* An optional term added to D(q) after the force-constant part and before
 * D is made exactly Hermitian (@d as above, eV/(Å² u)); the non-analytic
 * correction of polar crystals (qv-nonanalytic.h) is one. It is called
 * from the solver's worker threads, so it must only read @data. */
typedef void (*QvDynamicalTerm) (const double q[3], double _Complex *d, gpointer data);

/* qv_dynamical_matrix_build with @term (may be NULL: the same as build). */
void qv_dynamical_matrix_build_with (const QvForceConstants *fc, QvDynamicalTerm term,
                                     gpointer data, const double q[3], double _Complex *d);

/* Cartesian q (Å⁻¹, with the 2π) of the fractional @q for @cell (rows). */
void qv_dynamical_matrix_cartesian_q (const double cell[3][3], const double q[3], double out[3]);

/* Solves D(q) with LAPACKE_zheevd at the @n_q fractional points @q (3 n_q),
 * over @n_threads workers of a GThreadPool (0: one per processor). Inside
 * the workers OpenBLAS must run one thread: when the library is OpenBLAS,
 * openblas_set_num_threads (1) is called once before the pool starts (it
 * is a process-wide setting, not safe to change while other threads run
 * BLAS) — the value is left at 1 afterwards. @progress is called from the
 * calling thread; cancelling fails with QV_ERROR_CANCELLED. */
QvPhononSet *qv_dynamical_matrix_solve (const QvForceConstants *fc, const double *q, gsize n_q,
                                        gboolean want_vectors, guint n_threads,
                                        const QvProgress *progress, GError **error);

/* qv_dynamical_matrix_solve with @term added to every D(q) (NULL: the
 * same as solve). */
QvPhononSet *qv_dynamical_matrix_solve_with (const QvForceConstants *fc, QvDynamicalTerm term,
                                             gpointer data, const double *q, gsize n_q,
                                             gboolean want_vectors, guint n_threads,
                                             const QvProgress *progress, GError **error);

G_END_DECLS
