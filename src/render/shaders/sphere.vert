// sphere.vert — Quaver renderer (in progress)
