/* qv-symmetry-modes.c — irreducible representations of normal modes from
 * the characters of the symmetry operations on their displacements,
 * reduced by the orthogonality of characters (Cotton, Chemical Applications
 * of Group Theory, 3rd ed., §4.3, the reduction formula).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-symmetry-modes.h"

#define MAX_SET 8

void
qv_symmetry_mode_characters (const QvPointGroup *g, const QvModeSet *modes, gsize first, gsize n,
                             double *chi)
{
  gsize na = g->n_atoms;
  for (gsize k = 0; k < g->order; k++)
    {
      const double *r = g->operations + 9 * k;
      const gsize *perm = g->permutations + k * na;
      double sum = 0;
      for (gsize m = first; m < first + n; m++)
        {
          const double *l = qv_mode_set_vector (modes, m);
          for (gsize a = 0; a < na; a++)
            {
              const double *la = l + 3 * a, *lb = l + 3 * perm[a];
              for (int i = 0; i < 3; i++)
                sum += lb[i] * (r[3 * i] * la[0] + r[3 * i + 1] * la[1] + r[3 * i + 2] * la[2]);
            }
        }
      chi[k] = sum;
    }
}

/* Reduces modes first … first+n−1; TRUE with @label etc. when whole. */
static gboolean
try_set (const QvSymmetryReport *rep, const QvModeSet *modes, const gsize *classes, gsize first,
         gsize n, double *chi, double *mult, QvModeSymmetry *out)
{
  const QvCharacterTable *t = rep->table;
  qv_symmetry_mode_characters (rep->group, modes, first, n, chi);
  qv_character_table_reduce (t, rep->group, classes, chi, mult);
  double residual = 0, dim = 0;
  for (gsize i = 0; i < qv_character_table_n_irreps (t); i++)
    {
      residual = MAX (residual, fabs (mult[i] - round (mult[i])));
      dim += round (mult[i]) * qv_character_table_character (t, i, 0);
    }
  out->residual = residual;
  if (residual > QV_SYMMETRY_INTEGRAL_TOLERANCE || fabs (dim - (double) n) > 0.5)
    return FALSE;
  GString *label = g_string_new (NULL);
  out->ir_active = out->raman_active = FALSE;
  for (gsize i = 0; i < qv_character_table_n_irreps (t); i++)
    {
      long c = lround (mult[i]);
      if (c <= 0)
        continue;
      if (label->len)
        g_string_append (label, " + ");
      if (c > 1)
        g_string_append_printf (label, "%ld", c);
      g_string_append (label, qv_character_table_label (t, i));
      out->ir_active |= qv_character_table_ir_active (t, i);
      out->raman_active |= qv_character_table_raman_active (t, i);
    }
  out->label = g_string_free (label, FALSE);
  out->defined = TRUE;
  out->first = first;
  out->size = n;
  return TRUE;
}

QvSymmetryReport *
qv_symmetry_report_new (const QvPointGroup *g, const QvModeSet *modes)
{
  QvSymmetryReport *rep = g_new0 (QvSymmetryReport, 1);
  GPtrArray *warn = g_ptr_array_new ();
  rep->group = g;
  rep->n_modes = modes->n_modes;
  rep->modes = g_new0 (QvModeSymmetry, modes->n_modes);
  rep->table = qv_character_table_lookup (g->name);
  g_autofree gsize *classes = g_new (gsize, g->order);
  g_autoptr(GError) error = NULL;
  if (rep->table && !qv_character_table_classify (rep->table, g, classes, &error))
    {
      g_ptr_array_add (warn, g_strdup_printf ("symmetry: %s; modes are not labelled", error->message));
      rep->table = NULL;
    }
  else if (rep->table == NULL)
    g_ptr_array_add (warn, g_strdup_printf ("symmetry: no character table for %s in this build; "
                                            "modes are not labelled", g->name));
  if (modes->n_atoms != g->n_atoms)
    {
      g_ptr_array_add (warn, g_strdup ("symmetry: the modes are not of the structure the group was found for"));
      rep->table = NULL;
    }
  g_autofree double *chi = g_new (double, g->order);
  g_autofree double *mult = rep->table ? g_new (double, qv_character_table_n_irreps (rep->table)) : NULL;
  gsize n_unknown = 0, first_unknown = 0;
  for (gsize k = 0; k < modes->n_modes;)
    {
      QvModeSymmetry *m = &rep->modes[k];
      gboolean ok = FALSE;
      if (rep->table)
        {
          double nu = qv_mode_set_wavenumber (modes, k);
          double window = MAX (1.0, 2e-3 * fabs (nu));
          for (gsize n = 1; n <= MAX_SET && k + n <= modes->n_modes && !ok; n++)
            {
              if (fabs (qv_mode_set_wavenumber (modes, k + n - 1) - nu) > window)
                break;
              ok = try_set (rep, modes, classes, k, n, chi, mult, m);
            }
        }
      if (ok)
        {
          for (gsize j = k + 1; j < k + m->size; j++)
            {
              rep->modes[j] = *m;
              rep->modes[j].label = g_strdup (m->label);
            }
          k += m->size;
        }
      else
        {
          m->label = g_strdup ("?");
          m->defined = FALSE;
          m->first = k;
          m->size = 1;
          if (rep->table)
            {
              if (n_unknown++ == 0)
                first_unknown = k;
            }
          k++;
        }
    }
  if (n_unknown)
    g_ptr_array_add (warn, g_strdup_printf (
      "symmetry: %" G_GSIZE_FORMAT " mode(s) (the first: mode %" G_GSIZE_FORMAT ") have no whole "
      "species of %s: the Hessian's symmetry is broken beyond the geometry's tolerance of %g Å; "
      "--symmetrize averages it over the group", n_unknown, first_unknown + 1, g->name, g->tolerance));
  g_ptr_array_add (warn, NULL);
  rep->warnings = (char **) g_ptr_array_free (warn, FALSE);
  return rep;
}

void
qv_symmetry_report_free (QvSymmetryReport *rep)
{
  if (rep == NULL)
    return;
  for (gsize k = 0; k < rep->n_modes; k++)
    g_free (rep->modes[k].label);
  g_free (rep->modes);
  g_strfreev (rep->warnings);
  g_free (rep);
}

/* Eigen-decomposition of a small symmetric matrix by Jacobi rotations:
 * @a n×n (destroyed), @v n×n columns, values on a's diagonal. */
static void
jacobi (double *a, double *v, gsize n)
{
  for (gsize i = 0; i < n * n; i++)
    v[i] = (i % (n + 1)) == 0;
  for (int sweep = 0; sweep < 60; sweep++)
    {
      double off = 0;
      for (gsize p = 0; p < n; p++)
        for (gsize q = p + 1; q < n; q++)
          off += fabs (a[p * n + q]);
      if (off < 1e-14)
        return;
      for (gsize p = 0; p < n; p++)
        for (gsize q = p + 1; q < n; q++)
          {
            double apq = a[p * n + q];
            if (fabs (apq) < 1e-300)
              continue;
            double theta = (a[q * n + q] - a[p * n + p]) / (2 * apq);
            double t = (theta >= 0 ? 1 : -1) / (fabs (theta) + sqrt (theta * theta + 1));
            double c = 1 / sqrt (t * t + 1), s = t * c;
            for (gsize k = 0; k < n; k++)
              {
                double akp = a[k * n + p], akq = a[k * n + q];
                a[k * n + p] = c * akp - s * akq;
                a[k * n + q] = s * akp + c * akq;
              }
            for (gsize k = 0; k < n; k++)
              {
                double apk = a[p * n + k], aqk = a[q * n + k];
                a[p * n + k] = c * apk - s * aqk;
                a[q * n + k] = s * apk + c * aqk;
              }
            for (gsize k = 0; k < n; k++)
              {
                double vkp = v[k * n + p], vkq = v[k * n + q];
                v[k * n + p] = c * vkp - s * vkq;
                v[k * n + q] = s * vkp + c * vkq;
              }
          }
    }
}

gsize
qv_symmetry_align_degenerate (const QvSymmetryReport *rep, QvModeSet *modes)
{
  const QvPointGroup *g = rep->group;
  if (rep->table == NULL || modes->n_atoms != g->n_atoms)
    return 0;
  gsize na = g->n_atoms, dim = 3 * na, aligned = 0;
  g_autofree gsize *classes = g_new (gsize, g->order);
  if (!qv_character_table_classify (rep->table, g, classes, NULL))
    return 0;
  g_autofree double *tl = g_new (double, dim * 3);
  g_autofree double *old = g_new (double, dim * 3);
  for (gsize k = 0; k < rep->n_modes; k++)
    {
      const QvModeSymmetry *m = &rep->modes[k];
      gsize n = m->size;
      if (m->first != k || !m->defined || n < 2 || n > 3)
        continue;
      /* the first involution (R² = 1) in class order that is not ±1 on the set */
      for (gsize c = 1; c < qv_character_table_n_classes (rep->table); c++)
        {
          gssize op = -1;
          for (gsize q = 0; q < g->order && op < 0; q++)
            if (classes[q] == c)
              op = (gssize) q;
          const double *r = g->operations + 9 * op;
          double r2[9];
          for (int i = 0; i < 3; i++)
            for (int j = 0; j < 3; j++)
              r2[3 * i + j] = r[3 * i] * r[j] + r[3 * i + 1] * r[3 + j] + r[3 * i + 2] * r[6 + j];
          gboolean involution = TRUE;
          for (int i = 0; i < 9; i++)
            involution &= fabs (r2[i] - (i % 4 == 0)) < 1e-6;
          if (!involution)
            continue;
          /* M_ij = l_iᵀ T l_j */
          const gsize *perm = g->permutations + (gsize) op * na;
          for (gsize j = 0; j < n; j++)
            {
              const double *l = qv_mode_set_vector (modes, k + j);
              memcpy (old + j * dim, l, dim * sizeof (double));
              for (gsize a = 0; a < na; a++)
                for (int i = 0; i < 3; i++)
                  tl[j * dim + 3 * perm[a] + i] = r[3 * i] * l[3 * a] + r[3 * i + 1] * l[3 * a + 1]
                                                  + r[3 * i + 2] * l[3 * a + 2];
            }
          double mm[9], v[9];
          for (gsize i = 0; i < n; i++)
            for (gsize j = 0; j < n; j++)
              {
                double s = 0, s2 = 0;
                for (gsize q = 0; q < dim; q++)
                  {
                    s += old[i * dim + q] * tl[j * dim + q];
                    s2 += old[j * dim + q] * tl[i * dim + q];
                  }
                mm[i * n + j] = 0.5 * (s + s2);
              }
          gboolean scalar = TRUE;
          for (gsize i = 0; i < n; i++)
            for (gsize j = 0; j < n; j++)
              scalar &= fabs (mm[i * n + j] - (i == j ? mm[0] : 0)) < 1e-6;
          if (scalar)
            continue;
          jacobi (mm, v, n);
          gsize idx[3] = { 0, 1, 2 };
          for (gsize i = 0; i < n; i++)
            for (gsize j = i + 1; j < n; j++)
              if (mm[idx[j] * n + idx[j]] > mm[idx[i] * n + idx[i]] + 1e-9)
                {
                  gsize t = idx[i]; idx[i] = idx[j]; idx[j] = t;
                }
          for (gsize j = 0; j < n; j++)
            {
              double *l = modes->vectors + (k + j) * dim;
              gsize big = 0;
              for (gsize q = 0; q < dim; q++)
                {
                  double s = 0;
                  for (gsize i = 0; i < n; i++)
                    s += old[i * dim + q] * v[i * n + idx[j]];
                  l[q] = s;
                  if (fabs (l[q]) > fabs (l[big]) + 1e-9)
                    big = q;
                }
              if (l[big] < 0)
                for (gsize q = 0; q < dim; q++)
                  l[q] = -l[q];
            }
          aligned++;
          break;
        }
    }
  return aligned;
}
