/* qv-comparison-table.h — the comparison of two mode sets as a table:
 * CSV with one row per mode of A (its match in B, the wavenumber shift, the
 * overlap and subspace overlap) followed by A's whole row of the overlap
 * matrix, as `quaver compare --format csv` writes it and the app saves it.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-mode-comparison.h"

G_BEGIN_DECLS

/* The document (newly allocated, NUL-terminated, final newline). */
char *qv_comparison_table_csv (const QvModeComparison *comparison);

G_END_DECLS
