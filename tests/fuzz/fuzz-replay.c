/* fuzz-replay.c — reads the committed inputs of one fuzz target through its
 * harness, without libFuzzer (every build with tests).
 *
 *   fuzz-replay-READER [--accept DIR]… [--reject DIR]… [--any DIR]…
 *
 * --accept: every file must be read; --reject: every file must fail with a
 * proper error (the crash regressions: each once crashed, hung or leaked;
 * a file whose name contains ".ok." was a valid input and must be read);
 * --any: either, as long as the contract holds (the seed corpus). A broken
 * contract aborts; a wrong outcome is reported and the exit status is 1.
 * A missing folder counts as empty.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdio.h>
#include <string.h>
#include "qv-fuzz.h"

typedef enum { WANT_ACCEPT, WANT_REJECT, WANT_ANY } Want;

static gint
compare_names (gconstpointer a, gconstpointer b)
{
  return strcmp (*(char *const *) a, *(char *const *) b);
}

static int
replay (const char *folder, Want want, guint *count)
{
  g_autoptr(GDir) dir = g_dir_open (folder, 0, NULL);
  g_autoptr(GPtrArray) names = g_ptr_array_new_with_free_func (g_free);
  const char *entry;
  int failures = 0;

  if (dir == NULL)
    return 0;
  while ((entry = g_dir_read_name (dir)) != NULL)
    if (entry[0] != '.')
      g_ptr_array_add (names, g_strdup (entry));
  g_ptr_array_sort (names, compare_names);
  for (guint i = 0; i < names->len; i++)
    {
      const char *name = names->pdata[i];
      g_autofree char *path = g_build_filename (folder, name, NULL);
      g_autofree char *contents = NULL;
      g_autoptr(GError) error = NULL;
      gsize length = 0;
      gboolean accepted;
      Want expected = want;

      if (g_file_test (path, G_FILE_TEST_IS_DIR))
        continue;
      if (!g_file_get_contents (path, &contents, &length, &error))
        {
          printf ("not ok - %s: %s\n", path, error->message);
          failures++;
          continue;
        }
      if (want == WANT_REJECT && strstr (name, ".ok.") != NULL)
        expected = WANT_ACCEPT;
      accepted = qv_fuzz_read ((const guint8 *) contents, length);
      (*count)++;
      if ((expected == WANT_ACCEPT && !accepted) || (expected == WANT_REJECT && accepted))
        {
          printf ("not ok - %s: %s, expected %s\n", path,
                  accepted ? "accepted" : "refused",
                  expected == WANT_ACCEPT ? "to be read" : "an error");
          failures++;
        }
      else
        printf ("ok - %s (%s)\n", path, accepted ? "read" : "refused");
    }
  return failures;
}

int
main (int argc, char **argv)
{
  int failures = 0;
  guint count = 0;

  qv_fuzz_init ();
  for (int i = 1; i + 1 < argc; i += 2)
    {
      Want want;

      if (strcmp (argv[i], "--accept") == 0)
        want = WANT_ACCEPT;
      else if (strcmp (argv[i], "--reject") == 0)
        want = WANT_REJECT;
      else if (strcmp (argv[i], "--any") == 0)
        want = WANT_ANY;
      else
        {
          fprintf (stderr, "usage: %s [--accept|--reject|--any DIR]…\n", argv[0]);
          return 1;
        }
      failures += replay (argv[i + 1], want, &count);
    }
  printf ("# %u inputs, %d wrong\n", count, failures);
  return failures == 0 ? 0 : 1;
}
