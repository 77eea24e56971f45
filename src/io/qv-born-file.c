/* qv-born-file.c — Born charges and ε∞ as text.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-born-file.h"
#include "qv-io-error.h"

void
qv_born_charges_free (QvBornCharges *born)
{
  if (born == NULL)
    return;
  g_free (born->born);
  g_free (born);
}

enum { NONE, DIELECTRIC, BORN };

QvBornCharges *
qv_born_charges_read_data (const char *data, gsize length, const char *name, GError **error)
{
  g_autoptr(GArray) eps = g_array_new (FALSE, FALSE, sizeof (double));
  g_autoptr(GArray) z = g_array_new (FALSE, FALSE, sizeof (double));
  gboolean seen[3] = { FALSE, FALSE, FALSE };
  gsize line = 1, pos = 0, section_line[3] = { 0, 0, 0 };
  int section = NONE;
  QvBornCharges *out;

  while (pos < length)
    {
      gsize start = pos, end, col;
      g_autofree char *text = NULL;
      char *p;
      while (pos < length && data[pos] != '\n')
        pos++;
      end = pos;
      if (pos < length)
        pos++;
      text = g_strndup (data + start, end - start);
      if ((p = strchr (text, '#')))
        *p = '\0';
      p = text;
      for (;;)
        {
          char *word_end;
          while (*p == ' ' || *p == '\t' || *p == '\r' || *p == ',')
            p++;
          if (*p == '\0')
            break;
          col = (gsize) (p - text) + 1;
          word_end = p;
          while (*word_end && *word_end != ' ' && *word_end != '\t' && *word_end != '\r'
                 && *word_end != ',')
            word_end++;
          if (g_ascii_isalpha (*p))
            {
              g_autofree char *word = g_strndup (p, (gsize) (word_end - p));
              int s = g_ascii_strcasecmp (word, "dielectric") == 0 ? DIELECTRIC
                      : g_ascii_strcasecmp (word, "born") == 0 ? BORN : NONE;
              if (s == NONE)
                {
                  qv_io_error (error, name, line, col,
                               "unknown word '%s': sections are 'dielectric' (9 numbers) and "
                               "'born' (9 per atom)", word);
                  return NULL;
                }
              if (seen[s])
                {
                  qv_io_error (error, name, line, col, "'%s' given a second time (first on line %"
                               G_GSIZE_FORMAT ")", word, section_line[s]);
                  return NULL;
                }
              seen[s] = TRUE;
              section_line[s] = line;
              section = s;
            }
          else
            {
              char *num_end;
              double v = g_ascii_strtod (p, &num_end);
              if (num_end != word_end || !isfinite (v))
                {
                  qv_io_error (error, name, line, col, "expected a number, got '%.*s'",
                               (int) MIN (word_end - p, 40), p);
                  return NULL;
                }
              if (section == NONE)
                {
                  qv_io_error (error, name, line, col,
                               "a number before any section: start with 'dielectric' or 'born'");
                  return NULL;
                }
              if (section == DIELECTRIC && eps->len == 9)
                {
                  qv_io_error (error, name, line, col,
                               "the dielectric tensor has 9 numbers; this is a tenth");
                  return NULL;
                }
              if (section == BORN && z->len >= 9 * 100000)
                {
                  qv_io_error (error, name, line, col, "more than 100000 atoms of Born charges");
                  return NULL;
                }
              g_array_append_val (section == DIELECTRIC ? eps : z, v);
            }
          p = word_end;
        }
      line++;
    }
  if (!seen[DIELECTRIC] || eps->len != 9)
    {
      qv_io_error (error, name, seen[DIELECTRIC] ? section_line[DIELECTRIC] : 0, 0,
                   seen[DIELECTRIC] ? "the dielectric tensor needs 9 numbers, got %u"
                                    : "no 'dielectric' section (9 numbers of epsilon_inf)%.0u",
                   eps->len);
      return NULL;
    }
  if (!seen[BORN] || z->len == 0 || z->len % 9 != 0)
    {
      qv_io_error (error, name, seen[BORN] ? section_line[BORN] : 0, 0,
                   seen[BORN] ? "the Born section needs 9 numbers per atom, got %u"
                              : "no 'born' section (9 numbers per primitive atom)%.0u",
                   z->len);
      return NULL;
    }
  out = g_new0 (QvBornCharges, 1);
  memcpy (out->epsilon, eps->data, 9 * sizeof (double));
  out->n_atoms = z->len / 9;
  out->born = g_memdup2 (z->data, z->len * sizeof (double));
  return out;
}

QvBornCharges *
qv_born_charges_read_file (const char *path, GError **error)
{
  g_autofree char *contents = NULL;
  gsize length;
  if (!qv_io_read_file (path, 64 << 20, &contents, &length, error))
    return NULL;
  return qv_born_charges_read_data (contents, length, path, error);
}
