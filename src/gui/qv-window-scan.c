/* qv-window-scan.c — loading a scan's energies into an anharmonic window.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-config.h"
#include "qv-error.h"
#include "qv-window-scan.h"

#define CHOOSER_KEY "qv-window-scan-chooser"
#define UNIT_CHOICE "unit"

QvAnharmonicWindow *
qv_window_load_scan_energies (QvWindow *window, const char *manifest,
                              const QvScanEnergiesOptions *options)
{
  QvAnharmonicWindow *anharmonic = qv_anharmonic_window_new (GTK_WINDOW (window));
  QvScanEnergiesOptions defaults;

  if (options == NULL)
    {
      qv_scan_energies_options_init (&defaults);
      options = &defaults;
    }
  qv_anharmonic_window_load (anharmonic, manifest, options);
  gtk_window_present (GTK_WINDOW (anharmonic));
  return anharmonic;
}

GtkFileChooserNative *
qv_window_scan_get_chooser (QvWindow *window)
{
  return g_object_get_data (G_OBJECT (window), CHOOSER_KEY);
}

static void
set_chooser (QvWindow *window, GtkFileChooserNative *chooser)
{
  g_object_set_data (G_OBJECT (window), CHOOSER_KEY, chooser);
}

static void
add_filter (GtkFileChooser *chooser, const char *name, const char *const *patterns)
{
  GtkFileFilter *filter = gtk_file_filter_new ();

  gtk_file_filter_set_name (filter, name);
  for (const char *const *p = patterns; *p; p++)
    gtk_file_filter_add_pattern (filter, *p);
  gtk_file_chooser_add_filter (chooser, filter);
  g_object_unref (filter);
}

static void
energies_response (GtkNativeDialog *chooser, int response, gpointer data)
{
  QvWindow *window = data;
  const char *manifest = g_object_get_data (G_OBJECT (chooser), "manifest");

  set_chooser (window, NULL);
  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr(GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (chooser));
      g_autofree char *path = file ? g_file_get_path (file) : NULL;
      const char *unit = gtk_file_chooser_get_choice (GTK_FILE_CHOOSER (chooser), UNIT_CHOICE);
      QvScanEnergiesOptions options;
      g_autoptr(GError) error = NULL;

      qv_scan_energies_options_init (&options);
      options.energies = path;
      options.unit_given = TRUE;
      if (path && unit && qv_energy_unit_parse (unit, &options.unit, &error))
        qv_window_load_scan_energies (window, manifest, &options);
      else if (error)
        qv_window_show_error (window, _("The energies cannot be read"), error);
    }
  gtk_native_dialog_destroy (chooser);
  g_object_unref (chooser);
  g_object_unref (window);
}

/* The energies as lines NAME ENERGY, and their unit (never guessed). */
static void
choose_energies (QvWindow *window, const char *manifest)
{
  GtkFileChooserNative *chooser =
    gtk_file_chooser_native_new (_("Energies of the Scan (NAME ENERGY Lines)"), GTK_WINDOW (window),
                                 GTK_FILE_CHOOSER_ACTION_OPEN, _("_Load"), _("_Cancel"));
  const char *ids[QV_ENERGY_UNIT_COUNT + 1] = { NULL };
  const char *labels[QV_ENERGY_UNIT_COUNT + 1] = { NULL };
  static const char *const text[] = { "*.txt", "*.dat", "*.energies", NULL };
  static const char *const all[] = { "*", NULL };

  for (int u = 0; u < QV_ENERGY_UNIT_COUNT; u++)
    ids[u] = labels[u] = qv_energy_unit_name ((QvEnergyUnit) u);
  /* TRANSLATORS: the unit of the energies in the file, chosen in the file chooser */
  gtk_file_chooser_add_choice (GTK_FILE_CHOOSER (chooser), UNIT_CHOICE, _("Energy unit"), ids, labels);
  gtk_file_chooser_set_choice (GTK_FILE_CHOOSER (chooser), UNIT_CHOICE,
                               qv_energy_unit_name (QV_ENERGY_UNIT_HARTREE));
  add_filter (GTK_FILE_CHOOSER (chooser), _("Energy files (*.txt, *.dat)"), text);
  add_filter (GTK_FILE_CHOOSER (chooser), _("All files"), all);
  g_object_set_data_full (G_OBJECT (chooser), "manifest", g_strdup (manifest), g_free);
  gtk_native_dialog_set_modal (GTK_NATIVE_DIALOG (chooser), TRUE);
  g_signal_connect (chooser, "response", G_CALLBACK (energies_response), g_object_ref (window));
  set_chooser (window, chooser);
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
}

static void
manifest_response (GtkNativeDialog *chooser, int response, gpointer data)
{
  QvWindow *window = data;

  set_chooser (window, NULL);
  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr(GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (chooser));
      g_autofree char *path = file ? g_file_get_path (file) : NULL;

      /* energy= on every structure's comment line needs no file */
      if (path && qv_scan_energies_have_xyz_energies (path))
        qv_window_load_scan_energies (window, path, NULL);
      else if (path)
        choose_energies (window, path);
    }
  gtk_native_dialog_destroy (chooser);
  g_object_unref (chooser);
  g_object_unref (window);
}

void
qv_window_choose_scan_energies (QvWindow *window)
{
  GtkFileChooserNative *chooser =
    gtk_file_chooser_native_new (_("The Scan's Manifest (manifest.json of quaver displace --scan)"),
                                 GTK_WINDOW (window), GTK_FILE_CHOOSER_ACTION_OPEN, _("_Open"),
                                 _("_Cancel"));
  static const char *const json[] = { "manifest.json", "*.json", NULL };

  add_filter (GTK_FILE_CHOOSER (chooser), _("Scan manifests (manifest.json)"), json);
  gtk_native_dialog_set_modal (GTK_NATIVE_DIALOG (chooser), TRUE);
  g_signal_connect (chooser, "response", G_CALLBACK (manifest_response), g_object_ref (window));
  set_chooser (window, chooser);
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
}
