/* qv-export-symmetric-stencil.c — the files of `quaver stencil
 * --symmetric`: the reference supercell and only its symmetry-distinct ±h
 * displacements (qv-symmetric-stencil.h), for `quaver collect`.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-export-private.h"
#include "qv-symmetric-stencil.h"

/* The axis letter of a unit Cartesian direction, or 0 when it is none. */
static char
axis_of (const double dir[3])
{
  for (int a = 0; a < 3; a++)
    if (dir[a] == 1.0 && dir[(a + 1) % 3] == 0.0 && dir[(a + 2) % 3] == 0.0)
      return "xyz"[a];
  return 0;
}

static char *
direction_text (const double dir[3])
{
  char b[3][G_ASCII_DTOSTR_BUF_SIZE];
  for (int a = 0; a < 3; a++)
    g_ascii_dtostr (b[a], sizeof b[a], dir[a]);
  return g_strdup_printf ("%s %s %s", b[0], b[1], b[2]);
}

static gboolean
symmetric_produce (QvExport *e, gsize file, GString *text, const QvProgress *progress,
                   GError **error)
{
  const QvSymmetricStencil *st = e->symmetric_stencil;
  (void) progress;
  (void) error;

  if (file == 0)
    {
      /* the reference, with its masses and cell so collect can rebuild the
       * same stencil and solve with them */
      QvXyzPair pairs[] = { { "stencil", "reference" } };
      QvXyzFrame frame = { .style = QV_XYZ_EXTENDED, .precision = QV_XYZ_EXACT, .masses = TRUE,
                           .pairs = pairs, .n_pairs = G_N_ELEMENTS (pairs) };
      qv_xyz_append_frame (text, e->structure, &frame);
      return TRUE;
    }
  {
    const gsize d = file - 1;
    g_autofree double *x = g_new (double, 3 * e->structure->n_atoms);
    g_autofree char *dir_text = NULL;
    gsize atom;
    int sign;
    double dir[3];
    char dbuf[24], abuf[24], sbuf[G_ASCII_DTOSTR_BUF_SIZE], axis_buf[2];
    QvXyzPair pairs[5];
    QvXyzFrame frame = { .style = e->format.style, .precision = QV_XYZ_EXACT };

    qv_symmetric_stencil_displacement (st, d, &atom, dir, &sign);
    qv_symmetric_stencil_positions (st, e->structure, d, x);
    g_snprintf (dbuf, sizeof dbuf, "%" G_GSIZE_FORMAT, d + 1);
    g_snprintf (abuf, sizeof abuf, "%" G_GSIZE_FORMAT, atom + 1);
    g_ascii_dtostr (sbuf, sizeof sbuf, sign * e->symmetric_step);
    axis_buf[0] = axis_of (dir);
    axis_buf[1] = '\0';
    pairs[0] = (QvXyzPair) { "stencil", "displacement" };
    pairs[1] = (QvXyzPair) { "displacement", dbuf };
    pairs[2] = (QvXyzPair) { "atom", abuf };
    if (axis_buf[0])
      pairs[3] = (QvXyzPair) { "axis", axis_buf };
    else
      {
        dir_text = direction_text (dir);
        pairs[3] = (QvXyzPair) { "direction", dir_text };
      }
    pairs[4] = (QvXyzPair) { "shift", sbuf };
    frame.positions = x;
    frame.pairs = pairs;
    frame.n_pairs = G_N_ELEMENTS (pairs);
    qv_xyz_append_frame (text, e->structure, &frame);
  }
  return TRUE;
}

static void
symmetric_record (QvExport *e, gsize file, QvManifestFile *entry)
{
  QvManifestFrame *frame = qv_manifest_file_add_frame (entry);
  gsize atom;
  int sign;
  double dir[3];
  char axis_buf[2];

  if (file == 0)
    {
      qv_manifest_set_boolean (frame->fields, "reference", TRUE);
      return;
    }
  qv_symmetric_stencil_displacement (e->symmetric_stencil, file - 1, &atom, dir, &sign);
  axis_buf[0] = axis_of (dir);
  axis_buf[1] = '\0';
  qv_manifest_set_integer (frame->fields, "displacement", (gint64) file);
  qv_manifest_set_integer (frame->fields, "atom", (gint64) atom + 1);
  if (axis_buf[0])
    qv_manifest_set_string (frame->fields, "axis", axis_buf);
  else
    {
      g_autofree char *t = direction_text (dir);
      qv_manifest_set_string (frame->fields, "direction", t);
    }
  qv_manifest_set_integer (frame->fields, "sign", sign);
  qv_manifest_set_number (frame->fields, "shift", sign * e->symmetric_step);
}

static void
symmetric_free (QvExport *e)
{
  qv_symmetric_stencil_free (e->symmetric_stencil);
  qv_structure_free (e->own_structure);
}

static const QvExportClass symmetric_class = {
  symmetric_produce, symmetric_record, NULL, symmetric_free,
};

QvExport *
qv_export_new_symmetric_stencil (const QvStructure *supercell, double step, double symprec,
                                 const QvExportFormat *format, QvManifest *manifest,
                                 GError **error)
{
  g_autoptr(QvExport) e = NULL;
  QvStructure *copy = qv_structure_copy (supercell);
  QvManifest *m = manifest;
  g_autofree char *formula = NULL;
  gsize n_disp, n_full;

  e = qv_export_alloc (&symmetric_class, "stencil", copy, NULL, format, manifest);
  e->own_structure = copy;
  if (e->format.single_file)
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE,
                           "a stencil is written one structure per file, as collect reads it back "
                           "with one result per structure");
      return NULL;
    }
  if (!supercell->has_cell || !qv_structure_is_periodic (supercell))
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE,
                           "a symmetry-reduced stencil needs a periodic supercell (extended XYZ "
                           "with Lattice and pbc); for a molecule leave out --symmetric");
      return NULL;
    }
  e->symmetric_stencil = qv_symmetric_stencil_new (copy, step, symprec, error);
  if (e->symmetric_stencil == NULL)
    return NULL;
  e->symmetric_step = step;
  n_disp = qv_symmetric_stencil_n_displacements (e->symmetric_stencil);
  n_full = 6 * copy->n_atoms;
  e->n_structures = n_disp + 1;
  e->structure_file = g_new (gsize, e->n_structures);
  qv_export_plan_file (e, g_strdup ("reference.xyz"), "extxyz");
  e->structure_file[0] = 0;
  for (gsize d = 0; d < n_disp; d++)
    {
      qv_export_plan_file (e, g_strdup_printf ("disp-%04" G_GSIZE_FORMAT ".xyz", d + 1),
                           qv_export_style_name (e->format.style));
      e->structure_file[d + 1] = d + 1;
    }

  qv_export_describe_structure (e);
  qv_manifest_set_number (m->options, "step", step);
  qv_manifest_set_boolean (m->options, "symmetric", TRUE);
  qv_manifest_set_number (m->options, "symprec", symprec);
  qv_manifest_set_string (m->options, "format", qv_export_style_name (e->format.style));
  qv_manifest_set_string (m->parameters, "scheme", "symmetry-reduced central difference");
  qv_manifest_set_number (m->parameters, "step", step);
  qv_manifest_set_string (m->parameters, "step_unit", "A");
  /* the symprec passed to spglib; <= 0 meant its default */
  qv_manifest_set_number (m->parameters, "symprec", symprec > 0 ? symprec : QV_SPACE_GROUP_DEFAULT_SYMPREC);
  qv_manifest_set_string (m->parameters, "symprec_unit", "A");
  qv_manifest_set_string (m->parameters, "atoms", "all");
  qv_manifest_set_boolean (m->parameters, "complete", TRUE);
  qv_manifest_set_integer (m->parameters, "displacements", (gint64) n_disp);
  qv_manifest_set_integer (m->parameters, "full_displacements", (gint64) n_full);
  qv_manifest_set_integer (m->parameters, "operations",
                           (gint64) qv_symmetric_stencil_n_operations (e->symmetric_stencil));
  qv_manifest_set_string (m->parameters, "reference", "reference.xyz");
  qv_manifest_set_string (m->parameters, "hessian",
                          "f_j = -(F_j(+h d) - F_j(-h d)) / (2h) = d^T Phi_aj for each kept (a, d); "
                          "Phi rebuilt from the space-group operations by least squares, "
                          "then (Phi + Phi^T)/2 and the group average");
  formula = qv_structure_formula (copy);
  e->description = g_strdup_printf (
    "%" G_GSIZE_FORMAT " symmetry-distinct displaced structures of %s (+/- %g A; the full "
    "stencil would need %" G_GSIZE_FORMAT ", %" G_GSIZE_FORMAT " space-group operations)\n"
    "and reference.xyz, the supercell at rest with its masses\n"
    "and manifest.json: run each structure, then 'quaver collect' on the folder",
    n_disp, formula, step, n_full, qv_symmetric_stencil_n_operations (e->symmetric_stencil));
  return g_steal_pointer (&e);
}
