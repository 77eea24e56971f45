/* qv-solver.h — harmonic normal modes from a structure and its Hessian.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-hessian.h"
#include "qv-mode-set.h"
#include "qv-progress.h"
#include "qv-rigid-body.h"
#include "qv-structure.h"

G_BEGIN_DECLS

typedef enum {
  QV_LOWEST_AUTO,              /* Lanczos for large matrices, else LAPACK */
  QV_LOWEST_LAPACK,            /* dsyevr with an index range */
  QV_LOWEST_LANCZOS,           /* shift-invert block Lanczos (qv-lanczos.h),
                                  falling back to dsyevr if it cannot prove
                                  its result */
} QvLowestMethod;

const char *qv_lowest_method_name (QvLowestMethod method);
gboolean qv_lowest_method_parse (const char *text, QvLowestMethod *method, GError **error);

typedef struct {
  QvProjection projection;
  gsize lowest;                /* 0: all modes (dsyevd); k: lowest k (dsyevr) */
  double degeneracy_tolerance; /* relative to max|λ|; 0 picks the default */
  QvLowestMethod lowest_method;
} QvSolveOptions;

/* AUTO picks Lanczos from this dimension up (below it LAPACK is as fast). */
#define QV_LANCZOS_MIN_DIMENSION 1200

#define QV_SOLVE_DEFAULT_DEGENERACY 1e-6

void qv_solve_options_init (QvSolveOptions *options);

/* Largest n the all-modes solver takes: its workspace 1+6n+2n² must fit a
 * 32-bit lapack_int. */
gsize qv_solver_max_full_dimension (void);

/* Mass-weights in place: K_ij = H_ij / √(m_i m_j) (both triangles). */
void qv_solver_mass_weight (double *matrix, gsize n_atoms, const double *masses);

/* Solves in place: @hessian (eV/Å², any symmetry) is consumed — its memory
 * becomes the mode vectors — and freed. Peak memory: the matrix plus LAPACK
 * workspace. */
QvModeSet *qv_solve (const QvStructure *structure, QvHessian *hessian,
                     const QvSolveOptions *options, const QvProgress *progress,
                     GError **error);

/* The rigid-body space both solvers remove: checks that every mass is
 * positive (QV_ERROR_INPUT naming the atom), turns a full projection into
 * translations only for a periodic structure (@used), and builds the basis. */
QvRigidBody *qv_solver_rigid_body (const QvStructure *structure, const double *masses,
                                   QvProjection requested, QvProjection *used, GError **error);

/* What an eigensolver found, before it becomes a mode set. */
typedef struct {
  double *eigenvalues;         /* m_solved, ascending, eV/(Å² u) (taken) */
  double *vectors;             /* 3N × m_solved, column-major, mass weighted,
                                  orthonormal (taken) */
  gsize m_solved;              /* ≥ n_modes: pairs past a range complete a
                                  degenerate set before it is made canonical */
  gsize n_modes;               /* kept in the mode set */
  gboolean lowest_only;
  const char *eigensolver;     /* static name */
  double asymmetry;            /* max|H_ij − H_ji| / max|H| */
  double translations[3], rotations[3];  /* rigid-body residual eigenvalues */
} QvEigenpairs;

/* The end of the pipeline, shared by qv_solve and the distributed solver
 * (qv-distributed-solver.h): repairs the orthogonality of close clusters,
 * fixes signs and degenerate bases (qv-canonical.h), and builds the mode set
 * with its diagnostics (residuals, rigid-body mixing from @rb's kept KV). */
QvModeSet *qv_solver_finish (const QvStructure *structure, const double *masses,
                             const QvRigidBody *rb, QvProjection projection,
                             QvEigenpairs *pairs, double degeneracy_tolerance);

G_END_DECLS
