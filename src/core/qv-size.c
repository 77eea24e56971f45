/* qv-size.c
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <string.h>
#include <unistd.h>
#include "qv-config.h"
#include "qv-error.h"
#include "qv-size.h"

gboolean
qv_size_mul (gsize a, gsize b, gsize *out)
{
  if (!g_size_checked_mul (out, a, b))
    {
      *out = G_MAXSIZE;
      return FALSE;
    }
  return TRUE;
}

gboolean
qv_size_mul3 (gsize a, gsize b, gsize c, gsize *out)
{
  gsize ab;
  return qv_size_mul (a, b, &ab) && qv_size_mul (ab, c, out) ? TRUE : (*out = G_MAXSIZE, FALSE);
}

guint64
qv_size_physical_memory (void)
{
  long pages, page_size;

#ifdef QV_TEST_HOOKS
  {
    const char *fake = g_getenv (QV_SIZE_MEMORY_ENV);
    if (fake != NULL && *fake != '\0')
      return g_ascii_strtoull (fake, NULL, 10);
  }
#endif
  pages = sysconf (_SC_PHYS_PAGES);
  page_size = sysconf (_SC_PAGESIZE);
  if (pages <= 0 || page_size <= 0)
    return 0;
  if ((guint64) pages > G_MAXUINT64 / (guint64) page_size)
    return G_MAXUINT64;
  return (guint64) pages * (guint64) page_size;
}


/* "107.3 GiB" in binary units, with a plain space (GLib puts a no-break
 * space between number and unit, awkward to grep for in a terminal). */
static char *
format_bytes (guint64 bytes)
{
  char *text = g_format_size_full (bytes, G_FORMAT_SIZE_IEC_UNITS);
  char *nbsp;

  while ((nbsp = strstr (text, "\xc2\xa0")) != NULL)
    memmove (nbsp + 1, nbsp + 2, strlen (nbsp + 2) + 1), *nbsp = ' ';
  return text;
}

gboolean
qv_size_check_memory (guint64 bytes, const char *what, GError **error)
{
  const guint64 have = qv_size_physical_memory ();
  g_autofree char *need_text = NULL, *have_text = NULL;

  if (have == 0 || bytes <= have)
    return TRUE;
  need_text = format_bytes (bytes);
  have_text = format_bytes (have);
  g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
               "too large for this machine: %s needs %s (this machine has %s)",
               what, need_text, have_text);
  return FALSE;
}

gboolean
qv_size_check_matrix (gsize n, guint64 extra_bytes, const char *what, GError **error)
{
  gsize bytes;

  if (!qv_size_mul3 (n, n, sizeof (double), &bytes) || bytes > G_MAXUINT64 - extra_bytes)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                   "too large for any machine: %s of %" G_GSIZE_FORMAT " rows cannot even be "
                   "counted in bytes", what, n);
      return FALSE;
    }
  return qv_size_check_memory ((guint64) bytes + extra_bytes, what, error);
}
