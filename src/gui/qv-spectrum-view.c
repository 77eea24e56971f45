/* qv-spectrum-view.c — the spectrum pane.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-config.h"
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-error-dialog.h"
#include "qv-output.h"
#include "qv-png-writer.h"
#include "qv-spectrum-table.h"
#include "qv-spectrum-view.h"

struct _QvSpectrumView
{
  GtkWidget parent_instance;

  GtkStack *stack;
  GtkDropDown *kind_dropdown;
  GtkSpinButton *width_spin;
  GtkDropDown *shape_dropdown;
  GtkDrawingArea *area;
  GtkLabel *none_label;
  GtkLabel *hint_label;
  GtkButton *save_button;

  QvDocument *document;
  QvSpectrumKind kinds[3];       /* the dropdown's entries */
  guint n_kinds;
  QvSpectrumKind kind;
  QvLineShape shape;
  double fwhm;
  int selected;
  QvSpectrum *spectrum;
  gboolean updating;             /* setting the controls from code */
};

G_DEFINE_FINAL_TYPE (QvSpectrumView, qv_spectrum_view, GTK_TYPE_WIDGET)

enum { MODE_ACTIVATED, N_SIGNALS };
static guint signals[N_SIGNALS];

static const char *
kind_name (QvSpectrumKind kind)
{
  switch (kind)
    {
    case QV_SPECTRUM_KIND_IR: return _("IR");
    case QV_SPECTRUM_KIND_RAMAN_ACTIVITY: return _("Raman activity");
    case QV_SPECTRUM_KIND_RAMAN_INTENSITY: return _("Raman, 532 nm, 298 K");
    default: return "";
    }
}

static const char *
kind_unit (QvSpectrumKind kind)
{
  switch (kind)
    {
    case QV_SPECTRUM_KIND_IR: return "km/mol";
    case QV_SPECTRUM_KIND_RAMAN_ACTIVITY: return "Å⁴/u";
    case QV_SPECTRUM_KIND_RAMAN_INTENSITY: return "10⁻³⁰ cm²/sr";
    default: return "";
    }
}

static const QvIntensities *
intensities_of (QvSpectrumView *self)
{
  const QvDocumentAnalysis *a = self->document ? qv_document_get_analysis (self->document) : NULL;
  return a ? a->intensities : NULL;
}

static gboolean
has_kind (const QvIntensities *in, QvSpectrumKind kind)
{
  return in && (kind == QV_SPECTRUM_KIND_IR ? in->has_ir : in->has_raman);
}

/* The sticks of the chosen kind from the core's intensities, broadened by
 * the core: cheap (a few thousand grid points), so on the main thread. */
static void
rebuild (QvSpectrumView *self)
{
  const QvIntensities *in = intensities_of (self);
  g_autofree double *pos = NULL;
  g_autofree double *height = NULL;
  g_autofree guint *mode = NULL;
  QvSpectrumOptions so;
  g_autoptr(GError) error = NULL;

  g_clear_pointer (&self->spectrum, qv_spectrum_free);
  if (!has_kind (in, self->kind))
    {
      gtk_widget_queue_draw (GTK_WIDGET (self->area));
      return;
    }
  pos = g_new (double, MAX (in->n_modes, 1));
  height = g_new (double, MAX (in->n_modes, 1));
  mode = g_new (guint, MAX (in->n_modes, 1));
  for (gsize k = 0; k < in->n_modes; k++)
    {
      const QvModeIntensity *m = &in->modes[k];
      pos[k] = m->wavenumber;
      mode[k] = (guint) k;
      /* NaN heights are left out: imaginary modes, lines without a Stokes side. */
      switch (self->kind)
        {
        case QV_SPECTRUM_KIND_IR: height[k] = m->defined ? m->ir : NAN; break;
        case QV_SPECTRUM_KIND_RAMAN_ACTIVITY: height[k] = m->defined ? m->raman_activity : NAN; break;
        default: height[k] = m->defined && m->raman_defined ? m->raman_intensity : NAN; break;
        }
    }
  qv_spectrum_options_init (&so);
  so.shape = self->shape;
  so.fwhm = self->fwhm;
  self->spectrum = qv_spectrum_new (in->n_modes, pos, height, mode, &so, &error);
  /* A width the core refuses says why where the hint is; the controls stay. */
  gtk_label_set_label (self->hint_label, self->spectrum ? _("Click a peak to select its mode") : error->message);
  if (self->spectrum)
    gtk_widget_remove_css_class (GTK_WIDGET (self->hint_label), "error");
  else
    gtk_widget_add_css_class (GTK_WIDGET (self->hint_label), "error");
  gtk_widget_queue_draw (GTK_WIDGET (self->area));
}

void
qv_spectrum_view_get_plot_options (QvSpectrumView *self, QvSpectrumPlotOptions *o)
{
  qv_spectrum_plot_options_init (o);
  o->width = MAX (gtk_widget_get_width (GTK_WIDGET (self->area)), 1);
  o->height = MAX (gtk_widget_get_height (GTK_WIDGET (self->area)), 1);
  o->selected = self->selected;
  o->n_labels = 8;
  /* The unit on the stick axis, the envelope's per cm⁻¹ (as `quaver spectrum` draws them). */
  o->stick_label = kind_unit (self->kind);
  o->envelope_label = NULL;
}

static void
draw (GtkDrawingArea *area, cairo_t *cr, int width, int height, gpointer data)
{
  QvSpectrumView *self = data;
  QvSpectrumPlotOptions o;
  g_autofree char *envelope = NULL;

  if (self->spectrum == NULL)
    return;
  qv_spectrum_view_get_plot_options (self, &o);
  o.width = width;
  o.height = height;
  /* TRANSLATORS: the envelope's axis: "km/mol per cm⁻¹" */
  envelope = g_strdup_printf (_("%s per cm⁻¹"), kind_unit (self->kind));
  o.envelope_label = envelope;
  /* The plot's own paper colours in both styles: a figure, as exported. */
  qv_spectrum_plot_draw (cr, self->spectrum, &o);
}

int
qv_spectrum_view_click (QvSpectrumView *self, double x, double y)
{
  QvSpectrumPlotOptions o;
  double left, top, right, bottom;
  int k;

  if (self->spectrum == NULL)
    return -1;
  qv_spectrum_view_get_plot_options (self, &o);
  qv_spectrum_plot_area (&o, &left, &top, &right, &bottom);
  /* Only clicks over the data box, not on the axes' labels. */
  if (y < top || y > bottom + 4.0)
    return -1;
  k = qv_spectrum_plot_hit (self->spectrum, &o, x, QV_SPECTRUM_VIEW_HIT_TOLERANCE);
  if (k >= 0)
    g_signal_emit (self, signals[MODE_ACTIVATED], 0, k);
  return k;
}

static void
pressed (GtkGestureClick *gesture, int n_press, double x, double y, gpointer data)
{
  qv_spectrum_view_click (QV_SPECTRUM_VIEW (data), x, y);
}

static gboolean
query_tooltip (GtkWidget *widget, int x, int y, gboolean keyboard, GtkTooltip *tooltip, gpointer data)
{
  QvSpectrumView *self = data;
  const QvIntensities *in = intensities_of (self);
  QvSpectrumPlotOptions o;
  g_autofree char *text = NULL;
  int k;

  if (self->spectrum == NULL || in == NULL || keyboard)
    return FALSE;
  qv_spectrum_view_get_plot_options (self, &o);
  k = qv_spectrum_plot_hit (self->spectrum, &o, x, QV_SPECTRUM_VIEW_HIT_TOLERANCE);
  if (k < 0 || (gsize) k >= in->n_modes)
    return FALSE;
  for (gsize i = 0; i < self->spectrum->n_sticks; i++)
    if ((int) self->spectrum->stick_mode[i] == k)
      {
        /* TRANSLATORS: tooltip of a peak: "Mode 7 · 1043.2 cm⁻¹ · 41.3 km/mol" */
        text = g_strdup_printf (_("Mode %d · %.1f cm⁻¹ · %.4g %s"), k + 1, self->spectrum->stick_position[i],
                                self->spectrum->stick_height[i], kind_unit (self->kind));
        break;
      }
  if (text == NULL)
    return FALSE;
  gtk_tooltip_set_text (tooltip, text);
  return TRUE;
}

/* ---- controls ---- */

static void
fill_kinds (QvSpectrumView *self)
{
  const QvIntensities *in = intensities_of (self);
  g_autoptr(GtkStringList) list = gtk_string_list_new (NULL);
  guint chosen = 0;

  self->n_kinds = 0;
  if (has_kind (in, QV_SPECTRUM_KIND_IR))
    self->kinds[self->n_kinds++] = QV_SPECTRUM_KIND_IR;
  if (has_kind (in, QV_SPECTRUM_KIND_RAMAN_ACTIVITY))
    {
      self->kinds[self->n_kinds++] = QV_SPECTRUM_KIND_RAMAN_ACTIVITY;
      self->kinds[self->n_kinds++] = QV_SPECTRUM_KIND_RAMAN_INTENSITY;
    }
  for (guint i = 0; i < self->n_kinds; i++)
    {
      gtk_string_list_append (list, kind_name (self->kinds[i]));
      if (self->kinds[i] == self->kind)
        chosen = i;
    }
  if (self->n_kinds)
    self->kind = self->kinds[chosen];
  self->updating = TRUE;
  gtk_drop_down_set_model (self->kind_dropdown, G_LIST_MODEL (list));
  gtk_drop_down_set_selected (self->kind_dropdown, chosen);
  self->updating = FALSE;
  /* One kind only: nothing to choose. */
  gtk_widget_set_sensitive (GTK_WIDGET (self->kind_dropdown), self->n_kinds > 1);
}

static void
kind_changed (QvSpectrumView *self)
{
  const guint i = gtk_drop_down_get_selected (self->kind_dropdown);

  if (self->updating || i >= self->n_kinds)
    return;
  self->kind = self->kinds[i];
  rebuild (self);
}

static void
width_changed (QvSpectrumView *self)
{
  if (self->updating)
    return;
  self->fwhm = gtk_spin_button_get_value (self->width_spin);
  rebuild (self);
}

static void
shape_changed (QvSpectrumView *self)
{
  if (self->updating)
    return;
  self->shape = gtk_drop_down_get_selected (self->shape_dropdown) == 1 ? QV_LINE_GAUSSIAN : QV_LINE_LORENTZIAN;
  rebuild (self);
}

gboolean
qv_spectrum_view_set_kind (QvSpectrumView *self, QvSpectrumKind kind)
{
  for (guint i = 0; i < self->n_kinds; i++)
    if (self->kinds[i] == kind)
      {
        gtk_drop_down_set_selected (self->kind_dropdown, i);
        self->kind = kind;
        rebuild (self);
        return TRUE;
      }
  return FALSE;
}

void
qv_spectrum_view_set_width (QvSpectrumView *self, double fwhm)
{
  gtk_spin_button_set_value (self->width_spin, fwhm);
  self->fwhm = gtk_spin_button_get_value (self->width_spin);
  rebuild (self);
}

void
qv_spectrum_view_set_shape (QvSpectrumView *self, QvLineShape shape)
{
  gtk_drop_down_set_selected (self->shape_dropdown, shape == QV_LINE_GAUSSIAN ? 1 : 0);
  self->shape = shape;
  rebuild (self);
}

/* ---- document ---- */

void
qv_spectrum_view_set_document (QvSpectrumView *self, QvDocument *doc)
{
  const QvDocumentAnalysis *a;

  g_set_object (&self->document, doc);
  a = doc ? qv_document_get_analysis (doc) : NULL;
  fill_kinds (self);
  rebuild (self);
  if (a && a->intensities)
    gtk_stack_set_visible_child_name (self->stack, "plot");
  else
    {
      gtk_label_set_label (self->none_label,
                           a && a->intensity_note ? a->intensity_note
                           : _("Open a document to see its spectrum."));
      gtk_stack_set_visible_child_name (self->stack, "none");
    }
}

void
qv_spectrum_view_set_selected (QvSpectrumView *self, int mode)
{
  if (self->selected == mode)
    return;
  self->selected = mode;
  gtk_widget_queue_draw (GTK_WIDGET (self->area));
}

gboolean
qv_spectrum_view_has_spectrum (QvSpectrumView *self)
{
  return self->spectrum != NULL;
}

const QvSpectrum *
qv_spectrum_view_get_spectrum (QvSpectrumView *self)
{
  return self->spectrum;
}

/* ---- saving ---- */

gboolean
qv_spectrum_view_save (QvSpectrumView *self, const char *path, gboolean force, GError **error)
{
  const char *dot = strrchr (path, '.');
  QvSpectrumPlotOptions o;
  int width = MAX (gtk_widget_get_width (GTK_WIDGET (self->area)), 640);
  int height = MAX (gtk_widget_get_height (GTK_WIDGET (self->area)), 360);
  gsize length = 0;
  g_autofree guint8 *bytes = NULL;

  if (self->spectrum == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s", _("There is no spectrum to save"));
      return FALSE;
    }
  qv_spectrum_view_get_plot_options (self, &o);
  o.width = width;
  o.height = height;
  if (dot && g_ascii_strcasecmp (dot, ".csv") == 0)
    {
      const char *quantity = self->kind == QV_SPECTRUM_KIND_IR ? "ir"
                             : self->kind == QV_SPECTRUM_KIND_RAMAN_INTENSITY ? "raman" : "raman_activity";
      const char *unit = self->kind == QV_SPECTRUM_KIND_IR ? "km/mol"
                         : self->kind == QV_SPECTRUM_KIND_RAMAN_INTENSITY ? "1e-30 cm^2/sr" : "A^4/u";
      char *text = qv_spectrum_table_envelope_csv (self->spectrum, quantity, unit);
      length = strlen (text);
      bytes = (guint8 *) text;
    }
  else if (dot && g_ascii_strcasecmp (dot, ".svg") == 0)
    {
      bytes = (guint8 *) qv_spectrum_plot_svg (self->spectrum, &o, &length, error);
      if (bytes == NULL)
        return FALSE;
    }
  else if (dot && g_ascii_strcasecmp (dot, ".png") == 0)
    {
      g_autofree guint8 *rgba = qv_spectrum_plot_rgba (self->spectrum, &o, error);
      const char *text[] = { "Software", "quaver " QV_VERSION, NULL };
      if (rgba == NULL)
        return FALSE;
      bytes = qv_png_encode (rgba, o.width, o.height, FALSE, text, &length, error);
      if (bytes == NULL)
        return FALSE;
    }
  else
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s",
                   _("End the file name in .csv, .png or .svg to choose the format"));
      return FALSE;
    }
  return qv_output_write (path, (const char *) bytes, length, force, error);
}

static void
save_response (GtkNativeDialog *chooser, int response, gpointer data)
{
  QvSpectrumView *self = data;

  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr(GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (chooser));
      g_autofree char *path = file ? g_file_get_path (file) : NULL;
      g_autoptr(GError) error = NULL;

      /* The chooser has asked before replacing a file. */
      if (path && !qv_spectrum_view_save (self, path, TRUE, &error))
        {
          qv_error_dialog_show (GTK_WIDGET (self), _("The spectrum could not be saved"), error);
        }
    }
  gtk_native_dialog_destroy (chooser);
  g_object_unref (chooser);
  g_object_unref (self);
}

static void
save_clicked (QvSpectrumView *self)
{
  GtkRoot *root = gtk_widget_get_root (GTK_WIDGET (self));
  GtkFileChooserNative *chooser =
    gtk_file_chooser_native_new (_("Save the Spectrum"), GTK_IS_WINDOW (root) ? GTK_WINDOW (root) : NULL,
                                 GTK_FILE_CHOOSER_ACTION_SAVE, _("_Save"), _("_Cancel"));

  gtk_file_chooser_set_current_name (GTK_FILE_CHOOSER (chooser), "spectrum.svg");
  gtk_native_dialog_set_modal (GTK_NATIVE_DIALOG (chooser), TRUE);
  g_signal_connect (chooser, "response", G_CALLBACK (save_response), g_object_ref (self));
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
}

/* ---- GObject ---- */

static void
qv_spectrum_view_dispose (GObject *object)
{
  QvSpectrumView *self = QV_SPECTRUM_VIEW (object);

  g_clear_object (&self->document);
  g_clear_pointer (&self->spectrum, qv_spectrum_free);
  gtk_widget_dispose_template (GTK_WIDGET (self), QV_TYPE_SPECTRUM_VIEW);
  G_OBJECT_CLASS (qv_spectrum_view_parent_class)->dispose (object);
}

static void
qv_spectrum_view_class_init (QvSpectrumViewClass *klass)
{
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  G_OBJECT_CLASS (klass)->dispose = qv_spectrum_view_dispose;
  /* A peak was clicked: its 0-based mode. */
  signals[MODE_ACTIVATED] = g_signal_new ("mode-activated", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST,
                                          0, NULL, NULL, NULL, G_TYPE_NONE, 1, G_TYPE_INT);
  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "qvspectrumview");
  gtk_widget_class_set_template_from_resource (widget_class, "/org/quaverlab/Quaver/gui/qv-spectrum-view.ui");
  gtk_widget_class_bind_template_child (widget_class, QvSpectrumView, stack);
  gtk_widget_class_bind_template_child (widget_class, QvSpectrumView, kind_dropdown);
  gtk_widget_class_bind_template_child (widget_class, QvSpectrumView, width_spin);
  gtk_widget_class_bind_template_child (widget_class, QvSpectrumView, shape_dropdown);
  gtk_widget_class_bind_template_child (widget_class, QvSpectrumView, area);
  gtk_widget_class_bind_template_child (widget_class, QvSpectrumView, none_label);
  gtk_widget_class_bind_template_child (widget_class, QvSpectrumView, hint_label);
  gtk_widget_class_bind_template_child (widget_class, QvSpectrumView, save_button);
}

static void
qv_spectrum_view_init (QvSpectrumView *self)
{
  GtkGesture *click;
  const char *shapes[] = { _("Lorentzian"), _("Gaussian"), NULL };
  g_autoptr(GtkStringList) shape_list = gtk_string_list_new (shapes);

  gtk_widget_init_template (GTK_WIDGET (self));
  self->selected = -1;
  self->kind = QV_SPECTRUM_KIND_IR;
  self->shape = QV_LINE_LORENTZIAN;
  self->fwhm = QV_SPECTRUM_DEFAULT_FWHM;
  gtk_drop_down_set_model (self->shape_dropdown, G_LIST_MODEL (shape_list));
  gtk_spin_button_set_value (self->width_spin, self->fwhm);
  gtk_drawing_area_set_draw_func (self->area, draw, self, NULL);
  click = gtk_gesture_click_new ();
  g_signal_connect (click, "pressed", G_CALLBACK (pressed), self);
  gtk_widget_add_controller (GTK_WIDGET (self->area), GTK_EVENT_CONTROLLER (click));
  gtk_widget_set_has_tooltip (GTK_WIDGET (self->area), TRUE);
  g_signal_connect (self->area, "query-tooltip", G_CALLBACK (query_tooltip), self);
  g_signal_connect_swapped (self->kind_dropdown, "notify::selected", G_CALLBACK (kind_changed), self);
  g_signal_connect_swapped (self->shape_dropdown, "notify::selected", G_CALLBACK (shape_changed), self);
  g_signal_connect_swapped (self->width_spin, "value-changed", G_CALLBACK (width_changed), self);
  g_signal_connect_swapped (self->save_button, "clicked", G_CALLBACK (save_clicked), self);
  qv_spectrum_view_set_document (self, NULL);
}
