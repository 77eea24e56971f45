#version 330 core
// cylinder.frag — ray–cylinder intersection with flat caps, true depth,
// coloured by the nearer atom (split at the midpoint); the sides' coverage
// from the ray's distance to the axis, in pixels (see u_aa).
// SPDX-License-Identifier: GPL-3.0-or-later

flat in vec3 v_a;
flat in vec4 v_axis;
flat in vec2 v_span;
flat in float v_inv_px;
flat in vec3 v_albedo_a;
flat in vec3 v_albedo_b;
flat in vec3 v_haze;
flat in vec4 v_half;
out vec4 frag_colour;

void main ()
{
  vec3 o, d;
  qv_view_ray (o, d);
  float r = u_bond_radius;
  vec3 ax = v_axis.xyz;
  float len = v_axis.w;
  vec3 oc = o - v_a;
  float da = dot (d, ax), oa = dot (oc, ax);
  vec3 dp = d - da * ax, op = oc - oa * ax;   // perpendicular to the axis
  float iqa = 1.0 / max (dot (dp, dp), 1e-8);
  float qb = dot (dp, op), oo = dot (op, op);
  float q2 = max (oo - qb * qb * iqa, 0.0);
  float alpha = clamp ((r - qv_sqrt (q2)) * v_inv_px + 0.5, 0.0, 1.0);
  float t, s;
  vec3 p, n;

  if (alpha <= 0.0 || (u_aa == QV_AA_FRINGE && alpha >= 0.999))
    discard;
  // The side's near hit, or past the silhouette the ray's closest approach.
  t = (-qb - qv_sqrt (max (qb * qb - (oo - r * r) / iqa, 0.0))) * iqa;
  s = oa + t * da;
  if (s >= v_span.x && s <= v_span.y)
    {
      p = o + t * d;
      n = normalize (op + t * dp);
    }
  else
    {
      // The side is hit outside the bond: try the cap it passed.
      float sc = s < v_span.x ? v_span.x : v_span.y;
      if (abs (da) < 1e-6 || u_aa == QV_AA_FRINGE)
        discard;
      t = (sc - oa) / da;
      p = o + t * d;
      vec3 rel = p - v_a - sc * ax;
      if (dot (rel, rel) > r * r)
        discard;
      n = s < v_span.x ? -ax : ax;
      s = sc;
      alpha = 1.0;
    }
  if (!qv_aa_keep (alpha))
    discard;
  frag_colour = vec4 (qv_shade_fast (s < 0.5 * len ? v_albedo_a : v_albedo_b, v_haze, v_half, n),
                      qv_aa_alpha (alpha));
#ifndef QV_FRINGE
  gl_FragDepth = qv_depth (p);
#endif
}
