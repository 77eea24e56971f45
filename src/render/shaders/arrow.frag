#version 330 core
// arrow.frag — arrows in the accent colour.
// SPDX-License-Identifier: GPL-3.0-or-later

in vec3 v_pos;
in vec3 v_normal;
out vec4 frag_colour;

void main ()
{
  frag_colour = vec4 (qv_shade (u_accent.rgb, v_pos, normalize (v_normal)), 1.0);
}
