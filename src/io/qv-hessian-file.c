/* qv-hessian-file.c — Hessian matrices from plain text and NumPy .npy.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Text is parsed in one pass: a hand-written, locale-independent number
 * parser (parse_number) writes straight into the matrix when its size is
 * known. A text in memory, or a text file streamed through a small buffer
 * with pread (no copy of the whole file is held), is split at a line break
 * into two parts parsed by two threads when it is large; the second part's
 * numbers go to a scratch buffer copied in place afterwards. On a 3000×3000
 * file (211 MB, "%.16e") two threads took 0.30–0.33 s against 0.50–0.55 s
 * for one, on a 2-core machine. Whenever anything is wrong the text is
 * parsed again, whole and in memory, by one thread, which writes the message
 * with absolute lines and columns, so the fast paths never have to.
 *
 * .npy files are read header first, then the data straight into the matrix.
 *
 * Lines and columns count from 1; columns are bytes. */
#include "qv-hessian-file.h"

#include <errno.h>
#include <fcntl.h>
#include <float.h>
#include <math.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "qv-io-error.h"

/* Largest text file read into memory (the text plus the matrix must fit). */
#define QV_HESSIAN_TEXT_MAX_BYTES ((gsize) MIN ((guint64) G_MAXSIZE, (guint64) 64 << 30))

/* Parse with this many threads (1 or 2) when the text is at least
 * QV_HESSIAN_TEXT_THREAD_MIN_BYTES long; overridable at compile time to
 * measure the difference. */
#ifndef QV_HESSIAN_TEXT_THREADS
#define QV_HESSIAN_TEXT_THREADS 2
#endif
#ifndef QV_HESSIAN_TEXT_THREAD_MIN_BYTES
#define QV_HESSIAN_TEXT_THREAD_MIN_BYTES ((gsize) 4 << 20)
#endif

#define NPY_MAGIC "\x93NUMPY"
#define NPY_MAGIC_LEN 6
/* The header of a .npy file is a short dict; numpy itself refuses headers
 * above 10 000 bytes by default, we allow much more but not gigabytes. */
#define NPY_MAX_HEADER ((gsize) 1 << 20)

/* ------------------------------------------------------------------ */
/* Numbers                                                             */

/* Powers of ten that are exact doubles: 10^22 = 2^22 · 5^22 and
 * 5^22 < 2^53. */
static const double pow10_double[23] = {
  1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11,
  1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
};

#if LDBL_MANT_DIG == 64 && (defined (__x86_64__) || defined (__i386__))
/* x87 extended precision: 64-bit significands, so every decimal mantissa of
 * up to 19 digits is exact, and so is 10^k up to k = 27 (5^27 < 2^64). */
#define QV_HAVE_X87_LONG_DOUBLE 1
static const long double pow10_long_double[28] = {
  1e0L, 1e1L, 1e2L, 1e3L, 1e4L, 1e5L, 1e6L, 1e7L, 1e8L, 1e9L, 1e10L,
  1e11L, 1e12L, 1e13L, 1e14L, 1e15L, 1e16L, 1e17L, 1e18L, 1e19L, 1e20L,
  1e21L, 1e22L, 1e23L, 1e24L, 1e25L, 1e26L, 1e27L,
};
#endif

/* Character classes of the text format. */
enum { CH_TOKEN = 0, CH_SPACE, CH_NEWLINE, CH_COMMA, CH_HASH };

static const guint8 char_class[256] = {
  [' '] = CH_SPACE, ['\t'] = CH_SPACE, ['\r'] = CH_SPACE, ['\v'] = CH_SPACE,
  ['\f'] = CH_SPACE, ['\n'] = CH_NEWLINE, [','] = CH_COMMA, ['#'] = CH_HASH,
};

static inline gboolean
is_delimiter (const char *p, const char *end)
{
  return p >= end || char_class[(guchar) *p] != CH_TOKEN;
}

/* The correctly rounded value through the C library (g_ascii_strtod, which
 * is locale-independent). Only called on text that parse_number has already
 * checked to be a decimal number; Fortran 'd' exponents become 'e'. */
static double
parse_number_slow (const char *start, gsize len)
{
  char stack[128];
  char *buffer = len < sizeof stack ? stack : g_malloc (len + 1);
  double value;

  for (gsize i = 0; i < len; i++)
    buffer[i] = (start[i] == 'd' || start[i] == 'D') ? 'e' : start[i];
  buffer[len] = '\0';
  value = g_ascii_strtod (buffer, NULL);
  if (buffer != stack)
    g_free (buffer);
  return value;
}

#if G_BYTE_ORDER == G_LITTLE_ENDIAN
/* Eight ASCII digits at once (SWAR): @v holds the bytes of p[0..7], p[0]
 * lowest. */
static inline gboolean
eight_digits (guint64 v)
{
  /* every byte is 0x30..0x39: high nibble 3, and adding 6 keeps it 3 */
  return ((v & G_GUINT64_CONSTANT (0xF0F0F0F0F0F0F0F0))
          | (((v + G_GUINT64_CONSTANT (0x0606060606060606))
              & G_GUINT64_CONSTANT (0xF0F0F0F0F0F0F0F0)) >> 4))
         == G_GUINT64_CONSTANT (0x3333333333333333);
}

static inline guint64
eight_digits_value (guint64 v)
{
  v -= G_GUINT64_CONSTANT (0x3030303030303030);
  /* pairs: byte 2k becomes 10·d(2k) + d(2k+1) (at most 99, no carries) */
  v = (v * 10 + (v >> 8)) & G_GUINT64_CONSTANT (0x00FF00FF00FF00FF);
  /* quadruples: at most 9999 in each 16-bit lane pair */
  v = (v * 100 + (v >> 16)) & G_GUINT64_CONSTANT (0x0000FFFF0000FFFF);
  /* all eight: at most 99 999 999 */
  v = (v * 10000 + (v >> 32)) & G_GUINT64_CONSTANT (0xFFFFFFFF);
  return v;
}
#endif

/* Parses a decimal number [+-](digits[.digits]|.digits)([eEdD][+-]digits)
 * at @p and returns the first byte after it, or NULL when @p does not start
 * with one. The result is the correctly rounded double (it agrees bit for bit
 * with strtod): up to 19 significant digits are collected into an integer
 * mantissa m with a decimal exponent e. When m ≤ 2^53 and |e| ≤ 22 both m
 * and 10^|e| are exact doubles and one IEEE multiplication or division
 * rounds correctly (Clinger, PLDI 1990). On x87 machines, m < 2^64 and
 * |e| ≤ 27 are exact in long double; one long double operation rounds the
 * exact value once to 64 bits, and rounding that to 53 bits gives the right
 * double unless the 64-bit result sits exactly on a midpoint between two
 * doubles (its low 11 bits are 10000000000): any midpoint between the exact
 * value and its 64-bit rounding would itself be a closer 64-bit number.
 * Midpoints, more digits, larger exponents, subnormals and overflow go to
 * strtod: correctness first. Overflow gives ±inf, for the caller. */
static inline const char *
parse_number (const char *p, const char *end, double *value)
{
  const char *start = p, *digits_start;
  gboolean negative = FALSE;
  gboolean seen;               /* at least one mantissa digit */
  gboolean truncated = FALSE;  /* a nonzero digit did not fit in 19 */
  guint64 mantissa = 0;
  int digits = 0;              /* digits in @mantissa (may count zeros) */
  gint64 exponent = 0;

  if (p < end && (*p == '-' || *p == '+'))
    {
      negative = *p == '-';
      p++;
    }
  digits_start = p;
  while (p < end && *p == '0')   /* leading zeros are not significant */
    p++;
  for (; p < end && (guchar) (*p - '0') < 10; p++)
    {
      if (digits < 19)
        {
          mantissa = mantissa * 10 + (guint) (*p - '0');
          digits++;
        }
      else
        {
          exponent++;
          truncated |= *p != '0';
        }
    }
  seen = p > digits_start;
  if (p < end && *p == '.')
    {
      const char *fraction = ++p;

      if (digits == 0)
        for (; p < end && *p == '0'; p++)
          exponent--;
#if G_BYTE_ORDER == G_LITTLE_ENDIAN
      while (digits <= 11 && end - p >= 8)
        {
          guint64 v;

          memcpy (&v, p, sizeof v);
          if (!eight_digits (v))
            break;
          mantissa = mantissa * 100000000 + eight_digits_value (v);
          digits += 8;
          exponent -= 8;
          p += 8;
        }
#endif
      for (; p < end && (guchar) (*p - '0') < 10; p++)
        {
          if (digits < 19)
            {
              mantissa = mantissa * 10 + (guint) (*p - '0');
              digits++;
              exponent--;
            }
          else
            truncated |= *p != '0';
        }
      seen |= p > fraction;
    }
  if (!seen)
    return NULL;
  if (p < end && (*p == 'e' || *p == 'E' || *p == 'd' || *p == 'D'))
    {
      const char *q = p + 1;
      gboolean exponent_negative = FALSE;
      gint64 e = 0;

      if (q < end && (*q == '-' || *q == '+'))
        {
          exponent_negative = *q == '-';
          q++;
        }
      if (q >= end || (guchar) (*q - '0') >= 10)
        return NULL;
      for (; q < end && (guchar) (*q - '0') < 10; q++)
        if (e < 1000000)
          e = e * 10 + (*q - '0');
      exponent += exponent_negative ? -e : e;
      p = q;
    }

  if (mantissa == 0)
    {
      *value = negative ? -0.0 : 0.0;
      return p;
    }
  if (!truncated && exponent >= -27 && exponent <= 27)
    {
#if FLT_EVAL_METHOD == 0
      if (mantissa <= ((guint64) 1 << 53) && exponent >= -22 && exponent <= 22)
        {
          double v = (double) mantissa;

          v = exponent < 0 ? v / pow10_double[-exponent] : v * pow10_double[exponent];
          *value = negative ? -v : v;
          return p;
        }
#endif
#ifdef QV_HAVE_X87_LONG_DOUBLE
      {
        long double r = (long double) mantissa;
        guint64 significand;

        r = exponent < 0 ? r / pow10_long_double[-exponent]
                         : r * pow10_long_double[exponent];
        memcpy (&significand, &r, sizeof significand);
        if ((significand & 0x7ff) != 0x400)
          {
            double v = (double) r;

            *value = negative ? -v : v;
            return p;
          }
      }
#endif
    }
  *value = parse_number_slow (start, (gsize) (p - start));
  return p;
}

/* A printable, quoted, shortened copy of the token at @p for messages. */
static char *
describe_token (const char *p, const char *end)
{
  GString *out = g_string_new ("'");
  const char *q = p;

  while (!is_delimiter (q, end) && q - p < 40)
    {
      guchar c = (guchar) *q++;

      if (c >= 0x20 && c < 0x7f && c != '\'' && c != '\\')
        g_string_append_c (out, (char) c);
      else
        g_string_append_printf (out, "\\x%02x", c);
    }
  g_string_append_c (out, '\'');
  if (!is_delimiter (q, end))
    g_string_append (out, "…");
  return g_string_free (out, FALSE);
}

/* ------------------------------------------------------------------ */
/* One pass over a range of lines                                       */

typedef enum { PATTERN_FULL, PATTERN_LOWER, PATTERN_UPPER, N_PATTERNS } Pattern;

typedef struct {
  gsize row;          /* 0-based data row, G_MAXSIZE when none */
  gsize line;
  gsize found;        /* numbers in that row */
  gsize expected;     /* what the pattern wanted (for breaks) */
  const char *start;  /* start of the line */
} RowMark;

typedef enum { CHUNK_OK, CHUNK_SYNTAX, CHUNK_NO_MEMORY } ChunkStatus;

typedef struct {
  /* input */
  const char *begin, *end;     /* whole lines */
  double *out;
  gsize capacity;              /* numbers @out can hold */
  gboolean grow;               /* @out is ours: g_try_realloc past capacity */
  gsize mark_row;              /* remember this data row (0-based) */

  /* output */
  ChunkStatus status;
  gsize count;                 /* numbers seen, stored or not */
  gsize lines;                 /* newline characters in the range */
  gsize excess_line, excess_col; /* where number #capacity (0-based) is,
                                    when it did not fit (!grow) */
  /* Row lengths (a row is a line with at least one number), as seen from
   * this range alone: constant, rising by one, falling by one. */
  gsize rows, first_len, last_len;
  gboolean pattern_ok[N_PATTERNS];
  RowMark pattern_break[N_PATTERNS];
  RowMark marked;              /* data row number @mark_row */
  RowMark past_square;         /* data row number @first_len */
  RowMark last_row;
  gsize error_line, error_col;
  char *error_message;
} Chunk;

static void
chunk_init (Chunk *c, const char *begin, const char *end, double *out,
            gsize capacity, gboolean grow, gsize mark_row)
{
  memset (c, 0, sizeof *c);
  c->begin = begin;
  c->end = end;
  c->out = out;
  c->capacity = capacity;
  c->grow = grow;
  c->mark_row = mark_row;
  for (int i = 0; i < N_PATTERNS; i++)
    {
      c->pattern_ok[i] = TRUE;
      c->pattern_break[i].row = G_MAXSIZE;
    }
  c->marked.row = c->past_square.row = c->last_row.row = G_MAXSIZE;
}

static void
chunk_clear (Chunk *c)
{
  g_clear_pointer (&c->error_message, g_free);
  if (c->grow)
    g_clear_pointer (&c->out, g_free);
}

static void
chunk_break (Chunk *c, Pattern pattern, gsize found, gsize expected,
             gsize line, const char *line_start)
{
  c->pattern_ok[pattern] = FALSE;
  c->pattern_break[pattern] = (RowMark) { c->rows, line, found, expected, line_start };
}

static void
chunk_end_row (Chunk *c, gsize found, gsize line, const char *line_start)
{
  gsize r = c->rows;
  RowMark mark = { r, line, found, 0, line_start };

  if (r == 0)
    c->first_len = found;
  else
    {
      if (c->pattern_ok[PATTERN_FULL] && found != c->first_len)
        chunk_break (c, PATTERN_FULL, found, c->first_len, line, line_start);
      if (c->pattern_ok[PATTERN_LOWER] && found != c->first_len + r)
        chunk_break (c, PATTERN_LOWER, found, c->first_len + r, line, line_start);
      if (c->pattern_ok[PATTERN_UPPER]
          && (c->first_len <= r || found != c->first_len - r))
        chunk_break (c, PATTERN_UPPER, found,
                     c->first_len > r ? c->first_len - r : 0, line, line_start);
      if (r == c->first_len)
        c->past_square = mark;
    }
  if (r == c->mark_row)
    c->marked = mark;
  c->last_row = mark;
  c->last_len = found;
  c->rows++;
}

static G_GNUC_NO_INLINE gboolean
chunk_store_slow (Chunk *c, double value, gsize line, gsize col)
{
  if (c->grow)
    {
      gsize capacity = c->capacity < 1024 ? 1024 : c->capacity;
      double *bigger;

      if (capacity > G_MAXSIZE / 2 / sizeof (double))
        return FALSE;
      capacity *= 2;
      bigger = g_try_realloc (c->out, capacity * sizeof (double));
      if (bigger == NULL)
        return FALSE;
      c->out = bigger;
      c->capacity = capacity;
      c->out[c->count] = value;
    }
  else if (c->count == c->capacity)
    {
      c->excess_line = line;
      c->excess_col = col;
    }
  c->count++;
  return TRUE;
}

static void
chunk_syntax_error (Chunk *c, gsize line, gsize col, char *message)
{
  c->status = CHUNK_SYNTAX;
  c->error_line = line;
  c->error_col = col;
  c->error_message = message;
}

/* Parses c->begin … c->end, whole lines (the last may lack its newline).
 * It can be called again on the lines that follow, in another buffer:
 * counts, rows and line numbers carry on. */
static void
chunk_parse (Chunk *c)
{
  const char *p = c->begin, *end = c->end;
  const char *line_start = p;
  gsize line = c->lines + 1;
  gsize in_row = 0;             /* numbers on the current line */
  gboolean after_number = FALSE; /* a comma may follow */

  while (p < end)
    {
      switch (char_class[(guchar) *p])
        {
        case CH_SPACE:
          p++;
          continue;
        case CH_NEWLINE:
          if (in_row > 0)
            chunk_end_row (c, in_row, line, line_start);
          in_row = 0;
          after_number = FALSE;
          c->lines++;
          line++;
          line_start = ++p;
          continue;
        case CH_COMMA:
          if (!after_number)
            {
              chunk_syntax_error (c, line, (gsize) (p - line_start) + 1,
                                  g_strdup ("expected a number before ','"));
              return;
            }
          after_number = FALSE;
          p++;
          continue;
        case CH_HASH:
          {
            const char *nl = memchr (p, '\n', (gsize) (end - p));

            p = nl != NULL ? nl : end;
            continue;
          }
        default:
          break;
        }

      /* a token */
      {
        double value;
        const char *q = parse_number (p, end, &value);
        gsize col = (gsize) (p - line_start) + 1;

        if (q == NULL || !is_delimiter (q, end))
          {
            g_autofree char *token = describe_token (p, end);
            const char *t = p + (*p == '-' || *p == '+');

            if (end - t >= 3 && (g_ascii_strncasecmp (t, "nan", 3) == 0
                                 || g_ascii_strncasecmp (t, "inf", 3) == 0))
              chunk_syntax_error (c, line, col,
                                  g_strdup_printf ("%s: NaN and infinity are not accepted in a Hessian",
                                                   token));
            else
              chunk_syntax_error (c, line, col,
                                  g_strdup_printf ("expected a decimal number, found %s", token));
            return;
          }
        if (!isfinite (value))
          {
            g_autofree char *token = describe_token (p, end);

            chunk_syntax_error (c, line, col,
                                g_strdup_printf ("%s is out of the range of a double", token));
            return;
          }
        if (G_LIKELY (c->count < c->capacity))
          c->out[c->count++] = value;
        else if (!chunk_store_slow (c, value, line, col))
          {
            c->status = CHUNK_NO_MEMORY;
            return;
          }
        in_row++;
        after_number = TRUE;
        p = q;
      }
    }
  if (in_row > 0)
    chunk_end_row (c, in_row, line, line_start);
}

/* Appends @b (the range after @a) to @a's row statistics and counts. */
static void
chunk_merge_stats (Chunk *a, const Chunk *b)
{
  if (b->rows > 0)
    {
      if (a->rows == 0)
        {
          a->first_len = b->first_len;
          for (int i = 0; i < N_PATTERNS; i++)
            a->pattern_ok[i] = b->pattern_ok[i];
        }
      else
        {
          a->pattern_ok[PATTERN_FULL] &= b->pattern_ok[PATTERN_FULL]
                                         && b->first_len == a->first_len;
          a->pattern_ok[PATTERN_LOWER] &= b->pattern_ok[PATTERN_LOWER]
                                          && b->first_len == a->last_len + 1;
          a->pattern_ok[PATTERN_UPPER] &= b->pattern_ok[PATTERN_UPPER]
                                          && b->first_len + 1 == a->last_len;
        }
      a->rows += b->rows;
      a->last_len = b->last_len;
    }
  a->count += b->count;
  a->lines += b->lines;
}

/* ------------------------------------------------------------------ */
/* What the numbers make                                                */

static gsize
triangle_count (gsize dim)
{
  /* dim (dim + 1) / 2 without overflow for any dim that passed
   * qv_hessian_new; G_MAXSIZE when it would overflow. */
  gsize a = dim, b = dim + 1;

  if (dim == G_MAXSIZE)
    return G_MAXSIZE;
  if (a % 2 == 0)
    a /= 2;
  else
    b /= 2;
  if (a != 0 && b > G_MAXSIZE / a)
    return G_MAXSIZE;
  return a * b;
}

static gsize
square_count (gsize dim)
{
  if (dim != 0 && dim > G_MAXSIZE / dim)
    return G_MAXSIZE;
  return dim * dim;
}

/* The dimension whose full (or triangle) count is @count; 0 when none. */
static gsize
dimension_from_count (gsize count, gboolean triangle)
{
  double guess = triangle ? (sqrt (8.0 * (double) count + 1.0) - 1.0) / 2.0
                          : sqrt ((double) count);
  gsize d = (gsize) guess;

  for (gsize c = d > 2 ? d - 2 : 0; c <= d + 2; c++)
    if ((triangle ? triangle_count (c) : square_count (c)) == count)
      return c;
  return 0;
}

static gsize
layout_count (QvHessianLayout layout, gsize dim)
{
  return layout == QV_HESSIAN_LAYOUT_FULL ? square_count (dim) : triangle_count (dim);
}

static const char *
layout_words (QvHessianLayout layout)
{
  switch (layout)
    {
    case QV_HESSIAN_LAYOUT_FULL:
      return "full matrix";
    case QV_HESSIAN_LAYOUT_LOWER:
      return "lower triangle";
    case QV_HESSIAN_LAYOUT_UPPER:
      return "upper triangle";
    case QV_HESSIAN_LAYOUT_AUTO:
    case QV_HESSIAN_LAYOUT_NPY:
    default:
      return "matrix";
    }
}

/* "a full matrix", "an upper triangle" */
static const char *
article (QvHessianLayout layout)
{
  return layout == QV_HESSIAN_LAYOUT_UPPER ? "an" : "a";
}

static const char *
plural (gsize count)
{
  return count == 1 ? "" : "s";
}

static char *
geometry_words (gsize n)
{
  if (n % 3 == 0)
    return g_strdup_printf ("the geometry has %" G_GSIZE_FORMAT " atom%s (expects 3 × %"
                            G_GSIZE_FORMAT " = %" G_GSIZE_FORMAT ")", n / 3, plural (n / 3),
                            n / 3, n);
  return g_strdup_printf ("%" G_GSIZE_FORMAT " were expected", n);
}

/* The line of the last byte of the text (1 for an empty text). */
static gsize
end_line (const char *data, gsize length, gsize newlines)
{
  if (length > 0 && data[length - 1] == '\n')
    return newlines;
  return newlines + 1;
}

/* The column after the last number of the line at @start, or of its
 * @k-th (0-based) number. */
static gsize
row_column (const char *start, const char *end, gsize k)
{
  const char *p = start, *after = start;
  gsize seen = 0;

  while (p < end && *p != '\n' && *p != '#')
    {
      if (is_delimiter (p, end))
        {
          p++;
          continue;
        }
      if (seen == k)
        return (gsize) (p - start) + 1;
      while (!is_delimiter (p, end))
        p++;
      after = p;
      seen++;
    }
  return (gsize) (after - start) + 1;
}

#define LAYOUT_ADVICE "the layout cannot be told from the row lengths; " \
  "if the lines are wrapped or the layout is unusual, pass --hessian-layout full|lower|upper"

/* Decides the layout and dimension from the statistics of a whole pass.
 * With @report FALSE it only answers; with TRUE it also sets @error (the
 * statistics must then come from one serial pass, for absolute lines). */
static gboolean
decide_shape (const Chunk *c, const char *data, gsize length, const char *name,
              gsize n, QvHessianLayout layout, gboolean report,
              QvHessianLayout *out_layout, gsize *out_dim, GError **error)
{
  gsize eof = report ? end_line (data, length, c->lines) : 0;
  gsize dim = 0;

  if (c->count == 0)
    {
      if (report)
        qv_io_error (error, name, eof, 0, "%s, expected the numbers of a Hessian matrix",
                     length == 0 ? "the file is empty" : "no numbers in the file");
      return FALSE;
    }

  if (layout == QV_HESSIAN_LAYOUT_AUTO)
    {
      if (c->pattern_ok[PATTERN_FULL] && c->rows == c->first_len)
        layout = QV_HESSIAN_LAYOUT_FULL, dim = c->rows;
      else if (c->pattern_ok[PATTERN_LOWER] && c->first_len == 1)
        layout = QV_HESSIAN_LAYOUT_LOWER, dim = c->rows;
      else if (c->pattern_ok[PATTERN_UPPER] && c->last_len == 1)
        layout = QV_HESSIAN_LAYOUT_UPPER, dim = c->rows;
      else
        {
          if (!report)
            return FALSE;
          if (c->pattern_ok[PATTERN_FULL] && c->rows < c->first_len)
            qv_io_error (error, name, eof, 0,
                         "the file ends after %" G_GSIZE_FORMAT " rows of %" G_GSIZE_FORMAT
                         " numbers, a full matrix needs %" G_GSIZE_FORMAT " rows; " LAYOUT_ADVICE,
                         c->rows, c->first_len, c->first_len);
          else if (c->pattern_ok[PATTERN_FULL])
            qv_io_error (error, name, c->past_square.line,
                         row_column (c->past_square.start, data + length, 0),
                         "row %" G_GSIZE_FORMAT " is one too many for a full matrix of %"
                         G_GSIZE_FORMAT " columns (%" G_GSIZE_FORMAT " rows in all); " LAYOUT_ADVICE,
                         c->first_len + 1, c->first_len, c->rows);
          else if (c->pattern_ok[PATTERN_UPPER])
            qv_io_error (error, name, eof, 0,
                         "the rows shrink by one like an upper triangle (%" G_GSIZE_FORMAT
                         ", %" G_GSIZE_FORMAT ", …) but the file ends at a row of %"
                         G_GSIZE_FORMAT " number%s instead of 1; " LAYOUT_ADVICE,
                         c->first_len, c->first_len - 1, c->last_len, plural (c->last_len));
          else
            {
              /* Report the pattern that held longest. */
              const RowMark *b = NULL;
              Pattern which = PATTERN_FULL;

              for (int i = 0; i < N_PATTERNS; i++)
                if (!c->pattern_ok[i] && (b == NULL || c->pattern_break[i].row > b->row))
                  b = &c->pattern_break[i], which = (Pattern) i;
              if (c->pattern_ok[PATTERN_LOWER])
                {
                  /* rising by one but not from 1 */
                  qv_io_error (error, name, c->last_row.line, 0,
                               "the rows grow by one from %" G_GSIZE_FORMAT
                               " numbers, but a lower triangle starts with 1; " LAYOUT_ADVICE,
                               c->first_len);
                }
              else if (b->row == 1)
                qv_io_error (error, name, b->line, row_column (b->start, data + length, 0),
                             "the first row has %" G_GSIZE_FORMAT " number%s and the second %"
                             G_GSIZE_FORMAT ", which fits none of full (n rows of n), lower "
                             "(1, 2, …, n) and upper (n, n−1, …, 1); " LAYOUT_ADVICE,
                             c->first_len, plural (c->first_len), b->found);
              else
                qv_io_error (error, name, b->line,
                             row_column (b->start, data + length, MIN (b->found, b->expected)),
                             "row %" G_GSIZE_FORMAT " has %" G_GSIZE_FORMAT
                             " number%s, the rows before it make %s %s, which needs %"
                             G_GSIZE_FORMAT " here; " LAYOUT_ADVICE,
                             b->row + 1, b->found, plural (b->found),
                             article ((QvHessianLayout) (which + 1)),
                             layout_words ((QvHessianLayout) (which + 1)), b->expected);
            }
          return FALSE;
        }

      if (n != 0 && dim != n)
        {
          if (report)
            {
              g_autofree char *geometry = geometry_words (n);
              const RowMark *where = dim > n ? &c->marked : &c->last_row;

              qv_io_error (error, name, where->line, 0,
                           "has %" G_GSIZE_FORMAT " rows (%s), %s", dim,
                           layout_words (layout), geometry);
            }
          return FALSE;
        }
    }
  else
    {
      gboolean triangle = layout != QV_HESSIAN_LAYOUT_FULL;

      if (n != 0)
        {
          gsize expected = layout_count (layout, n);

          dim = n;
          if (c->count != expected)
            {
              g_autofree char *geometry = NULL;
              g_autofree char *holds = NULL;
              gsize other = dimension_from_count (c->count, triangle);

              if (!report)
                return FALSE;
              geometry = geometry_words (n);
              if (other != 0)
                holds = g_strdup_printf ("; the file has %" G_GSIZE_FORMAT " rows (%s of %"
                                         G_GSIZE_FORMAT " numbers), %s",
                                         other, layout_words (layout), c->count, geometry);
              if (c->count > expected)
                qv_io_error (error, name, c->excess_line, c->excess_col,
                             "too many numbers: a %" G_GSIZE_FORMAT "×%" G_GSIZE_FORMAT
                             " %s has %" G_GSIZE_FORMAT ", this is number %" G_GSIZE_FORMAT "%s",
                             n, n, layout_words (layout), expected, expected + 1,
                             holds != NULL ? holds : "");
              else
                qv_io_error (error, name, eof, 0,
                             "too few numbers: the file ends after %" G_GSIZE_FORMAT
                             ", a %" G_GSIZE_FORMAT "×%" G_GSIZE_FORMAT " %s has %"
                             G_GSIZE_FORMAT "%s",
                             c->count, n, n, layout_words (layout), expected,
                             holds != NULL ? holds : "");
              return FALSE;
            }
        }
      else
        {
          dim = dimension_from_count (c->count, triangle);
          if (dim == 0)
            {
              if (report)
                qv_io_error (error, name, eof, 0,
                             "%" G_GSIZE_FORMAT " number%s do not make %s %s of any size "
                             "(it needs %s)", c->count, plural (c->count), article (layout),
                             layout_words (layout),
                             triangle ? "n(n+1)/2 numbers" : "n² numbers");
              return FALSE;
            }
        }
    }

  *out_layout = layout;
  *out_dim = dim;
  return TRUE;
}

/* Mirrors one triangle onto the other, in blocks for the cache:
 * @upper_from_lower copies a[i][j] (j < i) to a[j][i], else the reverse,
 * where a[i][j] is data[i * n + j]. */
static void
mirror_triangle (double *data, gsize n, gboolean from_lower)
{
  const gsize B = 64;

  for (gsize ib = 0; ib < n; ib += B)
    for (gsize jb = 0; jb <= ib; jb += B)
      {
        gsize imax = MIN (ib + B, n), jmax = MIN (jb + B, n);

        for (gsize i = ib; i < imax; i++)
          for (gsize j = jb; j < jmax && j < i; j++)
            {
              if (from_lower)
                data[j * n + i] = data[i * n + j];
              else
                data[i * n + j] = data[j * n + i];
            }
      }
}

/* Spreads a packed triangle (row by row from data[0]) over the n×n block in
 * place, and mirrors it. Rows go from the last to the first: a row's
 * destination never overlaps the packed rows before it. */
static void
expand_triangle (double *data, gsize n, QvHessianLayout layout)
{
  if (layout == QV_HESSIAN_LAYOUT_LOWER)
    {
      for (gsize i = n; i-- > 0;)
        memmove (data + i * n, data + triangle_count (i), (i + 1) * sizeof (double));
      mirror_triangle (data, n, TRUE);
    }
  else
    {
      for (gsize i = n; i-- > 0;)
        {
          /* rows before i hold n + (n−1) + … + (n−i+1) = i·n − i(i−1)/2 */
          gsize offset = i * n - (i > 0 ? triangle_count (i - 1) : 0);

          memmove (data + i * n + i, data + offset, (n - i) * sizeof (double));
        }
      mirror_triangle (data, n, FALSE);
    }
}

static gboolean
threads_wanted (guint64 length)
{
  return QV_HESSIAN_TEXT_THREADS > 1 && length >= QV_HESSIAN_TEXT_THREAD_MIN_BYTES
         && g_get_num_processors () > 1;
}

static void
set_no_memory (GError **error, const char *name, guint64 length)
{
  g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
               "%s: out of memory while reading a Hessian of %" G_GUINT64_FORMAT
               " bytes of text", name, length);
}

/* A part of the text for one thread: in memory (fd < 0, the chunk's
 * begin/end), or the bytes from..to of a file, streamed through a small
 * buffer with pread (then the chunk's row positions are not kept valid, and
 * a failure is re-parsed in memory for its message). Both start at the
 * beginning of a line. */
typedef struct {
  Chunk chunk;
  int fd;
  guint64 from, to;
  gboolean read_failed;         /* an I/O error, or the file shrank */
} Job;

#ifndef QV_HESSIAN_STREAM_BLOCK
#define QV_HESSIAN_STREAM_BLOCK ((gsize) 1 << 20)
#endif
#define STREAM_BLOCK QV_HESSIAN_STREAM_BLOCK

static void
job_stream (Job *job)
{
  gsize capacity = STREAM_BLOCK, filled = 0;
  char *buffer = g_try_malloc (capacity);
  guint64 pos = job->from;

  if (buffer == NULL)
    {
      job->chunk.status = CHUNK_NO_MEMORY;
      return;
    }
  while (job->chunk.status == CHUNK_OK)
    {
      gsize want = (gsize) MIN ((guint64) (capacity - filled), job->to - pos);
      gsize used;

      if (want > 0)
        {
          ssize_t got = pread (job->fd, buffer + filled, want, (off_t) pos);

          if (got < 0 && errno == EINTR)
            continue;
          if (got <= 0)
            {
              job->read_failed = TRUE;
              break;
            }
          pos += (guint64) got;
          filled += (gsize) got;
        }
      if (pos == job->to)
        used = filled;              /* the rest, whatever its end */
      else
        {
          used = filled;
          while (used > 0 && buffer[used - 1] != '\n')
            used--;
          if (used == 0 && filled < capacity)
            continue;               /* a short read: read on */
          if (used == 0)
            {
              /* a line longer than the buffer */
              char *bigger = capacity <= G_MAXSIZE / 2 ? g_try_realloc (buffer, capacity * 2) : NULL;

              if (bigger == NULL)
                {
                  job->chunk.status = CHUNK_NO_MEMORY;
                  break;
                }
              buffer = bigger;
              capacity *= 2;
              continue;
            }
        }
      job->chunk.begin = buffer;
      job->chunk.end = buffer + used;
      chunk_parse (&job->chunk);
      if (used == filled && pos == job->to)
        break;
      memmove (buffer, buffer + used, filled - used);
      filled -= used;
    }
  job->chunk.begin = job->chunk.end = NULL;
  g_free (buffer);
}

static gpointer
job_run (gpointer data)
{
  Job *job = data;

  if (job->fd < 0)
    chunk_parse (&job->chunk);
  else
    job_stream (job);
  return NULL;
}

/* The matrix of @name, or an error that names the file (a matrix too
 * large for this machine, say). */
static QvHessian *
new_matrix (gsize n, const char *name, GError **error)
{
  QvHessian *h = qv_hessian_new (n, FALSE, error);

  if (h == NULL)
    g_prefix_error (error, "%s: ", name);
  return h;
}

/* Runs one or two jobs (the second in its own thread) and makes the
 * matrix. @report: the single job covers all of @data in memory, so errors
 * can be told with their positions; otherwise a NULL return without an
 * error asks the caller for such a pass. */
static QvHessian *
run_jobs (Job *jobs, int n_jobs, const char *data, gsize length, const char *name,
          guint64 total_bytes, gsize n, QvHessianLayout layout, gboolean report,
          GError **error)
{
  g_autoptr(QvHessian) hessian = NULL;
  QvHessianLayout used = QV_HESSIAN_LAYOUT_AUTO;
  gsize dim = 0, count0;
  double *out0;
  gboolean ok = FALSE;

  g_assert (n_jobs == 1 || n_jobs == 2);
  g_assert (!report || (n_jobs == 1 && jobs[0].fd < 0));

  if (n != 0)
    {
      /* With an explicit layout keep exactly its count, so that the
       * position of the first number too many is recorded. */
      gsize capacity = layout == QV_HESSIAN_LAYOUT_AUTO || n_jobs > 1
                       ? square_count (n) : layout_count (layout, n);

      hessian = new_matrix (n, name, error);
      if (hessian == NULL)
        return NULL;
      chunk_init (&jobs[0].chunk, jobs[0].chunk.begin, jobs[0].chunk.end,
                  hessian->data, capacity, FALSE, n);
    }
  else
    chunk_init (&jobs[0].chunk, jobs[0].chunk.begin, jobs[0].chunk.end,
                NULL, 0, TRUE, G_MAXSIZE);
  if (n_jobs == 2)
    {
      /* a number and its separator take at least two bytes; most take
       * far more, and the buffer grows if needed */
      guint64 bytes = jobs[1].fd >= 0 ? jobs[1].to - jobs[1].from
                                      : (guint64) (jobs[1].chunk.end - jobs[1].chunk.begin);
      gsize estimate = (gsize) MIN (bytes / 16 + 64, (guint64) (G_MAXSIZE / sizeof (double)));

      if (n != 0)
        estimate = MIN (estimate, square_count (n));
      chunk_init (&jobs[1].chunk, jobs[1].chunk.begin, jobs[1].chunk.end,
                  g_try_new (double, estimate), estimate, TRUE, G_MAXSIZE);
      if (jobs[1].chunk.out == NULL)
        {
          set_no_memory (error, name, total_bytes);
          chunk_clear (&jobs[0].chunk);
          return NULL;
        }
    }

  if (n_jobs == 2)
    {
      GThread *thread = g_thread_try_new ("qv-hessian-text", job_run, &jobs[1], NULL);

      job_run (&jobs[0]);
      if (thread != NULL)
        g_thread_join (thread);
      else
        job_run (&jobs[1]);
    }
  else
    job_run (&jobs[0]);

  for (int i = 0; i < n_jobs; i++)
    if (jobs[i].chunk.status == CHUNK_NO_MEMORY)
      {
        set_no_memory (error, name, total_bytes);
        goto out;
      }
  if (report && jobs[0].chunk.status == CHUNK_SYNTAX)
    {
      qv_io_error (error, name, jobs[0].chunk.error_line, jobs[0].chunk.error_col, "%s",
                   jobs[0].chunk.error_message);
      goto out;
    }
  for (int i = 0; i < n_jobs; i++)
    if (jobs[i].chunk.status != CHUNK_OK || jobs[i].read_failed)
      goto out;
  if (n != 0 && !report && jobs[0].chunk.count > jobs[0].chunk.capacity)
    goto out;

  count0 = jobs[0].chunk.count;
  out0 = jobs[0].chunk.out;
  if (n_jobs == 2)
    chunk_merge_stats (&jobs[0].chunk, &jobs[1].chunk);
  if (!decide_shape (&jobs[0].chunk, data, length, name, n, layout, report,
                     &used, &dim, error))
    goto out;
  if (n == 0)
    {
      hessian = new_matrix (dim, name, error);
      if (hessian == NULL)
        goto out;
      if (count0 > 0)   /* out0 is NULL when the first part held no number */
        memcpy (hessian->data, out0, count0 * sizeof (double));
    }
  if (n_jobs == 2)
    memcpy (hessian->data + count0, jobs[1].chunk.out,
            jobs[1].chunk.count * sizeof (double));
  ok = TRUE;

out:
  for (int i = 0; i < n_jobs; i++)
    chunk_clear (&jobs[i].chunk);
  if (!ok)
    return NULL;
  if (used != QV_HESSIAN_LAYOUT_FULL)
    expand_triangle (hessian->data, dim, used);
  hessian->layout = used;
  /* a full text is stored row by row as it comes, that is transposed */
  hessian->transposed = used == QV_HESSIAN_LAYOUT_FULL;
  return g_steal_pointer (&hessian);
}

static void
job_init_memory (Job *job, const char *begin, const char *end)
{
  memset (job, 0, sizeof *job);
  job->fd = -1;
  job->chunk.begin = begin;
  job->chunk.end = end;
}

QvHessian *
qv_hessian_read_text (const char *data, gsize length, const char *name,
                      gsize n, QvHessianLayout layout, GError **error)
{
  Job jobs[2];
  const char *mid;

  g_return_val_if_fail (data != NULL || length == 0, NULL);
  if (name == NULL)
    name = "<hessian>";
  if (data == NULL)
    data = "";
  if (layout == QV_HESSIAN_LAYOUT_NPY)
    return qv_hessian_read_npy (data, length, name, n, error);

  if (threads_wanted (length)
      && (mid = memchr (data + length / 2, '\n', length - length / 2)) != NULL
      && mid + 1 < data + length)
    {
      GError *local = NULL;
      QvHessian *hessian;

      job_init_memory (&jobs[0], data, mid + 1);
      job_init_memory (&jobs[1], mid + 1, data + length);
      hessian = run_jobs (jobs, 2, data, length, name, length, n, layout, FALSE, &local);
      if (local != NULL)
        g_propagate_error (error, local);
      if (hessian != NULL || local != NULL)
        return hessian;
    }

  /* One thread over everything; this also tells what is wrong. */
  job_init_memory (&jobs[0], data, data + length);
  return run_jobs (jobs, 1, data, length, name, length, n, layout, TRUE, error);
}

/* The text file open on @fd, streamed: NULL without an error when it must
 * be read again into memory to be reported on (or when it changed). */
static QvHessian *
read_text_fd (int fd, guint64 size, const char *path, gsize n, QvHessianLayout layout,
              GError **error)
{
  Job jobs[2];
  int n_jobs = 1;

  memset (jobs, 0, sizeof jobs);
  jobs[0].fd = jobs[1].fd = fd;
  jobs[0].from = 0;
  jobs[0].to = size;
  if (threads_wanted (size))
    {
      /* the second part starts after the first newline past the middle */
      char window[65536];
      guint64 pos = size / 2;

      while (pos < size)
        {
          ssize_t got = pread (fd, window, (gsize) MIN ((guint64) sizeof window, size - pos),
                               (off_t) pos);
          const char *nl;

          if (got < 0 && errno == EINTR)
            continue;
          if (got <= 0)
            break;
          nl = memchr (window, '\n', (gsize) got);
          if (nl != NULL)
            {
              guint64 start = pos + (guint64) (nl - window) + 1;

              if (start < size)
                {
                  jobs[0].to = jobs[1].from = start;
                  jobs[1].to = size;
                  n_jobs = 2;
                }
              break;
            }
          pos += (guint64) got;
        }
    }
  return run_jobs (jobs, n_jobs, NULL, 0, path, size, n, layout, FALSE, error);
}



/* ------------------------------------------------------------------ */
/* NumPy .npy                                                           */

typedef struct {
  gsize data_offset;     /* bytes before the array */
  gsize dim;
  gboolean big_endian;
  gboolean fortran_order;
} NpyHeader;

static const char *
npy_skip_space (const char *p, const char *end)
{
  while (p < end && (*p == ' ' || *p == '\t' || *p == '\n' || *p == '\r'))
    p++;
  return p;
}

/* A Python string literal in single or double quotes, no escapes (numpy
 * never writes any in the fields we read). */
static const char *
npy_string (const char *p, const char *end, char **out)
{
  char quote;
  const char *start;

  if (p >= end || (*p != '\'' && *p != '"'))
    return NULL;
  quote = *p++;
  start = p;
  while (p < end && *p != quote && *p != '\\')
    p++;
  if (p >= end || *p != quote)
    return NULL;
  *out = g_strndup (start, (gsize) (p - start));
  return p + 1;
}

static char *
npy_excerpt (const char *p, const char *end)
{
  return describe_token (p, MIN (end, p + 30));
}

/* Fills @h from the header at the start of @data (@length bytes available,
 * which need only cover the header), or sets an error that names @name. */
static gboolean
npy_parse_header (const char *data, gsize length, const char *name, NpyHeader *h,
                  GError **error)
{
  guint major, minor;
  gsize header_len, prefix;
  const char *p, *end;
  g_autofree char *descr = NULL;
  gboolean have_descr = FALSE, have_order = FALSE, have_shape = FALSE;
  guint64 shape[3] = { 0, 0, 0 };
  gsize ndim = 0;

  if (length < NPY_MAGIC_LEN || memcmp (data, NPY_MAGIC, NPY_MAGIC_LEN) != 0)
    {
      qv_io_error (error, name, 0, 0, "not a NumPy .npy file (it does not start with \\x93NUMPY)");
      return FALSE;
    }
  if (length < NPY_MAGIC_LEN + 2)
    goto truncated;
  major = (guchar) data[6];
  minor = (guchar) data[7];
  if (major == 1)
    {
      if (length < 10)
        goto truncated;
      header_len = (guchar) data[8] | ((gsize) (guchar) data[9] << 8);
      prefix = 10;
    }
  else if (major == 2 || major == 3)
    {
      if (length < 12)
        goto truncated;
      header_len = (guchar) data[8] | ((gsize) (guchar) data[9] << 8)
                   | ((gsize) (guchar) data[10] << 16) | ((gsize) (guchar) data[11] << 24);
      prefix = 12;
    }
  else
    {
      qv_io_error (error, name, 0, 0, ".npy format version %u.%u is not supported "
                   "(1.0, 2.0 and 3.0 are)", major, minor);
      return FALSE;
    }
  if (header_len > NPY_MAX_HEADER)
    {
      qv_io_error (error, name, 0, 0, "the .npy header claims %" G_GSIZE_FORMAT
                   " bytes, more than the %" G_GSIZE_FORMAT " accepted", header_len,
                   NPY_MAX_HEADER);
      return FALSE;
    }
  if (length - prefix < header_len)
    {
      qv_io_error (error, name, 0, 0, "the .npy header claims %" G_GSIZE_FORMAT
                   " bytes but the file ends after %" G_GSIZE_FORMAT,
                   header_len, length - prefix);
      return FALSE;
    }
  h->data_offset = prefix + header_len;

  p = data + prefix;
  end = p + header_len;
  p = npy_skip_space (p, end);
  if (p >= end || *p != '{')
    goto malformed;
  p++;
  for (;;)
    {
      g_autofree char *key = NULL;

      p = npy_skip_space (p, end);
      if (p < end && *p == '}')
        break;
      p = npy_string (p, end, &key);
      if (p == NULL)
        goto malformed;
      p = npy_skip_space (p, end);
      if (p >= end || *p != ':')
        goto malformed;
      p = npy_skip_space (p + 1, end);

      /* numpy writes each key once; a second one would also leak the first */
      if ((strcmp (key, "descr") == 0 && have_descr)
          || (strcmp (key, "fortran_order") == 0 && have_order)
          || (strcmp (key, "shape") == 0 && have_shape))
        {
          qv_io_error (error, name, 0, 0, "the .npy header gives '%s' twice", key);
          return FALSE;
        }
      if (strcmp (key, "descr") == 0)
        {
          if (p < end && *p == '[')
            {
              qv_io_error (error, name, 0, 0, "the .npy array has a structured dtype, "
                           "expected float64 ('<f8' or '>f8')");
              return FALSE;
            }
          p = npy_string (p, end, &descr);
          if (p == NULL)
            goto malformed;
          have_descr = TRUE;
        }
      else if (strcmp (key, "fortran_order") == 0)
        {
          if (end - p >= 4 && memcmp (p, "True", 4) == 0)
            h->fortran_order = TRUE, p += 4;
          else if (end - p >= 5 && memcmp (p, "False", 5) == 0)
            h->fortran_order = FALSE, p += 5;
          else
            goto malformed;
          have_order = TRUE;
        }
      else if (strcmp (key, "shape") == 0)
        {
          if (p >= end || *p != '(')
            goto malformed;
          p++;
          for (;;)
            {
              guint64 v = 0;
              const char *digits;

              p = npy_skip_space (p, end);
              if (p < end && *p == ')')
                break;
              digits = p;
              while (p < end && g_ascii_isdigit (*p))
                {
                  if (v > (G_MAXUINT64 - 9) / 10)
                    {
                      qv_io_error (error, name, 0, 0, "the .npy shape has an absurd size");
                      return FALSE;
                    }
                  v = v * 10 + (guint64) (*p++ - '0');
                }
              if (p == digits)
                goto malformed;
              if (p < end && *p == 'L')   /* Python 2 longs */
                p++;
              if (ndim < G_N_ELEMENTS (shape))
                shape[ndim] = v;
              ndim++;
              p = npy_skip_space (p, end);
              if (p < end && *p == ',')
                p++;
              else if (p < end && *p == ')')
                break;
              else
                goto malformed;
            }
          p++;
          have_shape = TRUE;
        }
      else
        {
          qv_io_error (error, name, 0, 0, "unexpected key '%s' in the .npy header", key);
          return FALSE;
        }
      p = npy_skip_space (p, end);
      if (p < end && *p == ',')
        p++;
      else if (p < end && *p == '}')
        break;
      else
        goto malformed;
    }
  if (!have_descr || !have_order || !have_shape)
    {
      qv_io_error (error, name, 0, 0, "the .npy header lacks '%s'",
                   !have_descr ? "descr" : !have_order ? "fortran_order" : "shape");
      return FALSE;
    }

  if (strcmp (descr, "<f8") == 0)
    h->big_endian = FALSE;
  else if (strcmp (descr, ">f8") == 0)
    h->big_endian = TRUE;
  else if (strcmp (descr, "=f8") == 0)
    h->big_endian = G_BYTE_ORDER == G_BIG_ENDIAN;   /* native */
  else
    {
      g_autofree char *shown = g_strescape (descr, NULL);

      qv_io_error (error, name, 0, 0, "the .npy array has dtype '%s', expected float64 "
                   "('<f8' or '>f8')", shown);
      return FALSE;
    }

  if (ndim != 2 || shape[0] != shape[1])
    {
      GString *s = g_string_new ("(");

      for (gsize i = 0; i < MIN (ndim, G_N_ELEMENTS (shape)); i++)
        g_string_append_printf (s, "%s%" G_GUINT64_FORMAT, i ? ", " : "", shape[i]);
      if (ndim > G_N_ELEMENTS (shape))
        g_string_append (s, ", …");
      if (ndim == 1)
        g_string_append_c (s, ',');
      g_string_append_c (s, ')');
      qv_io_error (error, name, 0, 0, "the .npy array has shape %s, expected a square "
                   "matrix (n, n)", s->str);
      g_string_free (s, TRUE);
      return FALSE;
    }
  if (shape[0] > G_MAXSIZE || shape[0] == 0
      || square_count ((gsize) shape[0]) > G_MAXSIZE / sizeof (double))
    {
      qv_io_error (error, name, 0, 0, "the .npy array has shape (%" G_GUINT64_FORMAT ", %"
                   G_GUINT64_FORMAT "), %s", shape[0], shape[1],
                   shape[0] == 0 ? "an empty matrix" : "too large to hold in memory");
      return FALSE;
    }
  h->dim = (gsize) shape[0];
  return TRUE;

truncated:
  qv_io_error (error, name, 0, 0, "the .npy file ends inside its header (%" G_GSIZE_FORMAT
               " bytes)", length);
  return FALSE;

malformed:
  {
    g_autofree char *at = npy_excerpt (p != NULL ? p : end, end);

    qv_io_error (error, name, 0, 0, "malformed .npy header near %s", at);
    return FALSE;
  }
}

static gboolean
npy_check_dimension (const NpyHeader *h, const char *name, gsize n, GError **error)
{
  g_autofree char *geometry = NULL;

  if (n == 0 || h->dim == n)
    return TRUE;
  geometry = geometry_words (n);
  qv_io_error (error, name, 0, 0, "has %" G_GSIZE_FORMAT " rows (.npy shape (%" G_GSIZE_FORMAT
               ", %" G_GSIZE_FORMAT ")), %s", h->dim, h->dim, h->dim, geometry);
  return FALSE;
}

/* Swaps bytes when needed and checks every element for NaN/inf. The data
 * are kept in file order: Fortran order is our column-major storage; C order
 * stores the transpose, which is harmless because the solver symmetrizes
 * first (see qv-hessian.h). Row and column in messages are the array's. */
static gboolean
npy_finish (QvHessian *hessian, const NpyHeader *h, const char *name, GError **error)
{
  gsize count = hessian->n * hessian->n;
  double *d = hessian->data;

  if (h->big_endian != (G_BYTE_ORDER == G_BIG_ENDIAN))
    {
      guint64 *u = (guint64 *) (void *) d;

      for (gsize i = 0; i < count; i++)
        u[i] = GUINT64_SWAP_LE_BE (u[i]);
    }
  for (gsize i = 0; i < count; i++)
    if (!isfinite (d[i]))
      {
        gsize row = h->fortran_order ? i % hessian->n : i / hessian->n;
        gsize col = h->fortran_order ? i / hessian->n : i % hessian->n;

        qv_io_error (error, name, 0, 0, "element (row %" G_GSIZE_FORMAT ", column %"
                     G_GSIZE_FORMAT ") of the .npy array is %s", row + 1, col + 1,
                     isnan (d[i]) ? "NaN" : "infinite");
        return FALSE;
      }
  hessian->layout = QV_HESSIAN_LAYOUT_NPY;
  hessian->transposed = !h->fortran_order;
  return TRUE;
}

static gboolean
npy_check_data_length (const NpyHeader *h, const char *name, gsize available, GError **error)
{
  gsize bytes = square_count (h->dim) * sizeof (double);

  if (available < bytes)
    {
      qv_io_error (error, name, 0, 0, "truncated .npy data: a %" G_GSIZE_FORMAT "×%"
                   G_GSIZE_FORMAT " float64 array needs %" G_GSIZE_FORMAT
                   " bytes after the header, the file has %" G_GSIZE_FORMAT,
                   h->dim, h->dim, bytes, available);
      return FALSE;
    }
  if (available > bytes)
    {
      qv_io_error (error, name, 0, 0, "%" G_GSIZE_FORMAT " unexpected bytes after the data "
                   "of the %" G_GSIZE_FORMAT "×%" G_GSIZE_FORMAT " .npy array",
                   available - bytes, h->dim, h->dim);
      return FALSE;
    }
  return TRUE;
}

QvHessian *
qv_hessian_read_npy (const char *data, gsize length, const char *name,
                     gsize n, GError **error)
{
  NpyHeader h = { 0 };
  QvHessian *hessian;

  g_return_val_if_fail (data != NULL || length == 0, NULL);
  if (name == NULL)
    name = "<hessian.npy>";
  if (data == NULL)
    data = "";
  if (!npy_parse_header (data, length, name, &h, error)
      || !npy_check_dimension (&h, name, n, error)
      || !npy_check_data_length (&h, name, length - h.data_offset, error))
    return NULL;
  hessian = new_matrix (h.dim, name, error);
  if (hessian == NULL)
    return NULL;
  memcpy (hessian->data, data + h.data_offset, h.dim * h.dim * sizeof (double));
  if (!npy_finish (hessian, &h, name, error))
    {
      qv_hessian_free (hessian);
      return NULL;
    }
  return hessian;
}

/* ------------------------------------------------------------------ */
/* Files                                                                */

/* Reads up to @count bytes; returns how many were read (short only at the
 * end of the file), or -1 with errno. */
static gssize
read_all (int fd, void *buffer, gsize count)
{
  gsize done = 0;

  while (done < count)
    {
      gsize want = MIN (count - done, (gsize) 1 << 30);
      ssize_t r = read (fd, (char *) buffer + done, want);

      if (r < 0 && errno == EINTR)
        continue;
      if (r < 0)
        return -1;
      if (r == 0)
        break;
      done += (gsize) r;
    }
  return (gssize) done;
}

/* Reads and checks the header of the .npy file open on @fd (at its start):
 * the dimension against @n (0: any) and the file's length against the data
 * the header promises. Leaves @fd just past the header. */
static gboolean
npy_probe_fd (int fd, const char *path, guint64 file_size, gsize n, NpyHeader *h,
              GError **error)
{
  char prefix[12];
  g_autofree char *header = NULL;
  gsize header_total, want;
  gssize got;

  got = read_all (fd, prefix, sizeof prefix);
  if (got < 0)
    goto read_failed;
  if ((gsize) got < sizeof prefix)
    {
      if (!npy_parse_header (prefix, (gsize) got, path, h, error))
        return FALSE;
      qv_io_error (error, path, 0, 0, "the .npy file ends inside its header");
      return FALSE;
    }
  /* Parse the prefix alone first to learn the header length. */
  if (prefix[6] == 1)
    header_total = 10 + ((guchar) prefix[8] | ((gsize) (guchar) prefix[9] << 8));
  else if (prefix[6] == 2 || prefix[6] == 3)
    header_total = 12 + ((guchar) prefix[8] | ((gsize) (guchar) prefix[9] << 8)
                         | ((gsize) (guchar) prefix[10] << 16)
                         | ((gsize) (guchar) prefix[11] << 24));
  else
    header_total = sizeof prefix;   /* npy_parse_header reports the version */
  if (header_total > NPY_MAX_HEADER + 12)
    header_total = sizeof prefix;   /* ... and the oversized header */
  want = MAX (header_total, sizeof prefix);
  if (file_size < want)
    want = (gsize) MAX (file_size, (guint64) sizeof prefix);
  header = g_malloc (want);
  memcpy (header, prefix, sizeof prefix);
  got = read_all (fd, header + sizeof prefix, want - sizeof prefix);
  if (got < 0)
    goto read_failed;
  if (!npy_parse_header (header, sizeof prefix + (gsize) got, path, h, error)
      || !npy_check_dimension (h, path, n, error))
    return FALSE;
  if (file_size < h->data_offset)
    file_size = h->data_offset;
  if (!npy_check_data_length (h, path, (gsize) MIN (file_size - h->data_offset,
                                                    (guint64) G_MAXSIZE), error))
    return FALSE;
  if (lseek (fd, (off_t) h->data_offset, SEEK_SET) != (off_t) h->data_offset)
    goto read_failed;
  return TRUE;

read_failed:
  qv_io_error (error, path, 0, 0, "cannot read: %s", g_strerror (errno));
  return FALSE;
}

/* Reads the .npy file open on @fd straight into the matrix: only the
 * header is held besides it. */
static QvHessian *
read_npy_fd (int fd, const char *path, guint64 file_size, gsize n, GError **error)
{
  NpyHeader h = { 0 };
  g_autoptr(QvHessian) hessian = NULL;
  gsize bytes;
  gssize got;
  char extra;

  if (!npy_probe_fd (fd, path, file_size, n, &h, error))
    return NULL;
  hessian = new_matrix (h.dim, path, error);
  if (hessian == NULL)
    return NULL;
  bytes = h.dim * h.dim * sizeof (double);
  got = read_all (fd, hessian->data, bytes);
  if (got < 0)
    goto read_failed;
  if ((gsize) got != bytes || read_all (fd, &extra, 1) != 0)
    {
      /* the file changed size while we read it */
      qv_io_error (error, path, 0, 0, "the .npy file changed while it was read");
      return NULL;
    }
  if (!npy_finish (hessian, &h, path, error))
    return NULL;
  return g_steal_pointer (&hessian);

read_failed:
  qv_io_error (error, path, 0, 0, "cannot read: %s", g_strerror (errno));
  return NULL;
}

/* Everything from a pipe or other non-regular file, into memory. */
static char *
read_all_memory (int fd, const char *path, gsize *length, GError **error)
{
  gsize capacity = 1 << 16, filled = 0;
  char *buffer = g_malloc (capacity);

  for (;;)
    {
      gssize got;

      if (filled == capacity)
        {
          if (capacity >= QV_HESSIAN_TEXT_MAX_BYTES)
            {
              g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                           "%s: more than the %" G_GSIZE_FORMAT " bytes this reader accepts",
                           path, QV_HESSIAN_TEXT_MAX_BYTES);
              g_free (buffer);
              return NULL;
            }
          capacity = MIN (capacity * 2, QV_HESSIAN_TEXT_MAX_BYTES);
          buffer = g_try_realloc (buffer, capacity);
          if (buffer == NULL)
            {
              set_no_memory (error, path, filled);
              return NULL;
            }
        }
      got = read_all (fd, buffer + filled, capacity - filled);
      if (got < 0)
        {
          qv_io_error (error, path, 0, 0, "cannot read: %s", g_strerror (errno));
          g_free (buffer);
          return NULL;
        }
      filled += (gsize) got;
      if (filled < capacity)
        break;
    }
  *length = filled;
  return buffer;
}

static gboolean
has_npy_magic (const char *data, gsize length)
{
  return length >= NPY_MAGIC_LEN && memcmp (data, NPY_MAGIC, NPY_MAGIC_LEN) == 0;
}

QvHessian *
qv_hessian_read_file (const char *path, gsize n, QvHessianLayout layout,
                      GError **error)
{
  char magic[NPY_MAGIC_LEN];
  struct stat st;
  gssize got;
  int fd;

  g_return_val_if_fail (path != NULL, NULL);
  if (layout == QV_HESSIAN_LAYOUT_NPY)
    layout = QV_HESSIAN_LAYOUT_AUTO;   /* told by the magic bytes anyway */

  fd = open (path, O_RDONLY | O_CLOEXEC);
  if (fd < 0)
    {
      qv_io_error (error, path, 0, 0, "cannot open: %s", g_strerror (errno));
      return NULL;
    }
  if (fstat (fd, &st) != 0)
    {
      qv_io_error (error, path, 0, 0, "cannot read: %s", g_strerror (errno));
      close (fd);
      return NULL;
    }
  if (S_ISDIR (st.st_mode))
    {
      qv_io_error (error, path, 0, 0, "is a directory, expected a file");
      close (fd);
      return NULL;
    }
  if (!S_ISREG (st.st_mode))
    {
      /* a pipe (say, process substitution): it can be read only once */
      gsize length = 0;
      g_autofree char *contents = read_all_memory (fd, path, &length, error);

      close (fd);
      if (contents == NULL)
        return NULL;
      if (has_npy_magic (contents, length))
        return qv_hessian_read_npy (contents, length, path, n, error);
      return qv_hessian_read_text (contents, length, path, n, layout, error);
    }

  got = read_all (fd, magic, sizeof magic);
  if (got < 0)
    {
      qv_io_error (error, path, 0, 0, "cannot read: %s", g_strerror (errno));
      close (fd);
      return NULL;
    }
  if (has_npy_magic (magic, (gsize) got))
    {
      QvHessian *hessian = NULL;

      if (lseek (fd, 0, SEEK_SET) != 0)
        qv_io_error (error, path, 0, 0, "cannot read: %s", g_strerror (errno));
      else
        hessian = read_npy_fd (fd, path, (guint64) st.st_size, n, error);
      close (fd);
      return hessian;
    }
  /* Text: streamed from the file, without holding all of it. */
  {
    GError *local = NULL;
    QvHessian *hessian = read_text_fd (fd, (guint64) st.st_size, path, n, layout, &local);

    close (fd);
    if (local != NULL)
      g_propagate_error (error, local);
    if (hessian != NULL || local != NULL)
      return hessian;
  }

  /* Something is wrong (or the file changed): read it into memory and parse
   * it with one thread, which tells where. */
  {
    g_autofree char *contents = NULL;
    gsize length = 0;
    Job job;

    if (!qv_io_read_file (path, QV_HESSIAN_TEXT_MAX_BYTES, &contents, &length, error))
      return NULL;
    job_init_memory (&job, contents, contents + length);
    return run_jobs (&job, 1, contents, length, path, length, n, layout, TRUE, error);
  }
}

gboolean
qv_hessian_probe_npy (const char *path, gsize n, QvNpyLayout *layout, GError **error)
{
  char magic[NPY_MAGIC_LEN];
  NpyHeader h = { 0 };
  struct stat st;
  gssize got;
  gboolean ok;
  int fd;

  fd = open (path, O_RDONLY | O_CLOEXEC);
  if (fd < 0)
    {
      qv_io_error (error, path, 0, 0, "cannot open: %s", g_strerror (errno));
      return FALSE;
    }
  if (fstat (fd, &st) != 0)
    {
      qv_io_error (error, path, 0, 0, "cannot read: %s", g_strerror (errno));
      close (fd);
      return FALSE;
    }
  if (!S_ISREG (st.st_mode))
    {
      qv_io_error (error, path, 0, 0, "%s", S_ISDIR (st.st_mode) ? "is a directory, expected a file"
                   : "is not a regular file; the ranks read their blocks at their own offsets");
      close (fd);
      return FALSE;
    }
  got = read_all (fd, magic, sizeof magic);
  if (got < 0 || !has_npy_magic (magic, (gsize) got))
    {
      if (got < 0)
        qv_io_error (error, path, 0, 0, "cannot read: %s", g_strerror (errno));
      else
        qv_io_error (error, path, 0, 0, "is not a NumPy .npy file; a text Hessian is converted "
                     "once with 'quaver convert %s -o FILE.npy'", path);
      close (fd);
      return FALSE;
    }
  ok = lseek (fd, 0, SEEK_SET) == 0 && npy_probe_fd (fd, path, (guint64) st.st_size, n, &h, error);
  close (fd);
  if (!ok)
    return FALSE;
  layout->data_offset = h.data_offset;
  layout->dim = h.dim;
  layout->big_endian = h.big_endian;
  layout->fortran_order = h.fortran_order;
  return TRUE;
}
