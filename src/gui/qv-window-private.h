/* qv-window-private.h — what the window's actions reach inside it.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <adwaita.h>
#include "qv-export-pane.h"
#include "qv-window.h"

G_BEGIN_DECLS

AdwFlap *qv_window_get_export_flap (QvWindow *self);
QvExportPane *qv_window_get_export_pane (QvWindow *self);

G_END_DECLS
