/* qv-svg-figure.h — a vector figure of the renderer's view for papers: the
 * same camera, styles and options as the GL renderer, written as an SVG 1.1
 * document by hand (no GL, no GTK, no cairo), editable: every atom is one
 * <circle class="atom" id="atom-K"> (K 1-based, as the labels count),
 * every half bond one shape coloured by its atom, all in one group drawn
 * far to near (painter's algorithm), so occlusion comes out right and an
 * atom can be recoloured or moved in an editor. Sizes are in pixels of
 * camera->width × camera->height, the PNG's size.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-camera.h"
#include "qv-renderer.h"
#include "qv-structure.h"

G_BEGIN_DECLS

/* What to draw. Every array holds one entry (3 floats or 1) per atom of
 * @structure. */
typedef struct {
  const QvStructure *structure;   /* elements and cell; bonds are perceived
                                   * from its positions (qv_bonds_perceive,
                                   * QV_BONDS_DEFAULT_TOLERANCE) as the GL
                                   * renderer does */
  const float *positions;         /* 3N Å where the atoms are drawn (the
                                   * displaced positions of the phase shown);
                                   * NULL: the structure's own */
  const float *arrows;            /* 3N Å or NULL: per atom the displacement
                                   * an arrow shows (the renderer's mode field
                                   * × amplitude): options->arrow_scale × its
                                   * length long, none below
                                   * options->arrow_threshold */
  const float *ghost_positions;   /* 3N Å or NULL: atoms and bonds drawn
                                   * again there, options->ghost_alpha opaque
                                   * (when > 0), sorted in with the rest */
  const float *participation;     /* N or NULL: for QV_COLOUR_PARTICIPATION
                                   * (scaled by its largest value) */
} QvSvgFigure;

/* The SVG document (newly allocated, NUL-terminated, *@length bytes
 * without the NUL) of @figure seen by @camera (qv_camera_project's
 * projection; its viewport is the document's size) with @options: bonds,
 * arrows, cell, labels, colouring, background (a rectangle of its colour
 * unless options->transparent), depth_cue, atom_scale, bond_radius,
 * arrow_scale, arrow_threshold, ghost_alpha. Atoms behind the eye or wholly
 * outside the picture are left out. Fails with QV_ERROR_INPUT when the
 * viewport is empty or a position is not finite (naming the atom).
 *
 * Writing it is the caller's business (src/io/qv-output.h: atomic, no
 * silent overwrite); src/render does not depend on src/io. */
char *qv_svg_figure_render (const QvSvgFigure *figure, const QvCamera *camera,
                            const QvRenderOptions *options, gsize *length,
                            GError **error);

G_END_DECLS
