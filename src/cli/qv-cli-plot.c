/* qv-cli-plot.c — --plot and --plot-size of the lattice commands.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <string.h>
#include "qv-cli-plot.h"
#include "qv-config.h"
#include "qv-error.h"
#include "qv-output.h"
#include "qv-png-writer.h"

const char qv_cli_plot_help[] =
  "Figure: --plot FILE draws the table's numbers as well, as SVG or PNG by\n"
  "the extension of FILE (--plot-size WxH in pixels, default 900x500); it\n"
  "is written like any output (never over an existing file without --force).\n"
  "A figure is a picture of harmonic results, which are approximations.\n";

static gboolean
parse_size (const char *text, int *w, int *h, GError **error)
{
  const char *second;
  char *end = NULL;
  gint64 a, b;

  a = g_ascii_strtoll (text, &end, 10);
  if (end == text || (*end != 'x' && *end != 'X'))
    goto bad;
  second = end + 1;
  b = g_ascii_strtoll (second, &end, 10);
  if (end == second || *end != '\0')
    goto bad;
  if (a < 200 || b < 150 || a > 16384 || b > 16384)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "--plot-size must be from 200x150 to 16384x16384 pixels, got %s", text);
      return FALSE;
    }
  *w = (int) a;
  *h = (int) b;
  return TRUE;
bad:
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "--plot-size takes WIDTHxHEIGHT in pixels, e.g. 900x500");
  return FALSE;
}

gboolean
qv_cli_plot_check (QvCliPlot *plot, const char *output, gboolean force, int default_width,
                   int default_height, GError **error)
{
  plot->width = default_width;
  plot->height = default_height;
  if (plot->size && !parse_size (plot->size, &plot->width, &plot->height, error))
    return FALSE;
  if (plot->path == NULL)
    {
      if (plot->size)
        {
          g_set_error (error, QV_ERROR, QV_ERROR_USAGE, "--plot-size applies to --plot FILE");
          return FALSE;
        }
      return TRUE;
    }
#ifndef QV_HAVE_RENDER
  g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
               "this build has no renderer: --plot needs a build with the renderer; "
               "leave --plot out for the table alone");
  return FALSE;
#else
  const char *dot = strrchr (plot->path, '.');
  const char *slash = strrchr (plot->path, '/');
  if (dot && (!slash || dot > slash) && g_ascii_strcasecmp (dot, ".svg") == 0)
    plot->kind = QV_CLI_PLOT_SVG;
  else if (dot && (!slash || dot > slash) && g_ascii_strcasecmp (dot, ".png") == 0)
    plot->kind = QV_CLI_PLOT_PNG;
  else
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "--plot %s: end the file name in .svg or .png to choose the format", plot->path);
      return FALSE;
    }
  if (output && strcmp (output, plot->path) == 0)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_USAGE,
                   "--plot and --output are the same file (%s): give the figure its own name",
                   plot->path);
      return FALSE;
    }
  if (!force && g_file_test (plot->path, G_FILE_TEST_EXISTS))
    {
      g_set_error (error, QV_ERROR, QV_ERROR_WRITE, "%s exists; pass --force to replace it",
                   plot->path);
      return FALSE;
    }
  return TRUE;
#endif
}

gboolean
qv_cli_plot_write_svg (const QvCliPlot *plot, const char *svg, gsize length, gboolean force,
                       GError **error)
{
  return qv_output_write (plot->path, svg, length, force, error);
}

gboolean
qv_cli_plot_write_rgba (const QvCliPlot *plot, const guint8 *rgba, const char *const *text,
                        gboolean force, GError **error)
{
  g_autoptr(GPtrArray) keys = g_ptr_array_new ();
  g_autofree guint8 *png = NULL;
  gsize length = 0;

  g_ptr_array_add (keys, (gpointer) "Software");
  g_ptr_array_add (keys, (gpointer) ("Quaver " QV_VERSION));
  for (gsize i = 0; text && text[i] && text[i + 1]; i += 2)
    {
      g_ptr_array_add (keys, (gpointer) text[i]);
      g_ptr_array_add (keys, (gpointer) text[i + 1]);
    }
  g_ptr_array_add (keys, NULL);
  png = qv_png_encode (rgba, plot->width, plot->height, TRUE, (const char *const *) keys->pdata,
                       &length, error);
  if (png == NULL)
    return FALSE;
  return qv_output_write (plot->path, (const char *) png, length, force, error);
}

void
qv_cli_plot_clear (QvCliPlot *plot)
{
  g_clear_pointer (&plot->path, g_free);
  g_clear_pointer (&plot->size, g_free);
}
