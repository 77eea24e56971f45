/* qv-cif.h — crystal structures from CIF 1.1 files.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * The syntax is CIF 1.1 (Hall, Allen & Brown, Acta Cryst. A47, 655, 1991,
 * and the CIF 1.1 syntax specification): data blocks, tag-value pairs,
 * loops, comments, quoted strings, semicolon text fields. Of the tags, only
 * the ones a crystal structure needs are read (docs/formats.md, "CIF"):
 * the cell, the atom sites and the symmetry operators, in either spelling.
 * Every other tag is checked for syntax and ignored. */
#pragma once
#include <glib.h>
#include "qv-structure.h"

G_BEGIN_DECLS

/* Two images of sites closer than this (Cartesian minimum-image distance,
 * Å) are one atom: 0.01 Å absorbs coordinates rounded to 4 decimals in cells
 * up to about 100 Å, and real atoms are never that close. */
#define QV_CIF_DEFAULT_MERGE_TOLERANCE 1e-2

typedef struct {
  const char *block;        /* data block name (without "data_"),
                               case-insensitive; NULL: the first block
                               that has atom sites */
  double merge_tolerance;   /* Å; 0: QV_CIF_DEFAULT_MERGE_TOLERANCE */
} QvCifOptions;

/* Reads one data block and expands its sites by its symmetry operators into
 * the full contents of the cell given: every operator applied to every site,
 * fractional coordinates wrapped into [0, 1), images within the merge
 * tolerance of an atom already placed dropped (special positions). Atoms
 * keep their site's label and come in site order, then operator order. The
 * structure has the cell (rows a, b, c in Å: a along x, b in the xy plane,
 * c making a right-handed set), pbc TRUE in all three directions, elements
 * from _atom_site_type_symbol (else from the label) and their default
 * masses. @options may be NULL. On failure returns NULL with
 * QV_ERROR_INPUT "NAME:LINE:COLUMN: what was wrong, how to fix". */
QvStructure *qv_cif_read_data (const char *data, gsize length, const char *name,
                               const QvCifOptions *options, GError **error);
QvStructure *qv_cif_read_file (const char *path, const QvCifOptions *options,
                               GError **error);

/* TRUE when @path ends in ".cif" (any case). */
gboolean qv_cif_is_cif_path (const char *path);

/* One symmetry operation in fractional coordinates: x' = R x + t. */
typedef struct {
  int rotation[3][3];
  double translation[3];
} QvCifOperator;

/* Parses "x,y,z", "-x+1/2,y,-z", "x-y,x,z+2/3", "1/2+X, Y, Z" … (spaces
 * allowed; the coefficients of x, y, z must be whole numbers and the
 * rotation must have determinant ±1). On failure sets @error_offset to the
 * byte in @text where the problem is and returns FALSE with QV_ERROR_INPUT
 * (a message without a location). */
gboolean qv_cif_parse_operator (const char *text, QvCifOperator *op,
                                gsize *error_offset, GError **error);

G_END_DECLS
