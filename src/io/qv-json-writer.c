/* qv-json-writer.c
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-json-writer.h"

#define MAX_DEPTH 64

struct _QvJsonWriter {
  GString *out;
  guint depth;
  gboolean first[MAX_DEPTH];   /* no member written yet at this depth */
};

QvJsonWriter *
qv_json_writer_new (void)
{
  QvJsonWriter *w = g_new0 (QvJsonWriter, 1);
  w->out = g_string_sized_new (4096);
  w->first[0] = TRUE;
  return w;
}

char *
qv_json_writer_finish (QvJsonWriter *w)
{
  GString *out = w->out;
  g_warn_if_fail (w->depth == 0);
  g_string_append_c (out, '\n');
  g_free (w);
  return g_string_free (out, FALSE);
}

static void
append_string (GString *out, const char *s)
{
  g_string_append_c (out, '"');
  for (const unsigned char *p = (const unsigned char *) s; *p; p++)
    switch (*p)
      {
      case '"': g_string_append (out, "\\\""); break;
      case '\\': g_string_append (out, "\\\\"); break;
      case '\n': g_string_append (out, "\\n"); break;
      case '\r': g_string_append (out, "\\r"); break;
      case '\t': g_string_append (out, "\\t"); break;
      default:
        if (*p < 0x20)
          g_string_append_printf (out, "\\u%04x", *p);
        else
          g_string_append_c (out, (char) *p);
      }
  g_string_append_c (out, '"');
}

/* Separator, newline, indentation and "key": before a value. */
static void
begin_value (QvJsonWriter *w, const char *key)
{
  if (w->depth > 0)
    {
      if (!w->first[w->depth])
        g_string_append_c (w->out, ',');
      g_string_append_c (w->out, '\n');
      for (guint i = 0; i < w->depth; i++)
        g_string_append (w->out, "  ");
    }
  w->first[w->depth] = FALSE;
  if (key)
    {
      append_string (w->out, key);
      g_string_append (w->out, ": ");
    }
}

static void
open_container (QvJsonWriter *w, const char *key, char c)
{
  begin_value (w, key);
  g_string_append_c (w->out, c);
  g_return_if_fail (w->depth + 1 < MAX_DEPTH);
  w->depth++;
  w->first[w->depth] = TRUE;
}

static void
close_container (QvJsonWriter *w, char c)
{
  const gboolean empty = w->first[w->depth];
  g_return_if_fail (w->depth > 0);
  w->depth--;
  if (!empty)
    {
      g_string_append_c (w->out, '\n');
      for (guint i = 0; i < w->depth; i++)
        g_string_append (w->out, "  ");
    }
  g_string_append_c (w->out, c);
}

void qv_json_begin_object (QvJsonWriter *w, const char *key) { open_container (w, key, '{'); }
void qv_json_end_object (QvJsonWriter *w) { close_container (w, '}'); }
void qv_json_begin_array (QvJsonWriter *w, const char *key) { open_container (w, key, '['); }
void qv_json_end_array (QvJsonWriter *w) { close_container (w, ']'); }

void
qv_json_string (QvJsonWriter *w, const char *key, const char *value)
{
  begin_value (w, key);
  if (value)
    append_string (w->out, value);
  else
    g_string_append (w->out, "null");
}

const char *
qv_json_format_double (char *buf, double value)
{
  g_ascii_formatd (buf, G_ASCII_DTOSTR_BUF_SIZE, "%.15g", value);
  if (g_ascii_strtod (buf, NULL) == value)
    return buf;
  g_ascii_formatd (buf, G_ASCII_DTOSTR_BUF_SIZE, "%.16g", value);
  if (g_ascii_strtod (buf, NULL) == value)
    return buf;
  return g_ascii_formatd (buf, G_ASCII_DTOSTR_BUF_SIZE, "%.17g", value);
}

/* Scalars get the shortest spelling; arrays (participations, vectors:
 * millions of numbers in a large table) get the 17-digit round-trip form
 * in one formatting call, four times faster. */
static void
append_number (GString *out, double value, gboolean shortest)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  if (!isfinite (value))
    g_string_append (out, "null");
  else if (shortest)
    g_string_append (out, qv_json_format_double (buf, value == 0.0 ? 0.0 : value));
  else
    g_string_append (out, g_ascii_dtostr (buf, sizeof buf, value == 0.0 ? 0.0 : value));
}

void
qv_json_number (QvJsonWriter *w, const char *key, double value)
{
  begin_value (w, key);
  append_number (w->out, value, TRUE);
}

void
qv_json_int (QvJsonWriter *w, const char *key, gint64 value)
{
  begin_value (w, key);
  g_string_append_printf (w->out, "%" G_GINT64_FORMAT, value);
}

void
qv_json_bool (QvJsonWriter *w, const char *key, gboolean value)
{
  begin_value (w, key);
  g_string_append (w->out, value ? "true" : "false");
}

void
qv_json_null (QvJsonWriter *w, const char *key)
{
  begin_value (w, key);
  g_string_append (w->out, "null");
}

void
qv_json_numbers (QvJsonWriter *w, const char *key, const double *values, gsize n)
{
  begin_value (w, key);
  g_string_append_c (w->out, '[');
  for (gsize i = 0; i < n; i++)
    {
      if (i > 0)
        g_string_append (w->out, ", ");
      append_number (w->out, values[i], n <= 8);
    }
  g_string_append_c (w->out, ']');
}
