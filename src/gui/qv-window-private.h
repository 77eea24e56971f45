/* qv-window-private.h — what the window's actions reach inside it.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include "qv-export-pane.h"
#include "qv-window.h"

G_BEGIN_DECLS

GtkRevealer *qv_window_get_export_revealer (QvWindow *self);
QvExportPane *qv_window_get_export_pane (QvWindow *self);

G_END_DECLS
