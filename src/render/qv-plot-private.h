/* qv-plot-private.h — what the phonon plots (dispersion, DOS, thermal)
 * share: their palette in a light and a dark variant, text placement with
 * Pango, axis ticks, the frequency unit of an axis, and the SVG and RGBA
 * surfaces around a drawing function. Private to src/render.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <cairo.h>
#include <glib.h>
#include <pango/pangocairo.h>
#include "qv-units.h"

G_BEGIN_DECLS

#define QV_PLOT_MAX_SIDE 16384
#define QV_PLOT_FONT_PX 12.0
#define QV_PLOT_N_SERIES 6
/* The top and bottom margins of the dispersion plot and of a sideways DOS
 * plot, so that the two frequency axes line up at the same height. */
#define QV_PLOT_MARGIN_TOP 34.0
#define QV_PLOT_MARGIN_BOTTOM 48.0

typedef struct { double r, g, b; } QvPlotRgb;

typedef struct {
  QvPlotRgb paper;      /* background */
  QvPlotRgb ink;        /* axes, text */
  QvPlotRgb grid;       /* grid lines, label lines */
  QvPlotRgb branch;     /* dispersion branches, the DOS total */
  QvPlotRgb imaginary;  /* the part below zero */
  QvPlotRgb mark;       /* selected point, hover line */
  QvPlotRgb series[QV_PLOT_N_SERIES];   /* partial DOS, thermal curves */
} QvPlotPalette;

/* Our own palette: a warm paper with slate ink, or a charcoal ground with
 * light ink; the series hues keep apart in both. */
const QvPlotPalette *qv_plot_palette (gboolean dark);
void qv_plot_set_rgb (cairo_t *cr, QvPlotRgb c, double alpha);

/* A layout in Sans at QV_PLOT_FONT_PX pixels (g_object_unref it). */
PangoLayout *qv_plot_layout (cairo_t *cr);
/* Shows @text with its box anchored at (@x, @y): @ax, @ay in 0…1 of the
 * box (0.5, 0: centred below the point). @box gets x, y, w, h when given. */
void qv_plot_text (cairo_t *cr, PangoLayout *layout, const char *text, double x, double y,
                   double ax, double ay, double *box);
/* The extents of @text (pixels). */
void qv_plot_text_size (PangoLayout *layout, const char *text, double *width, double *height);
/* A step of 1, 2 or 5 × 10ⁿ giving about @target intervals over @span. */
double qv_plot_nice_step (double span, double target);
/* A tick value with the digits its step needs; with @imaginary_negative a
 * negative value is written as its magnitude with an "i" ("50i"). */
void qv_plot_format_tick (char *buf, gsize size, double v, double step,
                          gboolean imaginary_negative);
/* "cm⁻¹", "THz", "meV". */
const char *qv_plot_unit_symbol (QvFrequencyUnit unit);
/* "wavenumber (cm⁻¹)", "frequency (THz)", "energy (meV)". */
const char *qv_plot_unit_axis_label (QvFrequencyUnit unit);

/* QV_ERROR_USAGE naming @what unless @min_w ≤ width ≤ QV_PLOT_MAX_SIDE and
 * @min_h ≤ height ≤ QV_PLOT_MAX_SIDE. */
gboolean qv_plot_check_size (const char *what, int width, int height, int min_w, int min_h,
                             GError **error);

typedef void (*QvPlotDrawFunc) (cairo_t *cr, gconstpointer data);
/* @draw on an SVG surface of width × height px: the document, newly
 * allocated and NUL-terminated, *@length bytes without the NUL. */
char *qv_plot_svg (int width, int height, QvPlotDrawFunc draw, gconstpointer data,
                   gsize *length, GError **error);
/* @draw on an image: straight-alpha RGBA, top row first. */
guint8 *qv_plot_rgba (int width, int height, QvPlotDrawFunc draw, gconstpointer data,
                      GError **error);

G_END_DECLS
