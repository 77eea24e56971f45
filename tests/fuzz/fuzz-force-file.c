/* fuzz-force-file.c — plain force files (qv_force_file_read_data), with
 * the atom count a caller would pass: 1 to 4, and the number of lines.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include "qv-fuzz.h"
#include "qv-force-file.h"

static gboolean
read_once (const guint8 *data, gsize size, gsize n_atoms)
{
  GError *error = NULL;
  double *forces = qv_force_file_read_data ((const char *) data, size, QV_FUZZ_NAME,
                                            n_atoms, &error);

  qv_fuzz_check_failure ("force-file", forces == NULL, error, QV_FUZZ_NAME);
  if (forces == NULL)
    return FALSE;
  for (gsize i = 0; i < 3 * n_atoms; i++)
    qv_fuzz_assert ("force-file", isfinite (forces[i]), "a force not finite");
  g_free (forces);
  return TRUE;
}

gboolean
qv_fuzz_read (const guint8 *data, gsize size)
{
  gsize lines = 0;
  gboolean any = FALSE;

  for (gsize i = 0; i < size; i++)
    lines += data[i] == '\n';
  for (gsize n = 1; n <= 4; n++)
    any |= read_once (data, size, n);
  if (lines > 4 && lines < 100000)
    any |= read_once (data, size, lines);
  return any;
}
