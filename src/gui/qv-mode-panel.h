/* qv-mode-panel.h — the side list: what the document is, warnings, the
 * level v, and one sortable row per mode.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-document.h"

G_BEGIN_DECLS

#define QV_TYPE_MODE_PANEL (qv_mode_panel_get_type ())
G_DECLARE_FINAL_TYPE (QvModePanel, qv_mode_panel, QV, MODE_PANEL, GtkWidget)

/* Rebuilds the rows for @doc's modes (NULL clears). */
void qv_mode_panel_set_document (QvModePanel *self, QvDocument *doc);
/* Property "level": v of the turning points, 0–50. */
guint qv_mode_panel_get_level (QvModePanel *self);
void qv_mode_panel_set_level (QvModePanel *self, guint level);
/* Property "selected": the selected mode's index (0-based), −1 for none. */
int qv_mode_panel_get_selected (QvModePanel *self);
/* Selects mode @index (clamped) and scrolls its row into view. */
void qv_mode_panel_select (QvModePanel *self, int index);
/* Moves the selection by @delta rows in the list's current order. */
void qv_mode_panel_step (QvModePanel *self, int delta);
/* The rows as shown (sorted), QvModeItem each. */
GListModel *qv_mode_panel_get_rows (QvModePanel *self);
/* The text a row's cell shows: column 0 index, 1 wavenumber, 2 reduced mass,
 * 3 turning point, 4 largest displacement, 5 symmetry species (shown after
 * the wavenumber). For tests. */
char *qv_mode_panel_cell_text (QvModePanel *self, guint row, guint column);
/* The summary's point-group line ("Point group C2v · symmetry number 2 …"). */
const char *qv_mode_panel_get_symmetry_summary (QvModePanel *self);
/* Sorts by @column (as above), ascending or not (as a header click would). */
void qv_mode_panel_sort_by (QvModePanel *self, guint column, gboolean ascending);

G_END_DECLS
