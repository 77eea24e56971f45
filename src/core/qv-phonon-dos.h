/* qv-phonon-dos.h — phonon density of states on a Γ-centred mesh: Gaussian
 * smearing or the linear tetrahedron method, total and per element.
 *
 * g(ω) is in states per cm⁻¹ per primitive cell, normalised so that
 * ∫ g dω = 3n (n sites): every mesh point weighs 1/N_q and every branch
 * carries one state. ω is the signed wavenumber (cm⁻¹, negative =
 * imaginary) as in QvPhononSet.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-force-constants.h"
#include "qv-phonon-mesh.h"
#include "qv-progress.h"

G_BEGIN_DECLS

typedef enum {
  QV_DOS_TETRAHEDRON,
  QV_DOS_GAUSSIAN,
} QvDosMethod;

gboolean qv_dos_method_parse (const char *text, QvDosMethod *method, GError **error);
const char *qv_dos_method_name (QvDosMethod method);

typedef struct {
  QvDosMethod method;
  double sigma;          /* cm⁻¹, Gaussian standard deviation (> 0 for QV_DOS_GAUSSIAN) */
  double step;           /* cm⁻¹ between grid points; ≤ 0: range / 1000 */
  double omega_min;      /* cm⁻¹; when omega_max ≤ omega_min the range is taken */
  double omega_max;      /*   from the modes (± 5σ for Gaussian) */
} QvDosOptions;

typedef struct {
  QvDosMethod method;
  double sigma;
  double step;
  gsize n_points;
  double *omega;         /* n_points, cm⁻¹, centres of the grid bins */
  double *total;         /* n_points, states / cm⁻¹ / cell */
  gsize n_groups;
  guint *z;              /* n_groups atomic numbers, ascending */
  double *partial;       /* n_groups × n_points; Σ over groups = total */
  int mesh[3];
} QvPhononDos;

void qv_phonon_dos_free (QvPhononDos *dos);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvPhononDos, qv_phonon_dos_free)

/* The DOS from @wavenumbers (n_q × nb, mesh order, any order within a q)
 * and optional projections @weights (n_q × nb × n_groups, each mode's
 * weights summing to 1; NULL: none, n_groups 0). @reciprocal (rows b_i, any
 * scale) picks the shortest main diagonal of the mesh's subcells for the
 * tetrahedra. Tetrahedron: Lehmann & Taut, phys. stat. sol. (b) 54, 469
 * (1972) with the subcell split into six tetrahedra around its shortest
 * diagonal (Blöchl, Jepsen & Andersen, Phys. Rev. B 49, 16223, 1994, from
 * memory); each grid value is the exact number of states in its bin
 * divided by the bin width, so the grid sums to 3n whatever the step when
 * it covers every mode. Gaussian: exp(−(ω−ω_qν)²/2σ²)/(σ√2π) per mode,
 * evaluated at the grid points. A tetrahedron's projection is the mean of
 * its four corners' weights. */
QvPhononDos *qv_phonon_dos_compute (const QvPhononMesh *mesh, const double reciprocal[3][3],
                                    gsize n_branches, const double *wavenumbers,
                                    const double *weights, gsize n_groups, const guint *z,
                                    const QvDosOptions *options, GError **error);

/* Solves D(q) on @mesh (in chunks, @n_threads workers) and returns the
 * DOS with one projection per element: the weight of mode (q, ν) on
 * element Z is Σ_{κ of Z} |e_κ(q ν)|², @site_z the atomic number of each
 * primitive site (QvSupercellMap.z). */
QvPhononDos *qv_phonon_dos_from_force_constants (const QvForceConstants *fc,
                                                 const guint *site_z,
                                                 const QvPhononMesh *mesh,
                                                 const QvDosOptions *options, guint n_threads,
                                                 const QvProgress *progress, GError **error);

/* qv_phonon_dos_from_force_constants with @term and @data added to every
 * D(q) (qv_phonon_mesh_solve_with; NULL: the same, bit for bit). */
QvPhononDos *qv_phonon_dos_from_force_constants_with (const QvForceConstants *fc,
                                                      QvDynamicalTerm term, gpointer data,
                                                      const guint *site_z,
                                                      const QvPhononMesh *mesh,
                                                      const QvDosOptions *options,
                                                      guint n_threads,
                                                      const QvProgress *progress,
                                                      GError **error);

G_END_DECLS
