/* qv-hessian.c
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-hessian.h"
#include "qv-size.h"

QvHessian *
qv_hessian_new (gsize n, gboolean zero, GError **error)
{
  QvHessian *h;
  gsize count;

  if (n == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "a 0×0 matrix cannot be allocated");
      return NULL;
    }
  {
    /* Refuse what cannot fit in physical memory before asking for it: with
     * overcommit, malloc may say yes and the process is killed later. */
    g_autofree char *what = g_strdup_printf ("a %" G_GSIZE_FORMAT "×%" G_GSIZE_FORMAT " Hessian",
                                             n, n);
    if (!qv_size_check_matrix (n, 0, what, error))
      return NULL;
  }
  count = n * n;
  h = g_new0 (QvHessian, 1);
  h->n = n;
  h->data = zero ? g_try_malloc0 (count * sizeof (double))
                 : g_try_malloc (count * sizeof (double));
  if (h->data == NULL)
    {
      g_free (h);
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                   "not enough memory for a %" G_GSIZE_FORMAT "×%" G_GSIZE_FORMAT
                   " matrix (%.1f MiB)", n, n, (double) count * sizeof (double) / 1048576.0);
      return NULL;
    }
  return h;
}

void
qv_hessian_free (QvHessian *hessian)
{
  if (hessian == NULL)
    return;
  g_free (hessian->data);
  g_free (hessian);
}

QvHessian *
qv_hessian_copy (const QvHessian *hessian, GError **error)
{
  QvHessian *h = qv_hessian_new (hessian->n, FALSE, error);
  if (h == NULL)
    return NULL;
  memcpy (h->data, hessian->data, hessian->n * hessian->n * sizeof (double));
  h->layout = hessian->layout;
  h->transposed = hessian->transposed;
  return h;
}

void
qv_hessian_scale (QvHessian *hessian, double factor)
{
  const gsize count = hessian->n * hessian->n;
  if (factor == 1.0)
    return;
  for (gsize i = 0; i < count; i++)
    hessian->data[i] *= factor;
}

double
qv_hessian_symmetrize (QvHessian *hessian)
{
  /* Blocked so both the (i, j) and the (j, i) tiles stay in cache. */
  enum { B = 64 };
  const gsize n = hessian->n;
  double *a = hessian->data;
  double max_abs = 0.0, max_diff = 0.0;

  for (gsize jb = 0; jb < n; jb += B)
    for (gsize ib = jb; ib < n; ib += B)
      {
        const gsize jend = MIN (jb + B, n), iend = MIN (ib + B, n);
        for (gsize j = jb; j < jend; j++)
          for (gsize i = MAX (ib, j); i < iend; i++)
            {
              const double x = a[i + j * n], y = a[j + i * n];
              const double d = fabs (x - y);
              const double m = 0.5 * (x + y);
              if (d > max_diff) max_diff = d;
              if (fabs (x) > max_abs) max_abs = fabs (x);
              if (fabs (y) > max_abs) max_abs = fabs (y);
              a[i + j * n] = m;
              a[j + i * n] = m;
            }
      }
  hessian->transposed = FALSE;   /* symmetric: both readings agree */
  return max_abs > 0.0 ? max_diff / max_abs : 0.0;
}

gssize
qv_hessian_find_nonfinite (const QvHessian *hessian)
{
  const gsize count = hessian->n * hessian->n;
  for (gsize i = 0; i < count; i++)
    if (!isfinite (hessian->data[i]))
      return (gssize) i;
  return -1;
}

const char *
qv_hessian_layout_name (QvHessianLayout layout)
{
  switch (layout)
    {
    case QV_HESSIAN_LAYOUT_AUTO: return "auto";
    case QV_HESSIAN_LAYOUT_FULL: return "full";
    case QV_HESSIAN_LAYOUT_LOWER: return "lower";
    case QV_HESSIAN_LAYOUT_UPPER: return "upper";
    case QV_HESSIAN_LAYOUT_NPY: return "npy";
    default: return "?";
    }
}

gboolean
qv_hessian_layout_parse (const char *text, QvHessianLayout *layout, GError **error)
{
  static const QvHessianLayout all[] = {
    QV_HESSIAN_LAYOUT_AUTO, QV_HESSIAN_LAYOUT_FULL, QV_HESSIAN_LAYOUT_LOWER, QV_HESSIAN_LAYOUT_UPPER,
  };
  for (gsize i = 0; i < G_N_ELEMENTS (all); i++)
    if (text && g_ascii_strcasecmp (text, qv_hessian_layout_name (all[i])) == 0)
      {
        *layout = all[i];
        return TRUE;
      }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "unknown Hessian layout '%s'; accepted: auto, full, lower, upper", text ? text : "");
  return FALSE;
}
