#version 330 core
// line.frag — cell edges in the foreground colour.
// SPDX-License-Identifier: GPL-3.0-or-later

out vec4 frag_colour;

void main ()
{
  frag_colour = vec4 (u_fg.rgb, 1.0);
}
