/* qv-gui.h — the one entry point of the desktop app.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once

/* Binds the translations, creates the GtkApplication and runs it with the
 * app's own arguments (FILE…, --demo). Returns the exit status. Only the
 * command's GUI path calls this: headless commands never create an
 * application, so they need no display and no D-Bus. */
int qv_gui_run (int argc, char **argv);

/* Binds the gettext domain: the installed catalogue when there is one, the
 * build tree's otherwise (running uninstalled). Called by qv_gui_run; tests
 * call it themselves. */
void qv_gui_init_i18n (void);
