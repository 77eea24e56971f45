// arrow.frag — Quaver renderer (in progress)
