/* qv-spectrum-table.c — spectra as CSV.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include "qv-json-writer.h"
#include "qv-spectrum-table.h"

static void
csv_number (GString *out, double v)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  g_string_append_c (out, ',');
  if (isfinite (v))
    g_string_append (out, qv_json_format_double (buf, v));
}

char *
qv_spectrum_table_sticks_csv (const QvIntensities *in, double scale)
{
  GString *out = g_string_new ("mode,wavenumber_cm-1,scaled_wavenumber_cm-1,ir_km_mol,"
                               "raman_activity_A4_u,raman_intensity_1e-30_cm2_sr\n");
  for (gsize k = 0; k < in->n_modes; k++)
    {
      const QvModeIntensity *m = &in->modes[k];
      g_string_append_printf (out, "%" G_GSIZE_FORMAT, k + 1);
      csv_number (out, m->wavenumber);
      csv_number (out, m->wavenumber * scale);
      csv_number (out, in->has_ir && m->defined ? m->ir : NAN);
      csv_number (out, in->has_raman && m->defined ? m->raman_activity : NAN);
      csv_number (out, in->has_raman && m->raman_defined ? m->raman_intensity : NAN);
      g_string_append_c (out, '\n');
    }
  return g_string_free (out, FALSE);
}

char *
qv_spectrum_table_envelope_csv (const QvSpectrum *s, const char *quantity, const char *unit)
{
  GString *out = g_string_new (NULL);
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  g_autofree char *u = g_strdelimit (g_strdup (unit), " /^", '_');

  g_string_append_printf (out, "wavenumber_cm-1,%s_%s_per_cm-1\n", quantity, u);
  for (gsize i = 0; i < s->n_points; i++)
    {
      g_string_append (out, qv_json_format_double (buf, qv_spectrum_x (s, i)));
      csv_number (out, s->envelope[i]);
      g_string_append_c (out, '\n');
    }
  return g_string_free (out, FALSE);
}
