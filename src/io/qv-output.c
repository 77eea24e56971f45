/* qv-output.c
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "qv-error.h"
#include "qv-output.h"

gboolean
qv_output_write (const char *path, const char *contents, gsize length,
                 gboolean force, GError **error)
{
  g_autoptr(GError) local = NULL;

  if (!force && g_file_test (path, G_FILE_TEST_EXISTS))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_WRITE,
                   "%s exists; pass --force to replace it", path);
      return FALSE;
    }
  if (g_file_test (path, G_FILE_TEST_IS_DIR))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "%s is a directory", path);
      return FALSE;
    }
  if (!g_file_set_contents_full (path, contents, (gssize) length,
                                 G_FILE_SET_CONTENTS_CONSISTENT, 0644, &local))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "cannot write %s: %s", path, local->message);
      return FALSE;
    }
  return TRUE;
}
