/* qv-phonon-mesh.c — Γ-centred q meshes (see qv-phonon-mesh.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdlib.h>
#include <string.h>
#include "qv-error.h"
#include "qv-phonon-mesh.h"

gboolean
qv_phonon_mesh_parse (const char *text, int n[3], GError **error)
{
  g_auto(GStrv) parts = NULL;
  guint count;

  if (text == NULL || *text == '\0')
    goto bad;
  parts = g_strsplit_set (text, "xX", -1);
  count = g_strv_length (parts);
  if (count != 1 && count != 3)
    goto bad;
  for (guint i = 0; i < 3; i++)
    {
      const char *p = g_strstrip (parts[count == 1 ? 0 : i]);
      char *end = NULL;
      long v = strtol (p, &end, 10);
      if (*p == '\0' || end == NULL || *end != '\0' || v < 1 || v > 1000)
        goto bad;
      n[i] = (int) v;
    }
  if ((gint64) n[0] * n[1] * n[2] > QV_PHONON_MESH_MAX_POINTS)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "mesh '%s' has %" G_GINT64_FORMAT " points, more than %d; use a coarser mesh",
                   text, (gint64) n[0] * n[1] * n[2], QV_PHONON_MESH_MAX_POINTS);
      return FALSE;
    }
  return TRUE;

bad:
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "mesh '%s' not understood; write NxMxL (e.g. 20x20x20) or N, each from 1 to 1000",
               text ? text : "");
  return FALSE;
}

QvPhononMesh *
qv_phonon_mesh_new (const int n[3], GError **error)
{
  QvPhononMesh *mesh;
  gsize k = 0;

  for (int i = 0; i < 3; i++)
    if (n[i] < 1 || n[i] > 1000)
      {
        g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "mesh divisions must be from 1 to 1000, got %d", n[i]);
        return NULL;
      }
  if ((gint64) n[0] * n[1] * n[2] > QV_PHONON_MESH_MAX_POINTS)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "a %dx%dx%d mesh has more than %d points",
                   n[0], n[1], n[2], QV_PHONON_MESH_MAX_POINTS);
      return NULL;
    }
  mesh = g_new0 (QvPhononMesh, 1);
  memcpy (mesh->n, n, sizeof mesh->n);
  mesh->n_q = (gsize) n[0] * n[1] * n[2];
  mesh->q = g_new (double, 3 * mesh->n_q);
  for (int i = 0; i < n[0]; i++)
    for (int j = 0; j < n[1]; j++)
      for (int l = 0; l < n[2]; l++, k++)
        {
          int idx[3] = { i, j, l };
          for (int c = 0; c < 3; c++)
            {
              /* fold into (−½, ½]: i/n − 1 when i/n > ½, compared in integers */
              int m = 2 * idx[c] > n[c] ? idx[c] - n[c] : idx[c];
              mesh->q[3 * k + c] = (double) m / n[c];
            }
        }
  return mesh;
}

void
qv_phonon_mesh_free (QvPhononMesh *mesh)
{
  if (mesh == NULL)
    return;
  g_free (mesh->q);
  g_free (mesh);
}

gsize
qv_phonon_mesh_index (const QvPhononMesh *mesh, long i, long j, long k)
{
  long n0 = mesh->n[0], n1 = mesh->n[1], n2 = mesh->n[2];
  i %= n0; if (i < 0) i += n0;
  j %= n1; if (j < 0) j += n1;
  k %= n2; if (k < 0) k += n2;
  return (gsize) ((i * n1 + j) * n2 + k);
}

typedef struct {
  const QvProgress *outer;
  gsize start, count, total;
} ChunkProgress;

static gboolean
chunk_progress (double fraction, const char *stage, gpointer user_data)
{
  ChunkProgress *cp = user_data;
  double f = ((double) cp->start + fraction * (double) cp->count) / (double) cp->total;
  return cp->outer->func (f, stage, cp->outer->user_data);
}

gboolean
qv_phonon_mesh_solve (const QvForceConstants *fc, const QvPhononMesh *mesh,
                      gboolean want_vectors, gsize chunk_size, guint n_threads,
                      QvPhononChunkFunc func, gpointer user_data,
                      const QvProgress *progress, GError **error)
{
  return qv_phonon_mesh_solve_with (fc, NULL, NULL, mesh, want_vectors, chunk_size, n_threads,
                                    func, user_data, progress, error);
}

gboolean
qv_phonon_mesh_solve_with (const QvForceConstants *fc, QvDynamicalTerm term, gpointer data,
                           const QvPhononMesh *mesh, gboolean want_vectors, gsize chunk_size,
                           guint n_threads, QvPhononChunkFunc func, gpointer user_data,
                           const QvProgress *progress, GError **error)
{
  if (chunk_size == 0)
    chunk_size = 4096;
  for (gsize start = 0; start < mesh->n_q; start += chunk_size)
    {
      gsize count = MIN (chunk_size, mesh->n_q - start);
      ChunkProgress cp = { progress, start, count, mesh->n_q };
      QvProgress inner = { chunk_progress, &cp };
      g_autoptr(QvPhononSet) set =
        qv_dynamical_matrix_solve_with (fc, term, data, mesh->q + 3 * start, count,
                                        want_vectors, n_threads,
                                        progress && progress->func ? &inner : NULL, error);
      if (set == NULL || !func (set, start, user_data, error))
        return FALSE;
    }
  return TRUE;
}
