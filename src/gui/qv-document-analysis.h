/* qv-document-analysis.h — what the core says each mode of a document is:
 * the point group and every mode's species (qv-symmetry-modes.h), the
 * internal-coordinate make-up (qv-mode-character.h) and, when the input has
 * derivative tensors, the IR and Raman intensities (qv-intensity.h).
 * Computed once per mode set, on the worker that loads or solves it; the
 * main thread only reads it.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-intensity.h"
#include "qv-mode-character.h"
#include "qv-mode-set.h"
#include "qv-point-group.h"
#include "qv-structure.h"
#include "qv-symmetry-modes.h"

G_BEGIN_DECLS

/* Larger structures are left without a make-up (the redundant internal
 * coordinates' G matrix grows with the square of the atoms and its
 * pseudo-inverse with the cube): `quaver modes --character` computes it. */
#define QV_DOCUMENT_ANALYSIS_MAX_CHARACTER_ATOMS 400
/* Larger structures are not searched for a point group. */
#define QV_DOCUMENT_ANALYSIS_MAX_SYMMETRY_ATOMS 2000

typedef struct {
  QvPointGroup *group;           /* NULL: see @group_note */
  QvSymmetryReport *symmetry;    /* with @group; labels every mode */
  char *group_note;              /* why there is no group, or NULL */
  QvModeCharacter *character;    /* NULL: see @character_note */
  char *character_note;
  QvDerivatives *derivatives;    /* the input's tensors, or NULL */
  QvIntensities *intensities;    /* from @derivatives, or NULL */
  char *intensity_note;          /* why there are none, or NULL */
} QvDocumentAnalysis;

/* Everything the core can say about @modes of @structure. Never fails:
 * what cannot be computed is NULL with a note. Takes @derivatives (may be
 * NULL). */
QvDocumentAnalysis *qv_document_analysis_new (const QvStructure *structure, const QvModeSet *modes,
                                              QvDerivatives *derivatives);
void qv_document_analysis_free (QvDocumentAnalysis *analysis);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvDocumentAnalysis, qv_document_analysis_free)

/* A copy of @analysis's tensors for the next solve, or NULL. */
QvDerivatives *qv_document_analysis_copy_derivatives (const QvDocumentAnalysis *analysis);

/* The core's ASCII names as a reader writes them: "Cinfv" → "C∞v",
 * "Dinfh" → "D∞h", "Sigma_g+" → "Σg+", "Pi_u" → "Πu" (newly allocated). */
char *qv_document_analysis_display (const char *name);

/* Mode @k's species ("A1", "E2g", "?" when broken; NULL without a group). */
const char *qv_document_analysis_label (const QvDocumentAnalysis *analysis, gsize k);
/* A key that sorts modes by species in the character table's order (the
 * table's irrep index), unlabelled modes last. */
int qv_document_analysis_label_order (const QvDocumentAnalysis *analysis, gsize k);

G_END_DECLS
