/* qv-bonds.c — bond perception from covalent radii with a cell list.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdlib.h>
#include "qv-bonds.h"
#include "qv-element.h"

/* Cell coordinates are packed into 21 bits each of a 64-bit key. */
#define CELL_BITS 21
#define CELL_MAX ((1u << CELL_BITS) - 3)

typedef struct {
  guint64 key;
  guint32 atom;
} CellEntry;

double
qv_bonds_radius (guint z)
{
  const QvElement *e = qv_element_from_z (z);

  if (e == NULL || !isfinite (e->covalent_radius))
    return QV_BONDS_FALLBACK_RADIUS;
  return e->covalent_radius;
}

static int
compare_entry (const void *pa, const void *pb)
{
  const CellEntry *a = pa, *b = pb;

  if (a->key != b->key)
    return a->key < b->key ? -1 : 1;
  return a->atom < b->atom ? -1 : (a->atom > b->atom);
}

static int
compare_bond (const void *pa, const void *pb)
{
  const QvBond *a = pa, *b = pb;

  if (a->a != b->a)
    return a->a < b->a ? -1 : 1;
  return a->b < b->b ? -1 : (a->b > b->b);
}

static guint64
pack (guint64 x, guint64 y, guint64 z)
{
  return (x << (2 * CELL_BITS)) | (y << CELL_BITS) | z;
}

/* First entry with key ≥ @key. */
static gsize
lower_bound (const CellEntry *cells, gsize n, guint64 key)
{
  gsize lo = 0, hi = n;

  while (lo < hi)
    {
      gsize mid = lo + (hi - lo) / 2;
      if (cells[mid].key < key)
        lo = mid + 1;
      else
        hi = mid;
    }
  return lo;
}

QvBond *
qv_bonds_perceive_points (const double *positions, const double *radii,
                          gsize n, double tolerance, gsize *n_bonds)
{
  double lo[3] = { INFINITY, INFINITY, INFINITY }, hi[3] = { -INFINITY, -INFINITY, -INFINITY };
  double rmax = 0.0, cell, scale = 1.0 + MAX (tolerance, 0.0);
  CellEntry *cells;
  guint32 *coords;
  gsize n_cells = 0;
  GArray *bonds;

  *n_bonds = 0;
  if (n < 2)
    return NULL;
  g_return_val_if_fail (n <= G_MAXUINT32, NULL);
  for (gsize i = 0; i < n; i++)
    {
      const double *p = positions + 3 * i;
      if (!isfinite (p[0]) || !isfinite (p[1]) || !isfinite (p[2]) || !isfinite (radii[i]))
        continue;
      for (int k = 0; k < 3; k++)
        {
          lo[k] = MIN (lo[k], p[k]);
          hi[k] = MAX (hi[k], p[k]);
        }
      rmax = MAX (rmax, radii[i]);
    }
  if (!(rmax > 0.0))
    return NULL;
  /* A cube as large as the longest possible bond: bonded atoms are in the
   * same or adjacent cubes. Very sparse clouds get larger cubes so that the
   * coordinates fit their bits. */
  cell = 2.0 * rmax * scale;
  for (int k = 0; k < 3; k++)
    if ((hi[k] - lo[k]) / cell > CELL_MAX)
      cell = (hi[k] - lo[k]) / CELL_MAX;

  cells = g_new (CellEntry, n);
  coords = g_new (guint32, 3 * n);
  for (gsize i = 0; i < n; i++)
    {
      const double *p = positions + 3 * i;
      guint32 c[3];
      if (!isfinite (p[0]) || !isfinite (p[1]) || !isfinite (p[2]) || !isfinite (radii[i]))
        continue;
      for (int k = 0; k < 3; k++)
        {
          double f = floor ((p[k] - lo[k]) / cell);
          c[k] = (guint32) CLAMP (f, 0.0, (double) CELL_MAX) + 1;   /* ≥ 1: room for −1 */
          coords[3 * i + k] = c[k];
        }
      cells[n_cells].key = pack (c[0], c[1], c[2]);
      cells[n_cells].atom = (guint32) i;
      n_cells++;
    }
  qsort (cells, n_cells, sizeof *cells, compare_entry);

  bonds = g_array_new (FALSE, FALSE, sizeof (QvBond));
  for (gsize e = 0; e < n_cells; e++)
    {
      guint32 i = cells[e].atom;
      const double *pi = positions + 3 * i;
      const guint32 *c = coords + 3 * i;

      for (int dx = -1; dx <= 1; dx++)
        for (int dy = -1; dy <= 1; dy++)
          for (int dz = -1; dz <= 1; dz++)
            {
              guint64 key = pack (c[0] + dx, c[1] + dy, c[2] + dz);
              for (gsize f = lower_bound (cells, n_cells, key);
                   f < n_cells && cells[f].key == key; f++)
                {
                  guint32 j = cells[f].atom;
                  const double *pj = positions + 3 * j;
                  double d2, cut;

                  if (j <= i)
                    continue;
                  d2 = (pi[0] - pj[0]) * (pi[0] - pj[0]) + (pi[1] - pj[1]) * (pi[1] - pj[1])
                       + (pi[2] - pj[2]) * (pi[2] - pj[2]);
                  cut = (radii[i] + radii[j]) * scale;
                  if (d2 > 0.0 && d2 < cut * cut)
                    {
                      QvBond b = { i, j };
                      g_array_append_val (bonds, b);
                    }
                }
            }
    }
  g_free (cells);
  g_free (coords);
  *n_bonds = bonds->len;
  if (bonds->len == 0)
    {
      g_array_free (bonds, TRUE);
      return NULL;
    }
  qsort (bonds->data, bonds->len, sizeof (QvBond), compare_bond);
  return (QvBond *) g_array_free (bonds, FALSE);
}

QvBond *
qv_bonds_perceive (const QvStructure *structure, double tolerance, gsize *n_bonds)
{
  gsize n = structure->n_atoms;
  double *pos = g_new (double, 3 * MAX (n, 1));
  double *radii = g_new (double, MAX (n, 1));
  QvBond *bonds;

  for (gsize i = 0; i < n; i++)
    {
      for (int k = 0; k < 3; k++)
        pos[3 * i + k] = structure->atoms[i].position[k];
      radii[i] = qv_bonds_radius (structure->atoms[i].z);
    }
  bonds = qv_bonds_perceive_points (pos, radii, n, tolerance, n_bonds);
  g_free (pos);
  g_free (radii);
  return bonds;
}
