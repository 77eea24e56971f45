/* qv-export-section-ensemble.h — the export pane's thermal ensemble:
 * harmonic Wigner samples of all modes with velocities, from a seed shown
 * so the set can be made again.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-export-pane-private.h"
#include "qv-export-writer.h"

G_BEGIN_DECLS

#define QV_TYPE_EXPORT_SECTION_ENSEMBLE (qv_export_section_ensemble_get_type ())
G_DECLARE_FINAL_TYPE (QvExportSectionEnsemble, qv_export_section_ensemble, QV, EXPORT_SECTION_ENSEMBLE, GtkWidget)

void qv_export_section_ensemble_set_context (QvExportSectionEnsemble *self, const QvExportContext *context);
void qv_export_section_ensemble_set_count (QvExportSectionEnsemble *self, guint count);
void qv_export_section_ensemble_set_seed (QvExportSectionEnsemble *self, guint64 seed);
guint64 qv_export_section_ensemble_get_seed (QvExportSectionEnsemble *self);
/* Files to write (manifest not counted; 0 when the options make none). */
gsize qv_export_section_ensemble_get_n_files (QvExportSectionEnsemble *self);
const char *qv_export_section_ensemble_get_preview (QvExportSectionEnsemble *self);
QvExportWriter *qv_export_section_ensemble_get_writer (QvExportSectionEnsemble *self);

G_END_DECLS
