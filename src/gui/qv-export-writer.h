/* qv-export-writer.h — the bottom of an export section: "Write…" asks for
 * a folder (and before writing into a non-empty one), runs the section's
 * job on a worker thread with a progress bar and Cancel, then lists the
 * files written with a button that opens the folder.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-progress.h"

G_BEGIN_DECLS

#define QV_TYPE_EXPORT_WRITER (qv_export_writer_get_type ())
G_DECLARE_FINAL_TYPE (QvExportWriter, qv_export_writer, QV, EXPORT_WRITER, GtkWidget)

/* Runs on the worker: writes into @directory (new or empty, or any with
 * @force), appends the names written to @written (char*, g_free'd) even
 * when it fails, reports through @progress (which cancels). */
typedef gboolean (*QvExportJobFunc) (gpointer job, const char *directory, gboolean force,
                                     const QvProgress *progress, GPtrArray *written,
                                     GError **error);

/* Called on the main thread when the user has chosen a folder: makes the
 * job (its data must not point into the document, which may change while
 * the job runs). NULL with @error when the options do not make an export. */
typedef gpointer (*QvExportPrepareFunc) (gpointer user_data, QvExportJobFunc *func,
                                         GDestroyNotify *free_job, GError **error);

void qv_export_writer_set_prepare (QvExportWriter *self, QvExportPrepareFunc prepare,
                                   gpointer user_data);
/* The folder chooser's title. */
void qv_export_writer_set_title (QvExportWriter *self, const char *title);
/* Whether "Write…" can be pressed (the section's options are valid). */
void qv_export_writer_set_ready (QvExportWriter *self, gboolean ready);

/* What "Write…" does after the chooser (and the question about a non-empty
 * folder); for tests. Does nothing while a job runs. */
void qv_export_writer_write_to (QvExportWriter *self, const char *directory, gboolean force);
gboolean qv_export_writer_is_busy (QvExportWriter *self);
/* Asks the running job to stop at its next file. */
void qv_export_writer_cancel (QvExportWriter *self);
/* Of the last job: the folder, the names written (NULL-terminated; empty
 * before any), and its error (NULL when it succeeded or none ran). */
const char *qv_export_writer_get_directory (QvExportWriter *self);
const char *const *qv_export_writer_get_written (QvExportWriter *self);
const GError *qv_export_writer_get_error (QvExportWriter *self);

G_END_DECLS
