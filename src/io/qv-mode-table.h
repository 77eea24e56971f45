/* qv-mode-table.h — the mode table as text, CSV, Markdown, LaTeX or JSON:
 * the full report of `quaver modes`, and tables of chosen columns for papers
 * (`quaver table`).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-hessian.h"
#include "qv-mode-character.h"
#include "qv-mode-set.h"
#include "qv-structure.h"
#include "qv-symmetry-modes.h"
#include "qv-units.h"

G_BEGIN_DECLS

typedef enum {
  QV_TABLE_TEXT,
  QV_TABLE_CSV,
  QV_TABLE_JSON,
  QV_TABLE_MARKDOWN,
  QV_TABLE_LATEX,              /* booktabs tabular */
} QvTableFormat;

gboolean qv_table_format_parse (const char *text, QvTableFormat *format, GError **error);

/* Everything a table states about where its numbers came from. */
typedef struct {
  const QvStructure *structure;
  const QvModeSet *modes;
  guint level;                 /* vibrational level v of the turning points */
  double temperature;          /* K, for the thermal RMS amplitude */
  QvFrequencyUnit unit;        /* of the text/Markdown wavenumber column */
  gboolean vectors;            /* JSON: include Cartesian displacements */
  const char *hessian_source;  /* file name, or NULL */
  const char *hessian_units;   /* as given, or NULL */
  QvHessianLayout layout;
  QvMassModel mass_model;
  const QvModeCharacter *character; /* JSON: "internal_coordinates" and each
                                       mode's "character" (modes --character),
                                       or NULL */
  const QvSymmetryReport *symmetry; /* point group and each mode's species
                                       (text "sym" column, CSV/Markdown
                                       "symmetry", JSON "point_group" and
                                       per-mode "symmetry"), or NULL */
} QvModeReport;

/* A newly allocated, NUL-terminated document. QV_TABLE_LATEX gives the
 * default columns of qv_mode_table_columns. */
char *qv_mode_table_format (const QvModeReport *report, QvTableFormat format);

/* The columns a user can choose for a table. */
typedef enum {
  QV_COLUMN_INDEX,                 /* mode number, from 1 */
  QV_COLUMN_WAVENUMBER,            /* in the report's unit, scaled; "i" marks imaginary */
  QV_COLUMN_REDUCED_MASS,          /* u */
  QV_COLUMN_FORCE_CONSTANT,        /* mdyn/Å */
  QV_COLUMN_TURNING_Q,             /* Q_tp at v, u^½ Å */
  QV_COLUMN_TURNING_DISPLACEMENT,  /* largest atomic displacement at Q_tp, Å, and its atom */
  QV_COLUMN_THERMAL_RMS,           /* largest atomic RMS displacement at T, Å */
  QV_COLUMN_COLLECTIVITY,          /* exp(Shannon entropy of p)/N */
  QV_COLUMN_TOP_ATOMS,             /* the atoms with the largest participation */
  QV_COLUMN_SYMMETRY,              /* the mode's species (report->symmetry), "?" unknown */
  QV_N_COLUMNS
} QvTableColumn;

/* Names as the command line spells them: index, wavenumber, reduced-mass,
 * force-constant, turning-q, turning-displacement, thermal-rms,
 * collectivity, top-atoms, symmetry. */
const char *qv_table_column_name (QvTableColumn column);
/* A comma-separated list of names into @columns (room for QV_N_COLUMNS;
 * no repeats); QV_ERROR_USAGE naming the accepted ones. */
gboolean qv_table_columns_parse (const char *text, QvTableColumn *columns, gsize *n_columns,
                                 GError **error);
/* "index,wavenumber,reduced-mass,force-constant,turning-q,turning-displacement" */
#define QV_TABLE_DEFAULT_COLUMNS "index,wavenumber,reduced-mass,force-constant,turning-q,turning-displacement"

typedef struct {
  const QvModeReport *report;
  const QvTableColumn *columns;    /* NULL: the default columns */
  gsize n_columns;
  double scale;                    /* frequency scaling factor for the wavenumber
                                      column (0 or 1: none); stated in the
                                      caption / header / JSON */
  guint top_atoms;                 /* atoms listed by top-atoms (0: 3) */
} QvTableLayout;

/* A table of the chosen columns, one row per mode, with a caption that
 * says what the numbers are (units, level, temperature, masses, scaling):
 * text (aligned, '#' caption lines), CSV (one header row whose names carry
 * the units and the scale factor), Markdown (caption paragraph, then a pipe
 * table), LaTeX (a table environment with \\caption and a booktabs tabular:
 * \\toprule, \\midrule, \\bottomrule; LaTeX specials escaped) or JSON
 * ("columns", "scale", "caption" and one object
 * per mode). */
char *qv_mode_table_columns (const QvTableLayout *layout, QvTableFormat format);

G_END_DECLS
