/* qv-fuzz.h — what every reader's fuzz target shares (tests/fuzz).
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Each fuzz-<reader>.c defines qv_fuzz_read. The same object is linked two
 * ways: with libFuzzer (fuzz-main.c, -Dfuzz=enabled, clang) to search for
 * inputs that break the reader, and with fuzz-replay.c in every build with
 * tests, which reads the committed corpus and the crash regressions through
 * it. A violated contract aborts, so both the fuzzer and the replay see it
 * as a crash. */
#pragma once

#include <glib.h>

G_BEGIN_DECLS

/* What the reader's messages call the input (and the start every message
 * must have: "NAME:LINE:COL: …" or "NAME: …"). */
#define QV_FUZZ_NAME "fuzz-input"

/* Reads @data through the target's reader(s) and checks their contract;
 * TRUE when the input was accepted. Never returns on a violation. */
gboolean qv_fuzz_read (const guint8 *data, gsize size);

/* The contract of a failed read: a result of NULL comes with an error in
 * QV_ERROR, its message valid UTF-8 starting with "@name:" or "@name " (or
 * with @name alone when it ends in '/': a file in that folder). A
 * result with an error set is a violation too. Frees @error. */
void qv_fuzz_check_failure (const char *reader, gboolean failed, GError *error,
                            const char *name);

/* Aborts with "reader: what" when @condition is false. */
#define qv_fuzz_assert(reader, condition, what)                                 \
  G_STMT_START {                                                                \
    if (G_UNLIKELY (!(condition)))                                              \
      qv_fuzz_fail (reader, "%s (%s, %s:%d)", what, #condition, __FILE__, __LINE__); \
  } G_STMT_END

G_NORETURN void qv_fuzz_fail (const char *reader, const char *format, ...) G_GNUC_PRINTF (2, 3);

/* A folder of this process for files a target needs on disk (made once,
 * removed at exit). */
const char *qv_fuzz_folder (void);

/* Writes @data to @path (replacing it); aborts when it cannot. */
void qv_fuzz_write (const char *path, const void *data, gsize size);

/* Called once before the first input: criticals and warnings abort. */
void qv_fuzz_init (void);

G_END_DECLS
