/* gui-test-util.c — driving the app in tests.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gstdio.h>
#include <math.h>
#include <stdlib.h>
#include "gui-test-util.h"
#include "qv-gui.h"

QvApplication *
qvg_app (void)
{
  static QvApplication *app = NULL;

  if (app == NULL)
    {
      g_autoptr(GError) error = NULL;
      qv_gui_init_i18n ();
      g_set_application_name ("Quaver");
      app = qv_application_new ();
      if (!g_application_register (G_APPLICATION (app), NULL, &error))
        g_error ("cannot register the application: %s", error->message);
      /* Windows come and go; the application stays for the whole run. */
      g_application_hold (G_APPLICATION (app));
    }
  return app;
}

static gboolean
is_mapped (gpointer widget)
{
  return gtk_widget_get_mapped (widget);
}

QvWindow *
qvg_window (void)
{
  QvWindow *window = QV_WINDOW (qv_application_new_window (qvg_app ()));

  gtk_window_set_default_size (GTK_WINDOW (window), 1200, 760);
  gtk_window_present (GTK_WINDOW (window));
  qvg_wait (is_mapped, window, 10.0);
  return window;
}

static gboolean
flag_timeout (gpointer data)
{
  *(gboolean *) data = TRUE;
  return G_SOURCE_REMOVE;
}

gboolean
qvg_wait (gboolean (*cond) (gpointer data), gpointer data, double timeout_s)
{
  gboolean timed_out = FALSE;
  guint id = g_timeout_add ((guint) (timeout_s * 1000.0), flag_timeout, &timed_out);
  gboolean ok;

  while (!(ok = cond (data)) && !timed_out)
    g_main_context_iteration (NULL, TRUE);
  if (!timed_out)
    g_source_remove (id);
  return ok;
}

static gboolean
never (gpointer data)
{
  return FALSE;
}

void
qvg_spin (double seconds)
{
  qvg_wait (never, NULL, seconds);
}

gboolean
qvg_window_has_document (gpointer window)
{
  return qv_window_get_document (window) != NULL && !qv_window_is_busy (window);
}

gboolean
qvg_window_idle (gpointer window)
{
  return !qv_window_is_busy (window);
}

GdkTexture *
qvg_snapshot (GtkWidget *window)
{
  g_autoptr(GdkPaintable) paintable = gtk_widget_paintable_new (window);
  GtkSnapshot *snapshot = gtk_snapshot_new ();
  const int w = gtk_widget_get_width (window), h = gtk_widget_get_height (window);
  g_autoptr(GskRenderNode) node = NULL;
  GskRenderer *renderer = gtk_native_get_renderer (GTK_NATIVE (window));

  gdk_paintable_snapshot (paintable, snapshot, w, h);
  node = gtk_snapshot_free_to_node (snapshot);
  if (node == NULL)
    return NULL;
  return gsk_renderer_render_texture (renderer, node, &GRAPHENE_RECT_INIT (0, 0, (float) w, (float) h));
}

guchar *
qvg_pixels (GdkTexture *texture, gsize *stride)
{
  const int w = gdk_texture_get_width (texture), h = gdk_texture_get_height (texture);
  guchar *data = g_malloc ((gsize) w * (gsize) h * 4);

  *stride = (gsize) w * 4;
  gdk_texture_download (texture, data, *stride);
  return data;
}

guint
qvg_count_colours (const guchar *pixels, gsize stride, int x, int y, int w, int h)
{
  g_autoptr(GHashTable) seen = g_hash_table_new (g_direct_hash, g_direct_equal);

  for (int j = y; j < y + h; j++)
    for (int i = x; i < x + w; i++)
      {
        const guchar *p = pixels + (gsize) j * stride + (gsize) i * 4;
        const guint32 c = ((guint32) p[0] << 16) | ((guint32) p[1] << 8) | p[2];
        g_hash_table_add (seen, GUINT_TO_POINTER (c + 1));
      }
  return g_hash_table_size (seen);
}

char *
qvg_build_path (const char *name)
{
  const char *root = g_getenv ("QV_BUILD_ROOT");
  g_autofree char *dir = g_build_filename (root ? root : ".", "tests", "gui", NULL);

  g_mkdir_with_parents (dir, 0755);
  return g_build_filename (dir, name, NULL);
}

char *
qvg_run_quaver (const char *cwd, const char *const *args)
{
  g_autoptr(GPtrArray) argv = g_ptr_array_new ();
  g_autofree char *out = NULL, *err = NULL;
  g_autoptr(GError) error = NULL;
  int status = -1;

  g_ptr_array_add (argv, (gpointer) g_getenv ("QUAVER"));
  for (const char *const *a = args; *a; a++)
    g_ptr_array_add (argv, (gpointer) *a);
  g_ptr_array_add (argv, NULL);
  if (!g_spawn_sync (cwd, (char **) argv->pdata, NULL, G_SPAWN_DEFAULT, NULL, NULL, &out, &err, &status,
                     &error))
    {
      g_printerr ("quaver: %s\n", error->message);
      return NULL;
    }
  if (!g_spawn_check_wait_status (status, NULL))
    {
      g_printerr ("quaver %s: %s\n", args[0] ? args[0] : "", err);
      return NULL;
    }
  return g_steal_pointer (&out);
}

void
qvg_remove_tree (const char *dir)
{
  g_autoptr(GDir) d = g_dir_open (dir, 0, NULL);
  const char *name;

  if (d == NULL)
    return;
  while ((name = g_dir_read_name (d)))
    {
      g_autofree char *path = g_build_filename (dir, name, NULL);
      if (g_file_test (path, G_FILE_TEST_IS_DIR) && !g_file_test (path, G_FILE_TEST_IS_SYMLINK))
        qvg_remove_tree (path);
      else
        g_remove (path);
    }
  g_rmdir (dir);
}

QvStructure *
qvg_spring_system (gsize n, guint32 seed, QvHessian **hessian)
{
  const double spacing = 1.5, jitter = 0.25, cutoff = 2.4;
  g_autoptr(GRand) rand = g_rand_new_with_seed (seed);
  QvStructure *s = qv_structure_new (n, NULL);
  QvHessian *h = qv_hessian_new (3 * n, TRUE, NULL);
  gsize side = 1;

  while (side * side * side < n)
    side++;
  for (gsize a = 0; a < n; a++)
    {
      const gsize cell[3] = { a % side, (a / side) % side, a / (side * side) };
      const double u = g_rand_double (rand);
      qv_structure_set_element (s, a, u < 0.5 ? 1 : u < 0.8 ? 6 : u < 0.9 ? 7 : 8, NULL);
      for (int c = 0; c < 3; c++)
        s->atoms[a].position[c] = spacing * (double) cell[c] + g_rand_double_range (rand, -jitter, jitter);
    }
  /* Neighbours lie within two lattice steps: compare lattice indices. */
  for (gsize a = 0; a < n; a++)
    for (gsize b = a + 1; b < n; b++)
      {
        const long da = (long) (a % side) - (long) (b % side);
        const long db = (long) ((a / side) % side) - (long) ((b / side) % side);
        const long dc = (long) (a / (side * side)) - (long) (b / (side * side));
        double d[3], r2 = 0.0, r, k;

        if (labs (da) > 2 || labs (db) > 2 || labs (dc) > 2)
          continue;
        for (int c = 0; c < 3; c++)
          {
            d[c] = s->atoms[b].position[c] - s->atoms[a].position[c];
            r2 += d[c] * d[c];
          }
        if (r2 >= cutoff * cutoff)
          continue;
        r = sqrt (r2);
        k = g_rand_double_range (rand, 2.0, 20.0);
        for (int i = 0; i < 3; i++)
          for (int j = 0; j < 3; j++)
            {
              const double v = k * d[i] * d[j] / (r * r);
              h->data[(3 * a + i) * 3 * n + 3 * a + j] += v;
              h->data[(3 * b + i) * 3 * n + 3 * b + j] += v;
              h->data[(3 * a + i) * 3 * n + 3 * b + j] -= v;
              h->data[(3 * b + i) * 3 * n + 3 * a + j] -= v;
            }
      }
  *hessian = h;
  return s;
}
