/* test-app.c — the desktop app on the demo: the list against the core,
 * the animation, a snapshot, a broken file, a mass edit, cancel, settings.
 * Every expected number comes from the core's own functions (the app must
 * show what `quaver modes` prints), or from independent solves here.
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
#include "qv-input.h"
#include "qv-mode-detail.h"
#include "qv-mode-item.h"
#include "qv-motion-bar.h"
#include "qv-preferences.h"
#include "qv-solver.h"

static QvWindow *
demo_window (void)
{
  QvWindow *window = qvg_window ();

  qv_window_open_demo (window);
  assert_true (qvg_wait (qvg_window_has_document, window, 60.0));
  return window;
}

static void
close_window (QvWindow *window)
{
  gtk_window_destroy (GTK_WINDOW (window));
  qvg_spin (0.05);
}

/* Row whose mode index is @k in the panel's current order. */
static guint
row_of_mode (QvModePanel *panel, guint k)
{
  GListModel *rows = qv_mode_panel_get_rows (panel);
  for (guint r = 0; r < g_list_model_get_n_items (rows); r++)
    {
      g_autoptr(QvModeItem) item = g_list_model_get_item (rows, r);
      if (qv_mode_item_get_index (item) == k)
        return r;
    }
  fail_msg ("mode %u not in the list", k);
  return 0;
}

static double
cell_number (QvModePanel *panel, guint row, guint column)
{
  g_autofree char *text = qv_mode_panel_cell_text (panel, row, column);
  char *end = NULL;
  double v = g_ascii_strtod (text, &end);
  assert_true (end != text);
  return v;
}

/* Warnings and criticals logged while a test listens (any domain: GTK's
 * size and layout checks log as Gtk-CRITICAL). */
static gboolean log_listening;
static GPtrArray *log_caught;

static GLogWriterOutput
log_writer (GLogLevelFlags level, const GLogField *fields, gsize n_fields, gpointer data)
{
  if (log_listening && (level & (G_LOG_LEVEL_CRITICAL | G_LOG_LEVEL_WARNING | G_LOG_LEVEL_ERROR)))
    {
      const char *domain = "", *message = "";
      for (gsize i = 0; i < n_fields; i++)
        if (g_str_equal (fields[i].key, "GLIB_DOMAIN") && fields[i].length < 0)
          domain = fields[i].value;
        else if (g_str_equal (fields[i].key, "MESSAGE") && fields[i].length < 0)
          message = fields[i].value;
      g_ptr_array_add (log_caught, g_strdup_printf ("%s: %s", domain, message));
    }
  return g_log_writer_default (level, fields, n_fields, data);
}

/* Start-up on the demo, laid out and drawn, logs no GTK warning or
 * critical (such as a widget whose height-for-width is inconsistent). */
static void
test_startup_clean (void **state)
{
  QvWindow *window;

  g_ptr_array_set_size (log_caught, 0);
  log_listening = TRUE;
  window = demo_window ();
  qvg_spin (1.0);
  /* Narrow and wide, as a user resizing the window would. */
  gtk_window_set_default_size (GTK_WINDOW (window), 900, 600);
  qvg_spin (0.5);
  gtk_window_set_default_size (GTK_WINDOW (window), 1400, 900);
  qvg_spin (0.5);
  log_listening = FALSE;
  for (guint i = 0; i < log_caught->len; i++)
    print_message ("logged: %s\n", (char *) log_caught->pdata[i]);
  assert_int_equal (log_caught->len, 0);
  close_window (window);
}

/* The list's turning-point column follows v as qv_mode_set_turning_point
 * says; the selection drives the detail. */
static void
test_level_changes_turning_points (void **state)
{
  QvWindow *window = demo_window ();
  QvModePanel *panel = qv_window_get_mode_panel (window);
  const QvModeSet *modes = qv_document_get_modes (qv_window_get_document (window));
  GListModel *rows = qv_mode_panel_get_rows (panel);
  guint changed = 0;

  assert_int_equal (g_list_model_get_n_items (rows), modes->n_modes);
  qv_mode_panel_select (panel, 3);
  qvg_spin (0.05);
  assert_int_equal (qv_mode_panel_get_selected (panel), 3);
  assert_non_null (strstr (qv_mode_detail_get_heading (qv_window_get_mode_detail (window)), "Mode 4"));

  for (guint v = 0; v <= 7; v += 7)
    {
      qv_mode_panel_set_level (panel, v);
      qvg_spin (0.02);
      for (guint k = 0; k < modes->n_modes; k++)
        {
          QvTurningPoint tp;
          const guint r = row_of_mode (panel, k);
          qv_mode_set_turning_point (modes, k, v, &tp);
          if (!tp.defined)
            {
              g_autofree char *text = qv_mode_panel_cell_text (panel, r, 3);
              assert_true (qv_mode_set_is_imaginary (modes, k));
              assert_string_equal (text, "—");
              continue;
            }
          /* Four decimals are shown. */
          assert_float_equal (cell_number (panel, r, 3), tp.q, 0.6e-4);
          assert_float_equal (cell_number (panel, r, 4), tp.max_displacement, 0.6e-4);
          if (v == 7)
            {
              QvTurningPoint tp0;
              qv_mode_set_turning_point (modes, k, 0, &tp0);
              /* Q_tp ∝ √(2v+1) (harmonic oscillator, Griffiths §2.3). */
              assert_float_equal (tp.q / tp0.q, sqrt (15.0), 1e-9);
              changed++;
            }
        }
    }
  assert_true (changed > 0);
  /* The selection stayed on mode 4 through the level changes. */
  assert_int_equal (qv_mode_panel_get_selected (panel), 3);
  close_window (window);
}

/* Sorting is numeric: by wavenumber descending the first row is the
 * largest wavenumber, and imaginary modes (negative) come last. */
static void
test_sort_numeric (void **state)
{
  QvWindow *window = demo_window ();
  QvModePanel *panel = qv_window_get_mode_panel (window);
  const QvModeSet *modes = qv_document_get_modes (qv_window_get_document (window));
  GListModel *rows = qv_mode_panel_get_rows (panel);
  const guint n = g_list_model_get_n_items (rows);
  double previous = G_MAXDOUBLE;

  qv_mode_panel_sort_by (panel, 1, FALSE);
  qvg_spin (0.05);
  for (guint r = 0; r < n; r++)
    {
      g_autoptr(QvModeItem) item = g_list_model_get_item (rows, r);
      const double wn = qv_mode_set_wavenumber (modes, qv_mode_item_get_index (item));
      assert_true (wn <= previous);
      previous = wn;
    }
  {
    g_autoptr(QvModeItem) last = g_list_model_get_item (rows, n - 1);
    g_autofree char *text = qv_mode_panel_cell_text (panel, n - 1, 1);
    assert_true (qv_mode_set_is_imaginary (modes, qv_mode_item_get_index (last)));
    assert_true (g_str_has_suffix (text, "i"));
  }
  /* Stepping follows the shown order: from the first row to the second. */
  qv_mode_panel_select (panel, (int) modes->n_modes - 1);
  qv_window_step_mode (window, +1);
  {
    g_autoptr(QvModeItem) second = g_list_model_get_item (rows, 1);
    assert_int_equal (qv_mode_panel_get_selected (panel), (int) qv_mode_item_get_index (second));
  }
  qv_mode_panel_sort_by (panel, 0, TRUE);
  close_window (window);
}

typedef struct {
  QvModeView *view;
  guint frames;
} FrameWait;

static gboolean
drew_more (gpointer data)
{
  FrameWait *w = data;
  return qv_mode_view_get_frames (w->view) > w->frames;
}

/* The phase advances as 2π·speed·t, deterministic through step(). */
static void
test_animation_step (void **state)
{
  QvWindow *window = demo_window ();
  QvModeView *view = qv_window_get_mode_view (window);
  QvMotionBar *bar = qv_window_get_motion_bar (window);
  FrameWait wait;

  g_object_set (bar, "speed", 0.5, NULL);
  qv_mode_view_set_playing (view, FALSE);
  qv_mode_view_set_phase (view, 0.0);
  qv_mode_view_step (view, 0.25);
  assert_float_equal (qv_mode_view_get_phase (view), 2.0 * G_PI * 0.5 * 0.25, 1e-12);
  qv_mode_view_step (view, 2.0);   /* one whole cycle more wraps around */
  assert_float_equal (qv_mode_view_get_phase (view), 2.0 * G_PI * 0.5 * 0.25, 1e-9);

  /* A step draws a frame. */
  wait.view = view;
  wait.frames = qv_mode_view_get_frames (view);
  qv_mode_view_step (view, 0.1);
  assert_true (qvg_wait (drew_more, &wait, 10.0));

  /* The amplitude the view gets is the core's for the selected mode. */
  qv_mode_panel_select (qv_window_get_mode_panel (window), 5);
  qv_motion_bar_set_amplitude (bar, 2.0);
  qvg_spin (0.02);
  assert_float_equal (qv_mode_view_get_amplitude (view),
                      qv_mode_set_display_amplitude (qv_document_get_modes (qv_window_get_document (window)),
                                                     5, qv_mode_panel_get_level (qv_window_get_mode_panel (window)),
                                                     2.0, NULL), 1e-12);
  qv_motion_bar_set_amplitude (bar, 1.0);
  close_window (window);
}

static gboolean
has_frame (gpointer view)
{
  return qv_mode_view_get_frames (view) > 0;
}

/* The window as drawn: not blank, and the 3D view not uniform. */
static void
test_snapshot (void **state)
{
  QvWindow *window = demo_window ();
  QvModeView *view = qv_window_get_mode_view (window);
  g_autoptr(GdkTexture) texture = NULL;
  g_autofree guchar *pixels = NULL;
  g_autofree char *png = qvg_build_path ("snapshot-demo.png");
  graphene_rect_t bounds;
  gsize stride;
  guint colours;
  FrameWait wait = { view, 0 };

  qv_mode_view_set_playing (view, FALSE);
  assert_true (qvg_wait (has_frame, view, 10.0));
  /* A frame at a phase away from the rest geometry. */
  wait.frames = qv_mode_view_get_frames (view);
  qv_mode_view_step (view, 0.3);
  assert_true (qvg_wait (drew_more, &wait, 10.0));
  qvg_spin (0.2);
  texture = qvg_snapshot (GTK_WIDGET (window));
  assert_non_null (texture);
  assert_true (gdk_texture_save_to_png (texture, png));
  pixels = qvg_pixels (texture, &stride);
  colours = qvg_count_colours (pixels, stride, 0, 0, gdk_texture_get_width (texture),
                               gdk_texture_get_height (texture));
  print_message ("snapshot %s: %d×%d, %u colours\n", png, gdk_texture_get_width (texture),
                 gdk_texture_get_height (texture), colours);
  assert_true (colours > 50);

  assert_true (gtk_widget_compute_bounds (GTK_WIDGET (view), GTK_WIDGET (window), &bounds));
  if (!qv_mode_view_has_renderer (view))
    {
      print_message ("the view has no renderer in this build: its content is not checked\n");
      close_window (window);
      skip ();
    }
  colours = qvg_count_colours (pixels, stride, (int) bounds.origin.x + 1, (int) bounds.origin.y + 1,
                               (int) bounds.size.width - 2, (int) bounds.size.height - 2);
  print_message ("3D view: %u colours\n", colours);
  /* Background, five element shades, shading and bonds: many colours. */
  assert_true (colours > 20);
  close_window (window);
}

static gboolean
has_dialog (gpointer window)
{
  return qv_window_get_error_dialog (window) != NULL && !qv_window_is_busy (window);
}

/* A broken file: a dialog with the reader's file:line message, and the
 * window keeps the document it had. */
static void
test_broken_file (void **state)
{
  QvWindow *window = demo_window ();
  QvDocument *before = g_object_ref (qv_window_get_document (window));
  g_autofree char *path = qvg_build_path ("broken.quaver.json");
  g_autofree char *secondary = NULL;
  g_autofree char *base = NULL;
  g_autoptr(GFile) file = NULL;
  static const char broken[] = "{\n  \"format\": \"quaver-bundle\",\n  \"version\": 1,\n  \"structure\": [1, 2,\n";

  assert_true (g_file_set_contents (path, broken, -1, NULL));
  file = g_file_new_for_path (path);
  qv_window_open_file (window, file);
  assert_true (qvg_wait (has_dialog, window, 30.0));
  g_object_get (qv_window_get_error_dialog (window), "secondary-text", &secondary, NULL);
  print_message ("error dialog: %s\n", secondary);
  base = g_path_get_basename (path);
  assert_non_null (strstr (secondary, base));
  assert_non_null (strstr (secondary, ":"));
  assert_ptr_equal (qv_window_get_document (window), before);
  assert_true (gtk_widget_get_visible (GTK_WIDGET (window)));
  gtk_window_destroy (qv_window_get_error_dialog (window));
  g_object_unref (before);
  close_window (window);
}

/* The demo's data as the test reads it itself, for independent solves. */
static QvInput *
demo_input (void)
{
  QvInputOptions o = { .demo = TRUE, .all_modes = TRUE };
  g_autoptr(GError) error = NULL;
  QvInput *input = qv_input_load (&o, &error);
  assert_non_null (input);
  return input;
}

static QvModeSet *
solve_with (const QvStructure *s, const QvHessian *h)
{
  g_autoptr(GError) error = NULL;
  QvSolveOptions options;
  QvModeSet *m;

  qv_solve_options_init (&options);
  m = qv_solve (s, qv_hessian_copy (h, NULL), &options, NULL, &error);
  assert_non_null (m);
  return m;
}

static gboolean
changed_modes (gpointer data)
{
  gpointer *d = data;
  return !qv_window_is_busy (d[0]) && qv_document_get_modes (qv_window_get_document (d[0])) != d[1];
}

/* H → D on the hydrogen that moves most in the highest mode (an X–H
 * stretch): the list shows what an independent solve with that mass gives,
 * that mode's wavenumber drops, and the selection stays on its index. */
static void
test_mass_edit (void **state)
{
  QvWindow *window = demo_window ();
  QvModePanel *panel = qv_window_get_mode_panel (window);
  QvDocument *doc = qv_window_get_document (window);
  const QvModeSet *before = qv_document_get_modes (doc);
  g_autoptr(QvInput) input = demo_input ();
  g_autoptr(QvStructure) heavy = qv_structure_copy (input->structure);
  g_autoptr(QvModeSet) expected = NULL;
  g_autofree double *p = g_new (double, before->n_atoms);
  const gsize top = before->n_modes - 1;
  const double wn_before = qv_mode_set_wavenumber (before, top);
  gsize hydrogen = 0;
  double best = -1.0;
  gpointer wait_data[2];

  qv_mode_set_participation (before, top, p);
  for (gsize a = 0; a < before->n_atoms; a++)
    if (input->structure->atoms[a].z == 1 && p[a] > best)
      best = p[a], hydrogen = a;
  assert_true (best > 0.0);
  assert_true (qv_structure_set_isotope (heavy, hydrogen, 2, NULL));
  expected = solve_with (heavy, input->hessian);

  qv_mode_panel_select (panel, (int) top);
  wait_data[0] = window;
  wait_data[1] = (gpointer) before;
  qv_window_set_atom_isotope (window, hydrogen, 2);
  assert_true (qvg_wait (changed_modes, wait_data, 60.0));
  {
    const QvModeSet *after = qv_document_get_modes (doc);
    assert_int_equal (after->n_modes, expected->n_modes);
    for (gsize k = 0; k < after->n_modes; k++)
      {
        const guint r = row_of_mode (panel, (guint) k);
        g_autoptr(QvModeItem) item = g_list_model_get_item (qv_mode_panel_get_rows (panel), r);
        assert_float_equal (qv_mode_item_get_wavenumber (item), qv_mode_set_wavenumber (expected, k), 1e-9);
      }
    /* Heavier hydrogen, lower X–H stretch (ν ∝ 1/√μ, common practice). */
    assert_true (qv_mode_set_wavenumber (after, top) < wn_before - 100.0);
    assert_int_equal (qv_mode_panel_get_selected (panel), (int) top);
    assert_true (qv_document_get_masses_edited (doc));
  }

  /* Reset restores the masses as read, and the original wavenumbers. */
  wait_data[1] = (gpointer) qv_document_get_modes (doc);
  qv_window_reset_masses (window);
  assert_true (qvg_wait (changed_modes, wait_data, 60.0));
  assert_false (qv_document_get_masses_edited (doc));
  assert_float_equal (qv_mode_set_wavenumber (qv_document_get_modes (doc), top), wn_before, 1e-9);
  close_window (window);
}

/* Cancel while a larger system re-solves: the window is free at once, the
 * document keeps its modes, and the abandoned worker's result never lands. */
static void
test_cancel_keeps_document (void **state)
{
  QvWindow *window = qvg_window ();
  g_autoptr(GError) error = NULL;
  /* Invented: an elastic network of 450 atoms (gui-test-util.h). */
  QvHessian *h = NULL;
  QvStructure *s = qvg_spring_system (450, 7, &h);
  g_autoptr(QvDocument) doc = qv_document_new_solved ("springs", s, h, &error);
  const QvModeSet *modes;
  QvStructure *heavier;
  gulong changed = 0;

  assert_non_null (doc);
  qv_window_set_document (window, doc);
  modes = qv_document_get_modes (doc);
  heavier = qv_structure_copy (qv_document_get_structure (doc));
  assert_true (qv_structure_set_mass (heavier, 0, 50.0, NULL));
  g_signal_connect_swapped (doc, "changed", G_CALLBACK (g_atomic_int_inc), &changed);

  qv_window_solve_masses (window, heavier);
  assert_true (qv_window_is_busy (window));
  qvg_spin (0.05);
  qv_window_cancel (window);
  assert_false (qv_window_is_busy (window));
  assert_ptr_equal (qv_document_get_modes (doc), modes);
  /* Long enough for the worker to finish (it solves 1350×1350). */
  qvg_spin (4.0);
  assert_ptr_equal (qv_document_get_modes (doc), modes);
  assert_int_equal (changed, 0);
  assert_false (qv_document_get_masses_edited (doc));

  /* Cancelling a load keeps the window as it was, too. */
  qv_window_open_demo (window);
  qv_window_cancel (window);
  qvg_spin (0.5);
  assert_ptr_equal (qv_window_get_document (window), doc);
  close_window (window);
}

/* The property defaults are the schema's (data/org.quaverlab.Quaver.gschema.xml). */
static void
test_preferences_match_schema (void **state)
{
  const char *root = g_getenv ("QV_BUILD_ROOT");
  g_autofree char *dir = g_build_filename (root, "data", NULL);
  g_autoptr(GError) error = NULL;
  g_autoptr(GSettingsSchemaSource) source = g_settings_schema_source_new_from_directory (dir, NULL, FALSE, &error);
  g_autoptr(GSettingsSchema) schema = NULL;
  g_autoptr(QvPreferences) prefs = qv_preferences_new (NULL);
  g_auto(GStrv) keys = NULL;

  assert_non_null (source);
  schema = g_settings_schema_source_lookup (source, QV_SCHEMA_ID, FALSE);
  assert_non_null (schema);
  keys = g_settings_schema_list_keys (schema);
  assert_true (g_strv_length (keys) >= 3);
  for (char **k = keys; *k; k++)
    {
      g_autoptr(GSettingsSchemaKey) key = g_settings_schema_get_key (schema, *k);
      g_autoptr(GVariant) def = g_settings_schema_key_get_default_value (key);
      GParamSpec *pspec = g_object_class_find_property (G_OBJECT_GET_CLASS (prefs), *k);
      GValue v = G_VALUE_INIT;
      g_autofree char *text = NULL;

      assert_non_null (pspec);
      g_value_init (&v, pspec->value_type);
      g_object_get_property (G_OBJECT (prefs), *k, &v);
      if (G_VALUE_HOLDS_ENUM (&v))
        {
          GEnumValue *e = g_enum_get_value (g_type_class_peek (pspec->value_type), g_value_get_enum (&v));
          assert_string_equal (e->value_nick, g_variant_get_string (def, NULL));
        }
      else if (G_VALUE_HOLDS_BOOLEAN (&v))
        assert_int_equal (g_value_get_boolean (&v), g_variant_get_boolean (def));
      else if (G_VALUE_HOLDS_UINT (&v))
        assert_int_equal (g_value_get_uint (&v), g_variant_get_uint32 (def));
      else if (G_VALUE_HOLDS_INT (&v))
        assert_int_equal (g_value_get_int (&v), g_variant_get_int32 (def));
      else if (G_VALUE_HOLDS_DOUBLE (&v))
        assert_float_equal (g_value_get_double (&v), g_variant_get_double (def), 0.0);
      else
        fail_msg ("key %s: unexpected type", *k);
      g_value_unset (&v);
    }
  /* And with the schema, the default object persists. */
  assert_true (qv_preferences_is_persistent (qv_preferences_get_default ()));
}

/* Headless commands need no display and no bus. */
static void
test_headless_commands (void **state)
{
  const char *quaver = g_getenv ("QUAVER");
  char *argv_modes[] = { (char *) quaver, (char *) "modes", (char *) "--demo", NULL };
  char *argv_version[] = { (char *) quaver, (char *) "--version", NULL };
  g_auto(GStrv) env = g_get_environ ();
  g_autofree char *out = NULL;
  int status = -1;

  env = g_environ_unsetenv (env, "DISPLAY");
  env = g_environ_unsetenv (env, "WAYLAND_DISPLAY");
  env = g_environ_unsetenv (env, "DBUS_SESSION_BUS_ADDRESS");
  assert_true (g_spawn_sync (NULL, argv_modes, env, G_SPAWN_STDERR_TO_DEV_NULL, NULL, NULL, &out, NULL,
                             &status, NULL));
  assert_true (g_spawn_check_wait_status (status, NULL));
  assert_non_null (strstr (out, "C2H6O"));
  g_clear_pointer (&out, g_free);
  assert_true (g_spawn_sync (NULL, argv_version, env, 0, NULL, NULL, &out, NULL, &status, NULL));
  assert_true (g_spawn_check_wait_status (status, NULL));
  assert_true (g_str_has_prefix (out, "quaver "));
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_startup_clean),
    cmocka_unit_test (test_level_changes_turning_points),
    cmocka_unit_test (test_sort_numeric),
    cmocka_unit_test (test_animation_step),
    cmocka_unit_test (test_snapshot),
    cmocka_unit_test (test_broken_file),
    cmocka_unit_test (test_mass_edit),
    cmocka_unit_test (test_cancel_keeps_document),
    cmocka_unit_test (test_preferences_match_schema),
    cmocka_unit_test (test_headless_commands),
  };

  int status;

  log_caught = g_ptr_array_new_with_free_func (g_free);
  g_log_set_writer_func (log_writer, NULL, NULL);
  qvg_app ();
  if (g_getenv ("QV_TEST_FILTER"))
    cmocka_set_test_filter (g_getenv ("QV_TEST_FILTER"));
  status = cmocka_run_group_tests (tests, NULL, NULL);
  /* The cancel test abandons a worker inside LAPACK; returning from main
   * under it would run OpenBLAS's exit handlers while it computes. Wait
   * for it as the app's exit path does (qv_gui_run leaves with _exit). */
  for (int i = 0; i < 1200 && qv_document_running_workers () > 0; i++)
    qvg_spin (0.1);
  return status;
}
