/* qv-stencil.c — central-difference stencil and Hessian assembly (see
 * qv-stencil.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include "qv-error.h"
#include "qv-stencil.h"

static int
compare_gsize (gconstpointer a, gconstpointer b)
{
  const gsize x = *(const gsize *) a, y = *(const gsize *) b;
  return x < y ? -1 : x > y;
}

QvStencil *
qv_stencil_new (gsize n_atoms, double step, const gsize *atoms, gsize n_selected,
                GError **error)
{
  QvStencil *st;

  if (!(step > 0.0 && step <= QV_STENCIL_MAX_STEP))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "the step must be a length in Å above 0 and at most %g, got %g",
                   QV_STENCIL_MAX_STEP, step);
      return NULL;
    }
  if (n_atoms == 0 || n_atoms > G_MAXSIZE / 64)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "a stencil needs 1 or more atoms");
      return NULL;
    }
  if (atoms && n_selected == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "no atom selected for the stencil");
      return NULL;
    }
  for (gsize i = 0; atoms && i < n_selected; i++)
    if (atoms[i] >= n_atoms)
      {
        g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                     "atom %" G_GSIZE_FORMAT " is not in the structure (atoms 1 to %" G_GSIZE_FORMAT ")",
                     atoms[i] + 1, n_atoms);
        return NULL;
      }

  st = g_new0 (QvStencil, 1);
  st->n_atoms = n_atoms;
  st->step = step;
  if (atoms == NULL)
    {
      st->n_selected = n_atoms;
      st->atoms = g_new (gsize, n_atoms);
      for (gsize a = 0; a < n_atoms; a++)
        st->atoms[a] = a;
    }
  else
    {
      st->atoms = g_memdup2 (atoms, sizeof (gsize) * n_selected);
      qsort (st->atoms, n_selected, sizeof (gsize), compare_gsize);
      for (gsize i = 0; i < n_selected; i++)
        if (st->n_selected == 0 || st->atoms[st->n_selected - 1] != st->atoms[i])
          st->atoms[st->n_selected++] = st->atoms[i];
    }
  st->n_displacements = 6 * st->n_selected;
  return st;
}

void
qv_stencil_free (QvStencil *stencil)
{
  if (stencil == NULL)
    return;
  g_free (stencil->atoms);
  g_free (stencil);
}

gboolean
qv_stencil_is_complete (const QvStencil *stencil)
{
  return stencil->n_selected == stencil->n_atoms;
}

void
qv_stencil_displacement (const QvStencil *st, gsize d, gsize *atom, int *axis, int *sign)
{
  g_return_if_fail (d < st->n_displacements);
  if (atom)
    *atom = st->atoms[d / 6];
  if (axis)
    *axis = (int) ((d / 2) % 3);
  if (sign)
    *sign = d % 2 ? -1 : 1;
}

void
qv_stencil_positions (const QvStencil *st, const QvStructure *reference, gsize d,
                      double *positions)
{
  gsize atom;
  int axis, sign;

  for (gsize a = 0; a < reference->n_atoms; a++)
    memcpy (positions + 3 * a, reference->atoms[a].position, sizeof (double) * 3);
  qv_stencil_displacement (st, d, &atom, &axis, &sign);
  positions[3 * atom + axis] += sign * st->step;
}

QvHessian *
qv_stencil_assemble (const QvStencil *st, const double *forces, double *asymmetry,
                     const QvProgress *progress, GError **error)
{
  const gsize n_full = 3 * st->n_atoms;
  const gsize n = 3 * st->n_selected;
  g_autoptr(QvHessian) h = NULL;
  const double inv2h = 1.0 / (2.0 * st->step);
  double asym;

  for (gsize d = 0; d < st->n_displacements; d++)
    for (gsize j = 0; j < n_full; j++)
      if (!isfinite (forces[d * n_full + j]))
        {
          gsize atom;
          int axis, sign;
          qv_stencil_displacement (st, d, &atom, &axis, &sign);
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                       "displacement %" G_GSIZE_FORMAT " (atom %" G_GSIZE_FORMAT " %c%c): "
                       "force on atom %" G_GSIZE_FORMAT " is not a finite number",
                       d + 1, atom + 1, sign > 0 ? '+' : '-', "xyz"[axis], j / 3 + 1);
          return NULL;
        }

  h = qv_hessian_new (n, FALSE, error);
  if (h == NULL)
    return NULL;
  h->layout = QV_HESSIAN_LAYOUT_FULL;
  /* Row r of H (displaced coordinate r), column c (force component c),
   * both within the selected coordinates; stored column-major. */
  for (gsize r = 0; r < n; r++)
    {
      const double *fp = forces + (2 * r) * n_full;
      const double *fm = forces + (2 * r + 1) * n_full;

      if ((r & 63) == 0 && !qv_progress_report (progress, (double) r / (double) n,
                                                "assembling the Hessian", error))
        return NULL;
      for (gsize c = 0; c < n; c++)
        {
          const gsize j = 3 * st->atoms[c / 3] + c % 3;
          h->data[c * n + r] = -(fp[j] - fm[j]) * inv2h;
        }
    }
  asym = qv_hessian_symmetrize (h);
  if (asymmetry)
    *asymmetry = asym;
  if (!qv_progress_report (progress, 1.0, "assembling the Hessian", error))
    return NULL;
  return g_steal_pointer (&h);
}

QvStructure *
qv_stencil_selected_structure (const QvStencil *st, const QvStructure *reference)
{
  QvStructure *s = qv_structure_new (st->n_selected, NULL);

  for (gsize i = 0; i < st->n_selected; i++)
    {
      const QvAtom *src = &reference->atoms[st->atoms[i]];
      QvAtom *dst = &s->atoms[i];
      dst->z = src->z;
      dst->mass = src->mass;
      dst->mass_number = src->mass_number;
      memcpy (dst->position, src->position, sizeof dst->position);
      dst->label = g_strdup (src->label);
    }
  s->has_cell = reference->has_cell;
  memcpy (s->cell, reference->cell, sizeof s->cell);
  memcpy (s->pbc, reference->pbc, sizeof s->pbc);
  if (reference->forces)
    {
      s->forces = g_new (double, 3 * st->n_selected);
      for (gsize i = 0; i < st->n_selected; i++)
        memcpy (s->forces + 3 * i, reference->forces + 3 * st->atoms[i], sizeof (double) * 3);
    }
  return s;
}

gboolean
qv_stencil_parse_atoms (const char *text, gsize n_atoms, gsize **atoms, gsize *n_selected,
                        GError **error)
{
  g_autoptr(GArray) out = g_array_new (FALSE, FALSE, sizeof (gsize));
  g_auto(GStrv) parts = NULL;
  g_autoptr(GString) compact = g_string_new (NULL);

  for (const char *c = text; *c; c++)
    if (*c != ' ' && *c != '\t')
      g_string_append_c (compact, *c);
  parts = g_strsplit (compact->str, ",", -1);
  if (g_strv_length (parts) == 1 && g_ascii_strcasecmp (g_strstrip (parts[0]), "all") == 0)
    {
      for (gsize a = 0; a < n_atoms; a++)
        g_array_append_val (out, a);
    }
  else
    for (char **p = parts; *p; p++)
      {
        char *part = g_strstrip (*p);
        char *end = NULL, *dash;
        guint64 lo, hi;

        if (*part == '\0')
          {
            g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                         "atom selection '%s': an empty item (atoms are listed as 1,3-5)", text);
            return FALSE;
          }
        dash = strchr (part + 1, '-');
        lo = g_ascii_strtoull (part, &end, 10);
        if (end == part || (dash ? end != dash : *end != '\0') || part[0] == '-' || part[0] == '+')
          goto bad;
        hi = lo;
        if (dash)
          {
            char *start = dash + 1;
            if (*start == '-' || *start == '+')
              goto bad;
            hi = g_ascii_strtoull (start, &end, 10);
            if (end == start || *end != '\0')
              goto bad;
          }
        if (lo < 1 || hi > n_atoms || lo > hi)
          {
            g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                         "atom selection '%s': '%s' is not within atoms 1 to %" G_GSIZE_FORMAT
                         "%s", text, part, n_atoms, lo > hi ? " (a range goes from low to high)" : "");
            return FALSE;
          }
        for (guint64 a = lo; a <= hi; a++)
          {
            gsize i = (gsize) a - 1;
            g_array_append_val (out, i);
          }
        continue;
      bad:
        g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                     "atom selection '%s': cannot read '%s' (atoms are listed as 1,3-5, from 1)",
                     text, part);
        return FALSE;
      }
  if (out->len == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "atom selection '%s' selects no atom", text);
      return FALSE;
    }
  *n_selected = out->len;
  *atoms = (gsize *) (void *) g_array_free (g_steal_pointer (&out), FALSE);
  return TRUE;
}

char *
qv_stencil_format_atoms (const QvStencil *st)
{
  GString *s;

  if (qv_stencil_is_complete (st))
    return g_strdup ("all");
  s = g_string_new (NULL);
  for (gsize i = 0; i < st->n_selected; i++)
    {
      gsize j = i;
      while (j + 1 < st->n_selected && st->atoms[j + 1] == st->atoms[j] + 1)
        j++;
      if (s->len)
        g_string_append_c (s, ',');
      if (j == i)
        g_string_append_printf (s, "%" G_GSIZE_FORMAT, st->atoms[i] + 1);
      else
        g_string_append_printf (s, "%" G_GSIZE_FORMAT "-%" G_GSIZE_FORMAT,
                                st->atoms[i] + 1, st->atoms[j] + 1);
      i = j;
    }
  return g_string_free (s, FALSE);
}
