// arrow.vert — Quaver renderer (in progress)
