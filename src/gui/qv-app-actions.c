/* qv-app-actions.c — app.open, app.open-demo, app.preferences,
 * app.shortcuts, app.about, app.quit and their keyboard shortcuts.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-app-actions.h"
#include "qv-config.h"
#include "qv-preferences-window.h"
#include "qv-window.h"

static GtkWindow *
main_window (gpointer app)
{
  return qv_application_get_main_window (QV_APPLICATION (app));
}

static void
open_activated (GSimpleAction *action, GVariant *param, gpointer app)
{
  GtkWindow *window = main_window (app);
  gtk_window_present (window);
  qv_window_choose_file (QV_WINDOW (window));
}

static void
open_demo_activated (GSimpleAction *action, GVariant *param, gpointer app)
{
  GtkWindow *window = main_window (app);
  gtk_window_present (window);
  qv_window_open_demo (QV_WINDOW (window));
}

static void
preferences_activated (GSimpleAction *action, GVariant *param, gpointer app)
{
  GtkWindow *parent = gtk_application_get_active_window (GTK_APPLICATION (app));
  GtkWindow *prefs = qv_preferences_window_new (parent);
  gtk_window_present (prefs);
}

static void
shortcuts_activated (GSimpleAction *action, GVariant *param, gpointer app)
{
  GtkWindow *window = main_window (app);
  /* GtkApplication loads gtk/help-overlay.ui from our resource base path
   * and gives every application window win.show-help-overlay. */
  gtk_widget_activate_action (GTK_WIDGET (window), "win.show-help-overlay", NULL);
}

void
qv_app_show_about (GtkWindow *parent)
{
  static const char *authors[] = { "The Quaver developers", NULL };

  gtk_show_about_dialog (parent,
                         "program-name", _("Quaver"),
                         "logo-icon-name", QV_APPLICATION_ID,
                         "version", QV_VERSION,
                         "comments", _("Harmonic normal modes from a geometry and its Hessian: "
                                       "frequencies, turning points and the motion of every mode.\n\n"
                                       "Harmonic results are approximations: validate them before "
                                       "you rely on them."),
                         "license-type", GTK_LICENSE_GPL_3_0,
                         "authors", authors,
                         "translator-credits", _("translator-credits"),
                         "copyright", "© 2025 The Quaver developers",
                         NULL);
}

static void
about_activated (GSimpleAction *action, GVariant *param, gpointer app)
{
  qv_app_show_about (gtk_application_get_active_window (GTK_APPLICATION (app)));
}

static void
quit_activated (GSimpleAction *action, GVariant *param, gpointer app)
{
  GList *windows = g_list_copy (gtk_application_get_windows (GTK_APPLICATION (app)));

  /* Closing saves each window's size; work in progress is abandoned. */
  for (GList *l = windows; l; l = l->next)
    gtk_window_close (l->data);
  g_list_free (windows);
}

void
qv_app_actions_install (QvApplication *app)
{
  static const GActionEntry entries[] = {
    { "open", open_activated },
    { "open-demo", open_demo_activated },
    { "preferences", preferences_activated },
    { "shortcuts", shortcuts_activated },
    { "about", about_activated },
    { "quit", quit_activated },
  };
  static const struct { const char *action; const char *accels[3]; } accels[] = {
    { "app.open", { "<Control>o", NULL } },
    { "win.save-bundle", { "<Control>s", NULL } },
    { "app.quit", { "<Control>q", NULL } },
    { "app.preferences", { "<Control>comma", NULL } },
    { "win.show-help-overlay", { "<Control>question", NULL } },
    /* Single keys (Space, 1, 2, 3, 0, A, C, O, +, −) are the window's own
     * shortcuts (qv-window-actions.c): they give way to text fields. */
    { "win.next-mode", { "<Alt>Down", NULL } },
    { "win.previous-mode", { "<Alt>Up", NULL } },
    { "win.toggle-export-pane", { "F9", NULL } },
    { "win.toggle-spectrum", { "F8", NULL } },
    { "win.compare", { "<Control><Shift>o", NULL } },
    { "win.load-scan-energies", { "<Control><Shift>e", NULL } },
    { "win.close", { "<Control>w", NULL } },
  };

  g_action_map_add_action_entries (G_ACTION_MAP (app), entries, G_N_ELEMENTS (entries), app);
  for (gsize i = 0; i < G_N_ELEMENTS (accels); i++)
    gtk_application_set_accels_for_action (GTK_APPLICATION (app), accels[i].action, accels[i].accels);
}
