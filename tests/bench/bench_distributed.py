#!/usr/bin/python3
"""bench_distributed.py — the distributed solve (`mpirun -n P quaver modes …
--distributed`, ScaLAPACK pdsyevd / pdsyevr) beside the serial LAPACK path
of the same command, in the same run, on invented spring models (the
Hessian of tests/mpi/test_distributed.py): wall time of the whole command
and the peak resident memory of each process (GNU time's %M per rank), then
the memory model of the block layout for the same sizes and for P = 64, 256.
A benchmark: it reports, it never fails on a figure (docs/performance.md).

  bench_distributed.py --quaver Q --mpirun M --model bench-block-layout
                       [--atoms 1500,2500] [--ranks 1,2] [--repeat 2]

SPDX-License-Identifier: GPL-3.0-or-later
"""
import argparse
import os
import subprocess
import sys
import tempfile
import time

import numpy as np
from scipy.spatial import cKDTree


def springs(n_atoms, seed=7):
    """A jittered grid of n_atoms (k x 10 x 10), springs within 3.9 A."""
    rng = np.random.default_rng(seed)
    nx = max(1, n_atoms // 100)
    g = np.array([(i, j, k) for i in range(nx) for j in range(10) for k in range(10)], float)
    x = 2.5 * g + rng.uniform(-0.2, 0.2, g.shape)
    n = len(x)
    H = np.zeros((3 * n, 3 * n))
    for a, b in sorted(cKDTree(x).query_pairs(3.9)):
        e = x[b] - x[a]
        e /= np.linalg.norm(e)
        B = rng.uniform(0.5, 1.5) * np.outer(e, e)
        H[3*a:3*a+3, 3*b:3*b+3] -= B
        H[3*b:3*b+3, 3*a:3*a+3] -= B
        H[3*a:3*a+3, 3*a:3*a+3] += B
        H[3*b:3*b+3, 3*b:3*b+3] += B
    return x, H


def timed(cmd, env):
    t = time.perf_counter()
    p = subprocess.run(cmd, capture_output=True, text=True, env=env)
    wall = time.perf_counter() - t
    if p.returncode != 0:
        sys.stderr.write(p.stderr[-2000:])
        raise SystemExit("failed: " + " ".join(cmd))
    # GNU time -f 'QVRSS %M' prints one line per process it wrapped
    rss = [int(line.split()[1]) for line in p.stderr.splitlines() if line.startswith("QVRSS ")]
    return wall, rss


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--quaver", required=True)
    ap.add_argument("--mpirun", required=True)
    ap.add_argument("--model", required=True)
    ap.add_argument("--atoms", default="1500,2500")
    ap.add_argument("--ranks", default="1,2")
    ap.add_argument("--repeat", type=int, default=2)
    a = ap.parse_args()
    gnu_time = "/usr/bin/time"
    ranks = [int(r) for r in a.ranks.split(",")]
    print("| atoms | 3N | modes | how | wall s (best of %d) | peak RSS per process MiB |" % a.repeat)
    print("| ---: | ---: | ---: | --- | ---: | --- |")
    sizes = []
    with tempfile.TemporaryDirectory(prefix="qv-bench-mpi-") as tmp:
        for n_atoms in [int(s) for s in a.atoms.split(",")]:
            x, H = springs(n_atoms)
            xyz, npy = os.path.join(tmp, "s.xyz"), os.path.join(tmp, "s.npy")
            with open(xyz, "w") as f:
                f.write("%d\ninvented spring model\n" % len(x))
                for p in x:
                    f.write("Ar %.8f %.8f %.8f\n" % tuple(p))
            np.save(npy, H)
            del H
            sizes.append(len(x))
            base = ["modes", xyz, "--hessian", npy, "--hessian-units", "eV/A^2",
                    "-o", os.path.join(tmp, "out.txt"), "--force"]
            for lowest in (None, 100):
                extra = ["--lowest", str(lowest)] if lowest else []
                runs = []
                for threads in (1, 2):
                    runs.append(("serial LAPACK, %d BLAS thread%s" % (threads, "s" if threads > 1 else ""),
                                 [gnu_time, "-f", "QVRSS %M", a.quaver] + base + extra
                                 + (["--lowest-method", "lapack"] if lowest else []),
                                 {"OPENBLAS_NUM_THREADS": str(threads)}))
                for p in ranks:
                    runs.append(("ScaLAPACK, %d rank%s" % (p, "s" if p > 1 else ""),
                                 [a.mpirun, "--allow-run-as-root", "--oversubscribe", "-n", str(p),
                                  "-x", "OPENBLAS_NUM_THREADS=1", gnu_time, "-f", "QVRSS %M",
                                  a.quaver] + base + extra + ["--distributed"],
                                 {"OPENBLAS_NUM_THREADS": "1"}))
                for label, cmd, env_extra in runs:
                    env = dict(os.environ, **env_extra)
                    best, rss = None, None
                    for _ in range(a.repeat):
                        wall, r = timed(cmd, env)
                        if best is None or wall < best:
                            best, rss = wall, r
                    print("| %d | %d | %s | %s | %.2f | %s |" % (
                        len(x), 3 * len(x), lowest or "all", label, best,
                        ", ".join("%.0f" % (k / 1024.0) for k in rss)))
                    sys.stdout.flush()
    print()
    print("Memory model of the block layout (qv_block_layout_solve_bytes), 64 x 64 blocks:")
    print()
    model = subprocess.run([a.model] + [str(s) for s in sizes] + ["20000", "--"]
                           + [str(p) for p in sorted(set(ranks + [64, 256]))],
                           capture_output=True, text=True, check=True)
    print(model.stdout)
    return 0


sys.exit(main())
