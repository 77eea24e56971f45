/* qv-atom-popover.h — a clicked atom: element, index, mass, its share of the
 * selected mode and its displacement, and the mass editor (an isotope from
 * the table, or a typed mass).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-document.h"

G_BEGIN_DECLS

#define QV_TYPE_ATOM_POPOVER (qv_atom_popover_get_type ())
G_DECLARE_FINAL_TYPE (QvAtomPopover, qv_atom_popover, QV, ATOM_POPOVER, GtkPopover)

QvAtomPopover *qv_atom_popover_new (void);
/* Fills in atom @atom of @doc for mode @k (−1: none) shown at Q = @amplitude. */
void qv_atom_popover_show_atom (QvAtomPopover *self, QvDocument *doc, gsize atom, int k,
                                double amplitude);
/* The facts shown, for tests. */
const char *qv_atom_popover_get_summary (QvAtomPopover *self);

/* Signal "mass-chosen" (guint atom, guint mass_number, double mass): an
 * isotope (mass_number > 0) or a typed mass (mass_number 0). */

G_END_DECLS
