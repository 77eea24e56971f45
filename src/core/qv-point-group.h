/* qv-point-group.h — the point group of a molecule: detection within a
 * tolerance, the standard orientation, the operations with their atom
 * permutations, and the rotational symmetry number.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-hessian.h"
#include "qv-structure.h"

G_BEGIN_DECLS

/* Default tolerance (Å): an atom's image under an operation must lie this
 * close to an atom of the same element. Suits optimised geometries, whose
 * symmetry is usually broken by less than 1e-3 Å (common practice). */
#define QV_SYMMETRY_DEFAULT_TOLERANCE 0.01

typedef struct {
  char *name;                  /* Schoenflies symbol, ASCII: "C3v", "D6h",
                                  "Td", "Cinfv", "Dinfh" */
  double tolerance;            /* Å, as used */
  gboolean linear;             /* Cinfv and Dinfh: @operations are those of
                                  the finite subgroup C2v or D2h */
  guint n;                     /* order of the principal axis (0 for the
                                  cubic and icosahedral groups, 1 for C1, Cs,
                                  Ci; 0 for linear) */
  double center[3];            /* Å, mass-weighted centre */
  double frame[3][3];          /* rows: the standard x, y, z axes in input
                                  coordinates (orthonormal, right-handed) */
  gsize n_atoms;
  gsize order;                 /* number of operations */
  double *operations;          /* order × 9: R (row-major) acting on positions
                                  relative to @center, in the input frame;
                                  operation 0 is the identity */
  gsize *permutations;         /* order × n_atoms: operation g carries atom a
                                  onto atom permutations[g * n_atoms + a] */
  guint symmetry_number;       /* σ: number of proper rotations (C∞v 1, D∞h 2) */
  double max_deviation;        /* Å, largest distance between an atom's image
                                  and the atom it is matched to */
} QvPointGroup;

/* Finds the largest point group whose operations carry every atom within
 * @tolerance (Å, > 0; 0 picks QV_SYMMETRY_DEFAULT_TOLERANCE) of an atom of
 * the same element and mass. Fails with QV_ERROR_INPUT for periodic or empty
 * structures, a single atom and non-finite positions, QV_ERROR_USAGE for a
 * bad tolerance.
 *
 * Standard orientation (@frame): z along the principal axis; x along the
 * C2' axis with most atoms on it (Dn, Dnh, Dnd), in the σv plane with most
 * atoms (Cnv, n ≥ 3), or normal to the mirror with most atoms (C2v: a planar
 * molecule lies in yz); D2, D2h: a planar molecule has x normal to its
 * plane and z along the in-plane axis with more atoms; Cs: z normal to the
 * mirror; T, Td, Th along the C2 axes, O, Oh along the C4 axes, I, Ih along
 * three perpendicular C2 axes with a C5 along (0, 1, φ); C1, Ci: principal
 * axes of inertia; linear: z along the molecule. */
QvPointGroup *qv_point_group_detect (const QvStructure *structure, double tolerance,
                                     GError **error);
void qv_point_group_free (QvPointGroup *group);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvPointGroup, qv_point_group_free)

const double *qv_point_group_operation (const QvPointGroup *group, gsize g);
const gsize *qv_point_group_permutation (const QvPointGroup *group, gsize g);

/* Sets of symmetry-equivalent atoms (orbits of the group): @out[a] is the
 * index of the set of atom a (sets numbered from 0 in order of their first
 * atom); returns the number of sets. */
gsize qv_point_group_equivalent_atoms (const QvPointGroup *group, gsize *out);

/* Averages the positions over the group: r_a ← c + (1/|G|) Σ_g R_gᵀ (r_{g(a)} − c).
 * The structure must be the one the group was found for. */
void qv_point_group_symmetrize_structure (const QvPointGroup *group, QvStructure *structure);

/* H ← (1/|G|) Σ_g P_g R_g H R_gᵀ P_gᵀ (R_g on each atom's block, P_g the atom
 * permutation); returns the largest change relative to max|H|. */
double qv_point_group_symmetrize_hessian (const QvPointGroup *group, QvHessian *hessian);

G_END_DECLS
