/* qv-point-group.c — point-group detection.
 *
 * The method (written for Quaver, after the usual textbook procedure, e.g.
 * Cotton, Chemical Applications of Group Theory, 3rd ed., §3.14, the
 * flow chart for finding a molecule's group):
 *   1. Centre on the mass-weighted centre; atoms are alike when they have
 *      the same element and mass; alike atoms at the same distance from the
 *      centre (within the tolerance) form a candidate set of equivalent
 *      atoms.
 *   2. Candidate directions: the principal axes of inertia, every atom's
 *      position, and for every pair of candidate-equivalent atoms the sum
 *      (a C2 through the pair's midpoint), the difference (the normal of a
 *      mirror that swaps them) and the cross product, and for every triple
 *      that holds the set's first atom the normal of its plane (a C_n
 *      through a ring). Directions within 3° are merged (weighted mean).
 *   3. Each direction is tested as a rotation axis of order 12 … 2 (the
 *      highest that holds), a mirror normal, and along an axis of order n
 *      an S_2n; then the inversion. An operation holds when every atom's
 *      image lies within the tolerance of an alike atom, one to one.
 *   4. The group follows from the elements found (two or more axes of order
 *      ≥ 3: T/O/I families; else the principal axis, perpendicular C2 axes,
 *      σh, σv/σd, S_2n), the standard orientation from the elements (see
 *      qv-point-group.h and docs/methods.md), and the operations are
 *      generated exactly in the standard frame, then rotated to the input.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include "qv-error.h"
#include "qv-point-group.h"

#define MAX_AXIS_ORDER 12
#define MERGE_COS 0.9999996    /* cos 0.05° */
#define PERP_SIN 0.0872        /* sin 5° */

typedef struct {
  gsize n;
  double *p;                   /* centred positions, 3n */
  guint *kind;
  double tol;
  guint *used;                 /* == stamp: taken in this op_maps call */
  guint stamp;
  double cell;                 /* grid spacing: 3 × tol */
  GHashTable *grid;            /* cell key → first atom + 1 */
  gsize *next;                 /* atoms of one cell: next + 1, 0 ends */
} Ctx;

static guint64
pack_cell (gint64 i, gint64 j, gint64 k)
{
  return ((guint64) (i & 0x1fffff) << 42) | ((guint64) (j & 0x1fffff) << 21) | (guint64) (k & 0x1fffff);
}

static guint64
grid_key (const Ctx *c, const double *p, int dx, int dy, int dz)
{
  return pack_cell ((gint64) floor (p[0] / c->cell) + dx, (gint64) floor (p[1] / c->cell) + dy,
                    (gint64) floor (p[2] / c->cell) + dz);
}

/* A grid of cells 3 × tol wide, so that the atoms within 3 × tol of a point
 * lie in its 27 neighbouring cells. */
static void
grid_build (Ctx *c)
{
  c->cell = 3 * c->tol;
  c->grid = g_hash_table_new_full (g_int64_hash, g_int64_equal, g_free, NULL);
  c->next = g_new0 (gsize, c->n);
  for (gsize a = c->n; a-- > 0;)
    {
      guint64 *key = g_new (guint64, 1);
      *key = grid_key (c, c->p + 3 * a, 0, 0, 0);
      gpointer old = g_hash_table_lookup (c->grid, key);
      c->next[a] = GPOINTER_TO_SIZE (old);
      g_hash_table_replace (c->grid, key, GSIZE_TO_POINTER (a + 1));
    }
}

static void
grid_free (Ctx *c)
{
  g_hash_table_destroy (c->grid);
  g_free (c->next);
}

typedef struct {
  double v[3];
  double w;
} Dir;

typedef struct {
  double v[3];
  guint order;
  gboolean s2n;
} Axis;

/* --- 3×3 helpers ------------------------------------------------------ */

static void
mat_mul (const double *a, const double *b, double *c)
{
  double t[9];
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      t[3 * i + j] = a[3 * i] * b[j] + a[3 * i + 1] * b[3 + j] + a[3 * i + 2] * b[6 + j];
  memcpy (c, t, sizeof t);
}

static void
mat_vec (const double *r, const double *v, double *out)
{
  double t[3];
  for (int i = 0; i < 3; i++)
    t[i] = r[3 * i] * v[0] + r[3 * i + 1] * v[1] + r[3 * i + 2] * v[2];
  memcpy (out, t, sizeof t);
}

static void
rotation (const double *u, double angle, double *r)
{
  double c = cos (angle), s = sin (angle), t = 1 - c;
  double x = u[0], y = u[1], z = u[2];
  double m[9] = { t * x * x + c, t * x * y - s * z, t * x * z + s * y,
                  t * x * y + s * z, t * y * y + c, t * y * z - s * x,
                  t * x * z - s * y, t * y * z + s * x, t * z * z + c };
  memcpy (r, m, sizeof m);
}

static void
reflection (const double *u, double *r)
{
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      r[3 * i + j] = (i == j) - 2 * u[i] * u[j];
}

static void
improper (const double *u, double angle, double *r)
{
  double a[9], b[9];
  rotation (u, angle, a);
  reflection (u, b);
  mat_mul (b, a, r);
}

static double
dot3 (const double *a, const double *b)
{
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

static void
cross3 (const double *a, const double *b, double *c)
{
  double t[3] = { a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0] };
  memcpy (c, t, sizeof t);
}

static gboolean
normalize3 (double *v)
{
  double n = sqrt (dot3 (v, v));
  if (!(n > 1e-12))
    return FALSE;
  v[0] /= n; v[1] /= n; v[2] /= n;
  return TRUE;
}

/* Eigenvectors of a symmetric 3×3 matrix by Jacobi rotations; @vecs rows,
 * ascending @vals. */
static void
eigen3 (const double *a_in, double *vals, double *vecs)
{
  double a[9], v[9] = { 1, 0, 0, 0, 1, 0, 0, 0, 1 };
  memcpy (a, a_in, sizeof a);
  for (int sweep = 0; sweep < 50; sweep++)
    {
      double off = fabs (a[1]) + fabs (a[2]) + fabs (a[5]);
      if (off < 1e-15 * (fabs (a[0]) + fabs (a[4]) + fabs (a[8]) + 1e-300))
        break;
      for (int p = 0; p < 2; p++)
        for (int q = p + 1; q < 3; q++)
          {
            double apq = a[3 * p + q];
            if (fabs (apq) < 1e-300)
              continue;
            double theta = (a[3 * q + q] - a[3 * p + p]) / (2 * apq);
            double t = (theta >= 0 ? 1 : -1) / (fabs (theta) + sqrt (theta * theta + 1));
            double c = 1 / sqrt (t * t + 1), s = t * c;
            for (int k = 0; k < 3; k++)
              {
                double akp = a[3 * k + p], akq = a[3 * k + q];
                a[3 * k + p] = c * akp - s * akq;
                a[3 * k + q] = s * akp + c * akq;
              }
            for (int k = 0; k < 3; k++)
              {
                double apk = a[3 * p + k], aqk = a[3 * q + k];
                a[3 * p + k] = c * apk - s * aqk;
                a[3 * q + k] = s * apk + c * aqk;
              }
            for (int k = 0; k < 3; k++)
              {
                double vkp = v[3 * k + p], vkq = v[3 * k + q];
                v[3 * k + p] = c * vkp - s * vkq;
                v[3 * k + q] = s * vkp + c * vkq;
              }
          }
    }
  int idx[3] = { 0, 1, 2 };
  for (int i = 0; i < 3; i++)
    for (int j = i + 1; j < 3; j++)
      if (a[4 * idx[j]] < a[4 * idx[i]])
        {
          int t = idx[i]; idx[i] = idx[j]; idx[j] = t;
        }
  for (int i = 0; i < 3; i++)
    {
      vals[i] = a[4 * idx[i]];
      for (int k = 0; k < 3; k++)
        vecs[3 * i + k] = v[3 * k + idx[i]];
    }
}

/* --- operations on the atoms -------------------------------------------- */

/* TRUE when R carries every atom within @tol of an alike atom, one to one;
 * fills @perm (may be NULL) and raises *@dev (may be NULL). */
static gboolean
op_maps (Ctx *c, const double *r, double tol, gsize *perm, double *dev)
{
  double tol2 = tol * tol, worst = 0;
  if (++c->stamp == 0)
    {
      memset (c->used, 0, c->n * sizeof (guint));
      c->stamp = 1;
    }
  for (gsize a = 0; a < c->n; a++)
    {
      double img[3], best = G_MAXDOUBLE;
      gssize hit = -1;
      mat_vec (r, c->p + 3 * a, img);
      /* only the cells the ball of radius @tol around the image touches */
      gint64 lo[3], hi[3];
      for (int q = 0; q < 3; q++)
        {
          lo[q] = (gint64) floor ((img[q] - tol) / c->cell);
          hi[q] = (gint64) floor ((img[q] + tol) / c->cell);
        }
      for (gint64 i = lo[0]; i <= hi[0]; i++)
        for (gint64 j = lo[1]; j <= hi[1]; j++)
          for (gint64 k = lo[2]; k <= hi[2]; k++)
        {
          guint64 key = pack_cell (i, j, k);
          for (gsize b1 = GPOINTER_TO_SIZE (g_hash_table_lookup (c->grid, &key)); b1; b1 = c->next[b1 - 1])
            {
              gsize b = b1 - 1;
              if (c->kind[b] != c->kind[a])
                continue;
              double dx = img[0] - c->p[3 * b], dy = img[1] - c->p[3 * b + 1], dz = img[2] - c->p[3 * b + 2];
              double d2 = dx * dx + dy * dy + dz * dz;
              if (d2 < best)
                {
                  best = d2;
                  hit = (gssize) b;
                }
            }
        }
      if (hit < 0 || best > tol2 || c->used[hit] == c->stamp)
        return FALSE;
      c->used[hit] = c->stamp;
      if (perm)
        perm[a] = (gsize) hit;
      if (best > worst)
        worst = best;
    }
  if (dev && sqrt (worst) > *dev)
    *dev = sqrt (worst);
  return TRUE;
}

/* Candidate directions, deduplicated through a grid of cells on the unit
 * cube (a hash of the rounded components of ±u). */
typedef struct {
  GArray *dirs;
  GHashTable *cells;           /* cell key → index + 1 */
} DirSet;

#define GRID 400.0

static guint64
cell_key (const double *u, int dx, int dy, int dz)
{
  gint64 k[3] = { (gint64) floor (u[0] * GRID) + dx, (gint64) floor (u[1] * GRID) + dy,
                  (gint64) floor (u[2] * GRID) + dz };
  return ((guint64) (k[0] + 1024) << 22) | ((guint64) (k[1] + 1024) << 11) | (guint64) (k[2] + 1024);
}

/* Adds a candidate direction unless one within MERGE_COS is there; keeps
 * the one from the longest raw vector (the best determined). */
static void
add_dir (DirSet *set, const double *v, double min_norm)
{
  double u[3] = { v[0], v[1], v[2] };
  double n = sqrt (dot3 (u, u));
  if (!(n > min_norm))
    return;
  u[0] /= n; u[1] /= n; u[2] /= n;
  const double reach = 1e-3;    /* > the chord of MERGE_COS */
  for (int sign = 1; sign >= -1; sign -= 2)
    {
      double w[3] = { sign * u[0], sign * u[1], sign * u[2] };
      int lo[3], hi[3];
      for (int q = 0; q < 3; q++)
        {
          lo[q] = (int) (floor ((w[q] - reach) * GRID) - floor (w[q] * GRID));
          hi[q] = (int) (floor ((w[q] + reach) * GRID) - floor (w[q] * GRID));
        }
      for (int dx = lo[0]; dx <= hi[0]; dx++)
        for (int dy = lo[1]; dy <= hi[1]; dy++)
          for (int dz = lo[2]; dz <= hi[2]; dz++)
            {
              guint idx = GPOINTER_TO_UINT (g_hash_table_lookup (set->cells,
                                              GSIZE_TO_POINTER ((gsize) cell_key (w, dx, dy, dz))));
              if (idx == 0)
                continue;
              Dir *d = &g_array_index (set->dirs, Dir, idx - 1);
              if (fabs (dot3 (d->v, u)) > MERGE_COS)
                {
                  if (n > d->w)
                    {
                      memcpy (d->v, u, sizeof u);
                      d->w = n;
                    }
                  return;
                }
            }
    }
  Dir d = { { u[0], u[1], u[2] }, n };
  g_array_append_val (set->dirs, d);
  g_hash_table_insert (set->cells, GSIZE_TO_POINTER ((gsize) cell_key (u, 0, 0, 0)),
                       GUINT_TO_POINTER (set->dirs->len));
}

/* Refines the direction of an element from the atoms it permutes:
 * rotations (order ≥ 3) Σ p_a × p_π(a) ∝ u; C2 Σ ±(p_a + p_π(a)) ∝ u;
 * mirrors Σ ±(p_a − p_π(a)) ∝ n. Keeps @u when the sums vanish. */
static void
refine (const Ctx *c, const gsize *perm, int kind, double *u)
{
  double acc[3] = { 0, 0, 0 };
  for (gsize a = 0; a < c->n; a++)
    {
      const double *p = c->p + 3 * a, *q = c->p + 3 * perm[a];
      double v[3];
      if (kind == 0)
        cross3 (p, q, v);
      else
        for (int i = 0; i < 3; i++)
          v[i] = kind == 1 ? p[i] + q[i] : p[i] - q[i];
      double s = dot3 (v, u) >= 0 ? 1 : -1;
      for (int i = 0; i < 3; i++)
        acc[i] += s * v[i];
    }
  if (dot3 (acc, acc) > 1e-6 * c->tol * c->tol)
    {
      normalize3 (acc);
      if (dot3 (acc, u) < 0)
        for (int i = 0; i < 3; i++)
          acc[i] = -acc[i];
      memcpy (u, acc, sizeof acc);
    }
}

static int
count_on_axis (const Ctx *c, const double *u)
{
  int k = 0;
  for (gsize a = 0; a < c->n; a++)
    {
      const double *p = c->p + 3 * a;
      double t = dot3 (p, u), q[3] = { p[0] - t * u[0], p[1] - t * u[1], p[2] - t * u[2] };
      if (dot3 (q, q) < c->tol * c->tol)
        k++;
    }
  return k;
}

static int
count_in_plane (const Ctx *c, const double *normal)
{
  int k = 0;
  for (gsize a = 0; a < c->n; a++)
    if (fabs (dot3 (c->p + 3 * a, normal)) < c->tol)
      k++;
  return k;
}

/* Flips @u so that the first atom with a clear projection on it has a
 * positive one (a reproducible sign). */
static void
orient_sign (const Ctx *c, double *u)
{
  for (gsize a = 0; a < c->n; a++)
    {
      double t = dot3 (c->p + 3 * a, u);
      if (fabs (t) > c->tol)
        {
          if (t < 0)
            {
              u[0] = -u[0]; u[1] = -u[1]; u[2] = -u[2];
            }
          return;
        }
    }
}

/* Rows x, y, z from z and a guess at x. */
static void
make_frame (const double *z_in, const double *x_in, double frame[3][3])
{
  double z[3] = { z_in[0], z_in[1], z_in[2] }, x[3] = { x_in[0], x_in[1], x_in[2] }, y[3];
  normalize3 (z);
  double t = dot3 (x, z);
  x[0] -= t * z[0]; x[1] -= t * z[1]; x[2] -= t * z[2];
  if (!normalize3 (x))
    {
      double e[3] = { fabs (z[0]) < 0.9 ? 1 : 0, fabs (z[0]) < 0.9 ? 0 : 1, 0 };
      t = dot3 (e, z);
      x[0] = e[0] - t * z[0]; x[1] = e[1] - t * z[1]; x[2] = e[2] - t * z[2];
      normalize3 (x);
    }
  cross3 (z, x, y);
  memcpy (frame[0], x, sizeof x);
  memcpy (frame[1], y, sizeof y);
  memcpy (frame[2], z, sizeof z);
}

/* A direction in the plane perpendicular to @z: the first atom's
 * projection that is clear of the axis. */
static void
first_perpendicular (const Ctx *c, const double *z, double *x)
{
  for (gsize a = 0; a < c->n; a++)
    {
      const double *p = c->p + 3 * a;
      double t = dot3 (p, z), q[3] = { p[0] - t * z[0], p[1] - t * z[1], p[2] - t * z[2] };
      if (dot3 (q, q) > 4 * c->tol * c->tol)
        {
          memcpy (x, q, sizeof q);
          normalize3 (x);
          return;
        }
    }
  x[0] = 1; x[1] = 0; x[2] = 0;
}

/* --- the ideal group in the standard frame -------------------------------- */

static gboolean
same_matrix (const double *a, const double *b)
{
  for (int i = 0; i < 9; i++)
    if (fabs (a[i] - b[i]) > 1e-6)
      return FALSE;
  return TRUE;
}

static GArray *
close_group (const double *gens, gsize n_gens)
{
  GArray *ops = g_array_new (FALSE, FALSE, sizeof (double) * 9);
  double e[9] = { 1, 0, 0, 0, 1, 0, 0, 0, 1 };
  g_array_append_vals (ops, e, 1);
  for (guint i = 0; i < ops->len && ops->len <= 240; i++)
    for (gsize k = 0; k < n_gens; k++)
      {
        double m[9];
        mat_mul (gens + 9 * k, (double *) ops->data + 9 * i, m);
        gboolean found = FALSE;
        for (guint j = 0; j < ops->len && !found; j++)
          found = same_matrix (m, (double *) ops->data + 9 * j);
        if (!found)
          g_array_append_vals (ops, m, 1);
      }
  return ops;
}

typedef enum {
  FAM_C1, FAM_CS, FAM_CI, FAM_CN, FAM_CNV, FAM_CNH, FAM_S2N, FAM_DN, FAM_DNH, FAM_DND,
  FAM_T, FAM_TD, FAM_TH, FAM_O, FAM_OH, FAM_I, FAM_IH, FAM_CINFV, FAM_DINFH,
} Family;

static gsize
family_generators (Family f, guint n, double *g)
{
  const double z[3] = { 0, 0, 1 }, x[3] = { 1, 0, 0 }, y[3] = { 0, 1, 0 };
  const double phi = (1 + sqrt (5.0)) / 2;
  double d111[3] = { 1, 1, 1 }, d5[3] = { 0, 1, phi }, dd[3] = { M_SQRT1_2, -M_SQRT1_2, 0 };
  normalize3 (d111);
  normalize3 (d5);
  gsize k = 0;
  switch (f)
    {
    case FAM_C1:
      rotation (z, 0, g + 9 * k++);
      break;
    case FAM_CS:
      reflection (z, g + 9 * k++);
      break;
    case FAM_CI:
      rotation (z, 0, g + 9 * k);
      for (int i = 0; i < 9; i++)
        g[9 * k + i] = -g[9 * k + i];
      k++;
      break;
    case FAM_CN: case FAM_CNV: case FAM_CNH: case FAM_DN: case FAM_DNH: case FAM_DND:
      rotation (z, 2 * G_PI / n, g + 9 * k++);
      if (f == FAM_CNV)
        reflection (y, g + 9 * k++);
      if (f == FAM_CNH || f == FAM_DNH)
        reflection (z, g + 9 * k++);
      if (f == FAM_DN || f == FAM_DNH || f == FAM_DND)
        rotation (x, G_PI, g + 9 * k++);
      if (f == FAM_DND)
        {
          double a = G_PI / (2 * n), nd[3] = { -sin (a), cos (a), 0 };
          reflection (nd, g + 9 * k++);
        }
      break;
    case FAM_S2N:
      improper (z, G_PI / n, g + 9 * k++);
      break;
    case FAM_T: case FAM_TD: case FAM_TH: case FAM_O: case FAM_OH:
      rotation (z, (f == FAM_O || f == FAM_OH) ? G_PI / 2 : G_PI, g + 9 * k++);
      rotation (x, G_PI, g + 9 * k++);
      rotation (d111, 2 * G_PI / 3, g + 9 * k++);
      if (f == FAM_TD)
        reflection (dd, g + 9 * k++);
      break;
    case FAM_I: case FAM_IH:
      rotation (z, G_PI, g + 9 * k++);
      rotation (d5, 2 * G_PI / 5, g + 9 * k++);
      rotation (d111, 2 * G_PI / 3, g + 9 * k++);
      break;
    case FAM_CINFV:
      rotation (z, G_PI, g + 9 * k++);
      reflection (y, g + 9 * k++);
      break;
    case FAM_DINFH:
      rotation (z, G_PI, g + 9 * k++);
      rotation (x, G_PI, g + 9 * k++);
      break;
    }
  if (f == FAM_TH || f == FAM_OH || f == FAM_IH || f == FAM_DINFH)
    {
      for (int i = 0; i < 9; i++)
        g[9 * k + i] = (i % 4 == 0) ? -1.0 : 0.0;
      k++;
    }
  return k;
}

static gsize
family_order (Family f, guint n)
{
  switch (f)
    {
    case FAM_C1: return 1;
    case FAM_CS: case FAM_CI: return 2;
    case FAM_CN: return n;
    case FAM_CNV: case FAM_CNH: case FAM_S2N: case FAM_DN: return 2 * n;
    case FAM_DNH: case FAM_DND: return 4 * n;
    case FAM_T: return 12;
    case FAM_TD: case FAM_TH: case FAM_O: return 24;
    case FAM_OH: return 48;
    case FAM_I: return 60;
    case FAM_IH: return 120;
    case FAM_CINFV: return 4;
    case FAM_DINFH: return 8;
    }
  return 0;
}

static char *
family_name (Family f, guint n)
{
  switch (f)
    {
    case FAM_C1: return g_strdup ("C1");
    case FAM_CS: return g_strdup ("Cs");
    case FAM_CI: return g_strdup ("Ci");
    case FAM_CN: return g_strdup_printf ("C%u", n);
    case FAM_CNV: return g_strdup_printf ("C%uv", n);
    case FAM_CNH: return g_strdup_printf ("C%uh", n);
    case FAM_S2N: return g_strdup_printf ("S%u", 2 * n);
    case FAM_DN: return g_strdup_printf ("D%u", n);
    case FAM_DNH: return g_strdup_printf ("D%uh", n);
    case FAM_DND: return g_strdup_printf ("D%ud", n);
    case FAM_T: return g_strdup ("T");
    case FAM_TD: return g_strdup ("Td");
    case FAM_TH: return g_strdup ("Th");
    case FAM_O: return g_strdup ("O");
    case FAM_OH: return g_strdup ("Oh");
    case FAM_I: return g_strdup ("I");
    case FAM_IH: return g_strdup ("Ih");
    case FAM_CINFV: return g_strdup ("Cinfv");
    case FAM_DINFH: return g_strdup ("Dinfh");
    }
  return NULL;
}

/* --- detection ------------------------------------------------------------ */

static gboolean
perpendicular (const double *a, const double *b)
{
  return fabs (dot3 (a, b)) < PERP_SIN;
}

static gboolean
parallel (const double *a, const double *b)
{
  return fabs (dot3 (a, b)) > 1 - 0.5 * PERP_SIN * PERP_SIN;
}

static void
inertia_frame (const Ctx *c, const double *m, double *vals, double *vecs)
{
  double t[9] = { 0 };
  for (gsize a = 0; a < c->n; a++)
    {
      const double *p = c->p + 3 * a;
      double r2 = dot3 (p, p);
      for (int i = 0; i < 3; i++)
        for (int j = 0; j < 3; j++)
          t[3 * i + j] += m[a] * ((i == j) * r2 - p[i] * p[j]);
    }
  eigen3 (t, vals, vecs);
}

typedef struct {
  double r;
  gsize atom;
} DistKey;

static int
cmp_key (const void *a, const void *b)
{
  const DistKey *x = a, *y = b;
  return (x->r > y->r) - (x->r < y->r);
}

QvPointGroup *
qv_point_group_detect (const QvStructure *s, double tolerance, GError **error)
{
  if (tolerance == 0)
    tolerance = QV_SYMMETRY_DEFAULT_TOLERANCE;
  if (!(tolerance > 0 && tolerance < 1))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "the symmetry tolerance must be more than 0 and less than 1 Å (got %g); "
                   "%g Å suits optimised geometries", tolerance, QV_SYMMETRY_DEFAULT_TOLERANCE);
      return NULL;
    }
  if (s == NULL || s->n_atoms < 1 || qv_structure_is_periodic (s))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   s && s->n_atoms ? "point groups are for molecules; this structure is periodic"
                                   : "no atoms: nothing to find the symmetry of");
      return NULL;
    }
  gsize n = s->n_atoms;
  if (n == 1)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "a single atom has the symmetry of a sphere (Kh): no molecular point group, "
                   "and no vibrations to label");
      return NULL;
    }
  for (gsize a = 0; a < n; a++)
    for (int i = 0; i < 3; i++)
      if (!isfinite (s->atoms[a].position[i]))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                       "atom %" G_GSIZE_FORMAT " has a non-finite position", a + 1);
          return NULL;
        }

  Ctx c = { n, g_new (double, 3 * n), g_new0 (guint, n), tolerance, g_new0 (guint, n), 0 };
  g_autofree double *masses = g_new (double, n);
  double com[3];
  qv_structure_center_of_mass (s, com);
  for (gsize a = 0; a < n; a++)
    {
      masses[a] = s->atoms[a].mass;
      for (int i = 0; i < 3; i++)
        c.p[3 * a + i] = s->atoms[a].position[i] - com[i];
      c.kind[a] = (guint) a;
      for (gsize b = 0; b < a; b++)
        if (s->atoms[b].z == s->atoms[a].z
            && fabs (s->atoms[b].mass - s->atoms[a].mass) <= 1e-9 * s->atoms[a].mass)
          {
            c.kind[a] = c.kind[b];
            break;
          }
    }

  grid_build (&c);
  QvPointGroup *g = g_new0 (QvPointGroup, 1);
  g->tolerance = tolerance;
  g->n_atoms = n;
  memcpy (g->center, com, sizeof com);

  double ivals[3], ivecs[9];
  inertia_frame (&c, masses, ivals, ivecs);

  Family fam = FAM_C1;
  guint order_n = 1;
  double z[3] = { ivecs[6], ivecs[7], ivecs[8] }, x[3] = { ivecs[0], ivecs[1], ivecs[2] };
  gboolean frame_done = FALSE;

  /* linear: every atom on the axis of the smallest moment */
  double lin[3] = { ivecs[0], ivecs[1], ivecs[2] };
  if (n >= 2 && count_on_axis (&c, lin) == (int) n)
    {
      double minus[9] = { -1, 0, 0, 0, -1, 0, 0, 0, -1 };
      fam = op_maps (&c, minus, tolerance, NULL, NULL) ? FAM_DINFH : FAM_CINFV;
      memcpy (z, lin, sizeof z);
      orient_sign (&c, z);
      x[0] = ivecs[3]; x[1] = ivecs[4]; x[2] = ivecs[5];
      frame_done = TRUE;
      order_n = 0;
    }
  GArray *axes = g_array_new (FALSE, FALSE, sizeof (Axis));
  GArray *mirrors = g_array_new (FALSE, FALSE, sizeof (double) * 3);
  gboolean inversion = FALSE;
  if (!frame_done)
    {
      /* candidate sets of equivalent atoms: alike and equally far out */
      g_autofree DistKey *keys = g_new (DistKey, n);
      for (gsize a = 0; a < n; a++)
        {
          keys[a].r = sqrt (dot3 (c.p + 3 * a, c.p + 3 * a));
          keys[a].atom = a;
        }
      qsort (keys, n, sizeof *keys, cmp_key);
      g_autofree gsize *set = g_new (gsize, n);
      g_autofree gboolean *taken = g_new0 (gboolean, n);
      DirSet dset = { g_array_new (FALSE, FALSE, sizeof (Dir)), g_hash_table_new (g_direct_hash, g_direct_equal) };
      DirSet *dirs = &dset;
      for (int i = 0; i < 3; i++)
        add_dir (dirs, ivecs + 3 * i, 0.5);
      gsize largest = 1;
      for (gsize k = 0; k < n; k++)
        {
          if (taken[k])
            continue;
          gsize m = 0;
          gsize a0 = keys[k].atom;
          for (gsize l = k; l < n && keys[l].r - keys[k].r < 2 * tolerance; l++)
            if (!taken[l] && c.kind[keys[l].atom] == c.kind[a0])
              {
                taken[l] = TRUE;
                set[m++] = keys[l].atom;
              }
          largest = MAX (largest, m);
          for (gsize i = 0; i < m; i++)
            {
              const double *pi = c.p + 3 * set[i];
              add_dir (dirs, pi, 2 * tolerance);
              for (gsize j = i + 1; j < m; j++)
                {
                  const double *pj = c.p + 3 * set[j];
                  double v[3];
                  for (int q = 0; q < 3; q++)
                    v[q] = pi[q] + pj[q];
                  add_dir (dirs, v, 2 * tolerance);
                  for (int q = 0; q < 3; q++)
                    v[q] = pi[q] - pj[q];
                  add_dir (dirs, v, 2 * tolerance);
                  cross3 (pi, pj, v);
                  add_dir (dirs, v, 4 * tolerance * (keys[k].r + tolerance));
                  if (i == 0)
                    for (gsize l = j + 1; l < m; l++)
                      {
                        const double *pl = c.p + 3 * set[l];
                        double e1[3], e2[3];
                        for (int q = 0; q < 3; q++)
                          {
                            e1[q] = pj[q] - pi[q];
                            e2[q] = pl[q] - pi[q];
                          }
                        cross3 (e1, e2, v);
                        add_dir (dirs, v, 4 * tolerance * (keys[k].r + tolerance));
                      }
                }
            }
        }
      guint nmax = (guint) MIN ((gsize) MAX_AXIS_ORDER, largest);
      g_autofree gsize *perm = g_new (gsize, n);
      for (guint i = 0; i < dirs->dirs->len; i++)
        {
          Dir *d = &g_array_index (dirs->dirs, Dir, i);
          double u[3] = { d->v[0], d->v[1], d->v[2] }, r[9];
          gboolean known_axis = FALSE, known_mirror = FALSE;
          for (guint j = 0; j < axes->len && !known_axis; j++)
            known_axis = parallel (g_array_index (axes, Axis, j).v, u);
          for (guint j = 0; j < mirrors->len && !known_mirror; j++)
            known_mirror = parallel ((double *) mirrors->data + 3 * j, u);
          for (guint m = nmax; m >= 2 && !known_axis; m--)
            {
              rotation (u, 2 * G_PI / m, r);
              if (op_maps (&c, r, tolerance, perm, NULL))
                {
                  double v[3] = { u[0], u[1], u[2] };
                  refine (&c, perm, m == 2 ? 1 : 0, v);
                  rotation (v, 2 * G_PI / m, r);
                  if (!op_maps (&c, r, tolerance, NULL, NULL))
                    memcpy (v, u, sizeof v);
                  gboolean dup = FALSE;
                  for (guint j = 0; j < axes->len && !dup; j++)
                    dup = parallel (g_array_index (axes, Axis, j).v, v);
                  if (!dup)
                    {
                      Axis ax = { { v[0], v[1], v[2] }, m, FALSE };
                      improper (v, G_PI / m, r);
                      ax.s2n = op_maps (&c, r, tolerance, NULL, NULL);
                      g_array_append_val (axes, ax);
                    }
                  break;
                }
            }
          reflection (u, r);
          if (!known_mirror && op_maps (&c, r, tolerance, perm, NULL))
            {
              double v[3] = { u[0], u[1], u[2] };
              refine (&c, perm, 2, v);
              reflection (v, r);
              if (!op_maps (&c, r, tolerance, NULL, NULL))
                memcpy (v, u, sizeof v);
              gboolean dup = FALSE;
              for (guint j = 0; j < mirrors->len && !dup; j++)
                dup = parallel ((double *) mirrors->data + 3 * j, v);
              if (!dup)
                g_array_append_vals (mirrors, v, 1);
            }
        }
      g_array_free (dset.dirs, TRUE);
      g_hash_table_destroy (dset.cells);
      double minus[9] = { -1, 0, 0, 0, -1, 0, 0, 0, -1 };
      inversion = op_maps (&c, minus, tolerance, NULL, NULL);

      /* --- the group from its elements --- */
      guint n_high = 0, max5 = 0, max4 = 0;
      for (guint j = 0; j < axes->len; j++)
        {
          guint o = g_array_index (axes, Axis, j).order;
          n_high += o >= 3;
          max5 |= o == 5;
          max4 |= o == 4;
        }
      if (n_high >= 2)
        {
          /* T, O and I families: the frame from perpendicular C2 (C4) axes */
          guint want = max5 ? 2 : max4 ? 4 : 2;
          fam = max5 ? (inversion ? FAM_IH : FAM_I)
              : max4 ? (inversion ? FAM_OH : FAM_O)
              : inversion ? FAM_TH : mirrors->len > 0 ? FAM_TD : FAM_T;
          order_n = 0;
          gssize iz = -1, ix = -1;
          for (guint j = 0; j < axes->len && ix < 0; j++)
            if (g_array_index (axes, Axis, j).order == want)
              {
                if (iz < 0)
                  iz = j;
                else if (perpendicular (g_array_index (axes, Axis, iz).v, g_array_index (axes, Axis, j).v))
                  ix = j;
              }
          if (iz >= 0 && ix >= 0)
            {
              memcpy (z, g_array_index (axes, Axis, iz).v, sizeof z);
              memcpy (x, g_array_index (axes, Axis, ix).v, sizeof x);
              frame_done = TRUE;
              if (fam == FAM_I || fam == FAM_IH)
                {
                  double fr[3][3], d5[3], v[3], r[9];
                  const double phi = (1 + sqrt (5.0)) / 2;
                  make_frame (z, x, fr);
                  double w = sqrt (1 + phi * phi);
                  for (int q = 0; q < 3; q++)
                    v[q] = (fr[1][q] + phi * fr[2][q]) / w;
                  memcpy (d5, v, sizeof v);
                  rotation (d5, 2 * G_PI / 5, r);
                  if (!op_maps (&c, r, 3 * tolerance, NULL, NULL))
                    memcpy (x, fr[1], sizeof x);   /* turn the frame 90° about z */
                }
            }
          else
            fam = FAM_C1;      /* inconsistent elements: fall back below */
        }
      if (!frame_done)
        {
          Axis *principal = NULL;
          for (guint j = 0; j < axes->len; j++)
            {
              Axis *a = &g_array_index (axes, Axis, j);
              if (principal == NULL || a->order > principal->order
                  || (a->order == principal->order && a->s2n && !principal->s2n))
                principal = a;
            }
          if (principal == NULL)
            {
              if (mirrors->len > 0)
                {
                  fam = FAM_CS;
                  memcpy (z, mirrors->data, sizeof z);
                  first_perpendicular (&c, z, x);
                }
              else
                fam = inversion ? FAM_CI : FAM_C1;
              order_n = 1;
            }
          else
            {
              guint nn = principal->order;
              /* D2 family: three C2 axes; choose z and x by the atoms on them */
              GPtrArray *perp = g_ptr_array_new ();
              for (guint j = 0; j < axes->len; j++)
                {
                  Axis *a = &g_array_index (axes, Axis, j);
                  if (a != principal && a->order == 2 && perpendicular (a->v, principal->v))
                    g_ptr_array_add (perp, a);
                }
              gboolean sigma_h = FALSE;
              guint n_vertical = 0;
              for (guint j = 0; j < mirrors->len; j++)
                {
                  const double *u = (double *) mirrors->data + 3 * j;
                  if (parallel (u, principal->v))
                    sigma_h = TRUE;
                  else if (perpendicular (u, principal->v))
                    n_vertical++;
                }
              order_n = nn;
              memcpy (z, principal->v, sizeof z);
              if (perp->len >= nn)
                {
                  fam = sigma_h ? FAM_DNH : n_vertical >= nn ? FAM_DND : FAM_DN;
                  if (nn == 2)
                    {
                      /* D2, D2h: planar → x normal to the plane; z the axis with most atoms */
                      Axis *three[3] = { principal, perp->pdata[0], perp->pdata[1] };
                      int on[3], in_plane[3], xi = -1, zi = -1;
                      for (int q = 0; q < 3; q++)
                        {
                          on[q] = count_on_axis (&c, three[q]->v);
                          in_plane[q] = count_in_plane (&c, three[q]->v);
                          if (in_plane[q] == (int) n && xi < 0)
                            xi = q;
                        }
                      for (int q = 0; q < 3; q++)
                        if (q != xi && (zi < 0 || on[q] > on[zi]))
                          zi = q;
                      if (xi < 0)
                        for (int q = 0; q < 3; q++)
                          if (q != zi && (xi < 0 || on[q] > on[xi]))
                            xi = q;
                      memcpy (z, three[zi]->v, sizeof z);
                      memcpy (x, three[xi]->v, sizeof x);
                    }
                  else
                    {
                      Axis *best = NULL;
                      int best_on = -1;
                      for (guint j = 0; j < perp->len; j++)
                        {
                          Axis *a = perp->pdata[j];
                          int on = count_on_axis (&c, a->v);
                          if (on > best_on)
                            {
                              best = a;
                              best_on = on;
                            }
                        }
                      memcpy (x, best->v, sizeof x);
                    }
                }
              else if (sigma_h)
                {
                  fam = FAM_CNH;
                  first_perpendicular (&c, z, x);
                }
              else if (n_vertical >= nn)
                {
                  fam = FAM_CNV;
                  const double *best = NULL;
                  int best_in = -1;
                  for (guint j = 0; j < mirrors->len; j++)
                    {
                      const double *u = (double *) mirrors->data + 3 * j;
                      int in = count_in_plane (&c, u);
                      if (perpendicular (u, principal->v) && in > best_in)
                        {
                          best = u;
                          best_in = in;
                        }
                    }
                  if (nn == 2)
                    memcpy (x, best, sizeof x);          /* yz: the plane with more atoms */
                  else
                    cross3 (best, z, x);                 /* x in the plane with most atoms */
                }
              else if (principal->s2n)
                {
                  fam = FAM_S2N;
                  first_perpendicular (&c, z, x);
                }
              else
                {
                  fam = FAM_CN;
                  first_perpendicular (&c, z, x);
                }
              g_ptr_array_free (perp, TRUE);
            }
          if (fam == FAM_C1 || fam == FAM_CI)
            {
              memcpy (z, ivecs + 6, sizeof z);
              memcpy (x, ivecs, sizeof x);
            }
          orient_sign (&c, z);
          orient_sign (&c, x);
        }
    }
  g_array_free (axes, TRUE);
  g_array_free (mirrors, TRUE);

  make_frame (z, x, g->frame);
  g->name = family_name (fam, order_n);
  g->n = order_n;
  g->linear = fam == FAM_CINFV || fam == FAM_DINFH;

  double gens[9 * 6];
  gsize n_gens = family_generators (fam, order_n, gens);
  GArray *ops = close_group (gens, n_gens);
  if (ops->len != family_order (fam, order_n))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "symmetry: the operations of %s did not close "
                   "(%u, expected %" G_GSIZE_FORMAT ")", g->name, ops->len, family_order (fam, order_n));
      g_array_free (ops, TRUE);
      goto fail;
    }
  g->order = ops->len;
  g->operations = g_new (double, 9 * g->order);
  g->permutations = g_new (gsize, g->order * n);
  g->symmetry_number = 0;
  for (gsize k = 0; k < g->order; k++)
    {
      const double *rs = (double *) ops->data + 9 * k;
      double *r = g->operations + 9 * k;
      /* R_in = Fᵀ R_std F */
      for (int i = 0; i < 3; i++)
        for (int j = 0; j < 3; j++)
          {
            double sum = 0;
            for (int a = 0; a < 3; a++)
              for (int b = 0; b < 3; b++)
                sum += g->frame[a][i] * rs[3 * a + b] * g->frame[b][j];
            r[3 * i + j] = sum;
          }
      double det = rs[0] * (rs[4] * rs[8] - rs[5] * rs[7]) - rs[1] * (rs[3] * rs[8] - rs[5] * rs[6])
                   + rs[2] * (rs[3] * rs[7] - rs[4] * rs[6]);
      if (det > 0)
        g->symmetry_number++;
      if (!op_maps (&c, r, 3 * tolerance, g->permutations + k * n, &g->max_deviation))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                       "symmetry: the elements found at %g Å do not make the group %s exactly; "
                       "try a smaller --symmetry-tolerance", tolerance, g->name);
          g_array_free (ops, TRUE);
          goto fail;
        }
    }
  if (fam == FAM_CINFV)
    g->symmetry_number = 1;
  if (fam == FAM_DINFH)
    g->symmetry_number = 2;
  g_array_free (ops, TRUE);
  grid_free (&c);
  g_free (c.p); g_free (c.kind); g_free (c.used);
  return g;

fail:
  grid_free (&c);
  g_free (c.p); g_free (c.kind); g_free (c.used);
  qv_point_group_free (g);
  return NULL;
}

void
qv_point_group_free (QvPointGroup *g)
{
  if (g == NULL)
    return;
  g_free (g->name);
  g_free (g->operations);
  g_free (g->permutations);
  g_free (g);
}

const double *
qv_point_group_operation (const QvPointGroup *g, gsize k)
{
  return g->operations + 9 * k;
}

const gsize *
qv_point_group_permutation (const QvPointGroup *g, gsize k)
{
  return g->permutations + k * g->n_atoms;
}

gsize
qv_point_group_equivalent_atoms (const QvPointGroup *g, gsize *out)
{
  gsize n_sets = 0;
  for (gsize a = 0; a < g->n_atoms; a++)
    out[a] = G_MAXSIZE;
  for (gsize a = 0; a < g->n_atoms; a++)
    {
      if (out[a] != G_MAXSIZE)
        continue;
      for (gsize k = 0; k < g->order; k++)
        out[g->permutations[k * g->n_atoms + a]] = n_sets;
      n_sets++;
    }
  return n_sets;
}

void
qv_point_group_symmetrize_structure (const QvPointGroup *g, QvStructure *s)
{
  gsize n = g->n_atoms;
  g_autofree double *out = g_new0 (double, 3 * n);
  for (gsize k = 0; k < g->order; k++)
    {
      const double *r = g->operations + 9 * k;
      const gsize *perm = g->permutations + k * n;
      for (gsize a = 0; a < n; a++)
        {
          const double *pb = s->atoms[perm[a]].position;
          double d[3] = { pb[0] - g->center[0], pb[1] - g->center[1], pb[2] - g->center[2] };
          for (int i = 0; i < 3; i++)   /* Rᵀ d */
            out[3 * a + i] += r[i] * d[0] + r[3 + i] * d[1] + r[6 + i] * d[2];
        }
    }
  for (gsize a = 0; a < n; a++)
    for (int i = 0; i < 3; i++)
      s->atoms[a].position[i] = g->center[i] + out[3 * a + i] / (double) g->order;
}

double
qv_point_group_symmetrize_hessian (const QvPointGroup *g, QvHessian *h)
{
  gsize n = g->n_atoms, dim = 3 * n;
  g_return_val_if_fail (h->n == dim, 0);
  double *acc = g_new0 (double, dim * dim);
  for (gsize k = 0; k < g->order; k++)
    {
      const double *r = g->operations + 9 * k;
      const gsize *perm = g->permutations + k * n;
      for (gsize a1 = 0; a1 < n; a1++)
        for (gsize a2 = 0; a2 < n; a2++)
          {
            double blk[9], t[9], o[9];
            for (int i = 0; i < 3; i++)
              for (int j = 0; j < 3; j++)
                blk[3 * i + j] = h->data[(3 * a1 + i) + (3 * a2 + j) * dim];
            /* R blk Rᵀ */
            mat_mul (r, blk, t);
            for (int i = 0; i < 3; i++)
              for (int j = 0; j < 3; j++)
                o[3 * i + j] = t[3 * i] * r[3 * j] + t[3 * i + 1] * r[3 * j + 1] + t[3 * i + 2] * r[3 * j + 2];
            gsize b1 = perm[a1], b2 = perm[a2];
            for (int i = 0; i < 3; i++)
              for (int j = 0; j < 3; j++)
                acc[(3 * b1 + i) + (3 * b2 + j) * dim] += o[3 * i + j];
          }
    }
  double scale = 0, change = 0;
  for (gsize i = 0; i < dim * dim; i++)
    {
      double v = acc[i] / (double) g->order;
      scale = MAX (scale, fabs (h->data[i]));
      change = MAX (change, fabs (v - h->data[i]));
      h->data[i] = v;
    }
  g_free (acc);
  return scale > 0 ? change / scale : 0;
}
