/* fuzz-cif.c — CIF 1.1 crystal structures (qv_cif_read_data): the syntax
 * (blocks, loops, quotes, text fields), the cell, the sites and the symmetry
 * operators expanded into the cell, with the first block that has sites and
 * with a named block. Each operator string the input holds is also given to
 * qv_cif_parse_operator alone.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-fuzz.h"
#include "qv-cif.h"

static gboolean
read_once (const guint8 *data, gsize size, const QvCifOptions *options)
{
  GError *error = NULL;
  QvStructure *s = qv_cif_read_data ((const char *) data, size, QV_FUZZ_NAME, options, &error);

  qv_fuzz_check_failure ("cif", s == NULL, error, QV_FUZZ_NAME);
  if (s == NULL)
    return FALSE;
  qv_fuzz_assert ("cif", s->n_atoms > 0 && s->has_cell, "no atoms or no cell");
  for (gsize a = 0; a < s->n_atoms; a++)
    {
      qv_fuzz_assert ("cif", s->atoms[a].z >= 1 && s->atoms[a].z <= 118, "atomic number");
      for (int k = 0; k < 3; k++)
        qv_fuzz_assert ("cif", isfinite (s->atoms[a].position[k]), "position not finite");
    }
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      qv_fuzz_assert ("cif", isfinite (s->cell[i][j]), "cell not finite");
  qv_structure_free (s);
  return TRUE;
}

/* Every line of the input as an operator: checks the parser's own contract
 * (an error offset inside the text). */
static void
parse_operators (const guint8 *data, gsize size)
{
  g_autofree char *text = g_strndup ((const char *) data, size);
  g_auto(GStrv) lines = g_strsplit (text, "\n", 64);

  for (guint i = 0; lines[i] != NULL; i++)
    {
      QvCifOperator op;
      gsize offset = G_MAXSIZE;
      GError *error = NULL;
      gboolean ok = qv_cif_parse_operator (lines[i], &op, &offset, &error);

      if (ok)
        {
          qv_fuzz_assert ("cif", error == NULL, "an operator and an error at once");
          for (int k = 0; k < 3; k++)
            qv_fuzz_assert ("cif", isfinite (op.translation[k]), "translation not finite");
        }
      else
        {
          qv_fuzz_assert ("cif", error != NULL, "refused without an error");
          qv_fuzz_assert ("cif", offset <= strlen (lines[i]), "error offset past the text");
          g_error_free (error);
        }
    }
}

gboolean
qv_fuzz_read (const guint8 *data, gsize size)
{
  const QvCifOptions named = { .block = "fuzz", .merge_tolerance = 0.5 };
  gboolean read = read_once (data, size, NULL);

  read_once (data, size, &named);
  parse_operators (data, size);
  return read;
}
