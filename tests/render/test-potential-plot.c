/* test-potential-plot.c — the potential plot of a scan (cairo only): the
 * pixel maps and their inverses, the read-out (Q, V and the nearest level)
 * against the harmonic closed form, the level lines drawn at the energies
 * the core gives (pixels of the level's colour on its row between the
 * turning points), the barrier line of a double well, a well-formed SVG
 * (GMarkup) and refused sizes.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>
#include "qv-potential-plot.h"

/* CODATA 2018 exact and recommended values (NIST), independent of qv-units */
static const double hbar = 6.62607015e-34 / (2 * M_PI);
static const double e_charge = 1.602176634e-19;
static const double m_u = 1.66053906660e-27;
static const double h_planck = 6.62607015e-34;
static const double c_light = 299792458.0;

static double
ev_per_cm1 (void)
{
  return h_planck * c_light * 100.0 / e_charge;
}

/* ħω in eV for V = ½λQ², λ in eV/(Å² u) (textbook harmonic oscillator) */
static double
hbar_omega (double lambda)
{
  return hbar * sqrt (lambda * e_charge / (1e-20 * m_u)) / e_charge;
}

typedef struct {
  double Q[61], V[61];
  gsize n;
  QvScanPotential *potential;
  QvScanLevels *levels;
  QvPotentialPlotData data;
} Scan;

static void
scan_init (Scan *s, double lambda, double barrier, double a, double half_width, gsize n)
{
  g_autoptr(GError) error = NULL;
  s->n = n;
  for (gsize i = 0; i < n; i++)
    {
      const double q = -half_width + 2 * half_width * i / (n - 1);
      s->Q[i] = q;
      s->V[i] = -3.25 + (barrier > 0 ? barrier * pow ((q / a) * (q / a) - 1, 2)
                                     : 0.5 * lambda * q * q);   /* an absolute offset */
    }
  s->potential = qv_scan_potential_new_1d (s->Q, s->V, n, QV_SCAN_FIT_SPLINE, 0, &error);
  assert_non_null (s->potential);
  s->levels = qv_scan_potential_solve (s->potential, 6, 0, 0, &error);
  assert_non_null (s->levels);
  s->data = (QvPotentialPlotData) { s->potential, s->levels, n, s->Q, s->V };
}

static void
scan_clear (Scan *s)
{
  qv_scan_levels_free (s->levels);
  qv_scan_potential_free (s->potential);
}

static const double lambda0 = 2.0;   /* eV/(Å² u), about 1000 cm⁻¹ (invented) */

static void
harmonic_scan (Scan *s)
{
  /* ±3.5 turning points of v = 5: the walls leave the six levels alone */
  const double qtp5 = sqrt (11 * hbar_omega (lambda0) / lambda0);
  scan_init (s, lambda0, 0, 0, 3.5 * qtp5, 61);
}

static void
test_mapping_and_readout (void **state)
{
  Scan s;
  QvPotentialPlotOptions o;
  double left, top, right, bottom, lo, hi, e0, e1;
  (void) state;

  harmonic_scan (&s);
  qv_potential_plot_options_init (&o);
  qv_potential_plot_area (&o, &left, &top, &right, &bottom);
  qv_scan_potential_range (s.potential, 0, &lo, &hi);
  assert_float_equal (qv_potential_plot_q_to_pixel (&s.data, &o, lo), left, 1e-9);
  assert_float_equal (qv_potential_plot_q_to_pixel (&s.data, &o, hi), right, 1e-9);
  assert_float_equal (qv_potential_plot_energy_to_pixel (&s.data, &o, 0.0), bottom, 1e-9);
  qv_potential_plot_range (&s.data, &o, &e0, &e1);
  assert_float_equal (qv_potential_plot_energy_to_pixel (&s.data, &o, e1), top, 1e-9);
  /* the range holds every level */
  assert_true (e1 > s.levels->levels[5].energy / ev_per_cm1 ());
  for (double px = left; px <= right; px += 37.3)
    assert_float_equal (qv_potential_plot_q_to_pixel (
      &s.data, &o, qv_potential_plot_pixel_to_q (&s.data, &o, px)), px, 1e-9);
  for (double py = top; py <= bottom; py += 23.9)
    assert_float_equal (qv_potential_plot_energy_to_pixel (
      &s.data, &o, qv_potential_plot_pixel_to_energy (&s.data, &o, py)), py, 1e-9);

  /* the levels are ħω(v+½) (harmonic closed form), so the read-out on the
   * row of E_v names level v; V under the pointer is ½λQ² */
  for (gsize v = 0; v < 6; v++)
    {
      const double ev = hbar_omega (lambda0) * (v + 0.5) / ev_per_cm1 ();
      QvPotentialPlotReadout r;
      const double px = qv_potential_plot_q_to_pixel (&s.data, &o, 0.3 * hi);
      assert_float_equal (s.levels->levels[v].energy / ev_per_cm1 (), ev, 1e-5 * ev);
      assert_true (qv_potential_plot_readout (&s.data, &o, px,
                                              qv_potential_plot_energy_to_pixel (&s.data, &o, ev),
                                              &r));
      assert_int_equal (r.level, v);
      assert_float_equal (r.level_energy, s.levels->levels[v].energy / ev_per_cm1 (), 1e-9);
      assert_float_equal (r.energy, ev, 1e-6 * ev);
      assert_float_equal (r.V, 0.5 * lambda0 * r.Q * r.Q / ev_per_cm1 (), 1e-6 * ev);
    }
  assert_false (qv_potential_plot_readout (&s.data, &o, left - 2, top + 5, NULL));
  /* ψ scale: the ground state's largest value on the DVR grid is drawn at
   * 40 % of the fundamental, which is ħω here */
  {
    const QvDvrLevels *g = s.levels->refinement->levels;
    double peak = 0.0;
    for (gsize i = 0; i < g->n_points; i++)
      peak = MAX (peak, fabs (qv_dvr_levels_wavefunction (g, 0, i)));
    assert_float_equal (s.levels->fundamental, hbar_omega (lambda0), 1e-5 * hbar_omega (lambda0));
    assert_float_equal (qv_potential_plot_wavefunction_scale (&s.data) * peak,
                        0.4 * s.levels->fundamental / ev_per_cm1 (), 1e-9);
  }
  scan_clear (&s);
}

static gboolean
near_rgb (const guint8 *p, double r, double g, double b, int tol)
{
  return abs (p[0] - (int) lround (255 * r)) <= tol && abs (p[1] - (int) lround (255 * g)) <= tol
         && abs (p[2] - (int) lround (255 * b)) <= tol;
}

static void
test_level_lines (void **state)
{
  Scan s;
  QvPotentialPlotOptions o;
  g_autoptr(GError) error = NULL;
  g_autofree guint8 *rgba = NULL;
  (void) state;

  harmonic_scan (&s);
  qv_potential_plot_options_init (&o);
  o.hide_wavefunctions = o.hide_parabola = o.hide_points = TRUE;
  rgba = qv_potential_plot_rgba (&s.data, &o, &error);
  assert_non_null (rgba);
  for (gsize v = 0; v < 4; v++)
    {
      const QvScanLevel *l = &s.levels->levels[v];
      const double e = l->energy / ev_per_cm1 ();
      const int y = (int) floor (qv_potential_plot_energy_to_pixel (&s.data, &o, e));
      /* halfway from the centre to the outer turning point: on the line */
      const int x = (int) lround (qv_potential_plot_q_to_pixel (&s.data, &o, 0.5 * l->turning[1]));
      /* outside the turning points, 25 px beyond: no line */
      const int xo = (int) lround (qv_potential_plot_q_to_pixel (&s.data, &o, l->turning[1])) + 25;
      gboolean on = FALSE, off = TRUE;
      /* the series colours of src/render/qv-plot.c's light palette, first two */
      static const double colour[2][3] = { { 0.12, 0.52, 0.50 }, { 0.74, 0.52, 0.22 } };
      for (int dy = -1; dy <= 1; dy++)
        {
          on |= near_rgb (rgba + 4 * ((gsize) (y + dy) * o.width + x), colour[v % 2][0],
                          colour[v % 2][1], colour[v % 2][2], 40);
          off &= !near_rgb (rgba + 4 * ((gsize) (y + dy) * o.width + xo), colour[v % 2][0],
                            colour[v % 2][1], colour[v % 2][2], 40);
        }
      if (v < 2)
        {
          assert_true (on);
          assert_true (off);
        }
      /* halfway between two levels: nothing of the level's colour */
      if (v < 3)
        {
          const double mid = 0.5 * (e + s.levels->levels[v + 1].energy / ev_per_cm1 ());
          const int ym = (int) lround (qv_potential_plot_energy_to_pixel (&s.data, &o, mid));
          if (v < 2)
            assert_false (near_rgb (rgba + 4 * ((gsize) ym * o.width + x), colour[v % 2][0],
                                    colour[v % 2][1], colour[v % 2][2], 40));
        }
    }
  scan_clear (&s);
}

static void
test_double_well (void **state)
{
  Scan s;
  QvPotentialPlotOptions o;
  double left, top, right, bottom;
  g_autoptr(GError) error = NULL;
  g_autofree guint8 *rgba = NULL;
  (void) state;

  /* V = B((Q/a)² − 1)², B = 0.12 eV, a = 0.5 u^½ Å (invented): two minima
   * at ±a, the barrier B between them */
  scan_init (&s, 0, 0.12, 0.5, 0.95, 61);
  assert_int_equal (s.levels->minima->len, 2);
  qv_potential_plot_options_init (&o);
  o.has_range = TRUE;
  o.e_max = 1.5 * 0.12 / ev_per_cm1 ();
  qv_potential_plot_area (&o, &left, &top, &right, &bottom);
  rgba = qv_potential_plot_rgba (&s.data, &o, &error);
  assert_non_null (rgba);
  {
    /* the dotted barrier line at left + 1 (dashes of 2 px on, 3 off) in
     * the palette's imaginary colour (rose) */
    const int y = (int) floor (qv_potential_plot_energy_to_pixel (&s.data, &o,
                                                                  s.levels->barrier / ev_per_cm1 ()));
    const guint8 *p = rgba + 4 * ((gsize) y * o.width + (gsize) left + 1);
    assert_float_equal (s.levels->barrier, 0.12, 1e-3);
    assert_true (p[0] > p[2] && p[0] > p[1] + 40);
  }
  scan_clear (&s);
}

static void
start_element (GMarkupParseContext *c, const char *name, const char **an, const char **av,
               gpointer data, GError **error)
{
  (void) c; (void) an; (void) av; (void) error;
  if (strcmp (name, "svg") == 0)
    (*(int *) data)++;
}

static void
test_svg_and_sizes (void **state)
{
  Scan s;
  QvPotentialPlotOptions o;
  g_autoptr(GError) error = NULL;
  g_autofree char *svg = NULL;
  gsize length = 0;
  int n_svg = 0;
  const GMarkupParser parser = { start_element, NULL, NULL, NULL, NULL };
  GMarkupParseContext *ctx;
  (void) state;

  harmonic_scan (&s);
  qv_potential_plot_options_init (&o);
  o.title = "mode 1 & <test>";
  svg = qv_potential_plot_svg (&s.data, &o, &length, &error);
  assert_non_null (svg);
  assert_int_equal (strlen (svg), length);
  ctx = g_markup_parse_context_new (&parser, 0, &n_svg, NULL);
  assert_true (g_markup_parse_context_parse (ctx, svg, (gssize) length, &error));
  assert_true (g_markup_parse_context_end_parse (ctx, &error));
  g_markup_parse_context_free (ctx);
  assert_int_equal (n_svg, 1);
  assert_non_null (strstr (svg, "width=\"900\""));

  o.width = 100;
  g_clear_error (&error);
  assert_null (qv_potential_plot_rgba (&s.data, &o, &error));
  assert_non_null (error);
  scan_clear (&s);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_mapping_and_readout),
    cmocka_unit_test (test_level_lines),
    cmocka_unit_test (test_double_well),
    cmocka_unit_test (test_svg_and_sizes),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
