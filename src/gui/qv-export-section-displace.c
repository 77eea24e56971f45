/* qv-export-section-displace.c — qv_export_new_displace from the controls;
 * the plan's files and amplitudes as the preview; written by the pane's
 * plan job on a worker.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include <math.h>
#include "qv-config.h"
#include "qv-error.h"
#include "qv-export.h"
#include "qv-export-section-displace.h"

struct _QvExportSectionDisplace
{
  GtkWidget parent_instance;
  GtkWidget *box;
  GtkDropDown *kind_drop;
  GtkWidget *points_label;
  GtkWidget *points_spin;
  GtkAdjustment *points_adjustment;
  GtkWidget *second_label;
  GtkWidget *second_spin;
  GtkAdjustment *second_adjustment;
  GtkWidget *value_spin;
  GtkAdjustment *value_adjustment;
  GtkDropDown *unit_drop;
  GtkCheckButton *default_check;
  GtkDropDown *style_drop;
  GtkCheckButton *single_check;
  GtkLabel *message_label;
  GtkLabel *files_label;
  GtkLabel *amplitude_label;
  GtkLabel *notes_label;
  QvExportWriter *writer;

  QvExportContext context;
  gsize n_files;
  gboolean kind_chosen;        /* the user picked the kind: keep it */
  gboolean setting_kind;       /* the section picks it (no user choice) */
};

G_DEFINE_FINAL_TYPE (QvExportSectionDisplace, qv_export_section_displace, GTK_TYPE_WIDGET)

/* In the order of the drop-downs' items. */
static const QvDisplaceKind kinds[] = {
  QV_DISPLACE_PAIR, QV_DISPLACE_SCAN, QV_DISPLACE_GRID, QV_DISPLACE_LEVELS, QV_DISPLACE_ESCAPE,
};
static const QvAmplitudeUnit units[] = {
  QV_AMPLITUDE_DIMENSIONLESS, QV_AMPLITUDE_MASS_WEIGHTED, QV_AMPLITUDE_ANGSTROM, QV_AMPLITUDE_TURNING_POINT,
};

typedef struct {
  QvDisplaceRequest request;
  QvExportFormat format;
} DisplaceOptions;

static void
read_options (QvExportSectionDisplace *self, DisplaceOptions *o)
{
  const guint kind = gtk_drop_down_get_selected (self->kind_drop);
  const guint unit = gtk_drop_down_get_selected (self->unit_drop);

  qv_displace_request_init (&o->request);
  o->request.kind = kinds[MIN (kind, G_N_ELEMENTS (kinds) - 1)];
  o->request.modes[0] = self->context.mode >= 0 ? (gsize) self->context.mode : 0;
  o->request.modes[1] = (gsize) gtk_adjustment_get_value (self->second_adjustment) - 1;
  o->request.unit = units[MIN (unit, G_N_ELEMENTS (units) - 1)];
  o->request.value = gtk_check_button_get_active (self->default_check)
                     ? NAN : gtk_adjustment_get_value (self->value_adjustment);
  o->request.level = self->context.level;
  o->request.points = (guint) gtk_adjustment_get_value (self->points_adjustment);
  qv_export_format_init (&o->format);
  o->format.style = gtk_drop_down_get_selected (self->style_drop) == 1 ? QV_XYZ_PLAIN : QV_XYZ_EXTENDED;
  o->format.single_file = gtk_check_button_get_active (self->single_check);
}

static QvExport *
plan_displace (const QvExportInputs *inputs, gconstpointer options, QvManifest *manifest, GError **error)
{
  const DisplaceOptions *o = options;
  return qv_export_new_displace (inputs->structure, inputs->modes,
                                 inputs->source ? inputs->source->mass_model : QV_MASS_ISOTOPIC, &o->request,
                                 &o->format, manifest, error);
}

/* "A = 1 × turning point at v = 0 = q 1.000 = Q 0.1454 u½ Å = 0.100 Å on atom 3" */
static void
append_amplitude (GString *s, const QvModeSet *modes, const QvAmplitude *a)
{
  g_autofree char *title = qv_export_pane_mode_title (modes, a->mode);

  g_string_append_printf (s, _("%s: A = "), title);
  if (isfinite (a->turning_multiple))
    g_string_append_printf (s, _("%.3g × turning point at v = %u = "), fabs (a->turning_multiple), a->level);
  if (isfinite (a->q))
    g_string_append_printf (s, "q %.4g = ", fabs (a->q));
  /* TRANSLATORS: "Q 0.1454 u½ Å = 0.100 Å on atom 3" */
  g_string_append_printf (s, _("Q %.4g u½ Å = %.3f Å on atom %zu"), fabs (a->Q), fabs (a->max_displacement),
                          a->max_atom + 1);
}

static void
refresh (QvExportSectionDisplace *self)
{
  QvDocument *doc = self->context.document;
  const guint kind = gtk_drop_down_get_selected (self->kind_drop);
  const gboolean grid = kinds[MIN (kind, G_N_ELEMENTS (kinds) - 1)] == QV_DISPLACE_GRID;
  const gboolean points = grid || kinds[MIN (kind, G_N_ELEMENTS (kinds) - 1)] == QV_DISPLACE_SCAN;
  const gboolean by_default = gtk_check_button_get_active (self->default_check);
  g_autoptr(GError) error = NULL;
  g_autoptr(QvExport) plan = NULL;
  DisplaceOptions o;

  gtk_widget_set_visible (self->points_label, points);
  gtk_widget_set_visible (self->points_spin, points);
  gtk_widget_set_visible (self->second_label, grid);
  gtk_widget_set_visible (self->second_spin, grid);
  gtk_widget_set_sensitive (self->value_spin, !by_default);
  gtk_widget_set_sensitive (GTK_WIDGET (self->unit_drop), !by_default);
  self->n_files = 0;
  gtk_label_set_label (self->files_label, "");
  gtk_label_set_label (self->amplitude_label, "");
  qv_export_pane_set_message (self->notes_label, NULL, FALSE);
  if (doc == NULL || self->context.mode < 0)
    {
      qv_export_pane_set_message (self->message_label, _("Select a mode in the list."), FALSE);
      qv_export_writer_set_ready (self->writer, FALSE);
      return;
    }
  gtk_adjustment_set_upper (self->second_adjustment, (double) qv_document_get_modes (doc)->n_modes);
  read_options (self, &o);
  {
    const QvExportInputs borrowed = {
      (QvStructure *) qv_document_get_structure (doc), (QvModeSet *) qv_document_get_modes (doc), NULL,
    };
    plan = plan_displace (&borrowed, &o, qv_manifest_new ("displace"), &error);
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
    gtk_label_set_label (self->files_label, files);
  }
  {
    const QvDisplacementSet *set = qv_export_displacement_set (plan);
    const QvDisplaced *last = &set->structures[set->n_structures - 1];
    g_autoptr(GString) s = g_string_new (NULL);

    for (guint i = 0; i < last->n_amplitudes; i++)
      {
        if (i)
          g_string_append_c (s, '\n');
        append_amplitude (s, qv_document_get_modes (doc), &last->amplitudes[i]);
      }
    gtk_label_set_label (self->amplitude_label, s->str);
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
  QvExportSectionDisplace *self = data;
  QvExportPlanJob *job;
  DisplaceOptions *o;

  if (self->context.document == NULL || self->context.mode < 0)
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE, _("Select a mode in the list."));
      return NULL;
    }
  o = g_new0 (DisplaceOptions, 1);
  read_options (self, o);
  job = g_new0 (QvExportPlanJob, 1);
  job->inputs = qv_export_inputs_new (self->context.document);
  job->command = "displace";
  job->plan = plan_displace;
  job->options = o;
  *func = qv_export_plan_job_run;
  *free_job = qv_export_plan_job_free;
  return job;
}

void
qv_export_section_displace_set_context (QvExportSectionDisplace *self, const QvExportContext *context)
{
  self->context = *context;
  /* Until the user picks a kind, an imaginary mode gets the escape pair
   * (its usual export) and a real one the ± pair. */
  if (!self->kind_chosen && context->document && context->mode >= 0)
    {
      const gboolean imaginary = qv_mode_set_is_imaginary (qv_document_get_modes (context->document),
                                                           (gsize) context->mode);
      self->setting_kind = TRUE;
      gtk_drop_down_set_selected (self->kind_drop, imaginary ? 4 : 0);
      self->setting_kind = FALSE;
    }
  refresh (self);
}

static void
kind_changed (QvExportSectionDisplace *self)
{
  if (!self->setting_kind)
    self->kind_chosen = TRUE;
  refresh (self);
}

void
qv_export_section_displace_set_kind (QvExportSectionDisplace *self, QvDisplaceKind kind)
{
  for (guint i = 0; i < G_N_ELEMENTS (kinds); i++)
    if (kinds[i] == kind)
      gtk_drop_down_set_selected (self->kind_drop, i);
}

void
qv_export_section_displace_set_points (QvExportSectionDisplace *self, guint points)
{
  gtk_adjustment_set_value (self->points_adjustment, points);
}

void
qv_export_section_displace_set_amplitude (QvExportSectionDisplace *self, QvAmplitudeUnit unit, double value)
{
  gtk_check_button_set_active (self->default_check, isnan (value));
  if (isnan (value))
    return;
  for (guint i = 0; i < G_N_ELEMENTS (units); i++)
    if (units[i] == unit)
      gtk_drop_down_set_selected (self->unit_drop, i);
  gtk_adjustment_set_value (self->value_adjustment, value);
}

gsize qv_export_section_displace_get_n_files (QvExportSectionDisplace *self) { return self->n_files; }
const char *qv_export_section_displace_get_preview (QvExportSectionDisplace *self)
{
  return gtk_label_get_label (self->files_label);
}
const char *qv_export_section_displace_get_message (QvExportSectionDisplace *self)
{
  return gtk_label_get_label (self->message_label);
}
const char *qv_export_section_displace_get_notes (QvExportSectionDisplace *self)
{
  return gtk_label_get_label (self->notes_label);
}
QvExportWriter *qv_export_section_displace_get_writer (QvExportSectionDisplace *self) { return self->writer; }

static void
qv_export_section_displace_dispose (GObject *object)
{
  gtk_widget_dispose_template (GTK_WIDGET (object), QV_TYPE_EXPORT_SECTION_DISPLACE);
  G_OBJECT_CLASS (qv_export_section_displace_parent_class)->dispose (object);
}

static void
qv_export_section_displace_class_init (QvExportSectionDisplaceClass *klass)
{
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  G_OBJECT_CLASS (klass)->dispose = qv_export_section_displace_dispose;
  g_type_ensure (QV_TYPE_EXPORT_WRITER);
  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "qvexportsection");
  gtk_widget_class_set_template_from_resource (widget_class,
                                               "/org/quaverlab/Quaver/gui/qv-export-section-displace.ui");
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, box);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, kind_drop);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, points_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, points_spin);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, points_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, second_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, second_spin);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, second_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, value_spin);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, value_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, unit_drop);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, default_check);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, style_drop);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, single_check);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, message_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, files_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, amplitude_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, notes_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionDisplace, writer);
}

static void
qv_export_section_displace_init (QvExportSectionDisplace *self)
{
  gtk_widget_init_template (GTK_WIDGET (self));
  self->context.mode = -1;
  /* One turning point at the list's v, the amplitude a user of the motion
   * bar has seen. */
  gtk_drop_down_set_selected (self->unit_drop, 3);
  gtk_check_button_set_active (self->default_check, TRUE);
  qv_export_writer_set_title (self->writer, _("Choose a Folder for the Displaced Structures"));
  qv_export_writer_set_prepare (self->writer, prepare, self);
  g_signal_connect_object (self->kind_drop, "notify::selected", G_CALLBACK (kind_changed), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->unit_drop, "notify::selected", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->style_drop, "notify::selected", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->points_adjustment, "value-changed", G_CALLBACK (refresh), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->second_adjustment, "value-changed", G_CALLBACK (refresh), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->value_adjustment, "value-changed", G_CALLBACK (refresh), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->default_check, "toggled", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->single_check, "toggled", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  refresh (self);
}
