/* lattice-model.h — spring models of crystals for the lattice tests.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-hessian.h"
#include "qv-structure.h"

/* A shell of springs: every pair of atoms (of the given sites' elements, 0
 * = any) at distance @distance (Å) under the supercell's periodic images
 * gets the pair potential ½ u_rel·K·u_rel with K = longitudinal ê êᵀ +
 * transverse (1 − ê êᵀ), eV/Å². */
typedef struct {
  double distance;
  double longitudinal;
  double transverse;
  guint z1, z2;
} LatticeShell;

/* The exact Hessian of the periodic supercell @s (images up to ±2 cells). */
QvHessian *lattice_model_hessian (const QvStructure *s, const LatticeShell *shells, gsize n_shells);

/* A structure with a cell: @n atoms of atomic numbers @z and masses @m at
 * Cartesian positions @r. */
QvStructure *lattice_model_structure (const double cell[3][3], gsize n, const guint *z,
                                      const double *m, const double *r);
