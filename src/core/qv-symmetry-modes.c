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
  gsize n_unknown = 0, first_unknown = 0, n_cut = 0;
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
              /* with only the lowest modes solved, a set may run past the end */
              double nu = qv_mode_set_wavenumber (modes, k);
              double last = qv_mode_set_wavenumber (modes, modes->n_modes - 1);
              if (modes->lowest_only && fabs (last - nu) <= MAX (1.0, 2e-3 * fabs (nu)))
                n_cut++;
              else if (n_unknown++ == 0)
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
  if (n_cut)
    g_ptr_array_add (warn, g_strdup_printf (
      "symmetry: the last %" G_GSIZE_FORMAT " mode(s) may be part of a degenerate set that the "
      "lowest-modes solve cut off; ask for a few more modes to label them", n_cut));
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

/* T_g v for operation @op (R on each atom's block, moved to the image atom). */
static void
apply_op (const QvPointGroup *g, gsize op, const double *v, double *out)
{
  const double *r = g->operations + 9 * op;
  const gsize *perm = g->permutations + op * g->n_atoms;
  for (gsize a = 0; a < g->n_atoms; a++)
    for (int i = 0; i < 3; i++)
      out[3 * perm[a] + i] = r[3 * i] * v[3 * a] + r[3 * i + 1] * v[3 * a + 1] + r[3 * i + 2] * v[3 * a + 2];
}

static gboolean
is_involution (const double *r)
{
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      {
        double s = r[3 * i] * r[j] + r[3 * i + 1] * r[3 + j] + r[3 * i + 2] * r[6 + j];
        if (fabs (s - (i == j)) > 1e-6)
          return FALSE;
      }
  return TRUE;
}

static gboolean
commute (const double *a, const double *b)
{
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      {
        double ab = 0, ba = 0;
        for (int k = 0; k < 3; k++)
          {
            ab += a[3 * i + k] * b[3 * k + j];
            ba += b[3 * i + k] * a[3 * k + j];
          }
        if (fabs (ab - ba) > 1e-6)
          return FALSE;
      }
  return TRUE;
}

gsize
qv_symmetry_align_degenerate (const QvSymmetryReport *rep, QvModeSet *modes)
{
  const QvPointGroup *g = rep->group;
  if (rep->table == NULL || modes->n_atoms != g->n_atoms)
    return 0;
  gsize dim = 3 * g->n_atoms, aligned = 0;
  g_autofree gsize *classes = g_new (gsize, g->order);
  if (!qv_character_table_classify (rep->table, g, classes, NULL))
    return 0;
  /* the involutions (C2, σ, i) in the table's class order */
  g_autofree gsize *invol = g_new (gsize, g->order);
  gsize n_invol = 0;
  for (gsize c = 1; c < qv_character_table_n_classes (rep->table); c++)
    for (gsize q = 0; q < g->order; q++)
      if (classes[q] == c && is_involution (g->operations + 9 * q))
        invol[n_invol++] = q;
  g_autofree double *basis = g_new (double, dim * MAX_SET);
  g_autofree double *tv = g_new (double, dim);
  g_autofree gsize *picked = g_new (gsize, n_invol + 1);
  for (gsize k = 0; k < rep->n_modes; k++)
    {
      const QvModeSymmetry *m = &rep->modes[k];
      gsize n = m->size;
      if (m->first != k || !m->defined || n < 2 || n > MAX_SET)
        continue;
      for (gsize j = 0; j < n; j++)
        memcpy (basis + j * dim, qv_mode_set_vector (modes, k + j), dim * sizeof (double));
      /* blocks of the basis that the chosen operations do not yet tell
       * apart: block[j] is the block of vector j */
      gsize block[MAX_SET] = { 0 }, n_picked = 0;
      gboolean changed = FALSE;
      for (gsize o = 0; o < n_invol; o++)
        {
          const double *r = g->operations + 9 * invol[o];
          gboolean ok = TRUE;
          for (gsize p = 0; p < n_picked && ok; p++)
            ok = commute (r, g->operations + 9 * picked[p]);
          if (!ok)
            continue;
          gboolean split = FALSE;
          for (gsize b = 0; b < n; b++)
            {
              gsize members[MAX_SET], nb = 0;
              for (gsize j = 0; j < n; j++)
                if (block[j] == b)
                  members[nb++] = j;
              if (nb < 2)
                continue;
              /* M = Vᵀ T V on the block, symmetrised */
              double mm[MAX_SET * MAX_SET], v[MAX_SET * MAX_SET], t[MAX_SET * MAX_SET];
              for (gsize i = 0; i < nb; i++)
                {
                  apply_op (g, invol[o], basis + members[i] * dim, tv);
                  for (gsize j = 0; j < nb; j++)
                    {
                      double sum = 0;
                      for (gsize q = 0; q < dim; q++)
                        sum += basis[members[j] * dim + q] * tv[q];
                      t[j * nb + i] = sum;
                    }
                }
              gboolean scalar = TRUE;
              for (gsize i = 0; i < nb; i++)
                for (gsize j = 0; j < nb; j++)
                  {
                    mm[i * nb + j] = 0.5 * (t[i * nb + j] + t[j * nb + i]);
                    scalar &= fabs (mm[i * nb + j] - (i == j ? mm[0] : 0)) < 1e-6;
                  }
              if (scalar)
                continue;
              jacobi (mm, v, nb);
              gsize idx[MAX_SET];
              for (gsize i = 0; i < nb; i++)
                idx[i] = i;
              for (gsize i = 0; i < nb; i++)
                for (gsize j = i + 1; j < nb; j++)
                  if (mm[idx[j] * nb + idx[j]] > mm[idx[i] * nb + idx[i]] + 1e-9)
                    {
                      gsize tmp = idx[i]; idx[i] = idx[j]; idx[j] = tmp;
                    }
              g_autofree double *old = g_new (double, nb * dim);
              for (gsize i = 0; i < nb; i++)
                memcpy (old + i * dim, basis + members[i] * dim, dim * sizeof (double));
              for (gsize i = 0; i < nb; i++)
                for (gsize q = 0; q < dim; q++)
                  {
                    double sum = 0;
                    for (gsize j = 0; j < nb; j++)
                      sum += old[j * dim + q] * v[j * nb + idx[i]];
                    basis[members[i] * dim + q] = sum;
                  }
              /* new blocks: vectors with the same eigenvalue stay together */
              gsize next_block = 0;
              for (gsize j = 0; j < n; j++)
                next_block = MAX (next_block, block[j] + 1);
              for (gsize i = 1; i < nb; i++)
                if (fabs (mm[idx[i] * nb + idx[i]] - mm[idx[i - 1] * nb + idx[i - 1]]) > 1e-6)
                  {
                    for (gsize j = i; j < nb; j++)
                      block[members[j]] = next_block;
                    next_block++;
                  }
              split = TRUE;
            }
          if (split)
            {
              picked[n_picked++] = invol[o];
              changed = TRUE;
            }
        }
      if (!changed)
        continue;
      for (gsize j = 0; j < n; j++)
        {
          double *l = modes->vectors + (k + j) * dim;
          const double *b = basis + j * dim;
          gsize big = 0;
          for (gsize q = 0; q < dim; q++)
            if (fabs (b[q]) > fabs (b[big]) + 1e-9)
              big = q;
          double sign = b[big] < 0 ? -1 : 1;
          for (gsize q = 0; q < dim; q++)
            l[q] = sign * b[q];
        }
      aligned++;
    }
  return aligned;
}
