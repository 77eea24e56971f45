/* qv-cmd-collect.c — `quaver collect`: the Hessian from the forces of a
 * stencil's structures (qv-stencil.h), checked against its manifest.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-cli.h"
#include "qv-error.h"
#include "qv-force-file.h"
#include "qv-hessian-writer.h"
#include "qv-io-error.h"
#include "qv-manifest.h"
#include "qv-mode-table.h"
#include "qv-output.h"
#include "qv-solver.h"
#include "qv-stencil.h"
#include "qv-symmetric-stencil.h"
#include "qv-xyz.h"

/* Default largest difference (Å) between a result's positions and the
 * stencil's: above the rounding of codes that print 6–8 decimals, far below
 * any step in use. */
#define DEFAULT_TOLERANCE 1e-5

/* The manifest scheme of `quaver stencil --symmetric`. */
#define SYMMETRIC_SCHEME "symmetry-reduced central difference"

static const char collect_description[] =
  "Reads back the structures 'quaver stencil' wrote into DIR, each with its\n"
  "forces, checks every one against DIR/manifest.json (atom count, elements,\n"
  "positions within --tolerance of the displaced ones), and assembles the\n"
  "Hessian H_ij = -(F_j(+h e_i) - F_j(-h e_i)) / (2h), symmetrised; the asymmetry\n"
  "before symmetrisation, max|H_ij - H_ji| / max|H|, is reported.\n"
  "\n"
  "The result for DIR/disp-0001.xyz is RDIR/disp-0001.xyz with a forces\n"
  "column (extended XYZ, Properties=species:S:1:pos:R:3:forces:R:3), or a plain\n"
  "file RDIR/disp-0001.forces with one line 'Fx Fy Fz' per atom (positions\n"
  "then come from the structure file). RDIR is DIR unless --results. Forces\n"
  "are in eV/A unless --force-units; --gradient reads dE/dx instead of forces.\n"
  "Every missing or mismatched result is named, then collect stops (exit 2).\n"
  "\n"
  "A stencil written with --symmetric holds only the symmetry-distinct\n"
  "displacements of a supercell: collect finds the same space group in\n"
  "reference.xyz, checks it gives the manifest's displacements, and rebuilds\n"
  "the whole supercell Hessian from the group's operations (least squares,\n"
  "symmetrised, averaged over the group); the largest least-squares residual\n"
  "relative to max|f| is reported as the spread.\n"
  "\n"
  "Output: -o FILE (repeatable) writes the Hessian in eV/A^2, as .npy when the\n"
  "name ends in .npy, otherwise as text (3N rows of 3N numbers); --modes\n"
  "prints the mode table 'quaver modes' would print for it. With neither, the\n"
  "text Hessian goes to standard output. A stencil of some atoms only gives\n"
  "the Hessian of those atoms with the others held fixed (a partial Hessian,\n"
  "3k x 3k): it is written as such and solved without rigid-body projection.\n"
  "\n"
  "Examples:\n"
  "  quaver collect fd -o mol.npy\n"
  "  quaver collect fd --results fd-out --force-units hartree/bohr --modes\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.";

/* A manifest field as a number (integer or floating). */
static gboolean
field_number (const GPtrArray *fields, const char *key, double *value)
{
  const QvManifestField *f = qv_manifest_get (fields, key);
  if (f == NULL)
    return FALSE;
  if (f->type == QV_MANIFEST_INTEGER)
    *value = (double) f->integer;
  else if (f->type == QV_MANIFEST_NUMBER)
    *value = f->number;
  else
    return FALSE;
  return TRUE;
}

static const char *
field_string (const GPtrArray *fields, const char *key)
{
  const QvManifestField *f = qv_manifest_get (fields, key);
  return f && f->type == QV_MANIFEST_STRING ? f->string : NULL;
}

static gboolean
field_true (const GPtrArray *fields, const char *key)
{
  const QvManifestField *f = qv_manifest_get (fields, key);
  return f && f->type == QV_MANIFEST_BOOLEAN && f->boolean;
}

/* "disp-0001.xyz" → "disp-0001.forces". */
static char *
force_file_name (const char *name)
{
  const char *dot = strrchr (name, '.');
  return dot ? g_strdup_printf ("%.*s.forces", (int) (dot - name), name)
             : g_strconcat (name, ".forces", NULL);
}

/* Reads and checks the result of displacement @d; on a problem returns FALSE
 * with the message in @problem (newly allocated). */
static gboolean
read_result (const double *x, const char *what, const QvStructure *reference, gsize d,
             const char *name, const char *dir, const char *results, double tolerance,
             double *forces, char **problem)
{
  g_autofree char *xyz_path = g_build_filename (results, name, NULL);
  g_autofree char *fname = force_file_name (name);
  g_autofree char *force_path = g_build_filename (results, fname, NULL);
  g_autoptr(GPtrArray) frames = NULL;
  g_autoptr(GError) error = NULL;
  const QvStructure *s;
  double worst = 0.0;
  gsize worst_k = 0;

  if (!g_file_test (xyz_path, G_FILE_TEST_EXISTS) && strcmp (dir, results) != 0)
    {
      g_free (xyz_path);
      xyz_path = g_build_filename (dir, name, NULL);
    }
  if (!g_file_test (xyz_path, G_FILE_TEST_EXISTS))
    {
      *problem = g_strdup_printf ("%s: missing (displacement %" G_GSIZE_FORMAT " of the manifest)",
                                  xyz_path, d + 1);
      return FALSE;
    }
  frames = qv_xyz_read_file (xyz_path, &error);
  if (frames == NULL)
    {
      *problem = g_strdup (error->message);
      return FALSE;
    }
  if (frames->len != 1)
    {
      *problem = g_strdup_printf ("%s: %u frames, expected one structure", xyz_path, frames->len);
      return FALSE;
    }
  s = g_ptr_array_index (frames, 0);
  if (s->n_atoms != reference->n_atoms)
    {
      *problem = g_strdup_printf ("%s: %" G_GSIZE_FORMAT " atoms, the stencil has %" G_GSIZE_FORMAT,
                                  xyz_path, s->n_atoms, reference->n_atoms);
      return FALSE;
    }
  for (gsize a = 0; a < s->n_atoms; a++)
    if (s->atoms[a].z != reference->atoms[a].z)
      {
        *problem = g_strdup_printf ("%s: atom %" G_GSIZE_FORMAT " has atomic number %u, the stencil's "
                                    "has %u (atoms in a different order?)", xyz_path, a + 1,
                                    s->atoms[a].z, reference->atoms[a].z);
        return FALSE;
      }
  for (gsize k = 0; k < 3 * s->n_atoms; k++)
    {
      const double diff = fabs (s->atoms[k / 3].position[k % 3] - x[k]);
      if (!(diff <= worst))
        {
          worst = diff;
          worst_k = k;
        }
    }
  if (!(worst <= tolerance))
    {
      *problem = g_strdup_printf (
        "%s: atom %" G_GSIZE_FORMAT " %c is %.10g A, the stencil put it at %.10g A (off by %.3g A, "
        "tolerance %.3g A); this is displacement %" G_GSIZE_FORMAT ", %s",
        xyz_path, worst_k / 3 + 1, "xyz"[worst_k % 3], s->atoms[worst_k / 3].position[worst_k % 3],
        x[worst_k], worst, tolerance, d + 1, what);
      return FALSE;
    }
  if (s->forces)
    memcpy (forces, s->forces, sizeof (double) * 3 * s->n_atoms);
  else
    {
      g_autofree double *f = NULL;

      if (!g_file_test (force_path, G_FILE_TEST_EXISTS) && strcmp (dir, results) != 0)
        {
          g_free (force_path);
          force_path = g_build_filename (dir, fname, NULL);
        }
      if (!g_file_test (force_path, G_FILE_TEST_EXISTS))
        {
          *problem = g_strdup_printf ("%s: no forces (no forces column in it and no %s beside it)",
                                      xyz_path, fname);
          return FALSE;
        }
      f = qv_force_file_read (force_path, s->n_atoms, &error);
      if (f == NULL)
        {
          *problem = g_strdup (error->message);
          return FALSE;
        }
      memcpy (forces, f, sizeof (double) * 3 * s->n_atoms);
    }
  for (gsize k = 0; k < 3 * s->n_atoms; k++)
    if (!isfinite (forces[k]))
      {
        *problem = g_strdup_printf ("%s: the force on atom %" G_GSIZE_FORMAT " (%c) is not a finite number",
                                    s->forces ? xyz_path : force_path, k / 3 + 1, "xyz"[k % 3]);
        return FALSE;
      }
  return TRUE;
}

/* The stencil and its reference structure from the manifest in @dir. */
/* The atom, direction and sign of displacement @d of @st as the manifest
 * frame @fields must give them; FALSE with @error when they differ. */
static gboolean
check_symmetric_frame (const QvSymmetricStencil *st, gsize d, const GPtrArray *fields,
                       const char *manifest_path, const char *name, GError **error)
{
  gsize atom;
  int sign;
  double dir[3], atom_v = 0, sign_v = 0, got[3] = { 0, 0, 0 };
  const char *axis = field_string (fields, "axis");
  const char *direction = field_string (fields, "direction");
  gboolean ok;

  qv_symmetric_stencil_displacement (st, d, &atom, dir, &sign);
  ok = field_number (fields, "atom", &atom_v) && field_number (fields, "sign", &sign_v);
  if (ok && axis && strlen (axis) == 1 && strchr ("xyz", axis[0]))
    got[axis[0] - 'x'] = 1.0;
  else if (ok && direction)
    {
      g_auto(GStrv) parts = g_strsplit_set (direction, " \t", -1);
      int k = 0;
      for (char **p = parts; *p && ok; p++)
        if (**p)
          {
            char *end = NULL;
            if (k >= 3)
              ok = FALSE;
            else
              {
                got[k++] = g_ascii_strtod (*p, &end);
                ok = end && *end == '\0';
              }
          }
      ok = ok && k == 3;
    }
  else
    ok = FALSE;
  if (!ok)
    {
      qv_io_error (error, manifest_path, 0, 0, "%s: the frame lacks the atom, the sign or the axis "
                   "(or direction) of a symmetric stencil's displacement", name);
      return FALSE;
    }
  if (atom_v != (double) (atom + 1) || sign_v != (double) sign
      || fabs (got[0] - dir[0]) + fabs (got[1] - dir[1]) + fabs (got[2] - dir[2]) > 1e-9)
    {
      qv_io_error (error, manifest_path, 0, 0,
                   "%s: displacement %" G_GSIZE_FORMAT " is atom %g, direction (%g %g %g), sign %g "
                   "in the manifest, but the space group of the reference gives atom %" G_GSIZE_FORMAT
                   ", direction (%g %g %g), sign %d (was reference.xyz or --symprec changed?)",
                   name, d + 1, atom_v, got[0], got[1], got[2], sign_v, atom + 1, dir[0], dir[1],
                   dir[2], sign);
      return FALSE;
    }
  return TRUE;
}

/* The stencil (full, or symmetric when @sym_out is set) and its reference
 * structure from the manifest in @dir. */
static gboolean
load_stencil (const char *dir, const char *manifest_path, QvManifest *m, QvStencil **stencil_out,
              QvSymmetricStencil **sym_out, QvStructure **reference_out, GPtrArray *names,
              GError **error)
{
  const char *atoms_text = field_string (m->parameters, "atoms");
  const char *ref_name = NULL;
  g_autofree gsize *atoms = NULL;
  gsize n_selected = 0;
  double step;
  g_autoptr(QvStencil) st = NULL;
  g_autoptr(QvSymmetricStencil) sym = NULL;
  g_autoptr(GPtrArray) frame_fields = NULL;
  g_autoptr(GError) local = NULL;
  const gboolean symmetric = g_strcmp0 (field_string (m->parameters, "scheme"), SYMMETRIC_SCHEME) == 0;
  double symprec = 0.0, n_listed = 0.0;
  gsize n_disp;
  g_autofree char *ref_path = NULL, *ref_data = NULL, *sha = NULL;
  g_autoptr(GPtrArray) frames = NULL;
  const QvManifestFile *ref_file = NULL;
  gsize ref_len = 0;

  if (g_strcmp0 (m->command, "stencil") != 0)
    {
      qv_io_error (error, manifest_path, 0, 0, "written by 'quaver %s', not by 'quaver stencil'",
                   m->command ? m->command : "?");
      return FALSE;
    }
  if (!field_number (m->parameters, "step", &step) || atoms_text == NULL || m->n_atoms == 0)
    {
      qv_io_error (error, manifest_path, 0, 0, "the parameters lack the step, the atoms or the atom count");
      return FALSE;
    }
  if (symmetric)
    {
      if (!field_number (m->parameters, "symprec", &symprec) || !(symprec > 0)
          || !field_number (m->parameters, "displacements", &n_listed)
          || !(n_listed >= 2 && n_listed <= 6.0 * (double) m->n_atoms && n_listed == floor (n_listed)))
        {
          qv_io_error (error, manifest_path, 0, 0, "a symmetric stencil's parameters lack the symprec "
                       "or a displacement count from 2 to 6 per atom");
          return FALSE;
        }
      n_disp = (gsize) n_listed;
    }
  else
    {
      if (!qv_stencil_parse_atoms (atoms_text, m->n_atoms, &atoms, &n_selected, &local)
          || !(st = qv_stencil_new (m->n_atoms, step, atoms, n_selected, &local)))
        {
          qv_io_error (error, manifest_path, 0, 0, "%s", local->message);
          return FALSE;
        }
      n_disp = st->n_displacements;
    }

  g_ptr_array_set_size (names, (guint) n_disp);
  frame_fields = g_ptr_array_new ();
  g_ptr_array_set_size (frame_fields, (guint) n_disp);
  for (guint i = 0; i < m->files->len; i++)
    {
      const QvManifestFile *f = g_ptr_array_index (m->files, i);
      for (guint j = 0; j < f->frames->len; j++)
        {
          const QvManifestFrame *fr = g_ptr_array_index (f->frames, j);
          double dv;

          if (field_true (fr->fields, "reference"))
            ref_file = f;
          else if (field_number (fr->fields, "displacement", &dv))
            {
              if (!(dv >= 1 && dv <= (double) n_disp && dv == floor (dv)))
                {
                  qv_io_error (error, manifest_path, 0, 0, "%s: displacement %g is outside 1 to %"
                               G_GSIZE_FORMAT, f->name, dv, n_disp);
                  return FALSE;
                }
              if (f->frames->len != 1 || g_ptr_array_index (names, (guint) dv - 1) != NULL)
                {
                  qv_io_error (error, manifest_path, 0, 0, "displacement %g is listed more than once", dv);
                  return FALSE;
                }
              if (strchr (f->name, '/') || strchr (f->name, '\\') || strcmp (f->name, "..") == 0)
                {
                  qv_io_error (error, manifest_path, 0, 0, "file name '%s' is not a plain name", f->name);
                  return FALSE;
                }
              g_ptr_array_index (names, (guint) dv - 1) = g_strdup (f->name);
              g_ptr_array_index (frame_fields, (guint) dv - 1) = fr->fields;
            }
        }
    }
  for (gsize d = 0; d < n_disp; d++)
    if (g_ptr_array_index (names, (guint) d) == NULL)
      {
        qv_io_error (error, manifest_path, 0, 0, "displacement %" G_GSIZE_FORMAT " of %" G_GSIZE_FORMAT
                     " is not listed", d + 1, n_disp);
        return FALSE;
      }
  if (ref_file == NULL || strchr (ref_file->name, '/'))
    {
      qv_io_error (error, manifest_path, 0, 0, "no reference structure is listed");
      return FALSE;
    }
  ref_name = ref_file->name;
  ref_path = g_build_filename (dir, ref_name, NULL);
  if (!qv_io_read_file (ref_path, (gsize) 1 << 30, &ref_data, &ref_len, error))
    return FALSE;
  sha = qv_manifest_sha256 (ref_data, ref_len);
  if (ref_file->sha256 && g_ascii_strcasecmp (sha, ref_file->sha256) != 0)
    {
      qv_io_error (error, ref_path, 0, 0, "changed since 'quaver stencil' wrote it (its SHA-256 is not "
                   "the manifest's); collect needs the undisplaced structure as written");
      return FALSE;
    }
  frames = qv_xyz_read_data (ref_data, ref_len, ref_path, error);
  if (frames == NULL)
    return FALSE;
  if (((QvStructure *) g_ptr_array_index (frames, 0))->n_atoms != m->n_atoms)
    {
      qv_io_error (error, ref_path, 0, 0, "%" G_GSIZE_FORMAT " atoms, the manifest says %" G_GSIZE_FORMAT,
                   ((QvStructure *) g_ptr_array_index (frames, 0))->n_atoms, m->n_atoms);
      return FALSE;
    }
  if (symmetric)
    {
      const QvStructure *ref = g_ptr_array_index (frames, 0);
      if (!ref->has_cell || !qv_structure_is_periodic (ref))
        {
          qv_io_error (error, ref_path, 0, 0, "no periodic cell (Lattice and pbc), which a "
                       "symmetry-reduced stencil needs");
          return FALSE;
        }
      sym = qv_symmetric_stencil_new (ref, step, symprec, &local);
      if (sym == NULL)
        {
          qv_io_error (error, ref_path, 0, 0, "%s", local->message);
          return FALSE;
        }
      if (qv_symmetric_stencil_n_displacements (sym) != n_disp)
        {
          qv_io_error (error, manifest_path, 0, 0, "%" G_GSIZE_FORMAT " displacements listed, but the "
                       "space group of %s gives %" G_GSIZE_FORMAT " (was it or --symprec changed?)",
                       n_disp, ref_path, qv_symmetric_stencil_n_displacements (sym));
          return FALSE;
        }
      for (gsize d = 0; d < n_disp; d++)
        if (!check_symmetric_frame (sym, d, g_ptr_array_index (frame_fields, (guint) d), manifest_path,
                                    g_ptr_array_index (names, (guint) d), error))
          return FALSE;
    }
  *reference_out = qv_structure_copy (g_ptr_array_index (frames, 0));
  *stencil_out = g_steal_pointer (&st);
  *sym_out = g_steal_pointer (&sym);
  return TRUE;
}

int
qv_cmd_collect (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  g_autoptr(QvManifest) manifest = NULL;
  g_autoptr(QvStencil) stencil = NULL;
  g_autoptr(QvSymmetricStencil) sym = NULL;
  g_autoptr(QvStructure) reference = NULL;
  g_autoptr(QvHessian) hessian = NULL;
  g_autoptr(GPtrArray) names = g_ptr_array_new_with_free_func (g_free);
  g_autoptr(GPtrArray) problems = g_ptr_array_new_with_free_func (g_free);
  g_autofree char *manifest_path = NULL, *selection = NULL, *comment = NULL;
  g_autofree double *forces = NULL;
  char *results = NULL, *units = NULL, *projection = NULL, *format = NULL;
  char **outputs = NULL;
  const char *dir;
  double tolerance = DEFAULT_TOLERANCE, temperature = 298.15, asymmetry = 0.0, factor, step;
  gsize n_disp;
  gboolean complete;
  gint64 level = 0;
  gboolean force = FALSE, gradient = FALSE, show_modes = FALSE, vectors = FALSE;
  QvForceUnit unit = QV_FORCE_UNIT_EV_A;
  QvTableFormat table_format = QV_TABLE_TEXT;
  QvSolveOptions solve;
  QvProgress progress = { qv_cli_progress, NULL };
  int status = QV_EXIT_OK;
  gsize n;
  GOptionEntry entries[] = {
    { "results", 'r', 0, G_OPTION_ARG_FILENAME, &results,
      "Directory with the results (default: DIR itself)", "RDIR" },
    { "force-units", 'u', 0, G_OPTION_ARG_STRING, &units,
      "Units of the forces: eV/A (default), hartree/bohr, Ry/bohr, kcal/mol/A, kJ/mol/A", "UNIT" },
    { "gradient", 0, 0, G_OPTION_ARG_NONE, &gradient,
      "The results hold gradients dE/dx (= -F), not forces", NULL },
    { "tolerance", 0, 0, G_OPTION_ARG_DOUBLE, &tolerance,
      "Largest difference in A between a result's positions and the stencil's (default 1e-5)", "A" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME_ARRAY, &outputs,
      "Write the Hessian (eV/A^2) to FILE: .npy, or text otherwise (repeatable)", "FILE" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Replace existing output files", NULL },
    { "modes", 0, 0, G_OPTION_ARG_NONE, &show_modes, "Print the mode table of the Hessian", NULL },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format,
      "Mode table: text (default), csv, json, markdown", "FORMAT" },
    { "project", 'p', 0, G_OPTION_ARG_STRING, &projection,
      "Mode table: rigid-body motion to remove: full (default; none for a partial Hessian), "
      "translations, none", "WHAT" },
    { "level", 'v', 0, G_OPTION_ARG_INT64, &level, "Mode table: level v of the turning points", "V" },
    { "temperature", 'T', 0, G_OPTION_ARG_DOUBLE, &temperature,
      "Mode table: temperature of the thermal RMS amplitude in K (default 298.15)", "T" },
    { "vectors", 0, 0, G_OPTION_ARG_NONE, &vectors, "Mode table (JSON): include the displacement vectors", NULL },
    { NULL }
  };

  qv_solve_options_init (&solve);
  g_set_prgname ("quaver collect");
  context = g_option_context_new ("DIR");
  g_option_context_set_summary (context, "Hessian from the forces of a stencil's structures.");
  g_option_context_set_description (context, collect_description);
  g_option_context_add_main_entries (context, entries, NULL);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    goto fail;
  if (argc != 2)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, argc < 2 ? "collect needs the DIR 'quaver stencil' wrote"
                   : "collect takes one DIR, got %d", argc - 1);
      goto fail;
    }
  if ((units && !qv_force_unit_parse (units, &unit, &error))
      || (format && !qv_table_format_parse (format, &table_format, &error))
      || (projection && !qv_projection_parse (projection, &solve.projection, &error)))
    goto fail;
  if (!(tolerance > 0.0 && isfinite (tolerance)) || level < 0 || level > 10000
      || !(temperature >= 0 && temperature < 1e7))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   !(tolerance > 0.0 && isfinite (tolerance)) ? "--tolerance must be a length in A above 0" :
                   (level < 0 || level > 10000) ? "--level must be a whole number from 0 to 10000" :
                   "--temperature must be a temperature in K, 0 or more");
      goto fail;
    }
  if ((format || projection || vectors) && !show_modes)
    g_printerr ("quaver: --format, --project and --vectors describe the mode table: add --modes\n");
  dir = argv[1];
  if (!g_file_test (dir, G_FILE_TEST_IS_DIR))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_INPUT, "%s: not a directory (give the DIR 'quaver stencil' wrote)", dir);
      goto fail;
    }
  if (results && !g_file_test (results, G_FILE_TEST_IS_DIR))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_INPUT, "%s: not a directory (--results)", results);
      goto fail;
    }

  manifest_path = g_build_filename (dir, "manifest.json", NULL);
  manifest = qv_manifest_read_file (manifest_path, &error);
  if (manifest == NULL)
    goto fail;
  if (!load_stencil (dir, manifest_path, manifest, &stencil, &sym, &reference, names, &error))
    goto fail;
  step = stencil ? stencil->step : 0.0;
  if (sym && !field_number (manifest->parameters, "step", &step))
    g_assert_not_reached ();    /* load_stencil checked it */
  n_disp = sym ? qv_symmetric_stencil_n_displacements (sym) : stencil->n_displacements;
  complete = sym != NULL || qv_stencil_is_complete (stencil);
  if (!(tolerance < 0.5 * step))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   "--tolerance %g A cannot tell the displaced structures apart: it must be below "
                   "half the step (%g A)", tolerance, step);
      goto fail;
    }

  n = 3 * reference->n_atoms;
  forces = g_try_new (double, n_disp * n);
  if (forces == NULL)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_LIMIT, "not enough memory for the forces of %" G_GSIZE_FORMAT
                   " structures", n_disp);
      goto fail;
    }
  for (gsize d = 0; d < n_disp; d++)
    {
      char *problem = NULL;
      g_autofree double *x = g_new (double, n);
      g_autofree char *what = NULL;
      gsize atom;
      int axis, sign;
      double dir3[3];

      if (sym)
        {
          qv_symmetric_stencil_positions (sym, reference, d, x);
          qv_symmetric_stencil_displacement (sym, d, &atom, dir3, &sign);
          what = g_strdup_printf ("atom %" G_GSIZE_FORMAT " %c(%g %g %g)", atom + 1,
                                  sign > 0 ? '+' : '-', dir3[0], dir3[1], dir3[2]);
        }
      else
        {
          qv_stencil_positions (stencil, reference, d, x);
          qv_stencil_displacement (stencil, d, &atom, &axis, &sign);
          what = g_strdup_printf ("atom %" G_GSIZE_FORMAT " %c%c", atom + 1, sign > 0 ? '+' : '-',
                                  "xyz"[axis]);
        }
      if (!read_result (x, what, reference, d, g_ptr_array_index (names, (guint) d), dir,
                        results ? results : dir, tolerance, forces + d * n, &problem))
        g_ptr_array_add (problems, problem);
    }
  if (problems->len)
    {
      for (guint i = 0; i < problems->len; i++)
        g_printerr ("quaver: %s\n", (const char *) g_ptr_array_index (problems, i));
      g_set_error (&error, QV_ERROR, QV_ERROR_INPUT,
                   "%u of %" G_GSIZE_FORMAT " displaced structures have no usable result (listed above); "
                   "no Hessian written", problems->len, n_disp);
      goto fail;
    }

  factor = qv_force_unit_to_ev_a (unit) * (gradient ? -1.0 : 1.0);
  if (factor != 1.0)
    for (gsize k = 0; k < n_disp * n; k++)
      forces[k] *= factor;
  if (sym)
    {
      double spread = 0.0;
      hessian = qv_symmetric_stencil_assemble (sym, forces, &spread, &error);
      if (hessian == NULL)
        goto fail;
      g_printerr ("quaver: supercell Hessian (%" G_GSIZE_FORMAT "x%" G_GSIZE_FORMAT ") rebuilt from %"
                  G_GSIZE_FORMAT " symmetry-distinct structures (the full stencil has %" G_GSIZE_FORMAT
                  ") with %" G_GSIZE_FORMAT " space-group operations, step %g A; spread (largest "
                  "least-squares residual / max|f|) = %.3g\n", hessian->n, hessian->n, n_disp,
                  6 * reference->n_atoms, qv_symmetric_stencil_n_operations (sym), step, spread);
      if (spread > QV_ASYMMETRY_WARNING)
        g_printerr ("quaver: warning: the spread is above %g: the forces do not have the symmetry "
                    "of the supercell (noisy forces, a step too large, or results that do not "
                    "belong together)\n", QV_ASYMMETRY_WARNING);
      comment = g_strdup_printf (
        "Hessian in eV/A^2 from forces by symmetry-reduced central differences (quaver collect %s)\n"
        "step %.17g A; %" G_GSIZE_FORMAT " displacements, %" G_GSIZE_FORMAT " operations; "
        "full Hessian; spread %.3g\n"
        "coordinate order x1 y1 z1 x2 ... over all atoms",
        dir, step, n_disp, qv_symmetric_stencil_n_operations (sym), spread);
      goto write;
    }
  hessian = qv_stencil_assemble (stencil, forces, &asymmetry, NULL, &error);
  if (hessian == NULL)
    goto fail;
  selection = qv_stencil_format_atoms (stencil);
  g_printerr ("quaver: Hessian of %s atoms (%" G_GSIZE_FORMAT "x%" G_GSIZE_FORMAT ") from %" G_GSIZE_FORMAT
              " structures, step %g A; asymmetry max|H_ij - H_ji|/max|H| = %.3g before symmetrising\n",
              selection, hessian->n, hessian->n, stencil->n_displacements, stencil->step, asymmetry);
  if (asymmetry > QV_ASYMMETRY_WARNING)
    g_printerr ("quaver: warning: the asymmetry is above %g: noisy forces, a step too large or too "
                "small, or results that do not belong together\n", QV_ASYMMETRY_WARNING);
  if (!qv_stencil_is_complete (stencil))
    g_printerr ("quaver: note: a partial Hessian (atoms %s, all others held fixed), not a full one\n",
                selection);

  comment = g_strdup_printf (
    "Hessian in eV/A^2 from forces by central differences (quaver collect %s)\n"
    "step %.17g A; %s; asymmetry before symmetrising %.3g\n"
    "coordinate order x1 y1 z1 x2 ... over %s",
    dir, stencil->step, qv_stencil_is_complete (stencil) ? "full Hessian" :
    "partial Hessian: the selected atoms only, all others held fixed", asymmetry,
    qv_stencil_is_complete (stencil) ? "all atoms" : selection);
write:
  for (char **o = outputs; o && *o; o++)
    {
      const QvHessianWriteFormat wf = qv_hessian_write_format_for (*o);
      if (!qv_hessian_write_file (*o, hessian, wf, comment, force, &error))
        goto fail;
      g_printerr ("quaver: wrote %s (%s, eV/A^2)\n", *o, wf == QV_HESSIAN_WRITE_NPY ? ".npy" : "text");
    }

  if (show_modes)
    {
      g_autoptr(QvStructure) sub = sym ? qv_structure_copy (reference)
                                       : qv_stencil_selected_structure (stencil, reference);
      g_autoptr(QvModeSet) modes = NULL;
      g_autoptr(QvHessian) copy = qv_hessian_copy (hessian, &error);
      g_autofree char *document = NULL;
      g_autofree char *source = g_strdup_printf ("%s (quaver collect)", dir);
      QvModeReport report = { 0 };

      if (copy == NULL)
        goto fail;
      if (!complete && projection == NULL)
        solve.projection = QV_PROJECTION_NONE;
      else if (!complete && solve.projection != QV_PROJECTION_NONE)
        g_printerr ("quaver: warning: rigid-body projection of a partial Hessian: the fixed atoms "
                    "already break translation and rotation invariance\n");
      modes = qv_solve (sub, g_steal_pointer (&copy), &solve, &progress, &error);
      if (modes == NULL)
        goto fail;
      report.structure = sub;
      report.modes = modes;
      report.level = (guint) level;
      report.temperature = temperature;
      report.vectors = vectors;
      report.hessian_source = source;
      report.hessian_units = "eV/A^2";
      report.layout = QV_HESSIAN_LAYOUT_FULL;
      report.mass_model = QV_MASS_ISOTOPIC;
      document = qv_mode_table_format (&report, table_format);
      status = qv_cli_emit ("collect", NULL, document, FALSE);
    }
  else if (outputs == NULL)
    {
      g_autofree char *text = qv_hessian_format_text (hessian, comment, NULL);
      status = qv_cli_emit ("collect", NULL, text, FALSE);
    }
  goto out;

fail:
  status = qv_cli_fail ("collect", error);
out:
  g_free (results); g_free (units); g_free (projection); g_free (format);
  g_strfreev (outputs);
  return status;
}
