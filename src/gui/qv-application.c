/* qv-application.c — start-up, windows, files from the command line.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <adwaita.h>
#include <glib/gi18n.h>
#include "qv-app-actions.h"
#include "qv-application.h"
#include "qv-config.h"
#include "qv-window.h"

/* From the generated qv-gui-resources.c: referencing it keeps the resource
 * (and its registering constructor) in the static library's link. */
GResource *qv_gui_get_resource (void);

struct _QvApplication
{
  GtkApplication parent_instance;
  gboolean demo;
};

G_DEFINE_FINAL_TYPE (QvApplication, qv_application, GTK_TYPE_APPLICATION)

static void
qv_application_startup (GApplication *application)
{
  g_autoptr(GtkCssProvider) css = gtk_css_provider_new ();

  G_APPLICATION_CLASS (qv_application_parent_class)->startup (application);
  g_return_if_fail (qv_gui_get_resource () != NULL);
  /* libadwaita only for its style manager: the app follows the desktop's
   * dark style; every widget is a plain GTK one. */
  adw_init ();
  adw_style_manager_set_color_scheme (adw_style_manager_get_default (), ADW_COLOR_SCHEME_DEFAULT);
  gtk_css_provider_load_from_resource (css, "/org/quaverlab/Quaver/gui/style.css");
  gtk_style_context_add_provider_for_display (gdk_display_get_default (), GTK_STYLE_PROVIDER (css),
                                              GTK_STYLE_PROVIDER_PRIORITY_APPLICATION);
  gtk_window_set_default_icon_name (QV_APPLICATION_ID);
  qv_app_actions_install (QV_APPLICATION (application));
}

static void
qv_application_activate (GApplication *application)
{
  QvApplication *self = QV_APPLICATION (application);
  GtkWindow *window = qv_application_get_main_window (self);

  if (self->demo)
    {
      self->demo = FALSE;
      qv_window_open_demo (QV_WINDOW (window));
    }
  gtk_window_present (window);
}

static void
qv_application_open (GApplication *application, GFile **files, int n_files, const char *hint)
{
  QvApplication *self = QV_APPLICATION (application);

  for (int i = 0; i < n_files; i++)
    {
      GtkWindow *window = NULL;
      GList *windows = gtk_application_get_windows (GTK_APPLICATION (self));
      /* Reuse a window that shows nothing yet. */
      for (GList *l = windows; l; l = l->next)
        if (QV_IS_WINDOW (l->data) && qv_window_get_document (l->data) == NULL
            && !qv_window_is_busy (l->data))
          {
            window = l->data;
            break;
          }
      if (window == NULL)
        window = qv_application_new_window (self);
      gtk_window_present (window);
      qv_window_open_file (QV_WINDOW (window), files[i]);
    }
}

static int
qv_application_handle_local_options (GApplication *application, GVariantDict *options)
{
  if (g_variant_dict_contains (options, "demo"))
    QV_APPLICATION (application)->demo = TRUE;
  return -1;
}

static void
qv_application_class_init (QvApplicationClass *klass)
{
  GApplicationClass *app_class = G_APPLICATION_CLASS (klass);

  app_class->startup = qv_application_startup;
  app_class->activate = qv_application_activate;
  app_class->open = qv_application_open;
  app_class->handle_local_options = qv_application_handle_local_options;
}

static void
qv_application_init (QvApplication *self)
{
  static const GOptionEntry entries[] = {
    { "demo", 0, 0, G_OPTION_ARG_NONE, NULL, N_("Open the built-in demo (invented data)"), NULL },
    { NULL }
  };
  g_application_add_main_option_entries (G_APPLICATION (self), entries);
}

QvApplication *
qv_application_new (void)
{
  /* Non-unique: each `quaver FILE` is its own process, so the app also runs
   * where there is no session bus. */
  return g_object_new (QV_TYPE_APPLICATION,
                       "application-id", QV_APPLICATION_ID,
                       "flags", G_APPLICATION_HANDLES_OPEN | G_APPLICATION_NON_UNIQUE,
                       "resource-base-path", "/org/quaverlab/Quaver",
                       NULL);
}

GtkWindow *
qv_application_new_window (QvApplication *app)
{
  return GTK_WINDOW (qv_window_new (GTK_APPLICATION (app)));
}

GtkWindow *
qv_application_get_main_window (QvApplication *app)
{
  GtkWindow *window = gtk_application_get_active_window (GTK_APPLICATION (app));

  if (window == NULL || !QV_IS_WINDOW (window))
    window = qv_application_new_window (app);
  return window;
}
