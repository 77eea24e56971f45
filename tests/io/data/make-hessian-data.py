#!/usr/bin/python3
# make-hessian-data.py — writes the small Hessian test files of tests/io/data
# with NumPy (the reference writer of .npy, numpy.lib.format). Invented
# matrices, not from any calculation. Run with Debian's /usr/bin/python3
# from this directory; the outputs are committed.
# SPDX-License-Identifier: GPL-3.0-or-later
import io
import numpy as np

rng = np.random.default_rng(20240531)
n = 6
a = rng.standard_normal((n, n)) * 10.0 ** rng.integers(-3, 3, size=(n, n))
sym = (a + a.T) / 2            # symmetric 6x6, values of mixed magnitude

def fmt(x):
    return repr(float(x))      # shortest round-trip text (Python float repr)

with open('sym-full.txt', 'w') as f:
    f.write('# invented 6x6 symmetric test matrix, full layout\n')
    for i in range(n):
        f.write(' '.join(fmt(x) for x in sym[i]) + '\n')

with open('sym-lower.txt', 'w') as f:
    f.write('# lower triangle, row by row\n\n')
    for i in range(n):
        f.write('  '.join(fmt(sym[i, j]) for j in range(i + 1)) + '   # row %d\n' % (i + 1))

with open('sym-upper.txt', 'w') as f:
    for i in range(n):
        f.write('\t'.join(fmt(sym[i, j]) for j in range(i, n)) + '\n')
    f.write('\n\n')

# the full matrix as one stream wrapped 4 numbers to a line: the row
# lengths 4, 2, 4, 2, ... tell no layout
flat = [fmt(x) for x in sym.reshape(-1)]
with open('sym-wrapped.txt', 'w') as f:
    for k in range(0, len(flat), 4):
        f.write(' '.join(flat[k:k + 4]) + '\n')

# the lower triangle wrapped 5 to a line
low = [fmt(sym[i, j]) for i in range(n) for j in range(i + 1)]
with open('sym-lower-wrapped.txt', 'w') as f:
    for k in range(0, len(low), 5):
        f.write(' '.join(low[k:k + 5]) + '\n')

# comma separated, CRLF line ends
with open('sym-commas.csv', 'w', newline='') as f:
    for i in range(n):
        f.write(', '.join(fmt(x) for x in sym[i]) + '\r\n')

def save(name, array, version=None):
    buf = io.BytesIO()
    if version is None:
        np.save(buf, array)
    else:
        np.lib.format.write_array(buf, array, version=version)
    with open(name, 'wb') as f:
        f.write(buf.getvalue())

save('sym.npy', sym)                                          # 1.0, '<f8', C
save('sym-v2.npy', sym, (2, 0))
save('sym-v3.npy', sym, (3, 0))
save('sym-fortran-be.npy', np.asfortranarray(sym.astype('>f8')))

# not symmetric, to tell the orders apart: A[i, j] = 10 i + j + 1
asym = np.array([[10.0 * i + j + 1 for j in range(3)] for i in range(3)])
save('asym-c.npy', asym)
save('asym-fortran.npy', np.asfortranarray(asym))
save('asym-c-be.npy', asym.astype('>f8'))
save('vector.npy', np.arange(6.0))                            # 1-D: refused
save('float32.npy', np.eye(3, dtype=np.float32))             # '<f4': refused
