/* qv-cmd-stencil.c — `quaver stencil`: the displaced structures of a
 * central-difference Hessian (qv-stencil.h), with their manifest.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <stdio.h>
#include <string.h>
#include <gio/gio.h>
#include "qv-bundle.h"
#include "qv-cli.h"
#include "qv-error.h"
#include "qv-manifest.h"
#include "qv-export.h"
#include "qv-space-group.h"
#include "qv-stencil.h"
#include "qv-symmetric-stencil.h"
#include "qv-xyz.h"

static const char stencil_description[] =
  "Writes the structures of a central-difference Hessian: every Cartesian\n"
  "coordinate of the selected atoms displaced by +h and by -h (6 structures per\n"
  "atom), each to its own file DIR/disp-0001.xyz …, the undisplaced structure as\n"
  "DIR/reference.xyz, and DIR/manifest.json saying which atom, axis and sign every\n"
  "file holds. Compute the forces of every structure with your own code, put\n"
  "them back (extended XYZ with a forces column in place of each file, or a\n"
  "plain force file disp-0001.forces beside it), then run 'quaver collect DIR'.\n"
  "\n"
  "Positions are written with 17 significant digits so they read back exactly.\n"
  "The error of the Hessian is of order h^2; force noise is amplified by 1/h.\n"
  "With --atoms only those atoms are displaced: collect then assembles the\n"
  "Hessian of the selected atoms with all other atoms held fixed (a partial\n"
  "Hessian), not a full one.\n"
  "\n"
  "With --symmetric (a periodic supercell only) only the symmetry-distinct\n"
  "displacements are written: for each orbit of equivalent atoms at most three\n"
  "directions, +h and -h each (fcc: 2 structures instead of 6N), found with the\n"
  "supercell's space group at --symprec; collect rebuilds the whole Hessian\n"
  "from them with the same operations.\n"
  "\n"
  "GEOMETRY is an XYZ or extended XYZ file (first frame) or a Quaver bundle;\n"
  "no Hessian is needed.\n"
  "\n"
  "Examples:\n"
  "  quaver stencil mol.xyz -o fd\n"
  "  quaver stencil mol.xyz --step 0.005 --atoms 1,3-5 -o fd-partial\n"
  "  quaver stencil supercell.xyz --symmetric -o fd-crystal\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.";

/* The structure to displace, and what to record as its input. */
static QvStructure *
load_geometry (const char *path, gboolean demo, QvManifest *manifest, GError **error)
{
  if (demo)
    {
      g_autoptr(GBytes) bytes = g_resources_lookup_data (QV_INPUT_DEMO_RESOURCE, 0, NULL);
      g_autoptr(QvBundle) bundle = NULL;
      gsize len = 0;
      const char *data;

      if (bytes == NULL)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "the built-in demo is missing from this build");
          return NULL;
        }
      data = g_bytes_get_data (bytes, &len);
      bundle = qv_bundle_read_data (data, len, "demo.quaver.json", error);
      if (bundle == NULL)
        return NULL;
      qv_manifest_add_input_data (manifest, "demo", "demo", data, len);
      return g_steal_pointer (&bundle->structure);
    }
  if (qv_input_is_bundle (path))
    {
      g_autoptr(QvBundle) bundle = qv_bundle_read_file (path, error);
      if (bundle == NULL || !qv_manifest_add_input_file (manifest, "bundle", path, error))
        return NULL;
      return g_steal_pointer (&bundle->structure);
    }
  else
    {
      g_autoptr(GPtrArray) frames = qv_xyz_read_file (path, error);
      if (frames == NULL || !qv_manifest_add_input_file (manifest, "geometry", path, error))
        return NULL;
      if (frames->len > 1)
        g_printerr ("quaver: %s has %u frames; using the first\n", path, frames->len);
      return qv_structure_copy (g_ptr_array_index (frames, 0));
    }
}

int
qv_cmd_stencil (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  g_autoptr(QvStructure) structure = NULL;
  g_autoptr(QvStencil) stencil = NULL;
  g_autoptr(QvManifest) manifest = NULL;
  g_autoptr(QvExport) export_ = NULL;
  QvExportFormat xformat;
  g_auto(GStrv) arguments = g_new0 (char *, argc + 1);
  g_autofree gsize *atoms = NULL;
  g_autofree char *selection = NULL;
  char *output = NULL, *atoms_text = NULL, *format = NULL;
  double step = QV_STENCIL_DEFAULT_STEP, symprec = QV_SPACE_GROUP_DEFAULT_SYMPREC;
  gboolean force = FALSE, demo = FALSE, plain = FALSE, symmetric = FALSE;
  gsize n_selected = 0;
  int status = QV_EXIT_OK;
  GOptionEntry entries[] = {
    { "step", 0, 0, G_OPTION_ARG_DOUBLE, &step,
      "Displacement h in A (default 0.01, common practice)", "H" },
    { "atoms", 'a', 0, G_OPTION_ARG_STRING, &atoms_text,
      "Displace only these atoms, e.g. 1,3-5 (from 1; default all)", "LIST" },
    { "symmetric", 0, 0, G_OPTION_ARG_NONE, &symmetric,
      "Periodic supercell: only the symmetry-distinct displacements", NULL },
    { "symprec", 0, 0, G_OPTION_ARG_DOUBLE, &symprec,
      "With --symmetric: symmetry tolerance in A (default 1e-5)", "A" },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format,
      "extxyz (default) or xyz (plain, for codes that read only that)", "FORMAT" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "Directory to write (new or empty)", "DIR" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Write into a non-empty DIR, replacing files", NULL },
    { "demo", 0, 0, G_OPTION_ARG_NONE, &demo, "Use the built-in demo (invented data) as input", NULL },
    { NULL }
  };

  for (int i = 1; i < argc; i++)
    arguments[i - 1] = g_strdup (argv[i]);
  g_set_prgname ("quaver stencil");
  context = g_option_context_new ("GEOMETRY");
  g_option_context_set_summary (context, "Displaced structures for a Hessian from forces.");
  g_option_context_set_description (context, stencil_description);
  g_option_context_add_main_entries (context, entries, NULL);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    goto fail;
  if (argc > 2 || (argc == 2 && demo) || (argc < 2 && !demo))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   argc > 2 ? "stencil takes one GEOMETRY, got %d" :
                   demo ? "--demo replaces GEOMETRY; give one or the other" :
                   "stencil needs a GEOMETRY file (or --demo)", argc - 1);
      goto fail;
    }
  if (output == NULL)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "stencil needs an output directory: -o DIR");
      goto fail;
    }
  if (format)
    {
      if (g_ascii_strcasecmp (format, "xyz") == 0)
        plain = TRUE;
      else if (g_ascii_strcasecmp (format, "extxyz") != 0)
        {
          g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "--format takes extxyz or xyz, got '%s'", format);
          goto fail;
        }
    }

  manifest = qv_manifest_new ("stencil");
  for (char **a = arguments; *a; a++)
    qv_manifest_add_argument (manifest, *a);
  structure = load_geometry (argc == 2 ? argv[1] : NULL, demo, manifest, &error);
  if (structure == NULL)
    goto fail;
  if (symmetric)
    {
      if (atoms_text)
        {
          g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                       "--symmetric displaces the whole supercell; leave out --atoms");
          goto fail;
        }
      if (!(symprec > 0.0 && symprec < 1.0))
        {
          g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                       "--symprec must be a distance in A above 0 and below 1, got %g", symprec);
          goto fail;
        }
      if (!qv_structure_is_periodic (structure) || !structure->has_cell)
        {
          g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                       "%s: --symmetric needs a periodic supercell (extended XYZ with Lattice "
                       "and pbc); this structure has no periodic cell, so leave out "
                       "--symmetric", argc == 2 ? argv[1] : "demo");
          goto fail;
        }
      qv_export_format_init (&xformat);
      xformat.style = plain ? QV_XYZ_PLAIN : QV_XYZ_EXTENDED;
      export_ = qv_export_new_symmetric_stencil (structure, step, symprec, &xformat,
                                                 g_steal_pointer (&manifest), &error);
      if (export_ == NULL)
        goto fail;
      if (!qv_export_write (export_, output, force, NULL, &error))
        goto fail;
      g_printerr ("quaver: wrote %" G_GSIZE_FORMAT " symmetry-distinct displaced structures "
                  "(instead of %" G_GSIZE_FORMAT ", step %g A) and reference.xyz to %s\n",
                  qv_export_n_structures (export_) - 1, 6 * structure->n_atoms, step,
                  qv_export_directory (export_));
      goto out;
    }
  if (atoms_text && !qv_stencil_parse_atoms (atoms_text, structure->n_atoms, &atoms, &n_selected, &error))
    goto fail;
  stencil = qv_stencil_new (structure->n_atoms, step, atoms, n_selected, &error);
  if (stencil == NULL)
    goto fail;
  selection = qv_stencil_format_atoms (stencil);
  qv_export_format_init (&xformat);
  xformat.style = plain ? QV_XYZ_PLAIN : QV_XYZ_EXTENDED;
  export_ = qv_export_new_stencil (structure, stencil, &xformat, g_steal_pointer (&manifest), &error);
  if (export_ == NULL)
    goto fail;
  if (!qv_export_write (export_, output, force, NULL, &error))
    goto fail;
  g_printerr ("quaver: wrote %" G_GSIZE_FORMAT " displaced structures (atoms %s, step %g A) "
              "and reference.xyz to %s\n", stencil->n_displacements, selection, step,
              qv_export_directory (export_));
  goto out;

fail:
  status = qv_cli_fail ("stencil", error);
out:
  g_free (output); g_free (atoms_text); g_free (format);
  return status;
}
