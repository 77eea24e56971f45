/* qv-output.c — one file written atomically: a hidden temporary file
 * beside the target, written, flushed to disk (fsync), then renamed into
 * place. A failure at any step (a full disk, an I/O error) removes the
 * temporary file and leaves whatever was at the target as it was. Without
 * consent (--force) the rename itself refuses to replace a file, so a file
 * that appears while we write is not lost either.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _GNU_SOURCE 1          /* renameat2 and RENAME_NOREPLACE (glibc ≥ 2.28) */
#include <errno.h>
#include <fcntl.h>
#include <stdio.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>
#include <glib/gstdio.h>
#include "qv-error.h"
#include "qv-output.h"

int
qv_output_commit (const char *temp, const char *final, gboolean replace)
{
  if (replace)
    return g_rename (temp, final) == 0 ? 0 : errno;
#ifdef RENAME_NOREPLACE
  if (renameat2 (AT_FDCWD, temp, AT_FDCWD, final, RENAME_NOREPLACE) == 0)
    return 0;
  if (errno != EINVAL && errno != ENOSYS && errno != ENOTSUP)
    return errno;
#endif
  /* a file system without renameat2 flags: link() also refuses an existing
   * name, atomically */
  if (link (temp, final) == 0)
    {
      (void) g_unlink (temp);
      return 0;
    }
  if (errno == EEXIST)
    return EEXIST;
  /* no hard links either (some network and FAT file systems): check, then
   * rename — the best such a file system allows */
  if (g_file_test (final, G_FILE_TEST_EXISTS))
    return EEXIST;
  return g_rename (temp, final) == 0 ? 0 : errno;
}

int
qv_output_write_fd (int fd, const char *data, gsize length)
{
  while (length > 0)
    {
      gssize n = write (fd, data, MIN (length, (gsize) G_MAXSSIZE));
      if (n < 0)
        {
          if (errno == EINTR)
            continue;
          return errno;
        }
      if (n == 0)
        return EIO;
      data += n;
      length -= (gsize) n;
    }
  return 0;
}

static void
set_exists_error (GError **error, const char *path)
{
  g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "%s exists; pass --force to replace it", path);
}

gboolean
qv_output_write (const char *path, const char *contents, gsize length,
                 gboolean force, GError **error)
{
  g_autofree char *dir = NULL, *base = NULL, *temp = NULL;
  int fd, saved = 0;

  g_return_val_if_fail (path != NULL, FALSE);
  if (*path == '\0')
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "the output file name is empty");
      return FALSE;
    }
  if (g_file_test (path, G_FILE_TEST_IS_DIR))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "%s is a directory", path);
      return FALSE;
    }
  if (!force && g_file_test (path, G_FILE_TEST_EXISTS))
    {
      set_exists_error (error, path);
      return FALSE;
    }

  dir = g_path_get_dirname (path);
  base = g_path_get_basename (path);
  temp = g_strdup_printf ("%s%c.%s.XXXXXX", dir, G_DIR_SEPARATOR, base);
  fd = g_mkstemp_full (temp, O_WRONLY | O_CLOEXEC, 0644);
  if (fd < 0)
    {
      saved = errno;
      g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "cannot write %s: %s", path, g_strerror (saved));
      return FALSE;
    }
  {
    /* g_mkstemp_full creates 0600 whatever the mode: give it the usual one */
    mode_t mask = umask (0);
    umask (mask);
    (void) fchmod (fd, 0644 & ~mask);
  }
  saved = qv_output_write_fd (fd, contents, length);
  if (saved == 0 && fsync (fd) != 0)
    saved = errno;
  if (close (fd) != 0 && saved == 0)
    saved = errno;
  if (saved == 0)
    saved = qv_output_commit (temp, path, force);
  if (saved != 0)
    {
      (void) g_unlink (temp);
      if (saved == EEXIST)
        set_exists_error (error, path);
      else
        g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "cannot write %s: %s", path,
                     g_strerror (saved));
      return FALSE;
    }
  return TRUE;
}
