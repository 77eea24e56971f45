/* qv-mode-view.h — the 3D view: a GtkGLArea that draws the structure and
 * the selected mode through the renderer (src/render), animates it from the
 * frame clock, and turns mouse and touchpad input into camera moves and
 * atom picks.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-camera.h"
#include "qv-structure.h"

G_BEGIN_DECLS

#define QV_TYPE_MODE_VIEW (qv_mode_view_get_type ())
G_DECLARE_FINAL_TYPE (QvModeView, qv_mode_view, QV, MODE_VIEW, GtkWidget)

/* Shows @structure (copied); @fit re-centres the camera on it. Clears the
 * mode. */
void qv_mode_view_set_structure (QvModeView *self, const QvStructure *structure, gboolean fit);
/* The mode's Cartesian displacement field (3N floats, Å per unit Q), the
 * per-atom colouring weights in [0, 1] (N floats, may be NULL) and the Q
 * shown; NULL @displacement clears. Copied. */
void qv_mode_view_set_mode (QvModeView *self, const float *displacement, const float *participation,
                            double amplitude);
/* A lattice mode's complex field: r(φ) = r₀ + amplitude·(re cos φ − im
 * sin φ) (qv-lattice-replica.h); NULL @im is a real mode. Copied. */
void qv_mode_view_set_complex_mode (QvModeView *self, const float *re, const float *im,
                                    const float *participation, double amplitude);
void qv_mode_view_set_amplitude (QvModeView *self, double amplitude);
/* Atoms shown, and whether the mode shown has an imaginary part (for tests). */
gsize qv_mode_view_get_n_atoms (QvModeView *self);
gboolean qv_mode_view_is_complex (QvModeView *self);
double qv_mode_view_get_amplitude (QvModeView *self);

/* Animation. Property "playing"; "speed" in cycles per second. */
gboolean qv_mode_view_get_playing (QvModeView *self);
void qv_mode_view_set_playing (QvModeView *self, gboolean playing);
/* Phase φ in radians, in [0, 2π). */
double qv_mode_view_get_phase (QvModeView *self);
void qv_mode_view_set_phase (QvModeView *self, double phase);
/* Advances the phase by @seconds at the current speed, as the frame clock
 * does (deterministic, for tests). */
void qv_mode_view_step (QvModeView *self, double seconds);

/* Properties "show-arrows", "participation-colouring", "orthographic",
 * "dark" (background). */
void qv_mode_view_set_dark (QvModeView *self, gboolean dark);

/* Camera. @axis is a QvViewAxis. */
void qv_mode_view_view_along (QvModeView *self, int axis);
void qv_mode_view_reset (QvModeView *self);
void qv_mode_view_set_highlight (QvModeView *self, gssize atom);
/* The camera as the view draws it now, for a picture of the same view
 * (its viewport is the view's); FALSE in a build without the renderer. */
gboolean qv_mode_view_get_camera (QvModeView *self, QvCamera *camera);
/* The camera's rotation (a quaternion x, y, z, w: world → view, normalised
 * here), and the zoom as a factor of the fitted frame (1: fitted; a zoom
 * set before the structure is fitted applies at the fit). For a bundle's
 * "view" (qv-document-save.h). */
void qv_mode_view_set_orientation (QvModeView *self, const double q[4]);
double qv_mode_view_get_zoom (QvModeView *self);
void qv_mode_view_set_zoom (QvModeView *self, double zoom);

/* The atom drawn under widget point (x, y) at the current phase, or −1.
 * Signal "atom-activated" (guint atom, double x, double y) on a click. */
gssize qv_mode_view_pick (QvModeView *self, double x, double y);
/* Where atom @atom is drawn, in widget coordinates; FALSE when unknown. */
gboolean qv_mode_view_project_atom (QvModeView *self, gsize atom, double *x, double *y);

/* Creates the GL context and the renderer now, before the view is shown,
 * and draws one small invented frame off screen so the driver's first-draw
 * work is done early (the window calls it while the welcome page shows). */
void qv_mode_view_prepare (QvModeView *self);

/* Frames drawn so far, and TRUE when the renderer draws (FALSE: the view
 * only clears, because the build has no renderer or GL failed). */
guint qv_mode_view_get_frames (QvModeView *self);
gboolean qv_mode_view_has_renderer (QvModeView *self);

G_END_DECLS
