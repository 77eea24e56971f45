/* qv-spectrum-plot.c — cairo drawing of a spectrum.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include <cairo-svg.h>
#include <pango/pangocairo.h>
#include "qv-error.h"
#include "qv-spectrum-plot.h"

/* Margins of the data box, pixels. */
#define MARGIN_LEFT 74.0
#define MARGIN_RIGHT 74.0
#define MARGIN_TOP 34.0
#define MARGIN_BOTTOM 52.0
#define FONT_PX 12.0
/* The tallest stick or envelope point reaches this share of the box. */
#define HEADROOM 0.86

typedef struct { double r, g, b; } Rgb;
/* A quiet palette of our own: paper, ink, a slate-blue envelope, ochre
 * sticks, a rose highlight. */
static const Rgb PAPER = { 0.984, 0.980, 0.969 };
static const Rgb INK = { 0.24, 0.25, 0.27 };
static const Rgb GRID = { 0.89, 0.88, 0.86 };
static const Rgb ENVELOPE = { 0.22, 0.40, 0.56 };
static const Rgb STICK = { 0.74, 0.52, 0.22 };
static const Rgb SELECTED = { 0.72, 0.22, 0.36 };

void
qv_spectrum_plot_options_init (QvSpectrumPlotOptions *o)
{
  memset (o, 0, sizeof *o);
  o->width = 900;
  o->height = 500;
  o->show_sticks = TRUE;
  o->show_envelope = TRUE;
  o->n_labels = 8;
  o->selected = -1;
}

void
qv_spectrum_plot_area (const QvSpectrumPlotOptions *o, double *left, double *top, double *right,
                       double *bottom)
{
  *left = MARGIN_LEFT;
  *top = MARGIN_TOP;
  *right = MAX (MARGIN_LEFT + 1.0, o->width - MARGIN_RIGHT);
  *bottom = MAX (MARGIN_TOP + 1.0, o->height - MARGIN_BOTTOM);
}

static void
view_range (const QvSpectrum *s, const QvSpectrumPlotOptions *o, double *lo, double *hi)
{
  if (o->has_range && o->x_max > o->x_min)
    {
      *lo = o->x_min;
      *hi = o->x_max;
    }
  else
    {
      *lo = s->start;
      *hi = MAX (qv_spectrum_stop (s), s->start + s->step);
    }
}

double
qv_spectrum_plot_x_to_pixel (const QvSpectrum *s, const QvSpectrumPlotOptions *o, double x)
{
  double left, top, right, bottom, lo, hi, t;
  qv_spectrum_plot_area (o, &left, &top, &right, &bottom);
  view_range (s, o, &lo, &hi);
  t = (x - lo) / (hi - lo);
  if (o->descending)
    t = 1.0 - t;
  return left + t * (right - left);
}

double
qv_spectrum_plot_pixel_to_x (const QvSpectrum *s, const QvSpectrumPlotOptions *o, double pixel)
{
  double left, top, right, bottom, lo, hi, t;
  qv_spectrum_plot_area (o, &left, &top, &right, &bottom);
  view_range (s, o, &lo, &hi);
  t = (pixel - left) / (right - left);
  if (o->descending)
    t = 1.0 - t;
  return lo + t * (hi - lo);
}

gint
qv_spectrum_plot_hit (const QvSpectrum *s, const QvSpectrumPlotOptions *o, double pixel,
                      double tolerance)
{
  double lo, hi, best = G_MAXDOUBLE, best_height = -G_MAXDOUBLE;
  gint mode = -1;

  view_range (s, o, &lo, &hi);
  for (gsize k = 0; k < s->n_sticks; k++)
    {
      const double x = s->stick_position[k];
      double d;
      if (x < lo || x > hi)
        continue;
      d = fabs (qv_spectrum_plot_x_to_pixel (s, o, x) - pixel);
      if (d > tolerance)
        continue;
      if (d < best - 1e-9 || (fabs (d - best) <= 1e-9 && s->stick_height[k] > best_height))
        {
          best = d;
          best_height = s->stick_height[k];
          mode = (gint) s->stick_mode[k];
        }
    }
  return mode;
}

/* A step of 1, 2 or 5 × 10ⁿ giving about @target intervals over @span. */
static double
nice_step (double span, double target)
{
  const double raw = span / target;
  const double p = pow (10.0, floor (log10 (raw)));
  const double f = raw / p;
  return (f < 1.5 ? 1.0 : f < 3.5 ? 2.0 : f < 7.5 ? 5.0 : 10.0) * p;
}

static void
set_rgb (cairo_t *cr, Rgb c, double alpha)
{
  cairo_set_source_rgba (cr, c.r, c.g, c.b, alpha);
}

/* Text with its anchor: @ax, @ay in 0…1 of its box (0.5, 0: centred below
 * the point). Returns the box in @box (x, y, w, h) when given. */
static void
text_at (cairo_t *cr, PangoLayout *layout, const char *text, double x, double y, double ax,
         double ay, double *box)
{
  PangoRectangle ink, logical;
  pango_layout_set_text (layout, text, -1);
  pango_layout_get_pixel_extents (layout, &ink, &logical);
  x -= ax * logical.width;
  y -= ay * logical.height;
  if (box)
    {
      box[0] = x; box[1] = y; box[2] = logical.width; box[3] = logical.height;
    }
  cairo_move_to (cr, x, y);
  pango_cairo_show_layout (cr, layout);
}

static void
format_tick (char *buf, gsize size, double v, double step)
{
  int digits = step >= 1 ? 0 : (int) ceil (-log10 (step) - 1e-9);
  if (fabs (v) < step * 1e-6)
    v = 0.0;
  if (fabs (v) >= 1e5 || (fabs (v) > 0 && fabs (v) < 1e-3))
    g_snprintf (buf, size, "%.2g", v);
  else
    g_snprintf (buf, size, "%.*f", MIN (digits, 6), v);
}

static void
y_axis (cairo_t *cr, PangoLayout *layout, double top_value, double x, double top, double bottom,
        gboolean right, gboolean grid, double left_edge, double right_edge)
{
  const double span = (bottom - top) * HEADROOM;
  double step;
  char buf[64];

  if (!(top_value > 0) || !isfinite (top_value))
    return;
  step = nice_step (top_value, 4.0);
  for (double v = 0.0; v <= top_value * 1.0 / HEADROOM + 1e-12 * top_value; v += step)
    {
      const double y = bottom - v / top_value * span;
      if (y < top - 0.5)
        break;
      if (grid && v > 0)
        {
          set_rgb (cr, GRID, 1.0);
          cairo_set_line_width (cr, 1.0);
          cairo_move_to (cr, left_edge, floor (y) + 0.5);
          cairo_line_to (cr, right_edge, floor (y) + 0.5);
          cairo_stroke (cr);
        }
      set_rgb (cr, INK, 1.0);
      cairo_set_line_width (cr, 1.0);
      cairo_move_to (cr, x, floor (y) + 0.5);
      cairo_line_to (cr, x + (right ? 5 : -5), floor (y) + 0.5);
      cairo_stroke (cr);
      format_tick (buf, sizeof buf, v, step);
      text_at (cr, layout, buf, x + (right ? 8 : -8), y, right ? 0.0 : 1.0, 0.5, NULL);
    }
}

static gboolean
overlaps (const double *a, const double *b)
{
  return a[0] < b[0] + b[2] && b[0] < a[0] + a[2] && a[1] < b[1] + b[3] && b[1] < a[1] + a[3];
}

static int
by_height (gconstpointer a, gconstpointer b, gpointer data)
{
  const QvSpectrum *s = data;
  const double ha = s->stick_height[*(const gsize *) a], hb = s->stick_height[*(const gsize *) b];
  return ha < hb ? 1 : ha > hb ? -1 : 0;
}

void
qv_spectrum_plot_draw (cairo_t *cr, const QvSpectrum *s, const QvSpectrumPlotOptions *o)
{
  double left, top, right, bottom, lo, hi, env_top, stick_top;
  PangoLayout *layout;
  PangoFontDescription *font;
  g_autoptr(GArray) boxes = g_array_new (FALSE, FALSE, sizeof (double) * 4);
  char buf[64];

  qv_spectrum_plot_area (o, &left, &top, &right, &bottom);
  view_range (s, o, &lo, &hi);
  env_top = qv_spectrum_max_envelope (s);
  stick_top = qv_spectrum_max_stick (s);

  cairo_save (cr);
  if (!o->transparent)
    {
      set_rgb (cr, PAPER, 1.0);
      cairo_paint (cr);
    }
  layout = pango_cairo_create_layout (cr);
  font = pango_font_description_from_string ("Sans");
  pango_font_description_set_absolute_size (font, FONT_PX * PANGO_SCALE);
  pango_layout_set_font_description (layout, font);

  /* y axes: envelope on the left (with the grid), sticks on the right */
  if (o->show_envelope)
    y_axis (cr, layout, env_top, left, top, bottom, FALSE, TRUE, left, right);
  if (o->show_sticks)
    y_axis (cr, layout, stick_top, o->show_envelope ? right : left, top, bottom,
            o->show_envelope, !o->show_envelope, left, right);

  /* x axis: ticks in cm⁻¹ */
  {
    const double step = nice_step (hi - lo, MAX (2.0, (right - left) / 90.0));
    set_rgb (cr, INK, 1.0);
    cairo_set_line_width (cr, 1.0);
    for (double v = ceil (lo / step) * step; v <= hi + 1e-9 * step; v += step)
      {
        const double px = floor (qv_spectrum_plot_x_to_pixel (s, o, v)) + 0.5;
        cairo_move_to (cr, px, bottom);
        cairo_line_to (cr, px, bottom + 5);
        cairo_stroke (cr);
        format_tick (buf, sizeof buf, v, step);
        text_at (cr, layout, buf, px, bottom + 8, 0.5, 0.0, NULL);
      }
    text_at (cr, layout, "wavenumber (cm\u207b\u00b9)", 0.5 * (left + right), bottom + 28, 0.5,
             0.0, NULL);
  }

  /* the data, clipped to the box */
  cairo_save (cr);
  cairo_rectangle (cr, left, top - 1, right - left, bottom - top + 1);
  cairo_clip (cr);
  if (o->show_envelope && env_top > 0 && s->n_points > 1)
    {
      const double span = (bottom - top) * HEADROOM;
      cairo_new_path (cr);
      for (gsize i = 0; i < s->n_points; i++)
        cairo_line_to (cr, qv_spectrum_plot_x_to_pixel (s, o, qv_spectrum_x (s, i)),
                       bottom - s->envelope[i] / env_top * span);
      cairo_line_to (cr, qv_spectrum_plot_x_to_pixel (s, o, qv_spectrum_stop (s)), bottom);
      cairo_line_to (cr, qv_spectrum_plot_x_to_pixel (s, o, s->start), bottom);
      cairo_close_path (cr);
      set_rgb (cr, ENVELOPE, 0.10);
      cairo_fill (cr);
      cairo_new_path (cr);
      for (gsize i = 0; i < s->n_points; i++)
        cairo_line_to (cr, qv_spectrum_plot_x_to_pixel (s, o, qv_spectrum_x (s, i)),
                       bottom - s->envelope[i] / env_top * span);
      set_rgb (cr, ENVELOPE, 1.0);
      cairo_set_line_width (cr, 1.6);
      cairo_set_line_join (cr, CAIRO_LINE_JOIN_ROUND);
      cairo_stroke (cr);
    }
  if (o->show_sticks && stick_top > 0)
    {
      const double span = (bottom - top) * HEADROOM;
      for (gsize k = 0; k < s->n_sticks; k++)
        {
          const double px = qv_spectrum_plot_x_to_pixel (s, o, s->stick_position[k]);
          const gboolean sel = o->selected >= 0 && (gint) s->stick_mode[k] == o->selected;
          set_rgb (cr, sel ? SELECTED : STICK, 1.0);
          cairo_set_line_width (cr, sel ? 2.4 : 1.3);
          cairo_move_to (cr, px, bottom);
          cairo_line_to (cr, px, bottom - s->stick_height[k] / stick_top * span);
          cairo_stroke (cr);
        }
    }
  cairo_restore (cr);

  /* the frame */
  set_rgb (cr, INK, 1.0);
  cairo_set_line_width (cr, 1.0);
  cairo_rectangle (cr, floor (left) + 0.5, floor (top) + 0.5, floor (right - left),
                   floor (bottom - top));
  cairo_stroke (cr);

  /* peak labels: the tallest sticks first, none over another */
  if (o->n_labels > 0 && s->n_sticks > 0 && (stick_top > 0 || env_top > 0))
    {
      const double span = (bottom - top) * HEADROOM;
      g_autofree gsize *order = g_new (gsize, s->n_sticks);
      guint placed = 0;
      for (gsize k = 0; k < s->n_sticks; k++)
        order[k] = k;
      g_qsort_with_data (order, (gint) s->n_sticks, sizeof (gsize), by_height, (gpointer) s);
      for (gsize i = 0; i < s->n_sticks && placed < o->n_labels; i++)
        {
          const gsize k = order[i];
          const double x = s->stick_position[k];
          double px, py = bottom, box[4];
          gboolean clash = FALSE;
          if (x < lo || x > hi || !(s->stick_height[k] > 0))
            continue;
          px = qv_spectrum_plot_x_to_pixel (s, o, x);
          if (o->show_sticks && stick_top > 0)
            py = MIN (py, bottom - s->stick_height[k] / stick_top * span);
          if (o->show_envelope && env_top > 0 && s->n_points > 1)
            {
              double fi = (x - s->start) / s->step;
              gsize i0 = (gsize) CLAMP (floor (fi), 0, (double) s->n_points - 1);
              py = MIN (py, bottom - s->envelope[i0] / env_top * span);
            }
          g_snprintf (buf, sizeof buf, "%u", s->stick_mode[k] + 1);
          pango_layout_set_text (layout, buf, -1);
          {
            PangoRectangle lr;
            pango_layout_get_pixel_extents (layout, NULL, &lr);
            box[0] = px - 0.5 * lr.width - 2;
            box[1] = MAX (top + 1, py - 4 - lr.height) - 1;
            box[2] = lr.width + 4;
            box[3] = lr.height + 2;
          }
          for (guint b = 0; b < boxes->len && !clash; b++)
            clash = overlaps (box, &g_array_index (boxes, double, 4 * b));
          if (clash)
            continue;
          g_array_append_vals (boxes, box, 1);
          set_rgb (cr, (o->selected >= 0 && (gint) s->stick_mode[k] == o->selected) ? SELECTED : INK,
                   1.0);
          cairo_move_to (cr, box[0] + 2, box[1] + 1);
          pango_cairo_show_layout (cr, layout);
          placed++;
        }
    }

  /* titles */
  set_rgb (cr, INK, 1.0);
  if (o->title)
    text_at (cr, layout, o->title, left, top - 8, 0.0, 1.0, NULL);
  if (o->show_envelope && o->envelope_label)
    {
      cairo_save (cr);
      cairo_translate (cr, 16, 0.5 * (top + bottom));
      cairo_rotate (cr, -G_PI / 2);
      text_at (cr, layout, o->envelope_label, 0, 0, 0.5, 0.5, NULL);
      cairo_restore (cr);
    }
  if (o->show_sticks && o->stick_label)
    {
      cairo_save (cr);
      if (o->show_envelope)
        {
          cairo_translate (cr, o->width - 16, 0.5 * (top + bottom));
          cairo_rotate (cr, G_PI / 2);
        }
      else
        {
          cairo_translate (cr, 16, 0.5 * (top + bottom));
          cairo_rotate (cr, -G_PI / 2);
        }
      text_at (cr, layout, o->stick_label, 0, 0, 0.5, 0.5, NULL);
      cairo_restore (cr);
    }
  pango_font_description_free (font);
  g_object_unref (layout);
  cairo_restore (cr);
}

static gboolean
check_size (const QvSpectrumPlotOptions *o, GError **error)
{
  if (o->width < 200 || o->height < 150 || o->width > QV_SPECTRUM_PLOT_MAX_SIDE
      || o->height > QV_SPECTRUM_PLOT_MAX_SIDE)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "a spectrum plot must be 200 to %d pixels wide and 150 to %d high, got %d × %d",
                   QV_SPECTRUM_PLOT_MAX_SIDE, QV_SPECTRUM_PLOT_MAX_SIDE, o->width, o->height);
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
qv_spectrum_plot_svg (const QvSpectrum *s, const QvSpectrumPlotOptions *o, gsize *length,
                      GError **error)
{
  GByteArray *bytes;
  cairo_surface_t *surface;
  cairo_t *cr;
  cairo_status_t status;

  if (!check_size (o, error))
    return NULL;
  bytes = g_byte_array_new ();
  surface = cairo_svg_surface_create_for_stream (append_bytes, bytes, o->width, o->height);
  cairo_svg_surface_set_document_unit (surface, CAIRO_SVG_UNIT_PX);
  cr = cairo_create (surface);
  qv_spectrum_plot_draw (cr, s, o);
  cairo_destroy (cr);
  cairo_surface_finish (surface);
  status = cairo_surface_status (surface);
  cairo_surface_destroy (surface);
  if (status != CAIRO_STATUS_SUCCESS)
    {
      g_byte_array_free (bytes, TRUE);
      g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "cannot draw the SVG: %s",
                   cairo_status_to_string (status));
      return NULL;
    }
  *length = bytes->len;
  g_byte_array_append (bytes, (const guint8 *) "", 1);
  return (char *) g_byte_array_free (bytes, FALSE);
}

guint8 *
qv_spectrum_plot_rgba (const QvSpectrum *s, const QvSpectrumPlotOptions *o, GError **error)
{
  cairo_surface_t *surface;
  cairo_t *cr;
  guint8 *rgba;
  const guint8 *data;
  int stride;

  if (!check_size (o, error))
    return NULL;
  surface = cairo_image_surface_create (CAIRO_FORMAT_ARGB32, o->width, o->height);
  if (cairo_surface_status (surface) != CAIRO_STATUS_SUCCESS)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "cannot make a %d × %d image: %s",
                   o->width, o->height, cairo_status_to_string (cairo_surface_status (surface)));
      cairo_surface_destroy (surface);
      return NULL;
    }
  cr = cairo_create (surface);
  qv_spectrum_plot_draw (cr, s, o);
  cairo_destroy (cr);
  cairo_surface_flush (surface);
  data = cairo_image_surface_get_data (surface);
  stride = cairo_image_surface_get_stride (surface);
  rgba = g_malloc ((gsize) o->width * (gsize) o->height * 4);
  /* cairo's ARGB32 is premultiplied, one native-endian word per pixel */
  for (int y = 0; y < o->height; y++)
    for (int x = 0; x < o->width; x++)
      {
        guint32 p;
        guint8 *out = rgba + ((gsize) y * (gsize) o->width + (gsize) x) * 4;
        guint a, r, g, b;
        memcpy (&p, data + (gsize) y * (gsize) stride + (gsize) x * 4, 4);
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
