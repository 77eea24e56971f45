#version 330 core
// arrow.frag — arrows in the accent colour: the ray against the shaft (a
// cylinder), the head (a cone) and the head's underside (an annulus); the
// edge's coverage estimated from the ray's distance to the arrow's profile
// where it passes closest to the axis (see u_aa).
// SPDX-License-Identifier: GPL-3.0-or-later

flat in vec3 v_base;
flat in vec4 v_axis;
flat in vec4 v_shape;
flat in float v_inv_px;
flat in vec3 v_albedo;
flat in vec3 v_haze;
flat in vec4 v_half;
out vec4 frag_colour;

void main ()
{
  vec3 o, d;
  qv_view_ray (o, d);
  vec3 ax = v_axis.xyz;
  float len = v_axis.w, sl = v_shape.x, rs = v_shape.y, rh = v_shape.z;
  float k = rh / max (v_shape.w, 1e-6);          // cone: radius = k (len − s)
  vec3 oc = o - v_base;
  float da = dot (d, ax), oa = dot (oc, ax);
  vec3 dp = d - da * ax, op = oc - oa * ax;       // perpendicular to the axis
  float qa = max (dot (dp, dp), 1e-8), qb = dot (dp, op), oo = dot (op, op);

  // Coverage: the profile's radius minus the ray's distance at the axis
  // point it passes closest to; looking down the axis, the head's disc.
  float sc = clamp (oa - qb / qa * da, 0.0, len);
  vec3 x = sc * ax - oc;                          // that axis point, from o
  float tx = dot (x, d);
  float dist = sqrt (max (dot (x, x) - tx * tx, 0.0));
  float sd = (sc <= sl ? rs : k * (len - sc)) - dist;
  if (abs (da) > 1e-4)
    {
      float rho = length (op + (sl - oa) / da * dp);
      if (rho < rh)
        sd = max (sd, (rh - rho) * abs (da));
    }
  float alpha = clamp (sd * v_inv_px + 0.5, 0.0, 1.0);
  if (alpha <= 0.0 || (u_aa == QV_AA_FRINGE && alpha >= 0.999))
    discard;

  float best = 1e30;
  vec3 n = vec3 (0.0);
  // Shaft: the side's near hit within [0, sl].
  float disc = qb * qb - qa * (oo - rs * rs);
  if (disc >= 0.0)
    {
      float t = (-qb - sqrt (disc)) / qa, s = oa + t * da;
      if (t > 0.0 && s >= 0.0 && s <= sl)
        {
          best = t;
          n = normalize (op + t * dp);
        }
    }
  // Head: |op + t dp|² = k² (len − oa − t da)², within [sl, len].
  {
    float h = len - oa;
    float A = qa - k * k * da * da, B = qb + k * k * h * da, C = oo - k * k * h * h;
    float dc = B * B - A * C;
    if (dc >= 0.0 && abs (A) > 1e-8)
      {
        float sq = sqrt (dc);
        float t1 = (-B - sq) / A, t2 = (-B + sq) / A;
        float s1 = oa + t1 * da, s2 = oa + t2 * da;
        bool ok1 = t1 > 0.0 && s1 >= sl && s1 <= len && t1 < best;
        bool ok2 = t2 > 0.0 && s2 >= sl && s2 <= len && t2 < best && (!ok1 || t2 < t1);
        float t = ok2 ? t2 : t1;
        if (ok1 || ok2)
          {
            vec3 radial = normalize (op + t * dp);
            best = t;
            n = normalize (radial * v_shape.w + ax * rh);
          }
      }
  }
  // The head's underside, seen from behind.
  if (da > 1e-6)
    {
      float t = (sl - oa) / da;
      vec3 rel = op + t * dp;
      float r2 = dot (rel, rel);
      if (t > 0.0 && t < best && r2 >= rs * rs && r2 <= rh * rh)
        {
          best = t;
          n = -ax;
        }
    }

  vec3 p;
  if (best < 1e29)
    {
      alpha = max (alpha, 0.5);
      p = o + best * d;
    }
  else
    {
      // Past the silhouette: shade the point nearest the ray, facing it.
      alpha = min (alpha, 0.49);
      p = o + tx * d;
      vec3 radial = x - tx * d;
      n = normalize (-radial - dot (-radial, ax) * ax + vec3 (1e-6));
    }
  if (!qv_aa_keep (alpha))
    discard;
  frag_colour = vec4 (qv_shade_fast (v_albedo, v_haze, v_half, n), qv_aa_alpha (alpha));
#ifndef QV_FRINGE
  gl_FragDepth = qv_depth (p);
#endif
}
