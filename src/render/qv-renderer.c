/* qv-renderer.c — impostor spheres and cylinders, arrows, cell, labels
 * (in progress: the skeleton fails to create until the shaders exist).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "qv-renderer.h"
#include "qv-renderer-private.h"

void
qv_render_options_init (QvRenderOptions *options)
{
  *options = (QvRenderOptions) {
    .bonds = TRUE, .arrows = TRUE, .cell = TRUE, .labels = FALSE,
    .colouring = QV_COLOUR_ELEMENT, .background = QV_BACKGROUND_LIGHT,
    .atom_scale = 1.0f, .arrow_scale = 2.0f, .arrow_threshold = 0.01f,
    .depth_cue = TRUE, .bond_radius = 0.14f,
  };
}

QvRenderer *
qv_renderer_new (GError **error)
{
  GLuint p = qv_shader_program_load ("sphere", error);
  if (p == 0)
    return NULL;
  return NULL;
}

void qv_renderer_free (QvRenderer *renderer) {}
void qv_renderer_set_structure (QvRenderer *renderer, const QvStructure *structure) {}
void qv_renderer_set_mode (QvRenderer *renderer, const float *re, const float *im, float amplitude) {}
void qv_renderer_set_participation (QvRenderer *renderer, const float *participation) {}
void qv_renderer_set_phase (QvRenderer *renderer, float phase) {}
void qv_renderer_set_options (QvRenderer *renderer, const QvRenderOptions *options) {}
const QvRenderOptions *qv_renderer_get_options (const QvRenderer *renderer) { return NULL; }
void qv_renderer_set_highlight (QvRenderer *renderer, gssize atom) {}
void qv_renderer_draw (QvRenderer *renderer, const QvCamera *camera) {}
const float *qv_renderer_positions (QvRenderer *renderer) { return NULL; }
const float *qv_renderer_radii (const QvRenderer *renderer) { return NULL; }
gsize qv_renderer_n_atoms (const QvRenderer *renderer) { return 0; }
gsize qv_renderer_n_bonds (const QvRenderer *renderer) { return 0; }
