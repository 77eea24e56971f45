/* test-size.c — qv-size: overflow-checked products and the physical-memory
 * check that turns an impossible allocation into a message (issue 8).
 * The expected values are exact integer arithmetic (common practice: a
 * product overflows gsize when it exceeds G_MAXSIZE = 2^64 - 1 on LP64).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdarg.h>
#include <stddef.h>
#include <setjmp.h>
#include <stdint.h>
#include <string.h>
#include <unistd.h>
#include <cmocka.h>
#include <glib.h>
#include "qv-error.h"
#include "qv-hessian.h"
#include "qv-size.h"

static void
test_mul (void **state)
{
  gsize out = 0;
  (void) state;
  assert_true (qv_size_mul (3, 7, &out));
  assert_int_equal (out, 21);
  assert_true (qv_size_mul (0, G_MAXSIZE, &out));
  assert_int_equal (out, 0);
  assert_true (qv_size_mul (G_MAXSIZE, 1, &out));
  assert_true (out == G_MAXSIZE);
  /* 2^32 · 2^32 = 2^64 wraps to 0 in gsize arithmetic */
  assert_false (qv_size_mul ((gsize) 1 << 32, (gsize) 1 << 32, &out));
  assert_true (out == G_MAXSIZE);
  /* (2^32 - 1)^2 = 2^64 - 2^33 + 1 still fits */
  assert_true (qv_size_mul (((gsize) 1 << 32) - 1, ((gsize) 1 << 32) - 1, &out));
  assert_true (out == G_MAXSIZE - ((gsize) 1 << 33) + 2);
  /* a declared 3·10^9-row matrix of doubles: 9·10^18 elements fit, ×8
   * bytes do not */
  assert_true (qv_size_mul (3000000000u, 3000000000u, &out));
  assert_false (qv_size_mul3 (3000000000u, 3000000000u, sizeof (double), &out));
  assert_true (qv_size_mul3 (9, 9, sizeof (double), &out));
  assert_int_equal (out, 648);
}

static void
test_physical_memory (void **state)
{
  (void) state;
  g_unsetenv (QV_SIZE_MEMORY_ENV);
  /* the real machine: sysconf agrees with itself and is at least 64 MiB */
  assert_true (qv_size_physical_memory ()
               == (guint64) sysconf (_SC_PHYS_PAGES) * (guint64) sysconf (_SC_PAGESIZE));
  assert_true (qv_size_physical_memory () >= ((guint64) 64 << 20));
  g_setenv (QV_SIZE_MEMORY_ENV, "1048576", TRUE);
  assert_true (qv_size_physical_memory () == 1048576);
  g_unsetenv (QV_SIZE_MEMORY_ENV);
}

static void
test_check (void **state)
{
  g_autoptr(GError) error = NULL;
  (void) state;

  g_setenv (QV_SIZE_MEMORY_ENV, "1073741824", TRUE);     /* a 1 GiB machine */
  assert_true (qv_size_check_memory ((guint64) 1 << 30, "exactly all of it", &error));
  assert_false (qv_size_check_memory (((guint64) 1 << 30) + 1, "one byte more", &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_LIMIT));
  assert_string_equal (error->message, "too large for this machine: one byte more needs 1.0 GiB "
                       "(this machine has 1.0 GiB)");
  g_clear_error (&error);

  /* 12000² doubles = 1 152 000 000 bytes = 1.07 GiB > 1 GiB; 11000² fit */
  assert_true (qv_size_check_matrix (11000, 0, "m", &error));
  assert_false (qv_size_check_matrix (12000, 0, "a 12000×12000 Hessian", &error));
  assert_string_equal (error->message, "too large for this machine: a 12000×12000 Hessian "
                       "needs 1.1 GiB (this machine has 1.0 GiB)");
  g_clear_error (&error);
  /* workspace on top of the matrix counts */
  assert_false (qv_size_check_matrix (11000, (guint64) 200 << 20, "m", &error));
  g_clear_error (&error);
  /* n² · 8 overflowing gsize is refused whatever the machine */
  g_unsetenv (QV_SIZE_MEMORY_ENV);
  assert_false (qv_size_check_matrix ((gsize) 1 << 31, 0, "a huge one", &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_LIMIT));
  assert_non_null (strstr (error->message, "too large for any machine"));
}

static void
test_hessian_new (void **state)
{
  g_autoptr(GError) error = NULL;
  QvHessian *h;
  (void) state;

  /* qv_hessian_new refuses before allocating: on a 64 MiB "machine" a
   * 3000×3000 matrix (72 MB = 68.7 MiB) is refused, 2000×2000 (32 MB) made */
  g_setenv (QV_SIZE_MEMORY_ENV, "67108864", TRUE);
  assert_null (qv_hessian_new (3000, FALSE, &error));
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_LIMIT));
  assert_string_equal (error->message, "too large for this machine: a 3000×3000 Hessian needs "
                       "68.7 MiB (this machine has 64.0 MiB)");
  g_clear_error (&error);
  h = qv_hessian_new (2000, TRUE, &error);
  assert_non_null (h);
  assert_true (h->data[2000 * 2000 - 1] == 0.0);
  qv_hessian_free (h);
  g_unsetenv (QV_SIZE_MEMORY_ENV);
}

int
main (void)
{
  const struct CMUnitTest tests[] = {
    cmocka_unit_test (test_mul),
    cmocka_unit_test (test_physical_memory),
    cmocka_unit_test (test_check),
    cmocka_unit_test (test_hessian_new),
  };
  return cmocka_run_group_tests (tests, NULL, NULL);
}
