/* qv-export-pane-private.h — what the export pane's sections share: the
 * window's current document, mode, level and amplitude, and copies of the
 * document's data that a worker thread can keep while the window moves on.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include "qv-manifest.h"
#include "qv-progress.h"
#include "qv-window.h"

G_BEGIN_DECLS

/* What the main window shows, as the sections need it. */
typedef struct {
  QvWindow *window;            /* the pane's window, or NULL */
  QvDocument *document;        /* NULL: nothing open */
  int mode;                    /* the selected mode, 0-based, −1 for none */
  guint level;                 /* v of the list's turning points */
  double multiple;             /* the motion bar's amplitude, × turning point */
  int lattice_q;               /* a crystal's lattice mode on the Lattice page: */
  int lattice_branch;          /*   path point and branch, −1 for none */
} QvExportContext;

/* A deep copy of @modes (the document frees its own on a mass re-solve). */
QvModeSet *qv_export_pane_copy_modes (const QvModeSet *modes);
/* A manifest for @command with the inputs of @source hashed (geometry,
 * bundle, Hessian; the demo from its resource; NULL: none, a document
 * built in memory) and the argument "(app)". Reads files: call it on the
 * worker. */
QvManifest *qv_export_pane_manifest (const QvDocumentSource *source, const char *command, GError **error);
/* "mode 7 (1234.5 cm⁻¹)" for headings and file names' sake, translated. */
char *qv_export_pane_mode_title (const QvModeSet *modes, gsize k);
/* What a structure export's worker needs, copied from the document: its
 * structure, modes and source outlive any change the window makes. */
typedef struct {
  QvStructure *structure;
  QvModeSet *modes;
  QvDocumentSource *source;    /* may be NULL */
} QvExportInputs;

QvExportInputs *qv_export_inputs_new (QvDocument *document);
void qv_export_inputs_free (QvExportInputs *inputs);
/* The job of a structure export (a QvExportJobFunc, see qv-export-writer.h):
 * @job is a QvExportPlanJob. */
typedef struct _QvExport QvExport;
typedef QvExport *(*QvExportPlanFunc) (const QvExportInputs *inputs, gconstpointer options,
                                       QvManifest *manifest, GError **error);
typedef struct {
  QvExportInputs *inputs;
  const char *command;         /* static */
  QvExportPlanFunc plan;
  gpointer options;            /* g_free'd */
} QvExportPlanJob;

gboolean qv_export_plan_job_run (gpointer job, const char *directory, gboolean force,
                                 const QvProgress *progress, GPtrArray *written, GError **error);
void qv_export_plan_job_free (gpointer job);
/* Writes @plan (qv_export_write) and adds the names of the files it wrote,
 * also after a failure, to @written. */
gboolean qv_export_pane_write (QvExport *plan, const char *directory, gboolean force,
                               const QvProgress *progress, GPtrArray *written, GError **error);
/* "11 structures in 11 files: mode7-scan-00.xyz … mode7-scan-10.xyz +
 * manifest.json", translated. */
char *qv_export_pane_files_text (const QvExport *plan);

/* Shows @message under an option group: red for an error, dim otherwise;
 * NULL or "" hides the label. */
void qv_export_pane_set_message (GtkLabel *label, const char *message, gboolean error);

G_END_DECLS
