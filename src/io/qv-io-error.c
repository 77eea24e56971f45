/* qv-io-error.c
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <errno.h>
#include <stdio.h>
#include <sys/stat.h>
#include "qv-io-error.h"

void
qv_io_error (GError **error, const char *file, gsize line, gsize column,
             const char *format, ...)
{
  va_list args;
  g_autofree char *message = NULL;

  va_start (args, format);
  message = g_strdup_vprintf (format, args);
  va_end (args);
  /* Messages quote the offending text, which in a broken or binary file
   * need not be UTF-8; the terminal and the app's dialogs need it to be
   * (invalid bytes become U+FFFD). */
  if (!g_utf8_validate (message, -1, NULL))
    {
      char *valid = g_utf8_make_valid (message, -1);

      g_free (message);
      message = valid;
    }

  if (line > 0 && column > 0)
    g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "%s:%" G_GSIZE_FORMAT ":%" G_GSIZE_FORMAT ": %s",
                 file, line, column, message);
  else if (line > 0)
    g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "%s:%" G_GSIZE_FORMAT ": %s", file, line, message);
  else
    g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "%s: %s", file, message);
}

gboolean
qv_io_read_file (const char *path, gsize max_bytes, char **contents,
                 gsize *length, GError **error)
{
  struct stat st;
  g_autoptr(GError) local = NULL;

  if (stat (path, &st) != 0)
    {
      qv_io_error (error, path, 0, 0, "cannot open: %s", g_strerror (errno));
      return FALSE;
    }
  if (S_ISDIR (st.st_mode))
    {
      qv_io_error (error, path, 0, 0, "is a directory, expected a file");
      return FALSE;
    }
  if (S_ISREG (st.st_mode) && (guint64) st.st_size > max_bytes)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                   "%s: file is %" G_GUINT64_FORMAT " bytes, more than the %" G_GSIZE_FORMAT
                   " this reader accepts", path, (guint64) st.st_size, max_bytes);
      return FALSE;
    }
  if (!g_file_get_contents (path, contents, length, &local))
    {
      qv_io_error (error, path, 0, 0, "cannot read: %s", local->message);
      return FALSE;
    }
  return TRUE;
}
