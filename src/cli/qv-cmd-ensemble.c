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
#include "qv-output-dir.h"
#include "qv-solver.h"
#include "qv-xyz.h"
#include "qv-config.h"

/* Seeds are kept below 2⁵³ so that every JSON reader holds them exactly. */
#define SEED_LIMIT ((guint64) 1 << 53)
/* Samples made, formatted and written per round: up to 256 (one wide matrix
 * product per round is what makes sampling fast, qv-ensemble.c), fewer for
 * huge structures so a round holds at most 2²⁴ coordinates per array. */
#define WRITE_BLOCK_MAX 256
#define WRITE_BLOCK_COORDINATES ((gsize) 1 << 24)

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

/* "1-3,7,9-12" (1-based) of the modes with @status. */
static char *
mode_ranges (const QvEnsemble *e, QvEnsembleModeStatus status, gsize *count)
{
  GString *s = g_string_new (NULL);
  const gsize n = e->modes->n_modes;

  *count = 0;
  for (gsize k = 0; k < n; k++)
    {
      gsize j = k;
      if (e->status[k] != status)
        continue;
      while (j + 1 < n && e->status[j + 1] == status)
        j++;
      if (s->len)
        g_string_append_c (s, ',');
      if (j == k)
        g_string_append_printf (s, "%" G_GSIZE_FORMAT, k + 1);
      else
        g_string_append_printf (s, "%" G_GSIZE_FORMAT "-%" G_GSIZE_FORMAT, k + 1, j + 1);
      *count += j - k + 1;
      k = j;
    }
  return g_string_free (s, FALSE);
}

static gboolean
parse_seed (const char *text, guint64 *seed, GError **error)
{
  char *end = NULL;
  guint64 v;

  errno = 0;
  v = g_ascii_strtoull (text, &end, 0);
  if (end == text || *end != '\0' || errno != 0 || text[0] == '-' || v >= SEED_LIMIT)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "--seed takes a whole number from 0 to %" G_GUINT64_FORMAT
                   " (decimal or 0x hex), got '%s'", SEED_LIMIT - 1, text);
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
  g_autoptr(QvEnsemble) ensemble = NULL;
  g_autoptr(QvManifest) manifest = NULL;
  g_autoptr(QvOutputDir) dir = NULL;
  g_auto(GStrv) warnings = NULL;
  g_auto(GStrv) arguments = g_new0 (char *, argc + 1);
  QvEnsembleOptions eo;
  QvEnsembleStats stats = { 0 };
  g_autofree double *positions = NULL, *velocities = NULL;
  g_autoptr(GString) single = NULL;
  QvManifestFile *single_entry = NULL;
  char *output = NULL, *seed_text = NULL, *format = NULL;
  gint64 count = 100;
  double temperature = 298.15, min_wavenumber = 0.0;
  gboolean force = FALSE, single_file = FALSE, plain = FALSE;
  gboolean periodic;
  char seed_buf[32], temp_buf[G_ASCII_DTOSTR_BUF_SIZE];
  int width, status = QV_EXIT_OK;
  gsize n, block;
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
    eo.seed = (((guint64) g_random_int () << 32) | g_random_int ()) % SEED_LIMIT;

  modes = qv_cli_solve (&solve, argc == 2 ? argv[1] : NULL, &input, &error);
  if (modes == NULL)
    goto fail;

  ensemble = qv_ensemble_new (input->structure, modes, &eo, &error);
  if (ensemble == NULL)
    goto fail;
  warnings = qv_ensemble_warnings (ensemble);
  for (char **w = warnings; *w; w++)
    g_printerr ("quaver: warning: %s\n", *w);

  /* Nothing is created before the input and the options are known good. */
  dir = qv_output_dir_open (output, force, &error);
  if (dir == NULL)
    goto fail;

  periodic = qv_structure_is_periodic (input->structure);
  manifest = qv_manifest_new ("ensemble");
  for (char **a = arguments; *a; a++)
    qv_manifest_add_argument (manifest, *a);
  if (!qv_cli_solve_hash_inputs (&solve, argc == 2 ? argv[1] : NULL, input, manifest, &error))
    goto fail;
  manifest->n_atoms = input->structure->n_atoms;
  manifest->formula = qv_structure_formula (input->structure);
  manifest->periodic = periodic;
  qv_manifest_set_number (manifest->options, "temperature", temperature);
  qv_manifest_set_integer (manifest->options, "count", count);
  qv_manifest_set_integer (manifest->options, "seed", (gint64) eo.seed);
  qv_manifest_set_number (manifest->options, "min_wavenumber", min_wavenumber);
  qv_manifest_set_string (manifest->options, "project", qv_projection_name (modes->projection));
  qv_manifest_set_boolean (manifest->options, "single_file", single_file);
  qv_manifest_set_string (manifest->options, "format", plain ? "xyz" : "extxyz");
  qv_manifest_set_string (manifest->parameters, "sampling", "harmonic Wigner");
  qv_manifest_set_number (manifest->parameters, "temperature", temperature);
  qv_manifest_set_integer (manifest->parameters, "seed", (gint64) eo.seed);
  qv_manifest_set_string (manifest->parameters, "random",
                          "xoshiro256** seeded by splitmix64; sample s uses stream s-1; "
                          "Marsaglia polar pairs (Q_k, P_k) for every mode k in order");
  qv_manifest_set_integer (manifest->parameters, "samples", count);
  qv_manifest_set_string (manifest->parameters, "position_unit", "A");
  qv_manifest_set_string (manifest->parameters, "velocity_unit", "A/fs");
  qv_manifest_set_number (manifest->parameters, "min_wavenumber", min_wavenumber);
  {
    static const struct { QvEnsembleModeStatus st; const char *key; } groups[] = {
      { QV_ENSEMBLE_MODE_SAMPLED, "modes_sampled" },
      { QV_ENSEMBLE_MODE_IMAGINARY, "modes_imaginary" },
      { QV_ENSEMBLE_MODE_BELOW_CUTOFF, "modes_below_cutoff" },
      { QV_ENSEMBLE_MODE_ZERO, "modes_zero" },
      { QV_ENSEMBLE_MODE_RIGID_BODY, "modes_rigid_body" },
    };
    for (gsize g = 0; g < G_N_ELEMENTS (groups); g++)
      {
        gsize c;
        g_autofree char *r = mode_ranges (ensemble, groups[g].st, &c);
        g_autofree char *key = g_strconcat ("n_", groups[g].key, NULL);
        qv_manifest_set_string (manifest->parameters, groups[g].key, r);
        qv_manifest_set_integer (manifest->parameters, key, (gint64) c);
      }
  }
  for (char **w = warnings; *w; w++)
    qv_manifest_add_note (manifest, *w);

  n = 3 * input->structure->n_atoms;
  block = CLAMP (WRITE_BLOCK_COORDINATES / n, (gsize) 1, (gsize) WRITE_BLOCK_MAX);
  positions = g_try_new (double, n * block);
  velocities = g_try_new (double, n * block);
  if (positions == NULL || velocities == NULL)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_LIMIT, "not enough memory for a block of samples");
      goto fail;
    }
  width = MAX (4, (int) floor (log10 ((double) count)) + 1);
  g_snprintf (seed_buf, sizeof seed_buf, "%" G_GUINT64_FORMAT, eo.seed);
  g_ascii_formatd (temp_buf, sizeof temp_buf, "%g", temperature);
  if (single_file)
    {
      single = g_string_sized_new ((gsize) MIN (count, 1000) * (input->structure->n_atoms + 2) * 110);
      single_entry = NULL;
    }

  for (gint64 b0 = 0; b0 < count; b0 += (gint64) block)
    {
      const gsize nb = (gsize) MIN ((gint64) block, count - b0);

      if (!qv_ensemble_generate (ensemble, (gsize) b0, nb, positions, velocities, &stats, NULL, &error))
        goto fail;
      for (gsize b = 0; b < nb; b++)
        {
          const gint64 sample = b0 + (gint64) b + 1;
          char sample_buf[24];
          QvXyzPair pairs[4] = {
            { "sample", sample_buf }, { "temperature", temp_buf }, { "seed", seed_buf },
            { "velocity_unit", "A/fs" },
          };
          QvXyzFrame frame = {
            .style = QV_XYZ_EXTENDED, .precision = QV_XYZ_FIXED,
            .positions = positions + b * n,
            .velocities = plain ? NULL : velocities + b * n,
            .pairs = pairs, .n_pairs = plain ? 3 : 4,
          };
          QvManifestFrame *mf;

          g_snprintf (sample_buf, sizeof sample_buf, "%" G_GINT64_FORMAT, sample);
          if (plain)
            frame.style = QV_XYZ_PLAIN;
          if (single_file)
            qv_xyz_append_frame (single, input->structure, &frame);
          else
            {
              g_autoptr(GString) text = g_string_sized_new ((input->structure->n_atoms + 2) * 110);
              g_autofree char *name = g_strdup_printf ("sample-%0*" G_GINT64_FORMAT ".xyz", width, sample);
              QvManifestFile *file;

              qv_xyz_append_frame (text, input->structure, &frame);
              if (!qv_output_dir_write (dir, name, text->str, text->len, &error))
                goto fail;
              file = qv_manifest_add_file (manifest, name, plain ? "xyz" : "extxyz", text->str, text->len);
              mf = qv_manifest_file_add_frame (file);
              qv_manifest_set_integer (mf->fields, "sample", sample);
            }
        }
      qv_cli_progress ((double) (b0 + (gint64) nb) / (double) count, "sampling and writing", NULL);
    }
  if (single_file)
    {
      if (!qv_output_dir_write (dir, "ensemble.xyz", single->str, single->len, &error))
        goto fail;
      single_entry = qv_manifest_add_file (manifest, "ensemble.xyz", plain ? "xyz" : "extxyz",
                                           single->str, single->len);
      for (gint64 s = 1; s <= count; s++)
        {
          QvManifestFrame *mf = qv_manifest_file_add_frame (single_entry);
          qv_manifest_set_integer (mf->fields, "sample", s);
        }
    }
  qv_manifest_set_number (manifest->parameters, "max_linear_momentum_removed", stats.max_linear_removed);
  qv_manifest_set_number (manifest->parameters, "max_angular_momentum_removed", stats.max_angular_removed);
  qv_manifest_set_number (manifest->parameters, "max_angular_momentum_left", stats.max_angular_left);
  {
    g_autofree char *json = qv_manifest_to_json (manifest);
    if (!qv_output_dir_write (dir, "manifest.json", json, strlen (json), &error))
      goto fail;
  }
  {
    gsize c;
    g_autofree char *used = mode_ranges (ensemble, QV_ENSEMBLE_MODE_SAMPLED, &c);
    g_printerr ("quaver: wrote %" G_GINT64_FORMAT " sample%s at %s K (seed %s, %" G_GSIZE_FORMAT
                " modes sampled: %s) to %s\n", count, count == 1 ? "" : "s", temp_buf, seed_buf,
                c, used, qv_output_dir_path (dir));
  }
  goto out;

fail:
  status = qv_cli_fail ("ensemble", error);
out:
  g_free (output); g_free (seed_text); g_free (format);
  qv_cli_solve_args_clear (&solve);
  return status;
}
