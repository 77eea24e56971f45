/* qv-style-private.h — colour-space helpers of qv-style.c, for tests.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* sRGB (encoded, 0..1) ↔ OKLab (L, a, b). */
void qv_style_srgb_to_oklab (const double rgb[3], double lab[3]);
/* FALSE when the colour falls outside the sRGB gamut (then clamped). */
gboolean qv_style_oklab_to_srgb (const double lab[3], double rgb[3]);
/* Number of elements the style table defines (118 when it is complete). */
guint qv_style_table_size (void);

G_END_DECLS
