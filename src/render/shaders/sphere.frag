#version 330 core
// sphere.frag — ray–sphere intersection with the true depth, and an
// antialiased silhouette through alpha-to-coverage.
// SPDX-License-Identifier: GPL-3.0-or-later

in vec3 v_pos;
flat in vec3 v_centre;
flat in float v_radius;
flat in vec3 v_colour;
flat in int v_atom;
out vec4 frag_colour;

void main ()
{
  vec3 o = u_ortho > 0.5 ? vec3 (v_pos.xy, 0.0) : vec3 (0.0);
  vec3 d = u_ortho > 0.5 ? vec3 (0.0, 0.0, -1.0) : normalize (v_pos);
  vec3 oc = o - v_centre;
  float b = dot (oc, d);
  float q = length (oc - b * d);          // closest approach to the centre
  float alpha = clamp ((v_radius - q) / max (fwidth (q), 1e-6) + 0.5, 0.0, 1.0);

  if (alpha <= 0.0)
    discard;
  float h = sqrt (max (v_radius * v_radius - q * q, 0.0));
  vec3 p = o + (-b - h) * d;
  vec3 n = normalize (p - v_centre);
  vec3 c = qv_shade (v_colour, p, n);
  if (v_atom == u_highlight)
    {
      // A rim of the accent colour around the selected atom.
      vec3 v = u_ortho > 0.5 ? vec3 (0.0, 0.0, 1.0) : normalize (-p);
      float rim = smoothstep (0.45, 0.8, 1.0 - dot (n, v));
      c = mix (c, u_accent.rgb, rim * 0.9);
    }
  frag_colour = vec4 (c, alpha);
  gl_FragDepth = qv_depth (p);
}
