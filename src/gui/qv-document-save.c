/* qv-document-save.c — a window's document to a bundle, and what is unsaved.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-bundle-writer.h"
#include "qv-document-save.h"
#include "qv-error.h"

/* Views equal within these count as the same: the camera is kept in
 * single precision, and a bundle written and read again is equal to
 * rounding. */
#define ORIENTATION_TOLERANCE 1e-5
#define ZOOM_TOLERANCE 1e-5

void
qv_document_save_current_view (QvWindow *window, QvBundleView *view)
{
  QvModeView *mv = qv_window_get_mode_view (window);
  const int k = qv_mode_panel_get_selected (qv_window_get_mode_panel (window));
  QvCamera camera;
  gboolean orthographic = FALSE;

  memset (view, 0, sizeof *view);
  view->present = TRUE;
  if (qv_mode_view_get_camera (mv, &camera))
    {
      view->has_orientation = TRUE;
      for (int i = 0; i < 4; i++)
        view->orientation[i] = camera.orientation[i];
    }
  g_object_get (mv, "orthographic", &orthographic, NULL);
  view->has_projection = TRUE;
  view->orthographic = orthographic;
  view->zoom = qv_mode_view_get_zoom (mv);
  view->mode = k >= 0 ? (guint) k + 1 : 0;
}

void
qv_document_save_restore_view (QvWindow *window)
{
  QvDocument *doc = qv_window_get_document (window);
  const QvBundleView *saved;
  QvBundleView shown;

  if (doc == NULL)
    return;
  saved = qv_document_get_saved_view (doc);
  if (saved->present)
    {
      const QvModeSet *modes = qv_document_get_modes (doc);
      if (saved->has_orientation)
        qv_mode_view_set_orientation (qv_window_get_mode_view (window), saved->orientation);
      qv_mode_view_set_zoom (qv_window_get_mode_view (window), saved->zoom > 0.0 ? saved->zoom : 1.0);
      if (saved->mode >= 1 && modes != NULL && saved->mode <= modes->n_modes)
        qv_mode_panel_select (qv_window_get_mode_panel (window), (int) saved->mode - 1);
    }
  qv_document_save_current_view (window, &shown);
  qv_document_mark_saved (doc, qv_document_get_bundle_path (doc), &shown);
}

gboolean
qv_document_save_views_differ (const QvBundleView *a, const QvBundleView *b)
{
  if (a->present != b->present || a->has_orientation != b->has_orientation
      || a->has_projection != b->has_projection || a->mode != b->mode)
    return TRUE;
  if (a->has_projection && a->orthographic != b->orthographic)
    return TRUE;
  if (fabs (a->zoom - b->zoom) > ZOOM_TOLERANCE * MAX (fabs (a->zoom), 1.0))
    return TRUE;
  if (a->has_orientation)
    {
      /* q and −q are the same rotation */
      double plus = 0.0, minus = 0.0;
      for (int i = 0; i < 4; i++)
        {
          plus = MAX (plus, fabs (a->orientation[i] - b->orientation[i]));
          minus = MAX (minus, fabs (a->orientation[i] + b->orientation[i]));
        }
      if (MIN (plus, minus) > ORIENTATION_TOLERANCE)
        return TRUE;
    }
  return FALSE;
}

gboolean
qv_document_save_has_unsaved (QvWindow *window)
{
  QvDocument *doc = qv_window_get_document (window);
  QvBundleView now;

  if (doc == NULL)
    return FALSE;
  if (qv_document_get_masses_unsaved (doc))
    return TRUE;
  if (qv_document_get_bundle_path (doc) == NULL)
    return FALSE;
  qv_document_save_current_view (window, &now);
  return qv_document_save_views_differ (&now, qv_document_get_saved_view (doc));
}

void
qv_document_save_fill (QvDocument *doc, const QvBundleView *view, QvBundle *b)
{
  /* Borrowed, not copied: a 2000-atom Hessian is 288 MB. */
  const QvStructure *s = qv_document_get_structure (doc);
  const QvInputCrystal *crystal = qv_document_get_crystal (doc);
  const QvDocumentAnalysis *analysis = qv_document_get_analysis (doc);

  memset (b, 0, sizeof *b);
  b->title = (char *) (s->comment && s->comment[0] ? s->comment : qv_document_get_name (doc));
  b->structure = (QvStructure *) s;
  b->mass_model = qv_document_get_mass_model (doc);
  b->hessian = (QvHessian *) qv_document_get_hessian (doc);
  if (b->hessian == NULL)
    b->modes = (QvModeSet *) qv_document_get_modes (doc);   /* precomputed */
  if (view)
    b->view = *view;
  b->derivatives = analysis ? analysis->derivatives : NULL;
  if (crystal != NULL)
    {
      b->primitive = crystal->primitive;
      b->has_supercell_matrix = crystal->has_supercell_matrix;
      memcpy (b->supercell_matrix, crystal->supercell_matrix, sizeof b->supercell_matrix);
      b->band_path = crystal->band_path;
      memcpy (b->mesh, crystal->mesh, sizeof b->mesh);
      if (crystal->born_charges != NULL)
        {
          b->born_charges = crystal->born_charges;
          b->has_dielectric = TRUE;
          memcpy (b->dielectric_tensor, crystal->dielectric_tensor, sizeof b->dielectric_tensor);
        }
    }
}

gboolean
qv_document_save_write (QvWindow *window, const char *path, gboolean force, GError **error)
{
  QvDocument *doc = qv_window_get_document (window);
  QvBundle bundle;
  QvBundleView view;

  if (doc == NULL)
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE, "no document to save");
      return FALSE;
    }
  qv_document_save_current_view (window, &view);
  qv_document_save_fill (doc, &view, &bundle);
  if (!qv_bundle_write_file (path, &bundle, force, NULL, error))
    return FALSE;
  qv_document_mark_saved (doc, path, &view);
  return TRUE;
}
