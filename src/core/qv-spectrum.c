/* qv-spectrum.c — sticks and their broadened envelope.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-spectrum.h"

gboolean
qv_line_shape_parse (const char *text, QvLineShape *shape, GError **error)
{
  if (g_ascii_strcasecmp (text, "lorentzian") == 0 || g_ascii_strcasecmp (text, "lorentz") == 0)
    *shape = QV_LINE_LORENTZIAN;
  else if (g_ascii_strcasecmp (text, "gaussian") == 0 || g_ascii_strcasecmp (text, "gauss") == 0)
    *shape = QV_LINE_GAUSSIAN;
  else
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "unknown line shape \"%s\"; use lorentzian or gaussian", text);
      return FALSE;
    }
  return TRUE;
}

const char *
qv_line_shape_name (QvLineShape shape)
{
  return shape == QV_LINE_GAUSSIAN ? "gaussian" : "lorentzian";
}

void
qv_spectrum_options_init (QvSpectrumOptions *o)
{
  memset (o, 0, sizeof *o);
  o->shape = QV_LINE_LORENTZIAN;
  o->fwhm = QV_SPECTRUM_DEFAULT_FWHM;
}

double
qv_line_shape_value (QvLineShape shape, double fwhm, double dx)
{
  if (shape == QV_LINE_GAUSSIAN)
    {
      const double sigma = fwhm / sqrt (8.0 * G_LN2);
      return exp (-0.5 * dx * dx / (sigma * sigma)) / (sigma * sqrt (2.0 * G_PI));
    }
  return (fwhm / (2.0 * G_PI)) / (dx * dx + 0.25 * fwhm * fwhm);
}

QvSpectrum *
qv_spectrum_new (gsize n, const double *positions, const double *heights, const guint *modes,
                 const QvSpectrumOptions *o, GError **error)
{
  g_autoptr(QvSpectrum) s = NULL;
  double start, stop, step, top = 0.0, span;
  gsize n_points, kept = 0;

  if (!(o->fwhm > 0 && o->fwhm < 1e5))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "the line width (FWHM) must be above 0 and below 100000 cm^-1, got %g", o->fwhm);
      return NULL;
    }
  for (gsize i = 0; i < n; i++)
    if (isfinite (heights[i]) && isfinite (positions[i]))
      top = MAX (top, positions[i]);
  if (o->has_range)
    {
      start = o->start;
      stop = o->stop;
      if (!(isfinite (start) && isfinite (stop) && start < stop))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "the range must be START:STOP with START below STOP (cm^-1), got %g:%g",
                       start, stop);
          return NULL;
        }
    }
  else
    {
      start = 0.0;
      stop = ceil ((top + QV_SPECTRUM_RANGE_MARGIN * o->fwhm) / 100.0) * 100.0;
    }
  step = o->step > 0 ? o->step : MIN (1.0, o->fwhm / 10.0);
  if (!(isfinite (step) && step > 0) || o->step < 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "the grid step must be above 0 cm^-1");
      return NULL;
    }
  span = stop - start;
  if (span / step + 1 > QV_SPECTRUM_MAX_POINTS)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "a grid from %g to %g cm^-1 in steps of %g has more than %d points; "
                   "take a larger step or a smaller range", start, stop, step,
                   QV_SPECTRUM_MAX_POINTS);
      return NULL;
    }
  /* the last point reaches @stop, or the last step before it */
  n_points = (gsize) floor (span / step + 1e-9) + 1;

  s = g_new0 (QvSpectrum, 1);
  s->shape = o->shape;
  s->fwhm = o->fwhm;
  s->start = start;
  s->step = step;
  s->n_points = n_points;
  s->stick_position = g_new (double, MAX (n, 1));
  s->stick_height = g_new (double, MAX (n, 1));
  s->stick_mode = g_new (guint, MAX (n, 1));
  for (gsize i = 0; i < n; i++)
    if (isfinite (heights[i]) && isfinite (positions[i]))
      {
        s->stick_position[kept] = positions[i];
        s->stick_height[kept] = heights[i];
        s->stick_mode[kept] = modes ? modes[i] : (guint) i;
        kept++;
      }
  s->n_sticks = kept;
  s->envelope = g_new0 (double, n_points);
  if (s->shape == QV_LINE_LORENTZIAN && (double) kept * (double) n_points > QV_SPECTRUM_MAX_WORK)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "%" G_GSIZE_FORMAT " lines on %" G_GSIZE_FORMAT " grid points is more than this "
                   "command evaluates (%.0e); take a larger step or a smaller range", kept,
                   n_points, QV_SPECTRUM_MAX_WORK);
      return NULL;
    }
  for (gsize k = 0; k < kept; k++)
    {
      const double x0 = s->stick_position[k], h = s->stick_height[k];
      gsize i0 = 0, i1 = n_points;
      if (h == 0)
        continue;
      if (s->shape == QV_LINE_GAUSSIAN)
        {
          /* beyond 40 σ the Gaussian is below the smallest double: exactly 0 */
          const double reach = 40.0 * s->fwhm / sqrt (8.0 * G_LN2);
          const double lo = floor ((x0 - reach - start) / step), hi = ceil ((x0 + reach - start) / step) + 1;
          i0 = lo <= 0 ? 0 : lo >= (double) n_points ? n_points : (gsize) lo;
          i1 = hi <= 0 ? 0 : hi >= (double) n_points ? n_points : (gsize) hi;
        }
      for (gsize i = i0; i < i1; i++)
        s->envelope[i] += h * qv_line_shape_value (s->shape, s->fwhm, start + (double) i * step - x0);
    }
  return g_steal_pointer (&s);
}

void
qv_spectrum_free (QvSpectrum *s)
{
  if (s == NULL)
    return;
  g_free (s->stick_position);
  g_free (s->stick_height);
  g_free (s->stick_mode);
  g_free (s->envelope);
  g_free (s);
}

double
qv_spectrum_x (const QvSpectrum *s, gsize i)
{
  return s->start + (double) i * s->step;
}

double
qv_spectrum_stop (const QvSpectrum *s)
{
  return qv_spectrum_x (s, s->n_points - 1);
}

double
qv_spectrum_integral (const QvSpectrum *s)
{
  double sum = 0.0;
  if (s->n_points < 2)
    return 0.0;
  for (gsize i = 0; i < s->n_points; i++)
    sum += (i == 0 || i + 1 == s->n_points ? 0.5 : 1.0) * s->envelope[i];
  return sum * s->step;
}

double
qv_spectrum_stick_sum (const QvSpectrum *s)
{
  double sum = 0.0;
  for (gsize k = 0; k < s->n_sticks; k++)
    sum += s->stick_height[k];
  return sum;
}

double
qv_spectrum_max_envelope (const QvSpectrum *s)
{
  double top = 0.0;
  for (gsize i = 0; i < s->n_points; i++)
    top = MAX (top, s->envelope[i]);
  return top;
}

double
qv_spectrum_max_stick (const QvSpectrum *s)
{
  double top = 0.0;
  for (gsize k = 0; k < s->n_sticks; k++)
    top = MAX (top, s->stick_height[k]);
  return top;
}
