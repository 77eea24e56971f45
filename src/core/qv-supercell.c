/* qv-supercell.c — supercell matrices, lattice reduction, atom mapping.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <errno.h>
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-supercell.h"

#define MAX_DET 100000

gint64
qv_supercell_matrix_det (const int m[3][3])
{
  return (gint64) m[0][0] * ((gint64) m[1][1] * m[2][2] - (gint64) m[1][2] * m[2][1])
       - (gint64) m[0][1] * ((gint64) m[1][0] * m[2][2] - (gint64) m[1][2] * m[2][0])
       + (gint64) m[0][2] * ((gint64) m[1][0] * m[2][1] - (gint64) m[1][1] * m[2][0]);
}

/* adj with m · adj = det · 1 */
static void
adjugate (const int m[3][3], gint64 adj[3][3])
{
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      {
        int r0 = (j + 1) % 3, r1 = (j + 2) % 3, c0 = (i + 1) % 3, c1 = (i + 2) % 3;
        adj[i][j] = (gint64) m[r0][c0] * m[r1][c1] - (gint64) m[r0][c1] * m[r1][c0];
      }
}

static gint64
floor_div (gint64 a, gint64 b)
{
  gint64 q = a / b;
  if ((a % b != 0) && ((a < 0) != (b < 0)))
    q--;
  return q;
}

gboolean
qv_supercell_matrix_parse (const char *text, int matrix[3][3], GError **error)
{
  g_auto(GStrv) parts = NULL;
  g_autofree char *stripped = g_strstrip (g_strdup (text));
  gint64 values[9];
  gsize n = 0;
  gboolean diagonal = strchr (text, 'x') != NULL || strchr (text, 'X') != NULL;

  parts = g_regex_split_simple (diagonal ? "[xX]" : "[\\s,]+", stripped, 0, 0);
  for (char **p = parts; *p; p++)
    {
      g_autofree char *word = g_strstrip (g_strdup (*p));
      char *end = NULL;
      gint64 v;
      if (*word == '\0')
        continue;
      errno = 0;
      v = g_ascii_strtoll (word, &end, 10);
      if (*end != '\0' || errno != 0 || v < -10000 || v > 10000 || n >= 9)
        {
          n = 99;
          break;
        }
      values[n++] = v;
    }
  if (!((diagonal && n == 3) || (!diagonal && n == 9)))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "supercell '%s' is neither NxMxL (such as 2x2x2) nor nine whole numbers "
                   "\"m11 m12 m13 m21 m22 m23 m31 m32 m33\" (rows: supercell vectors in "
                   "primitive vectors)", text);
      return FALSE;
    }
  memset (matrix, 0, 9 * sizeof (int));
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      matrix[i][j] = diagonal ? (i == j ? (int) values[i] : 0) : (int) values[3 * i + j];
  gint64 det = qv_supercell_matrix_det (matrix);
  if (det <= 0 || det > MAX_DET)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "supercell '%s' has determinant %" G_GINT64_FORMAT ": it must be from 1 to %d "
                   "(a positive number of primitive cells; swap two rows if it is negative)",
                   text, det, MAX_DET);
      return FALSE;
    }
  return TRUE;
}

double
qv_lattice_volume (const double c[3][3])
{
  return c[0][0] * (c[1][1] * c[2][2] - c[1][2] * c[2][1])
       - c[0][1] * (c[1][0] * c[2][2] - c[1][2] * c[2][0])
       + c[0][2] * (c[1][0] * c[2][1] - c[1][1] * c[2][0]);
}

void
qv_lattice_reciprocal (const double c[3][3], double b[3][3])
{
  double v = qv_lattice_volume (c);
  for (int i = 0; i < 3; i++)
    {
      const double *u = c[(i + 1) % 3], *w = c[(i + 2) % 3];
      b[i][0] = 2 * G_PI * (u[1] * w[2] - u[2] * w[1]) / v;
      b[i][1] = 2 * G_PI * (u[2] * w[0] - u[0] * w[2]) / v;
      b[i][2] = 2 * G_PI * (u[0] * w[1] - u[1] * w[0]) / v;
    }
}

static double
dot3 (const double *a, const double *b)
{
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

/* LLL in three dimensions, Gram–Schmidt recomputed at every step (3 vectors:
 * cost is nothing next to what follows). */
void
qv_lattice_reduce (const double basis[3][3], double reduced[3][3], int transform[3][3])
{
  double b[3][3], bs[3][3], mu[3][3], bb[3];
  int t[3][3] = { { 1, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 } };
  const double delta = 0.99;
  int k = 1, guard = 0;

  memcpy (b, basis, sizeof b);
  while (k < 3 && guard++ < 10000)
    {
      /* Gram–Schmidt */
      for (int i = 0; i < 3; i++)
        {
          memcpy (bs[i], b[i], sizeof bs[i]);
          for (int j = 0; j < i; j++)
            {
              mu[i][j] = dot3 (b[i], bs[j]) / bb[j];
              for (int c = 0; c < 3; c++)
                bs[i][c] -= mu[i][j] * bs[j][c];
            }
          bb[i] = dot3 (bs[i], bs[i]);
        }
      /* size reduction of b_k */
      for (int j = k - 1; j >= 0; j--)
        {
          double r = round (dot3 (b[k], bs[j]) / bb[j]);
          if (r != 0)
            {
              for (int c = 0; c < 3; c++)
                {
                  b[k][c] -= r * b[j][c];
                  t[k][c] -= (int) r * t[j][c];
                }
              /* refresh the projections of b_k */
              for (int i = 0; i < 3; i++)
                {
                  memcpy (bs[i], b[i], sizeof bs[i]);
                  for (int jj = 0; jj < i; jj++)
                    {
                      mu[i][jj] = dot3 (b[i], bs[jj]) / bb[jj];
                      for (int c = 0; c < 3; c++)
                        bs[i][c] -= mu[i][jj] * bs[jj][c];
                    }
                  bb[i] = dot3 (bs[i], bs[i]);
                }
            }
        }
      if (bb[k] >= (delta - mu[k][k - 1] * mu[k][k - 1]) * bb[k - 1])
        k++;
      else
        {
          double tmp[3];
          int ti[3];
          memcpy (tmp, b[k], sizeof tmp);
          memcpy (b[k], b[k - 1], sizeof tmp);
          memcpy (b[k - 1], tmp, sizeof tmp);
          memcpy (ti, t[k], sizeof ti);
          memcpy (t[k], t[k - 1], sizeof ti);
          memcpy (t[k - 1], ti, sizeof ti);
          k = MAX (k - 1, 1);
        }
    }
  /* keep the handedness of the input */
  if ((qv_lattice_volume (b) < 0) != (qv_lattice_volume (basis) < 0))
    for (int c = 0; c < 3; c++)
      {
        b[2][c] = -b[2][c];
        t[2][c] = -t[2][c];
      }
  if (reduced)
    memcpy (reduced, b, sizeof b);
  if (transform)
    memcpy (transform, t, sizeof t);
}

/* ------------------------------------------------------------------ */
/* Classes of lattice translations modulo the supercell                 */

typedef struct {
  int m[3][3];
  gint64 adj[3][3];
  gint64 det;
} Modulus;

static void
modulus_init (Modulus *mod, const int m[3][3])
{
  memcpy (mod->m, m, sizeof mod->m);
  adjugate (m, mod->adj);
  mod->det = qv_supercell_matrix_det (m);
}

/* Reduces @n to the representative inside the supercell and returns a key
 * (the numerators of its fractional supercell coordinates). */
static gint64
modulus_reduce (const Modulus *mod, const int n[3], int out[3])
{
  gint64 num[3], k[3];
  for (int j = 0; j < 3; j++)
    {
      num[j] = 0;
      for (int i = 0; i < 3; i++)
        num[j] += (gint64) n[i] * mod->adj[i][j];
      k[j] = floor_div (num[j], mod->det);
      num[j] -= k[j] * mod->det;
    }
  if (out)
    for (int j = 0; j < 3; j++)
      {
        gint64 v = n[j];
        for (int i = 0; i < 3; i++)
          v -= k[i] * mod->m[i][j];
        out[j] = (int) v;
      }
  return (num[0] * mod->det + num[1]) * mod->det + num[2];
}

/* Representatives in lexicographic order, n3 fastest. */
static int *
modulus_enumerate (const Modulus *mod)
{
  int lo[3], hi[3], count = 0;
  int *cells = g_new (int, 3 * (gsize) mod->det);

  for (int j = 0; j < 3; j++)
    {
      lo[j] = 0;
      hi[j] = 0;
      for (int c = 0; c < 8; c++)
        {
          int v = 0;
          for (int i = 0; i < 3; i++)
            if (c & (1 << i))
              v += mod->m[i][j];
          lo[j] = MIN (lo[j], v);
          hi[j] = MAX (hi[j], v);
        }
    }
  for (int a = lo[0]; a <= hi[0]; a++)
    for (int b = lo[1]; b <= hi[1]; b++)
      for (int c = lo[2]; c <= hi[2]; c++)
        {
          int n[3] = { a, b, c }, r[3];
          modulus_reduce (mod, n, r);
          if (r[0] == a && r[1] == b && r[2] == c)
            {
              g_assert (count < mod->det);
              memcpy (cells + 3 * count, n, sizeof n);
              count++;
            }
        }
  g_assert (count == mod->det);
  return cells;
}

QvStructure *
qv_supercell_build (const QvStructure *p, const int matrix[3][3], GError **error)
{
  gint64 det = qv_supercell_matrix_det (matrix);
  Modulus mod;
  g_autofree int *cells = NULL;
  QvStructure *s;

  if (!p->has_cell)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "the primitive structure has no cell: give it a Lattice=\"…\" (extended XYZ)");
      return NULL;
    }
  if (det <= 0 || det > MAX_DET || (guint64) det * p->n_atoms > 10000000)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                   "a supercell of %" G_GINT64_FORMAT " primitive cells of %" G_GSIZE_FORMAT
                   " atoms is outside what can be built (determinant 1 to %d, at most 10 million atoms)",
                   det, p->n_atoms, MAX_DET);
      return NULL;
    }
  modulus_init (&mod, matrix);
  cells = modulus_enumerate (&mod);
  s = qv_structure_new ((gsize) det * p->n_atoms, error);
  if (s == NULL)
    return NULL;
  s->has_cell = TRUE;
  for (int i = 0; i < 3; i++)
    {
      s->pbc[i] = TRUE;
      for (int c = 0; c < 3; c++)
        s->cell[i][c] = matrix[i][0] * p->cell[0][c] + matrix[i][1] * p->cell[1][c]
                      + matrix[i][2] * p->cell[2][c];
    }
  for (gsize l = 0; l < (gsize) det; l++)
    for (gsize k = 0; k < p->n_atoms; k++)
      {
        QvAtom *a = &s->atoms[l * p->n_atoms + k];
        const QvAtom *src = &p->atoms[k];
        const int *n = cells + 3 * l;
        a->z = src->z;
        a->mass = src->mass;
        a->mass_number = src->mass_number;
        a->label = g_strdup (src->label);
        for (int c = 0; c < 3; c++)
          a->position[c] = src->position[c] + n[0] * p->cell[0][c] + n[1] * p->cell[1][c]
                         + n[2] * p->cell[2][c];
      }
  return s;
}

/* ------------------------------------------------------------------ */
/* Mapping                                                              */

void
qv_supercell_map_free (QvSupercellMap *map)
{
  if (map == NULL)
    return;
  g_free (map->positions);
  g_free (map->masses);
  g_free (map->z);
  g_free (map->site);
  g_free (map->translation);
  g_free (map->cell);
  g_free (map->cells);
  g_free (map->atom);
  g_free (map);
}

gsize
qv_supercell_map_class (const QvSupercellMap *map, const int n[3])
{
  Modulus mod;
  int r[3];
  modulus_init (&mod, map->matrix);
  modulus_reduce (&mod, n, r);
  /* cells are in lexicographic order: binary search */
  gsize lo = 0, hi = map->n_cells;
  while (lo < hi)
    {
      gsize mid = (lo + hi) / 2;
      const int *c = map->cells + 3 * mid;
      int cmp = c[0] != r[0] ? (c[0] < r[0] ? -1 : 1)
              : c[1] != r[1] ? (c[1] < r[1] ? -1 : 1)
              : c[2] != r[2] ? (c[2] < r[2] ? -1 : 1) : 0;
      if (cmp == 0)
        return mid;
      if (cmp < 0)
        lo = mid + 1;
      else
        hi = mid;
    }
  g_assert_not_reached ();
  return 0;
}

double *
qv_supercell_map_commensurate_q (const QvSupercellMap *map)
{
  int mt[3][3];
  Modulus mod;
  g_autofree int *ks = NULL;
  double *q = g_new (double, 3 * map->n_cells);

  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      mt[i][j] = map->matrix[j][i];
  modulus_init (&mod, mt);
  ks = modulus_enumerate (&mod);
  /* q = M⁻¹ k = adj(M) k / det; adj(Mᵀ) = adj(M)ᵀ */
  for (gsize l = 0; l < map->n_cells; l++)
    for (int i = 0; i < 3; i++)
      {
        gint64 num = 0;
        for (int j = 0; j < 3; j++)
          num += mod.adj[j][i] * ks[3 * l + j];
        q[3 * l + i] = (double) num / (double) mod.det;
        q[3 * l + i] -= floor (q[3 * l + i] + 1e-12);
        if (q[3 * l + i] < 0)
          q[3 * l + i] = 0;
      }
  return q;
}

static char *
format_cell (const double c[3][3])
{
  return g_strdup_printf ("(%.6g %.6g %.6g | %.6g %.6g %.6g | %.6g %.6g %.6g)",
                          c[0][0], c[0][1], c[0][2], c[1][0], c[1][1], c[1][2],
                          c[2][0], c[2][1], c[2][2]);
}

QvSupercellMap *
qv_supercell_map (const QvStructure *p, const QvStructure *s, double tolerance, GError **error)
{
  g_autoptr(QvSupercellMap) map = NULL;
  double b[3][3], volume, scale, tol, fm[3][3], worst = 0;
  g_autofree double *frac = NULL;
  gint64 det;
  Modulus mod;
  gsize n;

  if (tolerance <= 0)
    tolerance = QV_SUPERCELL_DEFAULT_TOLERANCE;
  if (!p->has_cell || !s->has_cell)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "the %s structure has no cell: give it a Lattice=\"ax ay az bx by bz cx cy cz\" "
                   "(extended XYZ)", p->has_cell ? "supercell" : "primitive");
      return NULL;
    }
  volume = qv_lattice_volume (p->cell);
  if (!(fabs (volume) > 1e-6) || p->n_atoms == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "the primitive cell has zero volume: its three lattice vectors are not independent");
      return NULL;
    }
  n = p->n_atoms;
  scale = cbrt (fabs (volume) / (double) n);
  tol = tolerance * scale;
  qv_lattice_reciprocal (p->cell, b);

  /* M = A a⁻¹, integer within the tolerance */
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      fm[i][j] = dot3 (s->cell[i], b[j]) / (2 * G_PI);
  map = g_new0 (QvSupercellMap, 1);
  for (int i = 0; i < 3; i++)
    {
      double r[3];
      for (int j = 0; j < 3; j++)
        {
          if (!(fabs (fm[i][j]) < 10000))
            goto not_integer;
          map->matrix[i][j] = (int) lround (fm[i][j]);
        }
      for (int c = 0; c < 3; c++)
        r[c] = s->cell[i][c] - (map->matrix[i][0] * p->cell[0][c] + map->matrix[i][1] * p->cell[1][c]
                                + map->matrix[i][2] * p->cell[2][c]);
      if (sqrt (dot3 (r, r)) > tol * MAX (1.0, sqrt (dot3 (s->cell[i], s->cell[i])) / scale))
        {
        not_integer:;
          g_autofree char *pc = format_cell (p->cell), *sc = format_cell (s->cell);
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                       "the supercell lattice %s is not an integer multiple of the primitive "
                       "lattice %s: supercell vector %d is %.6g %.6g %.6g primitive vectors. "
                       "Give the supercell that was built from this primitive cell, in the same "
                       "orientation (a rotated or strained copy does not map)",
                       sc, pc, i + 1, fm[i][0], fm[i][1], fm[i][2]);
          return NULL;
        }
    }
  det = qv_supercell_matrix_det (map->matrix);
  if (det <= 0 || det > MAX_DET)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "the supercell matrix [%d %d %d; %d %d %d; %d %d %d] has determinant %" G_GINT64_FORMAT
                   ": it must be positive (a right-handed supercell of the same handedness as the "
                   "primitive cell) and at most %d",
                   map->matrix[0][0], map->matrix[0][1], map->matrix[0][2], map->matrix[1][0],
                   map->matrix[1][1], map->matrix[1][2], map->matrix[2][0], map->matrix[2][1],
                   map->matrix[2][2], det, MAX_DET);
      return NULL;
    }
  if (s->n_atoms != (gsize) det * n)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "wrong supercell size: its cell is %" G_GINT64_FORMAT " primitive cells "
                   "(matrix [%d %d %d; %d %d %d; %d %d %d]) of %" G_GSIZE_FORMAT " atoms, so it "
                   "needs %" G_GUINT64_FORMAT " atoms, but it has %" G_GSIZE_FORMAT ". Check that "
                   "the supercell file is complete and belongs to this primitive cell",
                   det, map->matrix[0][0], map->matrix[0][1], map->matrix[0][2], map->matrix[1][0],
                   map->matrix[1][1], map->matrix[1][2], map->matrix[2][0], map->matrix[2][1],
                   map->matrix[2][2], n, (guint64) det * n, s->n_atoms);
      return NULL;
    }

  map->n_primitive = n;
  map->n_cells = (gsize) det;
  map->n_atoms = s->n_atoms;
  memcpy (map->primitive_cell, p->cell, sizeof map->primitive_cell);
  memcpy (map->supercell, s->cell, sizeof map->supercell);
  {
    /* reduce the exact M·a, not the file's rounded supercell vectors */
    double exact[3][3];
    for (int i = 0; i < 3; i++)
      for (int c = 0; c < 3; c++)
        exact[i][c] = map->matrix[i][0] * p->cell[0][c] + map->matrix[i][1] * p->cell[1][c]
                    + map->matrix[i][2] * p->cell[2][c];
    qv_lattice_reduce (exact, map->reduced, NULL);
  }
  map->positions = g_new (double, 3 * n);
  map->masses = g_new (double, n);
  map->z = g_new (guint, n);
  frac = g_new (double, 3 * n);
  for (gsize k = 0; k < n; k++)
    {
      memcpy (map->positions + 3 * k, p->atoms[k].position, 3 * sizeof (double));
      map->masses[k] = p->atoms[k].mass;
      map->z[k] = p->atoms[k].z;
      for (int j = 0; j < 3; j++)
        frac[3 * k + j] = dot3 (p->atoms[k].position, b[j]) / (2 * G_PI);
    }
  modulus_init (&mod, map->matrix);
  map->cells = modulus_enumerate (&mod);
  map->site = g_new (guint, s->n_atoms);
  map->translation = g_new (int, 3 * s->n_atoms);
  map->cell = g_new (gsize, s->n_atoms);
  map->atom = g_new (gsize, s->n_atoms);
  for (gsize i = 0; i < s->n_atoms; i++)
    map->atom[i] = G_MAXSIZE;

  for (gsize i = 0; i < s->n_atoms; i++)
    {
      const double *r = s->atoms[i].position;
      double f[3], best = G_MAXDOUBLE;
      gssize found = -1, nearest = -1;
      int nf[3] = { 0, 0, 0 };
      for (int j = 0; j < 3; j++)
        f[j] = dot3 (r, b[j]) / (2 * G_PI);
      for (gsize k = 0; k < n; k++)
        {
          double d[3], res[3], dist;
          int nk[3];
          for (int j = 0; j < 3; j++)
            {
              d[j] = f[j] - frac[3 * k + j];
              if (!(fabs (d[j]) < 1e6))
                {
                  g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                               "supercell atom %" G_GSIZE_FORMAT " is at a position that is not "
                               "finite or is far outside the cell", i + 1);
                  return NULL;
                }
              nk[j] = (int) lround (d[j]);
            }
          for (int c = 0; c < 3; c++)
            res[c] = (d[0] - nk[0]) * p->cell[0][c] + (d[1] - nk[1]) * p->cell[1][c]
                   + (d[2] - nk[2]) * p->cell[2][c];
          dist = sqrt (dot3 (res, res));
          if (dist < best && s->atoms[i].z == p->atoms[k].z)
            {
              best = dist;
              nearest = (gssize) k;
            }
          if (dist > tol)
            continue;
          if (s->atoms[i].z != p->atoms[k].z)
            {
              g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                           "supercell atom %" G_GSIZE_FORMAT " (Z = %u) sits on primitive site %"
                           G_GSIZE_FORMAT ", which holds Z = %u: the element differs", i + 1,
                           s->atoms[i].z, k + 1, p->atoms[k].z);
              return NULL;
            }
          if (found >= 0)
            {
              g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                           "supercell atom %" G_GSIZE_FORMAT " matches two primitive sites, %"
                           G_GSIZE_FORMAT " and %" G_GSIZE_FORMAT ", within the tolerance %.3g Å: "
                           "the primitive cell holds two atoms at the same place (or lower "
                           "--tolerance)", i + 1, (gsize) found + 1, k + 1, tol);
              return NULL;
            }
          found = (gssize) k;
          memcpy (nf, nk, sizeof nf);
          worst = MAX (worst, dist);
        }
      if (found < 0)
        {
          if (nearest >= 0)
            g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                         "supercell atom %" G_GSIZE_FORMAT " at %.6f %.6f %.6f Å matches no "
                         "primitive site: the nearest of its element (site %" G_GSIZE_FORMAT
                         ") is %.3g Å away, the tolerance %.3g Å. Use the relaxed primitive cell "
                         "the supercell was built from, or raise --tolerance",
                         i + 1, r[0], r[1], r[2], (gsize) nearest + 1, best, tol);
          else
            g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                         "supercell atom %" G_GSIZE_FORMAT " (Z = %u) matches no primitive site: "
                         "the primitive cell has no atom of that element", i + 1, s->atoms[i].z);
          return NULL;
        }
      {
        gsize l = qv_supercell_map_class (map, nf);
        gsize slot = l * n + (gsize) found;
        if (map->atom[slot] != G_MAXSIZE)
          {
            const int *c = map->cells + 3 * l;
            g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                         "supercell atoms %" G_GSIZE_FORMAT " and %" G_GSIZE_FORMAT " both sit on "
                         "primitive site %" G_GSIZE_FORMAT " of lattice point (%d %d %d): an atom "
                         "is duplicated (another missing), or the supercell was not built from "
                         "this primitive cell", map->atom[slot] + 1, i + 1, (gsize) found + 1,
                         c[0], c[1], c[2]);
            return NULL;
          }
        map->atom[slot] = i;
        map->site[i] = (guint) found;
        memcpy (map->translation + 3 * i, nf, sizeof nf);
        map->cell[i] = l;
      }
    }
  map->max_residual = worst;
  return g_steal_pointer (&map);
}
