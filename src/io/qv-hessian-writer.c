/* qv-hessian-writer.c — text and .npy Hessian writers (NumPy format
 * description: numpy.lib.format, "A simple file format for NumPy arrays",
 * NEP 1).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <string.h>
#include "qv-hessian-writer.h"
#include "qv-npy-writer.h"
#include "qv-json-writer.h"
#include "qv-output.h"

QvHessianWriteFormat
qv_hessian_write_format_for (const char *path)
{
  const gsize len = strlen (path);
  return len >= 4 && g_ascii_strcasecmp (path + len - 4, ".npy") == 0
         ? QV_HESSIAN_WRITE_NPY : QV_HESSIAN_WRITE_TEXT;
}

char *
qv_hessian_format_text (const QvHessian *h, const char *comment, gsize *length)
{
  const gsize n = h->n;
  GString *out = g_string_sized_new (n * n * 24 + 256);
  char buf[G_ASCII_DTOSTR_BUF_SIZE];

  if (comment)
    {
      g_auto(GStrv) lines = g_strsplit (comment, "\n", -1);
      for (char **l = lines; *l; l++)
        g_string_append_printf (out, "# %s\n", *l);
    }
  for (gsize i = 0; i < n; i++)
    {
      for (gsize j = 0; j < n; j++)
        {
          if (j)
            g_string_append_c (out, ' ');
          /* Column-major storage: element (i, j) is data[j n + i] (data[i n
           * + j] when the reader kept a row-major source as it came). */
          g_string_append (out, qv_json_format_double (buf, h->transposed ? h->data[i * n + j]
                                                                         : h->data[j * n + i]));
        }
      g_string_append_c (out, '\n');
    }
  if (length)
    *length = out->len;
  return g_string_free (out, FALSE);
}

char *
qv_hessian_format_npy (const QvHessian *h, gsize *length)
{
  /* Row i, column j in C order: element (i, j) of the column-major matrix,
   * or, when the reader kept a row-major source as it came, the storage as
   * it is. */
  return h->transposed ? qv_npy_format (h->data, h->n, h->n, h->n, 1, length)
                       : qv_npy_format (h->data, h->n, h->n, 1, h->n, length);
}

gboolean
qv_hessian_write_file (const char *path, const QvHessian *h, QvHessianWriteFormat format,
                       const char *comment, gboolean force, GError **error)
{
  gsize length = 0;
  g_autofree char *contents = format == QV_HESSIAN_WRITE_NPY
                              ? qv_hessian_format_npy (h, &length)
                              : qv_hessian_format_text (h, comment, &length);
  return qv_output_write (path, contents, length, force, error);
}
