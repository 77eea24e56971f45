/* fuzz-xyz.c — XYZ and extended XYZ (qv_xyz_read_data): plain frames,
 * multi-frame scans, the comment line's key=value pairs (Lattice, pbc,
 * Properties, energy).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include "qv-fuzz.h"
#include "qv-element.h"
#include "qv-xyz.h"

static void
check_structure (const QvStructure *s)
{
  qv_fuzz_assert ("xyz", s != NULL && s->n_atoms > 0, "a frame without atoms");
  for (gsize a = 0; a < s->n_atoms; a++)
    {
      const QvAtom *atom = &s->atoms[a];

      qv_fuzz_assert ("xyz", atom->z >= 1 && atom->z <= 118, "atomic number out of range");
      qv_fuzz_assert ("xyz", isfinite (atom->mass) && atom->mass > 0, "mass not positive");
      for (int k = 0; k < 3; k++)
        qv_fuzz_assert ("xyz", isfinite (atom->position[k]), "position not finite");
      if (s->forces != NULL)
        for (int k = 0; k < 3; k++)
          qv_fuzz_assert ("xyz", isfinite (s->forces[3 * a + k]), "force not finite");
    }
  if (s->has_cell)
    for (int i = 0; i < 3; i++)
      for (int j = 0; j < 3; j++)
        qv_fuzz_assert ("xyz", isfinite (s->cell[i][j]), "cell not finite");
  if (s->has_energy)
    qv_fuzz_assert ("xyz", isfinite (s->energy), "energy not finite");
}

gboolean
qv_fuzz_read (const guint8 *data, gsize size)
{
  GError *error = NULL;
  GPtrArray *frames = qv_xyz_read_data ((const char *) data, size, QV_FUZZ_NAME, &error);

  qv_fuzz_check_failure ("xyz", frames == NULL, error, QV_FUZZ_NAME);
  if (frames == NULL)
    return FALSE;
  qv_fuzz_assert ("xyz", frames->len > 0, "no frames");
  for (guint i = 0; i < frames->len; i++)
    check_structure (frames->pdata[i]);
  g_ptr_array_unref (frames);
  return TRUE;
}
