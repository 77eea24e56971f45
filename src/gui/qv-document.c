/* qv-document.c — the document of one window and its worker-thread jobs.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include <string.h>
#include "qv-config.h"
#ifdef __linux__
#include <sys/resource.h>
#include <sys/syscall.h>
#include <unistd.h>
#endif
#include "qv-document.h"
#include "qv-error.h"
#include "qv-solver.h"

struct _QvDocument
{
  GObject parent_instance;
  char *name;
  char *path;
  QvStructure *structure;   /* masses in use */
  QvStructure *original;    /* masses as loaded */
  QvHessian *hessian;       /* eV/Å² as read; never handed to qv_solve */
  QvModeSet *modes;
  QvModeRow *rows;          /* one per mode */
  QvDocumentAnalysis *analysis; /* of @modes */
  QvDocumentSource *source; /* what was read, NULL when built in memory */
  QvDocumentLattice *lattice; /* a crystal's lattice dynamics, or NULL */
  char *lattice_note;       /* why a crystal has none, or NULL */
  /* saving: what was read that the modes do not keep, and the saved state */
  QvInputCrystal *crystal;  /* a bundle's "crystal", or NULL */
  QvBundleView saved_view;  /* as read from a bundle, or as last saved */
  QvStructure *saved;       /* masses as loaded or last saved */
  char *bundle_path;        /* the bundle read or last written, or NULL */
};

G_DEFINE_FINAL_TYPE (QvDocument, qv_document, G_TYPE_OBJECT)

enum { CHANGED, N_SIGNALS };
static guint signals[N_SIGNALS];

/* Progress reports hop from the worker to the main context, throttled. */
#define PROGRESS_INTERVAL_US (50 * G_TIME_SPAN_MILLISECOND)

typedef struct {
  GTask *task;                     /* weak: the job that reports */
  GMainContext *context;
  QvDocumentProgressFunc func;
  gpointer user_data;
  gint64 last;                     /* worker only */
} Relay;

typedef struct {
  GTask *task;                     /* owned: checked before reporting */
  QvDocumentProgressFunc func;
  gpointer user_data;
  double fraction;
  char *stage;
} Report;

static gboolean
deliver_report (gpointer data)
{
  Report *r = data;
  /* A job that has finished, or was cancelled, has nothing more to say. */
  if (!g_task_get_completed (r->task) && !g_cancellable_is_cancelled (g_task_get_cancellable (r->task)))
    r->func (r->fraction, r->stage, r->user_data);
  return G_SOURCE_REMOVE;
}

static void
report_free (gpointer data)
{
  Report *r = data;
  g_object_unref (r->task);
  g_free (r->stage);
  g_free (r);
}

static void
relay_post (Relay *relay, double fraction, const char *stage)
{
  Report *r;

  if (relay->func == NULL)
    return;
  r = g_new0 (Report, 1);
  r->task = g_object_ref (relay->task);
  r->func = relay->func;
  r->user_data = relay->user_data;
  r->fraction = fraction;
  r->stage = g_strdup (stage);
  g_main_context_invoke_full (relay->context, G_PRIORITY_DEFAULT, deliver_report, r, report_free);
}

/* QvProgressFunc: runs on the worker. */
static gboolean
relay_progress (double fraction, const char *stage, gpointer user_data)
{
  Relay *relay = user_data;
  const gint64 now = g_get_monotonic_time ();

  if (g_cancellable_is_cancelled (g_task_get_cancellable (relay->task)))
    return FALSE;
  if (now - relay->last >= PROGRESS_INTERVAL_US || fraction >= 1.0)
    {
      relay->last = now;
      relay_post (relay, fraction, stage);
    }
  return TRUE;
}

static void
qv_document_finalize (GObject *object)
{
  QvDocument *self = QV_DOCUMENT (object);

  g_free (self->name);
  g_free (self->path);
  g_clear_pointer (&self->structure, qv_structure_free);
  g_clear_pointer (&self->original, qv_structure_free);
  g_clear_pointer (&self->hessian, qv_hessian_free);
  g_clear_pointer (&self->modes, qv_mode_set_free);
  g_free (self->rows);
  g_clear_pointer (&self->analysis, qv_document_analysis_free);
  g_clear_pointer (&self->source, qv_document_source_free);
  g_clear_pointer (&self->lattice, qv_document_lattice_free);
  g_free (self->lattice_note);
  g_clear_pointer (&self->crystal, qv_input_crystal_free);
  g_clear_pointer (&self->saved, qv_structure_free);
  g_free (self->bundle_path);
  G_OBJECT_CLASS (qv_document_parent_class)->finalize (object);
}

static void
qv_document_class_init (QvDocumentClass *klass)
{
  G_OBJECT_CLASS (klass)->finalize = qv_document_finalize;
  /* The structure's masses and the modes were replaced. */
  signals[CHANGED] = g_signal_new ("changed", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST,
                                   0, NULL, NULL, NULL, G_TYPE_NONE, 0);
}

static void
qv_document_init (QvDocument *self)
{
}

QvDocumentSource *
qv_document_source_copy (const QvDocumentSource *s)
{
  QvDocumentSource *c = g_new0 (QvDocumentSource, 1);
  c->geometry = g_strdup (s->geometry);
  c->demo = s->demo;
  c->hessian = g_strdup (s->hessian);
  c->hessian_units = g_strdup (s->hessian_units);
  c->hessian_layout = g_strdup (s->hessian_layout);
  c->mass_model = s->mass_model;
  c->bundle_hessian = g_strdup (s->bundle_hessian);
  return c;
}

void
qv_document_source_free (QvDocumentSource *s)
{
  if (s == NULL)
    return;
  g_free (s->geometry);
  g_free (s->hessian);
  g_free (s->hessian_units);
  g_free (s->hessian_layout);
  g_free (s->bundle_hessian);
  g_free (s);
}

/* Heavy work yields the CPUs to the main thread (and to the GL driver's
 * threads that draw the window): on a machine with few cores the solver's
 * threads would otherwise delay frames. Linux gives each thread its own
 * nice value, and threads started by the solver (OpenBLAS) inherit it.
 * Returns the value to restore. */
static int
worker_lower_priority (void)
{
#ifdef __linux__
  const id_t tid = (id_t) syscall (SYS_gettid);
  const int before = getpriority (PRIO_PROCESS, tid);
  (void) setpriority (PRIO_PROCESS, tid, MAX (before, 10));
  return before;
#else
  return 0;
#endif
}

static void
worker_restore_priority (int before)
{
#ifdef __linux__
  /* Without the privilege to raise it again the pool thread stays at 10:
   * harmless, it only ever runs background work. */
  (void) setpriority (PRIO_PROCESS, (id_t) syscall (SYS_gettid), before);
#else
  (void) before;
#endif
}

/* The species column: the label, cut to the row's buffer on a character. */
static void
qv_document_row_set_symmetry (QvModeRow *row, const QvDocumentAnalysis *analysis, gsize k)
{
  g_autofree char *label = qv_document_analysis_display (qv_document_analysis_label (analysis, k));

  row->symmetry_order = qv_document_analysis_label_order (analysis, k);
  if (label == NULL || label[0] == '\0')
    row->symmetry[0] = '\0';
  else if (strlen (label) < sizeof row->symmetry)
    g_strlcpy (row->symmetry, label, sizeof row->symmetry);
  else
    {
      const char *end = g_utf8_find_prev_char (label, label + sizeof row->symmetry - 4);
      g_snprintf (row->symmetry, sizeof row->symmetry, "%.*s…", (int) (end - label), label);
    }
}

/* The list's numbers for every mode: on the worker, O(N) per mode. */
static QvModeRow *
compute_rows (const QvModeSet *modes, const QvDocumentAnalysis *analysis)
{
  QvModeRow *rows = g_new0 (QvModeRow, MAX (modes->n_modes, 1));

  for (gsize k = 0; k < modes->n_modes; k++)
    {
      QvTurningPoint tp;
      qv_mode_set_turning_point (modes, k, 0, &tp);
      rows[k].wavenumber = qv_mode_set_wavenumber (modes, k);
      rows[k].reduced_mass = qv_mode_set_reduced_mass (modes, k);
      rows[k].eigenvalue = modes->eigenvalues[k];
      rows[k].unit_displacement = qv_mode_set_max_displacement (modes, k, 1.0, NULL);
      rows[k].imaginary = qv_mode_set_is_imaginary (modes, k);
      rows[k].has_turning_point = tp.defined;
      qv_document_row_set_symmetry (&rows[k], analysis, k);
    }
  return rows;
}

static QvModeSet *
solve_copy (const QvStructure *structure, const QvHessian *hessian,
            const QvProgress *progress, GError **error)
{
  QvSolveOptions options;
  QvHessian *copy = qv_hessian_copy (hessian, error);

  if (copy == NULL)
    return NULL;
  qv_solve_options_init (&options);
  /* qv_solve consumes the matrix it is given: the copy, never the original. */
  return qv_solve (structure, copy, &options, progress, error);
}

/* Takes @analysis, or computes it when NULL (without tensors); then the
 * rows. */
static QvDocument *
document_new (const char *name, const char *path, QvStructure *structure,
              QvHessian *hessian, QvModeSet *modes, QvDocumentAnalysis *analysis)
{
  QvDocument *doc = g_object_new (QV_TYPE_DOCUMENT, NULL);
  doc->name = g_strdup (name);
  doc->path = g_strdup (path);
  doc->original = qv_structure_copy (structure);
  doc->saved = qv_structure_copy (structure);
  doc->structure = structure;
  doc->hessian = hessian;
  doc->modes = modes;
  doc->analysis = analysis ? analysis : qv_document_analysis_new (structure, modes, NULL);
  doc->rows = compute_rows (modes, doc->analysis);
  return doc;
}

QvDocument *
qv_document_new_solved (const char *name, QvStructure *structure, QvHessian *hessian,
                        GError **error)
{
  QvModeSet *modes = solve_copy (structure, hessian, NULL, error);

  if (modes == NULL)
    {
      qv_structure_free (structure);
      qv_hessian_free (hessian);
      return NULL;
    }
  return document_new (name, NULL, structure, hessian, modes, NULL);
}

/* ---- loading ---- */

typedef struct {
  QvDocumentSource *source;
  Relay relay;
} LoadData;

static void
load_data_free (gpointer data)
{
  LoadData *d = data;
  qv_document_source_free (d->source);
  g_main_context_unref (d->relay.context);
  g_free (d);
}

static void load_work (LoadData *d, GTask *task, const QvInputOptions *options,
                       const QvProgress *progress_in);

/* Workers still running, abandoned ones included (see qv-document.h). */
static gint running_workers;

guint
qv_document_running_workers (void)
{
  return (guint) g_atomic_int_get (&running_workers);
}

void
qv_document_worker_hold (void)
{
  g_atomic_int_inc (&running_workers);
}

void
qv_document_worker_release (void)
{
  g_atomic_int_dec_and_test (&running_workers);
}

static void
load_thread (GTask *task, gpointer source_object, gpointer task_data, GCancellable *cancellable)
{
  LoadData *d = task_data;
  QvInputOptions o = {
    .geometry = d->source->geometry, .demo = d->source->demo,
    .hessian = d->source->hessian, .hessian_units = d->source->hessian_units,
    .hessian_layout = d->source->hessian_layout, .all_modes = TRUE,
  };
  QvProgress progress = { relay_progress, &d->relay };
  const int priority = worker_lower_priority ();

  relay_post (&d->relay, -1.0, N_("reading"));
  load_work (d, task, &o, &progress);
  worker_restore_priority (priority);
  g_atomic_int_dec_and_test (&running_workers);
}

static void
load_work (LoadData *d, GTask *task, const QvInputOptions *options, const QvProgress *progress_in)
{
  QvProgress progress = *progress_in;
  g_autoptr(QvInput) input = NULL;
  GError *error = NULL;
  QvModeSet *modes;
  QvDocument *doc;
  QvDocumentAnalysis *analysis;
  QvDocumentLattice *lattice;
  char *lattice_note = NULL;
  g_autofree char *display = NULL;

  input = qv_input_load (options, &error);
  if (input == NULL)
    {
      g_task_return_error (task, error);
      return;
    }
  if (g_task_return_error_if_cancelled (task))
    return;
  if (input->hessian)
    {
      modes = solve_copy (input->structure, input->hessian, &progress, &error);
      if (modes == NULL)
        {
          g_task_return_error (task, error);
          return;
        }
    }
  else
    modes = g_steal_pointer (&input->modes);
  /* A crystal: its dispersion, DOS and thermal properties as well. */
  lattice = qv_document_lattice_new (input, &progress, &lattice_note);
  if (g_task_return_error_if_cancelled (task))
    {
      qv_mode_set_free (modes);
      qv_document_lattice_free (lattice);
      g_free (lattice_note);
      return;
    }

  display = d->source->demo ? g_strdup (_("Demo (invented data)"))
                            : g_path_get_basename (d->source->geometry);
  /* The GObject is made here, on the worker, with the list's rows: the
   * main thread only shows it. */
  /* The bundle's tensors (the demo's too), kept by the input. */
  analysis = qv_document_analysis_new (input->structure, modes, g_steal_pointer (&input->derivatives));
  doc = document_new (display, d->source->demo ? NULL : d->source->geometry,
                      g_steal_pointer (&input->structure),
                      g_steal_pointer (&input->hessian), modes, analysis);
  doc->source = qv_document_source_copy (d->source);
  doc->source->mass_model = input->mass_model;
  doc->lattice = lattice;
  doc->lattice_note = lattice_note;
  if (!d->source->demo && !d->source->hessian && input->hessian_source
      && g_file_test (input->hessian_source, G_FILE_TEST_IS_REGULAR))
    doc->source->bundle_hessian = g_strdup (input->hessian_source);
  /* what a save needs again (qv-document-save.h) */
  doc->crystal = g_steal_pointer (&input->crystal);
  doc->saved_view = input->view;
  if (!d->source->demo && d->source->geometry && qv_input_is_bundle (d->source->geometry))
    doc->bundle_path = g_strdup (d->source->geometry);
  g_task_return_pointer (task, doc, g_object_unref);
}

void
qv_document_load_async (const QvDocumentSource *source, GCancellable *cancellable,
                        QvDocumentProgressFunc progress, gpointer progress_data,
                        GAsyncReadyCallback callback, gpointer user_data)
{
  g_autoptr(GTask) task = g_task_new (NULL, cancellable, callback, user_data);
  LoadData *d = g_new0 (LoadData, 1);

  d->source = qv_document_source_copy (source);
  d->relay.task = task;
  d->relay.context = g_main_context_ref_thread_default ();
  d->relay.func = progress;
  d->relay.user_data = progress_data;
  g_task_set_source_tag (task, qv_document_load_async);
  g_task_set_task_data (task, d, load_data_free);
  /* LAPACK cannot be interrupted: a cancelled load returns at once and the
   * worker's result is dropped when it ends. */
  g_task_set_return_on_cancel (task, TRUE);
  g_atomic_int_inc (&running_workers);
  g_task_run_in_thread (task, load_thread);
}

QvDocument *
qv_document_load_finish (GAsyncResult *result, GError **error)
{
  g_return_val_if_fail (g_task_is_valid (result, NULL), NULL);
  return g_task_propagate_pointer (G_TASK (result), error);
}

/* ---- re-solving ---- */

typedef struct {
  QvStructure *structure;
  QvDerivatives *derivatives;      /* a copy of the document's, or NULL */
  Relay relay;
} SolveData;

static void
solve_data_free (gpointer data)
{
  SolveData *d = data;
  g_clear_pointer (&d->structure, qv_structure_free);
  g_clear_pointer (&d->derivatives, qv_derivatives_free);
  g_main_context_unref (d->relay.context);
  g_free (d);
}

typedef struct {
  QvModeSet *modes;
  QvModeRow *rows;
  QvDocumentAnalysis *analysis;
} Solved;

static void
solved_free (gpointer data)
{
  Solved *solved = data;
  qv_mode_set_free (solved->modes);
  g_free (solved->rows);
  qv_document_analysis_free (solved->analysis);
  g_free (solved);
}

static void
solve_thread (GTask *task, gpointer source_object, gpointer task_data, GCancellable *cancellable)
{
  QvDocument *doc = source_object;   /* kept alive by the task */
  SolveData *d = task_data;
  QvProgress progress = { relay_progress, &d->relay };
  GError *error = NULL;
  const int priority = worker_lower_priority ();
  QvModeSet *modes = solve_copy (d->structure, doc->hessian, &progress, &error);
  Solved *solved;

  worker_restore_priority (priority);
  if (modes == NULL)
    g_task_return_error (task, error);
  else
    {
      solved = g_new0 (Solved, 1);
      solved->modes = modes;
      solved->analysis = qv_document_analysis_new (d->structure, modes, g_steal_pointer (&d->derivatives));
      solved->rows = compute_rows (modes, solved->analysis);
      g_task_return_pointer (task, solved, solved_free);
    }
  g_atomic_int_dec_and_test (&running_workers);
}

void
qv_document_solve_async (QvDocument *doc, QvStructure *structure, GCancellable *cancellable,
                         QvDocumentProgressFunc progress, gpointer progress_data,
                         GAsyncReadyCallback callback, gpointer user_data)
{
  g_autoptr(GTask) task = g_task_new (doc, cancellable, callback, user_data);
  SolveData *d = g_new0 (SolveData, 1);

  d->structure = structure;
  d->derivatives = qv_document_analysis_copy_derivatives (doc->analysis);
  d->relay.task = task;
  d->relay.context = g_main_context_ref_thread_default ();
  d->relay.func = progress;
  d->relay.user_data = progress_data;
  g_task_set_source_tag (task, qv_document_solve_async);
  g_task_set_task_data (task, d, solve_data_free);
  if (doc->hessian == NULL || structure == NULL || structure->n_atoms != doc->structure->n_atoms)
    {
      g_task_return_new_error (task, QV_ERROR, QV_ERROR_INPUT, "%s",
                               doc->hessian == NULL
                               ? _("This file holds precomputed modes, not a Hessian: masses cannot be changed")
                               : _("The new masses do not match the structure"));
      return;
    }
  g_task_set_return_on_cancel (task, TRUE);
  g_atomic_int_inc (&running_workers);
  g_task_run_in_thread (task, solve_thread);
}

gboolean
qv_document_solve_finish (QvDocument *doc, GAsyncResult *result, GError **error)
{
  GTask *task = G_TASK (result);
  SolveData *d = g_task_get_task_data (task);
  Solved *solved = g_task_propagate_pointer (task, error);

  if (solved == NULL)
    return FALSE;
  g_clear_pointer (&doc->structure, qv_structure_free);
  doc->structure = g_steal_pointer (&d->structure);
  g_clear_pointer (&doc->modes, qv_mode_set_free);
  g_free (doc->rows);
  doc->modes = solved->modes;
  doc->rows = solved->rows;
  qv_document_analysis_free (doc->analysis);
  doc->analysis = solved->analysis;
  g_free (solved);
  g_signal_emit (doc, signals[CHANGED], 0);
  return TRUE;
}

const char *qv_document_get_name (QvDocument *doc) { return doc->name; }
const char *qv_document_get_path (QvDocument *doc) { return doc->path; }
const QvDocumentSource *qv_document_get_source (QvDocument *doc) { return doc->source; }
const QvStructure *qv_document_get_structure (QvDocument *doc) { return doc->structure; }
const QvStructure *qv_document_get_original (QvDocument *doc) { return doc->original; }
const QvModeSet *qv_document_get_modes (QvDocument *doc) { return doc->modes; }
const QvModeRow *qv_document_get_rows (QvDocument *doc) { return doc->rows; }
const QvDocumentAnalysis *qv_document_get_analysis (QvDocument *doc) { return doc->analysis; }
gboolean qv_document_has_hessian (QvDocument *doc) { return doc->hessian != NULL; }

gboolean
qv_document_get_masses_edited (QvDocument *doc)
{
  for (gsize a = 0; a < doc->structure->n_atoms; a++)
    if (doc->structure->atoms[a].mass != doc->original->atoms[a].mass)
      return TRUE;
  return FALSE;
}

const QvDocumentLattice *
qv_document_get_lattice (QvDocument *doc)
{
  return doc->lattice;
}

const char *
qv_document_get_lattice_note (QvDocument *doc)
{
  return doc->lattice_note;
}

/* ---- saving ---- */

const QvHessian *qv_document_get_hessian (QvDocument *doc) { return doc->hessian; }
const QvInputCrystal *qv_document_get_crystal (QvDocument *doc) { return doc->crystal; }
const QvBundleView *qv_document_get_saved_view (QvDocument *doc) { return &doc->saved_view; }
const char *qv_document_get_bundle_path (QvDocument *doc) { return doc->bundle_path; }

QvMassModel
qv_document_get_mass_model (QvDocument *doc)
{
  return doc->source ? doc->source->mass_model : QV_MASS_ISOTOPIC;
}

gboolean
qv_document_get_masses_unsaved (QvDocument *doc)
{
  for (gsize a = 0; a < doc->structure->n_atoms; a++)
    if (doc->structure->atoms[a].mass != doc->saved->atoms[a].mass)
      return TRUE;
  return FALSE;
}

void
qv_document_mark_saved (QvDocument *doc, const char *bundle_path, const QvBundleView *view)
{
  g_clear_pointer (&doc->saved, qv_structure_free);
  doc->saved = qv_structure_copy (doc->structure);
  if (bundle_path != doc->bundle_path)
    {
      g_free (doc->bundle_path);
      doc->bundle_path = g_strdup (bundle_path);
    }
  if (view)
    doc->saved_view = *view;
}
