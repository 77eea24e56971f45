/* qv-cif.c — crystal structures from CIF 1.1 files.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Two stages. The lexer and parser follow the CIF 1.1 syntax (Hall, Allen &
 * Brown, Acta Cryst. A47, 655, 1991; the CIF 1.1 syntax specification):
 * whitespace-separated tokens; '#' comments; data_NAME starts a block;
 * tags begin with '_' and are case-insensitive; a value is an unquoted
 * word, a 'single' or "double" quoted string (closed by the quote followed
 * by whitespace, on the same line), or a text field between two lines
 * starting with ';'; loop_ is followed by its tags and then their values,
 * row by row. Every block is kept as a table of tags, each pointing to a
 * column of a loop (a plain tag-value pair is a loop of one row).
 *
 * The second stage takes one block and builds the structure: cell, sites,
 * operators, expansion. Unquoted '?' (unknown) and '.' (inapplicable) are
 * recognised; numbers may carry a standard uncertainty in parentheses,
 * 1.234(5), which is dropped. Lines and columns count from 1, columns in
 * bytes; LF, CRLF and CR line ends. */
#include "qv-cif.h"

#include <math.h>
#include <string.h>

#include "qv-element.h"
#include "qv-io-error.h"

#define CIF_MAX_BYTES ((gsize) 1 << 30)
#define CIF_MAX_ATOMS ((gsize) 10000000)
/* Occupancies below this are partial (common practice: CIFs print 1 as
 * 0.9999 or 1.000(2) at most). */
#define CIF_OCCUPANCY_FULL (1.0 - 1e-3)

/* ------------------------------------------------------------------ */
/* Lexer                                                                */

typedef enum {
  TOK_EOF,
  TOK_DATA,        /* text: the block name */
  TOK_LOOP,
  TOK_TAG,         /* text: the tag with its '_' */
  TOK_VALUE,
  TOK_RESERVED,    /* save_, global_, stop_ */
} TokKind;

typedef struct {
  TokKind kind;
  char *text;      /* owned */
  gsize line, column;
  gboolean quoted; /* quoted string or text field: '?' and '.' are text */
} Token;

typedef struct {
  const char *data;
  gsize len, pos;
  gsize line, line_start;
  const char *name;
} Lexer;

static void
token_clear (Token *t)
{
  g_clear_pointer (&t->text, g_free);
}

static gboolean
at_line_end (const Lexer *lx, gsize p)
{
  return p >= lx->len || lx->data[p] == '\n' || lx->data[p] == '\r';
}

static gboolean
is_space (char c)
{
  return c == ' ' || c == '\t' || c == '\n' || c == '\r';
}

/* Steps over one line end at lx->pos (LF, CRLF or CR). */
static void
newline (Lexer *lx)
{
  if (lx->data[lx->pos] == '\r' && lx->pos + 1 < lx->len && lx->data[lx->pos + 1] == '\n')
    lx->pos++;
  lx->pos++;
  lx->line++;
  lx->line_start = lx->pos;
}

static gsize
column (const Lexer *lx)
{
  return lx->pos - lx->line_start + 1;
}

static gboolean
skip_space (Lexer *lx, GError **error)
{
  while (lx->pos < lx->len)
    {
      char c = lx->data[lx->pos];
      if (c == ' ' || c == '\t')
        lx->pos++;
      else if (c == '\n' || c == '\r')
        newline (lx);
      else if (c == '#')
        {
          while (!at_line_end (lx, lx->pos))
            lx->pos++;
        }
      else if (c == '\0')
        {
          qv_io_error (error, lx->name, lx->line, column (lx),
                       "a NUL byte: this is not a text file (CIF is plain text)");
          return FALSE;
        }
      else
        break;
    }
  return TRUE;
}

static gboolean
next_token (Lexer *lx, Token *t, GError **error)
{
  gsize start;
  char c;

  memset (t, 0, sizeof *t);
  if (!skip_space (lx, error))
    return FALSE;
  t->line = lx->line;
  t->column = column (lx);
  if (lx->pos >= lx->len)
    {
      t->kind = TOK_EOF;
      return TRUE;
    }
  c = lx->data[lx->pos];

  if (c == ';' && lx->pos == lx->line_start)
    {
      /* A text field: up to the next line that starts with ';'. */
      GString *text = g_string_new (NULL);
      lx->pos++;
      for (;;)
        {
          if (lx->pos >= lx->len)
            {
              g_string_free (text, TRUE);
              qv_io_error (error, lx->name, t->line, t->column,
                           "text field opened here is never closed: end it with a line "
                           "that starts with ';'");
              return FALSE;
            }
          if (lx->data[lx->pos] == '\n' || lx->data[lx->pos] == '\r')
            {
              newline (lx);
              if (lx->pos < lx->len && lx->data[lx->pos] == ';')
                {
                  lx->pos++;
                  break;
                }
              g_string_append_c (text, '\n');
              continue;
            }
          g_string_append_c (text, lx->data[lx->pos]);
          lx->pos++;
        }
      t->kind = TOK_VALUE;
      t->quoted = TRUE;
      t->text = g_string_free (text, FALSE);
      return TRUE;
    }

  if (c == '\'' || c == '"')
    {
      /* Closed by the same quote followed by whitespace or the end. */
      gsize p = lx->pos + 1;
      for (;; p++)
        {
          if (at_line_end (lx, p))
            {
              qv_io_error (error, lx->name, t->line, t->column,
                           "quoted string not closed on this line: end it with %c followed by "
                           "a space, or use a text field (lines between ';' lines) for text "
                           "that spans lines", c);
              return FALSE;
            }
          if (lx->data[p] == c && (p + 1 >= lx->len || is_space (lx->data[p + 1])))
            break;
        }
      t->kind = TOK_VALUE;
      t->quoted = TRUE;
      t->text = g_strndup (lx->data + lx->pos + 1, p - lx->pos - 1);
      lx->pos = p + 1;
      return TRUE;
    }

  start = lx->pos;
  while (lx->pos < lx->len && !is_space (lx->data[lx->pos]) && lx->data[lx->pos] != '\0')
    lx->pos++;
  t->text = g_strndup (lx->data + start, lx->pos - start);

  if (c == '_')
    t->kind = TOK_TAG;
  else if (g_ascii_strncasecmp (t->text, "data_", 5) == 0)
    {
      char *name = g_strdup (t->text + 5);
      if (*name == '\0')
        {
          g_free (name);
          qv_io_error (error, lx->name, t->line, t->column,
                       "data_ without a name: write data_NAME");
          token_clear (t);
          return FALSE;
        }
      g_free (t->text);
      t->text = name;
      t->kind = TOK_DATA;
    }
  else if (g_ascii_strcasecmp (t->text, "loop_") == 0)
    t->kind = TOK_LOOP;
  else if (g_ascii_strncasecmp (t->text, "save_", 5) == 0
           || g_ascii_strcasecmp (t->text, "global_") == 0
           || g_ascii_strcasecmp (t->text, "stop_") == 0)
    t->kind = TOK_RESERVED;
  else if (c == '[' || c == ']' || c == '$')
    {
      qv_io_error (error, lx->name, t->line, t->column,
                   "a value cannot begin with '%c' in CIF 1.1: put it in quotes", c);
      token_clear (t);
      return FALSE;
    }
  else
    t->kind = TOK_VALUE;
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* Parser: blocks of loops                                              */

typedef struct {
  guint n_tags;
  gboolean single;       /* a plain tag-value pair, not a loop_ */
  GPtrArray *values;     /* Token*, row by row */
  gsize line, column;    /* of loop_ (or of the tag of a single pair) */
} Loop;

typedef struct {
  Loop *loop;
  guint column;
  gsize line, col;       /* of the tag */
} TagRef;

typedef struct {
  char *name;
  gsize line, column;
  GPtrArray *loops;      /* Loop*, owned */
  GHashTable *tags;      /* lower-case tag → TagRef*, owned */
} Block;

static void
token_free (gpointer p)
{
  Token *t = p;
  token_clear (t);
  g_free (t);
}

static void
loop_free (gpointer p)
{
  Loop *l = p;
  g_ptr_array_unref (l->values);
  g_free (l);
}

static void
block_free (gpointer p)
{
  Block *b = p;
  g_free (b->name);
  g_ptr_array_unref (b->loops);
  g_hash_table_unref (b->tags);
  g_free (b);
}

static Token *
token_dup (Token *t)
{
  Token *copy = g_new (Token, 1);
  *copy = *t;
  t->text = NULL;
  return copy;
}

static Loop *
loop_new (gsize line, gsize col)
{
  Loop *l = g_new0 (Loop, 1);
  l->values = g_ptr_array_new_with_free_func (token_free);
  l->line = line;
  l->column = col;
  return l;
}

static gsize
loop_rows (const Loop *l)
{
  return l->n_tags ? l->values->len / l->n_tags : 0;
}

static Token *
loop_value (const Loop *l, gsize row, guint col)
{
  return g_ptr_array_index (l->values, row * l->n_tags + col);
}

static gboolean
add_tag (const char *file, Block *b, Loop *loop, guint col, const Token *tag, GError **error)
{
  char *key = g_ascii_strdown (tag->text, -1);
  TagRef *ref;

  if (g_hash_table_contains (b->tags, key))
    {
      const TagRef *old = g_hash_table_lookup (b->tags, key);
      qv_io_error (error, file, tag->line, tag->column,
                   "tag %s appears twice in data block '%s' (first on line %" G_GSIZE_FORMAT
                   "): keep one", tag->text, b->name, old->line);
      g_free (key);
      return FALSE;
    }
  ref = g_new (TagRef, 1);
  ref->loop = loop;
  ref->column = col;
  ref->line = tag->line;
  ref->col = tag->column;
  g_hash_table_insert (b->tags, key, ref);
  return TRUE;
}

static GPtrArray *
parse (const char *data, gsize length, const char *name, GError **error)
{
  Lexer lx = { data, length, 0, 1, 0, name };
  g_autoptr(GPtrArray) blocks = g_ptr_array_new_with_free_func (block_free);
  Block *b = NULL;
  Token t = { 0 };
  gboolean pending = FALSE;

  for (;;)
    {
      if (!pending && !next_token (&lx, &t, error))
        return NULL;
      pending = FALSE;
      if (t.kind == TOK_EOF)
        break;

      if (t.kind == TOK_RESERVED)
        {
          qv_io_error (error, name, t.line, t.column,
                       "'%s' (save frames, global blocks) belongs to dictionaries, not to "
                       "structure files: remove it", t.text);
          token_clear (&t);
          return NULL;
        }
      if (t.kind == TOK_DATA)
        {
          for (guint i = 0; i < blocks->len; i++)
            {
              Block *o = g_ptr_array_index (blocks, i);
              if (g_ascii_strcasecmp (o->name, t.text) == 0)
                {
                  qv_io_error (error, name, t.line, t.column,
                               "a second data block named '%s' (the first is on line %"
                               G_GSIZE_FORMAT "): block names must differ", t.text, o->line);
                  token_clear (&t);
                  return NULL;
                }
            }
          b = g_new0 (Block, 1);
          b->name = g_steal_pointer (&t.text);
          b->line = t.line;
          b->column = t.column;
          b->loops = g_ptr_array_new_with_free_func (loop_free);
          b->tags = g_hash_table_new_full (g_str_hash, g_str_equal, g_free, g_free);
          g_ptr_array_add (blocks, b);
          continue;
        }
      if (b == NULL)
        {
          qv_io_error (error, name, t.line, t.column,
                       "'%s' before the first data block: a CIF starts with data_NAME", t.text);
          token_clear (&t);
          return NULL;
        }
      if (t.kind == TOK_VALUE)
        {
          qv_io_error (error, name, t.line, t.column,
                       "value '%s' without a tag: a loop has more values than its tags take, "
                       "or a value with spaces needs quotes", t.text);
          token_clear (&t);
          return NULL;
        }
      if (t.kind == TOK_TAG)
        {
          Token v = { 0 };
          Loop *loop;

          if (!next_token (&lx, &v, error))
            {
              token_clear (&t);
              return NULL;
            }
          if (v.kind != TOK_VALUE)
            {
              qv_io_error (error, name, t.line, t.column,
                           "tag %s has no value: give one ('?' when unknown)", t.text);
              token_clear (&t);
              token_clear (&v);
              return NULL;
            }
          loop = loop_new (t.line, t.column);
          loop->n_tags = 1;
          loop->single = TRUE;
          g_ptr_array_add (loop->values, token_dup (&v));
          g_ptr_array_add (b->loops, loop);
          if (!add_tag (name, b, loop, 0, &t, error))
            {
              token_clear (&t);
              return NULL;
            }
          token_clear (&t);
          continue;
        }
      /* loop_ */
      {
        Loop *loop = loop_new (t.line, t.column);
        g_ptr_array_add (b->loops, loop);
        token_clear (&t);
        for (;;)
          {
            if (!next_token (&lx, &t, error))
              return NULL;
            if (t.kind != TOK_TAG)
              break;
            if (!add_tag (name, b, loop, loop->n_tags, &t, error))
              {
                token_clear (&t);
                return NULL;
              }
            loop->n_tags++;
            token_clear (&t);
          }
        if (loop->n_tags == 0)
          {
            qv_io_error (error, name, loop->line, loop->column,
                         "loop_ without tags: list the tags, then the values row by row");
            token_clear (&t);
            return NULL;
          }
        while (t.kind == TOK_VALUE)
          {
            g_ptr_array_add (loop->values, token_dup (&t));
            if (!next_token (&lx, &t, error))
              return NULL;
          }
        pending = TRUE;
        if (loop->values->len % loop->n_tags != 0)
          {
            qv_io_error (error, name, loop->line, loop->column,
                         "this loop has %u tags but %u values, not a whole number of rows: a "
                         "value is missing or extra (values with spaces need quotes)",
                         loop->n_tags, loop->values->len);
            token_clear (&t);
            return NULL;
          }
      }
    }
  if (blocks->len == 0)
    {
      qv_io_error (error, name, 0, 0, "no data block: a CIF starts with data_NAME");
      return NULL;
    }
  return g_steal_pointer (&blocks);
}

/* ------------------------------------------------------------------ */
/* Values                                                               */

static const TagRef *
find_tag (const Block *b, const char *tag)
{
  return g_hash_table_lookup (b->tags, tag);
}

static gboolean
is_unknown (const Token *v)
{
  return !v->quoted && (strcmp (v->text, "?") == 0 || strcmp (v->text, ".") == 0);
}

/* A CIF number: [+-]digits[.digits][(e|E)[+-]digits], or .digits, with an
 * optional standard uncertainty "(digits)" right after. */
static gboolean
parse_number (const char *s, double *out)
{
  const char *p = s, *num_end;
  gboolean digits = FALSE;
  g_autofree char *copy = NULL;
  char *end = NULL;

  if (*p == '+' || *p == '-')
    p++;
  while (g_ascii_isdigit (*p))
    p++, digits = TRUE;
  if (*p == '.')
    {
      p++;
      while (g_ascii_isdigit (*p))
        p++, digits = TRUE;
    }
  if (!digits)
    return FALSE;
  if (*p == 'e' || *p == 'E')
    {
      p++;
      if (*p == '+' || *p == '-')
        p++;
      if (!g_ascii_isdigit (*p))
        return FALSE;
      while (g_ascii_isdigit (*p))
        p++;
    }
  num_end = p;
  if (*p == '(')
    {
      p++;
      if (!g_ascii_isdigit (*p))
        return FALSE;
      while (g_ascii_isdigit (*p))
        p++;
      if (*p != ')')
        return FALSE;
      p++;
    }
  if (*p != '\0')
    return FALSE;
  copy = g_strndup (s, (gsize) (num_end - s));
  *out = g_ascii_strtod (copy, &end);
  return end != NULL && *end == '\0' && isfinite (*out);
}

/* Reads a number, naming the tag and what it is for in errors. */
static gboolean
value_number (const char *file, const Token *v, const char *tag, double *out, GError **error)
{
  if (is_unknown (v))
    {
      qv_io_error (error, file, v->line, v->column,
                   "%s is '%s' (unknown): Quaver needs its value", tag, v->text);
      return FALSE;
    }
  if (!parse_number (v->text, out))
    {
      qv_io_error (error, file, v->line, v->column,
                   "%s is '%s', not a number: write e.g. 5.64 or 5.640(2)", tag, v->text);
      return FALSE;
    }
  return TRUE;
}

static gboolean
single_number (const char *file, const Block *b, const char *tag, double *out,
               const Token **where, GError **error)
{
  const TagRef *ref = find_tag (b, tag);
  const Token *v;

  if (ref == NULL)
    {
      qv_io_error (error, file, b->line, b->column,
                   "data block '%s' has no %s: the cell needs a, b, c (Å) and alpha, beta, "
                   "gamma (degrees)", b->name, tag);
      return FALSE;
    }
  if (loop_rows (ref->loop) != 1)
    {
      qv_io_error (error, file, ref->line, ref->col,
                   "%s is in a loop of %" G_GSIZE_FORMAT " rows: give it once", tag,
                   loop_rows (ref->loop));
      return FALSE;
    }
  v = loop_value (ref->loop, 0, ref->column);
  if (where)
    *where = v;
  return value_number (file, v, tag, out, error);
}

/* ------------------------------------------------------------------ */
/* Cell                                                                 */

static double
cos_degrees (double deg)
{
  /* Exact for the angles cells use most, so 90° gives 0, not 6e-17. */
  if (deg == 90.0)
    return 0.0;
  if (deg == 60.0)
    return 0.5;
  if (deg == 120.0)
    return -0.5;
  return cos (deg * G_PI / 180.0);
}

static gboolean
read_cell (const char *file, const Block *b, double cell[3][3], GError **error)
{
  static const char *const length_tags[3] = { "_cell_length_a", "_cell_length_b", "_cell_length_c" };
  static const char *const angle_tags[3] = { "_cell_angle_alpha", "_cell_angle_beta", "_cell_angle_gamma" };
  double len[3], ang[3], ca, cb, cg, sg, cy, cz2;
  const Token *where = NULL, *first_angle = NULL;

  for (int i = 0; i < 3; i++)
    {
      if (!single_number (file, b, length_tags[i], &len[i], &where, error))
        return FALSE;
      if (!(len[i] > 0.0))
        {
          qv_io_error (error, file, where->line, where->column,
                       "%s is %g: a cell length must be positive (Å)", length_tags[i], len[i]);
          return FALSE;
        }
    }
  for (int i = 0; i < 3; i++)
    {
      if (!single_number (file, b, angle_tags[i], &ang[i], &where, error))
        return FALSE;
      if (i == 0)
        first_angle = where;
      if (!(ang[i] > 0.0 && ang[i] < 180.0))
        {
          qv_io_error (error, file, where->line, where->column,
                       "%s is %g: a cell angle lies strictly between 0 and 180 degrees",
                       angle_tags[i], ang[i]);
          return FALSE;
        }
    }
  ca = cos_degrees (ang[0]);
  cb = cos_degrees (ang[1]);
  cg = cos_degrees (ang[2]);
  sg = sqrt (1.0 - cg * cg);
  cy = (ca - cb * cg) / sg;
  cz2 = 1.0 - cb * cb - cy * cy;
  if (!(cz2 > 1e-10))
    {
      qv_io_error (error, file, first_angle->line, first_angle->column,
                   "the angles alpha %g, beta %g, gamma %g make no cell (no volume): check "
                   "_cell_angle_alpha, _beta and _gamma", ang[0], ang[1], ang[2]);
      return FALSE;
    }
  /* a along x, b in the xy plane, c completing a right-handed set
   * (common practice). */
  memset (cell, 0, 9 * sizeof (double));
  cell[0][0] = len[0];
  cell[1][0] = len[1] * cg;
  cell[1][1] = len[1] * sg;
  cell[2][0] = len[2] * cb;
  cell[2][1] = len[2] * cy;
  cell[2][2] = len[2] * sqrt (cz2);
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* Symmetry operators                                                   */

gboolean
qv_cif_is_cif_path (const char *path)
{
  gsize n = path ? strlen (path) : 0;
  return n >= 4 && g_ascii_strcasecmp (path + n - 4, ".cif") == 0;
}

static void
op_error (GError **error, gsize *offset, const char *text, const char *p, const char *format, ...)
  G_GNUC_PRINTF (5, 6);

static void
op_error (GError **error, gsize *offset, const char *text, const char *p, const char *format, ...)
{
  va_list args;
  g_autofree char *message = NULL;

  va_start (args, format);
  message = g_strdup_vprintf (format, args);
  va_end (args);
  if (offset)
    *offset = (gsize) (p - text);
  g_set_error_literal (error, QV_ERROR, QV_ERROR_INPUT, message);
}

/* digits[.digits] */
static gboolean
op_number (const char **pp, double *out)
{
  const char *p = *pp;
  char *end = NULL;
  g_autofree char *copy = NULL;

  while (g_ascii_isdigit (*p))
    p++;
  if (*p == '.')
    {
      p++;
      while (g_ascii_isdigit (*p))
        p++;
    }
  if (p == *pp || (p == *pp + 1 && **pp == '.'))
    return FALSE;
  copy = g_strndup (*pp, (gsize) (p - *pp));
  *out = g_ascii_strtod (copy, &end);
  *pp = p;
  return TRUE;
}

static int
axis_of (char c)
{
  switch (g_ascii_tolower (c))
    {
    case 'x': return 0;
    case 'y': return 1;
    case 'z': return 2;
    default: return -1;
    }
}

gboolean
qv_cif_parse_operator (const char *text, QvCifOperator *op, gsize *error_offset, GError **error)
{
  const char *p = text;
  double coef[3][3] = { { 0 } };
  int det;

  memset (op, 0, sizeof *op);
  for (int row = 0; row < 3; row++)
    {
      gboolean any = FALSE;

      for (;;)
        {
          double sign = 1.0, value = 1.0;
          gboolean have_sign = FALSE, have_number = FALSE;
          int axis;
          const char *term;

          while (*p == ' ' || *p == '\t' || *p == '\n' || *p == '\r')
            p++;
          if (*p == ',' || *p == '\0')
            break;
          term = p;
          if (*p == '+' || *p == '-')
            {
              sign = *p == '-' ? -1.0 : 1.0;
              have_sign = TRUE;
              p++;
              while (*p == ' ' || *p == '\t' || *p == '\n' || *p == '\r')
                p++;
            }
          if (any && !have_sign)
            {
              op_error (error, error_offset, text, term,
                        "'%c' where '+', '-' or ',' was expected: write components like x, "
                        "-y+1/2, x-y", *term);
              return FALSE;
            }
          if (g_ascii_isdigit (*p) || *p == '.')
            {
              if (!op_number (&p, &value))
                {
                  op_error (error, error_offset, text, p,
                            "'%c' is not a number: write components like x, -y+1/2, x-y", *p);
                  return FALSE;
                }
              have_number = TRUE;
              if (*p == '/')
                {
                  double denominator;
                  const char *d = ++p;
                  if (!op_number (&p, &denominator) || denominator == 0.0)
                    {
                      op_error (error, error_offset, text, d,
                                "a fraction needs a non-zero denominator: write 1/2, 2/3 …");
                      return FALSE;
                    }
                  value /= denominator;
                }
              if (*p == '*')
                p++;
            }
          axis = axis_of (*p);
          if (axis >= 0)
            {
              double c = sign * value;
              if (fabs (c - round (c)) > 1e-9)
                {
                  op_error (error, error_offset, text, term,
                            "the coefficient of %c is %g: a symmetry operator maps the lattice "
                            "to itself, so it must be a whole number", *p, c);
                  return FALSE;
                }
              coef[row][axis] += round (c);
              p++;
            }
          else if (have_number)
            op->translation[row] += sign * value;
          else
            {
              if (*p == '\0')
                op_error (error, error_offset, text, p,
                          "the operator ends after a sign: write e.g. -x+1/2");
              else
                op_error (error, error_offset, text, p,
                          "unknown token '%c' in a symmetry operator: use x, y, z, numbers, "
                          "fractions, '+' and '-' (e.g. -x+1/2,y,-z)", *p);
              return FALSE;
            }
          any = TRUE;
        }
      if (!any)
        {
          op_error (error, error_offset, text, p,
                    "component %d of the operator is empty: write three, e.g. x,y,z", row + 1);
          return FALSE;
        }
      if (row < 2)
        {
          if (*p != ',')
            {
              op_error (error, error_offset, text, p,
                        "the operator has %d component%s: it needs three separated by commas "
                        "(e.g. -x,y+1/2,-z)", row + 1, row == 0 ? "" : "s");
              return FALSE;
            }
          p++;
        }
      else if (*p == ',')
        {
          op_error (error, error_offset, text, p,
                    "more than three components: an operator is x', y', z' (e.g. -x,y+1/2,-z)");
          return FALSE;
        }
    }
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      {
        if (fabs (coef[i][j]) > 1000.0)
          {
            op_error (error, error_offset, text, text, "coefficients this large are no symmetry "
                      "operation");
            return FALSE;
          }
        op->rotation[i][j] = (int) coef[i][j];
      }
  det = op->rotation[0][0] * (op->rotation[1][1] * op->rotation[2][2] - op->rotation[1][2] * op->rotation[2][1])
        - op->rotation[0][1] * (op->rotation[1][0] * op->rotation[2][2] - op->rotation[1][2] * op->rotation[2][0])
        + op->rotation[0][2] * (op->rotation[1][0] * op->rotation[2][1] - op->rotation[1][1] * op->rotation[2][0]);
  if (det != 1 && det != -1)
    {
      op_error (error, error_offset, text, text,
                "the rotation part has determinant %d, not +1 or -1: this is no symmetry "
                "operation (a component repeated or missing?)", det);
      return FALSE;
    }
  return TRUE;
}

static gboolean
read_operators (const char *file, const Block *b, GArray *ops, GError **error)
{
  static const char *const spellings[] = { "_space_group_symop_operation_xyz",
                                           "_symmetry_equiv_pos_as_xyz" };
  const TagRef *ref = NULL;
  gboolean have_identity = FALSE;
  static const QvCifOperator identity = { { { 1, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 } }, { 0, 0, 0 } };

  for (guint i = 0; i < G_N_ELEMENTS (spellings) && ref == NULL; i++)
    ref = find_tag (b, spellings[i]);
  if (ref != NULL)
    for (gsize r = 0; r < loop_rows (ref->loop); r++)
      {
        const Token *v = loop_value (ref->loop, r, ref->column);
        QvCifOperator op;
        gsize offset = 0;
        g_autoptr(GError) local = NULL;

        if (!qv_cif_parse_operator (v->text, &op, &offset, &local))
          {
            /* Point at the byte, when the value sits on one line. */
            gsize col = v->column;
            if (strchr (v->text, '\n') == NULL)
              col += offset + (v->quoted ? 1 : 0);
            qv_io_error (error, file, v->line, col, "symmetry operator '%s': %s", v->text,
                         local->message);
            return FALSE;
          }
        if (memcmp (op.rotation, identity.rotation, sizeof op.rotation) == 0
            && fabs (op.translation[0] - round (op.translation[0])) < 1e-9
            && fabs (op.translation[1] - round (op.translation[1])) < 1e-9
            && fabs (op.translation[2] - round (op.translation[2])) < 1e-9)
          have_identity = TRUE;
        g_array_append_val (ops, op);
      }
  /* Every group holds the identity; a list without it (or no list: P1)
   * still places the sites as given. */
  if (!have_identity)
    g_array_prepend_val (ops, identity);
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* Sites                                                                */

typedef struct {
  char *label;            /* owned */
  guint z;
  guint mass_number;      /* 2 for D, else 0 */
  double frac[3];
  const Token *where;     /* the row's first value, for messages */
} Site;

static void
site_clear (gpointer p)
{
  Site *s = p;
  g_free (s->label);
}

/* The element at the start of @text: two letters when they make a symbol
 * (the second one lower-case unless @any_case), else one. "Na1+" → Na,
 * "O2-" → O, "C1a" → C, "D" → hydrogen 2. */
static gboolean
element_of (const char *text, gboolean any_case, guint *z, guint *mass_number)
{
  char sym[3] = { 0 };
  const QvElement *e = NULL;

  *mass_number = 0;
  if (!g_ascii_isalpha (text[0]))
    return FALSE;
  if (g_ascii_isalpha (text[1]) && (any_case || g_ascii_islower (text[1])))
    {
      sym[0] = text[0];
      sym[1] = text[1];
      e = qv_element_from_symbol (sym);
    }
  if (e == NULL)
    {
      sym[0] = text[0];
      sym[1] = '\0';
      if (g_ascii_toupper (sym[0]) == 'D')
        {
          *z = 1;
          *mass_number = 2;
          return TRUE;
        }
      e = qv_element_from_symbol (sym);
    }
  if (e == NULL)
    return FALSE;
  *z = e->z;
  return TRUE;
}

static gboolean
read_sites (const char *file, const Block *b, GArray *sites, GError **error)
{
  static const char *const frac_tags[3] = { "_atom_site_fract_x", "_atom_site_fract_y",
                                            "_atom_site_fract_z" };
  const TagRef *fx[3], *label, *type, *occ;
  const Loop *loop;
  gsize rows;

  for (int i = 0; i < 3; i++)
    {
      fx[i] = find_tag (b, frac_tags[i]);
      if (fx[i] == NULL)
        {
          qv_io_error (error, file, b->line, b->column,
                       "data block '%s' has no %s: Quaver reads atom sites in fractional "
                       "coordinates (_atom_site_fract_x, _y, _z)%s", b->name, frac_tags[i],
                       find_tag (b, "_atom_site_cartn_x") ? ", not Cartesian ones" : "");
          return FALSE;
        }
    }
  label = find_tag (b, "_atom_site_label");
  type = find_tag (b, "_atom_site_type_symbol");
  occ = find_tag (b, "_atom_site_occupancy");
  if (label == NULL && type == NULL)
    {
      qv_io_error (error, file, fx[0]->line, fx[0]->col,
                   "the atom sites have no _atom_site_label or _atom_site_type_symbol: give "
                   "each site a label such as Na1");
      return FALSE;
    }
  loop = fx[0]->loop;
  rows = loop_rows (loop);
  {
    const TagRef *all[5] = { fx[1], fx[2], label, type, occ };
    for (int i = 0; i < 5; i++)
      if (all[i] != NULL && all[i]->loop != loop && !(all[i]->loop->single && loop->single))
        {
          qv_io_error (error, file, all[i]->line, all[i]->col,
                       "this atom-site tag is not in the loop of _atom_site_fract_x (line %"
                       G_GSIZE_FORMAT "): put all _atom_site_ tags in one loop",
                       fx[0]->line);
          return FALSE;
        }
  }
  if (rows == 0)
    {
      qv_io_error (error, file, fx[0]->line, fx[0]->col, "the atom-site loop has no rows");
      return FALSE;
    }
  for (gsize r = 0; r < rows; r++)
    {
      Site site = { 0 };
      const Token *lv = label ? loop_value (label->loop, r, label->column) : NULL;
      const Token *tv = type ? loop_value (type->loop, r, type->column) : NULL;
      const char *name;

      site.where = loop_value (loop, r, 0);
      site.label = g_strdup (lv && !is_unknown (lv) ? lv->text : tv && !is_unknown (tv) ? tv->text : "?");
      name = site.label;
      for (int i = 0; i < 3; i++)
        {
          const Token *v = loop_value (fx[i]->loop, r, fx[i]->column);
          if (is_unknown (v) || !parse_number (v->text, &site.frac[i]))
            {
              qv_io_error (error, file, v->line, v->column,
                           "site '%s': %s is '%s', not a number: give the fractional "
                           "coordinate, e.g. 0.25 or 0.2500(3)", name, frac_tags[i], v->text);
              g_free (site.label);
              return FALSE;
            }
        }
      if (occ)
        {
          const Token *v = loop_value (occ->loop, r, occ->column);
          double o = 1.0;
          if (!is_unknown (v))
            {
              if (!parse_number (v->text, &o))
                {
                  qv_io_error (error, file, v->line, v->column,
                               "site '%s': _atom_site_occupancy is '%s', not a number", name,
                               v->text);
                  g_free (site.label);
                  return FALSE;
                }
              if (o < CIF_OCCUPANCY_FULL)
                {
                  qv_io_error (error, file, v->line, v->column,
                               "site '%s' has occupancy %s: Quaver needs an ordered structure "
                               "with every site fully occupied; resolve the disorder into one "
                               "ordered model (occupancy 1) first", name, v->text);
                  g_free (site.label);
                  return FALSE;
                }
              if (o > 1.0 + 1e-3)
                {
                  qv_io_error (error, file, v->line, v->column,
                               "site '%s' has occupancy %s, more than 1: check the value",
                               name, v->text);
                  g_free (site.label);
                  return FALSE;
                }
            }
        }
      {
        gboolean found = FALSE;
        const Token *ev = tv && !is_unknown (tv) ? tv : lv;
        if (ev != NULL && !is_unknown (ev))
          found = element_of (ev->text, ev == tv, &site.z, &site.mass_number);
        if (!found)
          {
            const Token *at = ev ? ev : site.where;
            qv_io_error (error, file, at->line, at->column,
                         "site '%s': '%s' does not start with an element symbol: set "
                         "_atom_site_type_symbol to the element (e.g. Fe or Fe3+)", name,
                         ev ? ev->text : "?");
            g_free (site.label);
            return FALSE;
          }
      }
      g_array_append_val (sites, site);
    }
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* Expansion                                                            */

typedef struct {
  double frac[3];
  guint site;
} Placed;

typedef struct {
  double cell[3][3];
  int n[3];                /* bins per axis */
  GHashTable *bins;        /* guint64 key → GArray of guint (index in placed) */
  GArray *placed;          /* Placed */
  double tol;
} Grid;

static guint64
bin_key (const Grid *g, const int idx[3])
{
  return (guint64) idx[0] + (guint64) g->n[0] * ((guint64) idx[1] + (guint64) g->n[1] * (guint64) idx[2]);
}

static void
bin_of (const Grid *g, const double f[3], int idx[3])
{
  for (int i = 0; i < 3; i++)
    idx[i] = CLAMP ((int) floor (f[i] * g->n[i]), 0, g->n[i] - 1);
}

/* The placed atom within the tolerance of @f, or -1. */
static gssize
grid_find (const Grid *g, const double f[3])
{
  int idx[3], lo[3], hi[3];

  bin_of (g, f, idx);
  for (int i = 0; i < 3; i++)
    {
      lo[i] = g->n[i] >= 3 ? -1 : 0;
      hi[i] = g->n[i] >= 3 ? 1 : g->n[i] - 1;
    }
  for (int a = lo[0]; a <= hi[0]; a++)
    for (int b = lo[1]; b <= hi[1]; b++)
      for (int c = lo[2]; c <= hi[2]; c++)
        {
          int k[3];
          GArray *list;
          if (g->n[0] >= 3) k[0] = (idx[0] + a + g->n[0]) % g->n[0]; else k[0] = a;
          if (g->n[1] >= 3) k[1] = (idx[1] + b + g->n[1]) % g->n[1]; else k[1] = b;
          if (g->n[2] >= 3) k[2] = (idx[2] + c + g->n[2]) % g->n[2]; else k[2] = c;
          {
            guint64 key = bin_key (g, k);
            list = g_hash_table_lookup (g->bins, &key);
          }
          if (list == NULL)
            continue;
          for (guint m = 0; m < list->len; m++)
            {
              guint j = g_array_index (list, guint, m);
              const Placed *p = &g_array_index (g->placed, Placed, j);
              double d[3], r[3] = { 0, 0, 0 };
              for (int i = 0; i < 3; i++)
                {
                  d[i] = f[i] - p->frac[i];
                  d[i] -= round (d[i]);
                }
              for (int i = 0; i < 3; i++)
                for (int x = 0; x < 3; x++)
                  r[x] += d[i] * g->cell[i][x];
              if (r[0] * r[0] + r[1] * r[1] + r[2] * r[2] < g->tol * g->tol)
                return (gssize) j;
            }
        }
  return -1;
}

static void
grid_add (Grid *g, const double f[3], guint site)
{
  Placed p = { { f[0], f[1], f[2] }, site };
  int idx[3];
  guint64 key;
  GArray *list;
  guint index = g->placed->len;

  g_array_append_val (g->placed, p);
  bin_of (g, f, idx);
  key = bin_key (g, idx);
  list = g_hash_table_lookup (g->bins, &key);
  if (list == NULL)
    {
      guint64 *k = g_new (guint64, 1);
      *k = key;
      list = g_array_new (FALSE, FALSE, sizeof (guint));
      g_hash_table_insert (g->bins, k, list);
    }
  g_array_append_val (list, index);
}

static void
cross (const double a[3], const double b[3], double out[3])
{
  out[0] = a[1] * b[2] - a[2] * b[1];
  out[1] = a[2] * b[0] - a[0] * b[2];
  out[2] = a[0] * b[1] - a[1] * b[0];
}

static QvStructure *
expand (const char *file, const Block *b, double cell[3][3], GArray *sites, GArray *ops,
        double tol, GError **error)
{
  Grid g = { 0 };
  double volume, width[3], min_width = G_MAXDOUBLE;
  QvStructure *s = NULL;
  gboolean ok = TRUE;

  /* Widths of the cell across each pair of faces: V / |b × c| and so on. */
  {
    double bc[3];
    cross (cell[1], cell[2], bc);
    volume = fabs (cell[0][0] * bc[0] + cell[0][1] * bc[1] + cell[0][2] * bc[2]);
  }
  for (int i = 0; i < 3; i++)
    {
      double n[3];
      cross (cell[(i + 1) % 3], cell[(i + 2) % 3], n);
      width[i] = volume / sqrt (n[0] * n[0] + n[1] * n[1] + n[2] * n[2]);
      min_width = MIN (min_width, width[i]);
    }
  if (!(tol > 0.0) || tol >= min_width / 4.0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "%s: merge tolerance %g Å is not small against the cell (narrowest width "
                   "%.4g Å): use a positive tolerance below %.4g Å", file, tol, min_width,
                   min_width / 4.0);
      return NULL;
    }
  if ((guint64) sites->len * ops->len > CIF_MAX_ATOMS)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                   "%s: %u sites times %u operators is more than the %" G_GSIZE_FORMAT
                   " atoms this reader takes", file, sites->len, ops->len, CIF_MAX_ATOMS);
      return NULL;
    }

  memcpy (g.cell, cell, sizeof g.cell);
  g.tol = tol;
  for (int i = 0; i < 3; i++)
    g.n[i] = (int) CLAMP (floor (width[i] / tol), 1.0, 256.0);
  g.bins = g_hash_table_new_full (g_int64_hash, g_int64_equal, g_free, (GDestroyNotify) g_array_unref);
  g.placed = g_array_new (FALSE, FALSE, sizeof (Placed));

  for (guint si = 0; si < sites->len && ok; si++)
    {
      const Site *site = &g_array_index (sites, Site, si);
      for (guint k = 0; k < ops->len && ok; k++)
        {
          const QvCifOperator *op = &g_array_index (ops, QvCifOperator, k);
          double f[3];
          gssize hit;

          for (int i = 0; i < 3; i++)
            {
              f[i] = op->translation[i];
              for (int j = 0; j < 3; j++)
                f[i] += op->rotation[i][j] * site->frac[j];
              f[i] -= floor (f[i]);
              if (f[i] >= 1.0)
                f[i] = 0.0;
            }
          hit = grid_find (&g, f);
          if (hit < 0)
            grid_add (&g, f, si);
          else
            {
              const Placed *p = &g_array_index (g.placed, Placed, hit);
              if (p->site != si)
                {
                  const Site *other = &g_array_index (sites, Site, p->site);
                  qv_io_error (error, file, site->where->line, site->where->column,
                               "sites '%s' and '%s' fall on one place (within %g Å, at %.4f "
                               "%.4f %.4f) once the symmetry operators are applied: a site "
                               "listed twice or a disordered model; Quaver needs an ordered "
                               "structure", other->label, site->label, tol, f[0], f[1], f[2]);
                  ok = FALSE;
                }
            }
        }
    }

  if (ok)
    {
      s = qv_structure_new (g.placed->len, error);
      if (s == NULL)
        ok = FALSE;
    }
  for (guint a = 0; ok && a < g.placed->len; a++)
    {
      const Placed *p = &g_array_index (g.placed, Placed, a);
      const Site *site = &g_array_index (sites, Site, p->site);

      if (!qv_structure_set_element (s, a, site->z, error)
          || (site->mass_number && !qv_structure_set_isotope (s, a, site->mass_number, error)))
        {
          ok = FALSE;
          break;
        }
      qv_structure_set_label (s, a, site->label);
      for (int x = 0; x < 3; x++)
        {
          s->atoms[a].position[x] = 0.0;
          for (int i = 0; i < 3; i++)
            s->atoms[a].position[x] += p->frac[i] * cell[i][x];
        }
    }
  if (ok)
    {
      s->has_cell = TRUE;
      memcpy (s->cell, cell, sizeof s->cell);
      s->pbc[0] = s->pbc[1] = s->pbc[2] = TRUE;
      s->comment = g_strdup_printf ("data_%s", b->name);
    }
  else
    g_clear_pointer (&s, qv_structure_free);
  g_hash_table_unref (g.bins);
  g_array_unref (g.placed);
  return s;
}

/* ------------------------------------------------------------------ */

static char *
block_names (GPtrArray *blocks)
{
  GString *out = g_string_new (NULL);
  for (guint i = 0; i < blocks->len; i++)
    {
      const Block *b = g_ptr_array_index (blocks, i);
      g_string_append_printf (out, "%s%s", i ? ", " : "", b->name);
    }
  return g_string_free (out, FALSE);
}

QvStructure *
qv_cif_read_data (const char *data, gsize length, const char *name,
                  const QvCifOptions *options, GError **error)
{
  g_autoptr(GPtrArray) blocks = NULL;
  g_autoptr(GArray) sites = NULL;
  g_autoptr(GArray) ops = NULL;
  const Block *b = NULL;
  double cell[3][3];
  double tol = options && options->merge_tolerance > 0.0 ? options->merge_tolerance
                                                          : QV_CIF_DEFAULT_MERGE_TOLERANCE;

  g_return_val_if_fail (data != NULL || length == 0, NULL);
  if (name == NULL)
    name = "<cif>";
  blocks = parse (data ? data : "", length, name, error);
  if (blocks == NULL)
    return NULL;

  if (options && options->block)
    {
      for (guint i = 0; i < blocks->len && b == NULL; i++)
        {
          const Block *c = g_ptr_array_index (blocks, i);
          if (g_ascii_strcasecmp (c->name, options->block) == 0)
            b = c;
        }
      if (b == NULL)
        {
          g_autofree char *names = block_names (blocks);
          qv_io_error (error, name, 0, 0, "no data block '%s'; the file has: %s",
                       options->block, names);
          return NULL;
        }
    }
  else
    {
      for (guint i = 0; i < blocks->len && b == NULL; i++)
        {
          const Block *c = g_ptr_array_index (blocks, i);
          if (find_tag (c, "_atom_site_fract_x") != NULL)
            b = c;
        }
      /* Else a block with sites of another kind, for a precise message. */
      for (guint i = 0; i < blocks->len && b == NULL; i++)
        {
          const Block *c = g_ptr_array_index (blocks, i);
          if (find_tag (c, "_atom_site_label") || find_tag (c, "_atom_site_type_symbol")
              || find_tag (c, "_atom_site_cartn_x"))
            b = c;
        }
      if (b == NULL)
        {
          g_autofree char *names = block_names (blocks);
          qv_io_error (error, name, 0, 0,
                       "no data block has atom sites (_atom_site_fract_x, _y, _z); the file "
                       "has: %s", names);
          return NULL;
        }
    }

  if (!read_cell (name, b, cell, error))
    return NULL;
  sites = g_array_new (FALSE, FALSE, sizeof (Site));
  g_array_set_clear_func (sites, site_clear);
  if (!read_sites (name, b, sites, error))
    return NULL;
  ops = g_array_new (FALSE, FALSE, sizeof (QvCifOperator));
  if (!read_operators (name, b, ops, error))
    return NULL;
  return expand (name, b, cell, sites, ops, tol, error);
}

QvStructure *
qv_cif_read_file (const char *path, const QvCifOptions *options, GError **error)
{
  g_autofree char *contents = NULL;
  gsize length = 0;

  if (!qv_io_read_file (path, CIF_MAX_BYTES, &contents, &length, error))
    return NULL;
  return qv_cif_read_data (contents, length, path, options, error);
}
