#version 330 core
// sphere.vert — one atom per six vertices (two triangles; llvmpipe runs
// its vertex pipeline once per instance, so plain vertex ranges are much
// faster than instancing there): a view-space quad that just covers
// the sphere's silhouette (the tangent cone's circle in the plane through
// the centre, perpendicular to the line of sight), ray-cast in sphere.frag.
// SPDX-License-Identifier: GPL-3.0-or-later

out vec3 v_pos;
flat out vec3 v_centre;
flat out float v_radius;
flat out vec3 v_colour;
flat out int v_atom;

void main ()
{
  int i = gl_VertexID / 6;
  vec3 c = (u_view * vec4 (qv_atom_position (i), 1.0)).xyz;
  float r = qv_atom_radius (i);
  vec2 corner = qv_quad_corner (gl_VertexID);
  // A pixel and a half of margin for the antialiased edge.
  float margin = 1.5 * qv_pixel_size (c.z + r);
  vec3 pos;

  if (u_ortho > 0.5)
    pos = vec3 (c.xy + corner * (r + margin), c.z + r);
  else
    {
      float d2 = dot (c, c);
      vec3 w = normalize (c);
      vec3 e1 = normalize (abs (w.y) < 0.99 ? cross (w, vec3 (0.0, 1.0, 0.0))
                                             : cross (w, vec3 (1.0, 0.0, 0.0)));
      vec3 e2 = cross (e1, w);
      float s = d2 > r * r * 1.0001 ? r * sqrt (d2 / (d2 - r * r)) : 0.0;
      pos = c + (corner.x * e1 + corner.y * e2) * (s + margin);
    }
  v_pos = pos;
  v_centre = c;
  v_radius = r;
  v_colour = qv_atom_colour (i);
  v_atom = i;
  gl_Position = u_proj * vec4 (pos, 1.0);
}
