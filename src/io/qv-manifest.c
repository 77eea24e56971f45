/* qv-manifest.c — manifest.json, version 1: writer and strict reader.
 *
 * The reader has its own small JSON parser (RFC 8259, strict: no comments,
 * no trailing commas, no duplicate keys, nesting bounded by
 * QV_MANIFEST_MAX_DEPTH before anything recurses deeper) that keeps the line
 * and column of every value, so every message is "FILE:LINE:COL: PATH: …".
 * A manifest is small (one entry per structure written), so a tree is fine.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "qv-config.h"
#include "qv-io-error.h"
#include "qv-json-writer.h"
#include "qv-manifest.h"

/* ------------------------------------------------------------------------ */
/* The in-memory manifest                                                   */
/* ------------------------------------------------------------------------ */

static void
field_free (gpointer data)
{
  QvManifestField *f = data;
  g_free (f->key);
  g_free (f->string);
  g_free (f);
}

static GPtrArray *
fields_new (void)
{
  return g_ptr_array_new_with_free_func (field_free);
}

static void
frame_free (gpointer data)
{
  QvManifestFrame *f = data;
  g_array_unref (f->amplitudes);
  g_ptr_array_unref (f->fields);
  g_free (f);
}

static void
file_free (gpointer data)
{
  QvManifestFile *f = data;
  g_free (f->name);
  g_free (f->format);
  g_free (f->sha256);
  g_ptr_array_unref (f->frames);
  g_free (f);
}

static void
input_free (gpointer data)
{
  QvManifestInput *i = data;
  g_free (i->role);
  g_free (i->path);
  g_free (i->sha256);
  g_free (i);
}

QvManifest *
qv_manifest_new (const char *command)
{
  QvManifest *m = g_new0 (QvManifest, 1);
  m->version = QV_MANIFEST_VERSION;
  m->generator = g_strdup ("quaver " QV_VERSION);
  m->command = g_strdup (command ? command : "");
  m->arguments = g_ptr_array_new_with_free_func (g_free);
  m->options = fields_new ();
  m->inputs = g_ptr_array_new_with_free_func (input_free);
  m->parameters = fields_new ();
  m->notes = g_ptr_array_new_with_free_func (g_free);
  m->files = g_ptr_array_new_with_free_func (file_free);
  return m;
}

void
qv_manifest_free (QvManifest *m)
{
  if (m == NULL)
    return;
  g_free (m->generator);
  g_free (m->command);
  g_free (m->formula);
  g_ptr_array_unref (m->arguments);
  g_ptr_array_unref (m->options);
  g_ptr_array_unref (m->inputs);
  g_ptr_array_unref (m->parameters);
  g_ptr_array_unref (m->notes);
  g_ptr_array_unref (m->files);
  g_free (m);
}

char *
qv_manifest_sha256 (const void *data, gsize length)
{
  return g_compute_checksum_for_data (G_CHECKSUM_SHA256, data, length);
}

void
qv_manifest_add_argument (QvManifest *m, const char *argument)
{
  g_ptr_array_add (m->arguments, g_strdup (argument));
}

void
qv_manifest_add_note (QvManifest *m, const char *note)
{
  g_ptr_array_add (m->notes, g_strdup (note));
}

static void
add_input (QvManifest *m, const char *role, const char *path, char *sha256)
{
  QvManifestInput *i = g_new0 (QvManifestInput, 1);
  i->role = g_strdup (role);
  i->path = g_strdup (path);
  i->sha256 = sha256;
  g_ptr_array_add (m->inputs, i);
}

void
qv_manifest_add_input_data (QvManifest *m, const char *role, const char *path,
                            const void *data, gsize length)
{
  add_input (m, role, path, qv_manifest_sha256 (data, length));
}

gboolean
qv_manifest_add_input_file (QvManifest *m, const char *role, const char *path, GError **error)
{
  g_autoptr(GChecksum) sum = g_checksum_new (G_CHECKSUM_SHA256);
  g_autofree guchar *buffer = g_malloc (1 << 20);
  FILE *f = fopen (path, "rb");
  gsize n;

  if (f == NULL)
    {
      int saved = errno;
      qv_io_error (error, path, 0, 0, "cannot open: %s", g_strerror (saved));
      return FALSE;
    }
  while ((n = fread (buffer, 1, 1 << 20, f)) > 0)
    g_checksum_update (sum, buffer, (gssize) n);
  if (ferror (f))
    {
      fclose (f);
      qv_io_error (error, path, 0, 0, "cannot read it to compute its SHA-256");
      return FALSE;
    }
  fclose (f);
  add_input (m, role, path, g_strdup (g_checksum_get_string (sum)));
  return TRUE;
}

static QvManifestField *
field_slot (GPtrArray *fields, const char *key, QvManifestType type)
{
  QvManifestField *f = NULL;

  for (guint i = 0; i < fields->len && f == NULL; i++)
    if (strcmp (((QvManifestField *) fields->pdata[i])->key, key) == 0)
      f = fields->pdata[i];
  if (f == NULL)
    {
      f = g_new0 (QvManifestField, 1);
      f->key = g_strdup (key);
      g_ptr_array_add (fields, f);
    }
  g_clear_pointer (&f->string, g_free);
  f->type = type;
  return f;
}

void
qv_manifest_set_number (GPtrArray *fields, const char *key, double value)
{
  field_slot (fields, key, QV_MANIFEST_NUMBER)->number = value;
}

void
qv_manifest_set_integer (GPtrArray *fields, const char *key, gint64 value)
{
  QvManifestField *f = field_slot (fields, key, QV_MANIFEST_INTEGER);
  f->integer = value;
  f->number = (double) value;
}

void
qv_manifest_set_string (GPtrArray *fields, const char *key, const char *value)
{
  field_slot (fields, key, QV_MANIFEST_STRING)->string = g_strdup (value ? value : "");
}

void
qv_manifest_set_boolean (GPtrArray *fields, const char *key, gboolean value)
{
  field_slot (fields, key, QV_MANIFEST_BOOLEAN)->boolean = value;
}

const QvManifestField *
qv_manifest_get (const GPtrArray *fields, const char *key)
{
  for (guint i = 0; fields && i < fields->len; i++)
    if (strcmp (((QvManifestField *) fields->pdata[i])->key, key) == 0)
      return fields->pdata[i];
  return NULL;
}

gboolean
qv_manifest_get_number (const GPtrArray *fields, const char *key, double *value)
{
  const QvManifestField *f = qv_manifest_get (fields, key);

  if (f == NULL || (f->type != QV_MANIFEST_NUMBER && f->type != QV_MANIFEST_INTEGER))
    return FALSE;
  *value = f->type == QV_MANIFEST_INTEGER ? (double) f->integer : f->number;
  return TRUE;
}

QvManifestFile *
qv_manifest_add_file (QvManifest *m, const char *name, const char *format,
                      const void *contents, gsize length)
{
  QvManifestFile *f = g_new0 (QvManifestFile, 1);
  f->name = g_strdup (name);
  f->format = g_strdup (format);
  f->sha256 = qv_manifest_sha256 (contents, length);
  f->frames = g_ptr_array_new_with_free_func (frame_free);
  g_ptr_array_add (m->files, f);
  return f;
}

static QvManifestFrame *
frame_new (guint index)
{
  QvManifestFrame *fr = g_new0 (QvManifestFrame, 1);
  fr->index = index;
  fr->amplitudes = g_array_new (FALSE, TRUE, sizeof (QvManifestAmplitude));
  fr->fields = fields_new ();
  return fr;
}

QvManifestFrame *
qv_manifest_file_add_frame (QvManifestFile *file)
{
  QvManifestFrame *fr = frame_new (file->frames->len);
  g_ptr_array_add (file->frames, fr);
  return fr;
}

void
qv_manifest_frame_add_amplitude (QvManifestFrame *frame, const QvManifestAmplitude *amplitude)
{
  g_array_append_val (frame->amplitudes, *amplitude);
}

/* ------------------------------------------------------------------------ */
/* Writing                                                                  */
/* ------------------------------------------------------------------------ */

static void
write_fields (QvJsonWriter *w, const char *key, const GPtrArray *fields)
{
  qv_json_begin_object (w, key);
  for (guint i = 0; i < fields->len; i++)
    {
      const QvManifestField *f = fields->pdata[i];
      switch (f->type)
        {
        case QV_MANIFEST_NUMBER: qv_json_number (w, f->key, f->number); break;
        case QV_MANIFEST_INTEGER: qv_json_int (w, f->key, f->integer); break;
        case QV_MANIFEST_STRING: qv_json_string (w, f->key, f->string); break;
        case QV_MANIFEST_BOOLEAN: qv_json_bool (w, f->key, f->boolean); break;
        default: qv_json_null (w, f->key); break;
        }
    }
  qv_json_end_object (w);
}

/* A member the reader takes as optional: left out when NULL, since the
 * reader refuses null where it expects a string. */
static void
optional_string (QvJsonWriter *w, const char *key, const char *value)
{
  if (value != NULL)
    qv_json_string (w, key, value);
}

char *
qv_manifest_to_json (const QvManifest *m)
{
  QvJsonWriter *w = qv_json_writer_new ();

  qv_json_begin_object (w, NULL);
  qv_json_string (w, "format", QV_MANIFEST_FORMAT);
  qv_json_int (w, "version", QV_MANIFEST_VERSION);
  optional_string (w, "generator", m->generator);
  qv_json_string (w, "command", m->command);
  qv_json_begin_array (w, "arguments");
  for (guint i = 0; i < m->arguments->len; i++)
    qv_json_string (w, NULL, m->arguments->pdata[i]);
  qv_json_end_array (w);
  write_fields (w, "options", m->options);
  qv_json_begin_array (w, "inputs");
  for (guint i = 0; i < m->inputs->len; i++)
    {
      const QvManifestInput *in = m->inputs->pdata[i];
      qv_json_begin_object (w, NULL);
      qv_json_string (w, "role", in->role);
      optional_string (w, "path", in->path);
      qv_json_string (w, "sha256", in->sha256);
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  qv_json_begin_object (w, "structure");
  qv_json_int (w, "natoms", (gint64) m->n_atoms);
  qv_json_string (w, "formula", m->formula);
  qv_json_bool (w, "periodic", m->periodic);
  qv_json_end_object (w);
  qv_json_begin_object (w, "units");
  qv_json_string (w, "wavenumber", "cm^-1");
  qv_json_string (w, "q", "1");
  qv_json_string (w, "Q", "u^1/2 A");
  qv_json_string (w, "max_displacement", "A");
  qv_json_string (w, "positions", "A");
  qv_json_end_object (w);
  write_fields (w, "parameters", m->parameters);
  qv_json_begin_array (w, "notes");
  for (guint i = 0; i < m->notes->len; i++)
    qv_json_string (w, NULL, m->notes->pdata[i]);
  qv_json_end_array (w);
  qv_json_begin_array (w, "files");
  for (guint i = 0; i < m->files->len; i++)
    {
      const QvManifestFile *f = m->files->pdata[i];
      qv_json_begin_object (w, NULL);
      qv_json_string (w, "name", f->name);
      optional_string (w, "format", f->format);
      qv_json_string (w, "sha256", f->sha256);
      qv_json_begin_array (w, "frames");
      for (guint j = 0; j < f->frames->len; j++)
        {
          const QvManifestFrame *fr = f->frames->pdata[j];
          qv_json_begin_object (w, NULL);
          qv_json_int (w, "index", fr->index);
          qv_json_begin_array (w, "modes");
          for (guint k = 0; k < fr->amplitudes->len; k++)
            {
              const QvManifestAmplitude *a = &g_array_index (fr->amplitudes, QvManifestAmplitude, k);
              qv_json_begin_object (w, NULL);
              qv_json_int (w, "mode", a->mode);
              if (!isnan (a->wavenumber))   /* optional: absent when read absent */
                qv_json_number (w, "wavenumber", a->wavenumber);
              qv_json_number (w, "q", a->q);          /* null when undefined */
              qv_json_number (w, "Q", a->Q);
              qv_json_number (w, "max_displacement", a->max_displacement);
              qv_json_int (w, "max_atom", a->max_atom);
              if (a->level >= 0)
                qv_json_int (w, "level", a->level);
              else
                qv_json_null (w, "level");
              qv_json_number (w, "turning_point_multiple", a->turning_multiple);
              qv_json_end_object (w);
            }
          qv_json_end_array (w);
          write_fields (w, "fields", fr->fields);
          qv_json_end_object (w);
        }
      qv_json_end_array (w);
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  qv_json_end_object (w);
  return qv_json_writer_finish (w);
}

/* ------------------------------------------------------------------------ */
/* A strict JSON parser that keeps positions                                */
/* ------------------------------------------------------------------------ */

typedef enum { J_NULL, J_BOOL, J_NUMBER, J_STRING, J_ARRAY, J_OBJECT } JType;

typedef struct JNode JNode;
struct JNode {
  JType type;
  gsize line, column;
  gboolean boolean;
  double number;
  gboolean integral;           /* an integer literal that fits 64 bits */
  gint64 integer;
  char *string;
  GPtrArray *items;            /* JNode*: array elements or object values */
  GPtrArray *keys;             /* char*: object member names */
  GArray *key_pos;             /* gsize pairs: line, column of each name */
};

static void
jnode_free (gpointer data)
{
  JNode *n = data;
  if (n == NULL)
    return;
  g_free (n->string);
  if (n->items)
    g_ptr_array_unref (n->items);
  if (n->keys)
    g_ptr_array_unref (n->keys);
  if (n->key_pos)
    g_array_unref (n->key_pos);
  g_free (n);
}

typedef struct {
  const char *p, *end, *name;
  gsize line, column;
  GError **error;
} Parser;

static void
advance (Parser *ps)
{
  const unsigned char c = (unsigned char) *ps->p++;
  if (c == '\n')
    {
      ps->line++;
      ps->column = 1;
    }
  else if ((c & 0xC0) != 0x80)
    ps->column++;
}

static int
peek (const Parser *ps)
{
  return ps->p < ps->end ? (unsigned char) *ps->p : -1;
}

static void
skip_space (Parser *ps)
{
  while (ps->p < ps->end && (*ps->p == ' ' || *ps->p == '\t' || *ps->p == '\n' || *ps->p == '\r'))
    advance (ps);
}

static gboolean parse_fail (Parser *ps, const char *format, ...) G_GNUC_PRINTF (2, 3);

static gboolean
parse_fail (Parser *ps, const char *format, ...)
{
  va_list args;
  g_autofree char *message = NULL;
  va_start (args, format);
  message = g_strdup_vprintf (format, args);
  va_end (args);
  qv_io_error (ps->error, ps->name, ps->line, ps->column, "%s", message);
  return FALSE;
}

static gboolean
parse_hex4 (Parser *ps, guint *value)
{
  *value = 0;
  for (int i = 0; i < 4; i++)
    {
      int c = peek (ps);
      if (!g_ascii_isxdigit (c))
        return parse_fail (ps, "expected 4 hexadecimal digits after \\u");
      *value = *value * 16 + (guint) g_ascii_xdigit_value ((char) c);
      advance (ps);
    }
  return TRUE;
}

static gboolean
parse_string (Parser *ps, char **out)
{
  GString *s = g_string_new (NULL);

  advance (ps);   /* the opening quote */
  for (;;)
    {
      int c = peek (ps);
      if (c < 0)
        {
          g_string_free (s, TRUE);
          return parse_fail (ps, "the file ends inside a string");
        }
      if (c == '"')
        {
          advance (ps);
          break;
        }
      if (c < 0x20)
        {
          g_string_free (s, TRUE);
          return parse_fail (ps, "control character in a string (write it as an escape)");
        }
      if (c == '\\')
        {
          advance (ps);
          c = peek (ps);
          switch (c)
            {
            case '"': case '\\': case '/': g_string_append_c (s, (char) c); advance (ps); break;
            case 'b': g_string_append_c (s, '\b'); advance (ps); break;
            case 'f': g_string_append_c (s, '\f'); advance (ps); break;
            case 'n': g_string_append_c (s, '\n'); advance (ps); break;
            case 'r': g_string_append_c (s, '\r'); advance (ps); break;
            case 't': g_string_append_c (s, '\t'); advance (ps); break;
            case 'u':
              {
                guint u, lo;
                advance (ps);
                if (!parse_hex4 (ps, &u))
                  {
                    g_string_free (s, TRUE);
                    return FALSE;
                  }
                if (u >= 0xD800 && u < 0xDC00)
                  {
                    if (peek (ps) != '\\' || ps->p + 1 >= ps->end || ps->p[1] != 'u')
                      {
                        g_string_free (s, TRUE);
                        return parse_fail (ps, "a high surrogate \\u%04X without its low half", u);
                      }
                    advance (ps);
                    advance (ps);
                    if (!parse_hex4 (ps, &lo))
                      {
                        g_string_free (s, TRUE);
                        return FALSE;
                      }
                    if (lo < 0xDC00 || lo > 0xDFFF)
                      {
                        g_string_free (s, TRUE);
                        return parse_fail (ps, "\\u%04X is not a low surrogate", lo);
                      }
                    u = 0x10000 + ((u - 0xD800) << 10) + (lo - 0xDC00);
                  }
                else if (u >= 0xDC00 && u < 0xE000)
                  {
                    g_string_free (s, TRUE);
                    return parse_fail (ps, "a lone low surrogate \\u%04X", u);
                  }
                if (u == 0)
                  {
                    g_string_free (s, TRUE);
                    return parse_fail (ps, "\\u0000 in a string");
                  }
                g_string_append_unichar (s, (gunichar) u);
              }
              break;
            default:
              g_string_free (s, TRUE);
              return parse_fail (ps, "unknown escape in a string");
            }
          continue;
        }
      g_string_append_c (s, (char) c);
      advance (ps);
    }
  *out = g_string_free (s, FALSE);
  return TRUE;
}

static gboolean
parse_number (Parser *ps, JNode *n)
{
  const char *start = ps->p;
  gboolean integral = TRUE;
  g_autofree char *text = NULL;

  if (peek (ps) == '-')
    advance (ps);
  if (peek (ps) == '0')
    {
      advance (ps);
      if (g_ascii_isdigit (peek (ps)))
        return parse_fail (ps, "a number must not start with 0 followed by digits");
    }
  else if (g_ascii_isdigit (peek (ps)))
    while (g_ascii_isdigit (peek (ps)))
      advance (ps);
  else
    return parse_fail (ps, "expected a digit");
  if (peek (ps) == '.')
    {
      integral = FALSE;
      advance (ps);
      if (!g_ascii_isdigit (peek (ps)))
        return parse_fail (ps, "expected a digit after the decimal point");
      while (g_ascii_isdigit (peek (ps)))
        advance (ps);
    }
  if (peek (ps) == 'e' || peek (ps) == 'E')
    {
      integral = FALSE;
      advance (ps);
      if (peek (ps) == '+' || peek (ps) == '-')
        advance (ps);
      if (!g_ascii_isdigit (peek (ps)))
        return parse_fail (ps, "expected a digit in the exponent");
      while (g_ascii_isdigit (peek (ps)))
        advance (ps);
    }
  text = g_strndup (start, (gsize) (ps->p - start));
  n->type = J_NUMBER;
  n->number = g_ascii_strtod (text, NULL);
  if (!isfinite (n->number))
    return parse_fail (ps, "the number %s is out of the range of a double", text);
  if (integral)
    {
      char *end = NULL;
      errno = 0;
      n->integer = g_ascii_strtoll (text, &end, 10);
      n->integral = errno == 0;
    }
  return TRUE;
}

static JNode *parse_value (Parser *ps, guint depth);

static JNode *
parse_container (Parser *ps, JNode *n, guint depth)
{
  const gboolean object = peek (ps) == '{';
  const int close = object ? '}' : ']';

  if (depth >= QV_MANIFEST_MAX_DEPTH)
    {
      parse_fail (ps, "nested deeper than %d levels of arrays and objects",
                  QV_MANIFEST_MAX_DEPTH);
      jnode_free (n);
      return NULL;
    }
  n->type = object ? J_OBJECT : J_ARRAY;
  n->items = g_ptr_array_new_with_free_func (jnode_free);
  if (object)
    {
      n->keys = g_ptr_array_new_with_free_func (g_free);
      n->key_pos = g_array_new (FALSE, FALSE, sizeof (gsize));
    }
  advance (ps);
  skip_space (ps);
  if (peek (ps) == close)
    {
      advance (ps);
      return n;
    }
  for (;;)
    {
      JNode *item;
      if (object)
        {
          char *key = NULL;
          gsize line = ps->line, column = ps->column;
          if (peek (ps) != '"')
            {
              parse_fail (ps, "expected a member name in double quotes");
              jnode_free (n);
              return NULL;
            }
          if (!parse_string (ps, &key))
            {
              jnode_free (n);
              return NULL;
            }
          for (guint i = 0; i < n->keys->len; i++)
            if (strcmp (n->keys->pdata[i], key) == 0)
              {
                qv_io_error (ps->error, ps->name, line, column, "member \"%s\" appears twice", key);
                g_free (key);
                jnode_free (n);
                return NULL;
              }
          g_ptr_array_add (n->keys, key);
          g_array_append_val (n->key_pos, line);
          g_array_append_val (n->key_pos, column);
          skip_space (ps);
          if (peek (ps) != ':')
            {
              parse_fail (ps, "expected ':' after the member name");
              jnode_free (n);
              return NULL;
            }
          advance (ps);
          skip_space (ps);
        }
      item = parse_value (ps, depth + 1);
      if (item == NULL)
        {
          jnode_free (n);
          return NULL;
        }
      g_ptr_array_add (n->items, item);
      skip_space (ps);
      if (peek (ps) == close)
        {
          advance (ps);
          return n;
        }
      if (peek (ps) != ',')
        {
          parse_fail (ps, object ? "expected ',' or '}' after an object member"
                                 : "expected ',' or ']' after an array element");
          jnode_free (n);
          return NULL;
        }
      advance (ps);
      skip_space (ps);
      if (peek (ps) == close)
        {
          parse_fail (ps, "'%c' after a comma; JSON does not allow a trailing comma", close);
          jnode_free (n);
          return NULL;
        }
    }
}

static gboolean
literal (Parser *ps, const char *word)
{
  const gsize len = strlen (word);
  if ((gsize) (ps->end - ps->p) < len || memcmp (ps->p, word, len) != 0)
    return FALSE;
  for (gsize i = 0; i < len; i++)
    advance (ps);
  return TRUE;
}

static JNode *
parse_value (Parser *ps, guint depth)
{
  JNode *n = g_new0 (JNode, 1);
  int c = peek (ps);

  n->line = ps->line;
  n->column = ps->column;
  if (c == '{' || c == '[')
    return parse_container (ps, n, depth);
  if (c == '"')
    {
      n->type = J_STRING;
      if (parse_string (ps, &n->string))
        return n;
    }
  else if (c == '-' || g_ascii_isdigit (c))
    {
      if (parse_number (ps, n))
        return n;
    }
  else if (literal (ps, "true"))
    {
      n->type = J_BOOL;
      n->boolean = TRUE;
      return n;
    }
  else if (literal (ps, "false"))
    {
      n->type = J_BOOL;
      return n;
    }
  else if (literal (ps, "null"))
    {
      n->type = J_NULL;
      return n;
    }
  else if (c < 0)
    parse_fail (ps, "the file ends where a value was expected");
  else
    parse_fail (ps, "expected a value (an object, array, string, number, true, false or null)");
  jnode_free (n);
  return NULL;
}

/* ------------------------------------------------------------------------ */
/* Reading the manifest from the tree                                       */
/* ------------------------------------------------------------------------ */

typedef struct {
  const char *name;
  GError **error;
} Reader;

static gboolean at_fail (Reader *r, gsize line, gsize column, const char *path,
                         const char *format, ...) G_GNUC_PRINTF (5, 6);

static gboolean
at_fail (Reader *r, gsize line, gsize column, const char *path, const char *format, ...)
{
  va_list args;
  g_autofree char *message = NULL;
  va_start (args, format);
  message = g_strdup_vprintf (format, args);
  va_end (args);
  qv_io_error (r->error, r->name, line, column, "%s: %s", path, message);
  return FALSE;
}

static const char *
type_name (const JNode *n)
{
  switch (n->type)
    {
    case J_NULL: return "null";
    case J_BOOL: return "a boolean";
    case J_NUMBER: return "a number";
    case J_STRING: return "a string";
    case J_ARRAY: return "an array";
    case J_OBJECT: return "an object";
    default: return "?";
    }
}

static gboolean
expect (Reader *r, const JNode *n, JType type, const char *path)
{
  static const char *const names[] = { "null", "true or false", "a number", "a string",
                                       "an array", "an object" };
  if (n->type == type)
    return TRUE;
  return at_fail (r, n->line, n->column, path, "expected %s, found %s", names[type], type_name (n));
}

static char *
child_path (const char *path, const char *key)
{
  return *path ? g_strconcat (path, ".", key, NULL) : g_strdup (key);
}

/* Checks that @object has no member outside @known and all of @required
 * (a subset of @known; NULL-terminated lists). */
static gboolean
check_members (Reader *r, const JNode *object, const char *path, const char *const *known,
               const char *const *required)
{
  for (guint i = 0; i < object->keys->len; i++)
    {
      const char *key = object->keys->pdata[i];
      gboolean ok = FALSE;
      for (const char *const *k = known; *k && !ok; k++)
        ok = strcmp (*k, key) == 0;
      if (!ok)
        {
          g_autofree char *list = g_strjoinv (", ", (char **) known);
          g_autofree char *where = child_path (path, key);
          return at_fail (r, g_array_index (object->key_pos, gsize, 2 * i),
                          g_array_index (object->key_pos, gsize, 2 * i + 1), where,
                          "unknown member; %s takes %s", *path ? path : "the manifest", list);
        }
    }
  for (const char *const *k = required; *k; k++)
    {
      gboolean found = FALSE;
      for (guint i = 0; i < object->keys->len && !found; i++)
        found = strcmp (object->keys->pdata[i], *k) == 0;
      if (!found)
        return at_fail (r, object->line, object->column, *path ? path : "manifest",
                        "the required member \"%s\" is missing", *k);
    }
  return TRUE;
}

static const JNode *
member (const JNode *object, const char *key)
{
  for (guint i = 0; i < object->keys->len; i++)
    if (strcmp (object->keys->pdata[i], key) == 0)
      return object->items->pdata[i];
  return NULL;
}

static gboolean
get_string (Reader *r, const JNode *object, const char *path, const char *key, char **out)
{
  const JNode *n = member (object, key);
  g_autofree char *where = child_path (path, key);
  if (n == NULL)
    return TRUE;
  if (!expect (r, n, J_STRING, where))
    return FALSE;
  g_free (*out);
  *out = g_strdup (n->string);
  return TRUE;
}

static gboolean
get_uint (Reader *r, const JNode *object, const char *path, const char *key, guint64 max,
          guint64 *out)
{
  const JNode *n = member (object, key);
  g_autofree char *where = child_path (path, key);
  if (n == NULL)
    return TRUE;
  if (n->type != J_NUMBER || !n->integral || n->integer < 0 || (guint64) n->integer > max)
    return at_fail (r, n->line, n->column, where, "expected a whole number from 0 to %"
                    G_GUINT64_FORMAT, max);
  *out = (guint64) n->integer;
  return TRUE;
}

/* A number, or null for NAN when @nullable. */
static gboolean
get_double (Reader *r, const JNode *object, const char *path, const char *key,
            gboolean nullable, double *out)
{
  const JNode *n = member (object, key);
  g_autofree char *where = child_path (path, key);
  if (n == NULL)
    return TRUE;
  if (nullable && n->type == J_NULL)
    {
      *out = NAN;
      return TRUE;
    }
  if (n->type != J_NUMBER)
    return at_fail (r, n->line, n->column, where, "expected a number%s, found %s",
                    nullable ? " or null" : "", type_name (n));
  *out = n->number;
  return TRUE;
}

static gboolean
read_fields (Reader *r, const JNode *object, const char *path, const char *key, GPtrArray *out)
{
  const JNode *n = member (object, key);
  g_autofree char *where = child_path (path, key);
  if (n == NULL)
    return TRUE;
  if (!expect (r, n, J_OBJECT, where))
    return FALSE;
  for (guint i = 0; i < n->keys->len; i++)
    {
      const char *k = n->keys->pdata[i];
      const JNode *v = n->items->pdata[i];
      g_autofree char *at = child_path (where, k);
      switch (v->type)
        {
        case J_NUMBER:
          if (v->integral)
            qv_manifest_set_integer (out, k, v->integer);
          else
            qv_manifest_set_number (out, k, v->number);
          break;
        case J_STRING: qv_manifest_set_string (out, k, v->string); break;
        case J_BOOL: qv_manifest_set_boolean (out, k, v->boolean); break;
        default:
          return at_fail (r, v->line, v->column, at, "a field is a number, a string or "
                          "true/false, found %s", type_name (v));
        }
    }
  return TRUE;
}

static gboolean
read_strings (Reader *r, const JNode *object, const char *path, const char *key, GPtrArray *out)
{
  const JNode *n = member (object, key);
  g_autofree char *where = child_path (path, key);
  if (n == NULL)
    return TRUE;
  if (!expect (r, n, J_ARRAY, where))
    return FALSE;
  for (guint i = 0; i < n->items->len; i++)
    {
      const JNode *v = n->items->pdata[i];
      g_autofree char *at = g_strdup_printf ("%s[%u]", where, i);
      if (!expect (r, v, J_STRING, at))
        return FALSE;
      g_ptr_array_add (out, g_strdup (v->string));
    }
  return TRUE;
}

static gboolean
is_sha256 (const char *s)
{
  if (s == NULL || strlen (s) != 64)
    return FALSE;
  for (const char *p = s; *p; p++)
    if (!g_ascii_isxdigit (*p) || g_ascii_isupper (*p))
      return FALSE;
  return TRUE;
}

static gboolean
check_sha (Reader *r, const JNode *object, const char *path, const char *value)
{
  const JNode *n = member (object, "sha256");
  g_autofree char *where = child_path (path, "sha256");
  if (is_sha256 (value))
    return TRUE;
  return at_fail (r, n->line, n->column, where, "expected 64 lower-case hexadecimal digits "
                  "(a SHA-256)");
}

static gboolean
read_amplitude (Reader *r, const JNode *n, const char *path, QvManifestAmplitude *a)
{
  static const char *const known[] = { "mode", "wavenumber", "q", "Q", "max_displacement",
                                       "max_atom", "level", "turning_point_multiple", NULL };
  static const char *const required[] = { "mode", "Q", NULL };
  guint64 mode = 0, atom = 0, level = 0;
  const JNode *lv;

  if (!expect (r, n, J_OBJECT, path) || !check_members (r, n, path, known, required))
    return FALSE;
  memset (a, 0, sizeof *a);
  a->wavenumber = a->q = a->max_displacement = a->turning_multiple = NAN;
  a->level = -1;
  if (!get_uint (r, n, path, "mode", G_MAXUINT, &mode)
      || !get_uint (r, n, path, "max_atom", G_MAXUINT, &atom)
      || !get_double (r, n, path, "wavenumber", FALSE, &a->wavenumber)
      || !get_double (r, n, path, "q", TRUE, &a->q)
      || !get_double (r, n, path, "Q", FALSE, &a->Q)
      || !get_double (r, n, path, "max_displacement", TRUE, &a->max_displacement)
      || !get_double (r, n, path, "turning_point_multiple", TRUE, &a->turning_multiple))
    return FALSE;
  if (mode == 0)
    {
      g_autofree char *where = child_path (path, "mode");
      const JNode *m = member (n, "mode");
      return at_fail (r, m->line, m->column, where, "modes count from 1");
    }
  lv = member (n, "level");
  if (lv != NULL && lv->type != J_NULL)
    {
      if (!get_uint (r, n, path, "level", 1000000, &level))
        return FALSE;
      a->level = (gint) level;
    }
  a->mode = (guint) mode;
  a->max_atom = (guint) atom;
  return TRUE;
}

static gboolean
read_frame (Reader *r, const JNode *n, const char *path, guint expected, QvManifestFrame **out)
{
  static const char *const known[] = { "index", "modes", "fields", NULL };
  static const char *const required[] = { "index", NULL };
  guint64 index = 0;
  const JNode *modes;
  QvManifestFrame *fr;

  if (!expect (r, n, J_OBJECT, path) || !check_members (r, n, path, known, required)
      || !get_uint (r, n, path, "index", G_MAXUINT, &index))
    return FALSE;
  if (index != expected)
    {
      const JNode *i = member (n, "index");
      g_autofree char *where = child_path (path, "index");
      return at_fail (r, i->line, i->column, where, "frame index %" G_GUINT64_FORMAT
                      ", expected %u (frames are listed in file order)", index, expected);
    }
  fr = frame_new (expected);
  modes = member (n, "modes");
  if (modes != NULL)
    {
      g_autofree char *where = child_path (path, "modes");
      if (!expect (r, modes, J_ARRAY, where))
        {
          frame_free (fr);
          return FALSE;
        }
      for (guint i = 0; i < modes->items->len; i++)
        {
          QvManifestAmplitude a;
          g_autofree char *at = g_strdup_printf ("%s[%u]", where, i);
          if (!read_amplitude (r, modes->items->pdata[i], at, &a))
            {
              frame_free (fr);
              return FALSE;
            }
          g_array_append_val (fr->amplitudes, a);
        }
    }
  if (!read_fields (r, n, path, "fields", fr->fields))
    {
      frame_free (fr);
      return FALSE;
    }
  *out = fr;
  return TRUE;
}

static gboolean
read_file_entry (Reader *r, QvManifest *m, const JNode *n, const char *path)
{
  static const char *const known[] = { "name", "format", "sha256", "frames", NULL };
  static const char *const required[] = { "name", "sha256", "frames", NULL };
  QvManifestFile *f;
  const JNode *frames;
  g_autofree char *where = child_path (path, "frames");

  if (!expect (r, n, J_OBJECT, path) || !check_members (r, n, path, known, required))
    return FALSE;
  f = g_new0 (QvManifestFile, 1);
  f->frames = g_ptr_array_new_with_free_func (frame_free);
  g_ptr_array_add (m->files, f);
  if (!get_string (r, n, path, "name", &f->name) || !get_string (r, n, path, "format", &f->format)
      || !get_string (r, n, path, "sha256", &f->sha256) || !check_sha (r, n, path, f->sha256))
    return FALSE;
  if (*f->name == '\0' || strchr (f->name, '/') || strchr (f->name, '\\')
      || strcmp (f->name, ".") == 0 || strcmp (f->name, "..") == 0)
    {
      const JNode *v = member (n, "name");
      g_autofree char *at = child_path (path, "name");
      return at_fail (r, v->line, v->column, at, "a file name beside the manifest is expected "
                      "(no directories), found \"%s\"", f->name);
    }
  for (guint i = 0; i + 1 < m->files->len; i++)
    if (strcmp (((QvManifestFile *) m->files->pdata[i])->name, f->name) == 0)
      {
        const JNode *v = member (n, "name");
        g_autofree char *at = child_path (path, "name");
        return at_fail (r, v->line, v->column, at, "\"%s\" is listed twice", f->name);
      }
  frames = member (n, "frames");
  if (!expect (r, frames, J_ARRAY, where))
    return FALSE;
  for (guint i = 0; i < frames->items->len; i++)
    {
      QvManifestFrame *fr = NULL;
      g_autofree char *at = g_strdup_printf ("%s[%u]", where, i);
      if (!read_frame (r, frames->items->pdata[i], at, i, &fr))
        return FALSE;
      g_ptr_array_add (f->frames, fr);
    }
  return TRUE;
}

static QvManifest *
read_manifest (Reader *r, const JNode *root)
{
  static const char *const known[] = { "format", "version", "generator", "command", "arguments",
                                       "options", "inputs", "structure", "units", "parameters",
                                       "notes", "files", NULL };
  static const char *const required[] = { "format", "version", "command", "files", NULL };
  g_autoptr(QvManifest) m = NULL;
  const JNode *n;
  guint64 version = 0;

  if (!expect (r, root, J_OBJECT, "manifest"))
    return NULL;
  /* format and version first: a file of another kind gets that message,
   * not one about its members */
  n = member (root, "format");
  if (n == NULL || n->type != J_STRING || strcmp (n->string, QV_MANIFEST_FORMAT) != 0)
    {
      at_fail (r, n ? n->line : root->line, n ? n->column : root->column, "format",
               "not a Quaver manifest: expected \"format\": \"%s\"", QV_MANIFEST_FORMAT);
      return NULL;
    }
  if (!get_uint (r, root, "", "version", G_MAXINT, &version))
    return NULL;
  n = member (root, "version");
  if (n == NULL || version < 1 || version > QV_MANIFEST_VERSION)
    {
      at_fail (r, n ? n->line : root->line, n ? n->column : root->column, "version",
               n == NULL ? "the version is missing" :
               "version %" G_GUINT64_FORMAT " is not one this program reads (1 to %d); a newer "
               "Quaver wrote it", version, QV_MANIFEST_VERSION);
      return NULL;
    }
  if (!check_members (r, root, "", known, required))
    return NULL;

  m = qv_manifest_new (NULL);
  m->version = (int) version;
  g_clear_pointer (&m->generator, g_free);
  if (!get_string (r, root, "", "generator", &m->generator)
      || !get_string (r, root, "", "command", &m->command)
      || !read_strings (r, root, "", "arguments", m->arguments)
      || !read_fields (r, root, "", "options", m->options)
      || !read_fields (r, root, "", "parameters", m->parameters)
      || !read_strings (r, root, "", "notes", m->notes))
    return NULL;

  if ((n = member (root, "inputs")) != NULL)
    {
      if (!expect (r, n, J_ARRAY, "inputs"))
        return NULL;
      for (guint i = 0; i < n->items->len; i++)
        {
          static const char *const in_known[] = { "role", "path", "sha256", NULL };
          static const char *const in_required[] = { "role", "sha256", NULL };
          const JNode *e = n->items->pdata[i];
          g_autofree char *at = g_strdup_printf ("inputs[%u]", i);
          QvManifestInput *in;
          if (!expect (r, e, J_OBJECT, at) || !check_members (r, e, at, in_known, in_required))
            return NULL;
          in = g_new0 (QvManifestInput, 1);
          g_ptr_array_add (m->inputs, in);
          if (!get_string (r, e, at, "role", &in->role) || !get_string (r, e, at, "path", &in->path)
              || !get_string (r, e, at, "sha256", &in->sha256) || !check_sha (r, e, at, in->sha256))
            return NULL;
        }
    }
  if ((n = member (root, "structure")) != NULL)
    {
      static const char *const s_known[] = { "natoms", "formula", "periodic", NULL };
      static const char *const s_required[] = { "natoms", NULL };
      const JNode *p;
      guint64 natoms = 0;
      if (!expect (r, n, J_OBJECT, "structure")
          || !check_members (r, n, "structure", s_known, s_required)
          || !get_uint (r, n, "structure", "natoms", 10000000, &natoms))
        return NULL;
      m->n_atoms = (gsize) natoms;
      p = member (n, "formula");
      if (p != NULL && p->type != J_NULL && !get_string (r, n, "structure", "formula", &m->formula))
        return NULL;
      p = member (n, "periodic");
      if (p != NULL)
        {
          if (!expect (r, p, J_BOOL, "structure.periodic"))
            return NULL;
          m->periodic = p->boolean;
        }
    }
  if ((n = member (root, "units")) != NULL && !expect (r, n, J_OBJECT, "units"))
    return NULL;

  n = member (root, "files");
  if (!expect (r, n, J_ARRAY, "files"))
    return NULL;
  for (guint i = 0; i < n->items->len; i++)
    {
      g_autofree char *at = g_strdup_printf ("files[%u]", i);
      if (!read_file_entry (r, m, n->items->pdata[i], at))
        return NULL;
    }
  return g_steal_pointer (&m);
}

QvManifest *
qv_manifest_read_data (const char *data, gsize length, const char *name, GError **error)
{
  Parser ps = { data, data + length, name ? name : "<manifest>", 1, 1, error };
  Reader r = { ps.name, error };
  const char *bad = NULL;
  JNode *root;
  QvManifest *m;

  if (!g_utf8_validate_len (data, length, &bad))
    {
      while (ps.p < bad)
        advance (&ps);
      parse_fail (&ps, *bad == '\0' ? "NUL byte; a manifest is UTF-8 text"
                                    : "invalid UTF-8; a manifest is UTF-8 text");
      return NULL;
    }
  skip_space (&ps);
  if (ps.p == ps.end)
    {
      parse_fail (&ps, "the file is empty; expected a JSON object");
      return NULL;
    }
  root = parse_value (&ps, 0);
  if (root == NULL)
    return NULL;
  skip_space (&ps);
  if (ps.p != ps.end)
    {
      parse_fail (&ps, "unexpected text after the end of the manifest's JSON object");
      jnode_free (root);
      return NULL;
    }
  m = read_manifest (&r, root);
  jnode_free (root);
  return m;
}

QvManifest *
qv_manifest_read_file (const char *path, GError **error)
{
  g_autofree char *contents = NULL;
  gsize length = 0;

  if (!qv_io_read_file (path, QV_MANIFEST_MAX_BYTES, &contents, &length, error))
    return NULL;
  return qv_manifest_read_data (contents, length, path, error);
}
