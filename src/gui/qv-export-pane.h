/* qv-export-pane.h — the export pane beside the mode list: one section each
 * for the mode table, displaced structures, a thermal ensemble, a
 * finite-difference stencil, a picture and an animation, all of the mode
 * selected in the window. Each says what it will write before it writes.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>

G_BEGIN_DECLS

#define QV_TYPE_EXPORT_PANE (qv_export_pane_get_type ())
G_DECLARE_FINAL_TYPE (QvExportPane, qv_export_pane, QV, EXPORT_PANE, GtkWidget)

/* Follows @window's selection, level and amplitude from now on (@window is
 * not referenced: the pane lives inside it). */
void qv_export_pane_attach (QvExportPane *self, GtkWidget *window);
/* The window's document changed (opened, closed, re-solved). */
void qv_export_pane_update (QvExportPane *self);

/* A section by name ("table", "displace", "ensemble", "stencil",
 * "picture", "animation"), or NULL when this build has none of that name;
 * opens it when @expand. */
GtkWidget *qv_export_pane_get_section (QvExportPane *self, const char *name, gboolean expand);
/* The line that says which mode the pane works on, for tests. */
const char *qv_export_pane_get_heading (QvExportPane *self);

G_END_DECLS
