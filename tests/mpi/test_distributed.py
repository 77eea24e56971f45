#!/usr/bin/python3
"""test_distributed.py P MPIRUN — `mpirun -n P quaver modes … --distributed` (MPI +
ScaLAPACK) against the serial LAPACK path of the same program and against
NumPy, on two invented spring models:

* 1500 atoms on a jittered grid, springs of random stiffness (no symmetry):
  every mode (pdsyevd) and the lowest 30 (pdsyevr);
* a 5 x 5 x 5 simple cubic cluster with nearest- and next-nearest-neighbour
  springs (point group O_h: two- and threefold degenerate modes), whose text
  Hessian goes through `quaver convert` first, solved in 16 x 16 blocks so
  that the matrix is spread over the whole grid.

Checks: wavenumbers equal the serial ones to 1e-8 relative; eigenvectors span
the same subspaces (sine of the largest principal angle per set of equal
eigenvalues, since signs and bases inside a degenerate set are free); the
LAPACK Working Note 41 acceptance ratios of the distributed eigenpairs against
PKP built here by NumPy (qvtest.reference_modes); and bad input answered once,
by rank 0, with the exit status of a serial run.

The spring Hessians are those of harmonic springs at rest length,
K_ab = -k r^ r^T with the diagonal blocks the negative row sums (Wilson,
Decius & Cross, Molecular Vibrations, 1955): translations and rotations are
exact zero modes. Invented data.
SPDX-License-Identifier: GPL-3.0-or-later
"""
import os
import sys
import tempfile

import numpy as np
from scipy.spatial import cKDTree

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "cross"))
import qvtest as q  # noqa: E402

P = int(sys.argv[1])
MPIRUN = sys.argv[2]
# OpenMPI refuses root without --allow-run-as-root (the CI machine runs as
# root) and more ranks than cores without --oversubscribe; one BLAS thread
# per rank (common practice: the ranks are the parallelism). Shared-memory
# transfers without cross-memory attach, which containers often forbid
# (OpenMPI's FAQ, from memory); it only changes how ranks copy, not what.
PREFIX = [MPIRUN, "--allow-run-as-root", "--oversubscribe", "-n", str(P),
          "--mca", "btl_vader_single_copy_mechanism", "none",
          "-x", "OPENBLAS_NUM_THREADS=1"]
failures = []


def check(ok, what):
    print(("ok    " if ok else "FAIL  ") + what)
    if not ok:
        failures.append(what)


def springs(x, cutoff, stiffness):
    n = len(x)
    H = np.zeros((3 * n, 3 * n))
    for (a, b), k in zip(sorted(cKDTree(x).query_pairs(cutoff)), stiffness):
        e = x[b] - x[a]
        e /= np.linalg.norm(e)
        B = k * np.outer(e, e)
        H[3*a:3*a+3, 3*b:3*b+3] -= B
        H[3*b:3*b+3, 3*a:3*a+3] -= B
        H[3*a:3*a+3, 3*a:3*a+3] += B
        H[3*b:3*b+3, 3*b:3*b+3] += B
    return H


def given_masses(masses):
    return [a for i, m in enumerate(masses) for a in ("--mass", "%d=%s" % (i + 1, q.fmt(m)))]


def solve_both(tmp, tag, common, distributed_extra=(), serial_extra=()):
    """Runs the serial and the distributed solve; returns their eigenvalues,
    vectors (3N x m) and text tables."""
    out = {}
    for side, prefix, extra in (("serial", (), serial_extra),
                                ("distributed", PREFIX, ("--distributed",) + tuple(distributed_extra))):
        base = os.path.join(tmp, "%s-%s" % (tag, side))
        p = q.run(["modes"] + list(common) + list(extra)
                  + ["--save-vectors", base + ".vec.npy", "--save-eigenvalues", base + ".val.npy",
                     "-o", base + ".txt"], prefix=prefix, timeout=900)
        out[side] = {"lam": np.load(base + ".val.npy"), "Z": np.load(base + ".vec.npy").T,
                     "table": open(base + ".txt").read(), "stderr": p.stderr_text}
    return out["serial"], out["distributed"]


def compare(tag, s, d, ref=None):
    nu_s, nu_d = q.to_wavenumber(s["lam"]), q.to_wavenumber(d["lam"])
    check(len(nu_s) == len(nu_d), "%s: %d modes, serial %d" % (tag, len(nu_d), len(nu_s)))
    rel = np.max(np.abs(nu_d - nu_s) / np.abs(nu_s))
    check(rel <= 1e-8, "%s: wavenumbers equal the serial ones to %.2g relative (<= 1e-8)" % (tag, rel))
    # equal eigenvalues: the solver's own degeneracy tolerance, 1e-6 max|lambda|
    tol = 1e-6 * np.max(np.abs(s["lam"]))
    sets = q.groups(s["lam"], tol)
    # the last set of a partial solve may be cut by the range: leave it out
    if len(s["lam"]) < s["Z"].shape[0] - 6:
        sets = sets[:-1]
    worst = max(q.subspace_distance(s["Z"][:, g], d["Z"][:, g]) for g in sets)
    largest = max(len(g) for g in sets)
    check(worst <= 1e-6, "%s: %d eigenvector subspaces (largest %d-fold) agree, sin(angle) %.2g "
          "(<= 1e-6)" % (tag, len(sets), largest, worst))
    if ref is not None:
        A = q.projected(ref["K"], ref["V"])
        res, orth = q.lapack_ratios(A, d["Z"], d["lam"])
        check(res < 30 and orth < 30, "%s: LAPACK ratios ||AZ-ZL||/(n|A|eps) = %.3g, "
              "||Z'Z-I||/(n eps) = %.3g (< 30, as the cross tests ask)" % (tag, res, orth))
        nu_ref = ref["nu"][:len(nu_d)]
        err = np.max(np.abs(nu_d - nu_ref) / np.abs(nu_ref))
        check(err <= 1e-7, "%s: wavenumbers equal NumPy's eigh of the projected K to %.2g "
              "relative (<= 1e-7)" % (tag, err))
    return largest


def main():
    rng = np.random.default_rng(20261203)
    with tempfile.TemporaryDirectory(prefix="qv-mpi-") as tmp:
        # --- 1500 atoms, no symmetry -------------------------------------
        g = np.array([(i, j, k) for i in range(15) for j in range(10) for k in range(10)], float)
        x = 2.5 * g + rng.uniform(-0.2, 0.2, g.shape)
        symbols = list(rng.choice(["C", "N", "O", "Si"], len(x)))
        pairs = len(cKDTree(x).query_pairs(3.9))
        H = springs(x, 3.9, rng.uniform(0.5, 1.5, pairs))
        q.write_xyz(os.path.join(tmp, "big.xyz"), symbols, x, "invented: 1500-atom spring model")
        q.write_npy(os.path.join(tmp, "big.npy"), H)
        masses = q.masses_of(symbols)
        ref = q.reference_modes(x, masses, H)
        # every atom's mass given, so that both sides solve the same matrix
        # (Quaver's isotope table and periodictable's differ by ~1e-10)
        common = [os.path.join(tmp, "big.xyz"), "--hessian", os.path.join(tmp, "big.npy"),
                  "--hessian-units", "eV/A^2"] + given_masses(masses)
        s, d = solve_both(tmp, "all", common)
        check("pdsyevd" in d["table"] and "dsyevd" in s["table"],
              "1500 atoms: the distributed table names pdsyevd, the serial dsyevd")
        check(d["table"].replace("pdsyevd", "dsyevd") == s["table"],
              "1500 atoms: the distributed text table is the serial one")
        check(d["stderr"].count("distributed over %d ranks" % P) == 1,
              "1500 atoms: rank 0 alone reports the grid")
        compare("1500 atoms, every mode (pdsyevd)", s, d, ref)
        s, d = solve_both(tmp, "low", common + ["--lowest", "30"],
                          serial_extra=("--lowest-method", "lapack"))
        check("pdsyevr" in d["table"], "1500 atoms --lowest 30: solved by pdsyevr")
        compare("1500 atoms, lowest 30 (pdsyevr)", s, d, ref)

        # --- the writers: displaced structures from rank 0's vectors --------
        for side, prefix, extra in (("serial", (), ["--lowest-method", "lapack"]),
                                    ("distributed", PREFIX, ["--distributed"])):
            q.run(["displace"] + common + ["--lowest", "5", "--mode", "2", "-o",
                                           os.path.join(tmp, "disp-" + side)] + extra, prefix=prefix)
        worst = 0.0
        for name in ("mode2-minus.xyz", "mode2-plus.xyz"):
            xyz = [np.loadtxt(os.path.join(tmp, "disp-" + side, name), skiprows=2, usecols=(1, 2, 3))
                   for side in ("serial", "distributed")]
            worst = max(worst, float(np.max(np.abs(xyz[0] - xyz[1]))))
        check(worst <= 1e-8, "displace --distributed writes the serial structures (largest "
              "difference %.2g A, <= 1e-8)" % worst)

        # --- 5 x 5 x 5 cubic cluster: degenerate modes --------------------
        c = 2.5 * np.array([(i, j, k) for i in range(5) for j in range(5) for k in range(5)], float)
        pairs = len(cKDTree(c).query_pairs(3.6))
        Hc = springs(c, 3.6, np.ones(pairs))
        with open(os.path.join(tmp, "cube.xyz"), "w") as f:
            f.write("%d\ninvented: 125 argon atoms, simple cubic, springs\n" % len(c))
            for p in c:
                f.write("Ar %s %s %s\n" % tuple(q.fmt(v) for v in p))
        q.write_hessian(os.path.join(tmp, "cube.hess"), Hc, layout="lower")
        q.run(["convert", os.path.join(tmp, "cube.hess"), "--geometry", os.path.join(tmp, "cube.xyz"),
               "-o", os.path.join(tmp, "cube.npy")])
        masses = q.masses_of(["Ar"] * len(c))
        refc = q.reference_modes(c, masses, Hc)
        s, d = solve_both(tmp, "cube", [os.path.join(tmp, "cube.xyz"), "--hessian-units", "eV/A^2"]
                          + given_masses(masses),
                          distributed_extra=("--hessian", os.path.join(tmp, "cube.npy"),
                                             "--block-size", "16"),
                          serial_extra=("--hessian", os.path.join(tmp, "cube.hess")))
        largest = compare("cube (O_h), 16 x 16 blocks", s, d, refc)
        check(largest == 3, "cube: threefold degenerate sets present (largest %d)" % largest)

        # --- rank 0 short of memory for every vector: refused before the solve
        small = PREFIX[:-2] + ["-x", "OPENBLAS_NUM_THREADS=1", "-x", "QV_TEST_PHYSICAL_MEMORY=209715200"]
        p = q.run(["modes"] + common + ["--distributed"], expect=None, prefix=small)
        check(p.returncode != 0 and "--lowest K" in p.stderr_text and "rank 0" in p.stderr_text,
              "on a pretend 200 MiB machine every mode is refused, pointing to --lowest "
              "(exit %d): %r" % (p.returncode, p.stderr_text.strip()[-240:]))
        # ... while the lowest 30 fit (q.run raises on a non-zero exit)
        q.run(["modes"] + common + ["--distributed", "--lowest", "30", "-o",
                                    os.path.join(tmp, "small.txt")], prefix=small)

        # --- bad input: one message from rank 0, the serial exit status ---
        text = [os.path.join(tmp, "cube.xyz"), "--hessian", os.path.join(tmp, "cube.hess"),
                "--hessian-units", "eV/A^2", "--distributed"]
        p = q.run(["modes"] + text, expect=2, prefix=PREFIX)
        check(p.stderr_text.count("quaver convert") == 1 and "cube.hess" in p.stderr_text,
              "a text Hessian is refused once, naming the file and 'quaver convert': %r"
              % p.stderr_text.strip()[:200])
        bad = Hc.copy()
        bad[7, 11] = np.nan
        q.write_npy(os.path.join(tmp, "nan.npy"), bad)
        p = q.run(["modes", os.path.join(tmp, "cube.xyz"), "--hessian", os.path.join(tmp, "nan.npy"),
                   "--hessian-units", "eV/A^2", "--distributed"], expect=2, prefix=PREFIX)
        check("row 8, column 12" in p.stderr_text and p.stderr_text.count("nan.npy") == 1,
              "a NaN is reported once with its row and column: %r" % p.stderr_text.strip()[:200])
        p = q.run(["modes", os.path.join(tmp, "big.xyz"), "--hessian", os.path.join(tmp, "cube.npy"),
                   "--hessian-units", "eV/A^2", "--distributed"], expect=2, prefix=PREFIX)
        check("cube.npy" in p.stderr_text and "375" in p.stderr_text,
              "a Hessian of the wrong size is refused: %r" % p.stderr_text.strip()[:200])
    if failures:
        print("%d check(s) failed" % len(failures))
        return 1
    print("all checks passed on %d ranks" % P)
    return 0


sys.exit(main())
