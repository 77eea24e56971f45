/* fuzz-npy.c — NumPy .npy Hessians, in memory (qv_hessian_read_npy) and
 * from a file (qv_hessian_read_file reads the header, then the data
 * straight into the matrix). Both must agree.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-fuzz.h"
#include "qv-hessian-file.h"

gboolean
qv_fuzz_read (const guint8 *data, gsize size)
{
  g_autofree char *path = g_build_filename (qv_fuzz_folder (), "hessian.npy", NULL);
  GError *error_memory = NULL, *error_file = NULL;
  QvHessian *memory, *file;
  gboolean magic = size >= 6 && memcmp (data, "\x93NUMPY", 6) == 0;

  qv_fuzz_write (path, data, size);
  memory = qv_hessian_read_npy ((const char *) data, size, path, 0, &error_memory);
  file = magic ? qv_hessian_read_file (path, 0, QV_HESSIAN_LAYOUT_NPY, &error_file) : NULL;
  if (magic)
    {
      qv_fuzz_assert ("npy", (memory == NULL) == (file == NULL),
                      "memory and file readers disagree on success");
      if (memory != NULL)
        {
          qv_fuzz_assert ("npy", memory->n == file->n, "different sizes");
          qv_fuzz_assert ("npy",
                          memcmp (memory->data, file->data,
                                  memory->n * memory->n * sizeof (double)) == 0,
                          "different matrices");
        }
      else if (strcmp (error_memory->message, error_file->message) != 0)
        qv_fuzz_fail ("npy", "different messages:\n  memory: %s\n  file: %s",
                      error_memory->message, error_file->message);
      qv_fuzz_check_failure ("npy", file == NULL, error_file, path);
    }
  qv_fuzz_check_failure ("npy", memory == NULL, error_memory, path);
  if (memory != NULL)
    {
      qv_fuzz_assert ("npy", memory->n > 0, "an empty matrix");
      for (gsize i = 0; i < memory->n * memory->n; i++)
        qv_fuzz_assert ("npy", isfinite (memory->data[i]), "an element not finite");
      /* the size given must be checked against the header */
      {
        GError *error = NULL;
        QvHessian *wrong = qv_hessian_read_npy ((const char *) data, size, path,
                                                memory->n + 3, &error);

        qv_fuzz_assert ("npy", wrong == NULL, "accepted with another size");
        qv_fuzz_check_failure ("npy", TRUE, error, path);
      }
    }
  {
    gboolean read = memory != NULL;

    qv_hessian_free (memory);
    qv_hessian_free (file);
    return read;
  }
}
