/* qv-error.h — the error domain shared by the core and the readers.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

#define QV_ERROR (qv_error_quark ())

typedef enum {
  QV_ERROR_INPUT,       /* malformed or inconsistent input: exit code 2 */
  QV_ERROR_USAGE,       /* wrong option or argument: exit code 1 */
  QV_ERROR_LIMIT,       /* beyond a size the solver or the format can take */
  QV_ERROR_SOLVER,      /* LAPACK reported a failure */
  QV_ERROR_CANCELLED,   /* the progress callback asked to stop */
  QV_ERROR_WRITE,       /* output could not be written: exit code 3 */
} QvErrorCode;

GQuark qv_error_quark (void);

G_END_DECLS
