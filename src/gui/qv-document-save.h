/* qv-document-save.h — saving a window's document as a Quaver bundle: the
 * structure with its masses as edited, the Hessian as read (or the
 * precomputed modes), the derivative tensors and crystal the input had, and
 * the view (camera rotation, projection, zoom, selected mode); and what
 * counts as unsaved work when the window closes. No widgets of its own:
 * it reads the window's view and writes through qv-bundle-writer.h.
 *
 * What counts as unsaved (asked about before a window closes):
 *   - masses changed since the document was loaded or last saved (any
 *     document with a Hessian);
 *   - the view changed since it was loaded or last saved — the camera's
 *     rotation or zoom, the projection or the selected mode — but only for
 *     a document that lives in a bundle (opened from one, or saved as one):
 *     a bundle keeps a view, a geometry and its Hessian do not, and asking
 *     after every rotation of the demo would only teach people to click
 *     "Discard". Panning is not part of a bundle's view and does not count.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include "qv-bundle.h"
#include "qv-window.h"

G_BEGIN_DECLS

/* The view the window shows now, as a bundle keeps it. */
void qv_document_save_current_view (QvWindow *window, QvBundleView *view);
/* Shows the view @doc was saved with (rotation, zoom, selected mode; the
 * projection is the app's preference and stays as it is) and takes the
 * view shown as the document's saved view. The window calls it whenever
 * it shows a new document. */
void qv_document_save_restore_view (QvWindow *window);
/* TRUE when two views differ in a way that counts (see above). */
gboolean qv_document_save_views_differ (const QvBundleView *a, const QvBundleView *b);
/* The window's document has unsaved work (see above); FALSE without one. */
gboolean qv_document_save_has_unsaved (QvWindow *window);

/* Fills @bundle with @doc as it is now and @view, all borrowed from @doc:
 * only for writing it, never to be freed with qv_bundle_free. */
void qv_document_save_fill (QvDocument *doc, const QvBundleView *view, QvBundle *bundle);
/* Writes the window's document and view to @path (an existing bundle, and
 * its NAME.hessian.npy, only with @force) and makes that the saved state. */
gboolean qv_document_save_write (QvWindow *window, const char *path, gboolean force,
                                 GError **error);

G_END_DECLS
