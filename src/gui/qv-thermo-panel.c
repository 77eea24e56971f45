/* qv-thermo-panel.c — the Thermochemistry page of a molecule.
 *
 * Everything is computed on the main thread: one temperature with every
 * mode's share at each change of a control, and the 191-point sweep only
 * when it is shown or saved after an option other than T changed (it costs
 * n_modes × 191 oscillators: tens of milliseconds for a thousand atoms).
 * docs/performance.md has the measured costs (tests/gui/bench-thermo-panel).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-config.h"
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-error-dialog.h"
#include "qv-output.h"
#include "qv-png-writer.h"
#include "qv-preferences.h"
#include "qv-thermo-panel.h"
#include "qv-thermochem-plot.h"
#include "qv-thermochem-table.h"
#include "qv-units.h"

/* ---- one row of the table ---- */

#define QV_TYPE_THERMO_ROW (qv_thermo_row_get_type ())
G_DECLARE_FINAL_TYPE (QvThermoRow, qv_thermo_row, QV, THERMO_ROW, GObject)

struct _QvThermoRow
{
  GObject parent_instance;
  guint mode;                       /* 0-based */
  gboolean used;
  gboolean imaginary;
  double v[QV_THERMO_N_COLUMNS];    /* what the columns sort by; −∞ when left out */
  guint revision;                   /* bumped when the values change */
};

G_DEFINE_FINAL_TYPE (QvThermoRow, qv_thermo_row, G_TYPE_OBJECT)

enum { ROW_PROP_0, ROW_PROP_REVISION, ROW_PROP_FIRST_VALUE };
static GParamSpec *row_revision_pspec;

/* The sorter's property of each column. */
static const char *const column_property[QV_THERMO_N_COLUMNS] = {
  "index", "wavenumber", "entropy", "share", "free-energy", "zpe", "heat-capacity", "treated",
};

static void
qv_thermo_row_get_property (GObject *object, guint id, GValue *value, GParamSpec *pspec)
{
  QvThermoRow *self = QV_THERMO_ROW (object);

  if (id == ROW_PROP_REVISION)
    g_value_set_uint (value, self->revision);
  else if (id >= ROW_PROP_FIRST_VALUE && id < ROW_PROP_FIRST_VALUE + QV_THERMO_N_COLUMNS)
    g_value_set_double (value, self->v[id - ROW_PROP_FIRST_VALUE]);
  else
    G_OBJECT_WARN_INVALID_PROPERTY_ID (object, id, pspec);
}

static void
qv_thermo_row_class_init (QvThermoRowClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);

  object_class->get_property = qv_thermo_row_get_property;
  row_revision_pspec = g_param_spec_uint ("revision", NULL, NULL, 0, G_MAXUINT, 0,
                                          G_PARAM_READABLE | G_PARAM_STATIC_STRINGS);
  g_object_class_install_property (object_class, ROW_PROP_REVISION, row_revision_pspec);
  for (guint c = 0; c < QV_THERMO_N_COLUMNS; c++)
    g_object_class_install_property (object_class, ROW_PROP_FIRST_VALUE + c,
                                     g_param_spec_double (column_property[c], NULL, NULL,
                                                          -G_MAXDOUBLE, G_MAXDOUBLE, 0.0,
                                                          G_PARAM_READABLE | G_PARAM_STATIC_NAME
                                                          | G_PARAM_STATIC_NICK | G_PARAM_STATIC_BLURB));
}

static void
qv_thermo_row_init (QvThermoRow *self)
{
}

/* ---- the panel ---- */

#define N_TERMS 4        /* translation, rotation, vibration, total */
#define N_QUANTITIES 6   /* ZPE, U, H, S, Cv, G */

struct _QvThermoPanel
{
  GtkWidget parent_instance;

  GtkWidget *box;
  GtkWidget *controls_grid;
  QvFrequencyUnit unit;        /* of the wavenumber columns (the list's) */
  GtkSpinButton *temperature_spin;
  GtkDropDown *state_dropdown;
  GtkWidget *pressure_label;
  GtkSpinButton *pressure_spin;
  GtkWidget *pressure_unit;
  GtkDropDown *soft_dropdown;
  GtkLabel *soft_param_label;
  GtkSpinButton *soft_param_spin;
  GtkWidget *soft_param_unit;
  GtkSpinButton *sigma_spin;
  GtkWidget *sigma_reset;
  GtkLabel *sigma_label;
  GtkSpinButton *scale_spin;
  GtkLabel *warning_label;
  GtkLabel *soft_note_label;
  GtkLabel *status_label;
  GtkLabel *headline_label;
  GtkGrid *summary_grid;
  GtkLabel *summary_note;
  GtkStack *page_stack;
  GtkLabel *table_caption;
  GtkColumnView *column_view;
  GtkDrawingArea *plot_area;
  GtkLabel *readout_label;
  GtkButton *save_button;
  GtkLabel *summary[N_TERMS][N_QUANTITIES];
  GtkColumnViewColumn *columns[QV_THERMO_N_COLUMNS];

  QvDocument *document;
  gulong changed_id;
  QvGasMolecule *molecule;
  char *group_name;               /* the point group's (core) name, or NULL */
  guint group_sigma;              /* its σ, or 1 */
  gboolean sigma_given;           /* the user changed the symmetry number */
  double cutoff, omega0;          /* the soft-mode parameter of each treatment */

  QvGasThermoOptions options;     /* what the results were computed with */
  double temperature;
  gboolean has_results;
  QvGasThermo thermo;
  QvGasMode *modes;               /* molecule->n_modes */
  QvGasThermo *sweep;
  double *sweep_t;
  gsize n_sweep;
  gboolean sweep_dirty;           /* the options changed since the sweep */

  GListStore *store;
  GtkSortListModel *sorted;
  GtkSingleSelection *selection;
  int selected;
  gboolean updating;              /* controls or selection set from code */
  gboolean hovering;
  double hover_t;
};

G_DEFINE_FINAL_TYPE (QvThermoPanel, qv_thermo_panel, GTK_TYPE_WIDGET)

enum {
  PROP_0,
  PROP_TEMPERATURE,
  PROP_STANDARD_STATE,
  PROP_PRESSURE,
  PROP_SOFT_MODES,
  PROP_CUTOFF,
  PROP_OMEGA0,
  PROP_SYMMETRY_NUMBER,
  PROP_FREQUENCY_SCALE,
  PROP_UNIT,
  N_PROPS
};
static GParamSpec *props[N_PROPS];
enum { MODE_ACTIVATED, N_SIGNALS };
static guint signals[N_SIGNALS];

static void ensure_sweep (QvThermoPanel *self);

static double
kj (void)
{
  return qv_gas_kj_per_mol ();
}

/* ---- options ---- */

static QvThermoState
state_choice (QvThermoPanel *self)
{
  const guint i = gtk_drop_down_get_selected (self->state_dropdown);
  return i <= QV_THERMO_STATE_PRESSURE ? (QvThermoState) i : QV_THERMO_STATE_1BAR;
}

static QvSoftModes
soft_choice (QvThermoPanel *self)
{
  const guint i = gtk_drop_down_get_selected (self->soft_dropdown);
  return i <= QV_SOFT_MODES_QUASI_RRHO ? (QvSoftModes) i : QV_SOFT_MODES_NONE;
}

static void
options_from_controls (QvThermoPanel *self, QvGasThermoOptions *o)
{
  qv_gas_thermo_options_init (o);
  switch (state_choice (self))
    {
    case QV_THERMO_STATE_1ATM: o->standard_state = QV_STANDARD_STATE_1ATM; break;
    case QV_THERMO_STATE_1M: o->standard_state = QV_STANDARD_STATE_1M; break;
    case QV_THERMO_STATE_PRESSURE: o->pressure = gtk_spin_button_get_value (self->pressure_spin) * 1e5; break;
    case QV_THERMO_STATE_1BAR:
    default: break;
    }
  o->soft_modes = soft_choice (self);
  o->cutoff = self->cutoff;
  o->omega0 = self->omega0;
  o->symmetry_number = (guint) gtk_spin_button_get_value_as_int (self->sigma_spin);
  o->frequency_scale = gtk_spin_button_get_value (self->scale_spin);
}

void
qv_thermo_panel_get_options (QvThermoPanel *self, QvGasThermoOptions *options)
{
  options_from_controls (self, options);
}

/* ---- text ---- */

static const char *
term_name (guint term)
{
  switch (term)
    {
    case 0: return _("Translation");
    case 1: return _("Rotation");
    case 2: return _("Vibration");
    default: return _("Total");
    }
}

static const QvGasTerm *
term_of (const QvGasThermo *th, guint term)
{
  switch (term)
    {
    case 0: return &th->translation;
    case 1: return &th->rotation;
    case 2: return &th->vibration;
    default: return &th->total;
    }
}

/* kJ/mol or J/(K mol), as the command's tables */
static double
quantity_of (const QvGasTerm *t, guint quantity)
{
  switch (quantity)
    {
    case 0: return t->zpe * kj ();
    case 1: return t->energy * kj ();
    case 2: return t->enthalpy * kj ();
    case 3: return t->entropy * kj () * 1000.0;
    case 4: return t->heat_capacity * kj () * 1000.0;
    default: return t->free_energy * kj ();
    }
}

/* A wavenumber (cm⁻¹) in the list's unit, with the digits the mode list
 * gives that unit plus one (the table is read for small differences). */
static char *
format_frequency (QvThermoPanel *self, double wavenumber, gboolean imaginary)
{
  const double value = fabs (qv_frequency_from_wavenumber (wavenumber, self->unit));
  const int digits = self->unit == QV_FREQUENCY_CM1 ? 2 : self->unit == QV_FREQUENCY_THZ ? 4 : 3;

  return g_strdup_printf ("%.*f%s", digits, value, imaginary ? "i" : "");
}

static const char *
unit_title (QvFrequencyUnit unit)
{
  /* TRANSLATORS: the per-mode table's wavenumber column title, per unit */
  return unit == QV_FREQUENCY_THZ ? _("THz") : unit == QV_FREQUENCY_MEV ? _("meV") : _("cm⁻¹");
}

static char *
format_cell (QvThermoPanel *self, QvThermoRow *row, QvThermoColumn column)
{
  const double *v = row->v;

  switch (column)
    {
    case QV_THERMO_COLUMN_INDEX:
      return g_strdup_printf ("%u", row->mode + 1);
    case QV_THERMO_COLUMN_WAVENUMBER:
      return format_frequency (self, v[column], row->imaginary);
    default:
      break;
    }
  if (!row->used)
    /* TRANSLATORS: a mode the thermochemistry does not sum (imaginary,
     * zero, or taken as rigid-body motion) */
    return g_strdup (column == QV_THERMO_COLUMN_ENTROPY ? _("left out") : "—");
  switch (column)
    {
    case QV_THERMO_COLUMN_SHARE: return g_strdup_printf ("%.1f", v[column]);
    case QV_THERMO_COLUMN_TREATED:
      if (self->options.soft_modes == QV_SOFT_MODES_QUASI_RRHO)
        return g_strdup_printf ("%.3f", v[column]);
      if (self->options.soft_modes == QV_SOFT_MODES_RAISE)
        return format_frequency (self, v[column], FALSE);
      return g_strdup ("");
    default: return g_strdup_printf ("%.3f", v[column]);
    }
}

static gboolean
cell_left_out (QvThermoRow *row, QvThermoColumn column)
{
  if (column == QV_THERMO_COLUMN_WAVENUMBER)
    return row->imaginary;
  return !row->used && column == QV_THERMO_COLUMN_ENTROPY;
}

/* ---- cells ---- */

typedef struct {
  QvThermoPanel *panel;
  QvThermoColumn column;
} CellKind;

static void
cell_setup (GtkSignalListItemFactory *factory, GtkListItem *item, gpointer data)
{
  CellKind *kind = data;
  GtkWidget *label = gtk_label_new (NULL);

  gtk_label_set_xalign (GTK_LABEL (label), kind->column == QV_THERMO_COLUMN_INDEX ? 0.0f : 1.0f);
  gtk_widget_add_css_class (label, "numeric");
  gtk_list_item_set_child (item, label);
}

static void
cell_update (GtkListItem *item, CellKind *kind)
{
  GtkWidget *label = gtk_list_item_get_child (item);
  QvThermoRow *row = gtk_list_item_get_item (item);
  g_autofree char *text = NULL;

  if (row == NULL || label == NULL)
    return;
  text = format_cell (kind->panel, row, kind->column);
  gtk_label_set_label (GTK_LABEL (label), text);
  /* warm italics, as the mode list marks an imaginary mode */
  if (cell_left_out (row, kind->column))
    gtk_widget_add_css_class (label, "imaginary");
  else
    gtk_widget_remove_css_class (label, "imaginary");
}

static void
row_notify (QvThermoRow *row, GParamSpec *pspec, GtkListItem *item)
{
  CellKind *kind = g_object_get_data (G_OBJECT (item), "qv-cell-kind");
  if (kind)
    cell_update (item, kind);
}

static void
cell_bind (GtkSignalListItemFactory *factory, GtkListItem *item, gpointer data)
{
  QvThermoRow *row = gtk_list_item_get_item (item);

  g_object_set_data (G_OBJECT (item), "qv-cell-kind", data);
  cell_update (item, data);
  g_signal_connect_object (row, "notify::revision", G_CALLBACK (row_notify), item, 0);
}

static void
cell_unbind (GtkSignalListItemFactory *factory, GtkListItem *item, gpointer data)
{
  QvThermoRow *row = gtk_list_item_get_item (item);

  if (row)
    g_signal_handlers_disconnect_by_func (row, row_notify, item);
}

static void
add_column (QvThermoPanel *self, QvThermoColumn column, const char *title)
{
  GtkListItemFactory *factory = gtk_signal_list_item_factory_new ();
  CellKind *kind = g_new0 (CellKind, 1);
  GtkExpression *expr;
  GtkSorter *sorter;
  GtkColumnViewColumn *col;

  kind->panel = self;
  kind->column = column;
  g_signal_connect_data (factory, "setup", G_CALLBACK (cell_setup), kind,
                         (GClosureNotify) (void (*) (void)) g_free, 0);
  g_signal_connect (factory, "bind", G_CALLBACK (cell_bind), kind);
  g_signal_connect (factory, "unbind", G_CALLBACK (cell_unbind), kind);
  col = gtk_column_view_column_new (title, factory);
  /* numbers sort as numbers; left-out modes as the smallest */
  expr = gtk_property_expression_new (QV_TYPE_THERMO_ROW, NULL, column_property[column]);
  sorter = GTK_SORTER (gtk_numeric_sorter_new (expr));
  gtk_column_view_column_set_sorter (col, sorter);
  g_object_unref (sorter);
  gtk_column_view_column_set_expand (col, column != QV_THERMO_COLUMN_INDEX);
  gtk_column_view_column_set_resizable (col, TRUE);
  gtk_column_view_append_column (self->column_view, col);
  self->columns[column] = col;
  g_object_unref (col);
}

/* ---- the results shown ---- */

static void
set_values (QvThermoPanel *self, QvThermoRow *row, const QvGasMode *md)
{
  const double s_vib = self->thermo.vibration.entropy;

  row->used = md->used;
  row->imaginary = md->wavenumber < 0;
  row->v[QV_THERMO_COLUMN_INDEX] = (double) row->mode + 1;
  row->v[QV_THERMO_COLUMN_WAVENUMBER] = md->wavenumber;
  if (md->used)
    {
      row->v[QV_THERMO_COLUMN_ENTROPY] = md->entropy * kj () * 1000.0;
      row->v[QV_THERMO_COLUMN_SHARE] = s_vib > 0 ? 100.0 * md->entropy / s_vib : 0.0;
      row->v[QV_THERMO_COLUMN_FREE_ENERGY] = md->free_energy * kj ();
      row->v[QV_THERMO_COLUMN_ZPE] = md->zpe * kj ();
      row->v[QV_THERMO_COLUMN_HEAT_CAPACITY] = md->heat_capacity * kj () * 1000.0;
      row->v[QV_THERMO_COLUMN_TREATED] = self->options.soft_modes == QV_SOFT_MODES_QUASI_RRHO
                                         ? md->weight : md->thermal;
    }
  else
    for (int c = QV_THERMO_COLUMN_ENTROPY; c < QV_THERMO_N_COLUMNS; c++)
      row->v[c] = -INFINITY;
  row->revision++;
  g_object_notify_by_pspec (G_OBJECT (row), row_revision_pspec);
}

static void
update_rows (QvThermoPanel *self)
{
  const guint n = g_list_model_get_n_items (G_LIST_MODEL (self->store));
  GtkSorter *sorter = gtk_column_view_get_sorter (self->column_view);
  const QvSoftModes soft = self->options.soft_modes;

  for (guint i = 0; i < n && self->modes; i++)
    {
      g_autoptr(QvThermoRow) row = g_list_model_get_item (G_LIST_MODEL (self->store), i);
      set_values (self, row, &self->modes[row->mode]);
    }
  gtk_column_view_column_set_visible (self->columns[QV_THERMO_COLUMN_TREATED], soft != QV_SOFT_MODES_NONE);
  gtk_column_view_column_set_title (self->columns[QV_THERMO_COLUMN_TREATED],
                                    /* TRANSLATORS: column titles: the quasi-RRHO
                                     * weight w, or the wavenumber a raised mode
                                     * is counted with */
                                    soft == QV_SOFT_MODES_QUASI_RRHO ? _("w") : _("Used"));
  self->updating = TRUE;
  if (sorter)
    gtk_sorter_changed (sorter, GTK_SORTER_CHANGE_DIFFERENT);
  self->updating = FALSE;
}

static void
set_unit (QvThermoPanel *self, QvFrequencyUnit unit)
{
  if (self->unit == unit)
    return;
  self->unit = unit;
  gtk_column_view_column_set_title (self->columns[QV_THERMO_COLUMN_WAVENUMBER], unit_title (unit));
  update_rows (self);
  g_object_notify_by_pspec (G_OBJECT (self), props[PROP_UNIT]);
}

static void
set_summary_visible (QvThermoPanel *self, gboolean visible)
{
  gtk_widget_set_visible (GTK_WIDGET (self->headline_label), visible);
  gtk_widget_set_visible (GTK_WIDGET (self->summary_grid), visible);
  gtk_widget_set_visible (GTK_WIDGET (self->summary_note), visible);
  gtk_widget_set_sensitive (self->controls_grid, visible);
  gtk_widget_set_sensitive (GTK_WIDGET (self->save_button), visible);
}

static void
update_summary (QvThermoPanel *self)
{
  const QvGasThermoOptions *o = &self->options;
  const QvGasThermo *th = &self->thermo;
  const QvGasMolecule *m = self->molecule;
  g_autoptr(GString) note = g_string_new (NULL);
  g_autofree char *state = NULL;

  for (guint t = 0; t < N_TERMS; t++)
    for (guint q = 0; q < N_QUANTITIES; q++)
      {
        g_autofree char *text = g_strdup_printf ("%.2f", quantity_of (term_of (th, t), q) + 0.0);
        gtk_label_set_label (self->summary[t][q], text);
      }

  {
    /* TRANSLATORS: the headline over the pages: the total G and H
     * (thermal corrections, kJ/mol) and S (J/(K·mol)) */
    g_autofree char *text = g_strdup_printf (_("G %.2f · H %.2f kJ/mol · S %.2f J/(K·mol)"),
                                             th->total.free_energy * kj (),
                                             th->total.enthalpy * kj (),
                                             th->total.entropy * kj () * 1000.0);
    gtk_label_set_label (self->headline_label, text);
  }
  if (o->pressure > 0)
    /* TRANSLATORS: the pressure of the gas, in bar */
    state = g_strdup_printf (_("p = %g bar"), o->pressure / 1e5);
  else if (o->standard_state == QV_STANDARD_STATE_1M)
    /* TRANSLATORS: the 1 mol/L standard state and the pressure it means at T */
    state = g_strdup_printf (_("1 mol/L (p = %.1f Pa at this T)"), th->pressure);
  else
    state = g_strdup (o->standard_state == QV_STANDARD_STATE_1ATM ? _("1 atm") : _("1 bar"));
  /* TRANSLATORS: under the totals: T, the standard state, Cp */
  g_string_append_printf (note, _("At %.2f K and %s. Energies in kJ/mol from the bottom of the well; "
                                  "S and Cv in J/(K·mol); Cp = %.2f J/(K·mol)."),
                          th->temperature, state, th->heat_capacity_p * kj () * 1000.0);
  if (o->soft_modes != QV_SOFT_MODES_NONE)
    {
      g_string_append_c (note, '\n');
      if (o->soft_modes == QV_SOFT_MODES_RAISE)
        /* TRANSLATORS: %g is the cut-off, %s the paper */
        g_string_append_printf (note, _("Real modes below %g cm⁻¹ raised to it in U, Cv and S "
                                        "(the ZPE keeps the computed wavenumber): %s."),
                                o->cutoff, qv_thermochem_soft_reference (o->soft_modes));
      else
        /* TRANSLATORS: the quasi-RRHO parameters and the paper */
        g_string_append_printf (note, _("S of each mode mixed with a free rotor's, ω₀ = %g cm⁻¹, "
                                        "α = %g (energies and Cv harmonic): %s."),
                                o->omega0, o->alpha, qv_thermochem_soft_reference (o->soft_modes));
    }
  if (m->n_zero)
    {
      g_string_append_c (note, '\n');
      g_string_append_printf (note, g_dngettext (GETTEXT_PACKAGE,
                                                 "%zu mode of zero wavenumber left out.",
                                                 "%zu modes of zero wavenumber left out.", m->n_zero),
                              m->n_zero);
    }
  if (m->n_rigid)
    {
      g_string_append_c (note, '\n');
      g_string_append_printf (note, g_dngettext (GETTEXT_PACKAGE,
                                                 "%zu mode taken as rigid-body motion and left out.",
                                                 "%zu modes taken as rigid-body motion and left out.",
                                                 m->n_rigid), m->n_rigid);
    }
  g_string_append_c (note, '\n');
  g_string_append (note, _("Ideal gas, rigid rotor, harmonic oscillator: an approximation to be "
                           "validated, above all the soft modes' share."));
  gtk_label_set_label (self->summary_note, note->str);
}

static void
update_notes (QvThermoPanel *self)
{
  const QvGasMolecule *m = self->molecule;
  gsize n_soft = 0;
  double lowest = INFINITY;

  if (m->n_imaginary)
    {
      g_autofree char *text = g_strdup_printf (
        g_dngettext (GETTEXT_PACKAGE,
                     "⚠ %zu imaginary mode (%.2fi cm⁻¹) is LEFT OUT of the thermochemistry: the "
                     "structure is not a minimum (a transition state, or an unconverged geometry), "
                     "so these numbers are not those of a stable species.",
                     "⚠ %zu imaginary modes (down to %.2fi cm⁻¹) are LEFT OUT of the "
                     "thermochemistry: the structure is not a minimum (a transition state, or an "
                     "unconverged geometry), so these numbers are not those of a stable species.",
                     m->n_imaginary), m->n_imaginary, -m->most_imaginary);
      gtk_label_set_label (self->warning_label, text);
    }
  gtk_widget_set_visible (GTK_WIDGET (self->warning_label), m->n_imaginary > 0);

  for (gsize k = 0; k < m->n_modes; k++)
    if (m->used[k] && m->wavenumbers[k] * self->options.frequency_scale < QV_GAS_RAISE_CUTOFF)
      {
        n_soft++;
        lowest = MIN (lowest, m->wavenumbers[k] * self->options.frequency_scale);
      }
  if (n_soft && self->options.soft_modes == QV_SOFT_MODES_NONE)
    {
      g_autofree char *text = g_strdup_printf (
        g_dngettext (GETTEXT_PACKAGE,
                     "%zu real mode below 100 cm⁻¹ (%.2f cm⁻¹) is counted as a harmonic oscillator, "
                     "whose entropy grows without bound as the wavenumber falls: see its share "
                     "below and try a soft-mode treatment.",
                     "%zu real modes below 100 cm⁻¹ (lowest %.2f cm⁻¹) are counted as harmonic "
                     "oscillators, whose entropy grows without bound as the wavenumber falls: see "
                     "their share below and try a soft-mode treatment.", n_soft), n_soft, lowest);
      gtk_label_set_label (self->soft_note_label, text);
    }
  gtk_widget_set_visible (GTK_WIDGET (self->soft_note_label),
                          n_soft && self->options.soft_modes == QV_SOFT_MODES_NONE);
}

static void
update_sigma_label (QvThermoPanel *self)
{
  g_autofree char *group = self->group_name ? qv_document_analysis_display (self->group_name) : NULL;
  g_autofree char *text = NULL;

  if (self->sigma_given)
    text = group
           /* TRANSLATORS: the symmetry number was typed in; the point group's own follows */
           ? g_strdup_printf (_("Given (the point group %s has %u)"), group, self->group_sigma)
           : g_strdup (_("Given"));
  else
    text = group
           /* TRANSLATORS: "From the point group C2v" */
           ? g_strdup_printf (_("From the point group %s"), group)
           : g_strdup (_("No point group found: 1 assumed"));
  gtk_label_set_label (self->sigma_label, text);
  gtk_widget_set_sensitive (self->sigma_reset, self->sigma_given);
}

static void
update_caption (QvThermoPanel *self)
{
  /* TRANSLATORS: above the per-mode table: units and what S % means */
  g_autofree char *text = g_strdup_printf (_("At %.2f K. S, Cv: J/(K·mol); G, ZPE: kJ/mol; "
                                             "S %%: share of the vibrational S."),
                                           self->thermo.temperature);
  gtk_label_set_label (self->table_caption, text);
}

/* The numbers at the temperature (and the sweep with them when
 * @sweep_too), from the controls. */
static void
compute (QvThermoPanel *self, gboolean sweep_too)
{
  g_autoptr(GError) error = NULL;
  QvGasThermoOptions o;

  if (self->molecule == NULL)
    return;
  options_from_controls (self, &o);
  if (!qv_gas_thermo_options_check (&o, &error))
    {
      /* the controls' ranges keep this from happening; say so if it does */
      gtk_label_set_label (self->status_label, error->message);
      gtk_widget_set_visible (GTK_WIDGET (self->status_label), TRUE);
      return;
    }
  gtk_widget_set_visible (GTK_WIDGET (self->status_label), FALSE);
  self->options = o;
  self->temperature = gtk_spin_button_get_value (self->temperature_spin);
  qv_gas_thermo_compute (self->molecule, &self->options, self->temperature, &self->thermo, self->modes);
  if (sweep_too || !self->has_results)
    self->sweep_dirty = TRUE;
  self->has_results = TRUE;
  update_rows (self);
  update_summary (self);
  update_notes (self);
  update_caption (self);
  set_summary_visible (self, TRUE);
  gtk_widget_queue_draw (GTK_WIDGET (self->plot_area));
}

/* ---- the document ---- */

static void
clear_results (QvThermoPanel *self)
{
  self->has_results = FALSE;
  g_clear_pointer (&self->molecule, qv_gas_molecule_free);
  g_clear_pointer (&self->modes, g_free);
  g_clear_pointer (&self->group_name, g_free);
  self->group_sigma = 1;
  self->selected = -1;
  g_list_store_remove_all (self->store);
  gtk_widget_set_visible (GTK_WIDGET (self->warning_label), FALSE);
  gtk_widget_set_visible (GTK_WIDGET (self->soft_note_label), FALSE);
  gtk_widget_queue_draw (GTK_WIDGET (self->plot_area));
}

static void
show_status (QvThermoPanel *self, const char *text)
{
  gtk_label_set_label (self->status_label, text);
  gtk_widget_set_visible (GTK_WIDGET (self->status_label), TRUE);
  set_summary_visible (self, FALSE);
  gtk_label_set_label (self->table_caption, "");
}

/* The molecule of the document's modes, its point group's σ, one row per
 * mode, then the numbers. */
static void
load (QvThermoPanel *self)
{
  const QvModeSet *modes;
  const QvDocumentAnalysis *a;
  g_autoptr(GError) error = NULL;

  clear_results (self);
  if (self->document == NULL)
    {
      show_status (self, _("No document."));
      return;
    }
  if (qv_document_get_lattice (self->document) || qv_document_get_lattice_note (self->document))
    {
      show_status (self, _("This is a crystal: its thermal properties are on the Lattice page."));
      return;
    }
  modes = qv_document_get_modes (self->document);
  if (modes->has_hessian && modes->projection != QV_PROJECTION_FULL)
    {
      show_status (self, _("Thermochemistry counts translations and rotations apart from the "
                           "vibrations: it needs them projected out of the Hessian."));
      return;
    }
  self->molecule = qv_gas_molecule_new_from_modes (qv_document_get_structure (self->document), modes, &error);
  if (self->molecule == NULL)
    {
      /* TRANSLATORS: %s is the core's reason */
      g_autofree char *text = g_strdup_printf (_("No thermochemistry: %s"), error->message);
      show_status (self, text);
      return;
    }
  a = qv_document_get_analysis (self->document);
  if (a && a->group)
    {
      self->group_name = g_strdup (a->group->name);
      self->group_sigma = a->group->symmetry_number;
    }
  if (!self->sigma_given)
    {
      self->updating = TRUE;
      gtk_spin_button_set_value (self->sigma_spin, self->group_sigma);
      self->updating = FALSE;
    }
  update_sigma_label (self);
  self->modes = g_new0 (QvGasMode, MAX (self->molecule->n_modes, 1));
  {
    const gsize n = self->molecule->n_modes;
    g_autofree gpointer *rows = g_new (gpointer, MAX (n, 1));
    for (gsize k = 0; k < n; k++)
      {
        QvThermoRow *row = g_object_new (QV_TYPE_THERMO_ROW, NULL);
        row->mode = (guint) k;
        rows[k] = row;
      }
    self->updating = TRUE;
    g_list_store_splice (self->store, 0, 0, rows, (guint) n);
    self->updating = FALSE;
    for (gsize k = 0; k < n; k++)
      g_object_unref (rows[k]);
  }
  compute (self, TRUE);
}

static void
document_changed (QvThermoPanel *self)
{
  const int selected = self->selected;

  load (self);
  qv_thermo_panel_set_selected (self, selected);
}

void
qv_thermo_panel_set_document (QvThermoPanel *self, QvDocument *doc)
{
  if (self->document)
    g_clear_signal_handler (&self->changed_id, self->document);
  g_set_object (&self->document, doc);
  /* a new document's σ comes from its own point group */
  self->sigma_given = FALSE;
  if (doc)
    self->changed_id = g_signal_connect_swapped (doc, "changed", G_CALLBACK (document_changed), self);
  load (self);
}

/* ---- reading it ---- */

gboolean
qv_thermo_panel_has_results (QvThermoPanel *self)
{
  return self->has_results;
}

const QvGasThermo *
qv_thermo_panel_get_thermo (QvThermoPanel *self)
{
  return self->has_results ? &self->thermo : NULL;
}

const QvGasMode *
qv_thermo_panel_get_modes (QvThermoPanel *self, gsize *n_modes)
{
  if (n_modes)
    *n_modes = self->has_results ? self->molecule->n_modes : 0;
  return self->has_results ? self->modes : NULL;
}

const QvGasThermo *
qv_thermo_panel_get_sweep (QvThermoPanel *self, gsize *n)
{
  ensure_sweep (self);
  if (n)
    *n = self->has_results ? self->n_sweep : 0;
  return self->has_results ? self->sweep : NULL;
}

const char *
qv_thermo_panel_get_warning (QvThermoPanel *self)
{
  return gtk_widget_get_visible (GTK_WIDGET (self->warning_label))
         ? gtk_label_get_label (self->warning_label) : NULL;
}

const char *
qv_thermo_panel_summary_text (QvThermoPanel *self, guint term, guint quantity)
{
  g_return_val_if_fail (term < N_TERMS && quantity < N_QUANTITIES, NULL);
  return gtk_label_get_label (self->summary[term][quantity]);
}

guint
qv_thermo_panel_get_n_rows (QvThermoPanel *self)
{
  return g_list_model_get_n_items (G_LIST_MODEL (self->sorted));
}

int
qv_thermo_panel_row_mode (QvThermoPanel *self, guint row)
{
  g_autoptr(QvThermoRow) r = g_list_model_get_item (G_LIST_MODEL (self->sorted), row);
  return r ? (int) r->mode : -1;
}

char *
qv_thermo_panel_cell_text (QvThermoPanel *self, guint row, QvThermoColumn column)
{
  g_autoptr(QvThermoRow) r = g_list_model_get_item (G_LIST_MODEL (self->sorted), row);
  return r && column < QV_THERMO_N_COLUMNS ? format_cell (self, r, column) : NULL;
}

gboolean
qv_thermo_panel_cell_left_out (QvThermoPanel *self, guint row, QvThermoColumn column)
{
  g_autoptr(QvThermoRow) r = g_list_model_get_item (G_LIST_MODEL (self->sorted), row);
  return r && column < QV_THERMO_N_COLUMNS && cell_left_out (r, column);
}

void
qv_thermo_panel_sort_by (QvThermoPanel *self, QvThermoColumn column, gboolean ascending)
{
  g_return_if_fail (column < QV_THERMO_N_COLUMNS);
  gtk_column_view_sort_by_column (self->column_view, self->columns[column],
                                  ascending ? GTK_SORT_ASCENDING : GTK_SORT_DESCENDING);
}

/* ---- selection ---- */

static void
selection_changed (QvThermoPanel *self)
{
  QvThermoRow *row = gtk_single_selection_get_selected_item (self->selection);
  const int k = row ? (int) row->mode : -1;

  if (k == self->selected)
    return;
  self->selected = k;
  if (!self->updating && k >= 0)
    g_signal_emit (self, signals[MODE_ACTIVATED], 0, k);
}

void
qv_thermo_panel_select_row (QvThermoPanel *self, guint row)
{
  gtk_selection_model_select_item (GTK_SELECTION_MODEL (self->selection), row, TRUE);
}

void
qv_thermo_panel_set_selected (QvThermoPanel *self, int mode)
{
  const guint n = g_list_model_get_n_items (G_LIST_MODEL (self->sorted));
  guint position = GTK_INVALID_LIST_POSITION;

  for (guint p = 0; p < n && mode >= 0; p++)
    {
      g_autoptr(QvThermoRow) row = g_list_model_get_item (G_LIST_MODEL (self->sorted), p);
      if ((int) row->mode == mode)
        {
          position = p;
          break;
        }
    }
  self->updating = TRUE;
  gtk_single_selection_set_selected (self->selection, position);
  self->updating = FALSE;
  self->selected = position == GTK_INVALID_LIST_POSITION ? -1 : mode;
}

int
qv_thermo_panel_get_selected (QvThermoPanel *self)
{
  return self->selected;
}

static void
row_activated (GtkColumnView *view, guint position, gpointer data)
{
  QvThermoPanel *self = data;
  const int k = qv_thermo_panel_row_mode (self, position);

  if (k >= 0)
    g_signal_emit (self, signals[MODE_ACTIVATED], 0, k);
}

/* ---- the sweep plot ---- */

/* The sweep for the options of the results, computed when first needed. */
static void
ensure_sweep (QvThermoPanel *self)
{
  if (!self->has_results || !self->sweep_dirty)
    return;
  qv_gas_thermo_sweep (self->molecule, &self->options, self->sweep_t, self->n_sweep, self->sweep);
  self->sweep_dirty = FALSE;
}

static void
plot_options (QvThermoPanel *self, int width, int height, QvThermochemPlotOptions *o)
{
  qv_thermochem_plot_options_init (o);
  o->width = MAX (width, 1);
  o->height = MAX (height, 1);
  o->has_marker = self->has_results;
  o->marker_t = self->temperature;
  o->has_hover = self->hovering;
  o->hover_t = self->hover_t;
}

static void
draw_plot (GtkDrawingArea *area, cairo_t *cr, int width, int height, gpointer data)
{
  QvThermoPanel *self = data;
  QvThermochemPlotOptions o;

  if (!self->has_results)
    return;
  ensure_sweep (self);
  plot_options (self, width, height, &o);
  /* the plot's own paper colours in both styles: a figure, as exported */
  qv_thermochem_plot_draw (cr, self->sweep, self->n_sweep, &o);
}

static gboolean
readout_at (QvThermoPanel *self, double x, double y, QvThermochemReadout *out)
{
  QvThermochemPlotOptions o;

  if (!self->has_results)
    return FALSE;
  ensure_sweep (self);
  plot_options (self, gtk_widget_get_width (GTK_WIDGET (self->plot_area)),
                gtk_widget_get_height (GTK_WIDGET (self->plot_area)), &o);
  return qv_thermochem_plot_readout (self->sweep, self->n_sweep, &o, x, y, NULL, out);
}

char *
qv_thermo_panel_describe_point (QvThermoPanel *self, double x, double y)
{
  QvThermochemReadout r;

  if (!readout_at (self, x, y, &r))
    return g_strdup ("");
  /* TRANSLATORS: the sweep plot's read-out: T, then H and G in kJ/mol,
   * S and Cp in J/(K·mol) */
  return g_strdup_printf (_("%.0f K · H %.2f · G %.2f kJ/mol · S %.2f · Cp %.2f J/(K·mol)"),
                          r.t, r.enthalpy, r.free_energy, r.entropy, r.heat_capacity_p);
}

static void
plot_motion (GtkEventControllerMotion *controller, double x, double y, gpointer data)
{
  QvThermoPanel *self = data;
  QvThermochemReadout r;
  const gboolean on = readout_at (self, x, y, &r);
  g_autofree char *text = on ? qv_thermo_panel_describe_point (self, x, y) : NULL;

  self->hovering = on;
  self->hover_t = on ? r.t : 0.0;
  gtk_label_set_label (self->readout_label, text ? text : " ");
  gtk_widget_queue_draw (GTK_WIDGET (self->plot_area));
}

static void
plot_leave (GtkEventControllerMotion *controller, gpointer data)
{
  QvThermoPanel *self = data;

  self->hovering = FALSE;
  gtk_label_set_label (self->readout_label, " ");
  gtk_widget_queue_draw (GTK_WIDGET (self->plot_area));
}

/* A click takes that temperature (to the kelvin) for the totals and the table. */
static void
plot_pressed (GtkGestureClick *gesture, int n_press, double x, double y, gpointer data)
{
  QvThermoPanel *self = data;
  QvThermochemReadout r;

  if (readout_at (self, x, y, &r))
    gtk_spin_button_set_value (self->temperature_spin, round (r.t));
}

GtkWidget *
qv_thermo_panel_get_plot_area (QvThermoPanel *self)
{
  return GTK_WIDGET (self->plot_area);
}

void
qv_thermo_panel_show_page (QvThermoPanel *self, const char *name)
{
  gtk_stack_set_visible_child_name (self->page_stack, name);
}

/* ---- saving ---- */

static gboolean
has_extension (const char *path, const char *ext)
{
  const char *dot = strrchr (path, '.');
  return dot && g_ascii_strcasecmp (dot, ext) == 0;
}

static gboolean
table_format (const char *path, QvThermochemTableFormat *format)
{
  if (has_extension (path, ".csv"))
    *format = QV_THERMOCHEM_TABLE_CSV;
  else if (has_extension (path, ".json"))
    *format = QV_THERMOCHEM_TABLE_JSON;
  else if (has_extension (path, ".txt"))
    *format = QV_THERMOCHEM_TABLE_TEXT;
  else
    return FALSE;
  return TRUE;
}

/* The table as `quaver thermo` writes it for the same options. */
static char *
report (QvThermoPanel *self, gboolean sweep, QvThermochemTableFormat format)
{
  const QvDocumentSource *source = qv_document_get_source (self->document);
  const char *path = qv_document_get_path (self->document);
  g_autofree char *formula = qv_structure_formula (qv_document_get_structure (self->document));
  g_autofree char *sigma = self->sigma_given ? g_strdup ("given")
                           : self->group_name ? g_strdup_printf ("from point group %s", self->group_name)
                           : g_strdup ("no point group found: 1 assumed");
  g_auto(GStrv) notes = qv_thermochem_notes (self->molecule, &self->options, self->group_name,
                                             self->group_sigma, self->sigma_given);
  QvThermochemReport r = { 0 };

  r.program = "Quaver";
  r.input = source && source->demo ? "demo" : path ? path : qv_document_get_name (self->document);
  r.formula = formula;
  r.mol = self->molecule;
  r.opt = &self->options;
  r.sigma_source = sigma;
  r.sweep = sweep;
  r.n_t = sweep ? self->n_sweep : 1;
  r.th = sweep ? self->sweep : &self->thermo;
  r.modes = sweep ? NULL : self->modes;
  r.notes = notes;
  return qv_thermochem_table_write (&r, format);
}

static gboolean
check_results (QvThermoPanel *self, GError **error)
{
  if (self->has_results)
    return TRUE;
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s", _("There is no thermochemistry to save"));
  return FALSE;
}

gboolean
qv_thermo_panel_save_table (QvThermoPanel *self, const char *path, gboolean force, GError **error)
{
  QvThermochemTableFormat format;
  g_autofree char *text = NULL;

  if (!check_results (self, error))
    return FALSE;
  if (!table_format (path, &format))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s",
                   _("End the file name in .csv, .json or .txt to choose the format"));
      return FALSE;
    }
  text = report (self, FALSE, format);
  return qv_output_write (path, text, strlen (text), force, error);
}

gboolean
qv_thermo_panel_save_sweep (QvThermoPanel *self, const char *path, gboolean force, GError **error)
{
  QvThermochemTableFormat format;
  QvThermochemPlotOptions o;
  g_autofree guint8 *bytes = NULL;
  gsize length = 0;

  if (!check_results (self, error))
    return FALSE;
  ensure_sweep (self);
  if (table_format (path, &format))
    {
      g_autofree char *text = report (self, TRUE, format);
      return qv_output_write (path, text, strlen (text), force, error);
    }
  if (!has_extension (path, ".png") && !has_extension (path, ".svg"))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s",
                   _("End the file name in .png, .svg, .csv, .json or .txt to choose the format"));
      return FALSE;
    }
  plot_options (self, MAX (gtk_widget_get_width (GTK_WIDGET (self->plot_area)), 720),
                MAX (gtk_widget_get_height (GTK_WIDGET (self->plot_area)), 420), &o);
  o.has_hover = FALSE;
  if (has_extension (path, ".svg"))
    bytes = (guint8 *) qv_thermochem_plot_svg (self->sweep, self->n_sweep, &o, &length, error);
  else
    {
      g_autofree guint8 *rgba = qv_thermochem_plot_rgba (self->sweep, self->n_sweep, &o, error);
      const char *text[] = { "Software", "quaver " QV_VERSION, NULL };
      if (rgba)
        bytes = qv_png_encode (rgba, o.width, o.height, FALSE, text, &length, error);
    }
  if (bytes == NULL)
    return FALSE;
  return qv_output_write (path, (const char *) bytes, length, force, error);
}

static void
save_response (GtkNativeDialog *chooser, int response, gpointer data)
{
  QvThermoPanel *self = data;

  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr(GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (chooser));
      g_autofree char *path = file ? g_file_get_path (file) : NULL;
      g_autoptr(GError) error = NULL;
      const gboolean sweep = g_strcmp0 (gtk_stack_get_visible_child_name (self->page_stack), "sweep") == 0;

      /* the chooser has asked before replacing a file */
      if (path && !(sweep ? qv_thermo_panel_save_sweep (self, path, TRUE, &error)
                          : qv_thermo_panel_save_table (self, path, TRUE, &error)))
        {
          qv_error_dialog_show (GTK_WIDGET (self), _("The thermochemistry could not be saved"), error);
        }
    }
  gtk_native_dialog_destroy (chooser);
  g_object_unref (chooser);
  g_object_unref (self);
}

static void
save_clicked (QvThermoPanel *self)
{
  GtkRoot *root = gtk_widget_get_root (GTK_WIDGET (self));
  const gboolean sweep = g_strcmp0 (gtk_stack_get_visible_child_name (self->page_stack), "sweep") == 0;
  GtkFileChooserNative *chooser =
    gtk_file_chooser_native_new (sweep ? _("Save the Sweep") : _("Save the Per-Mode Table"),
                                 GTK_IS_WINDOW (root) ? GTK_WINDOW (root) : NULL,
                                 GTK_FILE_CHOOSER_ACTION_SAVE, _("_Save"), _("_Cancel"));

  gtk_file_chooser_set_current_name (GTK_FILE_CHOOSER (chooser),
                                     sweep ? "thermochemistry-sweep.svg" : "thermochemistry.csv");
  gtk_native_dialog_set_modal (GTK_NATIVE_DIALOG (chooser), TRUE);
  g_signal_connect (chooser, "response", G_CALLBACK (save_response), g_object_ref (self));
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
}

/* ---- controls ---- */

static void
temperature_changed (QvThermoPanel *self)
{
  compute (self, FALSE);
  g_object_notify_by_pspec (G_OBJECT (self), props[PROP_TEMPERATURE]);
}

static void
options_changed (QvThermoPanel *self)
{
  if (!self->updating)
    compute (self, TRUE);
}

static void
state_changed (QvThermoPanel *self)
{
  const gboolean own = state_choice (self) == QV_THERMO_STATE_PRESSURE;

  gtk_widget_set_visible (self->pressure_label, own);
  gtk_widget_set_visible (GTK_WIDGET (self->pressure_spin), own);
  gtk_widget_set_visible (self->pressure_unit, own);
  options_changed (self);
  g_object_notify_by_pspec (G_OBJECT (self), props[PROP_STANDARD_STATE]);
}

/* The spin under the dropdown holds the chosen treatment's parameter. */
static void
soft_changed (QvThermoPanel *self)
{
  const QvSoftModes soft = soft_choice (self);
  const gboolean param = soft != QV_SOFT_MODES_NONE;

  self->updating = TRUE;
  if (soft == QV_SOFT_MODES_RAISE)
    {
      gtk_label_set_text_with_mnemonic (self->soft_param_label, _("C_ut-off"));
      gtk_widget_set_tooltip_text (GTK_WIDGET (self->soft_param_spin),
                                   _("Real wavenumbers below this are raised to it in the thermal "
                                     "energy, Cv and S (Ribeiro et al. 2011 use 100 cm⁻¹)"));
      gtk_spin_button_set_value (self->soft_param_spin, self->cutoff);
    }
  else if (soft == QV_SOFT_MODES_QUASI_RRHO)
    {
      gtk_label_set_text_with_mnemonic (self->soft_param_label, _("ω₀"));
      gtk_widget_set_tooltip_text (GTK_WIDGET (self->soft_param_spin),
                                   _("Where the entropy is half oscillator, half free rotor "
                                     "(Grimme 2012 uses 100 cm⁻¹, α = 4)"));
      gtk_spin_button_set_value (self->soft_param_spin, self->omega0);
    }
  self->updating = FALSE;
  gtk_widget_set_visible (GTK_WIDGET (self->soft_param_label), param);
  gtk_widget_set_visible (GTK_WIDGET (self->soft_param_spin), param);
  gtk_widget_set_visible (self->soft_param_unit, param);
  options_changed (self);
  g_object_notify_by_pspec (G_OBJECT (self), props[PROP_SOFT_MODES]);
}

static void
soft_param_changed (QvThermoPanel *self)
{
  const double v = gtk_spin_button_get_value (self->soft_param_spin);

  if (self->updating)
    return;
  if (soft_choice (self) == QV_SOFT_MODES_RAISE)
    {
      self->cutoff = v;
      g_object_notify_by_pspec (G_OBJECT (self), props[PROP_CUTOFF]);
    }
  else if (soft_choice (self) == QV_SOFT_MODES_QUASI_RRHO)
    {
      self->omega0 = v;
      g_object_notify_by_pspec (G_OBJECT (self), props[PROP_OMEGA0]);
    }
  options_changed (self);
}

static void
sigma_changed (QvThermoPanel *self)
{
  if (!self->updating)
    {
      self->sigma_given = TRUE;
      update_sigma_label (self);
    }
  options_changed (self);
  g_object_notify_by_pspec (G_OBJECT (self), props[PROP_SYMMETRY_NUMBER]);
}

static void
sigma_reset_clicked (QvThermoPanel *self)
{
  self->sigma_given = FALSE;
  self->updating = TRUE;
  gtk_spin_button_set_value (self->sigma_spin, self->group_sigma);
  self->updating = FALSE;
  update_sigma_label (self);
  options_changed (self);
}

static void
scale_changed (QvThermoPanel *self)
{
  options_changed (self);
  g_object_notify_by_pspec (G_OBJECT (self), props[PROP_FREQUENCY_SCALE]);
}

/* ---- GObject ---- */

static void
qv_thermo_panel_get_property (GObject *object, guint id, GValue *value, GParamSpec *pspec)
{
  QvThermoPanel *self = QV_THERMO_PANEL (object);

  switch (id)
    {
    case PROP_TEMPERATURE: g_value_set_double (value, gtk_spin_button_get_value (self->temperature_spin)); break;
    case PROP_STANDARD_STATE: g_value_set_int (value, (int) state_choice (self)); break;
    case PROP_PRESSURE: g_value_set_double (value, gtk_spin_button_get_value (self->pressure_spin)); break;
    case PROP_SOFT_MODES: g_value_set_int (value, (int) soft_choice (self)); break;
    case PROP_CUTOFF: g_value_set_double (value, self->cutoff); break;
    case PROP_OMEGA0: g_value_set_double (value, self->omega0); break;
    case PROP_SYMMETRY_NUMBER: g_value_set_uint (value, (guint) gtk_spin_button_get_value_as_int (self->sigma_spin)); break;
    case PROP_FREQUENCY_SCALE: g_value_set_double (value, gtk_spin_button_get_value (self->scale_spin)); break;
    case PROP_UNIT: g_value_set_enum (value, (int) self->unit); break;
    default: G_OBJECT_WARN_INVALID_PROPERTY_ID (object, id, pspec);
    }
}

static void
qv_thermo_panel_set_property (GObject *object, guint id, const GValue *value, GParamSpec *pspec)
{
  QvThermoPanel *self = QV_THERMO_PANEL (object);

  switch (id)
    {
    case PROP_TEMPERATURE: gtk_spin_button_set_value (self->temperature_spin, g_value_get_double (value)); break;
    case PROP_STANDARD_STATE: gtk_drop_down_set_selected (self->state_dropdown, (guint) g_value_get_int (value)); break;
    case PROP_PRESSURE: gtk_spin_button_set_value (self->pressure_spin, g_value_get_double (value)); break;
    case PROP_SOFT_MODES: gtk_drop_down_set_selected (self->soft_dropdown, (guint) g_value_get_int (value)); break;
    case PROP_CUTOFF:
      self->cutoff = g_value_get_double (value);
      if (soft_choice (self) == QV_SOFT_MODES_RAISE)
        gtk_spin_button_set_value (self->soft_param_spin, self->cutoff);
      break;
    case PROP_OMEGA0:
      self->omega0 = g_value_get_double (value);
      if (soft_choice (self) == QV_SOFT_MODES_QUASI_RRHO)
        gtk_spin_button_set_value (self->soft_param_spin, self->omega0);
      break;
    case PROP_SYMMETRY_NUMBER: gtk_spin_button_set_value (self->sigma_spin, g_value_get_uint (value)); break;
    case PROP_FREQUENCY_SCALE: gtk_spin_button_set_value (self->scale_spin, g_value_get_double (value)); break;
    case PROP_UNIT: set_unit (self, (QvFrequencyUnit) g_value_get_enum (value)); break;
    default: G_OBJECT_WARN_INVALID_PROPERTY_ID (object, id, pspec);
    }
}

static void
qv_thermo_panel_dispose (GObject *object)
{
  QvThermoPanel *self = QV_THERMO_PANEL (object);

  if (self->document)
    g_clear_signal_handler (&self->changed_id, self->document);
  g_clear_object (&self->document);
  gtk_widget_dispose_template (GTK_WIDGET (self), QV_TYPE_THERMO_PANEL);
  g_clear_object (&self->selection);
  g_clear_object (&self->sorted);
  g_clear_object (&self->store);
  G_OBJECT_CLASS (qv_thermo_panel_parent_class)->dispose (object);
}

static void
qv_thermo_panel_finalize (GObject *object)
{
  QvThermoPanel *self = QV_THERMO_PANEL (object);

  g_clear_pointer (&self->molecule, qv_gas_molecule_free);
  g_free (self->modes);
  g_free (self->sweep);
  g_free (self->sweep_t);
  g_free (self->group_name);
  G_OBJECT_CLASS (qv_thermo_panel_parent_class)->finalize (object);
}

static void
qv_thermo_panel_class_init (QvThermoPanelClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);
  const GParamFlags rw = G_PARAM_READWRITE | G_PARAM_STATIC_STRINGS | G_PARAM_EXPLICIT_NOTIFY;

  object_class->dispose = qv_thermo_panel_dispose;
  object_class->finalize = qv_thermo_panel_finalize;
  object_class->get_property = qv_thermo_panel_get_property;
  object_class->set_property = qv_thermo_panel_set_property;
  props[PROP_TEMPERATURE] = g_param_spec_double ("temperature", NULL, NULL, 1, 5000, 298.15, rw);
  props[PROP_STANDARD_STATE] = g_param_spec_int ("standard-state", NULL, NULL, 0, QV_THERMO_STATE_PRESSURE,
                                                 QV_THERMO_STATE_1BAR, rw);
  props[PROP_PRESSURE] = g_param_spec_double ("pressure", NULL, NULL, 1e-4, 1e4, 1, rw);
  props[PROP_SOFT_MODES] = g_param_spec_int ("soft-modes", NULL, NULL, 0, QV_SOFT_MODES_QUASI_RRHO,
                                             QV_SOFT_MODES_NONE, rw);
  props[PROP_CUTOFF] = g_param_spec_double ("cutoff", NULL, NULL, 1, 1000, QV_GAS_RAISE_CUTOFF, rw);
  props[PROP_OMEGA0] = g_param_spec_double ("omega0", NULL, NULL, 1, 1000, QV_GAS_QRRHO_OMEGA0, rw);
  props[PROP_SYMMETRY_NUMBER] = g_param_spec_uint ("symmetry-number", NULL, NULL, 1, 1000, 1, rw);
  props[PROP_FREQUENCY_SCALE] = g_param_spec_double ("frequency-scale", NULL, NULL, 0.5, 1.5, 1, rw);
  /* The unit of the wavenumber columns (the window binds the list's). */
  props[PROP_UNIT] = g_param_spec_enum ("unit", NULL, NULL, QV_TYPE_FREQUENCY_UNIT,
                                        QV_FREQUENCY_CM1, rw);
  g_object_class_install_properties (object_class, N_PROPS, props);
  /* A row of the table was chosen: its mode (0-based, the mode list's). */
  signals[MODE_ACTIVATED] = g_signal_new ("mode-activated", G_TYPE_FROM_CLASS (klass),
                                          G_SIGNAL_RUN_LAST, 0, NULL, NULL, NULL, G_TYPE_NONE,
                                          1, G_TYPE_INT);

  gtk_widget_class_set_template_from_resource (widget_class,
                                               "/org/quaverlab/Quaver/gui/qv-thermo-panel.ui");
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, box);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, controls_grid);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, temperature_spin);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, state_dropdown);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, pressure_label);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, pressure_spin);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, pressure_unit);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, soft_dropdown);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, soft_param_label);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, soft_param_spin);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, soft_param_unit);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, sigma_spin);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, sigma_reset);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, sigma_label);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, scale_spin);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, warning_label);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, soft_note_label);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, status_label);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, headline_label);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, summary_grid);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, summary_note);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, page_stack);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, table_caption);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, column_view);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, plot_area);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, readout_label);
  gtk_widget_class_bind_template_child (widget_class, QvThermoPanel, save_button);
  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "qvthermopanel");
}

static void
build_summary (QvThermoPanel *self)
{
  /* TRANSLATORS: the totals' column titles */
  const char *heads[N_QUANTITIES] = { _("ZPE"), _("U"), _("H"), _("S"), _("Cv"), _("G") };

  for (guint q = 0; q < N_QUANTITIES; q++)
    {
      GtkWidget *label = gtk_label_new (heads[q]);
      gtk_label_set_xalign (GTK_LABEL (label), 1.0f);
      gtk_widget_add_css_class (label, "heading");
      gtk_grid_attach (self->summary_grid, label, (int) q + 1, 0, 1, 1);
    }
  for (guint t = 0; t < N_TERMS; t++)
    {
      GtkWidget *name = gtk_label_new (term_name (t));
      gtk_label_set_xalign (GTK_LABEL (name), 0.0f);
      if (t == N_TERMS - 1)
        gtk_widget_add_css_class (name, "heading");
      gtk_grid_attach (self->summary_grid, name, 0, (int) t + 1, 1, 1);
      for (guint q = 0; q < N_QUANTITIES; q++)
        {
          GtkWidget *value = gtk_label_new ("");
          gtk_label_set_xalign (GTK_LABEL (value), 1.0f);
          gtk_widget_set_hexpand (value, TRUE);
          gtk_widget_add_css_class (value, "numeric");
          if (t == N_TERMS - 1)
            gtk_widget_add_css_class (value, "thermo-total");
          gtk_grid_attach (self->summary_grid, value, (int) q + 1, (int) t + 1, 1, 1);
          self->summary[t][q] = GTK_LABEL (value);
        }
    }
}

static void
qv_thermo_panel_init (QvThermoPanel *self)
{
  const char *states[] = { _("1 bar"), _("1 atm"), _("1 mol/L"), _("Pressure…"), NULL };
  /* TRANSLATORS: the soft-mode treatments: none, Ribeiro et al. 2011, Grimme 2012 */
  const char *softs[] = { _("None (harmonic)"), _("Raise to a cut-off"), _("Quasi-RRHO (free rotor)"), NULL };
  g_autoptr(GtkStringList) state_list = NULL;
  g_autoptr(GtkStringList) soft_list = NULL;
  GtkEventController *controller;
  GtkGesture *click;

  gtk_widget_init_template (GTK_WIDGET (self));
  self->selected = -1;
  self->group_sigma = 1;
  self->cutoff = QV_GAS_RAISE_CUTOFF;
  self->omega0 = QV_GAS_QRRHO_OMEGA0;
  self->temperature = 298.15;
  qv_gas_thermo_options_init (&self->options);

  state_list = gtk_string_list_new (states);
  soft_list = gtk_string_list_new (softs);
  gtk_drop_down_set_model (self->state_dropdown, G_LIST_MODEL (state_list));
  gtk_drop_down_set_model (self->soft_dropdown, G_LIST_MODEL (soft_list));
  gtk_widget_set_tooltip_text (GTK_WIDGET (self->soft_dropdown),
                               _("The harmonic entropy of a mode grows without bound as its wavenumber "
                                 "falls: raise low modes to a cut-off (Ribeiro, Marenich, Cramer & "
                                 "Truhlar 2011) or mix each mode's entropy with a free rotor's "
                                 "(Grimme 2012)"));

  /* the sweep's temperatures, as `quaver thermo --t-min 50 --t-max 1000 --t-step 5` */
  self->n_sweep = (gsize) floor ((QV_THERMO_PANEL_SWEEP_MAX - QV_THERMO_PANEL_SWEEP_MIN)
                                 / QV_THERMO_PANEL_SWEEP_STEP + 1e-9) + 1;
  self->sweep_t = g_new (double, self->n_sweep);
  self->sweep = g_new0 (QvGasThermo, self->n_sweep);
  for (gsize i = 0; i < self->n_sweep; i++)
    self->sweep_t[i] = QV_THERMO_PANEL_SWEEP_MIN + (double) i * QV_THERMO_PANEL_SWEEP_STEP;

  build_summary (self);
  add_column (self, QV_THERMO_COLUMN_INDEX, _("#"));
  add_column (self, QV_THERMO_COLUMN_WAVENUMBER, unit_title (self->unit));
  add_column (self, QV_THERMO_COLUMN_ENTROPY, _("S"));
  /* TRANSLATORS: column title: the mode's share of the vibrational entropy, percent */
  add_column (self, QV_THERMO_COLUMN_SHARE, _("S %"));
  add_column (self, QV_THERMO_COLUMN_FREE_ENERGY, _("G"));
  add_column (self, QV_THERMO_COLUMN_ZPE, _("ZPE"));
  add_column (self, QV_THERMO_COLUMN_HEAT_CAPACITY, _("Cv"));
  add_column (self, QV_THERMO_COLUMN_TREATED, _("Used"));
  gtk_column_view_column_set_visible (self->columns[QV_THERMO_COLUMN_TREATED], FALSE);

  self->store = g_list_store_new (QV_TYPE_THERMO_ROW);
  self->sorted = gtk_sort_list_model_new (G_LIST_MODEL (g_object_ref (self->store)),
                                          g_object_ref (gtk_column_view_get_sorter (self->column_view)));
  self->selection = gtk_single_selection_new (G_LIST_MODEL (g_object_ref (self->sorted)));
  gtk_single_selection_set_autoselect (self->selection, FALSE);
  gtk_single_selection_set_can_unselect (self->selection, TRUE);
  gtk_column_view_set_model (self->column_view, GTK_SELECTION_MODEL (self->selection));
  g_signal_connect_object (self->selection, "notify::selected-item", G_CALLBACK (selection_changed), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect (self->column_view, "activate", G_CALLBACK (row_activated), self);

  gtk_drawing_area_set_draw_func (self->plot_area, draw_plot, self, NULL);
  controller = gtk_event_controller_motion_new ();
  g_signal_connect (controller, "motion", G_CALLBACK (plot_motion), self);
  g_signal_connect (controller, "leave", G_CALLBACK (plot_leave), self);
  gtk_widget_add_controller (GTK_WIDGET (self->plot_area), controller);
  click = gtk_gesture_click_new ();
  g_signal_connect (click, "pressed", G_CALLBACK (plot_pressed), self);
  gtk_widget_add_controller (GTK_WIDGET (self->plot_area), GTK_EVENT_CONTROLLER (click));

  g_signal_connect_swapped (self->temperature_spin, "value-changed", G_CALLBACK (temperature_changed), self);
  g_signal_connect_swapped (self->state_dropdown, "notify::selected", G_CALLBACK (state_changed), self);
  g_signal_connect_swapped (self->pressure_spin, "value-changed", G_CALLBACK (options_changed), self);
  g_signal_connect_swapped (self->soft_dropdown, "notify::selected", G_CALLBACK (soft_changed), self);
  g_signal_connect_swapped (self->soft_param_spin, "value-changed", G_CALLBACK (soft_param_changed), self);
  g_signal_connect_swapped (self->sigma_spin, "value-changed", G_CALLBACK (sigma_changed), self);
  g_signal_connect_swapped (self->sigma_reset, "clicked", G_CALLBACK (sigma_reset_clicked), self);
  g_signal_connect_swapped (self->scale_spin, "value-changed", G_CALLBACK (scale_changed), self);
  g_signal_connect_swapped (self->save_button, "clicked", G_CALLBACK (save_clicked), self);
  update_sigma_label (self);
  gtk_stack_set_visible_child_name (self->page_stack, "modes");
  show_status (self, _("No document."));
}
