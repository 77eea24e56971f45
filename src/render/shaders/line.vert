// line.vert — Quaver renderer (in progress)
