/* qv-output.h — atomic writes that never overwrite by accident.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* Writes @contents to @path through a temporary file and a rename, so a
 * reader never sees a half-written file. An existing @path is an error
 * (QV_ERROR_WRITE, "…exists; pass --force to replace it") unless @force. */
gboolean qv_output_write (const char *path, const char *contents, gsize length,
                          gboolean force, GError **error);

G_END_DECLS
