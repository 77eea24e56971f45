/* qv-labels.c — the glyph atlas for atom labels, drawn with pangocairo.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <pango/pangocairo.h>
#include <string.h>
#include "qv-renderer-private.h"

#define CELL_HEIGHT 40        /* pixels: one label height */
#define FONT_PX 26
#define PAD 5                 /* halo room on each side */
#define COLUMNS 16

static const char glyph_set[] =
  "0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz";

QvLabelAtlas *
qv_label_atlas_new (void)
{
  QvLabelAtlas *atlas = g_new0 (QvLabelAtlas, 1);
  const int n = (int) strlen (glyph_set);
  int cell_w, rows, stride;
  cairo_surface_t *fill, *halo;
  PangoFontDescription *font;
  PangoLayout *layout;
  cairo_t *cf, *ch;
  int advances[128] = { 0 };
  int max_adv = 0;

  /* Measure first: every cell as wide as the widest glyph. */
  fill = cairo_image_surface_create (CAIRO_FORMAT_A8, 1, 1);
  cf = cairo_create (fill);
  layout = pango_cairo_create_layout (cf);
  font = pango_font_description_from_string ("Sans Bold");
  pango_font_description_set_absolute_size (font, FONT_PX * PANGO_SCALE);
  pango_layout_set_font_description (layout, font);
  for (int i = 0; i < n; i++)
    {
      PangoRectangle logical;
      pango_layout_set_text (layout, glyph_set + i, 1);
      pango_layout_get_pixel_extents (layout, NULL, &logical);
      advances[(int) glyph_set[i]] = logical.width;
      max_adv = MAX (max_adv, logical.width);
    }
  g_object_unref (layout);
  cairo_destroy (cf);
  cairo_surface_destroy (fill);

  cell_w = max_adv + 2 * PAD;
  rows = (n + COLUMNS - 1) / COLUMNS;
  atlas->width = cell_w * COLUMNS;
  atlas->height = CELL_HEIGHT * rows;
  fill = cairo_image_surface_create (CAIRO_FORMAT_A8, atlas->width, atlas->height);
  halo = cairo_image_surface_create (CAIRO_FORMAT_A8, atlas->width, atlas->height);
  cf = cairo_create (fill);
  ch = cairo_create (halo);
  layout = pango_cairo_create_layout (cf);
  pango_layout_set_font_description (layout, font);
  cairo_set_line_width (ch, 5.0);
  cairo_set_line_join (ch, CAIRO_LINE_JOIN_ROUND);
  for (int i = 0; i < n; i++)
    {
      int c = (int) glyph_set[i];
      int x = (i % COLUMNS) * cell_w, y = (i / COLUMNS) * CELL_HEIGHT;
      PangoRectangle logical;
      QvGlyph *g = &atlas->glyphs[c];

      pango_layout_set_text (layout, glyph_set + i, 1);
      pango_layout_get_pixel_extents (layout, NULL, &logical);
      /* Centred vertically in the cell. */
      double oy = y + (CELL_HEIGHT - logical.height) / 2.0;
      cairo_move_to (cf, x + PAD, oy);
      pango_cairo_show_layout (cf, layout);
      cairo_move_to (ch, x + PAD, oy);
      pango_cairo_layout_path (ch, layout);
      cairo_stroke_preserve (ch);
      cairo_fill (ch);
      g->present = TRUE;
      g->advance = (float) advances[c] / CELL_HEIGHT;
      g->pad = (float) PAD / CELL_HEIGHT;
      g->uv[0] = (float) x / atlas->width;
      g->uv[1] = (float) y / atlas->height;
      g->uv[2] = (float) (x + advances[c] + 2 * PAD) / atlas->width;
      g->uv[3] = (float) (y + CELL_HEIGHT) / atlas->height;
    }
  g_object_unref (layout);
  pango_font_description_free (font);
  cairo_destroy (cf);
  cairo_destroy (ch);
  cairo_surface_flush (fill);
  cairo_surface_flush (halo);

  atlas->rg = g_malloc ((gsize) atlas->width * atlas->height * 2);
  {
    const guint8 *f = cairo_image_surface_get_data (fill);
    const guint8 *h = cairo_image_surface_get_data (halo);
    int fs = cairo_image_surface_get_stride (fill), hs = cairo_image_surface_get_stride (halo);
    stride = atlas->width * 2;
    for (int y = 0; y < atlas->height; y++)
      for (int x = 0; x < atlas->width; x++)
        {
          atlas->rg[y * stride + 2 * x] = f[y * fs + x];
          atlas->rg[y * stride + 2 * x + 1] = h[y * hs + x];
        }
  }
  cairo_surface_destroy (fill);
  cairo_surface_destroy (halo);
  return atlas;
}

void
qv_label_atlas_free (QvLabelAtlas *atlas)
{
  if (atlas == NULL)
    return;
  g_free (atlas->rg);
  g_free (atlas);
}
