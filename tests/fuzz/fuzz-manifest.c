/* fuzz-manifest.c — manifest.json (qv_manifest_read_data), the strict
 * reader of an export's record. A manifest that is read must also be
 * written again (qv_manifest_to_json) and read back to an equal document.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <string.h>
#include "qv-fuzz.h"
#include "qv-manifest.h"

gboolean
qv_fuzz_read (const guint8 *data, gsize size)
{
  GError *error = NULL;
  QvManifest *manifest = qv_manifest_read_data ((const char *) data, size, QV_FUZZ_NAME, &error);
  QvManifest *again;
  char *json, *json_again;

  qv_fuzz_check_failure ("manifest", manifest == NULL, error, QV_FUZZ_NAME);
  if (manifest == NULL)
    return FALSE;
  json = qv_manifest_to_json (manifest);
  qv_fuzz_assert ("manifest", g_utf8_validate (json, -1, NULL), "written as invalid UTF-8");
  again = qv_manifest_read_data (json, strlen (json), "rewritten", &error);
  if (again == NULL)
    qv_fuzz_fail ("manifest", "its own output is refused: %s\n%s", error->message, json);
  json_again = qv_manifest_to_json (again);
  if (strcmp (json, json_again) != 0)
    qv_fuzz_fail ("manifest", "written twice differently:\n%s\n---\n%s", json, json_again);
  g_free (json);
  g_free (json_again);
  qv_manifest_free (again);
  qv_manifest_free (manifest);
  return TRUE;
}
