/* qv-fuzz.c — the shared checks of the fuzz targets.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "qv-fuzz.h"

#include <glib/gstdio.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>
#include "qv-error.h"

void
qv_fuzz_fail (const char *reader, const char *format, ...)
{
  va_list args;

  fprintf (stderr, "qv-fuzz: %s: ", reader);
  va_start (args, format);
  vfprintf (stderr, format, args);
  va_end (args);
  fputc ('\n', stderr);
  abort ();
}

void
qv_fuzz_check_failure (const char *reader, gboolean failed, GError *error,
                       const char *name)
{
  if (!failed)
    {
      if (error != NULL)
        qv_fuzz_fail (reader, "a result and an error at once: %s", error->message);
      return;
    }
  if (error == NULL)
    qv_fuzz_fail (reader, "failed without an error");
  if (error->domain != QV_ERROR)
    qv_fuzz_fail (reader, "error outside QV_ERROR (%s %d): %s",
                  g_quark_to_string (error->domain), error->code, error->message);
  if (error->message == NULL || error->message[0] == '\0')
    qv_fuzz_fail (reader, "an empty error message");
  if (!g_utf8_validate (error->message, -1, NULL))
    qv_fuzz_fail (reader, "the message is not UTF-8: %s", error->message);
  if (!g_str_has_prefix (error->message, name)
      || (!g_str_has_suffix (name, "/") && error->message[strlen (name)] != ':'
          && error->message[strlen (name)] != ' '))
    qv_fuzz_fail (reader, "the message does not start with the file's name \"%s\": %s",
                  name, error->message);
  g_error_free (error);
}

static char *folder;

static void
remove_tree (const char *path)
{
  GDir *dir = g_dir_open (path, 0, NULL);
  const char *entry;

  if (dir != NULL)
    {
      while ((entry = g_dir_read_name (dir)) != NULL)
        {
          g_autofree char *child = g_build_filename (path, entry, NULL);

          if (g_file_test (child, G_FILE_TEST_IS_DIR)
              && !g_file_test (child, G_FILE_TEST_IS_SYMLINK))
            remove_tree (child);
          else
            g_unlink (child);
        }
      g_dir_close (dir);
    }
  g_rmdir (path);
}

static void
remove_folder (void)
{
  if (folder != NULL)
    remove_tree (folder);
}

const char *
qv_fuzz_folder (void)
{
  if (folder == NULL)
    {
      g_autoptr(GError) error = NULL;

      /* in memory where there is such a place: the targets write a file
       * for every input */
      if (g_file_test ("/dev/shm", G_FILE_TEST_IS_DIR) && access ("/dev/shm", W_OK) == 0)
        {
          char *shm = g_strdup ("/dev/shm/qv-fuzz-XXXXXX");

          if (g_mkdtemp (shm) != NULL)
            folder = shm;
          else
            g_free (shm);
        }
      if (folder == NULL)
        folder = g_dir_make_tmp ("qv-fuzz-XXXXXX", &error);
      if (folder == NULL)
        qv_fuzz_fail ("setup", "no temporary folder: %s", error->message);
      atexit (remove_folder);
    }
  return folder;
}

void
qv_fuzz_write (const char *path, const void *data, gsize size)
{
  /* plain stdio, not g_file_set_contents: that syncs the disk on every
   * replacement, which would cost most of the fuzzer's time */
  FILE *f = fopen (path, "wb");

  if (f == NULL || (size > 0 && fwrite (data, 1, size, f) != size) || fclose (f) != 0)
    qv_fuzz_fail ("setup", "cannot write %s", path);
}

void
qv_fuzz_init (void)
{
  g_log_set_always_fatal (G_LOG_LEVEL_CRITICAL | G_LOG_LEVEL_WARNING);
  /* The CLI and the app use the C locale for numbers whatever LANG says;
   * the readers must not depend on it either way. */
  g_setenv ("OPENBLAS_NUM_THREADS", "1", TRUE);
}
