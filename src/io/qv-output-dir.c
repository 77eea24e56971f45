/* qv-output-dir.c — an export's target directory, written file by file.
 * Each file goes to a hidden temporary file beside its final name, is
 * flushed to disk and renamed: a reader sees the whole file or none. A
 * failure removes the temporary file and leaves the files written before.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <errno.h>
#include <fcntl.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>
#include <glib/gstdio.h>
#include "qv-config.h"
#include "qv-error.h"
#include "qv-output.h"
#include "qv-output-dir.h"

struct _QvOutputDir {
  char *path;
  gboolean force;
  gboolean created;
  GPtrArray *written;          /* char*, NULL-terminated for the getter */
  GHashTable *names;           /* the same names, for lookups */
};

static gboolean
directory_is_empty (const char *path, gboolean *empty, GError **error)
{
  g_autoptr(GError) local = NULL;
  GDir *dir = g_dir_open (path, 0, &local);

  if (dir == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "cannot read the directory %s: %s", path,
                   local->message);
      return FALSE;
    }
  *empty = g_dir_read_name (dir) == NULL;
  g_dir_close (dir);
  return TRUE;
}

QvOutputDir *
qv_output_dir_open (const char *path, gboolean force, GError **error)
{
  QvOutputDir *dir;
  gboolean created = FALSE;

  g_return_val_if_fail (path != NULL, NULL);
  if (*path == '\0')
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "the output directory name is empty");
      return NULL;
    }
  if (g_file_test (path, G_FILE_TEST_EXISTS))
    {
      gboolean empty = FALSE;

      if (!g_file_test (path, G_FILE_TEST_IS_DIR))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_WRITE,
                       "%s exists and is not a directory; give a new or empty directory", path);
          return NULL;
        }
      if (!directory_is_empty (path, &empty, error))
        return NULL;
      if (!empty && !force)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_WRITE,
                       "%s is not empty; give a new or empty directory, or pass --force to "
                       "write into it (files of the same names are then replaced)", path);
          return NULL;
        }
    }
  else
    {
      if (g_mkdir_with_parents (path, 0755) != 0)
        {
          int saved = errno;
          g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "cannot create the directory %s: %s",
                       path, g_strerror (saved));
          return NULL;
        }
      created = TRUE;
    }
  dir = g_new0 (QvOutputDir, 1);
  dir->path = g_strdup (path);
  dir->force = force;
  dir->created = created;
  dir->written = g_ptr_array_new_with_free_func (g_free);
  g_ptr_array_add (dir->written, NULL);
  dir->names = g_hash_table_new (g_str_hash, g_str_equal);
  return dir;
}

static gboolean
valid_name (const char *name)
{
  return name != NULL && *name != '\0' && strcmp (name, ".") != 0 && strcmp (name, "..") != 0
         && strchr (name, '/') == NULL && strchr (name, '\\') == NULL;
}

/* The test hook of qv-output-dir.h: how many writes succeed before one
 * fails; -1 when no failure is injected. */
static gint64
writes_before_failure (void)
{
#ifdef QV_TEST_HOOKS
  const char *value = g_getenv (QV_OUTPUT_DIR_FAIL_ENV);
  if (value != NULL && *value != '\0')
    return g_ascii_strtoll (value, NULL, 10);
#endif
  return -1;
}

gboolean
qv_output_dir_write (QvOutputDir *dir, const char *name, const char *contents, gsize length,
                     GError **error)
{
  static gint64 writes_done = 0;   /* for the test hook, process-wide */
  g_autofree char *final = NULL, *temp = NULL;
  gint64 fail_after = writes_before_failure ();
  int fd, saved = 0;
  gboolean ok;

  g_return_val_if_fail (dir != NULL, FALSE);
  if (!valid_name (name))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_WRITE,
                   "'%s' is not a plain file name (no directories)", name ? name : "");
      return FALSE;
    }
  if (g_hash_table_contains (dir->names, name))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "%s was already written by this export",
                   name);
      return FALSE;
    }
  final = g_build_filename (dir->path, name, NULL);
  if (g_file_test (final, G_FILE_TEST_IS_DIR)
      || (!dir->force && g_file_test (final, G_FILE_TEST_EXISTS)))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "%s exists; pass --force to replace it",
                   final);
      return FALSE;
    }

  temp = g_strdup_printf ("%s%c.%s.XXXXXX", dir->path, G_DIR_SEPARATOR, name);
  fd = g_mkstemp_full (temp, O_WRONLY | O_CLOEXEC, 0644);
  if (fd < 0)
    {
      saved = errno;
      g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "cannot write %s: %s", final,
                   g_strerror (saved));
      return FALSE;
    }
  /* g_mkstemp_full creates 0600 whatever the mode: give it the usual one */
  {
    mode_t mask = umask (0);
    umask (mask);
    (void) fchmod (fd, 0644 & ~mask);
  }

  if (fail_after >= 0 && writes_done >= fail_after)
    {
      /* the injected failure: half the data reach the temporary file, as
       * when a disk fills up */
      (void) qv_output_write_fd (fd, contents, length / 2);
      saved = ENOSPC;
      ok = FALSE;
    }
  else
    ok = (saved = qv_output_write_fd (fd, contents, length)) == 0;
  if (ok && fsync (fd) != 0)
    {
      saved = errno;
      ok = FALSE;
    }
  if (close (fd) != 0 && ok)
    {
      saved = errno;
      ok = FALSE;
    }
  /* without --force the rename refuses to replace a file that appeared
   * since the check above */
  if (ok && (saved = qv_output_commit (temp, final, dir->force)) != 0)
    ok = FALSE;
  if (!ok)
    {
      (void) g_unlink (temp);
      if (saved == EEXIST)
        g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "%s exists; pass --force to replace it",
                     final);
      else
        g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "cannot write %s: %s", final,
                     g_strerror (saved));
      return FALSE;
    }
  writes_done++;
  {
    char *copy = g_strdup (name);
    g_ptr_array_insert (dir->written, (gint) dir->written->len - 1, copy);
    g_hash_table_add (dir->names, copy);
  }
  return TRUE;
}

const char *
qv_output_dir_path (const QvOutputDir *dir)
{
  return dir->path;
}

char *
qv_output_dir_file_path (const QvOutputDir *dir, const char *name)
{
  return g_build_filename (dir->path, name, NULL);
}

const char *const *
qv_output_dir_written (const QvOutputDir *dir, gsize *n)
{
  if (n)
    *n = dir->written->len - 1;
  return (const char *const *) dir->written->pdata;
}

gboolean
qv_output_dir_created (const QvOutputDir *dir)
{
  return dir->created;
}

void
qv_output_dir_free (QvOutputDir *dir)
{
  if (dir == NULL)
    return;
  g_hash_table_destroy (dir->names);
  g_ptr_array_free (dir->written, TRUE);
  g_free (dir->path);
  g_free (dir);
}
