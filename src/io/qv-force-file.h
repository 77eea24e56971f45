/* qv-force-file.h — plain force files (one line of three numbers per atom)
 * and the force units they come in.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

typedef enum {
  QV_FORCE_UNIT_EV_A,
  QV_FORCE_UNIT_HARTREE_BOHR,
  QV_FORCE_UNIT_RY_BOHR,
  QV_FORCE_UNIT_KCAL_MOL_A,
  QV_FORCE_UNIT_KJ_MOL_A,
  QV_FORCE_UNIT_COUNT
} QvForceUnit;

/* "eV/A", "hartree/bohr", "Ry/bohr", "kcal/mol/A", "kJ/mol/A"; case-
 * insensitive, "Å" accepted for "A". Unknown: QV_ERROR_USAGE listing them. */
gboolean qv_force_unit_parse (const char *text, QvForceUnit *unit, GError **error);
const char *qv_force_unit_name (QvForceUnit unit);
/* Factor f such that value_in_unit × f = value in eV/Å (CODATA 2018). */
double qv_force_unit_to_ev_a (QvForceUnit unit);
/* The accepted spellings, comma separated. */
const char *qv_force_unit_list (void);

/* @n_atoms lines of three numbers (x y z of one atom), whitespace or comma
 * separated; '#' starts a comment; blank lines are skipped. Numbers are
 * parsed locale-independently; a missing or extra number, a non-number,
 * NaN or infinity, or a wrong line count is QV_ERROR_INPUT "NAME:LINE:COL: …".
 * Returns 3·n_atoms values in the file's unit. */
double *qv_force_file_read_data (const char *data, gsize length, const char *name,
                                 gsize n_atoms, GError **error);
double *qv_force_file_read (const char *path, gsize n_atoms, GError **error);

G_END_DECLS
