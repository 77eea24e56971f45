/* qv-hessian-writer.c — text and .npy Hessian writers (NumPy format
 * description: numpy.lib.format, "A simple file format for NumPy arrays",
 * NEP 1).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <string.h>
#include "qv-hessian-writer.h"
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
  const gsize n = h->n;
  g_autofree char *dict = g_strdup_printf (
    "{'descr': '<f8', 'fortran_order': False, 'shape': (%" G_GSIZE_FORMAT ", %" G_GSIZE_FORMAT "), }",
    n, n);
  /* magic (6) + version (2) + header length (2) + header, a multiple of 64. */
  const gsize unpadded = 10 + strlen (dict) + 1;
  const gsize total_header = (unpadded + 63) / 64 * 64;
  const gsize header_len = total_header - 10;
  const gsize size = total_header + n * n * sizeof (double);
  char *out, *p;
  guint64 *data;

  g_return_val_if_fail (header_len <= G_MAXUINT16, NULL);
  out = g_malloc (size);
  memcpy (out, "\x93NUMPY\x01\x00", 8);
  out[8] = (char) (header_len & 0xff);
  out[9] = (char) (header_len >> 8);
  p = out + 10;
  memcpy (p, dict, strlen (dict));
  memset (p + strlen (dict), ' ', header_len - strlen (dict) - 1);
  p[header_len - 1] = '\n';
  data = (guint64 *) (void *) (out + total_header);
  /* Row i, column j in C order: element (i, j) of the column-major matrix,
   * or, when the reader kept a row-major source as it came, the storage as
   * it is. */
  if (h->transposed && G_BYTE_ORDER == G_LITTLE_ENDIAN)
    memcpy (data, h->data, n * n * sizeof (double));
  else
    for (gsize i = 0; i < n; i++)
      for (gsize j = 0; j < n; j++)
        {
          guint64 bits;
          memcpy (&bits, h->transposed ? &h->data[i * n + j] : &h->data[j * n + i], sizeof bits);
          bits = GUINT64_TO_LE (bits);
          memcpy (&data[i * n + j], &bits, sizeof bits);
        }
  if (length)
    *length = size;
  return out;
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
