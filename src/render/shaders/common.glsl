// common.glsl — Quaver renderer (in progress)
