/* qv-export-frozen.c — the file of `quaver frozen-phonon`: a supercell
 * displaced along one lattice mode at a commensurate q, with its q,
 * branch, wavenumber, amplitude and phase on the comment line and in the
 * manifest.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-error.h"
#include "qv-export-private.h"

/* The parameters the comment line repeats, from the manifest (the export
 * keeps no other copy of them). */
static const char *const frozen_keys[] = {
  "q", "branch", "wavenumber_cm-1", "amplitude_Q_sqrtu_A", "largest_displacement_A", "phase_rad",
};

static gboolean
frozen_produce (QvExport *e, gsize file, GString *text, const QvProgress *progress,
                GError **error)
{
  QvXyzPair pairs[G_N_ELEMENTS (frozen_keys) + 1];
  char *values[G_N_ELEMENTS (frozen_keys)] = { NULL };
  QvXyzFrame frame = { .style = QV_XYZ_EXTENDED, .precision = QV_XYZ_EXACT, .masses = TRUE };
  gsize n = 0;

  (void) file;
  (void) progress;
  (void) error;
  pairs[n++] = (QvXyzPair) { "frozen_phonon", "displaced" };
  for (gsize k = 0; k < G_N_ELEMENTS (frozen_keys); k++)
    {
      const QvManifestField *f = qv_manifest_get (e->manifest->parameters, frozen_keys[k]);
      if (f == NULL)
        continue;
      if (f->type == QV_MANIFEST_STRING)
        values[k] = g_strdup (f->string);
      else if (f->type == QV_MANIFEST_INTEGER)
        values[k] = g_strdup_printf ("%" G_GINT64_FORMAT, f->integer);
      else
        {
          values[k] = g_malloc (G_ASCII_DTOSTR_BUF_SIZE);
          g_ascii_dtostr (values[k], G_ASCII_DTOSTR_BUF_SIZE, f->number);
        }
      pairs[n++] = (QvXyzPair) { frozen_keys[k], values[k] };
    }
  frame.pairs = pairs;
  frame.n_pairs = n;
  qv_xyz_append_frame (text, e->structure, &frame);
  for (gsize k = 0; k < G_N_ELEMENTS (frozen_keys); k++)
    g_free (values[k]);
  return TRUE;
}

static void
frozen_record (QvExport *e, gsize file, QvManifestFile *entry)
{
  QvManifestFrame *frame = qv_manifest_file_add_frame (entry);
  double v;
  (void) file;
  qv_manifest_set_boolean (frame->fields, "frozen_phonon", TRUE);
  if (qv_manifest_get_number (e->manifest->parameters, "largest_displacement_A", &v))
    qv_manifest_set_number (frame->fields, "largest_displacement_A", v);
}

static void
frozen_free (QvExport *e)
{
  qv_structure_free (e->own_structure);
}

static const QvExportClass frozen_class = {
  frozen_produce, frozen_record, NULL, frozen_free,
};

QvExport *
qv_export_new_frozen (const QvFrozenPhonon *fp, const QvExportFormat *format,
                      QvManifest *manifest, GError **error)
{
  g_autoptr(QvExport) e = NULL;
  QvStructure *copy = qv_structure_copy (fp->structure);
  QvManifest *m = manifest;
  g_autofree char *formula = NULL, *q = NULL;
  char qa[3][G_ASCII_DTOSTR_BUF_SIZE];

  e = qv_export_alloc (&frozen_class, "frozen-phonon", copy, NULL, format, manifest);
  e->own_structure = copy;
  if (!copy->has_cell)
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE,
                           "a frozen phonon needs a periodic supercell with a cell");
      return NULL;
    }
  if (e->format.style != QV_XYZ_EXTENDED)
    {
      g_set_error_literal (error, QV_ERROR, QV_ERROR_USAGE,
                           "a frozen-phonon supercell is written as extended XYZ, whose Lattice "
                           "keeps the cell: drop the plain-XYZ choice");
      return NULL;
    }
  e->n_structures = 1;
  e->structure_file = g_new0 (gsize, 1);
  qv_export_plan_file (e, g_strdup ("frozen-phonon.xyz"), "extxyz");

  for (int i = 0; i < 3; i++)
    g_ascii_dtostr (qa[i], sizeof qa[i], fp->q[i]);
  q = g_strdup_printf ("%s %s %s", qa[0], qa[1], qa[2]);
  qv_export_describe_structure (e);
  qv_manifest_set_string (m->options, "q", q);
  qv_manifest_set_integer (m->options, "branch", (gint64) fp->branch + 1);
  qv_manifest_set_number (m->options, "phase_rad", fp->phase);
  qv_manifest_set_string (m->parameters, "q", q);
  qv_manifest_set_string (m->parameters, "q_unit",
                          "fractional reciprocal coordinates of the primitive cell, without 2 pi");
  qv_manifest_set_integer (m->parameters, "branch", (gint64) fp->branch + 1);
  qv_manifest_set_number (m->parameters, "wavenumber_cm-1", fp->wavenumber);
  qv_manifest_set_number (m->parameters, "amplitude_Q_sqrtu_A", fp->a);
  qv_manifest_set_number (m->parameters, "largest_displacement_A", fp->largest);
  qv_manifest_set_number (m->parameters, "phase_rad", fp->phase);
  qv_manifest_set_boolean (m->parameters, "standing_wave", fp->standing);
  qv_manifest_set_string (m->parameters, "pattern",
                          "u_lk = Re[A exp(i phase) e_k(q) exp(i q.(R_l + tau_k))] / sqrt(N m_k), "
                          "e(q) the unit eigenvector of D(q) with the phase of R_l + tau_k' - tau_k, "
                          "largest component real and positive");
  if (fp->standing)
    qv_export_add_note (e, "q and -q differ: the static pattern holds both, so started at rest "
                           "it moves as a standing wave, not as the running wave at q");
  if (fp->degenerate)
    qv_export_add_note (e, "this branch is degenerate at q: its eigenvector is one choice "
                           "within the degenerate subspace");
  if (fp->wavenumber < 0)
    qv_export_add_note (e, "the mode is imaginary at q: the pattern follows an instability");
  formula = qv_structure_formula (copy);
  e->description = g_strdup_printf (
    "a supercell of %s (%" G_GSIZE_FORMAT " atoms) displaced along branch %" G_GSIZE_FORMAT
    " at q = (%s), %.2f cm-1\n"
    "A = %g sqrt(u) A, largest displacement %g A, phase %g rad\n"
    "and manifest.json with q, branch, wavenumber, amplitude and phase",
    formula, copy->n_atoms, fp->branch + 1, q, fp->wavenumber, fp->a, fp->largest, fp->phase);
  return g_steal_pointer (&e);
}
