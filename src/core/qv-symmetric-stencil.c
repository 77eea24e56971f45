/* qv-symmetric-stencil.c — symmetry-reduced displacements of a supercell
 * and the force constants rebuilt from them.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-space-group.h"
#include "qv-stencil.h"
#include "qv-symmetric-stencil.h"

typedef double Mat3[3][3];
typedef double Vec3[3];

struct _QvSymmetricStencil {
  gsize n_atoms;
  double step;
  gsize n_ops;
  double (*rot)[3][3];       /* n_ops Cartesian rotations S */
  gsize *perm;               /* n_ops × n_atoms: p_g(i) */
  gsize n_dirs;              /* kept (atom, direction) pairs */
  gsize *atom;               /* n_dirs */
  double (*dir)[3];          /* n_dirs, unit */
};

void
qv_symmetric_stencil_free (QvSymmetricStencil *st)
{
  if (st == NULL)
    return;
  g_free (st->rot);
  g_free (st->perm);
  g_free (st->atom);
  g_free (st->dir);
  g_free (st);
}

gsize qv_symmetric_stencil_n_atoms (const QvSymmetricStencil *st) { return st->n_atoms; }
gsize qv_symmetric_stencil_n_displacements (const QvSymmetricStencil *st) { return 2 * st->n_dirs; }
gsize qv_symmetric_stencil_n_operations (const QvSymmetricStencil *st) { return st->n_ops; }

static gboolean
invert3 (const double m[3][3], double out[3][3])
{
  double det = m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1])
               - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0])
               + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0]);
  if (fabs (det) < 1e-300)
    return FALSE;
  out[0][0] = (m[1][1] * m[2][2] - m[1][2] * m[2][1]) / det;
  out[0][1] = (m[0][2] * m[2][1] - m[0][1] * m[2][2]) / det;
  out[0][2] = (m[0][1] * m[1][2] - m[0][2] * m[1][1]) / det;
  out[1][0] = (m[1][2] * m[2][0] - m[1][0] * m[2][2]) / det;
  out[1][1] = (m[0][0] * m[2][2] - m[0][2] * m[2][0]) / det;
  out[1][2] = (m[0][2] * m[1][0] - m[0][0] * m[1][2]) / det;
  out[2][0] = (m[1][0] * m[2][1] - m[1][1] * m[2][0]) / det;
  out[2][1] = (m[0][1] * m[2][0] - m[0][0] * m[2][1]) / det;
  out[2][2] = (m[0][0] * m[1][1] - m[0][1] * m[1][0]) / det;
  return TRUE;
}

static void
apply (const double s[3][3], const double v[3], double out[3])
{
  for (int a = 0; a < 3; a++)
    out[a] = s[a][0] * v[0] + s[a][1] * v[1] + s[a][2] * v[2];
}

/* Rank of @n vectors by Gram–Schmidt with a relative threshold. */
static int
rank_of (const double (*v)[3], gsize n)
{
  double basis[3][3];
  int r = 0;
  for (gsize i = 0; i < n && r < 3; i++)
    {
      double w[3] = { v[i][0], v[i][1], v[i][2] }, len0, len;
      len0 = sqrt (w[0] * w[0] + w[1] * w[1] + w[2] * w[2]);
      for (int k = 0; k < r; k++)
        {
          double p = w[0] * basis[k][0] + w[1] * basis[k][1] + w[2] * basis[k][2];
          for (int c = 0; c < 3; c++)
            w[c] -= p * basis[k][c];
        }
      len = sqrt (w[0] * w[0] + w[1] * w[1] + w[2] * w[2]);
      if (len0 > 0 && len > 1e-6 * len0)
        {
          for (int c = 0; c < 3; c++)
            basis[r][c] = w[c] / len;
          r++;
        }
    }
  return r;
}

QvSymmetricStencil *
qv_symmetric_stencil_new (const QvStructure *supercell, double step, double symprec,
                          GError **error)
{
  g_autoptr(QvSpaceGroup) group = NULL;
  g_autoptr(QvSymmetricStencil) st = NULL;
  gsize n = supercell->n_atoms;
  double at[3][3], ati[3][3], tol;
  g_autofree double (*frac)[3] = NULL;
  g_autoptr(GArray) atoms = g_array_new (FALSE, FALSE, sizeof (gsize));
  g_autoptr(GArray) dirs = g_array_new (FALSE, FALSE, sizeof (Vec3));

  if (!(step > 0) || step > QV_STENCIL_MAX_STEP)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "the step must be in (0, %g] A, got %g",
                   QV_STENCIL_MAX_STEP, step);
      return NULL;
    }
  group = qv_space_group_find (supercell, symprec, error);
  if (group == NULL)
    return NULL;
  tol = 10 * group->symprec;

  st = g_new0 (QvSymmetricStencil, 1);
  st->n_atoms = n;
  st->step = step;
  st->n_ops = group->n_operations;
  st->rot = g_new (Mat3, st->n_ops);
  st->perm = g_new (gsize, st->n_ops * n);
  /* r = Aᵀ x (A rows = lattice vectors), so S = Aᵀ R A⁻ᵀ */
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      at[i][j] = supercell->cell[j][i];
  if (!invert3 (at, ati))
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_INPUT, "the supercell's cell is singular");
      return NULL;
    }
  frac = g_new (Vec3, n);
  for (gsize i = 0; i < n; i++)
    apply ((const double (*)[3]) ati, supercell->atoms[i].position, frac[i]);
  for (gsize g = 0; g < st->n_ops; g++)
    {
      double tmp[3][3];
      g_autofree gboolean *taken = g_new0 (gboolean, n);
      for (int i = 0; i < 3; i++)
        for (int j = 0; j < 3; j++)
          {
            tmp[i][j] = 0;
            for (int k = 0; k < 3; k++)
              tmp[i][j] += group->rotations[g][i][k] * ati[k][j];
          }
      for (int i = 0; i < 3; i++)
        for (int j = 0; j < 3; j++)
          {
            st->rot[g][i][j] = 0;
            for (int k = 0; k < 3; k++)
              st->rot[g][i][j] += at[i][k] * tmp[k][j];
          }
      for (gsize i = 0; i < n; i++)
        {
          double x[3];
          gsize found = G_MAXSIZE;
          for (int a = 0; a < 3; a++)
            x[a] = group->rotations[g][a][0] * frac[i][0] + group->rotations[g][a][1] * frac[i][1]
                   + group->rotations[g][a][2] * frac[i][2] + group->translations[g][a];
          for (gsize j = 0; j < n && found == G_MAXSIZE; j++)
            {
              double df[3], dc[3];
              if (supercell->atoms[j].z != supercell->atoms[i].z)
                continue;
              for (int a = 0; a < 3; a++)
                {
                  df[a] = frac[j][a] - x[a];
                  df[a] -= round (df[a]);
                }
              apply ((const double (*)[3]) at, df, dc);
              if (sqrt (dc[0] * dc[0] + dc[1] * dc[1] + dc[2] * dc[2]) < tol)
                found = j;
            }
          if (found == G_MAXSIZE || taken[found])
            {
              g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                           "symmetry operation %" G_GSIZE_FORMAT " does not map atom %" G_GSIZE_FORMAT
                           " onto one atom within %g A: loosen the symmetry tolerance",
                           g + 1, i + 1, tol);
              return NULL;
            }
          taken[found] = TRUE;
          st->perm[g * n + i] = found;
        }
    }

  /* representatives of the orbits, in atom order */
  for (gsize a = 0; a < n; a++)
    {
      double (*images)[3];
      gsize n_site = 0, n_images = 0;
      int rank = 0;
      static const double axes[3][3] = { { 1, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 } };
      gsize first_dir = dirs->len;
      if (group->equivalent_atoms[a] != a)
        continue;
      for (gsize g = 0; g < st->n_ops; g++)
        if (st->perm[g * n + a] == a)
          n_site++;
      images = g_new (Vec3, 3 * n_site);
      for (int c = 0; c < 3 && rank < 3; c++)
        {
          gsize before = n_images;
          int r;
          for (gsize g = 0; g < st->n_ops; g++)
            if (st->perm[g * n + a] == a)
              apply ((const double (*)[3]) st->rot[g], axes[c], images[n_images++]);
          r = rank_of ((const double (*)[3]) images, n_images);
          if (r > rank)
            {
              rank = r;
              g_array_append_val (atoms, a);
              g_array_append_vals (dirs, axes[c], 1);
            }
          else
            n_images = before;
        }
      g_free (images);
      (void) first_dir;
    }
  st->n_dirs = atoms->len;
  st->atom = g_memdup2 (atoms->data, atoms->len * sizeof (gsize));
  st->dir = g_memdup2 (dirs->data, dirs->len * sizeof (Vec3));
  return g_steal_pointer (&st);
}

void
qv_symmetric_stencil_displacement (const QvSymmetricStencil *st, gsize d, gsize *atom,
                                   double direction[3], int *sign)
{
  gsize k = d / 2;
  *atom = st->atom[k];
  memcpy (direction, st->dir[k], sizeof (Vec3));
  *sign = d % 2 == 0 ? 1 : -1;
}

void
qv_symmetric_stencil_positions (const QvSymmetricStencil *st, const QvStructure *reference,
                                gsize d, double *positions)
{
  gsize atom;
  double dir[3];
  int sign;
  for (gsize i = 0; i < reference->n_atoms; i++)
    memcpy (positions + 3 * i, reference->atoms[i].position, 3 * sizeof (double));
  qv_symmetric_stencil_displacement (st, d, &atom, dir, &sign);
  for (int a = 0; a < 3; a++)
    positions[3 * atom + a] += sign * st->step * dir[a];
}

QvHessian *
qv_symmetric_stencil_assemble (const QvSymmetricStencil *st, const double *forces,
                               double *spread, GError **error)
{
  gsize n = st->n_atoms, n3 = 3 * n;
  g_autoptr(QvHessian) h = NULL, avg = NULL;
  g_autofree double (*m)[3][3] = g_new0 (Mat3, n);
  g_autofree double *f = g_new (double, n3);
  double fmax = 0, worst = 0;

  for (gsize i = 0; i < 2 * st->n_dirs * n3; i++)
    if (!isfinite (forces[i]))
      {
        g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                     "the force on atom %" G_GSIZE_FORMAT " in displacement %" G_GSIZE_FORMAT
                     " is not a finite number", (i % n3) / 3 + 1, i / n3 + 1);
        return NULL;
      }
  h = qv_hessian_new (n3, TRUE, error);
  avg = h ? qv_hessian_new (n3, TRUE, error) : NULL;
  if (avg == NULL)
    return NULL;
  /* accumulate UᵀU per atom b (m) and UᵀR into the rows of b (h, as B[row][col]) */
  for (gsize k = 0; k < st->n_dirs; k++)
    {
      const double *fp = forces + (2 * k) * n3, *fm = forces + (2 * k + 1) * n3;
      for (gsize i = 0; i < n3; i++)
        {
          f[i] = -(fp[i] - fm[i]) / (2 * st->step);
          fmax = MAX (fmax, fabs (f[i]));
        }
      for (gsize g = 0; g < st->n_ops; g++)
        {
          const gsize *p = st->perm + g * n;
          gsize b = p[st->atom[k]];
          double u[3];
          apply ((const double (*)[3]) st->rot[g], st->dir[k], u);
          for (int x = 0; x < 3; x++)
            for (int y = 0; y < 3; y++)
              m[b][x][y] += u[x] * u[y];
          for (gsize j = 0; j < n; j++)
            {
              double sf[3];
              gsize pj = p[j];
              apply ((const double (*)[3]) st->rot[g], f + 3 * j, sf);
              for (int x = 0; x < 3; x++)
                for (int y = 0; y < 3; y++)
                  avg->data[(3 * b + x) + (3 * pj + y) * n3] += u[x] * sf[y];
            }
        }
    }
  /* Φ_{b·} = (UᵀU)⁻¹ UᵀR */
  for (gsize b = 0; b < n; b++)
    {
      double inv[3][3];
      if (!invert3 ((const double (*)[3]) m[b], inv))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                       "atom %" G_GSIZE_FORMAT " is reached by too few displacement directions",
                       b + 1);
          return NULL;
        }
      for (gsize c = 0; c < n3; c++)
        for (int x = 0; x < 3; x++)
          {
            double s = 0;
            for (int y = 0; y < 3; y++)
              s += inv[x][y] * avg->data[(3 * b + y) + c * n3];
            h->data[(3 * b + x) + c * n3] = s;
          }
    }
  /* residual of the equations */
  if (spread)
    {
      for (gsize k = 0; k < st->n_dirs; k++)
        {
          const double *fp = forces + (2 * k) * n3, *fm = forces + (2 * k + 1) * n3;
          for (gsize i = 0; i < n3; i++)
            f[i] = -(fp[i] - fm[i]) / (2 * st->step);
          for (gsize g = 0; g < st->n_ops; g++)
            {
              const gsize *p = st->perm + g * n;
              gsize b = p[st->atom[k]];
              double u[3];
              apply ((const double (*)[3]) st->rot[g], st->dir[k], u);
              for (gsize j = 0; j < n; j++)
                {
                  double sf[3];
                  apply ((const double (*)[3]) st->rot[g], f + 3 * j, sf);
                  for (int y = 0; y < 3; y++)
                    {
                      double s = 0;
                      for (int x = 0; x < 3; x++)
                        s += u[x] * h->data[(3 * b + x) + (3 * p[j] + y) * n3];
                      worst = MAX (worst, fabs (s - sf[y]));
                    }
                }
            }
        }
      *spread = fmax > 0 ? worst / fmax : 0;
    }
  qv_hessian_symmetrize (h);
  /* group average: Φ_ij ← (1/|G|) Σ_g Sᵀ Φ_{p(i)p(j)} S */
  memset (avg->data, 0, n3 * n3 * sizeof (double));
  for (gsize g = 0; g < st->n_ops; g++)
    {
      const gsize *p = st->perm + g * n;
      const double (*s)[3] = (const double (*)[3]) st->rot[g];
      for (gsize i = 0; i < n; i++)
        for (gsize j = 0; j < n; j++)
          {
            double blk[3][3], t[3][3];
            for (int x = 0; x < 3; x++)
              for (int y = 0; y < 3; y++)
                blk[x][y] = h->data[(3 * p[i] + x) + (3 * p[j] + y) * n3];
            for (int x = 0; x < 3; x++)
              for (int y = 0; y < 3; y++)
                t[x][y] = blk[x][0] * s[0][y] + blk[x][1] * s[1][y] + blk[x][2] * s[2][y];
            for (int x = 0; x < 3; x++)
              for (int y = 0; y < 3; y++)
                avg->data[(3 * i + x) + (3 * j + y) * n3]
                  += (s[0][x] * t[0][y] + s[1][x] * t[1][y] + s[2][x] * t[2][y]) / (double) st->n_ops;
          }
    }
  return g_steal_pointer (&avg);
}
