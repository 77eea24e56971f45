/* fuzz-tensor-file.c — derivative tensors as text (qv_tensor_read_text):
 * dipole derivatives (3 rows) and polarisability derivatives (6 or 9
 * rows), for 1 to 4 atoms.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include "qv-fuzz.h"
#include "qv-tensor-file.h"

static gboolean
read_once (const guint8 *data, gsize size, gsize n_atoms, const gsize *rows, const char *what)
{
  GError *error = NULL;
  gsize n_rows = 0;
  double *values = qv_tensor_read_text ((const char *) data, size, QV_FUZZ_NAME, n_atoms,
                                        rows, what, &n_rows, &error);
  gboolean allowed = FALSE;

  qv_fuzz_check_failure ("tensor-file", values == NULL, error, QV_FUZZ_NAME);
  if (values == NULL)
    return FALSE;
  for (const gsize *r = rows; *r != 0; r++)
    allowed |= *r == n_rows;
  qv_fuzz_assert ("tensor-file", allowed, "a row count that was not asked for");
  for (gsize i = 0; i < n_rows * 3 * n_atoms; i++)
    qv_fuzz_assert ("tensor-file", isfinite (values[i]), "a value not finite");
  g_free (values);
  return TRUE;
}

gboolean
qv_fuzz_read (const guint8 *data, gsize size)
{
  static const gsize dipole[] = { 3, 0 };
  static const gsize polarizability[] = { 6, 9, 0 };
  gboolean any = FALSE;

  for (gsize n = 1; n <= 4; n++)
    {
      any |= read_once (data, size, n, dipole, "dipole derivatives");
      any |= read_once (data, size, n, polarizability, "polarizability derivatives");
    }
  return any;
}
