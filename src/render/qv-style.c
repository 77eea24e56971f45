/* qv-style.c — element colours and radii (data/element-style.txt), the
 * background themes, the arrow accent and the participation ramp.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <gio/gio.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include "qv-element.h"
#include "qv-render-resources.h"
#include "qv-style.h"
#include "qv-style-private.h"

#define STYLE_RESOURCE "/org/quaverlab/Quaver/render/element-style.txt"

static QvElementStyle styles[QV_ELEMENT_MAX_Z + 1];
static guint n_styles;

static gboolean
parse_hex (const char *text, float rgb[3])
{
  char *end;
  unsigned long v;

  if (text[0] != '#' || strlen (text) != 7)
    return FALSE;
  v = strtoul (text + 1, &end, 16);
  if (*end != '\0')
    return FALSE;
  rgb[0] = (float) ((v >> 16) & 0xff) / 255.0f;
  rgb[1] = (float) ((v >> 8) & 0xff) / 255.0f;
  rgb[2] = (float) (v & 0xff) / 255.0f;
  return TRUE;
}

/* The table is compiled in: a malformed line is a bug in data/, reported
 * once with its line number; the element keeps the neutral grey. */
static gpointer
load_table (gpointer data)
{
  g_autoptr(GBytes) bytes = NULL;
  g_auto(GStrv) lines = NULL;
  g_autofree char *text = NULL;
  gsize size;
  const char *raw;

  for (guint z = 0; z <= QV_ELEMENT_MAX_Z; z++)
    styles[z] = (QvElementStyle) { { 0.62f, 0.62f, 0.66f }, 0.60f };
  bytes = g_resource_lookup_data (qv_render_get_resource (), STYLE_RESOURCE,
                                  G_RESOURCE_LOOKUP_FLAGS_NONE, NULL);
  if (bytes == NULL)
    {
      g_critical ("%s is missing from the render resource", STYLE_RESOURCE);
      return NULL;
    }
  raw = g_bytes_get_data (bytes, &size);
  text = g_strndup (raw, size);
  lines = g_strsplit (text, "\n", -1);
  for (guint i = 0; lines[i]; i++)
    {
      g_auto(GStrv) f = NULL;
      char *line = g_strstrip (lines[i]), *end;
      guint64 z;
      double radius;
      const QvElement *e;
      float rgb[3];

      if (line[0] == '\0' || line[0] == '#')
        continue;
      f = g_strsplit_set (line, " \t", -1);
      /* Collapse empty fields from repeated separators. */
      {
        guint k = 0;
        for (guint j = 0; f[j]; j++)
          if (f[j][0] != '\0')
            f[k++] = f[j];
          else
            g_free (f[j]);
        f[k] = NULL;
        if (k != 4)
          {
            g_critical ("element-style.txt:%u: expected Z symbol #RRGGBB radius", i + 1);
            continue;
          }
      }
      z = g_ascii_strtoull (f[0], &end, 10);
      e = qv_element_from_z ((guint) z);
      radius = g_ascii_strtod (f[3], NULL);
      if (*end != '\0' || e == NULL || g_ascii_strcasecmp (e->symbol, f[1]) != 0
          || !parse_hex (f[2], rgb) || !(radius > 0.0 && radius < 5.0))
        {
          g_critical ("element-style.txt:%u: bad entry “%s”", i + 1, line);
          continue;
        }
      memcpy (styles[z].rgb, rgb, sizeof rgb);
      styles[z].radius = (float) radius;
      n_styles++;
    }
  return NULL;
}

static void
ensure_table (void)
{
  static GOnce once = G_ONCE_INIT;

  g_once (&once, load_table, NULL);
}

const QvElementStyle *
qv_style_element (guint z)
{
  ensure_table ();
  if (z > QV_ELEMENT_MAX_Z)
    z = 0;
  return &styles[z];
}

guint
qv_style_table_size (void)
{
  ensure_table ();
  return n_styles;
}

/* Calm, not pure white or black; sRGB. */
void
qv_style_background (QvBackground background, float rgba[4])
{
  static const float light[4] = { 0.937f, 0.941f, 0.929f, 1.0f };  /* #EFF0ED */
  static const float dark[4] = { 0.118f, 0.129f, 0.149f, 1.0f };   /* #1E2126 */

  memcpy (rgba, background == QV_BACKGROUND_DARK ? dark : light, sizeof light);
}

/* One accent per background, away from the element hues (no red, blue,
 * grey or yellow): a deep magenta on light, a bright one on dark. */
void
qv_style_arrow (QvBackground background, float rgb[3])
{
  static const float light[3] = { 0.706f, 0.137f, 0.478f };  /* #B4237A */
  static const float dark[3] = { 0.961f, 0.447f, 0.757f };   /* #F572C1 */

  memcpy (rgb, background == QV_BACKGROUND_DARK ? dark : light, sizeof light);
}

void
qv_style_foreground (QvBackground background, float rgb[3])
{
  static const float light[3] = { 0.200f, 0.216f, 0.239f };  /* #33373D */
  static const float dark[3] = { 0.788f, 0.804f, 0.827f };   /* #C9CDD3 */

  memcpy (rgb, background == QV_BACKGROUND_DARK ? dark : light, sizeof light);
}

/* sRGB transfer function (IEC 61966-2-1). */
static double
srgb_decode (double c)
{
  return c <= 0.04045 ? c / 12.92 : pow ((c + 0.055) / 1.055, 2.4);
}

static double
srgb_encode (double c)
{
  return c <= 0.0031308 ? 12.92 * c : 1.055 * pow (c, 1.0 / 2.4) - 0.055;
}

/* OKLab: the matrices of Björn Ottosson, "A perceptual color space for
 * image processing" (2020, bottosson.github.io/posts/oklab). */
void
qv_style_srgb_to_oklab (const double rgb[3], double lab[3])
{
  double r = srgb_decode (rgb[0]), g = srgb_decode (rgb[1]), b = srgb_decode (rgb[2]);
  double l = cbrt (0.4122214708 * r + 0.5363325363 * g + 0.0514459929 * b);
  double m = cbrt (0.2119034982 * r + 0.6806995451 * g + 0.1073969566 * b);
  double s = cbrt (0.0883024619 * r + 0.2817188376 * g + 0.6299787005 * b);

  lab[0] = 0.2104542553 * l + 0.7936177850 * m - 0.0040720468 * s;
  lab[1] = 1.9779984951 * l - 2.4285922050 * m + 0.4505937099 * s;
  lab[2] = 0.0259040371 * l + 0.7827717662 * m - 0.8086757660 * s;
}

gboolean
qv_style_oklab_to_srgb (const double lab[3], double rgb[3])
{
  double l = lab[0] + 0.3963377774 * lab[1] + 0.2158037573 * lab[2];
  double m = lab[0] - 0.1055613458 * lab[1] - 0.0638541728 * lab[2];
  double s = lab[0] - 0.0894841775 * lab[1] - 1.2914855480 * lab[2];
  double lin[3];
  gboolean inside = TRUE;

  l = l * l * l;
  m = m * m * m;
  s = s * s * s;
  lin[0] = 4.0767416621 * l - 3.3077115913 * m + 0.2309699292 * s;
  lin[1] = -1.2684380046 * l + 2.6097574011 * m - 0.3413193965 * s;
  lin[2] = -0.0041960863 * l - 0.7034186147 * m + 1.7076147010 * s;
  for (int k = 0; k < 3; k++)
    {
      if (lin[k] < -1e-6 || lin[k] > 1.0 + 1e-6)
        inside = FALSE;
      rgb[k] = srgb_encode (CLAMP (lin[k], 0.0, 1.0));
    }
  return inside;
}

/* The ramp: OKLab lightness falls evenly from 0.93 to 0.48 while chroma
 * grows and the hue turns from a cool grey-blue through violet to a warm
 * magenta-red. Where a colour falls outside sRGB its chroma is reduced
 * (lightness and hue kept), so the lightness steps stay even. */
void
qv_style_ramp (double t, float rgb[3])
{
  double L, C, h, lab[3], out[3];

  t = CLAMP (isfinite (t) ? t : 0.0, 0.0, 1.0);
  L = 0.93 - 0.45 * t;
  C = 0.025 + 0.165 * t;
  h = (255.0 + 115.0 * t) * G_PI / 180.0;
  for (int i = 0; i < 40; i++)
    {
      lab[0] = L;
      lab[1] = C * cos (h);
      lab[2] = C * sin (h);
      if (qv_style_oklab_to_srgb (lab, out))
        break;
      C *= 0.95;
    }
  for (int k = 0; k < 3; k++)
    rgb[k] = (float) out[k];
}
