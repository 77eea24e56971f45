/* qv-spectrum-view.h — the document's IR or Raman spectrum, drawn by the
 * renderer's plot (qv-spectrum-plot.h) from the core's intensities; a click
 * on a peak asks for its mode, the selected mode is marked.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-document.h"
#include "qv-spectrum-plot.h"

G_BEGIN_DECLS

#define QV_TYPE_SPECTRUM_VIEW (qv_spectrum_view_get_type ())
G_DECLARE_FINAL_TYPE (QvSpectrumView, qv_spectrum_view, QV, SPECTRUM_VIEW, GtkWidget)

typedef enum {
  QV_SPECTRUM_KIND_IR,               /* km/mol */
  QV_SPECTRUM_KIND_RAMAN_ACTIVITY,   /* Å⁴/u */
  QV_SPECTRUM_KIND_RAMAN_INTENSITY,  /* 10⁻³⁰ cm²/sr at 532 nm, 298.15 K */
} QvSpectrumKind;

/* Peaks within this many pixels of a click select their mode. */
#define QV_SPECTRUM_VIEW_HIT_TOLERANCE 8.0

/* Shows @doc's spectrum, or says calmly that it has none (NULL clears). */
void qv_spectrum_view_set_document (QvSpectrumView *self, QvDocument *doc);
/* The mode drawn highlighted (−1: none). */
void qv_spectrum_view_set_selected (QvSpectrumView *self, int mode);
/* TRUE when the document has tensors and a plot is shown. */
gboolean qv_spectrum_view_has_spectrum (QvSpectrumView *self);

/* Kind (one the document has), line width (FWHM, cm⁻¹) and shape. FALSE
 * for a kind the document's tensors cannot give. */
gboolean qv_spectrum_view_set_kind (QvSpectrumView *self, QvSpectrumKind kind);
void qv_spectrum_view_set_width (QvSpectrumView *self, double fwhm);
void qv_spectrum_view_set_shape (QvSpectrumView *self, QvLineShape shape);

/* What is drawn, for tests: the spectrum (NULL without one) and the
 * plot's options at the widget's present size. */
const QvSpectrum *qv_spectrum_view_get_spectrum (QvSpectrumView *self);
void qv_spectrum_view_get_plot_options (QvSpectrumView *self, QvSpectrumPlotOptions *options);
/* What a click at pixel (@x, @y) of the plot does: the hit mode (−1 for
 * none), after emitting ::mode-activated for it. */
int qv_spectrum_view_click (QvSpectrumView *self, double x, double y);
/* Writes the spectrum as shown to @path, the format from its extension:
 * .csv (the envelope on its grid, src/io/qv-spectrum-table.h), .png or .svg
 * (the plot at the pane's size, src/render/qv-spectrum-plot.h); atomically,
 * replacing a file only with @force. */
gboolean qv_spectrum_view_save (QvSpectrumView *self, const char *path, gboolean force,
                                GError **error);

G_END_DECLS
