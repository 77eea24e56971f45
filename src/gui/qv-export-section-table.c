/* qv-export-section-table.c — the mode table: qv_mode_table_columns with
 * the columns ticked here, copied or saved atomically (qv_output_write).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-config.h"
#include "qv-export-section-table.h"
#include "qv-output.h"
#include "qv-preferences.h"

struct _QvExportSectionTable
{
  GtkWidget parent_instance;
  GtkWidget *box;
  GtkGrid *columns_grid;
  GtkDropDown *format_drop;
  GtkAdjustment *scale_adjustment;
  GtkAdjustment *temperature_adjustment;
  GtkLabel *summary_label;
  GtkLabel *sample_label;
  GtkLabel *message_label;
  GtkWidget *copy_button;
  GtkWidget *save_button;

  GtkCheckButton *checks[QV_N_COLUMNS];
  QvExportContext context;
};

G_DEFINE_FINAL_TYPE (QvExportSectionTable, qv_export_section_table, GTK_TYPE_WIDGET)

/* In the order of QvTableColumn; a column added to the table later shows
 * under its command-line name until it has a label here. */
static const char *const column_labels[] = {
  N_("Index"),
  N_("Wavenumber"),
  N_("Reduced mass"),
  N_("Force constant"),
  N_("Turning-point Q"),
  N_("Displacement at v"),
  N_("Thermal RMS at T"),
  N_("Collectivity"),
  N_("Top atoms"),
  N_("Symmetry"),
};

/* In the order of the format drop-down's items. */
static const QvTableFormat formats[] = {
  QV_TABLE_TEXT, QV_TABLE_CSV, QV_TABLE_JSON, QV_TABLE_MARKDOWN, QV_TABLE_LATEX,
};
static const char *const extensions[] = { "txt", "csv", "json", "md", "tex" };

QvTableFormat
qv_export_section_table_get_format (QvExportSectionTable *self)
{
  const guint i = gtk_drop_down_get_selected (self->format_drop);
  return i < G_N_ELEMENTS (formats) ? formats[i] : QV_TABLE_TEXT;
}

void
qv_export_section_table_set_format (QvExportSectionTable *self, QvTableFormat format)
{
  for (guint i = 0; i < G_N_ELEMENTS (formats); i++)
    if (formats[i] == format)
      gtk_drop_down_set_selected (self->format_drop, i);
}

void
qv_export_section_table_set_column (QvExportSectionTable *self, QvTableColumn column, gboolean shown)
{
  g_return_if_fail (column < QV_N_COLUMNS);
  gtk_check_button_set_active (self->checks[column], shown);
}

char *
qv_export_section_table_build (QvExportSectionTable *self)
{
  QvDocument *doc = self->context.document;
  const QvDocumentSource *source;
  QvTableColumn columns[QV_N_COLUMNS];
  QvModeReport report = { 0 };
  QvTableLayout layout = { 0 };
  QvFrequencyUnit unit = QV_FREQUENCY_CM1;
  gsize n = 0;

  if (doc == NULL)
    return NULL;
  for (int c = 0; c < QV_N_COLUMNS; c++)
    if (gtk_check_button_get_active (self->checks[c]))
      columns[n++] = (QvTableColumn) c;
  if (n == 0)
    return NULL;
  /* The unit the list shows (Preferences). */
  g_object_get (qv_preferences_get_default (), "wavenumber-unit", &unit, NULL);
  source = qv_document_get_source (doc);
  report.structure = qv_document_get_structure (doc);
  report.modes = qv_document_get_modes (doc);
  report.level = self->context.level;
  report.temperature = gtk_adjustment_get_value (self->temperature_adjustment);
  report.unit = unit;
  report.hessian_source = source && !source->demo ? source->hessian : NULL;
  report.hessian_units = source && !source->demo ? source->hessian_units : NULL;
  report.mass_model = source ? source->mass_model : QV_MASS_ISOTOPIC;
  /* the species and make-up the document worked out (NULL without) */
  if (qv_document_get_analysis (doc))
    {
      report.symmetry = qv_document_get_analysis (doc)->symmetry;
      report.character = qv_document_get_analysis (doc)->character;
    }
  layout.report = &report;
  layout.columns = columns;
  layout.n_columns = n;
  layout.scale = gtk_adjustment_get_value (self->scale_adjustment);
  layout.top_atoms = 3;
  return qv_mode_table_columns (&layout, qv_export_section_table_get_format (self));
}

/* The first lines of @text, each cut to @width characters. */
static char *
sample_of (const char *text, guint lines, guint width)
{
  g_auto(GStrv) all = g_strsplit (text, "\n", (int) lines + 1);
  g_autoptr(GString) out = g_string_new (NULL);

  for (guint i = 0; all[i] && i < lines; i++)
    {
      if (i)
        g_string_append_c (out, '\n');
      if (g_utf8_strlen (all[i], -1) > width)
        {
          g_autofree char *cut = g_utf8_substring (all[i], 0, width - 1);
          g_string_append_printf (out, "%s…", cut);
        }
      else
        g_string_append (out, all[i]);
    }
  if (all[0] && g_strv_length (all) > lines)
    g_string_append (out, "\n…");
  return g_string_free (g_steal_pointer (&out), FALSE);
}

static void
refresh (QvExportSectionTable *self)
{
  g_autofree char *table = qv_export_section_table_build (self);
  g_autofree char *summary = NULL;
  g_autofree char *sample = NULL;
  const QvModeSet *modes = self->context.document ? qv_document_get_modes (self->context.document) : NULL;
  const double scale = gtk_adjustment_get_value (self->scale_adjustment);

  gtk_widget_set_sensitive (self->copy_button, table != NULL);
  gtk_widget_set_sensitive (self->save_button, table != NULL);
  gtk_label_set_label (self->message_label, "");
  gtk_widget_set_visible (GTK_WIDGET (self->message_label), FALSE);
  if (modes == NULL)
    {
      gtk_label_set_label (self->summary_label, _("Open a document to make its mode table."));
      gtk_label_set_label (self->sample_label, "");
      return;
    }
  if (table == NULL)
    {
      gtk_label_set_label (self->summary_label, _("Tick at least one column."));
      gtk_label_set_label (self->sample_label, "");
      return;
    }
  {
    const guint n_modes = (guint) modes->n_modes;
    g_autofree char *rows = g_strdup_printf (ngettext ("%u row, one per mode", "%u rows, one per mode", n_modes),
                                             n_modes);
    g_autofree char *size = g_format_size (strlen (table));
    /* TRANSLATORS: "12 rows, one per mode · turning points at v = 0 · 298.15 K · scaled by 0.9700 · 1.2 kB" */
    g_autofree char *scaled = scale != 1.0 ? g_strdup_printf (_(" · scaled by %.4f"), scale) : g_strdup ("");
    summary = g_strdup_printf (_("%s · turning points at v = %u · %.2f K%s · %s"), rows, self->context.level,
                               gtk_adjustment_get_value (self->temperature_adjustment), scaled, size);
  }
  sample = sample_of (table, 8, 60);
  gtk_label_set_label (self->summary_label, summary);
  gtk_label_set_label (self->sample_label, sample);
}

const char *
qv_export_section_table_get_summary (QvExportSectionTable *self)
{
  return gtk_label_get_label (self->summary_label);
}

void
qv_export_section_table_set_context (QvExportSectionTable *self, const QvExportContext *context)
{
  self->context = *context;
  refresh (self);
}

static void
copy_clicked (QvExportSectionTable *self)
{
  g_autofree char *table = qv_export_section_table_build (self);

  if (table == NULL)
    return;
  gdk_clipboard_set_text (gtk_widget_get_clipboard (GTK_WIDGET (self)), table);
  qv_export_pane_set_message (self->message_label, _("The table is on the clipboard."), FALSE);
}

gboolean
qv_export_section_table_save_to (QvExportSectionTable *self, const char *path, gboolean force,
                                 GError **error)
{
  g_autofree char *table = qv_export_section_table_build (self);

  if (table == NULL)
    {
      g_set_error_literal (error, G_IO_ERROR, G_IO_ERROR_INVALID_ARGUMENT,
                           _("There is no table to write: open a document and tick a column."));
      return FALSE;
    }
  return qv_output_write (path, table, strlen (table), force, error);
}

static void
save_response (GtkNativeDialog *chooser, int response, gpointer data)
{
  QvExportSectionTable *self = data;

  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr(GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (chooser));
      g_autofree char *path = file ? g_file_get_path (file) : NULL;
      g_autoptr(GError) error = NULL;

      /* GTK 4's chooser itself asks before a file is replaced, so a file
       * there now has been agreed to; one that appears after the answer is
       * still refused by qv_output_write. */
      if (path && !qv_export_section_table_save_to (self, path, g_file_test (path, G_FILE_TEST_EXISTS), &error))
        {
          GtkRoot *root = gtk_widget_get_root (GTK_WIDGET (self));
          if (QV_IS_WINDOW (root))
            qv_window_show_error (QV_WINDOW (root), _("The table could not be saved"), error);
        }
      else if (path)
        {
          g_autofree char *shown = g_filename_display_name (path);
          g_autofree char *text = g_strdup_printf (_("Saved to %s"), shown);
          qv_export_pane_set_message (self->message_label, text, FALSE);
        }
    }
  gtk_native_dialog_destroy (chooser);
  g_object_unref (chooser);
  g_object_unref (self);
}

static void
save_clicked (QvExportSectionTable *self)
{
  GtkRoot *root = gtk_widget_get_root (GTK_WIDGET (self));
  GtkFileChooserNative *chooser =
    gtk_file_chooser_native_new (_("Save the Mode Table"), GTK_IS_WINDOW (root) ? GTK_WINDOW (root) : NULL,
                                 GTK_FILE_CHOOSER_ACTION_SAVE, _("_Save"), _("_Cancel"));
  const guint i = gtk_drop_down_get_selected (self->format_drop);
  g_autofree char *name = g_strdup_printf ("modes.%s", extensions[MIN (i, G_N_ELEMENTS (extensions) - 1)]);

  gtk_file_chooser_set_current_name (GTK_FILE_CHOOSER (chooser), name);
  gtk_native_dialog_set_modal (GTK_NATIVE_DIALOG (chooser), TRUE);
  g_signal_connect (chooser, "response", G_CALLBACK (save_response), g_object_ref (self));
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
}

static void
qv_export_section_table_dispose (GObject *object)
{
  gtk_widget_dispose_template (GTK_WIDGET (object), QV_TYPE_EXPORT_SECTION_TABLE);
  G_OBJECT_CLASS (qv_export_section_table_parent_class)->dispose (object);
}

static void
qv_export_section_table_class_init (QvExportSectionTableClass *klass)
{
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  G_OBJECT_CLASS (klass)->dispose = qv_export_section_table_dispose;
  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "qvexportsection");
  gtk_widget_class_set_template_from_resource (widget_class, "/org/quaverlab/Quaver/gui/qv-export-section-table.ui");
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionTable, box);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionTable, columns_grid);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionTable, format_drop);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionTable, scale_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionTable, temperature_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionTable, summary_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionTable, sample_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionTable, message_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionTable, copy_button);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionTable, save_button);
}

static void
qv_export_section_table_init (QvExportSectionTable *self)
{
  g_autoptr(GError) error = NULL;
  QvTableColumn defaults[QV_N_COLUMNS];
  gsize n_defaults = 0;

  gtk_widget_init_template (GTK_WIDGET (self));
  self->context.mode = -1;
  qv_table_columns_parse (QV_TABLE_DEFAULT_COLUMNS, defaults, &n_defaults, &error);
  for (int c = 0; c < QV_N_COLUMNS; c++)
    {
      GtkWidget *check = gtk_check_button_new_with_label ((gsize) c < G_N_ELEMENTS (column_labels)
                                                          ? _(column_labels[c])
                                                          : qv_table_column_name ((QvTableColumn) c));
      self->checks[c] = GTK_CHECK_BUTTON (check);
      for (gsize i = 0; i < n_defaults; i++)
        if (defaults[i] == (QvTableColumn) c)
          gtk_check_button_set_active (self->checks[c], TRUE);
      gtk_grid_attach (self->columns_grid, check, c % 2, c / 2, 1, 1);
      g_signal_connect_object (check, "toggled", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
    }
  g_signal_connect_object (self->format_drop, "notify::selected", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->scale_adjustment, "value-changed", G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->temperature_adjustment, "value-changed", G_CALLBACK (refresh), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->copy_button, "clicked", G_CALLBACK (copy_clicked), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (self->save_button, "clicked", G_CALLBACK (save_clicked), self, G_CONNECT_SWAPPED);
  refresh (self);
}
