/* qv-cli-solve.c — the input and solver options shared by table and
 * displace; `quaver modes` keeps its own (identical) spelling.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include <gio/gio.h>
#include "qv-cli-distributed.h"
#include "qv-cli-solve.h"
#include "qv-error.h"
#include "qv-input.h"
#include "qv-solver.h"

void
qv_cli_solve_add_entries (GOptionContext *context, QvCliSolveArgs *a)
{
  const GOptionEntry entries[] = {
    { "hessian", 'H', 0, G_OPTION_ARG_FILENAME, &a->hessian, "Hessian file: text or NumPy .npy", "FILE" },
    { "hessian-units", 'u', 0, G_OPTION_ARG_STRING, &a->units,
      "Units of the Hessian: eV/A^2, hartree/bohr^2, kcal/mol/A^2, kJ/mol/A^2, mdyn/A, aJ/A^2, N/m", "UNIT" },
    { "hessian-layout", 0, 0, G_OPTION_ARG_STRING, &a->layout,
      "Text layout: auto (default, from the row lengths), full, lower, upper", "LAYOUT" },
    { "project", 'p', 0, G_OPTION_ARG_STRING, &a->projection,
      "Rigid-body motion to remove: full (default), translations, none", "WHAT" },
    { "lowest", 'k', a->all_modes ? G_OPTION_FLAG_HIDDEN : 0, G_OPTION_ARG_INT64, &a->lowest,
      "Solve only the lowest K modes (faster)", "K" },
    { "lowest-method", 0, a->all_modes ? G_OPTION_FLAG_HIDDEN : 0, G_OPTION_ARG_STRING, &a->method,
      "How --lowest solves: auto (default), lapack (dsyevr), lanczos (shift-invert, checked, falls back to lapack)", "HOW" },
    { "masses", 0, 0, G_OPTION_ARG_STRING, &a->masses,
      "isotopic (most abundant isotope, default) or average (standard atomic weights)", "MODEL" },
    { "isotope", 'i', 0, G_OPTION_ARG_STRING_ARRAY, &a->isotopes,
      "Give an atom an isotope, e.g. 3=2 for deuterium on atom 3 (repeatable)", "ATOM=A" },
    { "mass", 'm', 0, G_OPTION_ARG_STRING_ARRAY, &a->mass_overrides,
      "Give an atom a mass in u (repeatable)", "ATOM=MASS" },
    { "demo", 0, 0, G_OPTION_ARG_NONE, &a->demo, "Use the built-in demo (invented data) as input", NULL },
    { "symmetry-tolerance", 0, 0, G_OPTION_ARG_DOUBLE, &a->symmetry_tolerance,
      "Largest distance in A between an atom's image and its partner for the point group (default 0.01)", "A" },
    { "symmetrize", 0, 0, G_OPTION_ARG_NONE, &a->symmetrize,
      "Average the geometry and the Hessian over the point group before solving", NULL },
    { NULL }
  };
  const GOptionEntry distributed[] = {
    { "distributed", 0, 0, G_OPTION_ARG_NONE, &a->distributed,
      "Solve over MPI ranks with ScaLAPACK: run as 'mpirun -n P quaver …' with a .npy Hessian "
      "(docs/cluster.md)", NULL },
    { "block-size", 0, 0, G_OPTION_ARG_INT64, &a->block_size,
      "--distributed: rows and columns of the blocks dealt to the ranks (default 64)", "NB" },
    { NULL }
  };

  g_option_context_add_main_entries (context, entries, NULL);
  if (a->offer_distributed)
    g_option_context_add_main_entries (context, distributed, NULL);
}

/* Finds the point group (modes and table, or --symmetrize) and with
 * --symmetrize averages the geometry and the Hessian over it. A molecule
 * whose group cannot be found is still solved, with a warning. */
static gboolean
symmetry_before (QvCliSolveArgs *a, QvInput *input, GError **error)
{
  g_autoptr(GError) local = NULL;

  if (a->symmetry_tolerance < 0 || a->symmetry_tolerance >= 1 || isnan (a->symmetry_tolerance))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "--symmetry-tolerance must be a distance in A above 0 and below 1 (got %g); "
                   "%g suits optimised geometries", a->symmetry_tolerance, QV_SYMMETRY_DEFAULT_TOLERANCE);
      return FALSE;
    }
  if (!a->want_symmetry && !a->symmetrize)
    return TRUE;
  if (qv_structure_is_periodic (input->structure))
    {
      if (a->symmetrize)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                       "--symmetrize works on molecules (point groups); this structure is periodic");
          return FALSE;
        }
      return TRUE;
    }
  a->point_group = qv_point_group_detect (input->structure, a->symmetry_tolerance, &local);
  if (a->point_group == NULL)
    {
      if (a->symmetrize)
        {
          g_propagate_prefixed_error (error, g_steal_pointer (&local), "--symmetrize: ");
          return FALSE;
        }
      g_printerr ("%s: warning: no point group: %s\n", g_get_prgname (), local->message);
      return TRUE;
    }
  if (a->symmetrize)
    {
      qv_point_group_symmetrize_structure (a->point_group, input->structure);
      if (input->hessian)
        qv_point_group_symmetrize_hessian (a->point_group, input->hessian);
      else if (input->modes)
        g_printerr ("%s: warning: --symmetrize: the input has modes but no Hessian; only the "
                    "geometry was averaged\n", g_get_prgname ());
    }
  return TRUE;
}

/* What --distributed takes: a geometry with a .npy Hessian (each rank reads
 * its blocks from the file), and nothing that needs the whole matrix. */
static gboolean
distributed_usage (const QvCliSolveArgs *a, const char *geometry, GError **error)
{
  const char *refused = a->demo ? "--demo (its Hessian is inside the bundle)"
                        : a->symmetrize ? "--symmetrize (it averages the whole Hessian)"
                        : a->layout ? "--hessian-layout (a .npy file says its own layout)"
                        : a->method ? "--lowest-method (--distributed solves the lowest modes with pdsyevr)"
                        : geometry && qv_input_is_bundle (geometry) ? "a bundle as GEOMETRY"
                        : NULL;

  if (refused)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "--distributed does not take %s; give an XYZ geometry with --hessian FILE.npy "
                   "--hessian-units UNIT", refused);
      return FALSE;
    }
  if (a->block_size < 0 || a->block_size > 4096)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "--block-size must be from 1 to 4096 (got %" G_GINT64_FORMAT "); 64 suits "
                   "most clusters", a->block_size);
      return FALSE;
    }
  return TRUE;
}

QvModeSet *
qv_cli_solve (QvCliSolveArgs *a, const char *geometry, QvInput **input_out, GError **error)
{
  QvCliInputOptions io = { 0 };
  QvSolveOptions solve;
  QvProgress progress = { qv_cli_progress, NULL };
  g_autoptr(QvInput) input = NULL;
  QvModeSet *modes;

  qv_solve_options_init (&solve);
  if ((a->projection && !qv_projection_parse (a->projection, &solve.projection, error))
      || (a->method && !qv_lowest_method_parse (a->method, &solve.lowest_method, error)))
    return NULL;
  if (a->lowest < 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "--lowest must be a positive number of modes");
      return NULL;
    }
  io.geometry = geometry;
  io.demo = a->demo;
  io.hessian = a->hessian;
  io.hessian_units = a->units;
  io.hessian_layout = a->layout;
  io.masses = a->masses;
  io.isotopes = a->isotopes;
  io.mass_overrides = a->mass_overrides;
  io.all_modes = a->lowest == 0;
  if (a->distributed && !distributed_usage (a, geometry, error))
    return NULL;
  if (!a->distributed && a->block_size != 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "--block-size goes with --distributed");
      return NULL;
    }
  io.hessian_deferred = a->distributed;
  input = qv_cli_input_load (&io, error);
  if (input == NULL)
    return NULL;
  /* the point group and the labels are rank 0's work */
  if (!qv_cli_distributed_is_root ())
    a->want_symmetry = FALSE;
  if (!symmetry_before (a, input, error))
    return NULL;
  if (a->distributed)
    {
      solve.lowest = (gsize) a->lowest;
      modes = qv_cli_distributed_solve (input->structure, input->hessian_source,
                                        input->hessian_scale, &solve, (gsize) a->block_size, error);
      if (modes == NULL)
        return NULL;
    }
  else if (input->hessian)
    {
      solve.lowest = (gsize) a->lowest;
      modes = qv_solve (input->structure, g_steal_pointer (&input->hessian), &solve, &progress,
                        error);
      if (modes == NULL)
        return NULL;
    }
  else
    modes = g_steal_pointer (&input->modes);
  if (a->point_group && a->want_symmetry)
    {
      a->symmetry = qv_symmetry_report_new (a->point_group, modes);
      if (a->symmetrize)
        qv_symmetry_align_degenerate (a->symmetry, modes);
    }
  *input_out = g_steal_pointer (&input);
  return modes;
}

gboolean
qv_cli_solve_hash_inputs (const QvCliSolveArgs *a, const char *geometry, const QvInput *input,
                          QvManifest *manifest, GError **error)
{
  if (a->demo)
    {
      g_autoptr(GBytes) bytes = g_resources_lookup_data (QV_INPUT_DEMO_RESOURCE, 0, NULL);
      gsize len = 0;
      const void *data = bytes ? g_bytes_get_data (bytes, &len) : NULL;

      if (data == NULL)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT, "the built-in demo is missing from this build");
          return FALSE;
        }
      qv_manifest_add_input_data (manifest, "demo", "resource://" QV_INPUT_DEMO_RESOURCE, data, len);
      return TRUE;
    }
  if (geometry && !qv_manifest_add_input_file (manifest, qv_input_is_bundle (geometry) ? "bundle" : "geometry",
                                               geometry, error))
    return FALSE;
  if (a->hessian)
    return qv_manifest_add_input_file (manifest, "hessian", a->hessian, error);
  /* a bundle's Hessian in a file of its own */
  if (geometry && qv_input_is_bundle (geometry) && input->hessian_source
      && g_file_test (input->hessian_source, G_FILE_TEST_IS_REGULAR))
    return qv_manifest_add_input_file (manifest, "hessian", input->hessian_source, error);
  return TRUE;
}

void
qv_cli_solve_report (QvModeReport *report, const QvInput *input, const QvModeSet *modes)
{
  report->structure = input->structure;
  report->modes = modes;
  report->hessian_source = input->hessian_source;
  report->hessian_units = input->hessian_units;
  report->layout = input->layout;
  report->mass_model = input->mass_model;
}

void
qv_cli_solve_report_symmetry (QvModeReport *report, const QvCliSolveArgs *a)
{
  report->symmetry = a->symmetry;
}

void
qv_cli_solve_args_clear (QvCliSolveArgs *a)
{
  g_free (a->hessian); g_free (a->units); g_free (a->layout); g_free (a->masses);
  g_free (a->projection); g_free (a->method);
  g_strfreev (a->isotopes); g_strfreev (a->mass_overrides);
  qv_symmetry_report_free (a->symmetry);
  qv_point_group_free (a->point_group);
  memset (a, 0, sizeof *a);
}
