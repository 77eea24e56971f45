/* qv-window.h — the main window: a 3D view of the selected mode, the mode
 * list and its detail, and the work that loads and solves documents.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-compare-window.h"
#include "qv-document.h"
#include "qv-mode-panel.h"
#include "qv-mode-view.h"
#include "qv-lattice-pane.h"
#include "qv-motion-bar.h"
#include "qv-mode-detail.h"
#include "qv-spectrum-view.h"
#include "qv-thermo-panel.h"

G_BEGIN_DECLS

#define QV_TYPE_WINDOW (qv_window_get_type ())
G_DECLARE_FINAL_TYPE (QvWindow, qv_window, QV, WINDOW, GtkApplicationWindow)

QvWindow *qv_window_new (GtkApplication *app);

/* Opening. Each replaces the current document only when the new one has
 * loaded and solved; a failure shows a dialog and keeps what was shown. */
void qv_window_open_demo (QvWindow *self);
/* A bundle opens at once; a geometry first asks for its Hessian. */
void qv_window_open_file (QvWindow *self, GFile *file);
void qv_window_open_source (QvWindow *self, const QvDocumentSource *source);
/* The file chooser. */
void qv_window_choose_file (QvWindow *self);
/* "Compare With…": a bundle chosen, then a compare window for it. */
void qv_window_choose_compare (QvWindow *self);
/* A compare window of the document's modes against those of @path (a
 * bundle), presented; for tests and the chooser. */
QvCompareWindow *qv_window_compare_with (QvWindow *self, const char *path);
/* Shows @doc (for tests and benchmarks that build one in memory). */
void qv_window_set_document (QvWindow *self, QvDocument *doc);

/* Masses: re-solves on a worker with @structure's masses (taken). */
void qv_window_solve_masses (QvWindow *self, QvStructure *structure);
void qv_window_set_atom_isotope (QvWindow *self, gsize atom, guint mass_number);
void qv_window_set_atom_mass (QvWindow *self, gsize atom, double mass);
void qv_window_reset_masses (QvWindow *self);

/* A load or solve is running. */
gboolean qv_window_is_busy (QvWindow *self);
/* Abandons the running job at once; the document stays as it was. */
void qv_window_cancel (QvWindow *self);

QvDocument *qv_window_get_document (QvWindow *self);
QvModePanel *qv_window_get_mode_panel (QvWindow *self);
QvModeView *qv_window_get_mode_view (QvWindow *self);
QvMotionBar *qv_window_get_motion_bar (QvWindow *self);
QvModeDetail *qv_window_get_mode_detail (QvWindow *self);
/* The spectrum pane under the view and its revealer (win.toggle-spectrum). */
QvSpectrumView *qv_window_get_spectrum_view (QvWindow *self);
/* A crystal's lattice plots, and the side panel's page shown: "lattice"
 * or "modes" (the supercell's own list); set it with
 * qv_window_show_side_page. */
QvLatticePane *qv_window_get_lattice_pane (QvWindow *self);
const char *qv_window_get_side_page (QvWindow *self);
void qv_window_show_side_page (QvWindow *self, const char *name);
gboolean qv_window_get_side_switcher_visible (QvWindow *self);
/* A molecule's Thermochemistry page ("thermo"; hidden for crystals, whose
 * thermal properties are on the lattice page). */
QvThermoPanel *qv_window_get_thermo_panel (QvWindow *self);
GtkRevealer *qv_window_get_spectrum_revealer (QvWindow *self);
/* The error dialog on screen, or NULL. */
GtkWindow *qv_window_get_error_dialog (QvWindow *self);

/* Steps the selection (win.next-mode / win.previous-mode). */
void qv_window_step_mode (QvWindow *self, int delta);
/* The view along an axis, reset, the export pane. */
void qv_window_view_along (QvWindow *self, int axis);
void qv_window_reset_view (QvWindow *self);
/* Shows what the user should know about @error over the window. */
void qv_window_show_error (QvWindow *self, const char *primary, const GError *error);
/* Pops up the atom's details and mass editor at view pixel (x, y). */
void qv_window_show_atom (QvWindow *self, gsize atom, double x, double y);

G_END_DECLS
