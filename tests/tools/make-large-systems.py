#!/usr/bin/python3
# make-large-systems.py — writes, into the current directory, the inputs of
# the large-system measurements in docs/reliability.md ("Limits").
# Invented test systems for the large-system measurements (docs/reliability.md):
# a 20 000-atom XYZ (argon on a 20x25x40 simple cubic grid, 3.8 A apart) and a
# 5 000-atom nearest- and next-nearest-neighbour spring model (10x20x25 grid, 2.5 A, k = 1 eV/A^2
# along each bond, i.e. K_ab = -k r^ r^T and the diagonal blocks the negative
# row sums, so translations are exact zero modes) as a dense .npy Hessian.
import numpy as np, sys
def grid(nx, ny, nz, a):
    return np.array([(i*a, j*a, k*a) for i in range(nx) for j in range(ny) for k in range(nz)], float)
x = grid(20, 25, 40, 3.8)
with open("argon-20000.xyz", "w") as f:
    f.write("%d\ninvented: 20000 argon atoms on a simple cubic grid\n" % len(x))
    for p in x:
        f.write("Ar %.6f %.6f %.6f\n" % tuple(p))
nx, ny, nz, a = 10, 20, 25, 2.5
x = grid(nx, ny, nz, a)
n = len(x)
with open("springs-5000.xyz", "w") as f:
    f.write("%d\ninvented: 5000-atom nearest- and next-nearest-neighbour spring model (argon masses)\n" % n)
    for p in x:
        f.write("Ar %.6f %.6f %.6f\n" % tuple(p))
idx = lambda i, j, k: (i*ny + j)*nz + k
H = np.zeros((3*n, 3*n))
bonds = []
for i in range(nx):
    for j in range(ny):
        for k in range(nz):
            for di, dj, dk in ((1,0,0),(0,1,0),(0,0,1),(1,1,0),(1,-1,0),(1,0,1),(1,0,-1),(0,1,1),(0,1,-1)):
                if 0 <= i+di < nx and 0 <= j+dj < ny and 0 <= k+dk < nz:
                    bonds.append((idx(i,j,k), idx(i+di,j+dj,k+dk)))
for p, q in bonds:
    r = x[q] - x[p]; r /= np.linalg.norm(r)
    B = np.outer(r, r)
    H[3*p:3*p+3, 3*q:3*q+3] -= B; H[3*q:3*q+3, 3*p:3*p+3] -= B
    H[3*p:3*p+3, 3*p:3*p+3] += B; H[3*q:3*q+3, 3*q:3*q+3] += B
np.save("springs-5000.npy", H)
print(len(bonds), "bonds")
