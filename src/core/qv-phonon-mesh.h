/* qv-phonon-mesh.h — Γ-centred meshes of wave vectors over the Brillouin
 * zone, and solving D(q) on them chunk by chunk.
 *
 * A mesh n1 × n2 × n3 holds q = (i/n1, j/n2, k/n3) in fractional reciprocal
 * coordinates without 2π (qv-dynamical-matrix.h), each component folded
 * into (−½, ½]; index (i·n2 + j)·n3 + k, so Γ is index 0. Every point has
 * weight 1/(n1 n2 n3) (no symmetry reduction in this version).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-dynamical-matrix.h"

G_BEGIN_DECLS

#define QV_PHONON_MESH_MAX_POINTS 8000000

typedef struct {
  int n[3];
  gsize n_q;
  double *q;          /* 3 n_q, fractional reciprocal */
} QvPhononMesh;

/* "NxMxL" or a single "N" (N×N×N), each from 1 to 1000 and at most
 * QV_PHONON_MESH_MAX_POINTS points; QV_ERROR_USAGE otherwise. */
gboolean qv_phonon_mesh_parse (const char *text, int n[3], GError **error);
QvPhononMesh *qv_phonon_mesh_new (const int n[3], GError **error);
void qv_phonon_mesh_free (QvPhononMesh *mesh);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvPhononMesh, qv_phonon_mesh_free)

/* Index of mesh point (i, j, k), each taken modulo its n. */
gsize qv_phonon_mesh_index (const QvPhononMesh *mesh, long i, long j, long k);

/* Called for each solved chunk of consecutive mesh points (start .. start +
 * chunk->n_q − 1); return FALSE (with @error set) to stop. */
typedef gboolean (*QvPhononChunkFunc) (const QvPhononSet *chunk, gsize start, gpointer user_data,
                                       GError **error);

/* Solves D(q) over the whole mesh in chunks of at most @chunk_size points
 * (0: 4096) with qv_dynamical_matrix_solve (@n_threads workers), handing
 * each to @func, so eigenvectors of a dense mesh never need to be held at
 * once. Progress covers the whole mesh. */
gboolean qv_phonon_mesh_solve (const QvForceConstants *fc, const QvPhononMesh *mesh,
                               gboolean want_vectors, gsize chunk_size, guint n_threads,
                               QvPhononChunkFunc func, gpointer user_data,
                               const QvProgress *progress, GError **error);

/* qv_phonon_mesh_solve with @term (may be NULL: the same as
 * qv_phonon_mesh_solve, bit for bit) added to every D(q) with @data, as
 * qv_dynamical_matrix_solve_with. */
gboolean qv_phonon_mesh_solve_with (const QvForceConstants *fc, QvDynamicalTerm term,
                                    gpointer data, const QvPhononMesh *mesh,
                                    gboolean want_vectors, gsize chunk_size, guint n_threads,
                                    QvPhononChunkFunc func, gpointer user_data,
                                    const QvProgress *progress, GError **error);

G_END_DECLS
