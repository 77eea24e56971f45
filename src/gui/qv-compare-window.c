/* qv-compare-window.c — comparing two mode sets.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-config.h"
#include <string.h>
#include "qv-compare-window.h"
#include "qv-comparison-table.h"
#include "qv-error.h"
#include "qv-error-dialog.h"
#include "qv-json-writer.h"
#include "qv-output.h"

struct _QvCompareWindow
{
  GtkWindow parent_instance;

  GtkLabel *title_label;
  GtkLabel *subtitle_label;
  GtkWidget *save_button;
  GtkStack *stack;
  GtkLabel *busy_label;
  GtkLabel *error_label;
  GtkLabel *summary_label;
  QvOverlapMap *map;
  GtkLabel *readout_label;

  char *name_a;
  QvStructure *structure_a;    /* copies of A as it was when the window opened */
  QvModeSet *modes_a;
  QvDocument *document_b;
  QvModeComparison *comparison;
  GCancellable *job;
  char *error;
};

G_DEFINE_FINAL_TYPE (QvCompareWindow, qv_compare_window, GTK_TYPE_WINDOW)

/* The fields a comparison reads: masses, eigenvalues, vectors. */
static QvModeSet *
copy_modes (const QvModeSet *m)
{
  QvModeSet *c = qv_mode_set_new (m->n_atoms, m->masses, m->n_modes,
                                  g_memdup2 (m->eigenvalues, m->n_modes * sizeof (double)),
                                  g_memdup2 (m->vectors, 3 * m->n_atoms * m->n_modes * sizeof (double)));
  c->has_hessian = m->has_hessian;
  c->projection = m->projection;
  c->linear = m->linear;
  c->n_vibrations = m->n_vibrations;
  c->n_translations = m->n_translations;
  c->n_rotations = m->n_rotations;
  return c;
}

static void
show_error (QvCompareWindow *self, const GError *error)
{
  g_free (self->error);
  self->error = g_strdup (error->message);
  gtk_label_set_label (self->error_label, error->message);
  gtk_stack_set_visible_child_name (self->stack, "error");
  gtk_widget_set_sensitive (self->save_button, FALSE);
}

static void
job_done (QvCompareWindow *self)
{
  g_clear_object (&self->job);
}

static void
show_comparison (QvCompareWindow *self)
{
  const QvModeComparison *c = self->comparison;
  g_autofree char *formula = qv_structure_formula (self->structure_a);
  g_autofree char *subtitle = NULL;
  g_autofree char *summary = NULL;

  subtitle = g_strdup_printf ("A %s · B %s", self->name_a, qv_document_get_name (self->document_b));
  gtk_label_set_label (self->subtitle_label, subtitle);
  gtk_widget_set_visible (GTK_WIDGET (self->subtitle_label), TRUE);
  /* TRANSLATORS: summary of a comparison: formula, mode counts, mean overlap of
   * the matched pairs, RMSD of the fit, largest mass difference */
  summary = g_strdup_printf (_("%s · A %zu modes, B %zu modes · %zu pairs matched, mean overlap %.3f · "
                               "fit RMSD %.4f Å · largest mass difference %.1f %%"),
                             formula, qv_mode_comparison_n_modes_a (c), qv_mode_comparison_n_modes_b (c),
                             qv_mode_comparison_n_pairs (c), qv_mode_comparison_mean_overlap (c),
                             qv_mode_comparison_rmsd (c), 100.0 * qv_mode_comparison_max_mass_difference (c));
  gtk_label_set_label (self->summary_label, summary);
  qv_overlap_map_set_comparison (self->map, c);
  gtk_label_set_label (self->readout_label, _("Point at a cell to read its modes and overlap; "
                                              "the matched pairs are outlined."));
  gtk_stack_set_visible_child_name (self->stack, "result");
  gtk_widget_set_sensitive (self->save_button, TRUE);
}

/* ---- the comparison, on a worker ---- */

typedef struct {
  QvStructure *structure_a;    /* borrowed: the window keeps them */
  QvModeSet *modes_a;
  QvDocument *document_b;      /* owned ref: never changes */
} CompareData;

static void
compare_data_free (gpointer data)
{
  CompareData *d = data;
  g_clear_object (&d->document_b);
  g_free (d);
}

static void
compare_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  CompareData *d = task_data;
  QvComparisonOptions options;
  GError *error = NULL;
  QvModeComparison *c;

  qv_comparison_options_init (&options);
  c = qv_mode_comparison_new (d->structure_a, d->modes_a, qv_document_get_structure (d->document_b),
                              qv_document_get_modes (d->document_b), &options, &error);
  if (c == NULL)
    g_task_return_error (task, error);
  else
    g_task_return_pointer (task, c, (GDestroyNotify) qv_mode_comparison_free);
  qv_document_worker_release ();
}

static void
compare_done (GObject *source, GAsyncResult *result, gpointer data)
{
  QvCompareWindow *self = QV_COMPARE_WINDOW (source);
  g_autoptr(GError) error = NULL;
  QvModeComparison *c = g_task_propagate_pointer (G_TASK (result), &error);

  if (g_error_matches (error, G_IO_ERROR, G_IO_ERROR_CANCELLED))
    return;
  job_done (self);
  if (c == NULL)
    {
      show_error (self, error);
      return;
    }
  g_clear_pointer (&self->comparison, qv_mode_comparison_free);
  self->comparison = c;
  show_comparison (self);
}

static void
loaded (GObject *source, GAsyncResult *result, gpointer data)
{
  QvCompareWindow *self = data;   /* a ref, dropped here */
  g_autoptr(GError) error = NULL;
  g_autoptr(QvDocument) doc = qv_document_load_finish (result, &error);
  g_autoptr(GTask) task = NULL;
  CompareData *d;

  if (doc == NULL)
    {
      if (!g_error_matches (error, G_IO_ERROR, G_IO_ERROR_CANCELLED))
        {
          job_done (self);
          show_error (self, error);
        }
      g_object_unref (self);
      return;
    }
  g_set_object (&self->document_b, doc);
  gtk_label_set_label (self->busy_label, _("Comparing the modes…"));
  task = g_task_new (self, self->job, compare_done, NULL);
  d = g_new0 (CompareData, 1);
  d->structure_a = self->structure_a;
  d->modes_a = self->modes_a;
  d->document_b = g_object_ref (doc);
  g_task_set_task_data (task, d, compare_data_free);
  g_task_set_return_on_cancel (task, TRUE);
  qv_document_worker_hold ();
  g_task_run_in_thread (task, compare_thread);
  g_object_unref (self);
}

void
qv_compare_window_load (QvCompareWindow *self, const QvDocumentSource *source)
{
  g_autofree char *base = source->geometry ? g_path_get_basename (source->geometry) : g_strdup (_("the demo"));
  g_autofree char *what = NULL;

  if (self->job)
    g_cancellable_cancel (self->job);
  g_clear_object (&self->job);
  g_clear_pointer (&self->error, g_free);
  g_clear_pointer (&self->comparison, qv_mode_comparison_free);
  qv_overlap_map_set_comparison (self->map, NULL);
  self->job = g_cancellable_new ();
  /* TRANSLATORS: %s is a file name */
  what = g_strdup_printf (_("Reading and solving %s…"), base);
  gtk_label_set_label (self->busy_label, what);
  gtk_stack_set_visible_child_name (self->stack, "busy");
  gtk_widget_set_sensitive (self->save_button, FALSE);
  /* The structures and modes the worker reads stay with the window: it is
   * kept alive until the load returns, and the comparison task holds it. */
  qv_document_load_async (source, self->job, NULL, NULL, loaded, g_object_ref (self));
}

/* ---- CSV ---- */

char *
qv_compare_window_format_csv (QvCompareWindow *self)
{
  /* the columns of `quaver compare --format csv` (src/io) */
  return self->comparison ? qv_comparison_table_csv (self->comparison) : NULL;
}

gboolean
qv_compare_window_save_csv (QvCompareWindow *self, const char *path, gboolean force, GError **error)
{
  g_autofree char *csv = qv_compare_window_format_csv (self);

  if (csv == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s", _("There is no comparison to save yet"));
      return FALSE;
    }
  return qv_output_write (path, csv, strlen (csv), force, error);
}

static void
save_response (GtkNativeDialog *chooser, int response, gpointer data)
{
  QvCompareWindow *self = data;

  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr(GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (chooser));
      g_autofree char *path = file ? g_file_get_path (file) : NULL;
      g_autoptr(GError) error = NULL;

      /* The chooser has asked before replacing a file. */
      if (path && !qv_compare_window_save_csv (self, path, TRUE, &error))
        {
          qv_error_dialog_show (GTK_WIDGET (self), _("The overlap matrix could not be saved"), error);
        }
    }
  gtk_native_dialog_destroy (chooser);
  g_object_unref (chooser);
  g_object_unref (self);
}

static void
save_clicked (QvCompareWindow *self)
{
  GtkFileChooserNative *chooser =
    gtk_file_chooser_native_new (_("Save the Overlap Matrix"), GTK_WINDOW (self),
                                 GTK_FILE_CHOOSER_ACTION_SAVE, _("_Save"), _("_Cancel"));

  gtk_file_chooser_set_current_name (GTK_FILE_CHOOSER (chooser), "overlap.csv");
  gtk_native_dialog_set_modal (GTK_NATIVE_DIALOG (chooser), TRUE);
  g_signal_connect (chooser, "response", G_CALLBACK (save_response), g_object_ref (self));
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
}

static void
readout_changed (QvCompareWindow *self, const char *text)
{
  gtk_label_set_label (self->readout_label, text ? text
                       : _("Point at a cell to read its modes and overlap; the matched pairs are outlined."));
}

/* ---- accessors ---- */

gboolean qv_compare_window_is_busy (QvCompareWindow *self) { return self->job != NULL; }
const QvModeComparison *qv_compare_window_get_comparison (QvCompareWindow *self) { return self->comparison; }
const char *qv_compare_window_get_error (QvCompareWindow *self) { return self->error; }
QvOverlapMap *qv_compare_window_get_map (QvCompareWindow *self) { return self->map; }
const char *qv_compare_window_get_readout (QvCompareWindow *self) { return gtk_label_get_label (self->readout_label); }

QvCompareWindow *
qv_compare_window_new (GtkWindow *parent, QvDocument *doc)
{
  QvCompareWindow *self = g_object_new (QV_TYPE_COMPARE_WINDOW, "transient-for", parent,
                                        "application", parent ? gtk_window_get_application (parent) : NULL,
                                        NULL);

  self->name_a = g_strdup (qv_document_get_name (doc));
  self->structure_a = qv_structure_copy (qv_document_get_structure (doc));
  self->modes_a = copy_modes (qv_document_get_modes (doc));
  return self;
}

static void
qv_compare_window_dispose (GObject *object)
{
  QvCompareWindow *self = QV_COMPARE_WINDOW (object);

  if (self->job)
    g_cancellable_cancel (self->job);
  g_clear_object (&self->job);
  /* GtkWindow unparents its titlebar and child itself: no
   * gtk_widget_dispose_template here (it would unparent them twice). */
  G_OBJECT_CLASS (qv_compare_window_parent_class)->dispose (object);
}

static void
qv_compare_window_finalize (GObject *object)
{
  QvCompareWindow *self = QV_COMPARE_WINDOW (object);

  g_free (self->name_a);
  g_clear_pointer (&self->structure_a, qv_structure_free);
  g_clear_pointer (&self->modes_a, qv_mode_set_free);
  g_clear_object (&self->document_b);
  g_clear_pointer (&self->comparison, qv_mode_comparison_free);
  g_free (self->error);
  G_OBJECT_CLASS (qv_compare_window_parent_class)->finalize (object);
}

static void
qv_compare_window_class_init (QvCompareWindowClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = qv_compare_window_dispose;
  object_class->finalize = qv_compare_window_finalize;
  g_type_ensure (QV_TYPE_OVERLAP_MAP);
  gtk_widget_class_set_template_from_resource (widget_class, "/org/quaverlab/Quaver/gui/qv-compare-window.ui");
  gtk_widget_class_bind_template_child (widget_class, QvCompareWindow, title_label);
  gtk_widget_class_bind_template_child (widget_class, QvCompareWindow, subtitle_label);
  gtk_widget_class_bind_template_child (widget_class, QvCompareWindow, save_button);
  gtk_widget_class_bind_template_child (widget_class, QvCompareWindow, stack);
  gtk_widget_class_bind_template_child (widget_class, QvCompareWindow, busy_label);
  gtk_widget_class_bind_template_child (widget_class, QvCompareWindow, error_label);
  gtk_widget_class_bind_template_child (widget_class, QvCompareWindow, summary_label);
  gtk_widget_class_bind_template_child (widget_class, QvCompareWindow, map);
  gtk_widget_class_bind_template_child (widget_class, QvCompareWindow, readout_label);
  gtk_widget_class_bind_template_callback (widget_class, save_clicked);
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_w, GDK_CONTROL_MASK, "window.close", NULL);
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_Escape, 0, "window.close", NULL);
}

static void
qv_compare_window_init (QvCompareWindow *self)
{
  gtk_widget_init_template (GTK_WIDGET (self));
  g_signal_connect_object (self->map, "readout-changed", G_CALLBACK (readout_changed), self, G_CONNECT_SWAPPED);
}
