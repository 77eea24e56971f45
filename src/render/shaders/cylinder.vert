// cylinder.vert — Quaver renderer (in progress)
