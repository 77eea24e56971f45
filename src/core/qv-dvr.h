/* qv-dvr.h — the sinc discrete variable representation of Colbert & Miller
 * (J. Chem. Phys. 96, 1982, 1992) on a uniform grid in one or two
 * coordinates (direct product), solved with LAPACK's dsyevr for the lowest
 * levels, and a refinement loop that shrinks the grid step over a fixed
 * interval until the levels stop moving.
 *
 * Coordinates are mass weighted (Q in u^½ Å), so the mass is 1 and the
 * kinetic energy operator is −(ħ²/2) ∂²/∂Q²; energies are in eV.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* Largest number of grid points of one solve (the dense Hamiltonian is
 * n² doubles: 8192 points are 512 MiB). */
#define QV_DVR_MAX_POINTS 8192

/* ħ²/2 in eV·u·Å², the kinetic prefactor for a coordinate in u^½ Å
 * (CODATA 2018 constants of qv-units.h). */
double qv_dvr_kinetic_prefactor (void);

/* A uniform grid: x_i = lo[d] + i·step[d], i = 0..n[d]-1, along @dim (1 or 2)
 * axes. Point (i0, i1) has index i0 + n[0]·i1 (first axis fastest).
 * Without @walls the kinetic energy is that of the whole line (Colbert &
 * Miller eq. A7); with @walls that of the interval (a, b) with the
 * wavefunction zero at a = lo − step and b = lo + n·step (eq. A6), so a
 * level that reaches the ends still converges, to the level of that box. */
typedef struct {
  guint dim;
  gsize n[2];
  double lo[2];
  double step[2];
  gboolean walls;
} QvDvrGrid;

/* Without @walls: @n[d] points spanning [lo[d], hi[d]], end points
 * included. With @walls: @n[d] points strictly inside (lo[d], hi[d]), which
 * are the walls a and b. */
void qv_dvr_grid_span (QvDvrGrid *grid, guint dim, const gsize n[], const double lo[],
                       const double hi[], gboolean walls);
gsize qv_dvr_grid_size (const QvDvrGrid *grid);
/* Coordinates of point @index into @x (dim values). */
void qv_dvr_grid_point (const QvDvrGrid *grid, gsize index, double *x);

typedef struct {
  QvDvrGrid grid;
  gsize n_levels;
  double *energies;        /* n_levels, ascending, eV */
  double *vectors;         /* n_points × n_levels, column-major; Σ_i c_i² = 1 */
  gsize n_points;
} QvDvrLevels;

void qv_dvr_levels_free (QvDvrLevels *levels);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvDvrLevels, qv_dvr_levels_free)

/* The one-dimensional kinetic matrix, n×n column-major into @t, for a unit
 * mass and prefactor @kinetic (= ħ²/2). Without @walls Colbert & Miller's
 * eq. (A7) for (−∞, ∞): T_ij = (ħ²/2Δx²)(−1)^(i−j){π²/3 if i = j, 2/(i−j)²
 * otherwise}. With @walls eq. (A6) for (a, b), N = n + 1, b − a = NΔx:
 * T_ij = (ħ²/2)(π²/(2(b−a)²))(−1)^(i−j){(2N²+1)/3 − 1/sin²(πi/N) if i = j,
 * 1/sin²(π(i−j)/2N) − 1/sin²(π(i+j)/2N) otherwise}, i, j = 1..N−1. */
void qv_dvr_kinetic_matrix (gsize n, double step, double kinetic, gboolean walls, double *t);

/* The lowest @n_levels eigenpairs of H = T + V on @grid, @potential holding
 * V at every grid point (eV). QV_ERROR_LIMIT above QV_DVR_MAX_POINTS,
 * QV_ERROR_SOLVER when LAPACK fails. Each eigenvector's sign is fixed: its
 * largest-magnitude component is positive. */
QvDvrLevels *qv_dvr_solve (const QvDvrGrid *grid, const double *potential, double kinetic,
                           gsize n_levels, GError **error);

/* Per level: ⟨x_axis⟩ = Σ c_i² x_i, and the weight Σ c_i² on the points
 * within @fraction of the range from either end of any axis (at least the
 * outermost point). */
double qv_dvr_levels_mean (const QvDvrLevels *levels, gsize level, guint axis);
double qv_dvr_levels_edge_weight (const QvDvrLevels *levels, gsize level, double fraction);
/* The normalised wavefunction of @level at grid point @point (1/√(u^½ Å)
 * per axis): c_i/√(Π_d step_d). The sinc DVR basis function of point i is
 * 1/√Δx at x_i and zero at every other point, so these are ψ's values on
 * the grid, and Σ_i ψ_i² Π_d step_d = 1. */
double qv_dvr_levels_wavefunction (const QvDvrLevels *levels, gsize level, gsize point);
/* ⟨ψ_a| x_axis |ψ_b⟩ on the grid. */
double qv_dvr_levels_coordinate_element (const QvDvrLevels *levels, gsize a, gsize b,
                                         guint axis);

/* The potential at a point (dim coordinates), eV. */
typedef double (*QvDvrPotential) (const double *x, gpointer user_data);

typedef struct {
  gsize n[2];              /* points per axis */
  double step[2];
  double max_change;       /* largest |ΔE_v| against the previous step (eV),
                              NAN for the first */
} QvDvrStep;

typedef struct {
  guint dim;
  double lo[2], hi[2];     /* the interval of each axis */
  gboolean walls;          /* lo and hi are walls (default), see QvDvrGrid;
                              FALSE: grid points on lo and hi, free line */
  gsize n_levels;
  double tolerance;        /* eV: stop when every level moved less */
  gsize start_points;      /* per axis, first grid (default 33 in 1-D, 15 in 2-D) */
  gsize max_points;        /* per axis, last grid tried (default 2049 in 1-D, 49 in 2-D) */
} QvDvrRefineOptions;

void qv_dvr_refine_options_init (QvDvrRefineOptions *options, guint dim);

typedef struct {
  QvDvrLevels *levels;     /* on the finest grid solved */
  GArray *steps;           /* QvDvrStep, coarse to fine */
  gboolean converged;      /* the last step moved every level < tolerance */
} QvDvrRefinement;

void qv_dvr_refinement_free (QvDvrRefinement *refinement);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvDvrRefinement, qv_dvr_refinement_free)

/* Solves on grids of growing density over the fixed interval (about 1.4×
 * the points each step) until two successive grids agree on every one of
 * the lowest @n_levels levels within @tolerance, or @max_points is reached
 * (then converged is FALSE and the caller warns). The grid never leaves
 * [lo, hi], so the potential is never asked for outside it. */
QvDvrRefinement *qv_dvr_refine (const QvDvrRefineOptions *options, QvDvrPotential potential,
                                gpointer user_data, double kinetic, GError **error);

G_END_DECLS
