/* qv-random.h — a portable, seedable random stream: the same seed gives the
 * same numbers on every machine and with every compiler.
 *
 * Integers: xoshiro256** 1.0 (Blackman & Vigna, "Scrambled linear
 * pseudorandom number generators", ACM Trans. Math. Softw. 47, 36, 2021;
 * preprint 2018), its 256-bit state filled from splitmix64 (Steele, Lea &
 * Flood, OOPSLA 2014), as its authors recommend. Uniform doubles are the top
 * 53 bits times 2⁻⁵³ (exact). Normal deviates come in pairs from Marsaglia's
 * polar method (Marsaglia & Bray, SIAM Review 6, 260, 1964), which uses only
 * +, ×, /, √ (all correctly rounded in IEEE 754) and one log() from libm.
 * No global state: every stream is a value the caller owns (thread-safe).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

typedef struct {
  guint64 s[4];
} QvRandom;

/* The next output of splitmix64 for the state *@state (which advances). */
guint64 qv_random_splitmix64 (guint64 *state);

/* Seeds @rng with four consecutive splitmix64 outputs from @seed. */
void qv_random_init (QvRandom *rng, guint64 seed);
/* Stream @index of @seed: the state is splitmix64 outputs 4·index … 4·index+3
 * of the stream started at @seed, so stream i is the same whatever streams
 * were used before it (sample i of an ensemble does not depend on N).
 * qv_random_init (rng, seed) is stream 0. */
void qv_random_init_stream (QvRandom *rng, guint64 seed, guint64 index);

/* The next 64-bit output of xoshiro256**. */
guint64 qv_random_next (QvRandom *rng);
/* Uniform in [0, 1): (next >> 11) · 2⁻⁵³. */
double qv_random_uniform (QvRandom *rng);
/* Two independent standard normal deviates (Marsaglia polar). */
void qv_random_normal_pair (QvRandom *rng, double *z1, double *z2);

G_END_DECLS
