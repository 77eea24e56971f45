/* qv-gui.c — translations and the application's start.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include <locale.h>
#include <string.h>
#include <unistd.h>
#include "qv-application.h"
#include "qv-document.h"
#include "qv-config.h"
#include "qv-gui.h"
#include "qv-gui-private.h"

static gint64 gui_start_us;

/* TRUE when @dir holds our catalogue for at least one language. */
static gboolean
has_catalogue (const char *dir)
{
  g_autoptr(GDir) d = g_dir_open (dir, 0, NULL);
  const char *lang;

  if (d == NULL)
    return FALSE;
  while ((lang = g_dir_read_name (d)) != NULL)
    {
      g_autofree char *mo = g_build_filename (dir, lang, "LC_MESSAGES",
                                              GETTEXT_PACKAGE ".mo", NULL);
      if (g_file_test (mo, G_FILE_TEST_EXISTS))
        return TRUE;
    }
  return FALSE;
}

void
qv_gui_init_i18n (void)
{
  const char *dir = QV_LOCALEDIR;

  if (!has_catalogue (QV_LOCALEDIR) && has_catalogue (QV_BUILD_LOCALEDIR))
    dir = QV_BUILD_LOCALEDIR;
  bindtextdomain (GETTEXT_PACKAGE, dir);
  bind_textdomain_codeset (GETTEXT_PACKAGE, "UTF-8");
  textdomain (GETTEXT_PACKAGE);
}

int
qv_gui_run (int argc, char **argv)
{
  g_autoptr(QvApplication) app = NULL;
  int status;

  gui_start_us = g_get_monotonic_time ();
  qv_gui_init_i18n ();
  g_set_application_name (_("Quaver"));
  app = qv_application_new ();
  status = g_application_run (G_APPLICATION (app), argc, argv);
  /* A worker abandoned by Cancel may still be inside LAPACK: exiting
   * normally would run OpenBLAS's destructors under it and crash. Nothing
   * is lost by leaving at once: such workers only compute, and every file
   * is written atomically by code that has returned by now. */
  if (qv_document_running_workers () > 0)
    {
      fflush (NULL);
      _exit (status);
    }
  return status;
}


double
qv_gui_seconds_since_start (void)
{
  g_autofree char *stat = NULL;
  g_autofree char *uptime = NULL;

  /* Field 22 of /proc/self/stat: start time in clock ticks after boot. */
  if (g_file_get_contents ("/proc/self/stat", &stat, NULL, NULL)
      && g_file_get_contents ("/proc/uptime", &uptime, NULL, NULL))
    {
      const char *p = strrchr (stat, ')');
      int field = 2;
      while (p && *p && field < 22)
        if (*p++ == ' ')
          field++;
      if (p && field == 22)
        {
          const double start = g_ascii_strtod (p, NULL) / (double) sysconf (_SC_CLK_TCK);
          const double now = g_ascii_strtod (uptime, NULL);
          if (now >= start)
            return now - start;
        }
    }
  return (double) (g_get_monotonic_time () - gui_start_us) * 1e-6;
}

void
qv_gui_first_frame (void)
{
  const char *report = g_getenv ("QV_REPORT_FIRST_FRAME");
  GApplication *app;

  if (report == NULL || *report == '\0' || g_str_equal (report, "0"))
    return;
  g_printerr ("quaver: first frame %.3f s after the process started\n", qv_gui_seconds_since_start ());
  app = g_application_get_default ();
  if (g_str_equal (report, "quit") && app)
    g_application_quit (app);
}
