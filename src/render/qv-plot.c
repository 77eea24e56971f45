/* qv-plot.c — shared pieces of the phonon plots (qv-plot-private.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include <cairo-svg.h>
#include "qv-error.h"
#include "qv-plot-private.h"

/* Light: the spectrum plot's warm paper and slate ink, a deep blue-teal for
 * branches, rose for imaginary parts, amber marks. Dark: a charcoal ground,
 * the same hues lifted in lightness so they keep their contrast. */
static const QvPlotPalette LIGHT = {
  .paper = { 0.984, 0.980, 0.969 },
  .ink = { 0.24, 0.25, 0.27 },
  .grid = { 0.88, 0.87, 0.85 },
  .branch = { 0.13, 0.36, 0.47 },
  .imaginary = { 0.76, 0.24, 0.33 },
  .mark = { 0.86, 0.50, 0.08 },
  .series = { { 0.12, 0.52, 0.50 }, { 0.74, 0.52, 0.22 }, { 0.52, 0.30, 0.58 },
              { 0.42, 0.52, 0.20 }, { 0.70, 0.32, 0.22 }, { 0.30, 0.52, 0.78 } },
};

static const QvPlotPalette DARK = {
  .paper = { 0.125, 0.133, 0.145 },
  .ink = { 0.86, 0.86, 0.84 },
  .grid = { 0.26, 0.28, 0.30 },
  .branch = { 0.50, 0.78, 0.86 },
  .imaginary = { 0.96, 0.52, 0.60 },
  .mark = { 0.98, 0.72, 0.30 },
  .series = { { 0.38, 0.80, 0.74 }, { 0.92, 0.72, 0.40 }, { 0.78, 0.60, 0.90 },
              { 0.70, 0.82, 0.42 }, { 0.95, 0.55, 0.45 }, { 0.55, 0.72, 0.98 } },
};

const QvPlotPalette *
qv_plot_palette (gboolean dark)
{
  return dark ? &DARK : &LIGHT;
}

void
qv_plot_set_rgb (cairo_t *cr, QvPlotRgb c, double alpha)
{
  cairo_set_source_rgba (cr, c.r, c.g, c.b, alpha);
}

PangoLayout *
qv_plot_layout (cairo_t *cr)
{
  PangoLayout *layout = pango_cairo_create_layout (cr);
  PangoFontDescription *font = pango_font_description_from_string ("Sans");
  pango_font_description_set_absolute_size (font, QV_PLOT_FONT_PX * PANGO_SCALE);
  pango_layout_set_font_description (layout, font);
  pango_font_description_free (font);
  return layout;
}

void
qv_plot_text_size (PangoLayout *layout, const char *text, double *width, double *height)
{
  PangoRectangle logical;
  pango_layout_set_text (layout, text, -1);
  pango_layout_get_pixel_extents (layout, NULL, &logical);
  *width = logical.width;
  *height = logical.height;
}

void
qv_plot_text (cairo_t *cr, PangoLayout *layout, const char *text, double x, double y, double ax,
              double ay, double *box)
{
  double w, h;
  qv_plot_text_size (layout, text, &w, &h);
  x -= ax * w;
  y -= ay * h;
  if (box)
    {
      box[0] = x; box[1] = y; box[2] = w; box[3] = h;
    }
  cairo_move_to (cr, x, y);
  pango_cairo_show_layout (cr, layout);
}

double
qv_plot_nice_step (double span, double target)
{
  double raw, p, f;
  if (!(span > 0) || !isfinite (span) || !(target > 0))
    return 1.0;
  raw = span / target;
  p = pow (10.0, floor (log10 (raw)));
  f = raw / p;
  return (f < 1.5 ? 1.0 : f < 3.5 ? 2.0 : f < 7.5 ? 5.0 : 10.0) * p;
}

void
qv_plot_format_tick (char *buf, gsize size, double v, double step, gboolean imaginary_negative)
{
  const int digits = step >= 1 ? 0 : (int) ceil (-log10 (step) - 1e-9);
  const gboolean imaginary = imaginary_negative && v < 0 && fabs (v) >= step * 1e-6;
  if (fabs (v) < step * 1e-6)
    v = 0.0;
  if (imaginary)
    v = -v;
  if (fabs (v) >= 1e5 || (fabs (v) > 0 && fabs (v) < 1e-3))
    g_snprintf (buf, size, "%.2g%s", v, imaginary ? "i" : "");
  else
    g_snprintf (buf, size, "%.*f%s", MIN (digits, 6), v, imaginary ? "i" : "");
}

const char *
qv_plot_unit_symbol (QvFrequencyUnit unit)
{
  switch (unit)
    {
    case QV_FREQUENCY_THZ: return "THz";
    case QV_FREQUENCY_MEV: return "meV";
    case QV_FREQUENCY_CM1:
    default: return "cm\u207b\u00b9";
    }
}

const char *
qv_plot_unit_axis_label (QvFrequencyUnit unit)
{
  switch (unit)
    {
    case QV_FREQUENCY_THZ: return "frequency (THz)";
    case QV_FREQUENCY_MEV: return "energy (meV)";
    case QV_FREQUENCY_CM1:
    default: return "wavenumber (cm\u207b\u00b9)";
    }
}

gboolean
qv_plot_check_size (const char *what, int width, int height, int min_w, int min_h, GError **error)
{
  if (width < min_w || height < min_h || width > QV_PLOT_MAX_SIDE || height > QV_PLOT_MAX_SIDE)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "a %s must be %d to %d pixels wide and %d to %d high, got %d × %d", what, min_w,
                   QV_PLOT_MAX_SIDE, min_h, QV_PLOT_MAX_SIDE, width, height);
      return FALSE;
    }
  return TRUE;
}

static cairo_status_t
append_bytes (void *closure, const unsigned char *data, unsigned int length)
{
  g_byte_array_append (closure, data, length);
  return CAIRO_STATUS_SUCCESS;
}

char *
qv_plot_svg (int width, int height, QvPlotDrawFunc draw, gconstpointer data, gsize *length,
             GError **error)
{
  GByteArray *bytes = g_byte_array_new ();
  cairo_surface_t *surface;
  cairo_t *cr;
  cairo_status_t status;

  surface = cairo_svg_surface_create_for_stream (append_bytes, bytes, width, height);
  cairo_svg_surface_set_document_unit (surface, CAIRO_SVG_UNIT_PX);
  cr = cairo_create (surface);
  draw (cr, data);
  status = cairo_status (cr);
  cairo_destroy (cr);
  cairo_surface_finish (surface);
  if (status == CAIRO_STATUS_SUCCESS)
    status = cairo_surface_status (surface);
  cairo_surface_destroy (surface);
  if (status != CAIRO_STATUS_SUCCESS)
    {
      g_byte_array_free (bytes, TRUE);
      g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "cannot draw the SVG: %s",
                   cairo_status_to_string (status));
      return NULL;
    }
  if (length)
    *length = bytes->len;
  g_byte_array_append (bytes, (const guint8 *) "", 1);
  return (char *) g_byte_array_free (bytes, FALSE);
}

guint8 *
qv_plot_rgba (int width, int height, QvPlotDrawFunc draw, gconstpointer data, GError **error)
{
  cairo_surface_t *surface;
  cairo_t *cr;
  guint8 *rgba;
  const guint8 *pixels;
  int stride;

  surface = cairo_image_surface_create (CAIRO_FORMAT_ARGB32, width, height);
  if (cairo_surface_status (surface) != CAIRO_STATUS_SUCCESS)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "cannot make a %d × %d image: %s", width,
                   height, cairo_status_to_string (cairo_surface_status (surface)));
      cairo_surface_destroy (surface);
      return NULL;
    }
  cr = cairo_create (surface);
  draw (cr, data);
  cairo_destroy (cr);
  cairo_surface_flush (surface);
  pixels = cairo_image_surface_get_data (surface);
  stride = cairo_image_surface_get_stride (surface);
  rgba = g_malloc ((gsize) width * (gsize) height * 4);
  /* cairo's ARGB32 is premultiplied, one native-endian word per pixel */
  for (int y = 0; y < height; y++)
    for (int x = 0; x < width; x++)
      {
        guint32 p;
        guint8 *out = rgba + ((gsize) y * (gsize) width + (gsize) x) * 4;
        guint a, r, g, b;
        memcpy (&p, pixels + (gsize) y * (gsize) stride + (gsize) x * 4, 4);
        a = p >> 24; r = (p >> 16) & 0xff; g = (p >> 8) & 0xff; b = p & 0xff;
        if (a > 0 && a < 255)
          {
            r = MIN (255u, (r * 255 + a / 2) / a);
            g = MIN (255u, (g * 255 + a / 2) / a);
            b = MIN (255u, (b * 255 + a / 2) / a);
          }
        out[0] = (guint8) r; out[1] = (guint8) g; out[2] = (guint8) b; out[3] = (guint8) a;
      }
  cairo_surface_destroy (surface);
  return rgba;
}
