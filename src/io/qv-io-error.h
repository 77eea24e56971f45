/* qv-io-error.h — reader errors that say where: "file:line:column: what".
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-error.h"

G_BEGIN_DECLS

/* Sets QV_ERROR_INPUT with "FILE:LINE:COL: message" (":COL" left out when
 * @column is 0, ":LINE" too when @line is 0). Lines and columns count from 1. */
void qv_io_error (GError **error, const char *file, gsize line, gsize column,
                  const char *format, ...) G_GNUC_PRINTF (5, 6);

/* Reads a whole file; a missing or unreadable file is QV_ERROR_INPUT with
 * "FILE: reason". Refuses files larger than @max_bytes (QV_ERROR_LIMIT). */
gboolean qv_io_read_file (const char *path, gsize max_bytes, char **contents,
                          gsize *length, GError **error);

G_END_DECLS
