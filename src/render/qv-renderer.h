/* qv-renderer.h — draws a structure and one animated mode with OpenGL 3.3
 * core into whatever framebuffer is bound (a GtkGLArea's, or the offscreen
 * backend's). All functions need the renderer's GL context current.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-camera.h"
#include "qv-structure.h"
#include "qv-style.h"

G_BEGIN_DECLS

#define QV_RENDER_ERROR (qv_render_error_quark ())
typedef enum {
  QV_RENDER_ERROR_SHADER,     /* a shader did not compile or link */
  QV_RENDER_ERROR_CONTEXT,    /* no EGL, no platform, no GL 3.3 core */
  QV_RENDER_ERROR_FRAMEBUFFER,
} QvRenderErrorCode;
GQuark qv_render_error_quark (void);

typedef struct _QvRenderer QvRenderer;

typedef enum {
  QV_COLOUR_ELEMENT,
  QV_COLOUR_PARTICIPATION,
} QvAtomColouring;

/* How silhouettes are antialiased when the framebuffer has one sample per
 * pixel (a multisampled one always uses its samples, alpha-to-coverage). */
typedef enum {
  QV_ANTIALIAS_EDGES,   /* analytic: each edge's coverage blended, two passes
                         * (~1.7× the CPU time of NONE on llvmpipe) */
  QV_ANTIALIAS_NONE,    /* hard edges (default: the fastest, as before) */
} QvAntialias;

typedef struct {
  gboolean bonds;
  gboolean arrows;
  gboolean cell;
  gboolean labels;
  QvAtomColouring colouring;
  QvBackground background;
  float atom_scale;        /* × the style radius, default 1 */
  float arrow_scale;       /* arrow length in Å per Å of displacement amplitude */
  float arrow_threshold;   /* Å: displacements below this draw no arrow */
  /* Added by the renderer (fields only, the functions are unchanged): */
  gboolean depth_cue;      /* fade far atoms toward the background */
  float bond_radius;       /* Å, default 0.13 */
  /* Added for speed on llvmpipe (defaults: the fast interactive look): */
  QvAntialias antialias;   /* default QV_ANTIALIAS_NONE */
  int samples;             /* 0 (default): draw into the bound framebuffer;
                            * 2 or 4: into the renderer's own multisampled
                            * one, resolved into the bound framebuffer at the
                            * end of qv_renderer_draw — for still pictures in
                            * a window (4–5× slower on llvmpipe) */
  gboolean occlusion_cull; /* TRUE: per frame, skip the atoms, bonds and
                            * arrows certainly hidden behind atoms (found on
                            * the CPU, conservative: the picture is the
                            * same). Default FALSE: with the style's ball
                            * and stick radii almost every atom shows
                            * somewhere, so it costs more than it saves
                            * (docs/performance.md); a win with larger
                            * atom_scale */
  /* Added for still pictures (`quaver picture`; defaults: off): */
  gboolean transparent;    /* clear to alpha 0 and write coverage to alpha:
                            * the framebuffer then holds premultiplied
                            * colour, which qv_offscreen_read turns into
                            * straight alpha for a PNG. The background's
                            * colour still tints labels' halos and depth
                            * cueing. Default FALSE (opaque background) */
  float ghost_alpha;       /* > 0: the atoms and bonds drawn a second time
                            * at ghost_phase, this opaque (0..1), over the
                            * structure at the renderer's phase: where the
                            * ghost is in front it is blended once (its
                            * nearest surface), where behind it stays
                            * hidden. No arrows, labels or highlight.
                            * Default 0 (off) */
  float ghost_phase;       /* radians, default 0 (the + extreme) */
} QvRenderOptions;

void qv_render_options_init (QvRenderOptions *options);

/* Compiles the shaders (GResource) in the current context; errors name the
 * shader file and the compiler's line (QV_RENDER_ERROR). */
QvRenderer *qv_renderer_new (GError **error);
/* Frees GL objects: the context must be current. */
void qv_renderer_free (QvRenderer *renderer);

/* Uploads rest positions, elements, bonds (perceived from covalent radii)
 * and the cell edges; clears the mode. */
void qv_renderer_set_structure (QvRenderer *renderer, const QvStructure *structure);
/* The displacement field of one mode, uploaded once: per atom
 * r(φ) = r₀ + amplitude·(re·cos φ − im·sin φ); @re and @im are 3N Cartesian
 * Å per unit amplitude; @im may be NULL (a real mode). NULL @re clears. */
void qv_renderer_set_mode (QvRenderer *renderer, const float *re, const float *im,
                           float amplitude);
/* Per-atom participation in [0, 1] for participation colouring (n_atoms);
 * scaled by its largest value for the ramp; NULL clears. */
void qv_renderer_set_participation (QvRenderer *renderer, const float *participation);
/* Animation phase φ in radians: one uniform per frame (with
 * options.occlusion_cull also the small list of what is drawn). */
void qv_renderer_set_phase (QvRenderer *renderer, float phase);
void qv_renderer_set_options (QvRenderer *renderer, const QvRenderOptions *options);
const QvRenderOptions *qv_renderer_get_options (const QvRenderer *renderer);
/* Atom drawn highlighted (selection), −1 for none. */
void qv_renderer_set_highlight (QvRenderer *renderer, gssize atom);

/* Draws a full frame into the bound framebuffer (viewport from @camera:
 * camera->width × camera->height pixels, so with the offscreen backend give
 * the camera the draw size that qv_offscreen_begin returns). */
void qv_renderer_draw (QvRenderer *renderer, const QvCamera *camera);

/* Positions (3N floats, Å) at the current phase, and the drawn radii
 * (N floats, Å): what qv_camera_pick needs to pick what is on screen. */
const float *qv_renderer_positions (QvRenderer *renderer);
const float *qv_renderer_radii (const QvRenderer *renderer);
gsize qv_renderer_n_atoms (const QvRenderer *renderer);
/* Added by the renderer: number of bonds drawn (perceived by qv-bonds.h). */
gsize qv_renderer_n_bonds (const QvRenderer *renderer);
/* Added for occlusion culling: how many atoms, bonds and arrows the last
 * qv_renderer_draw sent to the GL (after culling; all of them without). */
void qv_renderer_drawn_counts (const QvRenderer *renderer, gsize counts[3]);

G_END_DECLS
