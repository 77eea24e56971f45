/* qv-welcome-page.h — what a window shows before a document: open a file,
 * open the demo, or pick a recent file.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>

G_BEGIN_DECLS

#define QV_TYPE_WELCOME_PAGE (qv_welcome_page_get_type ())
G_DECLARE_FINAL_TYPE (QvWelcomePage, qv_welcome_page, QV, WELCOME_PAGE, GtkWidget)

/* Number of recent files listed. */
#define QV_WELCOME_MAX_RECENT 6

G_END_DECLS
