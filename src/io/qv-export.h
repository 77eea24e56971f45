/* qv-export.h — an export planned before it is written: the files it will
 * write (names, count, what each holds, the amplitudes in every unit), then
 * the writing, with progress and cancellation, into a new or empty
 * directory, file by file and atomically, ending with manifest.json. The
 * CLI commands (displace, ensemble, stencil) and the app's export pane
 * share it, so both write the same files.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-displacement.h"
#include "qv-ensemble.h"
#include "qv-frozen-phonon.h"
#include "qv-manifest.h"
#include "qv-mode-set.h"
#include "qv-progress.h"
#include "qv-stencil.h"
#include "qv-structure.h"
#include "qv-xyz.h"

G_BEGIN_DECLS

typedef struct _QvExport QvExport;

/* How the structures are written. */
typedef struct {
  QvXyzStyle style;            /* QV_XYZ_EXTENDED (default) or QV_XYZ_PLAIN */
  gboolean single_file;        /* all structures as frames of one file */
  gboolean exact;              /* 17 significant digits instead of 10 decimals */
} QvExportFormat;

void qv_export_format_init (QvExportFormat *format);

/* Ensembles: at most this many samples; seeds below 2⁵³ so that every JSON
 * reader holds them exactly. */
#define QV_EXPORT_MAX_SAMPLES 10000000
#define QV_EXPORT_SEED_LIMIT ((guint64) 1 << 53)

/* Each constructor checks everything it can before anything is written
 * (QV_ERROR_USAGE with a message that says what to change) and takes
 * ownership of @manifest, which the caller has made with the command's
 * name, arguments and inputs (qv_manifest_add_input_*); the export fills in
 * the options, parameters, notes and files (the manifest is freed with the
 * export, or at once when the constructor fails). @structure and @modes
 * must outlive the export. */

/* Structures displaced along one or two modes (qv_displace). */
QvExport *qv_export_new_displace (const QvStructure *structure, const QvModeSet *modes,
                                  QvMassModel mass_model, const QvDisplaceRequest *request,
                                  const QvExportFormat *format, QvManifest *manifest,
                                  GError **error);
/* @count harmonic Wigner samples with velocities (qv_ensemble). */
QvExport *qv_export_new_ensemble (const QvStructure *structure, const QvModeSet *modes,
                                  const QvEnsembleOptions *options, guint64 count,
                                  const QvExportFormat *format, QvManifest *manifest,
                                  GError **error);
/* The ±h displacements of every selected Cartesian coordinate (qv_stencil),
 * plus the reference structure, for `quaver collect`. @structure may be
 * freed after the call (the export keeps a copy). */
QvExport *qv_export_new_stencil (const QvStructure *structure, const QvStencil *stencil,
                                 const QvExportFormat *format, QvManifest *manifest,
                                 GError **error);
/* Only the symmetry-distinct ±@step displacements of the periodic
 * @supercell (qv_symmetric_stencil_new with spglib's @symprec, ≤ 0 its
 * default), plus the reference structure, for `quaver collect`, which
 * rebuilds the whole Hessian from the space group. QV_ERROR_USAGE for a
 * structure without a periodic cell. @supercell may be freed after the
 * call (the export keeps a copy). */
QvExport *qv_export_new_symmetric_stencil (const QvStructure *supercell, double step,
                                           double symprec, const QvExportFormat *format,
                                           QvManifest *manifest, GError **error);
/* A supercell displaced along one lattice mode (qv_frozen_phonon_new), as
 * one extended-XYZ file with its Lattice, q, branch, wavenumber, amplitude
 * and phase on the comment line and in the manifest. @fp may be freed after
 * the call (the export keeps a copy of the structure). */
QvExport *qv_export_new_frozen (const QvFrozenPhonon *fp, const QvExportFormat *format,
                                QvManifest *manifest, GError **error);

void qv_export_free (QvExport *export_);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvExport, qv_export_free)

/* The command the export belongs to: "displace", "ensemble", "stencil". */
const char *qv_export_command (const QvExport *export_);
/* Files it will write, manifest.json not counted, in order. */
gsize qv_export_n_files (const QvExport *export_);
const char *qv_export_file_name (const QvExport *export_, gsize i);
/* Structures in all files together. */
gsize qv_export_n_structures (const QvExport *export_);
/* What the export holds, in a few plain lines for a person (what, how many,
 * the amplitude in every unit, the temperature and seed…), newly
 * allocated, untranslated. */
char *qv_export_describe (const QvExport *export_);
/* Notes the user should read before writing (the escape pair's default,
 * imaginary modes left out of an ensemble…), NULL-terminated, owned by the
 * export. */
const char *const *qv_export_notes (const QvExport *export_);
/* The file structure @s (0 ≤ s < n_structures) goes into. */
const char *qv_export_structure_file (const QvExport *export_, gsize s);
/* What the export was made from, for listings: the displaced structures
 * (displace), the sampler (ensemble) or the stencil; NULL for the other
 * kinds. */
const QvDisplacementSet *qv_export_displacement_set (const QvExport *export_);
const QvEnsemble *qv_export_ensemble (const QvExport *export_);
const QvStencil *qv_export_stencil (const QvExport *export_);

/* Opens @directory (new or empty; non-empty only with @force, see
 * qv-output-dir.h), writes every file and then manifest.json. @progress
 * (may be NULL) is called between files and can cancel (QV_ERROR_CANCELLED).
 * On failure the files already written stay, manifest.json is not written,
 * and the error says how many files are left and that the export is
 * incomplete. One export can be written once. */
gboolean qv_export_write (QvExport *export_, const char *directory, gboolean force,
                          const QvProgress *progress, GError **error);
/* After qv_export_write: the directory and the files written there
 * (manifest.json last when it succeeded), owned by the export. */
const char *qv_export_directory (const QvExport *export_);
const char *const *qv_export_written (const QvExport *export_, gsize *n);
/* The manifest as written (or as it stands before writing). */
const QvManifest *qv_export_manifest (const QvExport *export_);

G_END_DECLS
