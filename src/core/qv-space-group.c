/* qv-space-group.c — the space group of a periodic structure, through spglib.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "qv-space-group.h"

#include <math.h>
#include <string.h>
#include <spglib.h>

#include "qv-error.h"

/* spglib's error code is a global: one lock around every call and the
 * reading of its error code. */
static GMutex spg_lock;

/* spglib allocates arrays of ints of this many atoms; stay well inside. */
#define SPG_MAX_ATOMS ((gsize) 1000000)

typedef double Vec3[3];

typedef struct {
  guint z;
  double mass;
  guint mass_number;
} AtomType;

/* The input as spglib wants it: columns, fractional positions, types. */
typedef struct {
  double lattice[3][3];        /* lattice[i][j]: component i of vector j */
  double (*positions)[3];
  int *types;
  int n;
  GArray *type_table;          /* AtomType, index = type - 1 */
} SpgCell;

static void
spg_cell_clear (SpgCell *c)
{
  g_free (c->positions);
  g_free (c->types);
  if (c->type_table)
    g_array_unref (c->type_table);
  memset (c, 0, sizeof *c);
}

static gboolean
invert3 (const double m[3][3], double inv[3][3])
{
  double det = m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1])
               - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0])
               + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0]);
  if (!(fabs (det) > 1e-12) || !isfinite (det))
    return FALSE;
  inv[0][0] = (m[1][1] * m[2][2] - m[1][2] * m[2][1]) / det;
  inv[0][1] = (m[0][2] * m[2][1] - m[0][1] * m[2][2]) / det;
  inv[0][2] = (m[0][1] * m[1][2] - m[0][2] * m[1][1]) / det;
  inv[1][0] = (m[1][2] * m[2][0] - m[1][0] * m[2][2]) / det;
  inv[1][1] = (m[0][0] * m[2][2] - m[0][2] * m[2][0]) / det;
  inv[1][2] = (m[0][2] * m[1][0] - m[0][0] * m[1][2]) / det;
  inv[2][0] = (m[1][0] * m[2][1] - m[1][1] * m[2][0]) / det;
  inv[2][1] = (m[0][1] * m[2][0] - m[0][0] * m[2][1]) / det;
  inv[2][2] = (m[0][0] * m[1][1] - m[0][1] * m[1][0]) / det;
  return TRUE;
}

static gboolean
spg_cell_from_structure (const QvStructure *s, SpgCell *c, GError **error)
{
  double inv[3][3];

  memset (c, 0, sizeof *c);
  if (!s->has_cell || !s->pbc[0] || !s->pbc[1] || !s->pbc[2])
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "the space group needs a crystal: a cell periodic in all three directions "
                   "(extended XYZ Lattice= with pbc=\"T T T\", or a CIF)");
      return FALSE;
    }
  if (s->n_atoms == 0 || s->n_atoms > SPG_MAX_ATOMS)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                   "the space group search takes 1 to %" G_GSIZE_FORMAT " atoms, not %"
                   G_GSIZE_FORMAT, SPG_MAX_ATOMS, s->n_atoms);
      return FALSE;
    }
  if (!invert3 (s->cell, inv))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "the cell has no volume: its three lattice vectors are not independent");
      return FALSE;
    }
  /* Rows in QvStructure, columns for spglib. */
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      c->lattice[i][j] = s->cell[j][i];

  c->n = (int) s->n_atoms;
  c->positions = g_new (Vec3, s->n_atoms);
  c->types = g_new (int, s->n_atoms);
  c->type_table = g_array_new (FALSE, FALSE, sizeof (AtomType));
  for (gsize a = 0; a < s->n_atoms; a++)
    {
      const QvAtom *atom = &s->atoms[a];
      guint t;

      /* r = f C with C's rows the lattice vectors, so f = r C⁻¹. */
      for (int j = 0; j < 3; j++)
        c->positions[a][j] = atom->position[0] * inv[0][j] + atom->position[1] * inv[1][j]
                             + atom->position[2] * inv[2][j];
      for (t = 0; t < c->type_table->len; t++)
        {
          const AtomType *e = &g_array_index (c->type_table, AtomType, t);
          if (e->z == atom->z && e->mass == atom->mass)
            break;
        }
      if (t == c->type_table->len)
        {
          AtomType e = { atom->z, atom->mass, atom->mass_number };
          g_array_append_val (c->type_table, e);
        }
      c->types[a] = (int) t + 1;
    }
  return TRUE;
}

/* A structure from spglib's columns, fractional positions and types. */
static QvStructure *
structure_from_spg (const double lattice[3][3], const double (*positions)[3], const int *types,
                    int n, const GArray *type_table, GError **error)
{
  QvStructure *s = qv_structure_new ((gsize) n, error);

  if (s == NULL)
    return NULL;
  for (int i = 0; i < 3; i++)
    for (int j = 0; j < 3; j++)
      s->cell[j][i] = lattice[i][j];
  s->has_cell = TRUE;
  s->pbc[0] = s->pbc[1] = s->pbc[2] = TRUE;
  for (int a = 0; a < n; a++)
    {
      const AtomType *e;
      if (types[a] < 1 || (guint) types[a] > type_table->len)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_SOLVER, "spglib returned an unknown atom type %d",
                       types[a]);
          qv_structure_free (s);
          return NULL;
        }
      e = &g_array_index (type_table, AtomType, types[a] - 1);
      if (!qv_structure_set_element (s, (gsize) a, e->z, error))
        {
          qv_structure_free (s);
          return NULL;
        }
      s->atoms[a].mass = e->mass;
      s->atoms[a].mass_number = e->mass_number;
      for (int x = 0; x < 3; x++)
        s->atoms[a].position[x] = positions[a][0] * s->cell[0][x] + positions[a][1] * s->cell[1][x]
                                  + positions[a][2] * s->cell[2][x];
    }
  return s;
}

static void
set_spg_error (GError **error, SpglibError code, const char *what, double symprec)
{
  g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
               "spglib could not find the %s at symprec %g Å (%s): check that atoms are not "
               "too close, or try a larger tolerance (1e-3 to 1e-2 Å for rounded coordinates)",
               what, symprec, spg_get_error_message (code));
}

/* Called with spg_lock held. */
static QvStructure *
standardize_locked (const SpgCell *c, double symprec, gboolean primitive, gboolean idealize,
                    GError **error)
{
  double lattice[3][3];
  g_autofree Vec3 *positions = g_new (Vec3, 4 * (gsize) c->n);
  g_autofree int *types = g_new (int, 4 * (gsize) c->n);
  int n;

  memcpy (lattice, c->lattice, sizeof lattice);
  memcpy (positions, c->positions, sizeof (double[3]) * (gsize) c->n);
  memcpy (types, c->types, sizeof (int) * (gsize) c->n);
  n = spg_standardize_cell (lattice, positions, types, c->n, primitive ? 1 : 0,
                            idealize ? 0 : 1, symprec);
  if (n <= 0)
    {
      set_spg_error (error, spg_get_error_code (), primitive ? "primitive cell" : "standard cell",
                     symprec);
      return NULL;
    }
  return structure_from_spg ((const double (*)[3]) lattice, (const double (*)[3]) positions, types,
                             n, c->type_table, error);
}

static QvStructure *
standardize (const QvStructure *structure, double symprec, gboolean primitive,
             gboolean idealize, GError **error)
{
  SpgCell c;
  QvStructure *s;

  if (!(symprec > 0.0))
    symprec = QV_SPACE_GROUP_DEFAULT_SYMPREC;
  if (!spg_cell_from_structure (structure, &c, error))
    {
      spg_cell_clear (&c);
      return NULL;
    }
  g_mutex_lock (&spg_lock);
  s = standardize_locked (&c, symprec, primitive, idealize, error);
  g_mutex_unlock (&spg_lock);
  spg_cell_clear (&c);
  return s;
}

QvStructure *
qv_space_group_primitive (const QvStructure *structure, double symprec, gboolean idealize,
                          GError **error)
{
  return standardize (structure, symprec, TRUE, idealize, error);
}

QvStructure *
qv_space_group_standardized (const QvStructure *structure, double symprec, gboolean idealize,
                             GError **error)
{
  return standardize (structure, symprec, FALSE, idealize, error);
}

QvSpaceGroup *
qv_space_group_find (const QvStructure *structure, double symprec, GError **error)
{
  SpgCell c;
  SpglibDataset *d;
  QvSpaceGroup *g = NULL;

  if (!(symprec > 0.0))
    symprec = QV_SPACE_GROUP_DEFAULT_SYMPREC;
  if (!spg_cell_from_structure (structure, &c, error))
    {
      spg_cell_clear (&c);
      return NULL;
    }

  g_mutex_lock (&spg_lock);
  d = spg_get_dataset (c.lattice, c.positions, c.types, c.n, symprec);
  if (d == NULL || d->spacegroup_number == 0)
    set_spg_error (error, spg_get_error_code (), "space group", symprec);
  else
    {
      g = g_new0 (QvSpaceGroup, 1);
      g->number = d->spacegroup_number;
      g->hall_number = d->hall_number;
      g->international = g_strdup (d->international_symbol);
      g->hall_symbol = g_strdup (d->hall_symbol);
      g->choice = g_strdup (d->choice);
      g->point_group = g_strstrip (g_strdup (d->pointgroup_symbol));
      g->symprec = symprec;
      g->n_operations = (gsize) d->n_operations;
      g->rotations = g_memdup2 (d->rotations, sizeof (int[3][3]) * g->n_operations);
      g->translations = g_memdup2 (d->translations, sizeof (double[3]) * g->n_operations);
      g->n_atoms = (gsize) d->n_atoms;
      g->equivalent_atoms = g_new (gsize, g->n_atoms);
      for (gsize a = 0; a < g->n_atoms; a++)
        g->equivalent_atoms[a] = (gsize) d->equivalent_atoms[a];
      memcpy (g->transformation, d->transformation_matrix, sizeof g->transformation);
      memcpy (g->origin_shift, d->origin_shift, sizeof g->origin_shift);
      memcpy (g->std_rotation, d->std_rotation_matrix, sizeof g->std_rotation);
      g->primitive = standardize_locked (&c, symprec, TRUE, FALSE, error);
      if (g->primitive != NULL)
        g->standardized = standardize_locked (&c, symprec, FALSE, FALSE, error);
      if (g->standardized == NULL)
        g_clear_pointer (&g, qv_space_group_free);
    }
  if (d != NULL)
    spg_free_dataset (d);
  g_mutex_unlock (&spg_lock);
  spg_cell_clear (&c);
  return g;
}

void
qv_space_group_free (QvSpaceGroup *group)
{
  if (group == NULL)
    return;
  g_free (group->international);
  g_free (group->hall_symbol);
  g_free (group->choice);
  g_free (group->point_group);
  g_free (group->rotations);
  g_free (group->translations);
  g_free (group->equivalent_atoms);
  qv_structure_free (group->primitive);
  qv_structure_free (group->standardized);
  g_free (group);
}
