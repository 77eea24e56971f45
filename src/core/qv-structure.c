/* qv-structure.c
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-element.h"
#include "qv-error.h"
#include "qv-structure.h"

/* Far beyond any Hessian that fits in memory, small enough that 3N·3N
 * never overflows a 64-bit size. */
#define QV_STRUCTURE_MAX_ATOMS ((gsize) 100000000)

QvStructure *
qv_structure_new (gsize n_atoms, GError **error)
{
  QvStructure *s;

  if (n_atoms > QV_STRUCTURE_MAX_ATOMS)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                   "%" G_GSIZE_FORMAT " atoms is more than Quaver handles (%" G_GSIZE_FORMAT ")",
                   n_atoms, QV_STRUCTURE_MAX_ATOMS);
      return NULL;
    }
  s = g_new0 (QvStructure, 1);
  s->n_atoms = n_atoms;
  s->atoms = g_try_new0 (QvAtom, MAX (n_atoms, 1));
  if (s->atoms == NULL)
    {
      g_free (s);
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                   "not enough memory for %" G_GSIZE_FORMAT " atoms", n_atoms);
      return NULL;
    }
  for (gsize i = 0; i < n_atoms; i++)
    qv_structure_set_element (s, i, 1, NULL);
  return s;
}

QvStructure *
qv_structure_copy (const QvStructure *structure)
{
  QvStructure *s = g_new0 (QvStructure, 1);

  *s = *structure;
  s->atoms = g_memdup2 (structure->atoms, sizeof (QvAtom) * MAX (structure->n_atoms, 1));
  for (gsize i = 0; i < s->n_atoms; i++)
    s->atoms[i].label = g_strdup (structure->atoms[i].label);
  if (structure->forces)
    s->forces = g_memdup2 (structure->forces, sizeof (double) * 3 * structure->n_atoms);
  s->comment = g_strdup (structure->comment);
  return s;
}

void
qv_structure_free (QvStructure *structure)
{
  if (structure == NULL)
    return;
  for (gsize i = 0; i < structure->n_atoms; i++)
    g_free (structure->atoms[i].label);
  g_free (structure->atoms);
  g_free (structure->forces);
  g_free (structure->comment);
  g_free (structure);
}

gboolean
qv_structure_set_element (QvStructure *structure, gsize atom, guint z, GError **error)
{
  const QvElement *e = qv_element_from_z (z);

  g_return_val_if_fail (atom < structure->n_atoms, FALSE);
  if (e == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "atomic number %u is outside 1–%d", z, QV_ELEMENT_MAX_Z);
      return FALSE;
    }
  structure->atoms[atom].z = z;
  structure->atoms[atom].mass = e->isotope_mass;
  structure->atoms[atom].mass_number = e->mass_number;
  return TRUE;
}

void
qv_structure_apply_mass_model (QvStructure *structure, QvMassModel model)
{
  for (gsize i = 0; i < structure->n_atoms; i++)
    {
      QvAtom *a = &structure->atoms[i];
      const QvElement *e = qv_element_from_z (a->z);
      if (e == NULL)
        continue;
      if (model == QV_MASS_AVERAGE && isfinite (e->standard_weight))
        {
          a->mass = e->standard_weight;
          a->mass_number = 0;
        }
      else
        {
          a->mass = e->isotope_mass;
          a->mass_number = e->mass_number;
        }
    }
}

gboolean
qv_structure_set_isotope (QvStructure *structure, gsize atom, guint mass_number,
                          GError **error)
{
  const QvIsotope *iso;
  const QvElement *e;

  g_return_val_if_fail (atom < structure->n_atoms, FALSE);
  e = qv_element_from_z (structure->atoms[atom].z);
  iso = qv_isotope_lookup (structure->atoms[atom].z, mass_number);
  if (iso == NULL)
    {
      gsize n = 0;
      const QvIsotope *table = qv_isotope_table (&n);
      GString *known = g_string_new (NULL);
      for (gsize i = 0; i < n; i++)
        if (table[i].z == structure->atoms[atom].z)
          g_string_append_printf (known, "%s%u", known->len ? ", " : "", table[i].mass_number);
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "no isotope %u of %s in the table (it has %s); give a mass instead",
                   mass_number, e ? e->symbol : "?", known->len ? known->str : "none");
      g_string_free (known, TRUE);
      return FALSE;
    }
  structure->atoms[atom].mass = iso->mass;
  structure->atoms[atom].mass_number = mass_number;
  return TRUE;
}

gboolean
qv_structure_set_mass (QvStructure *structure, gsize atom, double mass, GError **error)
{
  g_return_val_if_fail (atom < structure->n_atoms, FALSE);
  if (!isfinite (mass) || mass <= 0.0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "mass %g of atom %" G_GSIZE_FORMAT " must be a positive number of u",
                   mass, atom + 1);
      return FALSE;
    }
  structure->atoms[atom].mass = mass;
  structure->atoms[atom].mass_number = 0;
  return TRUE;
}

void
qv_structure_set_label (QvStructure *structure, gsize atom, const char *label)
{
  g_return_if_fail (atom < structure->n_atoms);
  g_free (structure->atoms[atom].label);
  structure->atoms[atom].label = g_strdup (label);
}

double
qv_structure_total_mass (const QvStructure *structure)
{
  double m = 0.0;
  for (gsize i = 0; i < structure->n_atoms; i++)
    m += structure->atoms[i].mass;
  return m;
}

void
qv_structure_center_of_mass (const QvStructure *structure, double com[3])
{
  const double total = qv_structure_total_mass (structure);
  com[0] = com[1] = com[2] = 0.0;
  for (gsize i = 0; i < structure->n_atoms; i++)
    for (int k = 0; k < 3; k++)
      com[k] += structure->atoms[i].mass * structure->atoms[i].position[k];
  if (total > 0)
    for (int k = 0; k < 3; k++)
      com[k] /= total;
}

double *
qv_structure_masses (const QvStructure *structure)
{
  double *m = g_new (double, MAX (structure->n_atoms, 1));
  for (gsize i = 0; i < structure->n_atoms; i++)
    m[i] = structure->atoms[i].mass;
  return m;
}

gboolean
qv_structure_is_periodic (const QvStructure *structure)
{
  return structure->pbc[0] || structure->pbc[1] || structure->pbc[2];
}

char *
qv_structure_formula (const QvStructure *structure)
{
  guint counts[QV_ELEMENT_MAX_Z + 1] = { 0 };
  GString *out = g_string_new (NULL);
  gboolean has_carbon;
  GPtrArray *rest = g_ptr_array_new ();

  for (gsize i = 0; i < structure->n_atoms; i++)
    if (structure->atoms[i].z <= QV_ELEMENT_MAX_Z)
      counts[structure->atoms[i].z]++;

  has_carbon = counts[6] > 0;
  for (guint z = 1; z <= QV_ELEMENT_MAX_Z; z++)
    {
      if (counts[z] == 0)
        continue;
      if (has_carbon && (z == 6 || z == 1))
        continue;
      g_ptr_array_add (rest, (gpointer) qv_element_from_z (z));
    }
  /* Hill order: with carbon, C then H then alphabetical; without, all
   * alphabetical. */
  if (has_carbon)
    {
      g_string_append (out, "C");
      if (counts[6] > 1) g_string_append_printf (out, "%u", counts[6]);
      if (counts[1] > 0) g_string_append (out, "H");
      if (counts[1] > 1) g_string_append_printf (out, "%u", counts[1]);
    }
  for (guint i = 0; i < rest->len; i++)
    for (guint j = i + 1; j < rest->len; j++)
      {
        const QvElement *a = rest->pdata[i], *b = rest->pdata[j];
        if (strcmp (a->symbol, b->symbol) > 0)
          {
            rest->pdata[i] = (gpointer) b;
            rest->pdata[j] = (gpointer) a;
          }
      }
  for (guint i = 0; i < rest->len; i++)
    {
      const QvElement *e = rest->pdata[i];
      g_string_append (out, e->symbol);
      if (counts[e->z] > 1)
        g_string_append_printf (out, "%u", counts[e->z]);
    }
  g_ptr_array_free (rest, TRUE);
  return g_string_free (out, FALSE);
}
