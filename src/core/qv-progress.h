/* qv-progress.h — progress reports and cancellation for long core calls.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* Called from whatever thread runs the work. @fraction is in [0, 1] for the
 * whole call; @stage is a short untranslated description ("mass weighting").
 * Return FALSE to cancel: the call then fails with QV_ERROR_CANCELLED at the
 * next check point (a running LAPACK routine is not interrupted). */
typedef gboolean (*QvProgressFunc) (double fraction, const char *stage, gpointer user_data);

typedef struct {
  QvProgressFunc func;
  gpointer user_data;
} QvProgress;

/* Reports progress; returns FALSE and sets QV_ERROR_CANCELLED when the
 * callback asks to stop. A NULL @progress or NULL func never cancels. */
gboolean qv_progress_report (const QvProgress *progress, double fraction,
                             const char *stage, GError **error);

G_END_DECLS
