/* qv-bonds.h — bonds perceived from covalent radii.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-structure.h"

G_BEGIN_DECLS

/* Atoms a and b are bonded when their distance d satisfies
 * 0 < d < (r_a + r_b)·(1 + tolerance), r the covalent radii of
 * qv-element.h (common practice; 0.15 is the usual tolerance). */
#define QV_BONDS_DEFAULT_TOLERANCE 0.15

/* Covalent radius used for elements the table has none for (Z > 96), Å
 * (common practice: about that of the heaviest listed actinides). */
#define QV_BONDS_FALLBACK_RADIUS 1.69

typedef struct {
  guint32 a, b;            /* atom indices, a < b */
} QvBond;

/* Every bonded pair of @structure, sorted by (a, b), into a new array of
 * QvBond; *@n_bonds receives the count. Uses a cell list (grid of cubes as
 * large as the longest possible bond), so the cost grows with N, not N².
 * Bonds are found between the atoms as given only: for a periodic structure
 * no bond is made across the cell boundary (no minimum image), so an atom
 * at one face is not bonded to the periodic image of one at the opposite
 * face. Returns NULL with *@n_bonds = 0 when there are none. */
QvBond *qv_bonds_perceive (const QvStructure *structure, double tolerance,
                           gsize *n_bonds);

/* The same for bare points: @positions 3n doubles (Å), @radii n covalent
 * radii (Å). */
QvBond *qv_bonds_perceive_points (const double *positions, const double *radii,
                                  gsize n, double tolerance, gsize *n_bonds);

/* Covalent radius of element @z for bonding (the fallback where none). */
double qv_bonds_radius (guint z);

G_END_DECLS
