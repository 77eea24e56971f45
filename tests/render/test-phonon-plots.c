/* test-phonon-plots.c — the cairo DOS and thermal plots: pixel maps against
 * the linear maps written out here, the sideways DOS lined up with a
 * dispersion plot of the same height, read-outs aimed at projected points,
 * pixels under the curves, size checks. `test-phonon-plots svg DIR` writes
 * dos.svg, dos-horizontal.svg and thermal.svg to look at. No GL.
 *
 * Data are invented: a DOS of two Gaussian bands split between two
 * elements (not a real crystal's), and the thermal properties of three
 * Einstein oscillators at 200, 300 and 400 cm⁻¹ (qv_thermal_compute),
 * whose heat capacity is checked against the Einstein closed form
 * C = k_B x² eˣ/(eˣ − 1)², x = hcν̃/k_BT (Kittel, Introduction to Solid
 * State Physics, ch. 5, from memory), CODATA 2018 constants (exact SI).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-dispersion-plot.h"
#include "qv-dos-plot.h"
#include "qv-thermal-plot.h"

#define NP 401

static QvPhononDos *
make_dos (void)
{
  QvPhononDos *dos = g_new0 (QvPhononDos, 1);
  dos->method = QV_DOS_GAUSSIAN;
  dos->sigma = 20.0;
  dos->step = 1.0;
  dos->n_points = NP;
  dos->omega = g_new (double, NP);
  dos->total = g_new (double, NP);
  dos->n_groups = 2;
  dos->z = g_new (guint, 2);
  dos->z[0] = 11;    /* Na */
  dos->z[1] = 17;    /* Cl */
  dos->partial = g_new (double, 2 * NP);
  for (gsize i = 0; i < NP; i++)
    {
      const double w = -50.0 + (double) i;
      const double a = 0.02 * exp (-0.5 * pow ((w - 120.0) / 20.0, 2));
      const double b = 0.01 * exp (-0.5 * pow ((w - 280.0) / 15.0, 2));
      dos->omega[i] = w;
      dos->partial[i] = 0.3 * a + 0.8 * b;
      dos->partial[NP + i] = 0.7 * a + 0.2 * b;
      dos->total[i] = a + b;
    }
  return dos;
}

static void
test_dos_mapping (void **state)
{
  g_autoptr(QvPhononDos) dos = make_dos ();
  QvDosPlotOptions o;
  double l, t, r, b, lo, hi, top;

  qv_dos_plot_options_init (&o);
  qv_dos_plot_area (&o, &l, &t, &r, &b);
  qv_dos_plot_range (dos, &o, &lo, &hi, &top);
  assert_true (lo == -50.0 && hi == 350.0);
  assert_true (top > 0.02 && top < 0.025);
  /* frequency along the bottom: ends at the box's edges, linear */
  assert_true (fabs (qv_dos_plot_frequency_to_pixel (dos, &o, -50.0) - l) < 1e-9);
  assert_true (fabs (qv_dos_plot_frequency_to_pixel (dos, &o, 150.0) - 0.5 * (l + r)) < 1e-9);
  assert_true (fabs (qv_dos_plot_value_to_pixel (dos, &o, 0.5 * top) - 0.5 * (t + b)) < 1e-9);
  assert_true (fabs (qv_dos_plot_pixel_to_frequency (dos, &o, qv_dos_plot_frequency_to_pixel (dos, &o, 77.0))
                     - 77.0) < 1e-9);
  /* sideways: frequency upwards, DOS to the right */
  o.horizontal = TRUE;
  o.width = 220;
  qv_dos_plot_area (&o, &l, &t, &r, &b);
  assert_true (fabs (qv_dos_plot_frequency_to_pixel (dos, &o, -50.0) - b) < 1e-9);
  assert_true (fabs (qv_dos_plot_frequency_to_pixel (dos, &o, 350.0) - t) < 1e-9);
  assert_true (fabs (qv_dos_plot_value_to_pixel (dos, &o, top) - r) < 1e-9);
  assert_true (fabs (qv_dos_plot_pixel_to_value (dos, &o, 0.5 * (l + r)) - 0.5 * top) < 1e-12);
}

/* Beside a dispersion plot of the same height and range, a frequency sits
 * on the same row in both. */
static void
test_dos_beside_dispersion (void **state)
{
  g_autoptr(QvPhononDos) dos = make_dos ();
  const double cell[3][3] = { { 3, 0, 0 }, { 0, 3, 0 }, { 0, 0, 3 } };
  g_autoptr(QvBandPath) path = qv_band_path_parse ("G 0 0 0; X 0.5 0 0", NULL);
  g_autoptr(QvBandSampling) s = qv_band_path_sample (path, cell, 11, 0, NULL);
  g_autofree double *w = g_new (double, s->n_q * 3);
  QvDispersionPlotOptions po;
  QvDosPlotOptions o;
  double lo, hi;

  for (gsize k = 0; k < s->n_q; k++)
    for (int br = 0; br < 3; br++)
      w[k * 3 + br] = (100.0 + 100.0 * br) * sin (G_PI * s->q[3 * k]) - (br == 0 ? 30.0 : 0.0);
  qv_dispersion_plot_options_init (&po);
  po.width = 700;
  po.height = 430;
  qv_dispersion_plot_range (s, 3, w, &po, &lo, &hi);
  assert_true (lo < -30.0);
  qv_dos_plot_options_init (&o);
  o.width = 180;
  o.height = po.height;
  o.horizontal = TRUE;
  o.hide_frequency_labels = TRUE;
  o.has_range = TRUE;
  o.x_min = lo;
  o.x_max = hi;
  for (double f = -40.0; f <= 300.0; f += 17.0)
    assert_true (fabs (qv_dos_plot_frequency_to_pixel (dos, &o, f)
                       - qv_dispersion_plot_y_to_pixel (s, 3, w, &po, f)) < 1e-9);
}

static void
test_dos_readout (void **state)
{
  g_autoptr(QvPhononDos) dos = make_dos ();
  QvDosPlotOptions o;
  double f, total, partial[2], l, t, r, b;

  for (int hz = 0; hz < 2; hz++)
    {
      qv_dos_plot_options_init (&o);
      o.horizontal = hz;
      o.unit = hz ? QV_FREQUENCY_THZ : QV_FREQUENCY_CM1;   /* the read-out stays in cm⁻¹ */
      qv_dos_plot_area (&o, &l, &t, &r, &b);
      /* aim at the grid point of 120 cm⁻¹ (index 170) */
      {
        const double p = qv_dos_plot_frequency_to_pixel (dos, &o, 120.0);
        const double px = hz ? 0.5 * (l + r) : p, py = hz ? p : 0.5 * (t + b);
        assert_true (qv_dos_plot_readout (dos, &o, px, py, &f, &total, partial));
        assert_true (fabs (f - 120.0) < 1e-9);
        assert_true (fabs (total - dos->total[170]) < 1e-12 * dos->total[170]);
        assert_true (fabs (partial[0] - dos->partial[170]) < 1e-12);
        assert_true (fabs (partial[1] - dos->partial[NP + 170]) < 1e-12);
      }
      /* outside the box: nothing */
      assert_false (qv_dos_plot_readout (dos, &o, l - 2, 0.5 * (t + b), &f, &total, NULL));
      assert_false (qv_dos_plot_readout (dos, &o, 0.5 * (l + r), b + 2, &f, &total, NULL));
    }
  /* half-way between grid points: the mean of the two (linear) */
  qv_dos_plot_value_at (dos, 120.5, &total, partial);
  assert_true (fabs (total - 0.5 * (dos->total[170] + dos->total[171])) < 1e-15);
  /* outside the grid: zero */
  qv_dos_plot_value_at (dos, 400.0, &total, partial);
  assert_true (total == 0.0 && partial[0] == 0.0 && partial[1] == 0.0);
}

static void
test_dos_pixels (void **state)
{
  g_autoptr(QvPhononDos) dos = make_dos ();
  g_autoptr(GError) error = NULL;
  g_autofree guint8 *rgba = NULL;
  QvDosPlotOptions o;
  double x, y_peak, y_above;
  const guint8 *ground, *under, *over;

  qv_dos_plot_options_init (&o);
  o.width = 600;
  o.height = 400;
  o.hide_partial = TRUE;
  rgba = qv_dos_plot_rgba (dos, &o, &error);
  assert_non_null (rgba);
  /* under the total's peak at 120 cm⁻¹ the fill tints the ground; above it
   * (beyond the legend's reach: the peak is left of centre) the ground */
  x = qv_dos_plot_frequency_to_pixel (dos, &o, 120.0);
  y_peak = qv_dos_plot_value_to_pixel (dos, &o, 0.5 * dos->total[170]);
  y_above = qv_dos_plot_value_to_pixel (dos, &o, 1.04 * dos->total[170]);
  ground = rgba;
  under = rgba + 4 * ((gsize) y_peak * o.width + (gsize) x + 2);
  over = rgba + 4 * ((gsize) y_above * o.width + (gsize) x + 2);
  assert_true (abs (under[0] - ground[0]) + abs (under[1] - ground[1]) + abs (under[2] - ground[2]) > 20);
  assert_true (abs (over[0] - ground[0]) + abs (over[1] - ground[1]) + abs (over[2] - ground[2]) < 40);
  g_free (rgba);
  /* sizes */
  o.width = 150;
  assert_null (qv_dos_plot_rgba (dos, &o, &error));
  g_clear_error (&error);
  o.horizontal = TRUE;
  rgba = qv_dos_plot_rgba (dos, &o, &error);
  assert_non_null (rgba);
}

/* The heat capacity of one Einstein oscillator, J/(K mol) (Kittel ch. 5). */
static double
einstein_cv (double wavenumber, double t)
{
  const double h = 6.62607015e-34, c = 299792458.0, k = 1.380649e-23, na = 6.02214076e23;
  const double x = h * c * 100.0 * wavenumber / (k * t);
  return k * na * x * x * exp (x) / pow (expm1 (x), 2);
}

static QvThermal *
make_thermal (void)
{
  const double q[3] = { 0.5, 0.5, 0.5 };
  const double w[3] = { 200.0, 300.0, 400.0 };
  double t[21];
  for (int i = 0; i < 21; i++)
    t[i] = 50.0 * i;
  return qv_thermal_compute (1, 3, q, w, FALSE, t, 21);
}

static void
test_thermal_mapping_and_readout (void **state)
{
  g_autoptr(QvThermal) th = make_thermal ();
  QvThermalPlotOptions o;
  QvThermalReadout out;
  QvThermalPanel panel;
  double le, te, re, be, ls, ts, rs, bs, t0, t1, v0, v1, px, py;

  qv_thermal_plot_options_init (&o);
  qv_thermal_plot_area (&o, QV_THERMAL_PANEL_ENERGY, &le, &te, &re, &be);
  qv_thermal_plot_area (&o, QV_THERMAL_PANEL_ENTROPY, &ls, &ts, &rs, &bs);
  assert_true (le == ls && re == rs && be < ts && te < be && ts < bs && bs <= o.height);
  qv_thermal_plot_range (th, &o, QV_THERMAL_PANEL_ENTROPY, &t0, &t1, &v0, &v1);
  assert_true (t0 == 0.0 && t1 == 1000.0 && v0 == 0.0);
  assert_true (fabs (qv_thermal_plot_t_to_pixel (th, &o, 0.0) - le) < 1e-9);
  assert_true (fabs (qv_thermal_plot_t_to_pixel (th, &o, 500.0) - 0.5 * (le + re)) < 1e-9);
  assert_true (fabs (qv_thermal_plot_value_to_pixel (th, &o, QV_THERMAL_PANEL_ENTROPY, 0.5 * (v0 + v1))
                     - 0.5 * (ts + bs)) < 1e-9);

  /* aim at T = 300 K on the Cv curve of the lower panel: the read-out
   * gives 300 K and Cv in J/(K mol), the Einstein sum of the three modes */
  px = qv_thermal_plot_t_to_pixel (th, &o, 300.0);
  py = qv_thermal_plot_value_to_pixel (th, &o, QV_THERMAL_PANEL_ENTROPY, th->heat_capacity[6] * 1000.0
                                       * qv_thermal_kj_per_mol (1));
  assert_true (qv_thermal_plot_readout (th, &o, px, py, &panel, &out));
  assert_int_equal (panel, QV_THERMAL_PANEL_ENTROPY);
  assert_true (fabs (out.t - 300.0) < 1e-9);
  {
    const double want = einstein_cv (200.0, 300.0) + einstein_cv (300.0, 300.0) + einstein_cv (400.0, 300.0);
    assert_true (fabs (out.heat_capacity - want) < 1e-8 * want);
  }
  /* per cell: meV/K, and the energies in eV (ZPE = Σ hcν̃/2) */
  o.per_cell = TRUE;
  assert_true (qv_thermal_plot_value_at (th, &o, 300.0, &out));
  assert_true (fabs (out.heat_capacity - th->heat_capacity[6] * 1000.0) < 1e-15);
  {
    const double zpe = 0.5 * (200.0 + 300.0 + 400.0) * 6.62607015e-34 * 299792458.0 * 100.0 / 1.602176634e-19;
    assert_true (fabs (out.zpe - zpe) < 1e-9 * zpe);
  }
  assert_string_equal (qv_thermal_plot_unit (&o, QV_THERMAL_PANEL_ENERGY), "eV/cell");
  /* two formula units per cell halve the molar values */
  o.per_cell = FALSE;
  o.formula_units = 2;
  assert_true (qv_thermal_plot_value_at (th, &o, 300.0, &out));
  assert_true (fabs (out.heat_capacity - 0.5 * th->heat_capacity[6] * 1000.0 * qv_thermal_kj_per_mol (1))
               < 1e-9 * out.heat_capacity);
  /* between two temperatures: linear; outside the table or the panels: nothing */
  assert_true (qv_thermal_plot_value_at (th, &o, 325.0, &out));
  assert_true (fabs (out.entropy - 0.5 * (th->entropy[6] + th->entropy[7]) * 500.0 * qv_thermal_kj_per_mol (1))
               < 1e-9 * out.entropy);
  assert_false (qv_thermal_plot_value_at (th, &o, 1001.0, &out));
  assert_false (qv_thermal_plot_readout (th, &o, px, 0.5 * (be + ts), &panel, &out));
}

static void
test_thermal_pixels (void **state)
{
  g_autoptr(QvThermal) th = make_thermal ();
  g_autoptr(GError) error = NULL;
  g_autofree guint8 *rgba = NULL;
  QvThermalPlotOptions o;
  const guint8 *ground;
  int off = 0;

  qv_thermal_plot_options_init (&o);
  o.width = 640;
  o.height = 480;
  rgba = qv_thermal_plot_rgba (th, &o, &error);
  assert_non_null (rgba);
  ground = rgba;
  /* on the F curve at several temperatures: not the ground */
  for (int i = 2; i < 20; i += 3)
    {
      const double x = qv_thermal_plot_t_to_pixel (th, &o, th->t[i]);
      const double y = qv_thermal_plot_value_to_pixel (th, &o, QV_THERMAL_PANEL_ENERGY,
                                                       th->free_energy[i] * qv_thermal_kj_per_mol (1));
      const guint8 *p = rgba + 4 * ((gsize) floor (y) * o.width + (gsize) floor (x));
      off += abs (p[0] - ground[0]) + abs (p[1] - ground[1]) + abs (p[2] - ground[2]) > 60;
    }
  assert_int_equal (off, 6);
  g_free (rgba);
  o.height = 200;
  rgba = qv_thermal_plot_rgba (th, &o, &error);
  assert_null (rgba);
}

static guint
count_glyphs (const char *svg)
{
  guint n = 0;
  for (const char *p = svg; (p = strstr (p, "<use ")) != NULL; p++)
    n++;
  return n;
}

/* The app's (translated) labels replace the English ones: cairo's SVG
 * places one glyph per character (spaces too), so "T/K" for
 * "temperature (K)" takes 12 fewer, "sum" for "total" 2 fewer. */
static void
test_labels_given (void **state)
{
  g_autoptr(QvThermal) th = make_thermal ();
  g_autoptr(QvPhononDos) dos = make_dos ();
  g_autoptr(GError) error = NULL;
  QvThermalPlotOptions t;
  QvDosPlotOptions d;
  gsize n;
  g_autofree char *a = NULL, *c = NULL, *x = NULL, *y = NULL;

  qv_thermal_plot_options_init (&t);
  a = qv_thermal_plot_svg (th, &t, &n, &error);
  t.temperature_label = "T/K";
  c = qv_thermal_plot_svg (th, &t, &n, &error);
  assert_true (a && c);
  assert_int_equal (count_glyphs (a), count_glyphs (c) + 12);
  qv_dos_plot_options_init (&d);
  x = qv_dos_plot_svg (dos, &d, &n, &error);
  d.total_label = "sum";
  y = qv_dos_plot_svg (dos, &d, &n, &error);
  assert_true (x && y);
  assert_int_equal (count_glyphs (x), count_glyphs (y) + 2);
}

static int
write_samples (const char *dir)
{
  g_autoptr(QvPhononDos) dos = make_dos ();
  g_autoptr(QvThermal) th = make_thermal ();
  QvDosPlotOptions d;
  QvThermalPlotOptions t;
  g_autoptr(GError) error = NULL;
  gsize n;
  g_autofree char *a = NULL, *b = NULL, *c = NULL;
  g_autofree char *pa = g_build_filename (dir, "dos.svg", NULL);
  g_autofree char *pb = g_build_filename (dir, "dos-horizontal.svg", NULL);
  g_autofree char *pc = g_build_filename (dir, "thermal.svg", NULL);

  qv_dos_plot_options_init (&d);
  d.title = "invented DOS";
  a = qv_dos_plot_svg (dos, &d, &n, &error);
  if (!a || !g_file_set_contents (pa, a, (gssize) n, &error))
    return 1;
  d.horizontal = TRUE;
  d.width = 240;
  d.dark = TRUE;
  b = qv_dos_plot_svg (dos, &d, &n, &error);
  if (!b || !g_file_set_contents (pb, b, (gssize) n, &error))
    return 1;
  qv_thermal_plot_options_init (&t);
  t.title = "invented Einstein solid";
  t.has_hover = TRUE;
  t.hover_t = 300;
  c = qv_thermal_plot_svg (th, &t, &n, &error);
  if (!c || !g_file_set_contents (pc, c, (gssize) n, &error))
    return 1;
  return 0;
}

int
main (int argc, char **argv)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_dos_mapping),
    cmocka_unit_test (test_dos_beside_dispersion),
    cmocka_unit_test (test_dos_readout),
    cmocka_unit_test (test_dos_pixels),
    cmocka_unit_test (test_thermal_mapping_and_readout),
    cmocka_unit_test (test_thermal_pixels),
    cmocka_unit_test (test_labels_given),
  };
  if (argc == 3 && strcmp (argv[1], "svg") == 0)
    return write_samples (argv[2]);
  return cmocka_run_group_tests (tests, NULL, NULL);
}
