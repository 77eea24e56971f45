/* qv-png-writer.h — PNG images (RFC 2083 / ISO 15948) through libpng:
 * 8-bit RGBA with straight alpha, and text chunks that record what the
 * picture shows (mode, amplitude, view), so a figure can be traced back.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* Largest width or height accepted, pixels (PNG allows 2³¹ − 1; this keeps
 * one image below 4 GiB). */
#define QV_PNG_MAX_SIDE 32768

/* Encodes @rgba (width × height × 4 bytes, top row first, straight alpha)
 * as a PNG in memory (newly allocated, *@length bytes). @text holds
 * key, value, key, value…, NULL-terminated (keys of 1–79 Latin-1
 * characters, as PNG requires; values as UTF-8 in iTXt chunks), or NULL.
 * With @opaque the alpha channel is left out (RGB). QV_ERROR_USAGE for a bad
 * size or key. */
guint8 *qv_png_encode (const guint8 *rgba, int width, int height, gboolean opaque,
                       const char *const *text, gsize *length, GError **error);

G_END_DECLS
