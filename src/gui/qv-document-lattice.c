/* qv-document-lattice.c — a crystal document's lattice dynamics, from the
 * core's functions, on the loading worker.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gi18n.h>
#include <math.h>
#include <string.h>
#include "qv-document-lattice.h"
#include "qv-error.h"
#include "qv-phonon-mesh.h"
#include "qv-space-group.h"
#include "qv-supercell.h"

/* spglib's tolerance for the app's symmetry search, Å (common practice). */
#define SYMPREC 1e-3

void
qv_document_lattice_free (QvDocumentLattice *l)
{
  if (l == NULL)
    return;
  qv_crystal_free (l->crystal);
  g_free (l->space_group);
  g_free (l->origin);
  qv_band_path_free (l->path);
  qv_band_sampling_free (l->sampling);
  g_free (l->bands);
  g_free (l->solve_q);
  g_free (l->order);
  g_free (l->path_note);
  qv_phonon_dos_free (l->dos);
  qv_thermal_free (l->thermal);
  g_free (l->mesh_note);
  g_free (l);
}

/* A mesh whose solve stays around a second on a laptop: 16³ for small
 * cells, fewer points as the branches grow (common practice to refine). */
static void
default_mesh (gsize n_sites, int mesh[3])
{
  int m = (int) floor (24.0 / cbrt ((double) n_sites));
  m = CLAMP (m, 4, 16);
  mesh[0] = mesh[1] = mesh[2] = m;
}

static gboolean
cancelled (const QvProgress *progress, double fraction, const char *stage)
{
  return !qv_progress_report (progress, fraction, stage, NULL);
}

static void
compute_bands (QvDocumentLattice *l, const char *path_text, const QvProgress *progress)
{
  const QvCrystal *c = l->crystal;
  g_autoptr(GError) error = NULL;
  g_autoptr(QvPhononSet) set = NULL;
  guint *order;
  gsize nq, nb;

  l->path = path_text ? qv_band_path_parse (path_text, &error)
                      : qv_band_path_default (c->primitive->cell, 0, &error);
  if (l->path == NULL)
    {
      l->path_note = g_strdup (error->message);
      return;
    }
  l->sampling = qv_band_path_sample (l->path, c->primitive->cell, QV_DOCUMENT_LATTICE_PATH_POINTS,
                                     0, &error);
  if (l->sampling == NULL)
    {
      l->path_note = g_strdup (error->message);
      g_clear_pointer (&l->path, qv_band_path_free);
      return;
    }
  nq = l->sampling->n_q;
  l->solve_q = c->na ? qv_band_sampling_solve_points (l->sampling, 1e-6)
                     : g_memdup2 (l->sampling->q, 3 * nq * sizeof (double));
  set = qv_dynamical_matrix_solve_with (c->fc, qv_crystal_term (c), qv_crystal_term_data (c),
                                        l->solve_q, nq, TRUE, 0, progress, &error);
  if (set == NULL)
    {
      l->path_note = g_strdup (error->message);
      return;
    }
  nb = l->n_branches = set->n_branches;
  order = l->order = g_new (guint, nq * nb);
  qv_band_connect (set, l->sampling->restart, order);
  l->bands = g_new (double, nq * nb);
  for (gsize k = 0; k < nq; k++)
    for (gsize b = 0; b < nb; b++)
      l->bands[k * nb + b] = set->wavenumbers[k * nb + order[k * nb + b]];
}

static void
compute_mesh (QvDocumentLattice *l, const QvProgress *progress)
{
  const QvCrystal *c = l->crystal;
  g_autoptr(GError) error = NULL;
  g_autoptr(QvPhononMesh) mesh = qv_phonon_mesh_new (l->mesh, &error);
  g_autoptr(QvPhononSet) set = NULL;
  QvDosOptions options = { QV_DOS_TETRAHEDRON, 0, 0, 0, 0 };
  double t[101];

  if (mesh == NULL)
    {
      l->mesh_note = g_strdup (error->message);
      return;
    }
  l->dos = qv_phonon_dos_from_force_constants_with (c->fc, qv_crystal_term (c),
                                                    qv_crystal_term_data (c), c->map->z, mesh,
                                                    &options, 0, progress, &error);
  if (l->dos == NULL)
    {
      l->mesh_note = g_strdup (error->message);
      return;
    }
  set = qv_dynamical_matrix_solve_with (c->fc, qv_crystal_term (c), qv_crystal_term_data (c),
                                        mesh->q, mesh->n_q, FALSE, 0, progress, &error);
  if (set == NULL)
    {
      l->mesh_note = g_strdup (error->message);
      return;
    }
  for (int i = 0; i <= 100; i++)
    t[i] = 10.0 * i;
  l->thermal = qv_thermal_compute (mesh->n_q, set->n_branches, mesh->q, set->wavenumbers, TRUE,
                                   t, G_N_ELEMENTS (t));
  l->formula_units = qv_crystal_formula_units (c);
}

/* A structure with a cell and a Hessian but no "crystal": its primitive
 * cell in the same orientation, when spglib finds one smaller than it. */
static QvStructure *
find_primitive (const QvStructure *s)
{
  QvStructure *p;

  if (!s->has_cell || !qv_structure_is_periodic (s))
    return NULL;
  p = qv_space_group_primitive (s, SYMPREC, FALSE, NULL);
  if (p != NULL && p->n_atoms >= s->n_atoms)
    g_clear_pointer (&p, qv_structure_free);
  return p;
}

QvDocumentLattice *
qv_document_lattice_new (const QvInput *input, const QvProgress *progress, char **note)
{
  g_autoptr(QvDocumentLattice) l = NULL;
  g_autoptr(QvStructure) found = NULL;
  g_autoptr(GError) error = NULL;
  const QvInputCrystal *ic = input->crystal;
  const QvStructure *primitive;
  g_autoptr(QvSpaceGroup) group = NULL;

  *note = NULL;
  if (input->hessian == NULL)
    return NULL;
  if (ic != NULL)
    primitive = ic->primitive;
  else if ((primitive = found = find_primitive (input->structure)) == NULL)
    return NULL;
  if (cancelled (progress, -1, N_("folding the force constants")))
    return NULL;

  l = g_new0 (QvDocumentLattice, 1);
  l->origin = g_strdup (ic ? "bundle" : "spglib");
  l->crystal = qv_crystal_new (primitive, input->structure, 0, &error);
  if (l->crystal != NULL && ic && ic->has_supercell_matrix
      && memcmp (ic->supercell_matrix, l->crystal->map->matrix, sizeof ic->supercell_matrix) != 0)
    {
      const int (*m)[3] = l->crystal->map->matrix;
      *note = g_strdup_printf (_("The structure is the supercell [%d %d %d; %d %d %d; %d %d %d] "
                                 "of the primitive cell, not the one the bundle names."),
                               m[0][0], m[0][1], m[0][2], m[1][0], m[1][1], m[1][2], m[2][0],
                               m[2][1], m[2][2]);
      return NULL;
    }
  if (l->crystal == NULL
      || !qv_crystal_set_hessian (l->crystal, input->hessian, TRUE, &error)
      || (ic && ic->born_charges
          && !qv_crystal_set_born (l->crystal, ic->primitive->n_atoms, ic->born_charges,
                                   ic->dielectric_tensor, &error)))
    {
      *note = g_strdup (error->message);
      return NULL;
    }
  group = qv_space_group_find (l->crystal->primitive, SYMPREC, NULL);
  if (group != NULL)
    {
      g_autoptr(QvStructure) conv = qv_space_group_standardized (l->crystal->primitive, SYMPREC,
                                                                 TRUE, NULL);
      l->space_group = g_strdup_printf ("%s (%d)", group->international, group->number);
      if (conv != NULL)
        {
          const double (*a)[3] = conv->cell;
          double len[3];
          for (int i = 0; i < 3; i++)
            len[i] = sqrt (a[i][0] * a[i][0] + a[i][1] * a[i][1] + a[i][2] * a[i][2]);
          for (int i = 0; i < 3; i++)
            {
              const int j = (i + 1) % 3, k = (i + 2) % 3;
              const double dot = a[j][0] * a[k][0] + a[j][1] * a[k][1] + a[j][2] * a[k][2];
              l->conventional[i] = len[i];
              l->conventional[3 + i] = acos (CLAMP (dot / (len[j] * len[k]), -1.0, 1.0)) * 180.0 / G_PI;
            }
          l->has_conventional = TRUE;
          l->conventional_atoms = conv->n_atoms;
        }
    }

  if (cancelled (progress, 0.0, N_("dispersion")))
    return NULL;
  compute_bands (l, ic ? ic->band_path : NULL, progress);
  if (cancelled (progress, 0.5, N_("density of states")))
    return NULL;
  if (ic && ic->mesh[0] > 0)
    memcpy (l->mesh, ic->mesh, sizeof l->mesh);
  else
    default_mesh (l->crystal->map->n_primitive, l->mesh);
  compute_mesh (l, progress);
  if (cancelled (progress, 1.0, N_("density of states")))
    return NULL;
  return g_steal_pointer (&l);
}

QvPhononSet *
qv_document_lattice_solve (const QvDocumentLattice *l, const double q[3], GError **error)
{
  const QvCrystal *c = l->crystal;
  return qv_dynamical_matrix_solve_with (c->fc, qv_crystal_term (c), qv_crystal_term_data (c), q,
                                         1, TRUE, 1, NULL, error);
}
