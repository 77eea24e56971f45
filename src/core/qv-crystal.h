/* qv-crystal.h — a crystal ready for lattice dynamics: its primitive cell,
 * the map of a supercell onto it, the force constants folded from the
 * supercell's Hessian with the acoustic sum rule, and optionally the
 * non-analytic term of a polar crystal. What the lattice commands and the
 * app both start from.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-dynamical-matrix.h"
#include "qv-force-constants.h"
#include "qv-hessian.h"
#include "qv-nonanalytic.h"
#include "qv-structure.h"
#include "qv-supercell.h"

G_BEGIN_DECLS

typedef struct {
  QvStructure *primitive;     /* owned copy */
  QvSupercellMap *map;        /* the supercell's atoms on the primitive sites */
  QvForceConstants *fc;       /* with the sum rule unless asked not to; NULL before
                                 qv_crystal_set_hessian */
  gboolean sum_rule;          /* the acoustic sum rule was imposed */
  double before[3];           /* acoustic wavenumbers at Γ before the sum rule, cm⁻¹ */
  double row_sum;             /* largest row sum removed, eV/Å² (0 without the rule) */
  double periodicity;         /* qv_force_constants_periodicity before the rule */
  QvNonAnalytic *na;          /* the LO–TO term (qv_crystal_set_born), or NULL */
} QvCrystal;

/* Maps @supercell onto @primitive (qv_supercell_map with @tolerance, ≤ 0
 * the default); the crystal has no force constants until
 * qv_crystal_set_hessian. Errors: QV_ERROR_INPUT from the map. */
QvCrystal *qv_crystal_new (const QvStructure *primitive, const QvStructure *supercell,
                           double tolerance, GError **error);
/* Folds @hessian (3N × 3N of the supercell, eV/Å²) into force constants
 * and, with @sum_rule, imposes the acoustic sum rule. Replaces earlier
 * force constants and drops the non-analytic term. */
gboolean qv_crystal_set_hessian (QvCrystal *crystal, const QvHessian *hessian,
                                 gboolean sum_rule, GError **error);
void qv_crystal_free (QvCrystal *crystal);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvCrystal, qv_crystal_free)

/* Adds the non-analytic term from Born charges @born (9 per primitive site,
 * Z*[field][displacement], e) and ε∞ @epsilon (qv_nonanalytic_new; the
 * charges are made neutral there). Replaces an earlier term. */
gboolean qv_crystal_set_born (QvCrystal *crystal, gsize n_sites, const double *born,
                              const double epsilon[3][3], GError **error);

/* D(q)'s extra term for the solvers (qv_nonanalytic_add, or NULL), and its data. */
QvDynamicalTerm qv_crystal_term (const QvCrystal *crystal);
gpointer qv_crystal_term_data (const QvCrystal *crystal);

/* The number of formula units in the primitive cell (qv_thermal_formula_units). */
gsize qv_crystal_formula_units (const QvCrystal *crystal);

G_END_DECLS
