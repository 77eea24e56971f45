/* qv-export-section-picture.h — the export pane's still picture of the
 * selected mode: PNG from the offscreen renderer and SVG of the same view,
 * with the window's camera and amplitude.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-export-pane-private.h"
#include "qv-export-writer.h"
#include "qv-picture.h"

G_BEGIN_DECLS

#define QV_TYPE_EXPORT_SECTION_PICTURE (qv_export_section_picture_get_type ())
G_DECLARE_FINAL_TYPE (QvExportSectionPicture, qv_export_section_picture, QV, EXPORT_SECTION_PICTURE, GtkWidget)

void qv_export_section_picture_set_context (QvExportSectionPicture *self, const QvExportContext *context);
void qv_export_section_picture_set_size (QvExportSectionPicture *self, int width, int height);
/* 0 PNG, 1 SVG, 2 both. */
void qv_export_section_picture_set_format (QvExportSectionPicture *self, guint format);
const char *qv_export_section_picture_get_preview (QvExportSectionPicture *self);
QvExportWriter *qv_export_section_picture_get_writer (QvExportSectionPicture *self);

/* What the pane's picture and animation share: a request for mode
 * @context->mode of @structure/@modes (the worker's copies) at the motion
 * bar's amplitude, with the mode view's camera (fitted to the picture when
 * @fit), arrows, labels, colouring and background; the caller sets size
 * and the rest. FALSE without a mode. */
gboolean qv_export_picture_request (QvPictureRequest *request, const QvExportContext *context,
                                    const QvStructure *structure, const QvModeSet *modes,
                                    gboolean fit);
/* The PNG text chunks (key, value, …, NULL) saying what a picture shows. */
char **qv_export_picture_text (const QvPictureRequest *request, const char *source);

G_END_DECLS
