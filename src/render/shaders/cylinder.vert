#version 330 core
// cylinder.vert — one bond per four indexed vertices (see sphere.vert): a
// quad in the view-space plane in front of the bond, ray-cast in
// cylinder.frag. Only the part outside both atoms' spheres is drawn (what
// is inside a sphere is hidden from everywhere): the quad covers that
// part's end circles. The two atoms are read from the atom buffer, so
// bonds follow the animation.
// SPDX-License-Identifier: GPL-3.0-or-later

// The two atoms of each bond.
uniform usamplerBuffer u_bonds;

flat out vec3 v_a;
flat out vec4 v_axis;        // unit direction a → b, length
flat out vec2 v_span;        // the drawn part along the axis, from a
flat out float v_inv_px;     // pixels per view unit at the bond's middle
flat out vec3 v_albedo_a;
flat out vec3 v_albedo_b;
flat out vec3 v_haze;
flat out vec4 v_half;

// The radius of the circle that covers sphere (c, r) seen from the eye,
// measured in the plane z = zq.
float cover_radius (vec3 c, float r, float zq)
{
  if (u_ortho > 0.5)
    return r;
  float d2 = dot (c, c);
  float s = r * sqrt (d2 / max (d2 - r * r, 1e-6));
  // Oblique lines of sight stretch it by up to |c|/|c.z|.
  return s * sqrt (d2) / max (-c.z, 1e-4) * (zq / min (c.z, -1e-4));
}

void main ()
{
  uvec2 bond = texelFetch (u_bonds, qv_listed (gl_VertexID >> 2)).xy;
  int ia = int (bond.x), ib = int (bond.y);
  vec3 a0 = (u_view * vec4 (qv_atom_position (ia), 1.0)).xyz;
  vec3 b0 = (u_view * vec4 (qv_atom_position (ib), 1.0)).xyz;
  vec3 mid = 0.5 * (a0 + b0);
  float r = u_bond_radius;
  float len = length (b0 - a0);
  vec3 ax = (b0 - a0) / max (len, 1e-6);
  // The side leaves sphere (c, R) where s² + r² = R².
  float ra0 = qv_atom_radius (ia), rb0 = qv_atom_radius (ib);
  float s0 = sqrt (max (ra0 * ra0 - r * r, 0.0));
  float s1 = len - sqrt (max (rb0 * rb0 - r * r, 0.0));
  if (s1 < s0)
    s0 = s1 = 0.5 * len;   // the spheres overlap past the bond: nothing shows
  vec3 a = a0 + ax * s0, b = a0 + ax * s1;
  float zq = max (a.z, b.z) + r;
  vec2 pa = a.xy, pb = b.xy;
  float margin = qv_pixel_size (zq) * qv_aa_margin ();
  float ra, rb, w;
  vec2 u, n, corner, p;
  vec3 unused;

  if (u_ortho < 0.5)
    {
      // Keep the plane in front of the eye; project the ends onto it.
      zq = min (zq, -1e-3);
      pa = a.xy * (zq / min (a.z, -1e-4));
      pb = b.xy * (zq / min (b.z, -1e-4));
    }
  ra = cover_radius (a, r, zq);
  rb = cover_radius (b, r, zq);
  w = max (ra, rb) + margin;
  u = pb - pa;
  u = dot (u, u) > 1e-12 ? normalize (u) : vec2 (1.0, 0.0);
  n = vec2 (-u.y, u.x);
  corner = qv_quad_corner4 (gl_VertexID);
  p = (corner.y < 0.0 ? pa - u * w : pb + u * w) + n * (corner.x * w);
  vec3 v_pos = vec3 (p, zq);
  v_a = a0;
  v_axis = vec4 (ax, len);
  v_span = vec2 (s0, s1);
  v_inv_px = 1.0 / qv_pixel_at (length (mid));
  qv_shade_setup (qv_atom_colour (ia), mid, v_albedo_a, v_haze, v_half);
  qv_shade_setup (qv_atom_colour (ib), mid, v_albedo_b, unused, v_half);
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
