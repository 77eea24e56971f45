/* qv-mode-detail.h — the selected mode in words: the atoms that move most,
 * collectivity, rigid-body contamination.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-document.h"

G_BEGIN_DECLS

#define QV_TYPE_MODE_DETAIL (qv_mode_detail_get_type ())
G_DECLARE_FINAL_TYPE (QvModeDetail, qv_mode_detail, QV, MODE_DETAIL, GtkWidget)

/* Atoms listed at most. */
#define QV_MODE_DETAIL_MAX_ATOMS 5

/* Shows mode @k of @doc (−1 or NULL: nothing selected). */
void qv_mode_detail_show (QvModeDetail *self, QvDocument *doc, int k);
/* The text of the heading and of the rigid-body line, for tests. */
const char *qv_mode_detail_get_heading (QvModeDetail *self);
const char *qv_mode_detail_get_mixing (QvModeDetail *self);

G_END_DECLS
