/* test-anharmonic-app.c — the anharmonic window. `quaver displace` writes a
 * scan of 41 structures along mode 1 of the bundled formaldehyde example
 * (data/examples/formaldehyde, invented demo data); the "electronic-
 * structure code" is a Morse potential V(Q) = D (1 − e^(−aQ))² in the
 * manifest's mass-weighted Q (Morse, Phys. Rev. 34, 57, 1929), D = 1.2 eV
 * (invented), a from V''(0) = 2 D a² = λ of the mode's harmonic
 * wavenumber, its energies written as a NAME ENERGY file in hartree on an
 * invented absolute offset. Checked:
 *
 * - the window opened through win.load-scan-energies' file choosers (the
 *   manifest, then the energy file with its unit) shows, for every level,
 *   what `quaver anharmonic MANIFEST --energies FILE --energy-units
 *   hartree -f json` prints on the same files (the command is the
 *   reference of the app; it is itself checked against NumPy and the Morse
 *   closed form in tests/anharmonic), and the command's warnings and notes;
 * - with the spline fit chosen in the window the levels are the command's
 *   --spline ones and, loosely, Morse's closed form E_v = ħω(v+½) −
 *   [ħω(v+½)]²/(4D) (0.2 cm⁻¹, the interpolation error of 41 points that
 *   tests/anharmonic measured);
 * - the plot's read-out names the Q under the pointer (the plot's own
 *   pixel ↔ Q conversion) and V there;
 * - Save… writes the .txt, .csv and .json byte for byte as the command's
 *   -f text|csv|json, a .png and an .svg, and refuses to replace a file
 *   without force (the file is kept);
 * - a NaN energy: the window shows the reader's "file:line" message on its
 *   error page and in an error dialog, and stays usable;
 * - energies as energy= of the XYZ files (eV, no energy file asked for):
 *   a symmetric double well B((Q/a)² − 1)² (invented, as in
 *   tests/anharmonic) shows the command's levels, both minima, the barrier
 *   (B itself, the quartic being exact) and the tunnelling splitting, with
 *   the multiple-well warning as a banner; a scan too short for the Morse
 *   well flags its levels above the scan in the table and warns;
 * - a grid over two modes with a coupled quadratic potential: the table and
 *   the coupled fundamentals as the command prints them, no plot, the CSV
 *   as the command's.
 *
 * Constants: CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93, 025010,
 * 2021): e, u, c, h exact or as published.
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
#include "qv-anharmonic-window.h"
#include "qv-potential-plot.h"
#include "qv-window-scan.h"

#define E_CHARGE 1.602176634e-19
#define M_U 1.66053906660e-27
#define C_LIGHT 299792458.0
#define H_PLANCK 6.62607015e-34
#define HARTREE_EV 27.211386245988
#define MORSE_D 1.2                   /* eV, invented */
#define OFFSET_HARTREE (-114.25)      /* an invented absolute energy */

/* |a − b| ≤ tol, with the values printed when not */
#define assert_close(a, b, tol) check_close ((a), (b), (tol), #a, __LINE__)
static void
check_close (double a, double b, double tol, const char *what, int line)
{
  if (!(fabs (a - b) <= tol))
    print_error ("line %d: %s = %.12g, expected %.12g (tolerance %g)\n", line, what, a, b, tol);
  assert_true (fabs (a - b) <= tol);
}

static char *tmp;
static char *manifest;
static char *energies;                /* Morse, hartree */
static char *nan_energies;            /* the same with one NaN */
static double hbar_omega;             /* eV */

/* `quaver ARGS…` (NULL-terminated), its standard output; exit 0 required. */
static char *
run_cli (const char *const *args)
{
  char *out = qvg_run_quaver (NULL, args);
  assert_non_null (out);
  return out;
}

/* `quaver anharmonic` on the Morse scan, @extra (NULL or one option), -f @format. */
static char *
run_anharmonic (const char *extra, const char *format)
{
  const char *args[] = { "anharmonic", manifest, "--energies", energies, "--energy-units", "hartree",
                         "-f", format, extra, NULL };
  return run_cli (args);
}

static int
setup (void **state)
{
  g_autofree char *bundle = g_build_filename (g_getenv ("QV_SOURCE_ROOT"), "data", "examples",
                                              "formaldehyde", "formaldehyde.quaver.json", NULL);
  g_autofree char *scan = NULL, *out = NULL;
  g_autoptr(JsonParser) parser = json_parser_new ();
  g_autoptr(GString) good = g_string_new ("# invented Morse energies of the scan, hartree\n");
  g_autoptr(GString) bad = g_string_new ("# the same with a NaN\n");
  JsonArray *files;
  double wavenumber = 0, lambda, a;

  tmp = g_dir_make_tmp ("qv-anharmonic-app-XXXXXX", NULL);
  assert_non_null (tmp);
  scan = g_build_filename (tmp, "scan", NULL);
  {
    const char *args[] = { "displace", bundle, "--mode", "1", "--scan", "41", "--q", "9", "-o", scan, NULL };
    out = run_cli (args);
  }
  manifest = g_build_filename (scan, "manifest.json", NULL);
  assert_true (json_parser_load_from_file (parser, manifest, NULL));
  files = json_object_get_array_member (json_node_get_object (json_parser_get_root (parser)), "files");
  assert_int_equal (json_array_get_length (files), 41);
  for (guint i = 0; i < json_array_get_length (files); i++)
    {
      JsonObject *f = json_array_get_object_element (files, i);
      JsonObject *frame = json_array_get_object_element (json_object_get_array_member (f, "frames"), 0);
      JsonObject *mode = json_array_get_object_element (json_object_get_array_member (frame, "modes"), 0);
      const double Q = json_object_get_double_member (mode, "Q");
      g_autofree char *name = g_strndup (json_object_get_string_member (f, "name"),
                                         strlen (json_object_get_string_member (f, "name")) - 4);
      double V;

      if (i == 0)
        {
          /* λ (eV/(u Å²)) of the harmonic wavenumber: ω = 2πc·100·ν̃ = √(λ e/(u 10⁻²⁰)) */
          wavenumber = json_object_get_double_member (mode, "wavenumber");
          lambda = pow (2 * G_PI * C_LIGHT * 100 * wavenumber, 2) * 1e-20 * M_U / E_CHARGE;
          a = sqrt (lambda / (2 * MORSE_D));
          hbar_omega = H_PLANCK / (2 * G_PI) * 2 * G_PI * C_LIGHT * 100 * wavenumber / E_CHARGE;
        }
      V = MORSE_D * pow (1 - exp (-a * Q), 2);
      g_string_append_printf (good, "%s %.15f\n", name, OFFSET_HARTREE + V / HARTREE_EV);
      if (i == 17)
        g_string_append_printf (bad, "%s nan\n", name);
      else
        g_string_append_printf (bad, "%s %.15f\n", name, OFFSET_HARTREE + V / HARTREE_EV);
    }
  assert_true (wavenumber > 100);
  energies = g_build_filename (tmp, "scan.txt", NULL);
  nan_energies = g_build_filename (tmp, "scan-nan.txt", NULL);
  assert_true (g_file_set_contents (energies, good->str, -1, NULL));
  assert_true (g_file_set_contents (nan_energies, bad->str, -1, NULL));
  return 0;
}

static int
teardown (void **state)
{
  qvg_remove_tree (tmp);
  g_free (tmp);
  g_free (manifest);
  g_free (energies);
  g_free (nan_energies);
  return 0;
}

static gboolean
window_idle (gpointer data)
{
  return !qv_anharmonic_window_is_busy (data);
}

static gboolean
chooser_shown (gpointer window)
{
  return qv_window_scan_get_chooser (window) != NULL;
}

typedef struct { GtkFileChooser *chooser; GFile *file; } Chosen;

static gboolean
file_chosen (gpointer data)
{
  Chosen *c = data;
  g_autoptr(GFile) got = gtk_file_chooser_get_file (c->chooser);
  return got && g_file_equal (got, c->file);
}

/* The chooser's file is selected once its folder has loaded: then the
 * user's "Open". */
static void
accept_when_chosen (GtkFileChooserNative *chooser, GFile *file)
{
  Chosen c = { GTK_FILE_CHOOSER (chooser), file };
  assert_true (qvg_wait (file_chosen, &c, 30.0));
  g_signal_emit_by_name (chooser, "response", GTK_RESPONSE_ACCEPT);
}

static QvAnharmonicWindow *
find_anharmonic_window (void)
{
  GListModel *tops = gtk_window_get_toplevels ();   /* transfer none */

  for (guint i = 0; i < g_list_model_get_n_items (tops); i++)
    {
      g_autoptr(GObject) w = g_list_model_get_item (tops, i);
      if (QV_IS_ANHARMONIC_WINDOW (w) && gtk_widget_get_visible (GTK_WIDGET (w)))
        return QV_ANHARMONIC_WINDOW (w);
    }
  return NULL;
}

static gboolean
anharmonic_window_shown (gpointer data)
{
  return find_anharmonic_window () != NULL;
}

static double
cell_value (QvAnharmonicWindow *w, guint v, guint column)
{
  const char *text = qv_anharmonic_window_get_cell (w, v, column);
  char *end = NULL;
  double x;

  assert_non_null (text);
  x = g_ascii_strtod (text, &end);
  assert_true (end != text);
  return x;
}

/* Every level the window shows against the command's JSON: E, E − E0,
 * ⟨Q⟩ and the turning points at the table's 4 decimals; the report's
 * values to 1e-9 cm⁻¹ (the same calls). */
static void check_against_json (QvAnharmonicWindow *w, const char *out);

/* A turning point of the command's JSON as the table shows it: null (V
 * below E up to the scan's end) is "beyond the scan". */
static char *
turning_text (JsonArray *tp, guint k)
{
  JsonNode *n = json_array_get_element (tp, k);
  return JSON_NODE_HOLDS_NULL (n) ? g_strdup ("beyond the scan")
                                  : g_strdup_printf ("%.4f", json_node_get_double (n));
}

static void
check_against_cli (QvAnharmonicWindow *w, const char *extra)
{
  g_autofree char *out = run_anharmonic (extra, "json");
  check_against_json (w, out);
}

static void
check_against_json (QvAnharmonicWindow *w, const char *out)
{
  g_autoptr(JsonParser) parser = json_parser_new ();
  const QvScanLevelsReport *report = qv_anharmonic_window_get_report (w);
  JsonObject *root;
  JsonArray *levels;
  guint dim;

  assert_true (json_parser_load_from_data (parser, out, -1, NULL));
  root = json_node_get_object (json_parser_get_root (parser));
  levels = json_object_get_array_member (root, "levels");
  dim = (guint) json_object_get_int_member (root, "dimension");
  assert_non_null (report);
  assert_int_equal (report->dim, dim);
  assert_int_equal (json_array_get_length (levels), report->levels->n_levels);
  for (guint v = 0; v < json_array_get_length (levels); v++)
    {
      JsonObject *lv = json_array_get_object_element (levels, v);
      const double e = json_object_get_double_member (lv, "energy");
      JsonArray *tp = dim == 1 ? json_object_get_array_member (lv, "turning_points") : NULL;
      const char *turning = qv_anharmonic_window_get_cell (w, v, QV_ANHARMONIC_COLUMN_TURNING);
      g_autofree char *tp0 = dim == 1 ? turning_text (tp, 0) : NULL;
      g_autofree char *tp1 = dim == 1 ? turning_text (tp, 1) : NULL;
      g_autofree char *expect_tp = g_strdup_printf ("%s … %s", tp0, tp1);

      assert_int_equal ((int) cell_value (w, v, QV_ANHARMONIC_COLUMN_V), (int) v);
      assert_close (cell_value (w, v, QV_ANHARMONIC_COLUMN_ENERGY), e, 0.5e-4 + 1e-9);
      assert_close (cell_value (w, v, QV_ANHARMONIC_COLUMN_SPACING),
                           json_object_get_double_member (lv, "above_ground"), 0.5e-4 + 1e-9);
      assert_close (cell_value (w, v, QV_ANHARMONIC_COLUMN_MEAN),
                           json_array_get_double_element (json_object_get_array_member (lv, "mean_Q"), 0),
                           0.5e-4 + 1e-12);
      if (dim == 2)
        assert_string_equal (turning, "—");
      else
        assert_string_equal (turning, expect_tp);
      assert_close (qv_scan_levels_wavenumber (report->levels->levels[v].energy), e, 1e-9);
    }
  if (dim == 1)
    {
      /* the summary shows the fundamental as the command prints it */
      g_autofree char *f = g_strdup_printf ("Fundamental %.4f",
                                            json_object_get_double_member (root, "fundamental"));
      assert_close (qv_scan_levels_wavenumber (report->levels->fundamental),
                    json_object_get_double_member (root, "fundamental"), 1e-9);
      assert_non_null (strstr (qv_anharmonic_window_get_summary (w), f));
    }
  else
    {
      /* a grid: the coupled fundamentals */
      JsonArray *f = json_object_get_array_member (root, "fundamentals");
      g_autofree char *text = g_strdup_printf ("Coupled fundamentals %.4f and %.4f",
        json_object_get_double_member (json_array_get_object_element (f, 0), "wavenumber"),
        json_object_get_double_member (json_array_get_object_element (f, 1), "wavenumber"));
      assert_non_null (strstr (qv_anharmonic_window_get_summary (w), text));
    }
  /* the command's warnings and notes are the window's banners */
  {
    JsonArray *warnings = json_object_get_array_member (root, "warnings");
    JsonArray *notes = json_object_get_array_member (root, "notes");
    g_autofree char *banners = qv_anharmonic_window_get_banners (w);
    guint shown = 0;
    for (guint k = 0; k < json_array_get_length (warnings); k++, shown++)
      assert_non_null (strstr (banners, json_array_get_string_element (warnings, k)));
    for (guint k = 0; k < json_array_get_length (notes); k++, shown++)
      assert_non_null (strstr (banners, json_array_get_string_element (notes, k)));
    assert_true (json_array_get_length (notes) >= 1);   /* the rectilinear-coordinate note */
    assert_non_null (strstr (banners, "torsion"));
    assert_int_equal (shown, report->warnings->len + report->notes->len);
  }
}

static void
test_levels_as_the_command (void **state)
{
  QvWindow *window = qvg_window ();
  GtkFileChooserNative *chooser;
  QvAnharmonicWindow *w;
  g_autoptr(GFile) file = g_file_new_for_path (manifest);
  g_autoptr(GFile) efile = g_file_new_for_path (energies);

  /* the action's path: the manifest, then (no energy= in the XYZ files)
   * the energy file and its unit */
  assert_null (find_anharmonic_window ());
  assert_true (g_action_group_has_action (G_ACTION_GROUP (window), "load-scan-energies"));
  {
    /* its keyboard shortcut */
    g_auto(GStrv) accels = gtk_application_get_accels_for_action (GTK_APPLICATION (qvg_app ()),
                                                                  "win.load-scan-energies");
    assert_true (accels && accels[0] && g_strv_contains ((const char *const *) accels, "<Shift><Control>e"));
  }
  g_action_group_activate_action (G_ACTION_GROUP (window), "load-scan-energies", NULL);
  assert_true (qvg_wait (chooser_shown, window, 30.0));
  chooser = qv_window_scan_get_chooser (window);
  assert_true (gtk_file_chooser_set_file (GTK_FILE_CHOOSER (chooser), file, NULL));
  accept_when_chosen (chooser, file);
  assert_true (qvg_wait (chooser_shown, window, 30.0));
  chooser = qv_window_scan_get_chooser (window);
  assert_true (gtk_file_chooser_set_file (GTK_FILE_CHOOSER (chooser), efile, NULL));
  gtk_file_chooser_set_choice (GTK_FILE_CHOOSER (chooser), "unit", "hartree");
  accept_when_chosen (chooser, efile);
  assert_true (qvg_wait (anharmonic_window_shown, NULL, 30.0));
  w = find_anharmonic_window ();
  assert_true (qvg_wait (window_idle, w, 120.0));
  assert_null (qv_anharmonic_window_get_error (w));
  check_against_cli (w, NULL);

  /* the spline, chosen in the window, re-solves: the command's --spline,
   * and Morse's closed form within the interpolation error */
  {
    gint64 t0 = g_get_monotonic_time ();
    qv_anharmonic_window_set_fit (w, QV_SCAN_FIT_SPLINE, 0);
    assert_true (qv_anharmonic_window_is_busy (w));
    assert_true (qvg_wait (window_idle, w, 120.0));
    /* a figure, not a check (benchmarks time things) */
    print_message ("anharmonic window: spline fitted and solved on the worker in %.0f ms\n",
                   (g_get_monotonic_time () - t0) / 1000.0);
  }
  assert_int_equal (qv_scan_potential_fit (qv_anharmonic_window_get_report (w)->potential), QV_SCAN_FIT_SPLINE);
  check_against_cli (w, "--spline");
  for (guint v = 0; v < 4; v++)
    {
      /* Morse 1929: E_v = ħω(v+½) − [ħω(v+½)]²/(4D), from the bottom of the well */
      const double x = hbar_omega * (v + 0.5);
      const double morse = qv_scan_levels_wavenumber (x - x * x / (4 * MORSE_D));
      assert_close (cell_value (w, v, QV_ANHARMONIC_COLUMN_ENERGY), morse, 0.2);
    }
  /* a polynomial of degree 12 again differs from the spline */
  qv_anharmonic_window_set_fit (w, QV_SCAN_FIT_POLYNOMIAL, 12);
  assert_true (qvg_wait (window_idle, w, 120.0));
  assert_int_equal (qv_scan_potential_degree (qv_anharmonic_window_get_report (w)->potential), 12);
  check_against_cli (w, "--degree=12");
  gtk_window_destroy (GTK_WINDOW (w));
  gtk_window_destroy (GTK_WINDOW (window));
}

static QvAnharmonicWindow *
open_morse (QvWindow *window, const char *file)
{
  QvScanEnergiesOptions options;
  QvAnharmonicWindow *w;

  qv_scan_energies_options_init (&options);
  options.energies = file;
  options.unit_given = TRUE;
  options.unit = QV_ENERGY_UNIT_HARTREE;
  w = qv_window_load_scan_energies (window, manifest, &options);
  assert_true (qvg_wait (window_idle, w, 120.0));
  qvg_spin (0.3);
  return w;
}

static void
test_readout (void **state)
{
  QvWindow *window = qvg_window ();
  QvAnharmonicWindow *w = open_morse (window, energies);
  const QvScanLevelsReport *r = qv_anharmonic_window_get_report (w);
  GtkWidget *plot = qv_anharmonic_window_get_plot (w);
  QvPotentialPlotData d = { r->potential, r->levels, 0, NULL, NULL };
  QvPotentialPlotOptions o;
  const double Q = 0.5;
  g_autofree char *expect = g_strdup_printf ("Q = %.3f", Q);
  double lo, hi, px, py, V, e_cm1;

  assert_true (gtk_widget_get_width (plot) >= 200);
  qv_potential_plot_options_init (&o);
  o.width = gtk_widget_get_width (plot);
  o.height = gtk_widget_get_height (plot);
  qv_scan_potential_range (r->potential, 0, &lo, &hi);
  assert_true (Q > lo && Q < hi);
  px = qv_potential_plot_q_to_pixel (&d, &o, Q);
  py = o.height / 2.0;
  qv_anharmonic_window_hover (w, px, py);
  assert_non_null (strstr (qv_anharmonic_window_get_readout (w), expect));
  /* V there, cm⁻¹ above the minimum, as the potential says */
  V = qv_scan_potential_eval (r->potential, &Q);
  e_cm1 = qv_scan_levels_wavenumber (V - r->levels->v_min);
  {
    g_autofree char *v_text = g_strdup_printf ("V(Q) = %.2f", e_cm1);
    assert_non_null (strstr (qv_anharmonic_window_get_readout (w), v_text));
  }
  gtk_window_destroy (GTK_WINDOW (w));
  gtk_window_destroy (GTK_WINDOW (window));
}

static void
test_save (void **state)
{
  QvWindow *window = qvg_window ();
  QvAnharmonicWindow *w = open_morse (window, energies);
  static const char *const formats[][2] = { { "txt", "text" }, { "csv", "csv" }, { "json", "json" } };

  for (gsize i = 0; i < G_N_ELEMENTS (formats); i++)
    {
      g_autofree char *name = g_strdup_printf ("levels.%s", formats[i][0]);
      g_autofree char *path = g_build_filename (tmp, name, NULL);
      g_autofree char *cli = run_anharmonic (NULL, formats[i][1]);
      g_autofree char *saved = NULL;
      g_autoptr(GError) error = NULL;

      assert_true (qv_anharmonic_window_save (w, path, FALSE, &error));
      assert_true (g_file_get_contents (path, &saved, NULL, NULL));
      assert_string_equal (saved, cli);
      /* never over a file without consent; the file is kept */
      assert_false (qv_anharmonic_window_save (w, path, FALSE, &error));
      assert_non_null (error);
      g_clear_pointer (&saved, g_free);
      assert_true (g_file_get_contents (path, &saved, NULL, NULL));
      assert_string_equal (saved, cli);
    }
  {
    g_autofree char *png = g_build_filename (tmp, "plot.png", NULL);
    g_autofree char *svg = g_build_filename (tmp, "plot.svg", NULL);
    g_autofree char *bytes = NULL;
    gsize length = 0;
    g_autoptr(GError) error = NULL;
    g_autofree char *bad = g_build_filename (tmp, "plot.xyz", NULL);

    assert_true (qv_anharmonic_window_save (w, png, FALSE, NULL));
    assert_true (g_file_get_contents (png, &bytes, &length, NULL));
    assert_true (length > 8 && memcmp (bytes, "\x89PNG", 4) == 0);
    g_clear_pointer (&bytes, g_free);
    assert_true (qv_anharmonic_window_save (w, svg, FALSE, NULL));
    assert_true (g_file_get_contents (svg, &bytes, &length, NULL));
    assert_non_null (strstr (bytes, "<svg"));
    assert_false (qv_anharmonic_window_save (w, bad, FALSE, &error));
    assert_false (g_file_test (bad, G_FILE_TEST_EXISTS));
  }
  gtk_window_destroy (GTK_WINDOW (w));
  gtk_window_destroy (GTK_WINDOW (window));
}

static gboolean
has_error_dialog (gpointer data)
{
  return qv_anharmonic_window_get_error_dialog (data) != NULL;
}

static void
test_nan_energy (void **state)
{
  QvWindow *window = qvg_window ();
  QvAnharmonicWindow *w = open_morse (window, nan_energies);
  g_autofree char *base = g_path_get_basename (nan_energies);
  const char *error = qv_anharmonic_window_get_error (w);
  GtkWindow *dialog;

  /* the reader's "file:line: …" (line 19: the comment, then structure 17) */
  assert_non_null (error);
  assert_non_null (strstr (error, base));
  assert_non_null (strstr (error, ":19:"));
  assert_null (qv_anharmonic_window_get_report (w));
  assert_true (qvg_wait (has_error_dialog, w, 10.0));
  dialog = qv_anharmonic_window_get_error_dialog (w);
  assert_true (gtk_widget_get_visible (GTK_WIDGET (dialog)));
  /* nothing to save; closing the dialog leaves a usable window that loads
   * good energies */
  assert_false (qv_anharmonic_window_save (w, "/nonexistent/levels.txt", FALSE, NULL));
  gtk_window_destroy (dialog);
  qvg_spin (0.1);
  assert_null (qv_anharmonic_window_get_error_dialog (w));
  {
    QvScanEnergiesOptions options;
    qv_scan_energies_options_init (&options);
    options.energies = energies;
    options.unit_given = TRUE;
    options.unit = QV_ENERGY_UNIT_HARTREE;
    qv_anharmonic_window_load (w, manifest, &options);
    assert_true (qvg_wait (window_idle, w, 120.0));
    assert_null (qv_anharmonic_window_get_error (w));
    assert_non_null (qv_anharmonic_window_get_report (w));
  }
  gtk_window_destroy (GTK_WINDOW (w));
  gtk_window_destroy (GTK_WINDOW (window));
}

/* A scan `quaver displace BUNDLE ARGS… -o tmp/NAME` with V(Q) (eV) of
 * each structure written back as energy= on its XYZ comment line; its
 * manifest. */
static char *
xyz_scan (const char *name, const char *const *args, double (*V) (double Q))
{
  g_autofree char *bundle = g_build_filename (g_getenv ("QV_SOURCE_ROOT"), "data", "examples",
                                              "formaldehyde", "formaldehyde.quaver.json", NULL);
  g_autofree char *dir = g_build_filename (tmp, name, NULL);
  g_autoptr(GPtrArray) argv = g_ptr_array_new ();
  g_autoptr(JsonParser) parser = json_parser_new ();
  g_autofree char *out = NULL;
  char *path;
  JsonArray *files;

  g_ptr_array_add (argv, "displace");
  g_ptr_array_add (argv, bundle);
  for (const char *const *a = args; *a; a++)
    g_ptr_array_add (argv, (gpointer) *a);
  g_ptr_array_add (argv, "-o");
  g_ptr_array_add (argv, dir);
  g_ptr_array_add (argv, NULL);
  out = run_cli ((const char *const *) argv->pdata);
  path = g_build_filename (dir, "manifest.json", NULL);
  assert_true (json_parser_load_from_file (parser, path, NULL));
  files = json_object_get_array_member (json_node_get_object (json_parser_get_root (parser)), "files");
  for (guint i = 0; i < json_array_get_length (files); i++)
    {
      JsonObject *f = json_array_get_object_element (files, i);
      JsonObject *frame = json_array_get_object_element (json_object_get_array_member (f, "frames"), 0);
      JsonObject *mode = json_array_get_object_element (json_object_get_array_member (frame, "modes"), 0);
      g_autofree char *xyz = g_build_filename (dir, json_object_get_string_member (f, "name"), NULL);
      g_autofree char *text = NULL;
      g_auto(GStrv) lines = NULL;
      g_autofree char *comment = NULL, *joined = NULL;

      assert_true (g_file_get_contents (xyz, &text, NULL, NULL));
      lines = g_strsplit (text, "\n", -1);
      assert_true (g_strv_length (lines) > 2);
      comment = g_strdup_printf ("%s energy=%.15g", lines[1], V (json_object_get_double_member (mode, "Q")));
      g_free (lines[1]);
      lines[1] = g_steal_pointer (&comment);
      joined = g_strjoinv ("\n", lines);
      assert_true (g_file_set_contents (xyz, joined, -1, NULL));
    }
  return path;
}

/* V = B((Q/a)² − 1)², a = 0.45 u½ Å, B = 1500 cm⁻¹ (invented, as in
 * tests/anharmonic): minima at ±a, barrier B */
#define WELL_A 0.45
#define WELL_B_CM1 1500.0
static double
double_well (double Q)
{
  const double ev_per_cm1 = H_PLANCK * C_LIGHT * 100 / E_CHARGE;
  return WELL_B_CM1 * ev_per_cm1 * pow (pow (Q / WELL_A, 2) - 1, 2);
}

static double
morse_short (double Q)
{
  /* the Morse well of setup() on a scan too short for its upper levels */
  const double lambda = pow (hbar_omega * E_CHARGE / (H_PLANCK / (2 * G_PI)), 2) * 1e-20 * M_U / E_CHARGE;
  const double a = sqrt (lambda / (2 * MORSE_D));
  return MORSE_D * pow (1 - exp (-a * Q), 2);
}

/* The core's warnings as banners, the table's flags and a double well's
 * summary, on scans whose energies are energy= of their XYZ files (eV,
 * no energy file: the chooser's path without the second question). */
static void
test_warnings (void **state)
{
  static const char *const dw_args[] = { "--mode", "1", "--scan", "61", "--Q", "0.9", NULL };
  static const char *const short_args[] = { "--mode", "1", "--scan", "11", "--q", "2", NULL };
  g_autofree char *dw = xyz_scan ("dw", dw_args, double_well);
  g_autofree char *shrt = xyz_scan ("short", short_args, morse_short);
  QvWindow *window = qvg_window ();
  QvAnharmonicWindow *w;
  g_autofree char *banners = NULL;
  gboolean flagged = FALSE;

  assert_true (qv_scan_energies_have_xyz_energies (dw));
  w = qv_window_load_scan_energies (window, dw, NULL);
  assert_true (qvg_wait (window_idle, w, 120.0));
  qv_anharmonic_window_set_fit (w, QV_SCAN_FIT_POLYNOMIAL, 4);
  assert_true (qvg_wait (window_idle, w, 120.0));
  {
    const char *args[] = { "anharmonic", dw, "--degree=4", "-f", "json", NULL };
    g_autofree char *out = run_cli (args);
    g_autoptr(JsonParser) parser = json_parser_new ();
    JsonObject *well;
    g_autofree char *splitting = NULL, *barrier = NULL;

    check_against_json (w, out);
    assert_true (json_parser_load_from_data (parser, out, -1, NULL));
    well = json_object_get_object_member (json_node_get_object (json_parser_get_root (parser)), "double_well");
    assert_non_null (well);
    splitting = g_strdup_printf ("tunnelling splitting %.4f cm⁻¹", json_object_get_double_member (well, "splitting"));
    barrier = g_strdup_printf ("barrier %.4f cm⁻¹", json_object_get_double_member (well, "barrier"));
    assert_non_null (strstr (qv_anharmonic_window_get_summary (w), splitting));
    assert_non_null (strstr (qv_anharmonic_window_get_summary (w), barrier));
    /* the barrier of the invented well, 1500 cm⁻¹, from the quartic fit */
    assert_close (json_object_get_double_member (well, "barrier"), WELL_B_CM1, 1e-3);
  }
  assert_non_null (strstr (qv_anharmonic_window_get_summary (w), "Double well"));
  banners = qv_anharmonic_window_get_banners (w);
  assert_non_null (strstr (banners, "multiple well"));
  g_clear_pointer (&banners, g_free);

  /* the short scan: levels above it flagged in the table and warned */
  qv_anharmonic_window_load (w, shrt, &(QvScanEnergiesOptions) { NULL, FALSE, QV_ENERGY_UNIT_EV,
                                                                 QV_SCAN_GEOMETRY_TOLERANCE });
  assert_true (qvg_wait (window_idle, w, 120.0));
  {
    const char *args[] = { "anharmonic", shrt, "-f", "json", NULL };
    g_autofree char *out = run_cli (args);
    check_against_json (w, out);
  }
  banners = qv_anharmonic_window_get_banners (w);
  assert_non_null (strstr (banners, "above the highest scanned energy"));
  for (guint v = 0; v < qv_anharmonic_window_get_report (w)->levels->n_levels; v++)
    {
      const gboolean above = qv_anharmonic_window_get_report (w)->levels->levels[v].above_scan;
      const char *flags = qv_anharmonic_window_get_cell (w, v, QV_ANHARMONIC_COLUMN_FLAGS);
      assert_int_equal (above, strstr (flags, "above the scan") != NULL);
      flagged |= above;
    }
  assert_true (flagged);

  /* a degree the 11 points cannot determine: the fit's refusal on the
   * error page and in a dialog; a lower one solves again */
  qv_anharmonic_window_set_fit (w, QV_SCAN_FIT_POLYNOMIAL, 16);
  assert_true (qvg_wait (window_idle, w, 120.0));
  assert_non_null (qv_anharmonic_window_get_error (w));
  assert_true (qvg_wait (has_error_dialog, w, 10.0));
  assert_null (qv_anharmonic_window_get_report (w));
  {
    g_autofree char *kept = g_build_filename (tmp, "refused.txt", NULL);
    assert_false (qv_anharmonic_window_save (w, kept, FALSE, NULL));
    assert_false (g_file_test (kept, G_FILE_TEST_EXISTS));
  }
  {
    const char *args[] = { "anharmonic", shrt, "--degree=16", NULL };
    g_autoptr(GPtrArray) argv = g_ptr_array_new ();
    int status = 0;
    g_ptr_array_add (argv, (gpointer) g_getenv ("QUAVER"));
    for (const char *const *a = args; *a; a++)
      g_ptr_array_add (argv, (gpointer) *a);
    g_ptr_array_add (argv, NULL);
    /* the command refuses it too */
    assert_true (g_spawn_sync (NULL, (char **) argv->pdata, NULL, G_SPAWN_STDOUT_TO_DEV_NULL
                               | G_SPAWN_STDERR_TO_DEV_NULL, NULL, NULL, NULL, NULL, &status, NULL));
    assert_false (g_spawn_check_wait_status (status, NULL));
  }
  gtk_window_destroy (qv_anharmonic_window_get_error_dialog (w));
  qv_anharmonic_window_set_fit (w, QV_SCAN_FIT_POLYNOMIAL, 4);
  assert_true (qvg_wait (window_idle, w, 120.0));
  assert_null (qv_anharmonic_window_get_error (w));
  assert_int_equal (qv_scan_potential_degree (qv_anharmonic_window_get_report (w)->potential), 4);
  gtk_window_destroy (GTK_WINDOW (w));
  gtk_window_destroy (GTK_WINDOW (window));
}

typedef struct { QvAnharmonicWindow *w; guint busy; } Ticks;

static gboolean
count_busy_tick (gpointer data)
{
  Ticks *t = data;
  t->busy += qv_anharmonic_window_is_busy (t->w);
  return G_SOURCE_CONTINUE;
}

/* A grid over modes 1 and 2 with V = ½(l₁Q₁² + l₂Q₂²) + cQ₁Q₂ (invented
 * l₁ = 0.5, l₂ = 0.8, c = 0.1 eV/(u Å²)), energies in eV in a file: the
 * table and the coupled fundamentals as the command prints them, no plot
 * (it draws one coordinate), the table saved as the command's. */
static void
test_grid (void **state)
{
  g_autofree char *bundle = g_build_filename (g_getenv ("QV_SOURCE_ROOT"), "data", "examples",
                                              "formaldehyde", "formaldehyde.quaver.json", NULL);
  g_autofree char *dir = g_build_filename (tmp, "grid", NULL);
  g_autofree char *grid = g_build_filename (dir, "manifest.json", NULL);
  g_autofree char *file = g_build_filename (tmp, "grid.txt", NULL);
  g_autofree char *out = NULL, *saved = NULL, *csv = g_build_filename (tmp, "grid.csv", NULL);
  g_autoptr(JsonParser) parser = json_parser_new ();
  g_autoptr(GString) text = g_string_new (NULL);
  const char *displace[] = { "displace", bundle, "--modes", "1,2", "--grid", "9", "--q", "5", "-o", dir, NULL };
  const char *json_args[] = { "anharmonic", grid, "--energies", file, "--energy-units", "eV", "-f", "json", NULL };
  const char *csv_args[] = { "anharmonic", grid, "--energies", file, "--energy-units", "eV", "-f", "csv", NULL };
  JsonArray *files;
  QvScanEnergiesOptions options;
  QvWindow *window;
  QvAnharmonicWindow *w;

  g_free (run_cli (displace));
  assert_true (json_parser_load_from_file (parser, grid, NULL));
  files = json_object_get_array_member (json_node_get_object (json_parser_get_root (parser)), "files");
  for (guint i = 0; i < json_array_get_length (files); i++)
    {
      JsonObject *f = json_array_get_object_element (files, i);
      JsonArray *modes = json_object_get_array_member (
        json_array_get_object_element (json_object_get_array_member (f, "frames"), 0), "modes");
      const double q1 = json_object_get_double_member (json_array_get_object_element (modes, 0), "Q");
      const double q2 = json_object_get_double_member (json_array_get_object_element (modes, 1), "Q");
      const char *name = json_object_get_string_member (f, "name");
      g_string_append_printf (text, "%.*s %.15f\n", (int) strlen (name) - 4, name,
                              0.5 * (0.5 * q1 * q1 + 0.8 * q2 * q2) + 0.1 * q1 * q2);
    }
  assert_true (g_file_set_contents (file, text->str, -1, NULL));
  window = qvg_window ();
  qv_scan_energies_options_init (&options);
  options.energies = file;
  options.unit_given = TRUE;
  options.unit = QV_ENERGY_UNIT_EV;
  w = qv_window_load_scan_energies (window, grid, &options);
  {
    /* the solve runs on a worker: the main loop turns while it is busy */
    Ticks t = { w, 0 };
    const guint id = g_timeout_add (1, count_busy_tick, &t);
    assert_true (qvg_wait (window_idle, w, 300.0));
    g_source_remove (id);
    print_message ("main loop turned %u times during the grid's solve\n", t.busy);
    assert_true (t.busy > 0);
  }
  assert_null (qv_anharmonic_window_get_error (w));
  out = run_cli (json_args);
  check_against_json (w, out);
  assert_false (gtk_widget_get_visible (qv_anharmonic_window_get_plot (w)));
  assert_true (qv_anharmonic_window_save (w, csv, FALSE, NULL));
  g_clear_pointer (&out, g_free);
  out = run_cli (csv_args);
  assert_true (g_file_get_contents (csv, &saved, NULL, NULL));
  assert_string_equal (saved, out);
  gtk_window_destroy (GTK_WINDOW (w));
  gtk_window_destroy (GTK_WINDOW (window));
}

/* The picture of the guide (docs/guide/anharmonic-window.png): with
 * QV_ANHARMONIC_SHOT=SECONDS the spline window stays on screen that long
 * for `import -window root`. */
static void
test_screenshot_pause (void **state)
{
  const char *seconds = g_getenv ("QV_ANHARMONIC_SHOT");
  QvWindow *window;
  QvAnharmonicWindow *w;

  if (seconds == NULL)
    skip ();
  window = qvg_window ();
  w = open_morse (window, energies);
  qv_anharmonic_window_set_fit (w, QV_SCAN_FIT_SPLINE, 0);
  assert_true (qvg_wait (window_idle, w, 120.0));
  gtk_window_set_default_size (GTK_WINDOW (w), 1000, 790);
  qvg_spin (0.5);
  qv_anharmonic_window_hover (w, 600, 200);
  qvg_spin (g_ascii_strtod (seconds, NULL));
  gtk_window_destroy (GTK_WINDOW (w));
  gtk_window_destroy (GTK_WINDOW (window));
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_levels_as_the_command),
    cmocka_unit_test (test_readout),
    cmocka_unit_test (test_save),
    cmocka_unit_test (test_nan_energy),
    cmocka_unit_test (test_warnings),
    cmocka_unit_test (test_grid),
    cmocka_unit_test (test_screenshot_pause),
  };

  qvg_app ();
  return cmocka_run_group_tests_name ("anharmonic-app", tests, setup, teardown);
}
