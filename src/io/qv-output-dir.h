/* qv-output-dir.h — an export's target directory: new or empty, written
 * file by file, each file atomically, never over someone else's files.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

typedef struct _QvOutputDir QvOutputDir;

/* Opens @path for an export. A missing directory is created (with its
 * parents, mode 0755); an existing empty directory is used; an existing
 * non-empty directory is refused (QV_ERROR_WRITE, "… is not empty; pass
 * --force to write into it") unless @force, and so is a path that is not a
 * directory. Nothing is written or created when it fails. */
QvOutputDir *qv_output_dir_open (const char *path, gboolean force, GError **error);

/* Writes @name (a plain file name: no directory separators, not "." or
 * "..") through a temporary file in the directory, fsync and rename. A file
 * of that name already in the directory is refused unless the directory was
 * opened with force, and so is a name this export already wrote. On failure
 * (QV_ERROR_WRITE) the temporary file is removed and the files written
 * before are left as they are; the caller stops and reports. */
gboolean qv_output_dir_write (QvOutputDir *dir, const char *name,
                              const char *contents, gsize length, GError **error);

const char *qv_output_dir_path (const QvOutputDir *dir);
/* The full path of @name inside the directory (newly allocated). */
char *qv_output_dir_file_path (const QvOutputDir *dir, const char *name);
/* Names written so far, in order (owned by @dir). */
const char *const *qv_output_dir_written (const QvOutputDir *dir, gsize *n);
/* TRUE when qv_output_dir_open created the directory. */
gboolean qv_output_dir_created (const QvOutputDir *dir);

void qv_output_dir_free (QvOutputDir *dir);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvOutputDir, qv_output_dir_free)

/* Test hook: when the environment has QV_TEST_FAIL_AFTER_WRITES=N, the
 * (N+1)-th qv_output_dir_write of the process writes half of its data to
 * the temporary file and then fails as a full disk would, so tests can see
 * the clean-up. Honoured only in builds with -Dtests=true. */
#define QV_OUTPUT_DIR_FAIL_ENV "QV_TEST_FAIL_AFTER_WRITES"

G_END_DECLS
