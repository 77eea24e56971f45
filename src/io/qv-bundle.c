/* qv-bundle.c — reads the Quaver bundle, *.quaver.json, version 1.
 *
 * Two passes. The first is our own strict JSON syntax check (RFC 8259): it
 * bounds the nesting depth before json-glib, which has no depth limit and
 * recurses, ever sees the text, and it rejects what json-glib would quietly
 * accept (comments, single quotes, trailing text, integers that wrap around
 * 64 bits), with "FILE:LINE:COL: …" messages. The second walks json-glib's
 * tree, whose nodes have no positions; a message there names the JSON path
 * of the offending value ("structure.atoms[3].position"), and only then, to
 * place it, the same tokenizer runs once more over the text following the
 * path of every value: "FILE:LINE:COL: PATH: …". The good path pays nothing.
 *
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <errno.h>
#include <limits.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <json-glib/json-glib.h>
#include "qv-bundle.h"
#include "qv-element.h"
#include "qv-hessian-file.h"
#include "qv-io-error.h"
#include "qv-size.h"

#define BUNDLE_FORMAT "quaver-bundle"
#define BUNDLE_VERSION 1
/* Largest bundle file read (the text; matrices beyond QV_BUNDLE_MAX_INLINE_N
 * live in their own files). */
#define BUNDLE_MAX_BYTES ((gsize) 512 * 1024 * 1024)

/* ------------------------------------------------------------------------ */
/* Pass 1: strict syntax and depth                                          */
/* ------------------------------------------------------------------------ */

/* For the run that places an error: the JSON path of the value being
 * scanned, spelt as in the messages (keys joined by '.', array indices in
 * brackets), and where @target was seen. */
typedef struct {
  const char *target;         /* "" for the whole document */
  gboolean name;              /* the member name at @target, not its value */
  GString *path;
  gsize line;                 /* of the last match, since json-glib keeps the */
  gsize column;               /* last of duplicate keys; 0 when none */
} Locate;

typedef struct {
  const char *p;
  const char *end;
  const char *name;
  gsize line;
  gsize column;               /* of the character at p, counted in characters */
  GError **error;
  Locate *locate;             /* NULL for the syntax check */
} Scan;

static void
scan_advance (Scan *s)
{
  const unsigned char c = (unsigned char) *s->p++;
  if (c == '\n')
    {
      s->line++;
      s->column = 1;
    }
  else if (s->p >= s->end || ((unsigned char) *s->p & 0xC0) != 0x80)
    s->column++;
}

static int
scan_peek (const Scan *s)
{
  return s->p < s->end ? (unsigned char) *s->p : -1;
}

static gboolean scan_fail (Scan *s, const char *format, ...) G_GNUC_PRINTF (2, 3);

static gboolean
scan_fail (Scan *s, const char *format, ...)
{
  va_list args;
  g_autofree char *message = NULL;

  va_start (args, format);
  message = g_strdup_vprintf (format, args);
  va_end (args);
  qv_io_error (s->error, s->name, s->line, s->column, "%s", message);
  return FALSE;
}

/* What stands at the scan position, for messages: "'x'", "end of file". */
static char *
scan_found (const Scan *s)
{
  const int c = scan_peek (s);
  if (c < 0)
    return g_strdup ("the end of the file");
  if (c >= 0x21 && c < 0x7F)
    return g_strdup_printf ("'%c'", c);
  if (c < 0x80)
    return g_strdup_printf ("the control character U+%04X", (guint) c);
  return g_strdup_printf ("U+%04X", (guint) g_utf8_get_char (s->p));
}

/* "expected WHAT, found X", with a hint for the usual non-JSON habits. */
static gboolean
scan_expected (Scan *s, const char *what)
{
  g_autofree char *found = NULL;
  if (scan_peek (s) == '/')
    return scan_fail (s, "comments are not part of JSON");
  if (scan_peek (s) == '\'')
    return scan_fail (s, "strings are written in double quotes in JSON");
  found = scan_found (s);
  return scan_fail (s, "expected %s, found %s", what, found);
}

static void
scan_space (Scan *s)
{
  while (s->p < s->end && (*s->p == ' ' || *s->p == '\t' || *s->p == '\n' || *s->p == '\r'))
    scan_advance (s);
}

static gboolean
scan_hex4 (Scan *s, guint *value)
{
  *value = 0;
  for (int k = 0; k < 4; k++)
    {
      const int c = scan_peek (s);
      if (!g_ascii_isxdigit (c))
        return scan_fail (s, "\\u must be followed by four hexadecimal digits");
      *value = *value * 16 + (guint) g_ascii_xdigit_value ((char) c);
      scan_advance (s);
    }
  return TRUE;
}

/* A string; its decoded text is appended to @out unless that is NULL. */
static gboolean
scan_string (Scan *s, GString *out)
{
  static const char escapes[] = "\"\\/bfnrt";
  const gsize line = s->line, column = s->column;

  scan_advance (s);                      /* the opening quote */
  for (;;)
    {
      const int c = scan_peek (s);
      if (c < 0)
        {
          s->line = line;
          s->column = column;
          return scan_fail (s, "this string is not closed (missing '\"')");
        }
      if (c == '"')
        {
          scan_advance (s);
          return TRUE;
        }
      if (c == '\n' || c == '\r')
        return scan_fail (s, "line break inside a string; close the string with '\"' "
                          "or write the break as \\n");
      if (c < 0x20)
        return scan_fail (s, "control character U+%04X inside a string; write it as an "
                          "escape such as \\n or \\t", (guint) c);
      if (c == '\\')
        {
          const gsize at_line = s->line, at_column = s->column;
          int e;
          scan_advance (s);
          e = scan_peek (s);
          if (e == 'u')
            {
              guint unit;
              scan_advance (s);
              if (!scan_hex4 (s, &unit))
                return FALSE;
              /* UTF-16 surrogates come in pairs (RFC 8259 §7); json-glib
               * mangles a lone one. */
              if (unit >= 0xDC00 && unit <= 0xDFFF)
                {
                  s->line = at_line;
                  s->column = at_column;
                  return scan_fail (s, "\\u%04X is the second half of a UTF-16 surrogate "
                                    "pair without its first half", unit);
                }
              if (unit >= 0xD800 && unit <= 0xDBFF)
                {
                  guint low = 0;
                  if (scan_peek (s) != '\\' || s->end - s->p < 2 || s->p[1] != 'u')
                    {
                      s->line = at_line;
                      s->column = at_column;
                      return scan_fail (s, "\\u%04X is the first half of a UTF-16 "
                                        "surrogate pair; the second half (\\uDC00–\\uDFFF) "
                                        "must follow", unit);
                    }
                  scan_advance (s);
                  scan_advance (s);
                  if (!scan_hex4 (s, &low))
                    return FALSE;
                  if (low < 0xDC00 || low > 0xDFFF)
                    {
                      s->line = at_line;
                      s->column = at_column;
                      return scan_fail (s, "\\u%04X\\u%04X is not a UTF-16 surrogate pair",
                                        unit, low);
                    }
                  unit = 0x10000 + ((unit - 0xD800) << 10) + (low - 0xDC00);
                }
              if (out != NULL)
                g_string_append_unichar (out, unit);
              continue;
            }
          if (e < 0 || strchr (escapes, e) == NULL)
            {
              s->line = at_line;
              s->column = at_column;
              return scan_fail (s, "invalid escape in a string; JSON has \\\", \\\\, \\/, "
                                "\\b, \\f, \\n, \\r, \\t and \\uXXXX");
            }
          if (out != NULL)
            g_string_append_c (out, "\"\\/\b\f\n\r\t"[strchr (escapes, e) - escapes]);
        }
      else if (out != NULL)
        g_string_append_c (out, (char) c);
      scan_advance (s);
    }
}

static gboolean
scan_number (Scan *s)
{
  const char *start = s->p;
  const gsize line = s->line, column = s->column;
  gboolean integer = TRUE;

  if (scan_peek (s) == '-')
    scan_advance (s);
  if (scan_peek (s) == '0')
    {
      scan_advance (s);
      if (g_ascii_isdigit (scan_peek (s)))
        return scan_fail (s, "a number cannot have leading zeros");
    }
  else if (g_ascii_isdigit (scan_peek (s)))
    while (g_ascii_isdigit (scan_peek (s)))
      scan_advance (s);
  else
    return scan_fail (s, "expected a digit after '-'");
  if (scan_peek (s) == '.')
    {
      integer = FALSE;
      scan_advance (s);
      if (!g_ascii_isdigit (scan_peek (s)))
        return scan_fail (s, "expected a digit after the decimal point");
      while (g_ascii_isdigit (scan_peek (s)))
        scan_advance (s);
    }
  if (scan_peek (s) == 'e' || scan_peek (s) == 'E')
    {
      integer = FALSE;
      scan_advance (s);
      if (scan_peek (s) == '+' || scan_peek (s) == '-')
        scan_advance (s);
      if (!g_ascii_isdigit (scan_peek (s)))
        return scan_fail (s, "expected a digit in the exponent");
      while (g_ascii_isdigit (scan_peek (s)))
        scan_advance (s);
    }
  if (integer)
    {
      /* json-glib stores integers as gint64 and silently wraps larger ones. */
      const gsize len = (gsize) (s->p - start);
      gboolean too_big = len > 20;
      if (!too_big)
        {
          char buffer[24];
          memcpy (buffer, start, len);
          buffer[len] = '\0';
          errno = 0;
          (void) g_ascii_strtoll (buffer, NULL, 10);
          too_big = errno == ERANGE;
        }
      if (too_big)
        {
          s->line = line;
          s->column = column;
          return scan_fail (s, "integer too large to be read exactly; write it with a "
                            "decimal point or an exponent (1.0e20)");
        }
    }
  return TRUE;
}

static gboolean
scan_literal (Scan *s, const char *word)
{
  const gsize len = strlen (word);
  if ((gsize) (s->end - s->p) < len || memcmp (s->p, word, len) != 0)
    return FALSE;
  for (gsize k = 0; k < len; k++)
    scan_advance (s);
  return TRUE;
}

/* Whether the path being scanned is the target or leads into it. */
static gboolean
locate_on_way (const Locate *l)
{
  const gsize len = l->path->len;
  if (len == 0)
    return TRUE;
  /* by length, not strncmp: a member name may hold "\u0000", and the path
   * may then be longer than the target although it compares equal */
  if (len > strlen (l->target) || memcmp (l->path->str, l->target, len) != 0)
    return FALSE;
  return l->target[len] == '\0' || l->target[len] == '.' || l->target[len] == '[';
}

/* Notes @line:@column when the path being scanned is the target. */
static void
locate_note (Locate *l, gboolean name, gsize line, gsize column)
{
  if (l->name == name && l->path->len == strlen (l->target)
      && memcmp (l->path->str, l->target, l->path->len) == 0)
    {
      l->line = line;
      l->column = column;
    }
}

/* A value. With @track (s->locate set and the path of this value on the way
 * to its target) the path of each member is followed; otherwise no path is
 * built at all. */
static gboolean
scan_value (Scan *s, guint depth, gboolean track)
{
  const int c = scan_peek (s);

  if (track)
    locate_note (s->locate, FALSE, s->line, s->column);
  if (c == '{' || c == '[')
    {
      const int close = c == '{' ? '}' : ']';
      GString *path = track ? s->locate->path : NULL;
      if (depth >= QV_BUNDLE_MAX_DEPTH)
        return scan_fail (s, "nested deeper than %d levels of arrays and objects",
                          QV_BUNDLE_MAX_DEPTH);
      scan_advance (s);
      scan_space (s);
      if (scan_peek (s) == close)
        {
          scan_advance (s);
          return TRUE;
        }
      for (gsize index = 0;; index++)
        {
          const gsize mark = path ? path->len : 0;
          gboolean inner = FALSE;
          if (c == '{')
            {
              const gsize line = s->line, column = s->column;
              if (scan_peek (s) != '"')
                return scan_expected (s, "a member name in double quotes");
              if (path && mark > 0)
                g_string_append_c (path, '.');
              if (!scan_string (s, path))
                return FALSE;
              if (path && (inner = locate_on_way (s->locate)))
                locate_note (s->locate, TRUE, line, column);
              scan_space (s);
              if (scan_peek (s) != ':')
                return scan_expected (s, "':' after the member name");
              scan_advance (s);
              scan_space (s);
            }
          else if (path)
            {
              g_string_append_printf (path, "[%" G_GSIZE_FORMAT "]", index);
              inner = locate_on_way (s->locate);
            }
          if (!scan_value (s, depth + 1, inner))
            return FALSE;
          if (path)
            g_string_truncate (path, mark);
          scan_space (s);
          if (scan_peek (s) == close)
            {
              scan_advance (s);
              return TRUE;
            }
          if (scan_peek (s) != ',')
            return scan_expected (s, c == '{' ? "',' or '}' after an object member"
                                              : "',' or ']' after an array element");
          scan_advance (s);
          scan_space (s);
          if (scan_peek (s) == close)
            return scan_fail (s, "'%c' after a comma; JSON does not allow a trailing comma",
                              close);
        }
    }
  if (c == '"')
    return scan_string (s, NULL);
  if (c == '-' || g_ascii_isdigit (c))
    return scan_number (s);
  if (scan_literal (s, "true") || scan_literal (s, "false") || scan_literal (s, "null"))
    return TRUE;
  if (c == 'N' || c == 'I' || c == '+' || c == '.')
    return scan_fail (s, "expected a JSON number (NaN, Infinity, a leading '+' or '.' are "
                      "not JSON)");
  return scan_expected (s, "a value (an object, array, string, number, true, false or null)");
}

/* Position of byte @offset as line and column (characters), both from 1. */
static void
text_position (const char *data, gsize offset, gsize *line, gsize *column)
{
  *line = 1;
  *column = 1;
  for (gsize i = 0; i < offset; i++)
    {
      if (data[i] == '\n')
        {
          (*line)++;
          *column = 1;
        }
      else if (((unsigned char) data[i + 1] & 0xC0) != 0x80 || i + 1 == offset)
        (*column)++;
    }
}

static gboolean
check_syntax (const char *data, gsize length, const char *name, GError **error)
{
  const char *bad = NULL;
  Scan s = { data, data + length, name, 1, 1, error, NULL };

  if (!g_utf8_validate_len (data, length, &bad))
    {
      gsize line, column;
      text_position (data, (gsize) (bad - data), &line, &column);
      if (*bad == '\0')
        qv_io_error (error, name, line, column, "NUL byte; a bundle is UTF-8 text");
      else
        qv_io_error (error, name, line, column, "invalid UTF-8; a bundle is UTF-8 text");
      return FALSE;
    }
  scan_space (&s);
  if (s.p == s.end)
    return scan_fail (&s, "the file is empty; expected a JSON object");
  if (!scan_value (&s, 0, FALSE))
    return FALSE;
  scan_space (&s);
  if (s.p != s.end)
    {
      g_autofree char *found = scan_found (&s);
      return scan_fail (&s, "unexpected %s after the end of the bundle's JSON object", found);
    }
  return TRUE;
}

/* json-glib says "<data>:LINE:COL: Parse error: message"; we say
 * "FILE:LINE:COL: message". */
static void
report_parser_error (const GError *local, const char *name, GError **error)
{
  const char *m = local->message;
  guint64 line = 0, column = 0;
  char *end = NULL;

  if (g_str_has_prefix (m, "<data>:"))
    {
      m += strlen ("<data>:");
      line = g_ascii_strtoull (m, &end, 10);
      if (end != m && *end == ':')
        {
          m = end + 1;
          column = g_ascii_strtoull (m, &end, 10);
          if (end != m && *end == ':')
            m = end + 1;
          else
            line = column = 0;
        }
      else
        line = 0;
      if (line == 0)
        m = local->message;
      while (*m == ' ')
        m++;
      if (g_str_has_prefix (m, "Parse error: "))
        m += strlen ("Parse error: ");
      if (g_str_has_prefix (m, "scanner: "))
        m += strlen ("scanner: ");
    }
  qv_io_error (error, name, (gsize) line, (gsize) column, "%s", m);
}

/* ------------------------------------------------------------------------ */
/* Pass 2: the tree                                                         */
/* ------------------------------------------------------------------------ */

typedef struct {
  const char *name;           /* the bundle, for messages */
  char *folder;               /* where referenced files are looked up; NULL
                                 when the bundle has no file name */
  const char *data;           /* the text, for placing errors */
  gsize length;
  GError **error;
} Reader;

static char *
path_key (const char *path, const char *key)
{
  return path && *path ? g_strconcat (path, ".", key, NULL) : g_strdup (key);
}

/* Where the value at JSON path @target starts (the whole bundle when
 * @target is NULL or ""), or with @name where its member name does; 0:0 if
 * it is not found. Runs the tokenizer over the text once more, so it is
 * only called to report an error. */
static void
locate (const Reader *r, const char *target, gboolean name, gsize *line, gsize *column)
{
  Locate l = { target ? target : "", name, g_string_new (NULL), 0, 0 };
  Scan s = { r->data, r->data + r->length, r->name, 1, 1, NULL, &l };

  scan_space (&s);
  (void) scan_value (&s, 0, TRUE);
  g_string_free (l.path, TRUE);
  *line = l.line;
  *column = l.column;
}

/* "FILE:LINE:COL: PATH: message", or without "PATH: " when @path is NULL. */
static gboolean
report (Reader *r, gsize line, gsize column, const char *path, const char *message)
{
  if (path != NULL && *path != '\0')
    qv_io_error (r->error, r->name, line, column, "%s: %s", path, message);
  else
    qv_io_error (r->error, r->name, line, column, "%s", message);
  return FALSE;
}

/* Where an error about the member @key of the object at @object (or about
 * the value at @object itself when @key is NULL) is placed. */
typedef enum {
  AT_VALUE,                   /* the member's value */
  AT_MISSING,                 /* the object, which lacks the member */
  AT_NAME                     /* the member's name (an unknown key) */
} Place;

static gboolean fail_v (Reader *r, Place place, const char *object, const char *key,
                        const char *format, va_list args) G_GNUC_PRINTF (5, 0);

static gboolean
fail_v (Reader *r, Place place, const char *object, const char *key, const char *format,
        va_list args)
{
  g_autofree char *path = key ? path_key (object, key) : g_strdup (object);
  g_autofree char *message = g_strdup_vprintf (format, args);
  gsize line, column;

  locate (r, place == AT_MISSING ? object : path, place == AT_NAME, &line, &column);
  return report (r, line, column, path, message);
}

static gboolean fail_at (Reader *r, Place place, const char *object, const char *key,
                         const char *format, ...) G_GNUC_PRINTF (5, 6);

static gboolean
fail_at (Reader *r, Place place, const char *object, const char *key, const char *format, ...)
{
  va_list args;
  va_start (args, format);
  fail_v (r, place, object, key, format, args);
  va_end (args);
  return FALSE;
}

static gboolean fail (Reader *r, const char *path, const char *format, ...) G_GNUC_PRINTF (3, 4);

/* An error in the value at @path (the whole bundle when @path is NULL). */
static gboolean
fail (Reader *r, const char *path, const char *format, ...)
{
  va_list args;
  va_start (args, format);
  fail_v (r, AT_VALUE, path, NULL, format, args);
  va_end (args);
  return FALSE;
}

/* Members @a and @b of the object at @object exclude each other: placed at
 * the name of whichever comes later in the file. */
static gboolean
fail_both (Reader *r, const char *object, const char *a, const char *b, const char *message)
{
  g_autofree char *path_a = path_key (object, a), *path_b = path_key (object, b);
  gsize line_a, column_a, line_b, column_b;

  locate (r, path_a, TRUE, &line_a, &column_a);
  locate (r, path_b, TRUE, &line_b, &column_b);
  if (line_b > line_a || (line_b == line_a && column_b > column_a))
    return report (r, line_b, column_b, object, message);
  return report (r, line_a, column_a, object, message);
}

/* Puts "FILE:LINE:COL: PATH: " before an error from elsewhere about the
 * value at @path. */
static void
prefix_error (Reader *r, const char *path)
{
  gsize line, column;
  locate (r, path, FALSE, &line, &column);
  if (line > 0)
    g_prefix_error (r->error, "%s:%" G_GSIZE_FORMAT ":%" G_GSIZE_FORMAT ": %s: ", r->name,
                    line, column, path);
  else
    g_prefix_error (r->error, "%s: %s: ", r->name, path);
}

static char *
path_index (const char *path, gsize index)
{
  return g_strdup_printf ("%s[%" G_GSIZE_FORMAT "]", path, index);
}

static gboolean
is_number (JsonNode *node)
{
  GType type;
  if (JSON_NODE_TYPE (node) != JSON_NODE_VALUE)
    return FALSE;
  type = json_node_get_value_type (node);
  return type == G_TYPE_INT64 || type == G_TYPE_DOUBLE;
}

static gboolean
is_integer (JsonNode *node)
{
  return JSON_NODE_TYPE (node) == JSON_NODE_VALUE
         && json_node_get_value_type (node) == G_TYPE_INT64;
}

static gboolean
is_string (JsonNode *node)
{
  return JSON_NODE_TYPE (node) == JSON_NODE_VALUE
         && json_node_get_value_type (node) == G_TYPE_STRING;
}

static gboolean
is_boolean (JsonNode *node)
{
  return JSON_NODE_TYPE (node) == JSON_NODE_VALUE
         && json_node_get_value_type (node) == G_TYPE_BOOLEAN;
}

/* What a node is, for "expected …, found …". */
static const char *
kind (JsonNode *node)
{
  switch (JSON_NODE_TYPE (node))
    {
    case JSON_NODE_OBJECT: return "an object";
    case JSON_NODE_ARRAY: return "an array";
    case JSON_NODE_NULL: return "null";
    case JSON_NODE_VALUE:
    default:
      break;
    }
  if (is_number (node))
    return is_integer (node) ? "an integer" : "a number";
  if (is_boolean (node))
    return json_node_get_boolean (node) ? "true" : "false";
  if (is_string (node))
    return "a string";
  return "an unknown value";
}

static double
number_value (JsonNode *node)
{
  return is_integer (node) ? (double) json_node_get_int (node) : json_node_get_double (node);
}

/* A finite number at @path (or at @path[@index] when @index ≥ 0). */
static gboolean
read_number (Reader *r, JsonNode *node, const char *path, gssize index, double *out)
{
  if (!is_number (node) || !isfinite (number_value (node)))
    {
      g_autofree char *where = index >= 0 ? path_index (path, (gsize) index) : g_strdup (path);
      if (!is_number (node))
        return fail (r, where, "expected a number, found %s", kind (node));
      return fail (r, where, "number out of range (beyond a finite double)");
    }
  *out = number_value (node);
  return TRUE;
}

/* An array of exactly @count numbers; @what qualifies the count in the
 * message ("" or " (3 × 5 atoms)"). */
static gboolean
read_numbers (Reader *r, JsonNode *node, const char *path, gsize count, const char *what,
              double *out)
{
  JsonArray *array;
  gsize length;

  if (JSON_NODE_TYPE (node) != JSON_NODE_ARRAY)
    return fail (r, path, "expected an array of %" G_GSIZE_FORMAT " numbers%s, found %s",
                 count, what, kind (node));
  array = json_node_get_array (node);
  length = json_array_get_length (array);
  if (length != count)
    return fail (r, path, "expected %" G_GSIZE_FORMAT " numbers%s, found %" G_GSIZE_FORMAT,
                 count, what, length);
  for (gsize i = 0; i < count; i++)
    if (!read_number (r, json_array_get_element (array, (guint) i), path, (gssize) i, &out[i]))
      return FALSE;
  return TRUE;
}

static gboolean
read_string (Reader *r, JsonNode *node, const char *path, const char **out)
{
  if (!is_string (node))
    return fail (r, path, "expected a string, found %s", kind (node));
  *out = json_node_get_string (node);
  return TRUE;
}

/* An array node at @path with at least @min elements. */
static JsonArray *
read_array (Reader *r, JsonNode *node, const char *path, gboolean non_empty,
            const char *of_what, const char *one)
{
  JsonArray *array;
  if (JSON_NODE_TYPE (node) != JSON_NODE_ARRAY)
    {
      fail (r, path, "expected an array of %s, found %s", of_what, kind (node));
      return NULL;
    }
  array = json_node_get_array (node);
  if (non_empty && json_array_get_length (array) == 0)
    {
      fail (r, path, "expected at least one %s, found an empty array", one);
      return NULL;
    }
  return array;
}

static JsonObject *
read_object (Reader *r, JsonNode *node, const char *path)
{
  if (JSON_NODE_TYPE (node) != JSON_NODE_OBJECT)
    {
      fail (r, path, "expected an object, found %s", kind (node));
      return NULL;
    }
  return json_node_get_object (node);
}

/* Inside the bundle's own objects every key is known: a misspelt "isotope"
 * must not silently leave a mass unchanged. (Unknown keys at the top level
 * are ignored, for forward compatibility.) */
static gboolean
check_keys (Reader *r, JsonObject *object, const char *path, const char *const *known)
{
  GList *members = json_object_get_members (object);
  gboolean ok = TRUE;

  for (GList *l = members; l != NULL && ok; l = l->next)
    {
      const char *key = l->data;
      gboolean found = FALSE;
      for (gsize k = 0; known[k] != NULL && !found; k++)
        found = strcmp (key, known[k]) == 0;
      if (!found)
        {
          g_autofree char *list = g_strjoinv (", ", (char **) known);
          ok = fail_at (r, AT_NAME, path, key, "unknown key \"%s\" (accepted here: %s)", key,
                        list);
        }
    }
  g_list_free (members);
  return ok;
}

static JsonNode *
member (JsonObject *object, const char *key)
{
  return json_object_has_member (object, key) ? json_object_get_member (object, key) : NULL;
}

/* --- structure ----------------------------------------------------------- */

typedef struct {
  guint isotope;              /* 0: none */
  double mass;                /* 0: none */
} MassOverride;

static gboolean
read_element (Reader *r, JsonNode *node, const char *path, guint *z)
{
  if (is_string (node))
    {
      const char *symbol = json_node_get_string (node);
      const QvElement *e = qv_element_from_symbol (symbol);
      if (e == NULL)
        {
          if (g_ascii_strcasecmp (symbol, "D") == 0 || g_ascii_strcasecmp (symbol, "T") == 0)
            return fail (r, path, "\"%s\" is not an element symbol; write \"element\": \"H\", "
                         "\"isotope\": %d", symbol, g_ascii_tolower (symbol[0]) == 'd' ? 2 : 3);
          return fail (r, path, "unknown element symbol \"%s\"", symbol);
        }
      *z = e->z;
      return TRUE;
    }
  if (is_integer (node))
    {
      const gint64 value = json_node_get_int (node);
      if (value < 1 || value > QV_ELEMENT_MAX_Z)
        return fail (r, path, "atomic number %" G_GINT64_FORMAT " is outside 1–%d", value,
                     QV_ELEMENT_MAX_Z);
      *z = (guint) value;
      return TRUE;
    }
  return fail (r, path, "expected an element symbol (\"C\") or an atomic number (6), found %s",
               kind (node));
}

static gboolean
read_atom (Reader *r, QvStructure *s, gsize i, JsonNode *node, const char *path,
           MassOverride *override)
{
  static const char *const keys[] = { "element", "position", "label", "isotope", "mass", NULL };
  JsonObject *atom = read_object (r, node, path);
  JsonNode *n;
  guint z = 0;

  if (atom == NULL || !check_keys (r, atom, path, keys))
    return FALSE;

  {
    g_autofree char *where = path_key (path, "element");
    g_autoptr(GError) local = NULL;
    if ((n = member (atom, "element")) == NULL)
      return fail_at (r, AT_MISSING, path, "element", "missing; every atom needs an element");
    if (!read_element (r, n, where, &z))
      return FALSE;
    if (!qv_structure_set_element (s, i, z, &local))
      return fail (r, where, "%s", local->message);
  }
  {
    g_autofree char *where = path_key (path, "position");
    if ((n = member (atom, "position")) == NULL)
      return fail_at (r, AT_MISSING, path, "position", "missing; every atom needs a position "
                      "[x, y, z] in Å");
    if (!read_numbers (r, n, where, 3, "", s->atoms[i].position))
      return FALSE;
  }
  if ((n = member (atom, "label")) != NULL)
    {
      g_autofree char *where = path_key (path, "label");
      const char *label = NULL;
      if (!read_string (r, n, where, &label))
        return FALSE;
      qv_structure_set_label (s, i, label);
    }
  if (member (atom, "isotope") != NULL && member (atom, "mass") != NULL)
    return fail_both (r, path, "isotope", "mass", "give \"isotope\" or \"mass\", not both");
  if ((n = member (atom, "isotope")) != NULL)
    {
      g_autofree char *where = path_key (path, "isotope");
      gint64 value;
      if (!is_integer (n))
        return fail (r, where, "expected a mass number (an integer such as 13), found %s",
                     kind (n));
      value = json_node_get_int (n);
      if (value < 1 || value > 400)
        return fail (r, where, "mass number %" G_GINT64_FORMAT " is not a mass number", value);
      override->isotope = (guint) value;
    }
  if ((n = member (atom, "mass")) != NULL)
    {
      g_autofree char *where = path_key (path, "mass");
      double mass;
      if (!read_number (r, n, where, -1, &mass))
        return FALSE;
      if (!(mass > 0.0))
        return fail (r, where, "a mass must be positive (u), found %g", mass);
      override->mass = mass;
    }
  return TRUE;
}

static gboolean
read_cell (Reader *r, const char *where_s, QvStructure *s, JsonNode *node)
{
  g_autofree char *k_cell = path_key (where_s, "cell");
  JsonArray *rows;
  double volume, lengths = 1.0;

  if (JSON_NODE_TYPE (node) != JSON_NODE_ARRAY)
    return fail (r, k_cell, "expected three lattice vectors [[ax, ay, az], "
                 "[bx, by, bz], [cx, cy, cz]] in Å, found %s", kind (node));
  rows = json_node_get_array (node);
  if (json_array_get_length (rows) != 3)
    return fail (r, k_cell, "expected 3 lattice vectors, found %u",
                 json_array_get_length (rows));
  for (guint k = 0; k < 3; k++)
    {
      g_autofree char *where = path_index (k_cell, k);
      if (!read_numbers (r, json_array_get_element (rows, k), where, 3, "", s->cell[k]))
        return FALSE;
      lengths *= sqrt (s->cell[k][0] * s->cell[k][0] + s->cell[k][1] * s->cell[k][1]
                       + s->cell[k][2] * s->cell[k][2]);
    }
  volume = s->cell[0][0] * (s->cell[1][1] * s->cell[2][2] - s->cell[1][2] * s->cell[2][1])
           - s->cell[0][1] * (s->cell[1][0] * s->cell[2][2] - s->cell[1][2] * s->cell[2][0])
           + s->cell[0][2] * (s->cell[1][0] * s->cell[2][1] - s->cell[1][1] * s->cell[2][0]);
  if (!(fabs (volume) > 1e-10 * lengths) || !isfinite (volume))
    return fail (r, k_cell, "the lattice vectors are linearly dependent "
                 "(the cell has no volume)");
  s->has_cell = TRUE;
  return TRUE;
}

static gboolean
read_pbc (Reader *r, const char *where_s, QvStructure *s, JsonNode *node)
{
  g_autofree char *k_pbc = path_key (where_s, "pbc");
  JsonArray *array;
  if (JSON_NODE_TYPE (node) != JSON_NODE_ARRAY
      || json_array_get_length (array = json_node_get_array (node)) != 3)
    return fail (r, k_pbc, "expected three booleans such as [true, true, false]");
  for (guint k = 0; k < 3; k++)
    {
      JsonNode *e = json_array_get_element (array, k);
      if (!is_boolean (e))
        {
          g_autofree char *where = path_index (k_pbc, k);
          return fail (r, where, "expected true or false, found %s", kind (e));
        }
      s->pbc[k] = json_node_get_boolean (e);
    }
  return TRUE;
}

static gboolean
read_forces (Reader *r, const char *where_s, QvStructure *s, JsonNode *node)
{
  g_autofree char *k_forces = path_key (where_s, "forces");
  JsonArray *rows;

  if (JSON_NODE_TYPE (node) != JSON_NODE_ARRAY)
    return fail (r, k_forces, "expected one [fx, fy, fz] per atom (eV/Å), found %s",
                 kind (node));
  rows = json_node_get_array (node);
  if (json_array_get_length (rows) != s->n_atoms)
    return fail (r, k_forces, "expected %" G_GSIZE_FORMAT " force vectors, one per "
                 "atom, found %u", s->n_atoms, json_array_get_length (rows));
  s->forces = g_new (double, 3 * s->n_atoms);
  for (gsize i = 0; i < s->n_atoms; i++)
    {
      g_autofree char *where = path_index (k_forces, i);
      if (!read_numbers (r, json_array_get_element (rows, (guint) i), where, 3, "",
                         &s->forces[3 * i]))
        return FALSE;
    }
  return TRUE;
}

static QvStructure *
read_structure (Reader *r, const char *where_s, JsonNode *node, JsonNode *masses_node,
                QvMassModel *model_out)
{
  g_autofree char *k_atoms = path_key (where_s, "atoms"), *k_pbc = path_key (where_s, "pbc");
  g_autofree char *k_energy = path_key (where_s, "energy");
  static const char *const keys[] = { "atoms", "cell", "pbc", "energy", "forces", NULL };
  g_autoptr(QvStructure) s = NULL;
  g_autofree MassOverride *overrides = NULL;
  JsonObject *object = read_object (r, node, where_s);
  JsonArray *atoms;
  JsonNode *n;
  QvMassModel model = QV_MASS_ISOTOPIC;
  gsize n_atoms;

  if (object == NULL || !check_keys (r, object, where_s, keys))
    return NULL;
  if (masses_node != NULL)
    {
      const char *text = NULL;
      if (!read_string (r, masses_node, "masses", &text))
        return NULL;
      if (strcmp (text, "isotopic") == 0)
        model = QV_MASS_ISOTOPIC;
      else if (strcmp (text, "average") == 0)
        model = QV_MASS_AVERAGE;
      else
        {
          fail (r, "masses", "expected \"isotopic\" or \"average\", found \"%s\"", text);
          return NULL;
        }
    }

  if ((n = member (object, "atoms")) == NULL)
    {
      fail_at (r, AT_MISSING, where_s, "atoms", "missing; a structure needs at least one "
               "atom");
      return NULL;
    }
  if ((atoms = read_array (r, n, k_atoms, TRUE, "atoms", "atom")) == NULL)
    return NULL;
  n_atoms = json_array_get_length (atoms);
  if ((s = qv_structure_new (n_atoms, r->error)) == NULL)
    {
      prefix_error (r, k_atoms);
      return NULL;
    }
  overrides = g_new0 (MassOverride, n_atoms);
  for (gsize i = 0; i < n_atoms; i++)
    {
      g_autofree char *where = path_index (k_atoms, i);
      if (!read_atom (r, s, i, json_array_get_element (atoms, (guint) i), where, &overrides[i]))
        return NULL;
    }

  if ((n = member (object, "cell")) != NULL && !read_cell (r, where_s, s, n))
    return NULL;
  s->pbc[0] = s->pbc[1] = s->pbc[2] = s->has_cell;
  if ((n = member (object, "pbc")) != NULL)
    {
      if (!read_pbc (r, where_s, s, n))
        return NULL;
      if (qv_structure_is_periodic (s) && !s->has_cell)
        {
          fail (r, k_pbc, "periodic directions need a \"cell\"");
          return NULL;
        }
    }
  if ((n = member (object, "energy")) != NULL)
    {
      if (!read_number (r, n, k_energy, -1, &s->energy))
        return NULL;
      s->has_energy = TRUE;
    }
  if ((n = member (object, "forces")) != NULL && !read_forces (r, where_s, s, n))
    return NULL;

  /* Masses: the model for every atom, then the per-atom overrides. */
  qv_structure_apply_mass_model (s, model);
  *model_out = model;
  for (gsize i = 0; i < n_atoms; i++)
    {
      g_autoptr(GError) local = NULL;
      if (overrides[i].isotope != 0
          && !qv_structure_set_isotope (s, i, overrides[i].isotope, &local))
        {
          g_autofree char *where = g_strdup_printf ("%s[%" G_GSIZE_FORMAT "].isotope", k_atoms, i);
          fail (r, where, "%s", local->message);
          return NULL;
        }
      if (overrides[i].mass > 0.0 && !qv_structure_set_mass (s, i, overrides[i].mass, &local))
        {
          g_autofree char *where = g_strdup_printf ("%s[%" G_GSIZE_FORMAT "].mass", k_atoms, i);
          fail (r, where, "%s", local->message);
          return NULL;
        }
    }
  for (gsize i = 0; i < n_atoms; i++)
    if (!(s->atoms[i].mass > 0.0) || !isfinite (s->atoms[i].mass))
      {
        g_autofree char *where = path_index (k_atoms, i);
        fail (r, where, "no usable mass for this element; give \"isotope\" or \"mass\"");
        return NULL;
      }
  return g_steal_pointer (&s);
}

/* --- hessian ------------------------------------------------------------- */

/* @relative below r->folder, as "folder/a/b" with "." and inner ".."
 * resolved; NULL with an error when it is absolute, leaves the folder
 * (textually or through a symbolic link) or does not exist. */
static char *
resolve_path (Reader *r, const char *relative)
{
  const char *where = "hessian.path";
  g_auto(GStrv) parts = NULL;
  g_autoptr(GPtrArray) kept = NULL;
  g_autofree char *joined = NULL, *real_folder = NULL, *real_file = NULL;

  if (*relative == '\0')
    {
      fail (r, where, "empty path");
      return NULL;
    }
  if (g_path_is_absolute (relative))
    {
      fail (r, where, "\"%s\" is an absolute path; give a path relative to the bundle's "
            "folder, so the bundle and its matrix can be moved together", relative);
      return NULL;
    }
  if (r->folder == NULL)
    {
      fail (r, where, "a referenced file needs the bundle's own location, which is not known "
            "here; put the matrix inline as \"data\"");
      return NULL;
    }
  parts = g_strsplit (relative, "/", -1);
  kept = g_ptr_array_new ();
  g_ptr_array_add (kept, r->folder);
  for (gsize k = 0; parts[k] != NULL; k++)
    {
      if (parts[k][0] == '\0' || strcmp (parts[k], ".") == 0)
        continue;
      if (strcmp (parts[k], "..") == 0)
        {
          if (kept->len <= 1)
            {
              fail (r, where, "\"%s\" leads outside the bundle's folder; keep the matrix "
                    "beside or below the bundle", relative);
              return NULL;
            }
          g_ptr_array_remove_index (kept, kept->len - 1);
          continue;
        }
      g_ptr_array_add (kept, parts[k]);
    }
  if (kept->len <= 1)
    {
      fail (r, where, "\"%s\" names the bundle's folder, not a file", relative);
      return NULL;
    }
  g_ptr_array_add (kept, NULL);
  joined = g_build_filenamev ((char **) kept->pdata);

  real_folder = realpath (r->folder, NULL);
  if (real_folder == NULL)
    {
      fail (r, where, "cannot resolve the bundle's folder \"%s\": %s", r->folder,
            g_strerror (errno));
      return NULL;
    }
  real_file = realpath (joined, NULL);
  if (real_file == NULL)
    {
      fail (r, where, "cannot open \"%s\": %s", joined, g_strerror (errno));
      return NULL;
    }
  {
    const gsize len = strlen (real_folder);
    const gboolean inside = strcmp (real_folder, "/") == 0
                            || (strncmp (real_file, real_folder, len) == 0
                                && real_file[len] == '/');
    if (!inside)
      {
        fail (r, where, "\"%s\" is a symbolic link to \"%s\", outside the bundle's folder; "
              "keep the matrix beside or below the bundle", relative, real_file);
        return NULL;
      }
  }
  return g_steal_pointer (&joined);
}

/* Where in "data" element (i, j) of the matrix was written. */
static void
inline_source (QvHessianLayout layout, gsize i, gsize j, gsize *row, gsize *column)
{
  const gsize lo = MIN (i, j), hi = MAX (i, j);
  switch (layout)
    {
    case QV_HESSIAN_LAYOUT_LOWER:
      *row = hi;
      *column = lo;
      break;
    case QV_HESSIAN_LAYOUT_UPPER:
      *row = lo;
      *column = hi - lo;
      break;
    default:
      *row = i;
      *column = j;
      break;
    }
}

static QvHessian *
read_inline (Reader *r, JsonNode *data, QvHessianLayout layout, gsize n, gsize n_atoms)
{
  g_autoptr(QvHessian) h = NULL;
  JsonArray *rows;
  gsize n_rows;

  if (JSON_NODE_TYPE (data) != JSON_NODE_ARRAY)
    {
      fail (r, "hessian.data", "expected an array of rows, found %s", kind (data));
      return NULL;
    }
  rows = json_node_get_array (data);
  n_rows = json_array_get_length (rows);
  if (n_rows != n)
    {
      fail (r, "hessian.data", "expected %" G_GSIZE_FORMAT " rows (3 × %" G_GSIZE_FORMAT
            " atoms), found %" G_GSIZE_FORMAT, n, n_atoms, n_rows);
      return NULL;
    }
  if ((h = qv_hessian_new (n, FALSE, r->error)) == NULL)
    {
      prefix_error (r, "hessian.data");
      return NULL;
    }
  h->layout = layout;
  for (gsize i = 0; i < n; i++)
    {
      g_autofree char *where = path_index ("hessian.data", i);
      JsonNode *row_node = json_array_get_element (rows, (guint) i);
      const gsize first = layout == QV_HESSIAN_LAYOUT_UPPER ? i : 0;
      const gsize count = layout == QV_HESSIAN_LAYOUT_FULL ? n
                          : layout == QV_HESSIAN_LAYOUT_LOWER ? i + 1 : n - i;
      JsonArray *row;

      if (JSON_NODE_TYPE (row_node) != JSON_NODE_ARRAY)
        {
          fail (r, where, "expected a row of numbers, found %s", kind (row_node));
          return NULL;
        }
      row = json_node_get_array (row_node);
      if (json_array_get_length (row) != count)
        {
          fail (r, where, "expected %" G_GSIZE_FORMAT " numbers (row %" G_GSIZE_FORMAT
                " of the %s layout, n = %" G_GSIZE_FORMAT "), found %u", count, i,
                qv_hessian_layout_name (layout), n, json_array_get_length (row));
          return NULL;
        }
      for (gsize k = 0; k < count; k++)
        {
          const gsize j = first + k;
          double v;
          if (!read_number (r, json_array_get_element (row, (guint) k), where, (gssize) k, &v))
            return NULL;
          /* column-major: element (i, j) at i + j n */
          h->data[i + j * n] = v;
          if (layout != QV_HESSIAN_LAYOUT_FULL)
            h->data[j + i * n] = v;
        }
    }
  return g_steal_pointer (&h);
}

static QvHessian *
read_hessian (Reader *r, JsonNode *node, gsize n_atoms, char **units_out, char **path_out)
{
  static const char *const keys[] = { "units", "layout", "data", "path", NULL };
  g_autoptr(QvHessian) h = NULL;
  g_autoptr(GError) local = NULL;
  JsonObject *object = read_object (r, node, "hessian");
  JsonNode *data, *file, *n;
  const char *units_text = NULL, *layout_text = NULL;
  QvHessianUnit unit;
  QvHessianLayout layout = QV_HESSIAN_LAYOUT_AUTO;
  const gsize n_dim = 3 * n_atoms;
  gssize bad;

  if (object == NULL || !check_keys (r, object, "hessian", keys))
    return NULL;
  if ((n = member (object, "units")) == NULL)
    {
      fail_at (r, AT_MISSING, "hessian", "units", "missing; the Hessian's unit must be stated "
               "(accepted: %s)", qv_hessian_unit_list ());
      return NULL;
    }
  if (!read_string (r, n, "hessian.units", &units_text))
    return NULL;
  if (!qv_hessian_unit_parse (units_text, &unit, &local))
    {
      fail (r, "hessian.units", "%s", local->message);
      return NULL;
    }

  data = member (object, "data");
  file = member (object, "path");
  if (data != NULL && file != NULL)
    {
      fail_both (r, "hessian", "data", "path", "has both \"data\" and \"path\"; give one");
      return NULL;
    }
  if (data == NULL && file == NULL)
    {
      fail (r, "hessian", "needs the matrix: inline \"data\" or a \"path\" to a file beside "
            "the bundle");
      return NULL;
    }
  if ((n = member (object, "layout")) != NULL)
    {
      if (!read_string (r, n, "hessian.layout", &layout_text))
        return NULL;
      if (strcmp (layout_text, "full") == 0)
        layout = QV_HESSIAN_LAYOUT_FULL;
      else if (strcmp (layout_text, "lower") == 0)
        layout = QV_HESSIAN_LAYOUT_LOWER;
      else if (strcmp (layout_text, "upper") == 0)
        layout = QV_HESSIAN_LAYOUT_UPPER;
      else if (strcmp (layout_text, "auto") == 0 && file != NULL)
        layout = QV_HESSIAN_LAYOUT_AUTO;
      else
        {
          fail (r, "hessian.layout", "expected %s, found \"%s\"",
                file ? "\"auto\", \"full\", \"lower\" or \"upper\""
                     : "\"full\", \"lower\" or \"upper\" with inline data", layout_text);
          return NULL;
        }
    }

  if (data != NULL)
    {
      if (n_dim > QV_BUNDLE_MAX_INLINE_N)
        {
          fail (r, "hessian.data", "a %" G_GSIZE_FORMAT " × %" G_GSIZE_FORMAT " matrix "
                "(%" G_GSIZE_FORMAT " atoms) is too large to store inline (at most %d); put "
                "it in a text or .npy file beside the bundle and give its \"path\"",
                n_dim, n_dim, n_atoms, QV_BUNDLE_MAX_INLINE_N);
          return NULL;
        }
      if (layout_text == NULL)
        {
          fail_at (r, AT_MISSING, "hessian", "layout", "missing; inline data needs \"full\", "
                   "\"lower\" or \"upper\"");
          return NULL;
        }
      if ((h = read_inline (r, data, layout, n_dim, n_atoms)) == NULL)
        return NULL;
    }
  else
    {
      const char *relative = NULL;
      g_autofree char *resolved = NULL;
      if (!read_string (r, file, "hessian.path", &relative))
        return NULL;
      if ((resolved = resolve_path (r, relative)) == NULL)
        return NULL;
      if ((h = qv_hessian_read_file (resolved, n_dim, layout, r->error)) == NULL)
        return NULL;
      if (h->n != n_dim)
        {
          fail (r, "hessian.path", "\"%s\" holds a %" G_GSIZE_FORMAT " × %" G_GSIZE_FORMAT
                " matrix; %" G_GSIZE_FORMAT " atoms need %" G_GSIZE_FORMAT " × %"
                G_GSIZE_FORMAT, resolved, h->n, h->n, n_atoms, n_dim, n_dim);
          return NULL;
        }
      *path_out = g_steal_pointer (&resolved);
    }

  qv_hessian_scale (h, qv_hessian_unit_to_ev_a2 (unit));
  if ((bad = qv_hessian_find_nonfinite (h)) >= 0)
    {
      const gsize i = (gsize) bad % n_dim, j = (gsize) bad / n_dim;
      if (data != NULL)
        {
          gsize row, column;
          g_autofree char *where = NULL;
          inline_source (layout, i, j, &row, &column);
          where = g_strdup_printf ("hessian.data[%" G_GSIZE_FORMAT "][%" G_GSIZE_FORMAT "]",
                                   row, column);
          fail (r, where, "not a finite number once converted from %s to eV/Å²", units_text);
        }
      else
        fail (r, "hessian.path", "element (%" G_GSIZE_FORMAT ", %" G_GSIZE_FORMAT ") of \"%s\" "
              "is not a finite number in eV/Å²", i + 1, j + 1, *path_out);
      g_clear_pointer (path_out, g_free);
      return NULL;
    }
  *units_out = g_strdup (units_text);
  return g_steal_pointer (&h);
}

/* --- modes --------------------------------------------------------------- */

static QvModeSet *
read_modes (Reader *r, JsonNode *node, const QvStructure *s)
{
  static const char *const keys[] = { "wavenumbers", "displacements", NULL };
  g_autofree double *wavenumbers = NULL, *displacements = NULL;
  g_autoptr(GError) local = NULL;
  JsonObject *object = read_object (r, node, "modes");
  JsonArray *w, *d;
  JsonNode *n;
  QvModeSet *modes;
  const gsize n_dim = 3 * s->n_atoms;
  g_autofree char *what = g_strdup_printf (" (3 × %" G_GSIZE_FORMAT " atoms)", s->n_atoms);
  gsize n_modes;

  if (object == NULL || !check_keys (r, object, "modes", keys))
    return NULL;
  if ((n = member (object, "wavenumbers")) == NULL)
    {
      fail_at (r, AT_MISSING, "modes", "wavenumbers", "missing; one wavenumber (cm⁻¹) per mode");
      return NULL;
    }
  if ((w = read_array (r, n, "modes.wavenumbers", TRUE, "wavenumbers (cm⁻¹)",
                       "wavenumber")) == NULL)
    return NULL;
  n_modes = json_array_get_length (w);
  if (n_modes > n_dim)
    {
      fail (r, "modes.wavenumbers", "%" G_GSIZE_FORMAT " modes, but %" G_GSIZE_FORMAT
            " atoms have at most 3N = %" G_GSIZE_FORMAT, n_modes, s->n_atoms, n_dim);
      return NULL;
    }
  if ((n = member (object, "displacements")) == NULL)
    {
      fail_at (r, AT_MISSING, "modes", "displacements", "missing; one Cartesian displacement "
               "vector per mode");
      return NULL;
    }
  if ((d = read_array (r, n, "modes.displacements", FALSE, "displacement vectors", NULL)) == NULL)
    return NULL;
  if (json_array_get_length (d) != n_modes)
    {
      fail (r, "modes.displacements", "expected %" G_GSIZE_FORMAT " vectors, one per "
            "wavenumber, found %u", n_modes, json_array_get_length (d));
      return NULL;
    }
  {
    /* n_modes and 3N are both counts of what the file lists, but their
     * product is not: refuse what cannot fit before g_new would abort */
    gsize bytes;
    g_autoptr(GError) too_large = NULL;
    if (!qv_size_mul3 (n_modes, n_dim, sizeof (double), &bytes)
        || !qv_size_check_memory (bytes, "the displacement vectors", &too_large))
      {
        fail (r, "modes.displacements", "%s", too_large ? too_large->message
              : "too many displacement vectors to count in bytes");
        return NULL;
      }
  }
  wavenumbers = g_new (double, n_modes);
  displacements = g_new (double, n_modes * n_dim);
  for (gsize k = 0; k < n_modes; k++)
    {
      g_autofree char *where = path_index ("modes.displacements", k);
      if (!read_number (r, json_array_get_element (w, (guint) k), "modes.wavenumbers",
                        (gssize) k, &wavenumbers[k]))
        return NULL;
      /* Its square, the eigenvalue, must stay finite; no vibration comes
       * near this bound (the highest molecular one is about 4400 cm⁻¹). */
      if (fabs (wavenumbers[k]) > QV_BUNDLE_MAX_WAVENUMBER)
        {
          g_autofree char *at = path_index ("modes.wavenumbers", k);
          fail (r, at, "%g cm⁻¹ is beyond any vibration (at most %g cm⁻¹ in magnitude); "
                "is it in cm⁻¹?", wavenumbers[k], QV_BUNDLE_MAX_WAVENUMBER);
          return NULL;
        }
      if (!read_numbers (r, json_array_get_element (d, (guint) k), where, n_dim, what,
                         &displacements[k * n_dim]))
        return NULL;
    }
  modes = qv_mode_set_new_from_cartesian (s, n_modes, wavenumbers, displacements, &local);
  if (modes == NULL)
    {
      fail (r, "modes", "%s", local ? local->message : "cannot build the mode set");
      return NULL;
    }
  return modes;
}

/* --- view ----------------------------------------------------------------- */

/* "view": the orientation, projection, zoom and mode of a picture. Keys of
 * the app's own state may sit beside them and are left alone. */
static gboolean
read_view (Reader *r, JsonNode *node, QvBundleView *view)
{
  JsonObject *o = read_object (r, node, "view");
  JsonNode *n;
  const char *text;

  if (o == NULL)
    return FALSE;
  view->present = TRUE;
  view->zoom = 1.0;
  if ((n = member (o, "orientation")) != NULL)
    {
      double *q = view->orientation;
      double norm;
      if (!read_numbers (r, n, "view.orientation", 4, " (a quaternion x, y, z, w)", q))
        return FALSE;
      norm = sqrt (q[0] * q[0] + q[1] * q[1] + q[2] * q[2] + q[3] * q[3]);
      if (!(norm > 1e-6))
        return fail (r, "view.orientation", "a rotation needs a quaternion of non-zero length");
      for (int i = 0; i < 4; i++)
        q[i] /= norm;
      view->has_orientation = TRUE;
    }
  if ((n = member (o, "projection")) != NULL)
    {
      if (!read_string (r, n, "view.projection", &text))
        return FALSE;
      if (strcmp (text, "orthographic") != 0 && strcmp (text, "perspective") != 0)
        return fail (r, "view.projection", "expected \"perspective\" or \"orthographic\", found \"%s\"",
                     text);
      view->has_projection = TRUE;
      view->orthographic = strcmp (text, "orthographic") == 0;
    }
  if ((n = member (o, "zoom")) != NULL)
    {
      if (!read_number (r, n, "view.zoom", -1, &view->zoom))
        return FALSE;
      if (!(view->zoom > 0 && view->zoom <= 100))
        return fail (r, "view.zoom", "expected a factor above 0 (up to 100), found %g", view->zoom);
    }
  if ((n = member (o, "mode")) != NULL)
    {
      if (!is_integer (n) || json_node_get_int (n) < 1 || json_node_get_int (n) > G_MAXUINT)
        return fail (r, "view.mode", "expected a mode number from 1, found %s", kind (n));
      view->mode = (guint) json_node_get_int (n);
    }
  return TRUE;
}

/* --- derivative tensors ---------------------------------------------------- */

/* "dipole_derivatives" or "polarizability_derivatives": {"units": U,
 * "data": [[3N numbers] × R]} with R one of @row_counts (0-terminated). The
 * values are returned in the file's unit, with its conversion factor. */
static double *
read_tensor (Reader *r, JsonNode *node, const char *key, gsize n_atoms, const gsize *row_counts,
             const char *rows_text, gboolean dipole, char **units_out, double *factor,
             gsize *n_rows)
{
  static const char *const keys[] = { "units", "data", NULL };
  g_autofree char *units_path = path_key (key, "units"), *data_path = path_key (key, "data");
  g_autofree char *what = g_strdup_printf (" (3N, %" G_GSIZE_FORMAT " atoms)", n_atoms);
  g_autofree double *values = NULL;
  g_autoptr(GError) local = NULL;
  JsonObject *object = read_object (r, node, key);
  JsonArray *rows;
  const char *units;
  const gsize n = 3 * n_atoms;
  gsize count;
  gboolean allowed = FALSE;
  JsonNode *m;

  if (object == NULL || !check_keys (r, object, key, keys))
    return NULL;
  if ((m = member (object, "units")) == NULL)
    {
      fail_at (r, AT_MISSING, key, "units", "missing; the unit must be stated (%s)",
               dipole ? qv_dipole_derivative_unit_list () : qv_polarizability_derivative_unit_list ());
      return NULL;
    }
  if (!read_string (r, m, units_path, &units))
    return NULL;
  if (!(dipole ? qv_dipole_derivative_unit_parse (units, factor, &local)
               : qv_polarizability_derivative_unit_parse (units, factor, &local)))
    {
      fail (r, units_path, "%s", local->message);
      return NULL;
    }
  if ((m = member (object, "data")) == NULL)
    {
      fail_at (r, AT_MISSING, key, "data", "missing; give %s rows of 3N = %" G_GSIZE_FORMAT
               " numbers", rows_text, n);
      return NULL;
    }
  if ((rows = read_array (r, m, data_path, TRUE, "rows", "row")) == NULL)
    return NULL;
  count = json_array_get_length (rows);
  for (gsize i = 0; row_counts[i] != 0; i++)
    allowed = allowed || count == row_counts[i];
  if (!allowed)
    {
      fail (r, data_path, "expected %s rows of 3N = %" G_GSIZE_FORMAT " numbers, found %"
            G_GSIZE_FORMAT " rows", rows_text, n, count);
      return NULL;
    }
  values = g_new (double, count * n);
  for (gsize i = 0; i < count; i++)
    {
      g_autofree char *where = path_index (data_path, i);
      if (!read_numbers (r, json_array_get_element (rows, (guint) i), where, n, what,
                         &values[i * n]))
        return NULL;
    }
  *units_out = g_strdup (units);
  *n_rows = count;
  return g_steal_pointer (&values);
}

static gboolean
read_derivatives (Reader *r, JsonObject *root, QvBundle *bundle)
{
  static const gsize dipole_rows[] = { 3, 0 }, alpha_rows[] = { 6, 9, 0 };
  const gsize n_atoms = bundle->structure->n_atoms;
  JsonNode *dipole = member (root, "dipole_derivatives");
  JsonNode *alpha = member (root, "polarizability_derivatives");
  double factor = 1.0;
  gsize n_rows = 0;

  if (dipole == NULL && alpha == NULL)
    return TRUE;
  bundle->derivatives = qv_derivatives_new (n_atoms);
  if (dipole != NULL)
    {
      g_autofree double *v = read_tensor (r, dipole, "dipole_derivatives", n_atoms, dipole_rows,
                                          "3", TRUE, &bundle->dipole_units, &factor, &n_rows);
      if (v == NULL)
        return FALSE;
      qv_derivatives_set_dipole (bundle->derivatives, v, factor);
    }
  if (alpha != NULL)
    {
      g_autofree double *v = read_tensor (r, alpha, "polarizability_derivatives", n_atoms,
                                          alpha_rows, "6 (xx, yy, zz, xy, xz, yz) or 9 (xx, xy, "
                                          "xz, yx, yy, yz, zx, zy, zz)", FALSE,
                                          &bundle->polarizability_units, &factor, &n_rows);
      if (v == NULL)
        return FALSE;
      qv_derivatives_set_polarizability (bundle->derivatives, n_rows, v, factor);
    }
  return TRUE;
}

/* --- Born charges and the dielectric tensor ------------------------------ */

/* {"units": @unit, "data": [[3 numbers] × 3]} into @out (9, row-major). */
static gboolean
read_matrix3 (Reader *r, JsonNode *node, const char *path, const char *unit, double *out)
{
  static const char *const keys[] = { "units", "data", NULL };
  g_autofree char *units_path = path_key (path, "units"), *data_path = path_key (path, "data");
  JsonObject *object = read_object (r, node, path);
  JsonArray *rows;
  const char *units;
  JsonNode *m;

  if (object == NULL || !check_keys (r, object, path, keys))
    return FALSE;
  if ((m = member (object, "units")) == NULL)
    return fail_at (r, AT_MISSING, path, "units", "missing; the unit must be stated (\"%s\")", unit);
  if (!read_string (r, m, units_path, &units))
    return FALSE;
  if (strcmp (units, unit) != 0)
    return fail (r, units_path, "expected \"%s\", found \"%s\"", unit, units);
  if ((m = member (object, "data")) == NULL)
    return fail_at (r, AT_MISSING, path, "data", "missing; give 3 rows of 3 numbers");
  if ((rows = read_array (r, m, data_path, TRUE, "rows", "row")) == NULL)
    return FALSE;
  if (json_array_get_length (rows) != 3)
    return fail (r, data_path, "expected 3 rows of 3 numbers, found %u rows",
                 json_array_get_length (rows));
  for (guint i = 0; i < 3; i++)
    {
      g_autofree char *where = path_index (data_path, i);
      if (!read_numbers (r, json_array_get_element (rows, i), where, 3, "", out + 3 * i))
        return FALSE;
    }
  return TRUE;
}

/* --- crystal ------------------------------------------------------------- */

/* Three integers in [lo, hi] at @path into @out. */
static gboolean
read_ints3 (Reader *r, JsonNode *node, const char *path, gint64 lo, gint64 hi, int out[3])
{
  JsonArray *a;

  if (JSON_NODE_TYPE (node) != JSON_NODE_ARRAY
      || json_array_get_length (a = json_node_get_array (node)) != 3)
    return fail (r, path, "expected three integers, found %s", kind (node));
  for (guint k = 0; k < 3; k++)
    {
      JsonNode *e = json_array_get_element (a, k);
      if (!is_integer (e) || json_node_get_int (e) < lo || json_node_get_int (e) > hi)
        {
          g_autofree char *where = path_index (path, k);
          return fail (r, where, "expected an integer from %" G_GINT64_FORMAT " to %"
                       G_GINT64_FORMAT ", found %s", lo, hi, kind (e));
        }
      out[k] = (int) json_node_get_int (e);
    }
  return TRUE;
}

/* "crystal": the structure is a supercell of "primitive", the Hessian the
 * supercell's; "supercell" (a 3x3 integer matrix or three counts) is
 * checked against the structure when the crystal is built, "path" and
 * "mesh" are the defaults of the lattice views. */
static gboolean
read_crystal (Reader *r, JsonObject *root, QvBundle *bundle)
{
  static const char *const keys[] = { "primitive", "supercell", "path", "mesh", NULL };
  JsonNode *node = member (root, "crystal"), *n;
  JsonObject *object;
  QvMassModel model;

  if (node == NULL)
    return TRUE;
  if ((object = read_object (r, node, "crystal")) == NULL
      || !check_keys (r, object, "crystal", keys))
    return FALSE;
  if (!bundle->structure->has_cell)
    return fail (r, "structure", "a bundle with a \"crystal\" needs the supercell's \"cell\" "
                 "in \"structure\"");
  if ((n = member (object, "primitive")) == NULL)
    return fail_at (r, AT_MISSING, "crystal", "primitive",
                    "missing; give the primitive cell: {\"cell\": [...], \"atoms\": [...]}");
  bundle->primitive = read_structure (r, "crystal.primitive", n, member (root, "masses"), &model);
  if (bundle->primitive == NULL)
    return FALSE;
  if (!bundle->primitive->has_cell)
    return fail_at (r, AT_MISSING, "crystal.primitive", "cell",
                    "missing; the primitive cell needs its lattice vectors");
  if ((n = member (object, "supercell")) != NULL)
    {
      JsonArray *rows;
      if (JSON_NODE_TYPE (n) == JSON_NODE_ARRAY
          && json_array_get_length (rows = json_node_get_array (n)) == 3
          && JSON_NODE_TYPE (json_array_get_element (rows, 0)) == JSON_NODE_ARRAY)
        {
          for (guint k = 0; k < 3; k++)
            {
              g_autofree char *where = path_index ("crystal.supercell", k);
              if (!read_ints3 (r, json_array_get_element (rows, k), where, -1000, 1000,
                               bundle->supercell_matrix[k]))
                return FALSE;
            }
        }
      else
        {
          int d[3];
          if (!read_ints3 (r, n, "crystal.supercell", 1, 1000, d))
            return FALSE;
          memset (bundle->supercell_matrix, 0, sizeof bundle->supercell_matrix);
          for (int k = 0; k < 3; k++)
            bundle->supercell_matrix[k][k] = d[k];
        }
      bundle->has_supercell_matrix = TRUE;
    }
  if ((n = member (object, "path")) != NULL)
    {
      const char *text;
      if (!read_string (r, n, "crystal.path", &text))
        return FALSE;
      bundle->band_path = g_strdup (text);
    }
  if ((n = member (object, "mesh")) != NULL
      && !read_ints3 (r, n, "crystal.mesh", 1, 1000, bundle->mesh))
    return FALSE;
  return TRUE;
}

static gboolean
read_born (Reader *r, JsonObject *root, QvBundle *bundle)
{
  static const char *const keys[] = { "units", "data", NULL };
  JsonNode *born = member (root, "born_charges"), *eps = member (root, "dielectric_tensor"), *m;
  /* with a "crystal", one tensor per site of the primitive cell */
  const gsize n_atoms = (bundle->primitive ? bundle->primitive : bundle->structure)->n_atoms;
  JsonObject *object;
  JsonArray *atoms;
  const char *units;

  if (born == NULL && eps == NULL)
    return TRUE;
  if (born == NULL || eps == NULL)
    return fail_at (r, AT_MISSING, NULL, born ? "dielectric_tensor" : "born_charges",
                    "missing; the non-analytic correction needs both \"born_charges\" and "
                    "\"dielectric_tensor\"");
  if (!read_matrix3 (r, eps, "dielectric_tensor", "relative", &bundle->dielectric_tensor[0][0]))
    return FALSE;
  bundle->has_dielectric = TRUE;
  if ((object = read_object (r, born, "born_charges")) == NULL
      || !check_keys (r, object, "born_charges", keys))
    return FALSE;
  if ((m = member (object, "units")) == NULL)
    return fail_at (r, AT_MISSING, "born_charges", "units", "missing; the unit must be stated (\"e\")");
  if (!read_string (r, m, "born_charges.units", &units))
    return FALSE;
  if (strcmp (units, "e") != 0)
    return fail (r, "born_charges.units", "expected \"e\" (the elementary charge), found \"%s\"",
                 units);
  if ((m = member (object, "data")) == NULL)
    return fail_at (r, AT_MISSING, "born_charges", "data",
                    "missing; give one 3x3 tensor per atom (%" G_GSIZE_FORMAT ")", n_atoms);
  if ((atoms = read_array (r, m, "born_charges.data", TRUE, "tensors", "tensor")) == NULL)
    return FALSE;
  if (json_array_get_length (atoms) != n_atoms)
    return fail (r, "born_charges.data", "expected one 3x3 tensor per %s (%" G_GSIZE_FORMAT
                 "), found %u", bundle->primitive ? "site of the primitive cell" : "atom",
                 n_atoms, json_array_get_length (atoms));
  bundle->born_charges = g_new (double, 9 * n_atoms);
  for (gsize a = 0; a < n_atoms; a++)
    {
      g_autofree char *where = path_index ("born_charges.data", a);
      JsonArray *rows = read_array (r, json_array_get_element (atoms, (guint) a), where, TRUE,
                                    "rows", "row");
      if (rows == NULL)
        return FALSE;
      if (json_array_get_length (rows) != 3)
        return fail (r, where, "expected 3 rows of 3 numbers, found %u rows",
                     json_array_get_length (rows));
      for (guint i = 0; i < 3; i++)
        {
          g_autofree char *row = path_index (where, i);
          if (!read_numbers (r, json_array_get_element (rows, i), row, 3, "",
                             bundle->born_charges + 9 * a + 3 * i))
            return FALSE;
        }
    }
  return TRUE;
}

/* --- the bundle ---------------------------------------------------------- */

static gboolean
read_header (Reader *r, JsonObject *root)
{
  JsonNode *n;
  gint64 version;

  if ((n = member (root, "format")) == NULL)
    return fail (r, NULL, "not a Quaver bundle: no \"format\": \"" BUNDLE_FORMAT "\"");
  if (!is_string (n) || strcmp (json_node_get_string (n), BUNDLE_FORMAT) != 0)
    {
      if (is_string (n))
        return fail (r, "format", "expected \"" BUNDLE_FORMAT "\", found \"%s\"",
                     json_node_get_string (n));
      return fail (r, "format", "expected \"" BUNDLE_FORMAT "\", found %s", kind (n));
    }
  if ((n = member (root, "version")) == NULL)
    return fail_at (r, AT_MISSING, NULL, "version", "missing; this Quaver reads version %d",
                    BUNDLE_VERSION);
  if (!is_integer (n))
    return fail (r, "version", "expected an integer, found %s", kind (n));
  version = json_node_get_int (n);
  if (version > BUNDLE_VERSION)
    return fail (r, "version", "the bundle is version %" G_GINT64_FORMAT ", newer than this "
                 "Quaver reads (version %d); a newer Quaver is needed", version, BUNDLE_VERSION);
  if (version < 1)
    return fail (r, "version", "%" G_GINT64_FORMAT " is not a bundle version; this Quaver "
                 "reads version %d", version, BUNDLE_VERSION);
  return TRUE;
}

static QvBundle *
read_bundle (Reader *r, JsonNode *root_node)
{
  g_autoptr(QvBundle) bundle = g_new0 (QvBundle, 1);
  JsonObject *root;
  JsonNode *n, *hessian, *modes;
  const char *text = NULL;

  if (JSON_NODE_TYPE (root_node) != JSON_NODE_OBJECT)
    {
      fail (r, NULL, "expected the bundle's JSON object ({ … }), found %s", kind (root_node));
      return NULL;
    }
  root = json_node_get_object (root_node);
  if (!read_header (r, root))
    return NULL;
  if ((n = member (root, "title")) != NULL)
    {
      if (!read_string (r, n, "title", &text))
        return NULL;
      bundle->title = g_strdup (text);
    }
  if ((n = member (root, "description")) != NULL && !read_string (r, n, "description", &text))
    return NULL;

  if ((n = member (root, "structure")) == NULL)
    {
      fail_at (r, AT_MISSING, NULL, "structure", "missing; a bundle needs a structure");
      return NULL;
    }
  if ((bundle->structure = read_structure (r, "structure", n, member (root, "masses"),
                                           &bundle->mass_model)) == NULL)
    return NULL;
  if (bundle->title != NULL && bundle->structure->comment == NULL)
    bundle->structure->comment = g_strdup (bundle->title);

  hessian = member (root, "hessian");
  modes = member (root, "modes");
  if (hessian != NULL && modes != NULL)
    {
      fail_both (r, NULL, "hessian", "modes",
                 "the bundle has both \"hessian\" and \"modes\"; give exactly one");
      return NULL;
    }
  if (hessian == NULL && modes == NULL)
    {
      fail (r, NULL, "the bundle needs a \"hessian\" or precomputed \"modes\"");
      return NULL;
    }
  if (hessian != NULL)
    {
      bundle->hessian = read_hessian (r, hessian, bundle->structure->n_atoms,
                                      &bundle->hessian_units, &bundle->hessian_path);
      if (bundle->hessian == NULL)
        return NULL;
    }
  else if ((bundle->modes = read_modes (r, modes, bundle->structure)) == NULL)
    return NULL;
  if ((n = member (root, "view")) != NULL && !read_view (r, n, &bundle->view))
    return NULL;
  if (!read_derivatives (r, root, bundle))
    return NULL;
  if (!read_crystal (r, root, bundle) || !read_born (r, root, bundle))
    return NULL;
  if (bundle->view.mode > 3 * bundle->structure->n_atoms)
    {
      fail (r, "view.mode", "mode %u does not exist: %" G_GSIZE_FORMAT " atoms have at most %"
            G_GSIZE_FORMAT " modes", bundle->view.mode, bundle->structure->n_atoms,
            3 * bundle->structure->n_atoms);
      return NULL;
    }
  return g_steal_pointer (&bundle);
}

QvBundle *
qv_bundle_read_data (const char *data, gsize length, const char *path, GError **error)
{
  g_autoptr(JsonParser) parser = NULL;
  g_autoptr(GError) local = NULL;
  Reader r = { path ? path : "<bundle>", path ? g_path_get_dirname (path) : NULL, NULL, 0,
               error };
  QvBundle *bundle = NULL;

  g_return_val_if_fail (data != NULL || length == 0, NULL);
  if (data == NULL)
    data = "";
  /* A UTF-8 byte order mark is allowed and skipped (RFC 8259 §8.1). */
  if (length >= 3 && memcmp (data, "\xEF\xBB\xBF", 3) == 0)
    {
      data += 3;
      length -= 3;
    }
  if (length > (gsize) G_MAXSSIZE)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "%s: too large", r.name);
      goto out;
    }
  if (!check_syntax (data, length, r.name, error))
    goto out;
  r.data = data;
  r.length = length;

  parser = json_parser_new_immutable ();
  if (!json_parser_load_from_data (parser, data, (gssize) length, &local))
    {
      report_parser_error (local, r.name, error);
      goto out;
    }
  if (json_parser_get_root (parser) == NULL)
    {
      qv_io_error (error, r.name, 0, 0, "the file is empty; expected a JSON object");
      goto out;
    }
  bundle = read_bundle (&r, json_parser_get_root (parser));

out:
  g_free (r.folder);
  return bundle;
}

QvBundle *
qv_bundle_read_file (const char *path, GError **error)
{
  g_autofree char *contents = NULL;
  gsize length = 0;

  g_return_val_if_fail (path != NULL, NULL);
  if (!qv_io_read_file (path, BUNDLE_MAX_BYTES, &contents, &length, error))
    return NULL;
  return qv_bundle_read_data (contents, length, path, error);
}

void
qv_bundle_free (QvBundle *bundle)
{
  if (bundle == NULL)
    return;
  g_free (bundle->title);
  qv_structure_free (bundle->structure);
  qv_hessian_free (bundle->hessian);
  g_free (bundle->hessian_units);
  g_free (bundle->hessian_path);
  qv_mode_set_free (bundle->modes);
  qv_derivatives_free (bundle->derivatives);
  g_free (bundle->dipole_units);
  g_free (bundle->polarizability_units);
  g_free (bundle->born_charges);
  qv_structure_free (bundle->primitive);
  g_free (bundle->band_path);
  g_free (bundle);
}
