/* qv-force-constants.c — Φ(R_l) from a supercell Hessian, sum rule,
 * Wigner–Seitz images.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <lapacke.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include "qv-error.h"
#include "qv-force-constants.h"
#include "qv-units.h"

struct _QvForceConstants {
  gsize n, n_cells;
  double cell[3][3];
  double *positions, *masses;
  int *translations;          /* 3 n_cells */
  double *phi;                /* [c][κ][κ'][3][3] */
  gsize *image_start;         /* n_cells n n + 1 */
  QvLatticeImage *images;
  double asymmetry, periodicity;
  int max_translation;
};

static gsize
block_index (const QvForceConstants *fc, gsize c, gsize k, gsize k2)
{
  return (c * fc->n + k) * fc->n + k2;
}

void
qv_force_constants_free (QvForceConstants *fc)
{
  if (fc == NULL)
    return;
  g_free (fc->positions);
  g_free (fc->masses);
  g_free (fc->translations);
  g_free (fc->phi);
  g_free (fc->image_start);
  g_free (fc->images);
  g_free (fc);
}

gsize qv_force_constants_n_sites (const QvForceConstants *fc) { return fc->n; }
gsize qv_force_constants_n_cells (const QvForceConstants *fc) { return fc->n_cells; }
const double (*qv_force_constants_cell (const QvForceConstants *fc))[3] { return (const double (*)[3]) fc->cell; }
const double *qv_force_constants_positions (const QvForceConstants *fc) { return fc->positions; }
const double *qv_force_constants_masses (const QvForceConstants *fc) { return fc->masses; }
double qv_force_constants_asymmetry (const QvForceConstants *fc) { return fc->asymmetry; }
double qv_force_constants_periodicity (const QvForceConstants *fc) { return fc->periodicity; }

const int *
qv_force_constants_translation (const QvForceConstants *fc, gsize cell)
{
  g_return_val_if_fail (cell < fc->n_cells, NULL);
  return fc->translations + 3 * cell;
}

const double *
qv_force_constants_block (const QvForceConstants *fc, gsize cell, gsize k, gsize k2)
{
  g_return_val_if_fail (cell < fc->n_cells && k < fc->n && k2 < fc->n, NULL);
  return fc->phi + 9 * block_index (fc, cell, k, k2);
}

gboolean
qv_force_constants_block_is_zero (const QvForceConstants *fc, gsize cell, gsize k, gsize k2)
{
  const double *b = qv_force_constants_block (fc, cell, k, k2);
  for (int e = 0; e < 9; e++)
    if (b[e] != 0)
      return FALSE;
  return TRUE;
}

int
qv_force_constants_max_translation (const QvForceConstants *fc)
{
  return fc->max_translation;
}

const QvLatticeImage *
qv_force_constants_images (const QvForceConstants *fc, gsize cell, gsize k, gsize k2,
                           gsize *n_images)
{
  gsize b = block_index (fc, cell, k, k2);
  *n_images = fc->image_start[b + 1] - fc->image_start[b];
  return fc->images + fc->image_start[b];
}

static double
dot3 (const double *a, const double *b)
{
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

/* The shortest images of @d0 modulo the lattice of @reduced (an
 * LLL-reduced basis): @d0 is first brought into the parallelepiped centred
 * at the origin, then the 5³ neighbours of that point are searched. */
static void
ws_images (const double reduced[3][3], const double d0[3], GArray *out)
{
  double bstar[3][3], g[3], d[3], cand[125][3], len[125], shortest = G_MAXDOUBLE;
  int count = 0, kept = 0;

  qv_lattice_reciprocal (reduced, bstar);
  for (int j = 0; j < 3; j++)
    {
      g[j] = dot3 (d0, bstar[j]) / (2 * G_PI);
      g[j] -= round (g[j]);
    }
  for (int c = 0; c < 3; c++)
    d[c] = g[0] * reduced[0][c] + g[1] * reduced[1][c] + g[2] * reduced[2][c];
  for (int a = -2; a <= 2; a++)
    for (int b = -2; b <= 2; b++)
      for (int e = -2; e <= 2; e++)
        {
          for (int c = 0; c < 3; c++)
            cand[count][c] = d[c] + a * reduced[0][c] + b * reduced[1][c] + e * reduced[2][c];
          len[count] = sqrt (dot3 (cand[count], cand[count]));
          shortest = MIN (shortest, len[count]);
          count++;
        }
  for (int i = 0; i < count; i++)
    if (len[i] <= shortest * (1 + QV_WS_TOLERANCE) + 1e-12)
      kept++;
  for (int i = 0; i < count; i++)
    if (len[i] <= shortest * (1 + QV_WS_TOLERANCE) + 1e-12)
      {
        QvLatticeImage im;
        memcpy (im.r, cand[i], sizeof im.r);
        im.weight = 1.0 / kept;
        g_array_append_val (out, im);
      }
}

QvForceConstants *
qv_force_constants_new (const QvSupercellMap *map, const QvHessian *hessian, GError **error)
{
  g_autoptr(QvForceConstants) fc = NULL;
  g_autoptr(QvHessian) h = NULL;
  g_autoptr(GArray) images = NULL;
  gsize n = map->n_primitive, ns = map->n_atoms, dim = 3 * ns;
  double hmax = 0, dev = 0;
  gsize *pair_class;
  gssize bad;

  if (hessian->n != dim)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "the Hessian is %" G_GSIZE_FORMAT " × %" G_GSIZE_FORMAT " but the supercell has %"
                   G_GSIZE_FORMAT " atoms, so it must be %" G_GSIZE_FORMAT " × %" G_GSIZE_FORMAT
                   " (coordinates x1 y1 z1 x2 … in the supercell file's atom order)",
                   hessian->n, hessian->n, ns, dim, dim);
      return NULL;
    }
  if ((bad = qv_hessian_find_nonfinite (hessian)) >= 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "the Hessian has a value that is not finite at row %" G_GSIZE_FORMAT
                   ", column %" G_GSIZE_FORMAT, (gsize) bad % dim + 1, (gsize) bad / dim + 1);
      return NULL;
    }
  h = qv_hessian_copy (hessian, error);
  if (h == NULL)
    return NULL;

  fc = g_new0 (QvForceConstants, 1);
  fc->n = n;
  fc->n_cells = map->n_cells;
  memcpy (fc->cell, map->primitive_cell, sizeof fc->cell);
  fc->positions = g_memdup2 (map->positions, 3 * n * sizeof (double));
  fc->masses = g_memdup2 (map->masses, n * sizeof (double));
  fc->translations = g_memdup2 (map->cells, 3 * map->n_cells * sizeof (int));
  fc->asymmetry = qv_hessian_symmetrize (h);
  fc->phi = g_new0 (double, 9 * n * n * map->n_cells);

  /* class of the translation from atom i to atom j, for every pair of
   * lattice points: (l, l') → class of R_l' − R_l */
  pair_class = g_new (gsize, map->n_cells * map->n_cells);
  for (gsize l = 0; l < map->n_cells; l++)
    for (gsize l2 = 0; l2 < map->n_cells; l2++)
      {
        int d[3];
        for (int c = 0; c < 3; c++)
          d[c] = map->cells[3 * l2 + c] - map->cells[3 * l + c];
        pair_class[l * map->n_cells + l2] = qv_supercell_map_class (map, d);
      }
  for (gsize i = 0; i < ns; i++)
    for (gsize j = 0; j < ns; j++)
      {
        gsize c = pair_class[map->cell[i] * map->n_cells + map->cell[j]];
        double *blk = fc->phi + 9 * block_index (fc, c, map->site[i], map->site[j]);
        for (int a = 0; a < 3; a++)
          for (int b = 0; b < 3; b++)
            {
              double v = h->data[(3 * i + a) + (3 * j + b) * dim];
              blk[3 * a + b] += v;
              hmax = MAX (hmax, fabs (v));
            }
      }
  for (gsize k = 0; k < 9 * n * n * map->n_cells; k++)
    fc->phi[k] /= (double) map->n_cells;
  for (gsize i = 0; i < ns; i++)
    for (gsize j = 0; j < ns; j++)
      {
        gsize c = pair_class[map->cell[i] * map->n_cells + map->cell[j]];
        const double *blk = fc->phi + 9 * block_index (fc, c, map->site[i], map->site[j]);
        for (int a = 0; a < 3; a++)
          for (int b = 0; b < 3; b++)
            dev = MAX (dev, fabs (h->data[(3 * i + a) + (3 * j + b) * dim] - blk[3 * a + b]));
      }
  g_free (pair_class);
  fc->periodicity = hmax > 0 ? dev / hmax : 0;

  /* Wigner–Seitz images of R_L + τ_κ' − τ_κ */
  images = g_array_new (FALSE, FALSE, sizeof (QvLatticeImage));
  fc->image_start = g_new (gsize, n * n * map->n_cells + 1);
  for (gsize c = 0; c < map->n_cells; c++)
    for (gsize k = 0; k < n; k++)
      for (gsize k2 = 0; k2 < n; k2++)
        {
          const int *t = map->cells + 3 * c;
          double d0[3];
          for (int x = 0; x < 3; x++)
            d0[x] = t[0] * fc->cell[0][x] + t[1] * fc->cell[1][x] + t[2] * fc->cell[2][x]
                  + fc->positions[3 * k2 + x] - fc->positions[3 * k + x];
          fc->image_start[block_index (fc, c, k, k2)] = images->len;
          ws_images (map->reduced, d0, images);
        }
  fc->image_start[n * n * map->n_cells] = images->len;
  /* the integer lattice vector of every image: r − (τ_κ' − τ_κ) in
   * primitive coordinates */
  {
    double b[3][3];
    qv_lattice_reciprocal (fc->cell, b);
    for (gsize c = 0; c < map->n_cells; c++)
      for (gsize k = 0; k < n; k++)
        for (gsize k2 = 0; k2 < n; k2++)
          {
            gsize blk = block_index (fc, c, k, k2);
            for (gsize i = fc->image_start[blk]; i < fc->image_start[blk + 1]; i++)
              {
                QvLatticeImage *im = &g_array_index (images, QvLatticeImage, i);
                double t[3];
                for (int x = 0; x < 3; x++)
                  t[x] = im->r[x] - fc->positions[3 * k2 + x] + fc->positions[3 * k + x];
                for (int j = 0; j < 3; j++)
                  {
                    im->n[j] = (int) lround (dot3 (t, b[j]) / (2 * G_PI));
                    fc->max_translation = MAX (fc->max_translation, abs (im->n[j]));
                  }
              }
          }
  }
  fc->images = (QvLatticeImage *) g_array_free (g_steal_pointer (&images), FALSE);
  return g_steal_pointer (&fc);
}

void
qv_force_constants_gamma_acoustic (const QvForceConstants *fc, double wavenumbers[3])
{
  gsize n = fc->n, dim = 3 * n;
  g_autofree double *d = g_new0 (double, dim * dim);
  g_autofree double *w = g_new (double, dim);
  double picked[3];

  for (gsize c = 0; c < fc->n_cells; c++)
    for (gsize k = 0; k < n; k++)
      for (gsize k2 = 0; k2 < n; k2++)
        {
          const double *blk = qv_force_constants_block (fc, c, k, k2);
          double s = 1.0 / sqrt (fc->masses[k] * fc->masses[k2]);
          for (int a = 0; a < 3; a++)
            for (int b = 0; b < 3; b++)
              d[(3 * k + a) * dim + 3 * k2 + b] += blk[3 * a + b] * s;
        }
  /* symmetric by construction, to rounding */
  for (gsize i = 0; i < dim; i++)
    for (gsize j = 0; j < i; j++)
      d[i * dim + j] = d[j * dim + i] = 0.5 * (d[i * dim + j] + d[j * dim + i]);
  if (LAPACKE_dsyevd (LAPACK_ROW_MAJOR, 'N', 'U', (lapack_int) dim, d, (lapack_int) dim, w) != 0)
    {
      wavenumbers[0] = wavenumbers[1] = wavenumbers[2] = NAN;
      return;
    }
  /* the three smallest in magnitude */
  for (int p = 0; p < 3; p++)
    {
      gsize best = 0;
      double bestv = G_MAXDOUBLE;
      for (gsize i = 0; i < dim; i++)
        if (!isnan (w[i]) && fabs (w[i]) < bestv)
          {
            bestv = fabs (w[i]);
            best = i;
          }
      picked[p] = p < (int) dim ? w[best] : NAN;
      w[best] = NAN;
    }
  for (int i = 0; i < 3; i++)
    for (int j = i + 1; j < 3; j++)
      if (picked[j] < picked[i])
        {
          double t = picked[i];
          picked[i] = picked[j];
          picked[j] = t;
        }
  for (int p = 0; p < 3; p++)
    wavenumbers[p] = qv_wavenumber_from_eigenvalue (picked[p]);
}

double
qv_force_constants_apply_sum_rule (QvForceConstants *fc, double before[3])
{
  gsize n = fc->n, nc = fc->n_cells;
  double ns = (double) (n * nc), worst = 0;
  g_autofree double *row = g_new0 (double, 9 * n);
  g_autofree double *col = g_new0 (double, 9 * n);
  double total[9] = { 0 };

  if (before)
    qv_force_constants_gamma_acoustic (fc, before);
  for (gsize c = 0; c < nc; c++)
    for (gsize k = 0; k < n; k++)
      for (gsize k2 = 0; k2 < n; k2++)
        {
          const double *blk = qv_force_constants_block (fc, c, k, k2);
          for (int e = 0; e < 9; e++)
            {
              row[9 * k + e] += blk[e];
              col[9 * k2 + e] += blk[e];
              total[e] += blk[e];
            }
        }
  for (gsize e = 0; e < 9 * n; e++)
    worst = MAX (worst, fabs (row[e]));
  /* Φ' = Φ − C_κ'/N_s − R_κ/N_s + N_c G/N_s² (H' = H − TH − HT + THT) */
  for (gsize c = 0; c < nc; c++)
    for (gsize k = 0; k < n; k++)
      for (gsize k2 = 0; k2 < n; k2++)
        {
          double *blk = fc->phi + 9 * block_index (fc, c, k, k2);
          for (int e = 0; e < 9; e++)
            blk[e] += -col[9 * k2 + e] / ns - row[9 * k + e] / ns + (double) nc * total[e] / (ns * ns);
        }
  return worst;
}
