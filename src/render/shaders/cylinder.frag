// cylinder.frag — Quaver renderer (in progress)
