#version 330 core
// label.frag — glyph (red channel) over a halo of the background colour
// (green channel) so labels stay readable over any atom.
// SPDX-License-Identifier: GPL-3.0-or-later

in vec2 v_uv;
uniform sampler2D u_atlas;
out vec4 frag_colour;

void main ()
{
  vec2 g = texture (u_atlas, v_uv).rg;
  float alpha = max (g.r, g.g * 0.8);
  if (alpha < 0.02)
    discard;
  frag_colour = vec4 (mix (u_bg.rgb, u_fg.rgb, g.r / max (alpha, 1e-3)), alpha);
}
