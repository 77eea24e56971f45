/* qv-motion-bar.c — amplitude, speed, arrows, colouring.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-config.h"
#include "qv-motion-bar.h"

struct _QvMotionBar
{
  GtkWidget parent_instance;
  GtkWidget *box;
  GtkAdjustment *amplitude_adjustment;
  GtkAdjustment *speed_adjustment;
  GtkLabel *multiple_label;
  GtkLabel *summary_label;
};

G_DEFINE_FINAL_TYPE (QvMotionBar, qv_motion_bar, GTK_TYPE_WIDGET)

enum { PROP_0, PROP_AMPLITUDE, PROP_SPEED, N_PROPS };
static GParamSpec *props[N_PROPS];

double
qv_motion_bar_get_amplitude (QvMotionBar *self)
{
  return gtk_adjustment_get_value (self->amplitude_adjustment);
}

void
qv_motion_bar_set_amplitude (QvMotionBar *self, double multiple)
{
  gtk_adjustment_set_value (self->amplitude_adjustment, multiple);
}

double
qv_motion_bar_get_speed (QvMotionBar *self)
{
  return gtk_adjustment_get_value (self->speed_adjustment);
}

void
qv_motion_bar_set_mode (QvMotionBar *self, const QvModeSet *modes, int k, guint v)
{
  g_autofree char *text = NULL;
  gboolean from_tp = FALSE;
  double q, largest;
  gsize atom = 0;

  if (modes == NULL || k < 0)
    {
      gtk_label_set_label (self->summary_label, "");
      return;
    }
  q = qv_mode_set_display_amplitude (modes, (gsize) k, v, qv_motion_bar_get_amplitude (self), &from_tp);
  largest = qv_mode_set_max_displacement (modes, (gsize) k, q, &atom);
  text = from_tp
         /* TRANSLATORS: "× turning point at v = 0: largest 0.204 Å (atom 4)" */
         ? g_strdup_printf (_("× turning point at v = %u: largest %.3f Å (atom %zu)"), v, largest, atom + 1)
         : g_strdup_printf (_("no turning point: largest %.3f Å (atom %zu), a fixed scale"), largest, atom + 1);
  gtk_label_set_label (self->summary_label, text);
  gtk_widget_set_tooltip_text (GTK_WIDGET (self->summary_label), text);
}

void
qv_motion_bar_set_summary (QvMotionBar *self, const char *text)
{
  gtk_label_set_label (self->summary_label, text ? text : "");
  gtk_widget_set_tooltip_text (GTK_WIDGET (self->summary_label), text);
}

const char *
qv_motion_bar_get_summary (QvMotionBar *self)
{
  return gtk_label_get_label (self->summary_label);
}

static void
amplitude_changed (QvMotionBar *self)
{
  g_autofree char *text = g_strdup_printf ("%.1f×", qv_motion_bar_get_amplitude (self));
  gtk_label_set_label (self->multiple_label, text);
  g_object_notify_by_pspec (G_OBJECT (self), props[PROP_AMPLITUDE]);
}

static void
speed_changed (QvMotionBar *self)
{
  g_object_notify_by_pspec (G_OBJECT (self), props[PROP_SPEED]);
}

static void
qv_motion_bar_get_property (GObject *object, guint prop_id, GValue *value, GParamSpec *pspec)
{
  QvMotionBar *self = QV_MOTION_BAR (object);
  switch (prop_id)
    {
    case PROP_AMPLITUDE: g_value_set_double (value, qv_motion_bar_get_amplitude (self)); break;
    case PROP_SPEED: g_value_set_double (value, qv_motion_bar_get_speed (self)); break;
    default: G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
qv_motion_bar_set_property (GObject *object, guint prop_id, const GValue *value, GParamSpec *pspec)
{
  QvMotionBar *self = QV_MOTION_BAR (object);
  switch (prop_id)
    {
    case PROP_AMPLITUDE: gtk_adjustment_set_value (self->amplitude_adjustment, g_value_get_double (value)); break;
    case PROP_SPEED: gtk_adjustment_set_value (self->speed_adjustment, g_value_get_double (value)); break;
    default: G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
qv_motion_bar_dispose (GObject *object)
{
  gtk_widget_dispose_template (GTK_WIDGET (object), QV_TYPE_MOTION_BAR);
  G_OBJECT_CLASS (qv_motion_bar_parent_class)->dispose (object);
}

static void
qv_motion_bar_class_init (QvMotionBarClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->get_property = qv_motion_bar_get_property;
  object_class->set_property = qv_motion_bar_set_property;
  object_class->dispose = qv_motion_bar_dispose;
  props[PROP_AMPLITUDE] = g_param_spec_double ("amplitude", NULL, NULL, 0.1, 10.0, 1.0,
                                               G_PARAM_READWRITE | G_PARAM_STATIC_STRINGS | G_PARAM_EXPLICIT_NOTIFY);
  props[PROP_SPEED] = g_param_spec_double ("speed", NULL, NULL, 0.1, 3.0, 0.6,
                                           G_PARAM_READWRITE | G_PARAM_STATIC_STRINGS | G_PARAM_EXPLICIT_NOTIFY);
  g_object_class_install_properties (object_class, N_PROPS, props);

  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "qvmotionbar");
  gtk_widget_class_set_template_from_resource (widget_class, "/org/quaverlab/Quaver/gui/qv-motion-bar.ui");
  gtk_widget_class_bind_template_child (widget_class, QvMotionBar, box);
  gtk_widget_class_bind_template_child (widget_class, QvMotionBar, amplitude_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvMotionBar, speed_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvMotionBar, multiple_label);
  gtk_widget_class_bind_template_child (widget_class, QvMotionBar, summary_label);
}

static void
qv_motion_bar_init (QvMotionBar *self)
{
  gtk_widget_init_template (GTK_WIDGET (self));
  g_signal_connect_object (self->amplitude_adjustment, "value-changed", G_CALLBACK (amplitude_changed), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->speed_adjustment, "value-changed", G_CALLBACK (speed_changed), self,
                           G_CONNECT_SWAPPED);
  amplitude_changed (self);
}
