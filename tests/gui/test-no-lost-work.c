/* test-no-lost-work.c — the app does not lose work: closing a window with
 * unsaved mass edits (or, for a document that lives in a bundle, a changed
 * view) asks first, "Save as Bundle…" writes a bundle that opens again with
 * the edited masses and the view, no question without changes; and cancel
 * abandons a long load or solve at any point, leaving the earlier document
 * shown, after which the next load works.
 *
 * The expected masses come from the core's isotope table (qv-element.h),
 * the invented systems from gui-test-util.h (an elastic network). The
 * cancel latency is printed as a figure (docs/reliability.md), never
 * asserted: only the behaviour is.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <cmocka.h>
#include <glib/gstdio.h>
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "gui-test-util.h"
#include "qv-bundle.h"
#include "qv-document-save.h"
#include "qv-element.h"
#include "qv-hessian-writer.h"
#include "qv-window-save.h"

static char *tmp_dir;

static char *
tmp_path (const char *name)
{
  return g_build_filename (tmp_dir, name, NULL);
}

static QvWindow *
demo_window (void)
{
  QvWindow *window = qvg_window ();

  qv_window_open_demo (window);
  assert_true (qvg_wait (qvg_window_has_document, window, 60.0));
  return window;
}

static QvWindow *
bundle_window (const char *path)
{
  QvWindow *window = qvg_window ();
  g_autoptr(GFile) file = g_file_new_for_path (path);

  qv_window_open_file (window, file);
  assert_true (qvg_wait (qvg_window_has_document, window, 60.0));
  return window;
}

static gsize
first_hydrogen (QvWindow *window)
{
  const QvStructure *s = qv_document_get_structure (qv_window_get_document (window));
  for (gsize a = 0; a < s->n_atoms; a++)
    if (s->atoms[a].z == 1)
      return a;
  fail_msg ("no hydrogen");
  return 0;
}

static gboolean
masses_edited_and_idle (gpointer window)
{
  QvDocument *doc = qv_window_get_document (window);
  return doc && !qv_window_is_busy (window) && qv_document_get_masses_edited (doc);
}

static gboolean
masses_as_loaded_and_idle (gpointer window)
{
  QvDocument *doc = qv_window_get_document (window);
  return doc && !qv_window_is_busy (window) && !qv_document_get_masses_edited (doc);
}

/* Deuterium on the first hydrogen, solved. */
static void
edit_mass (QvWindow *window)
{
  qv_window_set_atom_isotope (window, first_hydrogen (window), 2);
  assert_true (qvg_wait (masses_edited_and_idle, window, 60.0));
}

typedef struct {
  QvWindow *window;          /* weak: NULL once the window is gone */
} Watch;

/* The tests' one watch. Global, not on a test's stack: a window that has
 * closed may be finalized only during a later test, and its weak pointer
 * then clears this slot; on a stack it would write into a dead frame (or
 * clear the next test's window). watch() moves the weak pointer. */
static Watch the_watch;

static void
watch (Watch *w, QvWindow *window)
{
  /* A closed window may still be alive (out of the application's list,
   * not yet finalized): its weak pointer must not clear the new one. */
  if (w->window != NULL)
    g_object_remove_weak_pointer (G_OBJECT (w->window), (gpointer *) &w->window);
  w->window = window;
  g_object_add_weak_pointer (G_OBJECT (window), (gpointer *) &w->window);
}

static gboolean
gone (gpointer data)
{
  return ((Watch *) data)->window == NULL;
}

static gboolean
asked (gpointer data)
{
  Watch *w = data;
  return w->window && qv_window_save_get_question (w->window) != NULL;
}

/* Closed: no longer one of the application's windows (app.quit's measure;
 * the object itself may outlive that a little). */
static gboolean
closed (gpointer data)
{
  Watch *w = data;
  return w->window == NULL
         || g_list_find (gtk_application_get_windows (GTK_APPLICATION (qvg_app ())), w->window) == NULL;
}

/* Closes and lets the main loop run: TRUE when the window is gone. */
static gboolean
close_and_see (Watch *w)
{
  gtk_window_close (GTK_WINDOW (w->window));
  qvg_spin (0.2);
  return closed (w);
}

static void
destroy (Watch *w)
{
  if (w->window)
    {
      gtk_window_destroy (GTK_WINDOW (w->window));
      qvg_wait (gone, w, 5.0);
    }
}

/* No changes: no question, the window closes (the demo, and a bundle). */
static void
test_no_question_without_changes (void **state)
{
  g_autofree char *path = tmp_path ("unchanged.quaver.json");
  g_autoptr(GError) error = NULL;

  watch (&the_watch, demo_window ());
  /* a rotation of the demo is not work to keep: it lives in no bundle */
  qv_window_view_along (the_watch.window, QV_VIEW_ALONG_X);
  assert_false (qv_document_save_has_unsaved (the_watch.window));
  assert_true (close_and_see (&the_watch));

  /* a bundle opened and closed untouched */
  watch (&the_watch, demo_window ());
  assert_true (qv_document_save_write (the_watch.window, path, FALSE, &error));
  destroy (&the_watch);
  watch (&the_watch, bundle_window (path));
  assert_false (qv_document_save_has_unsaved (the_watch.window));
  assert_true (close_and_see (&the_watch));
}

/* Edited masses: the question; Cancel keeps the window, Discard closes. */
static void
test_discard (void **state)
{

  watch (&the_watch, demo_window ());
  edit_mass (the_watch.window);
  assert_true (qv_document_save_has_unsaved (the_watch.window));
  assert_false (close_and_see (&the_watch));
  assert_true (qvg_wait (asked, &the_watch, 5.0));

  adw_message_dialog_response (qv_window_save_get_question (the_watch.window), "cancel");
  qvg_spin (0.2);
  assert_non_null (the_watch.window);
  assert_null (qv_window_save_get_question (the_watch.window));
  assert_true (qv_document_get_masses_edited (qv_window_get_document (the_watch.window)));

  /* asked again, and this time discarded */
  assert_false (close_and_see (&the_watch));
  assert_true (qvg_wait (asked, &the_watch, 5.0));
  adw_message_dialog_response (qv_window_save_get_question (the_watch.window), "discard");
  assert_true (qvg_wait (closed, &the_watch, 5.0));
}

/* Masses reset to those loaded: nothing unsaved any more. */
static void
test_reset_is_not_unsaved (void **state)
{

  watch (&the_watch, demo_window ());
  edit_mass (the_watch.window);
  qv_window_reset_masses (the_watch.window);
  assert_true (qvg_wait (masses_as_loaded_and_idle, the_watch.window, 60.0));
  assert_false (qv_document_save_has_unsaved (the_watch.window));
  assert_true (close_and_see (&the_watch));
}

/* Save as Bundle… from the question: the bundle is written, the window
 * closes, and the bundle opens again with the edited mass and the view. */
static void
test_save_then_reopen (void **state)
{
  g_autofree char *path = tmp_path ("edited.quaver.json");
  g_autoptr(GFile) file = g_file_new_for_path (path);
  const QvIsotope *deuterium = qv_isotope_lookup (1, 2);
  const double orientation[4] = { 0.2, -0.3, 0.1, 0.927361849549570 };
  QvBundleView before;
  gsize h;

  assert_non_null (deuterium);
  watch (&the_watch, demo_window ());
  h = first_hydrogen (the_watch.window);
  edit_mass (the_watch.window);
  qv_mode_view_set_orientation (qv_window_get_mode_view (the_watch.window), orientation);
  qv_mode_view_set_zoom (qv_window_get_mode_view (the_watch.window), 1.5);
  qv_mode_panel_select (qv_window_get_mode_panel (the_watch.window), 2);
  qvg_spin (0.1);
  qv_document_save_current_view (the_watch.window, &before);

  assert_false (close_and_see (&the_watch));
  assert_true (qvg_wait (asked, &the_watch, 5.0));
  adw_message_dialog_response (qv_window_save_get_question (the_watch.window), "save");
  qvg_spin (0.2);
  assert_non_null (the_watch.window);
  assert_non_null (qv_window_save_get_chooser (the_watch.window));
  /* the chooser as a user would answer it */
  {
    GtkFileChooser *chooser = GTK_FILE_CHOOSER (qv_window_save_get_chooser (the_watch.window));
    g_autoptr(GFile) folder = g_file_get_parent (file);
    assert_true (gtk_file_chooser_set_current_folder (chooser, folder, NULL));
    gtk_file_chooser_set_current_name (chooser, "edited.quaver.json");
    /* the chooser loads the folder before it answers with it */
    qvg_spin (1.0);
  }
  g_signal_emit_by_name (qv_window_save_get_chooser (the_watch.window), "response", GTK_RESPONSE_ACCEPT);
  assert_true (qvg_wait (closed, &the_watch, 10.0));
  assert_true (g_file_test (path, G_FILE_TEST_IS_REGULAR));

  /* the bundle as the reader sees it */
  {
    g_autoptr(GError) error = NULL;
    g_autoptr(QvBundle) b = qv_bundle_read_file (path, &error);
    assert_non_null (b);
    assert_int_equal (b->structure->atoms[h].mass_number, 2);
    assert_true (b->structure->atoms[h].mass == deuterium->mass);
    assert_non_null (b->hessian);
    assert_true (b->view.present && b->view.has_orientation);
    assert_int_equal (b->view.mode, 3);
  }

  /* and as the app opens it again */
  watch (&the_watch, bundle_window (path));
  {
    QvDocument *doc = qv_window_get_document (the_watch.window);
    QvBundleView after;
    assert_true (qv_document_get_structure (doc)->atoms[h].mass == deuterium->mass);
    /* loaded so: not an edit of this document, nothing unsaved */
    assert_false (qv_document_get_masses_edited (doc));
    assert_false (qv_document_save_has_unsaved (the_watch.window));
    assert_int_equal (qv_mode_panel_get_selected (qv_window_get_mode_panel (the_watch.window)), 2);
    qvg_spin (0.2);
    qv_document_save_current_view (the_watch.window, &after);
    assert_false (qv_document_save_views_differ (&before, &after));

    /* a document in a bundle: a changed view is unsaved work */
    qv_mode_panel_select (qv_window_get_mode_panel (the_watch.window), 4);
    assert_true (qv_document_save_has_unsaved (the_watch.window));
    assert_false (close_and_see (&the_watch));
    assert_true (qvg_wait (asked, &the_watch, 5.0));
    adw_message_dialog_response (qv_window_save_get_question (the_watch.window), "cancel");
    qvg_spin (0.1);
    /* saved over (the chooser would have asked): nothing unsaved, no question */
    {
      g_autoptr(GError) error = NULL;
      assert_true (qv_document_save_write (the_watch.window, path, TRUE, &error));
    }
    assert_false (qv_document_save_has_unsaved (the_watch.window));
  }
  assert_true (close_and_see (&the_watch));
}

/* An existing bundle is not replaced without consent. */
static void
test_no_overwrite (void **state)
{
  g_autofree char *path = tmp_path ("exists.quaver.json");
  g_autofree char *contents = NULL;
  g_autoptr(GError) error = NULL;

  assert_true (g_file_set_contents (path, "someone's file", -1, NULL));
  watch (&the_watch, demo_window ());
  assert_false (qv_document_save_write (the_watch.window, path, FALSE, &error));
  assert_non_null (error);
  assert_true (g_file_get_contents (path, &contents, NULL, NULL));
  assert_string_equal (contents, "someone's file");
  destroy (&the_watch);
}

/* app.quit asks every window with unsaved work and closes the others. */
static void
test_quit_asks (void **state)
{
  static Watch clean, edited;   /* not on the stack: see the_watch */

  watch (&clean, demo_window ());
  watch (&edited, demo_window ());
  edit_mass (edited.window);
  g_action_group_activate_action (G_ACTION_GROUP (qvg_app ()), "quit", NULL);
  assert_true (qvg_wait (closed, &clean, 5.0));
  assert_true (qvg_wait (asked, &edited, 5.0));
  assert_false (closed (&edited));
  adw_message_dialog_response (qv_window_save_get_question (edited.window), "discard");
  assert_true (qvg_wait (closed, &edited, 5.0));
}

/* ---- cancel ---- */

typedef struct {
  QvWindow *window;
  gint64 cancelled_at;
  gint64 idle_at;            /* the window says it is idle again */
  gint64 responsive_at;      /* the main loop ran a timer after it */
} Latency;

static gboolean
note_responsive (gpointer data)
{
  Latency *l = data;
  l->responsive_at = g_get_monotonic_time ();
  return G_SOURCE_REMOVE;
}

static gboolean
latency_done (gpointer data)
{
  return ((Latency *) data)->responsive_at != 0;
}

/* Cancels through the window's action as the Cancel button does, and
 * measures until the window is idle and its main loop runs again. */
static double
cancel_now (QvWindow *window, const char *where)
{
  Latency l = { window, 0, 0, 0 };

  assert_true (qv_window_is_busy (window));
  l.cancelled_at = g_get_monotonic_time ();
  g_action_group_activate_action (G_ACTION_GROUP (window), "cancel", NULL);
  g_timeout_add (1, note_responsive, &l);
  assert_true (qvg_wait (qvg_window_idle, window, 10.0));
  l.idle_at = g_get_monotonic_time ();
  assert_true (qvg_wait (latency_done, &l, 10.0));
  printf ("cancel %s: idle after %.3f ms, main loop running after %.3f ms\n", where,
          (double) (l.idle_at - l.cancelled_at) * 1e-3, (double) (l.responsive_at - l.cancelled_at) * 1e-3);
  return (double) (MAX (l.idle_at, l.responsive_at) - l.cancelled_at) * 1e-3;
}

static gboolean
solving (gpointer window)
{
  GtkProgressBar *bar = GTK_PROGRESS_BAR (gtk_widget_get_template_child (window, QV_TYPE_WINDOW,
                                                                         "progress_bar"));
  return !qv_window_is_busy (window) || gtk_progress_bar_get_fraction (bar) > 0.0;
}

static gboolean
workers_done (gpointer data)
{
  return qv_document_running_workers () == 0;
}

static void
write_system (gsize n, guint32 seed, const char *xyz, const char *npy)
{
  QvHessian *h = NULL;
  g_autoptr(QvStructure) s = qvg_spring_system (n, seed, &h);
  g_autoptr(GString) text = g_string_new (NULL);
  g_autoptr(GError) error = NULL;

  g_string_append_printf (text, "%zu\ninvented spring network for test-no-lost-work\n", s->n_atoms);
  for (gsize a = 0; a < s->n_atoms; a++)
    {
      char x[G_ASCII_DTOSTR_BUF_SIZE], y[G_ASCII_DTOSTR_BUF_SIZE], z[G_ASCII_DTOSTR_BUF_SIZE];
      g_string_append_printf (text, "%s %s %s %s\n", qv_element_from_z (s->atoms[a].z)->symbol,
                              g_ascii_dtostr (x, sizeof x, s->atoms[a].position[0]),
                              g_ascii_dtostr (y, sizeof y, s->atoms[a].position[1]),
                              g_ascii_dtostr (z, sizeof z, s->atoms[a].position[2]));
    }
  assert_true (g_file_set_contents (xyz, text->str, (gssize) text->len, NULL));
  assert_true (qv_hessian_write_file (npy, h, QV_HESSIAN_WRITE_NPY, NULL, TRUE, &error));
  qv_hessian_free (h);
}

/* A 1200-atom load (a 3600×3600 Hessian) cancelled while it reads and
 * while it solves, a mass re-solve cancelled, then loads that work. */
static void
test_cancel_anywhere (void **state)
{
  g_autofree char *xyz = tmp_path ("large.xyz"), *npy = tmp_path ("large.npy");
  g_autofree char *small_xyz = tmp_path ("small.xyz"), *small_npy = tmp_path ("small.npy");
  QvDocumentSource source = { .geometry = xyz, .hessian = npy, .hessian_units = (char *) "eV/A^2" };
  QvDocumentSource small = { .geometry = small_xyz, .hessian = small_npy,
                             .hessian_units = (char *) "eV/A^2" };
  QvDocument *demo;
  double worst = 0.0;

  write_system (1200, 11, xyz, npy);
  write_system (60, 12, small_xyz, small_npy);
  watch (&the_watch, demo_window ());
  demo = qv_window_get_document (the_watch.window);
  /* the new window's first frames (the GL driver's shaders) are drawn
   * before the clock starts */
  qvg_spin (1.0);

  /* at once: the worker is reading the files */
  qv_window_open_source (the_watch.window, &source);
  { const double ms = cancel_now (the_watch.window, "while reading"); worst = MAX (worst, ms); }
  assert_ptr_equal (qv_window_get_document (the_watch.window), demo);

  /* once the solver reports progress */
  qv_window_open_source (the_watch.window, &source);
  assert_true (qvg_wait (solving, the_watch.window, 120.0));
  if (qv_window_is_busy (the_watch.window))
    { const double ms = cancel_now (the_watch.window, "while solving"); worst = MAX (worst, ms); }
  else
    print_message ("the solve ended before it could be cancelled\n");
  assert_ptr_equal (qv_window_get_document (the_watch.window), demo);

  /* a mass re-solve of the shown document */
  qv_window_set_atom_isotope (the_watch.window, first_hydrogen (the_watch.window), 2);
  { const double ms = cancel_now (the_watch.window, "a mass re-solve"); worst = MAX (worst, ms); }
  assert_ptr_equal (qv_window_get_document (the_watch.window), demo);
  assert_false (qv_document_get_masses_edited (demo));

  /* the abandoned workers end and their results are dropped */
  assert_true (qvg_wait (workers_done, NULL, 600.0));
  qvg_spin (0.2);
  assert_ptr_equal (qv_window_get_document (the_watch.window), demo);
  assert_null (qv_window_get_error_dialog (the_watch.window));
  printf ("cancel: worst latency %.3f ms (target 1 s)\n", worst);

  /* the next load works */
  qv_window_open_source (the_watch.window, &small);
  assert_true (qvg_wait (qvg_window_has_document, the_watch.window, 120.0));
  assert_true (qv_window_get_document (the_watch.window) != demo);
  assert_int_equal (qv_document_get_structure (qv_window_get_document (the_watch.window))->n_atoms, 60);
  destroy (&the_watch);
  g_unlink (npy);
  g_unlink (xyz);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_no_question_without_changes),
    cmocka_unit_test (test_discard),
    cmocka_unit_test (test_reset_is_not_unsaved),
    cmocka_unit_test (test_save_then_reopen),
    cmocka_unit_test (test_no_overwrite),
    cmocka_unit_test (test_cancel_anywhere),
    cmocka_unit_test (test_quit_asks),
  };
  int status;

  tmp_dir = g_dir_make_tmp ("qv-no-lost-work-XXXXXX", NULL);
  qvg_app ();
  if (g_getenv ("QV_TEST_FILTER"))
    cmocka_set_test_filter (g_getenv ("QV_TEST_FILTER"));
  status = cmocka_run_group_tests (tests, NULL, NULL);
  /* abandoned workers must not run under the exit handlers (test-app.c) */
  for (int i = 0; i < 1200 && qv_document_running_workers () > 0; i++)
    qvg_spin (0.1);
  {
    GDir *d = g_dir_open (tmp_dir, 0, NULL);
    const char *name;
    while (d && (name = g_dir_read_name (d)) != NULL)
      {
        g_autofree char *p = tmp_path (name);
        g_unlink (p);
      }
    if (d)
      g_dir_close (d);
    g_rmdir (tmp_dir);
  }
  return status;
}
