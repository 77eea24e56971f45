/* qv-mode-list.h — the mode list's model: a GListModel of QvModeItem over a
 * document's rows, each item made when it is first asked for, so showing
 * thousands of modes makes only the rows on screen.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gio/gio.h>
#include "qv-document.h"
#include "qv-units.h"

G_BEGIN_DECLS

#define QV_TYPE_MODE_LIST (qv_mode_list_get_type ())
G_DECLARE_FINAL_TYPE (QvModeList, qv_mode_list, QV, MODE_LIST, GObject)

QvModeList *qv_mode_list_new (void);
/* One item per mode of @doc (NULL: none) at level @level; emits
 * items-changed for the whole list. */
void qv_mode_list_set_document (QvModeList *self, QvDocument *doc, guint level);
/* Moves the items made so far to level @v (they notify); later ones are
 * made at @v. */
void qv_mode_list_set_level (QvModeList *self, guint v);
/* Makes every item made so far notify @property (its text changed). */
void qv_mode_list_notify_all (QvModeList *self, const char *property);
/* Items made so far (for the benchmark and tests). */
guint qv_mode_list_get_n_made (QvModeList *self);

G_END_DECLS
