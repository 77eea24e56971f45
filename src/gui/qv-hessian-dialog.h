/* qv-hessian-dialog.h — asks for the Hessian of an XYZ geometry: its file,
 * its units (never guessed) and its text layout.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <gtk/gtk.h>
#include "qv-document.h"

G_BEGIN_DECLS

#define QV_TYPE_HESSIAN_DIALOG (qv_hessian_dialog_get_type ())
G_DECLARE_FINAL_TYPE (QvHessianDialog, qv_hessian_dialog, QV, HESSIAN_DIALOG, GtkWindow)

/* Signal "chosen" (QvDocumentSource *, borrowed) when the user opens. */
QvHessianDialog *qv_hessian_dialog_new (GtkWindow *parent, const char *geometry);
/* What the fields say; for tests that fill them in. */
void qv_hessian_dialog_set_hessian (QvHessianDialog *self, const char *path);
void qv_hessian_dialog_set_unit (QvHessianDialog *self, int unit);   /* QvHessianUnit, −1 none */
gboolean qv_hessian_dialog_can_open (QvHessianDialog *self);
/* Emits "chosen" and closes, as the Open button does. */
void qv_hessian_dialog_open (QvHessianDialog *self);

G_END_DECLS
