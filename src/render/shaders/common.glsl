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
  float u_cos_phase;  // cos φ and sin φ, computed once per frame
  float u_sin_phase;
  float u_px_scale;   // size of a pixel in view units: × the distance from
                      // the eye in perspective, as it is in orthographic
  float u_pad0;
  float u_pad1;
};

// How impostors treat their edge (qv-renderer.c sets it per draw): the
// coverage estimate alpha (1 inside, 0 a pixel outside the silhouette) is
// QV_AA_COVERAGE: written for alpha-to-coverage (multisampled framebuffer);
// QV_AA_SOLID: a hard edge at alpha 0.5, no blending (no antialiasing);
// QV_AA_INNER: only fully covered pixels, opaque (first pass of the
// analytic antialiasing); QV_AA_FRINGE: only partly covered pixels, blended
// over what the first pass drew, no depth write (its second pass);
// QV_AA_MASKED: every fragment of some coverage, written with alpha 1 to
// the samples an earlier depth-only pass chose (the ghost's colour pass,
// depth test EQUAL, no alpha-to-coverage).
const int QV_AA_COVERAGE = 0;
const int QV_AA_SOLID = 1;
const int QV_AA_INNER = 2;
const int QV_AA_FRINGE = 3;
const int QV_AA_MASKED = 4;
uniform int u_aa;

#ifdef QV_FRAGMENT
// The view-space ray through this fragment's pixel centre, from
// gl_FragCoord (the projections are symmetric, qv-camera.c): no
// perspective-corrected varying to interpolate for it.
void qv_view_ray (out vec3 o, out vec3 d)
{
  vec2 ndc = gl_FragCoord.xy * 2.0 * u_viewport.zw - 1.0;
  vec2 xy = ndc / vec2 (u_proj[0][0], u_proj[1][1]);
  if (u_ortho > 0.5)
    {
      o = vec3 (xy, 0.0);
      d = vec3 (0.0, 0.0, -1.0);
    }
  else
    {
      o = vec3 (0.0);
      d = normalize (vec3 (xy, -1.0));
    }
}
#endif

// How far (in pixels) an impostor's quad must reach past its silhouette
// for this pass: llvmpipe pays for every pixel of every quad.
float qv_aa_margin ()
{
  return u_aa == QV_AA_INNER ? 0.0 : u_aa == QV_AA_SOLID ? 0.25 : 0.75;
}

// Whether a fragment of coverage @alpha belongs to this pass.
bool qv_aa_keep (float alpha)
{
  if (u_aa == QV_AA_SOLID)
    return alpha >= 0.5;
  if (u_aa == QV_AA_INNER)
    return alpha >= 0.999;
  if (u_aa == QV_AA_FRINGE)
    return alpha > 0.0 && alpha < 0.999;
  return alpha > 0.0;
}

// The alpha to write for coverage @alpha: the coverage itself where it
// is blended (QV_AA_FRINGE) or turned into samples (QV_AA_COVERAGE), 1
// where the edge is hard, the pixel fully covered or the samples chosen
// already (QV_AA_MASKED). Only a transparent background
// (QvRenderOptions.transparent) keeps what is written to alpha.
float qv_aa_alpha (float alpha)
{
  return u_aa == QV_AA_COVERAGE || u_aa == QV_AA_FRINGE ? alpha : 1.0;
}

// Three texels per atom: (rest position, style radius), (Re field, 0),
// (Im field, 0); the field already carries the mode's amplitude.
uniform samplerBuffer u_atoms;
// One RGBA8 texel per atom: its colour (element or participation), sRGB.
uniform samplerBuffer u_colours;

#ifndef QV_FRAGMENT
// Occlusion culling (qv-renderer.c): with u_list_base ≥ 0 quad q draws the
// impostor at entry u_list_base + q of this frame's list of those not
// certainly hidden; with −1, impostor q.
uniform usamplerBuffer u_list;
uniform int u_list_base;

int qv_listed (int q)
{
  return u_list_base < 0 ? q : int (texelFetch (u_list, u_list_base + q).r);
}
#endif

vec3 qv_atom_position (int i)
{
  vec3 rest = texelFetch (u_atoms, 3 * i).xyz;
  vec3 re = texelFetch (u_atoms, 3 * i + 1).xyz;
  vec3 im = texelFetch (u_atoms, 3 * i + 2).xyz;
  return rest + re * u_cos_phase - im * u_sin_phase;
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

// Corner (±1, ±1) of vertex @v of a quad of four vertices, drawn by the
// index pattern 0 1 2, 2 1 3 (qv-renderer.c).
vec2 qv_quad_corner4 (int v)
{
  return vec2 (float (v & 1), float ((v >> 1) & 1)) * 2.0 - 1.0;
}

// The size of a pixel in view units at distance @dist from the eye.
float qv_pixel_at (float dist)
{
  return u_ortho > 0.5 ? u_px_scale : u_px_scale * dist;
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

// qv_shade split in two for impostors: what is constant over one sphere,
// bond or arrow (linear albedo and depth cueing at its centre @c, the half
// vector for its centre's line of sight) is computed per vertex into flat
// varyings, leaving the fragment shader two dot products and a square root.
void qv_shade_setup (vec3 base, vec3 c, out vec3 albedo, out vec3 haze, out vec4 halfway)
{
  float f = clamp ((-c.z - u_cue.x) / max (u_cue.y - u_cue.x, 1e-3), 0.0, 1.0) * u_cue.z;
  vec3 v = u_ortho > 0.5 ? vec3 (0.0, 0.0, 1.0) : normalize (-c);
  albedo = qv_to_linear (base) * (1.0 - f);
  haze = qv_to_linear (u_bg.rgb) * f;
  halfway = vec4 (normalize (u_light.xyz + v), 0.22 * (1.0 - f));
}

// √x as x·(1/√x): llvmpipe's inversesqrt is a fast estimate refined by a
// Newton step, far cheaper than its exact sqrt; 0 stays 0.
float qv_sqrt (float x)
{
  return x * inversesqrt (max (x, 1e-20));
}

vec3 qv_shade_fast (vec3 albedo, vec3 haze, vec4 halfway, vec3 n)
{
  float diffuse = max (dot (n, u_light.xyz) * (1.0 / 1.15) + 0.15 / 1.15, 0.0);
  float nh = max (dot (n, halfway.xyz), 0.0);
  nh *= nh; nh *= nh; nh *= nh; nh *= nh; nh *= nh;
  vec3 c = clamp (albedo * (u_light.w + (1.0 - u_light.w) * diffuse)
                  + vec3 (halfway.w * nh) + haze, 0.0, 1.0);
  return c * inversesqrt (max (c, vec3 (1e-20)));
}

// Window depth of view-space point @p: only the projection's last two rows.
float qv_depth (vec3 p)
{
  vec4 q = vec4 (p, 1.0);
  float z = dot (q, vec4 (u_proj[0][2], u_proj[1][2], u_proj[2][2], u_proj[3][2]));
  float w = dot (q, vec4 (u_proj[0][3], u_proj[1][3], u_proj[2][3], u_proj[3][3]));
  return clamp (z / w * 0.5 + 0.5, 0.0, 1.0);
}
