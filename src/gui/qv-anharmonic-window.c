/* qv-anharmonic-window.c — anharmonic levels on a scan's potential.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include "qv-config.h"
#include <math.h>
#include <string.h>
#include "qv-anharmonic-window.h"
#include "qv-error.h"
#include "qv-error-dialog.h"
#include "qv-output.h"
#include "qv-png-writer.h"
#include "qv-potential-plot.h"

/* The scan read, shared by the window and the workers that fit and solve
 * on it (a re-solve may still run when a new scan replaces it). */
typedef struct {
  QvScanEnergies *scan;
} Scan;

static void
scan_clear (gpointer data)
{
  Scan *s = data;
  g_clear_pointer (&s->scan, qv_scan_energies_free);
}

static Scan *scan_ref (Scan *s) { return g_atomic_rc_box_acquire (s); }
static void scan_unref (Scan *s) { g_atomic_rc_box_release_full (s, scan_clear); }

/* One solve: the potential, its levels and their report (which borrows
 * them and the scan). */
typedef struct {
  Scan *scan;
  QvScanPotential *potential;
  QvScanLevels *levels;
  QvScanLevelsReport report;
  gsize n_points;
  double *Q, *V;             /* the points along the first axis, for the plot */
} Result;

static void
result_free (Result *r)
{
  if (r == NULL)
    return;
  qv_scan_levels_report_clear (&r->report);
  g_clear_pointer (&r->levels, qv_scan_levels_free);
  g_clear_pointer (&r->potential, qv_scan_potential_free);
  g_clear_pointer (&r->scan, scan_unref);
  g_free (r->Q);
  g_free (r->V);
  g_free (r);
}

#define N_LEVELS 6

struct _QvAnharmonicWindow
{
  GtkWindow parent_instance;

  GtkLabel *subtitle_label;
  GtkWidget *save_button;
  GtkSpinner *spinner;
  GtkCheckButton *spline_check;
  GtkSpinButton *degree_spin;
  GtkStack *stack;
  GtkLabel *busy_label;
  GtkLabel *error_label;
  GtkBox *banner_box;
  GtkDrawingArea *plot_area;
  GtkLabel *readout_label;
  GtkGrid *level_grid;
  GtkLabel *summary_label;

  Scan *scan;                /* the scan shown (or being re-solved) */
  Result *result;
  QvScanFit fit;
  guint degree;              /* 0: the default */
  GCancellable *job;
  char *error;
  GtkWindow *error_dialog;   /* cleared when it goes (error_dialog_gone) */
  gint hover_level;
  gboolean syncing;          /* the controls are being set from a result */
  char *cells[N_LEVELS * 4][QV_ANHARMONIC_N_COLUMNS];
};

G_DEFINE_FINAL_TYPE (QvAnharmonicWindow, qv_anharmonic_window, GTK_TYPE_WINDOW)

static double
cm1 (double ev)
{
  return qv_scan_levels_wavenumber (ev);
}

/* A coordinate for the summary: no "−0.0000" for a minimum at the origin. */
static double
tidy (double q)
{
  return fabs (q) < 5e-5 ? 0.0 : q;
}

/* ---- the worker: read, fit, solve ---- */

typedef struct {
  char *manifest;            /* NULL: re-solve @scan */
  char *energies;
  QvScanEnergiesOptions options;
  Scan *scan;
  QvScanFit fit;
  guint degree;
} Job;

static void
job_free (gpointer data)
{
  Job *j = data;
  g_free (j->manifest);
  g_free (j->energies);
  g_clear_pointer (&j->scan, scan_unref);
  g_free (j);
}

static void
solve_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  Job *j = task_data;
  GError *error = NULL;
  Result *r = g_new0 (Result, 1);

  if (j->manifest)
    {
      QvScanEnergies *scan;
      j->options.energies = j->energies;
      scan = qv_scan_energies_read (j->manifest, &j->options, &error);
      if (scan == NULL)
        goto fail;
      j->scan = g_atomic_rc_box_new0 (Scan);
      j->scan->scan = scan;
    }
  r->scan = scan_ref (j->scan);
  /* the calls of `quaver anharmonic` (src/cli/qv-cmd-anharmonic.c) */
  r->potential = qv_scan_energies_potential (r->scan->scan, j->fit, j->degree, &error);
  if (r->potential == NULL)
    goto fail;
  r->levels = qv_scan_potential_solve (r->potential, N_LEVELS, 0, 0, &error);
  if (r->levels == NULL)
    goto fail;
  qv_scan_levels_report_init (&r->report, r->scan->scan, r->potential, r->levels);
  r->n_points = r->scan->scan->points->len;
  r->Q = g_new (double, r->n_points);
  r->V = g_new (double, r->n_points);
  for (gsize i = 0; i < r->n_points; i++)
    {
      const QvScanPoint *p = &g_array_index (r->scan->scan->points, QvScanPoint, i);
      r->Q[i] = p->Q[0];
      r->V[i] = p->energy;
    }
  g_task_return_pointer (task, r, (GDestroyNotify) result_free);
  return;

fail:
  result_free (r);
  g_task_return_error (task, error);
}

/* ---- showing ---- */

static void
error_dialog_gone (QvAnharmonicWindow *self, GtkWindow *dialog)
{
  if (self->error_dialog == dialog)
    self->error_dialog = NULL;
}

static void
show_error (QvAnharmonicWindow *self, const char *primary, const GError *error)
{
  g_free (self->error);
  self->error = g_strdup (error->message);
  gtk_label_set_label (self->error_label, error->message);
  gtk_stack_set_visible_child_name (self->stack, "error");
  gtk_widget_set_sensitive (self->save_button, FALSE);
  if (self->error_dialog)
    gtk_window_destroy (self->error_dialog);
  self->error_dialog = qv_error_dialog_show (GTK_WIDGET (self), primary, error);
  /* NULL again once it is answered and gone (disconnected if we go first) */
  g_signal_connect_object (self->error_dialog, "destroy", G_CALLBACK (error_dialog_gone), self,
                           G_CONNECT_SWAPPED);
}

static void
clear_grid (GtkGrid *grid)
{
  GtkWidget *child;
  while ((child = gtk_widget_get_first_child (GTK_WIDGET (grid))))
    gtk_grid_remove (grid, child);
}

static void
clear_cells (QvAnharmonicWindow *self)
{
  for (gsize v = 0; v < G_N_ELEMENTS (self->cells); v++)
    for (gsize c = 0; c < QV_ANHARMONIC_N_COLUMNS; c++)
      g_clear_pointer (&self->cells[v][c], g_free);
}

static void
add_cell (GtkGrid *grid, int column, int row, const char *text, gboolean heading)
{
  GtkWidget *label = gtk_label_new (text);

  gtk_label_set_xalign (GTK_LABEL (label), heading || column == QV_ANHARMONIC_COLUMN_FLAGS ? 0 : 1);
  gtk_label_set_selectable (GTK_LABEL (label), !heading);
  if (heading)
    gtk_widget_add_css_class (label, "heading");
  else if (column != QV_ANHARMONIC_COLUMN_FLAGS)
    gtk_widget_add_css_class (label, "numeric");
  gtk_grid_attach (grid, label, column, row, 1, 1);
}

static void
fill_table (QvAnharmonicWindow *self)
{
  const QvScanLevels *l = self->result->levels;
  const gboolean one_d = l->dim == 1;
  const char *headings[QV_ANHARMONIC_N_COLUMNS] = {
    /* TRANSLATORS: the level table's columns: quantum number, energy above
     * the potential's minimum, E_v − E_0, mean coordinate, classical turning
     * points, weight of the wavefunction near the grid's edge, flags */
    "v", _("E (cm⁻¹)"), _("E − E₀ (cm⁻¹)"), one_d ? _("⟨Q⟩ (u½ Å)") : _("⟨Q₁⟩, ⟨Q₂⟩ (u½ Å)"),
    _("Turning points (u½ Å)"), _("Edge weight"), _("Flags"),
  };

  clear_grid (self->level_grid);
  clear_cells (self);
  for (int c = 0; c < QV_ANHARMONIC_N_COLUMNS; c++)
    add_cell (self->level_grid, c, 0, headings[c], TRUE);
  for (gsize v = 0; v < l->n_levels && v < G_N_ELEMENTS (self->cells); v++)
    {
      const QvScanLevel *lv = &l->levels[v];
      const double weight_limit = QV_SCAN_EDGE_WEIGHT_LIMIT;
      char **row = self->cells[v];
      g_autoptr(GString) flags = g_string_new (NULL);

      row[QV_ANHARMONIC_COLUMN_V] = g_strdup_printf ("%zu", v);
      row[QV_ANHARMONIC_COLUMN_ENERGY] = g_strdup_printf ("%.4f", cm1 (lv->energy));
      row[QV_ANHARMONIC_COLUMN_SPACING] = g_strdup_printf ("%.4f", cm1 (lv->energy - l->levels[0].energy));
      row[QV_ANHARMONIC_COLUMN_MEAN] = one_d ? g_strdup_printf ("%.4f", lv->mean[0])
                                             : g_strdup_printf ("%.4f, %.4f", lv->mean[0], lv->mean[1]);
      if (!one_d)
        row[QV_ANHARMONIC_COLUMN_TURNING] = g_strdup ("—");
      else
        {
          g_autofree char *a = isfinite (lv->turning[0]) ? g_strdup_printf ("%.4f", lv->turning[0])
                                                          : g_strdup (_("beyond the scan"));
          g_autofree char *b = isfinite (lv->turning[1]) ? g_strdup_printf ("%.4f", lv->turning[1])
                                                          : g_strdup (_("beyond the scan"));
          row[QV_ANHARMONIC_COLUMN_TURNING] = g_strdup_printf ("%s … %s", a, b);
        }
      row[QV_ANHARMONIC_COLUMN_EDGE] = g_strdup_printf ("%.2e", lv->edge_weight);
      if (lv->above_scan)
        g_string_append (flags, _("above the scan"));
      if (lv->edge_weight > weight_limit)
        g_string_append_printf (flags, "%s%s", flags->len ? ", " : "", _("weight at the edge"));
      row[QV_ANHARMONIC_COLUMN_FLAGS] = g_string_free (g_steal_pointer (&flags), FALSE);
      for (int c = 0; c < QV_ANHARMONIC_N_COLUMNS; c++)
        add_cell (self->level_grid, c, (int) v + 1, row[c], FALSE);
    }
}

static void
fill_summary (QvAnharmonicWindow *self)
{
  const Result *r = self->result;
  const QvScanLevels *l = r->levels;
  g_autoptr(GString) s = g_string_new (NULL);
  double rms, max;

  if (l->dim == 1)
    {
      /* TRANSLATORS: the anharmonic summary of a scan, all in cm⁻¹ */
      g_string_append_printf (s, _("Fundamental %.4f · first overtone %.4f · harmonic (curvature "
                                   "at the minimum) %.4f · manifest %.4f cm⁻¹"),
                              cm1 (l->fundamental), cm1 (l->overtone), l->harmonic[0],
                              r->report.wavenumbers[0]);
      g_string_append_c (s, '\n');
      g_string_append_printf (s, _("ωₑ %.4f · ωₑxₑ %.4f cm⁻¹ · minimum at Q = %.4f u½ Å"),
                              cm1 (l->omega_e), cm1 (l->omega_e_x_e), tidy (l->q_min[0]));
      if (l->minima && l->minima->len > 1)
        {
          const QvScanMinimum *a = &g_array_index (l->minima, QvScanMinimum, 0);
          const QvScanMinimum *b = &g_array_index (l->minima, QvScanMinimum, 1);
          g_string_append_c (s, '\n');
          /* TRANSLATORS: a double well: both minima (Q, energy), the barrier and the
           * tunnelling splitting */
          g_string_append_printf (s, _("Double well: minima at Q = %.4f (%.4f cm⁻¹) and %.4f "
                                       "(%.4f cm⁻¹) · barrier %.4f cm⁻¹ · tunnelling splitting "
                                       "%.4f cm⁻¹"),
                                  tidy (a->Q[0]), cm1 (a->energy), tidy (b->Q[0]), cm1 (b->energy),
                                  cm1 (l->barrier), cm1 (l->splitting));
        }
    }
  else
    {
      /* TRANSLATORS: the coupled fundamentals of a two-mode grid and the harmonic
       * values from the curvature, cm⁻¹ */
      g_string_append_printf (s, _("Coupled fundamentals %.4f and %.4f · harmonic %.4f and %.4f cm⁻¹"),
                              cm1 (l->fundamentals[0]), cm1 (l->fundamentals[1]), l->harmonic[0],
                              l->harmonic[1]);
    }
  qv_scan_potential_residual (r->potential, &rms, &max);
  g_string_append_c (s, '\n');
  if (qv_scan_potential_fit (r->potential) == QV_SCAN_FIT_SPLINE)
    g_string_append_printf (s, _("Natural cubic spline through %zu points"), r->n_points);
  else
    /* TRANSLATORS: the fit: degree, points, residual rms and largest, cm⁻¹ */
    g_string_append_printf (s, _("Polynomial of degree %u through %zu points · residual rms %.4f, "
                                 "largest %.4f cm⁻¹"),
                            qv_scan_potential_degree (r->potential), r->n_points, cm1 (rms), cm1 (max));
  if (l->refinement && l->refinement->steps->len)
    {
      const QvDvrStep *st = &g_array_index (l->refinement->steps, QvDvrStep,
                                            l->refinement->steps->len - 1);
      g_string_append_printf (s, " · ");
      /* TRANSLATORS: the DVR grid: points per axis, converged or not */
      g_string_append_printf (s, l->refinement->converged ? _("DVR grid of %zu points, converged")
                                                          : _("DVR grid of %zu points, not converged"),
                              st->n[0]);
    }
  gtk_label_set_label (self->summary_label, s->str);
}

static void
add_banner (QvAnharmonicWindow *self, const char *text, gboolean warning)
{
  GtkWidget *label = gtk_label_new (text);

  gtk_label_set_wrap (GTK_LABEL (label), TRUE);
  gtk_label_set_xalign (GTK_LABEL (label), 0);
  gtk_widget_add_css_class (label, warning ? "qv-anharmonic-warning" : "qv-anharmonic-note");
  if (!warning)
    gtk_widget_add_css_class (label, "dim-label");
  gtk_box_append (self->banner_box, label);
}

static void
fill_banners (QvAnharmonicWindow *self)
{
  const QvScanLevelsReport *r = &self->result->report;
  GtkWidget *child;

  while ((child = gtk_widget_get_first_child (GTK_WIDGET (self->banner_box))))
    gtk_box_remove (self->banner_box, child);
  for (guint k = 0; k < r->warnings->len; k++)
    {
      /* TRANSLATORS: %s is a warning of the solver (in English) */
      g_autofree char *text = g_strdup_printf (_("Warning: %s"), (const char *) g_ptr_array_index (r->warnings, k));
      add_banner (self, text, TRUE);
    }
  for (guint k = 0; k < r->notes->len; k++)
    add_banner (self, g_ptr_array_index (r->notes, k), FALSE);
}

static void
sync_controls (QvAnharmonicWindow *self)
{
  const Result *r = self->result;

  self->syncing = TRUE;
  gtk_check_button_set_active (self->spline_check, self->fit == QV_SCAN_FIT_SPLINE);
  gtk_widget_set_sensitive (GTK_WIDGET (self->degree_spin), self->fit != QV_SCAN_FIT_SPLINE);
  if (r && qv_scan_potential_fit (r->potential) == QV_SCAN_FIT_POLYNOMIAL)
    gtk_spin_button_set_value (self->degree_spin, qv_scan_potential_degree (r->potential));
  self->syncing = FALSE;
}

static void
show_result (QvAnharmonicWindow *self)
{
  const QvScanLevelsReport *rep = &self->result->report;
  g_autofree char *subtitle = NULL;
  g_autofree char *base = g_path_get_basename (self->result->scan->scan->manifest_path);

  if (rep->dim == 1)
    /* TRANSLATORS: the window's subtitle: mode number, harmonic wavenumber, file */
    subtitle = g_strdup_printf (_("Mode %u (%.1f cm⁻¹) · %s"), rep->modes[0], rep->wavenumbers[0], base);
  else
    subtitle = g_strdup_printf (_("Modes %u and %u · %s"), rep->modes[0], rep->modes[1], base);
  gtk_label_set_label (self->subtitle_label, subtitle);
  gtk_widget_set_visible (GTK_WIDGET (self->subtitle_label), TRUE);
  fill_table (self);
  fill_summary (self);
  fill_banners (self);
  sync_controls (self);
  self->hover_level = -1;
  gtk_widget_set_visible (GTK_WIDGET (self->plot_area), rep->dim == 1);
  gtk_label_set_label (self->readout_label, rep->dim == 1
                       ? _("Point at the plot to read Q, V(Q) and the nearest level.")
                       : _("A two-mode grid's potential is not drawn; its levels are in the table."));
  gtk_widget_queue_draw (GTK_WIDGET (self->plot_area));
  gtk_stack_set_visible_child_name (self->stack, "result");
  gtk_widget_set_sensitive (self->save_button, TRUE);
}

static void
solve_done (GObject *source, GAsyncResult *result, gpointer data)
{
  QvAnharmonicWindow *self = QV_ANHARMONIC_WINDOW (source);
  Job *job = g_task_get_task_data (G_TASK (result));
  const gboolean loading = job->manifest != NULL;
  g_autoptr(GError) error = NULL;
  Result *r = g_task_propagate_pointer (G_TASK (result), &error);

  if (g_error_matches (error, G_IO_ERROR, G_IO_ERROR_CANCELLED))
    return;
  g_clear_object (&self->job);
  gtk_spinner_set_spinning (self->spinner, FALSE);
  if (r == NULL)
    {
      /* nothing shown, nothing saved: the levels of another fit would not
       * be those the controls say (the scan stays for another fit) */
      g_clear_pointer (&self->result, result_free);
      show_error (self, loading ? _("The scan's energies cannot be used")
                                : _("The levels cannot be solved with this fit"), error);
      return;
    }
  if (loading)
    {
      g_clear_pointer (&self->scan, scan_unref);
      self->scan = scan_ref (r->scan);
    }
  result_free (self->result);
  self->result = r;
  show_result (self);
}

static void
start (QvAnharmonicWindow *self, Job *job, const char *busy)
{
  g_autoptr(GTask) task = NULL;

  if (self->job)
    g_cancellable_cancel (self->job);
  g_clear_object (&self->job);
  g_clear_pointer (&self->error, g_free);
  self->job = g_cancellable_new ();
  job->fit = self->fit;
  job->degree = self->fit == QV_SCAN_FIT_SPLINE ? 0 : self->degree;
  gtk_label_set_label (self->busy_label, busy);
  gtk_spinner_set_spinning (self->spinner, TRUE);
  if (self->result == NULL || job->manifest)
    {
      gtk_stack_set_visible_child_name (self->stack, "busy");
      gtk_widget_set_sensitive (self->save_button, FALSE);
    }
  task = g_task_new (self, self->job, solve_done, NULL);
  g_task_set_task_data (task, job, job_free);
  /* The worker owns what it reads (the job, a reference to the scan). */
  g_task_set_return_on_cancel (task, TRUE);
  g_task_run_in_thread (task, solve_thread);
}

void
qv_anharmonic_window_load (QvAnharmonicWindow *self, const char *manifest,
                           const QvScanEnergiesOptions *options)
{
  Job *job = g_new0 (Job, 1);
  g_autofree char *base = g_path_get_basename (manifest);
  g_autofree char *busy = NULL;

  job->manifest = g_strdup (manifest);
  job->options = *options;
  job->energies = g_strdup (options->energies);
  g_clear_pointer (&self->result, result_free);
  g_clear_pointer (&self->scan, scan_unref);
  self->fit = QV_SCAN_FIT_POLYNOMIAL;
  self->degree = 0;
  sync_controls (self);
  /* TRANSLATORS: %s is a file name */
  busy = g_strdup_printf (_("Reading %s and solving for the levels…"), base);
  start (self, job, busy);
}

void
qv_anharmonic_window_set_fit (QvAnharmonicWindow *self, QvScanFit fit, guint degree)
{
  Job *job;

  if (fit == self->fit && (fit == QV_SCAN_FIT_SPLINE || degree == self->degree))
    return;
  self->fit = fit;
  self->degree = degree;
  sync_controls (self);
  if (self->scan == NULL)
    return;
  job = g_new0 (Job, 1);
  job->scan = scan_ref (self->scan);
  start (self, job, _("Solving for the levels…"));
}

static void
fit_changed (QvAnharmonicWindow *self)
{
  if (self->syncing)
    return;
  qv_anharmonic_window_set_fit (self, gtk_check_button_get_active (self->spline_check)
                                      ? QV_SCAN_FIT_SPLINE : QV_SCAN_FIT_POLYNOMIAL,
                                (guint) gtk_spin_button_get_value_as_int (self->degree_spin));
}

/* ---- the plot ---- */

static gboolean
plot_data (QvAnharmonicWindow *self, QvPotentialPlotData *d)
{
  const Result *r = self->result;

  if (r == NULL || r->levels->dim != 1)
    return FALSE;
  d->potential = r->potential;
  d->levels = r->levels;
  d->n_points = r->n_points;
  d->Q = r->Q;
  d->V = r->V;
  return TRUE;
}

static void
plot_options (QvAnharmonicWindow *self, int width, int height, QvPotentialPlotOptions *o)
{
  qv_potential_plot_options_init (o);
  o->width = MAX (width, 200);
  o->height = MAX (height, 150);
  o->selected_level = self->hover_level;
}

static void
draw_plot (GtkDrawingArea *area, cairo_t *cr, int width, int height, gpointer data)
{
  QvAnharmonicWindow *self = data;
  QvPotentialPlotData d;
  QvPotentialPlotOptions o;

  if (!plot_data (self, &d) || width < 200 || height < 150)
    return;
  plot_options (self, width, height, &o);
  qv_potential_plot_draw (cr, &d, &o);
}

void
qv_anharmonic_window_hover (QvAnharmonicWindow *self, double x, double y)
{
  QvPotentialPlotData d;
  QvPotentialPlotOptions o;
  QvPotentialPlotReadout r;
  GtkWidget *area = GTK_WIDGET (self->plot_area);
  gint level = -1;

  if (!plot_data (self, &d))
    return;
  plot_options (self, gtk_widget_get_width (area), gtk_widget_get_height (area), &o);
  if (qv_potential_plot_readout (&d, &o, x, y, &r))
    {
      /* TRANSLATORS: the plot's read-out: Q under the pointer, V(Q) there, the
       * nearest level and its energy */
      g_autofree char *text = g_strdup_printf (_("Q = %.3f u½ Å · V(Q) = %.2f cm⁻¹ · pointer at %.2f cm⁻¹ · "
                                                 "nearest level v = %zu at %.2f cm⁻¹"),
                                               r.Q, r.V, r.energy, r.level, r.level_energy);
      gtk_label_set_label (self->readout_label, text);
      level = (gint) r.level;
    }
  else
    gtk_label_set_label (self->readout_label, _("Point at the plot to read Q, V(Q) and the nearest level."));
  if (level != self->hover_level)
    {
      self->hover_level = level;
      gtk_widget_queue_draw (area);
    }
}

static void
plot_motion (GtkEventControllerMotion *controller, double x, double y, gpointer data)
{
  qv_anharmonic_window_hover (data, x, y);
}

static void
plot_leave (GtkEventControllerMotion *controller, gpointer data)
{
  QvAnharmonicWindow *self = data;

  self->hover_level = -1;
  gtk_widget_queue_draw (GTK_WIDGET (self->plot_area));
}

/* ---- saving ---- */

gboolean
qv_anharmonic_window_save (QvAnharmonicWindow *self, const char *path, gboolean force, GError **error)
{
  static const struct { const char *ext; int kind; } kinds[] = {
    { ".txt", QV_SCAN_LEVELS_TABLE_TEXT }, { ".csv", QV_SCAN_LEVELS_TABLE_CSV },
    { ".json", QV_SCAN_LEVELS_TABLE_JSON }, { ".png", -1 }, { ".svg", -2 },
  };
  const char *dot = strrchr (path, '.');
  int kind = -3;
  g_autofree char *bytes = NULL;
  gsize length = 0;

  if (self->result == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s", _("There are no levels to save yet"));
      return FALSE;
    }
  for (gsize i = 0; dot && i < G_N_ELEMENTS (kinds); i++)
    if (g_ascii_strcasecmp (dot, kinds[i].ext) == 0)
      kind = kinds[i].kind;
  if (kind == -3)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s",
                   _("End the file name in .txt, .csv, .json, .png or .svg to choose the format"));
      return FALSE;
    }
  if (kind >= 0)
    {
      bytes = qv_scan_levels_table_write (&self->result->report, (QvScanLevelsTableFormat) kind);
      length = strlen (bytes);
    }
  else
    {
      QvPotentialPlotData d;
      QvPotentialPlotOptions o;
      const char *text[] = { "Software", "quaver " QV_VERSION, NULL };

      if (!plot_data (self, &d))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "%s",
                       _("A two-mode grid has no plot; save the table instead"));
          return FALSE;
        }
      qv_potential_plot_options_init (&o);
      if (kind == -2)
        bytes = qv_potential_plot_svg (&d, &o, &length, error);
      else
        {
          g_autofree guint8 *rgba = qv_potential_plot_rgba (&d, &o, error);
          if (rgba)
            bytes = (char *) qv_png_encode (rgba, o.width, o.height, FALSE, text, &length, error);
        }
      if (bytes == NULL)
        return FALSE;
    }
  return qv_output_write (path, bytes, length, force, error);
}

static void
save_response (GtkNativeDialog *chooser, int response, gpointer data)
{
  QvAnharmonicWindow *self = data;

  if (response == GTK_RESPONSE_ACCEPT)
    {
      g_autoptr(GFile) file = gtk_file_chooser_get_file (GTK_FILE_CHOOSER (chooser));
      g_autofree char *path = file ? g_file_get_path (file) : NULL;
      g_autoptr(GError) error = NULL;

      /* The chooser has asked before replacing a file. */
      if (path && !qv_anharmonic_window_save (self, path, TRUE, &error))
        {
          qv_error_dialog_show (GTK_WIDGET (self), _("The levels could not be saved"), error);
        }
    }
  gtk_native_dialog_destroy (chooser);
  g_object_unref (chooser);
  g_object_unref (self);
}

static void
save_clicked (QvAnharmonicWindow *self)
{
  GtkFileChooserNative *chooser =
    gtk_file_chooser_native_new (_("Save the Levels or the Plot"), GTK_WINDOW (self),
                                 GTK_FILE_CHOOSER_ACTION_SAVE, _("_Save"), _("_Cancel"));
  g_autofree char *name = NULL;

  if (self->result)
    name = g_strdup_printf ("anharmonic-mode%u.txt", self->result->report.modes[0]);
  gtk_file_chooser_set_current_name (GTK_FILE_CHOOSER (chooser), name ? name : "anharmonic.txt");
  gtk_native_dialog_set_modal (GTK_NATIVE_DIALOG (chooser), TRUE);
  g_signal_connect (chooser, "response", G_CALLBACK (save_response), g_object_ref (self));
  gtk_native_dialog_show (GTK_NATIVE_DIALOG (chooser));
}

/* ---- accessors ---- */

gboolean qv_anharmonic_window_is_busy (QvAnharmonicWindow *self) { return self->job != NULL; }
const char *qv_anharmonic_window_get_error (QvAnharmonicWindow *self) { return self->error; }
GtkWindow *qv_anharmonic_window_get_error_dialog (QvAnharmonicWindow *self) { return self->error_dialog; }
const char *qv_anharmonic_window_get_summary (QvAnharmonicWindow *self) { return gtk_label_get_label (self->summary_label); }
const char *qv_anharmonic_window_get_readout (QvAnharmonicWindow *self) { return gtk_label_get_label (self->readout_label); }
GtkWidget *qv_anharmonic_window_get_plot (QvAnharmonicWindow *self) { return GTK_WIDGET (self->plot_area); }

const QvScanLevelsReport *
qv_anharmonic_window_get_report (QvAnharmonicWindow *self)
{
  return self->result ? &self->result->report : NULL;
}

const char *
qv_anharmonic_window_get_cell (QvAnharmonicWindow *self, guint v, guint column)
{
  if (self->result == NULL || v >= G_N_ELEMENTS (self->cells) || column >= QV_ANHARMONIC_N_COLUMNS)
    return NULL;
  return self->cells[v][column];
}

char *
qv_anharmonic_window_get_banners (QvAnharmonicWindow *self)
{
  GString *s = g_string_new (NULL);

  for (GtkWidget *c = gtk_widget_get_first_child (GTK_WIDGET (self->banner_box)); c;
       c = gtk_widget_get_next_sibling (c))
    g_string_append_printf (s, "%s%s", s->len ? "\n" : "", gtk_label_get_label (GTK_LABEL (c)));
  return g_string_free (s, FALSE);
}

/* ---- GObject ---- */

QvAnharmonicWindow *
qv_anharmonic_window_new (GtkWindow *parent)
{
  return g_object_new (QV_TYPE_ANHARMONIC_WINDOW, "transient-for", parent,
                       "application", parent ? gtk_window_get_application (parent) : NULL, NULL);
}

static void
qv_anharmonic_window_dispose (GObject *object)
{
  QvAnharmonicWindow *self = QV_ANHARMONIC_WINDOW (object);

  if (self->job)
    g_cancellable_cancel (self->job);
  g_clear_object (&self->job);
  self->error_dialog = NULL;   /* error_dialog_gone is disconnected with us */
  G_OBJECT_CLASS (qv_anharmonic_window_parent_class)->dispose (object);
}

static void
qv_anharmonic_window_finalize (GObject *object)
{
  QvAnharmonicWindow *self = QV_ANHARMONIC_WINDOW (object);

  result_free (self->result);
  g_clear_pointer (&self->scan, scan_unref);
  clear_cells (self);
  g_free (self->error);
  G_OBJECT_CLASS (qv_anharmonic_window_parent_class)->finalize (object);
}

static void
qv_anharmonic_window_class_init (QvAnharmonicWindowClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = qv_anharmonic_window_dispose;
  object_class->finalize = qv_anharmonic_window_finalize;
  gtk_widget_class_set_template_from_resource (widget_class, "/org/quaverlab/Quaver/gui/qv-anharmonic-window.ui");
  gtk_widget_class_bind_template_child (widget_class, QvAnharmonicWindow, subtitle_label);
  gtk_widget_class_bind_template_child (widget_class, QvAnharmonicWindow, save_button);
  gtk_widget_class_bind_template_child (widget_class, QvAnharmonicWindow, spinner);
  gtk_widget_class_bind_template_child (widget_class, QvAnharmonicWindow, spline_check);
  gtk_widget_class_bind_template_child (widget_class, QvAnharmonicWindow, degree_spin);
  gtk_widget_class_bind_template_child (widget_class, QvAnharmonicWindow, stack);
  gtk_widget_class_bind_template_child (widget_class, QvAnharmonicWindow, busy_label);
  gtk_widget_class_bind_template_child (widget_class, QvAnharmonicWindow, error_label);
  gtk_widget_class_bind_template_child (widget_class, QvAnharmonicWindow, banner_box);
  gtk_widget_class_bind_template_child (widget_class, QvAnharmonicWindow, plot_area);
  gtk_widget_class_bind_template_child (widget_class, QvAnharmonicWindow, readout_label);
  gtk_widget_class_bind_template_child (widget_class, QvAnharmonicWindow, level_grid);
  gtk_widget_class_bind_template_child (widget_class, QvAnharmonicWindow, summary_label);
  gtk_widget_class_bind_template_callback (widget_class, save_clicked);
  gtk_widget_class_bind_template_callback (widget_class, fit_changed);
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_w, GDK_CONTROL_MASK, "window.close", NULL);
  gtk_widget_class_add_binding_action (widget_class, GDK_KEY_Escape, 0, "window.close", NULL);
}

static void
qv_anharmonic_window_init (QvAnharmonicWindow *self)
{
  GtkEventController *motion;

  gtk_widget_init_template (GTK_WIDGET (self));
  self->fit = QV_SCAN_FIT_POLYNOMIAL;
  self->hover_level = -1;
  gtk_spin_button_set_range (self->degree_spin, 2, QV_SCAN_MAX_DEGREE);
  gtk_drawing_area_set_draw_func (self->plot_area, draw_plot, self, NULL);
  motion = gtk_event_controller_motion_new ();
  g_signal_connect (motion, "motion", G_CALLBACK (plot_motion), self);
  g_signal_connect (motion, "leave", G_CALLBACK (plot_leave), self);
  gtk_widget_add_controller (GTK_WIDGET (self->plot_area), motion);
}
