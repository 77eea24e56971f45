#version 330 core
// line.vert — cell edges.
// SPDX-License-Identifier: GPL-3.0-or-later

layout(location = 0) in vec3 a_position;

void main ()
{
  gl_Position = u_proj * (u_view * vec4 (a_position, 1.0));
}
