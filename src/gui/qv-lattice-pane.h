/* qv-lattice-pane.h — a crystal document's lattice plots beside the view:
 * the dispersion (hover read-out, click or arrow keys to choose a lattice
 * mode), the density of states and the thermal properties, each saved as
 * a table or a figure. The numbers are the document's (computed by the
 * core on the loading worker); the pane only draws them.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-document.h"

G_BEGIN_DECLS

#define QV_TYPE_LATTICE_PANE (qv_lattice_pane_get_type ())
G_DECLARE_FINAL_TYPE (QvLatticePane, qv_lattice_pane, QV, LATTICE_PANE, GtkWidget)

/* Pixels within which a click or hover finds a point of a branch. */
#define QV_LATTICE_PANE_HIT_TOLERANCE 10.0

/* Shows @doc's lattice (nothing for a document without one). */
void qv_lattice_pane_set_document (QvLatticePane *self, QvDocument *doc);
/* The lattice mode shown: q point @q_index of the path and branch @branch
 * (connected order), or −1 for none. Emits nothing. */
/* The header: formula, space group, cells, notes. */
const char *qv_lattice_pane_get_info (QvLatticePane *self);
void qv_lattice_pane_set_selected (QvLatticePane *self, int q_index, int branch);
void qv_lattice_pane_get_selected (QvLatticePane *self, int *q_index, int *branch);
/* Cells along each lattice vector the view replicates ("cells" property). */
int qv_lattice_pane_get_cells (QvLatticePane *self);
/* What a point of the plot shown says: the dispersion's nearest branch
 * point, the DOS or thermal curves' values at that abscissa; "" off the
 * plot. For tests, and the read-out under the plot. */
char *qv_lattice_pane_describe_point (QvLatticePane *self, double x, double y);
/* A click at widget point (x, y) of the dispersion: selects and emits
 * "mode-activated" (int q_index, int branch) when it hits a branch.
 * Returns whether it did. */
gboolean qv_lattice_pane_click (QvLatticePane *self, double x, double y);
/* Shows "dispersion", "dos" or "thermal". */
void qv_lattice_pane_show_plot (QvLatticePane *self, const char *name);
/* Writes the plot shown to @path: .csv/.json/.txt a table, .png/.svg a
 * figure (atomic; refuses an existing file unless @force). */
gboolean qv_lattice_pane_save (QvLatticePane *self, const char *path, gboolean force,
                               GError **error);
/* The dispersion's drawing area, for tests that point into it. */
GtkWidget *qv_lattice_pane_get_dispersion_area (QvLatticePane *self);

G_END_DECLS
