/* test-character.c — what the app says each mode is: the symmetry column
 * and the point group, the make-up in the detail, the spectrum pane whose
 * peaks select modes, and the compare window's heat map and CSV. Every
 * expected value comes from the core's own functions called here on modes
 * solved here (the app must show what the core computes), from `quaver
 * compare` (the CSV), or from a textbook count (formaldehyde's species).
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
#include "qv-error.h"
#include "qv-input.h"
#include "qv-intensity.h"
#include "qv-mode-character.h"
#include "qv-mode-comparison.h"
#include "qv-mode-item.h"
#include "qv-point-group.h"
#include "qv-solver.h"
#include "qv-symmetry-modes.h"

#define COL_SYMMETRY 5

static char *
source_path (const char *relative)
{
  return g_build_filename (g_getenv ("QV_SOURCE_ROOT"), relative, NULL);
}

#define DEMO_BUNDLE "data/examples/ethanol-unconverged/ethanol.quaver.json"
#define STABLE_BUNDLE "data/examples/formaldehyde/formaldehyde.quaver.json"

/* The input and its modes, read and solved here as `quaver modes` does. */
typedef struct {
  QvInput *input;
  QvModeSet *modes;
} Solved;

static Solved
solve_here (const char *path)
{
  QvInputOptions o = { .geometry = path, .all_modes = TRUE };
  QvSolveOptions so;
  g_autoptr(GError) error = NULL;
  Solved s = { 0 };

  s.input = qv_input_load (&o, &error);
  assert_non_null (s.input);
  if (s.input->hessian)
    {
      qv_solve_options_init (&so);
      s.modes = qv_solve (s.input->structure, g_steal_pointer (&s.input->hessian), &so, NULL, &error);
    }
  else
    s.modes = g_steal_pointer (&s.input->modes);
  assert_non_null (s.modes);
  return s;
}

static void
solved_clear (Solved *s)
{
  g_clear_pointer (&s->input, qv_input_free);
  g_clear_pointer (&s->modes, qv_mode_set_free);
}

static QvWindow *
open_window (const char *path)
{
  QvWindow *window = qvg_window ();
  QvDocumentSource source = { .geometry = (char *) path };

  qv_window_open_source (window, &source);
  assert_true (qvg_wait (qvg_window_has_document, window, 60.0));
  assert_true (qvg_wait (qvg_window_idle, window, 60.0));
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

/* The list's species column equals qv_symmetry_report_new on modes solved
 * here, for every mode; the summary names the group and its σ. */
static void
check_symmetry_column (QvWindow *window, const Solved *s, QvPointGroup **group_out,
                       QvSymmetryReport **report_out)
{
  QvModePanel *panel = qv_window_get_mode_panel (window);
  g_autoptr(GError) error = NULL;
  QvPointGroup *group = qv_point_group_detect (s->input->structure, 0.0, &error);
  QvSymmetryReport *report;
  g_autofree char *sigma = NULL;

  assert_non_null (group);
  report = qv_symmetry_report_new (group, s->modes);
  assert_int_equal (g_list_model_get_n_items (qv_mode_panel_get_rows (panel)), s->modes->n_modes);
  for (guint k = 0; k < s->modes->n_modes; k++)
    {
      g_autofree char *cell = qv_mode_panel_cell_text (panel, row_of_mode (panel, k), COL_SYMMETRY);
      g_autofree char *shown = qv_document_analysis_display (report->modes[k].label);
      assert_string_equal (cell, shown);
    }
  assert_non_null (strstr (qv_mode_panel_get_symmetry_summary (panel), group->name));
  sigma = g_strdup_printf ("symmetry number %u", group->symmetry_number);
  assert_non_null (strstr (qv_mode_panel_get_symmetry_summary (panel), sigma));
  *group_out = group;
  *report_out = report;
}

/* The core's ASCII names are shown as written in the tables (Σ, Π, ∞ as
 * in Herzberg's notation for linear molecules, from memory); the others
 * pass unchanged. */
static void
test_display_names (void **state)
{
  static const char *const cases[][2] = {
    { "Cinfv", "C∞v" }, { "Dinfh", "D∞h" }, { "Sigma_g+", "Σg+" }, { "Sigma+", "Σ+" },
    { "Pi_u", "Πu" }, { "Pi", "Π" }, { "A1g", "A1g" }, { "E'", "E'" }, { "A1 + E", "A1 + E" }, { "?", "?" },
  };
  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_autofree char *shown = qv_document_analysis_display (cases[i][0]);
      assert_string_equal (shown, cases[i][1]);
    }
}

/* The demo (ethanol at an unconverged, twisted point: C1 or at most Cs). */
static void
test_symmetry_column_demo (void **state)
{
  g_autofree char *path = source_path (DEMO_BUNDLE);
  Solved s = solve_here (path);
  QvWindow *window = open_window (path);
  QvPointGroup *group = NULL;
  QvSymmetryReport *report = NULL;

  check_symmetry_column (window, &s, &group, &report);
  /* A molecule without symmetry elements beyond a mirror (from memory:
   * C1 has one species A, Cs has A' and A''). */
  assert_true (g_str_equal (group->name, "C1") || g_str_equal (group->name, "Cs"));
  for (gsize k = 0; k < report->n_modes; k++)
    assert_true (report->modes[k].defined);
  qv_symmetry_report_free (report);
  qv_point_group_free (group);
  close_window (window);
  solved_clear (&s);
}

/* Formaldehyde-like C2v: the list's species, their count against the
 * textbook reduction Γ_vib = 3A1 + B1 + 2B2 (Herzberg, Infrared and Raman
 * Spectra, 1945, for H2CO; which of B1/B2 is out of plane depends on the
 * axis convention, so the two are counted together), and sorting by the
 * column keeps the table's order. */
static void
test_symmetry_column_c2v (void **state)
{
  g_autofree char *path = source_path (STABLE_BUNDLE);
  Solved s = solve_here (path);
  QvWindow *window = open_window (path);
  QvModePanel *panel = qv_window_get_mode_panel (window);
  QvPointGroup *group = NULL;
  QvSymmetryReport *report = NULL;
  guint a1 = 0, b = 0, vib = 0;
  int last = -1;

  check_symmetry_column (window, &s, &group, &report);
  assert_string_equal (group->name, "C2v");
  for (gsize k = 0; k < report->n_modes; k++)
    {
      const double wn = qv_mode_set_wavenumber (s.modes, k);
      if (fabs (wn) < 50.0)
        continue;   /* rigid-body modes, if listed */
      vib++;
      a1 += g_str_equal (report->modes[k].label, "A1");
      b += g_str_equal (report->modes[k].label, "B1") || g_str_equal (report->modes[k].label, "B2");
    }
  assert_int_equal (vib, 6);
  assert_int_equal (a1, 3);
  assert_int_equal (b, 3);

  qv_mode_panel_sort_by (panel, COL_SYMMETRY, TRUE);
  qvg_spin (0.1);
  for (guint r = 0; r < s.modes->n_modes; r++)
    {
      GListModel *rows = qv_mode_panel_get_rows (panel);
      g_autoptr(QvModeItem) item = g_list_model_get_item (rows, r);
      int order;
      g_object_get (item, "symmetry-order", &order, NULL);
      assert_true (order >= last);
      last = order;
    }
  qv_symmetry_report_free (report);
  qv_point_group_free (group);
  close_window (window);
  solved_clear (&s);
}

/* The detail's make-up line is qv_mode_character_summary of the core on
 * modes solved here, for every mode selected in turn, and its species line
 * names the mode's label and activity from the core's selection rules. */
static void
test_detail_character (void **state)
{
  g_autofree char *path = source_path (STABLE_BUNDLE);
  Solved s = solve_here (path);
  QvWindow *window = open_window (path);
  QvModePanel *panel = qv_window_get_mode_panel (window);
  QvModeDetail *detail = qv_window_get_mode_detail (window);
  g_autoptr(GError) error = NULL;
  g_autoptr(QvModeCharacter) character = qv_mode_character_new (s.input->structure, s.modes, NULL, &error);
  g_autoptr(QvPointGroup) group = qv_point_group_detect (s.input->structure, 0.0, &error);
  g_autoptr(QvSymmetryReport) report = NULL;

  assert_non_null (character);
  assert_non_null (group);
  report = qv_symmetry_report_new (group, s.modes);
  for (guint k = 0; k < s.modes->n_modes; k++)
    {
      g_autofree char *expected = qv_mode_character_summary (character, k, QV_MODE_DETAIL_MAX_FAMILIES);
      const QvModeSymmetry *sym = &report->modes[k];

      qv_mode_panel_select (panel, (int) k);
      qvg_spin (0.02);
      assert_string_equal (qv_mode_detail_get_character (detail), expected);
      assert_non_null (strstr (qv_mode_detail_get_symmetry (detail), sym->label));
      assert_non_null (strstr (qv_mode_detail_get_symmetry (detail),
                               sym->ir_active ? "IR active" : "IR inactive"));
      assert_non_null (strstr (qv_mode_detail_get_symmetry (detail),
                               sym->raman_active ? "Raman active" : "Raman inactive"));
    }
  close_window (window);
  solved_clear (&s);
}

/* The demo with invented point charges on its atoms (a rigid-charge model:
 * ∂μ_i/∂x_aj = q_a δ_ij, from memory) written as a bundle. */
static const double demo_charges[] = { -0.18, 0.05, -0.65, 0.06, 0.06, 0.06, 0.06, 0.06, 0.48 };

static char *
write_tensor_bundle (void)
{
  g_autofree char *path = source_path (DEMO_BUNDLE);
  g_autofree char *out = qvg_build_path ("ethanol-charges.quaver.json");
  g_autoptr(JsonParser) parser = json_parser_new ();
  g_autoptr(GError) error = NULL;
  g_autoptr(JsonGenerator) gen = json_generator_new ();
  JsonObject *root, *apt;
  JsonArray *rows;
  const gsize n = G_N_ELEMENTS (demo_charges);

  assert_true (json_parser_load_from_file (parser, path, &error));
  root = json_node_get_object (json_parser_get_root (parser));
  apt = json_object_new ();
  json_object_set_string_member (apt, "units", "e");
  rows = json_array_new ();
  for (int c = 0; c < 3; c++)
    {
      JsonArray *row = json_array_new ();
      for (gsize a = 0; a < n; a++)
        for (int d = 0; d < 3; d++)
          json_array_add_double_element (row, d == c ? demo_charges[a] : 0.0);
      json_array_add_array_element (rows, row);
    }
  json_object_set_array_member (apt, "data", rows);
  json_object_set_object_member (root, "dipole_derivatives", apt);
  json_generator_set_root (gen, json_parser_get_root (parser));
  assert_true (json_generator_to_file (gen, out, &error));
  return g_steal_pointer (&out);
}

static gboolean
area_has_size (gpointer data)
{
  QvSpectrumView *view = data;
  QvSpectrumPlotOptions o;
  qv_spectrum_view_get_plot_options (view, &o);
  return o.width > 200 && o.height > 120;
}

/* A click on a peak selects its mode: for each of the three strongest IR
 * lines of the core's intensities (computed here from the same charges),
 * a click at the pixel the plot puts that wavenumber at selects that mode,
 * and the pane marks it. The demo's own tensors are drawn as the core
 * computes them; without tensors the pane has no plot. */
static void
test_spectrum_click (void **state)
{
  g_autofree char *path = write_tensor_bundle ();
  Solved s = solve_here (path);
  QvWindow *window = open_window (path);
  QvModePanel *panel = qv_window_get_mode_panel (window);
  QvSpectrumView *view = qv_window_get_spectrum_view (window);
  g_autoptr(QvDerivatives) d = qv_derivatives_new (s.input->structure->n_atoms);
  g_autoptr(QvIntensities) in = NULL;
  g_autoptr(GError) error = NULL;
  g_autofree double *rows = g_new0 (double, 3 * 3 * s.input->structure->n_atoms);
  const QvSpectrum *spectrum;
  QvSpectrumPlotOptions o;
  double left, top, right, bottom;
  gsize n = s.input->structure->n_atoms;
  gint best[3] = { -1, -1, -1 };

  for (gsize a = 0; a < n; a++)
    for (int c = 0; c < 3; c++)
      rows[c * 3 * n + 3 * a + c] = demo_charges[a];
  qv_derivatives_set_dipole (d, rows, 1.0);
  in = qv_intensities_compute (s.modes, d, NULL, 1.0, &error);
  assert_non_null (in);

  g_action_group_activate_action (G_ACTION_GROUP (window), "toggle-spectrum", NULL);
  assert_true (gtk_revealer_get_reveal_child (qv_window_get_spectrum_revealer (window)));
  assert_true (qvg_wait (area_has_size, view, 10.0));
  assert_true (qv_spectrum_view_has_spectrum (view));
  spectrum = qv_spectrum_view_get_spectrum (view);

  /* The sticks are the core's intensities. */
  for (gsize i = 0; i < spectrum->n_sticks; i++)
    {
      const guint k = spectrum->stick_mode[i];
      assert_true (in->modes[k].defined);
      assert_float_equal (spectrum->stick_height[i], in->modes[k].ir, 1e-9 * MAX (1.0, in->modes[k].ir));
      assert_float_equal (spectrum->stick_position[i], qv_mode_set_wavenumber (s.modes, k), 1e-9);
    }
  /* The three strongest lines. */
  for (gsize k = 0; k < in->n_modes; k++)
    {
      if (!in->modes[k].defined)
        continue;
      for (int b = 0; b < 3; b++)
        if (best[b] < 0 || in->modes[k].ir > in->modes[best[b]].ir)
          {
            memmove (best + b + 1, best + b, (gsize) (2 - b) * sizeof *best);
            best[b] = (gint) k;
            break;
          }
    }
  qv_spectrum_view_get_plot_options (view, &o);
  qv_spectrum_plot_area (&o, &left, &top, &right, &bottom);
  for (int b = 0; b < 3; b++)
    {
      const double px = qv_spectrum_plot_x_to_pixel (spectrum, &o, qv_mode_set_wavenumber (s.modes, (gsize) best[b]));
      /* The expected hit by the renderer's own test at that pixel: the
       * strong lines of this molecule lie apart by more than the tolerance. */
      const gint expected = qv_spectrum_plot_hit (spectrum, &o, px, QV_SPECTRUM_VIEW_HIT_TOLERANCE);
      assert_int_equal (expected, best[b]);
      assert_int_equal (qv_spectrum_view_click (view, px, 0.5 * (top + bottom)), best[b]);
      qvg_spin (0.02);
      assert_int_equal (qv_mode_panel_get_selected (panel), best[b]);
      qv_spectrum_view_get_plot_options (view, &o);
      assert_int_equal (o.selected, best[b]);
    }
  /* Off every peak nothing is selected anew. */
  assert_int_equal (qv_spectrum_view_click (view, left + 1.0, top - 10.0), -1);
  close_window (window);
  solved_clear (&s);

  /* The demo carries its own (invented) tensors: its sticks are the
   * core's intensities of them. */
  {
    QvWindow *demo = qvg_window ();
    QvInputOptions io = { .demo = TRUE, .all_modes = TRUE };
    g_autoptr(QvInput) input = qv_input_load (&io, &error);
    QvSolveOptions so;
    g_autoptr(QvModeSet) modes = NULL;
    g_autoptr(QvIntensities) demo_in = NULL;
    const QvSpectrum *ds;

    assert_non_null (input);
    assert_non_null (input->derivatives);
    qv_solve_options_init (&so);
    modes = qv_solve (input->structure, g_steal_pointer (&input->hessian), &so, NULL, &error);
    assert_non_null (modes);
    demo_in = qv_intensities_compute (modes, input->derivatives, NULL, 1.0, &error);
    assert_non_null (demo_in);
    qv_window_open_demo (demo);
    assert_true (qvg_wait (qvg_window_has_document, demo, 60.0));
    assert_true (qv_spectrum_view_has_spectrum (qv_window_get_spectrum_view (demo)));
    ds = qv_spectrum_view_get_spectrum (qv_window_get_spectrum_view (demo));
    assert_true (ds->n_sticks > 0);
    for (gsize i = 0; i < ds->n_sticks; i++)
      assert_float_equal (ds->stick_height[i], demo_in->modes[ds->stick_mode[i]].ir,
                          1e-9 * MAX (1.0, demo_in->modes[ds->stick_mode[i]].ir));

    /* Saving what is shown: the CSV holds the envelope exactly (shortest
     * round-trip numbers), the PNG has the PNG signature (ISO/IEC 15948),
     * the SVG is well-formed XML (GMarkup), and nothing is replaced
     * without being asked. */
    {
      QvSpectrumView *sv = qv_window_get_spectrum_view (demo);
      g_autofree char *dir = g_dir_make_tmp ("qv-spectrum-save-XXXXXX", NULL);
      g_autofree char *csv = g_build_filename (dir, "ir.csv", NULL);
      g_autofree char *png = g_build_filename (dir, "ir.png", NULL);
      g_autofree char *svg = g_build_filename (dir, "ir.svg", NULL);
      g_autofree char *text = NULL, *png_bytes = NULL, *svg_text = NULL;
      g_auto(GStrv) lines = NULL;
      gsize png_length = 0, svg_length = 0;
      g_autoptr(GMarkupParseContext) parse = NULL;
      static const GMarkupParser no_callbacks = { 0 };

      assert_true (qv_spectrum_view_save (sv, csv, FALSE, &error));
      assert_true (g_file_get_contents (csv, &text, NULL, NULL));
      lines = g_strsplit (text, "\n", -1);
      assert_true (g_str_has_prefix (lines[0], "wavenumber_cm-1,ir_km_mol_per_cm-1"));
      assert_int_equal (g_strv_length (lines), ds->n_points + 2);   /* header, rows, "" */
      for (gsize i = 0; i < ds->n_points; i++)
        {
          const char *comma = strchr (lines[i + 1], ',');
          assert_non_null (comma);
          assert_true (g_ascii_strtod (comma + 1, NULL) == ds->envelope[i]);
        }
      assert_false (qv_spectrum_view_save (sv, csv, FALSE, &error));
      assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_WRITE));
      g_clear_error (&error);
      assert_true (qv_spectrum_view_save (sv, png, FALSE, &error));
      assert_true (g_file_get_contents (png, &png_bytes, &png_length, NULL));
      assert_true (png_length > 33 && memcmp (png_bytes, "\x89PNG\r\n\x1a\n", 8) == 0);
      assert_true (qv_spectrum_view_save (sv, svg, FALSE, &error));
      assert_true (g_file_get_contents (svg, &svg_text, &svg_length, NULL));
      parse = g_markup_parse_context_new (&no_callbacks, 0, NULL, NULL);
      assert_true (g_markup_parse_context_parse (parse, svg_text, (gssize) svg_length, &error));
      assert_true (g_markup_parse_context_end_parse (parse, &error));
      {
        g_autofree char *bmp = g_build_filename (dir, "ir.bmp", NULL);
        assert_false (qv_spectrum_view_save (sv, bmp, TRUE, &error));
        assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
        g_clear_error (&error);
        assert_false (g_file_test (bmp, G_FILE_TEST_EXISTS));
      }
      g_remove (csv); g_remove (png); g_remove (svg);
      g_rmdir (dir);
    }
    close_window (demo);
  }

  /* A bundle without tensors: no plot, a note instead. */
  {
    g_autofree char *stable = source_path (STABLE_BUNDLE);
    QvWindow *plain = open_window (stable);
    assert_false (qv_spectrum_view_has_spectrum (qv_window_get_spectrum_view (plain)));
    close_window (plain);
  }
}

/* The demo with its hydroxyl hydrogen made deuterium (an isotopologue). */
static char *
write_isotopologue (void)
{
  g_autofree char *path = source_path (DEMO_BUNDLE);
  g_autofree char *out = qvg_build_path ("ethanol-od.quaver.json");
  g_autoptr(JsonParser) parser = json_parser_new ();
  g_autoptr(GError) error = NULL;
  g_autoptr(JsonGenerator) gen = json_generator_new ();
  JsonArray *atoms;

  assert_true (json_parser_load_from_file (parser, path, &error));
  atoms = json_object_get_array_member (json_object_get_object_member (
            json_node_get_object (json_parser_get_root (parser)), "structure"), "atoms");
  json_object_set_int_member (json_array_get_object_element (atoms, 8), "isotope", 2);
  json_generator_set_root (gen, json_parser_get_root (parser));
  assert_true (json_generator_to_file (gen, out, &error));
  return g_steal_pointer (&out);
}

static gboolean
compare_idle (gpointer data)
{
  return !qv_compare_window_is_busy (data);
}

/* The heat map's matrix and matching are qv_mode_comparison_new's on modes
 * solved here; the read-out names the cell under a pixel; the CSV equals
 * what `quaver compare --format csv` prints, is written atomically and
 * not over an existing file unless asked. */
static void
test_compare_heat_map (void **state)
{
  g_autofree char *path_a = source_path (DEMO_BUNDLE);
  g_autofree char *path_b = write_isotopologue ();
  g_autofree char *csv_path = qvg_build_path ("overlap.csv");
  Solved a = solve_here (path_a), b = solve_here (path_b);
  QvWindow *window = open_window (path_a);
  QvCompareWindow *compare;
  QvOverlapMap *map;
  QvComparisonOptions options;
  g_autoptr(QvModeComparison) expected = NULL;
  g_autoptr(GError) error = NULL;
  g_autofree char *csv = NULL;
  g_autofree char *cli = NULL;
  g_autofree char *written = NULL;
  g_autofree char *readout = NULL;
  const double *matrix;
  gsize n_a, n_b, i, j;
  int status;

  qv_comparison_options_init (&options);
  expected = qv_mode_comparison_new (a.input->structure, a.modes, b.input->structure, b.modes, &options, &error);
  assert_non_null (expected);

  compare = qv_window_compare_with (window, path_b);
  assert_non_null (compare);
  assert_true (qvg_wait (compare_idle, compare, 60.0));
  assert_null (qv_compare_window_get_error (compare));
  map = qv_compare_window_get_map (compare);
  matrix = qv_overlap_map_get_matrix (map, &n_a, &n_b);
  assert_int_equal (n_a, qv_mode_comparison_n_modes_a (expected));
  assert_int_equal (n_b, qv_mode_comparison_n_modes_b (expected));
  for (i = 0; i < n_a; i++)
    {
      for (j = 0; j < n_b; j++)
        assert_float_equal (matrix[i * n_b + j], qv_mode_comparison_overlap (expected, i, j), 1e-12);
      assert_int_equal (qv_overlap_map_get_partner (map, i), qv_mode_comparison_partner_of_a (expected, i));
    }

  /* The read-out of the cell under a pixel. */
  qvg_spin (0.3);
  for (double y = 0; y < gtk_widget_get_height (GTK_WIDGET (map)); y += 1.0)
    if (qv_overlap_map_cell_at (map, 200.0, y, &i, &j) && i == 3)
      {
        g_autofree char *mode_a = g_strdup_printf ("A %zu ·", i + 1);
        g_autofree char *mode_b = g_strdup_printf ("B %zu ·", j + 1);
        g_autofree char *overlap = g_strdup_printf ("overlap %.3f", qv_mode_comparison_overlap (expected, i, j));
        readout = qv_overlap_map_hover (map, 200.0, y);
        assert_non_null (readout);
        assert_non_null (strstr (readout, mode_a));
        assert_non_null (strstr (readout, mode_b));
        assert_non_null (strstr (readout, overlap));
        assert_string_equal (qv_compare_window_get_readout (compare), readout);
        break;
      }
  assert_non_null (readout);

  /* The CSV against the command's. */
  csv = qv_compare_window_format_csv (compare);
  {
    const char *argv[] = { g_getenv ("QUAVER"), "compare", path_a, path_b, "--format", "csv", NULL };
    assert_true (g_spawn_sync (NULL, (char **) argv, NULL, 0, NULL, NULL, &cli, NULL, &status, NULL));
    assert_true (g_spawn_check_wait_status (status, NULL));
  }
  assert_string_equal (csv, cli);
  g_remove (csv_path);
  assert_true (qv_compare_window_save_csv (compare, csv_path, FALSE, &error));
  assert_true (g_file_get_contents (csv_path, &written, NULL, NULL));
  assert_string_equal (written, csv);
  /* An existing file is not replaced unless asked. */
  assert_false (qv_compare_window_save_csv (compare, csv_path, FALSE, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_WRITE));
  g_clear_error (&error);
  assert_true (qv_compare_window_save_csv (compare, csv_path, TRUE, &error));

  gtk_window_destroy (GTK_WINDOW (compare));
  close_window (window);
  solved_clear (&a);
  solved_clear (&b);
}

/* B with other atoms: the window says why, nothing is drawn. */
static void
test_compare_mismatch (void **state)
{
  g_autofree char *path_a = source_path (DEMO_BUNDLE);
  g_autofree char *path_b = source_path (STABLE_BUNDLE);
  QvWindow *window = open_window (path_a);
  QvCompareWindow *compare = qv_window_compare_with (window, path_b);
  gsize n_a, n_b;

  assert_true (qvg_wait (compare_idle, compare, 60.0));
  assert_non_null (qv_compare_window_get_error (compare));
  assert_null (qv_compare_window_get_comparison (compare));
  assert_null (qv_overlap_map_get_matrix (qv_compare_window_get_map (compare), &n_a, &n_b));
  assert_null (qv_compare_window_format_csv (compare));
  gtk_window_destroy (GTK_WINDOW (compare));
  close_window (window);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_display_names),
    cmocka_unit_test (test_symmetry_column_demo),
    cmocka_unit_test (test_symmetry_column_c2v),
    cmocka_unit_test (test_detail_character),
    cmocka_unit_test (test_spectrum_click),
    cmocka_unit_test (test_compare_heat_map),
    cmocka_unit_test (test_compare_mismatch),
  };
  int status;

  /* A critical from GTK (a widget misused, say on closing a window) fails
   * the run. */
  g_log_set_always_fatal (G_LOG_FATAL_MASK | G_LOG_LEVEL_CRITICAL);
  qvg_app ();
  if (g_getenv ("QV_TEST_FILTER"))
    cmocka_set_test_filter (g_getenv ("QV_TEST_FILTER"));
  status = cmocka_run_group_tests (tests, NULL, NULL);
  for (int i = 0; i < 1200 && qv_document_running_workers () > 0; i++)
    qvg_spin (0.1);
  return status;
}
