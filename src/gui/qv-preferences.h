/* qv-preferences.h — the settings that persist, as properties of one
 * object: bound to GSettings when the schema is found (installed, or in the
 * build tree), kept in memory for this run otherwise.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gio/gio.h>

G_BEGIN_DECLS

#define QV_SCHEMA_ID "org.quaverlab.Quaver"

typedef enum {
  QV_BACKGROUND_CHOICE_SYSTEM,  /* follow the desktop's dark style */
  QV_BACKGROUND_CHOICE_LIGHT,
  QV_BACKGROUND_CHOICE_DARK,
} QvBackgroundChoice;

#define QV_TYPE_BACKGROUND_CHOICE (qv_background_choice_get_type ())
GType qv_background_choice_get_type (void);
/* Wavenumber unit of the list, as a GEnum of QvFrequencyUnit (nicks
 * "cm-1", "THz", "meV", as in the schema). */
#define QV_TYPE_FREQUENCY_UNIT (qv_frequency_unit_get_type ())
GType qv_frequency_unit_get_type (void);

#define QV_TYPE_PREFERENCES (qv_preferences_get_type ())
G_DECLARE_FINAL_TYPE (QvPreferences, qv_preferences, QV, PREFERENCES, GObject)

/* The app's shared instance (created on first use). */
QvPreferences *qv_preferences_get_default (void);
/* A new instance; @settings NULL keeps the values in memory. */
QvPreferences *qv_preferences_new (GSettings *settings);
/* GSettings for our schema from the default source, else the build tree;
 * NULL (with a warning) when neither has it. */
GSettings *qv_preferences_lookup_settings (void);
/* TRUE when the values persist. */
gboolean qv_preferences_is_persistent (QvPreferences *prefs);

/* Property names: "background", "default-level", "wavenumber-unit",
 * "show-arrows", "participation-colouring", "orthographic", "speed",
 * "amplitude", "window-width", "window-height", "window-maximized". */

G_END_DECLS
