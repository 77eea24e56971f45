/* qv-svg-figure.c — the renderer's view as an SVG 1.1 document, written
 * with a GString: atoms as discs with a radial gradient lit like the GL
 * shaders (the same light, ambient, wrap and highlight, evaluated at a few
 * points of the disc), half bonds and arrows as polygons with a gradient
 * across them, cell edges as short line segments, optional labels; all of
 * them depth-sorted far to near (painter's algorithm) in one group.
 *
 * Why by hand and not through cairo's SVG surface: cairo writes every
 * shape as an anonymous path (circles become four Bézier curves) and has
 * no ids or classes, so neither a test nor an editor can tell which shape
 * is which atom; here each atom is one <circle class="atom" id="atom-K">,
 * each gradient is defined once per colour, and the document stays small
 * and plain SVG 1.1.
 *
 * Projection: the camera's view and projection matrices (qv-camera.h). A
 * sphere's outline in perspective is an ellipse (a cone cut by the image
 * plane) whose centre lies a little outward of the projected centre
 * (by about f·(r/d)²·tan θ); the disc is put at that ellipse's centre with
 * the radius of the same area, so it sits where the GL renderer's
 * ray-cast sphere does. In orthographic the two coincide
 * (qv_camera_project).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include "qv-bonds.h"
#include "qv-element.h"
#include "qv-error.h"
#include "qv-svg-figure.h"

/* The GL renderer's constants (qv-renderer.c fill_frame,
 * shaders/common.glsl qv_shade, shaders/arrow.vert). */
static const double LIGHT[3] = { -0.40, 0.55, 0.73 };
#define AMBIENT 0.24
#define SPECULAR 0.22
#define ARROW_SHAFT 0.055
#define ARROW_HEAD 0.14
#define ARROW_HEAD_LENGTH 0.34
/* Depth cueing levels: gradients are shared per colour and level. */
#define CUE_LEVELS 16
/* Pixels a half bond reaches past the bond's middle, under its other
 * half, so that no hairline seam shows between them. */
#define BOND_OVERLAP_PX 0.5
/* Cell edges are cut in this many pieces, each sorted on its own. */
#define CELL_PIECES 8

typedef struct {
  double key;          /* distance from the eye, Å: larger is drawn first */
  gsize seq;           /* creation order: ties keep it */
  gsize start, length; /* the item's text in Figure.pool */
} Item;

typedef struct {
  const QvSvgFigure *figure;
  const QvCamera *camera;
  const QvRenderOptions *options;
  gsize n;
  mat4 view;
  gboolean ortho;
  double focal;        /* pixels per Å at unit distance (perspective) or per
                        * Å (orthographic) */
  double width, height;
  double light[3], halfway[3];
  float bg[4], fg[3], accent[3];
  double cue_start, cue_end, cue_strength;
  float *radii;        /* N, Å as drawn */
  float *colours;      /* 3N sRGB, before depth cueing */
  GString *pool;
  GArray *items;
  GString *defs;
  GHashTable *gradients; /* id → itself, those already in defs */
} Figure;

/* Numbers: two decimals, trailing zeros dropped, locale-independent. */
static void
num (GString *s, double v)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  gsize len;

  if (fabs (v) < 0.005)
    v = 0.0;
  g_ascii_formatd (buf, sizeof buf, "%.2f", v);
  len = strlen (buf);
  while (len > 0 && buf[len - 1] == '0')
    len--;
  if (len > 0 && buf[len - 1] == '.')
    len--;
  g_string_append_len (s, buf, (gssize) len);
}

static void
attr (GString *s, const char *name, double v)
{
  g_string_append_printf (s, " %s=\"", name);
  num (s, v);
  g_string_append_c (s, '"');
}

static void
hex (GString *s, const double rgb[3])
{
  g_string_append_printf (s, "#%02x%02x%02x",
                          (int) lround (CLAMP (rgb[0], 0.0, 1.0) * 255.0),
                          (int) lround (CLAMP (rgb[1], 0.0, 1.0) * 255.0),
                          (int) lround (CLAMP (rgb[2], 0.0, 1.0) * 255.0));
}

static void
to_view (const Figure *f, const float p[3], double out[3])
{
  for (int k = 0; k < 3; k++)
    out[k] = f->view[0][k] * p[0] + f->view[1][k] * p[1] + f->view[2][k] * p[2] + f->view[3][k];
}

/* Pixels per Å across the line of sight at view point @c. */
static double
px_per_unit (const Figure *f, const double c[3])
{
  return f->ortho ? f->focal : f->focal / MAX (-c[2], 1e-6);
}

/* Distance from the eye, the sorting key. */
static double
eye_distance (const Figure *f, const double c[3])
{
  return f->ortho ? -c[2] : sqrt (c[0] * c[0] + c[1] * c[1] + c[2] * c[2]);
}

/* The depth cueing level (0 … CUE_LEVELS) at view point @c, as
 * shaders/common.glsl qv_shade_setup fades toward the background. */
static int
cue_level (const Figure *f, const double c[3])
{
  double t;

  if (f->cue_strength <= 0.0)
    return 0;
  t = CLAMP ((-c[2] - f->cue_start) / MAX (f->cue_end - f->cue_start, 1e-3), 0.0, 1.0);
  return (int) lround (t * CUE_LEVELS);
}

/* shaders/common.glsl qv_shade (viewer along +z): @base sRGB, @n the unit
 * normal in view space, @level the depth cueing level; result sRGB. */
static void
shade (const Figure *f, const double base[3], const double n[3], int level, double out[3])
{
  double nl = n[0] * f->light[0] + n[1] * f->light[1] + n[2] * f->light[2];
  double nh = MAX (n[0] * f->halfway[0] + n[1] * f->halfway[1] + n[2] * f->halfway[2], 0.0);
  double diffuse = MAX ((nl + 0.15) / 1.15, 0.0);
  double spec = pow (nh, 32.0) * SPECULAR;
  double fade = f->cue_strength * level / CUE_LEVELS;

  for (int k = 0; k < 3; k++)
    {
      double albedo = base[k] * base[k], bg = (double) f->bg[k] * f->bg[k];
      double c = albedo * (AMBIENT + (1.0 - AMBIENT) * diffuse) + spec;
      c = c * (1.0 - fade) + bg * fade;
      out[k] = sqrt (CLAMP (c, 0.0, 1.0));
    }
}

static void
gradient_id (GString *s, const char *kind, const double base[3], int level)
{
  g_string_append_printf (s, "%s-", kind);
  hex (s, base);
  g_string_erase (s, (gssize) (s->len - 7), 1);   /* the '#' */
  g_string_append_printf (s, "-%d", level);
}

static void
stop (GString *s, double offset, const double rgb[3])
{
  g_string_append (s, "<stop");
  attr (s, "offset", offset);
  g_string_append (s, " stop-color=\"");
  hex (s, rgb);
  g_string_append (s, "\"/>");
}

/* The shaded disc's radial gradient, defined once per colour and level:
 * the focal point where the highlight peaks (the normal along the half
 * vector), stops shaded along the line from there through the centre to
 * the far rim. The gradient's circle is shifted toward the light and
 * grown to touch the far rim, so the rim on the lit side (nearer the
 * focal point in offset) stays lighter than the far one, as lit. */
#define SPHERE_LIGHT_SHIFT 0.3
static const char *
sphere_gradient (Figure *f, const double base[3], int level)
{
  GString *id = g_string_new (NULL);
  const char *key;
  double fx = f->halfway[0], fy = f->halfway[1], fl = hypot (fx, fy);
  static const double offsets[] = { 0.0, 0.2, 0.4, 0.6, 0.8, 0.92, 1.0 };

  gradient_id (id, "sphere", base, level);
  key = g_hash_table_lookup (f->gradients, id->str);
  if (key)
    {
      g_string_free (id, TRUE);
      return key;
    }
  g_string_append_printf (f->defs, "<radialGradient id=\"%s\"", id->str);
  attr (f->defs, "cx", 0.5 + 0.5 * SPHERE_LIGHT_SHIFT * (fl > 0 ? fx / fl : 0.0));
  attr (f->defs, "cy", 0.5 - 0.5 * SPHERE_LIGHT_SHIFT * (fl > 0 ? fy / fl : 0.0));
  attr (f->defs, "r", 0.5 * (1.0 + SPHERE_LIGHT_SHIFT));
  attr (f->defs, "fx", 0.5 + 0.5 * fx);
  attr (f->defs, "fy", 0.5 - 0.5 * fy);
  g_string_append (f->defs, ">");
  for (gsize j = 0; j < G_N_ELEMENTS (offsets); j++)
    {
      double o = offsets[j], ex = fl > 0 ? -fx / fl : 0.0, ey = fl > 0 ? -fy / fl : -1.0;
      double p[2] = { fx + o * (ex - fx), fy + o * (ey - fy) }, n[3], rgb[3];
      double q = MIN (p[0] * p[0] + p[1] * p[1], 1.0);
      n[0] = p[0];
      n[1] = p[1];
      n[2] = sqrt (1.0 - q);
      shade (f, base, n, level, rgb);
      stop (f->defs, o, rgb);
    }
  g_string_append (f->defs, "</radialGradient>\n");
  key = id->str;
  g_hash_table_add (f->gradients, g_string_free (id, FALSE));
  return key;
}

/* A cylinder's gradient across it: from the side facing the light's
 * direction in the picture (t = −1) to the far side (t = 1), in the local
 * frame of the shape (see local_frame). */
static const char *
cylinder_gradient (Figure *f, const double base[3], int level)
{
  GString *id = g_string_new (NULL);
  const char *key;
  double lx = f->light[0], ly = f->light[1], ll = hypot (lx, ly);

  gradient_id (id, "cylinder", base, level);
  key = g_hash_table_lookup (f->gradients, id->str);
  if (key)
    {
      g_string_free (id, TRUE);
      return key;
    }
  lx /= ll;
  ly /= ll;
  g_string_append_printf (f->defs, "<linearGradient id=\"%s\" x1=\"0\" y1=\"0\" x2=\"0\" y2=\"1\">", id->str);
  for (int j = 0; j <= 8; j++)
    {
      double o = j / 8.0, t = 2.0 * o - 1.0, n[3], rgb[3];
      n[0] = -t * lx;
      n[1] = -t * ly;
      n[2] = sqrt (MAX (1.0 - t * t, 0.0));
      shade (f, base, n, level, rgb);
      stop (f->defs, o, rgb);
    }
  g_string_append (f->defs, "</linearGradient>\n");
  key = id->str;
  g_hash_table_add (f->gradients, g_string_free (id, FALSE));
  return key;
}

/* The outline: the colour's rim shading, darker. */
static void
outline_colour (const Figure *f, const double base[3], int level, double out[3])
{
  const double rim[3] = { -f->halfway[0], -f->halfway[1], 0.0 };

  shade (f, base, rim, level, out);
  for (int k = 0; k < 3; k++)
    out[k] *= 0.6;
}

static Item *
item_begin (Figure *f, double key)
{
  Item it = { key, f->items->len, f->pool->len, 0 };

  g_array_append_val (f->items, it);
  return &g_array_index (f->items, Item, f->items->len - 1);
}

static void
item_end (Figure *f)
{
  Item *it = &g_array_index (f->items, Item, f->items->len - 1);

  g_string_append_c (f->pool, '\n');
  it->length = f->pool->len - it->start;
}

static int
item_compare (gconstpointer a, gconstpointer b)
{
  const Item *x = a, *y = b;

  if (x->key != y->key)
    return x->key > y->key ? -1 : 1;
  return x->seq < y->seq ? -1 : x->seq > y->seq;
}

static void
opacity (GString *s, double alpha)
{
  if (alpha < 1.0)
    attr (s, "opacity", alpha);
}

static const float *
atom_position (const float *positions, gsize i)
{
  return positions + 3 * i;
}

static void
atom_colour (const Figure *f, gsize i, double rgb[3])
{
  for (int k = 0; k < 3; k++)
    rgb[k] = f->colours[3 * i + k];
}

/* The disc of sphere (@centre world, @radius Å): centre and radius in
 * pixels; FALSE when not wholly in front of the eye. */
static gboolean
disc (const Figure *f, const float centre[3], double radius, double *x, double *y, double *r)
{
  double c[3];

  to_view (f, centre, c);
  if (f->ortho)
    {
      float px, py;
      if (!qv_camera_project (f->camera, centre, &px, &py, NULL))
        return FALSE;
      *x = px;
      *y = py;
      *r = radius * f->focal;
      return TRUE;
    }
  if (!(-c[2] > radius * 1.0001))
    return FALSE;
  {
    /* The cone of lines of sight tangent to the sphere, cut by the image
     * plane z = −F (X right, Y up, pixels from the picture's centre):
     * (c·u)² = (|c|² − r²)|u|² for u = (X, Y, −F), a conic
     * A X² + B XY + C Y² + D X + E Y + G = 0. */
    double F = f->focal, k = c[0] * c[0] + c[1] * c[1] + c[2] * c[2] - radius * radius;
    double A = c[0] * c[0] - k, C = c[1] * c[1] - k, B = 2.0 * c[0] * c[1];
    double D = -2.0 * F * c[2] * c[0], E = -2.0 * F * c[2] * c[1];
    double G = F * F * (c[2] * c[2] - k);
    double det = 4.0 * A * C - B * B;
    double X0, Y0, G0;

    if (!(det > 0.0))
      return FALSE;
    X0 = (B * E - 2.0 * C * D) / det;
    Y0 = (B * D - 2.0 * A * E) / det;
    G0 = G + 0.5 * (D * X0 + E * Y0);
    /* Semi-axes √(−G0/λ) for the eigenvalues λ of [[A, B/2], [B/2, C]]:
     * their product −G0/√(λ₁λ₂), λ₁λ₂ = det/4. */
    *x = 0.5 * f->width + X0;
    *y = 0.5 * f->height - Y0;
    *r = sqrt (fabs (G0) / sqrt (0.25 * det));
    return TRUE;
  }
}

/* A shape along the picture segment p → q: the transform that maps local
 * (s along, t across) onto it, t growing away from the light's side.
 * FALSE for a segment shorter than a hundredth of a pixel. */
static gboolean
local_frame (const Figure *f, const double p[2], const double q[2], GString *s, double *len)
{
  double ux = q[0] - p[0], uy = q[1] - p[1], l = hypot (ux, uy), mx, my;
  /* The light's direction in the picture (y down). */
  double lx = f->light[0], ly = -f->light[1];

  if (!(l > 0.01))
    return FALSE;
  ux /= l;
  uy /= l;
  mx = -uy;
  my = ux;
  if (mx * lx + my * ly > 0.0)
    {
      mx = -mx;
      my = -my;
    }
  *len = l;
  g_string_append (s, " transform=\"matrix(");
  num (s, ux);
  g_string_append_c (s, ' ');
  num (s, uy);
  g_string_append_c (s, ' ');
  num (s, mx);
  g_string_append_c (s, ' ');
  num (s, my);
  g_string_append_c (s, ' ');
  num (s, p[0]);
  g_string_append_c (s, ' ');
  num (s, p[1]);
  g_string_append (s, ")\"");
  return TRUE;
}

static void
points (GString *s, const double *xy, int n)
{
  g_string_append (s, " points=\"");
  for (int j = 0; j < n; j++)
    {
      if (j)
        g_string_append_c (s, ' ');
      num (s, xy[2 * j]);
      g_string_append_c (s, ',');
      num (s, xy[2 * j + 1]);
    }
  g_string_append_c (s, '"');
}

static gboolean
project (const Figure *f, const float w[3], double out[2], double view[3])
{
  float x, y;

  to_view (f, w, view);
  if (view[2] >= -1e-4 || !qv_camera_project (f->camera, w, &x, &y, NULL))
    return FALSE;
  out[0] = x;
  out[1] = y;
  return TRUE;
}

static void
add_atom (Figure *f, const float *positions, gsize i, gboolean ghost)
{
  const QvElement *e = qv_element_from_z (f->figure->structure->atoms[i].z);
  const float *p = atom_position (positions, i);
  double x, y, r, c[3], base[3], line[3];
  int level;
  const char *grad;
  GString *s = f->pool;

  if (!disc (f, p, f->radii[i], &x, &y, &r))
    return;
  if (x + r < 0.0 || x - r > f->width || y + r < 0.0 || y - r > f->height)
    return;
  to_view (f, p, c);
  atom_colour (f, i, base);
  level = cue_level (f, c);
  grad = sphere_gradient (f, base, level);
  outline_colour (f, base, level, line);
  item_begin (f, eye_distance (f, c));
  g_string_append_printf (s, "<circle class=\"%s\" id=\"%s-%" G_GSIZE_FORMAT "\"",
                          ghost ? "ghost" : "atom", ghost ? "ghost" : "atom", i + 1);
  attr (s, "cx", x);
  attr (s, "cy", y);
  attr (s, "r", r);
  g_string_append_printf (s, " fill=\"url(#%s)\" stroke=\"", grad);
  hex (s, line);
  g_string_append_c (s, '"');
  attr (s, "stroke-width", CLAMP (0.04 * r, 0.3, 1.5));
  if (ghost)
    opacity (s, f->options->ghost_alpha);
  g_string_append (s, "><title>");
  g_string_append_printf (s, "%s%" G_GSIZE_FORMAT "%s</title></circle>",
                          e ? e->symbol : "X", i + 1, ghost ? " (displaced)" : "");
  item_end (f);

  if (f->options->labels && !ghost)
    {
      double px = CLAMP (f->height / 34.0, 12.0, 96.0), fg[3], bg[3];
      char text[32];
      for (int k = 0; k < 3; k++)
        {
          fg[k] = f->fg[k];
          bg[k] = f->bg[k];
        }
      g_snprintf (text, sizeof text, "%s%" G_GSIZE_FORMAT, e ? e->symbol : "X", i + 1);
      /* Right after its atom: a nearer atom covers it, as in the GL
       * picture (labels are depth-tested at the sphere's front). */
      item_begin (f, eye_distance (f, c));
      g_string_append_printf (s, "<g class=\"label\" id=\"label-%" G_GSIZE_FORMAT "\""
                                 " font-family=\"sans-serif\" text-anchor=\"middle\"", i + 1);
      attr (s, "font-size", px);
      g_string_append (s, "><text");
      attr (s, "x", x);
      attr (s, "y", y + 0.35 * px);
      g_string_append (s, " fill=\"none\" stroke=\"");
      hex (s, bg);
      g_string_append (s, "\" stroke-linejoin=\"round\"");
      attr (s, "stroke-width", 0.25 * px);
      g_string_append_printf (s, ">%s</text><text", text);
      attr (s, "x", x);
      attr (s, "y", y + 0.35 * px);
      g_string_append (s, " fill=\"");
      hex (s, fg);
      g_string_append_printf (s, "\">%s</text></g>", text);
      item_end (f);
    }
}

/* One colour's part of a bond or an arrow: @poly local points (s, t)
 * after the transform of the picture segment p → q. */
static void
add_shape (Figure *f, const char *class, const char *id, double key, const double p[2],
           const double q[2], const double *poly, int n_points, const double base[3],
           int level, double alpha)
{
  GString *s = f->pool;
  const char *grad = cylinder_gradient (f, base, level);
  double len, line[3];
  gsize mark = s->len;

  item_begin (f, key);
  g_string_append_printf (s, "<polygon class=\"%s\" id=\"%s\"", class, id);
  if (!local_frame (f, p, q, s, &len))
    {
      g_string_truncate (s, mark);
      g_array_set_size (f->items, f->items->len - 1);
      return;
    }
  {
    double *xy = g_newa (double, 2 * n_points);
    for (int j = 0; j < n_points; j++)
      {
        /* s in units of the segment's length, t in pixels. */
        xy[2 * j] = poly[2 * j] * len;
        xy[2 * j + 1] = poly[2 * j + 1];
      }
    points (s, xy, n_points);
  }
  outline_colour (f, base, level, line);
  g_string_append_printf (s, " fill=\"url(#%s)\" stroke=\"", grad);
  hex (s, line);
  g_string_append (s, "\" stroke-width=\"0.3\" stroke-linejoin=\"round\"");
  opacity (s, alpha);
  g_string_append (s, "/>");
  item_end (f);
}

/* Bond @a–@b as the GL renderer draws it (shaders/cylinder.vert): the
 * part outside both spheres, coloured by the nearer atom up to the middle. */
static void
add_bond (Figure *f, const float *positions, guint32 ia, guint32 ib, gboolean ghost)
{
  const float *a0 = atom_position (positions, ia), *b0 = atom_position (positions, ib);
  double rb = f->options->bond_radius, ra = f->radii[ia], rc = f->radii[ib];
  double d[3], len, s0, s1, mid;
  const guint32 atoms[2] = { ia, ib };

  for (int k = 0; k < 3; k++)
    d[k] = (double) b0[k] - a0[k];
  len = sqrt (d[0] * d[0] + d[1] * d[1] + d[2] * d[2]);
  if (!(len > 1e-6))
    return;
  s0 = sqrt (MAX (ra * ra - rb * rb, 0.0));
  s1 = len - sqrt (MAX (rc * rc - rb * rb, 0.0));
  if (s1 <= s0)
    return;   /* the spheres overlap past the bond: nothing shows */
  mid = 0.5 * len;
  for (int h = 0; h < 2; h++)
    {
      double from = h == 0 ? s0 : MAX (mid, s0), to = h == 0 ? MIN (mid, s1) : s1;
      float w0[3], w1[3], wm[3];
      double p[2], q[2], v0[3], v1[3], vm[3], base[3], hw0, hw1, poly[8], l, ext = 0.0;
      char id[64];

      if (!(to > from))
        continue;
      for (int k = 0; k < 3; k++)
        {
          w0[k] = (float) (a0[k] + d[k] / len * from);
          w1[k] = (float) (a0[k] + d[k] / len * to);
          wm[k] = 0.5f * (w0[k] + w1[k]);
        }
      if (!project (f, w0, p, v0) || !project (f, w1, q, v1))
        continue;
      to_view (f, wm, vm);
      hw0 = rb * px_per_unit (f, v0);
      hw1 = rb * px_per_unit (f, v1);
      l = hypot (q[0] - p[0], q[1] - p[1]);
      if (!(l > 0.01))
        continue;
      /* The end at the middle reaches a little under the other half. */
      if ((h == 0 && to == mid) || (h == 1 && from == mid))
        ext = BOND_OVERLAP_PX / l;
      if (h == 0)
        {
          double lp[8] = { 0, -hw0, 1 + ext, -hw1, 1 + ext, hw1, 0, hw0 };
          memcpy (poly, lp, sizeof poly);
        }
      else
        {
          double lp[8] = { -ext, -hw0, 1, -hw1, 1, hw1, -ext, hw0 };
          memcpy (poly, lp, sizeof poly);
        }
      atom_colour (f, atoms[h], base);
      g_snprintf (id, sizeof id, "%s-%u-%u-at-%u", ghost ? "ghost-bond" : "bond",
                  ia + 1, ib + 1, atoms[h] + 1);
      add_shape (f, ghost ? "bond ghost" : "bond", id, eye_distance (f, vm), p, q, poly, 4,
                 base, cue_level (f, vm), ghost ? f->options->ghost_alpha : 1.0);
    }
}

/* As shaders/arrow.vert: from 0.85 of the radius along the displacement,
 * arrow_scale × its length long, the head at most 45 % of it. */
static void
add_arrow (Figure *f, const float *positions, gsize i)
{
  const float *c = atom_position (positions, i), *v = f->figure->arrows + 3 * i;
  double amp = sqrt ((double) v[0] * v[0] + (double) v[1] * v[1] + (double) v[2] * v[2]);
  double len, head_len, shrink, shaft_r, head_r, start;
  float wb[3], wn[3], wt[3], wm[3];
  double pb[2], pn[2], pt[2], vb[3], vn[3], vt[3], vm[3], base[3];
  double l, ln, poly[14];
  char id[48];

  if (!(amp > 0.0) || amp < f->options->arrow_threshold)
    return;
  len = f->options->arrow_scale * amp;
  if (!(len > 0.0))
    return;
  head_len = MIN (ARROW_HEAD_LENGTH, 0.45 * len);
  shrink = head_len / ARROW_HEAD_LENGTH;
  shaft_r = ARROW_SHAFT * MAX (shrink, 0.5);
  head_r = ARROW_HEAD * MAX (shrink, 0.5);
  start = 0.85 * f->radii[i];
  for (int k = 0; k < 3; k++)
    {
      double dir = v[k] / amp;
      wb[k] = (float) (c[k] + dir * start);
      wn[k] = (float) (c[k] + dir * (start + len - head_len));
      wt[k] = (float) (c[k] + dir * (start + len));
      wm[k] = (float) (c[k] + dir * (start + 0.5 * len));
    }
  if (!project (f, wb, pb, vb) || !project (f, wn, pn, vn) || !project (f, wt, pt, vt))
    return;
  to_view (f, wm, vm);
  l = hypot (pt[0] - pb[0], pt[1] - pb[1]);
  if (!(l > 0.01))
    return;
  ln = hypot (pn[0] - pb[0], pn[1] - pb[1]) / l;
  {
    double ws0 = shaft_r * px_per_unit (f, vb), ws1 = shaft_r * px_per_unit (f, vn);
    double wh = head_r * px_per_unit (f, vn);
    double lp[14] = { 0, -ws0, ln, -ws1, ln, -wh, 1, 0, ln, wh, ln, ws1, 0, ws0 };
    memcpy (poly, lp, sizeof poly);
  }
  for (int k = 0; k < 3; k++)
    base[k] = f->accent[k];
  g_snprintf (id, sizeof id, "arrow-%" G_GSIZE_FORMAT, i + 1);
  add_shape (f, "arrow", id, eye_distance (f, vm), pb, pt, poly, 7, base, cue_level (f, vm), 1.0);
}

static void
add_cell (Figure *f)
{
  const QvStructure *st = f->figure->structure;
  double width = MAX (1.0, f->height / 600.0);
  int edge = 0;

  for (int c0 = 0; c0 < 8; c0++)
    for (int axis = 0; axis < 3; axis++)
      {
        int c1 = c0 | (1 << axis);
        double e[2][3];
        if (c1 == c0)
          continue;
        edge++;
        for (int end = 0; end < 2; end++)
          for (int k = 0; k < 3; k++)
            {
              int corner = end ? c1 : c0;
              e[end][k] = 0.0;
              for (int row = 0; row < 3; row++)
                if (corner & (1 << row))
                  e[end][k] += st->cell[row][k];
            }
        for (int piece = 0; piece < CELL_PIECES; piece++)
          {
            float w0[3], w1[3], wm[3];
            double p[2], q[2], v0[3], v1[3], vm[3], fg[3];
            GString *s = f->pool;
            for (int k = 0; k < 3; k++)
              {
                w0[k] = (float) (e[0][k] + (e[1][k] - e[0][k]) * piece / CELL_PIECES);
                w1[k] = (float) (e[0][k] + (e[1][k] - e[0][k]) * (piece + 1) / CELL_PIECES);
                wm[k] = 0.5f * (w0[k] + w1[k]);
                fg[k] = f->fg[k];
              }
            if (!project (f, w0, p, v0) || !project (f, w1, q, v1))
              continue;
            to_view (f, wm, vm);
            item_begin (f, eye_distance (f, vm));
            g_string_append_printf (s, "<line class=\"cell\" id=\"cell-%d-%d\"", edge, piece + 1);
            attr (s, "x1", p[0]);
            attr (s, "y1", p[1]);
            attr (s, "x2", q[0]);
            attr (s, "y2", q[1]);
            g_string_append (s, " stroke=\"");
            hex (s, fg);
            g_string_append (s, "\" stroke-linecap=\"round\"");
            attr (s, "stroke-width", width);
            g_string_append (s, "/>");
            item_end (f);
          }
      }
}

/* The renderer's bounding sphere of the rest positions and its depth
 * cueing range (qv-renderer.c update_bounds, fill_frame). */
static void
depth_cue (Figure *f)
{
  const QvStructure *st = f->figure->structure;
  float lo[3] = { 0, 0, 0 }, hi[3] = { 0, 0, 0 }, centre[3], r2 = 0.0f, extent;
  double cv[3];

  for (gsize i = 0; i < f->n; i++)
    for (int k = 0; k < 3; k++)
      {
        float v = (float) st->atoms[i].position[k];
        lo[k] = i == 0 ? v : MIN (lo[k], v);
        hi[k] = i == 0 ? v : MAX (hi[k], v);
      }
  for (int k = 0; k < 3; k++)
    centre[k] = 0.5f * (lo[k] + hi[k]);
  for (gsize i = 0; i < f->n; i++)
    {
      float d2 = 0.0f;
      for (int k = 0; k < 3; k++)
        {
          float d = (float) st->atoms[i].position[k] - centre[k];
          d2 += d * d;
        }
      r2 = MAX (r2, d2);
    }
  extent = sqrtf (r2) + 1.0f;
  to_view (f, centre, cv);
  f->cue_start = -cv[2] - 0.3 * extent;
  f->cue_end = -cv[2] + extent;
  f->cue_strength = f->options->depth_cue ? 0.5 : 0.0;
}

static gboolean
check_finite (const float *v, gsize n, const char *what, GError **error)
{
  if (v == NULL)
    return TRUE;
  for (gsize i = 0; i < n; i++)
    for (int k = 0; k < 3; k++)
      if (!isfinite (v[3 * i + k]))
        {
          g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                       "SVG figure: the %s of atom %" G_GSIZE_FORMAT " is not a finite number "
                       "(check the mode's amplitude and the input geometry)", what, i + 1);
          return FALSE;
        }
  return TRUE;
}

char *
qv_svg_figure_render (const QvSvgFigure *figure, const QvCamera *camera,
                      const QvRenderOptions *options, gsize *length, GError **error)
{
  const QvStructure *st = figure->structure;
  g_autofree float *rest = NULL;
  g_autofree QvBond *bonds = NULL;
  const float *positions = figure->positions;
  gboolean ghost = figure->ghost_positions && options->ghost_alpha > 0.0f;
  gsize n_bonds = 0, n_atoms_drawn = 0;
  float max_p = 0.0f;
  mat4 proj;
  GString *out;
  Figure f = { 0 };

  if (camera->width < 1 || camera->height < 1)
    {
      g_set_error (error, QV_ERROR, QV_ERROR_INPUT,
                   "SVG figure: %d × %d pixels is not a picture size", camera->width, camera->height);
      return NULL;
    }
  f.figure = figure;
  f.camera = camera;
  f.options = options;
  f.n = st->n_atoms;
  if (positions == NULL)
    {
      rest = g_new (float, 3 * MAX (f.n, 1));
      for (gsize i = 0; i < 3 * f.n; i++)
        rest[i] = (float) st->atoms[i / 3].position[i % 3];
      positions = rest;
    }
  if (!check_finite (positions, f.n, "position", error)
      || !check_finite (figure->arrows, f.n, "arrow", error)
      || !check_finite (ghost ? figure->ghost_positions : NULL, f.n, "displaced position", error))
    return NULL;

  qv_camera_view_matrix (camera, f.view);
  qv_camera_projection_matrix (camera, proj);
  f.ortho = camera->projection == QV_CAMERA_ORTHOGRAPHIC;
  f.width = camera->width;
  f.height = camera->height;
  f.focal = 0.5 * proj[1][1] * camera->height;
  {
    double ll = sqrt (LIGHT[0] * LIGHT[0] + LIGHT[1] * LIGHT[1] + LIGHT[2] * LIGHT[2]), hl;
    double h[3];
    for (int k = 0; k < 3; k++)
      f.light[k] = LIGHT[k] / ll;
    for (int k = 0; k < 3; k++)
      h[k] = f.light[k] + (k == 2 ? 1.0 : 0.0);
    hl = sqrt (h[0] * h[0] + h[1] * h[1] + h[2] * h[2]);
    for (int k = 0; k < 3; k++)
      f.halfway[k] = h[k] / hl;
  }
  qv_style_background (options->background, f.bg);
  qv_style_foreground (options->background, f.fg);
  qv_style_arrow (options->background, f.accent);
  depth_cue (&f);

  f.radii = g_new (float, MAX (f.n, 1));
  f.colours = g_new (float, 3 * MAX (f.n, 1));
  if (options->colouring == QV_COLOUR_PARTICIPATION && figure->participation)
    for (gsize i = 0; i < f.n; i++)
      if (isfinite (figure->participation[i]))
        max_p = MAX (max_p, figure->participation[i]);
  for (gsize i = 0; i < f.n; i++)
    {
      const QvElementStyle *style = qv_style_element (st->atoms[i].z);
      f.radii[i] = style->radius * (options->atom_scale > 0.0f ? options->atom_scale : 1.0f);
      if (options->colouring == QV_COLOUR_PARTICIPATION && figure->participation)
        {
          float p = figure->participation[i];
          qv_style_ramp (max_p > 0.0f && isfinite (p) ? p / max_p : 0.0, f.colours + 3 * i);
        }
      else
        memcpy (f.colours + 3 * i, style->rgb, 3 * sizeof (float));
    }

  f.pool = g_string_sized_new (256 * (f.n + 1));
  f.items = g_array_new (FALSE, FALSE, sizeof (Item));
  f.defs = g_string_new (NULL);
  f.gradients = g_hash_table_new_full (g_str_hash, g_str_equal, g_free, NULL);

  for (gsize i = 0; i < f.n; i++)
    {
      gsize before = f.items->len;
      add_atom (&f, positions, i, FALSE);
      if (f.items->len > before)
        n_atoms_drawn++;
    }
  if (options->bonds)
    {
      bonds = qv_bonds_perceive (st, QV_BONDS_DEFAULT_TOLERANCE, &n_bonds);
      for (gsize b = 0; b < n_bonds; b++)
        add_bond (&f, positions, bonds[b].a, bonds[b].b, FALSE);
    }
  if (options->arrows && figure->arrows)
    for (gsize i = 0; i < f.n; i++)
      add_arrow (&f, positions, i);
  if (ghost)
    {
      for (gsize i = 0; i < f.n; i++)
        add_atom (&f, figure->ghost_positions, i, TRUE);
      for (gsize b = 0; b < n_bonds; b++)
        add_bond (&f, figure->ghost_positions, bonds[b].a, bonds[b].b, TRUE);
    }
  if (options->cell && st->has_cell)
    add_cell (&f);
  g_array_sort (f.items, item_compare);

  out = g_string_sized_new (f.pool->len + f.defs->len + 1024);
  g_string_append (out, "<?xml version=\"1.0\" encoding=\"UTF-8\" standalone=\"no\"?>\n"
                        "<!DOCTYPE svg PUBLIC \"-//W3C//DTD SVG 1.1//EN\" "
                        "\"http://www.w3.org/Graphics/SVG/1.1/DTD/svg11.dtd\">\n");
  g_string_append_printf (out, "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" "
                               "width=\"%d\" height=\"%d\" viewBox=\"0 0 %d %d\">\n",
                          camera->width, camera->height, camera->width, camera->height);
  g_string_append_printf (out, "<title>Quaver figure</title>\n"
                               "<desc>%" G_GSIZE_FORMAT " atoms (%" G_GSIZE_FORMAT " drawn), "
                               "%" G_GSIZE_FORMAT " bonds; drawn far to near</desc>\n",
                          f.n, n_atoms_drawn, options->bonds ? n_bonds : 0);
  g_string_append (out, "<defs>\n");
  g_string_append_len (out, f.defs->str, (gssize) f.defs->len);
  g_string_append (out, "</defs>\n");
  if (!options->transparent)
    {
      double bg[3] = { f.bg[0], f.bg[1], f.bg[2] };
      g_string_append_printf (out, "<rect id=\"background\" x=\"0\" y=\"0\" width=\"%d\" "
                                   "height=\"%d\" fill=\"", camera->width, camera->height);
      hex (out, bg);
      g_string_append (out, "\"/>\n");
    }
  g_string_append (out, "<g id=\"scene\">\n");
  for (guint j = 0; j < f.items->len; j++)
    {
      const Item *it = &g_array_index (f.items, Item, j);
      g_string_append_len (out, f.pool->str + it->start, (gssize) it->length);
    }
  g_string_append (out, "</g>\n</svg>\n");

  g_string_free (f.pool, TRUE);
  g_string_free (f.defs, TRUE);
  g_array_free (f.items, TRUE);
  g_hash_table_destroy (f.gradients);
  g_free (f.radii);
  g_free (f.colours);
  if (length)
    *length = out->len;
  return g_string_free (out, FALSE);
}
