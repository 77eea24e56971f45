/* qv-labels.c — the glyph atlas for atom labels (in progress).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "qv-renderer-private.h"
