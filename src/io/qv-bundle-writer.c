/* qv-bundle-writer.c — a Quaver bundle from what qv-bundle.c reads.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <glib/gstdio.h>
#include <string.h>
#include "qv-bundle-writer.h"
#include "qv-element.h"
#include "qv-error.h"
#include "qv-hessian-writer.h"
#include "qv-json-writer.h"
#include "qv-output.h"

#define BUNDLE_SUFFIX ".quaver.json"

char *
qv_bundle_writer_hessian_path (const char *path)
{
  g_autofree char *stem = NULL;

  g_return_val_if_fail (path != NULL, NULL);
  if (g_str_has_suffix (path, BUNDLE_SUFFIX))
    stem = g_strndup (path, strlen (path) - strlen (BUNDLE_SUFFIX));
  else if (g_str_has_suffix (path, ".json"))
    stem = g_strndup (path, strlen (path) - strlen (".json"));
  else
    stem = g_strdup (path);
  return g_strconcat (stem, ".hessian.npy", NULL);
}

static void
write_vector3 (QvJsonWriter *w, const char *key, const double v[3])
{
  qv_json_numbers (w, key, v, 3);
}

/* The mass the model gives atom @i, and the isotope table's mass of the
 * atom's own mass number (0 when it has none, or the table lacks it). */
static gboolean
mass_is_isotope (const QvAtom *atom)
{
  const QvIsotope *iso;

  if (atom->mass_number == 0 || (iso = qv_isotope_lookup (atom->z, atom->mass_number)) == NULL)
    return FALSE;
  return iso->mass == atom->mass;
}

/* A structure as qv-bundle.c's read_structure reads it, with each atom's
 * mass as an override wherever it is not the model's. */
static void
write_structure (QvJsonWriter *w, const char *key, const QvStructure *s, QvMassModel model)
{
  g_autoptr(QvStructure) reference = qv_structure_copy (s);
  const gboolean default_pbc = s->pbc[0] == s->has_cell && s->pbc[1] == s->has_cell
                               && s->pbc[2] == s->has_cell;

  qv_structure_apply_mass_model (reference, model);
  qv_json_begin_object (w, key);
  if (s->has_cell)
    {
      qv_json_begin_array (w, "cell");
      for (int k = 0; k < 3; k++)
        write_vector3 (w, NULL, s->cell[k]);
      qv_json_end_array (w);
    }
  if (!default_pbc)
    {
      qv_json_begin_array (w, "pbc");
      for (int k = 0; k < 3; k++)
        qv_json_bool (w, NULL, s->pbc[k]);
      qv_json_end_array (w);
    }
  if (s->has_energy)
    qv_json_number (w, "energy", s->energy);
  qv_json_begin_array (w, "atoms");
  for (gsize i = 0; i < s->n_atoms; i++)
    {
      const QvAtom *a = &s->atoms[i];
      const QvElement *e = qv_element_from_z (a->z);

      qv_json_begin_object (w, NULL);
      if (e != NULL)
        qv_json_string (w, "element", e->symbol);
      else
        qv_json_int (w, "element", a->z);
      write_vector3 (w, "position", a->position);
      if (a->label != NULL)
        qv_json_string (w, "label", a->label);
      if (a->mass != reference->atoms[i].mass)
        {
          if (mass_is_isotope (a))
            qv_json_int (w, "isotope", a->mass_number);
          else
            qv_json_number (w, "mass", a->mass);
        }
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  if (s->forces != NULL)
    {
      qv_json_begin_array (w, "forces");
      for (gsize i = 0; i < s->n_atoms; i++)
        write_vector3 (w, NULL, s->forces + 3 * i);
      qv_json_end_array (w);
    }
  qv_json_end_object (w);
}

/* Row i of the matrix, H_i0 … H_i(n−1), from its column-major storage. */
static void
write_hessian (QvJsonWriter *w, const QvHessian *h, const char *file)
{
  qv_json_begin_object (w, "hessian");
  qv_json_string (w, "units", "eV/A^2");
  if (file != NULL)
    qv_json_string (w, "path", file);
  else
    {
      g_autofree double *row = g_new (double, MAX (h->n, 1));
      qv_json_string (w, "layout", "full");
      qv_json_begin_array (w, "data");
      for (gsize i = 0; i < h->n; i++)
        {
          for (gsize j = 0; j < h->n; j++)
            row[j] = h->data[i + j * h->n];
          qv_json_numbers (w, NULL, row, h->n);
        }
      qv_json_end_array (w);
    }
  qv_json_end_object (w);
}

static void
write_modes (QvJsonWriter *w, const QvModeSet *modes)
{
  const gsize n = 3 * modes->n_atoms;
  g_autofree double *wavenumbers = g_new (double, MAX (modes->n_modes, 1));
  g_autofree double *d = g_new (double, n);

  for (gsize k = 0; k < modes->n_modes; k++)
    wavenumbers[k] = qv_mode_set_wavenumber (modes, k);
  qv_json_begin_object (w, "modes");
  qv_json_numbers (w, "wavenumbers", wavenumbers, modes->n_modes);
  qv_json_begin_array (w, "displacements");
  for (gsize k = 0; k < modes->n_modes; k++)
    {
      qv_mode_set_cartesian (modes, k, d);
      qv_json_numbers (w, NULL, d, n);
    }
  qv_json_end_array (w);
  qv_json_end_object (w);
}

static void
write_view (QvJsonWriter *w, const QvBundleView *view)
{
  qv_json_begin_object (w, "view");
  if (view->has_orientation)
    qv_json_numbers (w, "orientation", view->orientation, 4);
  if (view->has_projection)
    qv_json_string (w, "projection", view->orthographic ? "orthographic" : "perspective");
  if (view->zoom > 0.0 && view->zoom != 1.0)
    qv_json_number (w, "zoom", view->zoom);
  if (view->mode > 0)
    qv_json_int (w, "mode", view->mode);
  qv_json_end_object (w);
}

static void
write_rows (QvJsonWriter *w, const char *key, const char *units, const double *rows,
            gsize n_rows, gsize n)
{
  qv_json_begin_object (w, key);
  qv_json_string (w, "units", units);
  qv_json_begin_array (w, "data");
  for (gsize i = 0; i < n_rows; i++)
    qv_json_numbers (w, NULL, rows + i * n, n);
  qv_json_end_array (w);
  qv_json_end_object (w);
}

static void
write_crystal (QvJsonWriter *w, const QvBundle *b)
{
  qv_json_begin_object (w, "crystal");
  write_structure (w, "primitive", b->primitive, b->mass_model);
  if (b->has_supercell_matrix)
    {
      qv_json_begin_array (w, "supercell");
      for (int i = 0; i < 3; i++)
        {
          qv_json_begin_array (w, NULL);
          for (int j = 0; j < 3; j++)
            qv_json_int (w, NULL, b->supercell_matrix[i][j]);
          qv_json_end_array (w);
        }
      qv_json_end_array (w);
    }
  if (b->band_path != NULL)
    qv_json_string (w, "path", b->band_path);
  if (b->mesh[0] > 0 && b->mesh[1] > 0 && b->mesh[2] > 0)
    {
      qv_json_begin_array (w, "mesh");
      for (int k = 0; k < 3; k++)
        qv_json_int (w, NULL, b->mesh[k]);
      qv_json_end_array (w);
    }
  qv_json_end_object (w);
}

static void
write_born (QvJsonWriter *w, const QvBundle *b)
{
  const gsize sites = (b->primitive ? b->primitive : b->structure)->n_atoms;

  qv_json_begin_object (w, "born_charges");
  qv_json_string (w, "units", "e");
  qv_json_begin_array (w, "data");
  for (gsize a = 0; a < sites; a++)
    {
      qv_json_begin_array (w, NULL);
      for (int i = 0; i < 3; i++)
        qv_json_numbers (w, NULL, b->born_charges + 9 * a + 3 * i, 3);
      qv_json_end_array (w);
    }
  qv_json_end_array (w);
  qv_json_end_object (w);
  qv_json_begin_object (w, "dielectric_tensor");
  qv_json_string (w, "units", "relative");
  qv_json_begin_array (w, "data");
  for (int i = 0; i < 3; i++)
    qv_json_numbers (w, NULL, b->dielectric_tensor[i], 3);
  qv_json_end_array (w);
  qv_json_end_object (w);
}

char *
qv_bundle_format (const QvBundle *b, const char *hessian_file, gsize *length, GError **error)
{
  QvJsonWriter *w;
  char *text;

  g_return_val_if_fail (b != NULL && b->structure != NULL, NULL);
  if (b->hessian == NULL && b->modes == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "a bundle needs a Hessian or precomputed modes");
      return NULL;
    }
  if (b->hessian != NULL && b->hessian->n != 3 * b->structure->n_atoms)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "the Hessian is %" G_GSIZE_FORMAT " × %"
                   G_GSIZE_FORMAT "; %" G_GSIZE_FORMAT " atoms need %" G_GSIZE_FORMAT,
                   b->hessian->n, b->hessian->n, b->structure->n_atoms, 3 * b->structure->n_atoms);
      return NULL;
    }
  if (b->hessian != NULL && hessian_file == NULL && b->hessian->n > QV_BUNDLE_MAX_INLINE_N)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_LIMIT, "a %" G_GSIZE_FORMAT " × %" G_GSIZE_FORMAT
                   " Hessian is too large to be inline in a bundle (at most %d × %d); it "
                   "needs a file beside the bundle", b->hessian->n, b->hessian->n,
                   QV_BUNDLE_MAX_INLINE_N, QV_BUNDLE_MAX_INLINE_N);
      return NULL;
    }
  if (b->born_charges != NULL && !b->has_dielectric)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "Born charges need the dielectric tensor");
      return NULL;
    }

  w = qv_json_writer_new ();
  qv_json_begin_object (w, NULL);
  qv_json_string (w, "format", "quaver-bundle");
  qv_json_int (w, "version", 1);
  if (b->title != NULL)
    qv_json_string (w, "title", b->title);
  write_structure (w, "structure", b->structure, b->mass_model);
  qv_json_string (w, "masses", b->mass_model == QV_MASS_AVERAGE ? "average" : "isotopic");
  if (b->hessian != NULL)
    write_hessian (w, b->hessian, hessian_file);
  else
    write_modes (w, b->modes);
  if (b->view.present)
    write_view (w, &b->view);
  if (b->derivatives != NULL && b->derivatives->dipole != NULL)
    write_rows (w, "dipole_derivatives", "e", b->derivatives->dipole, 3,
                3 * b->derivatives->n_atoms);
  if (b->derivatives != NULL && b->derivatives->polarizability != NULL)
    write_rows (w, "polarizability_derivatives", "A^2", b->derivatives->polarizability,
                QV_ALPHA_N_COMPONENTS, 3 * b->derivatives->n_atoms);
  if (b->primitive != NULL)
    write_crystal (w, b);
  if (b->born_charges != NULL)
    write_born (w, b);
  qv_json_end_object (w);
  text = qv_json_writer_finish (w);
  if (length)
    *length = strlen (text);
  return text;
}

gboolean
qv_bundle_write_file (const char *path, const QvBundle *b, gboolean force,
                      char **hessian_written, GError **error)
{
  g_autofree char *npy = NULL, *npy_name = NULL, *text = NULL;
  gsize length = 0;
  gboolean wrote_npy = FALSE;

  g_return_val_if_fail (path != NULL && b != NULL, FALSE);
  if (hessian_written)
    *hessian_written = NULL;
  if (b->hessian != NULL && b->hessian->n > QV_BUNDLE_MAX_INLINE_N)
    {
      npy = qv_bundle_writer_hessian_path (path);
      npy_name = g_path_get_basename (npy);
    }
  /* Both names are checked before anything is written. */
  if (!force && g_file_test (path, G_FILE_TEST_EXISTS))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "%s exists; pass --force to replace it", path);
      return FALSE;
    }
  if (!force && npy != NULL && g_file_test (npy, G_FILE_TEST_EXISTS))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "%s (the bundle's Hessian file) exists; pass "
                   "--force to replace it", npy);
      return FALSE;
    }
  if ((text = qv_bundle_format (b, npy_name, &length, error)) == NULL)
    return FALSE;
  if (npy != NULL)
    {
      if (!qv_hessian_write_file (npy, b->hessian, QV_HESSIAN_WRITE_NPY, NULL, force, error))
        return FALSE;
      wrote_npy = TRUE;
    }
  if (!qv_output_write (path, text, length, force, error))
    {
      /* No bundle: no orphaned matrix of our own either. */
      if (wrote_npy)
        g_unlink (npy);
      return FALSE;
    }
  if (hessian_written)
    *hessian_written = g_steal_pointer (&npy);
  return TRUE;
}
