/* qv-export-section-ensemble.c — qv_export_new_ensemble from the controls;
 * the samples are drawn when the pane's plan job writes them, on a worker.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include <math.h>
#include "qv-config.h"
#include "qv-error.h"
#include "qv-export.h"
#include "qv-export-section-ensemble.h"

struct _QvExportSectionEnsemble
{
  GtkWidget parent_instance;
  GtkWidget *box;
  GtkAdjustment *temperature_adjustment;
  GtkAdjustment *count_adjustment;
  GtkAdjustment *seed_adjustment;
  GtkWidget *new_seed_button;
  GtkAdjustment *cutoff_adjustment;
  GtkCheckButton *single_check;
  GtkLabel *message_label;
  GtkLabel *files_label;
  GtkLabel *detail_label;
  GtkLabel *notes_label;
  QvExportWriter *writer;

  QvExportContext context;
  gsize n_files;
};

G_DEFINE_FINAL_TYPE (QvExportSectionEnsemble, qv_export_section_ensemble, GTK_TYPE_WIDGET)

typedef struct {
  QvEnsembleOptions options;
  guint64 count;
  QvExportFormat format;
} EnsembleOptions;

static void
read_options (QvExportSectionEnsemble *self, EnsembleOptions *o)
{
  qv_ensemble_options_init (&o->options);
  o->options.temperature = gtk_adjustment_get_value (self->temperature_adjustment);
  o->options.seed = (guint64) gtk_adjustment_get_value (self->seed_adjustment);
  o->options.min_wavenumber = gtk_adjustment_get_value (self->cutoff_adjustment);
  o->count = (guint64) gtk_adjustment_get_value (self->count_adjustment);
  qv_export_format_init (&o->format);
  o->format.single_file = gtk_check_button_get_active (self->single_check);
}

static QvExport *
plan_ensemble (const QvExportInputs *inputs, gconstpointer options, QvManifest *manifest, GError **error)
{
  const EnsembleOptions *o = options;
  return qv_export_new_ensemble (inputs->structure, inputs->modes, &o->options, o->count, &o->format,
                                 manifest, error);
}

static void
refresh (QvExportSectionEnsemble *self)
{
  QvDocument *doc = self->context.document;
  g_autoptr(GError) error = NULL;
  g_autoptr(QvExport) plan = NULL;
  EnsembleOptions o;

  self->n_files = 0;
  gtk_label_set_label (self->files_label, "");
  gtk_label_set_label (self->detail_label, "");
  qv_export_pane_set_message (self->notes_label, NULL, FALSE);
  if (doc == NULL)
    {
      qv_export_pane_set_message (self->message_label, _("Open a document to export from it."), FALSE);
      qv_export_writer_set_ready (self->writer, FALSE);
      return;
    }
  read_options (self, &o);
  {
    const QvExportInputs borrowed = {
      (QvStructure *) qv_document_get_structure (doc), (QvModeSet *) qv_document_get_modes (doc), NULL,
    };
    plan = plan_ensemble (&borrowed, &o, qv_manifest_new ("ensemble"), &error);
  }
  if (plan == NULL)
    {
      qv_export_pane_set_message (self->message_label, error->message, TRUE);
      qv_export_writer_set_ready (self->writer, FALSE);
      return;
    }
  qv_export_pane_set_message (self->message_label, NULL, FALSE);
  self->n_files = qv_export_n_files (plan);
  {
    g_autofree char *files = qv_export_pane_files_text (plan);
    const QvEnsemble *ensemble = qv_export_ensemble (plan);
    g_autofree char *sampled = g_strdup_printf (ngettext ("%zu mode sampled", "%zu modes sampled",
                                                          ensemble->n_sampled), ensemble->n_sampled);
    g_autofree char *seed = g_strdup_printf ("%" G_GUINT64_FORMAT, o.options.seed);
    /* TRANSLATORS: "298.15 K, seed 81234 · 20 modes sampled · positions in Å, velocities in Å/fs" */
    g_autofree char *detail = g_strdup_printf (_("%.2f K, seed %s · %s · positions in Å, velocities in Å/fs"),
                                               o.options.temperature, seed, sampled);
    gtk_label_set_label (self->files_label, files);
    gtk_label_set_label (self->detail_label, detail);
  }
  {
    g_autofree char *notes = g_strjoinv ("\n", (char **) qv_export_notes (plan));
    qv_export_pane_set_message (self->notes_label, notes, FALSE);
  }
  qv_export_writer_set_ready (self->writer, TRUE);
}

static gpointer
prepare (gpointer data, QvExportJobFunc *func, GDestroyNotify *free_job, GError **error)
{
  QvExportSectionEnsemble *self = data;
  QvExportPlanJob *job;
  EnsembleOptions *o;

  if (self->context.document == NULL)
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE, _("Open a document to export from it."));
      return NULL;
    }
  o = g_new0 (EnsembleOptions, 1);
  read_options (self, o);
  job = g_new0 (QvExportPlanJob, 1);
  job->inputs = qv_export_inputs_new (self->context.document);
  job->command = "ensemble";
  job->plan = plan_ensemble;
  job->options = o;
  *func = qv_export_plan_job_run;
  *free_job = qv_export_plan_job_free;
  return job;
}

static void
new_seed (QvExportSectionEnsemble *self)
{
  /* Six digits: easy to read out and type again. */
  gtk_adjustment_set_value (self->seed_adjustment, (double) g_random_int_range (1, 1000000));
}

void
qv_export_section_ensemble_set_context (QvExportSectionEnsemble *self, const QvExportContext *context)
{
  self->context = *context;
  refresh (self);
}

void
qv_export_section_ensemble_set_count (QvExportSectionEnsemble *self, guint count)
{
  gtk_adjustment_set_value (self->count_adjustment, count);
}

void
qv_export_section_ensemble_set_seed (QvExportSectionEnsemble *self, guint64 seed)
{
  gtk_adjustment_set_value (self->seed_adjustment, (double) seed);
}

guint64
qv_export_section_ensemble_get_seed (QvExportSectionEnsemble *self)
{
  return (guint64) gtk_adjustment_get_value (self->seed_adjustment);
}

gsize qv_export_section_ensemble_get_n_files (QvExportSectionEnsemble *self) { return self->n_files; }
const char *qv_export_section_ensemble_get_preview (QvExportSectionEnsemble *self)
{
  return gtk_label_get_label (self->files_label);
}
QvExportWriter *qv_export_section_ensemble_get_writer (QvExportSectionEnsemble *self) { return self->writer; }

static void
qv_export_section_ensemble_dispose (GObject *object)
{
  gtk_widget_dispose_template (GTK_WIDGET (object), QV_TYPE_EXPORT_SECTION_ENSEMBLE);
  G_OBJECT_CLASS (qv_export_section_ensemble_parent_class)->dispose (object);
}

static void
qv_export_section_ensemble_class_init (QvExportSectionEnsembleClass *klass)
{
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  G_OBJECT_CLASS (klass)->dispose = qv_export_section_ensemble_dispose;
  g_type_ensure (QV_TYPE_EXPORT_WRITER);
  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "qvexportsection");
  gtk_widget_class_set_template_from_resource (widget_class,
                                               "/org/quaverlab/Quaver/gui/qv-export-section-ensemble.ui");
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionEnsemble, box);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionEnsemble, temperature_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionEnsemble, count_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionEnsemble, seed_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionEnsemble, new_seed_button);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionEnsemble, cutoff_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionEnsemble, single_check);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionEnsemble, message_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionEnsemble, files_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionEnsemble, detail_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionEnsemble, notes_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionEnsemble, writer);
}

static void
qv_export_section_ensemble_init (QvExportSectionEnsemble *self)
{
  gtk_widget_init_template (GTK_WIDGET (self));
  self->context.mode = -1;
  new_seed (self);
  qv_export_writer_set_title (self->writer, _("Choose a Folder for the Ensemble"));
  qv_export_writer_set_prepare (self->writer, prepare, self);
  g_signal_connect_object (self->new_seed_button, "clicked", G_CALLBACK (new_seed), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->temperature_adjustment, "value-changed", G_CALLBACK (refresh), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->count_adjustment, "value-changed", G_CALLBACK (refresh), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->seed_adjustment, "value-changed", G_CALLBACK (refresh), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->cutoff_adjustment, "value-changed", G_CALLBACK (refresh), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->single_check, "toggled", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  refresh (self);
}
