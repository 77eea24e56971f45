/* qv-input.c — reading what a front end works on.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <string.h>
#include <gio/gio.h>
#include "qv-bundle.h"
#include "qv-cif.h"
#include "qv-error.h"
#include "qv-hessian-file.h"
#include "qv-input.h"
#include "qv-size.h"
#include "qv-solver.h"
#include "qv-units.h"
#include "qv-xyz.h"

gboolean
qv_input_is_bundle (const char *path)
{
  return g_str_has_suffix (path, ".json");
}

static gboolean
load_bundle (QvInput *input, QvBundle *bundle)
{
  input->structure = g_steal_pointer (&bundle->structure);
  input->mass_model = bundle->mass_model;
  input->view = bundle->view;
  input->derivatives = g_steal_pointer (&bundle->derivatives);
  input->dipole_units = g_steal_pointer (&bundle->dipole_units);
  input->polarizability_units = g_steal_pointer (&bundle->polarizability_units);
  input->hessian = g_steal_pointer (&bundle->hessian);
  input->modes = g_steal_pointer (&bundle->modes);
  input->hessian_units = g_strdup (bundle->hessian_units);
  input->hessian_source = g_strdup (bundle->hessian_path ? bundle->hessian_path : "inline in the bundle");
  if (input->hessian)
    input->layout = input->hessian->layout;
  if (bundle->primitive != NULL)
    {
      QvInputCrystal *c = input->crystal = g_new0 (QvInputCrystal, 1);
      c->primitive = g_steal_pointer (&bundle->primitive);
      c->has_supercell_matrix = bundle->has_supercell_matrix;
      memcpy (c->supercell_matrix, bundle->supercell_matrix, sizeof c->supercell_matrix);
      c->band_path = g_steal_pointer (&bundle->band_path);
      memcpy (c->mesh, bundle->mesh, sizeof c->mesh);
      c->born_charges = g_steal_pointer (&bundle->born_charges);
      memcpy (c->dielectric_tensor, bundle->dielectric_tensor, sizeof c->dielectric_tensor);
    }
  return TRUE;
}

/* Before reading a Hessian of 3N rows: will it fit in this machine's
 * memory, with the all-modes solver's workspace when that will run? Says
 * so naming the geometry, before megabytes of text are parsed. */
static gboolean
check_memory (const char *geometry, gsize n_atoms, gboolean all_modes, GError **error)
{
  const gsize n = 3 * n_atoms;
  const guint64 workspace = all_modes ? (guint64) (2.0 * n * n + 6.0 * n + 1.0) * sizeof (double) : 0;
  g_autofree char *what = g_strdup_printf ("%" G_GSIZE_FORMAT " atoms (a %" G_GSIZE_FORMAT "×%"
                                           G_GSIZE_FORMAT " Hessian%s)", n_atoms, n, n,
                                           all_modes ? " and the all-modes solver's workspace" : "");
  if (qv_size_check_matrix (n, workspace, what, error))
    return TRUE;
  g_prefix_error (error, "%s: ", geometry);
  return FALSE;
}

static gboolean
load (QvInput *input, const QvInputOptions *o, GError **error)
{

  if (o->demo)
    {
      g_autoptr(GBytes) bytes = g_resources_lookup_data (QV_INPUT_DEMO_RESOURCE, 0, NULL);
      gsize len = 0;
      const char *data;
      g_autoptr(QvBundle) bundle = NULL;

      if (bytes == NULL)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "the built-in demo is missing from this build");
          return FALSE;
        }
      data = g_bytes_get_data (bytes, &len);
      input->name = g_strdup ("demo");
      bundle = qv_bundle_read_data (data, len, "demo.quaver.json", error);
      if (bundle == NULL)
        return FALSE;
      load_bundle (input, bundle);
    }
  else if (o->geometry == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "no input: give a geometry file, a bundle, or --demo");
      return FALSE;
    }
  else if (qv_input_is_bundle (o->geometry))
    {
      g_autoptr(QvBundle) bundle = NULL;
      input->name = g_strdup (o->geometry);
      if (o->hessian)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "%s is a bundle and brings its own Hessian: leave out --hessian", o->geometry);
          return FALSE;
        }
      bundle = qv_bundle_read_file (o->geometry, error);
      if (bundle == NULL)
        return FALSE;
      load_bundle (input, bundle);
    }
  else
    {
      g_autoptr(GPtrArray) frames = NULL;
      QvHessianUnit unit;
      QvHessianLayout layout = QV_HESSIAN_LAYOUT_AUTO;

      input->name = g_strdup (o->geometry);
      if (o->hessian == NULL)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "%s has no Hessian: pass --hessian FILE --hessian-units UNIT, or use a bundle",
                       o->geometry);
          return FALSE;
        }
      if (o->hessian_units == NULL)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "--hessian needs --hessian-units (one of %s): units are never guessed",
                       qv_hessian_unit_list ());
          return FALSE;
        }
      if (!qv_hessian_unit_parse (o->hessian_units, &unit, error))
        return FALSE;
      if (o->hessian_layout && !qv_hessian_layout_parse (o->hessian_layout, &layout, error))
        return FALSE;
      if (qv_cif_is_cif_path (o->geometry))
        {
          /* A CIF: the first data block with atom sites, expanded by its
           * symmetry operators into the cell's contents. */
          QvStructure *crystal = qv_cif_read_file (o->geometry, NULL, error);
          if (crystal == NULL)
            return FALSE;
          frames = g_ptr_array_new_with_free_func ((GDestroyNotify) qv_structure_free);
          g_ptr_array_add (frames, crystal);
        }
      else
        frames = qv_xyz_read_file (o->geometry, error);
      if (frames == NULL)
        return FALSE;
      input->n_frames = frames->len;
      input->structure = qv_structure_copy (g_ptr_array_index (frames, 0));
      if (o->hessian_deferred)
        {
          /* the caller reads it (each MPI rank its blocks) */
          input->hessian_source = g_strdup (o->hessian);
          input->hessian_units = g_strdup (qv_hessian_unit_name (unit));
          input->hessian_scale = qv_hessian_unit_to_ev_a2 (unit);
          input->layout = QV_HESSIAN_LAYOUT_NPY;
          return TRUE;
        }
      if (o->all_modes && 3 * input->structure->n_atoms > qv_solver_max_full_dimension ())
        {
          g_set_error (error, QV_ERROR, QV_ERROR_LIMIT,
                       "%s: %" G_GSIZE_FORMAT " atoms make a %" G_GSIZE_FORMAT "-row Hessian, beyond "
                       "what this LAPACK's 32-bit all-modes solver takes (3N ≤ %" G_GSIZE_FORMAT "); "
                       "ask for the lowest modes only with --lowest K", o->geometry,
                       input->structure->n_atoms, 3 * input->structure->n_atoms,
                       qv_solver_max_full_dimension ());
          return FALSE;
        }
      if (!check_memory (o->geometry, input->structure->n_atoms, o->all_modes, error))
        return FALSE;
      input->hessian = qv_hessian_read_file (o->hessian, 3 * input->structure->n_atoms, layout, error);
      if (input->hessian == NULL)
        return FALSE;
      qv_hessian_scale (input->hessian, qv_hessian_unit_to_ev_a2 (unit));
      input->hessian_source = g_strdup (o->hessian);
      input->hessian_units = g_strdup (qv_hessian_unit_name (unit));
      input->layout = input->hessian->layout;
    }
  return TRUE;
}


QvInput *
qv_input_load (const QvInputOptions *options, GError **error)
{
  QvInput *input = g_new0 (QvInput, 1);

  input->n_frames = 1;
  if (!load (input, options, error))
    {
      qv_input_free (input);
      return NULL;
    }
  return input;
}

void
qv_input_crystal_free (QvInputCrystal *crystal)
{
  if (crystal == NULL)
    return;
  qv_structure_free (crystal->primitive);
  g_free (crystal->band_path);
  g_free (crystal->born_charges);
  g_free (crystal);
}

void
qv_input_free (QvInput *input)
{
  if (input == NULL)
    return;
  qv_input_crystal_free (input->crystal);
  g_free (input->name);
  qv_structure_free (input->structure);
  qv_hessian_free (input->hessian);
  qv_mode_set_free (input->modes);
  g_free (input->hessian_source);
  g_free (input->hessian_units);
  qv_derivatives_free (input->derivatives);
  g_free (input->dipole_units);
  g_free (input->polarizability_units);
  g_free (input);
}
