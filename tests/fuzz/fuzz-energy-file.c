/* fuzz-energy-file.c — energy files, "NAME ENERGY" lines
 * (qv_energy_file_read_data), and matching them to the structures of an
 * export (qv_energy_file_match): the file's own names, in reverse order and
 * each with ".xyz" added, must match; a name it does not have must not.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include "qv-fuzz.h"
#include "qv-energy-file.h"

gboolean
qv_fuzz_read (const guint8 *data, gsize size)
{
  GError *error = NULL;
  QvEnergyFile *file = qv_energy_file_read_data ((const char *) data, size, QV_FUZZ_NAME,
                                                 &error);
  gsize n;
  const char **names;
  char **with_extension;
  double *values;

  qv_fuzz_check_failure ("energy-file", file == NULL, error, QV_FUZZ_NAME);
  if (file == NULL)
    return FALSE;
  n = file->entries->len;
  qv_fuzz_assert ("energy-file", n > 0, "a file without entries");
  qv_fuzz_assert ("energy-file", g_hash_table_size (file->by_name) == n, "names not distinct");
  names = g_new0 (const char *, n + 1);
  with_extension = g_new0 (char *, n + 1);
  values = g_new0 (double, n + 1);
  for (gsize i = 0; i < n; i++)
    {
      const QvEnergyEntry *e = file->entries->pdata[n - 1 - i];

      qv_fuzz_assert ("energy-file", isfinite (e->value), "an energy not finite");
      qv_fuzz_assert ("energy-file", e->line >= 1, "no line");
      names[i] = e->name;
      with_extension[i] = g_strconcat (e->name, ".xyz", NULL);
    }
  if (!qv_energy_file_match (file, names, n, values, &error))
    qv_fuzz_fail ("energy-file", "its own names do not match: %s", error->message);
  for (gsize i = 0; i < n; i++)
    qv_fuzz_assert ("energy-file",
                    values[i] == ((const QvEnergyEntry *) file->entries->pdata[n - 1 - i])->value,
                    "matched to another energy");
  /* "NAME.xyz" matches the entry NAME, unless another entry is "NAME.xyz" itself */
  if (qv_energy_file_match (file, (const char *const *) with_extension, n, values, &error))
    for (gsize i = 0; i < n; i++)
      qv_fuzz_assert ("energy-file", isfinite (values[i]), "an energy not finite");
  else
    qv_fuzz_check_failure ("energy-file", TRUE, error, QV_FUZZ_NAME);
  error = NULL;
  names[n] = "no such structure \xe2\x80\x94 invented";
  qv_fuzz_assert ("energy-file", !qv_energy_file_match (file, names, n + 1, values, &error),
                  "a name the file does not have was matched");
  qv_fuzz_check_failure ("energy-file", TRUE, error, QV_FUZZ_NAME);
  g_strfreev (with_extension);
  g_free (names);
  g_free (values);
  qv_energy_file_free (file);
  return TRUE;
}
