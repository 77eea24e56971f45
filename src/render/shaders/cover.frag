#version 330 core
// cover.frag — alpha 1 for every sample something was drawn on: with a
// transparent background and multisampling, alpha-to-coverage leaves each
// covered sample the fragment's coverage estimate in alpha; drawn with the
// depth test GREATER (stored depth < 1: covered) and only alpha written,
// this makes the samples opaque, so the resolve gives premultiplied
// colour (qv-renderer.c).
// SPDX-License-Identifier: GPL-3.0-or-later

out vec4 frag_colour;

void main ()
{
  frag_colour = vec4 (0.0, 0.0, 0.0, 1.0);
}
