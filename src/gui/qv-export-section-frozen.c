/* qv-export-section-frozen.c — qv_frozen_phonon_new_in_crystal for the
 * lattice mode chosen on the Lattice page, written with
 * qv_export_new_frozen (the files of `quaver frozen-phonon`).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include <math.h>
#include <string.h>
#include "qv-config.h"
#include "qv-document-lattice.h"
#include "qv-error.h"
#include "qv-export.h"
#include "qv-export-section-frozen.h"
#include "qv-frozen-phonon.h"

/* Cells along each vector of the diagonal supercell for a q that the
 * document's supercell does not fit (the command line has no such limit:
 * its --cell takes any matrix). */
#define MAX_CELLS 12

struct _QvExportSectionFrozen
{
  GtkWidget parent_instance;
  GtkWidget *box;
  GtkLabel *mode_label;
  GtkAdjustment *largest_adjustment;
  GtkAdjustment *phase_adjustment;
  GtkLabel *message_label;
  GtkLabel *files_label;
  GtkLabel *detail_label;
  GtkLabel *notes_label;
  QvExportWriter *writer;

  QvExportContext context;
  gboolean ready;
  QvFrozenRequest request;     /* of the plan shown */
  int matrix[3][3];
};

G_DEFINE_FINAL_TYPE (QvExportSectionFrozen, qv_export_section_frozen, GTK_TYPE_WIDGET)

/* The crystal and the lattice mode the context selects: q (the path's,
 * Γ itself rather than the nudged point) and the branch in ascending
 * order there, as `quaver frozen-phonon --q … --branch` counts it. NULL
 * with @why when there is none. */
static const QvDocumentLattice *
selection (QvExportSectionFrozen *self, QvFrozenRequest *request, const char **label, const char **why)
{
  QvDocument *doc = self->context.document;
  const QvDocumentLattice *l = doc ? qv_document_get_lattice (doc) : NULL;
  const int k = self->context.lattice_q, b = self->context.lattice_branch;

  *label = NULL;
  if (doc == NULL)
    {
      *why = _("Open a document to export from it.");
      return NULL;
    }
  if (l == NULL || l->crystal == NULL || l->crystal->fc == NULL)
    {
      *why = _("A frozen phonon needs a crystal: a periodic supercell with its Hessian.");
      return NULL;
    }
  if (l->bands == NULL || k < 0 || b < 0 || (gsize) k >= l->sampling->n_q
      || (gsize) b >= l->n_branches)
    {
      *why = _("Choose a lattice mode: click a band on the Lattice page.");
      return NULL;
    }
  memset (request, 0, sizeof *request);
  memcpy (request->q, l->sampling->q + 3 * k, sizeof request->q);
  request->branch = l->order[(gsize) k * l->n_branches + (gsize) b];
  request->amplitude = gtk_adjustment_get_value (self->largest_adjustment);
  request->unit = QV_FROZEN_LARGEST;
  request->phase = gtk_adjustment_get_value (self->phase_adjustment) * G_PI / 180;
  for (gsize i = 0; i < l->sampling->n_labels; i++)
    if (l->sampling->label_index[i] == (gsize) k)
      *label = l->sampling->labels[i];
  return l;
}

static char *
matrix_text (const int m[3][3])
{
  if (m[0][1] == 0 && m[0][2] == 0 && m[1][0] == 0 && m[1][2] == 0 && m[2][0] == 0 && m[2][1] == 0)
    return g_strdup_printf ("%d×%d×%d", m[0][0], m[1][1], m[2][2]);
  return g_strdup_printf ("(%d %d %d | %d %d %d | %d %d %d)", m[0][0], m[0][1], m[0][2], m[1][0],
                          m[1][1], m[1][2], m[2][0], m[2][1], m[2][2]);
}

static void
refresh (QvExportSectionFrozen *self)
{
  const QvDocumentLattice *l;
  const char *label = NULL, *why = NULL;
  g_autoptr(GError) error = NULL;
  g_autoptr(QvFrozenPhonon) fp = NULL;
  g_autoptr(QvExport) plan = NULL;
  g_autoptr(GString) notes = g_string_new (NULL);

  self->ready = FALSE;
  gtk_label_set_label (self->files_label, "");
  gtk_label_set_label (self->detail_label, "");
  gtk_label_set_label (self->mode_label, "");
  qv_export_pane_set_message (self->notes_label, NULL, FALSE);
  l = selection (self, &self->request, &label, &why);
  if (l == NULL)
    {
      qv_export_pane_set_message (self->message_label, why, FALSE);
      qv_export_writer_set_ready (self->writer, FALSE);
      return;
    }
  fp = qv_frozen_phonon_new_in_crystal (l->crystal, qv_document_get_structure (self->context.document),
                                        &self->request, MAX_CELLS, self->matrix, &error);
  if (fp != NULL)
    plan = qv_export_new_frozen (fp, NULL, qv_manifest_new ("frozen-phonon"), &error);
  {
    const double *q = self->request.q;
    const double w = fp ? fp->wavenumber : NAN;
    g_autofree char *where = label
      /* TRANSLATORS: "X = (0.5 0 0.5)": a labelled point of the path, fractional q */
      ? g_strdup_printf (_("%s = (%g %g %g)"), label, q[0], q[1], q[2])
      : g_strdup_printf ("q = (%.4g %.4g %.4g)", q[0], q[1], q[2]);
    g_autofree char *text = NULL;
    if (isnan (w))
      /* TRANSLATORS: "Branch 5 at X = (0.5 0 0.5)" */
      text = g_strdup_printf (_("Branch %zu at %s"), self->request.branch + 1, where);
    else
      /* TRANSLATORS: "Branch 5 at X = (0.5 0 0.5), 198.3 cm⁻¹" (i: imaginary) */
      text = g_strdup_printf (_("Branch %zu at %s, %.1f%s cm⁻¹"), self->request.branch + 1, where,
                              fabs (w), w < 0 ? "i" : "");
    gtk_label_set_label (self->mode_label, text);
  }
  if (plan == NULL)
    {
      qv_export_pane_set_message (self->message_label, error->message, TRUE);
      qv_export_writer_set_ready (self->writer, FALSE);
      return;
    }
  qv_export_pane_set_message (self->message_label, NULL, FALSE);
  {
    g_autofree char *files = qv_export_pane_files_text (plan);
    g_autofree char *cells = matrix_text (self->matrix);
    const gboolean own = memcmp (self->matrix, l->crystal->map->matrix, sizeof self->matrix) == 0;
    g_autofree char *detail = own
      /* TRANSLATORS: "The document's 3×3×3 supercell, 54 atoms; A = 0.1234 √u·Å" */
      ? g_strdup_printf (_("The document's %s supercell, %zu atoms; A = %.4g √u·Å"), cells, fp->n_atoms, fp->a)
      /* TRANSLATORS: "A 2×1×2 supercell (the smallest this q fits), 8 atoms; A = 0.1234 √u·Å" */
      : g_strdup_printf (_("A %s supercell (the smallest this q fits), %zu atoms; A = %.4g √u·Å"), cells,
                         fp->n_atoms, fp->a);
    gtk_label_set_label (self->files_label, files);
    gtk_label_set_label (self->detail_label, detail);
  }
  if (fp->standing)
    g_string_append (notes, _("This q is not its own opposite: the real pattern holds q and −q and moves as a standing wave of the two."));
  if (fp->degenerate)
    g_string_append_printf (notes, "%s%s", notes->len ? " " : "",
                            _("The branch is degenerate here: its eigenvector is one choice in the subspace."));
  if (fp->wavenumber < 0)
    g_string_append_printf (notes, "%s%s", notes->len ? " " : "",
                            _("An imaginary mode: the displaced structure follows the instability."));
  qv_export_pane_set_message (self->notes_label, notes->str, FALSE);
  self->ready = TRUE;
  qv_export_writer_set_ready (self->writer, TRUE);
}

/* ---- the job, on the writer's worker ---- */

typedef struct {
  QvDocument *document;        /* a reference: it owns the crystal */
  const QvCrystal *crystal;
  QvStructure *supercell;      /* a copy: the window may edit its masses */
  QvDocumentSource *source;    /* may be NULL */
  QvFrozenRequest request;
  double phase_deg;
} FrozenJob;

static void
frozen_job_free (gpointer data)
{
  FrozenJob *job = data;

  g_clear_object (&job->document);
  qv_structure_free (job->supercell);
  qv_document_source_free (job->source);
  g_free (job);
}

static gboolean
frozen_job_run (gpointer data, const char *directory, gboolean force, const QvProgress *progress,
                GPtrArray *written, GError **error)
{
  FrozenJob *job = data;
  QvManifest *manifest = qv_export_pane_manifest (job->source, "frozen-phonon", error);
  g_autoptr(QvFrozenPhonon) fp = NULL;
  g_autoptr(QvExport) plan = NULL;

  if (manifest == NULL)
    return FALSE;
  qv_manifest_set_number (manifest->options, "phase_deg", job->phase_deg);
  fp = qv_frozen_phonon_new_in_crystal (job->crystal, job->supercell, &job->request, MAX_CELLS, NULL,
                                        error);
  if (fp == NULL)
    {
      qv_manifest_free (manifest);
      return FALSE;
    }
  plan = qv_export_new_frozen (fp, NULL, manifest, error);
  if (plan == NULL)
    return FALSE;
  return qv_export_pane_write (plan, directory, force, progress, written, error);
}

static gpointer
prepare (gpointer data, QvExportJobFunc *func, GDestroyNotify *free_job, GError **error)
{
  QvExportSectionFrozen *self = data;
  const QvDocumentSource *source;
  FrozenJob *job;

  refresh (self);
  if (!self->ready)
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE, gtk_label_get_label (self->message_label));
      return NULL;
    }
  job = g_new0 (FrozenJob, 1);
  job->document = g_object_ref (self->context.document);
  job->crystal = qv_document_get_lattice (job->document)->crystal;
  job->supercell = qv_structure_copy (qv_document_get_structure (job->document));
  source = qv_document_get_source (job->document);
  job->source = source ? qv_document_source_copy (source) : NULL;
  job->request = self->request;
  job->phase_deg = gtk_adjustment_get_value (self->phase_adjustment);
  *func = frozen_job_run;
  *free_job = frozen_job_free;
  return job;
}

/* ---- public ---- */

void
qv_export_section_frozen_set_context (QvExportSectionFrozen *self, const QvExportContext *context)
{
  self->context = *context;
  refresh (self);
}

void
qv_export_section_frozen_set_amplitude (QvExportSectionFrozen *self, double largest, double phase_deg)
{
  gtk_adjustment_set_value (self->largest_adjustment, largest);
  gtk_adjustment_set_value (self->phase_adjustment, phase_deg);
}

gboolean
qv_export_section_frozen_get_plan (QvExportSectionFrozen *self, double q[3], gsize *branch,
                                   int matrix[3][3])
{
  if (!self->ready)
    return FALSE;
  memcpy (q, self->request.q, 3 * sizeof (double));
  *branch = self->request.branch;
  memcpy (matrix, self->matrix, sizeof self->matrix);
  return TRUE;
}

const char *qv_export_section_frozen_get_mode_text (QvExportSectionFrozen *self)
{
  return gtk_label_get_label (self->mode_label);
}
const char *qv_export_section_frozen_get_message (QvExportSectionFrozen *self)
{
  return gtk_label_get_label (self->message_label);
}
QvExportWriter *qv_export_section_frozen_get_writer (QvExportSectionFrozen *self) { return self->writer; }

static void
qv_export_section_frozen_dispose (GObject *object)
{
  gtk_widget_dispose_template (GTK_WIDGET (object), QV_TYPE_EXPORT_SECTION_FROZEN);
  G_OBJECT_CLASS (qv_export_section_frozen_parent_class)->dispose (object);
}

static void
qv_export_section_frozen_class_init (QvExportSectionFrozenClass *klass)
{
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  G_OBJECT_CLASS (klass)->dispose = qv_export_section_frozen_dispose;
  g_type_ensure (QV_TYPE_EXPORT_WRITER);
  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "qvexportsection");
  gtk_widget_class_set_template_from_resource (widget_class,
                                               "/org/quaverlab/Quaver/gui/qv-export-section-frozen.ui");
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionFrozen, box);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionFrozen, mode_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionFrozen, largest_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionFrozen, phase_adjustment);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionFrozen, message_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionFrozen, files_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionFrozen, detail_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionFrozen, notes_label);
  gtk_widget_class_bind_template_child (widget_class, QvExportSectionFrozen, writer);
}

static void
qv_export_section_frozen_init (QvExportSectionFrozen *self)
{
  gtk_widget_init_template (GTK_WIDGET (self));
  self->context.mode = -1;
  self->context.lattice_q = self->context.lattice_branch = -1;
  qv_export_writer_set_title (self->writer, _("Choose a Folder for the Frozen Phonon"));
  qv_export_writer_set_prepare (self->writer, prepare, self);
  g_signal_connect_object (self->largest_adjustment, "value-changed", G_CALLBACK (refresh), self,
                           G_CONNECT_SWAPPED);
  g_signal_connect_object (self->phase_adjustment, "value-changed", G_CALLBACK (refresh), self,
                           G_CONNECT_SWAPPED);
  refresh (self);
}
