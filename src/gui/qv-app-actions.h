/* qv-app-actions.h — the application's actions (app.*) and their keys.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include "qv-application.h"

G_BEGIN_DECLS

void qv_app_actions_install (QvApplication *app);
void qv_app_show_about (GtkWindow *parent);

G_END_DECLS
