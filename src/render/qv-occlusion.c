/* qv-occlusion.c — conservative occlusion culling on the CPU (see
 * qv-occlusion-private.h). Depths are view distances along −z, which order
 * fragments as the depth buffer does for both projections.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <string.h>
#include "qv-occlusion-private.h"

/* Safety margins: the bound must beat the tested depth by this (Å, plus a
 * relative part), far above the depth buffer's 24-bit resolution and the
 * shaders' rounding; occluder circles shrink by this many pixels. */
#define DEPTH_EPS_ABS 0.01f
#define DEPTH_EPS_REL 1e-4f
#define SHRINK_PX 1.0f

struct _QvOcclusion {
  int cell;
  int width, height;      /* pixels */
  int cols, rows;         /* cells */
  float *bound;           /* cols × rows view depths, +∞: nothing in front */
  gsize capacity;
  gboolean ortho;
  float sx, sy, tx, ty;   /* window x = sx·(x/w) + tx, w = −z (1 in ortho) */
  float znear, zfar;
};

QvOcclusion *
qv_occlusion_new (int cell)
{
  QvOcclusion *o = g_new0 (QvOcclusion, 1);

  o->cell = MAX (cell, 1);
  return o;
}

void
qv_occlusion_free (QvOcclusion *o)
{
  if (o == NULL)
    return;
  g_free (o->bound);
  g_free (o);
}

void
qv_occlusion_begin (QvOcclusion *o, const float proj[16], int width, int height)
{
  gsize n;
  float p22 = proj[10], p32 = proj[14];

  o->width = MAX (width, 1);
  o->height = MAX (height, 1);
  o->cols = (o->width + o->cell - 1) / o->cell;
  o->rows = (o->height + o->cell - 1) / o->cell;
  n = (gsize) o->cols * (gsize) o->rows;
  if (n > o->capacity)
    {
      g_free (o->bound);
      o->bound = g_new (float, n);
      o->capacity = n;
    }
  for (gsize i = 0; i < n; i++)
    o->bound[i] = INFINITY;
  o->ortho = proj[11] == 0.0f;   /* perspective has −1 there */
  /* ndc = P00·x/w + P30 (P30 = 0 for the symmetric projections), window
   * x = (ndc + 1)·W/2; the same for y. */
  o->sx = 0.5f * (float) o->width * proj[0];
  o->sy = 0.5f * (float) o->height * proj[5];
  o->tx = 0.5f * (float) o->width * (1.0f + proj[12]);
  o->ty = 0.5f * (float) o->height * (1.0f + proj[13]);
  if (o->ortho)
    {
      o->znear = (p32 + 1.0f) / p22;
      o->zfar = (p32 - 1.0f) / p22;
    }
  else
    {
      o->znear = p32 / (p22 - 1.0f);
      o->zfar = p32 / (p22 + 1.0f);
    }
}

void
qv_occlusion_add_sphere (QvOcclusion *o, const float c[3], float r)
{
  float d = -c[2], w = o->ortho ? 1.0f : d;
  float px, py, rad, rad2;
  int s = o->cell, y_lo, y_hi;

  if (!(d - r > o->znear) || !(d + r < o->zfar) || !(r > 0.0f))
    return;
  px = o->sx * c[0] / w + o->tx;
  py = o->sy * c[1] / w + o->ty;
  rad = o->sx * r / w - SHRINK_PX;
  if (rad < 0.5f * (float) s)
    return;
  rad2 = rad * rad;
  /* Cells whose pixel centres (i + 0.5) span [lo, hi] in y lie inside the
   * circle where both extreme rows do: the farther one decides. */
  y_lo = MAX ((int) floorf ((py - rad) / (float) s), 0);
  y_hi = MIN ((int) floorf ((py + rad) / (float) s), o->rows - 1);
  for (int cy = y_lo; cy <= y_hi; cy++)
    {
      float c0 = (float) (cy * s) + 0.5f, c1 = (float) (cy * s + s) - 0.5f;
      float dy = MAX (fabsf (c0 - py), fabsf (c1 - py)), hw, x0, x1;
      int cx0, cx1;
      float *row;

      if (dy * dy >= rad2)
        continue;
      hw = sqrtf (rad2 - dy * dy);
      x0 = px - hw;
      x1 = px + hw;
      /* Cell cx is covered when cx·s + 0.5 ≥ x0 and cx·s + s − 0.5 ≤ x1. */
      cx0 = MAX ((int) ceilf ((x0 - 0.5f) / (float) s), 0);
      cx1 = MIN ((int) floorf ((x1 + 0.5f) / (float) s) - 1, o->cols - 1);
      row = o->bound + (gsize) cy * (gsize) o->cols;
      for (int cx = cx0; cx <= cx1; cx++)
        if (d < row[cx])
          row[cx] = d;
    }
}

gboolean
qv_occlusion_hidden (const QvOcclusion *o, const float a[3], const float b[3],
                     float pad, float margin_px)
{
  float z_lo = MIN (a[2], b[2]) - pad, z_hi = MAX (a[2], b[2]) + pad;
  float nearest = -z_hi, farthest = -z_lo, need;
  float lo[2], hi[2];
  int s = o->cell, i0, i1, j0, j1;

  if (!(nearest > o->znear))
    return FALSE;
  for (int k = 0; k < 2; k++)
    {
      float v0 = MIN (a[k], b[k]) - pad, v1 = MAX (a[k], b[k]) + pad;
      float scale = k == 0 ? o->sx : o->sy, shift = k == 0 ? o->tx : o->ty;
      if (o->ortho)
        {
          lo[k] = scale * v0 + shift;
          hi[k] = scale * v1 + shift;
        }
      else
        {
          /* x/w over the box is extreme at its corners. */
          float e[4] = { v0 / nearest, v0 / farthest, v1 / nearest, v1 / farthest };
          lo[k] = hi[k] = e[0];
          for (int m = 1; m < 4; m++)
            {
              lo[k] = MIN (lo[k], e[m]);
              hi[k] = MAX (hi[k], e[m]);
            }
          lo[k] = scale * lo[k] + shift;
          hi[k] = scale * hi[k] + shift;
        }
      lo[k] -= margin_px;
      hi[k] += margin_px;
    }
  /* Pixels whose centres i + 0.5 fall in [lo, hi]. */
  i0 = MAX ((int) ceilf (lo[0] - 0.5f), 0);
  i1 = MIN ((int) floorf (hi[0] - 0.5f), o->width - 1);
  j0 = MAX ((int) ceilf (lo[1] - 0.5f), 0);
  j1 = MIN ((int) floorf (hi[1] - 0.5f), o->height - 1);
  if (i0 > i1 || j0 > j1)
    return TRUE;   /* entirely off screen */
  need = nearest - DEPTH_EPS_ABS - DEPTH_EPS_REL * nearest;
  i0 /= s;
  i1 /= s;
  j0 /= s;
  j1 /= s;
  for (int cy = j0; cy <= j1; cy++)
    {
      const float *row = o->bound + (gsize) cy * (gsize) o->cols;
      for (int cx = i0; cx <= i1; cx++)
        if (!(row[cx] < need))
          return FALSE;
    }
  return TRUE;
}

