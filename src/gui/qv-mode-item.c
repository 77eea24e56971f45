/* qv-mode-item.c — one row of the mode list.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include "qv-mode-item.h"
#include "qv-oscillator.h"

struct _QvModeItem
{
  GObject parent_instance;
  QvModeRow row;
  guint index;
  guint level;
  double turning_q;
  double max_displacement;
};

G_DEFINE_FINAL_TYPE (QvModeItem, qv_mode_item, G_TYPE_OBJECT)

enum {
  PROP_0,
  PROP_INDEX,
  PROP_WAVENUMBER,
  PROP_REDUCED_MASS,
  PROP_TURNING_Q,
  PROP_MAX_DISPLACEMENT,
  PROP_IMAGINARY,
  PROP_SYMMETRY_ORDER,
  N_PROPS
};
static GParamSpec *props[N_PROPS];

static void
qv_mode_item_get_property (GObject *object, guint prop_id, GValue *value, GParamSpec *pspec)
{
  QvModeItem *self = QV_MODE_ITEM (object);

  switch (prop_id)
    {
    case PROP_INDEX: g_value_set_uint (value, self->index); break;
    case PROP_WAVENUMBER: g_value_set_double (value, self->row.wavenumber); break;
    case PROP_REDUCED_MASS: g_value_set_double (value, self->row.reduced_mass); break;
    /* Sorters see modes without a turning point last (−1 < every value). */
    case PROP_TURNING_Q: g_value_set_double (value, isnan (self->turning_q) ? -1.0 : self->turning_q); break;
    case PROP_MAX_DISPLACEMENT: g_value_set_double (value, isnan (self->max_displacement) ? -1.0 : self->max_displacement); break;
    case PROP_IMAGINARY: g_value_set_boolean (value, self->row.imaginary); break;
    /* Species sort in the character table's order. */
    case PROP_SYMMETRY_ORDER: g_value_set_int (value, self->row.symmetry_order); break;
    default: G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
qv_mode_item_class_init (QvModeItemClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  const GParamFlags flags = G_PARAM_READABLE | G_PARAM_STATIC_STRINGS | G_PARAM_EXPLICIT_NOTIFY;

  object_class->get_property = qv_mode_item_get_property;
  props[PROP_INDEX] = g_param_spec_uint ("index", NULL, NULL, 0, G_MAXUINT, 0, flags);
  props[PROP_WAVENUMBER] = g_param_spec_double ("wavenumber", NULL, NULL, -G_MAXDOUBLE, G_MAXDOUBLE, 0, flags);
  props[PROP_REDUCED_MASS] = g_param_spec_double ("reduced-mass", NULL, NULL, -G_MAXDOUBLE, G_MAXDOUBLE, 0, flags);
  props[PROP_TURNING_Q] = g_param_spec_double ("turning-q", NULL, NULL, -G_MAXDOUBLE, G_MAXDOUBLE, 0, flags);
  props[PROP_MAX_DISPLACEMENT] = g_param_spec_double ("max-displacement", NULL, NULL, -G_MAXDOUBLE, G_MAXDOUBLE, 0, flags);
  props[PROP_IMAGINARY] = g_param_spec_boolean ("imaginary", NULL, NULL, FALSE, flags);
  props[PROP_SYMMETRY_ORDER] = g_param_spec_int ("symmetry-order", NULL, NULL, G_MININT, G_MAXINT, 0, flags);
  g_object_class_install_properties (object_class, N_PROPS, props);
}

static void
qv_mode_item_init (QvModeItem *self)
{
}

static void
compute_level (QvModeItem *self)
{
  if (!self->row.has_turning_point)
    {
      self->turning_q = self->max_displacement = NAN;
      return;
    }
  /* What qv_mode_set_turning_point gives, without its O(N) pass: Q from
   * the oscillator, the largest displacement linear in |Q|. */
  self->turning_q = qv_oscillator_turning_point (self->row.eigenvalue, self->level);
  self->max_displacement = fabs (self->turning_q) * self->row.unit_displacement;
}

QvModeItem *
qv_mode_item_new (const QvModeRow *row, guint index, guint level)
{
  QvModeItem *self = g_object_new (QV_TYPE_MODE_ITEM, NULL);

  self->row = *row;
  self->index = index;
  self->level = level;
  compute_level (self);
  return self;
}

void
qv_mode_item_set_level (QvModeItem *self, guint v)
{
  if (self->level == v)
    return;
  self->level = v;
  compute_level (self);
  g_object_notify_by_pspec (G_OBJECT (self), props[PROP_TURNING_Q]);
  g_object_notify_by_pspec (G_OBJECT (self), props[PROP_MAX_DISPLACEMENT]);
}

guint qv_mode_item_get_index (QvModeItem *self) { return self->index; }
double qv_mode_item_get_wavenumber (QvModeItem *self) { return self->row.wavenumber; }
double qv_mode_item_get_reduced_mass (QvModeItem *self) { return self->row.reduced_mass; }
double qv_mode_item_get_turning_q (QvModeItem *self) { return self->turning_q; }
double qv_mode_item_get_max_displacement (QvModeItem *self) { return self->max_displacement; }
gboolean qv_mode_item_get_imaginary (QvModeItem *self) { return self->row.imaginary; }
const char *qv_mode_item_get_symmetry (QvModeItem *self) { return self->row.symmetry; }

char *
qv_mode_item_format_wavenumber (QvModeItem *self, QvFrequencyUnit unit)
{
  const double value = fabs (qv_frequency_from_wavenumber (self->row.wavenumber, unit));
  const int digits = unit == QV_FREQUENCY_CM1 ? 1 : unit == QV_FREQUENCY_THZ ? 3 : 2;

  return g_strdup_printf ("%.*f%s", digits, value, self->row.imaginary ? "i" : "");
}
