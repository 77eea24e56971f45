/* qv-preferences.c — persistent settings as properties.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "qv-preferences.h"
#include "qv-units.h"

struct _QvPreferences
{
  GObject parent_instance;
  GSettings *settings;
  QvBackgroundChoice background;
  guint default_level;
  QvFrequencyUnit wavenumber_unit;
  gboolean show_arrows;
  gboolean show_labels;
  gboolean participation_colouring;
  gboolean orthographic;
  double speed;
  double amplitude;
  int window_width;
  int window_height;
  gboolean window_maximized;
};

G_DEFINE_FINAL_TYPE (QvPreferences, qv_preferences, G_TYPE_OBJECT)

GType
qv_background_choice_get_type (void)
{
  static gsize type = 0;
  static const GEnumValue values[] = {
    { QV_BACKGROUND_CHOICE_SYSTEM, "QV_BACKGROUND_CHOICE_SYSTEM", "follow-system" },
    { QV_BACKGROUND_CHOICE_LIGHT, "QV_BACKGROUND_CHOICE_LIGHT", "light" },
    { QV_BACKGROUND_CHOICE_DARK, "QV_BACKGROUND_CHOICE_DARK", "dark" },
    { 0, NULL, NULL }
  };
  if (g_once_init_enter (&type))
    g_once_init_leave (&type, g_enum_register_static ("QvBackgroundChoice", values));
  return type;
}

GType
qv_frequency_unit_get_type (void)
{
  static gsize type = 0;
  static const GEnumValue values[] = {
    { QV_FREQUENCY_CM1, "QV_FREQUENCY_CM1", "cm-1" },
    { QV_FREQUENCY_THZ, "QV_FREQUENCY_THZ", "THz" },
    { QV_FREQUENCY_MEV, "QV_FREQUENCY_MEV", "meV" },
    { 0, NULL, NULL }
  };
  if (g_once_init_enter (&type))
    g_once_init_leave (&type, g_enum_register_static ("QvFrequencyUnit", values));
  return type;
}

enum {
  PROP_0,
  PROP_BACKGROUND,
  PROP_DEFAULT_LEVEL,
  PROP_WAVENUMBER_UNIT,
  PROP_SHOW_ARROWS,
  PROP_SHOW_LABELS,
  PROP_PARTICIPATION_COLOURING,
  PROP_ORTHOGRAPHIC,
  PROP_SPEED,
  PROP_AMPLITUDE,
  PROP_WINDOW_WIDTH,
  PROP_WINDOW_HEIGHT,
  PROP_WINDOW_MAXIMIZED,
  N_PROPS
};
static GParamSpec *props[N_PROPS];

static void
qv_preferences_get_property (GObject *object, guint prop_id, GValue *value, GParamSpec *pspec)
{
  QvPreferences *self = QV_PREFERENCES (object);

  switch (prop_id)
    {
    case PROP_BACKGROUND: g_value_set_enum (value, self->background); break;
    case PROP_DEFAULT_LEVEL: g_value_set_uint (value, self->default_level); break;
    case PROP_WAVENUMBER_UNIT: g_value_set_enum (value, self->wavenumber_unit); break;
    case PROP_SHOW_ARROWS: g_value_set_boolean (value, self->show_arrows); break;
    case PROP_SHOW_LABELS: g_value_set_boolean (value, self->show_labels); break;
    case PROP_PARTICIPATION_COLOURING: g_value_set_boolean (value, self->participation_colouring); break;
    case PROP_ORTHOGRAPHIC: g_value_set_boolean (value, self->orthographic); break;
    case PROP_SPEED: g_value_set_double (value, self->speed); break;
    case PROP_AMPLITUDE: g_value_set_double (value, self->amplitude); break;
    case PROP_WINDOW_WIDTH: g_value_set_int (value, self->window_width); break;
    case PROP_WINDOW_HEIGHT: g_value_set_int (value, self->window_height); break;
    case PROP_WINDOW_MAXIMIZED: g_value_set_boolean (value, self->window_maximized); break;
    default: G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

#define SET(field, getter) \
  G_STMT_START { \
    if (self->field != getter (value)) \
      { \
        self->field = getter (value); \
        g_object_notify_by_pspec (object, pspec); \
      } \
  } G_STMT_END

static void
qv_preferences_set_property (GObject *object, guint prop_id, const GValue *value, GParamSpec *pspec)
{
  QvPreferences *self = QV_PREFERENCES (object);

  switch (prop_id)
    {
    case PROP_BACKGROUND: SET (background, (QvBackgroundChoice) g_value_get_enum); break;
    case PROP_DEFAULT_LEVEL: SET (default_level, g_value_get_uint); break;
    case PROP_WAVENUMBER_UNIT: SET (wavenumber_unit, (QvFrequencyUnit) g_value_get_enum); break;
    case PROP_SHOW_ARROWS: SET (show_arrows, g_value_get_boolean); break;
    case PROP_SHOW_LABELS: SET (show_labels, g_value_get_boolean); break;
    case PROP_PARTICIPATION_COLOURING: SET (participation_colouring, g_value_get_boolean); break;
    case PROP_ORTHOGRAPHIC: SET (orthographic, g_value_get_boolean); break;
    case PROP_SPEED: SET (speed, g_value_get_double); break;
    case PROP_AMPLITUDE: SET (amplitude, g_value_get_double); break;
    case PROP_WINDOW_WIDTH: SET (window_width, g_value_get_int); break;
    case PROP_WINDOW_HEIGHT: SET (window_height, g_value_get_int); break;
    case PROP_WINDOW_MAXIMIZED: SET (window_maximized, g_value_get_boolean); break;
    default: G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
qv_preferences_dispose (GObject *object)
{
  g_clear_object (&QV_PREFERENCES (object)->settings);
  G_OBJECT_CLASS (qv_preferences_parent_class)->dispose (object);
}

static void
qv_preferences_class_init (QvPreferencesClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  const GParamFlags flags = G_PARAM_READWRITE | G_PARAM_STATIC_STRINGS | G_PARAM_EXPLICIT_NOTIFY;

  object_class->get_property = qv_preferences_get_property;
  object_class->set_property = qv_preferences_set_property;
  object_class->dispose = qv_preferences_dispose;
  /* The defaults here are the schema's (a test compares them). */
  props[PROP_BACKGROUND] = g_param_spec_enum ("background", NULL, NULL, QV_TYPE_BACKGROUND_CHOICE,
                                              QV_BACKGROUND_CHOICE_SYSTEM, flags);
  props[PROP_DEFAULT_LEVEL] = g_param_spec_uint ("default-level", NULL, NULL, 0, 50, 0, flags);
  props[PROP_WAVENUMBER_UNIT] = g_param_spec_enum ("wavenumber-unit", NULL, NULL, QV_TYPE_FREQUENCY_UNIT,
                                                   QV_FREQUENCY_CM1, flags);
  props[PROP_SHOW_ARROWS] = g_param_spec_boolean ("show-arrows", NULL, NULL, TRUE, flags);
  props[PROP_SHOW_LABELS] = g_param_spec_boolean ("show-labels", NULL, NULL, FALSE, flags);
  props[PROP_PARTICIPATION_COLOURING] = g_param_spec_boolean ("participation-colouring", NULL, NULL, FALSE, flags);
  props[PROP_ORTHOGRAPHIC] = g_param_spec_boolean ("orthographic", NULL, NULL, FALSE, flags);
  props[PROP_SPEED] = g_param_spec_double ("speed", NULL, NULL, 0.1, 3.0, 0.6, flags);
  props[PROP_AMPLITUDE] = g_param_spec_double ("amplitude", NULL, NULL, 0.1, 10.0, 1.0, flags);
  props[PROP_WINDOW_WIDTH] = g_param_spec_int ("window-width", NULL, NULL, 400, 16384, 1200, flags);
  props[PROP_WINDOW_HEIGHT] = g_param_spec_int ("window-height", NULL, NULL, 300, 16384, 760, flags);
  props[PROP_WINDOW_MAXIMIZED] = g_param_spec_boolean ("window-maximized", NULL, NULL, FALSE, flags);
  g_object_class_install_properties (object_class, N_PROPS, props);
}

static void
qv_preferences_init (QvPreferences *self)
{
  /* Start from the pspec defaults. */
  for (guint p = 1; p < N_PROPS; p++)
    {
      GValue v = G_VALUE_INIT;
      g_value_init (&v, props[p]->value_type);
      g_param_value_set_default (props[p], &v);
      g_object_set_property (G_OBJECT (self), props[p]->name, &v);
      g_value_unset (&v);
    }
}

GSettings *
qv_preferences_lookup_settings (void)
{
  GSettingsSchemaSource *source = g_settings_schema_source_get_default ();
  g_autoptr(GSettingsSchema) schema = NULL;
  g_autoptr(GSettingsSchemaSource) build = NULL;

  if (source)
    schema = g_settings_schema_source_lookup (source, QV_SCHEMA_ID, TRUE);
  if (schema == NULL)
    {
      /* Running from the build tree: the schema compiled there. */
      build = g_settings_schema_source_new_from_directory (QV_BUILD_SCHEMA_DIR, source, FALSE, NULL);
      if (build)
        schema = g_settings_schema_source_lookup (build, QV_SCHEMA_ID, FALSE);
    }
  if (schema == NULL)
    {
      g_warning ("The settings schema %s is not installed: preferences last only "
                 "until the app quits", QV_SCHEMA_ID);
      return NULL;
    }
  return g_settings_new_full (schema, NULL, NULL);
}

QvPreferences *
qv_preferences_new (GSettings *settings)
{
  QvPreferences *self = g_object_new (QV_TYPE_PREFERENCES, NULL);

  if (settings)
    {
      self->settings = g_object_ref (settings);
      for (guint p = 1; p < N_PROPS; p++)
        g_settings_bind (settings, props[p]->name, self, props[p]->name, G_SETTINGS_BIND_DEFAULT);
    }
  return self;
}

QvPreferences *
qv_preferences_get_default (void)
{
  static QvPreferences *instance = NULL;

  if (instance == NULL)
    {
      g_autoptr(GSettings) settings = qv_preferences_lookup_settings ();
      instance = qv_preferences_new (settings);
    }
  return instance;
}

gboolean
qv_preferences_is_persistent (QvPreferences *self)
{
  return self->settings != NULL;
}
