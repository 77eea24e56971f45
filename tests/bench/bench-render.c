/* bench-render.c — frames per second of the renderer offscreen (EGL
 * surfaceless; llvmpipe on machines without a GPU) and the time to the
 * first frame of the demo. Measures and reports; never fails on a figure.
 *
 *   bench-render [--frames N] [--width W] [--height H] [--atoms N]
 *                [--aa edges|none|msaa4|all] [--samples S]
 *                [--no-arrows] [--no-bonds] [--dump PREFIX] [--stats]
 *                [--shape chains|droplet] [--cull|--no-cull] [--atom-scale X]
 *
 * --stats counts, over one frame, the vertex and fragment shader
 * invocations (GL_ARB_pipeline_statistics_query, where the GL has it).
 *
 * Every frame changes the phase, is drawn (and for msaa4 resolved) and
 * waited for with glFinish: a frame counts only once it is finished. The
 * figure is the median over blocks of ten frames (the machine is shared),
 * with the process's CPU time per frame (all threads) beside it. AA modes:
 * edges — analytic antialiasing, one sample; none — hard edges (the
 * default options, fastest); msaa4 — the renderer's own 4× multisampled buffer
 * resolved each frame (stills). --samples multisamples the offscreen
 * framebuffer itself instead (as `quaver picture` does).
 *
 * Structures for the frame rate are invented here: parallel zigzag
 * hydrocarbon chains (C–C 1.54 Å, C–H 1.09 Å, tetrahedral-like angles,
 * chains 4.6 Å apart), so that bonds are perceived as in a real molecular
 * crystal, with an invented smooth displacement field as the "mode"
 * (--shape chains, the default: a block about 50 × 50 × 38 Å at 10 000
 * atoms, 0.11 atoms/Å³ like a real alkane crystal); or --shape droplet, a
 * ball of water molecules (O–H 0.96 Å, H–O–H 104.5°, common practice) on
 * a grid jittered by ±0.4 Å (no straight channels) at about liquid water's density (1 molecule per 30 Å³),
 * randomly oriented: the shape of a solvated system. --cull and --no-cull
 * turn the renderer's occlusion culling on or off
 * (QvRenderOptions.occlusion_cull; without either, its default); each
 * run prints how many atoms, bonds and arrows were drawn after culling;
 * --stats also prints the most any atom-level culling could skip (oracle).
 * --atom-scale sets QvRenderOptions.atom_scale (1: the style's ball and
 * stick radii; about 2.5 approaches space filling).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include <epoxy/gl.h>
#include <math.h>
#include <stdio.h>
#include <sys/resource.h>
#include <stdlib.h>
#include <string.h>
#include "bench-util.h"
#include "qv-input.h"
#include "qv-offscreen.h"
#include "qv-renderer.h"
#include "qv-solver.h"

static QvStructure *
chains (gsize target)
{
  /* Chains of n_c carbons; grid of g × g chains, each CH2 is 3 atoms. */
  gsize n_c = (gsize) ceil (cbrt ((double) target / 3.0) * 2.0);
  gsize per_chain = 3 * n_c, g = (gsize) ceil (sqrt ((double) target / per_chain));
  gsize n = 0, cap = g * g * per_chain;
  QvStructure *s = qv_structure_new (cap, NULL);
  const double cc = 1.54, half = 0.5 * 109.5 * G_PI / 180.0, ch = 1.09;
  const double dx = cc * sin (half), dz = cc * cos (half) * 0.5;

  for (gsize a = 0; a < g && n < target; a++)
    for (gsize b = 0; b < g && n < target; b++)
      for (gsize k = 0; k < n_c && n + 3 <= target; k++)
        {
          double x = k * dx, y = a * 4.6, z = b * 4.6 + ((k & 1) ? dz : -dz);
          double side = (k & 1) ? 1.0 : -1.0;
          qv_structure_set_element (s, n, 6, NULL);
          s->atoms[n].position[0] = x;
          s->atoms[n].position[1] = y;
          s->atoms[n].position[2] = z;
          n++;
          for (int h = 0; h < 2; h++)
            {
              qv_structure_set_element (s, n, 1, NULL);
              s->atoms[n].position[0] = x;
              s->atoms[n].position[1] = y + (h ? 1.0 : -1.0) * ch * 0.816;
              s->atoms[n].position[2] = z + side * ch * 0.577;
              n++;
            }
        }
  s->n_atoms = n;
  return s;
}

static QvStructure *
droplet (gsize target)
{
  /* Grid spacing a = 30^(1/3) Å; keep the nodes inside the ball that holds
   * target / 3 of them. */
  const double a = cbrt (30.0), oh = 0.96, angle = 104.5 * G_PI / 180.0;
  double radius = cbrt ((double) (target / 3) * 30.0 * 3.0 / (4.0 * G_PI));
  int m = (int) ceil (radius / a) + 1;
  gsize n = 0, cap = target + 3;
  QvStructure *s = qv_structure_new (cap, NULL);
  guint64 seed = 7;

  for (int i = -m; i <= m; i++)
    for (int j = -m; j <= m; j++)
      for (int k = -m; k <= m; k++)
        {
          double o[3] = { i * a, j * a, k * a }, u[3], v[3], w[3], len;
          if (o[0] * o[0] + o[1] * o[1] + o[2] * o[2] > radius * radius || n + 3 > target)
            continue;
          for (int q = 0; q < 3; q++)
            o[q] += 0.8 * (bench_uniform (&seed) - 0.5);
          /* A random orthonormal pair (u, v) for the molecule's plane. */
          do
            {
              for (int q = 0; q < 3; q++)
                u[q] = bench_uniform (&seed) - 0.5;
              len = sqrt (u[0] * u[0] + u[1] * u[1] + u[2] * u[2]);
            }
          while (len < 0.1);
          for (int q = 0; q < 3; q++)
            u[q] /= len;
          w[0] = u[1] * 0.3 - u[2] * 0.7;
          w[1] = u[2] * 0.5 - u[0] * 0.3;
          w[2] = u[0] * 0.7 - u[1] * 0.5;
          len = sqrt (w[0] * w[0] + w[1] * w[1] + w[2] * w[2]);
          for (int q = 0; q < 3; q++)
            v[q] = w[q] / len;
          qv_structure_set_element (s, n, 8, NULL);
          memcpy (s->atoms[n].position, o, sizeof o);
          n++;
          for (int h = 0; h < 2; h++)
            {
              double t = (h ? 0.5 : -0.5) * angle;
              qv_structure_set_element (s, n, 1, NULL);
              for (int q = 0; q < 3; q++)
                s->atoms[n].position[q] = o[q] + oh * (cos (t) * u[q] + sin (t) * v[q]);
              n++;
            }
        }
  s->n_atoms = n;
  return s;
}

static double
now (void)
{
  return g_get_monotonic_time () / 1e6;
}

static double
cpu_seconds (void)
{
  struct rusage u;

  getrusage (RUSAGE_SELF, &u);
  return u.ru_utime.tv_sec + u.ru_utime.tv_usec / 1e6 + u.ru_stime.tv_sec + u.ru_stime.tv_usec / 1e6;
}

static int
compare_doubles (const void *a, const void *b)
{
  double x = *(const double *) a, y = *(const double *) b;
  return (x > y) - (x < y);
}

static void
fit (QvCamera *camera, const QvStructure *s, int w, int h)
{
  g_autofree float *p = g_new (float, 3 * s->n_atoms);

  for (gsize i = 0; i < 3 * s->n_atoms; i++)
    p[i] = (float) s->atoms[i / 3].position[i % 3];
  qv_camera_init (camera);
  qv_camera_set_viewport (camera, w, h);
  qv_camera_rotate_begin (camera, w * 0.5f, h * 0.5f);
  qv_camera_rotate_drag (camera, w * 0.56f, h * 0.45f);
  qv_camera_rotate_end (camera);
  qv_camera_fit (camera, p, s->n_atoms, 1.0f);
}

static gboolean opt_no_arrows, opt_no_bonds, opt_stats, opt_droplet;
static int opt_cull = -1;   /* −1: the renderer's default */
static int opt_samples;
static double opt_atom_scale = 1.0;
static const char *opt_dump;

/* Writes the last frame as binary PPM (for looking at what was measured). */
static void
dump (QvOffscreen *off, int w, int h, gsize atoms, const char *mode)
{
  g_autofree guint8 *rgba = g_malloc ((gsize) w * h * 4);
  g_autofree char *name = g_strdup_printf ("%s-%zu-%s.ppm", opt_dump, atoms, mode);
  FILE *f;

  qv_offscreen_read (off, rgba);
  f = fopen (name, "wb");
  if (f == NULL)
    bench_die ("cannot write %s", name);
  fprintf (f, "P6\n%d %d\n255\n", w, h);
  for (gsize i = 0; i < (gsize) w * h; i++)
    fwrite (rgba + 4 * i, 1, 3, f);
  fclose (f);
}

/* The most any atom-level culling could skip: ray-casts the spheres alone
 * on the CPU, pixel by pixel (perspective), and counts the atoms that are
 * the nearest at one pixel centre at least. Bonds and arrows, which also
 * hide atoms, are left out, so this is an upper bound on hidden atoms that
 * is close for thin bonds. */
static void
oracle (QvRenderer *r, const QvCamera *camera)
{
  const float *p = qv_renderer_positions (r), *rad = qv_renderer_radii (r);
  gsize n = qv_renderer_n_atoms (r), seen = 0;
  int w = camera->width, h = camera->height;
  g_autofree float *depth = g_new (float, (gsize) w * h);
  g_autofree gint32 *id = g_new (gint32, (gsize) w * h);
  g_autofree guint8 *front = g_new0 (guint8, MAX (n, 1));
  mat4 view, proj;

  qv_camera_view_matrix (camera, view);
  qv_camera_projection_matrix (camera, proj);
  for (gsize i = 0; i < (gsize) w * h; i++)
    {
      depth[i] = INFINITY;
      id[i] = -1;
    }
  for (gsize i = 0; i < n; i++)
    {
      vec4 c = { p[3 * i], p[3 * i + 1], p[3 * i + 2], 1.0f }, v;
      float rr = rad[i], d;
      int x0, x1, y0, y1;
      glm_mat4_mulv (view, c, v);
      d = -v[2];
      if (d - rr <= 0.01f)
        continue;
      /* A generous bounding square of the silhouette. */
      {
        float cx = (proj[0][0] * v[0] / d + 1.0f) * 0.5f * w;
        float cy = (proj[1][1] * v[1] / d + 1.0f) * 0.5f * h;
        float rp = proj[1][1] * 0.5f * h * rr / (d - rr) * 1.5f + 2.0f;
        x0 = MAX ((int) (cx - rp), 0);
        x1 = MIN ((int) (cx + rp), w - 1);
        y0 = MAX ((int) (cy - rp), 0);
        y1 = MIN ((int) (cy + rp), h - 1);
      }
      for (int y = y0; y <= y1; y++)
        for (int x = x0; x <= x1; x++)
          {
            /* Ray through the pixel centre, as shaders/common.glsl. */
            float dx = ((x + 0.5f) * 2.0f / w - 1.0f) / proj[0][0];
            float dy = ((y + 0.5f) * 2.0f / h - 1.0f) / proj[1][1];
            float len = sqrtf (dx * dx + dy * dy + 1.0f);
            float dir[3] = { dx / len, dy / len, -1.0f / len };
            float b = -(dir[0] * v[0] + dir[1] * v[1] + dir[2] * v[2]);
            float q2 = v[0] * v[0] + v[1] * v[1] + v[2] * v[2] - b * b, t, z;
            if (q2 >= rr * rr)
              continue;
            t = -b - sqrtf (rr * rr - q2);
            t = -t;   /* distance along the ray to the front */
            z = -t * dir[2];
            if (z < depth[(gsize) y * w + x])
              {
                depth[(gsize) y * w + x] = z;
                id[(gsize) y * w + x] = (gint32) i;
              }
          }
    }
  for (gsize i = 0; i < (gsize) w * h; i++)
    if (id[i] >= 0 && !front[id[i]])
      {
        front[id[i]] = 1;
        seen++;
      }
  printf ("  oracle (spheres only): %zu of %zu atoms (%.1f %%) are nearest at some pixel\n",
          seen, n, 100.0 * seen / MAX (n, 1));
}

typedef enum { AA_EDGES, AA_NONE, AA_MSAA4, N_AA } BenchAA;
static const char *const aa_names[N_AA] = { "edges", "none", "msaa4" };

static void
run_fps (QvOffscreen *off, QvRenderer *r, gsize atoms, BenchAA aa, int frames, int w, int h)
{
  g_autoptr(QvStructure) s = opt_droplet ? droplet (atoms) : chains (atoms);
  g_autofree float *re = g_new (float, 3 * s->n_atoms);
  QvCamera camera;
  double t0, c0, cpu, block[64], t;
  int dw, dh, n_blocks = 0;
  guint64 seed = 42;
  char mode[64];
  gsize drawn[3];

  /* An invented field: a smooth wave plus a little noise, 0.1–0.3 Å. */
  for (gsize i = 0; i < s->n_atoms; i++)
    for (int k = 0; k < 3; k++)
      re[3 * i + k] = (float) (0.15 * sin (0.3 * s->atoms[i].position[0] + k)
                               + 0.08 * (bench_uniform (&seed) - 0.5));
  qv_offscreen_begin (off, &dw, &dh);
  qv_renderer_set_structure (r, s);
  qv_renderer_set_mode (r, re, NULL, 1.0f);
  {
    QvRenderOptions o;
    qv_render_options_init (&o);
    o.arrows = !opt_no_arrows;
    o.bonds = !opt_no_bonds;
    o.antialias = aa == AA_NONE ? QV_ANTIALIAS_NONE : QV_ANTIALIAS_EDGES;
    o.samples = aa == AA_MSAA4 ? 4 : 0;
    if (opt_cull >= 0)
      o.occlusion_cull = opt_cull;
    o.atom_scale = (float) opt_atom_scale;
    qv_renderer_set_options (r, &o);
  }
  fit (&camera, s, dw, dh);
  /* Warm-up (shader variants, first-touch of buffers). */
  for (int f = 0; f < 3; f++)
    {
      qv_renderer_set_phase (r, 0.1f * f);
      qv_renderer_draw (r, &camera);
    }
  glFinish ();
  if (opt_stats && epoxy_has_gl_extension ("GL_ARB_pipeline_statistics_query"))
    {
      static const GLenum what[3] = {
        GL_VERTEX_SHADER_INVOCATIONS_ARB, GL_CLIPPING_INPUT_PRIMITIVES_ARB,
        GL_FRAGMENT_SHADER_INVOCATIONS_ARB,
      };
      GLuint q[3];
      GLuint64 v[3];
      glGenQueries (3, q);
      for (int k = 0; k < 3; k++)
        {
          glBeginQuery (what[k], q[k]);
          qv_renderer_draw (r, &camera);
          glEndQuery (what[k]);
          glGetQueryObjectui64v (q[k], GL_QUERY_RESULT, &v[k]);
        }
      glDeleteQueries (3, q);
      printf ("  one frame (%s): %" G_GUINT64_FORMAT " vertex shader invocations, %" G_GUINT64_FORMAT
              " triangles, %" G_GUINT64_FORMAT " fragment shader invocations\n",
              aa_names[aa], v[0], v[1], v[2]);
    }
  if (opt_stats)
    oracle (r, &camera);
  c0 = cpu_seconds ();
  for (int f = 0; f < frames; f += 10)
    {
      int m = MIN (10, frames - f);
      t0 = now ();
      for (int k = 0; k < m; k++)
        {
          qv_renderer_set_phase (r, (float) (2.0 * G_PI * (f + k) / 60.0));
          qv_renderer_draw (r, &camera);
          glFinish ();
        }
      if (n_blocks < (int) G_N_ELEMENTS (block))
        block[n_blocks++] = (now () - t0) / m;
    }
  cpu = (cpu_seconds () - c0) / frames;
  qsort (block, n_blocks, sizeof (double), compare_doubles);
  t = block[n_blocks / 2];
  if (opt_samples > 0)
    g_snprintf (mode, sizeof mode, "%d× MSAA framebuffer", opt_samples);
  else
    g_snprintf (mode, sizeof mode, "%s", aa_names[aa]);
  qv_renderer_drawn_counts (r, drawn);
  printf ("%6zu atoms %6zu bonds%s%s  %4d×%d  %-6s %3d frames  %7.1f ms/frame (best block %.1f)  "
          "%6.1f fps  cpu %6.1f ms/frame\n",
          s->n_atoms, qv_renderer_n_bonds (r), opt_no_bonds ? " (off)" : "",
          opt_no_arrows ? ", no arrows" : ", arrows", w, h, mode, frames,
          1e3 * t, 1e3 * block[0], 1.0 / t, 1e3 * cpu);
  printf ("  %s, culling %s: drawn in the last frame %zu atoms, %zu bonds, %zu arrows\n",
          opt_droplet ? "droplet" : "chains", qv_renderer_get_options (r)->occlusion_cull ? "on" : "off",
          drawn[0], drawn[1], drawn[2]);
  fflush (stdout);
  if (opt_dump)
    dump (off, w, h, atoms, aa_names[aa]);
}

int
main (int argc, char **argv)
{
  int frames = 60, w = 1280, h = 800, samples = 0, atoms = 0, aa_first = 0, aa_last = N_AA - 1;
  double t0, t_ctx, t_shaders, t_upload, t_draw;
  GError *error = NULL;
  QvOffscreen *off;
  QvRenderer *r;
  guint8 pixel[4];

  g_set_prgname ("bench-render");
  for (int i = 1; i < argc; i += 2)
    {
      if (strcmp (argv[i], "--no-arrows") == 0)
        {
          opt_no_arrows = TRUE;
          i--;
        }
      else if (strcmp (argv[i], "--stats") == 0)
        {
          opt_stats = TRUE;
          i--;
        }
      else if (strcmp (argv[i], "--no-cull") == 0 || strcmp (argv[i], "--cull") == 0)
        {
          opt_cull = strcmp (argv[i], "--cull") == 0;
          i--;
        }
      else if (strcmp (argv[i], "--no-bonds") == 0)
        {
          opt_no_bonds = TRUE;
          i--;
        }
      else if (i + 1 >= argc)
        bench_die ("%s needs a value", argv[i]);
      else if (strcmp (argv[i], "--frames") == 0)
        frames = atoi (argv[i + 1]);
      else if (strcmp (argv[i], "--width") == 0)
        w = atoi (argv[i + 1]);
      else if (strcmp (argv[i], "--height") == 0)
        h = atoi (argv[i + 1]);
      else if (strcmp (argv[i], "--samples") == 0)
        samples = atoi (argv[i + 1]);
      else if (strcmp (argv[i], "--atoms") == 0)
        atoms = atoi (argv[i + 1]);
      else if (strcmp (argv[i], "--shape") == 0)
        {
          if (strcmp (argv[i + 1], "droplet") != 0 && strcmp (argv[i + 1], "chains") != 0)
            bench_die ("--shape: chains or droplet, not %s", argv[i + 1]);
          opt_droplet = strcmp (argv[i + 1], "droplet") == 0;
        }
      else if (strcmp (argv[i], "--atom-scale") == 0)
        opt_atom_scale = g_ascii_strtod (argv[i + 1], NULL);
      else if (strcmp (argv[i], "--dump") == 0)
        opt_dump = argv[i + 1];
      else if (strcmp (argv[i], "--aa") == 0)
        {
          aa_first = -1;
          for (int a = 0; a < N_AA; a++)
            if (strcmp (argv[i + 1], aa_names[a]) == 0)
              aa_first = aa_last = a;
          if (strcmp (argv[i + 1], "all") == 0)
            aa_first = 0;
          if (aa_first < 0)
            bench_die ("--aa: edges, none, msaa4 or all, not %s", argv[i + 1]);
        }
      else
        bench_die ("unknown option %s", argv[i]);
    }

  /* Time to the first frame of the demo: context, shaders, upload, draw. */
  {
    QvInputOptions io = { .demo = TRUE };
    g_autoptr(QvInput) input = qv_input_load (&io, &error);
    QvSolveOptions so;
    g_autoptr(QvModeSet) modes = NULL;
    g_autofree double *cart = NULL;
    g_autofree float *re = NULL;
    QvCamera camera;
    gsize n, k;
    int dw, dh;

    if (input == NULL)
      bench_die ("%s", error->message);
    qv_solve_options_init (&so);
    modes = qv_solve (input->structure, g_steal_pointer (&input->hessian), &so, NULL, &error);
    if (modes == NULL)
      bench_die ("%s", error->message);
    n = input->structure->n_atoms;
    k = modes->n_modes - 1;
    cart = g_new (double, 3 * n);
    re = g_new (float, 3 * n);
    qv_mode_set_cartesian (modes, k, cart);
    for (gsize i = 0; i < 3 * n; i++)
      re[i] = (float) cart[i];

    t0 = now ();
    off = qv_offscreen_new (w, h, samples, 1, &error);
    if (off == NULL)
      {
        printf ("skipped: %s\n", error->message);
        return 0;
      }
    t_ctx = now ();
    r = qv_renderer_new (&error);
    if (r == NULL)
      bench_die ("%s", error->message);
    t_shaders = now ();
    qv_renderer_set_structure (r, input->structure);
    qv_renderer_set_mode (r, re, NULL, (float) qv_mode_set_display_amplitude (modes, k, 0, 1.0, NULL));
    t_upload = now ();
    qv_offscreen_begin (off, &dw, &dh);
    {
      g_autofree float *p = g_new (float, 3 * n);
      for (gsize i = 0; i < 3 * n; i++)
        p[i] = (float) input->structure->atoms[i / 3].position[i % 3];
      qv_camera_init (&camera);
      qv_camera_set_viewport (&camera, dw, dh);
      qv_camera_fit (&camera, p, n, 1.0f);
    }
    qv_renderer_draw (r, &camera);
    glReadPixels (0, 0, 1, 1, GL_RGBA, GL_UNSIGNED_BYTE, pixel);  /* waits for the frame */
    t_draw = now ();
    printf ("renderer: %s\n", qv_offscreen_renderer_name (off));
    printf ("first frame of the demo (%zu atoms, %d×%d, default options, %d× MSAA framebuffer): %.1f ms "
            "(context %.1f, shaders %.1f, upload %.1f, draw %.1f)\n",
            n, w, h, samples, 1e3 * (t_draw - t0), 1e3 * (t_ctx - t0),
            1e3 * (t_shaders - t_ctx), 1e3 * (t_upload - t_shaders), 1e3 * (t_draw - t_upload));
    fflush (stdout);
  }

  printf ("LP_NUM_THREADS=%s, targets: >= 60 fps at 1000 atoms, >= 30 fps at 10000\n",
          g_getenv ("LP_NUM_THREADS") ? g_getenv ("LP_NUM_THREADS") : "(default)");
  opt_samples = samples;
  if (samples > 0)
    aa_first = aa_last = AA_EDGES;   /* the framebuffer's samples decide */
  for (int a = aa_first; a <= aa_last; a++)
    {
      if (atoms > 0)
        run_fps (off, r, (gsize) atoms, (BenchAA) a, frames, w, h);
      else
        {
          run_fps (off, r, 1000, (BenchAA) a, frames, w, h);
          run_fps (off, r, 10000, (BenchAA) a, frames, w, h);
        }
    }
  qv_renderer_free (r);
  qv_offscreen_free (off);
  return 0;
}
