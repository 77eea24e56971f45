/* qv-space-group.h — the space group of a periodic structure, through spglib.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * A thin wrapper around spglib (Debian libsymspg, 2.0): the dataset, the
 * primitive cell and the standardised conventional cell of a QvStructure.
 *
 * Lattice: QvStructure keeps the lattice vectors as ROWS (cell[i] is a, b,
 * c); spglib takes and returns them as COLUMNS. The wrapper transposes both
 * ways; callers see rows only.
 *
 * Atom types: atoms are of one type when they have the same element and the
 * same mass, so isotopes lower the symmetry as they do for vibrations.
 *
 * Threads: spglib keeps its error code in a global variable, so every call
 * into it here is serialised by one static GMutex (the call and the reading
 * of its error code together). The functions are safe to call from any
 * thread; they do not run in parallel with each other. */
#pragma once
#include <glib.h>
#include "qv-structure.h"

G_BEGIN_DECLS

/* spglib's symprec: an absolute Cartesian distance in Å within which two
 * positions count as one after a symmetry operation. 1e-5 Å is spglib's own
 * documented default, right for relaxed structures written in full
 * precision; use 1e-3 to 1e-2 Å for coordinates rounded to 4-5 decimals. */
#define QV_SPACE_GROUP_DEFAULT_SYMPREC 1e-5

typedef struct {
  int number;                  /* 1 … 230 */
  char *international;         /* Hermann–Mauguin short symbol, "Fm-3m" */
  char *hall_symbol;           /* "-F 4 2 3" */
  int hall_number;             /* 1 … 530, spglib's numbering of settings */
  char *choice;                /* origin or axis choice, "" when none */
  char *point_group;           /* "m-3m" */
  double symprec;              /* Å, as used */

  /* The operations of the input cell, in its fractional coordinates:
   * x' = R x + t with x a column of fractional coordinates. */
  gsize n_operations;
  int (*rotations)[3][3];
  double (*translations)[3];

  gsize n_atoms;               /* of the input */
  gsize *equivalent_atoms;     /* per input atom: spglib's representative of
                                  its orbit (one index, the same for every
                                  atom of the orbit) */

  /* Input → standardised setting: (a_s b_s c_s) = (a b c) P⁻¹ as columns,
   * x_s = P x + p (spglib's convention). */
  double transformation[3][3]; /* P */
  double origin_shift[3];      /* p */
  /* Rotation from the standardised cell in the input's orientation to the
   * idealised one: (a_s b_s c_s)_ideal = R (a_s b_s c_s), columns. */
  double std_rotation[3][3];

  /* Both in the input's orientation (not idealised): their rows are lattice
   * vectors of the input lattice's superlattice or sublattice. */
  QvStructure *primitive;
  QvStructure *standardized;   /* conventional standard cell */
} QvSpaceGroup;

/* The space group of @structure (needs a cell, periodic in all three
 * directions). @symprec ≤ 0 means QV_SPACE_GROUP_DEFAULT_SYMPREC. Errors:
 * QV_ERROR_INPUT when the structure is not periodic or spglib finds no
 * group (its reason is in the message, with what to try). */
QvSpaceGroup *qv_space_group_find (const QvStructure *structure, double symprec,
                                   GError **error);
void qv_space_group_free (QvSpaceGroup *group);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvSpaceGroup, qv_space_group_free)

/* The primitive or the standardised conventional cell alone. @idealize:
 * FALSE keeps the input's orientation (spg_standardize_cell with
 * no_idealize); TRUE rotates to spglib's standard orientation and
 * symmetrises the lattice and positions (what spg_find_primitive does).
 * Masses follow the atom types; labels are not kept. */
QvStructure *qv_space_group_primitive (const QvStructure *structure, double symprec,
                                       gboolean idealize, GError **error);
QvStructure *qv_space_group_standardized (const QvStructure *structure, double symprec,
                                          gboolean idealize, GError **error);

G_END_DECLS
