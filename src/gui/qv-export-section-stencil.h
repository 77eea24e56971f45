/* qv-export-section-stencil.h — the export pane's finite-difference
 * stencil: ±h along x, y, z of the selected atoms (6 structures per atom)
 * and the reference, for `quaver collect` to build a Hessian from forces.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-export-pane-private.h"
#include "qv-export-writer.h"

G_BEGIN_DECLS

#define QV_TYPE_EXPORT_SECTION_STENCIL (qv_export_section_stencil_get_type ())
G_DECLARE_FINAL_TYPE (QvExportSectionStencil, qv_export_section_stencil, QV, EXPORT_SECTION_STENCIL, GtkWidget)

void qv_export_section_stencil_set_context (QvExportSectionStencil *self, const QvExportContext *context);
/* The atom selection as typed ("all", "1,3-5"). */
/* Only the symmetry-distinct displacements (offered for a periodic structure). */
void qv_export_section_stencil_set_symmetric (QvExportSectionStencil *self, gboolean symmetric);
void qv_export_section_stencil_set_atoms (QvExportSectionStencil *self, const char *text);
gsize qv_export_section_stencil_get_n_files (QvExportSectionStencil *self);
const char *qv_export_section_stencil_get_preview (QvExportSectionStencil *self);
const char *qv_export_section_stencil_get_message (QvExportSectionStencil *self);
QvExportWriter *qv_export_section_stencil_get_writer (QvExportSectionStencil *self);

G_END_DECLS
