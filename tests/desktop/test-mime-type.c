/* test-mime-type.c — the bundle's shared-mime-info file makes *.quaver.json
 * its own type, a kind of JSON, and leaves plain *.json alone.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Usage: test-mime-type MIME.XML
 * Builds a private MIME database from MIME.XML with update-mime-database in
 * a temporary XDG data directory placed before the system's, then asks GIO
 * (g_content_type_guess, which reads that database through XDG_DATA_DIRS)
 * what file names map to. Expected behaviour from the shared-mime-info
 * specification: the longest matching glob wins, sub-class-of makes the
 * type "is a" application/json. Exit 77 (skip) without update-mime-database. */
#include <gio/gio.h>
#include <glib/gstdio.h>
#include <errno.h>
#include <stdlib.h>
#include <string.h>

#define BUNDLE_TYPE "application/vnd.quaverlab.bundle+json"

static int failures;

static void
expect_type (const char *name, const char *want, gboolean want_equal)
{
  gboolean uncertain = FALSE;
  g_autofree char *got = g_content_type_guess (name, NULL, 0, &uncertain);
  gboolean equal = g_content_type_equals (got, want);

  if (equal != want_equal)
    {
      g_printerr ("FAIL: %s is %s, expected %s%s\n", name, got,
                  want_equal ? "" : "anything but ", want);
      failures++;
    }
  else
    g_print ("ok: %s is %s\n", name, got);
}

static gboolean
remove_tree (const char *path)
{
  g_autoptr (GDir) dir = g_dir_open (path, 0, NULL);
  const char *entry;

  if (dir != NULL)
    while ((entry = g_dir_read_name (dir)) != NULL)
      {
        g_autofree char *child = g_build_filename (path, entry, NULL);
        if (g_file_test (child, G_FILE_TEST_IS_DIR)
            && !g_file_test (child, G_FILE_TEST_IS_SYMLINK))
          remove_tree (child);
        else
          g_unlink (child);
      }
  return g_rmdir (path) == 0;
}

int
main (int argc, char **argv)
{
  g_autoptr (GError) error = NULL;
  g_autofree char *tool = g_find_program_in_path ("update-mime-database");
  g_autofree char *xml = NULL;
  gsize xml_len = 0;

  if (argc != 2)
    {
      g_printerr ("usage: %s MIME.XML\n", argv[0]);
      return 2;
    }
  if (tool == NULL)
    {
      g_print ("SKIP: update-mime-database not found\n");
      return 77;
    }
  if (!g_file_get_contents (argv[1], &xml, &xml_len, &error))
    {
      g_printerr ("%s\n", error->message);
      return 1;
    }

  g_autofree char *root = g_dir_make_tmp ("quaver-mime-XXXXXX", &error);
  if (root == NULL)
    {
      g_printerr ("%s\n", error->message);
      return 1;
    }
  g_autofree char *home = g_build_filename (root, "home", NULL);
  g_autofree char *mime = g_build_filename (root, "mime", NULL);
  g_autofree char *packages = g_build_filename (mime, "packages", NULL);
  g_autofree char *copy = g_build_filename (packages, "org.quaverlab.Quaver.xml", NULL);
  int status = 0;

  if (g_mkdir_with_parents (packages, 0700) != 0 || g_mkdir_with_parents (home, 0700) != 0
      || !g_file_set_contents (copy, xml, (gssize) xml_len, &error))
    {
      g_printerr ("cannot prepare %s: %s\n", root,
                  error ? error->message : g_strerror (errno));
      remove_tree (root);
      return 1;
    }

  /* Ours first, then the system's (for application/json itself); an empty
   * XDG_DATA_HOME so the user's own database cannot interfere. Set before
   * update-mime-database runs (it warns about a directory outside the
   * search path) and before GIO first looks at content types. */
  const char *system_dirs = g_getenv ("QV_SYSTEM_DATA_DIRS");
  g_autofree char *dirs = g_strconcat (root, ":",
                                       system_dirs ? system_dirs : "/usr/local/share:/usr/share",
                                       NULL);
  g_setenv ("XDG_DATA_DIRS", dirs, TRUE);
  g_setenv ("XDG_DATA_HOME", home, TRUE);

  const char *update_argv[] = { tool, mime, NULL };
  g_autofree char *update_err = NULL;
  if (!g_spawn_sync (NULL, (char **) update_argv, NULL, G_SPAWN_DEFAULT, NULL, NULL,
                     NULL, &update_err, &status, &error)
      || !g_spawn_check_wait_status (status, &error))
    {
      g_printerr ("update-mime-database %s failed: %s\n%s", mime,
                  error->message, update_err ? update_err : "");
      remove_tree (root);
      return 1;
    }
  if (update_err != NULL && *update_err != '\0')
    {
      /* It reports problems in the XML on stderr and still exits 0. */
      g_printerr ("FAIL: update-mime-database complained:\n%s", update_err);
      failures++;
    }

  expect_type ("x.quaver.json", BUNDLE_TYPE, TRUE);
  expect_type ("Ethanol.Quaver.JSON", BUNDLE_TYPE, TRUE);
  expect_type ("/some/dir/water.quaver.json", BUNDLE_TYPE, TRUE);
  expect_type ("x.json", BUNDLE_TYPE, FALSE);
  expect_type ("x.json", "application/json", TRUE);
  expect_type ("quaver.json", BUNDLE_TYPE, FALSE);
  expect_type ("x.quaver.json.bak", BUNDLE_TYPE, FALSE);

  if (!g_content_type_is_a (BUNDLE_TYPE, "application/json"))
    {
      g_printerr ("FAIL: %s is not a kind of application/json\n", BUNDLE_TYPE);
      failures++;
    }
  else
    g_print ("ok: %s is a kind of application/json\n", BUNDLE_TYPE);

  g_autofree char *description = g_content_type_get_description (BUNDLE_TYPE);
  if (description == NULL || strcmp (description, "Quaver bundle") != 0)
    {
      g_printerr ("FAIL: description of %s is \"%s\", expected \"Quaver bundle\"\n",
                  BUNDLE_TYPE, description ? description : "(none)");
      failures++;
    }
  else
    g_print ("ok: described as \"%s\"\n", description);

  if (!remove_tree (root))
    g_printerr ("warning: could not remove %s\n", root);
  g_print ("%d failure%s\n", failures, failures == 1 ? "" : "s");
  return failures == 0 ? 0 : 1;
}
