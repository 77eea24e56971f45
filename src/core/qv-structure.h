/* qv-structure.h — atoms, masses, an optional cell.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

typedef struct {
  guint z;                 /* atomic number 1..118 */
  double mass;             /* u */
  guint mass_number;       /* isotope of @mass, 0 when it is an average weight
                              or a mass typed by the user */
  double position[3];      /* Å */
  char *label;             /* optional, owned; NULL when none */
} QvAtom;

typedef enum {
  QV_MASS_ISOTOPIC,        /* most abundant isotope (default) */
  QV_MASS_AVERAGE,         /* standard atomic weight */
} QvMassModel;

typedef struct {
  gsize n_atoms;
  QvAtom *atoms;
  gboolean has_cell;
  double cell[3][3];       /* rows are the lattice vectors a, b, c in Å */
  gboolean pbc[3];
  gboolean has_energy;
  double energy;           /* eV */
  double *forces;          /* 3N, eV/Å, or NULL */
  char *comment;           /* owned, may be NULL */
} QvStructure;

/* Atoms start as hydrogen at the origin with the default mass. Fails (NULL)
 * only for absurd sizes, with QV_ERROR_LIMIT. */
QvStructure *qv_structure_new (gsize n_atoms, GError **error);
QvStructure *qv_structure_copy (const QvStructure *structure);
void qv_structure_free (QvStructure *structure);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvStructure, qv_structure_free)

/* Sets the element and its default (most abundant isotope) mass. */
gboolean qv_structure_set_element (QvStructure *structure, gsize atom, guint z,
                                   GError **error);
/* Resets every mass to the chosen model. */
void qv_structure_apply_mass_model (QvStructure *structure, QvMassModel model);
/* Isotope by mass number, from the isotope table; QV_ERROR_INPUT when the
 * table does not have it (the message lists the isotopes it has). */
gboolean qv_structure_set_isotope (QvStructure *structure, gsize atom,
                                   guint mass_number, GError **error);
/* Any positive finite mass in u. */
gboolean qv_structure_set_mass (QvStructure *structure, gsize atom, double mass,
                                GError **error);
void qv_structure_set_label (QvStructure *structure, gsize atom, const char *label);

void qv_structure_center_of_mass (const QvStructure *structure, double com[3]);
double qv_structure_total_mass (const QvStructure *structure);
/* Hill order: C, H, then the rest alphabetically ("C2H6O"). */
char *qv_structure_formula (const QvStructure *structure);
/* Masses as a newly allocated array of n_atoms doubles. */
double *qv_structure_masses (const QvStructure *structure);
/* TRUE when any direction is periodic. */
gboolean qv_structure_is_periodic (const QvStructure *structure);

G_END_DECLS
