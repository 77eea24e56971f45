#version 330 core
// arrow.vert — displacement arrows: a small mesh (shaft, cone, base disc)
// of MESH vertices per arrow, indexed (not instanced, see sphere.vert),
// vertex v of arrow a being a·MESH + v, placed at the atom's animated position, pointing along
// its displacement, length u_arrow_scale × |displacement|, starting at the
// sphere's surface.
// SPDX-License-Identifier: GPL-3.0-or-later

// The atom of each arrow.
uniform usamplerBuffer u_arrows;

// Must match ARROW_SEGMENTS in qv-renderer.c.
const int SEGMENTS = 10;
const int MESH = 5 * SEGMENTS + 1;

out vec3 v_pos;
out vec3 v_normal;

const float SHAFT = 0.055;      // Å, shaft radius
const float HEAD = 0.14;        // Å, head radius
const float HEAD_LENGTH = 0.34; // Å, at most

void main ()
{
  int v = gl_VertexID % MESH;
  int i = int (texelFetch (u_arrows, gl_VertexID / MESH).r);
  // Rings 0–2 (shaft bottom, shaft top, head underside), the underside's
  // centre, the cone's ring, then the tips between ring vertices.
  int part = v < 3 * SEGMENTS ? v / SEGMENTS
           : v == 3 * SEGMENTS ? 3 : v < 4 * SEGMENTS + 1 ? 4 : 5;
  int k = v < 3 * SEGMENTS ? v % SEGMENTS : v - (part == 4 ? 3 * SEGMENTS + 1 : 4 * SEGMENTS + 1);
  float angle = 6.28318530718 * (float (k) + (part == 5 ? 0.5 : 0.0)) / float (SEGMENTS);
  vec2 cs = part == 3 ? vec2 (0.0) : vec2 (cos (angle), sin (angle));
  vec3 centre = qv_atom_position (i);
  vec3 field = texelFetch (u_atoms, 3 * i + 1).xyz;
  float amp = length (field);
  vec3 dir = field / max (amp, 1e-12);
  float len = u_arrow_scale * amp;
  // Short arrows keep their shape: the head takes at most 45 % and shrinks
  // with the whole arrow.
  float head_len = min (HEAD_LENGTH, 0.45 * len);
  float shrink = head_len / HEAD_LENGTH;
  float shaft_r = SHAFT * max (shrink, 0.5), head_r = HEAD * max (shrink, 0.5);
  vec3 e1 = normalize (abs (dir.z) < 0.9 ? cross (dir, vec3 (0.0, 0.0, 1.0))
                                         : cross (dir, vec3 (1.0, 0.0, 0.0)));
  vec3 e2 = cross (dir, e1);
  vec3 ring = cs.x * e1 + cs.y * e2;
  vec3 base = centre + dir * (0.85 * qv_atom_radius (i));
  float shaft_len = len - head_len;
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
