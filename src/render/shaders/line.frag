// line.frag — Quaver renderer (in progress)
