/* qv-document-lattice.h — what the core says about a crystal document: its
 * force constants folded onto the primitive cell, the dispersion along a
 * path, the density of states and the thermal properties on a q mesh.
 * Computed once on the worker that loads the document; the main thread
 * only reads it (and solves single q points for the view).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-band-path.h"
#include "qv-crystal.h"
#include "qv-dynamical-matrix.h"
#include "qv-hessian.h"
#include "qv-input.h"
#include "qv-phonon-dos.h"
#include "qv-phonon-thermal.h"
#include "qv-progress.h"
#include "qv-structure.h"

G_BEGIN_DECLS

/* Points along the dispersion path in the app. */
#define QV_DOCUMENT_LATTICE_PATH_POINTS 240

typedef struct {
  QvCrystal *crystal;
  char *space_group;           /* "Fm-3m (225)", or NULL when spglib found none */
  char *origin;                /* how the primitive cell was found: "bundle", "spglib" */
  gboolean has_conventional;   /* spglib's standardised (conventional) cell: */
  double conventional[6];      /*   a, b, c (Å), α, β, γ (degrees) */
  gsize conventional_atoms;
  QvBandPath *path;            /* NULL: see @path_note */
  QvBandSampling *sampling;
  gsize n_branches;
  double *bands;               /* n_q × n_branches, cm⁻¹, connected by overlap */
  guint *order;                /* n_q × n_branches: branch b at q k is mode order[k·nb+b]
                                  in ascending order there (qv_band_connect) */
  double *solve_q;             /* 3 n_q: the q solved (Γ nudged along the path for
                                  the LO–TO term, qv_band_sampling_solve_points) */
  char *path_note;             /* why there is no dispersion, or NULL */
  int mesh[3];
  QvPhononDos *dos;            /* tetrahedron method, per element */
  QvThermal *thermal;          /* 0 … 1000 K */
  gsize formula_units;
  char *mesh_note;             /* why there is no DOS, or NULL */
} QvDocumentLattice;

/* The crystal of @input when it has one: a bundle's "crystal", or a
 * structure with a cell and a Hessian whose primitive cell spglib finds
 * smaller than it (the structure then being a supercell). NULL when the
 * input is no crystal; on a crystal that fails to build, NULL with
 * @note set to why (for the app to say). Cancelling through @progress
 * stops between the stages and returns NULL without a note. */
QvDocumentLattice *qv_document_lattice_new (const QvInput *input, const QvProgress *progress,
                                            char **note);
void qv_document_lattice_free (QvDocumentLattice *lattice);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvDocumentLattice, qv_document_lattice_free)

/* The eigenvectors and wavenumbers at one fractional q (with the LO–TO
 * term of a polar crystal; Γ itself has none: pass the path's @solve_q). */
QvPhononSet *qv_document_lattice_solve (const QvDocumentLattice *lattice, const double q[3],
                                        GError **error);

G_END_DECLS
