/* test-thermo-app.c — a molecule's Thermochemistry page: the demo (invented
 * data, one imaginary mode) opens on its modes with the Thermochemistry
 * page one click away; the page's totals and every row of its per-mode
 * table hold what `quaver thermo --demo -f json --per-mode` prints for the
 * same options (the command is itself checked against McQuarrie's closed
 * forms, the Sackur–Tetrode equation and values computed with SciPy in
 * tests/thermochem); switching the soft-mode treatment changes the low
 * modes' S as the command says; the imaginary mode is marked as left out
 * with a loud warning; a row selects its mode in the window; the tables
 * save as the command writes them (byte for byte) and never over a file
 * without force; a crystal shows its lattice page instead.
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
#include "qv-preferences.h"
#include "qv-thermochem-plot.h"

/* Whether @child's page of the side panel's stack is offered. */
static gboolean
page_visible (gpointer child)
{
  GtkWidget *stack = gtk_widget_get_parent (GTK_WIDGET (child));
  assert_true (GTK_IS_STACK (stack));
  return gtk_stack_page_get_visible (gtk_stack_get_page (GTK_STACK (stack), GTK_WIDGET (child)));
}

static QvWindow *
open_demo (void)
{
  QvWindow *window = qvg_window ();

  qv_window_open_demo (window);
  assert_true (qvg_wait (qvg_window_has_document, window, 120.0));
  assert_true (qvg_wait (qvg_window_idle, window, 120.0));
  qvg_spin (0.2);
  return window;
}

/* `quaver ARGS…` (NULL-terminated), its standard output; exit 0 required. */
static char *
run_cli (const char *const *args)
{
  char *out = qvg_run_quaver (NULL, args);
  assert_non_null (out);
  return out;
}

static JsonParser *
cli_json (const char *const *args)
{
  g_autofree char *out = run_cli (args);
  JsonParser *parser = json_parser_new ();
  assert_true (json_parser_load_from_data (parser, out, -1, NULL));
  return parser;
}

static JsonObject *
root_of (JsonParser *parser)
{
  return json_node_get_object (json_parser_get_root (parser));
}

/* |a − b| within 1e-9 of the larger magnitude (the JSON writer keeps 17
 * digits; the two computations are the same functions, so they agree to
 * rounding). */
static gboolean
close_to (double a, double b)
{
  return fabs (a - b) <= 1e-9 * MAX (1.0, MAX (fabs (a), fabs (b)));
}

static const char *const quantity_keys[6] = { "ZPE", "U", "H", "S", "Cv", "G" };
static const char *const term_keys[4] = { "translation", "rotation", "vibration", "total" };

static double
term_quantity (const QvGasTerm *t, guint q)
{
  const double kj = qv_gas_kj_per_mol ();
  const double v[6] = { t->zpe * kj, t->energy * kj, t->enthalpy * kj, t->entropy * kj * 1000,
                        t->heat_capacity * kj * 1000, t->free_energy * kj };
  return v[q];
}

/* The page against the command's JSON: every total, Cp, and every mode's
 * share; the summary's and the table's text as the numbers rounded. */
static void
check_against_cli (QvThermoPanel *panel, JsonParser *parser)
{
  JsonObject *root = root_of (parser);
  JsonObject *t0 = json_array_get_object_element (json_object_get_array_member (root, "temperatures"), 0);
  JsonArray *modes = json_object_get_array_member (root, "modes");
  const QvGasThermo *th = qv_thermo_panel_get_thermo (panel);
  const QvGasTerm *terms[4];
  const QvGasMode *md;
  const double kj = qv_gas_kj_per_mol ();
  gsize n = 0;

  assert_non_null (th);
  terms[0] = &th->translation;
  terms[1] = &th->rotation;
  terms[2] = &th->vibration;
  terms[3] = &th->total;
  assert_true (close_to (json_object_get_double_member (t0, "T"), th->temperature));
  assert_true (close_to (json_object_get_double_member (t0, "pressure"), th->pressure));
  for (guint t = 0; t < 4; t++)
    {
      JsonObject *cli = json_object_get_object_member (t0, term_keys[t]);
      for (guint q = 0; q < 6; q++)
        {
          const double want = json_object_get_double_member (cli, quantity_keys[q]);
          g_autofree char *text = g_strdup_printf ("%.2f", want + 0.0);
          if (!close_to (term_quantity (terms[t], q), want))
            print_error ("%s %s: app %.12g, command %.12g\n", term_keys[t], quantity_keys[q],
                         term_quantity (terms[t], q), want);
          assert_true (close_to (term_quantity (terms[t], q), want));
          assert_string_equal (qv_thermo_panel_summary_text (panel, t, q), text);
        }
    }
  assert_true (close_to (th->heat_capacity_p * kj * 1000, json_object_get_double_member (t0, "Cp")));

  md = qv_thermo_panel_get_modes (panel, &n);
  assert_int_equal (n, json_array_get_length (modes));
  assert_int_equal (qv_thermo_panel_get_n_rows (panel), n);
  for (guint k = 0; k < n; k++)
    {
      JsonObject *m = json_array_get_object_element (modes, k);
      const gboolean used = json_object_get_boolean_member (m, "used");
      assert_int_equal (json_object_get_int_member (m, "index"), k + 1);
      assert_true (close_to (md[k].wavenumber, json_object_get_double_member (m, "wavenumber")));
      assert_int_equal (md[k].used, used);
      if (used)
        {
          assert_true (close_to (md[k].entropy * kj * 1000, json_object_get_double_member (m, "S")));
          assert_true (close_to (md[k].free_energy * kj, json_object_get_double_member (m, "G")));
          assert_true (close_to (md[k].zpe * kj, json_object_get_double_member (m, "ZPE")));
          assert_true (close_to (md[k].energy * kj, json_object_get_double_member (m, "U")));
          assert_true (close_to (md[k].heat_capacity * kj * 1000, json_object_get_double_member (m, "Cv")));
          assert_true (close_to (md[k].weight, json_object_get_double_member (m, "weight")));
          assert_true (close_to (md[k].thermal, json_object_get_double_member (m, "thermal")));
        }
    }
  /* the table's rows (unsorted: row k is mode k) say the same, rounded */
  for (guint row = 0; row < n; row++)
    {
      const int k = qv_thermo_panel_row_mode (panel, row);
      JsonObject *m = json_array_get_object_element (modes, (guint) k);
      g_autofree char *s = qv_thermo_panel_cell_text (panel, row, QV_THERMO_COLUMN_ENTROPY);
      g_autofree char *g = qv_thermo_panel_cell_text (panel, row, QV_THERMO_COLUMN_FREE_ENERGY);
      g_autofree char *share = qv_thermo_panel_cell_text (panel, row, QV_THERMO_COLUMN_SHARE);
      g_autofree char *zpe = qv_thermo_panel_cell_text (panel, row, QV_THERMO_COLUMN_ZPE);
      g_autofree char *cv = qv_thermo_panel_cell_text (panel, row, QV_THERMO_COLUMN_HEAT_CAPACITY);
      if (!json_object_get_boolean_member (m, "used"))
        {
          assert_string_equal (s, "left out");
          assert_true (qv_thermo_panel_cell_left_out (panel, row, QV_THERMO_COLUMN_ENTROPY));
          continue;
        }
      {
        g_autofree char *ws = g_strdup_printf ("%.3f", json_object_get_double_member (m, "S"));
        g_autofree char *wg = g_strdup_printf ("%.3f", json_object_get_double_member (m, "G"));
        g_autofree char *wsh = g_strdup_printf ("%.1f", 100 * json_object_get_double_member (m, "S_fraction"));
        g_autofree char *wz = g_strdup_printf ("%.3f", json_object_get_double_member (m, "ZPE"));
        g_autofree char *wc = g_strdup_printf ("%.3f", json_object_get_double_member (m, "Cv"));
        assert_string_equal (s, ws);
        assert_string_equal (g, wg);
        assert_string_equal (share, wsh);
        assert_string_equal (zpe, wz);
        assert_string_equal (cv, wc);
        assert_false (qv_thermo_panel_cell_left_out (panel, row, QV_THERMO_COLUMN_ENTROPY));
      }
    }
}

static void
test_page_is_the_commands (void **state)
{
  QvWindow *window = open_demo ();
  QvThermoPanel *panel = qv_window_get_thermo_panel (window);
  const char *args[] = { "thermo", "--demo", "-f", "json", "--per-mode", NULL };
  g_autoptr(JsonParser) parser = cli_json (args);
  JsonObject *root = root_of (parser);
  const char *warning;
  (void) state;

  /* a molecule opens on its modes; the switcher offers the modes and the
   * thermochemistry, not the lattice */
  assert_string_equal (qv_window_get_side_page (window), "modes");
  assert_true (qv_window_get_side_switcher_visible (window));
  assert_false (page_visible (qv_window_get_lattice_pane (window)));
  assert_true (page_visible (panel));
  qv_window_show_side_page (window, "thermo");
  qvg_spin (0.2);
  assert_string_equal (qv_window_get_side_page (window), "thermo");

  assert_true (qv_thermo_panel_has_results (panel));
  /* σ from the point group, as the command finds it */
  {
    guint sigma = 0;
    g_object_get (panel, "symmetry-number", &sigma, NULL);
    assert_int_equal (sigma, json_object_get_int_member (root, "symmetry_number"));
  }
  check_against_cli (panel, parser);

  /* the demo's imaginary mode: left out, said loudly, marked in the table */
  assert_int_equal (json_object_get_int_member (root, "imaginary_left_out"), 1);
  warning = qv_thermo_panel_get_warning (panel);
  assert_non_null (warning);
  assert_non_null (strstr (warning, "LEFT OUT"));
  {
    g_autofree char *w = g_strdup_printf ("%.2fi", -json_object_get_double_member (root, "most_imaginary"));
    g_autofree char *cell = qv_thermo_panel_cell_text (panel, 0, QV_THERMO_COLUMN_WAVENUMBER);
    assert_non_null (strstr (warning, w));
    assert_string_equal (cell, w);
    assert_true (qv_thermo_panel_cell_left_out (panel, 0, QV_THERMO_COLUMN_WAVENUMBER));
    assert_false (qv_thermo_panel_cell_left_out (panel, 1, QV_THERMO_COLUMN_WAVENUMBER));
  }
  /* The wavenumber column follows the list's unit (Preferences): in meV,
   * 1 cm⁻¹ = h c / e = 0.123984198 meV (CODATA 2018, where h, c and e are
   * exact). The window binds the preference to the page. */
  {
    const double mev = 1000.0 * 6.62607015e-34 * 299792458.0 * 100.0 / 1.602176634e-19;
    g_autofree char *w = g_strdup_printf ("%.3fi", -json_object_get_double_member (root, "most_imaginary") * mev);
    g_autofree char *cell = NULL;
    g_object_set (qv_preferences_get_default (), "wavenumber-unit", QV_FREQUENCY_MEV, NULL);
    cell = qv_thermo_panel_cell_text (panel, 0, QV_THERMO_COLUMN_WAVENUMBER);
    assert_string_equal (cell, w);
    g_object_set (qv_preferences_get_default (), "wavenumber-unit", QV_FREQUENCY_CM1, NULL);
    g_clear_pointer (&cell, g_free);
    cell = qv_thermo_panel_cell_text (panel, 0, QV_THERMO_COLUMN_WAVENUMBER);
    assert_non_null (strstr (cell, "."));
    assert_int_equal (strlen (strchr (cell, '.')), 4);   /* ".NNi": two decimals in cm⁻¹ */
  }
  gtk_window_destroy (GTK_WINDOW (window));
}

/* One set of options on the page and on the command line. */
typedef struct {
  int soft;                   /* QvSoftModes */
  double cutoff, omega0;      /* 0: the default */
  double t, scale;            /* 0: the default */
  int state;                  /* QvThermoState, −1: the default */
  double pressure_bar;
  guint sigma;                /* 0: from the point group */
  const char *args[24];
} Case;

static void
apply_case (QvThermoPanel *panel, const Case *c)
{
  g_object_set (panel, "soft-modes", c->soft, NULL);
  if (c->cutoff > 0)
    g_object_set (panel, "cutoff", c->cutoff, NULL);
  if (c->omega0 > 0)
    g_object_set (panel, "omega0", c->omega0, NULL);
  if (c->t > 0)
    g_object_set (panel, "temperature", c->t, NULL);
  if (c->scale > 0)
    g_object_set (panel, "frequency-scale", c->scale, NULL);
  if (c->state >= 0)
    g_object_set (panel, "standard-state", c->state, NULL);
  if (c->pressure_bar > 0)
    g_object_set (panel, "pressure", c->pressure_bar, NULL);
  if (c->sigma > 0)
    g_object_set (panel, "symmetry-number", c->sigma, NULL);
  qvg_spin (0.05);
}

static void
test_soft_modes_as_the_command (void **state)
{
  const Case cases[] = {
    { QV_SOFT_MODES_QUASI_RRHO, 0, 0, 0, 0, -1, 0, 0,
      { "thermo", "--demo", "-f", "json", "--per-mode", "--soft-modes", "quasi-rrho", NULL } },
    { QV_SOFT_MODES_QUASI_RRHO, 0, 300, 0, 0, -1, 0, 0,
      { "thermo", "--demo", "-f", "json", "--per-mode", "--soft-modes", "quasi-rrho", "--omega0", "300", NULL } },
    { QV_SOFT_MODES_RAISE, 300, 0, 0, 0, -1, 0, 0,
      { "thermo", "--demo", "-f", "json", "--per-mode", "--soft-modes", "raise", "--cutoff", "300", NULL } },
    /* and the other controls with it */
    { QV_SOFT_MODES_RAISE, 300, 0, 350, 0.97, QV_THERMO_STATE_PRESSURE, 2.0, 2,
      { "thermo", "--demo", "-f", "json", "--per-mode", "--soft-modes", "raise", "--cutoff", "300",
        "-T", "350", "--scale", "0.97", "--pressure", "2bar", "--symmetry-number", "2", NULL } },
    { QV_SOFT_MODES_NONE, 0, 0, 350, 0.97, QV_THERMO_STATE_1M, 0, 2,
      { "thermo", "--demo", "-f", "json", "--per-mode", "-T", "350", "--scale", "0.97",
        "--standard-state", "1M", "--symmetry-number", "2", NULL } },
  };
  QvWindow *window = open_demo ();
  QvThermoPanel *panel = qv_window_get_thermo_panel (window);
  const char *harmonic_args[] = { "thermo", "--demo", "-f", "json", "--per-mode", NULL };
  g_autoptr(JsonParser) harmonic = cli_json (harmonic_args);
  JsonArray *hm = json_object_get_array_member (root_of (harmonic), "modes");
  (void) state;

  qv_window_show_side_page (window, "thermo");
  for (gsize i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      g_autoptr(JsonParser) parser = cli_json (cases[i].args);
      JsonArray *m = json_object_get_array_member (root_of (parser), "modes");
      /* mode 2 (index 1) is the demo's lowest real mode, 244.8 cm⁻¹ */
      JsonObject *low = json_array_get_object_element (m, 1);
      JsonObject *low_h = json_array_get_object_element (hm, 1);

      apply_case (panel, &cases[i]);
      check_against_cli (panel, parser);
      if (cases[i].soft != QV_SOFT_MODES_NONE && cases[i].t == 0)
        {
          /* the treatment changed the low mode's S (by what the command says) */
          const double ds = json_object_get_double_member (low, "S") - json_object_get_double_member (low_h, "S");
          const QvGasMode *md = qv_thermo_panel_get_modes (panel, NULL);
          const double app = md[1].entropy * qv_gas_kj_per_mol () * 1000
                             - json_object_get_double_member (low_h, "S");
          assert_true (fabs (ds) > 1e-3);
          assert_true (close_to (app, ds) || fabs (app - ds) < 1e-9);
        }
      if (cases[i].soft == QV_SOFT_MODES_QUASI_RRHO)
        {
          g_autofree char *w = qv_thermo_panel_cell_text (panel, 1, QV_THERMO_COLUMN_TREATED);
          g_autofree char *want = g_strdup_printf ("%.3f", json_object_get_double_member (low, "weight"));
          assert_string_equal (w, want);
        }
      /* back to the defaults for the next case */
      g_object_set (panel, "temperature", 298.15, "frequency-scale", 1.0, "standard-state",
                    QV_THERMO_STATE_1BAR, "cutoff", 100.0, "omega0", 100.0, NULL);
    }
  gtk_window_destroy (GTK_WINDOW (window));
}

static void
count_activation (QvThermoPanel *panel, int mode, gpointer data)
{
  int *last = data;
  last[0]++;
  last[1] = mode;
}

static void
test_row_selects_mode (void **state)
{
  QvWindow *window = open_demo ();
  QvThermoPanel *panel = qv_window_get_thermo_panel (window);
  QvModePanel *modes = qv_window_get_mode_panel (window);
  const QvGasMode *md;
  int seen[2] = { 0, -1 };
  int largest = -1;
  gsize n = 0;
  (void) state;

  qv_window_show_side_page (window, "thermo");
  qvg_spin (0.1);
  g_signal_connect (panel, "mode-activated", G_CALLBACK (count_activation), seen);
  /* the page follows the mode list, silently */
  assert_int_equal (qv_thermo_panel_get_selected (panel), qv_mode_panel_get_selected (modes));
  qv_mode_panel_select (modes, 5);
  qvg_spin (0.05);
  assert_int_equal (qv_thermo_panel_get_selected (panel), 5);
  assert_int_equal (seen[0], 0);

  /* a row selects its mode in the window */
  qv_thermo_panel_select_row (panel, 3);
  qvg_spin (0.05);
  assert_int_equal (seen[0], 1);
  assert_int_equal (seen[1], 3);
  assert_int_equal (qv_mode_panel_get_selected (modes), 3);

  /* sorted by S, largest first: the row on top is the mode of largest S */
  md = qv_thermo_panel_get_modes (panel, &n);
  for (gsize k = 0; k < n; k++)
    if (md[k].used && (largest < 0 || md[k].entropy > md[largest].entropy))
      largest = (int) k;
  qv_thermo_panel_sort_by (panel, QV_THERMO_COLUMN_ENTROPY, FALSE);
  qvg_spin (0.05);
  assert_int_equal (qv_thermo_panel_row_mode (panel, 0), largest);
  /* numerically: each row's S at least the next one's; the mode left out last */
  for (guint row = 0; row + 2 < qv_thermo_panel_get_n_rows (panel); row++)
    assert_true (md[qv_thermo_panel_row_mode (panel, row)].entropy
                 >= md[qv_thermo_panel_row_mode (panel, row + 1)].entropy);
  assert_false (md[qv_thermo_panel_row_mode (panel, qv_thermo_panel_get_n_rows (panel) - 1)].used);
  qv_thermo_panel_select_row (panel, 0);
  qvg_spin (0.05);
  assert_int_equal (seen[1], largest);
  assert_int_equal (qv_mode_panel_get_selected (modes), largest);
  /* sorted by wavenumber ascending: the imaginary mode first */
  qv_thermo_panel_sort_by (panel, QV_THERMO_COLUMN_WAVENUMBER, TRUE);
  qvg_spin (0.05);
  assert_int_equal (qv_thermo_panel_row_mode (panel, 0), 0);
  assert_true (md[qv_thermo_panel_row_mode (panel, 1)].wavenumber
               < md[qv_thermo_panel_row_mode (panel, 2)].wavenumber);
  gtk_window_destroy (GTK_WINDOW (window));
}

static char *
read_file (const char *path)
{
  g_autofree char *data = NULL;
  assert_true (g_file_get_contents (path, &data, NULL, NULL));
  return g_steal_pointer (&data);
}

static void
test_save (void **state)
{
  QvWindow *window = open_demo ();
  QvThermoPanel *panel = qv_window_get_thermo_panel (window);
  g_autofree char *dir = g_dir_make_tmp ("qv-thermo-XXXXXX", NULL);
  g_autofree char *csv = g_build_filename (dir, "modes.csv", NULL);
  g_autofree char *json = g_build_filename (dir, "modes.json", NULL);
  g_autofree char *sweep_csv = g_build_filename (dir, "sweep.csv", NULL);
  g_autofree char *svg = g_build_filename (dir, "sweep.svg", NULL);
  g_autofree char *png = g_build_filename (dir, "sweep.png", NULL);
  g_autofree char *bad = g_build_filename (dir, "modes.doc", NULL);
  const char *csv_args[] = { "thermo", "--demo", "-f", "csv", "--per-mode", "--soft-modes", "quasi-rrho",
                             "-T", "400", NULL };
  const char *sweep_args[] = { "thermo", "--demo", "-f", "csv", "--soft-modes", "quasi-rrho",
                               "--t-min", "50", "--t-max", "1000", "--t-step", "5", NULL };
  g_autoptr(GError) error = NULL;
  g_autofree char *cli = NULL, *saved = NULL, *cli_sweep = NULL, *saved_sweep = NULL;
  g_auto(GStrv) lines = NULL;
  const QvGasMode *md;
  gsize n = 0;
  (void) state;

  qv_window_show_side_page (window, "thermo");
  g_object_set (panel, "soft-modes", QV_SOFT_MODES_QUASI_RRHO, "temperature", 400.0, NULL);
  qvg_spin (0.05);

  /* the per-mode table, as the command writes it for the same options */
  assert_true (qv_thermo_panel_save_table (panel, csv, FALSE, &error));
  cli = run_cli (csv_args);
  saved = read_file (csv);
  assert_string_equal (saved, cli);
  /* and it reads back: one row per mode, the numbers of the page */
  md = qv_thermo_panel_get_modes (panel, &n);
  lines = g_strsplit (saved, "\n", -1);
  assert_string_equal (lines[0], "mode,wavenumber_cm-1,thermal_cm-1,weight,ZPE_kJ/mol,U_kJ/mol,"
                                 "S_J/(K.mol),S_%vib,Cv_J/(K.mol),G_kJ/mol,S_HO_J/(K.mol),S_FR_J/(K.mol)");
  assert_int_equal (g_strv_length (lines), n + 2);   /* header, rows, the final newline */
  for (gsize k = 0; k < n; k++)
    {
      g_auto(GStrv) cells = g_strsplit (lines[k + 1], ",", -1);
      assert_int_equal (g_strv_length (cells), 12);
      assert_int_equal (g_ascii_strtoull (cells[0], NULL, 10), k + 1);
      if (!md[k].used)
        {
          assert_string_equal (cells[6], "");
          continue;
        }
      /* six decimals in the file */
      assert_true (fabs (g_ascii_strtod (cells[6], NULL) - md[k].entropy * qv_gas_kj_per_mol () * 1000) < 6e-7);
      assert_true (fabs (g_ascii_strtod (cells[9], NULL) - md[k].free_energy * qv_gas_kj_per_mol ()) < 6e-7);
    }

  /* never over a file without force */
  assert_false (qv_thermo_panel_save_table (panel, csv, FALSE, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_WRITE));
  g_clear_error (&error);
  {
    g_autofree char *again = read_file (csv);
    assert_string_equal (again, cli);
  }
  g_object_set (panel, "temperature", 300.0, NULL);
  qvg_spin (0.05);
  assert_true (qv_thermo_panel_save_table (panel, csv, TRUE, &error));
  {
    g_autofree char *replaced = read_file (csv);
    assert_string_not_equal (replaced, cli);
  }
  assert_false (qv_thermo_panel_save_table (panel, bad, FALSE, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_USAGE));
  g_clear_error (&error);
  assert_false (g_file_test (bad, G_FILE_TEST_EXISTS));

  /* JSON: the totals and the modes */
  assert_true (qv_thermo_panel_save_table (panel, json, FALSE, &error));
  {
    g_autoptr(JsonParser) parser = json_parser_new ();
    JsonObject *root;
    assert_true (json_parser_load_from_file (parser, json, NULL));
    root = root_of (parser);
    assert_int_equal (json_array_get_length (json_object_get_array_member (root, "modes")), n);
    assert_true (close_to (json_object_get_double_member (
                             json_object_get_object_member (
                               json_array_get_object_element (json_object_get_array_member (root, "temperatures"), 0),
                               "total"), "G"),
                           qv_thermo_panel_get_thermo (panel)->total.free_energy * qv_gas_kj_per_mol ()));
  }

  /* the sweep: its table as the command's --t-min 50 --t-max 1000 --t-step 5 */
  assert_true (qv_thermo_panel_save_sweep (panel, sweep_csv, FALSE, &error));
  cli_sweep = run_cli (sweep_args);
  saved_sweep = read_file (sweep_csv);
  assert_string_equal (saved_sweep, cli_sweep);
  /* and its picture */
  assert_true (qv_thermo_panel_save_sweep (panel, svg, FALSE, &error));
  assert_true (qv_thermo_panel_save_sweep (panel, png, FALSE, &error));
  {
    g_autofree char *data = read_file (svg);
    g_autofree char *bytes = NULL;
    gsize length = 0;
    assert_non_null (strstr (data, "<svg"));
    assert_true (g_file_get_contents (png, &bytes, &length, NULL));
    assert_true (length > 8 && memcmp (bytes, "\x89PNG\r\n\x1a\n", 8) == 0);
  }
  assert_false (qv_thermo_panel_save_sweep (panel, png, FALSE, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_WRITE));
  g_clear_error (&error);

  g_unlink (csv); g_unlink (json); g_unlink (sweep_csv); g_unlink (svg); g_unlink (png);
  g_rmdir (dir);
  gtk_window_destroy (GTK_WINDOW (window));
}

/* The plot's read-out: a pixel at 600 K reads the sweep's row at 600 K. */
static void
test_plot_readout (void **state)
{
  QvWindow *window = open_demo ();
  QvThermoPanel *panel = qv_window_get_thermo_panel (window);
  GtkWidget *area;
  QvThermochemPlotOptions o;
  const QvGasThermo *sweep;
  gsize n = 0, i600;
  double l, t, r, b;
  g_autofree char *text = NULL, *want = NULL;
  (void) state;

  qv_window_show_side_page (window, "thermo");
  qv_thermo_panel_show_page (panel, "sweep");
  qvg_spin (0.3);
  area = qv_thermo_panel_get_plot_area (panel);
  sweep = qv_thermo_panel_get_sweep (panel, &n);
  assert_int_equal (n, 191);
  assert_true (sweep[0].temperature == QV_THERMO_PANEL_SWEEP_MIN);
  assert_true (sweep[n - 1].temperature == QV_THERMO_PANEL_SWEEP_MAX);
  i600 = (gsize) ((600.0 - QV_THERMO_PANEL_SWEEP_MIN) / QV_THERMO_PANEL_SWEEP_STEP);
  assert_true (sweep[i600].temperature == 600.0);
  qv_thermochem_plot_options_init (&o);
  o.width = gtk_widget_get_width (area);
  o.height = gtk_widget_get_height (area);
  assert_true (o.width >= 240 && o.height >= 150);
  qv_thermochem_plot_area (&o, QV_THERMOCHEM_PANEL_ENTROPY, &l, &t, &r, &b);
  text = qv_thermo_panel_describe_point (panel, qv_thermochem_plot_t_to_pixel (sweep, n, &o, 600.0),
                                         0.5 * (t + b));
  want = g_strdup_printf ("%.2f", sweep[i600].total.entropy * qv_gas_kj_per_mol () * 1000);
  assert_non_null (strstr (text, "600 K"));
  assert_non_null (strstr (text, want));
  g_free (text);
  text = qv_thermo_panel_describe_point (panel, 1, 1);
  assert_string_equal (text, "");
  gtk_window_destroy (GTK_WINDOW (window));
}

/* A crystal keeps its lattice page; the Thermochemistry page is hidden. */
static void
test_crystal_has_no_thermo_page (void **state)
{
  QvWindow *window = qvg_window ();
  g_autofree char *path = g_build_filename (g_getenv ("QV_SOURCE_ROOT"), "data", "examples",
                                            "rocksalt-springs", "mx.quaver.json", NULL);
  QvDocumentSource source = { .geometry = path };
  (void) state;

  qv_window_open_source (window, &source);
  assert_true (qvg_wait (qvg_window_has_document, window, 120.0));
  assert_true (qvg_wait (qvg_window_idle, window, 120.0));
  assert_string_equal (qv_window_get_side_page (window), "lattice");
  assert_true (qv_window_get_side_switcher_visible (window));
  assert_false (page_visible (qv_window_get_thermo_panel (window)));
  assert_true (page_visible (qv_window_get_lattice_pane (window)));
  assert_false (qv_thermo_panel_has_results (qv_window_get_thermo_panel (window)));
  gtk_window_destroy (GTK_WINDOW (window));
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_page_is_the_commands),
    cmocka_unit_test (test_soft_modes_as_the_command),
    cmocka_unit_test (test_row_selects_mode),
    cmocka_unit_test (test_save),
    cmocka_unit_test (test_plot_readout),
    cmocka_unit_test (test_crystal_has_no_thermo_page),
  };
  qvg_app ();
  return cmocka_run_group_tests (tests, NULL, NULL);
}
