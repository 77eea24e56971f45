/* qv-motion-bar.h — the strip over the view that sets how the mode moves:
 * amplitude in multiples of the turning point, speed, arrows, colouring.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-mode-set.h"

G_BEGIN_DECLS

#define QV_TYPE_MOTION_BAR (qv_motion_bar_get_type ())
G_DECLARE_FINAL_TYPE (QvMotionBar, qv_motion_bar, QV, MOTION_BAR, GtkWidget)

/* Property "amplitude": multiple of the turning point at level v. */
double qv_motion_bar_get_amplitude (QvMotionBar *self);
void qv_motion_bar_set_amplitude (QvMotionBar *self, double multiple);
/* Property "speed": cycles per second. */
double qv_motion_bar_get_speed (QvMotionBar *self);
/* Says what the amplitude means for mode @k at level @v (largest atomic
 * displacement in Å, from the core); NULL @modes clears. */
void qv_motion_bar_set_mode (QvMotionBar *self, const QvModeSet *modes, int k, guint v);
/* Says @text instead (a lattice mode's scale); NULL clears. */
void qv_motion_bar_set_summary (QvMotionBar *self, const char *text);
/* The explanation shown, for tests. */
const char *qv_motion_bar_get_summary (QvMotionBar *self);

G_END_DECLS
