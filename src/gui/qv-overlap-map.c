/* qv-overlap-map.c — the overlap heat map.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-config.h"
#include <math.h>
#include "qv-overlap-map.h"
#include "qv-style.h"

struct _QvOverlapMap
{
  GtkDrawingArea parent_instance;

  gsize n_a, n_b;
  double *matrix;              /* n_a × n_b, row-major */
  gsize *partner;              /* n_a */
  double *wavenumber_a, *wavenumber_b;
  cairo_surface_t *image;      /* one pixel per cell, made once */
  gssize hover_i, hover_j;     /* −1: none */
};

G_DEFINE_FINAL_TYPE (QvOverlapMap, qv_overlap_map, GTK_TYPE_DRAWING_AREA)

enum { READOUT_CHANGED, N_SIGNALS };
static guint signals[N_SIGNALS];

/* Room for the axes' numbers and the legend, pixels. */
#define MARGIN_LEFT 40.0
#define MARGIN_TOP 24.0
#define MARGIN_RIGHT 64.0
#define MARGIN_BOTTOM 8.0
#define LEGEND_WIDTH 12.0

typedef struct {
  double x, y, cell;           /* top left of the matrix and a cell's side */
} Geometry;

static gboolean
geometry (QvOverlapMap *self, Geometry *g)
{
  const double w = gtk_widget_get_width (GTK_WIDGET (self)) - MARGIN_LEFT - MARGIN_RIGHT;
  const double h = gtk_widget_get_height (GTK_WIDGET (self)) - MARGIN_TOP - MARGIN_BOTTOM;

  if (self->n_a == 0 || self->n_b == 0 || w <= 0 || h <= 0)
    return FALSE;
  g->cell = MIN (w / (double) self->n_b, h / (double) self->n_a);
  g->x = MARGIN_LEFT;
  g->y = MARGIN_TOP;
  return g->cell > 0;
}

static void
foreground (QvOverlapMap *self, GdkRGBA *rgba)
{
  /* gtk_widget_get_color is GTK 4.10: the style context's colour in 4.8. */
  gtk_style_context_get_color (gtk_widget_get_style_context (GTK_WIDGET (self)), rgba);
}

static void
make_image (QvOverlapMap *self)
{
  guchar *data;
  int stride;

  g_clear_pointer (&self->image, cairo_surface_destroy);
  if (self->n_a == 0 || self->n_b == 0 || self->n_a > 32767 || self->n_b > 32767)
    return;
  self->image = cairo_image_surface_create (CAIRO_FORMAT_RGB24, (int) self->n_b, (int) self->n_a);
  cairo_surface_flush (self->image);
  data = cairo_image_surface_get_data (self->image);
  stride = cairo_image_surface_get_stride (self->image);
  for (gsize i = 0; i < self->n_a; i++)
    {
      guint32 *row = (guint32 *) (data + (gsize) stride * i);
      for (gsize j = 0; j < self->n_b; j++)
        {
          float rgb[3];
          qv_style_ramp (CLAMP (self->matrix[i * self->n_b + j], 0.0, 1.0), rgb);
          row[j] = (guint32) lrintf (rgb[0] * 255.0f) << 16 | (guint32) lrintf (rgb[1] * 255.0f) << 8
                   | (guint32) lrintf (rgb[2] * 255.0f);
        }
    }
  cairo_surface_mark_dirty (self->image);
}

/* 1, 2, 5, 10, 20, 50 … modes between labels, at least @room pixels apart. */
static gsize
label_step (double cell, double room)
{
  static const gsize steps[] = { 1, 2, 5 };
  for (gsize scale = 1;; scale *= 10)
    for (gsize s = 0; s < G_N_ELEMENTS (steps); s++)
      if (steps[s] * scale * cell >= room || steps[s] * scale > 100000)
        return steps[s] * scale;
}

static void
text_at (cairo_t *cr, PangoLayout *layout, const char *text, double x, double y, double ax, double ay)
{
  int w, h;

  pango_layout_set_text (layout, text, -1);
  pango_layout_get_pixel_size (layout, &w, &h);
  cairo_move_to (cr, x - ax * w, y - ay * h);
  pango_cairo_show_layout (cr, layout);
}

static void
draw (GtkDrawingArea *area, cairo_t *cr, int width, int height, gpointer data)
{
  QvOverlapMap *self = QV_OVERLAP_MAP (area);
  g_autoptr(PangoLayout) layout = NULL;
  PangoFontDescription *font;
  GdkRGBA fg;
  Geometry g;
  gsize step;

  if (!geometry (self, &g) || self->image == NULL)
    return;
  foreground (self, &fg);
  layout = gtk_widget_create_pango_layout (GTK_WIDGET (self), NULL);
  font = pango_font_description_from_string ("Sans 8");
  pango_layout_set_font_description (layout, font);
  pango_font_description_free (font);

  /* The cells: one pixel each, scaled without smoothing. */
  cairo_save (cr);
  cairo_translate (cr, g.x, g.y);
  cairo_scale (cr, g.cell, g.cell);
  cairo_set_source_surface (cr, self->image, 0, 0);
  cairo_pattern_set_filter (cairo_get_source (cr), CAIRO_FILTER_NEAREST);
  cairo_rectangle (cr, 0, 0, (double) self->n_b, (double) self->n_a);
  cairo_fill (cr);
  cairo_restore (cr);

  /* The matching: each pair's cell outlined (a dot when cells are small). */
  gdk_cairo_set_source_rgba (cr, &fg);
  cairo_set_line_width (cr, MAX (1.0, MIN (2.0, g.cell / 8.0)));
  for (gsize i = 0; i < self->n_a; i++)
    {
      const gsize j = self->partner[i];
      if (j == QV_COMPARISON_NONE)
        continue;
      if (g.cell >= 5.0)
        cairo_rectangle (cr, g.x + g.cell * (double) j + 0.75, g.y + g.cell * (double) i + 0.75,
                         g.cell - 1.5, g.cell - 1.5);
      else
        cairo_rectangle (cr, g.x + g.cell * ((double) j + 0.5) - 0.75, g.y + g.cell * ((double) i + 0.5) - 0.75,
                         1.5, 1.5);
    }
  if (g.cell >= 5.0)
    cairo_stroke (cr);
  else
    cairo_fill (cr);

  /* The hovered cell. */
  if (self->hover_i >= 0 && self->hover_j >= 0)
    {
      cairo_set_line_width (cr, 1.0);
      cairo_rectangle (cr, g.x + g.cell * (double) self->hover_j - 1.5, g.y + g.cell * (double) self->hover_i - 1.5,
                       g.cell + 3.0, g.cell + 3.0);
      cairo_stroke (cr);
    }

  /* Mode numbers: B along the top, A down the left. */
  step = label_step (g.cell, 26.0);
  for (gsize j = step - 1; j < self->n_b; j += step)
    {
      g_autofree char *t = g_strdup_printf ("%zu", j + 1);
      text_at (cr, layout, t, g.x + g.cell * ((double) j + 0.5), g.y - 3.0, 0.5, 1.0);
    }
  step = label_step (g.cell, 14.0);
  for (gsize i = step - 1; i < self->n_a; i += step)
    {
      g_autofree char *t = g_strdup_printf ("%zu", i + 1);
      text_at (cr, layout, t, g.x - 4.0, g.y + g.cell * ((double) i + 0.5), 1.0, 0.5);
    }
  text_at (cr, layout, _("A ↓  B →"), 2.0, 2.0, 0.0, 0.0);

  /* The legend: the ramp from 0 (bottom) to 1 (top). */
  {
    const double lx = g.x + g.cell * (double) self->n_b + 12.0;
    const double lh = MIN (g.cell * (double) self->n_a, 240.0);
    for (int p = 0; p < (int) lh; p++)
      {
        float rgb[3];
        qv_style_ramp (1.0 - p / MAX (lh - 1.0, 1.0), rgb);
        cairo_set_source_rgb (cr, rgb[0], rgb[1], rgb[2]);
        cairo_rectangle (cr, lx, g.y + p, LEGEND_WIDTH, 1.0);
        cairo_fill (cr);
      }
    gdk_cairo_set_source_rgba (cr, &fg);
    text_at (cr, layout, "1", lx + LEGEND_WIDTH + 4.0, g.y, 0.0, 0.0);
    text_at (cr, layout, "0", lx + LEGEND_WIDTH + 4.0, g.y + lh, 0.0, 1.0);
  }
}

gboolean
qv_overlap_map_cell_at (QvOverlapMap *self, double x, double y, gsize *i, gsize *j)
{
  Geometry g;
  double ci, cj;

  if (!geometry (self, &g))
    return FALSE;
  cj = floor ((x - g.x) / g.cell);
  ci = floor ((y - g.y) / g.cell);
  if (ci < 0 || cj < 0 || ci >= (double) self->n_a || cj >= (double) self->n_b)
    return FALSE;
  *i = (gsize) ci;
  *j = (gsize) cj;
  return TRUE;
}

char *
qv_overlap_map_hover (QvOverlapMap *self, double x, double y)
{
  gsize i, j;
  char *text = NULL;
  const gboolean inside = qv_overlap_map_cell_at (self, x, y, &i, &j);

  if (inside)
    {
      const double o = self->matrix[i * self->n_b + j];
      /* TRANSLATORS: the heat map's read-out: mode of A, mode of B, their overlap */
      text = g_strdup_printf (_("A %zu · %.1f cm⁻¹   B %zu · %.1f cm⁻¹   overlap %.3f%s"),
                              i + 1, self->wavenumber_a[i], j + 1, self->wavenumber_b[j], o,
                              self->partner[i] == j ? _(" · matched") : "");
    }
  if ((inside ? (gssize) i : -1) != self->hover_i || (inside ? (gssize) j : -1) != self->hover_j)
    {
      self->hover_i = inside ? (gssize) i : -1;
      self->hover_j = inside ? (gssize) j : -1;
      gtk_widget_queue_draw (GTK_WIDGET (self));
      g_signal_emit (self, signals[READOUT_CHANGED], 0, text);
    }
  return text;
}

static void
motion (GtkEventControllerMotion *controller, double x, double y, gpointer data)
{
  g_free (qv_overlap_map_hover (QV_OVERLAP_MAP (data), x, y));
}

static void
leave (GtkEventControllerMotion *controller, gpointer data)
{
  g_free (qv_overlap_map_hover (QV_OVERLAP_MAP (data), -1.0, -1.0));
}

void
qv_overlap_map_set_comparison (QvOverlapMap *self, const QvModeComparison *c)
{
  g_clear_pointer (&self->matrix, g_free);
  g_clear_pointer (&self->partner, g_free);
  g_clear_pointer (&self->wavenumber_a, g_free);
  g_clear_pointer (&self->wavenumber_b, g_free);
  self->n_a = self->n_b = 0;
  self->hover_i = self->hover_j = -1;
  if (c)
    {
      self->n_a = qv_mode_comparison_n_modes_a (c);
      self->n_b = qv_mode_comparison_n_modes_b (c);
      self->matrix = g_memdup2 (qv_mode_comparison_overlaps (c), self->n_a * self->n_b * sizeof (double));
      self->partner = g_new (gsize, MAX (self->n_a, 1));
      self->wavenumber_a = g_new (double, MAX (self->n_a, 1));
      self->wavenumber_b = g_new (double, MAX (self->n_b, 1));
      for (gsize i = 0; i < self->n_a; i++)
        {
          self->partner[i] = qv_mode_comparison_partner_of_a (c, i);
          self->wavenumber_a[i] = qv_mode_comparison_wavenumber_a (c, i);
        }
      for (gsize j = 0; j < self->n_b; j++)
        self->wavenumber_b[j] = qv_mode_comparison_wavenumber_b (c, j);
    }
  make_image (self);
  gtk_widget_queue_draw (GTK_WIDGET (self));
}

const double *
qv_overlap_map_get_matrix (QvOverlapMap *self, gsize *n_a, gsize *n_b)
{
  *n_a = self->n_a;
  *n_b = self->n_b;
  return self->matrix;
}

gsize
qv_overlap_map_get_partner (QvOverlapMap *self, gsize i)
{
  return i < self->n_a ? self->partner[i] : QV_COMPARISON_NONE;
}

GtkWidget *
qv_overlap_map_new (void)
{
  return g_object_new (QV_TYPE_OVERLAP_MAP, NULL);
}

static void
qv_overlap_map_finalize (GObject *object)
{
  QvOverlapMap *self = QV_OVERLAP_MAP (object);

  g_free (self->matrix);
  g_free (self->partner);
  g_free (self->wavenumber_a);
  g_free (self->wavenumber_b);
  g_clear_pointer (&self->image, cairo_surface_destroy);
  G_OBJECT_CLASS (qv_overlap_map_parent_class)->finalize (object);
}

static void
qv_overlap_map_class_init (QvOverlapMapClass *klass)
{
  G_OBJECT_CLASS (klass)->finalize = qv_overlap_map_finalize;
  /* The read-out under the pointer changed (NULL: outside the matrix). */
  signals[READOUT_CHANGED] = g_signal_new ("readout-changed", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST,
                                           0, NULL, NULL, NULL, G_TYPE_NONE, 1, G_TYPE_STRING);
  gtk_widget_class_set_css_name (GTK_WIDGET_CLASS (klass), "qvoverlapmap");
}

static void
qv_overlap_map_init (QvOverlapMap *self)
{
  GtkEventController *m = gtk_event_controller_motion_new ();

  self->hover_i = self->hover_j = -1;
  gtk_drawing_area_set_draw_func (GTK_DRAWING_AREA (self), draw, NULL, NULL);
  gtk_drawing_area_set_content_width (GTK_DRAWING_AREA (self), 420);
  gtk_drawing_area_set_content_height (GTK_DRAWING_AREA (self), 420);
  g_signal_connect (m, "motion", G_CALLBACK (motion), self);
  g_signal_connect (m, "leave", G_CALLBACK (leave), self);
  gtk_widget_add_controller (GTK_WIDGET (self), m);
}
