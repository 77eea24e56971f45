/* qv-preferences-window.h — the Preferences window.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>

G_BEGIN_DECLS

#define QV_TYPE_PREFERENCES_WINDOW (qv_preferences_window_get_type ())
G_DECLARE_FINAL_TYPE (QvPreferencesWindow, qv_preferences_window, QV, PREFERENCES_WINDOW, GtkWindow)

GtkWindow *qv_preferences_window_new (GtkWindow *parent);

G_END_DECLS
