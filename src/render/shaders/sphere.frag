// sphere.frag — Quaver renderer (in progress)
