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
#include <adwaita.h>
#include <glib/gstdio.h>
#include <math.h>
#include <string.h>
#include "gui-test-util.h"
#include "qv-error.h"
#include "qv-export-pane.h"
#include "qv-export-section-table.h"
#include "qv-manifest.h"
#include "qv-window-private.h"
#include "qv-export-section-displace.h"
#include "qv-export-section-ensemble.h"
#include "qv-export-section-stencil.h"
#include "qv-export-writer.h"
#ifdef QV_GUI_HAVE_PICTURE
#include <gdk-pixbuf/gdk-pixbuf.h>
#include "qv-export-section-picture.h"
#endif
#ifdef QV_GUI_HAVE_ANIMATION
#include "qv-export-section-animation.h"
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
  assert_true (adw_flap_get_reveal_flap (qv_window_get_export_flap (window)));
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

  qvg_remove_tree (dir);
  close_window (window);
}

/* Warnings and criticals (GTK's layout checks log as Gtk-CRITICAL). */
static guint warnings_caught;
static gboolean warnings_listening;

static GLogWriterOutput
log_writer (GLogLevelFlags level, const GLogField *fields, gsize n_fields, gpointer data)
{
  if (warnings_listening && (level & (G_LOG_LEVEL_CRITICAL | G_LOG_LEVEL_WARNING | G_LOG_LEVEL_ERROR)))
    warnings_caught++;
  return g_log_writer_default (level, fields, n_fields, data);
}

/* Every section opens, one at a time, without a warning from GTK, in the
 * light and the dark style. */
static void
test_sections_open_clean (void **state)
{
  static const char *const names[] = { "table", "displace", "ensemble", "stencil", "picture", "animation" };
  QvWindow *window = demo_window_with_pane ();
  QvExportPane *pane = qv_window_get_export_pane (window);
  guint found = 0;

  warnings_caught = 0;
  warnings_listening = TRUE;
  for (int dark = 0; dark < 2; dark++)
    {
      adw_style_manager_set_color_scheme (adw_style_manager_get_default (),
                                          dark ? ADW_COLOR_SCHEME_FORCE_DARK : ADW_COLOR_SCHEME_FORCE_LIGHT);
      for (guint i = 0; i < G_N_ELEMENTS (names); i++)
        if (qv_export_pane_get_section (pane, names[i], TRUE))
          {
            found += !dark;
            qvg_spin (0.15);
          }
    }
  warnings_listening = FALSE;
  adw_style_manager_set_color_scheme (adw_style_manager_get_default (), ADW_COLOR_SCHEME_DEFAULT);
  /* Table, displaced structures, ensemble and stencil always; picture and
   * animation with the renderer and giflib. */
  assert_true (found >= 4);
  assert_int_equal (warnings_caught, 0);
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

static gboolean
writer_idle (gpointer writer)
{
  return !qv_export_writer_is_busy (writer);
}

/* SHA-256 of a file by coreutils' sha256sum (FIPS 180-4), not by the
 * manifest's own code. */
static char *
sha256sum (const char *path)
{
  const char *argv[] = { "sha256sum", path, NULL };
  g_autofree char *out = NULL;
  int status = 0;

  assert_true (g_spawn_sync (NULL, (char **) argv, NULL, G_SPAWN_SEARCH_PATH, NULL, NULL, &out, NULL,
                             &status, NULL));
  assert_true (g_spawn_check_wait_status (status, NULL));
  return g_strndup (out, 64);
}

static QvExportSectionDisplace *
scan_section (QvWindow *window, guint points)
{
  QvExportPane *pane = qv_window_get_export_pane (window);
  QvExportSectionDisplace *displace =
    QV_EXPORT_SECTION_DISPLACE (qv_export_pane_get_section (pane, "displace", TRUE));

  /* Mode 7 of the demo is real: one turning point at v = 0 by default. */
  qv_mode_panel_select (qv_window_get_mode_panel (window), 6);
  qv_export_section_displace_set_kind (displace, QV_DISPLACE_SCAN);
  qv_export_section_displace_set_points (displace, points);
  qvg_spin (0.1);
  return displace;
}

/* A scan of N points previews N files plus the manifest. */
static void
test_scan_preview (void **state)
{
  QvWindow *window = demo_window_with_pane ();
  QvExportSectionDisplace *displace = scan_section (window, 11);
  const char *preview = qv_export_section_displace_get_preview (displace);

  print_message ("scan preview: %s\n", preview);
  assert_int_equal (qv_export_section_displace_get_n_files (displace), 11);
  assert_non_null (strstr (preview, "11 structures in 11 files"));
  assert_non_null (strstr (preview, "mode7-scan-00.xyz"));
  assert_non_null (strstr (preview, "mode7-scan-10.xyz"));
  assert_non_null (strstr (preview, "manifest.json"));

  qv_export_section_displace_set_points (displace, 5);
  qvg_spin (0.05);
  assert_int_equal (qv_export_section_displace_get_n_files (displace), 5);
  assert_non_null (strstr (qv_export_section_displace_get_preview (displace), "mode7-scan-4.xyz")
                   ? qv_export_section_displace_get_preview (displace)
                   : strstr (qv_export_section_displace_get_preview (displace), "mode7-scan-04.xyz"));

  /* A bad request is said under the options, not in a dialog: an even
   * number of points has no undisplaced structure. */
  qv_export_section_displace_set_points (displace, 4);
  qvg_spin (0.05);
  assert_int_equal (qv_export_section_displace_get_n_files (displace), 0);
  assert_true (strlen (qv_export_section_displace_get_message (displace)) > 0);
  assert_null (qv_window_get_error_dialog (window));
  close_window (window);
}

/* Mode 1 of the demo is imaginary (284.8i cm⁻¹): an escape pair takes the
 * default step, says so in a note, and both structures are written; a
 * "pair" in turning points is refused under the options (an imaginary mode
 * has no turning point: the harmonic oscillator's classical turning point
 * needs ω² > 0, textbook). */
static void
test_escape_pair_of_imaginary_mode (void **state)
{
  QvWindow *window = demo_window_with_pane ();
  QvExportPane *pane = qv_window_get_export_pane (window);
  QvExportSectionDisplace *displace =
    QV_EXPORT_SECTION_DISPLACE (qv_export_pane_get_section (pane, "displace", TRUE));

  assert_true (qv_mode_set_is_imaginary (qv_document_get_modes (qv_window_get_document (window)), 0));
  qv_mode_panel_select (qv_window_get_mode_panel (window), 0);
  qvg_spin (0.05);
  /* Before a kind is chosen, an imaginary mode is offered its escape pair. */
  assert_int_equal (qv_export_section_displace_get_n_files (displace), 2);
  assert_non_null (strstr (qv_export_section_displace_get_preview (displace), "escape"));
  qv_export_section_displace_set_kind (displace, QV_DISPLACE_PAIR);
  qv_export_section_displace_set_amplitude (displace, QV_AMPLITUDE_TURNING_POINT, 1.0);
  qvg_spin (0.05);
  assert_int_equal (qv_export_section_displace_get_n_files (displace), 0);
  print_message ("pair of an imaginary mode: %s\n", qv_export_section_displace_get_message (displace));
  assert_true (strlen (qv_export_section_displace_get_message (displace)) > 0);

  qv_export_section_displace_set_kind (displace, QV_DISPLACE_ESCAPE);
  qv_export_section_displace_set_amplitude (displace, QV_AMPLITUDE_ANGSTROM, NAN);
  qvg_spin (0.05);
  print_message ("escape preview: %s\n", qv_export_section_displace_get_preview (displace));
  assert_int_equal (qv_export_section_displace_get_n_files (displace), 2);
  assert_int_equal (strlen (qv_export_section_displace_get_message (displace)), 0);
  print_message ("escape note: %s\n", qv_export_section_displace_get_notes (displace));
  assert_true (strlen (qv_export_section_displace_get_notes (displace)) > 0);
  assert_null (qv_window_get_error_dialog (window));
  close_window (window);
}

/* Written from the pane's own path (the writer's job after the folder is
 * chosen): every file the manifest lists is there with its SHA-256. */
static void
test_scan_written_with_manifest (void **state)
{
  QvWindow *window = demo_window_with_pane ();
  QvExportSectionDisplace *displace = scan_section (window, 7);
  QvExportWriter *writer = qv_export_section_displace_get_writer (displace);
  g_autofree char *dir = temp_dir ();
  g_autofree char *manifest_path = g_build_filename (dir, "manifest.json", NULL);
  g_autoptr(QvManifest) manifest = NULL;
  g_autoptr(GError) error = NULL;
  const char *const *written;
  guint frames = 0;

  qv_export_writer_write_to (writer, dir, FALSE);
  assert_true (qv_export_writer_is_busy (writer));
  assert_true (qvg_wait (writer_idle, writer, 60.0));
  assert_null (qv_export_writer_get_error (writer));
  written = qv_export_writer_get_written (writer);
  assert_int_equal (g_strv_length ((char **) written), 7 + 1);
  assert_string_equal (written[7], "manifest.json");

  manifest = qv_manifest_read_file (manifest_path, &error);
  assert_non_null (manifest);
  assert_string_equal (manifest->command, "displace");
  assert_int_equal (manifest->n_atoms, DEMO_ATOMS);
  assert_int_equal (manifest->files->len, 7);
  /* The demo is hashed from the resource the app opened. */
  assert_int_equal (manifest->inputs->len, 1);
  assert_string_equal (((QvManifestInput *) manifest->inputs->pdata[0])->role, "demo");
  for (guint i = 0; i < manifest->files->len; i++)
    {
      const QvManifestFile *f = manifest->files->pdata[i];
      g_autofree char *path = g_build_filename (dir, f->name, NULL);
      g_autofree char *sum = NULL;

      assert_string_equal (f->name, written[i]);
      assert_true (g_file_test (path, G_FILE_TEST_IS_REGULAR));
      sum = sha256sum (path);
      assert_string_equal (sum, f->sha256);
      frames += f->frames->len;
      /* Every structure of the scan is of mode 7 (1-based in the manifest). */
      for (guint k = 0; k < f->frames->len; k++)
        {
          const QvManifestFrame *fr = f->frames->pdata[k];
          assert_int_equal (fr->amplitudes->len, 1);
          assert_int_equal (g_array_index (fr->amplitudes, QvManifestAmplitude, 0).mode, 7);
        }
    }
  assert_int_equal (frames, 7);

  /* The folder is no longer empty: a second write is refused unless forced
   * (the pane asks first), and the first set stays as it was. */
  qv_export_writer_write_to (writer, dir, FALSE);
  assert_true (qvg_wait (writer_idle, writer, 60.0));
  assert_true (g_error_matches (qv_export_writer_get_error (writer), QV_ERROR, QV_ERROR_WRITE));
  {
    GtkWindow *dialog = qv_window_get_error_dialog (window);
    assert_non_null (dialog);
    gtk_window_destroy (dialog);
  }
  assert_true (g_file_test (manifest_path, G_FILE_TEST_IS_REGULAR));
  qv_export_writer_write_to (writer, dir, TRUE);
  assert_true (qvg_wait (writer_idle, writer, 60.0));
  assert_null (qv_export_writer_get_error (writer));

  qvg_remove_tree (dir);
  close_window (window);
}

/* Cancel while a long scan is written: it stops, says so, and writes no
 * manifest (so the folder cannot pass for a complete set). */
static void
test_cancel_leaves_no_manifest (void **state)
{
  QvWindow *window = demo_window_with_pane ();
  QvExportSectionDisplace *displace = scan_section (window, 201);
  QvExportWriter *writer = qv_export_section_displace_get_writer (displace);
  g_autofree char *dir = temp_dir ();
  g_autofree char *manifest_path = g_build_filename (dir, "manifest.json", NULL);
  const char *const *written;

  qv_export_writer_write_to (writer, dir, FALSE);
  qv_export_writer_cancel (writer);
  assert_true (qvg_wait (writer_idle, writer, 60.0));
  assert_true (g_error_matches (qv_export_writer_get_error (writer), QV_ERROR, QV_ERROR_CANCELLED));
  assert_false (g_file_test (manifest_path, G_FILE_TEST_EXISTS));
  written = qv_export_writer_get_written (writer);
  print_message ("cancelled after %u of 201 files\n", g_strv_length ((char **) written));
  assert_true (g_strv_length ((char **) written) < 201);
  for (guint i = 0; written[i]; i++)
    assert_false (g_str_equal (written[i], "manifest.json"));
  /* A cancel is the user's choice, not an error to show. */
  assert_null (qv_window_get_error_dialog (window));

  qvg_remove_tree (dir);
  close_window (window);
}

/* Ensemble and stencil previews count their files: N samples; 6 per
 * selected atom and the reference (central differences, ±h along x, y, z:
 * common practice). */
static void
test_ensemble_and_stencil_preview (void **state)
{
  QvWindow *window = demo_window_with_pane ();
  QvExportPane *pane = qv_window_get_export_pane (window);
  QvExportSectionEnsemble *ensemble =
    QV_EXPORT_SECTION_ENSEMBLE (qv_export_pane_get_section (pane, "ensemble", TRUE));
  QvExportSectionStencil *stencil;

  qv_export_section_ensemble_set_count (ensemble, 25);
  qv_export_section_ensemble_set_seed (ensemble, 4242);
  qvg_spin (0.05);
  assert_int_equal (qv_export_section_ensemble_get_n_files (ensemble), 25);
  assert_int_equal (qv_export_section_ensemble_get_seed (ensemble), 4242);

  stencil = QV_EXPORT_SECTION_STENCIL (qv_export_pane_get_section (pane, "stencil", TRUE));
  qvg_spin (0.05);
  assert_int_equal (qv_export_section_stencil_get_n_files (stencil), 6 * DEMO_ATOMS + 1);
  qv_export_section_stencil_set_atoms (stencil, "1,3-5");
  qvg_spin (0.05);
  assert_int_equal (qv_export_section_stencil_get_n_files (stencil), 6 * 4 + 1);
  qv_export_section_stencil_set_atoms (stencil, "1,30");
  qvg_spin (0.05);
  assert_int_equal (qv_export_section_stencil_get_n_files (stencil), 0);
  assert_true (strlen (qv_export_section_stencil_get_message (stencil)) > 0);
  close_window (window);
}

#ifdef QV_GUI_HAVE_PICTURE
/* The picture and the animation, drawn offscreen by the worker: the PNG
 * and the GIF decode (gdk-pixbuf, an independent decoder) to the size asked
 * for, the GIF is animated, and the XYZ has one frame per step. */
static void
test_picture_and_animation_written (void **state)
{
  QvWindow *window = demo_window_with_pane ();
  QvExportPane *pane = qv_window_get_export_pane (window);
  QvExportSectionPicture *picture;
  QvExportWriter *writer;
  g_autofree char *dir = temp_dir ();
  g_autofree char *png = g_build_filename (dir, "mode7.png", NULL);
  g_autofree char *svg = g_build_filename (dir, "mode7.svg", NULL);
  g_autofree char *gif = g_build_filename (dir, "mode7.gif", NULL);
  g_autofree char *xyz = g_build_filename (dir, "mode7-frames.xyz", NULL);
  g_autoptr(GdkPixbuf) pixbuf = NULL;
  g_autoptr(GError) error = NULL;
  g_autofree char *text = NULL;

  qv_mode_panel_select (qv_window_get_mode_panel (window), 6);
  picture = QV_EXPORT_SECTION_PICTURE (qv_export_pane_get_section (pane, "picture", TRUE));
  qv_export_section_picture_set_size (picture, 160, 120);
  qv_export_section_picture_set_format (picture, 2);
  qvg_spin (0.05);
  assert_non_null (strstr (qv_export_section_picture_get_preview (picture), "mode7.png"));
  writer = qv_export_section_picture_get_writer (picture);
  qv_export_writer_write_to (writer, dir, FALSE);
  assert_true (qvg_wait (writer_idle, writer, 60.0));
  if (qv_export_writer_get_error (writer))
    fail_msg ("picture: %s", qv_export_writer_get_error (writer)->message);
  pixbuf = gdk_pixbuf_new_from_file (png, &error);
  assert_non_null (pixbuf);
  assert_int_equal (gdk_pixbuf_get_width (pixbuf), 160);
  assert_int_equal (gdk_pixbuf_get_height (pixbuf), 120);
  assert_true (g_file_get_contents (svg, &text, NULL, NULL));
  assert_non_null (strstr (text, "<svg"));
  g_clear_pointer (&text, g_free);

#ifdef QV_GUI_HAVE_ANIMATION
  QvExportSectionAnimation *animation;
  g_autoptr(GdkPixbufAnimation) anim = NULL;

  animation = QV_EXPORT_SECTION_ANIMATION (qv_export_pane_get_section (pane, "animation", TRUE));
  qv_export_section_animation_set_size (animation, 96, 72);
  qv_export_section_animation_set_frames (animation, 6);
  qv_export_section_animation_set_format (animation, 2);
  qvg_spin (0.05);
  writer = qv_export_section_animation_get_writer (animation);
  /* The folder now holds the picture: writing beside it is asked for. */
  qv_export_writer_write_to (writer, dir, TRUE);
  assert_true (qvg_wait (writer_idle, writer, 60.0));
  if (qv_export_writer_get_error (writer))
    fail_msg ("animation: %s", qv_export_writer_get_error (writer)->message);
  anim = gdk_pixbuf_animation_new_from_file (gif, &error);
  assert_non_null (anim);
  assert_int_equal (gdk_pixbuf_animation_get_width (anim), 96);
  assert_int_equal (gdk_pixbuf_animation_get_height (anim), 72);
  assert_false (gdk_pixbuf_animation_is_static_image (anim));
  /* XYZ (common practice): each frame starts with the atom count line. */
  assert_true (g_file_get_contents (xyz, &text, NULL, NULL));
  assert_int_equal (count_lines (text, "9"), 6);
#endif

  qvg_remove_tree (dir);
  close_window (window);
}
#endif

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_table_written_and_read_back),
    cmocka_unit_test (test_pane_follows_selection),
    cmocka_unit_test (test_sections_open_clean),
    cmocka_unit_test (test_scan_preview),
    cmocka_unit_test (test_escape_pair_of_imaginary_mode),
    cmocka_unit_test (test_scan_written_with_manifest),
    cmocka_unit_test (test_cancel_leaves_no_manifest),
    cmocka_unit_test (test_ensemble_and_stencil_preview),
#ifdef QV_GUI_HAVE_PICTURE
    cmocka_unit_test (test_picture_and_animation_written),
#endif
  };

  g_log_set_writer_func (log_writer, NULL, NULL);
  qvg_app ();
  if (g_getenv ("QV_TEST_FILTER"))
    cmocka_set_test_filter (g_getenv ("QV_TEST_FILTER"));
  return cmocka_run_group_tests (tests, NULL, NULL);
}
