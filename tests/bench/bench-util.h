/* bench-util.h — small pieces both benchmark programs use.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

/* Stops with "g_get_prgname(): message" and exit status 1. */
G_GNUC_NORETURN G_GNUC_PRINTF (1, 2) void bench_die (const char *format, ...);
/* splitmix64 (Steele, Lea & Flood, OOPSLA 2014): a fixed-seed stream. */
guint64 bench_splitmix64 (guint64 *state);
/* Uniform in [0, 1) from the stream. */
double bench_uniform (guint64 *state);
