// label.frag — Quaver renderer (in progress)
