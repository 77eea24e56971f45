/* qv-gui-private.h — app-wide pieces shared inside src/gui.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* Called by the 3D view at its first drawn frame: with
 * QV_REPORT_FIRST_FRAME=1 prints the time since the process started on
 * stderr, with QV_REPORT_FIRST_FRAME=quit also quits the app. */
void qv_gui_first_frame (void);
/* Seconds since the process started (from /proc where there is one, else
 * since the app's start). */
double qv_gui_seconds_since_start (void);

G_END_DECLS
