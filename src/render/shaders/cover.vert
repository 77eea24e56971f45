#version 330 core
// cover.vert — one triangle over the whole viewport on the far plane (clip
// z = w, window depth 1), for cover.frag.
// SPDX-License-Identifier: GPL-3.0-or-later

void main ()
{
  vec2 p = vec2 (float ((gl_VertexID & 1) << 2), float ((gl_VertexID & 2) << 1)) - 1.0;
  gl_Position = vec4 (p, 1.0, 1.0);
}
