/* qv-mode-panel.c — the side list of modes.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-config.h"
#include <math.h>
#include "qv-mode-item.h"
#include "qv-mode-list.h"
#include "qv-mode-panel.h"
#include "qv-preferences.h"

/* COL_SYMMETRY is shown after the wavenumber; the numbers keep their
 * indices (qv_mode_panel_cell_text). */
enum { COL_INDEX, COL_WAVENUMBER, COL_MASS, COL_TURNING, COL_DISPLACEMENT, COL_SYMMETRY, N_COLUMNS };

struct _QvModePanel
{
  GtkWidget parent_instance;

  GtkWidget *box;
  GtkLabel *formula_label;
  GtkLabel *facts_label;
  GtkLabel *symmetry_label;
  GtkBox *warnings_box;
  GtkSpinButton *level_spin;
  GtkAdjustment *level_adjustment;
  GtkLabel *count_label;
  GtkColumnView *column_view;
  GtkColumnViewColumn *columns[N_COLUMNS];

  QvDocument *document;
  QvModeList *store;
  GtkSortListModel *sorted;
  GtkSliceListModel *slice;     /* the rows shown: all but just after a new document */
  guint grow_id;
  GtkSingleSelection *selection;
  guint level;
  QvFrequencyUnit unit;
  int selected;
};

G_DEFINE_FINAL_TYPE (QvModePanel, qv_mode_panel, GTK_TYPE_WIDGET)

enum { PROP_0, PROP_LEVEL, PROP_SELECTED, PROP_UNIT, N_PROPS };
static GParamSpec *props[N_PROPS];

/* Column properties: what the cell shows and the sorter compares. */
static const char *const column_property[N_COLUMNS] = {
  "index", "wavenumber", "reduced-mass", "turning-q", "max-displacement", "symmetry-order",
};

static char *
format_cell (QvModePanel *self, QvModeItem *item, guint column)
{
  double v;

  switch (column)
    {
    case COL_INDEX: return g_strdup_printf ("%u", qv_mode_item_get_index (item) + 1);
    case COL_WAVENUMBER: return qv_mode_item_format_wavenumber (item, self->unit);
    case COL_MASS: return g_strdup_printf ("%.3f", qv_mode_item_get_reduced_mass (item));
    case COL_TURNING:
      v = qv_mode_item_get_turning_q (item);
      /* No turning point: imaginary or zero mode. */
      return isnan (v) ? g_strdup ("—") : g_strdup_printf ("%.4f", v);
    case COL_DISPLACEMENT:
      v = qv_mode_item_get_max_displacement (item);
      return isnan (v) ? g_strdup ("—") : g_strdup_printf ("%.4f", v);
    case COL_SYMMETRY:
      /* No point group (periodic, too large): a dash, as for no turning point. */
      return g_strdup (qv_mode_item_get_symmetry (item)[0] ? qv_mode_item_get_symmetry (item) : "—");
    default: return g_strdup ("");
    }
}

/* ---- cells ---- */

typedef struct {
  QvModePanel *panel;
  guint column;
} CellKind;

static void
cell_setup (GtkSignalListItemFactory *factory, GtkListItem *list_item, gpointer data)
{
  CellKind *kind = data;
  GtkWidget *label = gtk_label_new (NULL);

  gtk_label_set_xalign (GTK_LABEL (label), kind->column == COL_INDEX ? 0.0f
                                           : kind->column == COL_SYMMETRY ? 0.5f : 1.0f);
  if (kind->column != COL_SYMMETRY)
    gtk_widget_add_css_class (label, "numeric");
  gtk_list_item_set_child (list_item, label);
}

static void
cell_update (GtkListItem *list_item, GParamSpec *pspec, CellKind *kind)
{
  GtkWidget *label = gtk_list_item_get_child (list_item);
  QvModeItem *item = gtk_list_item_get_item (list_item);
  g_autofree char *text = NULL;

  if (item == NULL || label == NULL)
    return;
  text = format_cell (kind->panel, item, kind->column);
  gtk_label_set_label (GTK_LABEL (label), text);
  if (kind->column == COL_WAVENUMBER)
    {
      if (qv_mode_item_get_imaginary (item))
        gtk_widget_add_css_class (label, "imaginary");
      else
        gtk_widget_remove_css_class (label, "imaginary");
    }
}

static void
item_notify (QvModeItem *item, GParamSpec *pspec, GtkListItem *list_item)
{
  CellKind *kind = g_object_get_data (G_OBJECT (list_item), "qv-cell-kind");
  if (kind)
    cell_update (list_item, NULL, kind);
}

static void
cell_bind (GtkSignalListItemFactory *factory, GtkListItem *list_item, gpointer data)
{
  QvModeItem *item = gtk_list_item_get_item (list_item);

  g_object_set_data (G_OBJECT (list_item), "qv-cell-kind", data);
  cell_update (list_item, NULL, data);
  g_signal_connect_object (item, "notify", G_CALLBACK (item_notify), list_item, 0);
}

static void
cell_unbind (GtkSignalListItemFactory *factory, GtkListItem *list_item, gpointer data)
{
  QvModeItem *item = gtk_list_item_get_item (list_item);

  if (item)
    g_signal_handlers_disconnect_by_func (item, item_notify, list_item);
}

static void
refresh_cells (QvModePanel *self)
{
  /* Re-sort when the values under the active sorter changed. */
  GtkSorter *sorter = gtk_column_view_get_sorter (self->column_view);
  if (sorter)
    gtk_sorter_changed (sorter, GTK_SORTER_CHANGE_DIFFERENT);
}

static void
update_titles (QvModePanel *self)
{
  const char *unit = self->unit == QV_FREQUENCY_THZ ? _("THz")
                     : self->unit == QV_FREQUENCY_MEV ? _("meV") : _("cm⁻¹");
  /* TRANSLATORS: column title, %s is the unit (cm⁻¹, THz, meV) */
  g_autofree char *freq = g_strdup_printf (_("Freq. (%s)"), unit);
  /* TRANSLATORS: column title: the classical turning point in u½ Å */
  g_autofree char *tp = g_strdup (_("Q tp (u½Å)"));
  /* TRANSLATORS: column title: the largest atomic displacement in Å */
  g_autofree char *disp = g_strdup (_("Max (Å)"));

  gtk_column_view_column_set_title (self->columns[COL_WAVENUMBER], freq);
  gtk_column_view_column_set_title (self->columns[COL_TURNING], tp);
  gtk_column_view_column_set_title (self->columns[COL_DISPLACEMENT], disp);
}

static void
add_column (QvModePanel *self, guint column, const char *title, const char *tooltip)
{
  GtkListItemFactory *factory = gtk_signal_list_item_factory_new ();
  CellKind *kind = g_new0 (CellKind, 1);
  GtkExpression *expr;
  GtkSorter *sorter;
  GtkColumnViewColumn *col;

  kind->panel = self;
  kind->column = column;
  g_signal_connect_data (factory, "setup", G_CALLBACK (cell_setup), kind, (GClosureNotify) (void (*) (void)) g_free, 0);
  g_signal_connect (factory, "bind", G_CALLBACK (cell_bind), kind);
  g_signal_connect (factory, "unbind", G_CALLBACK (cell_unbind), kind);
  col = gtk_column_view_column_new (title, factory);
  /* Numbers sort as numbers, not as text. */
  expr = gtk_property_expression_new (QV_TYPE_MODE_ITEM, NULL, column_property[column]);
  sorter = GTK_SORTER (gtk_numeric_sorter_new (expr));
  gtk_column_view_column_set_sorter (col, sorter);
  g_object_unref (sorter);
  gtk_column_view_column_set_expand (col, column != COL_INDEX && column != COL_SYMMETRY);
  gtk_column_view_column_set_resizable (col, column != COL_INDEX);
  if (column == COL_SYMMETRY)
    gtk_column_view_insert_column (self->column_view, 2, col);
  else
    gtk_column_view_append_column (self->column_view, col);
  self->columns[column] = col;
  g_object_unref (col);
  (void) tooltip;
}

/* ---- summary ---- */

static void
clear_box (GtkBox *box)
{
  GtkWidget *child;
  while ((child = gtk_widget_get_first_child (GTK_WIDGET (box))) != NULL)
    gtk_box_remove (box, child);
}

/* "Point group C2v · symmetry number 2", or why there is none. */
static void
update_symmetry (QvModePanel *self)
{
  const QvDocumentAnalysis *a = self->document ? qv_document_get_analysis (self->document) : NULL;
  g_autofree char *text = NULL;
  gsize broken = 0;

  if (a == NULL)
    {
      gtk_label_set_label (self->symmetry_label, "");
      gtk_widget_set_visible (GTK_WIDGET (self->symmetry_label), FALSE);
      return;
    }
  if (a->group == NULL)
    /* TRANSLATORS: %s is the core's reason, e.g. for a periodic structure */
    text = g_strdup_printf (_("No point group: %s"), a->group_note ? a->group_note : "");
  else
    {
      for (gsize k = 0; a->symmetry && k < a->symmetry->n_modes; k++)
        broken += !a->symmetry->modes[k].defined;
      /* TRANSLATORS: "Point group C2v · symmetry number 2 · tolerance 0.01 Å" */
      g_autofree char *name = qv_document_analysis_display (a->group->name);
      text = g_strdup_printf (_("Point group %s · symmetry number %u · tolerance %g Å"),
                              name, a->group->symmetry_number, a->group->tolerance);
      if (broken && a->symmetry->table)
        {
          g_autofree char *head = g_steal_pointer (&text);
          g_autofree char *tail = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE,
                                                                "%zu mode without a whole species (?)",
                                                                "%zu modes without a whole species (?)",
                                                                broken), broken);
          text = g_strdup_printf ("%s · %s", head, tail);
        }
      else if (a->symmetry && a->symmetry->table == NULL)
        {
          g_autofree char *head = g_steal_pointer (&text);
          text = g_strdup_printf ("%s · %s", head, _("no character table: modes not labelled"));
        }
    }
  gtk_label_set_label (self->symmetry_label, text);
  gtk_widget_set_visible (GTK_WIDGET (self->symmetry_label), TRUE);
}

static void
update_summary (QvModePanel *self)
{
  const QvStructure *s;
  const QvModeSet *m;
  g_autofree char *formula = NULL;
  g_autofree char *atoms = NULL;
  g_autofree char *projection = NULL;
  g_autofree char *facts = NULL;
  g_autofree char *count = NULL;
  g_auto(GStrv) warnings = NULL;
  gsize n_imag;

  clear_box (self->warnings_box);
  update_symmetry (self);
  if (self->document == NULL)
    {
      gtk_label_set_label (self->formula_label, "");
      gtk_label_set_label (self->facts_label, "");
      gtk_label_set_label (self->count_label, "");
      gtk_widget_set_visible (GTK_WIDGET (self->warnings_box), FALSE);
      return;
    }
  s = qv_document_get_structure (self->document);
  m = qv_document_get_modes (self->document);
  formula = qv_structure_formula (s);
  gtk_label_set_label (self->formula_label, formula);

  atoms = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "%zu atom", "%zu atoms", s->n_atoms), s->n_atoms);
  if (!m->has_hessian)
    projection = g_strdup (_("modes given in the file"));
  else if (m->projection == QV_PROJECTION_NONE)
    projection = g_strdup (_("no rigid-body projection"));
  else
    /* TRANSLATORS: "projection removed 3 translations, 3 rotations" */
    projection = g_strdup_printf (_("projection removed %u translations, %u rotations"),
                                  m->n_translations, m->n_rotations);
  facts = g_strdup_printf ("%s · %s", atoms, projection);
  gtk_label_set_label (self->facts_label, facts);

  n_imag = qv_mode_set_count_imaginary (m);
  count = n_imag
          ? g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "%zu modes, %zu imaginary", "%zu modes, %zu imaginary",
                                          m->n_modes), m->n_modes, n_imag)
          : g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "%zu mode", "%zu modes", m->n_modes), m->n_modes);
  gtk_label_set_label (self->count_label, count);

  /* The core words each warning with what it means. */
  warnings = qv_mode_set_warnings (m);
  for (char **w = warnings; w && *w; w++)
    {
      /* One wrapping label per warning, the sign in its text. */
      g_autofree char *text = g_strdup_printf ("⚠ %s", *w);
      GtkWidget *label = gtk_label_new (text);
      gtk_label_set_wrap (GTK_LABEL (label), TRUE);
      /* The summary sits in a scroller that asks for its content's
       * natural height measured without a width: a natural width just
       * under the panel's narrowest content (420 px less padding) keeps
       * that height close to the placed one. */
      gtk_label_set_max_width_chars (GTK_LABEL (label), 46);
      gtk_label_set_xalign (GTK_LABEL (label), 0.0f);
      gtk_box_append (self->warnings_box, label);
    }
  gtk_widget_set_visible (GTK_WIDGET (self->warnings_box), warnings && warnings[0]);
}

/* ---- selection ---- */

static void
selection_changed (QvModePanel *self)
{
  QvModeItem *item = gtk_single_selection_get_selected_item (self->selection);
  const int k = item ? (int) qv_mode_item_get_index (item) : -1;

  if (k != self->selected)
    {
      self->selected = k;
      g_object_notify_by_pspec (G_OBJECT (self), props[PROP_SELECTED]);
    }
}

static GtkWidget *
list_view_of (GtkColumnView *view)
{
  for (GtkWidget *c = gtk_widget_get_first_child (GTK_WIDGET (view)); c; c = gtk_widget_get_next_sibling (c))
    if (GTK_IS_LIST_VIEW (c))
      return c;
  return NULL;
}

static void
select_position (QvModePanel *self, guint position)
{
  GtkWidget *list = list_view_of (self->column_view);

  if (position >= g_list_model_get_n_items (G_LIST_MODEL (self->slice)))
    {
      g_clear_handle_id (&self->grow_id, g_source_remove);
      gtk_slice_list_model_set_size (self->slice, G_MAXUINT);
    }
  gtk_single_selection_set_selected (self->selection, position);
  /* gtk_column_view_scroll_to is 4.12: the list's own action scrolls and
   * moves the focus onto the row. */
  if (list && gtk_widget_get_mapped (list))
    gtk_widget_activate_action (list, "list.scroll-to-item", "u", position);
}

void
qv_mode_panel_select (QvModePanel *self, int index)
{
  const guint n = g_list_model_get_n_items (G_LIST_MODEL (self->sorted));
  GtkSorter *sorter = gtk_column_view_get_sorter (self->column_view);

  if (n == 0)
    return;
  index = CLAMP (index, 0, (int) n - 1);
  /* Unsorted, row and mode agree: no item needs to be made. */
  if (sorter == NULL || gtk_sorter_get_order (sorter) == GTK_SORTER_ORDER_NONE)
    {
      select_position (self, (guint) index);
      return;
    }
  for (guint p = 0; p < n; p++)
    {
      g_autoptr(QvModeItem) item = g_list_model_get_item (G_LIST_MODEL (self->sorted), p);
      if ((int) qv_mode_item_get_index (item) == index)
        {
          select_position (self, p);
          return;
        }
    }
}

void
qv_mode_panel_step (QvModePanel *self, int delta)
{
  const guint n = g_list_model_get_n_items (G_LIST_MODEL (self->sorted));
  guint p = gtk_single_selection_get_selected (self->selection);
  int next;

  if (n == 0)
    return;
  next = p == GTK_INVALID_LIST_POSITION ? 0 : (int) p + delta;
  select_position (self, (guint) CLAMP (next, 0, (int) n - 1));
}

int
qv_mode_panel_get_selected (QvModePanel *self)
{
  return self->selected;
}

/* ---- document and level ---- */

#define FIRST_ROWS 40

static gboolean
grow_slice (gpointer data)
{
  QvModePanel *self = data;

  self->grow_id = 0;
  gtk_slice_list_model_set_size (self->slice, G_MAXUINT);
  return G_SOURCE_REMOVE;
}

void
qv_mode_panel_set_document (QvModePanel *self, QvDocument *doc)
{
  g_set_object (&self->document, doc);
  /* Rows come from the worker (qv_document_get_rows); items are made as
   * the list shows them. */
  /* A list view that has not been laid out yet makes up to 200 rows of
   * widgets: show the first rows, and the rest once rows have a height. */
  gtk_slice_list_model_set_size (self->slice, FIRST_ROWS);
  qv_mode_list_set_document (self->store, doc, self->level);
  if (self->grow_id == 0)
    self->grow_id = g_timeout_add_full (G_PRIORITY_LOW, 100, grow_slice, self, NULL);
  update_summary (self);
  selection_changed (self);
}

guint
qv_mode_panel_get_level (QvModePanel *self)
{
  return self->level;
}

void
qv_mode_panel_set_level (QvModePanel *self, guint level)
{
  level = MIN (level, 50);
  if (level == self->level)
    return;
  self->level = level;
  qv_mode_list_set_level (self->store, level);
  gtk_adjustment_set_value (self->level_adjustment, level);
  update_titles (self);
  refresh_cells (self);
  g_object_notify_by_pspec (G_OBJECT (self), props[PROP_LEVEL]);
}

static void
level_spin_changed (QvModePanel *self)
{
  qv_mode_panel_set_level (self, (guint) gtk_spin_button_get_value_as_int (self->level_spin));
}

static void
set_unit (QvModePanel *self, QvFrequencyUnit unit)
{
  if (unit == self->unit)
    return;
  self->unit = unit;
  update_titles (self);
  /* Rows show new text: rebind the cells of the items made so far. */
  qv_mode_list_notify_all (self->store, "wavenumber");
  g_object_notify_by_pspec (G_OBJECT (self), props[PROP_UNIT]);
}

GListModel *
qv_mode_panel_get_rows (QvModePanel *self)
{
  return G_LIST_MODEL (self->sorted);
}

char *
qv_mode_panel_cell_text (QvModePanel *self, guint row, guint column)
{
  g_autoptr(QvModeItem) item = g_list_model_get_item (G_LIST_MODEL (self->sorted), row);

  return item && column < N_COLUMNS ? format_cell (self, item, column) : NULL;
}

const char *
qv_mode_panel_get_symmetry_summary (QvModePanel *self)
{
  return gtk_label_get_label (self->symmetry_label);
}

void
qv_mode_panel_sort_by (QvModePanel *self, guint column, gboolean ascending)
{
  g_return_if_fail (column < N_COLUMNS);
  gtk_column_view_sort_by_column (self->column_view, self->columns[column],
                                  ascending ? GTK_SORT_ASCENDING : GTK_SORT_DESCENDING);
}

/* ---- GObject ---- */

static void
qv_mode_panel_get_property (GObject *object, guint prop_id, GValue *value, GParamSpec *pspec)
{
  QvModePanel *self = QV_MODE_PANEL (object);

  switch (prop_id)
    {
    case PROP_LEVEL: g_value_set_uint (value, self->level); break;
    case PROP_SELECTED: g_value_set_int (value, self->selected); break;
    case PROP_UNIT: g_value_set_enum (value, self->unit); break;
    default: G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
qv_mode_panel_set_property (GObject *object, guint prop_id, const GValue *value, GParamSpec *pspec)
{
  QvModePanel *self = QV_MODE_PANEL (object);

  switch (prop_id)
    {
    case PROP_LEVEL: qv_mode_panel_set_level (self, g_value_get_uint (value)); break;
    case PROP_SELECTED: qv_mode_panel_select (self, g_value_get_int (value)); break;
    case PROP_UNIT: set_unit (self, (QvFrequencyUnit) g_value_get_enum (value)); break;
    default: G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static gboolean
qv_mode_panel_grab_focus (GtkWidget *widget)
{
  QvModePanel *self = QV_MODE_PANEL (widget);
  return gtk_widget_grab_focus (GTK_WIDGET (self->column_view));
}

static void
qv_mode_panel_dispose (GObject *object)
{
  QvModePanel *self = QV_MODE_PANEL (object);

  g_clear_object (&self->document);
  g_clear_handle_id (&self->grow_id, g_source_remove);
  gtk_widget_dispose_template (GTK_WIDGET (self), QV_TYPE_MODE_PANEL);
  g_clear_object (&self->selection);
  g_clear_object (&self->slice);
  g_clear_object (&self->sorted);
  g_clear_object (&self->store);
  G_OBJECT_CLASS (qv_mode_panel_parent_class)->dispose (object);
}

static void
qv_mode_panel_class_init (QvModePanelClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->get_property = qv_mode_panel_get_property;
  object_class->set_property = qv_mode_panel_set_property;
  object_class->dispose = qv_mode_panel_dispose;
  widget_class->grab_focus = qv_mode_panel_grab_focus;

  props[PROP_LEVEL] = g_param_spec_uint ("level", NULL, NULL, 0, 50, 0,
                                         G_PARAM_READWRITE | G_PARAM_STATIC_STRINGS | G_PARAM_EXPLICIT_NOTIFY);
  props[PROP_SELECTED] = g_param_spec_int ("selected", NULL, NULL, -1, G_MAXINT, -1,
                                           G_PARAM_READWRITE | G_PARAM_STATIC_STRINGS | G_PARAM_EXPLICIT_NOTIFY);
  props[PROP_UNIT] = g_param_spec_enum ("unit", NULL, NULL, QV_TYPE_FREQUENCY_UNIT, QV_FREQUENCY_CM1,
                                        G_PARAM_READWRITE | G_PARAM_STATIC_STRINGS | G_PARAM_EXPLICIT_NOTIFY);
  g_object_class_install_properties (object_class, N_PROPS, props);

  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "qvmodepanel");
  gtk_widget_class_set_template_from_resource (widget_class, "/org/quaverlab/Quaver/gui/qv-mode-panel.ui");
  gtk_widget_class_bind_template_child (widget_class, QvModePanel, box);
  gtk_widget_class_bind_template_child (widget_class, QvModePanel, formula_label);
  gtk_widget_class_bind_template_child (widget_class, QvModePanel, facts_label);
  gtk_widget_class_bind_template_child (widget_class, QvModePanel, symmetry_label);
  gtk_widget_class_bind_template_child (widget_class, QvModePanel, warnings_box);
  gtk_widget_class_bind_template_child (widget_class, QvModePanel, level_spin);
  gtk_widget_class_bind_template_child (widget_class, QvModePanel, level_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvModePanel, count_label);
  gtk_widget_class_bind_template_child (widget_class, QvModePanel, column_view);
}

static void
qv_mode_panel_init (QvModePanel *self)
{
  gtk_widget_init_template (GTK_WIDGET (self));
  self->selected = -1;
  self->unit = QV_FREQUENCY_CM1;

  add_column (self, COL_INDEX, _("#"), NULL);
  add_column (self, COL_WAVENUMBER, _("Frequency"), NULL);
  add_column (self, COL_MASS, _("μ (u)"), NULL);
  add_column (self, COL_TURNING, _("Q tp"), NULL);
  add_column (self, COL_DISPLACEMENT, _("Largest"), NULL);
  /* TRANSLATORS: column title: the mode's symmetry species (irreducible representation) */
  add_column (self, COL_SYMMETRY, _("Sym."), NULL);
  update_titles (self);

  self->store = qv_mode_list_new ();
  self->sorted = gtk_sort_list_model_new (G_LIST_MODEL (g_object_ref (self->store)),
                                          g_object_ref (gtk_column_view_get_sorter (self->column_view)));
  self->slice = gtk_slice_list_model_new (G_LIST_MODEL (g_object_ref (self->sorted)), 0, G_MAXUINT);
  self->selection = gtk_single_selection_new (G_LIST_MODEL (g_object_ref (self->slice)));
  gtk_single_selection_set_autoselect (self->selection, TRUE);
  gtk_column_view_set_model (self->column_view, GTK_SELECTION_MODEL (self->selection));
  g_signal_connect_object (self->selection, "notify::selected-item", G_CALLBACK (selection_changed), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->level_spin, "value-changed", G_CALLBACK (level_spin_changed), self,
                           G_CONNECT_SWAPPED);
}
