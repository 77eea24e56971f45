/* qv-mode-detail.c — the selected mode in words.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-config.h"
#include "qv-element.h"
#include "qv-mode-detail.h"

struct _QvModeDetail
{
  GtkWidget parent_instance;
  GtkWidget *box;
  GtkLabel *heading_label;
  GtkLabel *facts_label;
  GtkLabel *symmetry_label;
  GtkWidget *character_title;
  GtkLabel *character_label;
  GtkLabel *coordinates_label;
  GtkWidget *atoms_title;
  GtkGrid *atoms_grid;
  GtkLabel *mixing_label;
};

G_DEFINE_FINAL_TYPE (QvModeDetail, qv_mode_detail, GTK_TYPE_WIDGET)

typedef struct {
  gsize atom;
  double p;
} Share;

static int
by_share_desc (gconstpointer a, gconstpointer b)
{
  const double pa = ((const Share *) a)->p, pb = ((const Share *) b)->p;
  return pa < pb ? 1 : pa > pb ? -1 : 0;
}

/* Species and activity: "Species E (modes 4–5) · IR active · Raman inactive". */
static void
show_symmetry (QvModeDetail *self, const QvDocumentAnalysis *a, gsize k)
{
  const QvModeSymmetry *sym = a && a->symmetry && k < a->symmetry->n_modes ? &a->symmetry->modes[k] : NULL;
  g_autofree char *species = NULL;
  g_autofree char *text = NULL;
  g_autofree char *group = NULL;
  g_autofree char *label = NULL;

  gtk_widget_set_visible (GTK_WIDGET (self->symmetry_label), a != NULL);
  if (a == NULL)
    return;
  if (sym == NULL)
    {
      /* TRANSLATORS: %s is why there is no point group */
      text = g_strdup_printf (_("Species not known: no point group (%s)"), a->group_note ? a->group_note : "");
      gtk_label_set_label (self->symmetry_label, text);
      return;
    }
  group = qv_document_analysis_display (a->group->name);
  label = qv_document_analysis_display (sym->label);
  if (!sym->defined)
    {
      text = g_strdup_printf (_("Species ? in %s: the mode's symmetry is broken beyond the tolerance"),
                              group);
      gtk_label_set_label (self->symmetry_label, text);
      return;
    }
  species = sym->size > 1
            /* TRANSLATORS: "E (modes 4–5)": a degenerate set */
            ? g_strdup_printf (_("%s (modes %zu–%zu)"), label, sym->first + 1, sym->first + sym->size)
            : g_strdup (label);
  /* TRANSLATORS: "Species A1 in C2v · IR active · Raman active" */
  text = g_strdup_printf (_("Species %s in %s · %s · %s"), species, group,
                          sym->ir_active ? _("IR active") : _("IR inactive"),
                          sym->raman_active ? _("Raman active") : _("Raman inactive"));
  gtk_label_set_label (self->symmetry_label, text);
}

/* The families, then the largest coordinates, from the core. */
static void
show_character (QvModeDetail *self, const QvDocumentAnalysis *a, gsize k)
{
  const QvCharacterItem *items = NULL;
  g_autofree char *summary = NULL;
  GString *coords;
  gsize n;
  double described;

  gtk_widget_set_visible (self->character_title, a != NULL);
  gtk_widget_set_visible (GTK_WIDGET (self->character_label), a != NULL);
  gtk_widget_set_visible (GTK_WIDGET (self->coordinates_label), a != NULL && a->character != NULL);
  if (a == NULL)
    return;
  if (a->character == NULL)
    {
      gtk_label_set_label (self->character_label, a->character_note ? a->character_note : "");
      return;
    }
  summary = qv_mode_character_summary (a->character, k, QV_MODE_DETAIL_MAX_FAMILIES);
  gtk_label_set_label (self->character_label, summary);
  n = qv_mode_character_items (a->character, k, &items);
  coords = g_string_new (NULL);
  for (gsize i = 0; i < MIN (n, QV_MODE_DETAIL_MAX_COORDINATES); i++)
    {
      if (items[i].share < 0.005)
        break;
      g_string_append_printf (coords, "%s%s %.0f %%", coords->len ? ", " : "", items[i].name,
                              100.0 * items[i].share);
    }
  described = qv_mode_character_described (a->character, k);
  if (described < 0.95)
    {
      /* TRANSLATORS: the part of the mode the internal coordinates describe */
      g_autofree char *part = g_strdup_printf (_("the coordinates describe %.0f %% of this mode"),
                                               100.0 * described);
      g_string_append_printf (coords, "%s%s", coords->len ? " · " : "", part);
    }
  gtk_label_set_label (self->coordinates_label, coords->str);
  gtk_widget_set_visible (GTK_WIDGET (self->coordinates_label), coords->len > 0);
  g_string_free (coords, TRUE);
}

static void
clear_grid (QvModeDetail *self)
{
  GtkWidget *child;
  while ((child = gtk_widget_get_first_child (GTK_WIDGET (self->atoms_grid))) != NULL)
    gtk_grid_remove (self->atoms_grid, child);
}

void
qv_mode_detail_show (QvModeDetail *self, QvDocument *doc, int k)
{
  const QvModeSet *m = doc ? qv_document_get_modes (doc) : NULL;
  const QvStructure *s = doc ? qv_document_get_structure (doc) : NULL;
  g_autofree Share *shares = NULL;
  g_autofree double *p = NULL;
  g_autofree char *heading = NULL;
  g_autofree char *facts = NULL;
  g_autofree char *mixing = NULL;
  double wn, translation, rotation;
  gsize shown;

  clear_grid (self);
  if (m == NULL || k < 0 || (gsize) k >= m->n_modes)
    {
      gtk_label_set_label (self->heading_label, _("No mode selected"));
      gtk_label_set_label (self->facts_label, "");
      gtk_label_set_label (self->mixing_label, "");
      gtk_widget_set_visible (self->atoms_title, FALSE);
      show_symmetry (self, NULL, 0);
      show_character (self, NULL, 0);
      return;
    }
  show_symmetry (self, qv_document_get_analysis (doc), (gsize) k);
  show_character (self, qv_document_get_analysis (doc), (gsize) k);
  gtk_widget_set_visible (self->atoms_title, TRUE);
  wn = qv_mode_set_wavenumber (m, (gsize) k);
  heading = qv_mode_set_is_imaginary (m, (gsize) k)
            /* TRANSLATORS: "Mode 1 · 284.8i cm⁻¹" (imaginary) */
            ? g_strdup_printf (_("Mode %d · %.1fi cm⁻¹"), k + 1, -wn)
            : g_strdup_printf (_("Mode %d · %.1f cm⁻¹"), k + 1, wn);
  gtk_label_set_label (self->heading_label, heading);
  facts = g_strdup_printf (_("Reduced mass %.3f u · force constant %.3f mdyn/Å · collectivity %.2f"),
                           qv_mode_set_reduced_mass (m, (gsize) k),
                           qv_mode_set_force_constant (m, (gsize) k),
                           qv_mode_set_collectivity (m, (gsize) k));
  gtk_label_set_label (self->facts_label, facts);

  p = g_new (double, m->n_atoms);
  shares = g_new (Share, m->n_atoms);
  qv_mode_set_participation (m, (gsize) k, p);
  for (gsize a = 0; a < m->n_atoms; a++)
    {
      shares[a].atom = a;
      shares[a].p = p[a];
    }
  qsort (shares, m->n_atoms, sizeof *shares, by_share_desc);
  shown = MIN (m->n_atoms, QV_MODE_DETAIL_MAX_ATOMS);
  for (gsize i = 0; i < shown; i++)
    {
      const QvElement *e = qv_element_from_z (s->atoms[shares[i].atom].z);
      g_autofree char *name = g_strdup_printf ("%s%zu", e ? e->symbol : "?", shares[i].atom + 1);
      g_autofree char *pct = g_strdup_printf ("%.0f %%", 100.0 * shares[i].p);
      GtkWidget *l_name = gtk_label_new (name);
      GtkWidget *bar = gtk_level_bar_new_for_interval (0.0, 1.0);
      GtkWidget *l_pct = gtk_label_new (pct);

      gtk_label_set_xalign (GTK_LABEL (l_name), 0.0f);
      gtk_widget_add_css_class (l_name, "numeric");
      gtk_level_bar_set_value (GTK_LEVEL_BAR (bar), shares[i].p);
      /* One colour for every share: no offsets with their own colours. */
      gtk_level_bar_remove_offset_value (GTK_LEVEL_BAR (bar), GTK_LEVEL_BAR_OFFSET_LOW);
      gtk_level_bar_remove_offset_value (GTK_LEVEL_BAR (bar), GTK_LEVEL_BAR_OFFSET_HIGH);
      gtk_level_bar_remove_offset_value (GTK_LEVEL_BAR (bar), GTK_LEVEL_BAR_OFFSET_FULL);
      gtk_widget_set_hexpand (bar, TRUE);
      gtk_widget_set_valign (bar, GTK_ALIGN_CENTER);
      gtk_widget_add_css_class (bar, "participation");
      gtk_label_set_xalign (GTK_LABEL (l_pct), 1.0f);
      gtk_label_set_width_chars (GTK_LABEL (l_pct), 5);
      gtk_widget_add_css_class (l_pct, "numeric");
      gtk_grid_attach (self->atoms_grid, l_name, 0, (int) i, 1, 1);
      gtk_grid_attach (self->atoms_grid, bar, 1, (int) i, 1, 1);
      gtk_grid_attach (self->atoms_grid, l_pct, 2, (int) i, 1, 1);
    }

  if (qv_mode_set_rigid_mixing (m, (gsize) k, &translation, &rotation))
    {
      mixing = g_strdup_printf (_("Rigid-body contamination removed: translation %.2f %%, rotation %.2f %%"),
                                100.0 * translation, 100.0 * rotation);
      gtk_label_set_label (self->mixing_label, mixing);
      if (translation > QV_MIXING_WARNING || rotation > QV_MIXING_WARNING)
        gtk_widget_add_css_class (GTK_WIDGET (self->mixing_label), "warning-text");
      else
        gtk_widget_remove_css_class (GTK_WIDGET (self->mixing_label), "warning-text");
    }
  else
    {
      gtk_label_set_label (self->mixing_label, _("Rigid-body contamination: not known for these modes"));
      gtk_widget_remove_css_class (GTK_WIDGET (self->mixing_label), "warning-text");
    }
}

const char *
qv_mode_detail_get_heading (QvModeDetail *self)
{
  return gtk_label_get_label (self->heading_label);
}

const char *
qv_mode_detail_get_symmetry (QvModeDetail *self)
{
  return gtk_label_get_label (self->symmetry_label);
}

const char *
qv_mode_detail_get_character (QvModeDetail *self)
{
  return gtk_label_get_label (self->character_label);
}

const char *
qv_mode_detail_get_mixing (QvModeDetail *self)
{
  return gtk_label_get_label (self->mixing_label);
}

static void
qv_mode_detail_dispose (GObject *object)
{
  gtk_widget_dispose_template (GTK_WIDGET (object), QV_TYPE_MODE_DETAIL);
  G_OBJECT_CLASS (qv_mode_detail_parent_class)->dispose (object);
}

static void
qv_mode_detail_class_init (QvModeDetailClass *klass)
{
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  G_OBJECT_CLASS (klass)->dispose = qv_mode_detail_dispose;
  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "qvmodedetail");
  gtk_widget_class_set_template_from_resource (widget_class, "/org/quaverlab/Quaver/gui/qv-mode-detail.ui");
  gtk_widget_class_bind_template_child (widget_class, QvModeDetail, box);
  gtk_widget_class_bind_template_child (widget_class, QvModeDetail, heading_label);
  gtk_widget_class_bind_template_child (widget_class, QvModeDetail, facts_label);
  gtk_widget_class_bind_template_child (widget_class, QvModeDetail, symmetry_label);
  gtk_widget_class_bind_template_child (widget_class, QvModeDetail, character_title);
  gtk_widget_class_bind_template_child (widget_class, QvModeDetail, character_label);
  gtk_widget_class_bind_template_child (widget_class, QvModeDetail, coordinates_label);
  gtk_widget_class_bind_template_child (widget_class, QvModeDetail, atoms_title);
  gtk_widget_class_bind_template_child (widget_class, QvModeDetail, atoms_grid);
  gtk_widget_class_bind_template_child (widget_class, QvModeDetail, mixing_label);
}

static void
qv_mode_detail_init (QvModeDetail *self)
{
  gtk_widget_init_template (GTK_WIDGET (self));
}
