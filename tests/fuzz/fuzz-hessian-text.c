/* fuzz-hessian-text.c — the text Hessian reader, in memory
 * (qv_hessian_read_text) and streamed from a file (qv_hessian_read_file),
 * with every layout. Both paths must agree: the same matrix, or the same
 * message. (The fuzz build makes the two-thread split and the stream buffer
 * 64 bytes, so small inputs reach them.)
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-fuzz.h"
#include "qv-hessian-file.h"

static void
check_matrix (const QvHessian *h)
{
  qv_fuzz_assert ("hessian-text", h->n > 0, "an empty matrix");
  for (gsize i = 0; i < h->n * h->n; i++)
    qv_fuzz_assert ("hessian-text", isfinite (h->data[i]), "an element not finite");
}

gboolean
qv_fuzz_read (const guint8 *data, gsize size)
{
  static const QvHessianLayout layouts[] = {
    QV_HESSIAN_LAYOUT_AUTO, QV_HESSIAN_LAYOUT_FULL, QV_HESSIAN_LAYOUT_LOWER,
    QV_HESSIAN_LAYOUT_UPPER,
  };
  g_autofree char *path = g_build_filename (qv_fuzz_folder (), "hessian.txt", NULL);
  gboolean any = FALSE;

  /* .npy has its own target; the file reader would take it as one */
  if (size >= 6 && memcmp (data, "\x93NUMPY", 6) == 0)
    return FALSE;
  qv_fuzz_write (path, data, size);
  for (guint k = 0; k < G_N_ELEMENTS (layouts); k++)
    {
      GError *error_text = NULL, *error_file = NULL;
      QvHessian *text = qv_hessian_read_text ((const char *) data, size, path, 0,
                                              layouts[k], &error_text);
      QvHessian *file = qv_hessian_read_file (path, 0, layouts[k], &error_file);

      qv_fuzz_assert ("hessian-text", (text == NULL) == (file == NULL),
                      "the text and the file reader disagree on success");
      if (text != NULL)
        {
          check_matrix (text);
          qv_fuzz_assert ("hessian-text", text->n == file->n, "different sizes");
          qv_fuzz_assert ("hessian-text", text->layout == file->layout, "different layouts");
          qv_fuzz_assert ("hessian-text",
                          memcmp (text->data, file->data, text->n * text->n * sizeof (double)) == 0,
                          "different matrices");
          if (layouts[k] != QV_HESSIAN_LAYOUT_AUTO)
            qv_fuzz_assert ("hessian-text", text->layout == layouts[k], "another layout used");
          /* with the size known, the same text reads the same */
          {
            GError *error = NULL;
            QvHessian *again = qv_hessian_read_text ((const char *) data, size, path, text->n,
                                                     layouts[k], &error);

            qv_fuzz_check_failure ("hessian-text", again == NULL, error, path);
            qv_fuzz_assert ("hessian-text", again != NULL, "refused with its own size");
            qv_fuzz_assert ("hessian-text",
                            memcmp (text->data, again->data,
                                    text->n * text->n * sizeof (double)) == 0,
                            "different matrix with the size given");
            qv_hessian_free (again);
          }
          any = TRUE;
        }
      else
        {
          qv_fuzz_assert ("hessian-text", error_text != NULL && error_file != NULL,
                          "failed without an error");
          if (strcmp (error_text->message, error_file->message) != 0)
            qv_fuzz_fail ("hessian-text", "different messages:\n  text: %s\n  file: %s",
                          error_text->message, error_file->message);
        }
      qv_fuzz_check_failure ("hessian-text", text == NULL, error_text, path);
      qv_fuzz_check_failure ("hessian-text", file == NULL, error_file, path);
      qv_hessian_free (text);
      qv_hessian_free (file);
    }
  /* a wrong expected size is an error, never a crash */
  {
    GError *error = NULL;
    QvHessian *h = qv_hessian_read_text ((const char *) data, size, path, 6,
                                         QV_HESSIAN_LAYOUT_AUTO, &error);

    qv_fuzz_check_failure ("hessian-text", h == NULL, error, path);
    if (h != NULL)
      check_matrix (h);
    qv_hessian_free (h);
  }
  return any;
}
