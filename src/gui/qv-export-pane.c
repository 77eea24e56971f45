/* qv-export-pane.c — the sections in a column of expanders, one open at a
 * time, fed with what the window shows.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include <string.h>
#include "qv-config.h"
#include "qv-error.h"
#include "qv-export-pane.h"
#include "qv-export-pane-private.h"
#include "qv-export-section-table.h"
#include "qv-input.h"
#include "qv-preferences.h"
#include "qv-export.h"
#include "qv-export-section-displace.h"
#include "qv-export-section-ensemble.h"
#include "qv-export-section-frozen.h"
#include "qv-export-section-stencil.h"
#ifdef QV_GUI_HAVE_PICTURE
#include "qv-export-section-picture.h"
#endif
#ifdef QV_GUI_HAVE_ANIMATION
#include "qv-export-section-animation.h"
#endif

typedef void (*SetContextFunc) (gpointer section, const QvExportContext *context);

typedef struct {
  const char *name;
  GtkExpander *expander;
  GtkWidget *separator;        /* above it, or NULL */
  gboolean crystals_only;      /* shown for a crystal document only */
  GtkWidget *widget;
  SetContextFunc set_context;
} Section;

struct _QvExportPane
{
  GtkWidget parent_instance;
  GtkWidget *box;
  GtkLabel *heading_label;
  GtkBox *sections_box;

  GtkWidget *window;           /* not referenced: the pane is inside it */
  Section sections[7];
  guint n_sections;
  gboolean stale;              /* changed while unmapped */
};

G_DEFINE_FINAL_TYPE (QvExportPane, qv_export_pane, GTK_TYPE_WIDGET)

/* ---- shared with the sections ---- */

QvModeSet *
qv_export_pane_copy_modes (const QvModeSet *modes)
{
  QvModeSet *copy = g_memdup2 (modes, sizeof *modes);
  const gsize n3 = 3 * modes->n_atoms;

  copy->masses = g_memdup2 (modes->masses, modes->n_atoms * sizeof (double));
  copy->eigenvalues = g_memdup2 (modes->eigenvalues, modes->n_modes * sizeof (double));
  copy->vectors = g_memdup2 (modes->vectors, n3 * modes->n_modes * sizeof (double));
  copy->rigid_mixing = modes->rigid_mixing
                       ? g_memdup2 (modes->rigid_mixing, 2 * modes->n_modes * sizeof (double)) : NULL;
  return copy;
}

QvManifest *
qv_export_pane_manifest (const QvDocumentSource *source, const char *command, GError **error)
{
  g_autoptr(QvManifest) manifest = qv_manifest_new (command);

  if (source && source->demo)
    {
      g_autoptr(GBytes) bytes = g_resources_lookup_data (QV_INPUT_DEMO_RESOURCE, 0, NULL);
      gsize length = 0;
      const void *data = bytes ? g_bytes_get_data (bytes, &length) : NULL;

      if (data == NULL)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "%s", _("The built-in demo is missing from this build."));
          return NULL;
        }
      qv_manifest_add_input_data (manifest, "demo", "resource://" QV_INPUT_DEMO_RESOURCE, data, length);
    }
  else if (source)
    {
      if (source->geometry
          && !qv_manifest_add_input_file (manifest, qv_input_is_bundle (source->geometry) ? "bundle" : "geometry",
                                          source->geometry, error))
        return NULL;
      if (source->hessian && !qv_manifest_add_input_file (manifest, "hessian", source->hessian, error))
        return NULL;
      /* a bundle's Hessian in a file of its own, as the command line does */
      if (source->bundle_hessian
          && !qv_manifest_add_input_file (manifest, "hessian", source->bundle_hessian, error))
        return NULL;
    }
  /* No command line: the options are in the manifest's own fields. */
  qv_manifest_add_argument (manifest, "(app)");
  return g_steal_pointer (&manifest);
}

QvExportInputs *
qv_export_inputs_new (QvDocument *document)
{
  QvExportInputs *inputs = g_new0 (QvExportInputs, 1);
  const QvDocumentSource *source = qv_document_get_source (document);

  inputs->structure = qv_structure_copy (qv_document_get_structure (document));
  inputs->modes = qv_export_pane_copy_modes (qv_document_get_modes (document));
  inputs->source = source ? qv_document_source_copy (source) : NULL;
  return inputs;
}

void
qv_export_inputs_free (QvExportInputs *inputs)
{
  if (inputs == NULL)
    return;
  qv_structure_free (inputs->structure);
  qv_mode_set_free (inputs->modes);
  qv_document_source_free (inputs->source);
  g_free (inputs);
}

/* On the worker: hash the inputs, plan again from the copies (a plan is
 * written once), write. */
gboolean
qv_export_plan_job_run (gpointer data, const char *directory, gboolean force,
                        const QvProgress *progress, GPtrArray *written, GError **error)
{
  QvExportPlanJob *job = data;
  QvManifest *manifest = qv_export_pane_manifest (job->inputs->source, job->command, error);
  g_autoptr(QvExport) plan = NULL;

  if (manifest == NULL)
    return FALSE;
  plan = job->plan (job->inputs, job->options, manifest, error);
  if (plan == NULL)
    return FALSE;
  return qv_export_pane_write (plan, directory, force, progress, written, error);
}

gboolean
qv_export_pane_write (QvExport *plan, const char *directory, gboolean force,
                      const QvProgress *progress, GPtrArray *written, GError **error)
{
  const gboolean ok = qv_export_write (plan, directory, force, progress, error);
  gsize n = 0;
  const char *const *names = qv_export_written (plan, &n);

  for (gsize i = 0; i < n; i++)
    g_ptr_array_add (written, g_strdup (names[i]));
  return ok;
}

void
qv_export_plan_job_free (gpointer data)
{
  QvExportPlanJob *job = data;

  qv_export_inputs_free (job->inputs);
  g_free (job->options);
  g_free (job);
}

char *
qv_export_pane_files_text (const QvExport *plan)
{
  const gsize n = qv_export_n_files (plan);
  const gsize structures = qv_export_n_structures (plan);
  g_autofree char *count = g_strdup_printf (ngettext ("%zu structure", "%zu structures", structures), structures);

  if (n == 1)
    /* TRANSLATORS: "11 structures in mode7-scan.xyz + manifest.json" */
    return g_strdup_printf (_("%s in %s + manifest.json"), count, qv_export_file_name (plan, 0));
  if (n == 2)
    return g_strdup_printf (_("%s in 2 files: %s, %s + manifest.json"), count, qv_export_file_name (plan, 0),
                            qv_export_file_name (plan, 1));
  /* TRANSLATORS: "11 structures in 11 files: mode7-scan-00.xyz … mode7-scan-10.xyz + manifest.json" */
  return g_strdup_printf (_("%s in %zu files: %s … %s + manifest.json"), count, n, qv_export_file_name (plan, 0),
                          qv_export_file_name (plan, n - 1));
}

char *
qv_export_pane_mode_title (const QvModeSet *modes, gsize k)
{
  const double w = qv_mode_set_wavenumber (modes, k);

  return w < 0
         /* TRANSLATORS: "mode 1 (312.4i cm⁻¹)": an imaginary mode */
         ? g_strdup_printf (_("mode %zu (%.1fi cm⁻¹)"), k + 1, -w)
         /* TRANSLATORS: "mode 7 (1234.5 cm⁻¹)" */
         : g_strdup_printf (_("mode %zu (%.1f cm⁻¹)"), k + 1, w);
}

void
qv_export_pane_set_message (GtkLabel *label, const char *message, gboolean error)
{
  const gboolean shown = message && *message;

  gtk_label_set_label (label, shown ? message : "");
  gtk_widget_set_visible (GTK_WIDGET (label), shown);
  if (error)
    {
      gtk_widget_add_css_class (GTK_WIDGET (label), "error");
      gtk_widget_remove_css_class (GTK_WIDGET (label), "dim-label");
    }
  else
    {
      gtk_widget_remove_css_class (GTK_WIDGET (label), "error");
      gtk_widget_add_css_class (GTK_WIDGET (label), "dim-label");
    }
}

/* ---- the pane ---- */

static void
refresh (QvExportPane *self)
{
  QvWindow *window = QV_IS_WINDOW (self->window) ? QV_WINDOW (self->window) : NULL;
  QvExportContext context = { window, NULL, -1, 0, 1.0, -1, -1 };
  gboolean crystal = FALSE;

  if (!gtk_widget_get_mapped (GTK_WIDGET (self)))
    {
      self->stale = TRUE;
      return;
    }
  self->stale = FALSE;
  if (window)
    {
      context.document = qv_window_get_document (window);
      context.mode = qv_mode_panel_get_selected (qv_window_get_mode_panel (window));
      context.level = qv_mode_panel_get_level (qv_window_get_mode_panel (window));
      context.multiple = qv_motion_bar_get_amplitude (qv_window_get_motion_bar (window));
      qv_lattice_pane_get_selected (qv_window_get_lattice_pane (window), &context.lattice_q,
                                    &context.lattice_branch);
      crystal = context.document && qv_document_get_lattice (context.document) != NULL;
    }
  if (context.document && context.mode >= 0
      && (gsize) context.mode < qv_document_get_modes (context.document)->n_modes)
    {
      g_autofree char *title = qv_export_pane_mode_title (qv_document_get_modes (context.document),
                                                         (gsize) context.mode);
      g_autofree char *text = crystal
        /* TRANSLATORS: a crystal: "Of supercell mode 7 (1234.5 cm⁻¹), as selected on Supercell Modes; v = 0" */
        ? g_strdup_printf (_("Of supercell %s, as selected on Supercell Modes; v = %u"), title, context.level)
        /* TRANSLATORS: "Of mode 7 (1234.5 cm⁻¹), as selected in the list; v = 0" */
        : g_strdup_printf (_("Of %s, as selected in the list; v = %u"), title, context.level);
      gtk_label_set_label (self->heading_label, text);
    }
  else
    {
      context.mode = -1;
      gtk_label_set_label (self->heading_label, context.document ? _("Select a mode in the list.")
                                                                 : _("Open a document to export from it."));
    }
  /* Only the open section works out its preview now (an ensemble plan or a
   * long table costs something on a large system); the others do when
   * they are opened. */
  for (guint i = 0; i < self->n_sections; i++)
    {
      Section *s = &self->sections[i];
      if (s->crystals_only)
        {
          gtk_widget_set_visible (GTK_WIDGET (s->expander), crystal);
          if (s->separator)
            gtk_widget_set_visible (s->separator, crystal);
        }
      if (gtk_expander_get_expanded (s->expander))
        s->set_context (s->widget, &context);
    }
}

void
qv_export_pane_update (QvExportPane *self)
{
  g_return_if_fail (QV_IS_EXPORT_PANE (self));
  refresh (self);
}

void
qv_export_pane_attach (QvExportPane *self, GtkWidget *window)
{
  g_return_if_fail (QV_IS_WINDOW (window));
  self->window = window;
  g_signal_connect_object (qv_window_get_mode_panel (QV_WINDOW (window)), "notify::selected",
                           G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (qv_window_get_mode_panel (QV_WINDOW (window)), "notify::level",
                           G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (qv_window_get_motion_bar (QV_WINDOW (window)), "notify::amplitude",
                           G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (qv_preferences_get_default (), "notify::wavenumber-unit",
                           G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  g_signal_connect_object (qv_window_get_lattice_pane (QV_WINDOW (window)), "mode-activated",
                           G_CALLBACK (refresh), self, G_CONNECT_SWAPPED);
  refresh (self);
}

GtkWidget *
qv_export_pane_get_section (QvExportPane *self, const char *name, gboolean expand)
{
  for (guint i = 0; i < self->n_sections; i++)
    if (g_str_equal (self->sections[i].name, name))
      {
        if (expand)
          gtk_expander_set_expanded (self->sections[i].expander, TRUE);
        return self->sections[i].widget;
      }
  return NULL;
}

const char *
qv_export_pane_get_heading (QvExportPane *self)
{
  return gtk_label_get_label (self->heading_label);
}

/* One section open at a time: the pane stays short enough to read. */
static void
expanded_changed (GtkExpander *expander, GParamSpec *pspec, QvExportPane *self)
{
  if (!gtk_expander_get_expanded (expander))
    return;
  for (guint i = 0; i < self->n_sections; i++)
    if (self->sections[i].expander != expander)
      gtk_expander_set_expanded (self->sections[i].expander, FALSE);
  /* Read the window again: the document may have changed since. */
  refresh (self);
}

static void
add_section (QvExportPane *self, const char *name, const char *title, const char *blurb,
             GtkWidget *widget, SetContextFunc set_context)
{
  Section *s = &self->sections[self->n_sections++];
  GtkWidget *label_box = gtk_box_new (GTK_ORIENTATION_VERTICAL, 0);
  GtkWidget *title_label = gtk_label_new_with_mnemonic (title);
  GtkWidget *blurb_label = gtk_label_new (blurb);
  GtkWidget *expander = gtk_expander_new (NULL);

  gtk_label_set_xalign (GTK_LABEL (title_label), 0);
  gtk_widget_add_css_class (title_label, "heading");
  gtk_label_set_xalign (GTK_LABEL (blurb_label), 0);
  gtk_label_set_wrap (GTK_LABEL (blurb_label), TRUE);
  gtk_widget_add_css_class (blurb_label, "dim-label");
  gtk_widget_add_css_class (blurb_label, "caption");
  gtk_box_append (GTK_BOX (label_box), title_label);
  gtk_box_append (GTK_BOX (label_box), blurb_label);
  gtk_expander_set_label_widget (GTK_EXPANDER (expander), label_box);
  gtk_label_set_mnemonic_widget (GTK_LABEL (title_label), expander);
  gtk_widget_set_margin_start (widget, 4);
  gtk_widget_set_margin_top (widget, 10);
  gtk_widget_set_margin_bottom (widget, 14);
  gtk_expander_set_child (GTK_EXPANDER (expander), widget);
  gtk_widget_add_css_class (expander, "export-section");
  gtk_widget_set_margin_top (expander, 6);
  gtk_widget_set_margin_bottom (expander, 6);
  s->separator = NULL;
  s->crystals_only = FALSE;
  if (self->n_sections > 1)
    {
      s->separator = gtk_separator_new (GTK_ORIENTATION_HORIZONTAL);
      gtk_box_append (self->sections_box, s->separator);
    }
  gtk_box_append (self->sections_box, expander);
  g_signal_connect_object (expander, "notify::expanded", G_CALLBACK (expanded_changed), self, 0);

  s->name = name;
  s->expander = GTK_EXPANDER (expander);
  s->widget = widget;
  s->set_context = set_context;
}

static void
qv_export_pane_map (GtkWidget *widget)
{
  QvExportPane *self = QV_EXPORT_PANE (widget);

  GTK_WIDGET_CLASS (qv_export_pane_parent_class)->map (widget);
  if (self->stale)
    refresh (self);
}

static void
qv_export_pane_dispose (GObject *object)
{
  gtk_widget_dispose_template (GTK_WIDGET (object), QV_TYPE_EXPORT_PANE);
  G_OBJECT_CLASS (qv_export_pane_parent_class)->dispose (object);
}

static void
qv_export_pane_class_init (QvExportPaneClass *klass)
{
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  G_OBJECT_CLASS (klass)->dispose = qv_export_pane_dispose;
  widget_class->map = qv_export_pane_map;
  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "qvexportpane");
  gtk_widget_class_set_template_from_resource (widget_class, "/org/quaverlab/Quaver/gui/qv-export-pane.ui");
  gtk_widget_class_bind_template_child (widget_class, QvExportPane, box);
  gtk_widget_class_bind_template_child (widget_class, QvExportPane, heading_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportPane, sections_box);
}

static void
qv_export_pane_init (QvExportPane *self)
{
  gtk_widget_init_template (GTK_WIDGET (self));
  self->stale = TRUE;
  add_section (self, "table", _("_Table"), _("The modes in rows, for a paper or a spreadsheet"),
               g_object_new (QV_TYPE_EXPORT_SECTION_TABLE, NULL),
               (SetContextFunc) qv_export_section_table_set_context);
  add_section (self, "displace", _("_Displaced Structures"), _("Geometries along the mode, for the next calculation"),
               g_object_new (QV_TYPE_EXPORT_SECTION_DISPLACE, NULL),
               (SetContextFunc) qv_export_section_displace_set_context);
  add_section (self, "ensemble", _("E_nsemble"), _("Thermal samples with velocities (all modes)"),
               g_object_new (QV_TYPE_EXPORT_SECTION_ENSEMBLE, NULL),
               (SetContextFunc) qv_export_section_ensemble_set_context);
  add_section (self, "stencil", _("Stenc_il"), _("Displacements whose forces give a Hessian"),
               g_object_new (QV_TYPE_EXPORT_SECTION_STENCIL, NULL),
               (SetContextFunc) qv_export_section_stencil_set_context);
  add_section (self, "frozen", _("_Frozen Phonon"), _("A supercell moved along the chosen lattice mode"),
               g_object_new (QV_TYPE_EXPORT_SECTION_FROZEN, NULL),
               (SetContextFunc) qv_export_section_frozen_set_context);
  self->sections[self->n_sections - 1].crystals_only = TRUE;
#ifdef QV_GUI_HAVE_PICTURE
  add_section (self, "picture", _("_Picture"), _("The view as PNG or SVG"),
               g_object_new (QV_TYPE_EXPORT_SECTION_PICTURE, NULL),
               (SetContextFunc) qv_export_section_picture_set_context);
#endif
#ifdef QV_GUI_HAVE_ANIMATION
  add_section (self, "animation", _("Ani_mation"), _("One period of the motion as GIF or XYZ frames"),
               g_object_new (QV_TYPE_EXPORT_SECTION_ANIMATION, NULL),
               (SetContextFunc) qv_export_section_animation_set_context);
#endif
  gtk_expander_set_expanded (self->sections[0].expander, TRUE);
}
