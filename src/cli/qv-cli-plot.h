/* qv-cli-plot.h — `--plot FILE` and `--plot-size WxH` of the lattice
 * commands (bands, dos, thermo): the figure of the table, as SVG or PNG by
 * the file's extension, written atomically and never over an existing file
 * without --force. The drawing itself is the command's (src/render), so a
 * build without the renderer refuses --plot with a message.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>

G_BEGIN_DECLS

typedef enum {
  QV_CLI_PLOT_SVG,
  QV_CLI_PLOT_PNG,
} QvCliPlotKind;

typedef struct {
  char *path;                /* --plot, or NULL */
  char *size;                /* --plot-size, or NULL */
  int width, height;         /* from --plot-size or the defaults */
  QvCliPlotKind kind;
} QvCliPlot;

/* The two options, bound to @plot, for a command's entries (append them
 * before its NULL terminator). */
#define QV_CLI_PLOT_ENTRIES(plot) \
  { "plot", 0, 0, G_OPTION_ARG_FILENAME, &(plot)->path, \
    "Also draw the figure to FILE (.svg or .png)", "FILE" }, \
  { "plot-size", 0, 0, G_OPTION_ARG_STRING, &(plot)->size, \
    "Figure size in pixels (default 900x500)", "WxH" }

/* The help paragraph of --plot and --plot-size. */
extern const char qv_cli_plot_help[];

/* Checks --plot and --plot-size before any work: the extension (.svg or
 * .png), the size (200x150 to 16384x16384; @default_width × @default_height
 * without it), --plot-size without --plot, the same file as -o @output
 * (all QV_ERROR_USAGE), a build without the renderer (QV_ERROR_USAGE), and
 * an existing plot file without @force (QV_ERROR_WRITE, as the writer would
 * say). Without --plot only --plot-size is checked. */
gboolean qv_cli_plot_check (QvCliPlot *plot, const char *output, gboolean force,
                            int default_width, int default_height, GError **error);

/* Writes an SVG document of @length bytes, or encodes @rgba (width ×
 * height, straight alpha) as an opaque PNG with the text chunks @text
 * (key, value, …, NULL; "Software" is added) and writes it: atomically,
 * replacing only with @force. */
gboolean qv_cli_plot_write_svg (const QvCliPlot *plot, const char *svg, gsize length,
                                gboolean force, GError **error);
gboolean qv_cli_plot_write_rgba (const QvCliPlot *plot, const guint8 *rgba,
                                 const char *const *text, gboolean force, GError **error);

void qv_cli_plot_clear (QvCliPlot *plot);

G_END_DECLS
