/* qv-fixed-format.h — fast, exact fixed-point formatting of doubles: the
 * same characters as printf "%.Nf" in the C locale (round half to even on
 * the exact binary value, as glibc does), some 20 times faster, for the
 * millions of coordinates an ensemble or a scan writes.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* Largest @decimals accepted (10¹⁵ × a 53-bit mantissa fits 104 bits). */
#define QV_FIXED_MAX_DECIMALS 15
/* Characters @buf must hold (the widest "%.15f" of a double). */
#define QV_FIXED_BUF_SIZE 352

/* Writes @value with @decimals (0…QV_FIXED_MAX_DECIMALS) digits after the
 * point into @buf and returns its length. Values of magnitude 2⁶³ or more
 * and non-finite ones are passed to g_ascii_formatd, so the result always
 * equals g_ascii_formatd (buf, …, "%.Nf", value). */
gsize qv_fixed_format (char *buf, double value, int decimals);

G_END_DECLS
