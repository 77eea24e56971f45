/* qv-json-writer.h — a small streaming JSON writer for outputs (tables,
 * manifests). Builds the text directly: no node tree, so memory stays at the
 * size of the output even for thousands of modes.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

typedef struct _QvJsonWriter QvJsonWriter;

QvJsonWriter *qv_json_writer_new (void);
/* Returns the document (with a final newline) and frees the writer. */
char *qv_json_writer_finish (QvJsonWriter *writer);

/* @key is the member name inside an object, NULL inside an array or at the
 * top level. Numbers are written in the shortest form that reads back to
 * the same double; non-finite numbers are written as null. */
void qv_json_begin_object (QvJsonWriter *w, const char *key);
void qv_json_end_object (QvJsonWriter *w);
void qv_json_begin_array (QvJsonWriter *w, const char *key);
void qv_json_end_array (QvJsonWriter *w);
void qv_json_string (QvJsonWriter *w, const char *key, const char *value);
void qv_json_number (QvJsonWriter *w, const char *key, double value);
void qv_json_int (QvJsonWriter *w, const char *key, gint64 value);
void qv_json_bool (QvJsonWriter *w, const char *key, gboolean value);
void qv_json_null (QvJsonWriter *w, const char *key);
/* An array of numbers on one line; arrays longer than 8 use the 17-digit
 * round-trip spelling rather than the shortest (it is faster). */
void qv_json_numbers (QvJsonWriter *w, const char *key, const double *values, gsize n);

/* Shortest "%.*g" spelling of @value that reads back exactly; @buf holds
 * G_ASCII_DTOSTR_BUF_SIZE bytes. */
const char *qv_json_format_double (char *buf, double value);

G_END_DECLS
