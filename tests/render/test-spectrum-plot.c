/* test-spectrum-plot.c — the cairo spectrum plot: the pixel mapping and the
 * hit test (linear maps, worked by hand), the RGBA pixels (sticks where the
 * mapping puts them; straight alpha), the SVG bytes. No GL needed.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <string.h>
#include "qv-spectrum-plot.h"

static QvSpectrum *
make_spectrum (void)
{
  /* invented sticks; mode indices 3, 4, 5 */
  const double pos[] = { 1000.0, 1010.0, 3000.0 };
  const double h[] = { 5.0, 20.0, 10.0 };
  const guint modes[] = { 3, 4, 5 };
  QvSpectrumOptions o;

  qv_spectrum_options_init (&o);
  o.has_range = TRUE;
  o.start = 0.0;
  o.stop = 4000.0;
  o.fwhm = 12.0;
  o.step = 2.0;
  return qv_spectrum_new (3, pos, h, modes, &o, NULL);
}

static void
test_mapping (void **state)
{
  g_autoptr(QvSpectrum) s = make_spectrum ();
  QvSpectrumPlotOptions o;
  double left, top, right, bottom;

  qv_spectrum_plot_options_init (&o);
  qv_spectrum_plot_area (&o, &left, &top, &right, &bottom);
  assert_true (left < right && top < bottom && right <= o.width && bottom <= o.height);
  /* the range's ends at the box's edges, linear in between */
  assert_true (fabs (qv_spectrum_plot_x_to_pixel (s, &o, 0.0) - left) < 1e-9);
  assert_true (fabs (qv_spectrum_plot_x_to_pixel (s, &o, 4000.0) - right) < 1e-9);
  assert_true (fabs (qv_spectrum_plot_x_to_pixel (s, &o, 1000.0) - (left + 0.25 * (right - left))) < 1e-9);
  assert_true (fabs (qv_spectrum_plot_pixel_to_x (s, &o, qv_spectrum_plot_x_to_pixel (s, &o, 1234.5))
                     - 1234.5) < 1e-9);
  o.descending = TRUE;
  assert_true (fabs (qv_spectrum_plot_x_to_pixel (s, &o, 0.0) - right) < 1e-9);
  assert_true (fabs (qv_spectrum_plot_x_to_pixel (s, &o, 3000.0) - (left + 0.25 * (right - left))) < 1e-9);
}

static void
test_hit (void **state)
{
  g_autoptr(QvSpectrum) s = make_spectrum ();
  QvSpectrumPlotOptions o;
  double p1000, p1010, p3000;

  qv_spectrum_plot_options_init (&o);
  p1000 = qv_spectrum_plot_x_to_pixel (s, &o, 1000.0);
  p1010 = qv_spectrum_plot_x_to_pixel (s, &o, 1010.0);
  p3000 = qv_spectrum_plot_x_to_pixel (s, &o, 3000.0);
  assert_int_equal (qv_spectrum_plot_hit (s, &o, p3000, 4.0), 5);
  assert_int_equal (qv_spectrum_plot_hit (s, &o, p3000 + 3.9, 4.0), 5);
  assert_int_equal (qv_spectrum_plot_hit (s, &o, p3000 + 4.1, 4.0), -1);
  /* two sticks 10 cm⁻¹ apart (~1.9 px at 900 px): the nearer wins … */
  assert_int_equal (qv_spectrum_plot_hit (s, &o, p1000 - 0.3, 6.0), 3);
  assert_int_equal (qv_spectrum_plot_hit (s, &o, p1010 + 0.3, 6.0), 4);
  /* … and at equal distance the taller */
  assert_int_equal (qv_spectrum_plot_hit (s, &o, 0.5 * (p1000 + p1010), 6.0), 4);
  /* outside the shown range nothing matches */
  o.has_range = TRUE;
  o.x_min = 2000.0;
  o.x_max = 2500.0;
  assert_int_equal (qv_spectrum_plot_hit (s, &o, qv_spectrum_plot_x_to_pixel (s, &o, 3000.0), 1e6), -1);
}

static void
test_pixels (void **state)
{
  g_autoptr(QvSpectrum) s = make_spectrum ();
  g_autoptr(GError) error = NULL;
  QvSpectrumPlotOptions o;
  double left, top, right, bottom;
  g_autofree guint8 *rgba = NULL;
  int column, row;
  const guint8 *px;

  qv_spectrum_plot_options_init (&o);
  o.show_envelope = FALSE;
  o.n_labels = 0;
  rgba = qv_spectrum_plot_rgba (s, &o, &error);
  assert_non_null (rgba);
  qv_spectrum_plot_area (&o, &left, &top, &right, &bottom);
  /* opaque background everywhere */
  for (gsize i = 0; i < (gsize) o.width * o.height; i++)
    assert_int_equal (rgba[4 * i + 3], 255);
  /* a point just above the axis on the 3000 cm⁻¹ stick is stick-coloured
   * (ochre: red above blue), while a column 20 px away is paper */
  column = (int) floor (qv_spectrum_plot_x_to_pixel (s, &o, 3000.0));
  row = (int) bottom - 10;
  px = rgba + 4 * ((gsize) row * o.width + column);
  assert_true (px[0] > px[2] + 40);
  px = rgba + 4 * ((gsize) row * o.width + column + 20);
  assert_true (px[0] > 240 && px[1] > 240 && px[2] > 230);
  /* the tallest stick reaches higher than the one of half its height */
  {
    int c20 = (int) floor (qv_spectrum_plot_x_to_pixel (s, &o, 1010.0));
    int top20 = -1, top10 = -1;
    for (int y = (int) top; y < (int) bottom - 2; y++)
      {
        const guint8 *a = rgba + 4 * ((gsize) y * o.width + c20);
        const guint8 *b = rgba + 4 * ((gsize) y * o.width + column);
        if (top20 < 0 && a[0] > a[2] + 40)
          top20 = y;
        if (top10 < 0 && b[0] > b[2] + 40)
          top10 = y;
      }
    assert_true (top20 >= 0 && top10 >= 0);
    /* heights 20 and 10: the tops are at (bottom − H) and (bottom − H/2) */
    assert_true (fabs ((bottom - top10) / (bottom - top20) - 0.5) < 0.03);
  }
  /* transparent: alpha 0 away from the drawing */
  g_free (rgba);
  o.transparent = TRUE;
  rgba = qv_spectrum_plot_rgba (s, &o, &error);
  px = rgba + 4 * ((gsize) row * o.width + column + 20);
  assert_int_equal (px[3], 0);
}

static void
test_svg_and_sizes (void **state)
{
  g_autoptr(QvSpectrum) s = make_spectrum ();
  g_autoptr(GError) error = NULL;
  QvSpectrumPlotOptions o;
  gsize length = 0;
  g_autofree char *svg = NULL;

  qv_spectrum_plot_options_init (&o);
  o.width = 640;
  o.height = 400;
  o.title = "invented";
  o.selected = 4;
  svg = qv_spectrum_plot_svg (s, &o, &length, &error);
  assert_non_null (svg);
  assert_int_equal (strlen (svg), length);
  assert_non_null (strstr (svg, "<svg"));
  assert_non_null (strstr (svg, "width=\"640"));
  assert_non_null (strstr (svg, "height=\"400"));
  o.width = 50;
  assert_null (qv_spectrum_plot_svg (s, &o, &length, &error));
  assert_non_null (error);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_mapping),
    cmocka_unit_test (test_hit),
    cmocka_unit_test (test_pixels),
    cmocka_unit_test (test_svg_and_sizes),
  };
  /* Pango's font map and fontconfig's caches live until exit (not ours):
   * the test runs with leak detection off (tests/render/meson.build).
   * Releasing them here instead made cairo's debug reset abort now and
   * then on scaled fonts still held by Pango's caches. */
  return cmocka_run_group_tests (tests, NULL, NULL);
}
