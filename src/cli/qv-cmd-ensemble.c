/* qv-cmd-ensemble.c — `quaver ensemble`: thermally sampled structures with
 * velocities (harmonic Wigner distribution, qv-ensemble.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <string.h>
#include <gio/gio.h>
#include "qv-cli-solve.h"
#include "qv-cli.h"
#include "qv-ensemble.h"
#include "qv-error.h"
#include "qv-manifest.h"
#include "qv-export.h"
#include "qv-solver.h"
#include "qv-xyz.h"
#include "qv-config.h"

static const char ensemble_description[] =
  "Writes COUNT structures drawn from the harmonic Wigner distribution of\n"
  "GEOMETRY at temperature T: every vibrational mode k gets an independent\n"
  "normal coordinate Q_k and momentum P_k with <Q^2> = hbar/(2 omega) coth(hbar\n"
  "omega / 2 k_B T) and <P^2> = omega^2 <Q^2>; positions r = r0 + sum Q_k l_k/sqrt(m)\n"
  "in A and velocities v = sum P_k l_k/sqrt(m) in A/fs. Imaginary modes are always\n"
  "left out (with a warning naming them), rigid-body modes are never sampled,\n"
  "and --min-wavenumber leaves out soft modes. Every sample has its centre of\n"
  "mass at that of GEOMETRY and zero total linear and angular momentum.\n"
  "\n"
  "The same --seed gives the same samples: sample s uses random stream s-1 of\n"
  "the seed (xoshiro256** seeded by splitmix64, normals by Marsaglia's polar\n"
  "method), independent of COUNT. Without --seed a seed is picked and recorded.\n"
  "\n"
  "Output: DIR/sample-0001.xyz … (or DIR/ensemble.xyz with --single-file),\n"
  "extended XYZ with Properties=species:S:1:pos:R:3:velocities:R:3 and\n"
  "velocity_unit=A/fs on every comment line, and DIR/manifest.json with the\n"
  "temperature, seed, modes sampled and left out, and every sample's file.\n"
  "DIR must be new or empty unless --force.\n"
  "\n"
  "Examples:\n"
  "  quaver ensemble --demo -T 300 -n 100 --seed 42 -o ens\n"
  "  quaver ensemble mol.xyz -H mol.hess -u hartree/bohr^2 -T 500 -n 1000 \\\n"
  "      --min-wavenumber 50 --single-file -o ens500\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.\n"
  "Harmonic sampling ignores anharmonicity: validate before relying on it.";

static gboolean
parse_seed (const char *text, guint64 *seed, GError **error)
{
  char *end = NULL;
  guint64 v;

  errno = 0;
  v = g_ascii_strtoull (text, &end, 0);
  if (end == text || *end != '\0' || errno != 0 || text[0] == '-' || v >= QV_EXPORT_SEED_LIMIT)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "--seed takes a whole number from 0 to %" G_GUINT64_FORMAT
                   " (decimal or 0x hex), got '%s'", QV_EXPORT_SEED_LIMIT - 1, text);
      return FALSE;
    }
  *seed = v;
  return TRUE;
}

int
qv_cmd_ensemble (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  QvCliSolveArgs solve = { 0 };
  g_autoptr(QvInput) input = NULL;
  g_autoptr(QvModeSet) modes = NULL;
  g_autoptr(QvExport) export_ = NULL;
  g_autoptr(QvManifest) manifest = NULL;
  QvExportFormat xformat;
  QvProgress progress = { qv_cli_progress, NULL };
  g_auto(GStrv) arguments = g_new0 (char *, argc + 1);
  QvEnsembleOptions eo;
  char *output = NULL, *seed_text = NULL, *format = NULL;
  gint64 count = 100;
  double temperature = 298.15, min_wavenumber = 0.0;
  gboolean force = FALSE, single_file = FALSE, plain = FALSE;
  int status = QV_EXIT_OK;
  GOptionEntry entries[] = {
    { "temperature", 'T', 0, G_OPTION_ARG_DOUBLE, &temperature,
      "Temperature in K (default 298.15; 0 samples the zero-point distribution)", "T" },
    { "count", 'n', 0, G_OPTION_ARG_INT64, &count, "Number of samples (default 100)", "N" },
    { "seed", 's', 0, G_OPTION_ARG_STRING, &seed_text,
      "Seed of the random streams (default: picked and recorded in the manifest)", "SEED" },
    { "min-wavenumber", 0, 0, G_OPTION_ARG_DOUBLE, &min_wavenumber,
      "Leave out real modes below this wavenumber in cm-1 (default 0)", "CM-1" },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format,
      "extxyz (default: positions and velocities) or xyz (positions only)", "FORMAT" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "Directory to write (new or empty)", "DIR" },
    { "single-file", 0, 0, G_OPTION_ARG_NONE, &single_file,
      "All samples as frames of one file, DIR/ensemble.xyz", NULL },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Write into a non-empty DIR, replacing files", NULL },
    { NULL }
  };

  for (int i = 1; i < argc; i++)
    arguments[i - 1] = g_strdup (argv[i]);
  g_set_prgname ("quaver ensemble");
  context = g_option_context_new ("GEOMETRY");
  g_option_context_set_summary (context, "Thermal ensemble of structures with velocities.");
  g_option_context_set_description (context, ensemble_description);
  g_option_context_add_main_entries (context, entries, NULL);
  solve.all_modes = TRUE;
  qv_cli_solve_add_entries (context, &solve);
  qv_ensemble_options_init (&eo);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    goto fail;
  if (argc > 2 || (argc == 2 && solve.demo) || (argc < 2 && !solve.demo))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   argc > 2 ? "ensemble takes one GEOMETRY, got %d" :
                   solve.demo ? "--demo replaces GEOMETRY; give one or the other" :
                   "ensemble needs a GEOMETRY file (or --demo)", argc - 1);
      goto fail;
    }
  if (solve.lowest != 0 || solve.method)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   "ensemble samples every vibration: it takes no --lowest or --lowest-method");
      goto fail;
    }
  if (output == NULL)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "ensemble needs an output directory: -o DIR");
      goto fail;
    }
  if (count < 1 || count > 10000000)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "--count must be a number of samples from 1 to 10000000");
      goto fail;
    }
  if (format)
    {
      if (g_ascii_strcasecmp (format, "xyz") == 0)
        plain = TRUE;
      else if (g_ascii_strcasecmp (format, "extxyz") != 0)
        {
          g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                       "--format takes extxyz or xyz, got '%s'", format);
          goto fail;
        }
    }
  eo.temperature = temperature;
  eo.min_wavenumber = min_wavenumber;
  if (seed_text)
    {
      if (!parse_seed (seed_text, &eo.seed, &error))
        goto fail;
    }
  else
    /* Only the choice of a seed is random; the streams are qv-random's. */
    eo.seed = (((guint64) g_random_int () << 32) | g_random_int ()) % QV_EXPORT_SEED_LIMIT;

  modes = qv_cli_solve (&solve, argc == 2 ? argv[1] : NULL, &input, &error);
  if (modes == NULL)
    goto fail;

  manifest = qv_manifest_new ("ensemble");
  for (char **a = arguments; *a; a++)
    qv_manifest_add_argument (manifest, *a);
  if (!qv_cli_solve_hash_inputs (&solve, argc == 2 ? argv[1] : NULL, input, manifest, &error))
    goto fail;
  qv_export_format_init (&xformat);
  xformat.style = plain ? QV_XYZ_PLAIN : QV_XYZ_EXTENDED;
  xformat.single_file = single_file;
  export_ = qv_export_new_ensemble (input->structure, modes, &eo, (guint64) count, &xformat,
                                    g_steal_pointer (&manifest), &error);
  if (export_ == NULL)
    goto fail;
  for (const char *const *w = qv_export_notes (export_); *w; w++)
    g_printerr ("quaver: warning: %s\n", *w);
  if (!qv_export_write (export_, output, force, &progress, &error))
    goto fail;
  {
    const QvManifest *m = qv_export_manifest (export_);
    const QvManifestField *used = qv_manifest_get (m->parameters, "modes_sampled");
    const QvManifestField *n_used = qv_manifest_get (m->parameters, "n_modes_sampled");
    char temp_buf[G_ASCII_DTOSTR_BUF_SIZE];

    g_ascii_formatd (temp_buf, sizeof temp_buf, "%g", temperature);
    g_printerr ("quaver: wrote %" G_GINT64_FORMAT " sample%s at %s K (seed %" G_GUINT64_FORMAT
                ", %" G_GINT64_FORMAT " modes sampled: %s) to %s\n", count, count == 1 ? "" : "s",
                temp_buf, eo.seed, n_used->integer, used->string, qv_export_directory (export_));
  }
  goto out;

fail:
  status = qv_cli_fail ("ensemble", error);
out:
  g_free (output); g_free (seed_text); g_free (format);
  qv_cli_solve_args_clear (&solve);
  return status;
}
