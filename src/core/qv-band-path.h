/* qv-band-path.h — paths through the Brillouin zone: user paths, default
 * paths for cubic and hexagonal lattices, sampling, and the connection of
 * branches from one q to the next by eigenvector overlap.
 *
 * q points are fractional reciprocal coordinates "without 2π": q = Σ f_i
 * b_i with a_i·b_j = 2π δ_ij, so X of a simple cubic cell is (0, ½, 0).
 * Path distances are Cartesian lengths |Δq| in Å⁻¹ "with 2π".
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-dynamical-matrix.h"

G_BEGIN_DECLS

typedef struct {
  gsize n_vertices;
  char **labels;          /* n_vertices, owned */
  double *q;              /* 3 n_vertices, fractional reciprocal */
  gboolean *jump;         /* n_vertices: TRUE when the path jumps to this vertex
                             from the previous one (no segment between them) */
  char *lattice;          /* "cP", "cF", "cI", "hP" for a default path, else NULL */
} QvBandPath;

void qv_band_path_free (QvBandPath *path);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvBandPath, qv_band_path_free)

/* "G 0 0 0; X 0.5 0 0.5; W 0.5 0.25 0.75 | K 0.375 0.375 0.75; G": points
 * "LABEL QA QB QC" separated by ';' (joined by a segment) or '|' (the path
 * jumps). A label given before may stand alone to reuse its point.
 * QV_ERROR_USAGE with the item and what to write instead. */
QvBandPath *qv_band_path_parse (const char *text, GError **error);

/* The path of Setyawan & Curtarolo, Comput. Mater. Sci. 49, 299 (2010)
 * (from memory) for a cubic P, F, I or hexagonal lattice, recognised from
 * the metric of @cell (rows, Å) whatever its orientation and whichever
 * primitive vectors it uses: the paper's points are transformed into this
 * cell's reciprocal coordinates. The path follows the lattice, not the
 * space group of the atoms. Other lattices: QV_ERROR_USAGE asking for
 * --path. @tolerance is relative on the metric (≤ 0: 10⁻³). */
QvBandPath *qv_band_path_default (const double cell[3][3], double tolerance, GError **error);

/* The path as text in the syntax of qv_band_path_parse. */
char *qv_band_path_to_string (const QvBandPath *path);

typedef struct {
  gsize n_q;
  double *q;              /* 3 n_q fractional */
  double *distance;       /* n_q, cumulative |Δq| in Å⁻¹ (with 2π); a jump adds nothing */
  gboolean *restart;      /* n_q: TRUE at the first point of each continuous piece */
  gsize n_labels;
  char **labels;          /* "X", or "U|K" where the path jumps */
  double *label_distance;
  gsize *label_index;     /* sample index of each label */
} QvBandSampling;

void qv_band_sampling_free (QvBandSampling *sampling);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvBandSampling, qv_band_sampling_free)

/* Samples @path for @cell: with @density > 0, every segment gets
 * ⌈length × density⌉ intervals (density in points per Å⁻¹); otherwise about
 * @n_points points in all (at least 2 per segment), shared among the
 * segments by length. Both ends of every segment are sampled; at a jump
 * both the end and the new start appear, at the same distance. */
QvBandSampling *qv_band_path_sample (const QvBandPath *path, const double cell[3][3],
                                     gsize n_points, double density, GError **error);

/* The points of @s to solve when D(q) has a non-analytic term (polar
 * crystals, qv-nonanalytic.h), which at Γ depends on the direction of
 * approach: every Γ point is moved @step (fractional, e.g. 10⁻⁶) towards
 * its neighbour on the same piece of the path; a Γ alone on its piece
 * stays. A new array of 3 n_q doubles. */
double *qv_band_sampling_solve_points (const QvBandSampling *s, double step);

/* Connects branches along the q points of @set (which must hold
 * eigenvectors): order[k·nb + b] is the index (in ascending order at q_k)
 * of branch b. At k = 0 and where @restart[k] (may be NULL) the branches
 * are numbered in ascending order; elsewhere branch b continues into the
 * mode j that maximises Σ_b |⟨e_b(q_{k−1}) | e_j(q_k)⟩|² over all
 * one-to-one assignments (Kuhn–Munkres: Munkres, J. SIAM 5, 32, 1957), so
 * branches that cross are followed rather than swapped. */
void qv_band_connect (const QvPhononSet *set, const gboolean *restart, guint *order);

G_END_DECLS
