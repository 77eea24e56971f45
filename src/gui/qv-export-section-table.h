/* qv-export-section-table.h — the export pane's mode table: columns,
 * format, scale factor and temperature; a preview; copy and save.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-export-pane-private.h"
#include "qv-mode-table.h"

G_BEGIN_DECLS

#define QV_TYPE_EXPORT_SECTION_TABLE (qv_export_section_table_get_type ())
G_DECLARE_FINAL_TYPE (QvExportSectionTable, qv_export_section_table, QV, EXPORT_SECTION_TABLE, GtkWidget)

void qv_export_section_table_set_context (QvExportSectionTable *self, const QvExportContext *context);
void qv_export_section_table_set_format (QvExportSectionTable *self, QvTableFormat format);
QvTableFormat qv_export_section_table_get_format (QvExportSectionTable *self);
/* Ticks or clears column @column. */
void qv_export_section_table_set_column (QvExportSectionTable *self, QvTableColumn column, gboolean shown);
/* The table as it would be copied or saved (newly allocated), or NULL
 * without a document or without columns. */
char *qv_export_section_table_build (QvExportSectionTable *self);
/* What Save… does after the chooser (atomic; an existing @path only with
 * @force). */
gboolean qv_export_section_table_save_to (QvExportSectionTable *self, const char *path,
                                          gboolean force, GError **error);
/* The preview's summary line, for tests. */
const char *qv_export_section_table_get_summary (QvExportSectionTable *self);

G_END_DECLS
