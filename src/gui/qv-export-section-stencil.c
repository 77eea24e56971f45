/* qv-export-section-stencil.c — qv_export_new_stencil from the step and
 * the atom selection (qv_stencil_parse_atoms).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include <string.h>
#include "qv-config.h"
#include "qv-error.h"
#include "qv-export.h"
#include "qv-export-section-stencil.h"

struct _QvExportSectionStencil
{
  GtkWidget parent_instance;
  GtkWidget *box;
  GtkAdjustment *step_adjustment;
  GtkEditable *atoms_entry;
  GtkCheckButton *symmetric_check;
  GtkLabel *message_label;
  GtkLabel *files_label;
  GtkLabel *detail_label;
  GtkLabel *notes_label;
  QvExportWriter *writer;

  QvExportContext context;
  gsize n_files;
};

G_DEFINE_FINAL_TYPE (QvExportSectionStencil, qv_export_section_stencil, GTK_TYPE_WIDGET)

typedef struct {
  double step;
  gboolean symmetric;          /* only the symmetry-distinct displacements */
  QvExportFormat format;
  char atoms[];                /* the selection as typed */
} StencilOptions;

static StencilOptions *
read_options (QvExportSectionStencil *self)
{
  const char *text = gtk_editable_get_text (self->atoms_entry);
  const gsize length = strlen (text);
  StencilOptions *o = g_malloc0 (sizeof *o + length + 1);

  o->step = gtk_adjustment_get_value (self->step_adjustment);
  o->symmetric = gtk_widget_get_visible (GTK_WIDGET (self->symmetric_check))
                 && gtk_check_button_get_active (self->symmetric_check);
  qv_export_format_init (&o->format);
  memcpy (o->atoms, text, length);
  return o;
}

static QvExport *
plan_stencil (const QvExportInputs *inputs, gconstpointer options, QvManifest *manifest, GError **error)
{
  const StencilOptions *o = options;
  const gsize n_atoms = inputs->structure->n_atoms;
  g_autofree gsize *atoms = NULL;
  g_autoptr(QvStencil) stencil = NULL;
  gsize n = 0;
  const char *text = o->atoms[0] ? o->atoms : "all";

  if (o->symmetric)
    return qv_export_new_symmetric_stencil (inputs->structure, o->step, 0, &o->format, manifest,
                                            error);
  if (!qv_stencil_parse_atoms (text, n_atoms, &atoms, &n, error)
      || (stencil = qv_stencil_new (n_atoms, o->step, atoms, n, error)) == NULL)
    {
      qv_manifest_free (manifest);
      return NULL;
    }
  return qv_export_new_stencil (inputs->structure, stencil, &o->format, manifest, error);
}

static void
refresh (QvExportSectionStencil *self)
{
  QvDocument *doc = self->context.document;
  g_autoptr(GError) error = NULL;
  g_autoptr(QvExport) plan = NULL;
  g_autofree StencilOptions *o = NULL;

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
  {
    /* a periodic structure may use its space group */
    const QvStructure *s = qv_document_get_structure (doc);
    const gboolean periodic = s->has_cell && s->pbc[0] && s->pbc[1] && s->pbc[2];
    gtk_widget_set_visible (GTK_WIDGET (self->symmetric_check), periodic);
    gtk_widget_set_sensitive (GTK_WIDGET (self->atoms_entry),
                              !(periodic && gtk_check_button_get_active (self->symmetric_check)));
  }
  o = read_options (self);
  {
    const QvExportInputs borrowed = { (QvStructure *) qv_document_get_structure (doc), NULL, NULL };
    plan = plan_stencil (&borrowed, o, qv_manifest_new ("stencil"), &error);
  }
  if (plan == NULL)
    {
      qv_export_pane_set_message (self->message_label, error->message, TRUE);
      qv_export_writer_set_ready (self->writer, FALSE);
      return;
    }
  qv_export_pane_set_message (self->message_label, NULL, FALSE);
  self->n_files = qv_export_n_files (plan);
  if (o->symmetric)
    {
      const gsize n_atoms = qv_document_get_structure (doc)->n_atoms;
      g_autofree char *files = qv_export_pane_files_text (plan);
      /* TRANSLATORS: "12 symmetry-distinct displacements of ±0.0100 Å instead of 324, and the reference" */
      g_autofree char *detail = g_strdup_printf (_("%zu symmetry-distinct displacements of ±%.4f Å instead of %zu, and the reference"),
                                                 self->n_files - 1, o->step, 6 * n_atoms);
      gtk_label_set_label (self->files_label, files);
      gtk_label_set_label (self->detail_label, detail);
      qv_export_pane_set_message (self->notes_label,
                                  _("quaver collect rebuilds the whole Hessian from these and the space group, then symmetrises it."),
                                  FALSE);
      qv_export_writer_set_ready (self->writer, TRUE);
      return;
    }
  {
    const QvStencil *stencil = qv_export_stencil (plan);
    g_autofree char *files = qv_export_pane_files_text (plan);
    g_autofree char *selection = qv_stencil_format_atoms (stencil);
    g_autofree char *atoms = g_strdup_printf (ngettext ("%zu atom", "%zu atoms", stencil->n_selected),
                                              stencil->n_selected);
    /* TRANSLATORS: "6 × 9 atoms (all) = 54 displacements of ±0.0100 Å, and the reference" */
    g_autofree char *detail = g_strdup_printf (_("6 × %s (%s) = %zu displacements of ±%.4f Å, and the reference"),
                                               atoms, selection, stencil->n_displacements, stencil->step);
    gtk_label_set_label (self->files_label, files);
    gtk_label_set_label (self->detail_label, detail);
    if (!qv_stencil_is_complete (stencil))
      qv_export_pane_set_message (self->notes_label,
                                  _("A subset of atoms gives a partial Hessian: the block of these atoms with the others held fixed."),
                                  FALSE);
  }
  qv_export_writer_set_ready (self->writer, TRUE);
}

static gpointer
prepare (gpointer data, QvExportJobFunc *func, GDestroyNotify *free_job, GError **error)
{
  QvExportSectionStencil *self = data;
  QvExportPlanJob *job;

  if (self->context.document == NULL)
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE, _("Open a document to export from it."));
      return NULL;
    }
  job = g_new0 (QvExportPlanJob, 1);
  job->inputs = qv_export_inputs_new (self->context.document);
  job->command = "stencil";
  job->plan = plan_stencil;
  job->options = read_options (self);
  *func = qv_export_plan_job_run;
  *free_job = qv_export_plan_job_free;
  return job;
}

void
qv_export_section_stencil_set_context (QvExportSectionStencil *self, const QvExportContext *context)
{
  self->context = *context;
  refresh (self);
}

void
qv_export_section_stencil_set_symmetric (QvExportSectionStencil *self, gboolean symmetric)
{
  gtk_check_button_set_active (self->symmetric_check, symmetric);
}

void
qv_export_section_stencil_set_atoms (QvExportSectionStencil *self, const char *text)
{
  gtk_editable_set_text (self->atoms_entry, text);
}

gsize qv_export_section_stencil_get_n_files (QvExportSectionStencil *self) { return self->n_files; }
const char *qv_export_section_stencil_get_preview (QvExportSectionStencil *self)
{
  return gtk_label_get_label (self->files_label);
}
const char *qv_export_section_stencil_get_message (QvExportSectionStencil *self)
{
  return gtk_label_get_label (self->message_label);
}
QvExportWriter *qv_export_section_stencil_get_writer (QvExportSectionStencil *self) { return self->writer; }

static void
qv_export_section_stencil_dispose (GObject *object)
{
  gtk_widget_dispose_template (GTK_WIDGET (object), QV_TYPE_EXPORT_SECTION_STENCIL);
  G_OBJECT_CLASS (qv_export_section_stencil_parent_class)->dispose (object);
}

static void
qv_export_section_stencil_class_init (QvExportSectionStencilClass *klass)
{
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  G_OBJECT_CLASS (klass)->dispose = qv_export_section_stencil_dispose;
  g_type_ensure (QV_TYPE_EXPORT_WRITER);
  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "qvexportsection");
  gtk_widget_class_set_template_from_resource (widget_class,
                                               "/org/quaverlab/Quaver/gui/qv-export-section-stencil.ui");
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionStencil, box);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionStencil, symmetric_check);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionStencil, step_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionStencil, atoms_entry);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionStencil, message_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionStencil, files_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionStencil, detail_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionStencil, notes_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionStencil, writer);
}

static void
qv_export_section_stencil_init (QvExportSectionStencil *self)
{
  gtk_widget_init_template (GTK_WIDGET (self));
  self->context.mode = -1;
  qv_export_writer_set_title (self->writer, _("Choose a Folder for the Stencil"));
  qv_export_writer_set_prepare (self->writer, prepare, self);
  g_signal_connect_object (self->step_adjustment, "value-changed", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->atoms_entry, "changed", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->symmetric_check, "toggled", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  refresh (self);
}
