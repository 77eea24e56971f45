#version 330 core
// cylinder.vert — one bond per six vertices (see sphere.vert): a quad in the view-space plane in
// front of the bond that covers both end spheres' silhouettes, ray-cast in
// cylinder.frag. The two atoms are read from the atom buffer, so bonds
// follow the animation.
// SPDX-License-Identifier: GPL-3.0-or-later

// The two atoms of each bond.
uniform usamplerBuffer u_bonds;

out vec3 v_pos;
flat out vec3 v_a;
flat out vec3 v_b;
flat out vec3 v_colour_a;
flat out vec3 v_colour_b;

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
  uvec2 bond = texelFetch (u_bonds, gl_VertexID / 6).xy;
  int ia = int (bond.x), ib = int (bond.y);
  vec3 a = (u_view * vec4 (qv_atom_position (ia), 1.0)).xyz;
  vec3 b = (u_view * vec4 (qv_atom_position (ib), 1.0)).xyz;
  float r = u_bond_radius;
  float zq = max (a.z, b.z) + r;
  vec2 pa = a.xy, pb = b.xy;
  float margin = 1.5 * qv_pixel_size (zq);
  float ra, rb, w;
  vec2 u, n, corner, p;

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
  corner = qv_quad_corner (gl_VertexID);
  p = (corner.y < 0.0 ? pa - u * w : pb + u * w) + n * (corner.x * w);
  v_pos = vec3 (p, zq);
  v_a = a;
  v_b = b;
  v_colour_a = qv_atom_colour (ia);
  v_colour_b = qv_atom_colour (ib);
  gl_Position = u_proj * vec4 (v_pos, 1.0);
}
