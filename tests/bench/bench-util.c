/* bench-util.c
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include "bench-util.h"

void
bench_die (const char *format, ...)
{
  va_list args;
  va_start (args, format);
  fprintf (stderr, "%s: ", g_get_prgname () ? g_get_prgname () : "bench");
  vfprintf (stderr, format, args);
  fputc ('\n', stderr);
  va_end (args);
  exit (1);
}

guint64
bench_splitmix64 (guint64 *state)
{
  guint64 z = (*state += 0x9E3779B97F4A7C15ULL);
  z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
  z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
  return z ^ (z >> 31);
}

double
bench_uniform (guint64 *state)
{
  return (double) (bench_splitmix64 (state) >> 11) * 0x1.0p-53;
}
