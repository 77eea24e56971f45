/* qv-document.h — what one window shows: a structure, its Hessian as read
 * and the normal modes solved from it, with loading and re-solving on a
 * worker thread (progress, cancel). All numbers come from the core.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gio/gio.h>
#include "qv-document-analysis.h"
#include "qv-document-lattice.h"
#include "qv-input.h"
#include "qv-mode-set.h"
#include "qv-structure.h"

G_BEGIN_DECLS

#define QV_TYPE_DOCUMENT (qv_document_get_type ())
G_DECLARE_FINAL_TYPE (QvDocument, qv_document, QV, DOCUMENT, GObject)

/* Called on the main context, at most every 50 ms: @fraction in [0, 1], or
 * negative when the work cannot say how far it is (reading). */
typedef void (*QvDocumentProgressFunc) (double fraction, const char *stage, gpointer user_data);

/* What to read: a bundle, a geometry with its Hessian, or the demo. */
typedef struct {
  char *geometry;
  gboolean demo;
  char *hessian;
  char *hessian_units;
  char *hessian_layout;
  /* Filled in when read: the masses the input asked for, and a bundle's
   * Hessian file (NULL when inline), so exports record what was used. */
  QvMassModel mass_model;
  char *bundle_hessian;
} QvDocumentSource;

QvDocumentSource *qv_document_source_copy (const QvDocumentSource *source);
void qv_document_source_free (QvDocumentSource *source);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvDocumentSource, qv_document_source_free)

/* Reads and solves on a worker thread. Cancelling returns at once (the
 * worker is abandoned and its result discarded when it ends). */
void qv_document_load_async (const QvDocumentSource *source, GCancellable *cancellable,
                             QvDocumentProgressFunc progress, gpointer progress_data,
                             GAsyncReadyCallback callback, gpointer user_data);
QvDocument *qv_document_load_finish (GAsyncResult *result, GError **error);

/* A document from what is already in memory (takes @structure and @hessian;
 * solves on the calling thread). For tests and benchmarks. */
QvDocument *qv_document_new_solved (const char *name, QvStructure *structure,
                                    QvHessian *hessian, GError **error);

/* One row of the mode list, from the core's functions, computed on the
 * worker with the modes so that showing a large system costs the main
 * thread nothing per mode. */
typedef struct {
  double wavenumber;           /* cm⁻¹, signed (qv_mode_set_wavenumber) */
  double reduced_mass;         /* u (qv_mode_set_reduced_mass) */
  double eigenvalue;           /* eV/(Å² u), for qv_oscillator_turning_point */
  /* qv_mode_set_max_displacement at Q = 1 u^½ Å: the largest atomic
   * displacement is this times |Q| (that function's definition). */
  double unit_displacement;    /* Å per u^½ Å */
  gboolean imaginary;          /* qv_mode_set_is_imaginary */
  gboolean has_turning_point;  /* QvTurningPoint.defined */
  /* The species (qv-document-analysis.h): "A1", "E2g", "?" when broken,
   * "" without a point group; cut to fit (a long accidental sum ends in
   * "…"). @symmetry_order sorts by the table's order, "?" and "" last. */
  char symmetry[24];
  int symmetry_order;
} QvModeRow;

const char *qv_document_get_name (QvDocument *doc);
/* One row per mode (qv_document_get_modes ()->n_modes), replaced with the
 * modes on ::changed. */
const QvModeRow *qv_document_get_rows (QvDocument *doc);
/* The file the document came from, NULL for the demo. */
const char *qv_document_get_path (QvDocument *doc);
/* What the document was read from (the demo, a bundle, a geometry and its
 * Hessian), NULL for one built in memory: exports hash these inputs. */
const QvDocumentSource *qv_document_get_source (QvDocument *doc);
const QvStructure *qv_document_get_structure (QvDocument *doc);
const QvModeSet *qv_document_get_modes (QvDocument *doc);
/* Point group, species, make-up and intensities of the modes, computed on
 * the worker with them and replaced with them on ::changed. */
const QvDocumentAnalysis *qv_document_get_analysis (QvDocument *doc);
/* A crystal's lattice dynamics (a bundle with a "crystal", or a periodic
 * supercell with its Hessian), computed on the loading worker; NULL for a
 * molecule, or for a crystal that could not be built — then
 * qv_document_get_lattice_note says why (NULL otherwise). The lattice
 * keeps the masses as loaded: editing masses re-solves the supercell's
 * modes only. */
const QvDocumentLattice *qv_document_get_lattice (QvDocument *doc);
const char *qv_document_get_lattice_note (QvDocument *doc);
/* FALSE for precomputed modes: then masses cannot be changed. */
gboolean qv_document_has_hessian (QvDocument *doc);
/* TRUE when some mass differs from the one the file gave. */
gboolean qv_document_get_masses_edited (QvDocument *doc);
/* The masses as loaded. */
const QvStructure *qv_document_get_original (QvDocument *doc);

/* Solves again with the masses of @structure (taken; same atoms) from a
 * copy of the Hessian as read, on a worker thread; on success the document
 * takes the new structure and modes and emits ::changed. A cancelled or
 * failed solve leaves the document as it was. */
void qv_document_solve_async (QvDocument *doc, QvStructure *structure,
                              GCancellable *cancellable,
                              QvDocumentProgressFunc progress, gpointer progress_data,
                              GAsyncReadyCallback callback, gpointer user_data);
/* Load and solve workers still running, including ones abandoned by a
 * cancel (a LAPACK call cannot be interrupted). The process must not run
 * its exit handlers under them: OpenBLAS frees its buffers there. */
guint qv_document_running_workers (void);
/* Other workers of the app that call the core's LAPACK code (comparing
 * mode sets) count themselves in while they run. */
void qv_document_worker_hold (void);
void qv_document_worker_release (void);

gboolean qv_document_solve_finish (QvDocument *doc, GAsyncResult *result, GError **error);

/* ---- saving (qv-document-save.h) ---- */

/* The Hessian as read (eV/Å², never symmetrised in place), or NULL for
 * precomputed modes. */
const QvHessian *qv_document_get_hessian (QvDocument *doc);
/* A bundle's "crystal" as read (NULL otherwise). */
const QvInputCrystal *qv_document_get_crystal (QvDocument *doc);
/* The mass model the input asked for (isotopic for a document built in
 * memory). */
QvMassModel qv_document_get_mass_model (QvDocument *doc);
/* The view as the bundle gave it when read, or as it was last saved
 * (present FALSE when neither). */
const QvBundleView *qv_document_get_saved_view (QvDocument *doc);
/* The bundle the document was read from or last saved to, or NULL (the
 * demo, a geometry with its Hessian, a document built in memory). */
const char *qv_document_get_bundle_path (QvDocument *doc);
/* TRUE when some mass differs from the masses as loaded or last saved. */
gboolean qv_document_get_masses_unsaved (QvDocument *doc);
/* After a save to @bundle_path with @view: the masses in use and @view
 * become the saved state. */
void qv_document_mark_saved (QvDocument *doc, const char *bundle_path, const QvBundleView *view);

G_END_DECLS
