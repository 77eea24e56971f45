// common.glsl — shared by every Quaver shader (put after the #version line):
// the per-frame block, the atom data and the lighting.
// SPDX-License-Identifier: GPL-3.0-or-later

layout(std140) uniform Frame {
  mat4 u_view;        // world → view
  mat4 u_proj;        // view → clip
  vec4 u_light;       // xyz: unit direction towards the light (view), w: ambient
  vec4 u_bg;          // background, sRGB
  vec4 u_fg;          // cell edges and labels, sRGB
  vec4 u_accent;      // arrows, sRGB
  vec4 u_cue;         // x, y: view distances where depth cueing starts and
                      // ends, z: strength (0 = off)
  vec4 u_viewport;    // width, height, 1/width, 1/height (pixels)
  float u_phase;      // animation phase φ (radians): the per-frame value
  float u_atom_scale;
  float u_bond_radius;
  int u_highlight;    // atom index or −1
  float u_ortho;      // 1 for the orthographic projection
  float u_label_px;   // label height, pixels
  float u_arrow_scale;
  float u_pad0;
};

// Three texels per atom: (rest position, style radius), (Re field, 0),
// (Im field, 0); the field already carries the mode's amplitude.
uniform samplerBuffer u_atoms;
// One RGBA8 texel per atom: its colour (element or participation), sRGB.
uniform samplerBuffer u_colours;

vec3 qv_atom_position (int i)
{
  vec3 rest = texelFetch (u_atoms, 3 * i).xyz;
  vec3 re = texelFetch (u_atoms, 3 * i + 1).xyz;
  vec3 im = texelFetch (u_atoms, 3 * i + 2).xyz;
  return rest + re * cos (u_phase) - im * sin (u_phase);
}

float qv_atom_radius (int i)
{
  return texelFetch (u_atoms, 3 * i).w * u_atom_scale;
}

vec3 qv_atom_colour (int i)
{
  return texelFetch (u_colours, i).rgb;
}

// Corner (±1, ±1) of vertex @v of a quad drawn as two triangles, six
// vertices per quad.
vec2 qv_quad_corner (int v)
{
  const int corners[6] = int[6] (0, 1, 2, 2, 1, 3);
  int c = corners[v % 6];
  return vec2 (float (c & 1), float (c >> 1)) * 2.0 - 1.0;
}

// The size of one pixel in view units at view depth z (< 0).
float qv_pixel_size (float z)
{
  if (u_ortho > 0.5)
    return 2.0 / (u_proj[1][1] * u_viewport.y);
  return 2.0 * max (-z, 1e-4) / (u_proj[1][1] * u_viewport.y);
}

// sRGB ↔ linear with the gamma-2 approximation (square and square root):
// within a few per cent of the exact curve where shading happens, and far
// cheaper than pow() on a software rasteriser.
vec3 qv_to_linear (vec3 c)
{
  return c * c;
}

vec3 qv_to_srgb (vec3 c)
{
  return sqrt (clamp (c, 0.0, 1.0));
}

// Lambert with a softly wrapped terminator, a broad soft highlight and a
// little ambient, in linear light; depth cueing fades towards the
// background. @base and the result are sRGB; @p, @n in view space.
vec3 qv_shade (vec3 base, vec3 p, vec3 n)
{
  vec3 albedo = qv_to_linear (base);
  vec3 v = u_ortho > 0.5 ? vec3 (0.0, 0.0, 1.0) : normalize (-p);
  vec3 l = u_light.xyz;
  float diffuse = max ((dot (n, l) + 0.15) / 1.15, 0.0);
  vec3 h = normalize (l + v);
  // A soft highlight: (n·h)^32 by repeated squaring.
  float nh = max (dot (n, h), 0.0);
  nh *= nh; nh *= nh; nh *= nh; nh *= nh; nh *= nh;
  float spec = nh * 0.22;
  vec3 c = albedo * (u_light.w + (1.0 - u_light.w) * diffuse) + vec3 (spec);
  float f = clamp ((-p.z - u_cue.x) / max (u_cue.y - u_cue.x, 1e-3), 0.0, 1.0) * u_cue.z;
  c = mix (c, u_bg.rgb * u_bg.rgb, f);
  return qv_to_srgb (c);
}

float qv_depth (vec3 p)
{
  vec4 clip = u_proj * vec4 (p, 1.0);
  return clamp (clip.z / clip.w * 0.5 + 0.5, 0.0, 1.0);
}
