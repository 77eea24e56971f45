#!/usr/bin/python3
"""test_frozen_numpy.py — `quaver frozen-phonon` against an independent NumPy
D(q) of the CsCl-type spring model of test_bands_numpy.py.

The supercell (3x3x3, atoms shuffled and shifted by supercell vectors) is
displaced at a commensurate q; the displacement read back from the written
extended XYZ must be, in the convention of docs/methods.md,

    u_lk = Re[z e_k(q) e^{iq.r_lk}] / sqrt(N m_k),   |z| = A,

with e(q) NumPy's eigenvector of the spring D(q) (numpy.linalg.eigh), r_lk the
atom's position in the file (e^{iq.T} = 1 for supercell vectors T at a
commensurate q) and arg z the requested phase when e is given the documented
phase (largest component real and positive).

SPDX-License-Identifier: GPL-3.0-or-later
"""
import json
import os
import subprocess
import sys
import tempfile

import numpy as np

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import test_bands_numpy as model  # noqa: E402

failures = model.failures
check = model.check


def read_xyz(path):
    with open(path) as f:
        lines = f.read().splitlines()
    n = int(lines[0])
    comment = lines[1]
    pos = np.array([[float(x) for x in line.split()[1:4]] for line in lines[2:2 + n]])
    return comment, pos


def run(args, expect=0):
    p = subprocess.run([model.QUAVER, "frozen-phonon"] + args, capture_output=True, text=True)
    check(p.returncode == expect, "exit %d (expected %d) for %s: %s" % (p.returncode, expect, args, p.stderr))
    return p


def main():
    rng = np.random.default_rng(5)
    with tempfile.TemporaryDirectory() as tmp:
        prim = os.path.join(tmp, "prim.xyz")
        model.xyz(prim, model.CELL, model.SPECIES, model.MASSES, model.TAU)
        species, masses, pos, scell = model.supercell(3)
        sites = np.array([0 if s == "Cs" else 1 for s in species])
        h = model.hessian(sites, pos, scell)
        perm = rng.permutation(len(pos))
        shift = rng.integers(-1, 2, size=(len(pos), 3)) @ scell
        pos_s = pos[perm] + shift
        idx = np.concatenate([[3 * i, 3 * i + 1, 3 * i + 2] for i in perm])
        sc_xyz = os.path.join(tmp, "sc.xyz")
        model.xyz(sc_xyz, scell, [species[i] for i in perm], masses[perm], pos_s)
        hess = os.path.join(tmp, "sc.npy")
        np.save(hess, h[np.ix_(idx, idx)])
        site_s, mass_s = sites[perm], masses[perm]

        frac = np.array([0, 1 / 3, 2 / 3])
        branch, largest, phase_deg = 4, 0.04, 30.0
        out = os.path.join(tmp, "out")
        run([prim, "-S", sc_xyz, "-H", hess, "-u", "eV/A^2", "--q", "%.17g %.17g %.17g" % tuple(frac),
             "--branch", str(branch), "--largest", str(largest), "--phase", str(phase_deg), "-o", out])
        recip = 2 * np.pi * np.linalg.inv(model.CELL).T
        q = frac @ recip
        w, v = np.linalg.eigh(model.d_of_q(q))
        b = branch - 1
        check(np.min(np.abs(np.delete(w, b) - w[b])) > 1e-6 * abs(w[b]), "branch not degenerate")
        e = v[:, b].reshape(2, 3)
        path = os.path.join(out, "frozen-phonon.xyz")
        if not os.path.exists(path):
            check(False, "frozen-phonon.xyz written")
        else:
            comment, got = read_xyz(path)
            check('Lattice="' in comment, "the Lattice is written")
            u = got - pos_s
            nc = 27
            ph = np.exp(1j * pos_s @ q)
            z = 2 / nc * np.sum(np.sqrt(nc * mass_s)[:, None] * np.conj(e[site_s]) * u * np.conj(ph)[:, None])
            rebuilt = np.real(z * e[site_s] * ph[:, None]) / np.sqrt(nc * mass_s)[:, None]
            resid = np.max(np.abs(rebuilt - u))
            big = np.max(np.linalg.norm(u, axis=1))
            print("frozen phonon: |z| %.12g, largest %.12g A, residual %.2e A" % (abs(z), big, resid))
            check(abs(big - largest) < 1e-12, "largest displacement %.15g" % big)
            check(resid < 1e-12, "pattern is the NumPy eigenvector's: residual %.3g" % resid)
            flat = v[:, b]
            mags = np.sort(np.abs(flat))
            check(mags[-1] - mags[-2] > 1e-3, "one largest component, so the phase is defined")
            k = np.argmax(np.abs(flat))
            zz = z * flat[k] / abs(flat[k])   # z for e with that component real and positive
            got_phase = np.degrees(np.angle(zz))
            print("frozen phonon: phase %.9f deg (asked %.1f)" % (got_phase, phase_deg))
            check(abs(got_phase - phase_deg) < 1e-7, "phase %.12g" % got_phase)
            with open(os.path.join(out, "manifest.json")) as f:
                man = json.load(f)
            par = man["parameters"]
            want_cm = model.wavenumbers(np.array([w[b]]))[0]
            check(abs(par["wavenumber_cm-1"] - want_cm) < 1e-8 * abs(want_cm),
                  "wavenumber %.12g vs NumPy %.12g" % (par["wavenumber_cm-1"], want_cm))
            check(abs(par["amplitude_Q_sqrtu_A"] - abs(z)) < 1e-10, "amplitude A")
            check(par["branch"] == branch and par["standing_wave"] is True, "branch, standing wave")

        # not commensurate with 3x3x3: refused, nothing written
        out2 = os.path.join(tmp, "out2")
        p = run([prim, "-S", sc_xyz, "-H", hess, "-u", "eV/A^2", "--q", "0.25 0 0", "--branch", "1",
                 "-o", out2], expect=1)
        check("not commensurate" in p.stderr, "message: %s" % p.stderr)
        check(not os.path.exists(os.path.join(out2, "manifest.json")), "nothing written")
        # another cell for the pattern: 2x1x1 at q = (1/2, 0, 0) (q = -q: no
        # standing-wave note). There the pattern is a fixed real one times
        # cos(phase + theta): at phase 0 this branch's pattern vanishes and
        # is refused, at 90 degrees it is whole
        base = [prim, "-S", sc_xyz, "-H", hess, "-u", "eV/A^2", "--q", "0.5 0 0", "--branch", "6",
                "--cell", "2x1x1", "--normal-coordinate", "0.2"]
        p = run(base + ["-o", os.path.join(tmp, "out0")], expect=1)
        check("moves no atom" in p.stderr, "vanishing pattern refused: %s" % p.stderr)
        out3 = os.path.join(tmp, "out3")
        p = run(base + ["--phase", "90", "-o", out3])
        if p.returncode == 0:
            with open(os.path.join(out3, "manifest.json")) as f:
                man = json.load(f)
            check(man["parameters"]["standing_wave"] is False, "q = -q is no standing wave")
            _, got = read_xyz(os.path.join(out3, "frozen-phonon.xyz"))
            check(len(got) == 4, "2x1x1 has 4 atoms")
            ref = np.array([np.array([n, 0, 0]) @ model.CELL + model.TAU[k] for n in range(2) for k in range(2)])
            u = got - ref
            mw = np.sum(np.repeat(model.MASSES[None, :], 2, axis=0).ravel()[:, None] * u * u)
            # at q = -q the whole normal coordinate is in the pattern: sum m u^2 = A^2
            print("q = -q pattern: sum m u^2 = %.12g (A^2 = 0.04)" % mw)
            check(abs(mw - 0.04) < 1e-9, "sum m u^2 %.12g" % mw)

    if failures:
        print("%d check(s) failed" % len(failures))
        sys.exit(1)
    print("all checks passed")


if __name__ == "__main__":
    main()
