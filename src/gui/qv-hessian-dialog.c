/* qv-hessian-dialog.c — the Hessian of a geometry.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-config.h"
#include "qv-hessian.h"
#include "qv-hessian-dialog.h"
#include "qv-units.h"

struct _QvHessianDialog
{
  GtkWindow parent_instance;
  GtkLabel *intro_label;
  GtkWidget *cancel_button;
  GtkWidget *open_button;
  GtkWidget *file_button;
  GtkLabel *file_label;
  GtkDropDown *unit_dropdown;
  GtkDropDown *layout_dropdown;
  char *geometry;
  char *hessian;
};

G_DEFINE_FINAL_TYPE (QvHessianDialog, qv_hessian_dialog, GTK_TYPE_WINDOW)

enum { CHOSEN, N_SIGNALS };
static guint signals[N_SIGNALS];

/* Layout entries in the dropdown, in order. */
static const QvHessianLayout layouts[] = {
  QV_HESSIAN_LAYOUT_AUTO, QV_HESSIAN_LAYOUT_FULL, QV_HESSIAN_LAYOUT_LOWER, QV_HESSIAN_LAYOUT_UPPER,
};

static void
update_sensitivity (QvHessianDialog *self)
{
  gtk_widget_set_sensitive (self->open_button, qv_hessian_dialog_can_open (self));
}

gboolean
qv_hessian_dialog_can_open (QvHessianDialog *self)
{
  /* Entry 0 says "choose the units": no unit is assumed. */
  return self->hessian != NULL && gtk_drop_down_get_selected (self->unit_dropdown) > 0
         && gtk_drop_down_get_selected (self->unit_dropdown) != GTK_INVALID_LIST_POSITION;
}

void
qv_hessian_dialog_set_hessian (QvHessianDialog *self, const char *path)
{
  g_autofree char *base = NULL;

  g_free (self->hessian);
  self->hessian = g_strdup (path);
  base = path ? g_path_get_basename (path) : g_strdup (_("Choose…"));
  gtk_label_set_label (self->file_label, base);
  /* A .npy array carries its own layout. */
  gtk_widget_set_sensitive (GTK_WIDGET (self->layout_dropdown), path == NULL || !g_str_has_suffix (path, ".npy"));
  update_sensitivity (self);
}

void
qv_hessian_dialog_set_unit (QvHessianDialog *self, int unit)
{
  gtk_drop_down_set_selected (self->unit_dropdown, unit < 0 ? 0 : (guint) unit + 1);
}

void
qv_hessian_dialog_open (QvHessianDialog *self)
{
  const guint u = gtk_drop_down_get_selected (self->unit_dropdown);
  const guint l = gtk_drop_down_get_selected (self->layout_dropdown);
  QvDocumentSource source = { 0 };

  if (!qv_hessian_dialog_can_open (self))
    return;
  source.geometry = self->geometry;
  source.hessian = self->hessian;
  source.hessian_units = (char *) qv_hessian_unit_name ((QvHessianUnit) (u - 1));
  if (!g_str_has_suffix (self->hessian, ".npy") && l < G_N_ELEMENTS (layouts) && l > 0)
    source.hessian_layout = (char *) qv_hessian_layout_name (layouts[l]);
  g_object_ref (self);
  g_signal_emit (self, signals[CHOSEN], 0, &source);
  gtk_window_destroy (GTK_WINDOW (self));
  g_object_unref (self);
}

static void
chooser_response (GtkNativeDialog *chooser, int response, gpointer data)
{
  QvHessianDialog *self = data;

  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr(GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (chooser));
      g_autofree char *path = file ? g_file_get_path (file) : NULL;
      if (path)
        qv_hessian_dialog_set_hessian (self, path);
    }
  gtk_native_dialog_destroy (chooser);
  g_object_unref (chooser);
  g_object_unref (self);
}

static void
choose_file (QvHessianDialog *self)
{
  GtkFileChooserNative *chooser =
    gtk_file_chooser_native_new (_("Choose the Hessian"), GTK_WINDOW (self), GTK_FILE_CHOOSER_ACTION_OPEN,
                                 _("_Choose"), _("_Cancel"));
  if (self->geometry)
    {
      g_autoptr(GFile) geometry = g_file_new_for_path (self->geometry);
      g_autoptr(GFile) dir = g_file_get_parent (geometry);
      if (dir)
        gtk_file_chooser_set_current_folder (GTK_FILE_CHOOSER (chooser), dir, NULL);
    }
  gtk_native_dialog_set_modal (GTK_NATIVE_DIALOG (chooser), TRUE);
  g_signal_connect (chooser, "response", G_CALLBACK (chooser_response), g_object_ref (self));
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
}

static void
qv_hessian_dialog_finalize (GObject *object)
{
  QvHessianDialog *self = QV_HESSIAN_DIALOG (object);
  g_free (self->geometry);
  g_free (self->hessian);
  G_OBJECT_CLASS (qv_hessian_dialog_parent_class)->finalize (object);
}

static void
qv_hessian_dialog_dispose (GObject *object)
{
  gtk_widget_dispose_template (GTK_WIDGET (object), QV_TYPE_HESSIAN_DIALOG);
  G_OBJECT_CLASS (qv_hessian_dialog_parent_class)->dispose (object);
}

static void
qv_hessian_dialog_class_init (QvHessianDialogClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->finalize = qv_hessian_dialog_finalize;
  object_class->dispose = qv_hessian_dialog_dispose;
  signals[CHOSEN] = g_signal_new ("chosen", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0,
                                  NULL, NULL, NULL, G_TYPE_NONE, 1, G_TYPE_POINTER);
  gtk_widget_class_set_template_from_resource (widget_class, "/org/quaverlab/Quaver/gui/qv-hessian-dialog.ui");
  gtk_widget_class_bind_template_child (widget_class, QvHessianDialog, intro_label);
  gtk_widget_class_bind_template_child (widget_class, QvHessianDialog, cancel_button);
  gtk_widget_class_bind_template_child (widget_class, QvHessianDialog, open_button);
  gtk_widget_class_bind_template_child (widget_class, QvHessianDialog, file_button);
  gtk_widget_class_bind_template_child (widget_class, QvHessianDialog, file_label);
  gtk_widget_class_bind_template_child (widget_class, QvHessianDialog, unit_dropdown);
  gtk_widget_class_bind_template_child (widget_class, QvHessianDialog, layout_dropdown);
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_Escape, 0, "window.close", NULL);
}

static void
qv_hessian_dialog_init (QvHessianDialog *self)
{
  g_autoptr(GtkStringList) units = gtk_string_list_new (NULL);
  g_autoptr(GtkStringList) layout_names = gtk_string_list_new (NULL);

  gtk_widget_init_template (GTK_WIDGET (self));
  gtk_string_list_append (units, _("Choose the units…"));
  for (int u = 0; u < QV_HESSIAN_UNIT_COUNT; u++)
    gtk_string_list_append (units, qv_hessian_unit_name ((QvHessianUnit) u));
  gtk_drop_down_set_model (self->unit_dropdown, G_LIST_MODEL (units));
  gtk_string_list_append (layout_names, _("Detect from the row lengths"));
  gtk_string_list_append (layout_names, _("Full matrix"));
  gtk_string_list_append (layout_names, _("Lower triangle, row by row"));
  gtk_string_list_append (layout_names, _("Upper triangle, row by row"));
  gtk_drop_down_set_model (self->layout_dropdown, G_LIST_MODEL (layout_names));

  g_signal_connect_swapped (self->unit_dropdown, "notify::selected", G_CALLBACK (update_sensitivity), self);
  g_signal_connect_swapped (self->file_button, "clicked", G_CALLBACK (choose_file), self);
  g_signal_connect_swapped (self->open_button, "clicked", G_CALLBACK (qv_hessian_dialog_open), self);
  g_signal_connect_swapped (self->cancel_button, "clicked", G_CALLBACK (gtk_window_destroy), self);
}

QvHessianDialog *
qv_hessian_dialog_new (GtkWindow *parent, const char *geometry)
{
  QvHessianDialog *self = g_object_new (QV_TYPE_HESSIAN_DIALOG, "transient-for", parent, NULL);
  g_autofree char *base = g_path_get_basename (geometry);
  g_autofree char *intro = NULL;

  self->geometry = g_strdup (geometry);
  /* TRANSLATORS: %s is the geometry's file name */
  intro = g_strdup_printf (_("%s is a geometry. Its modes need the Hessian: choose the file and say "
                             "which units it is written in."), base);
  gtk_label_set_label (self->intro_label, intro);
  return self;
}
