/* qv-export-section-animation.h — the export pane's animation of the
 * selected mode: one period as a looping GIF and as multi-frame XYZ for
 * other programs.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-export-pane-private.h"
#include "qv-export-writer.h"

G_BEGIN_DECLS

#define QV_TYPE_EXPORT_SECTION_ANIMATION (qv_export_section_animation_get_type ())
G_DECLARE_FINAL_TYPE (QvExportSectionAnimation, qv_export_section_animation, QV, EXPORT_SECTION_ANIMATION, GtkWidget)

void qv_export_section_animation_set_context (QvExportSectionAnimation *self, const QvExportContext *context);
void qv_export_section_animation_set_frames (QvExportSectionAnimation *self, guint n_frames);
void qv_export_section_animation_set_size (QvExportSectionAnimation *self, int width, int height);
/* 0 GIF, 1 XYZ, 2 both. */
void qv_export_section_animation_set_format (QvExportSectionAnimation *self, guint format);
const char *qv_export_section_animation_get_preview (QvExportSectionAnimation *self);
QvExportWriter *qv_export_section_animation_get_writer (QvExportSectionAnimation *self);

G_END_DECLS
