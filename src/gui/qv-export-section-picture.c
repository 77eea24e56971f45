/* qv-export-section-picture.c — qv_picture_render + qv_png_encode and
 * qv_picture_svg on a worker (offscreen EGL, its own context), written
 * atomically into the chosen folder (qv-output-dir).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include <math.h>
#include "qv-config.h"
#include "qv-error.h"
#include "qv-export-section-picture.h"
#include "qv-output-dir.h"
#include "qv-png-writer.h"

struct _QvExportSectionPicture
{
  GtkWidget parent_instance;
  GtkWidget *box;
  GtkDropDown *format_drop;
  GtkAdjustment *width_adjustment;
  GtkAdjustment *height_adjustment;
  GtkAdjustment *supersample_adjustment;
  GtkCheckButton *arrows_check;
  GtkCheckButton *labels_check;
  GtkCheckButton *ghost_check;
  GtkCheckButton *transparent_check;
  GtkCheckButton *fit_check;
  GtkLabel *message_label;
  GtkLabel *files_label;
  GtkLabel *detail_label;
  QvExportWriter *writer;

  QvExportContext context;
};

G_DEFINE_FINAL_TYPE (QvExportSectionPicture, qv_export_section_picture, GTK_TYPE_WIDGET)

/* Of the ghost overlay when it is on (the CLI's default too). */
#define GHOST_ALPHA 0.35f

gboolean
qv_export_picture_request (QvPictureRequest *r, const QvExportContext *context,
                           const QvStructure *structure, const QvModeSet *modes, gboolean fit)
{
  QvModeView *view;
  gboolean participation = FALSE, dark = FALSE, arrows = TRUE, labels = FALSE;
  double Q;
  gsize atom = 0;

  qv_picture_request_init (r, structure);
  if (context->mode < 0 || modes == NULL || (gsize) context->mode >= modes->n_modes)
    return FALSE;
  r->modes = modes;
  r->mode = (gsize) context->mode;
  /* The amplitude the window shows: the motion bar's multiple of the
   * turning point at v (or of the fixed scale of a mode without one). */
  Q = qv_mode_set_display_amplitude (modes, r->mode, context->level, context->multiple, NULL);
  r->max_displacement = qv_mode_set_max_displacement (modes, r->mode, Q, &atom);
  if (context->window)
    {
      view = qv_window_get_mode_view (context->window);
      g_object_get (view, "show-arrows", &arrows, "show-labels", &labels,
                    "participation-colouring", &participation, "dark", &dark, NULL);
      qv_mode_view_get_camera (view, &r->camera);
    }
  r->options.arrows = arrows;
  r->options.labels = labels;
  r->options.colouring = participation ? QV_COLOUR_PARTICIPATION : QV_COLOUR_ELEMENT;
  r->options.background = dark ? QV_BACKGROUND_DARK : QV_BACKGROUND_LIGHT;
  if (fit)
    qv_picture_fit_camera (r);
  return TRUE;
}

char **
qv_export_picture_text (const QvPictureRequest *r, const char *source)
{
  GPtrArray *t = g_ptr_array_new ();
  const float *o = r->camera.orientation;
  const double w = qv_mode_set_wavenumber (r->modes, r->mode);

  g_ptr_array_add (t, g_strdup ("Software"));
  g_ptr_array_add (t, g_strdup ("quaver " QV_VERSION));
  g_ptr_array_add (t, g_strdup ("Source"));
  g_ptr_array_add (t, g_strdup (source ? source : "(app)"));
  g_ptr_array_add (t, g_strdup ("Description"));
  g_ptr_array_add (t, g_strdup_printf ("normal mode %zu (%.2f%s cm^-1), largest displacement %.4f A, "
                                       "phase %.1f deg", r->mode + 1, fabs (w), w < 0 ? "i" : "",
                                       r->max_displacement, r->phase * 180.0 / G_PI));
  g_ptr_array_add (t, g_strdup ("quaver:orientation"));
  g_ptr_array_add (t, g_strdup_printf ("%.6f,%.6f,%.6f,%.6f", o[0], o[1], o[2], o[3]));
  g_ptr_array_add (t, NULL);
  return (char **) g_ptr_array_free (t, FALSE);
}

/* ---- the job ---- */

typedef struct {
  QvExportInputs *inputs;
  QvPictureRequest request;    /* points into @inputs */
  gboolean png, svg;
  char *base;                  /* "mode7" */
  char *source;                /* for the PNG's Source chunk */
} PictureJob;

static void
picture_job_free (gpointer data)
{
  PictureJob *job = data;

  qv_export_inputs_free (job->inputs);
  g_free (job->base);
  g_free (job->source);
  g_free (job);
}

static gboolean
picture_job_run (gpointer data, const char *directory, gboolean force, const QvProgress *progress,
                 GPtrArray *written, GError **error)
{
  PictureJob *job = data;
  g_autoptr(QvOutputDir) dir = NULL;

  if (!qv_progress_report (progress, 0.0, N_("Drawing"), error)
      || (dir = qv_output_dir_open (directory, force, error)) == NULL)
    return FALSE;
  if (job->png)
    {
      g_autofree guint8 *rgba = qv_picture_render (&job->request, error);
      g_auto(GStrv) text = NULL;
      g_autofree guint8 *png = NULL;
      g_autofree char *name = g_strdup_printf ("%s.png", job->base);
      gsize length = 0;

      if (rgba == NULL || !qv_progress_report (progress, 0.6, N_("Writing"), error))
        return FALSE;
      text = qv_export_picture_text (&job->request, job->source);
      png = qv_png_encode (rgba, job->request.width, job->request.height, !job->request.options.transparent,
                           (const char *const *) text, &length, error);
      if (png == NULL || !qv_output_dir_write (dir, name, (const char *) png, length, error))
        return FALSE;
      g_ptr_array_add (written, g_steal_pointer (&name));
    }
  if (job->svg)
    {
      gsize length = 0;
      g_autofree char *svg = NULL;
      g_autofree char *name = g_strdup_printf ("%s.svg", job->base);

      if (!qv_progress_report (progress, 0.8, N_("Drawing"), error)
          || (svg = qv_picture_svg (&job->request, &length, error)) == NULL
          || !qv_output_dir_write (dir, name, svg, length, error))
        return FALSE;
      g_ptr_array_add (written, g_steal_pointer (&name));
    }
  return qv_progress_report (progress, 1.0, N_("Done"), error);
}

/* ---- the section ---- */

static void
read_request (QvExportSectionPicture *self, QvPictureRequest *r)
{
  r->width = (int) gtk_adjustment_get_value (self->width_adjustment);
  r->height = (int) gtk_adjustment_get_value (self->height_adjustment);
  r->supersample = (int) gtk_adjustment_get_value (self->supersample_adjustment);
  r->options.arrows = gtk_check_button_get_active (self->arrows_check);
  r->options.labels = gtk_check_button_get_active (self->labels_check);
  r->options.transparent = gtk_check_button_get_active (self->transparent_check);
  r->options.ghost_alpha = gtk_check_button_get_active (self->ghost_check) ? GHOST_ALPHA : 0.0f;
  r->options.ghost_phase = 0.0f;
  /* At rest with arrows; with a ghost the + extreme shows beside it. */
  r->phase = G_PI / 2;
}

static void
refresh (QvExportSectionPicture *self)
{
  QvDocument *doc = self->context.document;
  const guint format = gtk_drop_down_get_selected (self->format_drop);
  QvPictureRequest r;
  g_autofree char *files = NULL;
  g_autofree char *detail = NULL;
  g_autofree char *title = NULL;
  const int k = self->context.mode;

  gtk_label_set_label (self->files_label, "");
  gtk_label_set_label (self->detail_label, "");
  if (doc == NULL || k < 0)
    {
      qv_export_pane_set_message (self->message_label, _("Select a mode in the list."), FALSE);
      qv_export_writer_set_ready (self->writer, FALSE);
      return;
    }
  qv_export_pane_set_message (self->message_label, NULL, FALSE);
  qv_export_picture_request (&r, &self->context, qv_document_get_structure (doc), qv_document_get_modes (doc),
                             FALSE);
  read_request (self, &r);
  title = qv_export_pane_mode_title (qv_document_get_modes (doc), (gsize) k);
  files = format == 0 ? g_strdup_printf ("mode%d.png", k + 1)
          : format == 1 ? g_strdup_printf ("mode%d.svg", k + 1)
          : g_strdup_printf ("mode%d.png, mode%d.svg", k + 1, k + 1);
  /* TRANSLATORS: "1200 × 900 px (drawn at 2400 × 1800) of mode 7 (958.9 cm⁻¹); largest displacement 0.115 Å, …" */
  detail = g_strdup_printf (_("%d × %d px (drawn at %d × %d) of %s; largest displacement %.3f Å, as the motion bar sets it"),
                            r.width, r.height, r.width * r.supersample, r.height * r.supersample, title,
                            r.max_displacement);
  gtk_label_set_label (self->files_label, files);
  gtk_label_set_label (self->detail_label, detail);
  qv_export_writer_set_ready (self->writer, TRUE);
}

static gpointer
prepare (gpointer data, QvExportJobFunc *func, GDestroyNotify *free_job, GError **error)
{
  QvExportSectionPicture *self = data;
  const guint format = gtk_drop_down_get_selected (self->format_drop);
  PictureJob *job;

  if (self->context.document == NULL || self->context.mode < 0)
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE, _("Select a mode in the list."));
      return NULL;
    }
  job = g_new0 (PictureJob, 1);
  job->inputs = qv_export_inputs_new (self->context.document);
  qv_export_picture_request (&job->request, &self->context, job->inputs->structure, job->inputs->modes,
                             FALSE);
  read_request (self, &job->request);
  if (gtk_check_button_get_active (self->fit_check))
    qv_picture_fit_camera (&job->request);
  job->png = format != 1;
  job->svg = format != 0;
  job->base = g_strdup_printf ("mode%d", self->context.mode + 1);
  job->source = g_strdup (qv_document_get_path (self->context.document));
  *func = picture_job_run;
  *free_job = picture_job_free;
  return job;
}

void
qv_export_section_picture_set_context (QvExportSectionPicture *self, const QvExportContext *context)
{
  QvModeView *view = context->window ? qv_window_get_mode_view (context->window) : NULL;
  const gboolean first = self->context.window == NULL && view != NULL;

  self->context = *context;
  /* The view's arrows and labels are where the options start. */
  if (first)
    {
      gboolean arrows = TRUE, labels = FALSE;
      g_object_get (view, "show-arrows", &arrows, "show-labels", &labels, NULL);
      gtk_check_button_set_active (self->arrows_check, arrows);
      gtk_check_button_set_active (self->labels_check, labels);
    }
  refresh (self);
}

void
qv_export_section_picture_set_size (QvExportSectionPicture *self, int width, int height)
{
  gtk_adjustment_set_value (self->width_adjustment, width);
  gtk_adjustment_set_value (self->height_adjustment, height);
}

void
qv_export_section_picture_set_format (QvExportSectionPicture *self, guint format)
{
  gtk_drop_down_set_selected (self->format_drop, MIN (format, 2));
}

const char *qv_export_section_picture_get_preview (QvExportSectionPicture *self)
{
  return gtk_label_get_label (self->files_label);
}
QvExportWriter *qv_export_section_picture_get_writer (QvExportSectionPicture *self) { return self->writer; }

static void
qv_export_section_picture_dispose (GObject *object)
{
  gtk_widget_dispose_template (GTK_WIDGET (object), QV_TYPE_EXPORT_SECTION_PICTURE);
  G_OBJECT_CLASS (qv_export_section_picture_parent_class)->dispose (object);
}

static void
qv_export_section_picture_class_init (QvExportSectionPictureClass *klass)
{
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  G_OBJECT_CLASS (klass)->dispose = qv_export_section_picture_dispose;
  g_type_ensure (QV_TYPE_EXPORT_WRITER);
  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "qvexportsection");
  gtk_widget_class_set_template_from_resource (widget_class,
                                               "/org/quaverlab/Quaver/gui/qv-export-section-picture.ui");
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionPicture, box);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionPicture, format_drop);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionPicture, width_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionPicture, height_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionPicture, supersample_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionPicture, arrows_check);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionPicture, labels_check);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionPicture, ghost_check);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionPicture, transparent_check);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionPicture, fit_check);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionPicture, message_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionPicture, files_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionPicture, detail_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionPicture, writer);
}

static void
qv_export_section_picture_init (QvExportSectionPicture *self)
{
  GObject *controls[5];

  gtk_widget_init_template (GTK_WIDGET (self));
  self->context.mode = -1;
  qv_export_writer_set_title (self->writer, _("Choose a Folder for the Picture"));
  qv_export_writer_set_prepare (self->writer, prepare, self);
  controls[0] = G_OBJECT (self->format_drop);
  controls[1] = G_OBJECT (self->arrows_check);
  controls[2] = G_OBJECT (self->labels_check);
  controls[3] = G_OBJECT (self->ghost_check);
  controls[4] = G_OBJECT (self->transparent_check);
  g_signal_connect_object (controls[0], "notify::selected", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  for (guint i = 1; i < G_N_ELEMENTS (controls); i++)
    g_signal_connect_object (controls[i], "toggled", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->width_adjustment, "value-changed", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->height_adjustment, "value-changed", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->supersample_adjustment, "value-changed", G_CALLBACK (refresh), self,
                           G_CONNECT_SWAPPED);
  refresh (self);
}
