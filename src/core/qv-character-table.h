/* qv-character-table.h — character tables of the point groups, read from
 * data/character-tables.txt (Cotton, Chemical Applications of Group Theory,
 * 3rd ed., Appendix IIA, typed from memory; see the data file), and the
 * reduction of a representation by the orthogonality of characters.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-point-group.h"

G_BEGIN_DECLS

typedef struct _QvCharacterTable QvCharacterTable;

/* The table of a group by its name as qv_point_group_detect spells it, or
 * NULL when the data has none (e.g. C9, S12). Tables are read once and
 * live as long as the program. */
const QvCharacterTable *qv_character_table_lookup (const char *group);
/* Every table's name, NULL-terminated (static). */
const char *const *qv_character_table_names (void);

const char *qv_character_table_name (const QvCharacterTable *table);
/* Order of the group the classes partition (for Cinfv and Dinfh: of the
 * finite subgroup C2v or D2h the table correlates with). */
gsize qv_character_table_order (const QvCharacterTable *table);
gsize qv_character_table_n_classes (const QvCharacterTable *table);
/* The class heading token ("C3", "sv", "i*C2'"), its size, and its
 * representative operation in the standard frame (row-major 3×3). */
const char *qv_character_table_class_token (const QvCharacterTable *table, gsize c);
guint qv_character_table_class_size (const QvCharacterTable *table, gsize c);
const double *qv_character_table_class_matrix (const QvCharacterTable *table, gsize c);

gsize qv_character_table_n_irreps (const QvCharacterTable *table);
/* Mulliken label, ASCII: "A1g", "E'", "T2", "Pi_u" */
const char *qv_character_table_label (const QvCharacterTable *table, gsize irrep);
double qv_character_table_character (const QvCharacterTable *table, gsize irrep, gsize c);
/* The table's linear functions and rotations, and its quadratic functions,
 * as written ("z, Rz"; "" when none). */
const char *qv_character_table_linear (const QvCharacterTable *table, gsize irrep);
const char *qv_character_table_quadratic (const QvCharacterTable *table, gsize irrep);
/* IR active: the species of x, y or z; Raman active: of a quadratic
 * function; rotation: the species of Rx, Ry or Rz. */
gboolean qv_character_table_ir_active (const QvCharacterTable *table, gsize irrep);
gboolean qv_character_table_raman_active (const QvCharacterTable *table, gsize irrep);
gboolean qv_character_table_rotation (const QvCharacterTable *table, gsize irrep);

/* Assigns each operation of @group (found for this table's group) its
 * class: @class_of_op[group->order]. Fails with QV_ERROR_INPUT when the
 * operations do not fall into the table's classes with its sizes. */
gboolean qv_character_table_classify (const QvCharacterTable *table, const QvPointGroup *group,
                                      gsize *class_of_op, GError **error);
/* Multiplicities n_i = Σ_g χ_i(g) χ(g) / Σ_g χ_i(g)² of a representation
 * with characters @chi (one per operation); @out[n_irreps]. (The
 * denominator is |G| for an irreducible row, 2|G| for a real row that is a
 * complex-conjugate pair or a correlation sum of two.) */
void qv_character_table_reduce (const QvCharacterTable *table, const QvPointGroup *group,
                                const gsize *class_of_op, const double *chi, double *out);

G_END_DECLS
