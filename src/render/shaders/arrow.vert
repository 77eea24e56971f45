#version 330 core
// arrow.vert — displacement arrows as ray-cast impostors, four indexed
// vertices each (see sphere.vert): a quad in front of the arrow covering
// it, placed at the atom's animated position, pointing along its
// displacement, length u_arrow_scale × |displacement|, starting just inside
// the sphere's surface. arrow.frag intersects the shaft and the head.
// SPDX-License-Identifier: GPL-3.0-or-later

// The atom of each arrow.
uniform usamplerBuffer u_arrows;

flat out vec3 v_base;        // view space: the shaft's start
flat out vec4 v_axis;        // unit direction, length
flat out vec4 v_shape;       // shaft length, shaft radius, head radius, head length
flat out float v_inv_px;
flat out vec3 v_albedo;
flat out vec3 v_haze;
flat out vec4 v_half;

const float SHAFT = 0.055;      // Å, shaft radius
const float HEAD = 0.14;        // Å, head radius
const float HEAD_LENGTH = 0.34; // Å, at most

// As in cylinder.vert: the radius of the circle covering sphere (c, r)
// seen from the eye, in the plane z = zq.
float cover_radius (vec3 c, float r, float zq)
{
  if (u_ortho > 0.5)
    return r;
  float d2 = dot (c, c);
  float s = r * sqrt (d2 / max (d2 - r * r, 1e-6));
  return s * sqrt (d2) / max (-c.z, 1e-4) * (zq / min (c.z, -1e-4));
}

void main ()
{
  int i = int (texelFetch (u_arrows, qv_listed (gl_VertexID >> 2)).r);
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
  vec3 base = centre + dir * (0.85 * qv_atom_radius (i));
  vec3 a = (u_view * vec4 (base, 1.0)).xyz;
  vec3 ax = mat3 (u_view) * dir;
  vec3 b = a + ax * len;
  float zq = max (a.z, b.z) + head_r;
  vec2 pa = a.xy, pb = b.xy;
  float margin = qv_pixel_size (zq) * qv_aa_margin ();
  float w;
  vec2 u, n, corner, p;

  if (u_ortho < 0.5)
    {
      zq = min (zq, -1e-3);
      pa = a.xy * (zq / min (a.z, -1e-4));
      pb = b.xy * (zq / min (b.z, -1e-4));
    }
  w = max (cover_radius (a, head_r, zq), cover_radius (b, head_r, zq)) + margin;
  u = pb - pa;
  u = dot (u, u) > 1e-12 ? normalize (u) : vec2 (1.0, 0.0);
  n = vec2 (-u.y, u.x);
  corner = qv_quad_corner4 (gl_VertexID);
  p = (corner.y < 0.0 ? pa - u * w : pb + u * w) + n * (corner.x * w);
  vec3 v_pos = vec3 (p, zq);
  v_base = a;
  v_axis = vec4 (ax, len);
  v_shape = vec4 (len - head_len, shaft_r, head_r, head_len);
  v_inv_px = 1.0 / qv_pixel_at (length (0.5 * (a + b)));
  qv_shade_setup (u_accent.rgb, 0.5 * (a + b), v_albedo, v_haze, v_half);
  gl_Position = u_proj * vec4 (v_pos, 1.0);
#ifdef QV_FRINGE
  // The fringe pass tests the quad's own depth before shading (no
  // gl_FragDepth): make it the axis's, from one end to the other.
  {
    vec4 e = u_proj * vec4 (corner.y < 0.0 ? a : b, 1.0);
    gl_Position.z = e.z / e.w * gl_Position.w;
  }
#endif
}
