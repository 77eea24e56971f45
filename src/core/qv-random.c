/* qv-random.c — xoshiro256** seeded by splitmix64, normals by Marsaglia's
 * polar method (references in qv-random.h). The integer steps follow the
 * public-domain reference code of both generators word for word.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include "qv-random.h"

guint64
qv_random_splitmix64 (guint64 *state)
{
  guint64 z = (*state += G_GUINT64_CONSTANT (0x9e3779b97f4a7c15));
  z = (z ^ (z >> 30)) * G_GUINT64_CONSTANT (0xbf58476d1ce4e5b9);
  z = (z ^ (z >> 27)) * G_GUINT64_CONSTANT (0x94d049bb133111eb);
  return z ^ (z >> 31);
}

void
qv_random_init_stream (QvRandom *rng, guint64 seed, guint64 index)
{
  /* splitmix64's state advances by a constant per output, so output j of
   * the stream from @seed is the first output from seed + j·γ. */
  guint64 state = seed + 4 * index * G_GUINT64_CONSTANT (0x9e3779b97f4a7c15);

  for (int i = 0; i < 4; i++)
    rng->s[i] = qv_random_splitmix64 (&state);
  /* An all-zero state is the one fixed point of xoshiro; splitmix64 cannot
   * give four zero words in a row (it is a bijection of consecutive states),
   * but keep the guard for hand-made states. */
  if ((rng->s[0] | rng->s[1] | rng->s[2] | rng->s[3]) == 0)
    rng->s[0] = 1;
}

void
qv_random_init (QvRandom *rng, guint64 seed)
{
  qv_random_init_stream (rng, seed, 0);
}

static inline guint64
rotl (guint64 x, int k)
{
  return (x << k) | (x >> (64 - k));
}

guint64
qv_random_next (QvRandom *rng)
{
  guint64 *s = rng->s;
  const guint64 result = rotl (s[1] * 5, 7) * 9;
  const guint64 t = s[1] << 17;

  s[2] ^= s[0];
  s[3] ^= s[1];
  s[1] ^= s[2];
  s[0] ^= s[3];
  s[2] ^= t;
  s[3] = rotl (s[3], 45);
  return result;
}

double
qv_random_uniform (QvRandom *rng)
{
  return (double) (qv_random_next (rng) >> 11) * 0x1.0p-53;
}

void
qv_random_normal_pair (QvRandom *rng, double *z1, double *z2)
{
  double u, v, s, f;
  /* Rounded squares before the sum: a compiler contracting u·u + v·v into a
   * fused multiply-add (GCC does on FMA hardware by default) would change
   * the last bit of s from one machine to the next. */
  volatile double uu, vv;

  /* Accepts a point of the unit disc (probability π/4), rejecting the
   * centre where log(s)/s has no limit. 2U − 1 is exact in binary. */
  do
    {
      u = 2.0 * qv_random_uniform (rng) - 1.0;
      v = 2.0 * qv_random_uniform (rng) - 1.0;
      uu = u * u;
      vv = v * v;
      s = uu + vv;
    }
  while (s >= 1.0 || s == 0.0);
  f = sqrt (-2.0 * log (s) / s);
  *z1 = u * f;
  *z2 = v * f;
}
