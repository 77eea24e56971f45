/* qv-tensor-file.c — derivative tensors as rows of numbers.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-io-error.h"
#include "qv-tensor-file.h"

static gboolean
is_space (char c)
{
  return c == ' ' || c == '\t' || c == '\r' || c == ',' || c == '\f' || c == '\v';
}

static char *
counts_text (const gsize *row_counts)
{
  GString *s = g_string_new (NULL);
  for (gsize i = 0; row_counts[i] != 0; i++)
    g_string_append_printf (s, "%s%" G_GSIZE_FORMAT,
                            i == 0 ? "" : row_counts[i + 1] == 0 ? " or " : ", ", row_counts[i]);
  return g_string_free (s, FALSE);
}

/* One number of @len bytes at @t: FALSE with a message when it is not a
 * finite decimal number. */
static gboolean
parse_number (const char *t, gsize len, const char *name, gsize line, gsize column, double *out,
              GError **error)
{
  g_autofree char *word = g_strndup (t, len);
  char *end = NULL;

  const char *body;
  double v = 0.0;

  for (char *p = word; *p; p++)
    if (*p == 'd' || *p == 'D')
      *p = 'e';                 /* Fortran exponent */
  body = word + (word[0] == '-' || word[0] == '+');
  if (g_ascii_strncasecmp (body, "nan", 3) == 0 || g_ascii_strncasecmp (body, "inf", 3) == 0)
    {
      qv_io_error (error, name, line, column, "\"%.*s\": NaN and infinity are not accepted; "
                   "every derivative must be a finite number", (int) MIN (len, 40), t);
      return FALSE;
    }
  if (g_ascii_strncasecmp (body, "0x", 2) == 0)
    end = word;                 /* hexadecimal: refused below */
  else
    v = g_ascii_strtod (word, &end);
  if (end == word || *end != '\0')
    {
      qv_io_error (error, name, line, column, "\"%.*s\" is not a number", (int) MIN (len, 40), t);
      return FALSE;
    }
  if (!isfinite (v))
    {
      qv_io_error (error, name, line, column, "\"%.*s\" is beyond the range of a double",
                   (int) MIN (len, 40), t);
      return FALSE;
    }
  *out = v;
  return TRUE;
}

double *
qv_tensor_read_text (const char *data, gsize length, const char *name, gsize n_atoms,
                     const gsize *row_counts, const char *what, gsize *n_rows, GError **error)
{
  const gsize n = 3 * n_atoms;
  gsize max_rows = 0, rows = 0, line = 0, last_line = 0;
  g_autofree double *values = NULL;
  g_autofree char *counts = counts_text (row_counts);
  const char *p = data, *stop = data + length;

  for (gsize i = 0; row_counts[i] != 0; i++)
    max_rows = MAX (max_rows, row_counts[i]);
  values = g_new (double, max_rows * MAX (n, 1));
  while (p < stop)
    {
      const char *eol = memchr (p, '\n', (gsize) (stop - p));
      const char *end = eol ? eol : stop;
      const char *comment = memchr (p, '#', (gsize) (end - p));
      const char *t = p;
      gsize count = 0;

      line++;
      if (comment)
        end = comment;
      while (t < end)
        {
          const char *w;
          while (t < end && is_space (*t))
            t++;
          if (t >= end)
            break;
          w = t;
          while (t < end && !is_space (*t))
            t++;
          if (count == 0 && rows == max_rows)
            {
              qv_io_error (error, name, line, (gsize) (w - p) + 1,
                           "more than %" G_GSIZE_FORMAT " rows; %s have %s rows of 3N = %"
                           G_GSIZE_FORMAT " numbers (%" G_GSIZE_FORMAT " atoms)", max_rows, what,
                           counts, n, n_atoms);
              return NULL;
            }
          if (count == n)
            {
              qv_io_error (error, name, line, (gsize) (w - p) + 1,
                           "more than 3N = %" G_GSIZE_FORMAT " numbers on this row (%"
                           G_GSIZE_FORMAT " atoms); put each of the %s rows of %s on a line of "
                           "its own", n, n_atoms, counts, what);
              return NULL;
            }
          if (!parse_number (w, (gsize) (t - w), name, line, (gsize) (w - p) + 1,
                             &values[rows * n + count], error))
            return NULL;
          count++;
        }
      if (count > 0 && count < n)
        {
          qv_io_error (error, name, line, 0, "expected 3N = %" G_GSIZE_FORMAT " numbers on this "
                       "row (%" G_GSIZE_FORMAT " atoms), found %" G_GSIZE_FORMAT, n, n_atoms, count);
          return NULL;
        }
      if (count == n)
        {
          rows++;
          last_line = line;
        }
      p = eol ? eol + 1 : stop;
    }
  for (gsize i = 0; row_counts[i] != 0; i++)
    if (rows == row_counts[i])
      {
        *n_rows = rows;
        return g_steal_pointer (&values);
      }
  qv_io_error (error, name, rows ? last_line : 0, 0,
               "found %" G_GSIZE_FORMAT " rows; %s need %s rows of 3N = %" G_GSIZE_FORMAT
               " numbers (%" G_GSIZE_FORMAT " atoms)", rows, what, counts, n, n_atoms);
  return NULL;
}

double *
qv_tensor_read_file (const char *path, gsize n_atoms, const gsize *row_counts, const char *what,
                     gsize *n_rows, GError **error)
{
  g_autofree char *contents = NULL;
  gsize length = 0;

  if (!qv_io_read_file (path, QV_TENSOR_FILE_MAX_BYTES, &contents, &length, error))
    return NULL;
  return qv_tensor_read_text (contents, length, path, n_atoms, row_counts, what, n_rows, error);
}
