/* test-thermochem-plot.c — the cairo plot of a molecule's thermochemistry
 * against T (src/render/qv-thermochem-plot.c): pixel maps against the
 * linear maps written out here, read-outs aimed at projected points and
 * linear interpolation between the sweep's temperatures, pixels under the
 * curves and on the dashed marker, size checks. `test-thermochem-plot svg
 * DIR` writes plot.svg and plot.json (the box, the ranges, the data and
 * the invented molecule's wavenumbers) for test_thermochem_svg.py. No GL.
 *
 * The molecule is invented: a bent triatomic of masses 16, 1, 1 u with
 * wavenumbers 1600, 3650 and 3750 cm⁻¹ (made up, not a real molecule's).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-thermochem-plot.h"

#define NT 20                  /* 50, 100, …, 1000 K */

static const double wavenumbers[3] = { 1600.0, 3650.0, 3750.0 };

static QvGasMolecule *
make_molecule (void)
{
  const double r[9] = { 0.0, 0.0, 0.0, 0.76, 0.59, 0.0, -0.76, 0.59, 0.0 };
  const double m[3] = { 16.0, 1.0, 1.0 };
  g_autoptr(GError) error = NULL;
  QvGasMolecule *mol = qv_gas_molecule_new (3, r, m, 3, wavenumbers, QV_ROTOR_ATOM, &error);
  assert_non_null (mol);
  assert_int_equal (mol->rotor, QV_ROTOR_NONLINEAR);
  return mol;
}

static QvGasThermo *
make_sweep (const QvGasMolecule *mol)
{
  QvGasThermoOptions opt;
  double t[NT];
  QvGasThermo *out = g_new0 (QvGasThermo, NT);

  qv_gas_thermo_options_init (&opt);
  opt.symmetry_number = 2;
  for (int i = 0; i < NT; i++)
    t[i] = 50.0 * (i + 1);
  qv_gas_thermo_sweep (mol, &opt, t, NT, out);
  return out;
}

static double
kj (void)
{
  return qv_gas_kj_per_mol ();
}

static void
test_mapping (void **state)
{
  g_autoptr(QvGasMolecule) mol = make_molecule ();
  g_autofree QvGasThermo *sw = make_sweep (mol);
  QvThermochemPlotOptions o;
  double le, te, re, be, ls, ts, rs, bs, t0, t1, v0, v1, lo = G_MAXDOUBLE, hi = -G_MAXDOUBLE;
  (void) state;

  qv_thermochem_plot_options_init (&o);
  assert_int_equal (o.width, 900);
  assert_int_equal (o.height, 560);
  qv_thermochem_plot_area (&o, QV_THERMOCHEM_PANEL_ENERGY, &le, &te, &re, &be);
  qv_thermochem_plot_area (&o, QV_THERMOCHEM_PANEL_ENTROPY, &ls, &ts, &rs, &bs);
  /* one T axis for both panels, the entropy panel under the energy panel */
  assert_true (le == ls && re == rs);
  assert_true (be < ts);
  assert_true (fabs ((be - te) - (bs - ts)) < 1e-9);

  /* the range is the sweep's: 50 to 1000 K */
  qv_thermochem_plot_range (sw, NT, &o, QV_THERMOCHEM_PANEL_ENERGY, &t0, &t1, &v0, &v1);
  assert_true (t0 == 50.0 && t1 == 1000.0);
  /* the energy axis holds every H, G and ZPE with 6 % of the span either side */
  for (int i = 0; i < NT; i++)
    {
      const double v[3] = { sw[i].total.enthalpy * kj (), sw[i].total.free_energy * kj (),
                            sw[i].total.zpe * kj () };
      for (int c = 0; c < 3; c++)
        {
          lo = MIN (lo, v[c]);
          hi = MAX (hi, v[c]);
        }
    }
  assert_true (fabs (v0 - (lo - 0.06 * (hi - lo))) < 1e-9 * (hi - lo));
  assert_true (fabs (v1 - (hi + 0.06 * (hi - lo))) < 1e-9 * (hi - lo));
  /* the entropy axis starts at zero */
  qv_thermochem_plot_range (sw, NT, &o, QV_THERMOCHEM_PANEL_ENTROPY, &t0, &t1, &v0, &v1);
  assert_true (v0 == 0.0);
  assert_true (v1 > sw[NT - 1].total.entropy * kj () * 1000.0);

  /* the linear maps x = l + (T − T0)/(T1 − T0)(r − l), y = b − (v − v0)/(v1 − v0)(b − t) */
  assert_true (fabs (qv_thermochem_plot_t_to_pixel (sw, NT, &o, 50.0) - le) < 1e-9);
  assert_true (fabs (qv_thermochem_plot_t_to_pixel (sw, NT, &o, 1000.0) - re) < 1e-9);
  assert_true (fabs (qv_thermochem_plot_t_to_pixel (sw, NT, &o, 525.0) - 0.5 * (le + re)) < 1e-9);
  assert_true (fabs (qv_thermochem_plot_pixel_to_t (sw, NT, &o, 0.5 * (le + re)) - 525.0) < 1e-9);
  assert_true (fabs (qv_thermochem_plot_value_to_pixel (sw, NT, &o, QV_THERMOCHEM_PANEL_ENTROPY, 0.0)
                     - bs) < 1e-9);
  assert_true (fabs (qv_thermochem_plot_value_to_pixel (sw, NT, &o, QV_THERMOCHEM_PANEL_ENTROPY,
                                                        0.25 * v1) - (bs - 0.25 * (bs - ts))) < 1e-9);
  assert_true (fabs (qv_thermochem_plot_pixel_to_value (sw, NT, &o, QV_THERMOCHEM_PANEL_ENTROPY,
                                                        bs - 0.25 * (bs - ts)) - 0.25 * v1) < 1e-9 * v1);
  assert_string_equal (qv_thermochem_plot_unit (QV_THERMOCHEM_PANEL_ENERGY), "kJ/mol");
  assert_string_equal (qv_thermochem_plot_unit (QV_THERMOCHEM_PANEL_ENTROPY), "J/(K mol)");

  /* a range given replaces the sweep's */
  o.has_range = TRUE;
  o.t_min = 0.0;
  o.t_max = 2000.0;
  assert_true (fabs (qv_thermochem_plot_t_to_pixel (sw, NT, &o, 1000.0) - 0.5 * (le + re)) < 1e-9);
}

static void
test_readout (void **state)
{
  g_autoptr(QvGasMolecule) mol = make_molecule ();
  g_autofree QvGasThermo *sw = make_sweep (mol);
  QvThermochemPlotOptions o;
  QvThermochemReadout out;
  QvThermochemPanel panel = QV_THERMOCHEM_PANEL_ENERGY;
  double px, py, le, te, re, be, ls, ts, rs, bs;
  (void) state;

  qv_thermochem_plot_options_init (&o);
  qv_thermochem_plot_area (&o, QV_THERMOCHEM_PANEL_ENERGY, &le, &te, &re, &be);
  qv_thermochem_plot_area (&o, QV_THERMOCHEM_PANEL_ENTROPY, &ls, &ts, &rs, &bs);
  /* aimed at Cp at 300 K (sweep[5]) in the lower panel */
  px = qv_thermochem_plot_t_to_pixel (sw, NT, &o, 300.0);
  py = qv_thermochem_plot_value_to_pixel (sw, NT, &o, QV_THERMOCHEM_PANEL_ENTROPY,
                                          sw[5].heat_capacity_p * kj () * 1000.0);
  assert_true (qv_thermochem_plot_readout (sw, NT, &o, px, py, &panel, &out));
  assert_int_equal (panel, QV_THERMOCHEM_PANEL_ENTROPY);
  assert_true (fabs (out.t - 300.0) < 1e-9);
  assert_true (fabs (out.heat_capacity_p - sw[5].heat_capacity_p * kj () * 1000.0) < 1e-9);
  assert_true (fabs (out.entropy - sw[5].total.entropy * kj () * 1000.0) < 1e-9);
  assert_true (fabs (out.entropy_vibration - sw[5].vibration.entropy * kj () * 1000.0) < 1e-9);
  assert_true (fabs (out.enthalpy - sw[5].total.enthalpy * kj ()) < 1e-9);
  assert_true (fabs (out.free_energy - sw[5].total.free_energy * kj ()) < 1e-9);
  assert_true (fabs (out.zpe - sw[5].total.zpe * kj ()) < 1e-9);
  /* the upper panel at the same column */
  assert_true (qv_thermochem_plot_readout (sw, NT, &o, px, 0.5 * (te + be), &panel, &out));
  assert_int_equal (panel, QV_THERMOCHEM_PANEL_ENERGY);
  /* halfway between 300 and 350 K: the mean of the two rows */
  assert_true (qv_thermochem_plot_value_at (sw, NT, 325.0, &out));
  assert_true (fabs (out.free_energy - 0.5 * (sw[5].total.free_energy + sw[6].total.free_energy) * kj ())
               < 1e-9);
  assert_true (fabs (out.heat_capacity_p
                     - 0.5 * (sw[5].heat_capacity_p + sw[6].heat_capacity_p) * kj () * 1000.0) < 1e-9);
  /* outside the sweep, between the panels, left of the box: nothing */
  assert_false (qv_thermochem_plot_value_at (sw, NT, 1001.0, &out));
  assert_false (qv_thermochem_plot_value_at (sw, NT, 49.0, &out));
  assert_false (qv_thermochem_plot_readout (sw, NT, &o, px, 0.5 * (be + ts), &panel, &out));
  assert_false (qv_thermochem_plot_readout (sw, NT, &o, le - 3, 0.5 * (te + be), &panel, &out));
  assert_false (qv_thermochem_plot_value_at (NULL, 0, 300.0, &out));
}

static int
differs (const guint8 *p, const guint8 *ground)
{
  return abs (p[0] - ground[0]) + abs (p[1] - ground[1]) + abs (p[2] - ground[2]) > 60;
}

static void
test_pixels (void **state)
{
  g_autoptr(QvGasMolecule) mol = make_molecule ();
  g_autofree QvGasThermo *sw = make_sweep (mol);
  g_autoptr(GError) error = NULL;
  g_autofree guint8 *rgba = NULL;
  QvThermochemPlotOptions o;
  const guint8 *ground;
  double l, t, r, b;
  int off = 0, marker = 0, blank = 0;
  gsize len = 0;
  (void) state;

  qv_thermochem_plot_options_init (&o);
  o.width = 640;
  o.height = 480;
  o.has_marker = TRUE;
  o.marker_t = 298.15;
  rgba = qv_thermochem_plot_rgba (sw, NT, &o, &error);
  assert_non_null (rgba);
  ground = rgba;   /* the corner is paper */
  /* on the G curve and on the S curve at several temperatures */
  for (int i = 2; i < NT; i += 3)
    {
      const double x = qv_thermochem_plot_t_to_pixel (sw, NT, &o, sw[i].temperature);
      const double yg = qv_thermochem_plot_value_to_pixel (sw, NT, &o, QV_THERMOCHEM_PANEL_ENERGY,
                                                           sw[i].total.free_energy * kj ());
      const double ys = qv_thermochem_plot_value_to_pixel (sw, NT, &o, QV_THERMOCHEM_PANEL_ENTROPY,
                                                           sw[i].total.entropy * kj () * 1000.0);
      off += differs (rgba + 4 * ((gsize) floor (yg) * (gsize) o.width + (gsize) floor (x)), ground);
      off += differs (rgba + 4 * ((gsize) floor (ys) * (gsize) o.width + (gsize) floor (x)), ground);
    }
  assert_int_equal (off, 12);
  /* the marker: a dashed column at 298.15 K, drawn over part of the box */
  qv_thermochem_plot_area (&o, QV_THERMOCHEM_PANEL_ENTROPY, &l, &t, &r, &b);
  {
    const gsize x = (gsize) floor (qv_thermochem_plot_t_to_pixel (sw, NT, &o, 298.15));
    for (gsize y = (gsize) t + 2; y < (gsize) b - 2; y++)
      {
        const int d = differs (rgba + 4 * (y * (gsize) o.width + x), ground);
        marker += d;
        blank += !d;
      }
  }
  assert_true (marker > 20);
  assert_true (blank > 10);   /* dashed, not solid */
  g_free (rgba);
  /* too small */
  o.height = 200;
  rgba = qv_thermochem_plot_rgba (sw, NT, &o, &error);
  assert_null (rgba);
  assert_non_null (error);
  g_clear_error (&error);
  assert_null (qv_thermochem_plot_svg (sw, NT, &o, &len, &error));
  g_clear_error (&error);
  /* an empty sweep still draws its axes */
  o.height = 480;
  rgba = qv_thermochem_plot_rgba (NULL, 0, &o, &error);
  assert_non_null (rgba);
}

/* plot.svg and plot.json for test_thermochem_svg.py */
static int
write_samples (const char *dir)
{
  g_autoptr(QvGasMolecule) mol = make_molecule ();
  g_autofree QvGasThermo *sw = make_sweep (mol);
  QvThermochemPlotOptions o;
  g_autoptr(GError) error = NULL;
  g_autoptr(GString) js = g_string_new ("{");
  g_autofree char *svg = NULL;
  g_autofree char *svg_path = g_build_filename (dir, "plot.svg", NULL);
  g_autofree char *json_path = g_build_filename (dir, "plot.json", NULL);
  gsize length = 0;
  char buf[G_ASCII_DTOSTR_BUF_SIZE];

  qv_thermochem_plot_options_init (&o);
  o.title = "invented triatomic";
  o.has_marker = TRUE;
  o.marker_t = 298.15;
  svg = qv_thermochem_plot_svg (sw, NT, &o, &length, &error);
  if (svg == NULL)
    return 1;
#define NUM(v) g_ascii_dtostr (buf, sizeof buf, (v))
  g_string_append_printf (js, "\"width\": %d, \"height\": %d, \"marker_t\": %s", o.width, o.height,
                          NUM (o.marker_t));
  for (int p = 0; p < 2; p++)
    {
      double l, t, r, b, t0, t1, v0, v1;
      const char *name = p == 0 ? "energy" : "entropy";
      qv_thermochem_plot_area (&o, (QvThermochemPanel) p, &l, &t, &r, &b);
      qv_thermochem_plot_range (sw, NT, &o, (QvThermochemPanel) p, &t0, &t1, &v0, &v1);
      g_string_append_printf (js, ", \"%s\": {\"left\": %s", name, NUM (l));
      g_string_append_printf (js, ", \"top\": %s", NUM (t));
      g_string_append_printf (js, ", \"right\": %s", NUM (r));
      g_string_append_printf (js, ", \"bottom\": %s", NUM (b));
      g_string_append_printf (js, ", \"t_min\": %s", NUM (t0));
      g_string_append_printf (js, ", \"t_max\": %s", NUM (t1));
      g_string_append_printf (js, ", \"v_min\": %s", NUM (v0));
      g_string_append_printf (js, ", \"v_max\": %s}", NUM (v1));
    }
  g_string_append (js, ", \"wavenumbers\": [");
  for (int k = 0; k < 3; k++)
    g_string_append_printf (js, "%s%s", k ? ", " : "", NUM (wavenumbers[k]));
  g_string_append (js, "], \"rows\": [");
  for (int i = 0; i < NT; i++)
    {
      const double v[7] = { sw[i].temperature, sw[i].total.enthalpy * kj (),
                            sw[i].total.free_energy * kj (), sw[i].total.zpe * kj (),
                            sw[i].total.entropy * kj () * 1000.0,
                            sw[i].vibration.entropy * kj () * 1000.0,
                            sw[i].heat_capacity_p * kj () * 1000.0 };
      g_string_append_printf (js, "%s[", i ? ", " : "");
      for (int c = 0; c < 7; c++)
        g_string_append_printf (js, "%s%s", c ? ", " : "", NUM (v[c]));
      g_string_append_c (js, ']');
    }
  g_string_append (js, "]}\n");
#undef NUM
  if (!g_file_set_contents (svg_path, svg, (gssize) length, &error)
      || !g_file_set_contents (json_path, js->str, -1, &error))
    return 1;
  return 0;
}

int
main (int argc, char **argv)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_mapping),
    cmocka_unit_test (test_readout),
    cmocka_unit_test (test_pixels),
  };
  if (argc == 3 && strcmp (argv[1], "svg") == 0)
    return write_samples (argv[2]);
  return cmocka_run_group_tests (tests, NULL, NULL);
}
