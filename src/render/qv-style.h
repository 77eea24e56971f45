/* qv-style.h — Quaver's own look: element colours and display radii (one
 * table in data/element-style.txt, compiled into a GResource), background
 * themes, the accent colour of arrows and the participation ramp.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

typedef enum {
  QV_BACKGROUND_LIGHT,
  QV_BACKGROUND_DARK,
} QvBackground;

typedef struct {
  float rgb[3];           /* sRGB-encoded 0..1, as written in the table */
  float radius;           /* Å, drawn sphere radius in ball-and-stick */
} QvElementStyle;

/* Style of element @z (1..118); unknown elements get a neutral grey. */
const QvElementStyle *qv_style_element (guint z);
/* Background colours are sRGB-encoded 0..1 like every colour here. */
void qv_style_background (QvBackground background, float rgba[4]);
/* Colour of displacement arrows on @background. */
void qv_style_arrow (QvBackground background, float rgb[3]);
/* Colour of cell edges and labels on @background. */
void qv_style_foreground (QvBackground background, float rgb[3]);
/* Perceptually uniform ramp (evenly spaced in OKLab lightness) for t in
 * [0, 1]: low participation calm, high participation saturated. */
void qv_style_ramp (double t, float rgb[3]);

G_END_DECLS
