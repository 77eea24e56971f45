/* qv-scan-potential.c — V(Q) from a scan and its levels (sinc DVR).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <lapacke.h>
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-scan-potential.h"
#include "qv-units.h"

/* Points of the dense sampling used to find minima and turning points. */
#define SAMPLES_1D 4001
#define SAMPLES_2D 161

struct _QvScanPotential {
  guint dim;
  QvScanFit fit;
  guint degree;
  gsize n[2];
  double *axis[2];         /* 1-D: the points sorted by Q; 2-D: the axes */
  double *v;               /* energies at the points (sorted in 1-D) */
  double lo[2], hi[2];
  /* polynomial: Chebyshev coefficients; 2-D: c[a + (d+1)·b] for a + b ≤ d */
  double *coef;
  /* spline: second derivatives; 1-D along the points, 2-D along axis 0
   * for every row j: m[i + n0·j] */
  double *m;
  double rms, max_residual;
  double v_high, v_low;
};

double
qv_scan_ev_per_wavenumber (void)
{
  return QV_PLANCK * QV_SPEED_OF_LIGHT * 100.0 / QV_ELEMENTARY_CHARGE;
}

guint
qv_scan_default_degree (guint dim, const gsize n[])
{
  if (dim == 1)
    return n[0] >= 4 ? (guint) MIN (8, n[0] - 2) : (guint) (n[0] - 1);
  for (guint d = (guint) MIN (6, MIN (n[0], n[1]) - 1); d >= 2; d--)
    if ((gsize) (d + 1) * (d + 2) / 2 < n[0] * n[1])
      return d;
  return 2;
}

void
qv_scan_potential_free (QvScanPotential *p)
{
  if (p == NULL)
    return;
  g_free (p->axis[0]);
  g_free (p->axis[1]);
  g_free (p->v);
  g_free (p->coef);
  g_free (p->m);
  g_free (p);
}

/* ------------------------------------------------------------------ */
/* Natural cubic spline (e.g. Press et al., Numerical Recipes, §3.3)    */

static void
spline_second_derivatives (const double *x, const double *y, gsize n, gsize stride, double *m)
{
  g_autofree double *u = g_new (double, n);

  m[0] = u[0] = 0.0;
  for (gsize i = 1; i + 1 < n; i++)
    {
      const double sig = (x[i] - x[i - 1]) / (x[i + 1] - x[i - 1]);
      const double p = sig * m[i - 1] + 2.0;
      const double dy = (y[(i + 1) * stride] - y[i * stride]) / (x[i + 1] - x[i])
                        - (y[i * stride] - y[(i - 1) * stride]) / (x[i] - x[i - 1]);
      m[i] = (sig - 1.0) / p;
      u[i] = (6.0 * dy / (x[i + 1] - x[i - 1]) - sig * u[i - 1]) / p;
    }
  m[n - 1] = 0.0;
  for (gsize k = n - 1; k-- > 0; )
    m[k] = m[k] * m[k + 1] + u[k];
}

static double
spline_eval (const double *x, const double *y, gsize stride, const double *m, gsize n, double t)
{
  gsize lo = 0, hi = n - 1;
  double h, a, b;

  while (hi - lo > 1)
    {
      const gsize mid = (lo + hi) / 2;
      if (x[mid] > t)
        hi = mid;
      else
        lo = mid;
    }
  h = x[hi] - x[lo];
  a = (x[hi] - t) / h;
  b = (t - x[lo]) / h;
  return a * y[lo * stride] + b * y[hi * stride]
         + ((a * a * a - a) * m[lo] + (b * b * b - b) * m[hi]) * h * h / 6.0;
}

/* ------------------------------------------------------------------ */
/* Chebyshev polynomials                                                */

static void
chebyshev (double t, guint degree, double *T)
{
  T[0] = 1.0;
  if (degree >= 1)
    T[1] = t;
  for (guint k = 2; k <= degree; k++)
    T[k] = 2.0 * t * T[k - 1] - T[k - 2];
}

static double
scaled (const QvScanPotential *p, guint axis, double x)
{
  return (2.0 * x - p->lo[axis] - p->hi[axis]) / (p->hi[axis] - p->lo[axis]);
}

static double
poly_eval (const QvScanPotential *p, const double *x)
{
  double T0[QV_SCAN_MAX_DEGREE + 1], T1[QV_SCAN_MAX_DEGREE + 1], sum = 0.0;
  const guint d = p->degree;

  chebyshev (scaled (p, 0, x[0]), d, T0);
  if (p->dim == 1)
    {
      for (guint k = 0; k <= d; k++)
        sum += p->coef[k] * T0[k];
      return sum + p->v_low;
    }
  chebyshev (scaled (p, 1, x[1]), d, T1);
  for (guint b = 0; b <= d; b++)
    for (guint a = 0; a + b <= d; a++)
      sum += p->coef[a + (d + 1) * b] * T0[a] * T1[b];
  return sum + p->v_low;
}

static double
spline_eval_2d (const QvScanPotential *p, const double *x)
{
  const gsize n0 = p->n[0], n1 = p->n[1];
  g_autofree double *col = g_new (double, n1);
  g_autofree double *m = g_new (double, n1);

  for (gsize j = 0; j < n1; j++)
    col[j] = spline_eval (p->axis[0], p->v + n0 * j, 1, p->m + n0 * j, n0, x[0]);
  spline_second_derivatives (p->axis[1], col, n1, 1, m);
  return spline_eval (p->axis[1], col, 1, m, n1, x[1]);
}

static double
raw_eval (const QvScanPotential *p, const double *x)
{
  if (p->fit == QV_SCAN_FIT_POLYNOMIAL)
    return poly_eval (p, x);
  if (p->dim == 1)
    return spline_eval (p->axis[0], p->v, 1, p->m, p->n[0], x[0]);
  return spline_eval_2d (p, x);
}

double
qv_scan_potential_eval (const QvScanPotential *p, const double *x)
{
  double y[2];
  for (guint d = 0; d < p->dim; d++)
    y[d] = CLAMP (x[d], p->lo[d], p->hi[d]);
  return raw_eval (p, y);
}

/* Least squares for the Chebyshev coefficients of a polynomial fit
 * (dgels, QR); rows are the points. */
static gboolean
fit_polynomial (QvScanPotential *p, GError **error)
{
  const guint d = p->degree;
  const gsize rows = p->dim == 1 ? p->n[0] : p->n[0] * p->n[1];
  const gsize cols = p->dim == 1 ? d + 1 : (gsize) (d + 1) * (d + 2) / 2;
  g_autofree double *a = g_new0 (double, rows * cols);
  g_autofree double *b = g_new (double, rows);
  double T0[QV_SCAN_MAX_DEGREE + 1], T1[QV_SCAN_MAX_DEGREE + 1];
  lapack_int info;
  double sum2 = 0.0;

  for (gsize r = 0; r < rows; r++)
    {
      const gsize i = p->dim == 1 ? r : r % p->n[0];
      gsize c = 0;
      chebyshev (scaled (p, 0, p->axis[0][i]), d, T0);
      if (p->dim == 1)
        for (guint k = 0; k <= d; k++)
          a[r + rows * c++] = T0[k];
      else
        {
          chebyshev (scaled (p, 1, p->axis[1][r / p->n[0]]), d, T1);
          for (guint bb = 0; bb <= d; bb++)
            for (guint aa = 0; aa + bb <= d; aa++)
              a[r + rows * c++] = T0[aa] * T1[bb];
        }
      b[r] = p->v[r] - p->v_low;   /* fitted relative to the lowest point */
    }
  info = LAPACKE_dgels (LAPACK_COL_MAJOR, 'N', (lapack_int) rows, (lapack_int) cols, 1, a,
                        (lapack_int) rows, b, (lapack_int) rows);
  if (info != 0)
    {
      g_set_error (error, QV_ERROR, info > 0 ? QV_ERROR_INPUT : QV_ERROR_SOLVER,
                   "the polynomial fit of degree %u failed (dgels INFO = %d)%s", d, (int) info,
                   info > 0 ? ": the points do not determine it; give a lower --degree" : "");
      return FALSE;
    }
  p->coef = g_new0 (double, p->dim == 1 ? d + 1 : (gsize) (d + 1) * (d + 1));
  if (p->dim == 1)
    memcpy (p->coef, b, sizeof (double) * (d + 1));
  else
    {
      gsize c = 0;
      for (guint bb = 0; bb <= d; bb++)
        for (guint aa = 0; aa + bb <= d; aa++)
          p->coef[aa + (d + 1) * bb] = b[c++];
    }
  p->max_residual = 0.0;
  for (gsize r = 0; r < rows; r++)
    {
      double x[2] = { p->axis[0][p->dim == 1 ? r : r % p->n[0]], 0.0 };
      double res;
      if (p->dim == 2)
        x[1] = p->axis[1][r / p->n[0]];
      res = poly_eval (p, x) - p->v[r];
      sum2 += res * res;
      p->max_residual = MAX (p->max_residual, fabs (res));
    }
  p->rms = sqrt (sum2 / (double) rows);
  return TRUE;
}

static gboolean
check_degree (QvScanPotential *p, QvScanFit fit, guint degree, GError **error)
{
  p->fit = fit;
  if (fit != QV_SCAN_FIT_POLYNOMIAL)
    return TRUE;
  p->degree = degree ? degree : qv_scan_default_degree (p->dim, p->n);
  if (p->degree > QV_SCAN_MAX_DEGREE)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "a polynomial degree of %u is more than "
                   "this fits (up to %d)", p->degree, QV_SCAN_MAX_DEGREE);
      return FALSE;
    }
  if (p->degree < 2)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "the polynomial degree must be 2 or more "
                   "(a minimum needs curvature)");
      return FALSE;
    }
  for (guint d = 0; d < p->dim; d++)
    if (p->degree > p->n[d] - 1)
      {
        g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "a polynomial of degree %u needs at least %u "
                     "points along each scanned mode, the scan has %" G_GSIZE_FORMAT
                     "; give --degree %" G_GSIZE_FORMAT " or less, or --spline",
                     p->degree, p->degree + 1, p->n[d], p->n[d] - 1);
        return FALSE;
      }
  if (p->dim == 2 && (gsize) (p->degree + 1) * (p->degree + 2) / 2 > p->n[0] * p->n[1])
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "a polynomial of total degree %u has more "
                   "terms than the grid has points; give a lower --degree or --spline", p->degree);
      return FALSE;
    }
  return TRUE;
}

static void
finish_range (QvScanPotential *p, gsize count)
{
  p->v_high = -G_MAXDOUBLE;
  p->v_low = G_MAXDOUBLE;
  for (gsize i = 0; i < count; i++)
    {
      p->v_high = MAX (p->v_high, p->v[i]);
      p->v_low = MIN (p->v_low, p->v[i]);
    }
}

static int
compare_pair (gconstpointer a, gconstpointer b)
{
  const double x = ((const double *) a)[0], y = ((const double *) b)[0];
  return x < y ? -1 : x > y;
}

QvScanPotential *
qv_scan_potential_new_1d (const double *Q, const double *V, gsize n, QvScanFit fit,
                          guint degree, GError **error)
{
  g_autoptr(QvScanPotential) p = g_new0 (QvScanPotential, 1);
  g_autofree double *pairs = NULL;

  if (n < 3)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "a scan needs at least 3 points, it has %"
                   G_GSIZE_FORMAT, n);
      return NULL;
    }
  pairs = g_new (double, 2 * n);
  for (gsize i = 0; i < n; i++)
    {
      if (!isfinite (Q[i]) || !isfinite (V[i]))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "point %" G_GSIZE_FORMAT
                       " of the scan is not a finite number", i + 1);
          return NULL;
        }
      pairs[2 * i] = Q[i];
      pairs[2 * i + 1] = V[i];
    }
  qsort (pairs, n, 2 * sizeof (double), compare_pair);
  p->dim = 1;
  p->n[0] = n;
  p->axis[0] = g_new (double, n);
  p->v = g_new (double, n);
  for (gsize i = 0; i < n; i++)
    {
      p->axis[0][i] = pairs[2 * i];
      p->v[i] = pairs[2 * i + 1];
      if (i > 0 && !(p->axis[0][i] - p->axis[0][i - 1] > 1e-12 * MAX (1.0, fabs (p->axis[0][i]))))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "two points of the scan are at the same "
                       "Q = %.10g u^1/2 A", p->axis[0][i]);
          return NULL;
        }
    }
  p->lo[0] = p->axis[0][0];
  p->hi[0] = p->axis[0][n - 1];
  finish_range (p, n);
  if (!check_degree (p, fit, degree, error))
    return NULL;
  if (fit == QV_SCAN_FIT_POLYNOMIAL)
    {
      if (!fit_polynomial (p, error))
        return NULL;
    }
  else
    {
      p->m = g_new (double, n);
      spline_second_derivatives (p->axis[0], p->v, n, 1, p->m);
    }
  return g_steal_pointer (&p);
}

QvScanPotential *
qv_scan_potential_new_2d (const double *Q0, gsize n0, const double *Q1, gsize n1,
                          const double *V, QvScanFit fit, guint degree, GError **error)
{
  g_autoptr(QvScanPotential) p = g_new0 (QvScanPotential, 1);
  const double *axes[2] = { Q0, Q1 };
  const gsize ns[2] = { n0, n1 };

  if (n0 < 3 || n1 < 3)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "a grid needs at least 3 points along each "
                   "mode, it has %" G_GSIZE_FORMAT " x %" G_GSIZE_FORMAT, n0, n1);
      return NULL;
    }
  p->dim = 2;
  for (guint d = 0; d < 2; d++)
    {
      p->n[d] = ns[d];
      p->axis[d] = g_memdup2 (axes[d], sizeof (double) * ns[d]);
      for (gsize i = 0; i < ns[d]; i++)
        if (!isfinite (axes[d][i]) || (i > 0 && !(axes[d][i] > axes[d][i - 1])))
          {
            g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "the Q values of mode %u of the grid "
                         "are not finite and ascending", d + 1);
            return NULL;
          }
      p->lo[d] = axes[d][0];
      p->hi[d] = axes[d][ns[d] - 1];
    }
  for (gsize i = 0; i < n0 * n1; i++)
    if (!isfinite (V[i]))
      {
        g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "grid point %" G_GSIZE_FORMAT
                     " has an energy that is not a finite number", i + 1);
        return NULL;
      }
  p->v = g_memdup2 (V, sizeof (double) * n0 * n1);
  finish_range (p, n0 * n1);
  if (!check_degree (p, fit, degree, error))
    return NULL;
  if (fit == QV_SCAN_FIT_POLYNOMIAL)
    {
      if (!fit_polynomial (p, error))
        return NULL;
    }
  else
    {
      p->m = g_new (double, n0 * n1);
      for (gsize j = 0; j < n1; j++)
        spline_second_derivatives (p->axis[0], p->v + n0 * j, n0, 1, p->m + n0 * j);
    }
  return g_steal_pointer (&p);
}

guint qv_scan_potential_dim (const QvScanPotential *p) { return p->dim; }
QvScanFit qv_scan_potential_fit (const QvScanPotential *p) { return p->fit; }
guint qv_scan_potential_degree (const QvScanPotential *p) { return p->degree; }
double qv_scan_potential_highest_point (const QvScanPotential *p) { return p->v_high; }
double qv_scan_potential_lowest_point (const QvScanPotential *p) { return p->v_low; }

void
qv_scan_potential_range (const QvScanPotential *p, guint axis, double *lo, double *hi)
{
  *lo = p->lo[axis];
  *hi = p->hi[axis];
}

void
qv_scan_potential_residual (const QvScanPotential *p, double *rms, double *max)
{
  *rms = p->rms;
  *max = p->max_residual;
}

/* ------------------------------------------------------------------ */
/* Levels                                                               */

void
qv_scan_levels_free (QvScanLevels *l)
{
  if (l == NULL)
    return;
  g_free (l->levels);
  if (l->minima)
    g_array_unref (l->minima);
  qv_dvr_refinement_free (l->refinement);
  g_free (l);
}

static double
dvr_potential (const double *x, gpointer data)
{
  const QvScanPotential *p = data;
  return qv_scan_potential_eval (p, x);
}

/* Golden-section minimum of V on [a, b] (1-D). */
static double
golden_min (const QvScanPotential *p, double a, double b)
{
  const double g = (sqrt (5.0) - 1.0) / 2.0;
  double c = b - g * (b - a), d = a + g * (b - a);
  double fc = qv_scan_potential_eval (p, &c), fd = qv_scan_potential_eval (p, &d);

  for (int it = 0; it < 200 && b - a > 1e-13 * MAX (1.0, fabs (a)); it++)
    {
      if (fc < fd)
        {
          b = d; d = c; fd = fc;
          c = b - g * (b - a);
          fc = qv_scan_potential_eval (p, &c);
        }
      else
        {
          a = c; c = d; fc = fd;
          d = a + g * (b - a);
          fd = qv_scan_potential_eval (p, &d);
        }
    }
  return 0.5 * (a + b);
}

/* Second derivatives by central differences, h a small fraction of the
 * range, stepping inwards at an edge. */
static void
hessian_at (const QvScanPotential *p, const double *x, double hess[2][2])
{
  double h[2];
  for (guint d = 0; d < p->dim; d++)
    h[d] = 1e-5 * (p->hi[d] - p->lo[d]);
  for (guint i = 0; i < p->dim; i++)
    for (guint j = i; j < p->dim; j++)
      {
        double y[2];
        if (i == j)
          {
            double fp, fm, f0;
            memcpy (y, x, sizeof y);
            y[i] = CLAMP (x[i], p->lo[i] + h[i], p->hi[i] - h[i]);
            f0 = qv_scan_potential_eval (p, y);
            y[i] += h[i]; fp = qv_scan_potential_eval (p, y);
            y[i] -= 2 * h[i]; fm = qv_scan_potential_eval (p, y);
            hess[i][i] = (fp - 2 * f0 + fm) / (h[i] * h[i]);
          }
        else
          {
            double c[2] = { CLAMP (x[0], p->lo[0] + h[0], p->hi[0] - h[0]),
                            CLAMP (x[1], p->lo[1] + h[1], p->hi[1] - h[1]) };
            double f[4];
            for (int s = 0; s < 4; s++)
              {
                y[0] = c[0] + ((s & 1) ? h[0] : -h[0]);
                y[1] = c[1] + ((s & 2) ? h[1] : -h[1]);
                f[s] = qv_scan_potential_eval (p, y);
              }
            hess[0][1] = hess[1][0] = (f[3] - f[2] - f[1] + f[0]) / (4 * h[0] * h[1]);
          }
      }
}

static void
minimize_2d (const QvScanPotential *p, double *x)
{
  /* coordinate-wise golden sections on a shrinking box around the best
   * sample (cyclic; converges for the smooth wells of a scan) */
  double half[2] = { (p->hi[0] - p->lo[0]) / (SAMPLES_2D - 1), (p->hi[1] - p->lo[1]) / (SAMPLES_2D - 1) };
  for (int round = 0; round < 60; round++)
    for (guint d = 0; d < 2; d++)
      {
        const double a = MAX (p->lo[d], x[d] - half[d]), b = MIN (p->hi[d], x[d] + half[d]);
        const double gr = (sqrt (5.0) - 1.0) / 2.0;
        double y[2] = { x[0], x[1] }, lo = a, hi = b;
        double c = hi - gr * (hi - lo), e = lo + gr * (hi - lo), fc, fe;
        y[d] = c; fc = qv_scan_potential_eval (p, y);
        y[d] = e; fe = qv_scan_potential_eval (p, y);
        for (int it = 0; it < 80; it++)
          {
            if (fc < fe) { hi = e; e = c; fe = fc; c = hi - gr * (hi - lo); y[d] = c; fc = qv_scan_potential_eval (p, y); }
            else { lo = c; c = e; fc = fe; e = lo + gr * (hi - lo); y[d] = e; fe = qv_scan_potential_eval (p, y); }
          }
        x[d] = 0.5 * (lo + hi);
      }
}

static void
analyse_minima_1d (const QvScanPotential *p, QvScanLevels *l, const double *xs, const double *vs)
{
  /* local minima of the dense sampling, refined; a minimum separated from
   * its neighbour by less than 1e-3 cm⁻¹ of barrier is noise of the fit */
  const double noise = 1e-3 * qv_scan_ev_per_wavenumber ();
  g_autoptr(GArray) found = g_array_new (FALSE, FALSE, sizeof (QvScanMinimum));

  for (gsize i = 1; i + 1 < SAMPLES_1D; i++)
    if (vs[i] < vs[i - 1] && vs[i] <= vs[i + 1])
      {
        QvScanMinimum m = { { golden_min (p, xs[i - 1], xs[i + 1]), 0 }, 0 };
        m.energy = qv_scan_potential_eval (p, m.Q);
        if (found->len > 0)
          {
            QvScanMinimum *prev = &g_array_index (found, QvScanMinimum, found->len - 1);
            double top = -G_MAXDOUBLE;
            for (gsize k = 0; k < SAMPLES_1D; k++)
              if (xs[k] > prev->Q[0] && xs[k] < m.Q[0])
                top = MAX (top, vs[k]);
            if (top - MAX (prev->energy, m.energy) < noise)
              {
                if (m.energy < prev->energy)
                  *prev = m;
                continue;
              }
          }
        g_array_append_val (found, m);
      }
  l->minimum_inside = found->len > 0;
  if (found->len == 0)
    {
      /* the lowest point is at an end of the scan */
      gsize best = 0;
      for (gsize i = 1; i < SAMPLES_1D; i++)
        if (vs[i] < vs[best])
          best = i;
      l->q_min[0] = xs[best];
      l->v_min = vs[best];
    }
  else
    {
      gsize best = 0;
      for (guint k = 1; k < found->len; k++)
        if (g_array_index (found, QvScanMinimum, k).energy < g_array_index (found, QvScanMinimum, best).energy)
          best = k;
      l->q_min[0] = g_array_index (found, QvScanMinimum, best).Q[0];
      l->v_min = g_array_index (found, QvScanMinimum, best).energy;
    }
  for (guint k = 0; k < found->len; k++)
    g_array_index (found, QvScanMinimum, k).energy -= l->v_min;
  l->minima = g_steal_pointer (&found);
  l->barrier = NAN;
  if (l->minima->len >= 2)
    {
      /* the two lowest minima and the highest V between them */
      guint a = 0, b = 1;
      for (guint k = 0; k < l->minima->len; k++)
        {
          const double e = g_array_index (l->minima, QvScanMinimum, k).energy;
          if (e < g_array_index (l->minima, QvScanMinimum, a).energy)
            b = a, a = k;
          else if (k != a && (b == a || e < g_array_index (l->minima, QvScanMinimum, b).energy))
            b = k;
        }
      if (a == b)
        b = a == 0 ? 1 : 0;
      {
        const double qa = g_array_index (l->minima, QvScanMinimum, MIN (a, b)).Q[0];
        const double qb = g_array_index (l->minima, QvScanMinimum, MAX (a, b)).Q[0];
        double top = -G_MAXDOUBLE;
        for (gsize k = 0; k < SAMPLES_1D; k++)
          if (xs[k] > qa && xs[k] < qb)
            top = MAX (top, vs[k]);
        l->barrier = top - l->v_min;
      }
    }
}

/* Outermost points where V crosses @e: from each end inwards. */
static void
turning_points (const QvScanPotential *p, const double *xs, const double *vs, double e,
                double out[2])
{
  out[0] = out[1] = NAN;
  if (vs[0] > e)
    for (gsize i = 1; i < SAMPLES_1D; i++)
      if (vs[i] <= e)
        {
          double a = xs[i - 1], b = xs[i];
          for (int it = 0; it < 100; it++)
            {
              double c = 0.5 * (a + b);
              if (qv_scan_potential_eval (p, &c) > e) a = c; else b = c;
            }
          out[0] = 0.5 * (a + b);
          break;
        }
  if (vs[SAMPLES_1D - 1] > e)
    for (gsize i = SAMPLES_1D - 1; i-- > 0; )
      if (vs[i] <= e)
        {
          double a = xs[i], b = xs[i + 1];
          for (int it = 0; it < 100; it++)
            {
              double c = 0.5 * (a + b);
              if (qv_scan_potential_eval (p, &c) > e) b = c; else a = c;
            }
          out[1] = 0.5 * (a + b);
          break;
        }
}

QvScanLevels *
qv_scan_potential_solve (const QvScanPotential *p, gsize n_levels, double tolerance,
                         gsize max_points, GError **error)
{
  g_autoptr(QvScanLevels) l = g_new0 (QvScanLevels, 1);
  QvDvrRefineOptions options;
  const QvDvrLevels *dvr;
  g_autofree double *xs = NULL, *vs = NULL;
  double hess[2][2];

  if (n_levels < 3)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "at least 3 levels are needed (for the "
                   "fundamental and the overtone), asked for %" G_GSIZE_FORMAT, n_levels);
      return NULL;
    }
  l->dim = p->dim;
  l->fundamental = l->overtone = l->omega_e = l->omega_e_x_e = NAN;
  l->fundamentals[0] = l->fundamentals[1] = NAN;
  l->splitting = NAN;
  l->barrier = NAN;

  /* the minimum and the curvature there */
  if (p->dim == 1)
    {
      xs = g_new (double, SAMPLES_1D);
      vs = g_new (double, SAMPLES_1D);
      for (gsize i = 0; i < SAMPLES_1D; i++)
        {
          xs[i] = p->lo[0] + (p->hi[0] - p->lo[0]) * (double) i / (SAMPLES_1D - 1);
          vs[i] = qv_scan_potential_eval (p, &xs[i]);
        }
      analyse_minima_1d (p, l, xs, vs);
      hessian_at (p, l->q_min, hess);
      l->curvature[0] = hess[0][0];
      l->curvature[1] = NAN;
    }
  else
    {
      double best = G_MAXDOUBLE, x[2] = { 0.0, 0.0 };
      l->minima = g_array_new (FALSE, FALSE, sizeof (QvScanMinimum));
      for (gsize j = 0; j < SAMPLES_2D; j++)
        for (gsize i = 0; i < SAMPLES_2D; i++)
          {
            const double y[2] = { p->lo[0] + (p->hi[0] - p->lo[0]) * (double) i / (SAMPLES_2D - 1),
                                  p->lo[1] + (p->hi[1] - p->lo[1]) * (double) j / (SAMPLES_2D - 1) };
            const double v = qv_scan_potential_eval (p, y);
            if (v < best)
              best = v, x[0] = y[0], x[1] = y[1];
          }
      minimize_2d (p, x);
      l->q_min[0] = x[0];
      l->q_min[1] = x[1];
      l->v_min = qv_scan_potential_eval (p, x);
      l->minimum_inside = TRUE;
      for (guint d = 0; d < 2; d++)
        {
          const double h = 1e-3 * (p->hi[d] - p->lo[d]);
          if (x[d] - p->lo[d] < h || p->hi[d] - x[d] < h)
            l->minimum_inside = FALSE;
        }
      hessian_at (p, x, hess);
      {
        const double tr = hess[0][0] + hess[1][1];
        const double det = hess[0][0] * hess[1][1] - hess[0][1] * hess[1][0];
        const double disc = sqrt (MAX (0.0, tr * tr / 4 - det));
        l->curvature[0] = tr / 2 - disc;
        l->curvature[1] = tr / 2 + disc;
      }
      {
        QvScanMinimum m = { { x[0], x[1] }, 0.0 };
        g_array_append_val (l->minima, m);
      }
    }
  for (guint d = 0; d < p->dim; d++)
    l->harmonic[d] = qv_wavenumber_from_eigenvalue (l->curvature[d]);
  if (p->dim == 1)
    l->harmonic[1] = NAN;

  /* the levels */
  qv_dvr_refine_options_init (&options, p->dim);
  for (guint d = 0; d < p->dim; d++)
    {
      options.lo[d] = p->lo[d];
      options.hi[d] = p->hi[d];
    }
  options.n_levels = n_levels;
  if (tolerance > 0)
    options.tolerance = tolerance;
  if (max_points > 0)
    options.max_points = max_points;
  l->refinement = qv_dvr_refine (&options, dvr_potential, (gpointer) p, qv_dvr_kinetic_prefactor (),
                                 error);
  if (l->refinement == NULL)
    return NULL;
  dvr = l->refinement->levels;
  l->n_levels = dvr->n_levels;
  l->levels = g_new0 (QvScanLevel, l->n_levels);
  for (gsize k = 0; k < l->n_levels; k++)
    {
      QvScanLevel *lv = &l->levels[k];
      lv->energy = dvr->energies[k] - l->v_min;
      for (guint d = 0; d < p->dim; d++)
        lv->mean[d] = qv_dvr_levels_mean (dvr, k, d);
      if (p->dim == 1)
        {
          lv->mean[1] = NAN;
          turning_points (p, xs, vs, dvr->energies[k], lv->turning);
        }
      else
        lv->mean[1] = qv_dvr_levels_mean (dvr, k, 1), lv->turning[0] = lv->turning[1] = NAN;
      lv->edge_weight = qv_dvr_levels_edge_weight (dvr, k, QV_SCAN_EDGE_FRACTION);
      lv->above_scan = dvr->energies[k] > p->v_high;
    }
  if (p->dim == 1)
    {
      l->fundamental = l->levels[1].energy - l->levels[0].energy;
      l->overtone = l->levels[2].energy - l->levels[0].energy;
      l->omega_e_x_e = (2.0 * l->fundamental - l->overtone) / 2.0;
      l->omega_e = l->fundamental + 2.0 * l->omega_e_x_e;
      if (l->minima->len >= 2)
        l->splitting = l->fundamental;
    }
  else
    {
      /* the one-quantum states: largest coupling to the ground state
       * through Q (harmonic two-quantum states have none) */
      double score[2] = { -1, -1 };
      gsize which[2] = { 0, 0 };
      for (gsize k = 1; k < l->n_levels; k++)
        {
          const double m0 = qv_dvr_levels_coordinate_element (dvr, k, 0, 0);
          const double m1 = qv_dvr_levels_coordinate_element (dvr, k, 0, 1);
          const double s = m0 * m0 + m1 * m1;
          if (s > score[0])
            score[1] = score[0], which[1] = which[0], score[0] = s, which[0] = k;
          else if (s > score[1])
            score[1] = s, which[1] = k;
        }
      if (which[0] > which[1])
        {
          const gsize t = which[0];
          which[0] = which[1];
          which[1] = t;
        }
      for (int f = 0; f < 2; f++)
        {
          const double m0 = qv_dvr_levels_coordinate_element (dvr, which[f], 0, 0);
          const double m1 = qv_dvr_levels_coordinate_element (dvr, which[f], 0, 1);
          l->fundamental_level[f] = which[f];
          l->fundamentals[f] = which[f] ? l->levels[which[f]].energy - l->levels[0].energy : NAN;
          l->fundamental_axis[f] = fabs (m1) > fabs (m0) ? 1 : 0;
        }
    }
  return g_steal_pointer (&l);
}
