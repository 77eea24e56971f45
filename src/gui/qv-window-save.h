/* qv-window-save.h — "Save as Bundle…" (win.save-bundle) and the question
 * before a window with unsaved work closes (qv-document-save.h says what
 * counts as unsaved).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <adwaita.h>
#include "qv-window.h"

G_BEGIN_DECLS

/* Asks where to save the window's document as a bundle and saves it. */
void qv_window_save_choose (QvWindow *window);
/* For the window's close-request: TRUE when the window must stay open for
 * now because the question "Save as Bundle… / Discard / Cancel" is shown
 * (or a save it started is still being chosen); FALSE to close. */
gboolean qv_window_save_close_request (QvWindow *window);

/* For tests: the question on screen, the file chooser of a save, or NULL. */
AdwMessageDialog *qv_window_save_get_question (QvWindow *window);
GtkFileChooserNative *qv_window_save_get_chooser (QvWindow *window);

G_END_DECLS
