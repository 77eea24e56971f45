/* qv-export-writer.c — Write…, the folder question, the worker, the result.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-config.h"
#include "qv-error.h"
#include "qv-export-writer.h"
#include "qv-window.h"

struct _QvExportWriter
{
  GtkWidget parent_instance;
  GtkWidget *box;
  GtkWidget *write_button;
  GtkRevealer *progress_revealer;
  GtkProgressBar *progress_bar;
  GtkWidget *cancel_button;
  GtkWidget *result_box;
  GtkLabel *result_label;
  GtkLabel *files_label;
  GtkWidget *open_button;

  QvExportPrepareFunc prepare;
  gpointer prepare_data;
  char *title;
  gboolean ready;

  GCancellable *cancellable;   /* the running job, or NULL */
  char *directory;             /* of the last job */
  GPtrArray *written;          /* char*, NULL-terminated, of the last job */
  GError *error;               /* of the last job */
  gboolean disposed;
  guint scroll_id;             /* tick callback keeping it in view */
  gint64 scroll_until;         /* µs, frame clock time */
};

G_DEFINE_FINAL_TYPE (QvExportWriter, qv_export_writer, GTK_TYPE_WIDGET)

/* ---- the worker ---- */

typedef struct {
  QvExportJobFunc func;
  gpointer job;
  GDestroyNotify free_job;
  char *directory;
  gboolean force;
  GPtrArray *written;
  GCancellable *cancellable;
  /* progress, from the worker to the main loop */
  GMutex lock;
  double fraction;
  char *stage;
  gboolean idle_pending;
} WriteData;

static void
write_data_free (gpointer data)
{
  WriteData *d = data;

  if (d->free_job)
    d->free_job (d->job);
  g_free (d->directory);
  if (d->written)
    g_ptr_array_unref (d->written);
  g_clear_object (&d->cancellable);
  g_mutex_clear (&d->lock);
  g_free (d->stage);
  g_free (d);
}

static gboolean
show_progress (gpointer data)
{
  GTask *task = data;
  QvExportWriter *self = g_task_get_source_object (task);
  WriteData *d = g_task_get_task_data (task);
  double fraction;
  g_autofree char *stage = NULL;

  g_mutex_lock (&d->lock);
  fraction = d->fraction;
  stage = g_steal_pointer (&d->stage);
  d->idle_pending = FALSE;
  g_mutex_unlock (&d->lock);
  if (!self->disposed && self->cancellable == d->cancellable)
    {
      gtk_progress_bar_set_fraction (self->progress_bar, CLAMP (fraction, 0.0, 1.0));
      if (stage)
        gtk_progress_bar_set_text (self->progress_bar, g_dgettext (GETTEXT_PACKAGE, stage));
    }
  return G_SOURCE_REMOVE;
}

/* QvProgressFunc, on the worker: hands the figure to the main loop (one
 * idle at a time) and says whether to go on. */
static gboolean
worker_progress (double fraction, const char *stage, gpointer data)
{
  GTask *task = data;
  WriteData *d = g_task_get_task_data (task);
  gboolean schedule;

  g_mutex_lock (&d->lock);
  d->fraction = fraction;
  if (stage)
    {
      g_free (d->stage);
      d->stage = g_strdup (stage);
    }
  schedule = !d->idle_pending;
  d->idle_pending = TRUE;
  g_mutex_unlock (&d->lock);
  if (schedule)
    {
      GSource *source = g_idle_source_new ();
      g_source_set_callback (source, show_progress, g_object_ref (task), g_object_unref);
      g_source_attach (source, g_task_get_context (task));
      g_source_unref (source);
    }
  return !g_cancellable_is_cancelled (d->cancellable);
}

static void
write_thread (GTask *task, gpointer source_object, gpointer task_data, GCancellable *cancellable)
{
  WriteData *d = task_data;
  QvProgress progress = { worker_progress, task };
  GError *error = NULL;

  if (d->func (d->job, d->directory, d->force, &progress, d->written, &error))
    g_task_return_boolean (task, TRUE);
  else
    g_task_return_error (task, error);
}

/* ---- keeping the progress and the result in sight ---- */

/* The pane scrolls: while the progress bar slides in and when the result
 * shows, the writer's bottom is kept in the visible part (the chooser may
 * have been opened from a long section's last line). */
static gboolean
scroll_tick (GtkWidget *widget, GdkFrameClock *clock, gpointer data)
{
  QvExportWriter *self = QV_EXPORT_WRITER (widget);
  GtkWidget *scrolled = gtk_widget_get_ancestor (widget, GTK_TYPE_SCROLLED_WINDOW);
  GtkWidget *content = scrolled ? gtk_scrolled_window_get_child (GTK_SCROLLED_WINDOW (scrolled)) : NULL;
  double x = 0.0, y = 0.0;

  if (content && gtk_widget_translate_coordinates (widget, content, 0.0, 0.0, &x, &y))
    {
      GtkAdjustment *adj = gtk_scrolled_window_get_vadjustment (GTK_SCROLLED_WINDOW (scrolled));
      const double page = gtk_adjustment_get_page_size (adj);
      const double value = gtk_adjustment_get_value (adj);
      const double bottom = y + gtk_widget_get_height (widget);

      if (bottom > value + page)
        gtk_adjustment_set_value (adj, MIN (bottom - page, y));
    }
  if (gdk_frame_clock_get_frame_time (clock) < self->scroll_until)
    return G_SOURCE_CONTINUE;
  self->scroll_id = 0;
  return G_SOURCE_REMOVE;
}

static void
keep_in_view (QvExportWriter *self)
{
  /* Long enough for the revealer's slide (250 ms). */
  self->scroll_until = g_get_monotonic_time () + 400 * G_TIME_SPAN_MILLISECOND;
  if (self->scroll_id == 0)
    self->scroll_id = gtk_widget_add_tick_callback (GTK_WIDGET (self), scroll_tick, NULL, NULL);
}

/* ---- the result ---- */

static void
show_result (QvExportWriter *self)
{
  const guint n = self->written->len - 1;
  g_autoptr(GString) files = g_string_new (NULL);
  g_autofree char *text = NULL;
  g_autofree char *shown_dir = g_filename_display_name (self->directory);

  for (guint i = 0; i < n; i++)
    {
      if (i == 6 && n > 8)
        {
          g_string_append_c (files, '\n');
          /* TRANSLATORS: after a list of file names: "… and 40 more" */
          g_string_append_printf (files, ngettext ("… and %u more", "… and %u more", n - i), n - i);
          break;
        }
      if (files->len)
        g_string_append_c (files, '\n');
      g_string_append (files, g_ptr_array_index (self->written, i));
    }
  if (self->error == NULL)
    /* TRANSLATORS: "Wrote 12 files to /home/ana/scan" */
    text = g_strdup_printf (ngettext ("Wrote %u file to %s", "Wrote %u files to %s", n), n, shown_dir);
  else if (g_error_matches (self->error, QV_ERROR, QV_ERROR_CANCELLED))
    text = g_strdup_printf (ngettext ("Cancelled after %u file in %s: the set is incomplete and has no manifest.",
                                      "Cancelled after %u files in %s: the set is incomplete and has no manifest.", n),
                            n, shown_dir);
  else
    text = g_strdup_printf (ngettext ("Stopped by an error after %u file in %s: the set is incomplete.",
                                      "Stopped by an error after %u files in %s: the set is incomplete.", n),
                            n, shown_dir);
  gtk_label_set_label (self->result_label, text);
  gtk_label_set_label (self->files_label, files->str);
  gtk_widget_set_visible (GTK_WIDGET (self->files_label), n > 0);
  gtk_widget_set_visible (self->open_button, g_file_test (self->directory, G_FILE_TEST_IS_DIR));
  gtk_widget_set_visible (self->result_box, TRUE);
  keep_in_view (self);
}

static void
update_buttons (QvExportWriter *self)
{
  gtk_widget_set_sensitive (self->write_button, self->ready && self->cancellable == NULL);
}

static void
write_done (GObject *source, GAsyncResult *result, gpointer data)
{
  QvExportWriter *self = QV_EXPORT_WRITER (source);
  GTask *task = G_TASK (result);
  WriteData *d = g_task_get_task_data (task);
  GError *error = NULL;

  g_task_propagate_boolean (task, &error);
  if (self->disposed)
    {
      g_clear_error (&error);
      return;
    }
  g_clear_error (&self->error);
  self->error = error;
  g_ptr_array_unref (self->written);
  self->written = g_steal_pointer (&d->written);
  g_ptr_array_add (self->written, NULL);
  g_clear_object (&self->cancellable);
  gtk_revealer_set_reveal_child (self->progress_revealer, FALSE);
  update_buttons (self);
  show_result (self);
  if (gtk_widget_has_focus (self->cancel_button) && gtk_widget_get_visible (self->open_button))
    gtk_widget_grab_focus (self->open_button);
  if (error && !g_error_matches (error, QV_ERROR, QV_ERROR_CANCELLED))
    {
      GtkRoot *root = gtk_widget_get_root (GTK_WIDGET (self));
      if (QV_IS_WINDOW (root))
        qv_window_show_error (QV_WINDOW (root), _("The files could not be written"), error);
    }
}

void
qv_export_writer_write_to (QvExportWriter *self, const char *directory, gboolean force)
{
  g_autoptr(GTask) task = NULL;
  g_autoptr(GError) error = NULL;
  QvExportJobFunc func = NULL;
  GDestroyNotify free_job = NULL;
  gpointer job;
  WriteData *d;

  g_return_if_fail (QV_IS_EXPORT_WRITER (self));
  if (self->cancellable || self->prepare == NULL)
    return;
  job = self->prepare (self->prepare_data, &func, &free_job, &error);
  if (job == NULL)
    {
      GtkRoot *root = gtk_widget_get_root (GTK_WIDGET (self));
      g_clear_error (&self->error);
      self->error = g_error_copy (error);
      if (QV_IS_WINDOW (root))
        qv_window_show_error (QV_WINDOW (root), _("These options do not make an export"), error);
      return;
    }
  d = g_new0 (WriteData, 1);
  d->func = func;
  d->job = job;
  d->free_job = free_job;
  d->directory = g_strdup (directory);
  d->force = force;
  d->written = g_ptr_array_new_with_free_func (g_free);
  d->cancellable = g_cancellable_new ();
  g_mutex_init (&d->lock);

  g_free (self->directory);
  self->directory = g_strdup (directory);
  self->cancellable = g_object_ref (d->cancellable);
  gtk_widget_set_visible (self->result_box, FALSE);
  gtk_progress_bar_set_fraction (self->progress_bar, 0.0);
  gtk_progress_bar_set_text (self->progress_bar, _("Starting"));
  gtk_revealer_set_reveal_child (self->progress_revealer, TRUE);
  update_buttons (self);
  keep_in_view (self);
  /* Write… is insensitive now: the keyboard goes on from Cancel. */
  {
    GtkRoot *root = gtk_widget_get_root (GTK_WIDGET (self));
    GtkWidget *focus = root ? gtk_root_get_focus (root) : NULL;
    if (root && (focus == NULL || focus == self->write_button))
      gtk_widget_grab_focus (self->cancel_button);
  }

  task = g_task_new (self, NULL, write_done, NULL);
  g_task_set_source_tag (task, qv_export_writer_write_to);
  g_task_set_task_data (task, d, write_data_free);
  g_task_run_in_thread (task, write_thread);
}

/* ---- the folder ---- */

static gboolean
directory_is_empty (const char *path)
{
  g_autoptr(GDir) dir = g_dir_open (path, 0, NULL);
  return dir == NULL || g_dir_read_name (dir) == NULL;
}

typedef struct {
  QvExportWriter *writer;
  char *directory;
} AskCall;

static void
ask_response (GtkDialog *dialog, int response, gpointer data)
{
  AskCall *call = data;

  if (response == GTK_RESPONSE_ACCEPT)
    qv_export_writer_write_to (call->writer, call->directory, TRUE);
  gtk_window_destroy (GTK_WINDOW (dialog));
  g_object_unref (call->writer);
  g_free (call->directory);
  g_free (call);
}

static void
ask_non_empty (QvExportWriter *self, const char *directory)
{
  GtkRoot *root = gtk_widget_get_root (GTK_WIDGET (self));
  g_autofree char *name = g_filename_display_basename (directory);
  GtkWidget *dialog;
  AskCall *call = g_new0 (AskCall, 1);

  dialog = gtk_message_dialog_new (GTK_IS_WINDOW (root) ? GTK_WINDOW (root) : NULL,
                                   GTK_DIALOG_MODAL | GTK_DIALOG_DESTROY_WITH_PARENT,
                                   GTK_MESSAGE_QUESTION, GTK_BUTTONS_NONE,
                                   _("“%s” is not empty"), name);
  gtk_message_dialog_format_secondary_text (GTK_MESSAGE_DIALOG (dialog), "%s",
                                            _("The new files go beside what is there, and files of the same names are replaced. An empty folder keeps one export apart from another."));
  gtk_dialog_add_button (GTK_DIALOG (dialog), _("_Cancel"), GTK_RESPONSE_CANCEL);
  gtk_dialog_add_button (GTK_DIALOG (dialog), _("_Write Into It"), GTK_RESPONSE_ACCEPT);
  gtk_dialog_set_default_response (GTK_DIALOG (dialog), GTK_RESPONSE_CANCEL);
  call->writer = g_object_ref (self);
  call->directory = g_strdup (directory);
  g_signal_connect (dialog, "response", G_CALLBACK (ask_response), call);
  gtk_window_present (GTK_WINDOW (dialog));
}

static void
chooser_response (GtkNativeDialog *chooser, int response, gpointer data)
{
  QvExportWriter *self = data;

  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr(GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (chooser));
      g_autofree char *path = file ? g_file_get_path (file) : NULL;

      if (path && directory_is_empty (path))
        qv_export_writer_write_to (self, path, FALSE);
      else if (path)
        ask_non_empty (self, path);
    }
  gtk_native_dialog_destroy (chooser);
  g_object_unref (chooser);
  g_object_unref (self);
}

static void
write_clicked (QvExportWriter *self)
{
  GtkRoot *root = gtk_widget_get_root (GTK_WIDGET (self));
  GtkFileChooserNative *chooser =
    gtk_file_chooser_native_new (self->title ? self->title : _("Choose a Folder to Write Into"),
                                 GTK_IS_WINDOW (root) ? GTK_WINDOW (root) : NULL,
                                 GTK_FILE_CHOOSER_ACTION_SELECT_FOLDER, _("_Write Here"), _("_Cancel"));

  gtk_native_dialog_set_modal (GTK_NATIVE_DIALOG (chooser), TRUE);
  g_signal_connect (chooser, "response", G_CALLBACK (chooser_response), g_object_ref (self));
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
}

static void
open_clicked (QvExportWriter *self)
{
  g_autoptr(GFile) file = NULL;
  g_autofree char *uri = NULL;
  GtkRoot *root = gtk_widget_get_root (GTK_WIDGET (self));

  if (self->directory == NULL)
    return;
  file = g_file_new_for_path (self->directory);
  uri = g_file_get_uri (file);
  gtk_show_uri (GTK_IS_WINDOW (root) ? GTK_WINDOW (root) : NULL, uri, GDK_CURRENT_TIME);
}

/* ---- the rest ---- */

void
qv_export_writer_set_prepare (QvExportWriter *self, QvExportPrepareFunc prepare, gpointer user_data)
{
  self->prepare = prepare;
  self->prepare_data = user_data;
}

void
qv_export_writer_set_title (QvExportWriter *self, const char *title)
{
  g_free (self->title);
  self->title = g_strdup (title);
}

void
qv_export_writer_set_ready (QvExportWriter *self, gboolean ready)
{
  self->ready = ready;
  update_buttons (self);
}

gboolean
qv_export_writer_is_busy (QvExportWriter *self)
{
  return self->cancellable != NULL;
}

void
qv_export_writer_cancel (QvExportWriter *self)
{
  if (self->cancellable)
    {
      g_cancellable_cancel (self->cancellable);
      gtk_progress_bar_set_text (self->progress_bar, _("Cancelling"));
    }
}

const char *qv_export_writer_get_directory (QvExportWriter *self) { return self->directory; }
const char *const *qv_export_writer_get_written (QvExportWriter *self)
{
  return (const char *const *) self->written->pdata;
}
const GError *qv_export_writer_get_error (QvExportWriter *self) { return self->error; }

static void
qv_export_writer_dispose (GObject *object)
{
  QvExportWriter *self = QV_EXPORT_WRITER (object);

  /* A running job holds a reference: it finishes its current file, stops,
   * and its result is shown nowhere. */
  self->disposed = TRUE;
  if (self->scroll_id)
    {
      gtk_widget_remove_tick_callback (GTK_WIDGET (self), self->scroll_id);
      self->scroll_id = 0;
    }
  if (self->cancellable)
    g_cancellable_cancel (self->cancellable);
  gtk_widget_dispose_template (GTK_WIDGET (object), QV_TYPE_EXPORT_WRITER);
  G_OBJECT_CLASS (qv_export_writer_parent_class)->dispose (object);
}

static void
qv_export_writer_finalize (GObject *object)
{
  QvExportWriter *self = QV_EXPORT_WRITER (object);

  g_free (self->title);
  g_free (self->directory);
  g_clear_object (&self->cancellable);
  g_ptr_array_unref (self->written);
  g_clear_error (&self->error);
  G_OBJECT_CLASS (qv_export_writer_parent_class)->finalize (object);
}

static void
qv_export_writer_class_init (QvExportWriterClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = qv_export_writer_dispose;
  object_class->finalize = qv_export_writer_finalize;
  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "qvexportwriter");
  gtk_widget_class_set_template_from_resource (widget_class, "/org/quaverlab/Quaver/gui/qv-export-writer.ui");
  gtk_widget_class_bind_template_child (widget_class, QvExportWriter, box);
  gtk_widget_class_bind_template_child (widget_class, QvExportWriter, write_button);
  gtk_widget_class_bind_template_child (widget_class, QvExportWriter, progress_revealer);
  gtk_widget_class_bind_template_child (widget_class, QvExportWriter, progress_bar);
  gtk_widget_class_bind_template_child (widget_class, QvExportWriter, cancel_button);
  gtk_widget_class_bind_template_child (widget_class, QvExportWriter, result_box);
  gtk_widget_class_bind_template_child (widget_class, QvExportWriter, result_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportWriter, files_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportWriter, open_button);
}

static void
qv_export_writer_init (QvExportWriter *self)
{
  gtk_widget_init_template (GTK_WIDGET (self));
  self->written = g_ptr_array_new_with_free_func (g_free);
  g_ptr_array_add (self->written, NULL);
  self->ready = TRUE;
  g_signal_connect_object (self->write_button, "clicked", G_CALLBACK (write_clicked), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->cancel_button, "clicked", G_CALLBACK (qv_export_writer_cancel), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->open_button, "clicked", G_CALLBACK (open_clicked), self, G_CONNECT_SWAPPED);
}
