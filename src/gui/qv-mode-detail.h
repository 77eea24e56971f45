/* qv-mode-detail.h — the selected mode in words: the atoms that move most,
 * collectivity, rigid-body contamination, its species and make-up.
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
/* Families shown in the make-up (qv_mode_character_summary), and single
 * coordinates listed under it. */
#define QV_MODE_DETAIL_MAX_FAMILIES 3
#define QV_MODE_DETAIL_MAX_COORDINATES 3

/* The text of the heading, the species line, the make-up line and the
 * rigid-body line, for tests. */
const char *qv_mode_detail_get_heading (QvModeDetail *self);
const char *qv_mode_detail_get_symmetry (QvModeDetail *self);
const char *qv_mode_detail_get_character (QvModeDetail *self);
const char *qv_mode_detail_get_mixing (QvModeDetail *self);

G_END_DECLS
