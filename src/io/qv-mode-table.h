/* qv-mode-table.h — the mode table as text, CSV, Markdown or JSON.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-hessian.h"
#include "qv-mode-set.h"
#include "qv-structure.h"
#include "qv-units.h"

G_BEGIN_DECLS

typedef enum {
  QV_TABLE_TEXT,
  QV_TABLE_CSV,
  QV_TABLE_JSON,
  QV_TABLE_MARKDOWN,
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
} QvModeReport;

/* A newly allocated, NUL-terminated document. */
char *qv_mode_table_format (const QvModeReport *report, QvTableFormat format);

G_END_DECLS
