/* qv-progress.c
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "qv-progress.h"
#include "qv-error.h"

G_DEFINE_QUARK (quaver-error-quark, qv_error)

gboolean
qv_progress_report (const QvProgress *progress, double fraction,
                    const char *stage, GError **error)
{
  if (progress == NULL || progress->func == NULL)
    return TRUE;
  if (progress->func (CLAMP (fraction, 0.0, 1.0), stage, progress->user_data))
    return TRUE;
  g_set_error (error, QV_ERROR, QV_ERROR_CANCELLED, "cancelled during %s", stage);
  return FALSE;
}
