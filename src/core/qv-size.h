/* qv-size.h — sizes that become allocations: overflow-checked products and
 * a check against the machine's physical memory, so a count read from a
 * file turns into a clear error instead of a wrapped size or an
 * out-of-memory kill.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

/* *@out = a·b (a·b·c); FALSE, and *@out = G_MAXSIZE, when it overflows. */
gboolean qv_size_mul (gsize a, gsize b, gsize *out);
gboolean qv_size_mul3 (gsize a, gsize b, gsize c, gsize *out);

/* The machine's physical memory in bytes (sysconf _SC_PHYS_PAGES ×
 * _SC_PAGESIZE); 0 when unknown. Builds with -Dtests=true honour
 * QV_TEST_PHYSICAL_MEMORY (bytes) in the environment, so tests can play a
 * small machine. */
guint64 qv_size_physical_memory (void);
#define QV_SIZE_MEMORY_ENV "QV_TEST_PHYSICAL_MEMORY"

/* FALSE with QV_ERROR_LIMIT "too large for this machine: WHAT needs 107.3 GiB
 * (this machine has 23.5 GiB)" (binary units) when @bytes exceeds the physical memory
 * (nothing is refused when it is unknown). @what names the data, e.g. "a
 * 120000×120000 Hessian". */
gboolean qv_size_check_memory (guint64 bytes, const char *what, GError **error);

/* The check for an n×n matrix of doubles, plus @extra_bytes of work space
 * needed at the same time; also refuses an n² that overflows. */
gboolean qv_size_check_matrix (gsize n, guint64 extra_bytes, const char *what,
                               GError **error);

G_END_DECLS
