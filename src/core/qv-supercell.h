/* qv-supercell.h — supercells of a primitive cell: building one from an
 * integer matrix, reducing its lattice, and mapping a given supercell's
 * atoms back to primitive sites and lattice translations.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-structure.h"

G_BEGIN_DECLS

/* Relative position tolerance used when none is given: distances are
 * compared with tolerance × (V_primitive / n_primitive)^(1/3). */
#define QV_SUPERCELL_DEFAULT_TOLERANCE 1e-3

/* Reads "NxMxL" (a diagonal matrix, "2x2x2") or nine integers "m11 m12 m13
 * m21 … m33" (spaces or commas) into @matrix, whose rows give the supercell
 * vectors in primitive vectors: A_i = Σ_j m_ij a_j. The determinant must be
 * positive (and at most 100 000). QV_ERROR_USAGE otherwise. */
gboolean qv_supercell_matrix_parse (const char *text, int matrix[3][3], GError **error);
gint64 qv_supercell_matrix_det (const int matrix[3][3]);

/* The supercell of @primitive (which must have a cell) for @matrix, in the
 * standard order: lattice points n = (n1, n2, n3) inside the supercell in
 * lexicographic order (n1 slowest, n3 fastest; for a diagonal N×M×L matrix
 * that is n1 = 0…N−1, n2 = 0…M−1, n3 = 0…L−1), and within each lattice
 * point all primitive atoms in their order: atom index = l·n_primitive + κ,
 * position n·a + τ_κ. Masses, isotopes and labels are copied. */
QvStructure *qv_supercell_build (const QvStructure *primitive, const int matrix[3][3],
                                 GError **error);

/* Lattice reduction of the rows of @basis by the LLL algorithm (Lenstra,
 * Lenstra & Lovász, Math. Ann. 261, 515, 1982) with δ = 0.99, followed by a
 * sign choice that keeps a right-handed basis when the input is. @reduced
 * rows = @transform · @basis (integer, unimodular); either output may be
 * NULL. */
void qv_lattice_reduce (const double basis[3][3], double reduced[3][3], int transform[3][3]);

/* Volume (signed triple product) of the rows of @cell. */
double qv_lattice_volume (const double cell[3][3]);
/* Reciprocal vectors b_i (rows) with a_i·b_j = 2π δ_ij. */
void qv_lattice_reciprocal (const double cell[3][3], double reciprocal[3][3]);

/* Every supercell atom i as primitive site κ plus lattice translation:
 * r_i = Σ_j translation[3i+j] a_j + τ_κ + (a supercell lattice vector). */
typedef struct {
  gsize n_primitive;          /* n, atoms in the primitive cell */
  gsize n_cells;              /* det M, lattice points in the supercell */
  gsize n_atoms;              /* n × det M */
  int matrix[3][3];           /* A = M a (rows), found from the two cells */
  double primitive_cell[3][3];
  double supercell[3][3];     /* as given (rows, Å) */
  double reduced[3][3];       /* LLL-reduced basis of the supercell lattice M·a */
  double *positions;          /* 3n: τ_κ, Cartesian Å, of the primitive sites */
  double *masses;             /* n: u, of the primitive sites */
  guint *z;                   /* n: atomic numbers of the primitive sites */
  guint *site;                /* n_atoms: κ of each supercell atom */
  int *translation;           /* 3 n_atoms: R_l of each supercell atom (integers) */
  gsize *cell;                /* n_atoms: class of R_l modulo the supercell */
  int *cells;                 /* 3 n_cells: a representative R_l of each class,
                                 the one inside the supercell (0 ≤ f < 1) */
  gsize *atom;                /* n_cells × n: the supercell atom at (class l, κ) */
  double max_residual;        /* largest position mismatch of a match, Å */
} QvSupercellMap;

/* Maps @supercell (atoms in any order, each shifted by any lattice
 * translation) onto @primitive. The supercell lattice must be an integer
 * combination of the primitive one (same orientation) with positive
 * determinant, and the atom count must be n × det M: anything else is
 * QV_ERROR_INPUT with the numbers, never folded silently. Each atom must
 * match exactly one primitive site of the same element within @tolerance
 * (relative, see above; ≤ 0 takes the default), and each (site, lattice
 * point) must be taken exactly once; errors name the atoms (from 1). */
QvSupercellMap *qv_supercell_map (const QvStructure *primitive, const QvStructure *supercell,
                                  double tolerance, GError **error);
void qv_supercell_map_free (QvSupercellMap *map);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvSupercellMap, qv_supercell_map_free)

/* Class (0 … n_cells−1) of the integer lattice translation @n modulo the
 * supercell. */
gsize qv_supercell_map_class (const QvSupercellMap *map, const int n[3]);

/* The det M wave vectors commensurate with the supercell (e^{iq·A_i} = 1),
 * in fractional reciprocal coordinates of the primitive cell, each in
 * [0, 1): q = M⁻¹ k. Returns a new array of 3 × n_cells doubles. */
double *qv_supercell_map_commensurate_q (const QvSupercellMap *map);

G_END_DECLS
