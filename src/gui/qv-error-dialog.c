/* qv-error-dialog.c — a modal error dialog with a selectable message.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "qv-error-dialog.h"

static void
answered (GtkDialog *dialog, int response, gpointer data)
{
  gtk_window_destroy (GTK_WINDOW (dialog));
}

GtkWindow *
qv_error_dialog_show (GtkWidget *near, const char *primary, const GError *error)
{
  GtkRoot *root = near ? gtk_widget_get_root (near) : NULL;
  GtkWidget *dialog = gtk_message_dialog_new (GTK_IS_WINDOW (root) ? GTK_WINDOW (root) : NULL,
                                              GTK_DIALOG_MODAL | GTK_DIALOG_DESTROY_WITH_PARENT,
                                              GTK_MESSAGE_ERROR, GTK_BUTTONS_CLOSE, "%s", primary);
  GtkWidget *area = gtk_message_dialog_get_message_area (GTK_MESSAGE_DIALOG (dialog));

  gtk_message_dialog_format_secondary_text (GTK_MESSAGE_DIALOG (dialog), "%s",
                                            error ? error->message : "");
  for (GtkWidget *c = gtk_widget_get_first_child (area); c; c = gtk_widget_get_next_sibling (c))
    if (GTK_IS_LABEL (c))
      gtk_label_set_selectable (GTK_LABEL (c), TRUE);
  g_signal_connect (dialog, "response", G_CALLBACK (answered), NULL);
  gtk_window_present (GTK_WINDOW (dialog));
  return GTK_WINDOW (dialog);
}
