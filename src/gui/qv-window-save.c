/* qv-window-save.c — Save as Bundle… and the question before closing.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include <string.h>
#include "qv-config.h"
#include "qv-document-save.h"
#include "qv-window-save.h"

#define QUESTION_KEY "qv-save-question"
#define CHOOSER_KEY "qv-save-chooser"
#define CONFIRMED_KEY "qv-save-close-confirmed"

AdwMessageDialog *
qv_window_save_get_question (QvWindow *window)
{
  return g_object_get_data (G_OBJECT (window), QUESTION_KEY);
}

GtkFileChooserNative *
qv_window_save_get_chooser (QvWindow *window)
{
  return g_object_get_data (G_OBJECT (window), CHOOSER_KEY);
}

/* Where the chooser starts: the bundle the document lives in, or a bundle
 * named after the input beside it. */
static void
suggest_file (QvWindow *window, GtkFileChooser *chooser)
{
  QvDocument *doc = qv_window_get_document (window);
  const char *bundle = qv_document_get_bundle_path (doc);
  const char *path = bundle ? bundle : qv_document_get_path (doc);
  g_autofree char *name = NULL;

  if (bundle != NULL)
    name = g_path_get_basename (bundle);
  else if (path != NULL)
    {
      g_autofree char *base = g_path_get_basename (path);
      char *dot = strrchr (base, '.');
      if (dot != NULL && dot != base)
        *dot = '\0';
      name = g_strconcat (base, ".quaver.json", NULL);
    }
  else
    name = g_strdup ("demo.quaver.json");
  if (path != NULL)
    {
      g_autofree char *dir = g_path_get_dirname (path);
      g_autoptr(GFile) folder = g_file_new_for_path (dir);
      gtk_file_chooser_set_current_folder (chooser, folder, NULL);
    }
  gtk_file_chooser_set_current_name (chooser, name);
}

static void
chooser_response (GtkNativeDialog *chooser, int response, gpointer data)
{
  QvWindow *window = data;
  const gboolean then_close = GPOINTER_TO_INT (g_object_get_data (G_OBJECT (chooser), "then-close"));

  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr(GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (chooser));
      g_autofree char *path = file ? g_file_get_path (file) : NULL;
      g_autoptr(GError) error = NULL;

      if (path == NULL)
        {
          g_autofree char *uri = file ? g_file_get_uri (file) : g_strdup ("?");
          error = g_error_new (G_IO_ERROR, G_IO_ERROR_NOT_SUPPORTED, _("%s is not a local file"), uri);
        }
      /* The chooser has asked before replacing a file: consent to force. A
       * bundle's NAME.hessian.npy beside it goes with it. */
      else
        qv_document_save_write (window, path, g_file_test (path, G_FILE_TEST_EXISTS), &error);
      if (error != NULL)
        qv_window_show_error (window, _("The bundle could not be saved"), error);
      else if (then_close)
        {
          g_object_set_data (G_OBJECT (window), CONFIRMED_KEY, GINT_TO_POINTER (1));
          gtk_window_close (GTK_WINDOW (window));
        }
    }
  if (qv_window_save_get_chooser (window) == GTK_FILE_CHOOSER_NATIVE (chooser))
    g_object_set_data (G_OBJECT (window), CHOOSER_KEY, NULL);
  gtk_native_dialog_destroy (chooser);
  g_object_unref (chooser);
  g_object_unref (window);
}

static void
choose (QvWindow *window, gboolean then_close)
{
  GtkFileChooserNative *chooser;
  GtkFileFilter *filter;

  if (qv_window_get_document (window) == NULL)
    return;
  if ((chooser = qv_window_save_get_chooser (window)) != NULL)
    {
      gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
      return;
    }
  chooser = gtk_file_chooser_native_new (_("Save as Bundle"), GTK_WINDOW (window),
                                         GTK_FILE_CHOOSER_ACTION_SAVE, _("_Save"), _("_Cancel"));
  filter = gtk_file_filter_new ();
  gtk_file_filter_set_name (filter, _("Quaver bundles (*.quaver.json)"));
  gtk_file_filter_add_pattern (filter, "*.quaver.json");
  gtk_file_chooser_add_filter (GTK_FILE_CHOOSER (chooser), filter);
  g_object_unref (filter);
  suggest_file (window, GTK_FILE_CHOOSER (chooser));
  g_object_set_data (G_OBJECT (chooser), "then-close", GINT_TO_POINTER (then_close));
  g_object_set_data (G_OBJECT (window), CHOOSER_KEY, chooser);
  gtk_native_dialog_set_modal (GTK_NATIVE_DIALOG (chooser), TRUE);
  g_signal_connect (chooser, "response", G_CALLBACK (chooser_response), g_object_ref (window));
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
}

void
qv_window_save_choose (QvWindow *window)
{
  choose (window, FALSE);
}

/* After the question has gone: closing the window while its dialog is
 * still answering would leave the dialog a destroyed parent. */
static gboolean
close_confirmed (gpointer data)
{
  g_object_set_data (G_OBJECT (data), CONFIRMED_KEY, GINT_TO_POINTER (1));
  gtk_window_close (GTK_WINDOW (data));
  return G_SOURCE_REMOVE;
}

static void
question_response (AdwMessageDialog *dialog, const char *response, gpointer data)
{
  QvWindow *window = data;

  g_object_set_data (G_OBJECT (window), QUESTION_KEY, NULL);
  if (g_strcmp0 (response, "discard") == 0)
    g_idle_add_full (G_PRIORITY_DEFAULT, close_confirmed, g_object_ref (window), g_object_unref);
  else if (g_strcmp0 (response, "save") == 0)
    choose (window, TRUE);
}

gboolean
qv_window_save_close_request (QvWindow *window)
{
  QvDocument *doc = qv_window_get_document (window);
  AdwMessageDialog *question = qv_window_save_get_question (window);
  GtkWidget *dialog;
  gboolean masses;

  if (g_object_get_data (G_OBJECT (window), CONFIRMED_KEY) != NULL)
    return FALSE;
  if (question != NULL)
    {
      gtk_window_present (GTK_WINDOW (question));
      return TRUE;
    }
  if (qv_window_save_get_chooser (window) != NULL)
    return TRUE;
  if (!qv_document_save_has_unsaved (window))
    return FALSE;

  masses = qv_document_get_masses_unsaved (doc);
  dialog = adw_message_dialog_new (GTK_WINDOW (window), _("Save Changes as a Bundle?"), NULL);
  adw_message_dialog_format_body (ADW_MESSAGE_DIALOG (dialog),
                                  masses
                                  /* TRANSLATORS: %s is the document's name */
                                  ? _("The masses of “%s” were changed and are not saved. A bundle keeps "
                                      "them with the Hessian and the view; closing without saving loses them.")
                                  /* TRANSLATORS: %s is the document's name */
                                  : _("The view of “%s” (rotation, zoom, projection or selected mode) "
                                      "changed since its bundle was read or saved. Closing without saving "
                                      "loses it."),
                                  qv_document_get_name (doc));
  adw_message_dialog_add_responses (ADW_MESSAGE_DIALOG (dialog),
                                    "cancel", _("_Cancel"),
                                    "discard", _("_Discard"),
                                    "save", _("_Save as Bundle…"),
                                    NULL);
  adw_message_dialog_set_response_appearance (ADW_MESSAGE_DIALOG (dialog), "discard",
                                              ADW_RESPONSE_DESTRUCTIVE);
  adw_message_dialog_set_response_appearance (ADW_MESSAGE_DIALOG (dialog), "save",
                                              ADW_RESPONSE_SUGGESTED);
  adw_message_dialog_set_default_response (ADW_MESSAGE_DIALOG (dialog), "save");
  adw_message_dialog_set_close_response (ADW_MESSAGE_DIALOG (dialog), "cancel");
  g_signal_connect_object (dialog, "response", G_CALLBACK (question_response), window, 0);
  g_object_set_data (G_OBJECT (window), QUESTION_KEY, dialog);
  gtk_window_present (GTK_WINDOW (dialog));
  return TRUE;
}
