/* qv-phonon-dos.c — phonon DOS: linear tetrahedra and Gaussian smearing
 * (see qv-phonon-dos.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <complex.h>
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-phonon-dos.h"
#include "qv-supercell.h"

gboolean
qv_dos_method_parse (const char *text, QvDosMethod *method, GError **error)
{
  if (text && (g_ascii_strcasecmp (text, "tetrahedron") == 0 || g_ascii_strcasecmp (text, "tetra") == 0))
    *method = QV_DOS_TETRAHEDRON;
  else if (text && g_ascii_strcasecmp (text, "gaussian") == 0)
    *method = QV_DOS_GAUSSIAN;
  else
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "DOS method '%s' not known; accepted: tetrahedron, gaussian", text ? text : "");
      return FALSE;
    }
  return TRUE;
}

const char *
qv_dos_method_name (QvDosMethod method)
{
  return method == QV_DOS_GAUSSIAN ? "gaussian" : "tetrahedron";
}

void
qv_phonon_dos_free (QvPhononDos *dos)
{
  if (dos == NULL)
    return;
  g_free (dos->omega);
  g_free (dos->total);
  g_free (dos->z);
  g_free (dos->partial);
  g_free (dos);
}

/* Number of states below @e of one band in one tetrahedron with sorted
 * corner values e[0] ≤ … ≤ e[3], normalised to 1 (Lehmann & Taut 1972;
 * the cumulative form as in Blöchl, Jepsen & Andersen 1994, eq. A2–A4,
 * from memory). Half-open intervals keep every denominator non-zero. */
static double
tetra_count (const double e[4], double x)
{
  if (x <= e[0])
    return 0;
  if (x >= e[3])
    return 1;
  if (x < e[1])
    {
      double d = x - e[0];
      return d * d * d / ((e[1] - e[0]) * (e[2] - e[0]) * (e[3] - e[0]));
    }
  if (x < e[2])
    {
      double e21 = e[1] - e[0], e31 = e[2] - e[0], e41 = e[3] - e[0];
      double e32 = e[2] - e[1], e42 = e[3] - e[1], d = x - e[1];
      return (e21 * e21 + 3 * e21 * d + 3 * d * d - (e31 + e42) / (e32 * e42) * d * d * d)
             / (e31 * e41);
    }
  {
    double d = e[3] - x;
    return 1 - d * d * d / ((e[3] - e[0]) * (e[3] - e[1]) * (e[3] - e[2]));
  }
}

static void
sort4 (double e[4], gsize idx[4])
{
  for (int i = 1; i < 4; i++)
    for (int j = i; j > 0 && e[j] < e[j - 1]; j--)
      {
        double t = e[j]; e[j] = e[j - 1]; e[j - 1] = t;
        gsize u = idx[j]; idx[j] = idx[j - 1]; idx[j - 1] = u;
      }
}

/* Adds @amount × (count(hi) − count(lo)) / step over the bins that
 * [e[0], e[3]] touches, to @out[bin] and, with @proj, to each group. */
static void
tetra_add (const double e[4], double amount, double lo, double step, gsize n_points, double *total,
           double *partial, const double *proj, gsize n_groups)
{
  long b0 = (long) floor ((e[0] - lo) / step), b1 = (long) floor ((e[3] - lo) / step);
  double prev;
  if (b0 < 0)
    b0 = 0;
  if (b1 >= (long) n_points)
    b1 = (long) n_points - 1;
  if (b1 < b0)
    return;
  prev = tetra_count (e, lo + b0 * step);
  for (long b = b0; b <= b1; b++)
    {
      double next = tetra_count (e, lo + (b + 1) * step);
      double v = amount * (next - prev) / step;
      prev = next;
      if (v == 0)
        continue;
      total[b] += v;
      for (gsize g = 0; g < n_groups; g++)
        partial[g * n_points + (gsize) b] += v * proj[g];
    }
}

QvPhononDos *
qv_phonon_dos_compute (const QvPhononMesh *mesh, const double reciprocal[3][3],
                       gsize nb, const double *w, const double *weights, gsize n_groups,
                       const guint *z, const QvDosOptions *opt, GError **error)
{
  g_autoptr(QvPhononDos) dos = g_new0 (QvPhononDos, 1);
  gsize nq = mesh->n_q, total_modes = nq * nb;
  double wmin = G_MAXDOUBLE, wmax = -G_MAXDOUBLE, lo, hi, step;
  gsize n_points;

  if (opt->method == QV_DOS_GAUSSIAN && !(opt->sigma > 0 && isfinite (opt->sigma)))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "Gaussian smearing needs a positive width (cm^-1), got %g", opt->sigma);
      return NULL;
    }
  for (gsize i = 0; i < total_modes; i++)
    {
      if (!isfinite (w[i]))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "mode %" G_GSIZE_FORMAT " of the mesh is not finite", i);
          return NULL;
        }
      wmin = MIN (wmin, w[i]);
      wmax = MAX (wmax, w[i]);
    }
  if (opt->omega_max > opt->omega_min)
    {
      lo = opt->omega_min;
      hi = opt->omega_max;
    }
  else
    {
      double pad = opt->method == QV_DOS_GAUSSIAN ? 5 * opt->sigma : 0;
      double span = MAX (wmax - wmin, 1.0);
      lo = wmin - pad - 1e-3 * span;
      hi = wmax + pad + 1e-3 * span;
    }
  step = opt->step > 0 ? opt->step : (hi - lo) / 1000;
  if (!((hi - lo) / step < 1e7))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "a DOS grid from %g to %g cm^-1 in steps of %g would have more than 10^7 points; "
                   "choose a larger step", lo, hi, step);
      return NULL;
    }
  n_points = (gsize) ceil ((hi - lo) / step - 1e-9);
  if (n_points < 1)
    n_points = 1;

  dos->method = opt->method;
  dos->sigma = opt->method == QV_DOS_GAUSSIAN ? opt->sigma : 0;
  dos->step = step;
  dos->n_points = n_points;
  memcpy (dos->mesh, mesh->n, sizeof dos->mesh);
  dos->omega = g_new (double, n_points);
  dos->total = g_new0 (double, n_points);
  dos->n_groups = weights ? n_groups : 0;
  dos->z = dos->n_groups ? g_memdup2 (z, n_groups * sizeof (guint)) : NULL;
  dos->partial = g_new0 (double, MAX (dos->n_groups, 1) * n_points);
  for (gsize b = 0; b < n_points; b++)
    dos->omega[b] = lo + (b + 0.5) * step;

  if (opt->method == QV_DOS_GAUSSIAN)
    {
      double norm = 1.0 / (opt->sigma * sqrt (2 * G_PI) * (double) nq), reach = 6 * opt->sigma;
      for (gsize i = 0; i < total_modes; i++)
        {
          long b0 = (long) floor ((w[i] - reach - lo) / step - 0.5);
          long b1 = (long) ceil ((w[i] + reach - lo) / step - 0.5);
          b0 = MAX (b0, 0);
          b1 = MIN (b1, (long) n_points - 1);
          for (long b = b0; b <= b1; b++)
            {
              double x = (dos->omega[b] - w[i]) / opt->sigma;
              double v = norm * exp (-0.5 * x * x);
              dos->total[b] += v;
              for (gsize g = 0; g < dos->n_groups; g++)
                dos->partial[g * n_points + (gsize) b] += v * weights[i * n_groups + g];
            }
        }
    }
  else
    {
      /* the main diagonal of a subcell from corner c to its opposite goes
         along d_i = 1 − 2 c_i; the shortest in Cartesian length is used */
      static const int corners[4][3] = { { 0, 0, 0 }, { 1, 0, 0 }, { 0, 1, 0 }, { 1, 1, 0 } };
      static const int perms[6][3] = { { 0, 1, 2 }, { 0, 2, 1 }, { 1, 0, 2 }, { 1, 2, 0 }, { 2, 0, 1 }, { 2, 1, 0 } };
      int best = 0;
      double best_len = G_MAXDOUBLE;
      int tets[6][4][3];
      double amount = 1.0 / (6.0 * (double) nq);
      g_autofree double *proj = g_new0 (double, MAX (dos->n_groups, 1));

      for (int c = 0; c < 4; c++)
        {
          double v[3] = { 0, 0, 0 }, len;
          for (int i = 0; i < 3; i++)
            for (int x = 0; x < 3; x++)
              v[x] += (1 - 2 * corners[c][i]) * reciprocal[i][x] / mesh->n[i];
          len = v[0] * v[0] + v[1] * v[1] + v[2] * v[2];
          if (len < best_len * (1 - 1e-9))
            {
              best_len = len;
              best = c;
            }
        }
      for (int t = 0; t < 6; t++)
        {
          int p[3] = { corners[best][0], corners[best][1], corners[best][2] };
          memcpy (tets[t][0], p, sizeof p);
          for (int s = 0; s < 3; s++)
            {
              int axis = perms[t][s];
              p[axis] += 1 - 2 * corners[best][axis];
              memcpy (tets[t][s + 1], p, sizeof p);
            }
        }
      for (long i = 0; i < mesh->n[0]; i++)
        for (long j = 0; j < mesh->n[1]; j++)
          for (long k = 0; k < mesh->n[2]; k++)
            for (int t = 0; t < 6; t++)
              {
                gsize qi[4];
                for (int v = 0; v < 4; v++)
                  qi[v] = qv_phonon_mesh_index (mesh, i + tets[t][v][0], j + tets[t][v][1],
                                                k + tets[t][v][2]);
                for (gsize band = 0; band < nb; band++)
                  {
                    double e[4];
                    gsize idx[4];
                    for (int v = 0; v < 4; v++)
                      {
                        e[v] = w[qi[v] * nb + band];
                        idx[v] = qi[v];
                      }
                    sort4 (e, idx);
                    for (gsize g = 0; g < dos->n_groups; g++)
                      proj[g] = 0.25 * (weights[(qi[0] * nb + band) * n_groups + g]
                                        + weights[(qi[1] * nb + band) * n_groups + g]
                                        + weights[(qi[2] * nb + band) * n_groups + g]
                                        + weights[(qi[3] * nb + band) * n_groups + g]);
                    tetra_add (e, amount, lo, step, n_points, dos->total, dos->partial, proj,
                               dos->n_groups);
                  }
              }
    }
  return g_steal_pointer (&dos);
}

typedef struct {
  gsize nb, n_groups, n_sites;
  const guint *group_of_site;
  double *w;        /* n_q × nb */
  double *weights;  /* n_q × nb × n_groups */
} DosJob;

static gboolean
dos_chunk (const QvPhononSet *set, gsize start, gpointer user_data, GError **error)
{
  DosJob *job = user_data;
  gsize nb = job->nb;
  (void) error;
  memcpy (job->w + start * nb, set->wavenumbers, set->n_q * nb * sizeof (double));
  for (gsize k = 0; k < set->n_q; k++)
    for (gsize b = 0; b < nb; b++)
      {
        const double _Complex *e = set->eigenvectors + (k * nb + b) * nb;
        double *out = job->weights + ((start + k) * nb + b) * job->n_groups;
        for (gsize s = 0; s < job->n_sites; s++)
          {
            double sum = 0;
            for (int a = 0; a < 3; a++)
              {
                double _Complex c = e[3 * s + a];
                sum += creal (c) * creal (c) + cimag (c) * cimag (c);
              }
            out[job->group_of_site[s]] += sum;
          }
      }
  return TRUE;
}

QvPhononDos *
qv_phonon_dos_from_force_constants (const QvForceConstants *fc, const guint *site_z,
                                    const QvPhononMesh *mesh, const QvDosOptions *options,
                                    guint n_threads, const QvProgress *progress, GError **error)
{
  return qv_phonon_dos_from_force_constants_with (fc, NULL, NULL, site_z, mesh, options,
                                                  n_threads, progress, error);
}

QvPhononDos *
qv_phonon_dos_from_force_constants_with (const QvForceConstants *fc, QvDynamicalTerm term,
                                         gpointer data, const guint *site_z,
                                         const QvPhononMesh *mesh, const QvDosOptions *options,
                                         guint n_threads, const QvProgress *progress,
                                         GError **error)
{
  gsize n = qv_force_constants_n_sites (fc), nb = 3 * n, n_groups = 0;
  g_autofree guint *z = g_new (guint, n);
  g_autofree guint *group = g_new (guint, n);
  g_autofree double *w = NULL, *weights = NULL;
  double reciprocal[3][3];
  DosJob job;

  /* the elements present, ascending */
  for (gsize s = 0; s < n; s++)
    {
      gsize g = 0;
      while (g < n_groups && z[g] < site_z[s])
        g++;
      if (g < n_groups && z[g] == site_z[s])
        continue;
      memmove (z + g + 1, z + g, (n_groups - g) * sizeof (guint));
      z[g] = site_z[s];
      n_groups++;
    }
  for (gsize s = 0; s < n; s++)
    for (gsize g = 0; g < n_groups; g++)
      if (z[g] == site_z[s])
        group[s] = (guint) g;
  w = g_new (double, mesh->n_q * nb);
  weights = g_new0 (double, mesh->n_q * nb * n_groups);
  job = (DosJob) { nb, n_groups, n, group, w, weights };
  if (!qv_phonon_mesh_solve_with (fc, term, data, mesh, TRUE, 0, n_threads, dos_chunk, &job,
                                  progress, error))
    return NULL;
  qv_lattice_reciprocal (qv_force_constants_cell (fc), reciprocal);
  return qv_phonon_dos_compute (mesh, reciprocal, nb, w, weights, n_groups, z, options, error);
}
