/* qv-export-pane-private.h — what the export pane's sections share: the
 * window's current document, mode, level and amplitude, and copies of the
 * document's data that a worker thread can keep while the window moves on.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include "qv-manifest.h"
#include "qv-window.h"

G_BEGIN_DECLS

/* What the main window shows, as the sections need it. */
typedef struct {
  QvWindow *window;            /* the pane's window, or NULL */
  QvDocument *document;        /* NULL: nothing open */
  int mode;                    /* the selected mode, 0-based, −1 for none */
  guint level;                 /* v of the list's turning points */
  double multiple;             /* the motion bar's amplitude, × turning point */
} QvExportContext;

/* A deep copy of @modes (the document frees its own on a mass re-solve). */
QvModeSet *qv_export_pane_copy_modes (const QvModeSet *modes);
/* A manifest for @command with the document's inputs hashed (geometry,
 * bundle, Hessian; the demo from its resource) and the argument "(app)". */
QvManifest *qv_export_pane_manifest (QvDocument *document, const char *command, GError **error);
/* "mode 7 (1234.5 cm⁻¹)" for headings and file names' sake, translated. */
char *qv_export_pane_mode_title (const QvModeSet *modes, gsize k);
/* Shows @message under an option group: red for an error, dim otherwise;
 * NULL or "" hides the label. */
void qv_export_pane_set_message (GtkLabel *label, const char *message, gboolean error);

G_END_DECLS
