/* qv-io-test.h — the assertion both reader tests make of an error.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include <string.h>
#include "qv-error.h"

/* QV_ERROR_INPUT whose message starts with @where ("t.xyz:3:5:") and
 * contains @fragment. Needs cmocka included first. */
static inline void
qvt_assert_input_error (const GError *error, const char *where, const char *fragment)
{
  assert_non_null (error);
  if (!g_str_has_prefix (error->message, where) || strstr (error->message, fragment) == NULL)
    print_error ("message: %s\nwanted: %s … %s\n", error->message, where, fragment);
  assert_true (g_error_matches (error, QV_ERROR, QV_ERROR_INPUT));
  assert_true (g_str_has_prefix (error->message, where));
  assert_non_null (strstr (error->message, fragment));
}
