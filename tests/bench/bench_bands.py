#!/usr/bin/python3
"""bench_bands.py — `quaver bands` at 1000 q points for a 64-atom cell
against a straightforward NumPy implementation (D(q) from the springs, one
numpy.linalg.eigh per q), in the same run. A benchmark: it reports, it never
fails on a time. The model is invented: rock salt (conventional cube doubled,
64 atoms) with nearest- and next-nearest-neighbour springs; its 2x2x2
supercell (512 atoms) gives the Hessian that `quaver bands` reads.

SPDX-License-Identifier: GPL-3.0-or-later
"""
import argparse
import json
import os
import subprocess
import sys
import tempfile
import time

import numpy as np

QUAVER = os.environ.get("QUAVER") or os.path.join(
    os.environ.get("QV_BUILD_ROOT", "/work/main/build"), "src", "cli", "quaver")
A = 5.6
SHELLS = [(A / 2, 3.0, 0.4), (A / np.sqrt(2), 0.7, 0.05)]


def cell64():
    fcc = np.array([[0, 0, 0], [0, .5, .5], [.5, 0, .5], [.5, .5, 0]])
    species, pos = [], []
    for n in np.ndindex(2, 2, 2):
        for f in fcc:
            for s, shift in (("Na", 0.0), ("Cl", 0.5)):
                species.append(s)
                pos.append((np.array(n) + f + np.array([shift, 0, 0])) * A)
    return species, np.array(pos), np.eye(3) * 2 * A


def springs(pos, cell):
    """(i, j, delta, K) for every spring from atom i (both directions)."""
    out = []
    shifts = (np.array(list(np.ndindex(3, 3, 3))) - 1) @ cell
    for i in range(len(pos)):
        # every atom j and image: delta[j, s] = pos[j] + shift[s] - pos[i]
        delta = pos[:, None, :] + shifts[None, :, :] - pos[i]
        r = np.linalg.norm(delta, axis=2)
        for dist, cl, ct in SHELLS:
            for j, s in zip(*np.nonzero(np.abs(r - dist) < 1e-6)):
                d = delta[j, s]
                e = np.outer(d, d) / dist ** 2
                out.append((i, j, d, cl * e + ct * (np.eye(3) - e)))
    return out


def hessian(terms, n):
    h = np.zeros((3 * n, 3 * n))
    for i, j, _, k in terms:
        h[3 * i:3 * i + 3, 3 * i:3 * i + 3] += k
        h[3 * i:3 * i + 3, 3 * j:3 * j + 3] -= k
    return h


def xyz(path, cell, species, pos):
    with open(path, "w") as f:
        f.write("%d\nLattice=\"%s\" pbc=\"T T T\"\n" % (len(pos), " ".join("%.10f" % x for x in cell.ravel())))
        for s, p in zip(species, pos):
            f.write("%s %.10f %.10f %.10f\n" % (s, *p))


def numpy_bands(terms, masses, qcart):
    """D(q) = sum over springs -K e^{iq.delta}/sqrt(m m') + self terms; eigh per q."""
    n = len(masses)
    ii = np.array([t[0] for t in terms])
    jj = np.array([t[1] for t in terms])
    delta = np.array([t[2] for t in terms])
    k = np.array([t[3] for t in terms])
    inv = 1 / np.sqrt(masses[ii] * masses[jj])
    d0 = np.zeros((n, 3, n, 3))
    for i, kk in zip(ii, k):
        d0[i, :, i, :] += kk / masses[i]
    out = np.empty((len(qcart), 3 * n))
    t_eigh = 0.0
    for iq, q in enumerate(qcart):
        phase = np.exp(1j * delta @ q) * inv
        d = d0.astype(complex)
        np.add.at(d, (ii, slice(None), jj, slice(None)), -k * phase[:, None, None])
        t0 = time.perf_counter()
        # eigh, vectors included: what connecting branches by overlap needs
        out[iq] = np.linalg.eigh(d.reshape(3 * n, 3 * n))[0]
        t_eigh += time.perf_counter() - t0
    return out, t_eigh


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--points", type=int, default=1000)
    ap.add_argument("--repeat", type=int, default=3)
    args = ap.parse_args()
    cpus = len(os.sched_getaffinity(0))
    species, pos, cell = cell64()
    masses = np.array([22.98976928 if s == "Na" else 34.96885268 for s in species])
    with tempfile.TemporaryDirectory() as tmp:
        if os.environ.get("QV_BENCH_KEEP"):
            tmp = os.environ["QV_BENCH_KEEP"]
        prim = os.path.join(tmp, "prim.xyz")
        xyz(prim, cell, species, pos)
        # the 2x2x2 supercell in the standard order (n3 fastest, atoms inside)
        sc_pos = np.array([np.array(l) @ cell + p for l in np.ndindex(2, 2, 2) for p in pos])
        t0 = time.perf_counter()
        h = hessian(springs(sc_pos, 2 * cell), len(sc_pos))
        hess = os.path.join(tmp, "sc.npy")
        np.save(hess, h)
        print("model: 64-atom cell, 512-atom supercell Hessian %dx%d built in %.1f s"
              % (h.shape[0], h.shape[1], time.perf_counter() - t0))
        path = "G 0 0 0; X 0.5 0 0; M 0.5 0.5 0; G; R 0.5 0.5 0.5"
        print("load average before: %.2f %.2f %.2f (%d CPUs)" % (os.getloadavg() + (cpus,)))
        cmd = [QUAVER, "bands", prim, "--supercell", "2x2x2", "-H", hess, "-u", "eV/A^2",
               "--path", path, "--points", str(args.points), "-f", "json"]
        runs = [("1 thread", 1, []), ("%d threads" % cpus, cpus, []),
                ("%d threads, --connect sort (no eigenvectors)" % cpus, cpus, ["--connect", "sort"])]
        recip = 2 * np.pi * np.linalg.inv(cell).T
        terms = springs(pos, cell)
        times = {label: [] for label, _, _ in runs}
        numpy_times, eigh_times = [], []
        # rounds interleave the two sides, so a machine busy with other work
        # slows both in the same round; the ratio is taken per round
        for _ in range(args.repeat):
            for label, threads, extra in runs:
                env = dict(os.environ, OPENBLAS_NUM_THREADS=str(threads))
                t0 = time.perf_counter()
                p = subprocess.run(cmd + ["--threads", str(threads)] + extra, capture_output=True,
                                   text=True, env=env)
                times[label].append(time.perf_counter() - t0)
                if p.returncode != 0:
                    print("quaver bands failed (exit %d): %s" % (p.returncode, p.stderr))
                    sys.exit(1)
                if not extra:
                    doc = json.loads(p.stdout)
            qcart = np.array([pt["q"] for pt in doc["points"]]) @ recip
            t0 = time.perf_counter()
            w, t_eigh = numpy_bands(terms, masses, qcart)
            numpy_times.append(time.perf_counter() - t0)
            eigh_times.append(t_eigh)
        got = np.sort(np.array([pt["wavenumbers"] for pt in doc["points"]]), axis=1)
        cm1 = 521.4708983725  # sqrt(eV/(A^2 u)) in cm^-1 (REFERENCES.md)
        want = np.sort(np.sign(w) * np.sqrt(np.abs(w)) * cm1, axis=1)
        print("%d q points, %d rounds; largest difference from NumPy %.2e cm^-1"
              % (len(doc["points"]), args.repeat, np.max(np.abs(got - want))))
        print("NumPy (D(q) from the springs, one eigh per q, OPENBLAS_NUM_THREADS=%s): best %.3f s, "
              "eigh calls alone best %.3f s" % (os.environ.get("OPENBLAS_NUM_THREADS", "default"),
                                                min(numpy_times), min(eigh_times)))
        for label, ts in times.items():
            ratios = [t / n for t, n in zip(ts, numpy_times)]
            print("quaver bands, %s (end to end: read, fold, solve, write): best %.3f s; "
                  "ratio to NumPy per round: best %.2f, median %.2f (target <= 0.7)"
                  % (label, min(ts), min(ratios), float(np.median(ratios))))
        print("load average after: %.2f %.2f %.2f" % os.getloadavg())


if __name__ == "__main__":
    main()
