/* qv-mode-comparison.c — overlap, matching and Duschinsky analysis of two
 * mode sets of the same atoms.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include <cblas.h>
#include <lapacke.h>
#include "qv-error.h"
#include "qv-element.h"
#include "qv-assignment.h"
#include "qv-mode-comparison.h"
#include "qv-oscillator.h"

struct _QvModeComparison {
  QvComparisonOptions options;
  gsize n_atoms, n_a, n_b;
  double *masses_a, *masses_b;      /* n_atoms */
  double *positions_a;              /* 3N */
  double *aligned_b;                /* 3N, B after the fit */
  double rotation[9];               /* row-major */
  double rmsd;
  double max_mass_difference;
  double *l_a;                      /* 3N × n_a, column-major, A's vectors */
  double *l_b;                      /* 3N × n_b, column-major, B's vectors rotated */
  double *eigenvalues_a;            /* n_a */
  double *wavenumbers_a, *wavenumbers_b;
  double *overlaps;                 /* n_a × n_b, row-major */
  gsize *block_a, *block_b;         /* block of each mode */
  gsize n_blocks_a, n_blocks_b;
  gsize *block_size_a, *block_size_b;
  double *block_sums;               /* n_blocks_a × n_blocks_b: Σ O² */
  QvModePair *pairs;
  gsize n_pairs;
  gsize *partner_a, *partner_b;
  double mean_overlap;
  gboolean has_duschinsky;
  double *duschinsky_j;             /* n_a × n_b, row-major */
  double *duschinsky_k;             /* n_a */
  double *duschinsky_k_dimensionless;
};

static const char *const convention_names[] = {
  [QV_OVERLAP_COMMON_MASS] = "common-mass",
  [QV_OVERLAP_OWN_MASSES] = "own-masses",
  [QV_OVERLAP_CARTESIAN] = "cartesian",
};

const char *
qv_overlap_convention_name (QvOverlapConvention convention)
{
  if ((guint) convention < G_N_ELEMENTS (convention_names))
    return convention_names[convention];
  return "unknown";
}

gboolean
qv_overlap_convention_parse (const char *text, QvOverlapConvention *convention, GError **error)
{
  for (guint k = 0; k < G_N_ELEMENTS (convention_names); k++)
    if (g_ascii_strcasecmp (text, convention_names[k]) == 0)
      {
        *convention = (QvOverlapConvention) k;
        return TRUE;
      }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "unknown overlap convention '%s': use common-mass (default), own-masses or cartesian",
               text);
  return FALSE;
}

void
qv_comparison_options_init (QvComparisonOptions *options)
{
  memset (options, 0, sizeof *options);
  options->convention = QV_OVERLAP_COMMON_MASS;
  options->align = TRUE;
  options->degeneracy = QV_COMPARISON_DEFAULT_DEGENERACY;
}

/* ------------------------------------------------------------------------
 * Alignment: weighted Kabsch (Acta Cryst. A32, 922, 1976) through the SVD
 * of the 3 × 3 covariance, with the reflection excluded.
 * ---------------------------------------------------------------------- */

static double
det3 (const double *a)
{
  return a[0] * (a[4] * a[8] - a[5] * a[7]) - a[1] * (a[3] * a[8] - a[5] * a[6])
         + a[2] * (a[3] * a[7] - a[4] * a[6]);
}

static void
weighted_centre (const double *x, const double *w, gsize n, double c[3])
{
  double total = 0.0;

  c[0] = c[1] = c[2] = 0.0;
  for (gsize a = 0; a < n; a++)
    {
      for (int r = 0; r < 3; r++)
        c[r] += w[a] * x[3 * a + r];
      total += w[a];
    }
  for (int r = 0; r < 3; r++)
    c[r] /= total;
}

static void
kabsch (QvModeComparison *c, const double *x_b)
{
  gsize n = c->n_atoms;
  const double *w = c->masses_a, *x_a = c->positions_a;
  double ca[3], cb[3], h[9] = { 0 }, s[3], u[9], vt[9], superb[2], total = 0.0, sum = 0.0;
  double *r = c->rotation;

  weighted_centre (x_a, w, n, ca);
  weighted_centre (x_b, w, n, cb);
  /* H = Σ w p qᵀ, p = B − c_B, q = A − c_A: R H is symmetric positive
   * semidefinite at the optimum of min Σ w |R p − q|². */
  for (gsize a = 0; a < n; a++)
    for (int i = 0; i < 3; i++)
      for (int j = 0; j < 3; j++)
        h[3 * i + j] += w[a] * (x_b[3 * a + i] - cb[i]) * (x_a[3 * a + j] - ca[j]);
  if (LAPACKE_dgesvd (LAPACK_ROW_MAJOR, 'A', 'A', 3, 3, h, 3, s, u, 3, vt, 3, superb) != 0)
    {
      /* dgesvd does not fail on a finite 3 × 3; keep the identity if it did */
      memset (u, 0, sizeof u);
      memset (vt, 0, sizeof vt);
      u[0] = u[4] = u[8] = vt[0] = vt[4] = vt[8] = 1.0;
    }
  {
    /* R = V diag(1, 1, d) Uᵀ, d = sign det(V Uᵀ) */
    double d = det3 (u) * det3 (vt) < 0.0 ? -1.0 : 1.0;
    for (int i = 0; i < 3; i++)
      for (int j = 0; j < 3; j++)
        r[3 * i + j] = vt[0 * 3 + i] * u[3 * j + 0] + vt[1 * 3 + i] * u[3 * j + 1]
                       + d * vt[2 * 3 + i] * u[3 * j + 2];
  }
  for (gsize a = 0; a < n; a++)
    {
      double p[3] = { x_b[3 * a] - cb[0], x_b[3 * a + 1] - cb[1], x_b[3 * a + 2] - cb[2] };
      for (int i = 0; i < 3; i++)
        {
          double y = ca[i] + r[3 * i] * p[0] + r[3 * i + 1] * p[1] + r[3 * i + 2] * p[2];
          c->aligned_b[3 * a + i] = y;
          sum += w[a] * (y - x_a[3 * a + i]) * (y - x_a[3 * a + i]);
        }
      total += w[a];
    }
  c->rmsd = sqrt (sum / total);
}

static void
rotate_vectors (double *l, gsize n_atoms, gsize n_modes, const double r[9])
{
  for (gsize k = 0; k < n_modes; k++)
    for (gsize a = 0; a < n_atoms; a++)
      {
        double *x = l + k * 3 * n_atoms + 3 * a, y[3];
        for (int i = 0; i < 3; i++)
          y[i] = r[3 * i] * x[0] + r[3 * i + 1] * x[1] + r[3 * i + 2] * x[2];
        memcpy (x, y, sizeof y);
      }
}

/* Column k ← column k ⊙ (scale per atom), then normalised. */
static void
scale_and_normalise (double *u, gsize n_atoms, gsize n_modes, const double *scale)
{
  gsize n = 3 * n_atoms;

  for (gsize k = 0; k < n_modes; k++)
    {
      double *col = u + k * n, norm = 0.0;
      if (scale)
        for (gsize a = 0; a < n_atoms; a++)
          for (int i = 0; i < 3; i++)
            col[3 * a + i] *= scale[a];
      for (gsize i = 0; i < n; i++)
        norm += col[i] * col[i];
      norm = sqrt (norm);
      if (norm > 0.0)
        for (gsize i = 0; i < n; i++)
          col[i] /= norm;
    }
}

/* Row-major n_a × n_b of U_Aᵀ U_B (both 3N × n column-major). */
static void
inner_products (const double *ua, gsize n_a, const double *ub, gsize n_b, gsize n, double *out)
{
  /* row-major C (n_a × n_b) is column-major Cᵀ = U_Bᵀ U_A (n_b × n_a) */
  cblas_dgemm (CblasColMajor, CblasTrans, CblasNoTrans, (int) n_b, (int) n_a, (int) n, 1.0,
               ub, (int) n, ua, (int) n, 0.0, out, (int) n_b);
}

/* Blocks of modes whose wavenumbers chain within @tol, numbered by
 * ascending wavenumber. Returns the number of blocks; @sizes is allocated. */
static gsize
find_blocks (const double *nu, gsize n, double tol, gsize *block, gsize **sizes)
{
  gsize *order = g_new (gsize, n), n_blocks = 0;

  for (gsize k = 0; k < n; k++)
    order[k] = k;
  /* insertion sort: mode sets are sorted already, so this is linear */
  for (gsize k = 1; k < n; k++)
    {
      gsize t = order[k], q = k;
      while (q > 0 && nu[order[q - 1]] > nu[t])
        {
          order[q] = order[q - 1];
          q--;
        }
      order[q] = t;
    }
  *sizes = g_new0 (gsize, MAX (n, 1));
  for (gsize k = 0; k < n; k++)
    {
      if (k == 0 || !(nu[order[k]] - nu[order[k - 1]] <= tol))
        n_blocks++;
      block[order[k]] = n_blocks - 1;
      (*sizes)[n_blocks - 1]++;
    }
  g_free (order);
  return n_blocks;
}

static double
subspace_weight (const QvModeComparison *c, gsize i, gsize j)
{
  gsize bi = c->block_a[i], bj = c->block_b[j];
  gsize size = MAX (c->block_size_a[bi], c->block_size_b[bj]);
  return c->block_sums[bi * c->n_blocks_b + bj] / (double) size;
}

/* Inside every pair of blocks, re-match the pairs that the block-level
 * matching put there by their raw O²: the subspace total is unchanged (it
 * is constant over a block pair) and the individual overlaps are the best
 * the two bases allow. */
static void
refine_in_blocks (QvModeComparison *c, gsize *a_to_b)
{
  gboolean *done = g_new0 (gboolean, c->n_a);
  gsize *rows = g_new (gsize, c->n_a), *cols = g_new (gsize, c->n_a);
  double *w = NULL;

  for (gsize i = 0; i < c->n_a; i++)
    {
      gsize n = 0, bi, bj;
      gsize *sub;

      if (done[i] || a_to_b[i] == QV_COMPARISON_NONE)
        continue;
      bi = c->block_a[i];
      bj = c->block_b[a_to_b[i]];
      for (gsize k = i; k < c->n_a; k++)
        if (!done[k] && a_to_b[k] != QV_COMPARISON_NONE && c->block_a[k] == bi
            && c->block_b[a_to_b[k]] == bj)
          {
            rows[n] = k;
            cols[n] = a_to_b[k];
            done[k] = TRUE;
            n++;
          }
      if (n < 2)
        continue;
      /* columns in ascending order so ties keep the mode order */
      for (gsize r = 1; r < n; r++)
        for (gsize q = r; q > 0 && cols[q - 1] > cols[q]; q--)
          {
            gsize t = cols[q];
            cols[q] = cols[q - 1];
            cols[q - 1] = t;
          }
      w = g_renew (double, w, n * n);
      for (gsize r = 0; r < n; r++)
        for (gsize s = 0; s < n; s++)
          {
            double o = c->overlaps[rows[r] * c->n_b + cols[s]];
            w[r * n + s] = o * o;
          }
      sub = g_new (gsize, n);
      qv_assignment_maximise (w, n, n, sub);
      for (gsize r = 0; r < n; r++)
        a_to_b[rows[r]] = cols[sub[r]];
      g_free (sub);
    }
  g_free (w);
  g_free (done);
  g_free (rows);
  g_free (cols);
}

static void
match (QvModeComparison *c)
{
  gsize n_a = c->n_a, n_b = c->n_b;
  double *w = g_new (double, n_a * n_b), sum = 0.0;
  gsize *a_to_b = g_new (gsize, n_a), k = 0;

  for (gsize i = 0; i < n_a; i++)
    for (gsize j = 0; j < n_b; j++)
      w[i * n_b + j] = subspace_weight (c, i, j);
  qv_assignment_maximise (w, n_a, n_b, a_to_b);
  g_free (w);
  refine_in_blocks (c, a_to_b);

  c->partner_a = g_new (gsize, n_a);
  c->partner_b = g_new (gsize, n_b);
  for (gsize j = 0; j < n_b; j++)
    c->partner_b[j] = QV_COMPARISON_NONE;
  c->n_pairs = MIN (n_a, n_b);
  c->pairs = g_new0 (QvModePair, MAX (c->n_pairs, 1));
  for (gsize i = 0; i < n_a; i++)
    {
      gsize j = a_to_b[i];
      QvModePair *p;

      c->partner_a[i] = j;
      if (j == QV_COMPARISON_NONE)
        continue;
      c->partner_b[j] = i;
      g_assert (k < c->n_pairs);
      p = &c->pairs[k++];
      p->mode_a = i;
      p->mode_b = j;
      p->overlap = c->overlaps[i * n_b + j];
      p->subspace_overlap = sqrt (MIN (subspace_weight (c, i, j), 1.0));
      p->wavenumber_a = c->wavenumbers_a[i];
      p->wavenumber_b = c->wavenumbers_b[j];
      p->shift = p->wavenumber_b - p->wavenumber_a;
      p->degenerate = c->block_size_a[c->block_a[i]] > 1 || c->block_size_b[c->block_b[j]] > 1;
      if (!p->degenerate)
        p->subspace_overlap = p->overlap;
      sum += p->subspace_overlap;
    }
  c->n_pairs = k;
  c->mean_overlap = k ? sum / (double) k : NAN;
  g_free (a_to_b);
}

static const char *
element_symbol (guint z)
{
  const QvElement *e = qv_element_from_z (z);
  return e ? e->symbol : "?";
}

static gboolean
check_same_atoms (const QvStructure *a, const QvStructure *b, GError **error)
{
  if (a->n_atoms != b->n_atoms)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "A has %" G_GSIZE_FORMAT " atoms and B has %" G_GSIZE_FORMAT
                   ": compare needs two mode sets of the same atoms in the same order",
                   a->n_atoms, b->n_atoms);
      return FALSE;
    }
  for (gsize k = 0; k < a->n_atoms; k++)
    if (a->atoms[k].z != b->atoms[k].z)
      {
        g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                     "atom %" G_GSIZE_FORMAT " is %s in A but %s in B: compare needs the same "
                     "elements in the same order (reorder one file to match the other)",
                     k + 1, element_symbol (a->atoms[k].z), element_symbol (b->atoms[k].z));
        return FALSE;
      }
  return TRUE;
}

static gboolean
check_modes (const QvModeSet *m, const QvStructure *s, const char *side, GError **error)
{
  if (m->n_atoms != s->n_atoms)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "%s: the mode set has %" G_GSIZE_FORMAT " atoms but the structure %" G_GSIZE_FORMAT,
                   side, m->n_atoms, s->n_atoms);
      return FALSE;
    }
  if (m->n_modes == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "%s has no vibrational modes to compare (a single atom, or everything projected)",
                   side);
      return FALSE;
    }
  return TRUE;
}

QvModeComparison *
qv_mode_comparison_new (const QvStructure *structure_a, const QvModeSet *modes_a,
                        const QvStructure *structure_b, const QvModeSet *modes_b,
                        const QvComparisonOptions *options, GError **error)
{
  QvModeComparison *c;
  gsize n_atoms, n;
  double *x_b, *ua, *ub, *scale = NULL;

  if (!check_same_atoms (structure_a, structure_b, error)
      || !check_modes (modes_a, structure_a, "A", error)
      || !check_modes (modes_b, structure_b, "B", error))
    return NULL;
  if (!(options->degeneracy >= 0.0) || !isfinite (options->degeneracy))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "the degeneracy tolerance must be a wavenumber of 0 or more, in cm^-1");
      return NULL;
    }
  n_atoms = structure_a->n_atoms;
  n = 3 * n_atoms;
  c = g_new0 (QvModeComparison, 1);
  c->options = *options;
  c->n_atoms = n_atoms;
  c->n_a = modes_a->n_modes;
  c->n_b = modes_b->n_modes;
  /* the masses the mode sets were solved with */
  c->masses_a = g_memdup2 (modes_a->masses, sizeof (double) * n_atoms);
  c->masses_b = g_memdup2 (modes_b->masses, sizeof (double) * n_atoms);
  for (gsize a = 0; a < n_atoms; a++)
    c->max_mass_difference = MAX (c->max_mass_difference,
                                  fabs (c->masses_a[a] - c->masses_b[a]) / c->masses_a[a]);
  c->positions_a = g_new (double, n);
  x_b = g_new (double, n);
  for (gsize a = 0; a < n_atoms; a++)
    {
      memcpy (c->positions_a + 3 * a, structure_a->atoms[a].position, sizeof (double) * 3);
      memcpy (x_b + 3 * a, structure_b->atoms[a].position, sizeof (double) * 3);
    }
  c->aligned_b = g_new (double, n);
  if (options->align)
    kabsch (c, x_b);
  else
    {
      double sum = 0.0, total = 0.0;
      memset (c->rotation, 0, sizeof c->rotation);
      c->rotation[0] = c->rotation[4] = c->rotation[8] = 1.0;
      memcpy (c->aligned_b, x_b, sizeof (double) * n);
      for (gsize k = 0; k < n; k++)
        sum += c->masses_a[k / 3] * (x_b[k] - c->positions_a[k]) * (x_b[k] - c->positions_a[k]);
      for (gsize a = 0; a < n_atoms; a++)
        total += c->masses_a[a];
      c->rmsd = sqrt (sum / total);
    }
  g_free (x_b);

  c->l_a = g_memdup2 (modes_a->vectors, sizeof (double) * n * c->n_a);
  c->l_b = g_memdup2 (modes_b->vectors, sizeof (double) * n * c->n_b);
  rotate_vectors (c->l_b, n_atoms, c->n_b, c->rotation);
  c->eigenvalues_a = g_memdup2 (modes_a->eigenvalues, sizeof (double) * c->n_a);
  c->wavenumbers_a = g_new (double, c->n_a);
  c->wavenumbers_b = g_new (double, c->n_b);
  for (gsize k = 0; k < c->n_a; k++)
    c->wavenumbers_a[k] = qv_mode_set_wavenumber (modes_a, k);
  for (gsize k = 0; k < c->n_b; k++)
    c->wavenumbers_b[k] = qv_mode_set_wavenumber (modes_b, k);

  /* the unit vectors of the chosen convention */
  ua = g_memdup2 (c->l_a, sizeof (double) * n * c->n_a);
  ub = g_memdup2 (c->l_b, sizeof (double) * n * c->n_b);
  scale = g_new (double, n_atoms);
  switch (options->convention)
    {
    case QV_OVERLAP_CARTESIAN:
      for (gsize a = 0; a < n_atoms; a++)
        scale[a] = 1.0 / sqrt (c->masses_a[a]);
      scale_and_normalise (ua, n_atoms, c->n_a, scale);
      for (gsize a = 0; a < n_atoms; a++)
        scale[a] = 1.0 / sqrt (c->masses_b[a]);
      scale_and_normalise (ub, n_atoms, c->n_b, scale);
      break;
    case QV_OVERLAP_OWN_MASSES:
      scale_and_normalise (ub, n_atoms, c->n_b, NULL);
      break;
    case QV_OVERLAP_COMMON_MASS:
    default:
      /* d_B = l_B/√m_B, re-weighted by √m_A */
      for (gsize a = 0; a < n_atoms; a++)
        scale[a] = sqrt (c->masses_a[a] / c->masses_b[a]);
      scale_and_normalise (ub, n_atoms, c->n_b, scale);
      break;
    }
  g_free (scale);
  c->overlaps = g_new (double, MAX (c->n_a * c->n_b, 1));
  inner_products (ua, c->n_a, ub, c->n_b, n, c->overlaps);
  for (gsize k = 0; k < c->n_a * c->n_b; k++)
    c->overlaps[k] = MIN (fabs (c->overlaps[k]), 1.0);
  g_free (ua);
  g_free (ub);

  /* degenerate blocks and their subspace sums */
  c->block_a = g_new (gsize, c->n_a);
  c->block_b = g_new (gsize, c->n_b);
  c->n_blocks_a = find_blocks (c->wavenumbers_a, c->n_a, options->degeneracy, c->block_a,
                               &c->block_size_a);
  c->n_blocks_b = find_blocks (c->wavenumbers_b, c->n_b, options->degeneracy, c->block_b,
                               &c->block_size_b);
  c->block_sums = g_new0 (double, c->n_blocks_a * c->n_blocks_b);
  for (gsize i = 0; i < c->n_a; i++)
    for (gsize j = 0; j < c->n_b; j++)
      {
        double o = c->overlaps[i * c->n_b + j];
        c->block_sums[c->block_a[i] * c->n_blocks_b + c->block_b[j]] += o * o;
      }
  match (c);
  return c;
}

void
qv_mode_comparison_free (QvModeComparison *c)
{
  if (c == NULL)
    return;
  g_free (c->masses_a); g_free (c->masses_b); g_free (c->positions_a); g_free (c->aligned_b);
  g_free (c->l_a); g_free (c->l_b); g_free (c->eigenvalues_a);
  g_free (c->wavenumbers_a); g_free (c->wavenumbers_b); g_free (c->overlaps);
  g_free (c->block_a); g_free (c->block_b); g_free (c->block_size_a); g_free (c->block_size_b);
  g_free (c->block_sums); g_free (c->pairs); g_free (c->partner_a); g_free (c->partner_b);
  g_free (c->duschinsky_j); g_free (c->duschinsky_k); g_free (c->duschinsky_k_dimensionless);
  g_free (c);
}

const QvComparisonOptions *
qv_mode_comparison_options (const QvModeComparison *c)
{
  return &c->options;
}

gsize
qv_mode_comparison_n_modes_a (const QvModeComparison *c)
{
  return c->n_a;
}

gsize
qv_mode_comparison_n_modes_b (const QvModeComparison *c)
{
  return c->n_b;
}

double
qv_mode_comparison_wavenumber_a (const QvModeComparison *c, gsize i)
{
  g_return_val_if_fail (i < c->n_a, NAN);
  return c->wavenumbers_a[i];
}

double
qv_mode_comparison_wavenumber_b (const QvModeComparison *c, gsize j)
{
  g_return_val_if_fail (j < c->n_b, NAN);
  return c->wavenumbers_b[j];
}

const double *
qv_mode_comparison_overlaps (const QvModeComparison *c)
{
  return c->overlaps;
}

double
qv_mode_comparison_overlap (const QvModeComparison *c, gsize i, gsize j)
{
  g_return_val_if_fail (i < c->n_a && j < c->n_b, NAN);
  return c->overlaps[i * c->n_b + j];
}

double
qv_mode_comparison_subspace_overlap (const QvModeComparison *c, gsize i, gsize j)
{
  g_return_val_if_fail (i < c->n_a && j < c->n_b, NAN);
  if (c->block_size_a[c->block_a[i]] == 1 && c->block_size_b[c->block_b[j]] == 1)
    return c->overlaps[i * c->n_b + j];
  return sqrt (MIN (subspace_weight (c, i, j), 1.0));
}

gsize
qv_mode_comparison_block_a (const QvModeComparison *c, gsize i)
{
  g_return_val_if_fail (i < c->n_a, QV_COMPARISON_NONE);
  return c->block_a[i];
}

gsize
qv_mode_comparison_block_b (const QvModeComparison *c, gsize j)
{
  g_return_val_if_fail (j < c->n_b, QV_COMPARISON_NONE);
  return c->block_b[j];
}

gsize
qv_mode_comparison_n_blocks_a (const QvModeComparison *c)
{
  return c->n_blocks_a;
}

gsize
qv_mode_comparison_n_blocks_b (const QvModeComparison *c)
{
  return c->n_blocks_b;
}

gsize
qv_mode_comparison_n_pairs (const QvModeComparison *c)
{
  return c->n_pairs;
}

const QvModePair *
qv_mode_comparison_pair (const QvModeComparison *c, gsize k)
{
  g_return_val_if_fail (k < c->n_pairs, NULL);
  return &c->pairs[k];
}

gsize
qv_mode_comparison_partner_of_a (const QvModeComparison *c, gsize i)
{
  g_return_val_if_fail (i < c->n_a, QV_COMPARISON_NONE);
  return c->partner_a[i];
}

gsize
qv_mode_comparison_partner_of_b (const QvModeComparison *c, gsize j)
{
  g_return_val_if_fail (j < c->n_b, QV_COMPARISON_NONE);
  return c->partner_b[j];
}

double
qv_mode_comparison_mean_overlap (const QvModeComparison *c)
{
  return c->mean_overlap;
}

const double *
qv_mode_comparison_rotation (const QvModeComparison *c)
{
  return c->rotation;
}

double
qv_mode_comparison_rmsd (const QvModeComparison *c)
{
  return c->rmsd;
}

const double *
qv_mode_comparison_aligned_positions_b (const QvModeComparison *c)
{
  return c->aligned_b;
}

double
qv_mode_comparison_max_mass_difference (const QvModeComparison *c)
{
  return c->max_mass_difference;
}

gboolean
qv_mode_comparison_compute_duschinsky (QvModeComparison *c, GError **error)
{
  gsize n = 3 * c->n_atoms;

  if (c->has_duschinsky)
    return TRUE;
  for (gsize a = 0; a < c->n_atoms; a++)
    if (fabs (c->masses_a[a] - c->masses_b[a]) > QV_COMPARISON_SAME_MASS * c->masses_a[a])
      {
        g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                     "the Duschinsky matrix needs the same masses in A and B, but atom %"
                     G_GSIZE_FORMAT " has %.6f u in A and %.6f u in B: normal coordinates of "
                     "different masses do not share one mass-weighted space (give both sides "
                     "the same isotopes, or compare without --duschinsky)",
                     a + 1, c->masses_a[a], c->masses_b[a]);
        return FALSE;
      }
  c->duschinsky_j = g_new (double, MAX (c->n_a * c->n_b, 1));
  inner_products (c->l_a, c->n_a, c->l_b, c->n_b, n, c->duschinsky_j);
  c->duschinsky_k = g_new0 (double, c->n_a);
  c->duschinsky_k_dimensionless = g_new (double, c->n_a);
  for (gsize i = 0; i < c->n_a; i++)
    {
      const double *l = c->l_a + i * n;
      double k = 0.0;

      for (gsize q = 0; q < n; q++)
        k += l[q] * sqrt (c->masses_a[q / 3]) * (c->aligned_b[q] - c->positions_a[q]);
      c->duschinsky_k[i] = k;
      c->duschinsky_k_dimensionless[i] =
        c->eigenvalues_a[i] > 0.0 ? qv_oscillator_dimensionless (c->eigenvalues_a[i], k) : NAN;
    }
  c->has_duschinsky = TRUE;
  return TRUE;
}

gboolean
qv_mode_comparison_has_duschinsky (const QvModeComparison *c)
{
  return c->has_duschinsky;
}

const double *
qv_mode_comparison_duschinsky_j (const QvModeComparison *c)
{
  return c->duschinsky_j;
}

const double *
qv_mode_comparison_duschinsky_k (const QvModeComparison *c)
{
  return c->duschinsky_k;
}

const double *
qv_mode_comparison_duschinsky_k_dimensionless (const QvModeComparison *c)
{
  return c->duschinsky_k_dimensionless;
}
