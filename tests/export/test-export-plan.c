/* test-export-plan.c — qv-export, the planned export the CLI and the app's
 * export pane share: the plan names exactly the files that get written, an
 * ensemble's samples do not depend on how they are split into files, a
 * cancelled export leaves no manifest, and an export is written once
 * (cmocka). The demo's numbers themselves are checked against NumPy and
 * closed forms in test_displace.py and tests/cross.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <math.h>
#include <string.h>
#include <cmocka.h>
#include <glib.h>
#include <glib/gstdio.h>
#include "qv-error.h"
#include "qv-export.h"
#include "qv-input.h"
#include "qv-solver.h"

typedef struct {
  QvInput *input;
  QvModeSet *modes;
  char *tmp;
} Fixture;

static int
setup (void **state)
{
  Fixture *f = g_new0 (Fixture, 1);
  QvInputOptions io = { .demo = TRUE };
  QvSolveOptions so;
  g_autoptr(GError) error = NULL;

  f->input = qv_input_load (&io, &error);
  assert_non_null (f->input);
  qv_solve_options_init (&so);
  f->modes = qv_solve (f->input->structure, qv_hessian_copy (f->input->hessian, NULL), &so, NULL,
                       &error);
  assert_non_null (f->modes);
  f->tmp = g_dir_make_tmp ("qv-export-plan-XXXXXX", &error);
  assert_non_null (f->tmp);
  *state = f;
  return 0;
}

static void
remove_tree (const char *path)
{
  GDir *dir = g_dir_open (path, 0, NULL);
  const char *name;

  if (dir == NULL)
    {
      g_remove (path);
      return;
    }
  while ((name = g_dir_read_name (dir)))
    {
      g_autofree char *child = g_build_filename (path, name, NULL);
      remove_tree (child);
    }
  g_dir_close (dir);
  g_rmdir (path);
}

static int
teardown (void **state)
{
  Fixture *f = *state;
  remove_tree (f->tmp);
  g_free (f->tmp);
  qv_mode_set_free (f->modes);
  qv_input_free (f->input);
  g_free (f);
  return 0;
}

/* The names in a directory, NULL-terminated. */
static GStrv
listing (const char *path)
{
  GDir *dir = g_dir_open (path, 0, NULL);
  GPtrArray *names = g_ptr_array_new ();
  const char *name;

  assert_non_null (dir);
  while ((name = g_dir_read_name (dir)))
    g_ptr_array_add (names, g_strdup (name));
  g_dir_close (dir);
  g_ptr_array_add (names, NULL);
  return (GStrv) g_ptr_array_free (names, FALSE);
}

static gsize
first_real_mode (const QvModeSet *modes)
{
  for (gsize k = 0; k < modes->n_modes; k++)
    if (!qv_mode_set_is_imaginary (modes, k) && qv_mode_set_wavenumber (modes, k) > 100)
      return k;
  fail_msg ("the demo has no real mode above 100 cm-1");
  return 0;
}

/* A 5-point scan: the plan lists five files, the same five are written
 * (and then manifest.json), and the directory holds exactly those. */
static void
test_scan_plan_is_what_is_written (void **state)
{
  Fixture *f = *state;
  g_autoptr(GError) error = NULL;
  g_autoptr(QvExport) x = NULL;
  g_autofree char *dir = g_build_filename (f->tmp, "scan", NULL);
  g_autofree char *text = NULL;
  g_auto(GStrv) names = NULL;
  QvDisplaceRequest r;
  const char *const *written;
  gsize n_written;
  const gsize k = first_real_mode (f->modes);

  qv_displace_request_init (&r);
  r.kind = QV_DISPLACE_SCAN;
  r.points = 5;
  r.modes[0] = k;
  x = qv_export_new_displace (f->input->structure, f->modes, f->input->mass_model, &r, NULL,
                              qv_manifest_new ("displace"), &error);
  assert_non_null (x);
  assert_int_equal (qv_export_n_files (x), 5);
  assert_int_equal (qv_export_n_structures (x), 5);
  for (gsize i = 0; i < 5; i++)
    {
      g_autofree char *want = g_strdup_printf ("mode%" G_GSIZE_FORMAT "-scan-%02" G_GSIZE_FORMAT ".xyz",
                                               k + 1, i);
      assert_string_equal (qv_export_file_name (x, i), want);
      assert_string_equal (qv_export_structure_file (x, i), want);
    }
  text = qv_export_describe (x);
  assert_non_null (strstr (text, "5 structures"));
  assert_non_null (strstr (text, "manifest.json"));

  assert_true (qv_export_write (x, dir, FALSE, NULL, &error));
  written = qv_export_written (x, &n_written);
  assert_int_equal (n_written, 6);
  assert_string_equal (written[5], "manifest.json");
  names = listing (dir);
  assert_int_equal (g_strv_length (names), 6);
  for (gsize i = 0; i < 5; i++)
    assert_true (g_strv_contains ((const char *const *) names, qv_export_file_name (x, i)));
  assert_int_equal (qv_export_manifest (x)->files->len, 5);

  /* once only */
  assert_false (qv_export_write (x, dir, TRUE, NULL, &error));
  assert_non_null (error);
}

/* The same seed gives the same samples whether each goes into a file of its
 * own or all into one file: the per-file texts concatenated are the single
 * file, byte for byte. (That a sample does not depend on the block it is
 * generated in is the sampler's property, tests/unit/test-ensemble.c.) */
static void
test_ensemble_split_does_not_change_samples (void **state)
{
  Fixture *f = *state;
  g_autoptr(GError) error = NULL;
  g_autoptr(QvExport) each = NULL, one = NULL;
  g_autofree char *d1 = g_build_filename (f->tmp, "each", NULL);
  g_autofree char *d2 = g_build_filename (f->tmp, "one", NULL);
  g_autoptr(GString) joined = g_string_new (NULL);
  g_autofree char *single = NULL, *path = NULL;
  QvEnsembleOptions eo;
  QvExportFormat fmt;
  gsize length;

  qv_ensemble_options_init (&eo);
  eo.temperature = 500.0;
  eo.seed = 12345;
  qv_export_format_init (&fmt);
  each = qv_export_new_ensemble (f->input->structure, f->modes, &eo, 7, &fmt,
                                 qv_manifest_new ("ensemble"), &error);
  assert_non_null (each);
  assert_int_equal (qv_export_n_files (each), 7);
  assert_string_equal (qv_export_file_name (each, 0), "sample-0001.xyz");
  fmt.single_file = TRUE;
  one = qv_export_new_ensemble (f->input->structure, f->modes, &eo, 7, &fmt,
                                qv_manifest_new ("ensemble"), &error);
  assert_non_null (one);
  assert_int_equal (qv_export_n_files (one), 1);
  assert_int_equal (qv_export_n_structures (one), 7);
  assert_true (qv_export_write (each, d1, FALSE, NULL, &error));
  assert_true (qv_export_write (one, d2, FALSE, NULL, &error));
  for (gsize i = 0; i < 7; i++)
    {
      g_autofree char *p = g_build_filename (d1, qv_export_file_name (each, i), NULL);
      g_autofree char *t = NULL;
      assert_true (g_file_get_contents (p, &t, &length, NULL));
      g_string_append_len (joined, t, (gssize) length);
    }
  path = g_build_filename (d2, "ensemble.xyz", NULL);
  assert_true (g_file_get_contents (path, &single, &length, NULL));
  assert_int_equal (length, joined->len);
  assert_memory_equal (single, joined->str, length);
}

typedef struct {
  int calls, stop_at;
} Stopper;

static gboolean
stop_after (double fraction, const char *stage, gpointer data)
{
  Stopper *s = data;
  return ++s->calls < s->stop_at;
}

/* Cancelling between files: QV_ERROR_CANCELLED, the files before stay,
 * no manifest.json, and the message says the export is incomplete. */
static void
test_cancel_leaves_no_manifest (void **state)
{
  Fixture *f = *state;
  g_autoptr(GError) error = NULL;
  g_autoptr(QvExport) x = NULL;
  g_autofree char *dir = g_build_filename (f->tmp, "cancelled", NULL);
  g_auto(GStrv) names = NULL;
  QvDisplaceRequest r;
  /* call 1 is the start, then one after each file: stop after two files */
  Stopper stopper = { 0, 3 };
  QvProgress progress = { stop_after, &stopper };

  qv_displace_request_init (&r);
  r.kind = QV_DISPLACE_SCAN;
  r.points = 7;
  r.modes[0] = first_real_mode (f->modes);
  x = qv_export_new_displace (f->input->structure, f->modes, f->input->mass_model, &r, NULL,
                              qv_manifest_new ("displace"), &error);
  assert_non_null (x);
  assert_false (qv_export_write (x, dir, FALSE, &progress, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_CANCELLED));
  assert_non_null (strstr (error->message, "incomplete"));
  names = listing (dir);
  assert_int_equal (g_strv_length (names), 2);
  assert_false (g_strv_contains ((const char *const *) names, "manifest.json"));
}

/* A stencil: the reference plus 6 per atom; one file per structure only. */
static void
test_stencil_plan (void **state)
{
  Fixture *f = *state;
  g_autoptr(GError) error = NULL;
  g_autoptr(QvStencil) st = qv_stencil_new (f->input->structure->n_atoms, 0.01, NULL, 0, &error);
  g_autoptr(QvExport) x = NULL, bad = NULL;
  QvExportFormat fmt;

  assert_non_null (st);
  x = qv_export_new_stencil (f->input->structure, st, NULL, qv_manifest_new ("stencil"), &error);
  assert_non_null (x);
  assert_int_equal (qv_export_n_files (x), 6 * f->input->structure->n_atoms + 1);
  assert_string_equal (qv_export_file_name (x, 0), "reference.xyz");
  assert_string_equal (qv_export_file_name (x, 1), "disp-0001.xyz");
  qv_export_format_init (&fmt);
  fmt.single_file = TRUE;
  bad = qv_export_new_stencil (f->input->structure, st, &fmt, qv_manifest_new ("stencil"), &error);
  assert_null (bad);
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test_setup_teardown (test_scan_plan_is_what_is_written, setup, teardown),
    cmocka_unit_test_setup_teardown (test_ensemble_split_does_not_change_samples, setup, teardown),
    cmocka_unit_test_setup_teardown (test_cancel_leaves_no_manifest, setup, teardown),
    cmocka_unit_test_setup_teardown (test_stencil_plan, setup, teardown),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
