/* qv-error-dialog.h — the app's one way of saying that something failed:
 * a modal message dialog with the failure and the error's own message,
 * selectable (a reader's file:line:col is worth copying).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>

G_BEGIN_DECLS

/* Shows @primary and @error's message (NULL: none) over the window that
 * holds @near (a window or any widget in one). The dialog destroys itself
 * when answered; it is returned for a caller that keeps track of it. */
GtkWindow *qv_error_dialog_show (GtkWidget *near, const char *primary, const GError *error);

G_END_DECLS
