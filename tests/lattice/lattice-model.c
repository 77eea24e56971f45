/* lattice-model.c — spring models of crystals for the lattice tests.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "lattice-model.h"

QvStructure *
lattice_model_structure (const double cell[3][3], gsize n, const guint *z, const double *m,
                         const double *r)
{
  QvStructure *s = qv_structure_new (n, NULL);
  s->has_cell = TRUE;
  memcpy (s->cell, cell, sizeof s->cell);
  s->pbc[0] = s->pbc[1] = s->pbc[2] = TRUE;
  for (gsize i = 0; i < n; i++)
    {
      qv_structure_set_element (s, i, z[i], NULL);
      qv_structure_set_mass (s, i, m[i], NULL);
      memcpy (s->atoms[i].position, r + 3 * i, 3 * sizeof (double));
    }
  return s;
}

QvHessian *
lattice_model_hessian (const QvStructure *s, const LatticeShell *shells, gsize n_shells)
{
  gsize n = 3 * s->n_atoms;
  QvHessian *h = qv_hessian_new (n, TRUE, NULL);

  for (gsize i = 0; i < s->n_atoms; i++)
    for (gsize j = i + 1; j < s->n_atoms; j++)
      for (int a = -2; a <= 2; a++)
        for (int b = -2; b <= 2; b++)
          for (int c = -2; c <= 2; c++)
            {
              double d[3], len;
              for (int x = 0; x < 3; x++)
                d[x] = s->atoms[j].position[x] - s->atoms[i].position[x]
                     + a * s->cell[0][x] + b * s->cell[1][x] + c * s->cell[2][x];
              len = sqrt (d[0] * d[0] + d[1] * d[1] + d[2] * d[2]);
              for (gsize k = 0; k < n_shells; k++)
                {
                  const LatticeShell *sh = &shells[k];
                  gboolean species = (sh->z1 == 0 && sh->z2 == 0)
                    || (s->atoms[i].z == sh->z1 && s->atoms[j].z == sh->z2)
                    || (s->atoms[i].z == sh->z2 && s->atoms[j].z == sh->z1);
                  if (!species || fabs (len - sh->distance) > 1e-6)
                    continue;
                  for (int x = 0; x < 3; x++)
                    for (int y = 0; y < 3; y++)
                      {
                        double e = d[x] * d[y] / (len * len);
                        double kxy = sh->longitudinal * e + sh->transverse * ((x == y) - e);
                        h->data[(3 * i + x) + (3 * i + y) * n] += kxy;
                        h->data[(3 * j + x) + (3 * j + y) * n] += kxy;
                        h->data[(3 * i + x) + (3 * j + y) * n] -= kxy;
                        h->data[(3 * j + x) + (3 * i + y) * n] -= kxy;
                      }
                }
            }
  return h;
}
