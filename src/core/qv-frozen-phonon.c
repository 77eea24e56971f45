/* qv-frozen-phonon.c — a supercell displaced along one lattice mode.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-dynamical-matrix.h"
#include "qv-error.h"
#include "qv-frozen-phonon.h"

void
qv_frozen_phonon_free (QvFrozenPhonon *fp)
{
  if (fp == NULL)
    return;
  g_free (fp->vector);
  g_free (fp->displacements);
  qv_structure_free (fp->structure);
  g_free (fp);
}

static gboolean
near_integer (double x)
{
  return fabs (x - round (x)) < 1e-8;
}

gboolean
qv_frozen_phonon_commensurate (const int matrix[3][3], const double q[3], GError **error)
{
  double mf[3];
  for (int i = 0; i < 3; i++)
    mf[i] = matrix[i][0] * q[0] + matrix[i][1] * q[1] + matrix[i][2] * q[2];
  if (near_integer (mf[0]) && near_integer (mf[1]) && near_integer (mf[2]))
    return TRUE;
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "q = (%g %g %g) is not commensurate with the supercell [%d %d %d; %d %d %d; %d %d %d]: "
               "M q = (%g %g %g) must be integer; choose q = M^-1 k for integer k "
               "(for an NxMxL supercell, multiples of 1/N, 1/M, 1/L) or a larger supercell",
               q[0], q[1], q[2], matrix[0][0], matrix[0][1], matrix[0][2], matrix[1][0],
               matrix[1][1], matrix[1][2], matrix[2][0], matrix[2][1], matrix[2][2], mf[0], mf[1],
               mf[2]);
  return FALSE;
}

gboolean
qv_frozen_phonon_q_is_real (const double q[3])
{
  return near_integer (2 * q[0]) && near_integer (2 * q[1]) && near_integer (2 * q[2]);
}

/* e^{iq·(R_l+τ_κ)} of supercell atom @i. */
static double _Complex
atom_phase (const QvSupercellMap *map, const double cell[3][3], const double qc[3], gsize i)
{
  const int *t = map->translation + 3 * i;
  const double *tau = map->positions + 3 * map->site[i];
  double x = 0;
  for (int c = 0; c < 3; c++)
    x += qc[c] * (t[0] * cell[0][c] + t[1] * cell[1][c] + t[2] * cell[2][c] + tau[c]);
  return cos (x) + I * sin (x);
}

QvFrozenPhonon *
qv_frozen_phonon_new (const QvForceConstants *fc, const QvSupercellMap *map,
                      const QvStructure *supercell, const QvFrozenRequest *request,
                      GError **error)
{
  return qv_frozen_phonon_new_with (fc, NULL, NULL, map, supercell, request, error);
}

gboolean
qv_frozen_phonon_diagonal_supercell (const double q[3], int max, int matrix[3][3], GError **error)
{
  memset (matrix, 0, 9 * sizeof (int));
  for (int i = 0; i < 3; i++)
    {
      int n = 1;
      while (n <= max && !near_integer (n * q[i]))
        n++;
      if (n > max)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "q = (%g %g %g) needs more than %d cells along b%d for a frozen phonon: "
                       "choose a q with small denominators, such as 1/2, 1/3 or 1/4",
                       q[0], q[1], q[2], max, i + 1);
          return FALSE;
        }
      matrix[i][i] = n;
    }
  return TRUE;
}

QvFrozenPhonon *
qv_frozen_phonon_new_with (const QvForceConstants *fc, QvDynamicalTerm term, gpointer data,
                           const QvSupercellMap *map, const QvStructure *supercell,
                           const QvFrozenRequest *request, GError **error)
{
  gsize n = qv_force_constants_n_sites (fc), nb = 3 * n;
  const double (*cell)[3] = qv_force_constants_cell (fc);
  g_autoptr(QvPhononSet) set = NULL;
  g_autoptr(QvFrozenPhonon) fp = NULL;
  double qc[3], big = 0, norm2 = 0, scale;

  if (map->n_primitive != n || supercell->n_atoms != map->n_atoms)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "the supercell (%" G_GSIZE_FORMAT " atoms) and the force constants (%"
                   G_GSIZE_FORMAT " sites) do not belong together", supercell->n_atoms, n);
      return NULL;
    }
  if (!qv_frozen_phonon_commensurate (map->matrix, request->q, error))
    return NULL;
  if (request->branch >= nb)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "branch %" G_GSIZE_FORMAT " does not exist: the crystal has %" G_GSIZE_FORMAT
                   " branches (1 to %" G_GSIZE_FORMAT ")", request->branch + 1, nb, nb);
      return NULL;
    }
  if (!(request->amplitude > 0) || !isfinite (request->amplitude) || !isfinite (request->phase))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "the amplitude must be a positive number and the phase finite (got %g, %g)",
                   request->amplitude, request->phase);
      return NULL;
    }
  set = qv_dynamical_matrix_solve_with (fc, term, data, request->q, 1, TRUE, 1, NULL, error);
  if (set == NULL)
    return NULL;

  fp = g_new0 (QvFrozenPhonon, 1);
  memcpy (fp->q, request->q, sizeof fp->q);
  fp->branch = request->branch;
  fp->eigenvalue = set->eigenvalues[request->branch];
  fp->wavenumber = set->wavenumbers[request->branch];
  fp->phase = request->phase;
  fp->standing = !qv_frozen_phonon_q_is_real (request->q);
  for (gsize b = 0; b < nb; b++)
    if (b != request->branch
        && fabs (set->eigenvalues[b] - fp->eigenvalue)
             <= 1e-6 * MAX (fabs (fp->eigenvalue), 1e-6))
      fp->degenerate = TRUE;
  fp->vector = g_memdup2 (set->eigenvectors + request->branch * nb, nb * sizeof (double _Complex));
  fp->n_atoms = supercell->n_atoms;
  fp->displacements = g_new (double, 3 * fp->n_atoms);

  /* the pattern for A = 1, then scaled */
  qv_dynamical_matrix_cartesian_q (cell, request->q, qc);
  {
    double _Complex rot = cos (request->phase) + I * sin (request->phase);
    double nc = (double) map->n_cells;
    for (gsize i = 0; i < fp->n_atoms; i++)
      {
        gsize k = map->site[i];
        double _Complex p = rot * atom_phase (map, cell, qc, i);
        double w = 1.0 / sqrt (nc * map->masses[k]), len = 0;
        for (int a = 0; a < 3; a++)
          {
            double u = creal (fp->vector[3 * k + a] * p) * w;
            fp->displacements[3 * i + a] = u;
            len += u * u;
          }
        big = MAX (big, sqrt (len));
        norm2 += map->masses[k] * len;
      }
  }
  /* Σ m |u|² for A = 1 is ½ at q ≢ −q; at q ≡ −q it is cos²(φ + θ) with
   * θ fixed by the eigenvector's phase, and may vanish */
  if (!(norm2 > 1e-10))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "branch %" G_GSIZE_FORMAT " at q = (%g %g %g) moves no atom at phase %g rad: "
                   "at a q equal to -q the pattern is real only up to a phase; add 90 degrees "
                   "to the phase", request->branch + 1, request->q[0], request->q[1],
                   request->q[2], request->phase);
      return NULL;
    }
  if (request->unit == QV_FROZEN_Q)
    scale = request->amplitude;
  else
    scale = request->amplitude / big;
  fp->a = scale;
  fp->largest = big * scale;
  fp->structure = qv_structure_copy (supercell);
  for (gsize i = 0; i < fp->n_atoms; i++)
    for (int a = 0; a < 3; a++)
      {
        fp->displacements[3 * i + a] *= scale;
        fp->structure->atoms[i].position[a] += fp->displacements[3 * i + a];
      }
  g_clear_pointer (&fp->structure->forces, g_free);
  fp->structure->has_energy = FALSE;
  return g_steal_pointer (&fp);
}

double _Complex
qv_frozen_phonon_project (const QvSupercellMap *map, const double cell[3][3], const double q[3],
                          const double _Complex *e, const double *u)
{
  double qc[3], nc = (double) map->n_cells;
  double _Complex z = 0;

  qv_dynamical_matrix_cartesian_q (cell, q, qc);
  for (gsize i = 0; i < map->n_atoms; i++)
    {
      gsize k = map->site[i];
      double _Complex p = conj (atom_phase (map, cell, qc, i)), s = 0;
      for (int a = 0; a < 3; a++)
        s += conj (e[3 * k + a]) * u[3 * i + a];
      z += sqrt (nc * map->masses[k]) * s * p;
    }
  return 2 * z / nc;
}

QvFrozenPhonon *
qv_frozen_phonon_new_in_crystal (const QvCrystal *crystal, const QvStructure *supercell,
                                 const QvFrozenRequest *request, int max, int matrix[3][3],
                                 GError **error)
{
  g_autoptr(QvStructure) own = NULL;
  g_autoptr(QvSupercellMap) own_map = NULL;
  const QvSupercellMap *map = crystal->map;
  int m[3][3];

  if (crystal->fc == NULL)
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE,
                           "the crystal has no force constants for a frozen phonon");
      return NULL;
    }
  memcpy (m, crystal->map->matrix, sizeof m);
  if (!qv_frozen_phonon_commensurate (m, request->q, NULL))
    {
      if (!qv_frozen_phonon_diagonal_supercell (request->q, max, m, error)
          || (own = qv_supercell_build (crystal->primitive, m, error)) == NULL
          || (own_map = qv_supercell_map (crystal->primitive, own, 0, error)) == NULL)
        return NULL;
      supercell = own;
      map = own_map;
    }
  if (matrix != NULL)
    memcpy (matrix, m, sizeof m);
  return qv_frozen_phonon_new_with (crystal->fc, qv_crystal_term (crystal),
                                    qv_crystal_term_data (crystal), map, supercell, request,
                                    error);
}
