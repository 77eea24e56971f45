/* qv-render-test.c — shared helpers of the renderer tests.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include "qv-render-test.h"

QvrContext *
qvr_context_new (int width, int height, int samples, int supersample)
{
  QvrContext *c = g_new0 (QvrContext, 1);
  GError *error = NULL;

  c->offscreen = qv_offscreen_new (width, height, samples, supersample, &error);
  if (c->offscreen == NULL)
    {
      /* No EGL or no surfaceless platform: skip (CI has both). */
      g_printerr ("SKIP: %s\n", error->message);
      exit (QVR_SKIP);
    }
  c->renderer = qv_renderer_new (&error);
  if (c->renderer == NULL)
    g_error ("renderer: %s", error->message);
  c->width = width;
  c->height = height;
  c->rgba = g_malloc ((gsize) width * height * 4);
  qv_offscreen_begin (c->offscreen, &c->draw_width, &c->draw_height);
  return c;
}

void
qvr_context_free (QvrContext *c)
{
  qv_offscreen_make_current (c->offscreen);
  qv_renderer_free (c->renderer);
  qv_offscreen_free (c->offscreen);
  g_free (c->rgba);
  g_free (c);
}

void
qvr_render (QvrContext *c, QvCamera *camera)
{
  qv_offscreen_begin (c->offscreen, &c->draw_width, &c->draw_height);
  qv_camera_set_viewport (camera, c->draw_width, c->draw_height);
  qv_renderer_draw (c->renderer, camera);
  qv_offscreen_read (c->offscreen, c->rgba);
}

const guint8 *
qvr_pixel (const QvrContext *c, int x, int y)
{
  x = CLAMP (x, 0, c->width - 1);
  y = CLAMP (y, 0, c->height - 1);
  return c->rgba + ((gsize) y * c->width + x) * 4;
}

void
qvr_save (const QvrContext *c, const char *name)
{
  const char *root = g_getenv ("QV_BUILD_ROOT");
  g_autofree char *dir = g_build_filename (root ? root : ".", "tests", "render", NULL);
  g_autofree char *file = g_strconcat (c->save_prefix ? c->save_prefix : "", name, NULL);
  g_autofree char *path = g_build_filename (dir, file, NULL);
  FILE *f;

  g_mkdir_with_parents (dir, 0755);
  f = fopen (path, "wb");
  if (f == NULL)
    return;
  fprintf (f, "P6\n%d %d\n255\n", c->width, c->height);
  for (int i = 0; i < c->width * c->height; i++)
    fwrite (c->rgba + 4 * i, 1, 3, f);
  fclose (f);
}

void
qvr_hue (const float rgb[3], float *hue, float *chroma)
{
  float mx = MAX (rgb[0], MAX (rgb[1], rgb[2])), mn = MIN (rgb[0], MIN (rgb[1], rgb[2]));
  float d = mx - mn, h;

  if (d <= 0.0f)
    h = 0.0f;
  else if (mx == rgb[0])
    h = 60.0f * fmodf ((rgb[1] - rgb[2]) / d + 6.0f, 6.0f);
  else if (mx == rgb[1])
    h = 60.0f * ((rgb[2] - rgb[0]) / d + 2.0f);
  else
    h = 60.0f * ((rgb[0] - rgb[1]) / d + 4.0f);
  *hue = h;
  *chroma = d;
}

float
qvr_hue_distance (float a, float b)
{
  float d = fabsf (a - b);
  return MIN (d, 360.0f - d);
}

void
qvr_brightest (const QvrContext *c, int x, int y, int r, float rgb[3])
{
  int best = -1;

  for (int j = -r; j <= r; j++)
    for (int i = -r; i <= r; i++)
      {
        const guint8 *p = qvr_pixel (c, x + i, y + j);
        int v = MAX (p[0], MAX (p[1], p[2]));
        if (v > best)
          {
            best = v;
            for (int k = 0; k < 3; k++)
              rgb[k] = p[k] / 255.0f;
          }
      }
}

QvStructure *
qvr_structure (gsize n, const guint *z, const double *xyz)
{
  QvStructure *s = qv_structure_new (n, NULL);

  for (gsize i = 0; i < n; i++)
    {
      qv_structure_set_element (s, i, z[i], NULL);
      for (int k = 0; k < 3; k++)
        s->atoms[i].position[k] = xyz[3 * i + k];
    }
  return s;
}
