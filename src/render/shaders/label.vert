#version 330 core
// label.vert — one glyph per six vertices, a screen-aligned quad in front of
// its atom (at the sphere's nearest point), sized in pixels.
// SPDX-License-Identifier: GPL-3.0-or-later

layout(location = 0) in uint a_atom;
layout(location = 1) in vec4 a_uv;       // glyph rectangle in the atlas
layout(location = 2) in vec2 a_offset;   // x of the glyph's left edge and its
                                         // width, in label heights, from the
                                         // label's centre

out vec2 v_uv;

void main ()
{
  int i = int (a_atom);
  vec3 c = (u_view * vec4 (qv_atom_position (i), 1.0)).xyz;
  float r = qv_atom_radius (i);
  vec3 front = c + (u_ortho > 0.5 ? vec3 (0.0, 0.0, 1.0) : normalize (-c)) * r;
  vec4 clip = u_proj * vec4 (front, 1.0);
  vec2 corner = qv_quad_corner (gl_VertexID) * 0.5 + 0.5;
  vec2 px = vec2 (a_offset.x + corner.x * a_offset.y, corner.y - 0.5) * u_label_px;

  clip.xy += px * 2.0 * u_viewport.zw * clip.w;
  clip.z -= 1e-3 * clip.w;    // in front of its own sphere
  v_uv = mix (a_uv.xy, a_uv.zw, vec2 (corner.x, 1.0 - corner.y));
  gl_Position = clip;
}
