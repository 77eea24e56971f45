#!/usr/bin/env python3
"""The shift-invert Lanczos path of `quaver modes --lowest K` against
numpy.linalg.eigh of the independently projected matrix (DESIGN §2, built
here in NumPy by qvtest), and against Quaver's own full solve.

Systems: a 120-atom random spring network (no symmetry), the 55-atom
Lennard-Jones Mackay icosahedron at its minimum (icosahedral degeneracies
of 3, 4 and 5; at 3N = 165 the Krylov space is too small, so this case
checks that the hand-over to LAPACK gives the right answer), and the
network with one soft imaginary mode; in the others the test asserts that
Lanczos itself produced the result. The same LAPACK Working Note 41
acceptance ratios as every other solve (< 30).
"""
import os
import sys

import numpy as np

sys.path.insert(0, os.path.dirname(__file__))
import qvtest as q  # noqa: E402

failures = []


def check(cond, what):
    if not cond:
        failures.append(what)
    return cond


def compare(tag, symbols, x, H, k, expect_lanczos=True):
    masses = q.masses_of(symbols)
    ref = q.reference_modes(x, masses, H)
    with q.tmpdir() as tmp:
        xyz, hes = q.write_inputs(tmp, symbols, x, H)[:2]
        base = [xyz, "--hessian", hes, "--hessian-units", "eV/A^2", "--vectors"]
        # every mass passed explicitly so both sides use the same numbers
        for i, m in enumerate(masses):
            base += ["--mass", "%d=%r" % (i + 1, float(m))]
        low = q.modes_json(base + ["--lowest", str(k), "--lowest-method", "lanczos"])
        full = q.modes_json(base)
    if expect_lanczos:
        check(low["eigensolver"] == "lanczos", f"{tag}: eigensolver {low['eigensolver']}")
    a_low = q.mode_arrays(low, masses)
    a_full = q.mode_arrays(full, masses)
    scale = np.abs(ref["lam"]).max()
    err = np.abs(a_low["eigenvalue"] - ref["lam"][:k]).max() / scale
    check(err < 1e-12, f"{tag}: eigenvalues differ from numpy by {err:.3g} (relative to max)")
    diff = np.abs(a_low["L"] - a_full["L"][:, :k]).max()
    check(diff < 1e-7, f"{tag}: vectors differ from the full solve by {diff:.3g}")
    A = q.projected(ref["K"], ref["V"])
    res, orth = q.lapack_ratios(A, a_low["L"], a_low["eigenvalue"])
    check(res < 30 and orth < 30, f"{tag}: acceptance ratios {res:.3g}, {orth:.3g}")
    return err, diff, res, orth


rng_symbols, x, pairs, kk = q.random_network(120, 7)
H = q.spring_hessian(x, pairs, kk)
out = [("network", compare("network", rng_symbols, x, H, 20))]

sym55, x55, _ = q.lj55_argon()
H55 = q.lj_hessian(x55, q.LJ_EPS, q.LJ_SIGMA)
# 3N = 165 leaves the Krylov space too little room: Lanczos must hand over
# to LAPACK here (its residual check refuses), and the answer must be right.
out.append(("LJ55", compare("LJ55", sym55, x55, H55, 12, expect_lanczos=False)))

# one slightly unstable spring: a soft imaginary mode
kk2 = kk.copy()
kk2[0] = -3.0
H2 = q.spring_hessian(x, pairs, kk2)
out.append(("imaginary", compare("imaginary", rng_symbols, x, H2, 12)))

for tag, (err, diff, res, orth) in out:
    print(f"{tag}: eigenvalue error {err:.2g}, vector difference {diff:.2g}, ratios {res:.2g} {orth:.2g}")
for f in failures:
    print("FAIL:", f, file=sys.stderr)
sys.exit(1 if failures else 0)
