/* qv-export-private.h — what the kinds of export (qv-export-displace.c,
 * -ensemble.c, -stencil.c) fill in for the shared planning and writing of
 * qv-export.c.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include "qv-export.h"
#include "qv-output-dir.h"
#include "qv-space-group.h"
#include "qv-symmetric-stencil.h"

G_BEGIN_DECLS

typedef struct {
  /* Appends the contents of planned file @file to @text; @progress covers
   * this file only (may cancel). */
  gboolean (*produce) (QvExport *export_, gsize file, GString *text,
                       const QvProgress *progress, GError **error);
  /* The frames of @file into its manifest entry. */
  void (*record) (QvExport *export_, gsize file, QvManifestFile *entry);
  /* After the last file, before the manifest is written (may be NULL). */
  void (*finish) (QvExport *export_);
  void (*free) (QvExport *export_);
} QvExportClass;

struct _QvExport {
  const QvExportClass *klass;
  char *command;
  QvManifest *manifest;
  QvExportFormat format;
  const QvStructure *structure;
  const QvModeSet *modes;
  GPtrArray *files;            /* char*, planned names */
  GPtrArray *formats;          /* const char*, "xyz" / "extxyz" per file */
  gsize n_structures;
  gsize *structure_file;       /* n_structures: the file each goes into */
  GPtrArray *notes;            /* char*, NULL-terminated */
  char *description;
  gboolean written;
  char *directory;
  GPtrArray *written_names;    /* char*, NULL-terminated */
  /* the kinds' own */
  QvDisplacementSet *set;
  QvDisplaceRequest request;
  gboolean masses_column;
  QvEnsemble *ensemble;
  QvEnsembleStats stats;
  guint64 count;
  double *block_positions, *block_velocities;
  gsize block_first, block_count, block_capacity;
  QvStencil *stencil;
  QvStructure *own_structure;
  QvSymmetricStencil *symmetric_stencil;
  double symmetric_step;
};

/* Shared by the kinds: a new export of @command taking @manifest. */
QvExport *qv_export_alloc (const QvExportClass *klass, const char *command,
                           const QvStructure *structure, const QvModeSet *modes,
                           const QvExportFormat *format, QvManifest *manifest);
void qv_export_plan_file (QvExport *export_, char *name, const char *format);
void qv_export_add_note (QvExport *export_, const char *note);
/* The manifest's structure fields (atoms, formula, periodic). */
void qv_export_describe_structure (QvExport *export_);
/* The format name of a style. */
const char *qv_export_style_name (QvXyzStyle style);

G_END_DECLS
