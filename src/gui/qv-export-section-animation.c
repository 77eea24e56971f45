/* qv-export-section-animation.c — qv_picture_render_frames + qv_gif_encode
 * for the GIF, qv_picture_frame_positions + qv-xyz for the multi-frame
 * XYZ, on a worker, written atomically into the chosen folder.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include <math.h>
#include "qv-config.h"
#include "qv-error.h"
#include "qv-export-section-animation.h"
#include "qv-export-section-picture.h"
#include "qv-gif-writer.h"
#include "qv-output-dir.h"
#include "qv-xyz.h"

struct _QvExportSectionAnimation
{
  GtkWidget parent_instance;
  GtkWidget *box;
  GtkDropDown *format_drop;
  GtkAdjustment *width_adjustment;
  GtkAdjustment *height_adjustment;
  GtkAdjustment *frames_adjustment;
  GtkAdjustment *period_adjustment;
  GtkCheckButton *labels_check;
  GtkCheckButton *transparent_check;
  GtkCheckButton *fit_check;
  GtkLabel *message_label;
  GtkLabel *files_label;
  GtkLabel *detail_label;
  QvExportWriter *writer;

  QvExportContext context;
};

G_DEFINE_FINAL_TYPE (QvExportSectionAnimation, qv_export_section_animation, GTK_TYPE_WIDGET)

/* ---- the job ---- */

typedef struct {
  QvExportInputs *inputs;
  QvPictureRequest request;    /* points into @inputs */
  gboolean gif, xyz;
  double period;               /* s */
  char *base;                  /* "mode7" */
} AnimationJob;

static void
animation_job_free (gpointer data)
{
  AnimationJob *job = data;

  qv_export_inputs_free (job->inputs);
  g_free (job->base);
  g_free (job);
}

/* Whole hundredths per frame, spread so that one period adds up (as the
 * CLI does); FALSE when some had to be raised to GIF's shortest. */
static gboolean
frame_delays (guint n, double period, guint *delays)
{
  gboolean raised = FALSE;

  for (guint k = 0; k < n; k++)
    {
      const double t0 = round (100.0 * period * k / n), t1 = round (100.0 * period * (k + 1) / n);
      delays[k] = (guint) MAX (t1 - t0, 0.0);
      if (delays[k] < QV_GIF_MIN_DELAY_CS)
        {
          delays[k] = QV_GIF_MIN_DELAY_CS;
          raised = TRUE;
        }
    }
  return !raised;
}

/* Progress of a part of the job, [from, to] of the whole. */
typedef struct {
  const QvProgress *whole;
  double from, to;
} Part;

static gboolean
part_progress (double fraction, const char *stage, gpointer data)
{
  Part *p = data;
  return p->whole == NULL || p->whole->func == NULL
         || p->whole->func (p->from + (p->to - p->from) * fraction, stage, p->whole->user_data);
}

static gboolean
animation_job_run (gpointer data, const char *directory, gboolean force, const QvProgress *progress,
                   GPtrArray *written, GError **error)
{
  AnimationJob *job = data;
  const QvPictureRequest *r = &job->request;
  g_autoptr(QvOutputDir) dir = NULL;

  if (!qv_progress_report (progress, 0.0, N_("Drawing"), error)
      || (dir = qv_output_dir_open (directory, force, error)) == NULL)
    return FALSE;
  if (job->xyz)
    {
      const QvStructure *s = job->inputs->structure;
      g_autofree double *x = g_new (double, 3 * s->n_atoms);
      g_autoptr(GString) text = g_string_new (NULL);
      g_autofree char *name = g_strdup_printf ("%s-frames.xyz", job->base);
      char mode_buf[24], k_buf[24], phase_buf[G_ASCII_DTOSTR_BUF_SIZE], d_buf[G_ASCII_DTOSTR_BUF_SIZE];

      g_snprintf (mode_buf, sizeof mode_buf, "%zu", r->mode + 1);
      g_ascii_dtostr (d_buf, sizeof d_buf, r->max_displacement);
      for (guint k = 0; k < r->n_frames; k++)
        {
          QvXyzPair pairs[] = { { "mode", mode_buf }, { "frame", k_buf }, { "phase_deg", phase_buf },
                                { "max_displacement", d_buf } };
          QvXyzFrame frame = { .style = QV_XYZ_EXTENDED, .precision = QV_XYZ_FIXED,
                               .positions = x, .pairs = pairs, .n_pairs = G_N_ELEMENTS (pairs) };
          g_snprintf (k_buf, sizeof k_buf, "%u", k);
          g_ascii_formatd (phase_buf, sizeof phase_buf, "%.4f", 360.0 * k / r->n_frames);
          qv_picture_frame_positions (r, k, x);
          qv_xyz_append_frame (text, s, &frame);
        }
      if (!qv_output_dir_write (dir, name, text->str, text->len, error))
        return FALSE;
      g_ptr_array_add (written, g_steal_pointer (&name));
    }
  if (job->gif)
    {
      Part draw = { progress, 0.05, 0.65 }, encode = { progress, 0.65, 0.98 };
      const QvProgress draw_progress = { part_progress, &draw }, encode_progress = { part_progress, &encode };
      g_autofree guint *delays = g_new (guint, r->n_frames);
      g_auto(GStrv) images = NULL;
      g_autofree guint8 *gif = NULL;
      g_autofree char *name = g_strdup_printf ("%s.gif", job->base);
      gsize length = 0;

      images = (GStrv) qv_picture_render_frames (r, &draw_progress, error);
      if (images == NULL)
        return FALSE;
      frame_delays (r->n_frames, job->period, delays);
      {
        QvGifFrames frames = {
          .width = r->width, .height = r->height, .n_frames = r->n_frames,
          .rgba = (const guint8 *const *) images, .delays_cs = delays,
          .transparent = r->options.transparent,
        };
        gif = qv_gif_encode (&frames, &encode_progress, &length, error);
      }
      if (gif == NULL || !qv_output_dir_write (dir, name, (const char *) gif, length, error))
        return FALSE;
      g_ptr_array_add (written, g_steal_pointer (&name));
    }
  return qv_progress_report (progress, 1.0, N_("Done"), error);
}

/* ---- the section ---- */

static void
read_request (QvExportSectionAnimation *self, QvPictureRequest *r)
{
  r->width = (int) gtk_adjustment_get_value (self->width_adjustment);
  r->height = (int) gtk_adjustment_get_value (self->height_adjustment);
  r->n_frames = (guint) gtk_adjustment_get_value (self->frames_adjustment);
  r->supersample = 1;
  /* Arrows would stand still while the atoms move. */
  r->options.arrows = FALSE;
  r->options.labels = gtk_check_button_get_active (self->labels_check);
  r->options.transparent = gtk_check_button_get_active (self->transparent_check);
}

static void
refresh (QvExportSectionAnimation *self)
{
  QvDocument *doc = self->context.document;
  const guint format = gtk_drop_down_get_selected (self->format_drop);
  const double period = gtk_adjustment_get_value (self->period_adjustment);
  const int k = self->context.mode;
  QvPictureRequest r;
  g_autofree char *files = NULL;
  g_autofree char *detail = NULL;
  g_autofree char *title = NULL;
  g_autofree guint *delays = NULL;
  gboolean kept;

  gtk_label_set_label (self->files_label, "");
  gtk_label_set_label (self->detail_label, "");
  if (doc == NULL || k < 0)
    {
      qv_export_pane_set_message (self->message_label, _("Select a mode in the list."), FALSE);
      qv_export_writer_set_ready (self->writer, FALSE);
      return;
    }
  qv_export_picture_request (&r, &self->context, qv_document_get_structure (doc), qv_document_get_modes (doc),
                             FALSE);
  read_request (self, &r);
  delays = g_new (guint, r.n_frames);
  kept = frame_delays (r.n_frames, period, delays);
  qv_export_pane_set_message (self->message_label,
                              kept || format == 1 ? NULL
                              : _("GIF viewers show no frame shorter than 0.02 s: each frame will last 0.02 s. Use fewer frames or a longer cycle."),
                              FALSE);
  title = qv_export_pane_mode_title (qv_document_get_modes (doc), (gsize) k);
  files = format == 0 ? g_strdup_printf ("mode%d.gif", k + 1)
          : format == 1 ? g_strdup_printf ("mode%d-frames.xyz", k + 1)
          : g_strdup_printf ("mode%d.gif, mode%d-frames.xyz", k + 1, k + 1);
  /* TRANSLATORS: "30 frames of 800 × 600 px, one cycle of 1.20 s, looping; mode 7 (958.9 cm⁻¹), largest displacement 0.115 Å" */
  detail = g_strdup_printf (_("%u frames of %d × %d px, one cycle of %.2f s, looping; %s, largest displacement %.3f Å"),
                            r.n_frames, r.width, r.height, period, title, r.max_displacement);
  gtk_label_set_label (self->files_label, files);
  gtk_label_set_label (self->detail_label, detail);
  qv_export_writer_set_ready (self->writer, TRUE);
}

static gpointer
prepare (gpointer data, QvExportJobFunc *func, GDestroyNotify *free_job, GError **error)
{
  QvExportSectionAnimation *self = data;
  const guint format = gtk_drop_down_get_selected (self->format_drop);
  AnimationJob *job;

  if (self->context.document == NULL || self->context.mode < 0)
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE, _("Select a mode in the list."));
      return NULL;
    }
  job = g_new0 (AnimationJob, 1);
  job->inputs = qv_export_inputs_new (self->context.document);
  qv_export_picture_request (&job->request, &self->context, job->inputs->structure, job->inputs->modes,
                             FALSE);
  read_request (self, &job->request);
  if (gtk_check_button_get_active (self->fit_check))
    qv_picture_fit_camera (&job->request);
  job->gif = format != 1;
  job->xyz = format != 0;
  job->period = gtk_adjustment_get_value (self->period_adjustment);
  job->base = g_strdup_printf ("mode%d", self->context.mode + 1);
  *func = animation_job_run;
  *free_job = animation_job_free;
  return job;
}

void
qv_export_section_animation_set_context (QvExportSectionAnimation *self, const QvExportContext *context)
{
  self->context = *context;
  refresh (self);
}

void
qv_export_section_animation_set_frames (QvExportSectionAnimation *self, guint n_frames)
{
  gtk_adjustment_set_value (self->frames_adjustment, n_frames);
}

void
qv_export_section_animation_set_size (QvExportSectionAnimation *self, int width, int height)
{
  gtk_adjustment_set_value (self->width_adjustment, width);
  gtk_adjustment_set_value (self->height_adjustment, height);
}

void
qv_export_section_animation_set_format (QvExportSectionAnimation *self, guint format)
{
  gtk_drop_down_set_selected (self->format_drop, MIN (format, 2));
}

const char *qv_export_section_animation_get_preview (QvExportSectionAnimation *self)
{
  return gtk_label_get_label (self->files_label);
}
QvExportWriter *qv_export_section_animation_get_writer (QvExportSectionAnimation *self) { return self->writer; }

static void
qv_export_section_animation_dispose (GObject *object)
{
  gtk_widget_dispose_template (GTK_WIDGET (object), QV_TYPE_EXPORT_SECTION_ANIMATION);
  G_OBJECT_CLASS (qv_export_section_animation_parent_class)->dispose (object);
}

static void
qv_export_section_animation_class_init (QvExportSectionAnimationClass *klass)
{
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  G_OBJECT_CLASS (klass)->dispose = qv_export_section_animation_dispose;
  g_type_ensure (QV_TYPE_EXPORT_WRITER);
  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "qvexportsection");
  gtk_widget_class_set_template_from_resource (widget_class,
                                               "/org/quaverlab/Quaver/gui/qv-export-section-animation.ui");
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionAnimation, box);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionAnimation, format_drop);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionAnimation, width_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionAnimation, height_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionAnimation, frames_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionAnimation, period_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionAnimation, labels_check);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionAnimation, transparent_check);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionAnimation, fit_check);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionAnimation, message_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionAnimation, files_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionAnimation, detail_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionAnimation, writer);
}

static void
qv_export_section_animation_init (QvExportSectionAnimation *self)
{
  gtk_widget_init_template (GTK_WIDGET (self));
  self->context.mode = -1;
  qv_export_writer_set_title (self->writer, _("Choose a Folder for the Animation"));
  qv_export_writer_set_prepare (self->writer, prepare, self);
  g_signal_connect_object (self->format_drop, "notify::selected", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->labels_check, "toggled", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->transparent_check, "toggled", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->width_adjustment, "value-changed", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->height_adjustment, "value-changed", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->frames_adjustment, "value-changed", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->period_adjustment, "value-changed", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  refresh (self);
}
