/* qv-window-actions.h — the main window's actions (win.*).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include "qv-window.h"

G_BEGIN_DECLS

void qv_window_actions_install (QvWindow *self);
/* Enables what makes sense for the window's state (document, busy). */
void qv_window_actions_update (QvWindow *self);

G_END_DECLS
