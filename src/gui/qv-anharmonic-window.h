/* qv-anharmonic-window.h — the vibrational levels on the potential of a
 * scan along a mode (or a two-mode grid) that `quaver displace` wrote, from
 * the energies that came back: read, fitted and solved on a worker by the
 * same calls as `quaver anharmonic` (qv-scan-energies.h,
 * qv-scan-potential.h, qv-scan-levels-table.h); shown as the plot of V(Q)
 * with the harmonic parabola, the levels and the wavefunctions
 * (qv-potential-plot.h), the level table, the summary and the core's
 * warnings; saved as the command writes it or as the plot.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-scan-energies.h"
#include "qv-scan-levels-table.h"

G_BEGIN_DECLS

#define QV_TYPE_ANHARMONIC_WINDOW (qv_anharmonic_window_get_type ())
G_DECLARE_FINAL_TYPE (QvAnharmonicWindow, qv_anharmonic_window, QV, ANHARMONIC_WINDOW, GtkWindow)

/* Table columns (qv_anharmonic_window_get_cell). */
enum {
  QV_ANHARMONIC_COLUMN_V,
  QV_ANHARMONIC_COLUMN_ENERGY,       /* cm⁻¹ above the minimum of V */
  QV_ANHARMONIC_COLUMN_SPACING,      /* E_v − E_0, cm⁻¹ */
  QV_ANHARMONIC_COLUMN_MEAN,         /* ⟨Q⟩ (⟨Q1⟩, ⟨Q2⟩ on a grid) */
  QV_ANHARMONIC_COLUMN_TURNING,      /* outer classical turning points */
  QV_ANHARMONIC_COLUMN_EDGE,         /* weight near the grid's edge */
  QV_ANHARMONIC_COLUMN_FLAGS,
  QV_ANHARMONIC_N_COLUMNS
};

/* An empty window beside @parent (may be NULL). */
QvAnharmonicWindow *qv_anharmonic_window_new (GtkWindow *parent);
/* Reads the scan of @manifest (manifest.json or its folder) with the
 * energies @options name, fits V(Q) and solves, on a worker; the window
 * shows a spinner, then the levels, or the error (on its page and in a
 * dialog). Replaces an earlier scan. */
void qv_anharmonic_window_load (QvAnharmonicWindow *self, const char *manifest,
                                const QvScanEnergiesOptions *options);
/* The fit of V(Q): a spline, or a polynomial of @degree (0: the default
 * for the points); re-solves the scan shown on a worker when it changes.
 * The controls in the window call this. */
void qv_anharmonic_window_set_fit (QvAnharmonicWindow *self, QvScanFit fit, guint degree);

/* Reading or solving. */
gboolean qv_anharmonic_window_is_busy (QvAnharmonicWindow *self);
/* The report shown (its potential, levels, warnings), or NULL. */
const QvScanLevelsReport *qv_anharmonic_window_get_report (QvAnharmonicWindow *self);
/* Why the last load or solve failed, or NULL; the error dialog on screen
 * or NULL. */
const char *qv_anharmonic_window_get_error (QvAnharmonicWindow *self);
GtkWindow *qv_anharmonic_window_get_error_dialog (QvAnharmonicWindow *self);
/* The text of the level table's cell for level @v, or NULL. */
const char *qv_anharmonic_window_get_cell (QvAnharmonicWindow *self, guint v, guint column);
/* The summary under the table, the banners' texts (warnings then notes,
 * joined by newlines) and the plot's read-out. */
const char *qv_anharmonic_window_get_summary (QvAnharmonicWindow *self);
char *qv_anharmonic_window_get_banners (QvAnharmonicWindow *self);
const char *qv_anharmonic_window_get_readout (QvAnharmonicWindow *self);
/* The pointer at (@x, @y) of the plot (widget pixels), as a motion event. */
void qv_anharmonic_window_hover (QvAnharmonicWindow *self, double x, double y);
GtkWidget *qv_anharmonic_window_get_plot (QvAnharmonicWindow *self);

/* Writes the table (.txt, .csv, .json: as `quaver anharmonic -f
 * text|csv|json` writes it) or the plot (.png, .svg) atomically; an
 * existing file only with @force. */
gboolean qv_anharmonic_window_save (QvAnharmonicWindow *self, const char *path, gboolean force,
                                    GError **error);

G_END_DECLS
