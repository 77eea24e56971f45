/* qv-comparison-table.c — the comparison of two mode sets as CSV.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "qv-comparison-table.h"
#include "qv-json-writer.h"

static void
csv_number (GString *out, double value)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  g_string_append (out, qv_json_format_double (buf, value));
}

char *
qv_comparison_table_csv (const QvModeComparison *c)
{
  GString *out = g_string_new ("mode_a,wavenumber_a_cm^-1,match_b,wavenumber_b_cm^-1,shift_cm^-1,"
                               "overlap,subspace_overlap,degenerate");
  gsize n_a = qv_mode_comparison_n_modes_a (c), n_b = qv_mode_comparison_n_modes_b (c);
  const double *o = qv_mode_comparison_overlaps (c);

  for (gsize j = 0; j < n_b; j++)
    g_string_append_printf (out, ",overlap_b%" G_GSIZE_FORMAT, j + 1);
  g_string_append_c (out, '\n');
  for (gsize i = 0; i < n_a; i++)
    {
      gsize j = qv_mode_comparison_partner_of_a (c, i);
      const QvModePair *p = NULL;

      for (gsize k = 0; k < qv_mode_comparison_n_pairs (c) && j != QV_COMPARISON_NONE; k++)
        if (qv_mode_comparison_pair (c, k)->mode_a == i)
          p = qv_mode_comparison_pair (c, k);
      g_string_append_printf (out, "%" G_GSIZE_FORMAT ",", i + 1);
      if (p)
        {
          csv_number (out, p->wavenumber_a);
          g_string_append_printf (out, ",%" G_GSIZE_FORMAT ",", p->mode_b + 1);
          csv_number (out, p->wavenumber_b);
          g_string_append_c (out, ',');
          csv_number (out, p->shift);
          g_string_append_c (out, ',');
          csv_number (out, p->overlap);
          g_string_append_c (out, ',');
          csv_number (out, p->subspace_overlap);
          g_string_append (out, p->degenerate ? ",true" : ",false");
        }
      else
        {
          /* unmatched: the wavenumber of A, empty match columns */
          csv_number (out, qv_mode_comparison_wavenumber_a (c, i));
          g_string_append (out, ",,,,,,");
        }
      for (gsize jj = 0; jj < n_b; jj++)
        {
          g_string_append_c (out, ',');
          csv_number (out, o[i * n_b + jj]);
        }
      g_string_append_c (out, '\n');
    }
  return g_string_free (out, FALSE);
}
