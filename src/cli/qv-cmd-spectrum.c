/* qv-cmd-spectrum.c — `quaver spectrum`: IR and Raman intensities of the
 * modes and their broadened spectrum, as CSV, JSON, PNG or SVG.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <string.h>
#include <unistd.h>
#include "qv-bundle.h"
#include "qv-cli-solve.h"
#include "qv-config.h"
#include "qv-error.h"
#include "qv-fixed-format.h"
#include "qv-intensity.h"
#include "qv-json-writer.h"
#include "qv-output.h"
#include "qv-spectrum.h"
#include "qv-spectrum-table.h"
#include "qv-tensor-file.h"
#include "qv-units.h"
#ifdef QV_HAVE_RENDER
#include "qv-png-writer.h"
#include "qv-spectrum-plot.h"
#endif

static const char spectrum_description[] =
  "Solves the harmonic normal modes of GEOMETRY (the same inputs and options as\n"
  "'quaver modes'), projects the derivative tensors onto each mode and prints\n"
  "the intensities and the broadened spectrum (double-harmonic approximation).\n"
  "\n"
  "Derivative tensors (a bundle may carry them as \"dipole_derivatives\" and\n"
  "\"polarizability_derivatives\"; a file given here replaces the bundle's):\n"
  "  --dipole-derivatives FILE          3 rows of 3N numbers: d mu_x, d mu_y, d mu_z\n"
  "                                     over x1 y1 z1 x2 ... (atomic polar tensors)\n"
  "  --dipole-units U                   e (= e*A/A = e*bohr/bohr = au), D/A, D/bohr\n"
  "  --polarizability-derivatives FILE  6 rows (xx, yy, zz, xy, xz, yz) or 9 rows\n"
  "                                     (xx, xy, xz, yx, yy, yz, zx, zy, zz) of 3N\n"
  "  --polarizability-units U           A^2 (volume polarizability A^3 per A) or\n"
  "                                     bohr^2 (bohr^3 per bohr, atomic units)\n"
  "Units are never guessed. '#' starts a comment; one row per line.\n"
  "\n"
  "What is computed, per mode (docs/methods.md, \"Intensities and spectra\"):\n"
  "  IR intensity      N_A/(12 eps0 c^2) |d mu/dQ|^2, km/mol\n"
  "  Raman activity    S = 45 a'^2 + 7 g'^2, A^4/u\n"
  "  Raman intensity   d sigma/d Omega at --laser and -T, 1e-30 cm^2/sr\n"
  "Imaginary modes get no intensity (a warning says which).\n"
  "\n"
  "Spectrum (--kind): ir (default), raman (intensities at --laser, -T) or\n"
  "raman-activity. Each stick at its wavenumber times --scale is broadened by a\n"
  "normalised Lorentzian or Gaussian of --width FWHM (cm^-1), so the envelope (per\n"
  "cm^-1) integrates to the sum of the sticks. Default grid: 0 to the top stick\n"
  "plus 10 widths, rounded up to 100 cm^-1, in steps of min(1, width/10).\n"
  "\n"
  "Output (-o; the format follows the extension .csv, .json, .png, .svg, or\n"
  "--format): csv (default, to standard output) is the stick table, one row per\n"
  "mode (mode, wavenumber, scaled wavenumber, IR, Raman activity, Raman\n"
  "intensity), or with --envelope the envelope on the grid; json holds both;\n"
  "png and svg draw the plot (--size). Existing files are kept unless --force.\n"
  "\n"
  "Examples:\n"
  "  quaver spectrum mol.quaver.json\n"
  "  quaver spectrum mol.xyz -H mol.hess -u hartree/bohr^2 \\\n"
  "      --dipole-derivatives mol.apt --dipole-units e -o ir.svg\n"
  "  quaver spectrum mol.quaver.json --kind raman --laser 18797 -T 298.15 \\\n"
  "      --broadening gaussian --width 8 --scale 0.97 -o raman.png\n"
  "  quaver spectrum mol.quaver.json --envelope --range 400:4000 --step 0.5 -o ir.csv\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.\n"
  "Harmonic intensities are an approximation: validate them before relying on them.";

typedef enum { KIND_IR, KIND_RAMAN, KIND_RAMAN_ACTIVITY } Kind;
typedef enum { OUT_CSV, OUT_JSON, OUT_PNG, OUT_SVG } OutFormat;

static gboolean
parse_kind (const char *text, Kind *kind, GError **error)
{
  if (g_ascii_strcasecmp (text, "ir") == 0)
    *kind = KIND_IR;
  else if (g_ascii_strcasecmp (text, "raman") == 0)
    *kind = KIND_RAMAN;
  else if (g_ascii_strcasecmp (text, "raman-activity") == 0)
    *kind = KIND_RAMAN_ACTIVITY;
  else
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "unknown --kind '%s'; accepted: ir, raman, raman-activity", text);
      return FALSE;
    }
  return TRUE;
}

static gboolean
parse_format (const char *text, const char *path, OutFormat *out, GError **error)
{
  static const char *const names[] = { "csv", "json", "png", "svg" };
  const char *name = text;

  if (name == NULL && path != NULL)
    {
      const char *dot = strrchr (path, '.');
      const char *slash = strrchr (path, '/');
      name = dot && (!slash || dot > slash) ? dot + 1 : NULL;
      if (name == NULL)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "cannot tell the format from '%s': end the "
                       "file name in .csv, .json, .png or .svg, or give --format", path);
          return FALSE;
        }
    }
  if (name == NULL)
    {
      *out = OUT_CSV;
      return TRUE;
    }
  for (gsize i = 0; i < G_N_ELEMENTS (names); i++)
    if (g_ascii_strcasecmp (name, names[i]) == 0)
      {
        *out = (OutFormat) i;
        return TRUE;
      }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE, text ? "unknown format '%s'; accepted: csv, json, png, svg"
               : "cannot tell the format from the extension '.%s': use .csv, .json, .png or .svg, "
                 "or give --format", name);
  return FALSE;
}

static gboolean
parse_range (const char *text, double *a, double *b, GError **error)
{
  const char *colon = strchr (text, ':');
  char *end = NULL;
  g_autofree char *first = colon ? g_strndup (text, (gsize) (colon - text)) : NULL;

  if (colon == NULL)
    goto bad;
  *a = g_ascii_strtod (first, &end);
  if (end == first || *end != '\0')
    goto bad;
  *b = g_ascii_strtod (colon + 1, &end);
  if (end == colon + 1 || *end != '\0')
    goto bad;
  if (!(isfinite (*a) && isfinite (*b) && *a < *b))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "--range %s: START must be below STOP (cm^-1), e.g. --range 400:4000", text);
      return FALSE;
    }
  return TRUE;
bad:
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "--range takes START:STOP in cm^-1, e.g. --range 400:4000; got '%s'", text);
  return FALSE;
}

static gboolean
parse_size (const char *text, int *w, int *h, GError **error)
{
  char *end = NULL;
  gint64 a, b;

  a = g_ascii_strtoll (text, &end, 10);
  if (end == text || (*end != 'x' && *end != 'X'))
    goto bad;
  text = end + 1;
  b = g_ascii_strtoll (text, &end, 10);
  if (end == text || *end != '\0')
    goto bad;
  if (a < 200 || b < 150 || a > 16384 || b > 16384)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "--size must be from 200x150 to 16384x16384 pixels");
      return FALSE;
    }
  *w = (int) a;
  *h = (int) b;
  return TRUE;
bad:
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "--size takes WIDTHxHEIGHT in pixels, e.g. 900x500");
  return FALSE;
}

/* Reads a tensor file of the given kind into @d. */
static gboolean
load_tensor (const char *path, const char *units, gboolean dipole, QvDerivatives *d,
             GError **error)
{
  static const gsize dipole_rows[] = { 3, 0 }, alpha_rows[] = { 6, 9, 0 };
  g_autofree double *v = NULL;
  double factor;
  gsize n_rows = 0;

  if (units == NULL)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "%s needs %s (one of %s): units are never guessed",
                   dipole ? "--dipole-derivatives" : "--polarizability-derivatives",
                   dipole ? "--dipole-units" : "--polarizability-units",
                   dipole ? qv_dipole_derivative_unit_list ()
                          : qv_polarizability_derivative_unit_list ());
      return FALSE;
    }
  if (!(dipole ? qv_dipole_derivative_unit_parse (units, &factor, error)
               : qv_polarizability_derivative_unit_parse (units, &factor, error)))
    return FALSE;
  v = qv_tensor_read_file (path, d->n_atoms, dipole ? dipole_rows : alpha_rows,
                           dipole ? "dipole derivatives" : "polarizability derivatives",
                           &n_rows, error);
  if (v == NULL)
    return FALSE;
  if (dipole)
    qv_derivatives_set_dipole (d, v, factor);
  else
    qv_derivatives_set_polarizability (d, n_rows, v, factor);
  return TRUE;
}

static const char *
kind_name (Kind kind)
{
  return kind == KIND_IR ? "ir" : kind == KIND_RAMAN ? "raman" : "raman-activity";
}

static const char *
kind_unit (Kind kind)
{
  return kind == KIND_IR ? "km/mol" : kind == KIND_RAMAN ? "1e-30 cm^2/sr" : "A^4/u";
}

static void
json_optional (QvJsonWriter *w, const char *key, gboolean present, double v)
{
  if (present && isfinite (v))
    qv_json_number (w, key, v);
  else
    qv_json_null (w, key);
}

static char *
spectrum_json (const QvIntensities *in, const QvSpectrum *s, Kind kind, const char *dipole_units,
               const char *alpha_units)
{
  QvJsonWriter *w = qv_json_writer_new ();

  qv_json_begin_object (w, NULL);
  qv_json_string (w, "kind", kind_name (kind));
  qv_json_string (w, "unit", kind_unit (kind));
  qv_json_number (w, "scale", in->scale);
  qv_json_begin_object (w, "units");
  qv_json_string (w, "wavenumber", "cm^-1");
  qv_json_string (w, "ir", "km/mol");
  qv_json_string (w, "raman_activity", "A^4/u");
  qv_json_string (w, "raman_intensity", "1e-30 cm^2/sr");
  qv_json_string (w, "envelope", "intensity per cm^-1");
  qv_json_end_object (w);
  qv_json_begin_object (w, "inputs");
  if (dipole_units)
    qv_json_string (w, "dipole_units", dipole_units);
  if (alpha_units)
    qv_json_string (w, "polarizability_units", alpha_units);
  qv_json_end_object (w);
  if (in->has_raman)
    {
      qv_json_begin_object (w, "raman");
      qv_json_number (w, "laser_cm-1", in->raman.laser);
      qv_json_number (w, "temperature_K", in->raman.temperature);
      qv_json_string (w, "intensity", "d sigma/d Omega, 90 degree scattering, polarised "
                      "excitation, both scattered polarisations");
      qv_json_end_object (w);
    }
  qv_json_begin_object (w, "broadening");
  qv_json_string (w, "shape", qv_line_shape_name (s->shape));
  qv_json_number (w, "fwhm", s->fwhm);
  qv_json_number (w, "start", s->start);
  qv_json_number (w, "stop", qv_spectrum_stop (s));
  qv_json_number (w, "step", s->step);
  qv_json_end_object (w);
  qv_json_begin_array (w, "modes");
  for (gsize k = 0; k < in->n_modes; k++)
    {
      const QvModeIntensity *m = &in->modes[k];
      qv_json_begin_object (w, NULL);
      qv_json_int (w, "mode", (gint64) k + 1);
      qv_json_number (w, "wavenumber", m->wavenumber);
      qv_json_number (w, "scaled_wavenumber", m->wavenumber * in->scale);
      qv_json_bool (w, "imaginary", !m->defined);
      if (in->has_ir)
        {
          json_optional (w, "ir", m->defined, m->ir);
          if (m->defined)
            qv_json_numbers (w, "dipole_derivative", m->dmu_dq, 3);
        }
      if (in->has_raman)
        {
          json_optional (w, "raman_activity", m->defined, m->raman_activity);
          json_optional (w, "alpha_mean", m->defined, m->alpha_mean);
          json_optional (w, "gamma2", m->defined, m->gamma2);
          json_optional (w, "raman_intensity", m->raman_defined, m->raman_intensity);
        }
      qv_json_end_object (w);
    }
  qv_json_end_array (w);
  qv_json_begin_object (w, "envelope");
  {
    g_autofree double *x = g_new (double, s->n_points);
    for (gsize i = 0; i < s->n_points; i++)
      x[i] = qv_spectrum_x (s, i);
    qv_json_numbers (w, "wavenumber", x, s->n_points);
    qv_json_numbers (w, "intensity", s->envelope, s->n_points);
  }
  qv_json_number (w, "integral", qv_spectrum_integral (s));
  qv_json_number (w, "stick_sum", qv_spectrum_stick_sum (s));
  qv_json_end_object (w);
  qv_json_end_object (w);
  return qv_json_writer_finish (w);
}

#ifdef QV_HAVE_RENDER
/* PNG and SVG bytes (drawn with the renderer's plot code only). */
static int
write_bytes (const char *output, const void *data, gsize length, gboolean force)
{
  g_autoptr(GError) error = NULL;
  if (output)
    return qv_output_write (output, data, length, force, &error) ? QV_EXIT_OK
                                                                 : qv_cli_fail ("spectrum", error);
  errno = 0;
  if (fwrite (data, 1, length, stdout) != length || fflush (stdout) != 0)
    {
      g_printerr ("quaver: cannot write to standard output: %s\n", g_strerror (errno));
      return QV_EXIT_WRITE;
    }
  return QV_EXIT_OK;
}
#endif

int
qv_cmd_spectrum (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  QvCliSolveArgs solve = { .all_modes = TRUE };
  g_autoptr(QvInput) input = NULL;
  g_autoptr(QvModeSet) modes = NULL;
  g_autoptr(QvBundle) bundle = NULL;
  g_autoptr(QvDerivatives) derivatives = NULL;
  g_autoptr(QvIntensities) intensities = NULL;
  g_autoptr(QvSpectrum) spectrum = NULL;
  char *dipole_file = NULL, *dipole_units = NULL, *alpha_file = NULL, *alpha_units = NULL;
  char *kind_arg = NULL, *shape_arg = NULL, *range_arg = NULL, *format_arg = NULL;
  char *output = NULL, *size_arg = NULL;
  const char *dipole_units_used = NULL, *alpha_units_used = NULL;
  double width = QV_SPECTRUM_DEFAULT_FWHM, step = 0.0, scale = 1.0;
  double laser = QV_RAMAN_DEFAULT_LASER, temperature = 298.15;
  gint64 labels = 8;
  gboolean force = FALSE, envelope_only = FALSE, descending = FALSE;
  Kind kind = KIND_IR;
  OutFormat format = OUT_CSV;
  QvSpectrumOptions so;
  QvRamanConditions raman;
  int plot_w = 900, plot_h = 500;
  int status = QV_EXIT_OK;
  GOptionEntry entries[] = {
    { "dipole-derivatives", 0, 0, G_OPTION_ARG_FILENAME, &dipole_file,
      "Dipole derivatives (atomic polar tensors): 3 rows of 3N numbers", "FILE" },
    { "dipole-units", 0, 0, G_OPTION_ARG_STRING, &dipole_units,
      "Their unit: e (= e*A/A = e*bohr/bohr = au), D/A, D/bohr", "UNIT" },
    { "polarizability-derivatives", 0, 0, G_OPTION_ARG_FILENAME, &alpha_file,
      "Polarizability derivatives: 6 rows (xx yy zz xy xz yz) or 9 rows of 3N numbers", "FILE" },
    { "polarizability-units", 0, 0, G_OPTION_ARG_STRING, &alpha_units,
      "Their unit: A^2 (A^3 per A) or bohr^2 (bohr^3 per bohr)", "UNIT" },
    { "kind", 0, 0, G_OPTION_ARG_STRING, &kind_arg,
      "Spectrum: ir (default), raman, raman-activity", "KIND" },
    { "broadening", 0, 0, G_OPTION_ARG_STRING, &shape_arg,
      "Line shape: lorentzian (default) or gaussian", "SHAPE" },
    { "width", 'w', 0, G_OPTION_ARG_DOUBLE, &width, "Line width, FWHM in cm^-1 (default 10)", "W" },
    { "range", 0, 0, G_OPTION_ARG_STRING, &range_arg,
      "Grid range in cm^-1 (default 0 to the top stick + 10 widths)", "A:B" },
    { "step", 0, 0, G_OPTION_ARG_DOUBLE, &step,
      "Grid step in cm^-1 (default min(1, width/10))", "S" },
    { "scale", 's', 0, G_OPTION_ARG_DOUBLE, &scale,
      "Frequency scaling factor for the line positions (default 1: none)", "F" },
    { "laser", 0, 0, G_OPTION_ARG_DOUBLE, &laser,
      "Raman laser line in cm^-1 (default 18796.99, 532 nm)", "NU" },
    { "temperature", 'T', 0, G_OPTION_ARG_DOUBLE, &temperature,
      "Temperature of the Raman intensities in K (default 298.15)", "T" },
    { "envelope", 0, 0, G_OPTION_ARG_NONE, &envelope_only,
      "CSV: the envelope on the grid instead of the stick table", NULL },
    { "size", 0, 0, G_OPTION_ARG_STRING, &size_arg, "PNG/SVG size in pixels (default 900x500)",
      "WxH" },
    { "labels", 0, 0, G_OPTION_ARG_INT64, &labels,
      "PNG/SVG: label the N tallest peaks with their mode numbers (default 8)", "N" },
    { "descending", 0, 0, G_OPTION_ARG_NONE, &descending,
      "PNG/SVG: high wavenumbers on the left", NULL },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format_arg,
      "csv (default), json, png, svg (default: from the extension of -o)", "FORMAT" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "Write to FILE instead of standard output",
      "FILE" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Replace an existing output file", NULL },
    { NULL }
  };

  g_set_prgname ("quaver spectrum");
  context = g_option_context_new ("GEOMETRY");
  g_option_context_set_summary (context, "IR and Raman intensities of the normal modes and their "
                                "broadened spectrum.");
  g_option_context_set_description (context, spectrum_description);
  g_option_context_add_main_entries (context, entries, NULL);
  qv_cli_solve_add_entries (context, &solve);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    goto fail;
  if (argc > 2 || (argc == 2 && solve.demo) || (argc < 2 && !solve.demo))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   argc > 2 ? "spectrum takes one GEOMETRY, got %d" :
                   solve.demo ? "--demo replaces GEOMETRY; give one or the other" :
                   "spectrum needs a GEOMETRY file or bundle (or --demo)", argc - 1);
      goto fail;
    }
  qv_spectrum_options_init (&so);
  so.fwhm = width;
  so.step = step;
  if ((kind_arg && !parse_kind (kind_arg, &kind, &error))
      || (shape_arg && !qv_line_shape_parse (shape_arg, &so.shape, &error))
      || (range_arg && !parse_range (range_arg, &so.start, &so.stop, &error))
      || !parse_format (format_arg, output, &format, &error)
      || (size_arg && !parse_size (size_arg, &plot_w, &plot_h, &error)))
    goto fail;
  so.has_range = range_arg != NULL;
  if (!(width > 0 && width < 1e5) || step < 0 || !(scale > 0 && scale < 10)
      || !(laser > 0 && laser < 1e7) || !(temperature >= 0 && temperature < 1e7)
      || labels < 0 || labels > 1000)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "%s",
                   !(width > 0 && width < 1e5) ? "--width must be a FWHM above 0 cm^-1, e.g. 10" :
                   step < 0 ? "--step must be above 0 cm^-1" :
                   !(scale > 0 && scale < 10) ? "--scale must be a positive factor such as 0.97" :
                   !(laser > 0 && laser < 1e7) ? "--laser must be a wavenumber in cm^-1, e.g. 18797 for 532 nm" :
                   !(temperature >= 0 && temperature < 1e7) ? "--temperature must be a temperature in K, 0 or more" :
                   "--labels must be from 0 to 1000");
      goto fail;
    }
  if (envelope_only && format != OUT_CSV)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   "--envelope chooses the CSV table; JSON holds both, PNG and SVG draw both");
      goto fail;
    }
#ifndef QV_HAVE_RENDER
  if (format == OUT_PNG || format == OUT_SVG)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   "this build has no renderer: PNG and SVG plots need a build with the renderer; "
                   "write CSV or JSON");
      goto fail;
    }
#endif
  if (format == OUT_PNG && output == NULL && isatty (STDOUT_FILENO))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   "a PNG is not for a terminal: give -o FILE.png, or redirect standard output");
      goto fail;
    }
  if ((dipole_units && !dipole_file) || (alpha_units && !alpha_file))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "%s is given without %s",
                   dipole_units && !dipole_file ? "--dipole-units" : "--polarizability-units",
                   dipole_units && !dipole_file ? "--dipole-derivatives FILE"
                                                : "--polarizability-derivatives FILE");
      goto fail;
    }

  modes = qv_cli_solve (&solve, argc == 2 ? argv[1] : NULL, &input, &error);
  if (modes == NULL)
    goto fail;
  derivatives = qv_derivatives_new (input->structure->n_atoms);
  if (input->derivatives)
    {
      /* a bundle's tensors (the demo's are invented) */
      if (input->derivatives->dipole)
        {
          qv_derivatives_set_dipole (derivatives, input->derivatives->dipole, 1.0);
          dipole_units_used = input->dipole_units;
        }
      if (input->derivatives->polarizability)
        {
          qv_derivatives_set_polarizability (derivatives, 6, input->derivatives->polarizability, 1.0);
          alpha_units_used = input->polarizability_units;
        }
    }
  if (dipole_file)
    {
      if (!load_tensor (dipole_file, dipole_units, TRUE, derivatives, &error))
        goto fail;
      dipole_units_used = dipole_units;
    }
  if (alpha_file)
    {
      if (!load_tensor (alpha_file, alpha_units, FALSE, derivatives, &error))
        goto fail;
      alpha_units_used = alpha_units;
    }
  if (derivatives->dipole == NULL && derivatives->polarizability == NULL)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   "%s has no derivative tensors: give --dipole-derivatives FILE --dipole-units U "
                   "(and/or --polarizability-derivatives FILE --polarizability-units U), or a bundle "
                   "with \"dipole_derivatives\"", input->name);
      goto fail;
    }
  if (kind == KIND_IR && derivatives->dipole == NULL)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "an IR spectrum needs dipole derivatives: "
                   "give --dipole-derivatives FILE --dipole-units U, or --kind raman");
      goto fail;
    }
  if (kind != KIND_IR && derivatives->polarizability == NULL)
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "a Raman spectrum needs polarizability "
                   "derivatives: give --polarizability-derivatives FILE --polarizability-units U");
      goto fail;
    }
  if (derivatives->polarizability_asymmetry > 1e-3)
    g_printerr ("quaver: warning: the polarizability derivatives are not symmetric (largest "
                "|d alpha_ab - d alpha_ba| is %.2g of the largest element); ab and ba were averaged\n",
                derivatives->polarizability_asymmetry);

  raman.laser = laser;
  raman.temperature = temperature;
  intensities = qv_intensities_compute (modes, derivatives, &raman, scale, &error);
  if (intensities == NULL)
    goto fail;
  {
    const gsize n = intensities->n_modes;
    g_autofree double *pos = g_new (double, MAX (n, 1)), *h = g_new (double, MAX (n, 1));
    g_autofree guint *idx = g_new (guint, MAX (n, 1));
    gsize n_no_stokes = 0;

    for (gsize k = 0; k < n; k++)
      {
        const QvModeIntensity *m = &intensities->modes[k];
        pos[k] = m->wavenumber * scale;
        h[k] = !m->defined ? NAN : kind == KIND_IR ? m->ir
               : kind == KIND_RAMAN ? m->raman_intensity : m->raman_activity;
        idx[k] = (guint) k;
        if (!m->defined)
          g_printerr ("quaver: warning: mode %" G_GSIZE_FORMAT " is imaginary (%.2fi cm^-1): it has "
                      "no intensity and is left out of the spectrum\n", k + 1, -m->wavenumber);
        else if (intensities->has_raman && !m->raman_defined)
          n_no_stokes++;
      }
    if (n_no_stokes > 0 && kind == KIND_RAMAN)
      g_printerr ("quaver: warning: %" G_GSIZE_FORMAT " mode(s) have no Stokes line at a laser of "
                  "%g cm^-1 (wavenumber at or above the laser line, or zero): no Raman intensity\n",
                  n_no_stokes, laser);
    spectrum = qv_spectrum_new (n, pos, h, idx, &so, &error);
    if (spectrum == NULL)
      goto fail;
  }

  switch (format)
    {
    case OUT_CSV:
      {
        g_autofree char *text = envelope_only
          ? qv_spectrum_table_envelope_csv (spectrum,
                                            kind == KIND_IR ? "ir" : kind == KIND_RAMAN ? "raman"
                                                                                       : "raman_activity",
                                            kind_unit (kind))
          : qv_spectrum_table_sticks_csv (intensities, scale);
        status = qv_cli_emit ("spectrum", output, text, force);
        break;
      }
    case OUT_JSON:
      {
        g_autofree char *text = spectrum_json (intensities, spectrum, kind, dipole_units_used,
                                               alpha_units_used);
        status = qv_cli_emit ("spectrum", output, text, force);
        break;
      }
#ifdef QV_HAVE_RENDER
    case OUT_PNG:
    case OUT_SVG:
      {
        QvSpectrumPlotOptions po;
        g_autofree char *title = NULL, *env_label = NULL;
        g_autofree char *base = g_path_get_basename (input->name);
        gsize length = 0;

        qv_spectrum_plot_options_init (&po);
        po.width = plot_w;
        po.height = plot_h;
        po.descending = descending;
        po.n_labels = (guint) labels;
        title = g_strdup_printf ("%s — %s, %s FWHM %g cm\u207b\u00b9%s", base,
                                 kind == KIND_IR ? "IR" : kind == KIND_RAMAN ? "Raman" : "Raman activity",
                                 qv_line_shape_name (so.shape), so.fwhm,
                                 scale != 1.0 ? ", scaled" : "");
        po.title = title;
        po.stick_label = kind == KIND_IR ? "IR intensity (km/mol)"
                         : kind == KIND_RAMAN ? "d\u03c3/d\u03a9 (10\u207b\u00b3\u2070 cm\u00b2/sr)"
                         : "Raman activity (\u00c5\u2074/u)";
        env_label = g_strdup_printf ("%s per cm\u207b\u00b9", kind == KIND_IR ? "km/mol"
                                     : kind == KIND_RAMAN ? "10\u207b\u00b3\u2070 cm\u00b2/sr"
                                     : "\u00c5\u2074/u");
        po.envelope_label = env_label;
        if (format == OUT_SVG)
          {
            g_autofree char *svg = qv_spectrum_plot_svg (spectrum, &po, &length, &error);
            if (svg == NULL)
              goto fail;
            status = write_bytes (output, svg, length, force);
          }
        else
          {
            g_autofree guint8 *rgba = qv_spectrum_plot_rgba (spectrum, &po, &error);
            g_autofree guint8 *png = NULL;
            g_autofree char *fwhm = g_strdup_printf ("%g", so.fwhm);
            const char *text[] = { "Software", "Quaver " QV_VERSION, "Title", title,
                                   "Spectrum", kind_name (kind), "Line shape",
                                   qv_line_shape_name (so.shape), "FWHM cm-1", fwhm, NULL };
            if (rgba == NULL)
              goto fail;
            png = qv_png_encode (rgba, po.width, po.height, TRUE, text, &length, &error);
            if (png == NULL)
              goto fail;
            status = write_bytes (output, png, length, force);
          }
        break;
      }
#endif
    default:
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "this build cannot draw PNG or SVG");
      goto fail;
    }
  goto out;

fail:
  status = qv_cli_fail ("spectrum", error);
out:
  g_free (dipole_file); g_free (dipole_units); g_free (alpha_file); g_free (alpha_units);
  g_free (kind_arg); g_free (shape_arg); g_free (range_arg); g_free (format_arg);
  g_free (output); g_free (size_arg);
  qv_cli_solve_args_clear (&solve);
  return status;
}
