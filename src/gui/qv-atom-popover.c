/* qv-atom-popover.c — a clicked atom and its mass.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-config.h"
#include <math.h>
#include "qv-atom-popover.h"
#include "qv-element.h"

struct _QvAtomPopover
{
  GtkPopover parent_instance;
  GtkLabel *title_label;
  GtkLabel *summary_label;
  GtkWidget *mass_title;
  GtkWidget *isotope_row;
  GtkWidget *mass_row;
  GtkDropDown *isotope_dropdown;
  GtkWidget *isotope_button;
  GtkEntry *mass_entry;
  GtkWidget *mass_button;
  GtkLabel *mass_error;

  guint atom;
  GArray *mass_numbers;        /* guint, one per dropdown entry */
};

G_DEFINE_FINAL_TYPE (QvAtomPopover, qv_atom_popover, GTK_TYPE_POPOVER)

enum { MASS_CHOSEN, N_SIGNALS };
static guint signals[N_SIGNALS];

void
qv_atom_popover_show_atom (QvAtomPopover *self, QvDocument *doc, gsize atom, int k, double amplitude)
{
  const QvStructure *s = qv_document_get_structure (doc);
  const QvModeSet *m = qv_document_get_modes (doc);
  const QvAtom *at = &s->atoms[atom];
  const QvElement *e = qv_element_from_z (at->z);
  g_autoptr(GString) summary = g_string_new (NULL);
  g_autofree char *title = NULL;
  g_autoptr(GtkStringList) names = gtk_string_list_new (NULL);
  const QvIsotope *table;
  gsize n_table;
  guint selected = GTK_INVALID_LIST_POSITION;
  const gboolean editable = qv_document_has_hessian (doc);

  self->atom = (guint) atom;
  /* TRANSLATORS: "C2 — carbon" (symbol and 1-based index, element name) */
  title = g_strdup_printf (_("%s%zu — %s"), e ? e->symbol : "?", atom + 1, e ? e->name : "?");
  gtk_label_set_label (self->title_label, title);

  g_string_append_printf (summary, _("Mass %.5f u"), at->mass);
  if (at->mass_number)
    g_string_append_printf (summary, " (%u%s)", at->mass_number, e ? e->symbol : "");
  if (k >= 0 && (gsize) k < m->n_modes)
    {
      g_autofree double *p = g_new (double, m->n_atoms);
      double disp;

      qv_mode_set_participation (m, (gsize) k, p);
      disp = qv_mode_set_atom_displacement (m, (gsize) k, atom, amplitude);
      g_string_append_c (summary, '\n');
      g_string_append_printf (summary, _("Share of mode %d: %.1f %%"), k + 1, 100.0 * p[atom]);
      g_string_append_c (summary, '\n');
      g_string_append_printf (summary, _("Displacement as shown: %.4f Å"), disp);
    }
  gtk_label_set_label (self->summary_label, summary->str);

  g_array_set_size (self->mass_numbers, 0);
  table = qv_isotope_table (&n_table);
  for (gsize i = 0; i < n_table; i++)
    if (table[i].z == at->z)
      {
        g_autofree char *label = table[i].abundance > 0.0
          ? g_strdup_printf (_("%u%s — %.5f u, %.4g %% natural"), table[i].mass_number, e ? e->symbol : "",
                             table[i].mass, 100.0 * table[i].abundance)
          : g_strdup_printf (_("%u%s — %.5f u, not natural"), table[i].mass_number, e ? e->symbol : "",
                             table[i].mass);
        if (table[i].mass_number == at->mass_number)
          selected = self->mass_numbers->len;
        gtk_string_list_append (names, label);
        g_array_append_val (self->mass_numbers, table[i].mass_number);
      }
  gtk_drop_down_set_model (self->isotope_dropdown, G_LIST_MODEL (names));
  if (selected != GTK_INVALID_LIST_POSITION)
    gtk_drop_down_set_selected (self->isotope_dropdown, selected);
  gtk_widget_set_sensitive (self->isotope_row, editable && self->mass_numbers->len > 0);
  gtk_widget_set_sensitive (self->mass_row, editable);
  gtk_editable_set_text (GTK_EDITABLE (self->mass_entry), "");
  gtk_widget_set_visible (GTK_WIDGET (self->mass_error), !editable);
  if (!editable)
    gtk_label_set_label (self->mass_error, _("This file holds precomputed modes, not a Hessian: masses cannot be changed."));
}

const char *
qv_atom_popover_get_summary (QvAtomPopover *self)
{
  return gtk_label_get_label (self->summary_label);
}

static void
isotope_clicked (QvAtomPopover *self)
{
  const guint i = gtk_drop_down_get_selected (self->isotope_dropdown);

  if (i >= self->mass_numbers->len)
    return;
  gtk_popover_popdown (GTK_POPOVER (self));
  g_signal_emit (self, signals[MASS_CHOSEN], 0, self->atom, g_array_index (self->mass_numbers, guint, i), 0.0);
}

static void
mass_clicked (QvAtomPopover *self)
{
  const char *text = gtk_editable_get_text (GTK_EDITABLE (self->mass_entry));
  char *end = NULL;
  g_autofree char *copy = g_strstrip (g_strdup (text));
  double mass;

  /* Accept the user's decimal comma as well as a point. */
  g_strdelimit (copy, ",", '.');
  mass = g_ascii_strtod (copy, &end);
  if (end == copy || *end != '\0' || !(mass > 0.0) || !isfinite (mass))
    {
      gtk_label_set_label (self->mass_error, _("Type a positive mass in u, such as 2.014"));
      gtk_widget_set_visible (GTK_WIDGET (self->mass_error), TRUE);
      return;
    }
  gtk_widget_set_visible (GTK_WIDGET (self->mass_error), FALSE);
  gtk_popover_popdown (GTK_POPOVER (self));
  g_signal_emit (self, signals[MASS_CHOSEN], 0, self->atom, 0u, mass);
}

/* The summary is selectable (to copy its numbers) and takes the focus
 * first: show it without everything selected. */
static void
popover_mapped (QvAtomPopover *self)
{
  gtk_label_select_region (self->summary_label, 0, 0);
}

static void
qv_atom_popover_finalize (GObject *object)
{
  g_array_unref (QV_ATOM_POPOVER (object)->mass_numbers);
  G_OBJECT_CLASS (qv_atom_popover_parent_class)->finalize (object);
}

static void
qv_atom_popover_dispose (GObject *object)
{
  gtk_widget_dispose_template (GTK_WIDGET (object), QV_TYPE_ATOM_POPOVER);
  G_OBJECT_CLASS (qv_atom_popover_parent_class)->dispose (object);
}

static void
qv_atom_popover_class_init (QvAtomPopoverClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = qv_atom_popover_dispose;
  object_class->finalize = qv_atom_popover_finalize;
  signals[MASS_CHOSEN] = g_signal_new ("mass-chosen", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0,
                                       NULL, NULL, NULL, G_TYPE_NONE, 3, G_TYPE_UINT, G_TYPE_UINT, G_TYPE_DOUBLE);
  gtk_widget_class_set_template_from_resource (widget_class, "/org/quaverlab/Quaver/gui/qv-atom-popover.ui");
  gtk_widget_class_bind_template_child (widget_class, QvAtomPopover, title_label);
  gtk_widget_class_bind_template_child (widget_class, QvAtomPopover, summary_label);
  gtk_widget_class_bind_template_child (widget_class, QvAtomPopover, mass_title);
  gtk_widget_class_bind_template_child (widget_class, QvAtomPopover, isotope_row);
  gtk_widget_class_bind_template_child (widget_class, QvAtomPopover, mass_row);
  gtk_widget_class_bind_template_child (widget_class, QvAtomPopover, isotope_dropdown);
  gtk_widget_class_bind_template_child (widget_class, QvAtomPopover, isotope_button);
  gtk_widget_class_bind_template_child (widget_class, QvAtomPopover, mass_entry);
  gtk_widget_class_bind_template_child (widget_class, QvAtomPopover, mass_button);
  gtk_widget_class_bind_template_child (widget_class, QvAtomPopover, mass_error);
}

static void
qv_atom_popover_init (QvAtomPopover *self)
{
  gtk_widget_init_template (GTK_WIDGET (self));
  self->mass_numbers = g_array_new (FALSE, FALSE, sizeof (guint));
  g_signal_connect_swapped (self->isotope_button, "clicked", G_CALLBACK (isotope_clicked), self);
  g_signal_connect_swapped (self->mass_button, "clicked", G_CALLBACK (mass_clicked), self);
  g_signal_connect_swapped (self->mass_entry, "activate", G_CALLBACK (mass_clicked), self);
  g_signal_connect_after (self, "map", G_CALLBACK (popover_mapped), NULL);
}

QvAtomPopover *
qv_atom_popover_new (void)
{
  return g_object_new (QV_TYPE_ATOM_POPOVER, NULL);
}
