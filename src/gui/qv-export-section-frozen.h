/* qv-export-section-frozen.h — the export pane's frozen phonon: for a
 * crystal, a supercell displaced along the lattice mode chosen on the
 * Lattice page (qv_frozen_phonon_new_in_crystal), as `quaver
 * frozen-phonon` writes it.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-export-pane-private.h"
#include "qv-export-writer.h"

G_BEGIN_DECLS

#define QV_TYPE_EXPORT_SECTION_FROZEN (qv_export_section_frozen_get_type ())
G_DECLARE_FINAL_TYPE (QvExportSectionFrozen, qv_export_section_frozen, QV, EXPORT_SECTION_FROZEN, GtkWidget)

void qv_export_section_frozen_set_context (QvExportSectionFrozen *self, const QvExportContext *context);
/* The largest atomic displacement (Å) and the phase (degrees). */
void qv_export_section_frozen_set_amplitude (QvExportSectionFrozen *self, double largest, double phase_deg);
/* What the section would write: the q (fractional), the branch (0-based,
 * ascending at q) and the supercell; FALSE when it cannot write. */
gboolean qv_export_section_frozen_get_plan (QvExportSectionFrozen *self, double q[3], gsize *branch,
                                            int matrix[3][3]);
const char *qv_export_section_frozen_get_mode_text (QvExportSectionFrozen *self);
const char *qv_export_section_frozen_get_message (QvExportSectionFrozen *self);
QvExportWriter *qv_export_section_frozen_get_writer (QvExportSectionFrozen *self);

G_END_DECLS
