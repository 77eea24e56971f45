#version 330 core
// arrow.vert — one displacement arrow per instance: a small mesh (shaft,
// cone, base disc) placed at the atom's animated position, pointing along
// its displacement, length u_arrow_scale × |displacement|, starting at the
// sphere's surface.
// SPDX-License-Identifier: GPL-3.0-or-later

layout(location = 0) in vec4 a_vertex;   // cos θ, sin θ, part, 0
layout(location = 1) in uint a_atom;

out vec3 v_pos;
out vec3 v_normal;

const float SHAFT = 0.055;      // Å, shaft radius
const float HEAD = 0.14;        // Å, head radius
const float HEAD_LENGTH = 0.34; // Å, at most

void main ()
{
  int i = int (a_atom);
  vec3 centre = qv_atom_position (i);
  vec3 field = texelFetch (u_atoms, 3 * i + 1).xyz;
  float amp = length (field);
  vec3 dir = field / max (amp, 1e-12);
  float len = u_arrow_scale * amp;
  // Short arrows keep their shape: the head takes at most 45 % and shrinks
  // with the whole arrow.
  float head_len = min (HEAD_LENGTH, 0.45 * len);
  float k = head_len / HEAD_LENGTH;
  float shaft_r = SHAFT * max (k, 0.5), head_r = HEAD * max (k, 0.5);
  vec3 e1 = normalize (abs (dir.z) < 0.9 ? cross (dir, vec3 (0.0, 0.0, 1.0))
                                         : cross (dir, vec3 (1.0, 0.0, 0.0)));
  vec3 e2 = cross (dir, e1);
  vec3 ring = a_vertex.x * e1 + a_vertex.y * e2;
  vec3 base = centre + dir * (0.85 * qv_atom_radius (i));
  float shaft_len = len - head_len;
  int part = int (a_vertex.z + 0.5);
  vec3 p, n;

  if (part == 0)        // shaft, bottom ring
    { p = base + ring * shaft_r; n = ring; }
  else if (part == 1)   // shaft, top ring
    { p = base + dir * shaft_len + ring * shaft_r; n = ring; }
  else if (part == 2)   // underside of the head
    { p = base + dir * shaft_len + ring * head_r; n = -dir; }
  else if (part == 3)   // centre of the underside
    { p = base + dir * shaft_len; n = -dir; }
  else                  // cone: ring (4) and tip (5)
    {
      p = base + dir * (part == 5 ? len : shaft_len) + (part == 5 ? vec3 (0.0) : ring * head_r);
      n = normalize (ring * head_len + dir * head_r);
    }
  vec4 vp = u_view * vec4 (p, 1.0);
  v_pos = vp.xyz;
  v_normal = mat3 (u_view) * n;
  gl_Position = u_proj * vp;
}
