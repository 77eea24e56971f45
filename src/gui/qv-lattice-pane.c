/* qv-lattice-pane.c — the lattice plots of a crystal document.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-config.h"
#include <math.h>
#include <string.h>
#include "qv-dispersion-plot.h"
#include "qv-dos-plot.h"
#include "qv-element.h"
#include "qv-phonon-table.h"
#include "qv-thermal-plot.h"
#include "qv-error.h"
#include "qv-error-dialog.h"
#include "qv-lattice-pane.h"
#include "qv-output.h"
#include "qv-png-writer.h"
#include "qv-preferences.h"

struct _QvLatticePane
{
  GtkWidget parent_instance;

  GtkWidget *box;
  GtkLabel *info_label;
  GtkStack *plot_stack;
  GtkDrawingArea *dispersion_area;
  GtkDrawingArea *dos_area;
  GtkDrawingArea *thermal_area;
  GtkLabel *readout_label;
  GtkSpinButton *cells_spin;
  GtkLabel *selection_label;
  GtkButton *save_button;

  QvDocument *document;
  const QvDocumentLattice *lattice;   /* the document's */
  int selected_q, selected_branch;
  int hover_q, hover_branch;
  gboolean dos_hover, thermal_hover;
  double dos_hover_frequency, thermal_hover_t;
  QvFrequencyUnit unit;
};

G_DEFINE_FINAL_TYPE (QvLatticePane, qv_lattice_pane, GTK_TYPE_WIDGET)

enum { PROP_0, PROP_CELLS, PROP_UNIT, N_PROPS };
static GParamSpec *props[N_PROPS];
enum { MODE_ACTIVATED, N_SIGNALS };
static guint signals[N_SIGNALS];

static gboolean
has_bands (QvLatticePane *self)
{
  return self->lattice && self->lattice->bands;
}

static char *describe_dos (QvLatticePane *self, double x, double y);
static char *describe_thermal (QvLatticePane *self, double x, double y);

/* ---- the dispersion ---- */

static void
dispersion_options (QvLatticePane *self, int width, int height, QvDispersionPlotOptions *o)
{
  qv_dispersion_plot_options_init (o);
  o->width = MAX (width, 1);
  o->height = MAX (height, 1);
  o->unit = self->unit;
  o->selected_q = self->selected_q;
  o->selected_branch = self->selected_branch;
  o->hover_q = self->hover_q;
  o->hover_branch = self->hover_branch;
}

static void
live_dispersion_options (QvLatticePane *self, QvDispersionPlotOptions *o)
{
  dispersion_options (self, gtk_widget_get_width (GTK_WIDGET (self->dispersion_area)),
                      gtk_widget_get_height (GTK_WIDGET (self->dispersion_area)), o);
}

static void
draw_dispersion (GtkDrawingArea *area, cairo_t *cr, int width, int height, gpointer data)
{
  QvLatticePane *self = data;
  QvDispersionPlotOptions o;

  if (!has_bands (self))
    return;
  dispersion_options (self, width, height, &o);
  /* The plot's own paper colours in both styles: a figure, as exported. */
  qv_dispersion_plot_draw (cr, self->lattice->sampling, self->lattice->n_branches,
                           self->lattice->bands, &o);
}

static gboolean
hit (QvLatticePane *self, double x, double y, gsize *k, gsize *b)
{
  QvDispersionPlotOptions o;

  if (!has_bands (self))
    return FALSE;
  live_dispersion_options (self, &o);
  o.selected_q = o.hover_q = -1;
  return qv_dispersion_plot_hit (self->lattice->sampling, self->lattice->n_branches,
                                 self->lattice->bands, &o, x, y, QV_LATTICE_PANE_HIT_TOLERANCE,
                                 k, b);
}

static const char *
unit_text (QvFrequencyUnit unit)
{
  return unit == QV_FREQUENCY_THZ ? _("THz") : unit == QV_FREQUENCY_MEV ? _("meV") : _("cm⁻¹");
}

/* "q = (0.500 0.000 0.500) near X · branch 3 · 165.97 cm⁻¹" */
static char *
describe (QvLatticePane *self, gsize k, gsize b)
{
  const QvBandSampling *s = self->lattice->sampling;
  const double w = self->lattice->bands[k * self->lattice->n_branches + b];
  const double v = qv_frequency_from_wavenumber (fabs (w), self->unit);
  g_autofree char *label = NULL;

  for (gsize i = 0; i < s->n_labels; i++)
    if (s->label_index[i] == k)
      label = qv_dispersion_plot_label_text (s->labels[i]);
  /* TRANSLATORS: a point of the dispersion: q in reciprocal lattice units,
   * an optional high-symmetry label, the branch and its frequency; "i"
   * marks an imaginary frequency */
  return g_strdup_printf (_("q = (%.3f %.3f %.3f)%s%s · branch %u · %.2f%s %s"),
                          s->q[3 * k] + 0.0, s->q[3 * k + 1] + 0.0, s->q[3 * k + 2] + 0.0,
                          label ? " " : "", label ? label : "", (guint) b + 1, v,
                          w < 0 ? "i" : "", unit_text (self->unit));
}

char *
qv_lattice_pane_describe_point (QvLatticePane *self, double x, double y)
{
  const char *page = gtk_stack_get_visible_child_name (self->plot_stack);
  gsize k, b;

  if (g_strcmp0 (page, "dos") == 0)
    return describe_dos (self, x, y);
  if (g_strcmp0 (page, "thermal") == 0)
    return describe_thermal (self, x, y);
  if (!hit (self, x, y, &k, &b))
    return g_strdup ("");
  return describe (self, k, b);
}

static void
update_selection_label (QvLatticePane *self)
{
  g_autofree char *text = NULL;

  if (has_bands (self) && self->selected_q >= 0)
    text = describe (self, (gsize) self->selected_q, (gsize) self->selected_branch);
  gtk_label_set_label (self->selection_label, "");
  gtk_widget_set_tooltip_text (GTK_WIDGET (self->selection_label), text);
  gtk_label_set_label (self->readout_label, text ? text : _("Click a branch to show its lattice mode; arrow keys step along the path and between branches"));
}

static void
motion (GtkEventControllerMotion *controller, double x, double y, gpointer data)
{
  QvLatticePane *self = data;
  gsize k = 0, b = 0;
  const gboolean on = hit (self, x, y, &k, &b);
  const int hk = on ? (int) k : -1, hb = on ? (int) b : -1;

  if (hk == self->hover_q && hb == self->hover_branch)
    return;
  self->hover_q = hk;
  self->hover_branch = hb;
  if (on)
    {
      g_autofree char *text = describe (self, k, b);
      gtk_label_set_label (self->readout_label, text);
    }
  else
    update_selection_label (self);
  gtk_widget_queue_draw (GTK_WIDGET (self->dispersion_area));
}

static void
leave (GtkEventControllerMotion *controller, gpointer data)
{
  QvLatticePane *self = data;

  self->hover_q = self->hover_branch = -1;
  update_selection_label (self);
  gtk_widget_queue_draw (GTK_WIDGET (self->dispersion_area));
}

static void
activate (QvLatticePane *self, int k, int b)
{
  qv_lattice_pane_set_selected (self, k, b);
  g_signal_emit (self, signals[MODE_ACTIVATED], 0, k, b);
}

gboolean
qv_lattice_pane_click (QvLatticePane *self, double x, double y)
{
  gsize k, b;

  if (!hit (self, x, y, &k, &b))
    return FALSE;
  activate (self, (int) k, (int) b);
  return TRUE;
}

static void
pressed (GtkGestureClick *gesture, int n_press, double x, double y, gpointer data)
{
  QvLatticePane *self = data;

  gtk_widget_grab_focus (GTK_WIDGET (self->dispersion_area));
  qv_lattice_pane_click (self, x, y);
}

/* Left/Right walk along the path, Up/Down change branch (by frequency at
 * that q: the connected order is ascending only at the path's start). */
static gboolean
key_pressed (GtkEventControllerKey *controller, guint keyval, guint keycode,
             GdkModifierType state, gpointer data)
{
  QvLatticePane *self = data;
  int k = self->selected_q, b = self->selected_branch;
  const int nq = has_bands (self) ? (int) self->lattice->sampling->n_q : 0;
  const int nb = has_bands (self) ? (int) self->lattice->n_branches : 0;

  if (nq == 0)
    return FALSE;
  if (k < 0)
    {
      k = 0;
      b = 0;
    }
  switch (keyval)
    {
    case GDK_KEY_Left: k = MAX (k - ((state & GDK_SHIFT_MASK) ? 10 : 1), 0); break;
    case GDK_KEY_Right: k = MIN (k + ((state & GDK_SHIFT_MASK) ? 10 : 1), nq - 1); break;
    case GDK_KEY_Up:
    case GDK_KEY_Down:
      {
        /* the nearest branch above (below) at this q */
        const double *w = self->lattice->bands + (gsize) k * (gsize) nb;
        const gboolean up = keyval == GDK_KEY_Up;
        int best = -1;
        for (int j = 0; j < nb; j++)
          if (j != b && (up ? w[j] >= w[b] : w[j] <= w[b]))
            if (best < 0 || (up ? w[j] < w[best] : w[j] > w[best]))
              best = j;
        if (best < 0)
          return TRUE;
        b = best;
        break;
      }
    case GDK_KEY_Home: k = 0; break;
    case GDK_KEY_End: k = nq - 1; break;
    default: return FALSE;
    }
  activate (self, k, b);
  return TRUE;
}

/* ---- the density of states and the thermal properties ---- */

static void
dos_options (QvLatticePane *self, int width, int height, QvDosPlotOptions *o)
{
  qv_dos_plot_options_init (o);
  o->width = MAX (width, 1);
  o->height = MAX (height, 1);
  o->unit = self->unit;
  o->has_hover = self->dos_hover;
  o->hover_frequency = self->dos_hover_frequency;
}

static void
thermal_options (QvLatticePane *self, int width, int height, QvThermalPlotOptions *o)
{
  qv_thermal_plot_options_init (o);
  o->width = MAX (width, 1);
  o->height = MAX (height, 1);
  o->formula_units = self->lattice ? self->lattice->formula_units : 1;
  o->has_hover = self->thermal_hover;
  o->hover_t = self->thermal_hover_t;
}

static void
draw_dos (GtkDrawingArea *area, cairo_t *cr, int width, int height, gpointer data)
{
  QvLatticePane *self = data;
  QvDosPlotOptions o;

  if (self->lattice == NULL || self->lattice->dos == NULL)
    return;
  dos_options (self, width, height, &o);
  qv_dos_plot_draw (cr, self->lattice->dos, &o);
}

static void
draw_thermal (GtkDrawingArea *area, cairo_t *cr, int width, int height, gpointer data)
{
  QvLatticePane *self = data;
  QvThermalPlotOptions o;

  if (self->lattice == NULL || self->lattice->thermal == NULL)
    return;
  thermal_options (self, width, height, &o);
  qv_thermal_plot_draw (cr, self->lattice->thermal, &o);
}

/* "312.4 cm⁻¹ · DOS 0.0213 per cm⁻¹ (Na 0.0051, Cl 0.0162)" */
static char *
describe_dos (QvLatticePane *self, double x, double y)
{
  const QvPhononDos *dos = self->lattice ? self->lattice->dos : NULL;
  QvDosPlotOptions o;
  double f, total;
  g_autofree double *partial = NULL;
  g_autoptr(GString) s = NULL;
  double per;

  if (dos == NULL)
    return g_strdup ("");
  dos_options (self, gtk_widget_get_width (GTK_WIDGET (self->dos_area)),
               gtk_widget_get_height (GTK_WIDGET (self->dos_area)), &o);
  partial = g_new0 (double, MAX (dos->n_groups, 1));
  if (!qv_dos_plot_readout (dos, &o, x, y, &f, &total, partial))
    return g_strdup ("");
  /* states per unit of the axis: per cm⁻¹ times cm⁻¹ per unit */
  per = 1.0 / qv_frequency_from_wavenumber (1.0, self->unit);
  s = g_string_new (NULL);
  /* TRANSLATORS: DOS read-out: frequency, unit, DOS, unit */
  g_string_append_printf (s, _("%.2f %s · DOS %.4g per %s"),
                          qv_frequency_from_wavenumber (f, self->unit), unit_text (self->unit),
                          total * per, unit_text (self->unit));
  if (dos->n_groups > 1)
    {
      g_string_append (s, " (");
      for (gsize g = 0; g < dos->n_groups; g++)
        g_string_append_printf (s, "%s%s %.4g", g ? ", " : "", qv_element_from_z (dos->z[g])->symbol,
                                partial[g] * per);
      g_string_append_c (s, ')');
    }
  return g_string_free (g_steal_pointer (&s), FALSE);
}

/* "300 K · F −3.21 kJ/mol · U 9.87 kJ/mol · S 43.7 J/(K mol) · Cv 48.9 J/(K mol)" */
static char *
describe_thermal (QvLatticePane *self, double x, double y)
{
  const QvThermal *th = self->lattice ? self->lattice->thermal : NULL;
  QvThermalPlotOptions o;
  QvThermalPanel panel;
  QvThermalReadout r;

  if (th == NULL)
    return g_strdup ("");
  thermal_options (self, gtk_widget_get_width (GTK_WIDGET (self->thermal_area)),
                   gtk_widget_get_height (GTK_WIDGET (self->thermal_area)), &o);
  if (!qv_thermal_plot_readout (th, &o, x, y, &panel, &r))
    return g_strdup ("");
  /* TRANSLATORS: thermal read-out per mole of formula units */
  return g_strdup_printf (_("%.0f K · F %.3f · U %.3f kJ/mol · S %.3f · Cv %.3f J/(K mol)"), r.t,
                          r.free_energy, r.energy, r.entropy, r.heat_capacity);
}

static void
plot_motion (GtkEventControllerMotion *controller, double x, double y, gpointer data)
{
  QvLatticePane *self = data;
  GtkWidget *area = gtk_event_controller_get_widget (GTK_EVENT_CONTROLLER (controller));
  g_autofree char *text = NULL;

  if (area == GTK_WIDGET (self->dos_area))
    {
      QvDosPlotOptions o;
      double f, total;
      text = describe_dos (self, x, y);
      dos_options (self, gtk_widget_get_width (area), gtk_widget_get_height (area), &o);
      o.has_hover = FALSE;
      self->dos_hover = self->lattice && self->lattice->dos
                        && qv_dos_plot_readout (self->lattice->dos, &o, x, y, &f, &total, NULL);
      self->dos_hover_frequency = self->dos_hover ? f : 0;
    }
  else
    {
      QvThermalPlotOptions o;
      QvThermalPanel panel;
      QvThermalReadout r;
      text = describe_thermal (self, x, y);
      thermal_options (self, gtk_widget_get_width (area), gtk_widget_get_height (area), &o);
      o.has_hover = FALSE;
      self->thermal_hover = self->lattice && self->lattice->thermal
                            && qv_thermal_plot_readout (self->lattice->thermal, &o, x, y, &panel, &r);
      self->thermal_hover_t = self->thermal_hover ? r.t : 0;
    }
  gtk_label_set_label (self->readout_label, text[0] ? text : " ");
  gtk_widget_queue_draw (area);
}

static void
plot_leave (GtkEventControllerMotion *controller, gpointer data)
{
  QvLatticePane *self = data;

  self->dos_hover = self->thermal_hover = FALSE;
  update_selection_label (self);
  gtk_widget_queue_draw (gtk_event_controller_get_widget (GTK_EVENT_CONTROLLER (controller)));
}

/* ---- the pane ---- */

static void
update_info (QvLatticePane *self)
{
  const QvDocumentLattice *l = self->lattice;
  const char *note = self->document ? qv_document_get_lattice_note (self->document) : NULL;
  g_autoptr(GString) s = g_string_new (NULL);

  if (l == NULL)
    {
      gtk_label_set_label (self->info_label, note ? note : _("This document is not a crystal."));
      return;
    }
  {
    const QvSupercellMap *m = l->crystal->map;
    g_autofree char *formula = qv_structure_formula (l->crystal->primitive);
    /* TRANSLATORS: "NaCl · Fm-3m (225) · 2 sites · supercell of 27 cells" */
    g_string_append_printf (s, _("%s · %s · %u sites · supercell of %u cells"), formula,
                            l->space_group ? l->space_group : _("no space group found"),
                            (guint) m->n_primitive, (guint) m->n_cells);
    if (m->matrix[0][1] == 0 && m->matrix[0][2] == 0 && m->matrix[1][0] == 0
        && m->matrix[1][2] == 0 && m->matrix[2][0] == 0 && m->matrix[2][1] == 0)
      g_string_append_printf (s, " (%d×%d×%d)", m->matrix[0][0], m->matrix[1][1],
                              m->matrix[2][2]);
  }
  g_string_append_c (s, '\n');
  if (l->has_conventional)
    {
      const double *c = l->conventional;
      /* TRANSLATORS: spglib's standardised cell: lengths a, b, c, angles α, β, γ, atom count */
      g_string_append_printf (s, _("Conventional cell: %.4f, %.4f, %.4f Å; %.2f°, %.2f°, %.2f°; %u atoms"),
                              c[0], c[1], c[2], c[3], c[4], c[5], (guint) l->conventional_atoms);
      g_string_append_c (s, '\n');
    }
  /* TRANSLATORS: the three acoustic frequencies at Γ before the acoustic
   * sum rule set them to zero; large values mean an unconverged input */
  {
    double a[3];
    /* |x| < 0.005 prints as 0.00, not −0.00 */
    for (int i = 0; i < 3; i++)
      a[i] = fabs (l->crystal->before[i]) < 0.005 ? 0.0 : l->crystal->before[i];
    g_string_append_printf (s, _("Acoustic modes at Γ before the sum rule: %.2f, %.2f, %.2f cm⁻¹"),
                            a[0], a[1], a[2]);
  }
  if (l->crystal->na)
    g_string_append_printf (s, "\n%s", _("Born charges given: LO–TO splitting included"));
  if (l->path_note)
    g_string_append_printf (s, "\n%s", l->path_note);
  if (l->mesh_note)
    g_string_append_printf (s, "\n%s", l->mesh_note);
  if (qv_document_get_masses_edited (self->document))
    /* a mass edit is of one atom of the supercell, which no primitive cell
     * describes (a defect): only the supercell's own modes follow it */
    g_string_append_printf (s, "\n%s", _("⚠ These plots use the masses as loaded: mass edits change the Supercell Modes only."));
  gtk_label_set_label (self->info_label, s->str);
}

void
qv_lattice_pane_set_document (QvLatticePane *self, QvDocument *doc)
{
  /* a mass edit re-solves the document: say what it does not change */
  if (g_set_object (&self->document, doc) && doc)
    g_signal_connect_object (doc, "changed", G_CALLBACK (update_info), self, G_CONNECT_SWAPPED);
  self->lattice = doc ? qv_document_get_lattice (doc) : NULL;
  self->selected_q = self->selected_branch = -1;
  self->hover_q = self->hover_branch = -1;
  if (self->lattice)
    {
      /* a block of about 500 atoms at most, 2 to 4 cells along each vector */
      const double n = (double) self->lattice->crystal->map->n_primitive;
      const int cells = CLAMP ((int) floor (cbrt (500.0 / n)), 1, 4);
      gtk_spin_button_set_value (self->cells_spin, cells);
      /* without a path the dispersion page has nothing to show */
      qv_lattice_pane_show_plot (self, has_bands (self) ? "dispersion" : "dos");
    }
  update_info (self);
  update_selection_label (self);
  gtk_widget_set_sensitive (GTK_WIDGET (self->save_button), self->lattice != NULL);
  gtk_widget_queue_draw (GTK_WIDGET (self->dispersion_area));
  gtk_widget_queue_draw (GTK_WIDGET (self->dos_area));
  gtk_widget_queue_draw (GTK_WIDGET (self->thermal_area));
}

const char *
qv_lattice_pane_get_info (QvLatticePane *self)
{
  return gtk_label_get_label (self->info_label);
}

void
qv_lattice_pane_set_selected (QvLatticePane *self, int q_index, int branch)
{
  if (!has_bands (self) || q_index < 0 || branch < 0
      || (gsize) q_index >= self->lattice->sampling->n_q
      || (gsize) branch >= self->lattice->n_branches)
    q_index = branch = -1;
  self->selected_q = q_index;
  self->selected_branch = branch;
  update_selection_label (self);
  gtk_widget_queue_draw (GTK_WIDGET (self->dispersion_area));
}

void
qv_lattice_pane_get_selected (QvLatticePane *self, int *q_index, int *branch)
{
  *q_index = self->selected_q;
  *branch = self->selected_branch;
}

int
qv_lattice_pane_get_cells (QvLatticePane *self)
{
  return gtk_spin_button_get_value_as_int (self->cells_spin);
}

void
qv_lattice_pane_show_plot (QvLatticePane *self, const char *name)
{
  gtk_stack_set_visible_child_name (self->plot_stack, name);
}

GtkWidget *
qv_lattice_pane_get_dispersion_area (QvLatticePane *self)
{
  return GTK_WIDGET (self->dispersion_area);
}

/* ---- saving ---- */

static void
fill_source (QvLatticePane *self, QvPhononSource *src)
{
  const QvDocumentSource *ds = qv_document_get_source (self->document);
  const QvCrystal *c = self->lattice->crystal;

  memset (src, 0, sizeof *src);
  src->program = "quaver " QV_VERSION;
  src->primitive = qv_document_get_path (self->document);
  src->hessian = ds && ds->bundle_hessian ? ds->bundle_hessian
                 : ds && ds->hessian ? ds->hessian : qv_document_get_path (self->document);
  src->hessian_units = ds && ds->hessian_units ? ds->hessian_units : NULL;
  src->n_sites = c->map->n_primitive;
  src->sum_rule = c->sum_rule;
}

/* The table of the plot shown, in @format. */
static char *
table_of (QvLatticePane *self, const char *page, QvPhononTableFormat format, GError **error)
{
  const QvDocumentLattice *l = self->lattice;
  const QvCrystal *c = l->crystal;

  if (g_strcmp0 (page, "dispersion") == 0)
    {
      QvBandTableInfo info;
      g_autofree char *path = NULL;
      if (!has_bands (self))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s", l->path_note);
          return NULL;
        }
      memset (&info, 0, sizeof info);
      fill_source (self, &info.source);
      memcpy (info.supercell, c->map->matrix, sizeof info.supercell);
      info.n_cells = c->map->n_cells;
      info.lattice = l->path->lattice;
      path = qv_band_path_to_string (l->path);
      info.path = path;
      info.overlap = TRUE;
      memcpy (info.gamma_acoustic, c->before, sizeof info.gamma_acoustic);
      info.row_sum_removed = c->row_sum;
      info.periodicity_residual = c->periodicity;
      return qv_phonon_table_bands (&info, l->sampling, l->n_branches, l->bands, format);
    }
  if (l->dos == NULL || l->thermal == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s", l->mesh_note);
      return NULL;
    }
  if (g_strcmp0 (page, "dos") == 0)
    {
      QvDosTableInfo info;
      memset (&info, 0, sizeof info);
      fill_source (self, &info.source);
      info.n_q = (gsize) l->mesh[0] * (gsize) l->mesh[1] * (gsize) l->mesh[2];
      info.unit = self->unit;
      return qv_phonon_table_dos (&info, l->dos, format);
    }
  {
    QvThermalTableInfo info;
    g_autofree char *formula = qv_structure_formula (c->primitive);
    memset (&info, 0, sizeof info);
    fill_source (self, &info.source);
    memcpy (info.mesh, l->mesh, sizeof info.mesh);
    info.n_q = (gsize) l->mesh[0] * (gsize) l->mesh[1] * (gsize) l->mesh[2];
    info.formula = formula;
    info.formula_units = l->formula_units;
    info.site_z = c->map->z;
    return qv_phonon_table_thermal (&info, l->thermal, format);
  }
}

/* The figure of the plot shown: SVG text or PNG bytes. */
static guint8 *
figure_of (QvLatticePane *self, const char *page, gboolean svg, int width, int height,
           gsize *length, GError **error)
{
  const QvDocumentLattice *l = self->lattice;
  g_autofree guint8 *rgba = NULL;
  const char *text[] = { "Software", "quaver " QV_VERSION, NULL };

  if (g_strcmp0 (page, "dispersion") == 0)
    {
      QvDispersionPlotOptions o;
      if (!has_bands (self))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s", l->path_note);
          return NULL;
        }
      dispersion_options (self, width, height, &o);
      o.hover_q = o.hover_branch = -1;
      if (svg)
        return (guint8 *) qv_dispersion_plot_svg (l->sampling, l->n_branches, l->bands, &o,
                                                  length, error);
      rgba = qv_dispersion_plot_rgba (l->sampling, l->n_branches, l->bands, &o, error);
    }
  else if (l->dos == NULL || l->thermal == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s", l->mesh_note);
      return NULL;
    }
  else if (g_strcmp0 (page, "dos") == 0)
    {
      QvDosPlotOptions o;
      dos_options (self, width, height, &o);
      o.has_hover = FALSE;
      if (svg)
        return (guint8 *) qv_dos_plot_svg (l->dos, &o, length, error);
      rgba = qv_dos_plot_rgba (l->dos, &o, error);
    }
  else
    {
      QvThermalPlotOptions o;
      thermal_options (self, width, height, &o);
      o.has_hover = FALSE;
      if (svg)
        return (guint8 *) qv_thermal_plot_svg (l->thermal, &o, length, error);
      rgba = qv_thermal_plot_rgba (l->thermal, &o, error);
    }
  if (rgba == NULL)
    return NULL;
  return qv_png_encode (rgba, width, height, FALSE, text, length, error);
}

gboolean
qv_lattice_pane_save (QvLatticePane *self, const char *path, gboolean force, GError **error)
{
  const char *dot = strrchr (path, '.');
  const char *page = gtk_stack_get_visible_child_name (self->plot_stack);
  const int width = MAX (gtk_widget_get_width (GTK_WIDGET (self->plot_stack)), 720);
  const int height = MAX (gtk_widget_get_height (GTK_WIDGET (self->plot_stack)), 420);
  g_autofree guint8 *bytes = NULL;
  gsize length = 0;
  static const struct { const char *ext; int format; } kinds[] = {
    { ".csv", QV_PHONON_TABLE_CSV }, { ".json", QV_PHONON_TABLE_JSON },
    { ".txt", QV_PHONON_TABLE_TEXT }, { ".png", -1 }, { ".svg", -2 },
  };
  int kind = 0;

  if (self->lattice == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s", _("This document is not a crystal"));
      return FALSE;
    }
  for (gsize i = 0; dot && i < G_N_ELEMENTS (kinds); i++)
    if (g_ascii_strcasecmp (dot, kinds[i].ext) == 0)
      kind = kinds[i].format == -1 ? -1 : kinds[i].format == -2 ? -2 : kinds[i].format + 1;
  if (kind == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s",
                   _("End the file name in .csv, .json, .txt, .png or .svg to choose the format"));
      return FALSE;
    }
  if (kind > 0)
    {
      char *text = table_of (self, page, (QvPhononTableFormat) (kind - 1), error);
      if (text == NULL)
        return FALSE;
      length = strlen (text);
      bytes = (guint8 *) text;
    }
  else if ((bytes = figure_of (self, page, kind == -2, width, height, &length, error)) == NULL)
    return FALSE;
  return qv_output_write (path, (const char *) bytes, length, force, error);
}

static void
save_response (GtkNativeDialog *chooser, int response, gpointer data)
{
  QvLatticePane *self = data;

  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr(GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (chooser));
      g_autofree char *path = file ? g_file_get_path (file) : NULL;
      g_autoptr(GError) error = NULL;

      /* The chooser has asked before replacing a file. */
      if (path && !qv_lattice_pane_save (self, path, TRUE, &error))
        {
          qv_error_dialog_show (GTK_WIDGET (self), _("The plot could not be saved"), error);
        }
    }
  gtk_native_dialog_destroy (chooser);
  g_object_unref (chooser);
  g_object_unref (self);
}

static void
save_clicked (QvLatticePane *self)
{
  GtkRoot *root = gtk_widget_get_root (GTK_WIDGET (self));
  const char *page = gtk_stack_get_visible_child_name (self->plot_stack);
  g_autofree char *name = g_strdup_printf ("%s.svg", page ? page : "plot");
  GtkFileChooserNative *chooser =
    gtk_file_chooser_native_new (_("Save the Plot"), GTK_IS_WINDOW (root) ? GTK_WINDOW (root) : NULL,
                                 GTK_FILE_CHOOSER_ACTION_SAVE, _("_Save"), _("_Cancel"));

  gtk_file_chooser_set_current_name (GTK_FILE_CHOOSER (chooser), name);
  gtk_native_dialog_set_modal (GTK_NATIVE_DIALOG (chooser), TRUE);
  g_signal_connect (chooser, "response", G_CALLBACK (save_response), g_object_ref (self));
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
}

/* ---- GObject ---- */

static void
qv_lattice_pane_get_property (GObject *object, guint id, GValue *value, GParamSpec *pspec)
{
  QvLatticePane *self = QV_LATTICE_PANE (object);

  switch (id)
    {
    case PROP_CELLS: g_value_set_int (value, qv_lattice_pane_get_cells (self)); break;
    case PROP_UNIT: g_value_set_enum (value, self->unit); break;
    default: G_OBJECT_WARN_INVALID_PROPERTY_ID (object, id, pspec);
    }
}

static void
qv_lattice_pane_set_property (GObject *object, guint id, const GValue *value, GParamSpec *pspec)
{
  QvLatticePane *self = QV_LATTICE_PANE (object);

  switch (id)
    {
    case PROP_CELLS: gtk_spin_button_set_value (self->cells_spin, g_value_get_int (value)); break;
    case PROP_UNIT:
      self->unit = (QvFrequencyUnit) g_value_get_enum (value);
      update_selection_label (self);
      gtk_widget_queue_draw (GTK_WIDGET (self->dispersion_area));
      gtk_widget_queue_draw (GTK_WIDGET (self->dos_area));
      gtk_widget_queue_draw (GTK_WIDGET (self->thermal_area));
      break;
    default: G_OBJECT_WARN_INVALID_PROPERTY_ID (object, id, pspec);
    }
}

static void
cells_changed (QvLatticePane *self)
{
  g_object_notify_by_pspec (G_OBJECT (self), props[PROP_CELLS]);
}

static void
qv_lattice_pane_dispose (GObject *object)
{
  QvLatticePane *self = QV_LATTICE_PANE (object);

  g_clear_object (&self->document);
  self->lattice = NULL;
  gtk_widget_dispose_template (GTK_WIDGET (self), QV_TYPE_LATTICE_PANE);
  G_OBJECT_CLASS (qv_lattice_pane_parent_class)->dispose (object);
}

static void
qv_lattice_pane_class_init (QvLatticePaneClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = qv_lattice_pane_dispose;
  object_class->get_property = qv_lattice_pane_get_property;
  object_class->set_property = qv_lattice_pane_set_property;
  props[PROP_CELLS] = g_param_spec_int ("cells", NULL, NULL, 1, 8, 4,
                                        G_PARAM_READWRITE | G_PARAM_STATIC_STRINGS);
  props[PROP_UNIT] = g_param_spec_enum ("unit", NULL, NULL, QV_TYPE_FREQUENCY_UNIT,
                                        QV_FREQUENCY_CM1,
                                        G_PARAM_READWRITE | G_PARAM_STATIC_STRINGS);
  g_object_class_install_properties (object_class, N_PROPS, props);
  /* A lattice mode was chosen: q point and branch of the dispersion. */
  signals[MODE_ACTIVATED] = g_signal_new ("mode-activated", G_TYPE_FROM_CLASS (klass),
                                          G_SIGNAL_RUN_LAST, 0, NULL, NULL, NULL, G_TYPE_NONE,
                                          2, G_TYPE_INT, G_TYPE_INT);

  gtk_widget_class_set_template_from_resource (widget_class,
                                               "/org/quaverlab/Quaver/gui/qv-lattice-pane.ui");
  gtk_widget_class_bind_template_child (widget_class, QvLatticePane, box);
  gtk_widget_class_bind_template_child (widget_class, QvLatticePane, info_label);
  gtk_widget_class_bind_template_child (widget_class, QvLatticePane, plot_stack);
  gtk_widget_class_bind_template_child (widget_class, QvLatticePane, dispersion_area);
  gtk_widget_class_bind_template_child (widget_class, QvLatticePane, dos_area);
  gtk_widget_class_bind_template_child (widget_class, QvLatticePane, thermal_area);
  gtk_widget_class_bind_template_child (widget_class, QvLatticePane, readout_label);
  gtk_widget_class_bind_template_child (widget_class, QvLatticePane, cells_spin);
  gtk_widget_class_bind_template_child (widget_class, QvLatticePane, selection_label);
  gtk_widget_class_bind_template_child (widget_class, QvLatticePane, save_button);
  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "latticepane");
}

static void
qv_lattice_pane_init (QvLatticePane *self)
{
  GtkEventController *controller;
  GtkGesture *click;

  gtk_widget_init_template (GTK_WIDGET (self));
  self->selected_q = self->selected_branch = self->hover_q = self->hover_branch = -1;
  self->unit = QV_FREQUENCY_CM1;
  gtk_drawing_area_set_draw_func (self->dispersion_area, draw_dispersion, self, NULL);
  gtk_drawing_area_set_draw_func (self->dos_area, draw_dos, self, NULL);
  gtk_drawing_area_set_draw_func (self->thermal_area, draw_thermal, self, NULL);
  for (int i = 0; i < 2; i++)
    {
      controller = gtk_event_controller_motion_new ();
      g_signal_connect (controller, "motion", G_CALLBACK (plot_motion), self);
      g_signal_connect (controller, "leave", G_CALLBACK (plot_leave), self);
      gtk_widget_add_controller (GTK_WIDGET (i ? self->thermal_area : self->dos_area), controller);
    }

  controller = gtk_event_controller_motion_new ();
  g_signal_connect (controller, "motion", G_CALLBACK (motion), self);
  g_signal_connect (controller, "leave", G_CALLBACK (leave), self);
  gtk_widget_add_controller (GTK_WIDGET (self->dispersion_area), controller);
  click = gtk_gesture_click_new ();
  g_signal_connect (click, "pressed", G_CALLBACK (pressed), self);
  gtk_widget_add_controller (GTK_WIDGET (self->dispersion_area), GTK_EVENT_CONTROLLER (click));
  controller = gtk_event_controller_key_new ();
  g_signal_connect (controller, "key-pressed", G_CALLBACK (key_pressed), self);
  gtk_widget_add_controller (GTK_WIDGET (self->dispersion_area), controller);
  g_signal_connect_swapped (self->cells_spin, "value-changed", G_CALLBACK (cells_changed), self);
  g_signal_connect_swapped (self->save_button, "clicked", G_CALLBACK (save_clicked), self);
  update_selection_label (self);
}
