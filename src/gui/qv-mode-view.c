/* qv-mode-view.c — the 3D view of the selected mode.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <epoxy/gl.h>
#include <glib/gi18n.h>
#include "qv-config.h"
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-gui-private.h"
#include "qv-mode-view.h"
#ifdef QV_GUI_HAVE_RENDERER
#include "qv-camera.h"
#include "qv-picture.h"
#include "qv-renderer.h"
#include "qv-style.h"
#endif

/* A press that moves less than this (px) before release is a click. */
#define CLICK_SLOP 4.0
/* Arrows are scaled as in pictures (qv-picture.h): the longest arrow of a
 * mode is QV_PICTURE_ARROW_LONGEST Å whatever the amplitude, and atoms that
 * move less than QV_PICTURE_ARROW_MIN_SHARE of the largest displacement get
 * none. Presentation only: the displacements are the core's. */
/* The still view is drawn in the renderer's quality mode this long after
 * the last zoom or roll step. */
#define SETTLE_MS 250

struct _QvModeView
{
  GtkWidget parent_instance;
  GtkGLArea *area;

  QvStructure *structure;
  float *displacement;        /* 3N, Å per unit Q, or NULL */
  float *imaginary;           /* 3N, the field's imaginary part (a lattice
                                 mode), or NULL for a real mode */
  float *participation;       /* N, or NULL */
  double amplitude;
  gboolean structure_dirty, mode_dirty, options_dirty, fit_pending;

  gboolean playing;
  double speed;               /* cycles per second */
  double phase;
  gint64 last_frame_time;
  guint tick_id;
  guint frames;

  gboolean show_arrows, show_labels, participation_colouring, orthographic, dark;
  gssize highlight;

  double drag_x, drag_y;      /* where the drag began */
  double last_dx, last_dy;    /* offsets already applied (pan) */
  gboolean drag_pan;
  double zoom_scale;
  double pointer_x, pointer_y;
  double roll_angle;
  gboolean dragging;
  guint settle_id;            /* a zoom or roll just happened */

#ifdef QV_GUI_HAVE_RENDERER
  QvRenderer *renderer;
  QvCamera camera;
#endif
  double fit_distance;        /* the camera's distance at the last fit, 0 before */
  double zoom_after_fit;      /* × the fitted frame at the next fit (1) */
};

G_DEFINE_FINAL_TYPE (QvModeView, qv_mode_view, GTK_TYPE_WIDGET)

enum {
  PROP_0,
  PROP_PLAYING,
  PROP_SPEED,
  PROP_SHOW_ARROWS,
  PROP_SHOW_LABELS,
  PROP_PARTICIPATION_COLOURING,
  PROP_ORTHOGRAPHIC,
  PROP_DARK,
  N_PROPS
};
static GParamSpec *props[N_PROPS];

enum { ATOM_ACTIVATED, N_SIGNALS };
static guint signals[N_SIGNALS];

/* ---- drawing ---- */

static gboolean
is_moving (QvModeView *self)
{
  /* Playing counts from the start, before the first tick. */
  return (self->playing && self->displacement != NULL) || self->dragging || self->settle_id != 0;
}

static void
motion_changed (QvModeView *self)
{
  self->options_dirty = TRUE;
  gtk_gl_area_queue_render (self->area);
}

static gboolean
settled (gpointer data)
{
  QvModeView *self = data;
  self->settle_id = 0;
  motion_changed (self);
  return G_SOURCE_REMOVE;
}

/* A zoom or roll step: the fast look until the view stays still. */
static void
unsettle (QvModeView *self)
{
  const gboolean was_moving = is_moving (self);

  g_clear_handle_id (&self->settle_id, g_source_remove);
  self->settle_id = g_timeout_add (SETTLE_MS, settled, self);
  if (!was_moving)
    motion_changed (self);
}

#ifdef QV_GUI_HAVE_RENDERER
static void
camera_viewport (QvModeView *self)
{
  const int scale = gtk_widget_get_scale_factor (GTK_WIDGET (self->area));
  qv_camera_set_viewport (&self->camera, gtk_widget_get_width (GTK_WIDGET (self->area)) * scale,
                          gtk_widget_get_height (GTK_WIDGET (self->area)) * scale);
}

static void
fit_camera (QvModeView *self)
{
  g_autofree float *points = NULL;
  const gsize n = self->structure ? self->structure->n_atoms : 0;

  if (n == 0)
    return;
  points = g_new (float, 3 * n);
  for (gsize a = 0; a < n; a++)
    for (int c = 0; c < 3; c++)
      points[3 * a + c] = (float) self->structure->atoms[a].position[c];
  camera_viewport (self);
  /* Padding: the largest drawn radius and room for the motion. */
  qv_camera_fit (&self->camera, points, n, 1.5f);
  self->fit_distance = self->camera.distance;
  self->camera.distance = (float) (self->fit_distance / self->zoom_after_fit);
  self->zoom_after_fit = 1.0;
  self->fit_pending = FALSE;
}

/* The largest atomic displacement shown, Å: |amplitude| × the longest of
 * the mode's per-atom vectors. */
static double
largest_displacement (QvModeView *self)
{
  const gsize n = self->structure ? self->structure->n_atoms : 0;
  double best = 0.0;

  if (self->displacement == NULL)
    return 0.0;
  for (gsize a = 0; a < n; a++)
    {
      const float *d = self->displacement + 3 * a;
      double l2 = (double) d[0] * d[0] + (double) d[1] * d[1] + (double) d[2] * d[2];
      if (self->imaginary)
        {
          /* over a period the atom's path is an ellipse: its semi-major
           * axis² is (|re|² + |im|² + |v·v|)/2 with v = re + i·im */
          const float *e = self->imaginary + 3 * a;
          double i2 = (double) e[0] * e[0] + (double) e[1] * e[1] + (double) e[2] * e[2];
          double ri = (double) d[0] * e[0] + (double) d[1] * e[1] + (double) d[2] * e[2];
          double vv = sqrt ((l2 - i2) * (l2 - i2) + 4 * ri * ri);
          l2 = 0.5 * (l2 + i2 + vv);
        }
      best = MAX (best, l2);
    }
  return fabs (self->amplitude) * sqrt (best);
}

static void
upload (QvModeView *self)
{
  if (self->structure_dirty)
    {
      if (self->structure)
        qv_renderer_set_structure (self->renderer, self->structure);
      self->structure_dirty = FALSE;
      self->mode_dirty = TRUE;
    }
  if (self->fit_pending)
    fit_camera (self);
  if (self->mode_dirty)
    {
      qv_renderer_set_mode (self->renderer, self->displacement, self->imaginary,
                            (float) self->amplitude);
      if (self->participation)
        qv_renderer_set_participation (self->renderer, self->participation);
      self->mode_dirty = FALSE;
      /* The arrows' scale follows the mode and the amplitude. */
      self->options_dirty = TRUE;
    }
  if (self->options_dirty)
    {
      QvRenderOptions options = *qv_renderer_get_options (self->renderer);
      const double largest = largest_displacement (self);
      options.arrows = self->show_arrows;
      options.labels = self->show_labels;
      if (largest > 0.0)
        {
          options.arrow_scale = (float) (QV_PICTURE_ARROW_LONGEST / largest);
          options.arrow_threshold = (float) (QV_PICTURE_ARROW_MIN_SHARE * largest);
        }
      /* Moving (playing, dragged, zoomed): the renderer's fastest look,
       * hard edges on one sample; still: its quality for still pictures,
       * four samples, drawn once. */
      options.antialias = is_moving (self) ? QV_ANTIALIAS_NONE : QV_ANTIALIAS_EDGES;
      options.samples = is_moving (self) ? 0 : 4;
      options.colouring = self->participation_colouring && self->participation
                          ? QV_COLOUR_PARTICIPATION : QV_COLOUR_ELEMENT;
      options.background = self->dark ? QV_BACKGROUND_DARK : QV_BACKGROUND_LIGHT;
      qv_renderer_set_options (self->renderer, &options);
      qv_camera_set_projection (&self->camera, self->orthographic ? QV_CAMERA_ORTHOGRAPHIC
                                                                   : QV_CAMERA_PERSPECTIVE);
      qv_renderer_set_highlight (self->renderer, self->highlight);
      self->options_dirty = FALSE;
    }
}
#endif

#ifdef QV_GUI_HAVE_RENDERER
/* One small frame into a framebuffer of our own right after the context
 * exists: the GL driver compiles what its first draw needs (Mesa's
 * llvmpipe builds its shader variants then) while the window still shows
 * the welcome page, not when the first document is handed over. The
 * structure is invented: two atoms, a bond, one moving. */
static void
warm_up (QvModeView *self)
{
  g_autoptr(QvStructure) s = qv_structure_new (2, NULL);
  static const float mode[6] = { 0.0f, 0.0f, 0.0f, 0.3f, 0.0f, 0.0f };
  static const float part[2] = { 0.2f, 1.0f };
  QvCamera camera;
  GLuint fbo, colour, depth;
  GLint previous = 0;
  const int size = 64;

  qv_structure_set_element (s, 0, 6, NULL);
  qv_structure_set_element (s, 1, 1, NULL);
  s->atoms[1].position[0] = 1.09;
  glGetIntegerv (GL_FRAMEBUFFER_BINDING, &previous);
  glGenFramebuffers (1, &fbo);
  glGenRenderbuffers (1, &colour);
  glGenRenderbuffers (1, &depth);
  glBindRenderbuffer (GL_RENDERBUFFER, colour);
  glRenderbufferStorage (GL_RENDERBUFFER, GL_RGBA8, size, size);
  glBindRenderbuffer (GL_RENDERBUFFER, depth);
  glRenderbufferStorage (GL_RENDERBUFFER, GL_DEPTH24_STENCIL8, size, size);
  glBindFramebuffer (GL_FRAMEBUFFER, fbo);
  glFramebufferRenderbuffer (GL_FRAMEBUFFER, GL_COLOR_ATTACHMENT0, GL_RENDERBUFFER, colour);
  glFramebufferRenderbuffer (GL_FRAMEBUFFER, GL_DEPTH_STENCIL_ATTACHMENT, GL_RENDERBUFFER, depth);
  if (glCheckFramebufferStatus (GL_FRAMEBUFFER) == GL_FRAMEBUFFER_COMPLETE)
    {
      float points[6] = { 0.0f, 0.0f, 0.0f, 1.09f, 0.0f, 0.0f };
      qv_camera_init (&camera);
      qv_camera_set_viewport (&camera, size, size);
      qv_camera_fit (&camera, points, 2, 1.5f);
      qv_renderer_set_structure (self->renderer, s);
      qv_renderer_set_mode (self->renderer, mode, NULL, 1.0f);
      qv_renderer_set_participation (self->renderer, part);
      qv_renderer_draw (self->renderer, &camera);
      glFinish ();
    }
  glBindFramebuffer (GL_FRAMEBUFFER, (GLuint) previous);
  glDeleteFramebuffers (1, &fbo);
  glDeleteRenderbuffers (1, &colour);
  glDeleteRenderbuffers (1, &depth);
}
#endif

static void
area_realize (GtkGLArea *area, QvModeView *self)
{
  gtk_gl_area_make_current (area);
  if (gtk_gl_area_get_error (area) != NULL)
    {
      g_warning ("The 3D view has no OpenGL context: %s", gtk_gl_area_get_error (area)->message);
      return;
    }
#ifdef QV_GUI_HAVE_RENDERER
  {
    g_autoptr(GError) error = NULL;
    self->renderer = qv_renderer_new (&error);
    if (self->renderer == NULL)
      {
        g_warning ("The 3D view cannot draw: %s", error->message);
        gtk_gl_area_set_error (area, error);
        return;
      }
    self->structure_dirty = self->mode_dirty = self->options_dirty = TRUE;
    warm_up (self);
  }
#endif
}

static void
area_unrealize (GtkGLArea *area, QvModeView *self)
{
#ifdef QV_GUI_HAVE_RENDERER
  gtk_gl_area_make_current (area);
  if (self->renderer && gtk_gl_area_get_error (area) == NULL)
    qv_renderer_free (self->renderer);
  self->renderer = NULL;
#endif
}

static gboolean
area_render (GtkGLArea *area, GdkGLContext *context, QvModeView *self)
{
  self->frames++;
  if (self->frames == 1)
    qv_gui_first_frame ();
#ifdef QV_GUI_HAVE_RENDERER
  if (self->renderer)
    {
      upload (self);
      camera_viewport (self);
      qv_renderer_set_phase (self->renderer, (float) self->phase);
      qv_renderer_draw (self->renderer, &self->camera);
      return TRUE;
    }
#endif
  /* No renderer: the background colour only. */
  if (self->dark)
    glClearColor (0.11f, 0.12f, 0.14f, 1.0f);
  else
    glClearColor (0.95f, 0.95f, 0.94f, 1.0f);
  glClear (GL_COLOR_BUFFER_BIT | GL_DEPTH_BUFFER_BIT);
  return TRUE;
}

static void
redraw (QvModeView *self)
{
  gtk_gl_area_queue_render (self->area);
}

/* ---- animation ---- */

static gboolean
tick (GtkWidget *widget, GdkFrameClock *clock, gpointer data)
{
  QvModeView *self = data;
  const gint64 now = gdk_frame_clock_get_frame_time (clock);

  if (self->last_frame_time != 0)
    qv_mode_view_step (self, (double) (now - self->last_frame_time) * 1e-6);
  self->last_frame_time = now;
  return G_SOURCE_CONTINUE;
}

static void
update_ticking (QvModeView *self)
{
  const gboolean want = self->playing && self->displacement != NULL && gtk_widget_get_mapped (GTK_WIDGET (self));

  if (want && self->tick_id == 0)
    {
      self->last_frame_time = 0;
      self->tick_id = gtk_widget_add_tick_callback (GTK_WIDGET (self), tick, self, NULL);
      motion_changed (self);
    }
  else if (!want && self->tick_id != 0)
    {
      gtk_widget_remove_tick_callback (GTK_WIDGET (self), self->tick_id);
      self->tick_id = 0;
      motion_changed (self);
    }
}

void
qv_mode_view_step (QvModeView *self, double seconds)
{
  qv_mode_view_set_phase (self, self->phase + 2.0 * G_PI * self->speed * seconds);
}

void
qv_mode_view_set_phase (QvModeView *self, double phase)
{
  phase = fmod (phase, 2.0 * G_PI);
  if (phase < 0.0)
    phase += 2.0 * G_PI;
  self->phase = phase;
  /* Per frame: one uniform (set in render) and a redraw. */
  redraw (self);
}

gboolean
qv_mode_view_get_camera (QvModeView *self, QvCamera *camera)
{
#ifdef QV_GUI_HAVE_RENDERER
  camera_viewport (self);
  *camera = self->camera;
  return TRUE;
#else
  return FALSE;
#endif
}

double
qv_mode_view_get_phase (QvModeView *self)
{
  return self->phase;
}

gboolean
qv_mode_view_get_playing (QvModeView *self)
{
  return self->playing;
}

void
qv_mode_view_set_playing (QvModeView *self, gboolean playing)
{
  if (self->playing == !!playing)
    return;
  self->playing = !!playing;
  update_ticking (self);
  motion_changed (self);
  g_object_notify_by_pspec (G_OBJECT (self), props[PROP_PLAYING]);
}

/* ---- content ---- */

void
qv_mode_view_set_structure (QvModeView *self, const QvStructure *structure, gboolean fit)
{
  g_clear_pointer (&self->structure, qv_structure_free);
  self->structure = structure ? qv_structure_copy (structure) : NULL;
  g_clear_pointer (&self->displacement, g_free);
  g_clear_pointer (&self->imaginary, g_free);
  g_clear_pointer (&self->participation, g_free);
  self->structure_dirty = TRUE;
  self->fit_pending = self->fit_pending || fit;
  self->highlight = -1;
  self->options_dirty = TRUE;
  update_ticking (self);
  redraw (self);
}

void
qv_mode_view_set_mode (QvModeView *self, const float *displacement, const float *participation,
                       double amplitude)
{
  qv_mode_view_set_complex_mode (self, displacement, NULL, participation, amplitude);
}

void
qv_mode_view_set_complex_mode (QvModeView *self, const float *re, const float *im,
                               const float *participation, double amplitude)
{
  const gsize n = self->structure ? self->structure->n_atoms : 0;

  g_clear_pointer (&self->displacement, g_free);
  g_clear_pointer (&self->imaginary, g_free);
  g_clear_pointer (&self->participation, g_free);
  if (re && n)
    self->displacement = g_memdup2 (re, sizeof (float) * 3 * n);
  if (re && im && n)
    self->imaginary = g_memdup2 (im, sizeof (float) * 3 * n);
  if (participation && n)
    self->participation = g_memdup2 (participation, sizeof (float) * n);
  self->amplitude = amplitude;
  self->mode_dirty = TRUE;
  self->options_dirty = TRUE;
  update_ticking (self);
  redraw (self);
}

void
qv_mode_view_set_amplitude (QvModeView *self, double amplitude)
{
  self->amplitude = amplitude;
  self->mode_dirty = TRUE;
  redraw (self);
}

double
qv_mode_view_get_amplitude (QvModeView *self)
{
  return self->amplitude;
}

gsize
qv_mode_view_get_n_atoms (QvModeView *self)
{
  return self->structure ? self->structure->n_atoms : 0;
}

gboolean
qv_mode_view_is_complex (QvModeView *self)
{
  return self->imaginary != NULL;
}

void
qv_mode_view_set_dark (QvModeView *self, gboolean dark)
{
  g_object_set (self, "dark", dark, NULL);
}

void
qv_mode_view_set_highlight (QvModeView *self, gssize atom)
{
  self->highlight = atom;
  self->options_dirty = TRUE;
  redraw (self);
}

void
qv_mode_view_prepare (QvModeView *self)
{
  GtkRoot *root = gtk_widget_get_root (GTK_WIDGET (self));

  /* Realizing the area realizes its parents, shown or not. */
  if (root && gtk_widget_get_realized (GTK_WIDGET (root)) && !gtk_widget_get_realized (GTK_WIDGET (self->area)))
    gtk_widget_realize (GTK_WIDGET (self->area));
}

guint
qv_mode_view_get_frames (QvModeView *self)
{
  return self->frames;
}

gboolean
qv_mode_view_has_renderer (QvModeView *self)
{
#ifdef QV_GUI_HAVE_RENDERER
  return self->renderer != NULL;
#else
  return FALSE;
#endif
}

/* ---- camera ---- */

void
qv_mode_view_view_along (QvModeView *self, int axis)
{
#ifdef QV_GUI_HAVE_RENDERER
  qv_camera_view_along (&self->camera, (QvViewAxis) axis);
#endif
  redraw (self);
}

void
qv_mode_view_reset (QvModeView *self)
{
  self->zoom_after_fit = 1.0;
#ifdef QV_GUI_HAVE_RENDERER
  qv_camera_init (&self->camera);
  self->options_dirty = TRUE;
#endif
  self->fit_pending = TRUE;
  redraw (self);
}

void
qv_mode_view_set_orientation (QvModeView *self, const double q[4])
{
#ifdef QV_GUI_HAVE_RENDERER
  const double norm = sqrt (q[0] * q[0] + q[1] * q[1] + q[2] * q[2] + q[3] * q[3]);
  if (!(norm > 1e-6))
    return;
  for (int i = 0; i < 4; i++)
    self->camera.orientation[i] = (float) (q[i] / norm);
#endif
  redraw (self);
}

double
qv_mode_view_get_zoom (QvModeView *self)
{
#ifdef QV_GUI_HAVE_RENDERER
  if (!self->fit_pending && self->fit_distance > 0.0 && self->camera.distance > 0.0f)
    return self->fit_distance / self->camera.distance;
#endif
  return self->zoom_after_fit;
}

void
qv_mode_view_set_zoom (QvModeView *self, double zoom)
{
  if (!(zoom > 0.0) || !isfinite (zoom))
    return;
#ifdef QV_GUI_HAVE_RENDERER
  if (!self->fit_pending && self->fit_distance > 0.0)
    self->camera.distance = (float) (self->fit_distance / zoom);
  else
#endif
    self->zoom_after_fit = zoom;
  redraw (self);
}

gssize
qv_mode_view_pick (QvModeView *self, double x, double y)
{
#ifdef QV_GUI_HAVE_RENDERER
  const int scale = gtk_widget_get_scale_factor (GTK_WIDGET (self));

  if (self->renderer == NULL || !gtk_widget_get_realized (GTK_WIDGET (self->area)))
    return -1;
  gtk_gl_area_make_current (self->area);
  upload (self);
  camera_viewport (self);
  qv_renderer_set_phase (self->renderer, (float) self->phase);
  return qv_camera_pick (&self->camera, (float) (x * scale), (float) (y * scale),
                         qv_renderer_positions (self->renderer), qv_renderer_radii (self->renderer),
                         qv_renderer_n_atoms (self->renderer));
#else
  return -1;
#endif
}

gboolean
qv_mode_view_project_atom (QvModeView *self, gsize atom, double *x, double *y)
{
#ifdef QV_GUI_HAVE_RENDERER
  const int scale = gtk_widget_get_scale_factor (GTK_WIDGET (self));
  float px, py, depth;

  if (self->renderer == NULL || atom >= qv_renderer_n_atoms (self->renderer))
    return FALSE;
  gtk_gl_area_make_current (self->area);
  upload (self);
  camera_viewport (self);
  qv_renderer_set_phase (self->renderer, (float) self->phase);
  if (!qv_camera_project (&self->camera, qv_renderer_positions (self->renderer) + 3 * atom, &px, &py, &depth))
    return FALSE;
  *x = px / scale;
  *y = py / scale;
  return TRUE;
#else
  return FALSE;
#endif
}

static void
drag_begin (GtkGestureDrag *gesture, double x, double y, QvModeView *self)
{
  const GdkModifierType mods = gtk_event_controller_get_current_event_state (GTK_EVENT_CONTROLLER (gesture));
  const guint button = gtk_gesture_single_get_current_button (GTK_GESTURE_SINGLE (gesture));

  gtk_widget_grab_focus (GTK_WIDGET (self));
  self->dragging = TRUE;
  motion_changed (self);
  self->drag_x = x;
  self->drag_y = y;
  self->last_dx = self->last_dy = 0.0;
  self->drag_pan = button != GDK_BUTTON_PRIMARY || (mods & GDK_SHIFT_MASK);
#ifdef QV_GUI_HAVE_RENDERER
  if (!self->drag_pan)
    {
      const int scale = gtk_widget_get_scale_factor (GTK_WIDGET (self));
      qv_camera_rotate_begin (&self->camera, (float) (x * scale), (float) (y * scale));
    }
#endif
}

static void
drag_update (GtkGestureDrag *gesture, double dx, double dy, QvModeView *self)
{
#ifdef QV_GUI_HAVE_RENDERER
  const int scale = gtk_widget_get_scale_factor (GTK_WIDGET (self));
  if (self->drag_pan)
    qv_camera_pan (&self->camera, (float) ((dx - self->last_dx) * scale), (float) ((dy - self->last_dy) * scale));
  else
    qv_camera_rotate_drag (&self->camera, (float) ((self->drag_x + dx) * scale),
                           (float) ((self->drag_y + dy) * scale));
#endif
  self->last_dx = dx;
  self->last_dy = dy;
  redraw (self);
}

static void
drag_end (GtkGestureDrag *gesture, double dx, double dy, QvModeView *self)
{
#ifdef QV_GUI_HAVE_RENDERER
  if (!self->drag_pan)
    qv_camera_rotate_end (&self->camera);
#endif
  self->dragging = FALSE;
  motion_changed (self);
  if (hypot (dx, dy) < CLICK_SLOP
      && gtk_gesture_single_get_current_button (GTK_GESTURE_SINGLE (gesture)) == GDK_BUTTON_PRIMARY)
    {
      const double x = self->drag_x + dx, y = self->drag_y + dy;
      const gssize atom = qv_mode_view_pick (self, x, y);
      if (atom >= 0)
        g_signal_emit (self, signals[ATOM_ACTIVATED], 0, (guint) atom, x, y);
    }
}

static void
pointer_moved (GtkEventControllerMotion *motion, double x, double y, QvModeView *self)
{
  self->pointer_x = x;
  self->pointer_y = y;
}

static gboolean
scrolled (GtkEventControllerScroll *controller, double dx, double dy, QvModeView *self)
{
#ifdef QV_GUI_HAVE_RENDERER
  const int scale = gtk_widget_get_scale_factor (GTK_WIDGET (self));
  /* Zoom towards the pointer. */
  const double x = self->pointer_x, y = self->pointer_y;

  qv_camera_zoom_at (&self->camera, (float) (x * scale), (float) (y * scale), (float) pow (1.15, -dy));
#endif
  unsettle (self);
  redraw (self);
  return TRUE;
}

static void
zoom_changed (GtkGestureZoom *gesture, double scale_delta, QvModeView *self)
{
#ifdef QV_GUI_HAVE_RENDERER
  const int scale = gtk_widget_get_scale_factor (GTK_WIDGET (self));
  double x, y;
  if (!gtk_gesture_get_bounding_box_center (GTK_GESTURE (gesture), &x, &y))
    x = gtk_widget_get_width (GTK_WIDGET (self)) / 2.0, y = gtk_widget_get_height (GTK_WIDGET (self)) / 2.0;
  if (self->zoom_scale > 0.0)
    qv_camera_zoom_at (&self->camera, (float) (x * scale), (float) (y * scale),
                       (float) (scale_delta / self->zoom_scale));
#endif
  self->zoom_scale = scale_delta;
  unsettle (self);
  redraw (self);
}

static void
zoom_begin (GtkGesture *gesture, GdkEventSequence *sequence, QvModeView *self)
{
  self->zoom_scale = 1.0;
}

static void
rotate_changed (GtkGestureRotate *gesture, double angle, double delta, QvModeView *self)
{
#ifdef QV_GUI_HAVE_RENDERER
  qv_camera_roll (&self->camera, (float) (delta - self->roll_angle));
#endif
  self->roll_angle = delta;
  unsettle (self);
  redraw (self);
}

static void
rotate_begin (GtkGesture *gesture, GdkEventSequence *sequence, QvModeView *self)
{
  self->roll_angle = 0.0;
}

/* ---- GObject / GtkWidget ---- */

static void
qv_mode_view_map (GtkWidget *widget)
{
  GTK_WIDGET_CLASS (qv_mode_view_parent_class)->map (widget);
  update_ticking (QV_MODE_VIEW (widget));
}

static void
qv_mode_view_unmap (GtkWidget *widget)
{
  QvModeView *self = QV_MODE_VIEW (widget);
  GTK_WIDGET_CLASS (qv_mode_view_parent_class)->unmap (widget);
  g_clear_handle_id (&self->settle_id, g_source_remove);
  if (self->tick_id)
    {
      gtk_widget_remove_tick_callback (widget, self->tick_id);
      self->tick_id = 0;
    }
}

static void
qv_mode_view_get_property (GObject *object, guint prop_id, GValue *value, GParamSpec *pspec)
{
  QvModeView *self = QV_MODE_VIEW (object);
  switch (prop_id)
    {
    case PROP_PLAYING: g_value_set_boolean (value, self->playing); break;
    case PROP_SPEED: g_value_set_double (value, self->speed); break;
    case PROP_SHOW_ARROWS: g_value_set_boolean (value, self->show_arrows); break;
    case PROP_SHOW_LABELS: g_value_set_boolean (value, self->show_labels); break;
    case PROP_PARTICIPATION_COLOURING: g_value_set_boolean (value, self->participation_colouring); break;
    case PROP_ORTHOGRAPHIC: g_value_set_boolean (value, self->orthographic); break;
    case PROP_DARK: g_value_set_boolean (value, self->dark); break;
    default: G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
set_flag (QvModeView *self, gboolean *field, gboolean value, GParamSpec *pspec)
{
  if (*field == !!value)
    return;
  *field = !!value;
  self->options_dirty = TRUE;
  redraw (self);
  g_object_notify_by_pspec (G_OBJECT (self), pspec);
}

static void
qv_mode_view_set_property (GObject *object, guint prop_id, const GValue *value, GParamSpec *pspec)
{
  QvModeView *self = QV_MODE_VIEW (object);
  switch (prop_id)
    {
    case PROP_PLAYING: qv_mode_view_set_playing (self, g_value_get_boolean (value)); break;
    case PROP_SPEED:
      self->speed = g_value_get_double (value);
      g_object_notify_by_pspec (object, pspec);
      break;
    case PROP_SHOW_ARROWS: set_flag (self, &self->show_arrows, g_value_get_boolean (value), pspec); break;
    case PROP_SHOW_LABELS: set_flag (self, &self->show_labels, g_value_get_boolean (value), pspec); break;
    case PROP_PARTICIPATION_COLOURING:
      set_flag (self, &self->participation_colouring, g_value_get_boolean (value), pspec);
      break;
    case PROP_ORTHOGRAPHIC: set_flag (self, &self->orthographic, g_value_get_boolean (value), pspec); break;
    case PROP_DARK: set_flag (self, &self->dark, g_value_get_boolean (value), pspec); break;
    default: G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
qv_mode_view_dispose (GObject *object)
{
  QvModeView *self = QV_MODE_VIEW (object);

  g_clear_handle_id (&self->settle_id, g_source_remove);
  gtk_widget_dispose_template (GTK_WIDGET (self), QV_TYPE_MODE_VIEW);
  self->area = NULL;
  G_OBJECT_CLASS (qv_mode_view_parent_class)->dispose (object);
}

static void
qv_mode_view_finalize (GObject *object)
{
  QvModeView *self = QV_MODE_VIEW (object);

  g_clear_pointer (&self->structure, qv_structure_free);
  g_free (self->displacement);
  g_free (self->imaginary);
  g_free (self->participation);
  G_OBJECT_CLASS (qv_mode_view_parent_class)->finalize (object);
}

static void
qv_mode_view_class_init (QvModeViewClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);
  const GParamFlags flags = G_PARAM_READWRITE | G_PARAM_STATIC_STRINGS | G_PARAM_EXPLICIT_NOTIFY;

  object_class->get_property = qv_mode_view_get_property;
  object_class->set_property = qv_mode_view_set_property;
  object_class->dispose = qv_mode_view_dispose;
  object_class->finalize = qv_mode_view_finalize;
  widget_class->map = qv_mode_view_map;
  widget_class->unmap = qv_mode_view_unmap;

  props[PROP_PLAYING] = g_param_spec_boolean ("playing", NULL, NULL, TRUE, flags);
  props[PROP_SPEED] = g_param_spec_double ("speed", NULL, NULL, 0.0, 10.0, 0.6, flags);
  props[PROP_SHOW_ARROWS] = g_param_spec_boolean ("show-arrows", NULL, NULL, TRUE, flags);
  props[PROP_SHOW_LABELS] = g_param_spec_boolean ("show-labels", NULL, NULL, FALSE, flags);
  props[PROP_PARTICIPATION_COLOURING] = g_param_spec_boolean ("participation-colouring", NULL, NULL, FALSE, flags);
  props[PROP_ORTHOGRAPHIC] = g_param_spec_boolean ("orthographic", NULL, NULL, FALSE, flags);
  props[PROP_DARK] = g_param_spec_boolean ("dark", NULL, NULL, FALSE, flags);
  g_object_class_install_properties (object_class, N_PROPS, props);

  /* A click on an atom: its index (0-based) and where, in view pixels. */
  signals[ATOM_ACTIVATED] = g_signal_new ("atom-activated", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST,
                                          0, NULL, NULL, NULL, G_TYPE_NONE, 3,
                                          G_TYPE_UINT, G_TYPE_DOUBLE, G_TYPE_DOUBLE);

  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "qvmodeview");
  gtk_widget_class_set_template_from_resource (widget_class, "/org/quaverlab/Quaver/gui/qv-mode-view.ui");
  gtk_widget_class_bind_template_child (widget_class, QvModeView, area);

  /* ↑/↓ step through the modes while the view has the focus. */
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_Down, 0, "win.next-mode", NULL);
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_Up, 0, "win.previous-mode", NULL);
}

static void
qv_mode_view_init (QvModeView *self)
{
  GtkGesture *drag, *zoom, *rotate;
  GtkEventController *scroll, *motion;

  gtk_widget_init_template (GTK_WIDGET (self));
  self->playing = TRUE;
  self->speed = 0.6;
  self->show_arrows = TRUE;
  self->highlight = -1;
  self->zoom_after_fit = 1.0;
#ifdef QV_GUI_HAVE_RENDERER
  qv_camera_init (&self->camera);
#endif
  gtk_widget_set_focusable (GTK_WIDGET (self), TRUE);
  gtk_gl_area_set_required_version (self->area, 3, 3);
  gtk_gl_area_set_has_depth_buffer (self->area, TRUE);
  g_signal_connect (self->area, "realize", G_CALLBACK (area_realize), self);
  g_signal_connect (self->area, "unrealize", G_CALLBACK (area_unrealize), self);
  g_signal_connect (self->area, "render", G_CALLBACK (area_render), self);

  drag = gtk_gesture_drag_new ();
  gtk_gesture_single_set_button (GTK_GESTURE_SINGLE (drag), 0);
  g_signal_connect (drag, "drag-begin", G_CALLBACK (drag_begin), self);
  g_signal_connect (drag, "drag-update", G_CALLBACK (drag_update), self);
  g_signal_connect (drag, "drag-end", G_CALLBACK (drag_end), self);
  gtk_widget_add_controller (GTK_WIDGET (self), GTK_EVENT_CONTROLLER (drag));

  scroll = gtk_event_controller_scroll_new (GTK_EVENT_CONTROLLER_SCROLL_VERTICAL);
  g_signal_connect (scroll, "scroll", G_CALLBACK (scrolled), self);
  gtk_widget_add_controller (GTK_WIDGET (self), scroll);

  motion = gtk_event_controller_motion_new ();
  g_signal_connect (motion, "enter", G_CALLBACK (pointer_moved), self);
  g_signal_connect (motion, "motion", G_CALLBACK (pointer_moved), self);
  gtk_widget_add_controller (GTK_WIDGET (self), motion);

  zoom = gtk_gesture_zoom_new ();
  g_signal_connect (zoom, "begin", G_CALLBACK (zoom_begin), self);
  g_signal_connect (zoom, "scale-changed", G_CALLBACK (zoom_changed), self);
  gtk_widget_add_controller (GTK_WIDGET (self), GTK_EVENT_CONTROLLER (zoom));

  rotate = gtk_gesture_rotate_new ();
  g_signal_connect (rotate, "begin", G_CALLBACK (rotate_begin), self);
  g_signal_connect (rotate, "angle-changed", G_CALLBACK (rotate_changed), self);
  gtk_widget_add_controller (GTK_WIDGET (self), GTK_EVENT_CONTROLLER (rotate));
}
