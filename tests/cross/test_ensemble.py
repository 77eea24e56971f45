"""test_ensemble.py — `quaver ensemble` against the closed forms of the
harmonic Wigner distribution, recomputed here with NumPy.

Sources:
- Wigner distribution of a harmonic oscillator at temperature T (Wigner,
  Phys. Rev. 40, 749, 1932; REFERENCES.md): independent Gaussians with
  <Q^2> = hbar/(2 omega) coth(hbar omega / 2 k_B T), <P^2> = omega^2 <Q^2>.
- Constants: CODATA 2018 through scipy.constants.
- Sampling statistics: for N draws of a zero-mean Gaussian of variance s^2,
  the estimator sum(x^2)/N has variance 2 s^4 / N (chi-square with N degrees
  of freedom; any statistics textbook), the sample mean has variance s^2/N
  and the sample correlation of two independent Gaussians has standard
  deviation ~ 1/sqrt(N).  Bounds below are 5 of those standard deviations;
  the run is seeded, so the test is deterministic, and a factor omega instead
  of omega^2 in <P^2> (or a missing coth) is off by far more.
- The random streams: xoshiro256** (Blackman & Vigna, ACM TOMS 47, 36, 2021)
  seeded by splitmix64 (Steele, Lea & Flood, OOPSLA 2014), normal pairs by
  Marsaglia's polar method (Marsaglia & Bray, SIAM Review 6, 260, 1964), as
  docs/formats.md states; reimplemented below from those papers' published
  algorithms, so the test checks that the files follow the documented
  recipe, not just that they look Gaussian.
- Zero total linear and angular momentum of every sample: the promise of
  the command (DESIGN §2, REFERENCES.md), checked from the written positions
  and velocities.

SPDX-License-Identifier: GPL-3.0-or-later
"""
import glob
import json
import os
import sys

import numpy as np
import scipy.constants as sc

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import qvtest as qt  # noqa: E402

check = qt.Checker("ensemble")
M64 = (1 << 64) - 1


# --------------------------------------------------------------------------
# The documented random recipe, from the papers
# --------------------------------------------------------------------------

def splitmix64(state):
    state = (state + 0x9E3779B97F4A7C15) & M64
    z = state
    z = ((z ^ (z >> 30)) * 0xBF58476D1CE4E5B9) & M64
    z = ((z ^ (z >> 27)) * 0x94D049BB133111EB) & M64
    return state, z ^ (z >> 31)


def rotl(x, k):
    return ((x << k) | (x >> (64 - k))) & M64


class Xoshiro256ss:
    def __init__(self, seed, stream):
        # stream i: splitmix64 outputs 4i .. 4i+3 of the stream from the seed
        st = (seed + 4 * stream * 0x9E3779B97F4A7C15) & M64
        self.s = []
        for _ in range(4):
            st, z = splitmix64(st)
            self.s.append(z)

    def next(self):
        s = self.s
        result = (rotl((s[1] * 5) & M64, 7) * 9) & M64
        t = (s[1] << 17) & M64
        s[2] ^= s[0]
        s[3] ^= s[1]
        s[1] ^= s[2]
        s[0] ^= s[3]
        s[2] ^= t
        s[3] = rotl(s[3], 45)
        return result

    def uniform(self):
        return (self.next() >> 11) * 2.0 ** -53

    def normal_pair(self):
        while True:
            u = 2.0 * self.uniform() - 1.0
            v = 2.0 * self.uniform() - 1.0
            s = u * u + v * v
            if 0.0 < s < 1.0:
                f = np.sqrt(-2.0 * np.log(s) / s)
                return u * f, v * f


# --------------------------------------------------------------------------
# Closed forms in the units of the files
# --------------------------------------------------------------------------

HBAR = sc.hbar
KB = sc.k
U_A2 = qt.M_U * 1e-20                     # 1 u A^2 in kg m^2


def thermal_q2(lam, T):
    """<Q^2> in u A^2 for eigenvalue lam in eV/(A^2 u)."""
    w = np.sqrt(lam) * qt.OMEGA_UNIT       # rad/s
    q2 = HBAR / (2 * w) / U_A2
    if T == 0:
        return q2
    return q2 / np.tanh(HBAR * w / (2 * KB * T))


def omega_fs(lam):
    return np.sqrt(lam) * qt.OMEGA_UNIT * 1e-15   # rad/fs


# --------------------------------------------------------------------------
# Reading what the command wrote
# --------------------------------------------------------------------------

def read_extxyz(path):
    """Frames of an extended XYZ file: list of (info dict, symbols, pos, vel)."""
    frames = []
    with open(path) as f:
        lines = f.read().splitlines()
    i = 0
    while i < len(lines):
        if not lines[i].strip():
            i += 1
            continue
        n = int(lines[i])
        info = {}
        for tok in lines[i + 1].split():
            if "=" in tok:
                k, v = tok.split("=", 1)
                info[k] = v
        rows = [lines[i + 2 + a].split() for a in range(n)]
        sym = [r[0] for r in rows]
        pos = np.array([[float(v) for v in r[1:4]] for r in rows])
        vel = np.array([[float(v) for v in r[4:7]] for r in rows]) if len(rows[0]) >= 7 else None
        frames.append((info, sym, pos, vel))
        i += 2 + n
    return frames


def read_samples(d, single=False):
    if single:
        frames = read_extxyz(os.path.join(d, "ensemble.xyz"))
    else:
        frames = []
        for p in sorted(glob.glob(os.path.join(d, "sample-*.xyz"))):
            frames += read_extxyz(p)
    X = np.array([f[2].ravel() for f in frames])
    V = np.array([f[3].ravel() for f in frames])
    return frames, X, V


def files_bytes(d, pattern="sample-*.xyz"):
    out = {}
    for p in sorted(glob.glob(os.path.join(d, pattern))):
        with open(p, "rb") as f:
            out[os.path.basename(p)] = f.read()
    return out


# --------------------------------------------------------------------------
# The invented system: a random spring network (qvtest.random_network)
# --------------------------------------------------------------------------

def system(tmp, imaginary=False):
    symbols, x, pairs, k = qt.random_network(8, seed=11, neighbours=5)
    H = qt.spring_hessian(x, pairs, k)
    m = qt.masses_of(symbols)
    if imaginary:
        # Turn the lowest vibration into a barrier: K' = K - (lam + a) y y^T
        # in the mass-weighted space, y orthogonal to the rigid-body space,
        # so the new eigenvalue is -a and the rest are unchanged.
        ref = qt.reference_modes(x, m, H)
        y = ref["L"][:, 0]
        a = 0.5 * ref["lam"][1]
        K = ref["K"] - (ref["lam"][0] + a) * np.outer(y, y)
        s = np.sqrt(np.repeat(m, 3))
        H = K * s[:, None] * s[None, :]
    xyz, hes = qt.write_inputs(tmp, symbols, x, H)
    return symbols, x, m, H, xyz, hes


def modes_of(xyz, hes, m, extra=()):
    doc = qt.modes_json([xyz, "-H", hes, "-u", "eV/A^2", "--vectors"] + list(extra))
    arr = qt.mode_arrays(doc, m)
    return doc, arr


def normal_coordinates(X, V, x0, m, L):
    sm = np.sqrt(np.repeat(m, 3))
    Q = (X - x0.ravel()[None, :]) * sm[None, :] @ L
    P = V * sm[None, :] @ L
    return Q, P


def momenta(X, V, m):
    """Relative total linear and angular momentum (about each sample's own
    centre of mass) per sample."""
    n = len(m)
    lin, ang = [], []
    for x, v in zip(X, V):
        x = x.reshape(n, 3)
        v = v.reshape(n, 3)
        p = m[:, None] * v
        c = (m[:, None] * x).sum(0) / m.sum()
        r = x - c
        L = np.cross(r, p).sum(0)
        lin.append(np.linalg.norm(p.sum(0)) / np.sum(np.linalg.norm(p, axis=1)))
        ang.append(np.linalg.norm(L) / np.sum(np.linalg.norm(r, axis=1) * np.linalg.norm(p, axis=1)))
    return np.array(lin), np.array(ang)


def main():
    N = 2000
    T = 300.0
    seed = 20240607
    with qt.tmpdir() as tmp:
        symbols, x, m, H, xyz, hes = system(tmp)
        doc, arr = modes_of(xyz, hes, m)
        lam, L = arr["eigenvalue"], arr["L"]
        nm = len(lam)
        check.ok(nm == 3 * len(m) - 6, "18 vibrations of the 8-atom network")
        check.close(L.T @ L, np.eye(nm), "mode vectors orthonormal (JSON round trip)", atol=1e-8)

        d1 = os.path.join(tmp, "e1")
        p = qt.run(["ensemble", xyz, "-H", hes, "-u", "eV/A^2", "-T", T, "-n", N,
                    "--seed", seed, "-o", d1])
        frames, X, V = read_samples(d1)
        check.ok(len(frames) == N, "one file per sample (%d)" % len(frames))
        info = frames[0][0]
        check.ok(info.get("Properties") == "species:S:1:pos:R:3:velocities:R:3",
                 "Properties of the comment line: %s" % info.get("Properties"))
        check.ok(info.get("velocity_unit") == "A/fs", "velocity unit stated on the comment line")
        check.ok([f[0].get("sample") for f in frames[:3]] == ["1", "2", "3"], "sample numbers")
        with open(os.path.join(d1, "manifest.json")) as f:
            man = json.load(f)
        par = man["parameters"]
        check.ok(man["command"] == "ensemble" and par["temperature"] == T and par["seed"] == seed,
                 "manifest: command, temperature, seed")
        check.ok(par["modes_sampled"] == "1-%d" % nm and par["n_modes_imaginary"] == 0,
                 "manifest: modes sampled %s" % par["modes_sampled"])
        check.ok(len(man["files"]) == N and man["files"][4]["frames"][0]["fields"]["sample"] == 5,
                 "manifest: one entry per sample, with its index")

        Q, P = normal_coordinates(X, V, x, m, L)
        q2 = thermal_q2(lam, T)
        p2 = omega_fs(lam) ** 2 * q2
        sq = np.mean(Q ** 2, axis=0)
        sp = np.mean(P ** 2, axis=0)
        tol = 5 * np.sqrt(2.0 / N)          # relative, 5 sd of the variance estimator
        check.close(sq / q2, np.ones(nm), "<Q^2> per mode vs hbar/(2w) coth(hbar w/2kT)", atol=tol)
        check.close(sp / p2, np.ones(nm), "<P^2> per mode vs w^2 <Q^2>", atol=tol)
        # The classical limit kT/w^2 differs from the quantum form for the
        # stiff modes by much more than the tolerance: the test can tell.
        classical = KB * T / (np.sqrt(lam) * qt.OMEGA_UNIT) ** 2 / U_A2
        check.ok(np.max(np.abs(classical / q2 - 1)) > 5 * tol,
                 "quantum and classical spreads differ here by more than the tolerance")
        check.close(np.mean(Q, axis=0) / np.sqrt(q2), np.zeros(nm), "mean Q", atol=5 / np.sqrt(N))
        check.close(np.mean(P, axis=0) / np.sqrt(p2), np.zeros(nm), "mean P", atol=5 / np.sqrt(N))
        Z = np.hstack([Q / np.sqrt(q2), P / np.sqrt(p2)])
        C = np.corrcoef(Z.T)
        check.close(C - np.diag(np.diag(C)), np.zeros_like(C),
                    "Q and P of all modes uncorrelated", atol=5 / np.sqrt(N))
        # Kinetic energy: <sum 1/2 m v^2> = sum 1/2 <P^2> (u A^2/fs^2 -> eV)
        ke = 0.5 * np.sum(np.repeat(m, 3)[None, :] * V ** 2, axis=1) * qt.M_U * 1e10 / sc.e
        ke_expect = 0.5 * np.sum(p2) * qt.M_U * 1e10 / sc.e
        check.close(np.mean(ke), ke_expect, "mean kinetic energy (eV)", rtol=5 * np.sqrt(2.0 / (N * nm)) * 3)

        # The documented recipe, draw by draw: Q_k = sigma_Q z1 exactly (to
        # the 1e-10 A of the file); P_k = sigma_P z2 up to the removal of the
        # second-order angular momentum at the sampled geometry.
        for s in (0, 1, 17, N - 1):
            rng = Xoshiro256ss(seed, s)
            z = np.array([rng.normal_pair() for _ in range(nm)])
            check.close(Q[s], np.sqrt(q2) * z[:, 0], "sample %d: Q from the documented streams" % (s + 1),
                        atol=1e-7)
            check.close(P[s], np.sqrt(p2) * z[:, 1], "sample %d: P from the documented streams" % (s + 1),
                        atol=0.05 * np.max(np.sqrt(p2)))

        lin, ang = momenta(X, V, m)
        check.ok(lin.max() < 1e-7, "total linear momentum zero in every sample (max rel %.2g)" % lin.max())
        check.ok(ang.max() < 1e-7, "total angular momentum zero in every sample (max rel %.2g)" % ang.max())
        com0 = (m[:, None] * x).sum(0) / m.sum()
        com = np.array([(m[:, None] * xx.reshape(-1, 3)).sum(0) / m.sum() for xx in X])
        check.close(com, np.tile(com0, (N, 1)), "centre of mass of every sample at r0's", atol=1e-9)
        check.ok(par["max_angular_momentum_left"] < 1e-12,
                 "manifest: no angular momentum left (%g)" % par["max_angular_momentum_left"])

        # Reproducibility: same seed -> byte-identical samples; the first
        # samples do not depend on N; another seed -> other samples.
        d2 = os.path.join(tmp, "e2")
        qt.run(["ensemble", xyz, "-H", hes, "-u", "eV/A^2", "-T", T, "-n", N, "--seed", seed, "-o", d2])
        b1, b2 = files_bytes(d1), files_bytes(d2)
        check.ok(b1 == b2, "same seed: byte-identical sample files")
        d3 = os.path.join(tmp, "e3")
        qt.run(["ensemble", xyz, "-H", hes, "-u", "eV/A^2", "-T", T, "-n", 10, "--seed", seed, "-o", d3])
        b3 = files_bytes(d3)
        check.ok(all(b3[k] == b1[k.replace("sample-", "sample-")] for k in b3) and len(b3) == 10,
                 "sample s does not depend on the count")
        d4 = os.path.join(tmp, "e4")
        qt.run(["ensemble", xyz, "-H", hes, "-u", "eV/A^2", "-T", T, "-n", 10, "--seed", seed + 1, "-o", d4])
        b4 = files_bytes(d4)
        check.ok(all(b4[k] != b3[k] for k in b4), "another seed: every sample differs")

        # One multi-frame file holds the same frames.
        d5 = os.path.join(tmp, "e5")
        qt.run(["ensemble", xyz, "-H", hes, "-u", "eV/A^2", "-T", T, "-n", 10, "--seed", seed,
                "--single-file", "-o", d5])
        with open(os.path.join(d5, "ensemble.xyz"), "rb") as f:
            single = f.read()
        check.ok(single == b"".join(b3[k] for k in sorted(b3)), "--single-file: the same frames in one file")

        # A cut-off leaves modes out (Q = 0) and keeps the others' draws.
        nu = arr["wavenumber"]
        cut = 0.5 * (nu[2] + nu[3])
        d6 = os.path.join(tmp, "e6")
        p6 = qt.run(["ensemble", xyz, "-H", hes, "-u", "eV/A^2", "-T", T, "-n", 10, "--seed", seed,
                     "--min-wavenumber", cut, "-o", d6])
        _, X6, V6 = read_samples(d6)
        Q6, P6 = normal_coordinates(X6, V6, x, m, L)
        check.close(Q6[:, :3], np.zeros((10, 3)), "modes below the cut-off not sampled", atol=1e-7)
        check.close(Q6[:, 3:], Q[:10, 3:], "other modes keep their draws under a cut-off", atol=1e-7)
        with open(os.path.join(d6, "manifest.json")) as f:
            par6 = json.load(f)["parameters"]
        check.ok(par6["modes_below_cutoff"] == "1-3" and par6["n_modes_sampled"] == nm - 3,
                 "manifest: modes below the cut-off %s" % par6["modes_below_cutoff"])
        check.ok("below" in p6.stderr_text, "cut-off reported on stderr")

        # T = 0: the zero-point spread hbar/(2w).
        d7 = os.path.join(tmp, "e7")
        qt.run(["ensemble", xyz, "-H", hes, "-u", "eV/A^2", "-T", 0, "-n", 1000, "--seed", 5,
                "--single-file", "-o", d7])
        _, X7, V7 = read_samples(d7, single=True)
        Q7, _ = normal_coordinates(X7, V7, x, m, L)
        check.close(np.mean(Q7 ** 2, axis=0) / thermal_q2(lam, 0), np.ones(nm),
                    "T = 0: <Q^2> = hbar/(2w)", atol=5 * np.sqrt(2.0 / 1000))

        # Without projection: rigid-body modes are found and not sampled,
        # and the samples still carry no net momentum.
        d8 = os.path.join(tmp, "e8")
        p8 = qt.run(["ensemble", xyz, "-H", hes, "-u", "eV/A^2", "-T", T, "-n", 50, "--seed", 3,
                     "--project", "none", "-o", d8])
        with open(os.path.join(d8, "manifest.json")) as f:
            par8 = json.load(f)["parameters"]
        check.ok(par8["n_modes_rigid_body"] == 6 and par8["n_modes_sampled"] == nm,
                 "projection none: 6 rigid-body modes left out (%s), %d sampled"
                 % (par8["modes_rigid_body"], par8["n_modes_sampled"]))
        check.ok("rigid-body" in p8.stderr_text, "projection none: said on stderr")
        _, X8, V8 = read_samples(d8)
        lin8, ang8 = momenta(X8, V8, m)
        check.ok(lin8.max() < 1e-7 and ang8.max() < 1e-7,
                 "projection none: zero linear and angular momentum (%.2g, %.2g)" % (lin8.max(), ang8.max()))

        # An imaginary mode: always left out, named in a warning.
        sub = os.path.join(tmp, "imag")
        os.mkdir(sub)
        _, xi, mi, Hi, xyzi, hesi = system(sub, imaginary=True)
        doci, arri = modes_of(xyzi, hesi, mi)
        check.ok(arri["wavenumber"][0] < 0, "the modified network has an imaginary mode")
        d9 = os.path.join(tmp, "e9")
        p9 = qt.run(["ensemble", xyzi, "-H", hesi, "-u", "eV/A^2", "-T", T, "-n", 20, "--seed", 3, "-o", d9])
        check.ok("imaginary" in p9.stderr_text and "mode 1 (" in p9.stderr_text,
                 "imaginary mode named in a warning: %r" % p9.stderr_text.strip())
        _, X9, V9 = read_samples(d9)
        Q9, P9 = normal_coordinates(X9, V9, xi, mi, arri["L"])
        check.close(Q9[:, 0], np.zeros(20), "imaginary mode not sampled (Q)", atol=1e-7)
        with open(os.path.join(d9, "manifest.json")) as f:
            man9 = json.load(f)
        check.ok(man9["parameters"]["modes_imaginary"] == "1" and
                 any("imaginary" in n for n in man9.get("notes", [])),
                 "manifest: imaginary mode listed and noted")

        # Refusals: an existing non-empty directory, bad options.
        p = qt.run(["ensemble", xyz, "-H", hes, "-u", "eV/A^2", "-n", 2, "--seed", 1, "-o", d1], expect=3)
        check.ok("--force" in p.stderr_text, "non-empty output directory refused: %r" % p.stderr_text.strip())
        check.ok(b1 == files_bytes(d1), "the refused run changed nothing")
        for bad in (["-T", "-1"], ["-n", "0"], ["--seed", "-4"], ["--seed", "x"],
                    ["--min-wavenumber", "-5"], ["--format", "pdb"]):
            p = qt.run(["ensemble", xyz, "-H", hes, "-u", "eV/A^2", "-o", os.path.join(tmp, "bad")] + bad,
                       expect=1)
            check.ok(p.stderr_text.startswith("quaver: "), "usage error %s: %r" % (bad, p.stderr_text.strip()))
        check.ok(not os.path.exists(os.path.join(tmp, "bad")), "nothing created on a usage error")
        p = qt.run(["ensemble", os.path.join(tmp, "missing.xyz"), "-H", hes, "-u", "eV/A^2",
                    "-o", os.path.join(tmp, "bad")], expect=2)
        check.ok("missing.xyz" in p.stderr_text, "missing input named: %r" % p.stderr_text.strip())

    check.finish("Wigner ensemble: %d samples, %d modes, variances within %.1f%%" % (N, nm, 100 * tol))


if __name__ == "__main__":
    try:
        main()
    except qt.QuaverError as e:
        print("FAIL:", e, file=sys.stderr)
        sys.exit(1)
