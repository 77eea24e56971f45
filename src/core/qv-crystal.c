/* qv-crystal.c — the primitive cell, supercell map and force constants of
 * one crystal, built in one place for the commands and the app.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include "qv-crystal.h"
#include "qv-error.h"
#include "qv-phonon-thermal.h"

void
qv_crystal_free (QvCrystal *crystal)
{
  if (crystal == NULL)
    return;
  qv_nonanalytic_free (crystal->na);
  qv_force_constants_free (crystal->fc);
  qv_supercell_map_free (crystal->map);
  qv_structure_free (crystal->primitive);
  g_free (crystal);
}

QvCrystal *
qv_crystal_new (const QvStructure *primitive, const QvStructure *supercell, double tolerance,
                GError **error)
{
  g_autoptr(QvCrystal) c = NULL;

  g_return_val_if_fail (primitive != NULL && supercell != NULL, NULL);
  if (!primitive->has_cell || !supercell->has_cell)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "the %s has no cell",
                   primitive->has_cell ? "supercell" : "primitive cell");
      return NULL;
    }
  c = g_new0 (QvCrystal, 1);
  c->before[0] = c->before[1] = c->before[2] = NAN;
  c->primitive = qv_structure_copy (primitive);
  c->map = qv_supercell_map (primitive, supercell, tolerance, error);
  if (c->map == NULL)
    return NULL;
  return g_steal_pointer (&c);
}

gboolean
qv_crystal_set_hessian (QvCrystal *crystal, const QvHessian *hessian, gboolean sum_rule,
                        GError **error)
{
  QvForceConstants *fc = qv_force_constants_new (crystal->map, hessian, error);

  if (fc == NULL)
    return FALSE;
  qv_nonanalytic_free (crystal->na);     /* it reads the old force constants */
  crystal->na = NULL;
  qv_force_constants_free (crystal->fc);
  crystal->fc = fc;
  crystal->periodicity = qv_force_constants_periodicity (fc);
  crystal->before[0] = crystal->before[1] = crystal->before[2] = NAN;
  crystal->sum_rule = sum_rule;
  crystal->row_sum = 0;
  if (sum_rule)
    crystal->row_sum = qv_force_constants_apply_sum_rule (fc, crystal->before);
  else
    qv_force_constants_gamma_acoustic (fc, crystal->before);
  return TRUE;
}

gboolean
qv_crystal_set_born (QvCrystal *crystal, gsize n_sites, const double *born,
                     const double epsilon[3][3], GError **error)
{
  QvNonAnalytic *na;

  g_return_val_if_fail (crystal->fc != NULL, FALSE);
  na = qv_nonanalytic_new (crystal->fc, n_sites, born, epsilon, error);
  if (na == NULL)
    return FALSE;
  qv_nonanalytic_free (crystal->na);
  crystal->na = na;
  return TRUE;
}

QvDynamicalTerm
qv_crystal_term (const QvCrystal *crystal)
{
  return crystal->na ? qv_nonanalytic_add : NULL;
}

gpointer
qv_crystal_term_data (const QvCrystal *crystal)
{
  return crystal->na;
}

gsize
qv_crystal_formula_units (const QvCrystal *crystal)
{
  return qv_thermal_formula_units (crystal->map->n_primitive, crystal->map->z);
}
