/* qv-cmd-frozen.c — `quaver frozen-phonon`: a supercell displaced along one
 * lattice mode at a commensurate q (qv-frozen-phonon.h), written with its
 * manifest.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-cli.h"
#include "qv-cli-lattice.h"
#include "qv-error.h"
#include "qv-export.h"
#include "qv-frozen-phonon.h"
#include "qv-manifest.h"
#include "qv-supercell.h"

static const char frozen_description_head[] =
  "A frozen phonon: a supercell whose atoms are displaced along one branch of\n"
  "the dispersion at a wave vector q commensurate with it,\n"
  "  u = Re[A e^(i phase) e_k(q) e^(i q.(R_l + tau_k))] / sqrt(N m_k),\n"
  "in the phase convention of `quaver bands` (docs/methods.md). The force\n"
  "constants come from the supercell Hessian as for bands; the displaced cell\n"
  "is that supercell, or another one given with --cell.\n"
  "\n";

static const char frozen_description_tail[] =
  "\n"
  "q is in fractional reciprocal coordinates of the primitive cell without\n"
  "2 pi; it must be commensurate with the displaced cell (M q integer; for an\n"
  "NxMxL cell, multiples of 1/N, 1/M, 1/L). Branches count from 1 in\n"
  "ascending order at q. The amplitude is the largest atomic displacement\n"
  "(--largest, A, default 0.05) or the normal coordinate A (--normal-coordinate,\n"
  "sqrt(u) A). A static pattern at q other than -q holds q and -q together:\n"
  "started at rest it is a standing wave.\n"
  "With --born the eigenvector and wavenumber are those of D(q) with the\n"
  "LO-TO term (as quaver bands --born shows them).\n"
  "\n"
  "Writes DIR/frozen-phonon.xyz (extended XYZ with Lattice, masses, and q,\n"
  "branch, wavenumber, amplitude and phase on the comment line) and\n"
  "DIR/manifest.json.\n"
  "\n"
  "Examples:\n"
  "  quaver frozen-phonon prim.xyz -S sc.xyz -H sc.hess -u eV/A^2 --q \"0.5 0 0.5\" --branch 6 -o X6\n"
  "  quaver frozen-phonon prim.xyz --supercell 4x4x4 -H fc.npy -u eV/A^2 \\\n"
  "      --q \"0.5 0 0\" --branch 4 --cell 2x1x1 --phase 90 -o out\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.";

static gboolean
parse_q (const char *text, double q[3], GError **error)
{
  g_auto(GStrv) parts = g_strsplit_set (text, " ,\t", -1);
  int n = 0;
  for (char **p = parts; *p; p++)
    {
      char *end;
      if (**p == '\0')
        continue;
      if (n == 3)
        goto bad;
      q[n] = g_ascii_strtod (*p, &end);
      if (*end != '\0' || !isfinite (q[n]))
        goto bad;
      n++;
    }
  if (n == 3)
    return TRUE;
bad:
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "--q takes three numbers \"QA QB QC\" (fractional, without 2 pi), got '%s'", text);
  return FALSE;
}

int
qv_cmd_frozen (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  g_auto(GStrv) arguments = g_strdupv (argv + 1);
  char *q_arg = NULL, *cell_arg = NULL, *output = NULL;
  gint64 branch = 0;
  double largest = NAN, normal = NAN, phase_deg = 0;
  gboolean force = FALSE;
  QvCliLatticeOptions lo;
  g_autoptr(QvCliLattice) lattice = NULL;
  g_autoptr(QvStructure) cell = NULL;
  g_autoptr(QvSupercellMap) own_map = NULL;
  g_autoptr(QvFrozenPhonon) fp = NULL;
  g_autoptr(QvExport) export_ = NULL;
  g_autoptr(QvManifest) manifest = NULL;
  g_autofree char *description = NULL;
  const QvSupercellMap *map;
  QvFrozenRequest request = { { 0, 0, 0 }, 0, 0.05, QV_FROZEN_LARGEST, 0 };
  int status = QV_EXIT_OK;
  GOptionEntry entries[] = {
    { "q", 'q', 0, G_OPTION_ARG_STRING, &q_arg, "Wave vector \"QA QB QC\" (fractional, without 2 pi)", "Q" },
    { "branch", 'b', 0, G_OPTION_ARG_INT64, &branch, "Branch, from 1 in ascending order at q", "N" },
    { "largest", 0, 0, G_OPTION_ARG_DOUBLE, &largest, "Largest atomic displacement, A (default 0.05)", "A" },
    { "normal-coordinate", 0, 0, G_OPTION_ARG_DOUBLE, &normal, "Amplitude A of the normal coordinate, sqrt(u) A", "Q" },
    { "phase", 0, 0, G_OPTION_ARG_DOUBLE, &phase_deg, "Phase of the pattern, degrees (default 0)", "DEG" },
    { "cell", 0, 0, G_OPTION_ARG_STRING, &cell_arg, "Displace this supercell (NxMxL or 9 integers) instead", "MATRIX" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "Directory to write (new or empty)", "DIR" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Write into a non-empty directory", NULL },
    { NULL }
  };

  g_set_prgname ("quaver frozen-phonon");
  context = g_option_context_new ("PRIMITIVE");
  g_option_context_set_summary (context, "A supercell displaced along one lattice mode at a commensurate q.");
  description = g_strconcat (frozen_description_head, qv_cli_lattice_help, frozen_description_tail, NULL);
  g_option_context_set_description (context, description);
  if (!qv_cli_lattice_parse ("frozen-phonon", context, &lo, entries, &argc, &argv, &error))
    goto fail;
  if (q_arg == NULL || branch == 0)
    {
      g_set_error_literal (&error, QV_ERROR, QV_ERROR_USAGE,
                           "frozen-phonon needs the mode: --q \"QA QB QC\" and --branch N");
      goto fail;
    }
  if (!parse_q (q_arg, request.q, &error))
    goto fail;
  if (branch < 1 || branch > 3000000)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "--branch counts from 1, got %" G_GINT64_FORMAT, branch);
      goto fail;
    }
  request.branch = (gsize) (branch - 1);
  if (!isnan (largest) && !isnan (normal))
    {
      g_set_error_literal (&error, QV_ERROR, QV_ERROR_USAGE,
                           "give the amplitude once: --largest or --normal-coordinate");
      goto fail;
    }
  if (!isnan (normal))
    {
      request.unit = QV_FROZEN_Q;
      request.amplitude = normal;
    }
  else if (!isnan (largest))
    request.amplitude = largest;
  if (!isfinite (phase_deg))
    {
      g_set_error_literal (&error, QV_ERROR, QV_ERROR_USAGE, "--phase must be a number of degrees");
      goto fail;
    }
  request.phase = phase_deg * G_PI / 180;
  if (output == NULL)
    {
      g_set_error_literal (&error, QV_ERROR, QV_ERROR_USAGE,
                           "frozen-phonon needs an output directory: -o DIR");
      goto fail;
    }

  lattice = qv_cli_lattice_load ("frozen-phonon", &lo, argv[1], &error);
  if (lattice == NULL)
    goto fail;
  manifest = qv_manifest_new ("frozen-phonon");
  for (char **a = arguments; *a; a++)
    qv_manifest_add_argument (manifest, *a);
  if (!qv_manifest_add_input_file (manifest, "primitive", argv[1], &error)
      || !qv_manifest_add_input_file (manifest, "hessian", lo.hessian, &error)
      || (lo.supercell_structure
          && !qv_manifest_add_input_file (manifest, "supercell", lo.supercell_structure, &error)))
    goto fail;

  if (cell_arg || lo.supercell_structure == NULL)
    {
      int matrix[3][3];
      if (cell_arg)
        {
          if (!qv_supercell_matrix_parse (cell_arg, matrix, &error))
            goto fail;
        }
      else
        memcpy (matrix, lattice->map->matrix, sizeof matrix);
      cell = qv_supercell_build (lattice->primitive, matrix, &error);
      if (cell == NULL)
        goto fail;
      own_map = qv_supercell_map (lattice->primitive, cell, lo.tolerance, &error);
      if (own_map == NULL)
        goto fail;
      map = own_map;
    }
  else
    {
      /* the supercell as the user gave it: same atom order */
      cell = qv_cli_lattice_read_structure ("frozen-phonon", lo.supercell_structure, "supercell",
                                            &error);
      if (cell == NULL)
        goto fail;
      map = lattice->map;
    }
  /* with --born, D(q) has the LO-TO term too (at Gamma itself, which has
   * no direction of approach, it adds nothing: qv-nonanalytic.h) */
  fp = qv_frozen_phonon_new_with (lattice->fc, lattice->na ? qv_nonanalytic_add : NULL, lattice->na,
                                  map, cell, &request, &error);
  if (fp == NULL)
    goto fail;
  qv_manifest_set_number (manifest->options, "phase_deg", phase_deg);
  export_ = qv_export_new_frozen (fp, NULL, g_steal_pointer (&manifest), &error);
  if (export_ == NULL)
    goto fail;
  if (!qv_export_write (export_, output, force, NULL, &error))
    goto fail;
  for (const char *const *n = qv_export_notes (export_); *n; n++)
    g_printerr ("quaver: note: %s\n", *n);
  g_printerr ("quaver: wrote a %" G_GSIZE_FORMAT "-atom supercell displaced along branch %"
              G_GINT64_FORMAT " at q = (%s) (%.2f cm-1; A = %g sqrt(u) A, largest %g A) to %s\n",
              fp->n_atoms, branch, q_arg, fp->wavenumber, fp->a, fp->largest,
              qv_export_directory (export_));
  goto out;

fail:
  status = qv_cli_fail ("frozen-phonon", error);
out:
  qv_cli_lattice_options_clear (&lo);
  g_free (q_arg);
  g_free (cell_arg);
  g_free (output);
  return status;
}
