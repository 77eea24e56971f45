#version 330 core
// sphere.vert — one atom per four indexed vertices (not instanced:
// llvmpipe runs its vertex pipeline once per instance; the index pattern
// lets its vertex cache shade each corner once): a view-space quad that
// just covers the sphere's silhouette (the tangent cone's circle in the
// plane through the centre, perpendicular to the line of sight), ray-cast
// in sphere.frag. Everything constant over the sphere goes out flat. The
// quad's own depth is about the silhouette's: the fringe pass (QV_FRINGE,
// no gl_FragDepth) is depth-tested with it before shading.
// SPDX-License-Identifier: GPL-3.0-or-later

flat out vec4 v_sphere;     // view-space centre, radius
flat out float v_inv_px;    // pixels per view unit at the sphere
flat out float v_rim;       // 1 for the highlighted atom
flat out vec3 v_albedo;
flat out vec3 v_haze;
flat out vec4 v_half;

void main ()
{
  int i = qv_listed (gl_VertexID >> 2);
  vec3 c = (u_view * vec4 (qv_atom_position (i), 1.0)).xyz;
  float r = qv_atom_radius (i);
  vec2 corner = qv_quad_corner4 (gl_VertexID);
  float px = qv_pixel_at (length (c));
  float margin = px * qv_aa_margin ();
  vec3 pos;

  if (u_ortho > 0.5)
    pos = vec3 (c.xy + corner * (r + margin), c.z);
  else
    {
      float d2 = dot (c, c);
      vec3 w = c * inversesqrt (d2);
      vec3 e1 = normalize (abs (w.y) < 0.99 ? cross (w, vec3 (0.0, 1.0, 0.0))
                                             : cross (w, vec3 (1.0, 0.0, 0.0)));
      vec3 e2 = cross (e1, w);
      float s = d2 > r * r * 1.0001 ? r * sqrt (d2 / (d2 - r * r)) : 0.0;
      pos = c + (corner.x * e1 + corner.y * e2) * (s + margin);
    }
  v_sphere = vec4 (c, r);
  v_inv_px = 1.0 / px;
  v_rim = i == u_highlight ? 1.0 : 0.0;
  qv_shade_setup (qv_atom_colour (i), c, v_albedo, v_haze, v_half);
  gl_Position = u_proj * vec4 (pos, 1.0);
}
