/* qv-internal-coordinates.h — valence internal coordinates of a structure
 * (stretches, bends, torsions, out-of-plane angles) and their Wilson
 * B-matrix rows (Wilson, Decius & Cross, Molecular Vibrations, 1955, ch. 4).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-structure.h"

G_BEGIN_DECLS

typedef enum {
  QV_INTERNAL_STRETCH,       /* atoms a–b: the distance, Å */
  QV_INTERNAL_BEND,          /* atoms i–j–k, apex j: the angle, rad */
  QV_INTERNAL_LINEAR_BEND,   /* atoms i–j–k near 180°: (e_ji + e_jk)·u for a
                                fixed unit vector u ⟂ the axis, rad to first
                                order; each linear angle gives two, u ⟂ w */
  QV_INTERNAL_TORSION,       /* atoms i–j–k–l: the proper dihedral about
                                j–k, rad, in (−π, π] */
  QV_INTERNAL_OUT_OF_PLANE,  /* atoms l, j, i, k: the angle between bond j–l
                                and the plane i–j–k (Wilson's θ), rad;
                                j is the planar centre */
} QvInternalKind;

/* Short name of a kind: "stretch", "bend", "linear bend", "torsion",
 * "out-of-plane". */
const char *qv_internal_kind_name (QvInternalKind kind);

typedef struct {
  QvInternalKind kind;
  guint n_atoms;             /* 2, 3 or 4 */
  guint32 atoms[4];          /* 0-based, in the order of the kind above */
  double direction[3];       /* linear bends: u; zero otherwise */
  double value;              /* at the structure's geometry, Å or rad */
  char *name;                /* atoms numbered from 1: "C1–H5", "H5–C1–H6",
                                "H5–C1–C2–O3", "O3 out of H4–C1–H5",
                                "H1–C2–N3 linear bend a" */
  char *family;              /* element pattern in a canonical order, so
                                coordinates of the same type group:
                                "C–H stretch", "H–C–H bend",
                                "H–C–C–O torsion", "out-of-plane at C" */
} QvInternalCoordinate;

typedef struct {
  gsize n_atoms;
  gsize n_coordinates;
  QvInternalCoordinate *coordinates;
  double *b_matrix;          /* n_coordinates × 3N, row-major: row i is
                                ∂q_i/∂x (per Å for stretches, rad/Å else) */
  char **notes;              /* NULL-terminated; what was left out and why */
} QvInternalCoordinates;

/* Angles above this (degrees) are treated as linear: no ordinary bend and
 * no torsion through them (common practice: the bend's s-vectors and the
 * torsion are singular at 180°). */
#define QV_INTERNAL_LINEAR_ANGLE 175.0
/* A three-coordinate centre is planar when its three bond angles add up to
 * at least this (degrees; common practice). */
#define QV_INTERNAL_PLANAR_SUM 355.0

/* Perceives the coordinates of @structure: bonds from covalent radii with
 * @tolerance (qv-bonds.h, QV_BONDS_DEFAULT_TOLERANCE), every bond angle at
 * every centre (a linear one as a pair of linear bends), every proper
 * dihedral about every bond whose ends both have other neighbours (not
 * through a linear angle), and one out-of-plane angle at each planar
 * three-coordinate centre. The set is redundant in general (all six angles
 * at a tetrahedral centre, nine dihedrals about a C–C bond). Coordinates are
 * ordered stretches, bends, linear bends, torsions, out-of-plane, each
 * sorted by atoms. Bonds are found within the atoms as given (no periodic
 * images). QV_ERROR_INPUT when two atoms coincide. */
QvInternalCoordinates *qv_internal_coordinates_new (const QvStructure *structure,
                                                    double tolerance, GError **error);
void qv_internal_coordinates_free (QvInternalCoordinates *ic);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvInternalCoordinates, qv_internal_coordinates_free)

/* Row i of the B matrix (3N doubles). */
const double *qv_internal_coordinates_b_row (const QvInternalCoordinates *ic, gsize i);
/* How many coordinates of @kind. */
gsize qv_internal_coordinates_count (const QvInternalCoordinates *ic, QvInternalKind kind);

/* The value of @c at @positions (3N doubles, Å) and, when @row is not NULL,
 * its analytic derivatives there into @row (3N doubles, zeroed first):
 * Wilson's s-vectors (WDC §4-1) for stretches, bends and out-of-plane
 * angles, the gradient of the atan2 dihedral for torsions. */
double qv_internal_coordinate_evaluate (const QvInternalCoordinate *c, const double *positions,
                                        gsize n_atoms, double *row);

G_END_DECLS
