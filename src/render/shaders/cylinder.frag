#version 330 core
// cylinder.frag — ray–cylinder intersection with flat caps, true depth,
// coloured by the nearer atom (split at the midpoint), antialiased sides.
// SPDX-License-Identifier: GPL-3.0-or-later

in vec3 v_pos;
flat in vec3 v_a;
flat in vec3 v_b;
flat in vec3 v_colour_a;
flat in vec3 v_colour_b;
out vec4 frag_colour;

void main ()
{
  vec3 o = u_ortho > 0.5 ? vec3 (v_pos.xy, 0.0) : vec3 (0.0);
  vec3 d = u_ortho > 0.5 ? vec3 (0.0, 0.0, -1.0) : normalize (v_pos);
  float r = u_bond_radius;
  vec3 axis = v_b - v_a;
  float len = length (axis);
  vec3 ax = axis / len;
  vec3 oc = o - v_a;
  float da = dot (d, ax), oa = dot (oc, ax);
  vec3 dp = d - da * ax, op = oc - oa * ax;   // perpendicular to the axis
  float qa = max (dot (dp, dp), 1e-8);
  float qb = dot (dp, op);
  float q2 = max (dot (op, op) - qb * qb / qa, 0.0);
  float q = sqrt (q2);                         // ray-to-axis distance
  float alpha = clamp ((r - q) / max (fwidth (q), 1e-6) + 0.5, 0.0, 1.0);
  float t, s;
  vec3 p, n;

  if (alpha <= 0.0)
    discard;
  t = (-qb - sqrt (max (qb * qb - qa * (dot (op, op) - r * r), 0.0))) / qa;
  s = oa + t * da;
  if (s >= 0.0 && s <= len)
    {
      p = o + t * d;
      n = normalize (op + t * dp);
    }
  else
    {
      // The side is hit outside the bond: try the cap it passed.
      float sc = s < 0.0 ? 0.0 : len;
      if (abs (da) < 1e-6)
        discard;
      t = (sc - oa) / da;
      p = o + t * d;
      vec3 rel = p - v_a - sc * ax;
      if (dot (rel, rel) > r * r)
        discard;
      n = s < 0.0 ? -ax : ax;
      s = sc;
      alpha = 1.0;
    }
  frag_colour = vec4 (qv_shade (s < 0.5 * len ? v_colour_a : v_colour_b, p, n), alpha);
  gl_FragDepth = qv_depth (p);
}
