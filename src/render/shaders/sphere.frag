#version 330 core
// sphere.frag — ray–sphere intersection with the true depth; the edge's
// coverage from the ray's distance to the centre, in pixels (see u_aa).
// SPDX-License-Identifier: GPL-3.0-or-later

flat in vec4 v_sphere;
flat in float v_inv_px;
flat in float v_rim;
flat in vec3 v_albedo;
flat in vec3 v_haze;
flat in vec4 v_half;
out vec4 frag_colour;

void main ()
{
  vec3 o, d;
  qv_view_ray (o, d);
  vec3 oc = o - v_sphere.xyz;
  float r = v_sphere.w;
  float b = dot (oc, d);
  float q2 = max (dot (oc, oc) - b * b, 0.0);   // closest approach², to the centre
  float alpha = clamp ((r - qv_sqrt (q2)) * v_inv_px + 0.5, 0.0, 1.0);

  if (!qv_aa_keep (alpha))
    discard;
  // Past the silhouette (the fringe) the shading is the tangent point's.
  float h = qv_sqrt (max (r * r - q2, 0.0));
  vec3 p = o + (-b - h) * d;
  vec3 n = (p - v_sphere.xyz) * (1.0 / r);
  vec3 c = qv_shade_fast (v_albedo, v_haze, v_half, n);
  // A rim of the accent colour around the selected atom.
  float rim = smoothstep (0.45, 0.8, 1.0 + dot (n, d));
  c = mix (c, u_accent.rgb, rim * 0.9 * v_rim);
  frag_colour = vec4 (c, qv_aa_alpha (alpha));
#ifndef QV_FRINGE
  gl_FragDepth = qv_depth (p);
#endif
}
