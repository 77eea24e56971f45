// label.vert — Quaver renderer (in progress)
