/* qv-application.h — the GtkApplication of the desktop app.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>

G_BEGIN_DECLS

#define QV_TYPE_APPLICATION (qv_application_get_type ())
G_DECLARE_FINAL_TYPE (QvApplication, qv_application, QV, APPLICATION, GtkApplication)

QvApplication *qv_application_new (void);
/* A new main window showing the welcome page. */
GtkWindow *qv_application_new_window (QvApplication *app);
/* The focused main window, creating one when there is none. */
GtkWindow *qv_application_get_main_window (QvApplication *app);

G_END_DECLS
