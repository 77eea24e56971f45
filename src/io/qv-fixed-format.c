/* qv-fixed-format.c — exact "%.Nf" without printf.
 *
 * A finite double is m·2^e exactly (m < 2⁵³). For e < 0 the digits are
 * round(m·10^N / 2^−e): the product is exact in 128-bit integers, the
 * division a shift, and the rounding half-to-even on the exact remainder —
 * what glibc's printf does in the default rounding mode, so the output is
 * identical byte for byte (checked against g_ascii_formatd in
 * tests/io/test-fixed-format.c).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-fixed-format.h"

__extension__ typedef unsigned __int128 u128;

static const guint64 pow10_table[QV_FIXED_MAX_DECIMALS + 1] = {
  1ULL, 10ULL, 100ULL, 1000ULL, 10000ULL, 100000ULL, 1000000ULL, 10000000ULL,
  100000000ULL, 1000000000ULL, 10000000000ULL, 100000000000ULL, 1000000000000ULL,
  10000000000000ULL, 100000000000000ULL, 1000000000000000ULL,
};

/* Decimal digits of @v (at least one) at @p; returns the count. */
static gsize
put_u64 (char *p, guint64 v)
{
  char tmp[24];
  gsize n = 0;

  do
    {
      tmp[n++] = (char) ('0' + v % 10);
      v /= 10;
    }
  while (v);
  for (gsize i = 0; i < n; i++)
    p[i] = tmp[n - 1 - i];
  return n;
}

gsize
qv_fixed_format (char *buf, double value, int decimals)
{
  guint64 bits, mantissa, int_part, frac_part;
  int exponent;
  u128 scaled;
  char *p = buf;

  g_return_val_if_fail (decimals >= 0 && decimals <= QV_FIXED_MAX_DECIMALS, 0);
  if (!isfinite (value) || fabs (value) >= 0x1.0p63)
    {
      char format[8];
      g_snprintf (format, sizeof format, "%%.%df", decimals);
      g_ascii_formatd (buf, QV_FIXED_BUF_SIZE, format, value);
      return strlen (buf);
    }

  memcpy (&bits, &value, sizeof bits);
  if (bits >> 63)
    *p++ = '-';
  exponent = (int) ((bits >> 52) & 0x7ff);
  mantissa = bits & ((G_GUINT64_CONSTANT (1) << 52) - 1);
  if (exponent == 0)
    exponent = 1;                       /* subnormal */
  else
    mantissa |= G_GUINT64_CONSTANT (1) << 52;
  exponent -= 1075;                     /* value = mantissa · 2^exponent */

  if (exponent >= 0)
    {
      /* An integer below 2⁶³ (checked above). */
      int_part = mantissa << exponent;
      frac_part = 0;
    }
  else
    {
      const int shift = -exponent;
      scaled = (u128) mantissa * pow10_table[decimals];
      if (shift >= 120)
        scaled = 0;                     /* below 2⁻⁶⁸ · 10^N < ½ */
      else
        {
          const u128 q = scaled >> shift;
          const u128 r = scaled - (q << shift);
          const u128 half = (u128) 1 << (shift - 1);
          scaled = q + ((r > half || (r == half && (q & 1))) ? 1 : 0);
        }
      int_part = (guint64) (scaled / pow10_table[decimals]);
      frac_part = (guint64) (scaled % pow10_table[decimals]);
    }
  p += put_u64 (p, int_part);
  if (decimals > 0)
    {
      *p++ = '.';
      for (int i = decimals - 1; i >= 0; i--)
        {
          p[i] = (char) ('0' + frac_part % 10);
          frac_part /= 10;
        }
      p += decimals;
    }
  *p = '\0';
  return (gsize) (p - buf);
}
