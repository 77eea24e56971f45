/* qv-compare-window.h — the open document's modes (A) against those of a
 * second bundle (B): read and solved on a worker, compared by the core
 * (qv-mode-comparison.h), shown as an overlap heat map with the matching;
 * the matrix saved as CSV in the layout of `quaver compare --format csv`.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-document.h"
#include "qv-mode-comparison.h"
#include "qv-overlap-map.h"

G_BEGIN_DECLS

#define QV_TYPE_COMPARE_WINDOW (qv_compare_window_get_type ())
G_DECLARE_FINAL_TYPE (QvCompareWindow, qv_compare_window, QV, COMPARE_WINDOW, GtkWindow)

/* A window for @doc's modes as they are now (copied), beside @parent. */
QvCompareWindow *qv_compare_window_new (GtkWindow *parent, QvDocument *doc);
/* Reads B from @source (a bundle, or a geometry with its Hessian) and
 * compares, on workers; the window shows progress, then the map or the
 * error. Replaces an earlier B. */
void qv_compare_window_load (QvCompareWindow *self, const QvDocumentSource *source);

/* Reading or comparing. */
gboolean qv_compare_window_is_busy (QvCompareWindow *self);
/* The comparison shown, or NULL (busy, failed). */
const QvModeComparison *qv_compare_window_get_comparison (QvCompareWindow *self);
/* Why the last load or comparison failed, or NULL. */
const char *qv_compare_window_get_error (QvCompareWindow *self);
QvOverlapMap *qv_compare_window_get_map (QvCompareWindow *self);
/* The text under the map (the hovered cell's read-out or the hint). */
const char *qv_compare_window_get_readout (QvCompareWindow *self);

/* The CSV of the shown comparison (NULL without one). */
char *qv_compare_window_format_csv (QvCompareWindow *self);
/* Writes it atomically (qv_output_write; refuses an existing file unless
 * @force). */
gboolean qv_compare_window_save_csv (QvCompareWindow *self, const char *path, gboolean force,
                                     GError **error);

G_END_DECLS
