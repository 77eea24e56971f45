/* test-dispersion-plot.c — the cairo dispersion plot: the pixel mapping
 * against the linear map written out here (distance → column, wavenumber
 * → row, worked from the box and the range), the hit test aimed at
 * projected points, the RGBA pixels (branch-coloured along a branch, paper
 * away from it, transparent and dark grounds), the label text, the size
 * checks. `test-dispersion-plot svg DIR` writes plot.svg and plot.json
 * (the data, the box and the range) for test_dispersion_svg.py. No GL.
 *
 * The bands are invented: a simple cubic cell (a = 3 Å) with a path
 * through Γ, X, M, a jump to R and back to Γ; three "acoustic" branches
 * ω_b = W_b √(Σ sin² π q_i) and one flat "optical" branch, none of them the
 * dispersion of a real crystal.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <cmocka.h>
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-dispersion-plot.h"
#include "qv-units.h"

#define NB 4

typedef struct {
  QvBandSampling *s;
  double *w;
} Bands;

static void
bands_clear (Bands *b)
{
  qv_band_sampling_free (b->s);
  g_free (b->w);
}

/* @imaginary: the lowest branch dips to −W sin²(π q_a)·0.4 along Γ–X. */
static Bands
make_bands (gboolean imaginary)
{
  const double cell[3][3] = { { 3, 0, 0 }, { 0, 3, 0 }, { 0, 0, 3 } };
  const double scale[3] = { 120.0, 180.0, 260.0 };
  g_autoptr(QvBandPath) path = qv_band_path_parse ("G 0 0 0; X 0.5 0 0; M 0.5 0.5 0 | R 0.5 0.5 0.5; G",
                                                   NULL);
  Bands b;

  assert_non_null (path);
  b.s = qv_band_path_sample (path, cell, 61, 0, NULL);
  assert_non_null (b.s);
  b.w = g_new (double, b.s->n_q * NB);
  for (gsize k = 0; k < b.s->n_q; k++)
    {
      const double *q = b.s->q + 3 * k;
      double s2 = 0.0;
      for (int i = 0; i < 3; i++)
        s2 += sin (G_PI * q[i]) * sin (G_PI * q[i]);
      for (int i = 0; i < 3; i++)
        b.w[k * NB + i] = scale[i] * sqrt (s2);
      b.w[k * NB + 3] = 420.0 + 30.0 * cos (2 * G_PI * q[0]);
      if (imaginary && q[1] == 0.0 && q[2] == 0.0)
        b.w[k * NB] = -0.4 * scale[0] * sin (G_PI * q[0]) * sin (G_PI * q[0]);
    }
  return b;
}

/* The linear maps, written out from the box and the range. */
static double
column_of (const QvDispersionPlotOptions *o, const QvBandSampling *s, double d)
{
  double l, t, r, bt;
  qv_dispersion_plot_area (o, &l, &t, &r, &bt);
  return l + (d - s->distance[0]) / (s->distance[s->n_q - 1] - s->distance[0]) * (r - l);
}

static double
row_of (const QvDispersionPlotOptions *o, double lo, double hi, double w)
{
  double l, t, r, bt;
  qv_dispersion_plot_area (o, &l, &t, &r, &bt);
  return bt - (w - lo) / (hi - lo) * (bt - t);
}

static void
test_mapping (void **state)
{
  Bands b = make_bands (FALSE);
  QvDispersionPlotOptions o;
  double l, t, r, bt, lo, hi, wmax = 0.0;

  qv_dispersion_plot_options_init (&o);
  qv_dispersion_plot_area (&o, &l, &t, &r, &bt);
  assert_true (l > 0 && l < r && r <= o.width && t > 0 && t < bt && bt <= o.height);
  /* the path's ends at the box's edges, linear in between */
  assert_true (fabs (qv_dispersion_plot_x_to_pixel (b.s, &o, b.s->distance[0]) - l) < 1e-9);
  assert_true (fabs (qv_dispersion_plot_x_to_pixel (b.s, &o, b.s->distance[b.s->n_q - 1]) - r) < 1e-9);
  for (gsize i = 0; i < b.s->n_labels; i++)
    assert_true (fabs (qv_dispersion_plot_x_to_pixel (b.s, &o, b.s->label_distance[i])
                       - column_of (&o, b.s, b.s->label_distance[i])) < 1e-9);
  assert_true (fabs (qv_dispersion_plot_pixel_to_x (b.s, &o, qv_dispersion_plot_x_to_pixel (b.s, &o, 1.234))
                     - 1.234) < 1e-12);
  /* a range from the data: no imaginary values, so it starts at 0 and
   * reaches above the highest value */
  for (gsize i = 0; i < b.s->n_q * NB; i++)
    wmax = MAX (wmax, b.w[i]);
  qv_dispersion_plot_range (b.s, NB, b.w, &o, &lo, &hi);
  assert_true (lo == 0.0 && hi > wmax && hi < 1.2 * wmax);
  assert_true (fabs (qv_dispersion_plot_y_to_pixel (b.s, NB, b.w, &o, 0.0) - bt) < 1e-9);
  assert_true (fabs (qv_dispersion_plot_y_to_pixel (b.s, NB, b.w, &o, hi) - t) < 1e-9);
  /* a given range, in cm⁻¹ whatever the axis unit */
  o.has_range = TRUE;
  o.y_min = -100.0;
  o.y_max = 500.0;
  o.unit = QV_FREQUENCY_THZ;
  assert_true (fabs (qv_dispersion_plot_y_to_pixel (b.s, NB, b.w, &o, 200.0) - row_of (&o, -100, 500, 200.0))
               < 1e-9);
  assert_true (fabs (qv_dispersion_plot_y_to_pixel (b.s, NB, b.w, &o, 200.0) - 0.5 * (t + bt)) < 1e-9);
  assert_true (fabs (qv_dispersion_plot_pixel_to_y (b.s, NB, b.w, &o, 0.5 * (t + bt)) - 200.0) < 1e-9);
  bands_clear (&b);
  /* imaginary values (down to −48 cm⁻¹ at X) widen the range below zero,
   * padded by less than a tenth of the span */
  b = make_bands (TRUE);
  o.has_range = FALSE;
  qv_dispersion_plot_range (b.s, NB, b.w, &o, &lo, &hi);
  assert_true (lo < -48.0 && lo > -48.0 - 0.1 * (hi + 48.0));
  bands_clear (&b);
}

static void
test_hit (void **state)
{
  Bands b = make_bands (FALSE);
  QvDispersionPlotOptions o;
  gsize k = 0, br = 0, aim_k = 0;
  double px, py;

  qv_dispersion_plot_options_init (&o);
  o.has_range = TRUE;
  o.y_min = 0.0;
  o.y_max = 500.0;
  /* a point in the middle of Γ–X, where the four branches are apart */
  for (gsize i = 0; i < b.s->n_q; i++)
    if (fabs (b.s->q[3 * i] - 0.25) < fabs (b.s->q[3 * aim_k] - 0.25) && b.s->q[3 * i + 1] == 0.0)
      aim_k = i;
  assert_true (fabs (b.s->q[3 * aim_k] - 0.25) < 0.02);
  for (gsize aim_b = 0; aim_b < NB; aim_b++)
    {
      px = column_of (&o, b.s, b.s->distance[aim_k]);
      py = row_of (&o, 0, 500, b.w[aim_k * NB + aim_b]);
      assert_true (qv_dispersion_plot_hit (b.s, NB, b.w, &o, px, py, 6.0, &k, &br));
      assert_int_equal (k, aim_k);
      assert_int_equal (br, aim_b);
      /* 2 px off still hits it */
      assert_true (qv_dispersion_plot_hit (b.s, NB, b.w, &o, px + 1.2, py - 1.6, 6.0, &k, &br));
      assert_int_equal (k, aim_k);
      assert_int_equal (br, aim_b);
      assert_true (qv_dispersion_plot_point_to_pixel (b.s, NB, b.w, &o, aim_k, aim_b, &px, &py));
      assert_true (fabs (px - column_of (&o, b.s, b.s->distance[aim_k])) < 1e-9);
      assert_true (fabs (py - row_of (&o, 0, 500, b.w[aim_k * NB + aim_b])) < 1e-9);
    }
  /* far from every point: nothing */
  px = column_of (&o, b.s, b.s->distance[aim_k]);
  py = row_of (&o, 0, 500, 0.5 * (b.w[aim_k * NB + 2] + b.w[aim_k * NB + 3]));
  assert_true (0.5 * (row_of (&o, 0, 500, b.w[aim_k * NB + 2]) - row_of (&o, 0, 500, b.w[aim_k * NB + 3]))
               > 20.0);
  assert_false (qv_dispersion_plot_hit (b.s, NB, b.w, &o, px, py, 6.0, &k, &br));
  /* points outside the shown range never match */
  o.y_max = 300.0;
  py = row_of (&o, 0, 300, b.w[aim_k * NB + 3]);
  assert_false (qv_dispersion_plot_hit (b.s, NB, b.w, &o, px, py, 6.0, &k, &br));
  bands_clear (&b);
}

static gboolean
near_colour (const guint8 *px, double r, double g, double b, int tolerance)
{
  return abs (px[0] - (int) lround (255 * r)) <= tolerance && abs (px[1] - (int) lround (255 * g)) <= tolerance
         && abs (px[2] - (int) lround (255 * b)) <= tolerance;
}

static void
test_pixels (void **state)
{
  Bands b = make_bands (FALSE);
  g_autoptr(GError) error = NULL;
  QvDispersionPlotOptions o;
  g_autofree guint8 *rgba = NULL;
  g_autofree guint8 *paper = NULL;
  int hits = 0, tried = 0;

  qv_dispersion_plot_options_init (&o);
  o.width = 640;
  o.height = 420;
  o.has_range = TRUE;
  o.y_min = 0.0;
  o.y_max = 500.0;
  rgba = qv_dispersion_plot_rgba (b.s, NB, b.w, &o, &error);
  assert_non_null (rgba);
  /* the ground is the top-left corner; opaque everywhere */
  paper = g_memdup2 (rgba, 4);
  for (gsize i = 0; i < (gsize) o.width * o.height; i++)
    assert_int_equal (rgba[4 * i + 3], 255);
  /* along the optical branch, half-way between samples: not the ground
   * (more than 60 levels off in some channel); 12 px below it, where no
   * branch passes on Γ–X: the ground or a grid line (within 30 levels) */
  for (gsize k = 0; k + 1 < b.s->n_q; k++)
    {
      double x, y;
      const guint8 *p;
      if (b.s->restart[k + 1] || b.s->q[3 * k + 1] != 0.0 || b.s->q[3 * k + 4] != 0.0)
        continue;
      x = 0.5 * (column_of (&o, b.s, b.s->distance[k]) + column_of (&o, b.s, b.s->distance[k + 1]));
      y = row_of (&o, 0, 500, 0.5 * (b.w[k * NB + 3] + b.w[(k + 1) * NB + 3]));
      p = rgba + 4 * ((gsize) floor (y) * o.width + (gsize) floor (x));
      tried++;
      hits += !near_colour (p, paper[0] / 255.0, paper[1] / 255.0, paper[2] / 255.0, 60);
      p = rgba + 4 * ((gsize) floor (y + 12) * o.width + (gsize) floor (x));
      if (fabs (x - column_of (&o, b.s, b.s->label_distance[0])) > 3)
        assert_true (near_colour (p, paper[0] / 255.0, paper[1] / 255.0, paper[2] / 255.0, 30));
    }
  assert_true (tried > 5);
  assert_int_equal (hits, tried);
  g_free (rgba);

  /* transparent: alpha 0 away from the drawing */
  o.transparent = TRUE;
  rgba = qv_dispersion_plot_rgba (b.s, NB, b.w, &o, &error);
  assert_non_null (rgba);
  assert_int_equal (rgba[3], 0);
  g_free (rgba);

  /* dark: a dark ground, and light branches on it */
  o.transparent = FALSE;
  o.dark = TRUE;
  rgba = qv_dispersion_plot_rgba (b.s, NB, b.w, &o, &error);
  assert_non_null (rgba);
  assert_true (rgba[0] < 60 && rgba[1] < 60 && rgba[2] < 60);
  g_free (rgba);
  rgba = NULL;
  bands_clear (&b);
}

static void
test_labels_and_sizes (void **state)
{
  Bands b = make_bands (TRUE);
  g_autoptr(GError) error = NULL;
  QvDispersionPlotOptions o;
  g_autofree char *g = qv_dispersion_plot_label_text ("G");
  g_autofree char *xg = qv_dispersion_plot_label_text ("X|Gamma");
  g_autofree char *k = qv_dispersion_plot_label_text ("K");
  g_autofree char *svg = NULL;
  gsize length = 0;

  assert_string_equal (g, "\u0393");
  assert_string_equal (xg, "X|\u0393");
  assert_string_equal (k, "K");
  qv_dispersion_plot_options_init (&o);
  o.width = 199;
  assert_null (qv_dispersion_plot_svg (b.s, NB, b.w, &o, &length, &error));
  assert_non_null (error);
  g_clear_error (&error);
  o.width = 400;
  o.height = 20000;
  assert_null (qv_dispersion_plot_rgba (b.s, NB, b.w, &o, &error));
  g_clear_error (&error);
  o.height = 300;
  o.selected_q = 3;
  o.selected_branch = 1;
  o.hover_q = 4;
  o.hover_branch = 3;
  o.title = "invented bands";
  svg = qv_dispersion_plot_svg (b.s, NB, b.w, &o, &length, &error);
  assert_non_null (svg);
  assert_int_equal (strlen (svg), length);
  assert_non_null (strstr (svg, "<svg"));
  /* no data at all still draws (axes only) */
  {
    g_autofree char *empty = qv_dispersion_plot_svg (NULL, 0, NULL, &o, &length, &error);
    assert_non_null (empty);
  }
  bands_clear (&b);
}

/* plot.svg and plot.json for the Python check: both with and without
 * imaginary values. */
static int
write_sample (const char *dir)
{
  for (int imaginary = 0; imaginary < 2; imaginary++)
    {
      Bands b = make_bands (imaginary);
      QvDispersionPlotOptions o;
      g_autoptr(GError) error = NULL;
      g_autoptr(GString) js = g_string_new ("{");
      g_autofree char *svg = NULL, *svg_path = NULL, *json_path = NULL;
      double l, t, r, bt, lo, hi;
      gsize length = 0;
      char buf[G_ASCII_DTOSTR_BUF_SIZE];

      qv_dispersion_plot_options_init (&o);
      o.width = 720;
      o.height = 440;
      o.has_range = TRUE;
      o.y_min = imaginary ? -80.0 : 0.0;
      o.y_max = 500.0;
      svg = qv_dispersion_plot_svg (b.s, NB, b.w, &o, &length, &error);
      if (svg == NULL)
        return 1;
      qv_dispersion_plot_area (&o, &l, &t, &r, &bt);
      qv_dispersion_plot_range (b.s, NB, b.w, &o, &lo, &hi);
      g_string_append_printf (js, "\"width\": %d, \"height\": %d, \"n_branches\": %d", o.width, o.height, NB);
#define NUM(key, v) g_string_append_printf (js, ", \"%s\": %s", key, g_ascii_dtostr (buf, sizeof buf, v))
      NUM ("left", l); NUM ("top", t); NUM ("right", r); NUM ("bottom", bt);
      NUM ("y_min", lo); NUM ("y_max", hi);
      g_string_append (js, ", \"distance\": [");
      for (gsize k = 0; k < b.s->n_q; k++)
        g_string_append_printf (js, "%s%s", k ? ", " : "", g_ascii_dtostr (buf, sizeof buf, b.s->distance[k]));
      g_string_append (js, "], \"restart\": [");
      for (gsize k = 0; k < b.s->n_q; k++)
        g_string_append_printf (js, "%s%s", k ? ", " : "", b.s->restart[k] ? "true" : "false");
      g_string_append (js, "], \"wavenumbers\": [");
      for (gsize i = 0; i < b.s->n_q * NB; i++)
        g_string_append_printf (js, "%s%s", i ? ", " : "", g_ascii_dtostr (buf, sizeof buf, b.w[i]));
      g_string_append (js, "], \"labels\": [");
      for (gsize i = 0; i < b.s->n_labels; i++)
        g_string_append_printf (js, "%s[\"%s\", %s]", i ? ", " : "", b.s->labels[i],
                                g_ascii_dtostr (buf, sizeof buf, b.s->label_distance[i]));
      g_string_append (js, "]}\n");
#undef NUM
      svg_path = g_strdup_printf ("%s/plot%s.svg", dir, imaginary ? "-imaginary" : "");
      json_path = g_strdup_printf ("%s/plot%s.json", dir, imaginary ? "-imaginary" : "");
      if (!g_file_set_contents (svg_path, svg, (gssize) length, &error)
          || !g_file_set_contents (json_path, js->str, -1, &error))
        {
          fprintf (stderr, "%s\n", error->message);
          return 1;
        }
      bands_clear (&b);
    }
  return 0;
}

int
main (int argc, char **argv)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_mapping),
    cmocka_unit_test (test_hit),
    cmocka_unit_test (test_pixels),
    cmocka_unit_test (test_labels_and_sizes),
  };
  if (argc == 3 && strcmp (argv[1], "svg") == 0)
    return write_sample (argv[2]);
  return cmocka_run_group_tests (tests, NULL, NULL);
}
