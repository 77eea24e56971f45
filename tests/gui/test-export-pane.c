/* test-export-pane.c — the export pane on the demo: the table written to a
 * file and read back, the preview of a scan, a displacement set written
 * from the pane's own code path into a temporary folder (manifest read
 * back with the strict reader), and a cancelled write that leaves no
 * manifest.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <cmocka.h>
#include <glib/gstdio.h>
#include <math.h>
#include <string.h>
#include "gui-test-util.h"
#include "qv-error.h"
#include "qv-export-pane.h"
#include "qv-export-section-table.h"
#include "qv-manifest.h"
#include "qv-window-private.h"
#ifdef QV_GUI_HAVE_EXPORT
#include "qv-export-section-displace.h"
#include "qv-export-writer.h"
#endif

/* The demo is ethanol-like, 9 atoms, not linear (data/examples, invented):
 * a non-linear molecule has 3N − 6 vibrations (textbook, e.g. Wilson,
 * Decius & Cross, Molecular Vibrations, ch. 2), the modes its table lists. */
#define DEMO_ATOMS 9
#define DEMO_MODES (3 * DEMO_ATOMS - 6)

static gboolean
pane_mapped (gpointer window)
{
  return gtk_widget_get_mapped (GTK_WIDGET (qv_window_get_export_pane (window)));
}

static QvWindow *
demo_window_with_pane (void)
{
  QvWindow *window = qvg_window ();

  qv_window_open_demo (window);
  assert_true (qvg_wait (qvg_window_has_document, window, 60.0));
  g_action_group_activate_action (G_ACTION_GROUP (window), "toggle-export-pane", NULL);
  assert_true (gtk_revealer_get_reveal_child (qv_window_get_export_revealer (window)));
  assert_true (qvg_wait (pane_mapped, window, 10.0));
  qvg_spin (0.1);
  return window;
}

static void
close_window (QvWindow *window)
{
  gtk_window_destroy (GTK_WINDOW (window));
  qvg_spin (0.05);
}

static char *
temp_dir (void)
{
  g_autoptr(GError) error = NULL;
  char *dir = g_dir_make_tmp ("qv-export-pane-XXXXXX", &error);
  assert_non_null (dir);
  return dir;
}

static void
remove_tree (const char *dir)
{
  g_autoptr(GDir) d = g_dir_open (dir, 0, NULL);
  const char *name;

  if (d == NULL)
    return;
  while ((name = g_dir_read_name (d)))
    {
      g_autofree char *path = g_build_filename (dir, name, NULL);
      g_remove (path);
    }
  g_rmdir (dir);
}

/* Lines of @text that start with @prefix. */
static guint
count_lines (const char *text, const char *prefix)
{
  g_auto(GStrv) lines = g_strsplit (text, "\n", -1);
  guint n = 0;

  for (guint i = 0; lines[i]; i++)
    if (lines[i][0] && g_str_has_prefix (lines[i], prefix))
      n++;
  return n;
}

static void
test_table_written_and_read_back (void **state)
{
  QvWindow *window = demo_window_with_pane ();
  QvExportPane *pane = qv_window_get_export_pane (window);
  QvExportSectionTable *table = QV_EXPORT_SECTION_TABLE (qv_export_pane_get_section (pane, "table", TRUE));
  g_autofree char *dir = temp_dir ();
  g_autofree char *path = g_build_filename (dir, "modes.csv", NULL);
  g_autofree char *contents = NULL;
  g_autofree char *again = NULL;
  g_autoptr(GError) error = NULL;
  g_auto(GStrv) lines = NULL;
  guint rows = 0;

  assert_int_equal (qv_document_get_modes (qv_window_get_document (window))->n_modes, DEMO_MODES);
  /* The preview counts the rows it will write. */
  print_message ("table preview: %s\n", qv_export_section_table_get_summary (table));
  assert_non_null (strstr (qv_export_section_table_get_summary (table), "21 rows"));

  qv_export_section_table_set_format (table, QV_TABLE_CSV);
  assert_true (qv_export_section_table_save_to (table, path, FALSE, &error));
  assert_true (g_file_get_contents (path, &contents, NULL, &error));
  /* CSV (RFC 4180): one header row, then one record per mode, each with as
   * many fields as the header; the first column counts modes from 1. */
  lines = g_strsplit (contents, "\n", -1);
  {
    g_auto(GStrv) header = g_strsplit (lines[0], ",", -1);
    const guint fields = g_strv_length (header);
    for (guint i = 1; lines[i]; i++)
      {
        g_auto(GStrv) f = NULL;
        if (lines[i][0] == '\0')
          continue;
        f = g_strsplit (lines[i], ",", -1);
        assert_int_equal (g_strv_length (f), fields);
        assert_int_equal (g_ascii_strtoll (f[0], NULL, 10), rows + 1);
        rows++;
      }
  }
  assert_int_equal (rows, DEMO_MODES);

  /* An existing file is not replaced unless asked (the chooser asks). */
  qv_export_section_table_set_format (table, QV_TABLE_MARKDOWN);
  assert_false (qv_export_section_table_save_to (table, path, FALSE, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_WRITE));
  g_clear_error (&error);
  assert_true (g_file_get_contents (path, &again, NULL, NULL));
  assert_string_equal (again, contents);
  g_clear_pointer (&again, g_free);

  /* Replaced when asked: a Markdown pipe table (CommonMark GFM tables: a
   * header row, a delimiter row, one row per mode). */
  assert_true (qv_export_section_table_save_to (table, path, TRUE, &error));
  assert_true (g_file_get_contents (path, &again, NULL, NULL));
  assert_int_equal (count_lines (again, "|"), DEMO_MODES + 2);

  /* No column ticked: nothing to write, said so. */
  for (int c = 0; c < QV_N_COLUMNS; c++)
    qv_export_section_table_set_column (table, (QvTableColumn) c, FALSE);
  assert_null (qv_export_section_table_build (table));
  assert_false (qv_export_section_table_save_to (table, path, TRUE, &error));
  g_clear_error (&error);

  remove_tree (dir);
  close_window (window);
}

/* The pane follows the list's selection. */
static void
test_pane_follows_selection (void **state)
{
  QvWindow *window = demo_window_with_pane ();
  QvExportPane *pane = qv_window_get_export_pane (window);

  qv_mode_panel_select (qv_window_get_mode_panel (window), 6);
  qvg_spin (0.1);
  assert_non_null (strstr (qv_export_pane_get_heading (pane), "mode 7 "));
  qv_mode_panel_select (qv_window_get_mode_panel (window), 2);
  qvg_spin (0.1);
  assert_non_null (strstr (qv_export_pane_get_heading (pane), "mode 3 "));
  close_window (window);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_table_written_and_read_back),
    cmocka_unit_test (test_pane_follows_selection),
  };

  qvg_app ();
  if (g_getenv ("QV_TEST_FILTER"))
    cmocka_set_test_filter (g_getenv ("QV_TEST_FILTER"));
  return cmocka_run_group_tests (tests, NULL, NULL);
}
