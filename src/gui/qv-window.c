/* qv-window.c — the main window.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <adwaita.h>
#include <glib/gi18n.h>
#include "qv-config.h"
#include <math.h>
#include "qv-atom-popover.h"
#include "qv-error.h"
#include "qv-error-dialog.h"
#include "qv-export-pane.h"
#include "qv-hessian-dialog.h"
#include "qv-lattice-pane.h"
#include "qv-lattice-replica.h"
#include "qv-preferences.h"
#include "qv-welcome-page.h"
#include "qv-window.h"
#include "qv-window-actions.h"
#include "qv-window-private.h"
#include "qv-document-save.h"
#include "qv-window-save.h"

struct _QvWindow
{
  GtkApplicationWindow parent_instance;

  GtkLabel *title_label;
  GtkLabel *subtitle_label;
  GtkToggleButton *play_button;
  GtkWidget *export_button;
  GtkRevealer *progress_revealer;
  GtkLabel *progress_label;
  GtkProgressBar *progress_bar;
  GtkStack *stack;
  QvWelcomePage *welcome_page;
  GtkPaned *paned;
  QvModeView *mode_view;
  QvMotionBar *motion_bar;
  QvModePanel *mode_panel;
  QvModeDetail *mode_detail;
  AdwFlap *export_flap;
  GtkOverlay *view_overlay;
  QvExportPane *export_pane;
  GtkWidget *spectrum_button;
  GtkRevealer *spectrum_revealer;
  QvSpectrumView *spectrum_view;
  QvAtomPopover *atom_popover;
  GtkWidget *side_switcher;
  GtkStack *side_stack;
  QvLatticePane *lattice_pane;
  GtkStackPage *modes_page;
  GtkStackPage *lattice_page;
  GtkStackPage *thermo_page;
  QvThermoPanel *thermo_panel;

  QvDocument *document;
  gboolean lattice_shown;      /* the view shows a lattice mode's replica */
  GCancellable *job;           /* the running load or solve, or NULL */
  guint pulse_id;
  GtkWindow *error_dialog;
  QvPreferences *prefs;
  gulong changed_id;
};

G_DEFINE_FINAL_TYPE (QvWindow, qv_window, GTK_TYPE_APPLICATION_WINDOW)

/* ---- the selected mode ---- */

static void
show_selected_mode (QvWindow *self)
{
  const int k = qv_mode_panel_get_selected (self->mode_panel);
  const QvModeSet *modes = self->document ? qv_document_get_modes (self->document) : NULL;

  qv_mode_detail_show (self->mode_detail, self->document, k);
  qv_spectrum_view_set_selected (self->spectrum_view, k);
  if (self->lattice_shown)
    return;                    /* the view shows the lattice page's mode */
  if (modes == NULL || k < 0)
    {
      qv_mode_view_set_mode (self->mode_view, NULL, NULL, 0.0);
      qv_motion_bar_set_mode (self->motion_bar, NULL, -1, 0);
      return;
    }
  {
    const gsize n = modes->n_atoms;
    g_autofree double *cart = g_new (double, 3 * n);
    g_autofree double *part = g_new (double, n);
    g_autofree float *cart_f = g_new (float, 3 * n);
    g_autofree float *part_f = g_new (float, n);
    double largest = 0.0;
    const guint level = qv_mode_panel_get_level (self->mode_panel);
    const double amplitude = qv_mode_set_display_amplitude (modes, (gsize) k, level,
                                                            qv_motion_bar_get_amplitude (self->motion_bar),
                                                            NULL);

    qv_mode_set_cartesian (modes, (gsize) k, cart);
    qv_mode_set_participation (modes, (gsize) k, part);
    for (gsize a = 0; a < n; a++)
      largest = MAX (largest, part[a]);
    for (gsize i = 0; i < 3 * n; i++)
      cart_f[i] = (float) cart[i];
    /* The colour ramp spans this mode's own range. */
    for (gsize a = 0; a < n; a++)
      part_f[a] = largest > 0.0 ? (float) (part[a] / largest) : 0.0f;
    qv_mode_view_set_mode (self->mode_view, cart_f, part_f, amplitude);
    qv_motion_bar_set_mode (self->motion_bar, modes, k, level);
  }
}

/* ---- the selected lattice mode ---- */

/* A lattice mode's largest displacement at amplitude multiple 1, Å: a
 * display scale (a phonon's amplitude spreads over the whole crystal, so
 * no per-cell turning point is meaningful). */
#define LATTICE_DISPLAY_LARGEST 0.3

static void show_selected_mode (QvWindow *self);

static void
lattice_amplitude (QvWindow *self)
{
  const double largest = LATTICE_DISPLAY_LARGEST * qv_motion_bar_get_amplitude (self->motion_bar);
  /* TRANSLATORS: the motion bar for a lattice mode: the shown scale */
  g_autofree char *text = g_strdup_printf (_("× display scale: largest %.3f Å (not a quantum amplitude)"),
                                           largest);
  qv_mode_view_set_amplitude (self->mode_view, largest);
  qv_motion_bar_set_summary (self->motion_bar, text);
}

/* Shows the lattice mode chosen in the pane: D(q) solved at its q, the
 * field on a block of cells with the phases of qv-lattice-replica.h. */
static void
show_lattice_mode (QvWindow *self, gboolean fit)
{
  const QvDocumentLattice *l = self->document ? qv_document_get_lattice (self->document) : NULL;
  int k, b, cells = qv_lattice_pane_get_cells (self->lattice_pane);
  int reps[3] = { cells, cells, cells };
  g_autoptr(QvPhononSet) set = NULL;
  g_autoptr(QvStructure) block = NULL;
  g_autoptr(GError) error = NULL;

  qv_lattice_pane_get_selected (self->lattice_pane, &k, &b);
  if (l == NULL || l->bands == NULL || k < 0)
    return;
  set = qv_document_lattice_solve (l, l->solve_q + 3 * k, &error);
  block = qv_lattice_replica_new (l->crystal->primitive, reps, &error);
  if (set == NULL || block == NULL)
    {
      qv_window_show_error (self, _("The lattice mode could not be shown"), error);
      return;
    }
  {
    const gsize nb = l->n_branches, n = 3 * block->n_atoms;
    const guint j = l->order[(gsize) k * nb + (gsize) b];
    g_autofree float *re = g_new (float, n), *im = g_new (float, n);
    /* the field at the path's q (Γ itself, not the nudged point) */
    qv_lattice_replica_field (l->crystal->primitive, reps, l->sampling->q + 3 * k,
                              set->eigenvectors + (gsize) j * nb, re, im);
    if (!self->lattice_shown || fit)
      qv_mode_view_set_structure (self->mode_view, block, TRUE);
    self->lattice_shown = TRUE;
    qv_mode_view_set_complex_mode (self->mode_view, re, im, NULL, 0.0);
    lattice_amplitude (self);
  }
}

static void
lattice_mode_activated (QvLatticePane *pane, int k, int b, gpointer data)
{
  show_lattice_mode (QV_WINDOW (data), FALSE);
}

static void
lattice_cells_changed (QvWindow *self)
{
  if (self->lattice_shown)
    show_lattice_mode (self, TRUE);
}

/* Back to the supercell's own structure for its modes. */
static void
leave_lattice (QvWindow *self)
{
  if (!self->lattice_shown)
    return;
  self->lattice_shown = FALSE;
  if (self->document)
    qv_mode_view_set_structure (self->mode_view, qv_document_get_structure (self->document), TRUE);
}

static void
side_page_changed (QvWindow *self)
{
  const char *page = gtk_stack_get_visible_child_name (self->side_stack);

  if (g_strcmp0 (page, "lattice") == 0)
    show_lattice_mode (self, FALSE);
  else if (self->lattice_shown)
    {
      leave_lattice (self);
      show_selected_mode (self);
    }
}

/* A crystal opens on the lattice page, showing the top branch at the
 * path's second labelled point (a zone-boundary mode, where neighbouring
 * cells move against each other). */
static void
setup_lattice (QvWindow *self)
{
  const QvDocumentLattice *l = qv_document_get_lattice (self->document);
  const gboolean crystal = l != NULL || qv_document_get_lattice_note (self->document) != NULL;

  self->lattice_shown = FALSE;
  qv_lattice_pane_set_document (self->lattice_pane, self->document);
  /* A crystal's switcher shows its lattice and supercell modes; a
   * molecule's its modes and thermochemistry. */
  qv_thermo_panel_set_document (self->thermo_panel, self->document);
  qv_thermo_panel_set_selected (self->thermo_panel, qv_mode_panel_get_selected (self->mode_panel));
  gtk_stack_page_set_visible (self->lattice_page, crystal);
  gtk_stack_page_set_visible (self->thermo_page, !crystal);
  gtk_stack_page_set_title (self->modes_page, crystal ? _("Supercell Modes") : _("Modes"));
  gtk_widget_set_visible (self->side_switcher, TRUE);
  if (l != NULL && l->bands != NULL)
    {
      const gsize k = l->sampling->n_labels > 1 ? l->sampling->label_index[1] : 0;
      qv_lattice_pane_set_selected (self->lattice_pane, (int) k, (int) l->n_branches - 1);
    }
  gtk_stack_set_visible_child_name (self->side_stack, crystal ? "lattice" : "modes");
  if (l != NULL && l->bands != NULL)
    show_lattice_mode (self, TRUE);
}

static void
amplitude_changed (QvWindow *self)
{
  const int k = qv_mode_panel_get_selected (self->mode_panel);
  const QvModeSet *modes = self->document ? qv_document_get_modes (self->document) : NULL;

  if (self->lattice_shown)
    {
      lattice_amplitude (self);
      return;
    }
  if (modes == NULL || k < 0)
    return;
  qv_mode_view_set_amplitude (self->mode_view,
                              qv_mode_set_display_amplitude (modes, (gsize) k,
                                                             qv_mode_panel_get_level (self->mode_panel),
                                                             qv_motion_bar_get_amplitude (self->motion_bar),
                                                             NULL));
  qv_motion_bar_set_mode (self->motion_bar, modes, k, qv_mode_panel_get_level (self->mode_panel));
}

static void
update_title (QvWindow *self)
{
  g_autofree char *formula = NULL;
  g_autofree char *subtitle = NULL;

  /* Play and the export pane need a document. */
  gtk_widget_set_visible (GTK_WIDGET (self->play_button), self->document != NULL);
  gtk_widget_set_visible (self->export_button, self->document != NULL);
  gtk_widget_set_visible (self->spectrum_button, self->document != NULL);
  if (self->document == NULL)
    {
      gtk_label_set_label (self->title_label, _("Quaver"));
      gtk_widget_set_visible (GTK_WIDGET (self->subtitle_label), FALSE);
      gtk_window_set_title (GTK_WINDOW (self), _("Quaver"));
      return;
    }
  formula = qv_structure_formula (qv_document_get_structure (self->document));
  subtitle = qv_document_get_masses_edited (self->document)
             /* TRANSLATORS: subtitle, e.g. "C2H6O · masses edited" */
             ? g_strdup_printf (_("%s · masses edited"), formula)
             : g_strdup (formula);
  gtk_label_set_label (self->title_label, qv_document_get_name (self->document));
  gtk_label_set_label (self->subtitle_label, subtitle);
  gtk_widget_set_visible (GTK_WIDGET (self->subtitle_label), TRUE);
  gtk_window_set_title (GTK_WINDOW (self), qv_document_get_name (self->document));
}

static void
document_changed (QvWindow *self)
{
  /* Same atoms, new masses: the selection stays on the same index. */
  const int k = qv_mode_panel_get_selected (self->mode_panel);

  qv_mode_panel_set_document (self->mode_panel, self->document);
  qv_spectrum_view_set_document (self->spectrum_view, self->document);
  qv_mode_panel_select (self->mode_panel, k);
  if (!self->lattice_shown)
    qv_mode_view_set_structure (self->mode_view, qv_document_get_structure (self->document), FALSE);
  show_selected_mode (self);
  update_title (self);
  qv_window_actions_update (self);
  qv_export_pane_update (self->export_pane);
}

void
qv_window_set_document (QvWindow *self, QvDocument *doc)
{
  if (self->document)
    g_clear_signal_handler (&self->changed_id, self->document);
  g_set_object (&self->document, doc);
  gtk_popover_popdown (GTK_POPOVER (self->atom_popover));
  if (doc == NULL)
    {
      self->lattice_shown = FALSE;
      qv_lattice_pane_set_document (self->lattice_pane, NULL);
      qv_thermo_panel_set_document (self->thermo_panel, NULL);
      gtk_stack_set_visible_child_name (self->stack, "welcome");
      update_title (self);
      qv_window_actions_update (self);
      qv_export_pane_update (self->export_pane);
      return;
    }
  self->changed_id = g_signal_connect_swapped (doc, "changed", G_CALLBACK (document_changed), self);
  qv_mode_panel_set_document (self->mode_panel, doc);
  qv_spectrum_view_set_document (self->spectrum_view, doc);
  self->lattice_shown = FALSE;
  qv_mode_view_set_structure (self->mode_view, qv_document_get_structure (doc), TRUE);
  qv_mode_panel_select (self->mode_panel, 0);
  show_selected_mode (self);
  setup_lattice (self);
  update_title (self);
  gtk_stack_set_visible_child_name (self->stack, "document");
  qv_window_actions_update (self);
  qv_export_pane_update (self->export_pane);
  gtk_widget_grab_focus (GTK_WIDGET (self->mode_panel));
  /* a bundle's saved view, and the view shown as the saved state */
  qv_document_save_restore_view (self);
}

/* ---- jobs: progress strip, cancel ---- */

static gboolean
pulse (gpointer data)
{
  gtk_progress_bar_pulse (QV_WINDOW (data)->progress_bar);
  return G_SOURCE_CONTINUE;
}

static void
job_progress (double fraction, const char *stage, gpointer data)
{
  QvWindow *self = data;
  g_autofree char *text = g_strdup_printf ("%s…", g_dgettext (GETTEXT_PACKAGE, stage));

  gtk_label_set_label (self->progress_label, text);
  if (fraction < 0.0)
    {
      if (self->pulse_id == 0)
        self->pulse_id = g_timeout_add (100, pulse, self);
    }
  else
    {
      g_clear_handle_id (&self->pulse_id, g_source_remove);
      gtk_progress_bar_set_fraction (self->progress_bar, CLAMP (fraction, 0.0, 1.0));
    }
}

static GCancellable *
job_begin (QvWindow *self, const char *what)
{
  qv_window_cancel (self);
  self->job = g_cancellable_new ();
  gtk_label_set_label (self->progress_label, what);
  gtk_progress_bar_set_fraction (self->progress_bar, 0.0);
  gtk_revealer_set_reveal_child (self->progress_revealer, TRUE);
  qv_window_actions_update (self);
  return self->job;
}

/* Ends the job whose cancellable is @job; FALSE when a newer one runs. */
static gboolean
job_end (QvWindow *self, GCancellable *job)
{
  if (self->job != job)
    return FALSE;
  g_clear_object (&self->job);
  g_clear_handle_id (&self->pulse_id, g_source_remove);
  gtk_revealer_set_reveal_child (self->progress_revealer, FALSE);
  qv_window_actions_update (self);
  return TRUE;
}

gboolean
qv_window_is_busy (QvWindow *self)
{
  return self->job != NULL;
}

void
qv_window_cancel (QvWindow *self)
{
  g_autoptr(GCancellable) job = g_steal_pointer (&self->job);

  if (job == NULL)
    return;
  /* The task returns at once (return-on-cancel); its worker's result is
   * dropped when LAPACK finishes. */
  g_cancellable_cancel (job);
  g_clear_handle_id (&self->pulse_id, g_source_remove);
  gtk_revealer_set_reveal_child (self->progress_revealer, FALSE);
  qv_window_actions_update (self);
}

/* ---- errors ---- */

static void
error_dialog_gone (QvWindow *self, GtkWindow *dialog)
{
  if (self->error_dialog == dialog)
    self->error_dialog = NULL;
}

void
qv_window_show_error (QvWindow *self, const char *primary, const GError *error)
{
  if (self->error_dialog)
    gtk_window_destroy (self->error_dialog);
  self->error_dialog = qv_error_dialog_show (GTK_WIDGET (self), primary, error);
  /* NULL again once it is answered and gone (disconnected if we go first) */
  g_signal_connect_object (self->error_dialog, "destroy", G_CALLBACK (error_dialog_gone), self,
                           G_CONNECT_SWAPPED);
}

GtkWindow *
qv_window_get_error_dialog (QvWindow *self)
{
  return self->error_dialog;
}

/* ---- loading ---- */

typedef struct {
  QvWindow *window;
  GCancellable *job;
  char *uri;                   /* for the recent list, or NULL */
} LoadCall;

static void
load_done (GObject *source, GAsyncResult *result, gpointer data)
{
  LoadCall *call = data;
  QvWindow *self = call->window;
  g_autoptr(GError) error = NULL;
  g_autoptr(QvDocument) doc = qv_document_load_finish (result, &error);

  if (job_end (self, call->job))
    {
      if (doc)
        {
          qv_window_set_document (self, doc);
          if (call->uri)
            {
              /* Every field given: with add_item's defaults, GLib 2.74's
               * bookmark reader can crash on the entry when it is read back. */
              g_autofree char *exec = g_strdup_printf ("%s %%u", g_get_prgname () ? g_get_prgname () : "quaver");
              GtkRecentData recent = {
                .display_name = NULL,
                .description = NULL,
                .mime_type = (char *) (g_str_has_suffix (call->uri, ".json") ? "application/json" : "chemical/x-xyz"),
                .app_name = (char *) g_get_application_name (),
                .app_exec = exec,
                .groups = NULL,
                .is_private = FALSE,
              };
              gtk_recent_manager_add_full (gtk_recent_manager_get_default (), call->uri, &recent);
            }
        }
      else if (!g_error_matches (error, G_IO_ERROR, G_IO_ERROR_CANCELLED))
        qv_window_show_error (self, _("The file could not be opened"), error);
    }
  g_object_unref (call->window);
  g_object_unref (call->job);
  g_free (call->uri);
  g_free (call);
}

void
qv_window_open_source (QvWindow *self, const QvDocumentSource *source)
{
  LoadCall *call = g_new0 (LoadCall, 1);
  g_autofree char *what = NULL;

  if (source->demo)
    what = g_strdup (_("Opening the demo"));
  else
    {
      g_autofree char *base = g_path_get_basename (source->geometry);
      /* TRANSLATORS: %s is a file name */
      what = g_strdup_printf (_("Opening %s"), base);
    }
  call->window = g_object_ref (self);
  call->job = g_object_ref (job_begin (self, what));
  if (!source->demo)
    {
      g_autoptr(GFile) file = g_file_new_for_path (source->geometry);
      call->uri = g_file_get_uri (file);
    }
  qv_document_load_async (source, call->job, job_progress, self, load_done, call);
}

void
qv_window_open_demo (QvWindow *self)
{
  QvDocumentSource source = { .demo = TRUE };
  qv_window_open_source (self, &source);
}

static void
hessian_chosen (QvHessianDialog *dialog, QvDocumentSource *source, gpointer data)
{
  qv_window_open_source (QV_WINDOW (data), source);
}

void
qv_window_open_file (QvWindow *self, GFile *file)
{
  g_autofree char *path = g_file_get_path (file);
  GError *error = NULL;

  if (path == NULL)
    {
      g_autofree char *uri = g_file_get_uri (file);
      error = g_error_new (QV_ERROR, QV_ERROR_INPUT, _("%s is not a local file"), uri);
      qv_window_show_error (self, _("The file could not be opened"), error);
      g_error_free (error);
      return;
    }
  if (qv_input_is_bundle (path))
    {
      QvDocumentSource source = { .geometry = path };
      qv_window_open_source (self, &source);
    }
  else
    {
      /* A geometry needs its Hessian and that Hessian's units: ask. */
      QvHessianDialog *dialog = qv_hessian_dialog_new (GTK_WINDOW (self), path);
      g_signal_connect_object (dialog, "chosen", G_CALLBACK (hessian_chosen), self, 0);
      gtk_window_present (GTK_WINDOW (dialog));
    }
}

static void
chooser_response (GtkNativeDialog *chooser, int response, gpointer data)
{
  QvWindow *self = data;

  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr(GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (chooser));
      if (file)
        qv_window_open_file (self, file);
    }
  gtk_native_dialog_destroy (chooser);
  g_object_unref (chooser);
  g_object_unref (self);
}

void
qv_window_choose_file (QvWindow *self)
{
  GtkFileChooserNative *chooser =
    gtk_file_chooser_native_new (_("Open a Bundle or a Geometry"), GTK_WINDOW (self),
                                 GTK_FILE_CHOOSER_ACTION_OPEN, _("_Open"), _("_Cancel"));
  GtkFileFilter *filter;

  filter = gtk_file_filter_new ();
  gtk_file_filter_set_name (filter, _("Bundles and geometries"));
  gtk_file_filter_add_pattern (filter, "*.quaver.json");
  gtk_file_filter_add_pattern (filter, "*.json");
  gtk_file_filter_add_pattern (filter, "*.xyz");
  gtk_file_filter_add_pattern (filter, "*.extxyz");
  gtk_file_chooser_add_filter (GTK_FILE_CHOOSER (chooser), filter);
  g_object_unref (filter);
  filter = gtk_file_filter_new ();
  gtk_file_filter_set_name (filter, _("Quaver bundles (*.quaver.json)"));
  gtk_file_filter_add_pattern (filter, "*.quaver.json");
  gtk_file_chooser_add_filter (GTK_FILE_CHOOSER (chooser), filter);
  g_object_unref (filter);
  filter = gtk_file_filter_new ();
  gtk_file_filter_set_name (filter, _("XYZ geometries (*.xyz)"));
  gtk_file_filter_add_pattern (filter, "*.xyz");
  gtk_file_filter_add_pattern (filter, "*.extxyz");
  gtk_file_chooser_add_filter (GTK_FILE_CHOOSER (chooser), filter);
  g_object_unref (filter);
  filter = gtk_file_filter_new ();
  gtk_file_filter_set_name (filter, _("All files"));
  gtk_file_filter_add_pattern (filter, "*");
  gtk_file_chooser_add_filter (GTK_FILE_CHOOSER (chooser), filter);
  g_object_unref (filter);

  gtk_native_dialog_set_modal (GTK_NATIVE_DIALOG (chooser), TRUE);
  g_signal_connect (chooser, "response", G_CALLBACK (chooser_response), g_object_ref (self));
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
}

/* ---- comparing ---- */

QvCompareWindow *
qv_window_compare_with (QvWindow *self, const char *path)
{
  QvDocumentSource source = { .geometry = (char *) path };
  QvCompareWindow *compare;

  if (self->document == NULL)
    return NULL;
  compare = qv_compare_window_new (GTK_WINDOW (self), self->document);
  qv_compare_window_load (compare, &source);
  gtk_window_present (GTK_WINDOW (compare));
  return compare;
}

static void
compare_chooser_response (GtkNativeDialog *chooser, int response, gpointer data)
{
  QvWindow *self = data;

  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr(GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (chooser));
      g_autofree char *path = file ? g_file_get_path (file) : NULL;

      if (path && qv_input_is_bundle (path))
        qv_window_compare_with (self, path);
      else if (file)
        {
          g_autoptr(GError) error = g_error_new (QV_ERROR, QV_ERROR_USAGE, "%s",
                                                 _("Compare takes a Quaver bundle (*.quaver.json) with a "
                                                   "Hessian or precomputed modes of the same atoms."));
          qv_window_show_error (self, _("This file cannot be compared"), error);
        }
    }
  gtk_native_dialog_destroy (chooser);
  g_object_unref (chooser);
  g_object_unref (self);
}

void
qv_window_choose_compare (QvWindow *self)
{
  GtkFileChooserNative *chooser;
  GtkFileFilter *filter;

  if (self->document == NULL)
    return;
  chooser = gtk_file_chooser_native_new (_("Compare With a Bundle"), GTK_WINDOW (self),
                                         GTK_FILE_CHOOSER_ACTION_OPEN, _("_Compare"), _("_Cancel"));
  filter = gtk_file_filter_new ();
  gtk_file_filter_set_name (filter, _("Quaver bundles (*.quaver.json)"));
  gtk_file_filter_add_pattern (filter, "*.quaver.json");
  gtk_file_filter_add_pattern (filter, "*.json");
  gtk_file_chooser_add_filter (GTK_FILE_CHOOSER (chooser), filter);
  g_object_unref (filter);
  gtk_native_dialog_set_modal (GTK_NATIVE_DIALOG (chooser), TRUE);
  g_signal_connect (chooser, "response", G_CALLBACK (compare_chooser_response), g_object_ref (self));
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
}

static gboolean
files_dropped (GtkDropTarget *target, const GValue *value, double x, double y, gpointer data)
{
  QvWindow *self = data;
  GSList *files = g_value_get_boxed (value);

  if (files == NULL)
    return FALSE;
  /* One document per window: the first file here, the rest in new ones. */
  qv_window_open_file (self, files->data);
  for (GSList *l = files->next; l; l = l->next)
    {
      GtkApplication *app = gtk_window_get_application (GTK_WINDOW (self));
      QvWindow *other = qv_window_new (app);
      gtk_window_present (GTK_WINDOW (other));
      qv_window_open_file (other, l->data);
    }
  return TRUE;
}

/* ---- masses ---- */

typedef struct {
  QvWindow *window;
  GCancellable *job;
} SolveCall;

static void
solve_done (GObject *source, GAsyncResult *result, gpointer data)
{
  SolveCall *call = data;
  g_autoptr(GError) error = NULL;
  const gboolean ok = qv_document_solve_finish (QV_DOCUMENT (source), result, &error);

  if (job_end (call->window, call->job) && !ok
      && !g_error_matches (error, G_IO_ERROR, G_IO_ERROR_CANCELLED))
    qv_window_show_error (call->window, _("The modes could not be solved with these masses"), error);
  g_object_unref (call->window);
  g_object_unref (call->job);
  g_free (call);
}

void
qv_window_solve_masses (QvWindow *self, QvStructure *structure)
{
  SolveCall *call;

  if (self->document == NULL)
    {
      qv_structure_free (structure);
      return;
    }
  call = g_new0 (SolveCall, 1);
  call->window = g_object_ref (self);
  call->job = g_object_ref (job_begin (self, _("Solving with the new masses")));
  qv_document_solve_async (self->document, structure, call->job, job_progress, self,
                           solve_done, call);
}

static void
edit_mass (QvWindow *self, gsize atom, guint mass_number, double mass)
{
  g_autoptr(QvStructure) s = NULL;
  g_autoptr(GError) error = NULL;
  gboolean ok;

  if (self->document == NULL)
    return;
  s = qv_structure_copy (qv_document_get_structure (self->document));
  ok = mass_number ? qv_structure_set_isotope (s, atom, mass_number, &error)
                   : qv_structure_set_mass (s, atom, mass, &error);
  if (!ok)
    {
      qv_window_show_error (self, _("This mass cannot be used"), error);
      return;
    }
  qv_window_solve_masses (self, g_steal_pointer (&s));
}

void
qv_window_set_atom_isotope (QvWindow *self, gsize atom, guint mass_number)
{
  edit_mass (self, atom, mass_number, 0.0);
}

void
qv_window_set_atom_mass (QvWindow *self, gsize atom, double mass)
{
  edit_mass (self, atom, 0, mass);
}

void
qv_window_reset_masses (QvWindow *self)
{
  if (self->document && qv_document_get_masses_edited (self->document))
    qv_window_solve_masses (self, qv_structure_copy (qv_document_get_original (self->document)));
}

static void
mass_chosen (QvAtomPopover *popover, guint atom, guint mass_number, double mass, gpointer data)
{
  edit_mass (QV_WINDOW (data), atom, mass_number, mass);
}

void
qv_window_show_atom (QvWindow *self, gsize atom, double x, double y)
{
  const int k = qv_mode_panel_get_selected (self->mode_panel);
  double amplitude = 0.0;
  GdkRectangle rect = { (int) x, (int) y, 1, 1 };

  if (self->document == NULL || atom >= qv_document_get_structure (self->document)->n_atoms)
    return;
  if (k >= 0)
    amplitude = qv_mode_set_display_amplitude (qv_document_get_modes (self->document), (gsize) k,
                                               qv_mode_panel_get_level (self->mode_panel),
                                               qv_motion_bar_get_amplitude (self->motion_bar), NULL);
  qv_atom_popover_show_atom (self->atom_popover, self->document, atom, k, amplitude);
  gtk_popover_set_pointing_to (GTK_POPOVER (self->atom_popover), &rect);
  gtk_popover_popup (GTK_POPOVER (self->atom_popover));
  qv_mode_view_set_highlight (self->mode_view, (gssize) atom);
}

static void
atom_popover_closed (QvWindow *self)
{
  qv_mode_view_set_highlight (self->mode_view, -1);
}

static void
atom_activated (QvModeView *view, guint atom, double x, double y, gpointer data)
{
  /* the replica's atoms are not the document's: no mass editing there */
  if (QV_WINDOW (data)->lattice_shown)
    return;
  qv_window_show_atom (QV_WINDOW (data), atom, x, y);
}

/* A row of the thermochemistry table was chosen; the table follows the
 * mode list's selection. */
static void
thermo_mode_activated (QvThermoPanel *panel, int mode, gpointer data)
{
  qv_mode_panel_select (QV_WINDOW (data)->mode_panel, mode);
}

static void
thermo_follow_selection (QvWindow *self)
{
  qv_thermo_panel_set_selected (self->thermo_panel, qv_mode_panel_get_selected (self->mode_panel));
}

/* A peak of the spectrum was clicked. */
static void
spectrum_mode_activated (QvSpectrumView *view, int mode, gpointer data)
{
  qv_mode_panel_select (QV_WINDOW (data)->mode_panel, mode);
}

/* ---- navigation ---- */

void
qv_window_step_mode (QvWindow *self, int delta)
{
  qv_mode_panel_step (self->mode_panel, delta);
}

void
qv_window_view_along (QvWindow *self, int axis)
{
  qv_mode_view_view_along (self->mode_view, axis);
}

void
qv_window_reset_view (QvWindow *self)
{
  qv_mode_view_reset (self->mode_view);
}

static void
play_changed (QvWindow *self)
{
  gtk_button_set_icon_name (GTK_BUTTON (self->play_button),
                            qv_mode_view_get_playing (self->mode_view)
                            ? "media-playback-pause-symbolic" : "media-playback-start-symbolic");
}

/* ---- background follows the desktop unless chosen ---- */

static void
background_changed (QvWindow *self)
{
  QvBackgroundChoice choice;
  gboolean dark;

  g_object_get (self->prefs, "background", &choice, NULL);
  if (choice == QV_BACKGROUND_CHOICE_SYSTEM)
    dark = adw_style_manager_get_dark (adw_style_manager_get_default ());
  else
    dark = choice == QV_BACKGROUND_CHOICE_DARK;
  qv_mode_view_set_dark (self->mode_view, dark);
}

/* ---- life cycle ---- */

static gboolean
qv_window_close_request (GtkWindow *window)
{
  QvWindow *self = QV_WINDOW (window);
  int width, height;

  /* unsaved masses or view: ask first (qv-window-save.h) */
  if (qv_window_save_close_request (self))
    return TRUE;
  qv_window_cancel (self);
  gtk_window_get_default_size (window, &width, &height);
  g_object_set (self->prefs,
                "window-maximized", gtk_window_is_maximized (window),
                NULL);
  if (!gtk_window_is_maximized (window))
    g_object_set (self->prefs, "window-width", MAX (width, 400), "window-height", MAX (height, 300), NULL);
  return GTK_WINDOW_CLASS (qv_window_parent_class)->close_request (window);
}

static gboolean
prepare_view (gpointer data)
{
  QvWindow *self = data;
  qv_mode_view_prepare (self->mode_view);
  return G_SOURCE_REMOVE;
}

static void
qv_window_map (GtkWidget *widget)
{
  GTK_WIDGET_CLASS (qv_window_parent_class)->map (widget);
  /* After the first frame of the window: its GL context and the view's
   * renderer are made while the welcome page shows. */
  g_idle_add_full (G_PRIORITY_LOW, prepare_view, g_object_ref (widget), g_object_unref);
}

static void
qv_window_dispose (GObject *object)
{
  QvWindow *self = QV_WINDOW (object);

  qv_window_cancel (self);
  if (self->document)
    g_clear_signal_handler (&self->changed_id, self->document);
  g_clear_object (&self->document);
  if (self->atom_popover)
    {
      gtk_widget_unparent (GTK_WIDGET (self->atom_popover));
      self->atom_popover = NULL;
    }
  gtk_widget_dispose_template (GTK_WIDGET (self), QV_TYPE_WINDOW);
  G_OBJECT_CLASS (qv_window_parent_class)->dispose (object);
}

static void
qv_window_class_init (QvWindowClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = qv_window_dispose;
  GTK_WINDOW_CLASS (klass)->close_request = qv_window_close_request;
  widget_class->map = qv_window_map;

  g_type_ensure (QV_TYPE_WELCOME_PAGE);
  g_type_ensure (QV_TYPE_MODE_VIEW);
  g_type_ensure (QV_TYPE_MOTION_BAR);
  g_type_ensure (QV_TYPE_MODE_PANEL);
  g_type_ensure (QV_TYPE_LATTICE_PANE);
  g_type_ensure (QV_TYPE_THERMO_PANEL);
  g_type_ensure (QV_TYPE_MODE_DETAIL);
  g_type_ensure (QV_TYPE_EXPORT_PANE);
  g_type_ensure (QV_TYPE_SPECTRUM_VIEW);
  gtk_widget_class_set_template_from_resource (widget_class, "/org/quaverlab/Quaver/gui/qv-window.ui");
  gtk_widget_class_bind_template_child (widget_class, QvWindow, title_label);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, subtitle_label);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, play_button);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, export_button);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, progress_revealer);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, progress_label);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, progress_bar);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, stack);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, welcome_page);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, paned);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, mode_view);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, motion_bar);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, mode_panel);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, mode_detail);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, export_flap);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, view_overlay);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, export_pane);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, spectrum_button);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, spectrum_revealer);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, spectrum_view);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, side_switcher);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, side_stack);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, lattice_pane);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, modes_page);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, lattice_page);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, thermo_page);
  gtk_widget_class_bind_template_child (widget_class, QvWindow, thermo_panel);
}

static void
qv_window_init (QvWindow *self)
{
  GtkDropTarget *drop;
  int width, height;
  gboolean maximized;

  gtk_widget_init_template (GTK_WIDGET (self));
  self->prefs = qv_preferences_get_default ();

  g_object_get (self->prefs, "window-width", &width, "window-height", &height,
                "window-maximized", &maximized, NULL);
  gtk_window_set_default_size (GTK_WINDOW (self), width, height);
  if (maximized)
    gtk_window_maximize (GTK_WINDOW (self));

  /* Preferences drive the view and the list. */
  g_object_bind_property (self->prefs, "show-arrows", self->mode_view, "show-arrows", G_BINDING_SYNC_CREATE);
  g_object_bind_property (self->prefs, "show-labels", self->mode_view, "show-labels", G_BINDING_SYNC_CREATE);
  g_object_bind_property (self->prefs, "participation-colouring", self->mode_view, "participation-colouring",
                          G_BINDING_SYNC_CREATE);
  g_object_bind_property (self->prefs, "orthographic", self->mode_view, "orthographic", G_BINDING_SYNC_CREATE);
  g_object_bind_property (self->prefs, "speed", self->motion_bar, "speed",
                          G_BINDING_SYNC_CREATE | G_BINDING_BIDIRECTIONAL);
  g_object_bind_property (self->prefs, "amplitude", self->motion_bar, "amplitude",
                          G_BINDING_SYNC_CREATE | G_BINDING_BIDIRECTIONAL);
  g_object_bind_property (self->motion_bar, "speed", self->mode_view, "speed", G_BINDING_SYNC_CREATE);
  g_object_bind_property (self->prefs, "wavenumber-unit", self->mode_panel, "unit", G_BINDING_SYNC_CREATE);
  {
    guint level;
    g_object_get (self->prefs, "default-level", &level, NULL);
    qv_mode_panel_set_level (self->mode_panel, level);
  }
  g_signal_connect_object (self->prefs, "notify::background", G_CALLBACK (background_changed), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (adw_style_manager_get_default (), "notify::dark", G_CALLBACK (background_changed),
                           self, G_CONNECT_SWAPPED);
  background_changed (self);

  g_signal_connect_object (self->mode_panel, "notify::selected", G_CALLBACK (show_selected_mode), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->mode_panel, "notify::level", G_CALLBACK (amplitude_changed), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->motion_bar, "notify::amplitude", G_CALLBACK (amplitude_changed), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->mode_view, "notify::playing", G_CALLBACK (play_changed), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->mode_view, "atom-activated", G_CALLBACK (atom_activated), self, 0);
  g_signal_connect_object (self->spectrum_view, "mode-activated", G_CALLBACK (spectrum_mode_activated), self, 0);
  g_signal_connect_object (self->lattice_pane, "mode-activated", G_CALLBACK (lattice_mode_activated), self, 0);
  g_signal_connect_object (self->lattice_pane, "notify::cells", G_CALLBACK (lattice_cells_changed), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->side_stack, "notify::visible-child", G_CALLBACK (side_page_changed), self,
                           G_CONNECT_SWAPPED);
  g_object_bind_property (self->prefs, "wavenumber-unit", self->lattice_pane, "unit", G_BINDING_SYNC_CREATE);
  g_object_bind_property (self->prefs, "wavenumber-unit", self->thermo_panel, "unit", G_BINDING_SYNC_CREATE);
  g_signal_connect_object (self->thermo_panel, "mode-activated", G_CALLBACK (thermo_mode_activated), self, 0);
  g_signal_connect_object (self->mode_panel, "notify::selected", G_CALLBACK (thermo_follow_selection), self,
                           G_CONNECT_SWAPPED);
  play_changed (self);

  self->atom_popover = qv_atom_popover_new ();
  gtk_widget_set_parent (GTK_WIDGET (self->atom_popover), GTK_WIDGET (self->mode_view));
  g_signal_connect_object (self->atom_popover, "mass-chosen", G_CALLBACK (mass_chosen), self, 0);
  g_signal_connect_object (self->atom_popover, "closed", G_CALLBACK (atom_popover_closed), self,
                           G_CONNECT_SWAPPED);

  drop = gtk_drop_target_new (GDK_TYPE_FILE_LIST, GDK_ACTION_COPY);
  g_signal_connect (drop, "drop", G_CALLBACK (files_dropped), self);
  gtk_widget_add_controller (GTK_WIDGET (self), GTK_EVENT_CONTROLLER (drop));

  qv_window_actions_install (self);
  qv_window_actions_update (self);
  update_title (self);
  qv_export_pane_attach (self->export_pane, GTK_WIDGET (self));
  /* The motion bar floats over the view but its width counts: the view
   * never gets narrower than the bar, so the bar is never cut off (with the
   * export pane open on a narrow window, the pane slides over instead). */
  gtk_overlay_set_measure_overlay (self->view_overlay, GTK_WIDGET (self->motion_bar), TRUE);
}

QvWindow *
qv_window_new (GtkApplication *app)
{
  return g_object_new (QV_TYPE_WINDOW, "application", app, NULL);
}

QvDocument *qv_window_get_document (QvWindow *self) { return self->document; }
QvModePanel *qv_window_get_mode_panel (QvWindow *self) { return self->mode_panel; }
QvModeView *qv_window_get_mode_view (QvWindow *self) { return self->mode_view; }
QvMotionBar *qv_window_get_motion_bar (QvWindow *self) { return self->motion_bar; }
QvModeDetail *qv_window_get_mode_detail (QvWindow *self) { return self->mode_detail; }
QvSpectrumView *qv_window_get_spectrum_view (QvWindow *self) { return self->spectrum_view; }
GtkRevealer *qv_window_get_spectrum_revealer (QvWindow *self) { return self->spectrum_revealer; }
QvLatticePane *qv_window_get_lattice_pane (QvWindow *self) { return self->lattice_pane; }
QvThermoPanel *qv_window_get_thermo_panel (QvWindow *self) { return self->thermo_panel; }
const char *qv_window_get_side_page (QvWindow *self) { return gtk_stack_get_visible_child_name (self->side_stack); }
gboolean qv_window_get_side_switcher_visible (QvWindow *self) { return gtk_widget_get_visible (self->side_switcher); }

void
qv_window_show_side_page (QvWindow *self, const char *name)
{
  gtk_stack_set_visible_child_name (self->side_stack, name);
}

AdwFlap *
qv_window_get_export_flap (QvWindow *self)
{
  return self->export_flap;
}

QvExportPane *
qv_window_get_export_pane (QvWindow *self)
{
  return self->export_pane;
}
