/* qv-npy-writer.c — the NumPy .npy format 1.0 for float64 arrays (the
 * format's specification, numpy.lib.format).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <string.h>
#include "qv-npy-writer.h"

char *
qv_npy_format (const double *data, gsize rows, gsize cols, gsize row_stride, gsize col_stride,
               gsize *length)
{
  g_autofree char *dict = cols == 0
    ? g_strdup_printf ("{'descr': '<f8', 'fortran_order': False, 'shape': (%" G_GSIZE_FORMAT ",), }", rows)
    : g_strdup_printf ("{'descr': '<f8', 'fortran_order': False, 'shape': (%" G_GSIZE_FORMAT ", %"
                       G_GSIZE_FORMAT "), }", rows, cols);
  const gsize width = MAX (cols, 1);
  /* magic (6) + version (2) + header length (2) + header, a multiple of 64 */
  const gsize unpadded = 10 + strlen (dict) + 1;
  const gsize total_header = (unpadded + 63) / 64 * 64;
  const gsize header_len = total_header - 10;
  const gsize size = total_header + rows * width * sizeof (double);
  char *out, *p;
  guint64 *values;

  g_return_val_if_fail (header_len <= G_MAXUINT16, NULL);
  out = g_malloc (size);
  memcpy (out, "\x93NUMPY\x01\x00", 8);
  out[8] = (char) (header_len & 0xff);
  out[9] = (char) (header_len >> 8);
  p = out + 10;
  memcpy (p, dict, strlen (dict));
  memset (p + strlen (dict), ' ', header_len - strlen (dict) - 1);
  p[header_len - 1] = '\n';
  values = (guint64 *) (void *) (out + total_header);
  if (G_BYTE_ORDER == G_LITTLE_ENDIAN && (cols == 0 ? row_stride == 1
                                          : col_stride == 1 && row_stride == cols))
    memcpy (values, data, rows * width * sizeof (double));
  else
    for (gsize i = 0; i < rows; i++)
      for (gsize j = 0; j < width; j++)
        {
          guint64 bits;

          memcpy (&bits, &data[i * row_stride + (cols == 0 ? 0 : j * col_stride)], sizeof bits);
          bits = GUINT64_TO_LE (bits);
          memcpy (&values[i * width + j], &bits, sizeof bits);
        }
  if (length)
    *length = size;
  return out;
}
