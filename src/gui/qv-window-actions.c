/* qv-window-actions.c — win.play, win.next-mode, win.previous-mode,
 * win.toggle-arrows, win.toggle-participation, win.toggle-orthographic,
 * win.view-along-x/y/z (and -minus-), win.reset-view, win.toggle-export-pane,
 * win.toggle-spectrum, win.compare, win.reset-masses, win.level-up/down, win.cancel, win.open-recent, win.close,
 * win.save-bundle, win.load-scan-energies.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "qv-camera.h"
#include "qv-preferences.h"
#include "qv-window-actions.h"
#include "qv-window-private.h"
#include "qv-window-save.h"
#include "qv-window-scan.h"

static void
next_mode (GSimpleAction *a, GVariant *p, gpointer win)
{
  qv_window_step_mode (win, +1);
}

static void
previous_mode (GSimpleAction *a, GVariant *p, gpointer win)
{
  qv_window_step_mode (win, -1);
}

#define VIEW_ALONG(name, axis) \
  static void name (GSimpleAction *a, GVariant *p, gpointer win) { qv_window_view_along (win, axis); }
VIEW_ALONG (view_x, QV_VIEW_ALONG_X)
VIEW_ALONG (view_y, QV_VIEW_ALONG_Y)
VIEW_ALONG (view_z, QV_VIEW_ALONG_Z)
VIEW_ALONG (view_minus_x, QV_VIEW_ALONG_MINUS_X)
VIEW_ALONG (view_minus_y, QV_VIEW_ALONG_MINUS_Y)
VIEW_ALONG (view_minus_z, QV_VIEW_ALONG_MINUS_Z)

static void
reset_view (GSimpleAction *a, GVariant *p, gpointer win)
{
  qv_window_reset_view (win);
}

static void
reset_masses (GSimpleAction *a, GVariant *p, gpointer win)
{
  qv_window_reset_masses (win);
}

static void
level_step (QvWindow *win, int delta)
{
  QvModePanel *panel = qv_window_get_mode_panel (win);
  const int level = (int) qv_mode_panel_get_level (panel) + delta;
  qv_mode_panel_set_level (panel, (guint) CLAMP (level, 0, 50));
}

static void
level_up (GSimpleAction *a, GVariant *p, gpointer win)
{
  level_step (win, +1);
}

static void
level_down (GSimpleAction *a, GVariant *p, gpointer win)
{
  level_step (win, -1);
}

static void
cancel (GSimpleAction *a, GVariant *p, gpointer win)
{
  qv_window_cancel (win);
}

static void
open_recent (GSimpleAction *a, GVariant *p, gpointer win)
{
  g_autoptr(GFile) file = g_file_new_for_uri (g_variant_get_string (p, NULL));
  qv_window_open_file (win, file);
}

static void
compare (GSimpleAction *a, GVariant *p, gpointer win)
{
  qv_window_choose_compare (win);
}

static void
save_bundle (GSimpleAction *a, GVariant *p, gpointer win)
{
  qv_window_save_choose (win);
}

static void
load_scan_energies (GSimpleAction *a, GVariant *p, gpointer win)
{
  qv_window_choose_scan_energies (win);
}

static void
close_window (GSimpleAction *a, GVariant *p, gpointer win)
{
  gtk_window_close (win);
}

/* Actions that need a shown document. */
static const char *const document_actions[] = {
  "play", "next-mode", "previous-mode", "view-along-x", "view-along-y", "view-along-z",
  "view-along-minus-x", "view-along-minus-y", "view-along-minus-z", "reset-view",
  "level-up", "level-down", "toggle-export-pane", "toggle-spectrum", "compare",
  "save-bundle",
};

void
qv_window_actions_install (QvWindow *self)
{
  static const GActionEntry entries[] = {
    { "next-mode", next_mode },
    { "previous-mode", previous_mode },
    { "view-along-x", view_x },
    { "view-along-y", view_y },
    { "view-along-z", view_z },
    { "view-along-minus-x", view_minus_x },
    { "view-along-minus-y", view_minus_y },
    { "view-along-minus-z", view_minus_z },
    { "reset-view", reset_view },
    { "reset-masses", reset_masses },
    { "level-up", level_up },
    { "level-down", level_down },
    { "cancel", cancel },
    { "open-recent", open_recent, "s" },
    { "close", close_window },
    { "compare", compare },
    { "save-bundle", save_bundle },
    { "load-scan-energies", load_scan_energies },
  };
  QvPreferences *prefs = qv_preferences_get_default ();
  static const struct { const char *action; const char *property; } toggles[] = {
    { "toggle-arrows", "show-arrows" },
    { "toggle-labels", "show-labels" },
    { "toggle-participation", "participation-colouring" },
    { "toggle-orthographic", "orthographic" },
  };
  g_autoptr(GPropertyAction) play = NULL;
  g_autoptr(GPropertyAction) pane = NULL;
  g_autoptr(GPropertyAction) spectrum = NULL;

  static const struct { const char *trigger; const char *action; } keys[] = {
    { "space", "win.play" },
    { "1", "win.view-along-x" }, { "2", "win.view-along-y" }, { "3", "win.view-along-z" },
    { "0", "win.reset-view" },
    { "a", "win.toggle-arrows" }, { "l", "win.toggle-labels" }, { "c", "win.toggle-participation" }, { "o", "win.toggle-orthographic" },
    { "plus", "win.level-up" }, { "equal", "win.level-up" }, { "KP_Add", "win.level-up" },
    { "minus", "win.level-down" }, { "KP_Subtract", "win.level-down" },
    { "j", "win.next-mode" }, { "k", "win.previous-mode" },
  };
  GtkEventController *shortcuts = gtk_shortcut_controller_new ();

  g_action_map_add_action_entries (G_ACTION_MAP (self), entries, G_N_ELEMENTS (entries), self);
  /* Bubble phase: a focused entry or spin button gets its keys first. */
  gtk_event_controller_set_propagation_phase (shortcuts, GTK_PHASE_BUBBLE);
  for (gsize i = 0; i < G_N_ELEMENTS (keys); i++)
    gtk_shortcut_controller_add_shortcut (GTK_SHORTCUT_CONTROLLER (shortcuts),
                                          gtk_shortcut_new (gtk_shortcut_trigger_parse_string (keys[i].trigger),
                                                            gtk_named_action_new (keys[i].action)));
  gtk_widget_add_controller (GTK_WIDGET (self), shortcuts);
  /* Toggles are the properties they change: their state follows. */
  for (gsize i = 0; i < G_N_ELEMENTS (toggles); i++)
    {
      g_autoptr(GPropertyAction) action = g_property_action_new (toggles[i].action, prefs, toggles[i].property);
      g_action_map_add_action (G_ACTION_MAP (self), G_ACTION (action));
    }
  play = g_property_action_new ("play", qv_window_get_mode_view (self), "playing");
  g_action_map_add_action (G_ACTION_MAP (self), G_ACTION (play));
  pane = g_property_action_new ("toggle-export-pane", qv_window_get_export_flap (self), "reveal-flap");
  g_action_map_add_action (G_ACTION_MAP (self), G_ACTION (pane));
  spectrum = g_property_action_new ("toggle-spectrum", qv_window_get_spectrum_revealer (self), "reveal-child");
  g_action_map_add_action (G_ACTION_MAP (self), G_ACTION (spectrum));
}

static void
set_enabled (QvWindow *self, const char *name, gboolean enabled)
{
  GAction *action = g_action_map_lookup_action (G_ACTION_MAP (self), name);

  /* GPropertyAction has no setter: its "enabled" follows nothing else. */
  if (G_IS_SIMPLE_ACTION (action))
    g_simple_action_set_enabled (G_SIMPLE_ACTION (action), enabled);
}

void
qv_window_actions_update (QvWindow *self)
{
  QvDocument *doc = qv_window_get_document (self);
  const gboolean busy = qv_window_is_busy (self);

  if (g_action_map_lookup_action (G_ACTION_MAP (self), "cancel") == NULL)
    return;
  for (gsize i = 0; i < G_N_ELEMENTS (document_actions); i++)
    set_enabled (self, document_actions[i], doc != NULL);
  set_enabled (self, "reset-masses", doc && !busy && qv_document_get_masses_edited (doc));
  set_enabled (self, "cancel", busy);
}
