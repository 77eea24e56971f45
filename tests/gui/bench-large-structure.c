/* bench-large-structure.c — benchmark (not a test): a 20 000-atom
 * structure opens and rotates in the app.
 *
 * The app needs modes to show; a Hessian of 20 000 atoms (60 000 × 60 000,
 * 28.8 GB) cannot be held, so the structure comes as a bundle with a few
 * precomputed modes — the way a user with a large system and modes from
 * another program opens it. Everything is invented: atoms on a jittered
 * cubic lattice (1.5 Å, ±0.25 Å; H 50 %, C 30 %, N 10 %, O 10 %), and six
 * smooth "modes" (plane waves of displacement) with made-up wavenumbers.
 * The bundle is written with the app's own bundle writer.
 *
 * Measured: the open (read + build the modes + show, until the window has
 * the document and then until its first frame), and the frames drawn while
 * the view is rotated by a real mouse drag (xdotool through the X server of
 * xvfb-run; without xdotool, by setting the rotation every frame, which
 * draws the still-picture quality and is slower) with the animation paused
 * and then playing. Prints frames per second and the frame-clock gaps.
 * Exits 0 whenever it could run.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <gdk/x11/gdkx.h>
#include <glib/gstdio.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "gui-test-util.h"
#include "qv-bundle-writer.h"

static QvStructure *
invented_structure (gsize n)
{
  QvStructure *s = qv_structure_new (n, NULL);
  const gsize side = (gsize) ceil (cbrt ((double) n));
  guint32 state = 20000;

  for (gsize a = 0; a < n; a++)
    {
      const gsize i = a % side, j = (a / side) % side, k = a / (side * side);
      const double r = (double) (state = state * 1664525u + 1013904223u) / 4294967296.0;
      static const guint z[10] = { 1, 1, 1, 1, 1, 6, 6, 6, 7, 8 };
      qv_structure_set_element (s, a, z[(gsize) (r * 10.0) % 10], NULL);
      for (int c = 0; c < 3; c++)
        {
          const double u = (double) (state = state * 1664525u + 1013904223u) / 4294967296.0;
          const double base = 1.5 * (double) (c == 0 ? i : c == 1 ? j : k);
          s->atoms[a].position[c] = base + 0.5 * (u - 0.5);
        }
    }
  return s;
}

static QvModeSet *
invented_modes (const QvStructure *s, gsize n_modes)
{
  const gsize n = 3 * s->n_atoms;
  g_autofree double *wavenumbers = g_new (double, n_modes);
  g_autofree double *d = g_new (double, n * n_modes);

  for (gsize m = 0; m < n_modes; m++)
    {
      wavenumbers[m] = 20.0 + 15.0 * (double) m;
      for (gsize a = 0; a < s->n_atoms; a++)
        {
          const double *p = s->atoms[a].position;
          const double phase = 0.15 * (double) (m + 1) * (p[0] + 0.5 * p[1]) + 0.1 * p[2];
          d[m * n + 3 * a + m % 3] = sin (phase);
          d[m * n + 3 * a + (m + 1) % 3] = 0.3 * cos (phase);
          d[m * n + 3 * a + (m + 2) % 3] = 0.0;
        }
    }
  return qv_mode_set_new_from_cartesian (s, n_modes, wavenumbers, d, NULL);
}

typedef struct {
  GArray *ticks;        /* gint64 µs */
  gboolean recording;
  gboolean spin;        /* rotate by setting the orientation every tick */
  double angle;
} Recorder;

static gboolean
on_tick (GtkWidget *widget, GdkFrameClock *clock, gpointer data)
{
  Recorder *r = data;
  const gint64 now = g_get_monotonic_time ();
  if (r->recording)
    g_array_append_val (r->ticks, now);
  if (r->spin)
    {
      QvModeView *view = qv_window_get_mode_view (QV_WINDOW (widget));
      const double q[4] = { 0.0, sin (r->angle / 2), 0.0, cos (r->angle / 2) };
      r->angle += 0.05;
      qv_mode_view_set_orientation (view, q);
    }
  return G_SOURCE_CONTINUE;
}

typedef struct {
  QvModeView *view;
  guint frames;
} FrameWait;

static gboolean
drew_more (gpointer data)
{
  FrameWait *w = data;
  return qv_mode_view_get_frames (w->view) > w->frames;
}

static void
report_ticks (const char *what, GArray *t)
{
  double worst = 0.0;
  for (guint i = 0; i + 1 < t->len; i++)
    worst = MAX (worst, (double) (g_array_index (t, gint64, i + 1) - g_array_index (t, gint64, i)) * 1e-3);
  printf ("%s: %u frame-clock ticks, longest gap %.1f ms\n", what, t->len, worst);
}

/* A drag across the view by the X server's test extension: xdotool moves
 * the pointer to the view's centre, presses button 1, moves by @steps
 * steps of 1 px right (and ±1 px up and down) every 10 ms, releases. */
static GSubprocess *
start_drag (QvWindow *window, int steps)
{
  GtkWidget *view = GTK_WIDGET (qv_window_get_mode_view (window));
  GdkSurface *surface = gtk_native_get_surface (GTK_NATIVE (window));
  g_autoptr(GPtrArray) argv = g_ptr_array_new_with_free_func (g_free);
  graphene_point_t centre = GRAPHENE_POINT_INIT (gtk_widget_get_width (view) / 2.0f,
                                                 gtk_widget_get_height (view) / 2.0f), at;
  double sx = 0, sy = 0;
  g_autofree char *xdotool = g_find_program_in_path ("xdotool");

  if (xdotool == NULL || !GDK_IS_X11_SURFACE (surface)
      || !gtk_widget_compute_point (view, GTK_WIDGET (window), &centre, &at))
    return NULL;
  gtk_native_get_surface_transform (GTK_NATIVE (window), &sx, &sy);
  g_ptr_array_add (argv, g_strdup (xdotool));
  g_ptr_array_add (argv, g_strdup ("mousemove"));
  g_ptr_array_add (argv, g_strdup ("--window"));
  g_ptr_array_add (argv, g_strdup_printf ("%lu", (unsigned long) gdk_x11_surface_get_xid (surface)));
  g_ptr_array_add (argv, g_strdup_printf ("%d", (int) (at.x + sx - steps / 2.0)));
  g_ptr_array_add (argv, g_strdup_printf ("%d", (int) (at.y + sy)));
  g_ptr_array_add (argv, g_strdup ("mousedown"));
  g_ptr_array_add (argv, g_strdup ("1"));
  for (int i = 0; i < steps; i++)
    {
      g_ptr_array_add (argv, g_strdup ("sleep"));
      g_ptr_array_add (argv, g_strdup ("0.01"));
      g_ptr_array_add (argv, g_strdup ("mousemove_relative"));
      g_ptr_array_add (argv, g_strdup ("--"));
      g_ptr_array_add (argv, g_strdup ("1"));
      g_ptr_array_add (argv, g_strdup (i % 50 < 25 ? "1" : "-1"));
    }
  g_ptr_array_add (argv, g_strdup ("mouseup"));
  g_ptr_array_add (argv, g_strdup ("1"));
  g_ptr_array_add (argv, NULL);
  return g_subprocess_newv ((const char *const *) argv->pdata, G_SUBPROCESS_FLAGS_NONE, NULL);
}

static void
drag_ended (GObject *source, GAsyncResult *result, gpointer data)
{
  g_subprocess_wait_finish (G_SUBPROCESS (source), result, NULL);
  *(gboolean *) data = TRUE;
}

static gboolean
flag_set (gpointer data)
{
  return *(gboolean *) data;
}

/* Rotates for about @seconds; returns frames per second. */
static double
rotate (QvWindow *window, Recorder *r, double seconds, const char **how)
{
  QvModeView *view = qv_window_get_mode_view (window);
  const int steps = MIN ((int) (seconds * 100.0), gtk_widget_get_width (GTK_WIDGET (view)) - 40);
  g_autoptr(GSubprocess) drag = start_drag (window, steps);
  guint before = qv_mode_view_get_frames (view);
  gint64 start = g_get_monotonic_time (), end;
  QvCamera camera_before, camera_after;

  qv_mode_view_get_camera (view, &camera_before);
  g_array_set_size (r->ticks, 0);
  r->recording = TRUE;
  if (drag != NULL)
    {
      *how = "mouse drag (xdotool)";
      /* xdotool sleeps at least 10 ms per step: the drag takes longer than
       * @seconds when the machine is loaded; wait for it */
      gboolean ended = FALSE;
      g_subprocess_wait_async (drag, NULL, drag_ended, &ended);
      qvg_wait (flag_set, &ended, 10.0 * seconds + 30.0);
    }
  else
    {
      *how = "rotation set every frame (no xdotool)";
      r->spin = TRUE;
      qvg_spin (seconds);
      r->spin = FALSE;
    }
  end = g_get_monotonic_time ();
  r->recording = FALSE;
  qv_mode_view_get_camera (view, &camera_after);
  if (glm_quat_dot (camera_before.orientation, camera_after.orientation) > 0.99999f)
    printf ("note: the view's rotation did not change during the drag\n");
  return (double) (qv_mode_view_get_frames (view) - before) / ((double) (end - start) * 1e-6);
}

int
main (int argc, char **argv)
{
  gsize n_atoms = 20000;
  g_autofree char *path = NULL;
  g_autoptr(GError) error = NULL;
  QvBundle bundle = { 0 };
  QvWindow *window;
  Recorder r = { g_array_new (FALSE, FALSE, sizeof (gint64)), FALSE, FALSE, 0.0 };
  gint64 start, shown, drawn;
  const char *how = NULL;
  double fps;

  for (int i = 1; i + 1 < argc; i++)
    if (strcmp (argv[i], "--atoms") == 0)
      n_atoms = (gsize) g_ascii_strtoull (argv[i + 1], NULL, 10);

  bundle.title = (char *) "invented 20 000-atom lattice for bench-large-structure";
  bundle.structure = invented_structure (n_atoms);
  bundle.modes = invented_modes (bundle.structure, 6);
  path = qvg_build_path ("bench-large.quaver.json");
  g_unlink (path);
  if (bundle.modes == NULL || !qv_bundle_write_file (path, &bundle, TRUE, NULL, &error))
    {
      printf ("could not write the bundle: %s\n", error ? error->message : "no modes");
      return 0;
    }
  printf ("system: %zu atoms, 6 precomputed modes, bundle %s\n", n_atoms, path);
  qv_structure_free (bundle.structure);
  qv_mode_set_free (bundle.modes);

  window = qvg_window ();
  gtk_widget_add_tick_callback (GTK_WIDGET (window), on_tick, &r, NULL);
  qvg_spin (0.5);
  {
    g_autoptr(GFile) file = g_file_new_for_path (path);
    start = g_get_monotonic_time ();
    qv_window_open_file (window, file);
    if (!qvg_wait (qvg_window_has_document, window, 600.0))
      {
        printf ("the document did not open%s\n", qv_window_get_error_dialog (window) ? " (error dialog)" : "");
        return 0;
      }
    shown = g_get_monotonic_time ();
  }
  {
    /* the first frame of the new document */
    FrameWait w = { qv_window_get_mode_view (window), 0 };
    w.frames = qv_mode_view_get_frames (w.view);
    qvg_wait (drew_more, &w, 60.0);
  }
  drawn = g_get_monotonic_time ();
  printf ("open (read + modes + show): %.2f s; first frame of it after %.2f s\n",
          (double) (shown - start) * 1e-6, (double) (drawn - start) * 1e-6);

  qv_mode_view_set_playing (qv_window_get_mode_view (window), FALSE);
  qvg_spin (1.0);
  fps = rotate (window, &r, 5.0, &how);
  printf ("rotating, paused, by %s: %.1f frames per second\n", how, fps);
  report_ticks ("rotating, paused", r.ticks);

  qv_mode_view_set_playing (qv_window_get_mode_view (window), TRUE);
  qvg_spin (1.0);
  fps = rotate (window, &r, 5.0, &how);
  printf ("rotating while the mode plays, by %s: %.1f frames per second\n", how, fps);
  report_ticks ("rotating, playing", r.ticks);

  g_unlink (path);
  return 0;
}
