/* qv-preferences-window.c — the Preferences window, bound to QvPreferences.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "qv-preferences.h"
#include "qv-preferences-window.h"

struct _QvPreferencesWindow
{
  GtkWindow parent_instance;
  GtkDropDown *background_dropdown;
  GtkDropDown *unit_dropdown;
  GtkAdjustment *level_adjustment;
  GtkWidget *persist_label;
};

G_DEFINE_FINAL_TYPE (QvPreferencesWindow, qv_preferences_window, GTK_TYPE_WINDOW)

/* Dropdown positions are the enum values (both lists are in enum order). */
static gboolean
enum_to_position (GBinding *binding, const GValue *from, GValue *to, gpointer data)
{
  g_value_set_uint (to, (guint) g_value_get_enum (from));
  return TRUE;
}

static gboolean
position_to_enum (GBinding *binding, const GValue *from, GValue *to, gpointer data)
{
  const guint p = g_value_get_uint (from);
  if (p == GTK_INVALID_LIST_POSITION)
    return FALSE;
  g_value_set_enum (to, (int) p);
  return TRUE;
}

static void
qv_preferences_window_dispose (GObject *object)
{
  gtk_widget_dispose_template (GTK_WIDGET (object), QV_TYPE_PREFERENCES_WINDOW);
  G_OBJECT_CLASS (qv_preferences_window_parent_class)->dispose (object);
}

static void
qv_preferences_window_class_init (QvPreferencesWindowClass *klass)
{
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  G_OBJECT_CLASS (klass)->dispose = qv_preferences_window_dispose;
  gtk_widget_class_set_template_from_resource (widget_class,
                                               "/org/quaverlab/Quaver/gui/qv-preferences-window.ui");
  gtk_widget_class_bind_template_child (widget_class, QvPreferencesWindow, background_dropdown);
  gtk_widget_class_bind_template_child (widget_class, QvPreferencesWindow, unit_dropdown);
  gtk_widget_class_bind_template_child (widget_class, QvPreferencesWindow, level_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvPreferencesWindow, persist_label);
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_Escape, 0, "window.close", NULL);
}

static void
qv_preferences_window_init (QvPreferencesWindow *self)
{
  QvPreferences *prefs = qv_preferences_get_default ();

  gtk_widget_init_template (GTK_WIDGET (self));
  g_object_bind_property_full (prefs, "background", self->background_dropdown, "selected",
                               G_BINDING_SYNC_CREATE | G_BINDING_BIDIRECTIONAL,
                               enum_to_position, position_to_enum, NULL, NULL);
  g_object_bind_property_full (prefs, "wavenumber-unit", self->unit_dropdown, "selected",
                               G_BINDING_SYNC_CREATE | G_BINDING_BIDIRECTIONAL,
                               enum_to_position, position_to_enum, NULL, NULL);
  g_object_bind_property (prefs, "default-level", self->level_adjustment, "value",
                          G_BINDING_SYNC_CREATE | G_BINDING_BIDIRECTIONAL);
  gtk_widget_set_visible (self->persist_label, !qv_preferences_is_persistent (prefs));
}

GtkWindow *
qv_preferences_window_new (GtkWindow *parent)
{
  return g_object_new (QV_TYPE_PREFERENCES_WINDOW, "transient-for", parent, NULL);
}
