/* qv-mode-item.h — one row of the mode list: the numbers the core gives for
 * mode k at the chosen level v.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib-object.h>
#include "qv-document.h"
#include "qv-units.h"

G_BEGIN_DECLS

#define QV_TYPE_MODE_ITEM (qv_mode_item_get_type ())
G_DECLARE_FINAL_TYPE (QvModeItem, qv_mode_item, QV, MODE_ITEM, GObject)

/* Mode @index from its row (copied: under 100 bytes, O(1), cheap enough to make
 * on demand for thousands of modes). */
QvModeItem *qv_mode_item_new (const QvModeRow *row, guint index, guint level);
/* The turning point for level @v, O(1) (notifies "turning-q" and
 * "max-displacement"). */
void qv_mode_item_set_level (QvModeItem *item, guint v);

guint qv_mode_item_get_index (QvModeItem *item);
double qv_mode_item_get_wavenumber (QvModeItem *item);     /* cm⁻¹, signed */
double qv_mode_item_get_reduced_mass (QvModeItem *item);   /* u */
/* NAN when the mode has no turning point (imaginary, zero). */
double qv_mode_item_get_turning_q (QvModeItem *item);      /* u^½ Å */
double qv_mode_item_get_max_displacement (QvModeItem *item); /* Å */
gboolean qv_mode_item_get_imaginary (QvModeItem *item);
/* The species ("A1", "?" when broken, "" without a point group); property
 * "symmetry-order" sorts by it. */
const char *qv_mode_item_get_symmetry (QvModeItem *item);

/* The wavenumber column's text: "1234.5", "123.4i" for imaginary modes,
 * in @unit. */
char *qv_mode_item_format_wavenumber (QvModeItem *item, QvFrequencyUnit unit);

G_END_DECLS
