/* qv-band-path.c — band paths, sampling, branch connection.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <cblas.h>
#include <errno.h>
#include <complex.h>
#include <math.h>
#include <string.h>
#include "qv-assignment.h"
#include "qv-band-path.h"
#include "qv-error.h"
#include "qv-supercell.h"

void
qv_band_path_free (QvBandPath *path)
{
  if (path == NULL)
    return;
  for (gsize i = 0; i < path->n_vertices; i++)
    g_free (path->labels[i]);
  g_free (path->labels);
  g_free (path->q);
  g_free (path->jump);
  g_free (path->lattice);
  g_free (path);
}

void
qv_band_sampling_free (QvBandSampling *s)
{
  if (s == NULL)
    return;
  g_free (s->q);
  g_free (s->distance);
  g_free (s->restart);
  for (gsize i = 0; i < s->n_labels; i++)
    g_free (s->labels[i]);
  g_free (s->labels);
  g_free (s->label_distance);
  g_free (s->label_index);
  g_free (s);
}

static void
path_append (QvBandPath *p, GPtrArray *labels, GArray *q, GArray *jump, const char *label,
             const double f[3], gboolean jumped)
{
  g_ptr_array_add (labels, g_strdup (label));
  g_array_append_vals (q, f, 3);
  g_array_append_val (jump, jumped);
  p->n_vertices++;
}

static QvBandPath *
path_finish (QvBandPath *p, GPtrArray *labels, GArray *q, GArray *jump)
{
  p->labels = (char **) g_ptr_array_free (labels, FALSE);
  p->q = (double *) g_array_free (q, FALSE);
  p->jump = (gboolean *) g_array_free (jump, FALSE);
  return p;
}

QvBandPath *
qv_band_path_parse (const char *text, GError **error)
{
  QvBandPath *p = g_new0 (QvBandPath, 1);
  GPtrArray *labels = g_ptr_array_new ();
  GArray *q = g_array_new (FALSE, FALSE, sizeof (double));
  GArray *jump = g_array_new (FALSE, FALSE, sizeof (gboolean));
  gboolean next_jump = FALSE, segment = FALSE;
  const char *s = text;
  int item = 0;

  while (TRUE)
    {
      gsize len = strcspn (s, ";|");
      g_autofree char *raw = g_strndup (s, len);
      g_auto(GStrv) words = NULL;
      gsize n_words = 0;
      double f[3];

      item++;
      g_strstrip (raw);
      words = g_strsplit_set (raw, " \t,", -1);
      for (char **w = words; *w; w++)
        if (**w)
          words[n_words++] = *w;
        else
          g_free (*w);
      words[n_words] = NULL;
      if (n_words == 1 || n_words == 4)
        {
          const char *label = words[0];
          char *end;
          errno = 0;
          g_ascii_strtod (label, &end);
          if (*end == '\0')
            {
              g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                           "--path item %d '%s' starts with a number: each point is LABEL QA QB QC "
                           "(for example \"G 0 0 0; X 0.5 0 0.5\")", item, raw);
              goto fail;
            }
          if (n_words == 4)
            for (int j = 0; j < 3; j++)
              {
                f[j] = g_ascii_strtod (words[j + 1], &end);
                if (*end != '\0' || !isfinite (f[j]) || fabs (f[j]) > 100)
                  {
                    g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                                 "--path item %d '%s': '%s' is not a fractional coordinate "
                                 "(a number such as 0.5 or -0.375)", item, raw, words[j + 1]);
                    goto fail;
                  }
              }
          else
            {
              gssize found = -1;
              for (gsize v = 0; v < p->n_vertices; v++)
                if (strcmp (g_ptr_array_index (labels, v), label) == 0)
                  found = (gssize) v;
              if (found < 0)
                {
                  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                               "--path item %d: '%s' has no coordinates and was not given "
                               "before; write it as '%s QA QB QC'", item, label, label);
                  goto fail;
                }
              memcpy (f, &g_array_index (q, double, 3 * (gsize) found), sizeof f);
            }
          if (p->n_vertices > 0 && !next_jump)
            segment = TRUE;
          path_append (p, labels, q, jump, label, f, next_jump || p->n_vertices == 0);
        }
      else
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "--path item %d '%s': a point is LABEL QA QB QC (three fractional "
                       "reciprocal coordinates, without 2π) or a LABEL given before; items are "
                       "separated by ';' (joined) or '|' (a jump)", item, raw);
          goto fail;
        }
      s += len;
      if (*s == '\0')
        break;
      next_jump = *s == '|';
      s++;
    }
  if (!segment)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "--path needs at least two points joined by ';', such as \"G 0 0 0; X 0.5 0 0\"");
      goto fail;
    }
  return path_finish (p, labels, q, jump);

fail:
  qv_band_path_free (path_finish (p, labels, q, jump));
  return NULL;
}

char *
qv_band_path_to_string (const QvBandPath *p)
{
  GString *s = g_string_new (NULL);
  for (gsize v = 0; v < p->n_vertices; v++)
    {
      char a[G_ASCII_DTOSTR_BUF_SIZE], b[G_ASCII_DTOSTR_BUF_SIZE], c[G_ASCII_DTOSTR_BUF_SIZE];
      if (v > 0)
        g_string_append (s, p->jump[v] ? " | " : "; ");
      g_string_append_printf (s, "%s %s %s %s", p->labels[v],
                              g_ascii_formatd (a, sizeof a, "%.6g", p->q[3 * v] + 0.0),
                              g_ascii_formatd (b, sizeof b, "%.6g", p->q[3 * v + 1] + 0.0),
                              g_ascii_formatd (c, sizeof c, "%.6g", p->q[3 * v + 2] + 0.0));
    }
  return g_string_free (s, FALSE);
}

/* ------------------------------------------------------------------ */
/* Default paths: Setyawan & Curtarolo (2010), from memory              */

typedef struct {
  const char *label;
  double f[3];
} Point;

typedef struct {
  const char *name;
  double basis[3][3];         /* standard primitive vectors for a = 1 (c = 1 for hP) */
  double volume_factor;       /* V = factor · a³ (cubic) */
  const Point *points;
  const char *path;           /* labels; '-' joins, '|' jumps */
} Lattice;

static const Point cp_points[] = {
  { "G", { 0, 0, 0 } }, { "X", { 0, 0.5, 0 } }, { "M", { 0.5, 0.5, 0 } },
  { "R", { 0.5, 0.5, 0.5 } }, { NULL, { 0 } } };
static const Point cf_points[] = {
  { "G", { 0, 0, 0 } }, { "K", { 0.375, 0.375, 0.75 } }, { "L", { 0.5, 0.5, 0.5 } },
  { "U", { 0.625, 0.25, 0.625 } }, { "W", { 0.5, 0.25, 0.75 } }, { "X", { 0.5, 0, 0.5 } },
  { NULL, { 0 } } };
static const Point ci_points[] = {
  { "G", { 0, 0, 0 } }, { "H", { 0.5, -0.5, 0.5 } }, { "N", { 0, 0, 0.5 } },
  { "P", { 0.25, 0.25, 0.25 } }, { NULL, { 0 } } };
static const Point hp_points[] = {
  { "G", { 0, 0, 0 } }, { "A", { 0, 0, 0.5 } }, { "H", { 1.0 / 3, 1.0 / 3, 0.5 } },
  { "K", { 1.0 / 3, 1.0 / 3, 0 } }, { "L", { 0.5, 0, 0.5 } }, { "M", { 0.5, 0, 0 } },
  { NULL, { 0 } } };

#define S3 0.86602540378443864676

static const Lattice lattices[] = {
  { "cP", { { 1, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 } }, 1.0, cp_points, "G-X-M-G-R-X|M-R" },
  { "cF", { { 0, 0.5, 0.5 }, { 0.5, 0, 0.5 }, { 0.5, 0.5, 0 } }, 0.25, cf_points,
    "G-X-W-K-G-L-U-W-L-K|U-X" },
  { "cI", { { -0.5, 0.5, 0.5 }, { 0.5, -0.5, 0.5 }, { 0.5, 0.5, -0.5 } }, 0.5, ci_points,
    "G-H-N-G-P-H|P-N" },
  { "hP", { { 0.5, -S3, 0 }, { 0.5, S3, 0 }, { 0, 0, 1 } }, 0, hp_points,
    "G-M-K-G-A-L-H-A|L-M|K-H" },
};

static double
dot3 (const double *a, const double *b)
{
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

/* Finds integer rows V (|det| = 1) with V·reduced having metric @g. */
static gboolean
match_metric (const double reduced[3][3], const double g[3][3], double tol, int v[3][3])
{
  static const int order[5] = { 0, 1, -1, 2, -2 };
  double cand[124][3];
  int coef[124][3], n = 0;

  /* a cell already in the standard setting keeps its own vectors (and the
   * paper's coordinates) */
  {
    gboolean same = TRUE;
    for (int i = 0; i < 3; i++)
      for (int j = 0; j < 3; j++)
        same = same && fabs (dot3 (reduced[i], reduced[j]) - g[i][j]) <= tol;
    if (same)
      {
        memset (v, 0, 9 * sizeof (int));
        v[0][0] = v[1][1] = v[2][2] = 1;
        return TRUE;
      }
  }
  /* then small positive coefficients first */
  for (int ia = 0; ia < 5; ia++)
    for (int ib = 0; ib < 5; ib++)
      for (int ic = 0; ic < 5; ic++)
        {
          int a = order[ia], b = order[ib], c = order[ic];
          if (a == 0 && b == 0 && c == 0)
            continue;
          coef[n][0] = a; coef[n][1] = b; coef[n][2] = c;
          for (int x = 0; x < 3; x++)
            cand[n][x] = a * reduced[0][x] + b * reduced[1][x] + c * reduced[2][x];
          n++;
        }
  for (int pass = 0; pass < 2; pass++)
    for (int i = 0; i < n; i++)
    {
      if (fabs (dot3 (cand[i], cand[i]) - g[0][0]) > tol)
        continue;
      for (int j = 0; j < n; j++)
        {
          if (fabs (dot3 (cand[j], cand[j]) - g[1][1]) > tol
              || fabs (dot3 (cand[i], cand[j]) - g[0][1]) > tol)
            continue;
          for (int k = 0; k < n; k++)
            {
              int m[3][3];
              if (fabs (dot3 (cand[k], cand[k]) - g[2][2]) > tol
                  || fabs (dot3 (cand[i], cand[k]) - g[0][2]) > tol
                  || fabs (dot3 (cand[j], cand[k]) - g[1][2]) > tol)
                continue;
              memcpy (m[0], coef[i], sizeof m[0]);
              memcpy (m[1], coef[j], sizeof m[1]);
              memcpy (m[2], coef[k], sizeof m[2]);
              gint64 det = qv_supercell_matrix_det (m);
              if (det == (pass == 0 ? 1 : -1))
                {
                  memcpy (v, m, sizeof m);
                  return TRUE;
                }
            }
        }
    }
  return FALSE;
}

QvBandPath *
qv_band_path_default (const double cell[3][3], double tolerance, GError **error)
{
  double reduced[3][3], volume = fabs (qv_lattice_volume (cell));
  int t[3][3];

  if (tolerance <= 0)
    tolerance = 1e-3;
  if (!(volume > 1e-9))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "the cell has zero volume");
      return NULL;
    }
  for (int attempt = 0; attempt < 2; attempt++)
    {
    /* first the cell as given (identity), then its LLL-reduced basis */
    if (attempt == 0)
      {
        memcpy (reduced, cell, sizeof reduced);
        memset (t, 0, sizeof t);
        t[0][0] = t[1][1] = t[2][2] = 1;
      }
    else
      qv_lattice_reduce (cell, reduced, t);
    for (gsize li = 0; li < G_N_ELEMENTS (lattices); li++)
      {
        const Lattice *lat = &lattices[li];
        /* candidate lattice parameters: a from the volume (cubic), or a from
         * every short vector and c from the volume (hexagonal) */
        for (int trial = 0; trial < (lat->volume_factor > 0 ? 1 : 3); trial++)
          {
            double a, c = 1, std[3][3], g[3][3];
            int v[3][3];
            if (lat->volume_factor > 0)
              a = cbrt (volume / lat->volume_factor);
            else
              {
                a = sqrt (dot3 (reduced[trial], reduced[trial]));
                c = volume / (S3 * a * a);
              }
            for (int i = 0; i < 3; i++)
              for (int x = 0; x < 3; x++)
                std[i][x] = lat->basis[i][x] * (x == 2 && lat->volume_factor == 0 ? c : a);
            for (int i = 0; i < 3; i++)
              for (int j = 0; j < 3; j++)
                g[i][j] = dot3 (std[i], std[j]);
            if (!match_metric (reduced, g, tolerance * MAX (a, c) * MAX (a, c), v))
              continue;
            {
              /* a_std = V · reduced = V T · cell; f_cell = (V T)⁻¹ f_std */
              int w[3][3], winv[3][3];
              gint64 det;
              QvBandPath *p = g_new0 (QvBandPath, 1);
              GPtrArray *labels = g_ptr_array_new ();
              GArray *q = g_array_new (FALSE, FALSE, sizeof (double));
              GArray *jump = g_array_new (FALSE, FALSE, sizeof (gboolean));
              gboolean jumped = TRUE;

              for (int i = 0; i < 3; i++)
                for (int j = 0; j < 3; j++)
                  w[i][j] = v[i][0] * t[0][j] + v[i][1] * t[1][j] + v[i][2] * t[2][j];
              det = qv_supercell_matrix_det (w);
              for (int i = 0; i < 3; i++)
                for (int j = 0; j < 3; j++)
                  {
                    int r0 = (j + 1) % 3, r1 = (j + 2) % 3, c0 = (i + 1) % 3, c1 = (i + 2) % 3;
                    winv[i][j] = (int) (((gint64) w[r0][c0] * w[r1][c1] - (gint64) w[r0][c1] * w[r1][c0]) / det);
                  }
              for (const char *s = lat->path; *s; s++)
                {
                  if (*s == '-')
                    continue;
                  if (*s == '|')
                    {
                      jumped = TRUE;
                      continue;
                    }
                  for (const Point *pt = lat->points; pt->label; pt++)
                    if (pt->label[0] == *s)
                      {
                        double f[3];
                        for (int i = 0; i < 3; i++)
                          f[i] = winv[i][0] * pt->f[0] + winv[i][1] * pt->f[1] + winv[i][2] * pt->f[2] + 0.0;
                        path_append (p, labels, q, jump, pt->label, f, jumped);
                        jumped = FALSE;
                      }
                }
              p->lattice = g_strdup (lat->name);
              return path_finish (p, labels, q, jump);
            }
          }
      }
    }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "no default path for this lattice: default paths exist for cubic P, F, I and "
               "hexagonal lattices only; give one with --path \"G 0 0 0; X 0.5 0 0; …\" "
               "(fractional reciprocal coordinates)");
  return NULL;
}

/* ------------------------------------------------------------------ */
/* Sampling                                                             */

QvBandSampling *
qv_band_path_sample (const QvBandPath *p, const double cell[3][3], gsize n_points,
                     double density, GError **error)
{
  double b[3][3], total = 0;
  gsize n_segments = 0, n_pieces = 0;
  g_autofree double *length = g_new0 (double, p->n_vertices);
  GArray *q, *dist, *restart;
  GPtrArray *labels;
  GArray *ldist, *lidx;
  QvBandSampling *s;
  double at = 0;

  qv_lattice_reciprocal (cell, b);
  for (gsize v = 0; v < p->n_vertices; v++)
    {
      if (p->jump[v] || v == 0)
        {
          n_pieces++;
          continue;
        }
      double d[3];
      for (int x = 0; x < 3; x++)
        d[x] = 0;
      for (int i = 0; i < 3; i++)
        for (int x = 0; x < 3; x++)
          d[x] += (p->q[3 * v + i] - p->q[3 * (v - 1) + i]) * b[i][x];
      length[v] = sqrt (dot3 (d, d));
      if (!(length[v] > 1e-12))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "the path segment %s–%s has zero length: remove one of the two points "
                       "or put '|' between them", p->labels[v - 1], p->labels[v]);
          return NULL;
        }
      total += length[v];
      n_segments++;
    }
  if (n_segments == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "the path has no segment");
      return NULL;
    }
  if (density <= 0 && n_points < n_segments + n_pieces)
    n_points = n_segments + n_pieces;
  q = g_array_new (FALSE, FALSE, sizeof (double));
  dist = g_array_new (FALSE, FALSE, sizeof (double));
  restart = g_array_new (FALSE, FALSE, sizeof (gboolean));
  labels = g_ptr_array_new ();
  ldist = g_array_new (FALSE, FALSE, sizeof (double));
  lidx = g_array_new (FALSE, FALSE, sizeof (gsize));
  for (gsize v = 0; v < p->n_vertices; v++)
    {
      gsize index = dist->len;
      if (v == 0 || p->jump[v])
        {
          gboolean yes = TRUE;
          g_array_append_vals (q, p->q + 3 * v, 3);
          g_array_append_val (dist, at);
          g_array_append_val (restart, yes);
          if (v > 0 && labels->len > 0
              && g_array_index (lidx, gsize, labels->len - 1) == index - 1)
            {
              /* a jump: the end and the new start share one label */
              char *old = g_ptr_array_index (labels, labels->len - 1);
              g_ptr_array_index (labels, labels->len - 1) = g_strdup_printf ("%s|%s", old, p->labels[v]);
              g_free (old);
              g_array_index (lidx, gsize, labels->len - 1) = index;
              continue;
            }
        }
      else
        {
          gsize intervals;
          double start = at;
          if (density > 0)
            intervals = (gsize) MAX (1.0, ceil (length[v] * density));
          else
            intervals = (gsize) MAX (1.0, round (length[v] / total * (double) (n_points - n_pieces)));
          if (intervals > 1000000)
            {
              g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                           "the segment %s–%s would need %" G_GSIZE_FORMAT " points: lower the density",
                           p->labels[v - 1], p->labels[v], intervals);
              g_array_free (q, TRUE); g_array_free (dist, TRUE); g_array_free (restart, TRUE);
              g_ptr_array_free (labels, TRUE); g_array_free (ldist, TRUE); g_array_free (lidx, TRUE);
              return NULL;
            }
          for (gsize j = 1; j <= intervals; j++)
            {
              double t = (double) j / (double) intervals, f[3], d;
              gboolean no = FALSE;
              for (int i = 0; i < 3; i++)
                f[i] = p->q[3 * (v - 1) + i] + t * (p->q[3 * v + i] - p->q[3 * (v - 1) + i]);
              d = start + t * length[v];
              g_array_append_vals (q, f, 3);
              g_array_append_val (dist, d);
              g_array_append_val (restart, no);
            }
          at = start + length[v];
          index = dist->len - 1;
        }
      g_ptr_array_add (labels, g_strdup (p->labels[v]));
      g_array_append_val (ldist, at);
      g_array_append_val (lidx, index);
    }
  s = g_new0 (QvBandSampling, 1);
  s->n_q = dist->len;
  s->q = (double *) g_array_free (q, FALSE);
  s->distance = (double *) g_array_free (dist, FALSE);
  s->restart = (gboolean *) g_array_free (restart, FALSE);
  s->n_labels = labels->len;
  s->labels = (char **) g_ptr_array_free (labels, FALSE);
  s->label_distance = (double *) g_array_free (ldist, FALSE);
  s->label_index = (gsize *) g_array_free (lidx, FALSE);
  return s;
}

/* ------------------------------------------------------------------ */
/* Connection by overlap                                                */


#define WINDOW 8

void
qv_band_connect (const QvPhononSet *set, const gboolean *restart, guint *order)
{
  gsize nb = set->n_branches;
  g_autofree double *weight = g_new (double, nb * nb);
  g_autofree gsize *assign = g_new (gsize, nb);
  g_autofree gboolean *taken = g_new (gboolean, nb);
  g_autofree double _Complex *prev = g_new (double _Complex, nb * nb);
  g_autofree double _Complex *overlap = g_new (double _Complex, nb * nb);
  const double _Complex one = 1, zero = 0;

  g_return_if_fail (set->eigenvectors != NULL);
  for (gsize k = 0; k < set->n_q; k++)
    {
      gboolean simple = TRUE;
      if (k == 0 || (restart && restart[k]))
        {
          for (gsize b = 0; b < nb; b++)
            order[k * nb + b] = (guint) b;
          continue;
        }
      /* |⟨e_b(q_{k−1}) | e_j(q_k)⟩|² is doubly stochastic (both bases are
       * orthonormal), so an entry above ½ is the largest of its row and of
       * its column: when every branch finds one, those modes are distinct
       * and the assignment is the unique optimum (any other permutation
       * replaces an entry > ½ by one < ½ in each row it changes). They are
       * looked for first among the modes near the branch's previous place in
       * ascending order; only otherwise is the whole matrix formed (zgemm)
       * and Kuhn–Munkres run. */
      memset (taken, 0, nb * sizeof *taken);
      for (gsize b = 0; b < nb && simple; b++)
        {
          const double _Complex *e0 = set->eigenvectors + ((k - 1) * nb + order[(k - 1) * nb + b]) * nb;
          gsize at = order[(k - 1) * nb + b], lo = at > WINDOW ? at - WINDOW : 0;
          gsize hi = MIN (nb, at + WINDOW + 1);
          gboolean found = FALSE;
          for (gsize j = lo; j < hi && !found; j++)
            {
              const double _Complex *e1 = set->eigenvectors + (k * nb + j) * nb;
              double _Complex o = 0;
              for (gsize r = 0; r < nb; r++)
                o += conj (e0[r]) * e1[r];
              if (creal (o) * creal (o) + cimag (o) * cimag (o) > 0.5 + 1e-9 && !taken[j])
                {
                  taken[j] = TRUE;
                  assign[b] = j;
                  found = TRUE;
                }
            }
          simple = found;
        }
      if (!simple)
        {
          /* the previous q's vectors in branch order, then O = Pᴴ E:
           * O[b, j] = ⟨e_b(q_{k−1}) | e_j(q_k)⟩ */
          for (gsize b = 0; b < nb; b++)
            memcpy (prev + b * nb, set->eigenvectors + ((k - 1) * nb + order[(k - 1) * nb + b]) * nb,
                    nb * sizeof *prev);
          cblas_zgemm (CblasColMajor, CblasConjTrans, CblasNoTrans, (blasint) nb, (blasint) nb,
                       (blasint) nb, &one, prev, (blasint) nb, set->eigenvectors + k * nb * nb,
                       (blasint) nb, &zero, overlap, (blasint) nb);
        }
      if (!simple)
        {
          for (gsize b = 0; b < nb; b++)
            for (gsize j = 0; j < nb; j++)
              {
                double _Complex o = overlap[b + j * nb];
                weight[b * nb + j] = creal (o) * creal (o) + cimag (o) * cimag (o);
              }
          /* the branches that keep the largest total overlap |⟨e|e'⟩|² */
          qv_assignment_maximise (weight, nb, nb, assign);
        }
      for (gsize b = 0; b < nb; b++)
        order[k * nb + b] = (guint) assign[b];
    }
}

double *
qv_band_sampling_solve_points (const QvBandSampling *s, double step)
{
  double *out = g_memdup2 (s->q, 3 * s->n_q * sizeof (double));

  for (gsize k = 0; k < s->n_q; k++)
    {
      double *q = out + 3 * k, d[3], norm = 0.0;
      gssize j;
      if (q[0] != 0.0 || q[1] != 0.0 || q[2] != 0.0)
        continue;
      j = (k + 1 < s->n_q && !s->restart[k + 1]) ? (gssize) k + 1
          : (k > 0 && !s->restart[k]) ? (gssize) k - 1 : -1;
      if (j < 0)
        continue;
      for (int c = 0; c < 3; c++)
        {
          d[c] = s->q[3 * j + c];
          norm += d[c] * d[c];
        }
      norm = sqrt (norm);
      for (int c = 0; c < 3; c++)
        q[c] = norm > 0.0 ? step * d[c] / norm : 0.0;
    }
  return out;
}
