/* test-lattice-app.c — a crystal in the app: the bundled demo crystal
 * opens on its lattice page, whose dispersion holds exactly what `quaver
 * bands` computes from the same inputs (the command is itself checked
 * against an independent NumPy D(q) in tests/lattice/test_bands_numpy.py);
 * a click on a branch shows that lattice mode on a block of cells with a
 * complex field, the read-out names the point, the cells spin rebuilds the
 * block, the plots save, and the supercell's own modes are one page away.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <cmocka.h>
#include <glib/gstdio.h>
#include <json-glib/json-glib.h>
#include <math.h>
#include <string.h>
#include "gui-test-util.h"
#include "qv-dispersion-plot.h"
#include "qv-error.h"
#include "qv-export-pane.h"
#include "qv-export-section-frozen.h"
#include "qv-export-section-stencil.h"
#include "qv-symmetric-stencil.h"
#include "qv-window-private.h"
#include "qv-xyz.h"

#define CRYSTAL_DIR "data/examples/rocksalt-springs"

static char *
source_path (const char *relative)
{
  return g_build_filename (g_getenv ("QV_SOURCE_ROOT"), relative, NULL);
}

static QvWindow *
open_crystal (void)
{
  QvWindow *window = qvg_window ();
  g_autofree char *path = source_path (CRYSTAL_DIR "/mx.quaver.json");
  QvDocumentSource source = { .geometry = path };

  qv_window_open_source (window, &source);
  assert_true (qvg_wait (qvg_window_has_document, window, 120.0));
  assert_true (qvg_wait (qvg_window_idle, window, 120.0));
  qvg_spin (0.3);
  return window;
}

/* `quaver bands` on the same crystal as plain files, as JSON. */
static JsonParser *
bands_from_cli (void)
{
  g_autofree char *dir = source_path (CRYSTAL_DIR);
  const char *argv[] = { g_getenv ("QUAVER"), "bands", "mx-primitive.xyz", "-S", "mx-supercell.xyz",
                         "-H", "mx.hessian.npy", "-u", "eV/A^2", "--born", "mx.born.txt",
                         "--points", G_STRINGIFY (QV_DOCUMENT_LATTICE_PATH_POINTS), "-f", "json",
                         NULL };
  g_autofree char *out = NULL, *err = NULL;
  int status = -1;
  JsonParser *parser = json_parser_new ();

  assert_true (g_spawn_sync (dir, (char **) argv, NULL, G_SPAWN_DEFAULT, NULL, NULL, &out, &err,
                             &status, NULL));
  if (status != 0)
    print_error ("quaver bands: %s\n", err);
  assert_int_equal (status, 0);
  assert_true (json_parser_load_from_data (parser, out, -1, NULL));
  return parser;
}

static void
test_dispersion_is_the_commands (void **state)
{
  QvWindow *window = open_crystal ();
  QvDocument *doc = qv_window_get_document (window);
  const QvDocumentLattice *l = qv_document_get_lattice (doc);
  g_autoptr(JsonParser) parser = bands_from_cli ();
  JsonArray *points = json_object_get_array_member (json_node_get_object (json_parser_get_root (parser)),
                                                    "points");
  double worst = 0;
  (void) state;

  assert_non_null (l);
  assert_non_null (l->bands);
  assert_string_equal (qv_window_get_side_page (window), "lattice");
  assert_true (qv_window_get_side_switcher_visible (window));
  /* rock salt: space group Fm-3m, No. 225 (International Tables for
   * Crystallography A; common knowledge) */
  assert_string_equal (l->space_group, "Fm-3m (225)");
  /* the conventional cell of an fcc lattice: the cube of edge a (5.64 Å in
   * the generator, tests/tools/make-demo-crystal.py) holding 4 primitive
   * cells, 8 atoms */
  assert_true (l->has_conventional);
  for (int i = 0; i < 3; i++)
    {
      assert_true (fabs (l->conventional[i] - 5.64) < 1e-6);
      assert_true (fabs (l->conventional[3 + i] - 90.0) < 1e-6);
    }
  assert_int_equal (l->conventional_atoms, 8);
  assert_non_null (l->crystal->na);
  assert_int_equal (json_array_get_length (points), l->sampling->n_q);
  for (gsize k = 0; k < l->sampling->n_q; k++)
    {
      JsonObject *p = json_array_get_object_element (points, (guint) k);
      JsonArray *w = json_object_get_array_member (p, "wavenumbers");
      JsonArray *q = json_object_get_array_member (p, "q");
      assert_int_equal (json_array_get_length (w), l->n_branches);
      for (int c = 0; c < 3; c++)
        assert_true (fabs (json_array_get_double_element (q, c) - l->sampling->q[3 * k + c]) < 1e-6);
      for (gsize b = 0; b < l->n_branches; b++)
        worst = MAX (worst, fabs (json_array_get_double_element (w, (guint) b)
                                  - l->bands[k * l->n_branches + b]));
    }
  /* the command prints 4 decimals; the Γ zeros are rounding noise */
  assert_true (worst < 1e-3);
  /* the DOS and thermal properties are there too */
  assert_non_null (l->dos);
  assert_non_null (l->thermal);
  gtk_window_destroy (GTK_WINDOW (window));
}

static void
test_click_shows_lattice_mode (void **state)
{
  QvWindow *window = open_crystal ();
  QvDocument *doc = qv_window_get_document (window);
  const QvDocumentLattice *l = qv_document_get_lattice (doc);
  QvLatticePane *pane = qv_window_get_lattice_pane (window);
  QvModeView *view = qv_window_get_mode_view (window);
  GtkWidget *area = qv_lattice_pane_get_dispersion_area (pane);
  QvDispersionPlotOptions o;
  double px, py;
  int k, b, cells;
  gsize target_q;
  g_autofree char *text = NULL;
  (void) state;

  /* opened on a zone-boundary mode, shown on a block of cells */
  qv_lattice_pane_get_selected (pane, &k, &b);
  assert_true (k > 0);
  cells = qv_lattice_pane_get_cells (pane);
  assert_int_equal (qv_mode_view_get_n_atoms (view), (gsize) (2 * cells * cells * cells));

  /* aim at the lowest branch at the L point (a label of the path) */
  target_q = l->sampling->label_index[5];
  assert_true (strstr (l->sampling->labels[5], "L") != NULL);
  qv_dispersion_plot_options_init (&o);
  o.width = gtk_widget_get_width (area);
  o.height = gtk_widget_get_height (area);
  assert_true (o.width > 100 && o.height > 100);
  {
    /* the lowest branch at that q in the connected order */
    gsize low = 0;
    for (gsize j = 1; j < l->n_branches; j++)
      if (l->bands[target_q * l->n_branches + j] < l->bands[target_q * l->n_branches + low])
        low = j;
    assert_true (qv_dispersion_plot_point_to_pixel (l->sampling, l->n_branches, l->bands, &o,
                                                    target_q, low, &px, &py));
    assert_true (qv_lattice_pane_click (pane, px, py));
    qv_lattice_pane_get_selected (pane, &k, &b);
    assert_int_equal (k, (int) target_q);
    /* degenerate transverse branches at L: any of them */
    assert_true (fabs (l->bands[target_q * l->n_branches + (gsize) b]
                       - l->bands[target_q * l->n_branches + low]) < 1e-6);
  }
  qvg_spin (0.2);
  assert_true (qv_mode_view_is_complex (view));
  assert_non_null (strstr (qv_motion_bar_get_summary (qv_window_get_motion_bar (window)), "0.300"));
  /* the window may still have been settling its layout: aim anew */
  o.width = gtk_widget_get_width (area);
  o.height = gtk_widget_get_height (area);
  assert_true (qv_dispersion_plot_point_to_pixel (l->sampling, l->n_branches, l->bands, &o,
                                                  target_q, (gsize) b, &px, &py));
  text = qv_lattice_pane_describe_point (pane, px, py);
  if (strstr (text, " L ") == NULL)
    print_error ("read-out at (%g, %g): '%s'\n", px, py, text);
  assert_non_null (strstr (text, " L "));
  assert_non_null (strstr (text, "q = (0.500 0.500 0.500)"));

  /* a miss selects nothing new */
  assert_false (qv_lattice_pane_click (pane, 2, 2));

  /* two cells along each vector: 16 atoms */
  g_object_set (pane, "cells", 2, NULL);
  qvg_spin (0.2);
  assert_int_equal (qv_mode_view_get_n_atoms (view), 16);

  /* the supercell's own modes: its 54 atoms, a real mode */
  qv_window_show_side_page (window, "modes");
  qvg_spin (0.2);
  assert_int_equal (qv_mode_view_get_n_atoms (view), 54);
  assert_false (qv_mode_view_is_complex (view));
  qv_window_show_side_page (window, "lattice");
  qvg_spin (0.2);
  assert_int_equal (qv_mode_view_get_n_atoms (view), 16);
  gtk_window_destroy (GTK_WINDOW (window));
}

static gboolean
file_starts_with (const char *path, const char *magic, gsize n)
{
  g_autofree char *data = NULL;
  gsize length = 0;
  return g_file_get_contents (path, &data, &length, NULL) && length > n && memcmp (data, magic, n) == 0;
}

static void
test_save (void **state)
{
  QvWindow *window = open_crystal ();
  QvLatticePane *pane = qv_window_get_lattice_pane (window);
  g_autofree char *dir = g_dir_make_tmp ("qv-lattice-XXXXXX", NULL);
  g_autofree char *svg = g_build_filename (dir, "bands.svg", NULL);
  g_autofree char *png = g_build_filename (dir, "bands.png", NULL);
  g_autofree char *bad = g_build_filename (dir, "bands.doc", NULL);
  g_autoptr(GError) error = NULL;
  (void) state;

  assert_true (qv_lattice_pane_save (pane, svg, FALSE, &error));
  assert_true (qv_lattice_pane_save (pane, png, FALSE, &error));
  assert_true (file_starts_with (png, "\x89PNG\r\n\x1a\n", 8));
  {
    g_autofree char *data = NULL;
    assert_true (g_file_get_contents (svg, &data, NULL, NULL));
    assert_non_null (strstr (data, "<svg"));
  }
  /* not overwritten without being asked */
  assert_false (qv_lattice_pane_save (pane, svg, FALSE, &error));
  g_clear_error (&error);
  assert_true (qv_lattice_pane_save (pane, svg, TRUE, &error));
  assert_false (qv_lattice_pane_save (pane, bad, FALSE, &error));
  assert_non_null (strstr (error->message, ".svg"));
  g_clear_error (&error);
  g_unlink (svg);
  g_unlink (png);
  g_rmdir (dir);
  gtk_window_destroy (GTK_WINDOW (window));
}

static JsonParser *
run_json (const char *dir, const char *const *argv)
{
  g_autofree char *out = NULL, *err = NULL;
  int status = -1;
  JsonParser *parser = json_parser_new ();

  assert_true (g_spawn_sync (dir, (char **) argv, NULL, G_SPAWN_DEFAULT, NULL, NULL, &out, &err,
                             &status, NULL));
  if (status != 0)
    print_error ("%s: %s\n", argv[1], err);
  assert_int_equal (status, 0);
  assert_true (json_parser_load_from_data (parser, out, -1, NULL));
  return parser;
}

static JsonParser *
read_json (const char *path)
{
  JsonParser *parser = json_parser_new ();
  assert_true (json_parser_load_from_file (parser, path, NULL));
  return parser;
}

static double
max_difference (JsonObject *a, JsonObject *b, const char *member)
{
  JsonArray *x = json_object_get_array_member (a, member), *y = json_object_get_array_member (b, member);
  double worst = 0;
  assert_int_equal (json_array_get_length (x), json_array_get_length (y));
  for (guint i = 0; i < json_array_get_length (x); i++)
    worst = MAX (worst, fabs (json_array_get_double_element (x, i) - json_array_get_double_element (y, i)));
  return worst;
}

/* The thermal table the app saves is `quaver thermo` on the same files
 * and mesh (the command is checked against NumPy in test_thermo_numpy.py
 * and Dulong–Petit in test-dos.c); the DOS integrates to 3n = 6 states;
 * the read-outs name what is under the pointer. */
static void
test_dos_and_thermal (void **state)
{
  QvWindow *window = open_crystal ();
  QvLatticePane *pane = qv_window_get_lattice_pane (window);
  const QvDocumentLattice *l = qv_document_get_lattice (qv_window_get_document (window));
  g_autofree char *src = source_path (CRYSTAL_DIR);
  g_autofree char *dir = g_dir_make_tmp ("qv-lattice-XXXXXX", NULL);
  g_autofree char *thermal = g_build_filename (dir, "thermal.json", NULL);
  g_autofree char *dos = g_build_filename (dir, "dos.json", NULL);
  g_autofree char *mesh = g_strdup_printf ("%dx%dx%d", l->mesh[0], l->mesh[1], l->mesh[2]);
  const char *argv[] = { g_getenv ("QUAVER"), "thermo", "mx-primitive.xyz", "-S", "mx-supercell.xyz",
                         "-H", "mx.hessian.npy", "-u", "eV/A^2", "--born", "mx.born.txt", "--mesh",
                         mesh, "--t-max", "1000", "--t-step", "10", "-f", "json", NULL };
  g_autoptr(JsonParser) cli = run_json (src, argv);
  g_autoptr(JsonParser) app = NULL, app_dos = NULL;
  g_autoptr(GError) error = NULL;
  JsonObject *a, *c;
  g_autofree char *text = NULL;
  (void) state;

  qv_lattice_pane_show_plot (pane, "thermal");
  qvg_spin (0.3);
  assert_true (qv_lattice_pane_save (pane, thermal, FALSE, &error));
  app = read_json (thermal);
  a = json_node_get_object (json_parser_get_root (app));
  c = json_node_get_object (json_parser_get_root (cli));
  assert_int_equal (json_object_get_int_member (a, "n_q"), json_object_get_int_member (c, "n_q"));
  assert_true (max_difference (a, c, "T") == 0);
  assert_true (max_difference (a, c, "S") < 1e-9);
  assert_true (max_difference (a, c, "Cv") < 1e-9);
  assert_true (max_difference (a, c, "F") < 1e-9);
  /* read-out in the middle of the plot: a temperature and F, S, Cv */
  text = qv_lattice_pane_describe_point (pane, gtk_widget_get_width (GTK_WIDGET (pane)) / 2.0,
                                         gtk_widget_get_height (GTK_WIDGET (pane)) / 2.0);
  assert_non_null (strstr (text, " K · F "));
  g_clear_pointer (&text, g_free);

  qv_lattice_pane_show_plot (pane, "dos");
  qvg_spin (0.3);
  assert_true (qv_lattice_pane_save (pane, dos, FALSE, &error));
  app_dos = read_json (dos);
  {
    JsonObject *d = json_node_get_object (json_parser_get_root (app_dos));
    JsonArray *total = json_object_get_array_member (d, "total");
    double sum = 0, step = json_object_get_double_member (d, "step");
    for (guint i = 0; i < json_array_get_length (total); i++)
      sum += json_array_get_double_element (total, i) * step;
    /* 3 branches per site, 2 sites (tetrahedron bins hold exact counts) */
    assert_true (fabs (sum - 6.0) < 1e-6);
  }
  text = qv_lattice_pane_describe_point (pane, gtk_widget_get_width (GTK_WIDGET (pane)) / 2.0,
                                         gtk_widget_get_height (GTK_WIDGET (pane)) / 2.0);
  assert_non_null (strstr (text, "DOS"));
  assert_non_null (strstr (text, "Na"));
  g_unlink (thermal);
  g_unlink (dos);
  g_rmdir (dir);
  gtk_window_destroy (GTK_WINDOW (window));
}

/* The export pane offers the symmetry-reduced stencil for the periodic
 * supercell: its file count is the core's count of symmetry-distinct
 * displacements (checked against the full stencil's Hessian in
 * test-symmetric-stencil.c) plus the reference. */
static void
test_symmetric_stencil_offered (void **state)
{
  QvWindow *window = open_crystal ();
  QvExportPane *pane = qv_window_get_export_pane (window);
  QvExportSectionStencil *stencil;
  const QvStructure *sc = qv_document_get_structure (qv_window_get_document (window));
  g_autoptr(GError) error = NULL;
  QvSymmetricStencil *st = qv_symmetric_stencil_new (sc, 0.01, 0, &error);
  gsize n;
  (void) state;

  g_action_group_activate_action (G_ACTION_GROUP (window), "toggle-export-pane", NULL);
  qvg_spin (0.5);
  stencil = QV_EXPORT_SECTION_STENCIL (qv_export_pane_get_section (pane, "stencil", TRUE));
  qvg_spin (0.2);
  assert_non_null (st);
  n = qv_symmetric_stencil_n_displacements (st);
  qv_symmetric_stencil_free (st);
  assert_int_equal (qv_export_section_stencil_get_n_files (stencil), 6 * sc->n_atoms + 1);
  qv_export_section_stencil_set_symmetric (stencil, TRUE);
  qvg_spin (0.2);
  assert_int_equal (qv_export_section_stencil_get_n_files (stencil), n + 1);
  /* rock salt: both sites have the full cubic site symmetry, so a handful
   * of displacements replace 6N = 324 */
  assert_true (n < 12);
  gtk_window_destroy (GTK_WINDOW (window));
}

/* Atoms and the comment line of a frozen phonon's file. */
static QvStructure *
read_frozen (const char *dir, char **comment)
{
  g_autofree char *path = g_build_filename (dir, "frozen-phonon.xyz", NULL);
  g_autofree char *text = NULL;
  g_autoptr(GError) error = NULL;
  g_autoptr(GPtrArray) frames = NULL;

  assert_true (g_file_get_contents (path, &text, NULL, &error));
  *comment = g_strdup (strchr (text, '\n') + 1);
  *strchr (*comment, '\n') = '\0';
  frames = qv_xyz_read_file (path, &error);
  if (frames == NULL)
    print_error ("%s\n", error->message);
  assert_non_null (frames);
  assert_int_equal (frames->len, 1);
  return qv_structure_copy (frames->pdata[0]);
}

static gboolean
writer_idle (gpointer writer)
{
  return !qv_export_writer_is_busy (writer);
}

/* The export pane's frozen phonon: a click on the highest branch at X
 * (which the document's 3×3×3 supercell does not fit) offers a 2×1×2
 * supercell, and what the app writes is what `quaver frozen-phonon
 * --cell 2x1x2` writes from the same files (the command is checked against
 * LAPACK's eigenvectors of D(q) in tests/lattice/test-frozen.c and a NumPy
 * D(q) in test_frozen_numpy.py): the same atoms to 1e-9 Å and the same q,
 * branch, wavenumber and amplitude on the comment line. */
static void
test_frozen_phonon_is_the_commands (void **state)
{
  QvWindow *window = open_crystal ();
  const QvDocumentLattice *l = qv_document_get_lattice (qv_window_get_document (window));
  QvLatticePane *lattice = qv_window_get_lattice_pane (window);
  GtkWidget *area = qv_lattice_pane_get_dispersion_area (lattice);
  QvExportPane *pane = qv_window_get_export_pane (window);
  QvExportSectionFrozen *frozen;
  QvDispersionPlotOptions o;
  g_autoptr(GError) error = NULL;
  g_autofree char *tmp = g_dir_make_tmp ("qv-frozen-app-XXXXXX", &error);
  g_autofree char *app_dir = g_build_filename (tmp, "app", NULL);
  g_autofree char *cli_dir = g_build_filename (tmp, "cli", NULL);
  g_autofree char *manifest = g_build_filename (app_dir, "manifest.json", NULL);
  gsize x = G_MAXSIZE, top = 0, branch = 0;
  double q[3], px, py;
  int m[3][3];
  (void) state;

  assert_non_null (tmp);
  g_action_group_activate_action (G_ACTION_GROUP (window), "toggle-export-pane", NULL);
  qvg_spin (0.5);
  frozen = QV_EXPORT_SECTION_FROZEN (qv_export_pane_get_section (pane, "frozen", TRUE));
  assert_true (gtk_widget_get_visible (gtk_widget_get_ancestor (GTK_WIDGET (frozen), GTK_TYPE_EXPANDER)));
  qvg_spin (0.2);

  for (gsize i = 0; i < l->sampling->n_labels; i++)
    if (g_str_equal (l->sampling->labels[i], "X"))
      x = l->sampling->label_index[i];
  assert_true (x != G_MAXSIZE);
  for (gsize j = 1; j < l->n_branches; j++)
    if (l->bands[x * l->n_branches + j] > l->bands[x * l->n_branches + top])
      top = j;
  qv_dispersion_plot_options_init (&o);
  o.width = gtk_widget_get_width (area);
  o.height = gtk_widget_get_height (area);
  assert_true (qv_dispersion_plot_point_to_pixel (l->sampling, l->n_branches, l->bands, &o, x, top, &px, &py));
  assert_true (qv_lattice_pane_click (lattice, px, py));
  qvg_spin (0.2);

  qv_export_section_frozen_set_amplitude (frozen, 0.04, 30);
  qvg_spin (0.1);
  if (!qv_export_section_frozen_get_plan (frozen, q, &branch, m))
    print_error ("no plan: %s\n", qv_export_section_frozen_get_message (frozen));
  assert_true (qv_export_section_frozen_get_plan (frozen, q, &branch, m));
  assert_true (fabs (q[0] - 0.5) < 1e-12 && fabs (q[1]) < 1e-12 && fabs (q[2] - 0.5) < 1e-12);
  assert_int_equal (branch, l->n_branches - 1);          /* the highest, in ascending order */
  assert_int_equal (m[0][0], 2);
  assert_int_equal (m[1][1], 1);
  assert_int_equal (m[2][2], 2);
  assert_non_null (strstr (qv_export_section_frozen_get_mode_text (frozen), "X = (0.5 0 0.5)"));

  qv_export_writer_write_to (qv_export_section_frozen_get_writer (frozen), app_dir, FALSE);
  assert_true (qvg_wait (writer_idle, qv_export_section_frozen_get_writer (frozen), 60.0));
  if (qv_export_writer_get_error (qv_export_section_frozen_get_writer (frozen)))
    print_error ("%s\n", qv_export_writer_get_error (qv_export_section_frozen_get_writer (frozen))->message);
  assert_null (qv_export_writer_get_error (qv_export_section_frozen_get_writer (frozen)));
  assert_true (g_file_test (manifest, G_FILE_TEST_IS_REGULAR));

  {
    g_autofree char *dir = source_path (CRYSTAL_DIR);
    g_autofree char *branch_arg = g_strdup_printf ("%zu", branch + 1);
    const char *argv[] = { "frozen-phonon", "mx-primitive.xyz", "-S", "mx-supercell.xyz",
                           "-H", "mx.hessian.npy", "-u", "eV/A^2", "--born", "mx.born.txt",
                           "--q", "0.5 0 0.5", "--branch", branch_arg, "--largest", "0.04",
                           "--phase", "30", "--cell", "2x1x2", "-o", cli_dir, NULL };
    g_autofree char *out = qvg_run_quaver (dir, argv);
    g_autofree char *app_comment = NULL, *cli_comment = NULL;
    g_autoptr(QvStructure) a = NULL, c = NULL;

    assert_non_null (out);
    a = read_frozen (app_dir, &app_comment);
    c = read_frozen (cli_dir, &cli_comment);
    assert_int_equal (a->n_atoms, 8);
    assert_int_equal (a->n_atoms, c->n_atoms);
    for (gsize i = 0; i < a->n_atoms; i++)
      {
        assert_int_equal (a->atoms[i].z, c->atoms[i].z);
        for (int k = 0; k < 3; k++)
          assert_true (fabs (a->atoms[i].position[k] - c->atoms[i].position[k]) < 1e-9);
      }
    assert_string_equal (app_comment, cli_comment);
  }
  /* written once: the same folder again is refused, nothing replaced */
  qv_export_writer_write_to (qv_export_section_frozen_get_writer (frozen), app_dir, FALSE);
  assert_true (qvg_wait (writer_idle, qv_export_section_frozen_get_writer (frozen), 60.0));
  assert_non_null (qv_export_writer_get_error (qv_export_section_frozen_get_writer (frozen)));
  gtk_window_destroy (GTK_WINDOW (window));
  qvg_remove_tree (tmp);
}

static gboolean
masses_edited_and_idle (gpointer window)
{
  return qv_document_get_masses_edited (qv_window_get_document (window)) && qvg_window_idle (window);
}

/* A mass edit re-solves the supercell's modes; the lattice page keeps the
 * loaded masses and says so. */
static void
test_mass_edit_noted (void **state)
{
  QvWindow *window = open_crystal ();
  QvLatticePane *pane = qv_window_get_lattice_pane (window);
  const QvStructure *s = qv_document_get_structure (qv_window_get_document (window));
  gsize cl = 0;
  (void) state;

  assert_null (strstr (qv_lattice_pane_get_info (pane), "masses as loaded"));
  while (cl < s->n_atoms && s->atoms[cl].z != 17)
    cl++;
  assert_true (cl < s->n_atoms);
  qv_window_set_atom_isotope (window, cl, 37);
  assert_true (qvg_wait (masses_edited_and_idle, window, 60.0));
  assert_non_null (qv_document_get_lattice (qv_window_get_document (window)));
  assert_non_null (strstr (qv_lattice_pane_get_info (pane), "masses as loaded"));
  gtk_window_destroy (GTK_WINDOW (window));
}

/* A molecule has no lattice page. */
static void
test_molecule_has_no_lattice (void **state)
{
  QvWindow *window = qvg_window ();
  (void) state;

  qv_window_open_demo (window);
  assert_true (qvg_wait (qvg_window_has_document, window, 60.0));
  assert_true (qvg_wait (qvg_window_idle, window, 60.0));
  assert_null (qv_document_get_lattice (qv_window_get_document (window)));
  assert_string_equal (qv_window_get_side_page (window), "modes");
  {
    /* the side panel offers no Lattice page */
    GtkWidget *pane = GTK_WIDGET (qv_window_get_lattice_pane (window));
    GtkStack *stack = GTK_STACK (gtk_widget_get_ancestor (pane, GTK_TYPE_STACK));
    GtkStackPage *page = gtk_stack_get_page (stack, pane);
    assert_false (gtk_stack_page_get_visible (page) && qv_window_get_side_switcher_visible (window));
  }
  {
    /* nor a frozen phonon in the export pane */
    QvExportPane *pane = qv_window_get_export_pane (window);
    g_action_group_activate_action (G_ACTION_GROUP (window), "toggle-export-pane", NULL);
    qvg_spin (0.5);
    assert_false (gtk_widget_get_visible (gtk_widget_get_ancestor (qv_export_pane_get_section (pane, "frozen", FALSE),
                                                                   GTK_TYPE_EXPANDER)));
  }
  gtk_window_destroy (GTK_WINDOW (window));
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_dispersion_is_the_commands),
    cmocka_unit_test (test_click_shows_lattice_mode),
    cmocka_unit_test (test_save),
    cmocka_unit_test (test_dos_and_thermal),
    cmocka_unit_test (test_symmetric_stencil_offered),
    cmocka_unit_test (test_frozen_phonon_is_the_commands),
    cmocka_unit_test (test_mass_edit_noted),
    cmocka_unit_test (test_molecule_has_no_lattice),
  };
  qvg_app ();
  return cmocka_run_group_tests (tests, NULL, NULL);
}
