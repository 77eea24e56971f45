/* qv-cmd-picture.c — `quaver picture`: a still (PNG, SVG) or an animation of
 * one period (GIF, multi-frame XYZ) of a normal mode, drawn offscreen.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "qv-cli-amplitude.h"
#include "qv-cli-solve.h"
#include "qv-error.h"
#include "qv-output.h"
#include "qv-picture.h"
#include "qv-png-writer.h"
#include "qv-xyz.h"
#include "qv-config.h"
#include "qv-gif-writer.h"

static const char picture_description[] =
  "Draws normal mode N of GEOMETRY without a window (the same inputs and\n"
  "options as 'quaver modes'), for papers, talks and colleagues:\n"
  "  FILE.png   a still from the renderer, supersampled (transparent with\n"
  "             --transparent)\n"
  "  FILE.svg   a vector figure of the same view: shaded discs, bonds and\n"
  "             arrows, depth sorted, editable in a drawing program\n"
  "  FILE.gif   a looping animation of one period (one global palette)\n"
  "  FILE.xyz   the frames of that animation as a multi-frame extended XYZ\n"
  "The format follows the extension of -o, or --format.\n"
  "\n"
  "Amplitude: as in 'quaver displace' (--max-displacement A, --Q, --q or\n"
  "--turning-point[=M] with --level v); default one turning point of v = 0,\n"
  "or 0.3 A on the atom that moves most for an imaginary mode. A still shows\n"
  "the structure at rest with arrows along the mode; --extreme shows it at\n"
  "the + turning point instead, and --ghost overlays that extreme translucent.\n"
  "\n"
  "View: --view x|y|z|-x|-y|-z looks along an axis (default z), --rotate\n"
  "RX,RY,RZ then turns the molecule by degrees about the picture's\n"
  "horizontal, vertical and viewing axes, in that order; --orientation\n"
  "X,Y,Z,W sets the rotation as a quaternion instead (each PNG records its\n"
  "own, so a picture can be made again). The frame fits the molecule and\n"
  "its motion; --zoom F enlarges. A bundle's \"view\" (orientation,\n"
  "projection, zoom, mode) is used when the command line gives none.\n"
  "\n"
  "Examples:\n"
  "  quaver picture --demo --mode 7 -o mode7.png\n"
  "  quaver picture mol.quaver.json --mode 1 --view x --rotate 20,30,0 --labels -o ts.svg\n"
  "  quaver picture mol.quaver.json --mode 9 --frames 40 --size 800x600 -o mode9.gif\n"
  "\n"
  "Exit status: 0 success, 1 usage error, 2 bad input, 3 output not written.\n"
  "Harmonic modes are an approximation: validate them before relying on them.";

typedef enum { OUT_PNG, OUT_SVG, OUT_GIF, OUT_XYZ } OutFormat;

static gboolean
parse_format (const char *text, const char *path, OutFormat *out, GError **error)
{
  static const struct { const char *name; OutFormat f; } names[] = {
    { "png", OUT_PNG }, { "svg", OUT_SVG }, { "gif", OUT_GIF }, { "xyz", OUT_XYZ },
    { "extxyz", OUT_XYZ },
  };
  const char *dot = text ? NULL : strrchr (path, '.');
  const char *name = text ? text : dot ? dot + 1 : "";

  for (gsize i = 0; i < G_N_ELEMENTS (names); i++)
    if (g_ascii_strcasecmp (name, names[i].name) == 0)
      {
        *out = names[i].f;
        return TRUE;
      }
  if (text)
    g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "unknown format '%s'; accepted: png, svg, gif, xyz",
                 text);
  else
    g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "cannot tell the format from '%s': end the file "
                 "name in .png, .svg, .gif or .xyz, or give --format", path);
  return FALSE;
}

static gboolean
parse_floats (const char *option, const char *text, double *out, int n, GError **error)
{
  g_auto(GStrv) parts = g_strsplit (text, ",", -1);

  if ((int) g_strv_length (parts) != n)
    goto bad;
  for (int i = 0; i < n; i++)
    {
      char *end = NULL;
      out[i] = g_ascii_strtod (g_strstrip (parts[i]), &end);
      if (end == parts[i] || *end != '\0' || !isfinite (out[i]))
        goto bad;
    }
  return TRUE;
bad:
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "--%s takes %d comma-separated numbers, got '%s'",
               option, n, text);
  return FALSE;
}

static gboolean
parse_size (const char *text, int *w, int *h, GError **error)
{
  char *end = NULL;
  gint64 a = g_ascii_strtoll (text, &end, 10), b;

  if (end == text || (*end != 'x' && *end != 'X'))
    goto bad;
  text = end + 1;
  b = g_ascii_strtoll (text, &end, 10);
  if (end == text || *end != '\0' || a < 16 || b < 16 || a > QV_PICTURE_MAX_SIDE || b > QV_PICTURE_MAX_SIDE)
    goto bad;
  *w = (int) a;
  *h = (int) b;
  return TRUE;
bad:
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "--size takes WIDTHxHEIGHT in pixels, each 16 to %d, "
               "such as 1200x900", QV_PICTURE_MAX_SIDE);
  return FALSE;
}

static gboolean
parse_axis (const char *text, QvViewAxis *axis, GError **error)
{
  static const char *const names[] = { "x", "y", "z", "-x", "-y", "-z" };
  for (int i = 0; i < 6; i++)
    if (g_ascii_strcasecmp (text, names[i]) == 0)
      {
        *axis = (QvViewAxis) i;
        return TRUE;
      }
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "--view takes x, y, z, -x, -y or -z, got '%s'", text);
  return FALSE;
}

/* Turns the view by degrees about the picture's x, y and z axes, in order:
 * the rotations act in view space, so they multiply from the left. */
static void
rotate_view (QvCamera *camera, const double degrees[3])
{
  static const vec3 axes[3] = { { 1, 0, 0 }, { 0, 1, 0 }, { 0, 0, 1 } };
  for (int i = 0; i < 3; i++)
    {
      versor r, o;
      glm_quatv (r, (float) (degrees[i] * G_PI / 180.0), (float *) axes[i]);
      glm_quat_mul (r, camera->orientation, o);
      glm_quat_normalize_to (o, camera->orientation);
    }
}

/* The text chunks of a PNG: what it shows, and the view to make it again. */
static char **
png_text (const QvInput *input, const QvModeSet *modes, gsize k, const QvAmplitude *a,
          const QvPictureRequest *r)
{
  GPtrArray *t = g_ptr_array_new ();
  const float *o = r->camera.orientation;

  g_ptr_array_add (t, g_strdup ("Software"));
  g_ptr_array_add (t, g_strdup ("quaver " QV_VERSION));
  g_ptr_array_add (t, g_strdup ("Source"));
  g_ptr_array_add (t, g_strdup (input->name));
  g_ptr_array_add (t, g_strdup ("Description"));
  g_ptr_array_add (t, g_strdup_printf ("normal mode %" G_GSIZE_FORMAT " (%.2f%s cm^-1), largest "
                                       "displacement %.4f A on atom %" G_GSIZE_FORMAT ", Q = %.5g "
                                       "u^1/2 A, phase %.1f deg", k + 1,
                                       fabs (qv_mode_set_wavenumber (modes, k)),
                                       qv_mode_set_is_imaginary (modes, k) ? "i" : "",
                                       fabs (a->max_displacement), a->max_atom + 1, fabs (a->Q),
                                       r->phase * 180.0 / G_PI));
  g_ptr_array_add (t, g_strdup ("quaver:orientation"));
  {
    /* shortest round-trip text of each float, locale-independent */
    GString *q = g_string_new (NULL);
    for (int i = 0; i < 4; i++)
      {
        char buf[G_ASCII_DTOSTR_BUF_SIZE];
        g_string_append (q, g_ascii_formatd (buf, sizeof buf, "%.9g", o[i]));
        if (i < 3)
          g_string_append_c (q, ',');
      }
    g_ptr_array_add (t, g_string_free (q, FALSE));
  }
  g_ptr_array_add (t, NULL);
  return (char **) g_ptr_array_free (t, FALSE);
}

/* The GIF of one period lasting @period seconds: the delays (whole
 * hundredths) are spread so that the period adds up exactly. */
static gboolean
write_gif (const char *path, const guint8 *const *images, const QvPictureRequest *r,
           double period, gboolean transparent, gboolean force, GError **error)
{
  const guint n = r->n_frames;
  g_autofree guint *delays = g_new (guint, n);
  QvGifFrames frames = {
    .width = r->width, .height = r->height, .n_frames = n, .rgba = images,
    .delays_cs = delays, .transparent = transparent,
  };
  QvProgress progress = { qv_cli_progress, NULL };
  g_autofree guint8 *gif = NULL;
  gboolean raised = FALSE;
  gsize length;

  for (guint k = 0; k < n; k++)
    {
      const double t0 = round (100.0 * period * k / n), t1 = round (100.0 * period * (k + 1) / n);
      delays[k] = (guint) MAX (t1 - t0, 0.0);
      if (delays[k] < QV_GIF_MIN_DELAY_CS)
        {
          delays[k] = QV_GIF_MIN_DELAY_CS;
          raised = TRUE;
        }
    }
  if (raised)
    g_printerr ("quaver: note: %u frames in %.3g s is faster than GIF viewers show (0.02 s a "
                "frame at least); each frame lasts 0.02 s, one period %.2f s: use fewer "
                "--frames or a longer --period\n", n, period, 0.02 * n);
  gif = qv_gif_encode (&frames, &progress, &length, error);
  return gif != NULL && qv_output_write (path, (const char *) gif, length, force, error);
}

int
qv_cmd_picture (int argc, char **argv)
{
  g_autoptr(GOptionContext) context = NULL;
  g_autoptr(GError) error = NULL;
  QvCliSolveArgs solve = { 0 };
  QvCliAmplitude amp;
  g_autoptr(QvInput) input = NULL;
  g_autoptr(QvModeSet) modes = NULL;
  char *output = NULL, *format = NULL, *size = NULL, *view = NULL, *rotate = NULL;
  char *orientation = NULL;
  gint64 mode = 0, frames = 30, supersample = 2;
  double zoom = 1.0, period = 2.0, ghost = -1.0;
  gboolean force = FALSE, no_arrows = FALSE, no_bonds = FALSE, labels = FALSE;
  gboolean transparent = FALSE, dark = FALSE, extreme = FALSE, ortho = FALSE, ghost_flag = FALSE;
  int status = QV_EXIT_OK;
  OutFormat out = OUT_PNG;
  QvPictureRequest r;
  QvAmplitude a;
  GOptionGroup *group;
  GOptionEntry entries[] = {
    { "mode", 'n', 0, G_OPTION_ARG_INT64, &mode, "Mode to draw, numbered from 1 as in 'quaver modes'", "N" },
    { "output", 'o', 0, G_OPTION_ARG_FILENAME, &output, "File to write: .png, .svg, .gif or .xyz", "FILE" },
    { "format", 'f', 0, G_OPTION_ARG_STRING, &format, "png, svg, gif or xyz (default: from FILE)", "FORMAT" },
    { "size", 's', 0, G_OPTION_ARG_STRING, &size, "Picture size in pixels (default 1200x900)", "WxH" },
    { "supersample", 0, 0, G_OPTION_ARG_INT64, &supersample,
      "Draw S times larger and scale down, 1-4 (default 2)", "S" },
    { "view", 0, 0, G_OPTION_ARG_STRING, &view, "Look along an axis: x, y, z, -x, -y, -z (default z)", "AXIS" },
    { "rotate", 0, 0, G_OPTION_ARG_STRING, &rotate,
      "Then turn by degrees about the picture's horizontal, vertical, viewing axes", "RX,RY,RZ" },
    { "orientation", 0, 0, G_OPTION_ARG_STRING, &orientation,
      "The view's rotation as a quaternion (as a PNG from here records it)", "X,Y,Z,W" },
    { "orthographic", 0, 0, G_OPTION_ARG_NONE, &ortho, "Parallel projection (default perspective)", NULL },
    { "zoom", 0, 0, G_OPTION_ARG_DOUBLE, &zoom, "Enlarge the fitted frame by F (default 1)", "F" },
    { "extreme", 0, 0, G_OPTION_ARG_NONE, &extreme, "Still at the + turning point instead of at rest", NULL },
    { "ghost", 0, 0, G_OPTION_ARG_NONE, &ghost_flag, "Overlay the + extreme, translucent", NULL },
    { "ghost-opacity", 0, 0, G_OPTION_ARG_DOUBLE, &ghost, "Opacity of the overlay, 0-1 (default 0.35)", "A" },
    { "no-arrows", 0, 0, G_OPTION_ARG_NONE, &no_arrows, "No displacement arrows", NULL },
    { "no-bonds", 0, 0, G_OPTION_ARG_NONE, &no_bonds, "Atoms only", NULL },
    { "labels", 0, 0, G_OPTION_ARG_NONE, &labels, "Element and number on every atom", NULL },
    { "transparent", 0, 0, G_OPTION_ARG_NONE, &transparent, "No background (PNG, SVG, GIF)", NULL },
    { "dark", 0, 0, G_OPTION_ARG_NONE, &dark, "Dark background", NULL },
    { "frames", 0, 0, G_OPTION_ARG_INT64, &frames, "Frames of one period (GIF, XYZ; default 30)", "N" },
    { "period", 0, 0, G_OPTION_ARG_DOUBLE, &period, "Seconds one period lasts in the GIF (default 2)", "S" },
    { "force", 0, 0, G_OPTION_ARG_NONE, &force, "Replace FILE if it exists", NULL },
    { NULL }
  };

  g_set_prgname ("quaver picture");
  context = g_option_context_new ("GEOMETRY --mode N -o FILE");
  g_option_context_set_summary (context, "A picture or animation of one normal mode.");
  g_option_context_set_description (context, picture_description);
  group = qv_cli_amplitude_group ("picture", &amp, "Vibrational level v of the turning point (default 0)");
  g_option_group_add_entries (group, entries);
  g_option_context_set_main_group (context, group);
  solve.offer_distributed = TRUE;
  qv_cli_solve_add_entries (context, &solve);
  if (!g_option_context_parse (context, &argc, &argv, &error))
    goto fail;
  if (argc > 2 || (argc == 2 && solve.demo) || (argc < 2 && !solve.demo))
    {
      g_set_error (&error, QV_ERROR, QV_ERROR_USAGE,
                   argc > 2 ? "picture takes one GEOMETRY, got %d" :
                   solve.demo ? "--demo replaces GEOMETRY; give one or the other" :
                   "picture needs a GEOMETRY file (or --demo)", argc - 1);
      goto fail;
    }
  if (output == NULL)
    {
      g_set_error_literal (&error, QV_ERROR, QV_ERROR_USAGE,
                           "picture needs -o FILE (.png, .svg, .gif or .xyz)");
      goto fail;
    }
  if (mode < 0)
    {
      g_set_error_literal (&error, QV_ERROR, QV_ERROR_USAGE,
                           "give the mode to draw: --mode N (numbered from 1 as in 'quaver modes')");
      goto fail;
    }
  if (!parse_format (format, output, &out, &error))
    goto fail;
  {
    gboolean given;
    QvAmplitudeUnit unit;
    double value;
    if (!qv_cli_amplitude_get (&amp, &given, &unit, &value, &error))
      goto fail;
    if (!(zoom > 0 && zoom <= 100) || supersample < 1 || supersample > 4
        || frames < 2 || frames > QV_PICTURE_MAX_FRAMES || !(period > 0 && period <= 600)
        || (ghost >= 0 && ghost > 1))
      {
        g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "%s",
                     !(zoom > 0 && zoom <= 100) ? "--zoom takes a factor above 0 (up to 100)"
                     : supersample < 1 || supersample > 4 ? "--supersample takes 1, 2, 3 or 4"
                     : frames < 2 || frames > QV_PICTURE_MAX_FRAMES ? "--frames takes 2 to 1000"
                     : ghost > 1 ? "--ghost-opacity takes 0 to 1"
                     : "--period takes seconds above 0 (up to 600)");
        goto fail;
      }

    modes = qv_cli_solve (&solve, argc == 2 ? argv[1] : NULL, &input, &error);
    if (modes == NULL && error == NULL)
      goto out;   /* --distributed: rank 0 draws */
    if (modes == NULL)
      goto fail;
    if (mode == 0)
      {
        /* a bundle's saved view may name the mode */
        if (input->view.mode == 0)
          {
            g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "give the mode to draw: --mode N "
                         "(numbered from 1 as in 'quaver modes'); %s names none in a \"view\"",
                         input->name);
            goto fail;
          }
        mode = input->view.mode;
      }
    if ((guint64) mode > modes->n_modes)
      {
        g_set_error (&error, QV_ERROR, QV_ERROR_USAGE, "--mode %" G_GINT64_FORMAT " is out of range: "
                     "%s has modes 1 to %" G_GSIZE_FORMAT, mode, input->name, modes->n_modes);
        goto fail;
      }
    if (!given)
      {
        unit = qv_mode_set_is_imaginary (modes, (gsize) mode - 1) ? QV_AMPLITUDE_ANGSTROM
                                                                   : QV_AMPLITUDE_TURNING_POINT;
        value = unit == QV_AMPLITUDE_ANGSTROM ? 0.3 : 1.0;
      }
    if (!qv_amplitude_convert (modes, (gsize) mode - 1, unit, value, (guint) amp.level, &a, &error))
      goto fail;
  }

  qv_picture_request_init (&r, input->structure);
  r.modes = modes;
  r.mode = (gsize) mode - 1;
  r.max_displacement = fabs (a.max_displacement);
  r.supersample = (int) supersample;
  r.n_frames = (guint) frames;
  r.phase = extreme ? 0.0 : G_PI / 2;
  r.options.arrows = !no_arrows && !extreme;
  r.options.bonds = !no_bonds;
  r.options.labels = labels;
  r.options.background = dark ? QV_BACKGROUND_DARK : QV_BACKGROUND_LIGHT;
  r.options.transparent = transparent;
  if (ghost_flag || ghost >= 0)
    {
      r.options.ghost_alpha = (float) (ghost >= 0 ? ghost : 0.35);
      r.options.ghost_phase = 0.0f;
    }
  if (size && !parse_size (size, &r.width, &r.height, &error))
    goto fail;
  {
    QvViewAxis axis = QV_VIEW_ALONG_Z;
    if (view && !parse_axis (view, &axis, &error))
      goto fail;
    qv_camera_view_along (&r.camera, axis);
  }
  /* a bundle's saved view, unless the command line sets the view */
  if (input->view.has_orientation && !view && !rotate && !orientation)
    for (int i = 0; i < 4; i++)
      r.camera.orientation[i] = (float) input->view.orientation[i];
  if (input->view.has_projection && !ortho)
    ortho = input->view.orthographic;
  if (input->view.present && zoom == 1.0)
    zoom = input->view.zoom;
  if (orientation)
    {
      double q[4];
      if (rotate || view)
        {
          g_set_error_literal (&error, QV_ERROR, QV_ERROR_USAGE,
                               "--orientation sets the whole rotation: give it without --view or --rotate");
          goto fail;
        }
      if (!parse_floats ("orientation", orientation, q, 4, &error))
        goto fail;
      if (!(sqrt (q[0] * q[0] + q[1] * q[1] + q[2] * q[2] + q[3] * q[3]) > 1e-6))
        {
          g_set_error_literal (&error, QV_ERROR, QV_ERROR_USAGE,
                               "--orientation needs a quaternion of non-zero length");
          goto fail;
        }
      {
        versor v = { (float) q[0], (float) q[1], (float) q[2], (float) q[3] };
        glm_quat_normalize_to (v, r.camera.orientation);
      }
    }
  if (rotate)
    {
      double d[3];
      if (!parse_floats ("rotate", rotate, d, 3, &error))
        goto fail;
      rotate_view (&r.camera, d);
    }
  qv_camera_set_projection (&r.camera, ortho ? QV_CAMERA_ORTHOGRAPHIC : QV_CAMERA_PERSPECTIVE);
  qv_picture_fit_camera (&r);
  r.camera.distance /= (float) zoom;

  switch (out)
    {
    case OUT_PNG:
      {
        g_autofree guint8 *rgba = qv_picture_render (&r, &error);
        g_auto(GStrv) text = NULL;
        g_autofree guint8 *png = NULL;
        gsize length;

        if (rgba == NULL)
          goto fail;
        text = png_text (input, modes, r.mode, &a, &r);
        png = qv_png_encode (rgba, r.width, r.height, !transparent, (const char *const *) text,
                             &length, &error);
        if (png == NULL || !qv_output_write (output, (const char *) png, length, force, &error))
          goto fail;
        break;
      }
    case OUT_XYZ:
      {
        const gsize n = input->structure->n_atoms;
        g_autofree double *x = g_new (double, 3 * n);
        g_autoptr(GString) text = g_string_new (NULL);
        char mode_buf[24], k_buf[24], phase_buf[G_ASCII_DTOSTR_BUF_SIZE], d_buf[G_ASCII_DTOSTR_BUF_SIZE];

        g_snprintf (mode_buf, sizeof mode_buf, "%" G_GINT64_FORMAT, mode);
        g_ascii_dtostr (d_buf, sizeof d_buf, r.max_displacement);
        for (guint k = 0; k < r.n_frames; k++)
          {
            QvXyzPair pairs[] = { { "mode", mode_buf }, { "frame", k_buf }, { "phase_deg", phase_buf },
                                  { "max_displacement", d_buf } };
            QvXyzFrame frame = { .style = QV_XYZ_EXTENDED, .precision = QV_XYZ_FIXED,
                                 .positions = x, .pairs = pairs, .n_pairs = G_N_ELEMENTS (pairs) };
            g_snprintf (k_buf, sizeof k_buf, "%u", k);
            g_ascii_formatd (phase_buf, sizeof phase_buf, "%.4f", 360.0 * k / r.n_frames);
            qv_picture_frame_positions (&r, k, x);
            qv_xyz_append_frame (text, input->structure, &frame);
          }
        if (!qv_output_write (output, text->str, text->len, force, &error))
          goto fail;
        break;
      }
    case OUT_SVG:
      {
        gsize length;
        g_autofree char *svg = qv_picture_svg (&r, &length, &error);
        if (svg == NULL || !qv_output_write (output, svg, length, force, &error))
          goto fail;
        break;
      }
    case OUT_GIF:
    default:
      {
        QvProgress progress = { qv_cli_progress, NULL };
        g_auto(GStrv) images = (GStrv) qv_picture_render_frames (&r, &progress, &error);
        if (images == NULL)
          goto fail;
        if (!write_gif (output, (const guint8 *const *) images, &r, period, transparent, force,
                        &error))
          goto fail;
        break;
      }
    }
  g_printerr ("quaver: wrote %s: mode %" G_GINT64_FORMAT " (%.1f%s cm^-1), largest displacement "
              "%.3f A on atom %" G_GSIZE_FORMAT "\n", output, mode,
              fabs (qv_mode_set_wavenumber (modes, r.mode)),
              qv_mode_set_is_imaginary (modes, r.mode) ? "i" : "", r.max_displacement, a.max_atom + 1);
  goto out;

fail:
  status = qv_cli_fail ("picture", error);
out:
  g_free (output); g_free (format); g_free (size); g_free (view); g_free (rotate); g_free (orientation);
  qv_cli_solve_args_clear (&solve);
  return status;
}
