/* fuzz-born-file.c — Born effective charges and the dielectric tensor
 * (qv_born_charges_read_data).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include "qv-fuzz.h"
#include "qv-born-file.h"

gboolean
qv_fuzz_read (const guint8 *data, gsize size)
{
  GError *error = NULL;
  QvBornCharges *born = qv_born_charges_read_data ((const char *) data, size, QV_FUZZ_NAME,
                                                   &error);

  qv_fuzz_check_failure ("born-file", born == NULL, error, QV_FUZZ_NAME);
  if (born == NULL)
    return FALSE;
  qv_fuzz_assert ("born-file", born->n_atoms > 0 && born->born != NULL, "no charges");
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      qv_fuzz_assert ("born-file", isfinite (born->epsilon[i][j]), "epsilon not finite");
  for (gsize i = 0; i < 9 * born->n_atoms; i++)
    qv_fuzz_assert ("born-file", isfinite (born->born[i]), "a charge not finite");
  qv_born_charges_free (born);
  return TRUE;
}
