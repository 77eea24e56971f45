/* qv-export-section-displace.h — the export pane's displaced structures of
 * the selected mode: a ± pair, a scan, a grid with a second mode, the
 * turning points of levels 0…v, or an escape pair along an imaginary mode,
 * with the amplitude in any unit and shown in all of them.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-displacement.h"
#include "qv-export-pane-private.h"
#include "qv-export-writer.h"

G_BEGIN_DECLS

#define QV_TYPE_EXPORT_SECTION_DISPLACE (qv_export_section_displace_get_type ())
G_DECLARE_FINAL_TYPE (QvExportSectionDisplace, qv_export_section_displace, QV, EXPORT_SECTION_DISPLACE, GtkWidget)

void qv_export_section_displace_set_context (QvExportSectionDisplace *self, const QvExportContext *context);
/* Options, as the controls set them (for tests). */
void qv_export_section_displace_set_kind (QvExportSectionDisplace *self, QvDisplaceKind kind);
void qv_export_section_displace_set_points (QvExportSectionDisplace *self, guint points);
/* A value in @unit; NAN: the default amplitude. */
void qv_export_section_displace_set_amplitude (QvExportSectionDisplace *self, QvAmplitudeUnit unit,
                                               double value);
/* The preview: files to write (manifest not counted; 0 when the options
 * make no export), the preview's text, the message under the options. */
gsize qv_export_section_displace_get_n_files (QvExportSectionDisplace *self);
const char *qv_export_section_displace_get_preview (QvExportSectionDisplace *self);
const char *qv_export_section_displace_get_message (QvExportSectionDisplace *self);
/* The plan's notes (the default amplitude's reason…), one a line. */
const char *qv_export_section_displace_get_notes (QvExportSectionDisplace *self);
QvExportWriter *qv_export_section_displace_get_writer (QvExportSectionDisplace *self);

G_END_DECLS
