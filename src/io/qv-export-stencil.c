/* qv-export-stencil.c — the files of `quaver stencil`: the reference
 * structure and its ±h displacements of every selected Cartesian
 * coordinate, for `quaver collect`.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <string.h>
#include "qv-error.h"
#include "qv-export-private.h"

static gboolean
stencil_produce (QvExport *e, gsize file, GString *text, const QvProgress *progress,
                 GError **error)
{
  const QvStencil *st = e->stencil;

  if (file == 0)
    {
      /* the reference, with its masses so collect can solve with them */
      QvXyzPair pairs[] = { { "stencil", "reference" } };
      QvXyzFrame frame = { .style = QV_XYZ_EXTENDED, .precision = QV_XYZ_EXACT, .masses = TRUE,
                           .pairs = pairs, .n_pairs = G_N_ELEMENTS (pairs) };
      qv_xyz_append_frame (text, e->structure, &frame);
      return TRUE;
    }
  {
    const gsize d = file - 1;
    g_autofree double *x = g_new (double, 3 * e->structure->n_atoms);
    gsize atom;
    int axis, sign;
    char dbuf[24], abuf[24], sbuf[G_ASCII_DTOSTR_BUF_SIZE], axis_buf[2];
    QvXyzPair pairs[5];
    QvXyzFrame frame = { .style = e->format.style, .precision = QV_XYZ_EXACT };

    qv_stencil_displacement (st, d, &atom, &axis, &sign);
    qv_stencil_positions (st, e->structure, d, x);
    g_snprintf (dbuf, sizeof dbuf, "%" G_GSIZE_FORMAT, d + 1);
    g_snprintf (abuf, sizeof abuf, "%" G_GSIZE_FORMAT, atom + 1);
    g_ascii_dtostr (sbuf, sizeof sbuf, sign * st->step);
    axis_buf[0] = "xyz"[axis];
    axis_buf[1] = '\0';
    pairs[0] = (QvXyzPair) { "stencil", "displacement" };
    pairs[1] = (QvXyzPair) { "displacement", dbuf };
    pairs[2] = (QvXyzPair) { "atom", abuf };
    pairs[3] = (QvXyzPair) { "axis", axis_buf };
    pairs[4] = (QvXyzPair) { "shift", sbuf };
    frame.positions = x;
    frame.pairs = pairs;
    frame.n_pairs = G_N_ELEMENTS (pairs);
    qv_xyz_append_frame (text, e->structure, &frame);
  }
  return TRUE;
}

static void
stencil_record (QvExport *e, gsize file, QvManifestFile *entry)
{
  QvManifestFrame *frame = qv_manifest_file_add_frame (entry);
  gsize atom;
  int axis, sign;
  char axis_buf[2];

  if (file == 0)
    {
      qv_manifest_set_boolean (frame->fields, "reference", TRUE);
      return;
    }
  qv_stencil_displacement (e->stencil, file - 1, &atom, &axis, &sign);
  axis_buf[0] = "xyz"[axis];
  axis_buf[1] = '\0';
  qv_manifest_set_integer (frame->fields, "displacement", (gint64) file);
  qv_manifest_set_integer (frame->fields, "atom", (gint64) atom + 1);
  qv_manifest_set_string (frame->fields, "axis", axis_buf);
  qv_manifest_set_integer (frame->fields, "sign", sign);
  qv_manifest_set_number (frame->fields, "shift", sign * e->stencil->step);
}

static void
stencil_free (QvExport *e)
{
  qv_stencil_free (e->stencil);
  qv_structure_free (e->own_structure);
}

static const QvExportClass stencil_class = {
  stencil_produce, stencil_record, NULL, stencil_free,
};

QvExport *
qv_export_new_stencil (const QvStructure *structure, const QvStencil *stencil,
                       const QvExportFormat *format, QvManifest *manifest, GError **error)
{
  g_autoptr(QvExport) e = NULL;
  QvStructure *copy = qv_structure_copy (structure);
  QvManifest *m = manifest;
  g_autofree char *selection = NULL, *formula = NULL;

  e = qv_export_alloc (&stencil_class, "stencil", copy, NULL, format, manifest);
  e->own_structure = copy;
  if (e->format.single_file)
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE,
                           "a stencil is written one structure per file, as collect reads it back "
                           "with one result per structure");
      return NULL;
    }
  if (stencil->n_atoms != structure->n_atoms)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "the stencil is for %" G_GSIZE_FORMAT
                   " atoms, the structure has %" G_GSIZE_FORMAT, stencil->n_atoms, structure->n_atoms);
      return NULL;
    }
  e->stencil = qv_stencil_new (stencil->n_atoms, stencil->step, stencil->atoms,
                               stencil->n_selected, error);
  if (e->stencil == NULL)
    return NULL;
  e->n_structures = e->stencil->n_displacements + 1;
  e->structure_file = g_new (gsize, e->n_structures);
  qv_export_plan_file (e, g_strdup ("reference.xyz"), "extxyz");
  e->structure_file[0] = 0;
  for (gsize d = 0; d < e->stencil->n_displacements; d++)
    {
      qv_export_plan_file (e, g_strdup_printf ("disp-%04" G_GSIZE_FORMAT ".xyz", d + 1),
                           qv_export_style_name (e->format.style));
      e->structure_file[d + 1] = d + 1;
    }

  selection = qv_stencil_format_atoms (e->stencil);
  qv_export_describe_structure (e);
  qv_manifest_set_number (m->options, "step", e->stencil->step);
  qv_manifest_set_string (m->options, "atoms", selection);
  qv_manifest_set_string (m->options, "format", qv_export_style_name (e->format.style));
  qv_manifest_set_string (m->parameters, "scheme", "central difference, +h and -h per coordinate");
  qv_manifest_set_number (m->parameters, "step", e->stencil->step);
  qv_manifest_set_string (m->parameters, "step_unit", "A");
  qv_manifest_set_string (m->parameters, "atoms", selection);
  qv_manifest_set_boolean (m->parameters, "complete", qv_stencil_is_complete (e->stencil));
  qv_manifest_set_integer (m->parameters, "displacements", (gint64) e->stencil->n_displacements);
  qv_manifest_set_string (m->parameters, "reference", "reference.xyz");
  qv_manifest_set_string (m->parameters, "hessian",
                          "H_ij = -(F_j(+h e_i) - F_j(-h e_i)) / (2h), then (H + H^T)/2");
  if (!qv_stencil_is_complete (e->stencil))
    qv_export_add_note (e, "only some atoms are displaced: collect assembles the Hessian of "
                           "those atoms with all others held fixed (a partial Hessian)");
  formula = qv_structure_formula (copy);
  e->description = g_strdup_printf (
    "%" G_GSIZE_FORMAT " displaced structures of %s (atoms %s, +/- %g A along x, y, z)\n"
    "and reference.xyz, the structure at rest with its masses\n"
    "and manifest.json: run each structure, then 'quaver collect' on the folder",
    e->stencil->n_displacements, formula, selection, e->stencil->step);
  return g_steal_pointer (&e);
}
