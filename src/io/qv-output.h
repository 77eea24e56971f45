/* qv-output.h — atomic writes that never overwrite by accident.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* Writes @contents to @path through a temporary file beside it, fsync and
 * a rename, so a reader never sees a half-written file, and a failure (a
 * full disk) removes the temporary file and leaves an earlier @path as it
 * was. An existing @path is an error (QV_ERROR_WRITE, "…exists; pass
 * --force to replace it") unless @force — also when it appears during the
 * write. */
gboolean qv_output_write (const char *path, const char *contents, gsize length,
                          gboolean force, GError **error);

/* The pieces, for writers of several files (qv-output-dir.h): */
/* Writes all of @data to @fd; 0 or an errno. */
int qv_output_write_fd (int fd, const char *data, gsize length);
/* Renames the written @temp to @final; without @replace never replaces an
 * existing @final (atomically: RENAME_NOREPLACE, or a hard link). 0 or an
 * errno (EEXIST when @final exists). @temp is left for the caller to
 * remove on failure. */
int qv_output_commit (const char *temp, const char *final, gboolean replace);

G_END_DECLS
