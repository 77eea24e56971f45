/* qv-xyz.c — XYZ and extended XYZ, multi-frame.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Each frame: a line with the atom count, a comment line, then one line per
 * atom. The comment line of extended XYZ holds key=value pairs (values in
 * double quotes may hold spaces; a key without '=' is a flag and is
 * ignored); Lattice, pbc, energy and Properties are read, case-insensitively
 * (common practice), the other keys are ignored. A comment with no
 * key=value pair is kept as the structure's comment.
 *
 * Lines end in LF or CRLF; lines and columns count from 1, columns in bytes.
 * Numbers are parsed with g_ascii_strtod (locale-independent) after a check
 * that they are plain decimal numbers (no NaN, infinity or hexadecimal). */
#include "qv-fixed-format.h"
#include "qv-xyz.h"

#include <math.h>
#include <string.h>

#include "qv-element.h"
#include "qv-io-error.h"
#include "qv-output.h"

/* A sane upper bound, checked before anything is allocated. */
#define XYZ_MAX_ATOMS ((gsize) 10000000)
#define XYZ_MAX_BYTES ((gsize) MIN ((guint64) G_MAXSIZE, (guint64) 64 << 30))

/* ------------------------------------------------------------------ */
/* Lines and fields                                                     */

typedef struct {
  const char *pos, *end;   /* the rest of the text */
  gsize number;            /* of the line last returned */
} Lines;

typedef struct {
  const char *text;        /* without the line end */
  gsize len;
  gsize number;
} Line;

static gboolean
next_line (Lines *lines, Line *line)
{
  const char *nl;

  if (lines->pos >= lines->end)
    return FALSE;
  nl = memchr (lines->pos, '\n', (gsize) (lines->end - lines->pos));
  line->text = lines->pos;
  line->len = (gsize) ((nl != NULL ? nl : lines->end) - lines->pos);
  if (line->len > 0 && line->text[line->len - 1] == '\r')
    line->len--;
  lines->pos = nl != NULL ? nl + 1 : lines->end;
  line->number = ++lines->number;
  return TRUE;
}

static gboolean
is_blank (const char *p, gsize len)
{
  for (gsize i = 0; i < len; i++)
    if (!g_ascii_isspace (p[i]))
      return FALSE;
  return TRUE;
}

/* The number of the last line, when the rest of the text is blank (or
 * empty); 0 when something other than white space follows. */
static gsize
rest_is_blank (const Lines *lines)
{
  Lines copy = *lines;
  Line line;
  gsize last = lines->number;

  while (next_line (&copy, &line))
    {
      if (!is_blank (line.text, line.len))
        return 0;
      last = line.number;
    }
  return last;
}

/* The lines left up to the last one that is not blank; @last is the
 * number of the file's last line. */
static gsize
count_lines_left (const Lines *lines, gsize *last)
{
  Lines copy = *lines;
  Line line;
  gsize count = 0, content = 0;

  *last = lines->number;
  while (next_line (&copy, &line))
    {
      count++;
      if (!is_blank (line.text, line.len))
        content = count;
      *last = line.number;
    }
  return content;
}

typedef struct {
  const char *text;
  gsize len;
  gsize col;               /* 1-based */
} Field;

/* Splits at spaces and tabs; @fields is reused between lines. */
static void
split_fields (const Line *line, GArray *fields)
{
  gsize i = 0;

  g_array_set_size (fields, 0);
  while (i < line->len)
    {
      Field f;

      while (i < line->len && (line->text[i] == ' ' || line->text[i] == '\t'
                               || line->text[i] == '\v' || line->text[i] == '\f'))
        i++;
      if (i >= line->len)
        break;
      f.text = line->text + i;
      f.col = i + 1;
      while (i < line->len && line->text[i] != ' ' && line->text[i] != '\t'
             && line->text[i] != '\v' && line->text[i] != '\f')
        i++;
      f.len = (gsize) (line->text + i - f.text);
      g_array_append_val (fields, f);
    }
}

/* A printable, quoted, shortened copy for messages. */
static char *
describe (const char *p, gsize len)
{
  GString *out = g_string_new ("'");

  for (gsize i = 0; i < len && i < 40; i++)
    {
      guchar c = (guchar) p[i];

      if (c >= 0x20 && c < 0x7f && c != '\'' && c != '\\')
        g_string_append_c (out, (char) c);
      else
        g_string_append_printf (out, "\\x%02x", c);
    }
  g_string_append_c (out, '\'');
  if (len > 40)
    g_string_append (out, "…");
  return g_string_free (out, FALSE);
}

typedef enum { NUMBER_OK, NUMBER_BAD, NUMBER_NONFINITE } NumberStatus;

/* A plain decimal number [+-](digits[.digits]|.digits)([eE][+-]digits),
 * the whole of [p, p + len). */
static NumberStatus
parse_number (const char *p, gsize len, double *value)
{
  gsize i = 0, digits = 0;
  char stack[64];
  char *buffer;

  if (i < len && (p[i] == '+' || p[i] == '-'))
    i++;
  for (; i < len && g_ascii_isdigit (p[i]); i++)
    digits++;
  if (i < len && p[i] == '.')
    for (i++; i < len && g_ascii_isdigit (p[i]); i++)
      digits++;
  if (digits == 0)
    return NUMBER_BAD;
  if (i < len && (p[i] == 'e' || p[i] == 'E'))
    {
      gsize exponent_digits = 0;

      i++;
      if (i < len && (p[i] == '+' || p[i] == '-'))
        i++;
      for (; i < len && g_ascii_isdigit (p[i]); i++)
        exponent_digits++;
      if (exponent_digits == 0)
        return NUMBER_BAD;
    }
  if (i != len)
    return NUMBER_BAD;

  buffer = len < sizeof stack ? stack : g_malloc (len + 1);
  memcpy (buffer, p, len);
  buffer[len] = '\0';
  *value = g_ascii_strtod (buffer, NULL);
  if (buffer != stack)
    g_free (buffer);
  return isfinite (*value) ? NUMBER_OK : NUMBER_NONFINITE;
}

static gboolean
looks_nonfinite (const char *p, gsize len)
{
  if (len > 0 && (*p == '+' || *p == '-'))
    p++, len--;
  return len >= 3 && (g_ascii_strncasecmp (p, "nan", 3) == 0
                      || g_ascii_strncasecmp (p, "inf", 3) == 0);
}

/* Parses @len bytes as a number, or sets an error at @line:@col naming
 * @what ("the x coordinate"). */
static gboolean
number_or_error (const char *p, gsize len, const char *what, const char *name,
                 gsize line, gsize col, double *value, GError **error)
{
  NumberStatus status = parse_number (p, len, value);
  g_autofree char *shown = NULL;

  if (status == NUMBER_OK)
    return TRUE;
  shown = describe (p, len);
  if (status == NUMBER_NONFINITE)
    qv_io_error (error, name, line, col, "%s %s is out of the range of a double", what, shown);
  else if (looks_nonfinite (p, len))
    qv_io_error (error, name, line, col, "%s is %s; NaN and infinity are not accepted",
                 what, shown);
  else
    qv_io_error (error, name, line, col, "%s must be a number, found %s", what, shown);
  return FALSE;
}

/* ------------------------------------------------------------------ */
/* Extended XYZ comment line                                            */

typedef struct {
  char *key;
  char *value;               /* unescaped; NULL for a flag */
  const char *raw;           /* the value's text in the line (inside quotes) */
  gsize raw_len;
  gsize col;                 /* of the value's first character in the line */
} Pair;

static void
pair_clear (gpointer data)
{
  Pair *pair = data;

  g_free (pair->key);
  g_free (pair->value);
}

/* Splits the comment line into pairs. Returns FALSE with an error for an
 * unterminated quote in a value; a malformed line without any key=value
 * pair is not an error (it is then a plain comment). */
static gboolean
split_pairs (const Line *line, const char *name, GArray *pairs, GError **error)
{
  const char *p = line->text, *end = line->text + line->len;
  gboolean any_value = FALSE;

  while (p < end)
    {
      Pair pair = { 0 };
      const char *key_start;

      while (p < end && g_ascii_isspace (*p))
        p++;
      if (p >= end)
        break;
      key_start = p;
      if (*p == '"')
        {
          const char *close = memchr (p + 1, '"', (gsize) (end - p - 1));

          if (close == NULL)
            {
              if (!any_value)
                {
                  g_array_set_size (pairs, 0);
                  return TRUE;    /* a plain comment with a quote in it */
                }
              qv_io_error (error, name, line->number, (gsize) (p - line->text) + 1,
                           "unterminated quote in the extended XYZ comment line");
              return FALSE;
            }
          pair.key = g_strndup (p + 1, (gsize) (close - p - 1));
          p = close + 1;
        }
      else
        {
          while (p < end && !g_ascii_isspace (*p) && *p != '=')
            p++;
          pair.key = g_strndup (key_start, (gsize) (p - key_start));
        }
      {
        const char *q = p;

        while (q < end && (*q == ' ' || *q == '\t'))
          q++;
        if (q < end && *q == '=')
          {
            p = q + 1;
            while (p < end && (*p == ' ' || *p == '\t'))
              p++;
          }
        else
          {
            /* a flag */
            g_array_append_val (pairs, pair);
            continue;
          }
      }

      /* the value */
      pair.col = (gsize) (p - line->text) + 1;
      if (p < end && *p == '"')
        {
          GString *value = g_string_new (NULL);
          const char *open = p++;

          pair.raw = p;
          while (p < end && *p != '"')
            {
              if (*p == '\\' && p + 1 < end)
                p++;
              g_string_append_c (value, *p++);
            }
          if (p >= end)
            {
              g_string_free (value, TRUE);
              g_free (pair.key);
              qv_io_error (error, name, line->number, (gsize) (open - line->text) + 1,
                           "unterminated quote in the extended XYZ comment line");
              return FALSE;
            }
          pair.raw_len = (gsize) (p - pair.raw);
          pair.col++;
          p++;
          pair.value = g_string_free (value, FALSE);
        }
      else if (p < end && (*p == '{' || *p == '['))
        {
          /* an array value of some other key: up to the matching bracket */
          int depth = 0;

          pair.raw = p;
          for (; p < end; p++)
            {
              if (*p == '{' || *p == '[')
                depth++;
              else if ((*p == '}' || *p == ']') && --depth == 0)
                {
                  p++;
                  break;
                }
            }
          pair.raw_len = (gsize) (p - pair.raw);
          pair.value = g_strndup (pair.raw, pair.raw_len);
        }
      else
        {
          pair.raw = p;
          while (p < end && !g_ascii_isspace (*p))
            p++;
          pair.raw_len = (gsize) (p - pair.raw);
          pair.value = g_strndup (pair.raw, pair.raw_len);
        }
      any_value = TRUE;
      g_array_append_val (pairs, pair);
    }
  if (!any_value)
    g_array_set_size (pairs, 0);
  return TRUE;
}

/* Splits @pair's raw text at white space into at most @max fields. */
static gsize
split_value (const Pair *pair, Field *fields, gsize max)
{
  gsize n = 0, i = 0;

  while (i < pair->raw_len)
    {
      while (i < pair->raw_len && g_ascii_isspace (pair->raw[i]))
        i++;
      if (i >= pair->raw_len)
        break;
      if (n < max)
        {
          fields[n].text = pair->raw + i;
          fields[n].col = pair->col + i;
        }
      while (i < pair->raw_len && !g_ascii_isspace (pair->raw[i]))
        i++;
      if (n < max)
        fields[n].len = (gsize) (pair->raw + i - fields[n].text);
      n++;
    }
  return n;
}

typedef enum { COLUMN_SPECIES, COLUMN_POS, COLUMN_FORCES, COLUMN_MASSES, N_COLUMNS } ColumnKind;

typedef struct {
  gboolean declared;                 /* Properties= was given */
  gsize total;                       /* columns per atom line when declared */
  gssize first[N_COLUMNS];           /* first column of each, -1 when absent */
  char *text;                        /* the declaration, for messages */
} Columns;

typedef struct {
  gboolean has_cell;
  double cell[3][3];
  gboolean has_pbc;
  gboolean pbc[3];
  gsize pbc_col;
  gboolean has_energy;
  double energy;
  Columns columns;
  gboolean extended;
} Header;

static gboolean
parse_lattice (const Pair *pair, const char *name, gsize line, Header *h, GError **error)
{
  Field f[9];
  gsize n = split_value (pair, f, G_N_ELEMENTS (f));
  double *m = &h->cell[0][0];
  double det, scale;

  if (n != 9)
    {
      qv_io_error (error, name, line, pair->col, "Lattice needs 9 numbers (the vectors a, b "
                   "and c in Å), found %" G_GSIZE_FORMAT, n);
      return FALSE;
    }
  for (gsize i = 0; i < 9; i++)
    if (!number_or_error (f[i].text, f[i].len, "a Lattice component", name, line, f[i].col,
                          &m[i], error))
      return FALSE;
  det = h->cell[0][0] * (h->cell[1][1] * h->cell[2][2] - h->cell[1][2] * h->cell[2][1])
        - h->cell[0][1] * (h->cell[1][0] * h->cell[2][2] - h->cell[1][2] * h->cell[2][0])
        + h->cell[0][2] * (h->cell[1][0] * h->cell[2][1] - h->cell[1][1] * h->cell[2][0]);
  scale = 1.0;
  for (int i = 0; i < 3; i++)
    scale *= sqrt (h->cell[i][0] * h->cell[i][0] + h->cell[i][1] * h->cell[i][1]
                   + h->cell[i][2] * h->cell[i][2]);
  /* the volume against the product of the lengths: 0 for dependent vectors */
  if (!(scale > 0.0) || !isfinite (det) || fabs (det) <= 1e-10 * scale)
    {
      qv_io_error (error, name, line, pair->col, "the Lattice vectors are linearly dependent "
                   "(the cell has no volume)");
      return FALSE;
    }
  h->has_cell = TRUE;
  return TRUE;
}

static gboolean
parse_pbc (const Pair *pair, const char *name, gsize line, Header *h, GError **error)
{
  Field f[3];
  gsize n = split_value (pair, f, G_N_ELEMENTS (f));

  if (n != 3)
    {
      qv_io_error (error, name, line, pair->col, "pbc needs 3 values (T or F), found %"
                   G_GSIZE_FORMAT, n);
      return FALSE;
    }
  for (int i = 0; i < 3; i++)
    {
      g_autofree char *v = g_strndup (f[i].text, f[i].len);

      if (g_ascii_strcasecmp (v, "T") == 0 || g_ascii_strcasecmp (v, "True") == 0)
        h->pbc[i] = TRUE;
      else if (g_ascii_strcasecmp (v, "F") == 0 || g_ascii_strcasecmp (v, "False") == 0)
        h->pbc[i] = FALSE;
      else
        {
          g_autofree char *shown = describe (f[i].text, f[i].len);

          qv_io_error (error, name, line, f[i].col, "pbc values are T or F, found %s", shown);
          return FALSE;
        }
    }
  h->has_pbc = TRUE;
  h->pbc_col = pair->col;
  return TRUE;
}

static gboolean
parse_properties (const Pair *pair, const char *name, gsize line, Columns *c,
                  GError **error)
{
  static const struct {
    const char *name;
    char type;
    gsize count;
  } known[N_COLUMNS] = {
    [COLUMN_SPECIES] = { "species", 'S', 1 },
    [COLUMN_POS] = { "pos", 'R', 3 },
    [COLUMN_FORCES] = { "forces", 'R', 3 },
    [COLUMN_MASSES] = { "masses", 'R', 1 },
  };
  const char *p = pair->raw, *end = pair->raw + pair->raw_len;
  gsize column = 0;

  for (int k = 0; k < N_COLUMNS; k++)
    c->first[k] = -1;
  while (p < end)
    {
      const char *part[3];
      gsize len[3];
      gsize col = pair->col + (gsize) (p - pair->raw);
      guint64 count;
      char type;
      char *count_end;
      g_autofree char *count_text = NULL;
      g_autofree char *prop = NULL;

      for (int k = 0; k < 3; k++)
        {
          const char *colon;

          if (p >= end)
            {
              qv_io_error (error, name, line, col, "Properties is a list of name:type:count "
                           "triples; the last one is incomplete");
              return FALSE;
            }
          colon = memchr (p, ':', (gsize) (end - p));
          part[k] = p;
          len[k] = (gsize) ((colon != NULL ? colon : end) - p);
          p = colon != NULL ? colon + 1 : end;
        }
      prop = g_strndup (part[0], len[0]);
      if (len[0] == 0)
        {
          qv_io_error (error, name, line, col, "a property in Properties has an empty name");
          return FALSE;
        }
      if (len[1] != 1 || strchr ("SRILsril", part[1][0]) == NULL)
        {
          g_autofree char *shown = describe (part[1], len[1]);

          qv_io_error (error, name, line, pair->col + (gsize) (part[1] - pair->raw),
                       "property '%s' has type %s, expected S, R, I or L", prop, shown);
          return FALSE;
        }
      type = g_ascii_toupper (part[1][0]);
      count_text = g_strndup (part[2], len[2]);
      count = g_ascii_strtoull (count_text, &count_end, 10);
      if (len[2] == 0 || *count_end != '\0' || !g_ascii_isdigit (count_text[0])
          || count == 0 || count > 1000000)
        {
          g_autofree char *shown = describe (part[2], len[2]);

          qv_io_error (error, name, line, pair->col + (gsize) (part[2] - pair->raw),
                       "property '%s' has %s columns, expected a positive whole number",
                       prop, shown);
          return FALSE;
        }

      for (int k = 0; k < N_COLUMNS; k++)
        if (g_ascii_strcasecmp (prop, known[k].name) == 0)
          {
            if (c->first[k] >= 0)
              {
                qv_io_error (error, name, line, col, "property '%s' is declared twice", prop);
                return FALSE;
              }
            if (type != known[k].type || count != known[k].count)
              {
                qv_io_error (error, name, line, col, "property '%s' must be %s:%c:%"
                             G_GSIZE_FORMAT ", found %s:%c:%" G_GUINT64_FORMAT,
                             prop, known[k].name, known[k].type, known[k].count,
                             prop, type, count);
                return FALSE;
              }
            c->first[k] = (gssize) column;
          }
      column += (gsize) count;
      if (column > 1000000)
        {
          qv_io_error (error, name, line, col, "Properties declares more than 1000000 columns");
          return FALSE;
        }
    }
  if (c->first[COLUMN_SPECIES] < 0 || c->first[COLUMN_POS] < 0)
    {
      qv_io_error (error, name, line, pair->col, "Properties must declare species:S:1 and "
                   "pos:R:3");
      return FALSE;
    }
  c->declared = TRUE;
  c->total = column;
  g_free (c->text);
  c->text = g_strndup (pair->raw, pair->raw_len);
  return TRUE;
}

static void
header_clear (Header *h)
{
  g_clear_pointer (&h->columns.text, g_free);
}

static gboolean
parse_header (const Line *line, const char *name, Header *h, GError **error)
{
  g_autoptr(GArray) pairs = g_array_new (FALSE, TRUE, sizeof (Pair));
  gboolean seen[4] = { FALSE, FALSE, FALSE, FALSE };
  static const char *const keys[4] = { "Lattice", "pbc", "energy", "Properties" };

  g_array_set_clear_func (pairs, pair_clear);
  memset (h, 0, sizeof *h);
  h->columns.first[COLUMN_SPECIES] = 0;
  h->columns.first[COLUMN_POS] = 1;
  h->columns.first[COLUMN_FORCES] = -1;
  h->columns.first[COLUMN_MASSES] = -1;

  if (!split_pairs (line, name, pairs, error))
    return FALSE;
  h->extended = pairs->len > 0;

  for (guint i = 0; i < pairs->len; i++)
    {
      const Pair *pair = &g_array_index (pairs, Pair, i);
      int which = -1;

      if (pair->value == NULL)
        continue;   /* a flag */
      for (int k = 0; k < 4; k++)
        if (g_ascii_strcasecmp (pair->key, keys[k]) == 0)
          which = k;
      if (which < 0)
        continue;   /* someone else's key */
      if (seen[which])
        {
          qv_io_error (error, name, line->number, pair->col, "%s is given twice", keys[which]);
          return FALSE;
        }
      seen[which] = TRUE;
      switch (which)
        {
        case 0:
          if (!parse_lattice (pair, name, line->number, h, error))
            return FALSE;
          break;
        case 1:
          if (!parse_pbc (pair, name, line->number, h, error))
            return FALSE;
          break;
        case 2:
          {
            Field f[2];
            gsize n = split_value (pair, f, G_N_ELEMENTS (f));

            if (n != 1)
              {
                qv_io_error (error, name, line->number, pair->col,
                             "energy must be one number (eV), found %" G_GSIZE_FORMAT " values",
                             n);
                return FALSE;
              }
            if (!number_or_error (f[0].text, f[0].len, "energy", name, line->number,
                                  f[0].col, &h->energy, error))
              return FALSE;
            h->has_energy = TRUE;
          }
          break;
        case 3:
          if (!parse_properties (pair, name, line->number, &h->columns, error))
            return FALSE;
          break;
        default:
          g_assert_not_reached ();
        }
    }

  if (h->has_cell && !h->has_pbc)
    h->pbc[0] = h->pbc[1] = h->pbc[2] = TRUE;   /* the extended XYZ default */
  if (!h->has_cell && (h->pbc[0] || h->pbc[1] || h->pbc[2]))
    {
      qv_io_error (error, name, line->number, h->pbc_col,
                   "pbc says the structure is periodic, but there is no Lattice");
      return FALSE;
    }
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* Atoms                                                                */

/* "C", "cl", a whole number (Z), "D"/"T" (hydrogen 2 and 3), or a symbol
 * followed by digits ("C1", "H12": a label). */
static gboolean
parse_species (const Field *f, const char *name, gsize line, QvStructure *s, gsize atom,
               GError **error)
{
  gsize letters = 0, digits;
  guint z = 0, mass_number = 0;
  g_autoptr(GError) local = NULL;

  while (letters < f->len && g_ascii_isalpha (f->text[letters]))
    letters++;
  for (digits = letters; digits < f->len && g_ascii_isdigit (f->text[digits]); digits++)
    ;
  if (digits != f->len || f->len == 0)
    goto unknown;
  if (letters == 0)
    {
      guint64 value = 0;

      for (gsize i = 0; i < f->len && value <= QV_ELEMENT_MAX_Z; i++)
        value = value * 10 + (guint64) (f->text[i] - '0');
      if (value < 1 || value > QV_ELEMENT_MAX_Z)
        {
          g_autofree char *shown = describe (f->text, f->len);

          qv_io_error (error, name, line, f->col, "atomic number %s is outside 1–%d",
                       shown, QV_ELEMENT_MAX_Z);
          return FALSE;
        }
      z = (guint) value;
    }
  else
    {
      char symbol[4];
      const QvElement *element;

      if (letters >= sizeof symbol)
        goto unknown;
      memcpy (symbol, f->text, letters);
      symbol[letters] = '\0';
      if (g_ascii_strcasecmp (symbol, "D") == 0)
        z = 1, mass_number = 2;
      else if (g_ascii_strcasecmp (symbol, "T") == 0)
        z = 1, mass_number = 3;
      else if ((element = qv_element_from_symbol (symbol)) != NULL)
        z = element->z;
      else
        goto unknown;
    }

  if (!qv_structure_set_element (s, atom, z, &local)
      || (mass_number != 0 && !qv_structure_set_isotope (s, atom, mass_number, &local)))
    {
      qv_io_error (error, name, line, f->col, "%s", local->message);
      return FALSE;
    }
  if (letters > 0 && digits > letters)
    {
      g_autofree char *label = g_strndup (f->text, f->len);

      qv_structure_set_label (s, atom, label);
    }
  return TRUE;

unknown:
  {
    g_autofree char *shown = describe (f->text, f->len);

    qv_io_error (error, name, line, f->col, "unknown element %s", shown);
    return FALSE;
  }
}

static const char *const coordinate_words[3] = {
  "the x coordinate", "the y coordinate", "the z coordinate",
};
static const char *const force_words[3] = {
  "the x force component", "the y force component", "the z force component",
};

static gboolean
parse_atom (const Line *line, GArray *fields, const Header *h, const char *name,
            QvStructure *s, gsize atom, GError **error)
{
  const Columns *c = &h->columns;
  const Field *f;

  split_fields (line, fields);
  /* the array's data, not &element 0: a blank line has no fields and the
   * array no storage (offsetting a null pointer is undefined) */
  f = (const Field *) (void *) fields->data;
  if (c->declared && fields->len != c->total)
    {
      gsize col = fields->len > c->total ? f[c->total].col : line->len + 1;

      qv_io_error (error, name, line->number, col,
                   "expected %" G_GSIZE_FORMAT " columns (Properties=%s), found %u",
                   c->total, c->text, fields->len);
      return FALSE;
    }
  if (!c->declared && fields->len < 4)
    {
      qv_io_error (error, name, line->number, line->len + 1,
                   "expected an atom line 'symbol x y z', found %u field%s",
                   fields->len, fields->len == 1 ? "" : "s");
      return FALSE;
    }

  if (!parse_species (&f[c->first[COLUMN_SPECIES]], name, line->number, s, atom, error))
    return FALSE;
  for (int k = 0; k < 3; k++)
    {
      const Field *x = &f[c->first[COLUMN_POS] + k];

      if (!number_or_error (x->text, x->len, coordinate_words[k], name, line->number, x->col,
                            &s->atoms[atom].position[k], error))
        return FALSE;
    }
  if (c->first[COLUMN_FORCES] >= 0)
    for (int k = 0; k < 3; k++)
      {
        const Field *x = &f[c->first[COLUMN_FORCES] + k];

        if (!number_or_error (x->text, x->len, force_words[k], name, line->number, x->col,
                              &s->forces[3 * atom + (gsize) k], error))
          return FALSE;
      }
  if (c->first[COLUMN_MASSES] >= 0)
    {
      const Field *x = &f[c->first[COLUMN_MASSES]];
      double mass;
      g_autoptr(GError) local = NULL;

      if (!number_or_error (x->text, x->len, "the mass", name, line->number, x->col,
                            &mass, error))
        return FALSE;
      if (!qv_structure_set_mass (s, atom, mass, &local))
        {
          qv_io_error (error, name, line->number, x->col, "%s", local->message);
          return FALSE;
        }
    }
  return TRUE;
}

/* ------------------------------------------------------------------ */
/* Frames                                                               */

static gboolean
parse_count (const Line *line, const char *name, gsize *count, GError **error)
{
  const char *p = line->text, *end = line->text + line->len;
  const char *start;
  guint64 value = 0;
  g_autofree char *shown = NULL;

  while (p < end && g_ascii_isspace (*p))
    p++;
  start = p;
  while (p < end && g_ascii_isdigit (*p))
    {
      if (value <= XYZ_MAX_ATOMS)
        value = value * 10 + (guint64) (*p - '0');
      p++;
    }
  while (p < end && g_ascii_isspace (*p))
    p++;
  if (start == end)
    {
      qv_io_error (error, name, line->number, 0,
                   "expected the number of atoms, found a blank line");
      return FALSE;
    }
  shown = describe (start, (gsize) (end - start));
  if (p != end || p == start)
    {
      qv_io_error (error, name, line->number, (gsize) (start - line->text) + 1,
                   "expected the number of atoms (a whole number), found %s", shown);
      return FALSE;
    }
  if (value == 0)
    {
      qv_io_error (error, name, line->number, (gsize) (start - line->text) + 1,
                   "a frame with 0 atoms");
      return FALSE;
    }
  if (value > XYZ_MAX_ATOMS)
    {
      qv_io_error (error, name, line->number, (gsize) (start - line->text) + 1,
                   "%s atoms is more than this reader accepts (%" G_GSIZE_FORMAT ")",
                   shown, XYZ_MAX_ATOMS);
      return FALSE;
    }
  *count = (gsize) value;
  return TRUE;
}

static void
set_truncated (GError **error, const char *name, gsize last_line, gsize found,
               gsize count, gsize count_line)
{
  qv_io_error (error, name, last_line, 0,
               "the file ends after %" G_GSIZE_FORMAT " of the %" G_GSIZE_FORMAT
               " atom lines announced on line %" G_GSIZE_FORMAT, found, count, count_line);
}

static QvStructure *
read_frame (Lines *lines, const Line *count_line, GArray *fields, const char *name,
            GError **error)
{
  g_autoptr(QvStructure) s = NULL;
  Header header;
  Line comment, line;
  gsize count;

  if (!parse_count (count_line, name, &count, error))
    return NULL;
  if (!next_line (lines, &comment))
    {
      qv_io_error (error, name, count_line->number, 0,
                   "the file ends after the atom count, expected a comment line and %"
                   G_GSIZE_FORMAT " atom lines", count);
      return NULL;
    }
  /* Each atom line takes at least "H 0 0 0" and a line end. When the rest
   * of the file is too short for that, count its lines before allocating
   * anything: a count beyond them is refused here. */
  if (count > ((gsize) (lines->end - lines->pos) + 1) / 8)
    {
      gsize last, left = count_lines_left (lines, &last);

      if (left < count)
        {
          set_truncated (error, name, last, left, count, count_line->number);
          return NULL;
        }
    }
  if (!parse_header (&comment, name, &header, error))
    {
      header_clear (&header);
      return NULL;
    }

  s = qv_structure_new (count, error);
  if (s == NULL)
    {
      header_clear (&header);
      return NULL;
    }
  if (header.columns.first[COLUMN_FORCES] >= 0)
    s->forces = g_new0 (double, 3 * count);

  for (gsize i = 0; i < count; i++)
    {
      if (!next_line (lines, &line))
        {
          set_truncated (error, name, lines->number, i, count, count_line->number);
          header_clear (&header);
          return NULL;
        }
      if (is_blank (line.text, line.len))
        {
          gsize last = rest_is_blank (lines);

          if (last != 0)
            set_truncated (error, name, last, i, count, count_line->number);
          else
            qv_io_error (error, name, line.number, 0, "blank line, expected atom %"
                         G_GSIZE_FORMAT " of %" G_GSIZE_FORMAT, i + 1, count);
          header_clear (&header);
          return NULL;
        }
      if (!parse_atom (&line, fields, &header, name, s, i, error))
        {
          header_clear (&header);
          return NULL;
        }
    }

  if (header.has_cell)
    {
      s->has_cell = TRUE;
      memcpy (s->cell, header.cell, sizeof s->cell);
    }
  for (int k = 0; k < 3; k++)
    s->pbc[k] = header.pbc[k];
  s->has_energy = header.has_energy;
  s->energy = header.energy;
  if (!header.extended && !is_blank (comment.text, comment.len))
    s->comment = g_utf8_make_valid (comment.text, (gssize) comment.len);
  header_clear (&header);
  return g_steal_pointer (&s);
}

/* A line that starts with an element symbol and then has three or more
 * fields, where the next frame's atom count was due. */
static gboolean
looks_like_atom_line (const Line *line)
{
  const char *p = line->text, *end = line->text + line->len;
  gsize fields = 0;

  while (p < end && g_ascii_isspace (*p))
    p++;
  if (p == end || !g_ascii_isalpha (*p))
    return FALSE;
  while (p < end)
    {
      while (p < end && g_ascii_isspace (*p))
        p++;
      if (p == end)
        break;
      fields++;
      while (p < end && !g_ascii_isspace (*p))
        p++;
    }
  return fields >= 4;
}

GPtrArray *
qv_xyz_read_data (const char *data, gsize length, const char *name, GError **error)
{
  g_autoptr(GPtrArray) frames = g_ptr_array_new_with_free_func ((GDestroyNotify) qv_structure_free);
  g_autoptr(GArray) fields = g_array_new (FALSE, FALSE, sizeof (Field));
  Lines lines;
  Line line;
  gsize frame_start = 0;    /* the count line of the frame last read */

  g_return_val_if_fail (data != NULL || length == 0, NULL);
  if (name == NULL)
    name = "<xyz>";
  if (data == NULL)
    data = "";
  lines.pos = data;
  lines.end = data + length;
  lines.number = 0;
  if (length >= 3 && memcmp (data, "\xEF\xBB\xBF", 3) == 0)   /* a UTF-8 byte order mark */
    lines.pos += 3;

  if (rest_is_blank (&lines) != 0 || lines.pos == lines.end)
    {
      qv_io_error (error, name, MAX (rest_is_blank (&lines), (gsize) 1), 0,
                   "%s, expected the number of atoms of an XYZ frame",
                   length == 0 ? "the file is empty" : "the file is blank");
      return NULL;
    }
  while (rest_is_blank (&lines) == 0 && next_line (&lines, &line))
    {
      QvStructure *s;

      if (frames->len > 0 && looks_like_atom_line (&line))
        {
          /* More atom lines than the count announced: say that, rather
           * than "expected the number of atoms" of a frame nobody meant. */
          const QvStructure *last = g_ptr_array_index (frames, frames->len - 1);
          g_autofree char *shown = describe (line.text, line.len);
          qv_io_error (error, name, line.number, 1,
                       "an atom line %s after the %" G_GSIZE_FORMAT " atoms the frame's count "
                       "announced (line %" G_GSIZE_FORMAT "); is the count too small?",
                       shown, last->n_atoms, frame_start);
          return NULL;
        }
      frame_start = line.number;
      s = read_frame (&lines, &line, fields, name, error);

      if (s == NULL)
        return NULL;
      g_ptr_array_add (frames, s);
    }
  return g_steal_pointer (&frames);
}

GPtrArray *
qv_xyz_read_file (const char *path, GError **error)
{
  g_autofree char *contents = NULL;
  gsize length = 0;

  g_return_val_if_fail (path != NULL, NULL);
  if (!qv_io_read_file (path, XYZ_MAX_BYTES, &contents, &length, error))
    return NULL;
  return qv_xyz_read_data (contents, length, path, error);
}

/* ------------------------------------------------------------------ */
/* Writing                                                              */

static gboolean
is_plain_word (const char *text)
{
  if (text == NULL || *text == '\0')
    return FALSE;
  for (const char *p = text; *p; p++)
    if (!g_ascii_isalnum (*p) && strchr ("_-+.:/^,", *p) == NULL)
      return FALSE;
  return TRUE;
}

static gboolean
is_key (const char *text)
{
  if (text == NULL || *text == '\0')
    return FALSE;
  for (const char *p = text; *p; p++)
    if (!g_ascii_isalnum (*p) && strchr ("_-.", *p) == NULL)
      return FALSE;
  return TRUE;
}

static void
append_value (GString *out, const char *value)
{
  if (is_plain_word (value))
    {
      g_string_append (out, value);
      return;
    }
  g_string_append_c (out, '"');
  for (const char *p = value ? value : ""; *p; p++)
    {
      if (*p == '"' || *p == '\\')
        g_string_append_c (out, '\\');
      /* a line break would end the comment line */
      g_string_append_c (out, *p == '\n' || *p == '\r' ? ' ' : *p);
    }
  g_string_append_c (out, '"');
}

/* One number, C locale; a fixed-point "-0.000…" loses its sign. */
static void
append_number (GString *out, double value, QvXyzPrecision precision, int width)
{
  char buf[MAX (G_ASCII_DTOSTR_BUF_SIZE, QV_FIXED_BUF_SIZE)];
  const char *text;
  gsize len;

  /* Fixed decimals are the bulk of every scan and ensemble: the exact fast
   * formatter gives the same characters as "%.10f" several times faster. */
  if (precision == QV_XYZ_EXACT)
    g_ascii_formatd (buf, sizeof buf, "%.17g", value);
  else
    qv_fixed_format (buf, value, 10);
  text = buf;
  if (buf[0] == '-' && strspn (buf + 1, "0.") == strlen (buf + 1))
    text = buf + 1;
  len = strlen (text);
  for (int i = (int) len; i < width; i++)
    g_string_append_c (out, ' ');
  g_string_append_len (out, text, (gssize) len);
}

static void
append_comment (GString *out, const QvStructure *s, const QvXyzFrame *f)
{
  gboolean extended = f->style == QV_XYZ_EXTENDED;
  gboolean first = TRUE;

  if (extended)
    {
      g_string_append (out, "Properties=species:S:1:pos:R:3");
      if (f->velocities)
        g_string_append (out, ":velocities:R:3");
      if (f->forces)
        g_string_append (out, ":forces:R:3");
      if (f->masses)
        g_string_append (out, ":masses:R:1");
      first = FALSE;
      if (s->has_cell)
        {
          g_string_append (out, " Lattice=\"");
          for (int i = 0; i < 3; i++)
            for (int k = 0; k < 3; k++)
              {
                if (i || k)
                  g_string_append_c (out, ' ');
                append_number (out, s->cell[i][k], f->precision, 0);
              }
          g_string_append_printf (out, "\" pbc=\"%c %c %c\"", s->pbc[0] ? 'T' : 'F',
                                  s->pbc[1] ? 'T' : 'F', s->pbc[2] ? 'T' : 'F');
        }
      if (f->has_energy)
        {
          g_string_append (out, " energy=");
          append_number (out, f->energy, QV_XYZ_EXACT, 0);
        }
    }
  for (gsize i = 0; i < f->n_pairs; i++)
    {
      const QvXyzPair *pair = &f->pairs[i];

      g_return_if_fail (is_key (pair->key));
      if (!first)
        g_string_append_c (out, ' ');
      first = FALSE;
      g_string_append (out, pair->key);
      g_string_append_c (out, '=');
      append_value (out, pair->value);
    }
  if (!extended && f->n_pairs == 0 && f->comment)
    for (const char *p = f->comment; *p; p++)
      g_string_append_c (out, *p == '\n' || *p == '\r' ? ' ' : *p);
  g_string_append_c (out, '\n');
}

void
qv_xyz_append_frame (GString *out, const QvStructure *s, const QvXyzFrame *f)
{
  gboolean extended = f->style == QV_XYZ_EXTENDED;
  const int width = f->precision == QV_XYZ_EXACT ? 24 : 16;

  g_string_append_printf (out, "%" G_GSIZE_FORMAT "\n", s->n_atoms);
  append_comment (out, s, f);
  for (gsize a = 0; a < s->n_atoms; a++)
    {
      const QvElement *e = qv_element_from_z (s->atoms[a].z);
      const double *x = f->positions ? f->positions + 3 * a : s->atoms[a].position;

      g_string_append_printf (out, "%-2s", e ? e->symbol : "X");
      for (int k = 0; k < 3; k++)
        {
          g_string_append_c (out, ' ');
          append_number (out, x[k], f->precision, width);
        }
      if (extended && f->velocities)
        for (int k = 0; k < 3; k++)
          {
            g_string_append_c (out, ' ');
            append_number (out, f->velocities[3 * a + (gsize) k], f->precision, width);
          }
      if (extended && f->forces)
        for (int k = 0; k < 3; k++)
          {
            g_string_append_c (out, ' ');
            append_number (out, f->forces[3 * a + (gsize) k], f->precision, width);
          }
      if (extended && f->masses)
        {
          g_string_append_c (out, ' ');
          append_number (out, s->atoms[a].mass, QV_XYZ_EXACT, 0);
        }
      g_string_append_c (out, '\n');
    }
}

char *
qv_xyz_format (const QvStructure *structure, const QvXyzFrame *frames, gsize n_frames,
               gsize *length)
{
  /* ~ 60 bytes per atom line */
  GString *out = g_string_sized_new (MAX (n_frames, (gsize) 1) * (structure->n_atoms + 2) * 64);

  for (gsize i = 0; i < n_frames; i++)
    qv_xyz_append_frame (out, structure, &frames[i]);
  if (length)
    *length = out->len;
  return g_string_free (out, FALSE);
}

gboolean
qv_xyz_write_file (const char *path, const QvStructure *structure, const QvXyzFrame *frames,
                   gsize n_frames, gboolean force, GError **error)
{
  gsize length;
  g_autofree char *text = qv_xyz_format (structure, frames, n_frames, &length);

  return qv_output_write (path, text, length, force, error);
}
