#!/usr/bin/python3
"""test_symmetric_collect.py — `quaver stencil --symmetric` and `quaver collect`
against the analytic Hessian of an invented pair potential.

Model crystals (invented parameters, not any real material):
  * fcc, one species (Ar used only as a label), conventional cell a = 3.6 A,
    2x2x2 (32 atoms), nearest neighbours only;
  * rock salt (Na, Cl as labels), a = 5.6 A, 2x2x2 conventional (64 atoms),
    first and second neighbours;
with Lennard-Jones-form pair energies V(r) = 4 eps [(s/r)^12 - (s/r)^6] per
species pair, summed over the periodic images of the supercell within a cut-off
that lies between neighbour shells (so no pair crosses it).

The analytic supercell Hessian is the textbook pair form (e.g. Ashcroft &
Mermin ch. 22): the block of a pair at separation r is
K = V''(r) rr^T/r^2 + V'(r)/r (I - rr^T/r^2), Phi_ij = -sum_T K(r_ij + T) for
i != j, Phi_ii = -sum_{j != i} Phi_ij. The forces of every written structure
are computed here with NumPy from the same V and put back as extended XYZ
forces columns (fcc) or plain .forces files (rock salt); collect's Hessian
must match the analytic one to O(h^2) (error ratio ~4 when h doubles, the
central-difference truncation, common practice) and the full 6N stencil's
collect to rounding (cubic site groups: every image of a kept axis is again
+- an axis, docs/methods.md). The displacement count must be the
symmetry-distinct one: fcc 2, rock salt 4 (one orbit per species, one axis
each, + and -; the site group Oh maps x onto y and z — common practice).

SPDX-License-Identifier: GPL-3.0-or-later
"""
import json
import os
import shutil
import subprocess
import sys
import tempfile

import numpy as np

QUAVER = os.environ.get("QUAVER", "quaver")
failures = []


def check(cond, what):
    if not cond:
        failures.append(what)
        print("FAIL:", what)
    return cond


def run(args, expect=0):
    p = subprocess.run([QUAVER] + args, capture_output=True, text=True)
    check(p.returncode == expect, "exit %d (expected %d) for %s: %s"
          % (p.returncode, expect, " ".join(args), p.stderr))
    return p


class Crystal:
    """An invented cubic crystal: conventional cell a, basis, pair parameters."""

    def __init__(self, a, basis, params, cutoff, n=2):
        self.cell = np.eye(3) * a * n
        species, pos = [], []
        for l in np.ndindex(n, n, n):
            for s, f in basis:
                species.append(s)
                pos.append((np.array(l) + np.array(f)) * a)
        self.species = species
        self.pos = np.array(pos)
        self.params = params
        self.cutoff = cutoff
        self.images = np.array(list(np.ndindex(3, 3, 3))) - 1
        self.T = self.images @ self.cell
        n_at = len(species)
        eps = np.zeros((n_at, n_at))
        sig = np.zeros((n_at, n_at))
        for i in range(n_at):
            for j in range(n_at):
                e, s = params[frozenset((species[i], species[j]))]
                eps[i, j], sig[i, j] = e, s
        self.eps, self.sig = eps, sig

    def _pairs(self, x):
        # d[i, j, t] = x_i - x_j - T_t
        d = x[:, None, None, :] - x[None, :, None, :] - self.T[None, None, :, :]
        r = np.linalg.norm(d, axis=-1)
        mask = (r > 1e-8) & (r < self.cutoff)
        return d, r, mask

    def _derivs(self, r):
        e = self.eps[:, :, None]
        s = self.sig[:, :, None]
        with np.errstate(divide="ignore", invalid="ignore"):
            sr6 = (s / r) ** 6
            v1 = 4 * e * (-12 * sr6 ** 2 + 6 * sr6) / r
            v2 = 4 * e * (156 * sr6 ** 2 - 42 * sr6) / r ** 2
        return v1, v2

    def forces(self, x):
        d, r, mask = self._pairs(x)
        v1, _ = self._derivs(r)
        w = np.where(mask, v1 / np.where(mask, r, 1.0), 0.0)
        return -(w[..., None] * d).sum(axis=(1, 2))

    def hessian(self):
        x = self.pos
        n_at = len(x)
        d, r, mask = self._pairs(x)
        v1, v2 = self._derivs(r)
        H = np.zeros((3 * n_at, 3 * n_at))
        for i, j, t in zip(*np.nonzero(mask)):
            u = d[i, j, t] / r[i, j, t]
            K = v2[i, j, t] * np.outer(u, u) + v1[i, j, t] / r[i, j, t] * (np.eye(3) - np.outer(u, u))
            H[3 * i:3 * i + 3, 3 * j:3 * j + 3] -= K
            H[3 * i:3 * i + 3, 3 * i:3 * i + 3] += K
        return H

    def write(self, path):
        with open(path, "w") as f:
            f.write("%d\n" % len(self.species))
            f.write('Lattice="%s" pbc="T T T" Properties=species:S:1:pos:R:3 '
                    'comment="invented model crystal"\n' % " ".join("%.17g" % v for v in self.cell.ravel()))
            for s, p in zip(self.species, self.pos):
                f.write("%s %.17g %.17g %.17g\n" % (s, p[0], p[1], p[2]))


def read_xyz(path):
    with open(path) as f:
        lines = f.read().splitlines()
    n = int(lines[0])
    rows = [line.split() for line in lines[2:2 + n]]
    return [r[0] for r in rows], np.array([[float(v) for v in r[1:4]] for r in rows])


def structure_names(d):
    """The displaced structures a stencil wrote, from its manifest."""
    with open(os.path.join(d, "manifest.json")) as f:
        m = json.load(f)
    names = []
    for entry in m["files"]:
        for fr in entry.get("frames", []):
            if "displacement" in fr.get("fields", {}):
                names.append(entry["name"])
    return m, names


def compute(crystal, d, rdir, plain):
    """Forces of every displaced structure in d, into rdir."""
    m, names = structure_names(d)
    for name in names:
        species, x = read_xyz(os.path.join(d, name))
        F = crystal.forces(x)
        if plain:
            with open(os.path.join(rdir, name.rsplit(".", 1)[0] + ".forces"), "w") as f:
                for v in F:
                    f.write("%.17g %.17g %.17g\n" % tuple(v))
        else:
            with open(os.path.join(rdir, name), "w") as f:
                f.write("%d\n" % len(species))
                f.write("Properties=species:S:1:pos:R:3:forces:R:3\n")
                for s, p, v in zip(species, x, F):
                    f.write("%s %.17g %.17g %.17g %.17g %.17g %.17g\n" % ((s,) + tuple(p) + tuple(v)))
    return m, names


def stencil_collect(crystal, tmp, tag, h, symmetric, plain):
    geo = os.path.join(tmp, tag + ".xyz")
    crystal.write(geo)
    d = os.path.join(tmp, tag + "-fd")
    args = ["stencil", geo, "--step", repr(h), "-o", d] + (["--symmetric"] if symmetric else [])
    run(args)
    rdir = os.path.join(tmp, tag + "-out")
    os.mkdir(rdir)
    m, names = compute(crystal, d, rdir, plain)
    out = os.path.join(tmp, tag + ".npy")
    p = run(["collect", d, "--results", rdir, "-o", out])
    H = np.load(out) if os.path.exists(out) else None
    return m, names, H, p, d, rdir


def rel(a, b):
    return np.abs(a - b).max() / np.abs(b).max()


def test_crystal(tmp, label, crystal, expect_count, plain):
    H0 = crystal.hessian()
    n_at = len(crystal.species)
    errs = []
    for h in (0.01, 0.02):
        m, names, H, p, d, rdir = stencil_collect(crystal, tmp, "%s-%g" % (label, h), h, True, plain)
        par = m["parameters"]
        # the manifest says what the brief asks of it
        check(par.get("scheme") == "symmetry-reduced central difference", "%s: scheme %r" % (label, par.get("scheme")))
        check(par.get("displacements") == expect_count,
              "%s: %r displacements in the manifest, expected %d" % (label, par.get("displacements"), expect_count))
        check(par.get("full_displacements") == 6 * n_at, "%s: full count %r" % (label, par.get("full_displacements")))
        check(abs(par.get("step", 0) - h) < 1e-15 and par.get("symprec", 0) > 0, "%s: step/symprec %r" % (label, par))
        check(len(names) == expect_count, "%s: %d structures written, expected %d" % (label, len(names), expect_count))
        check("spread" in p.stderr, "%s: collect reports no spread: %s" % (label, p.stderr))
        if H is None:
            check(False, "%s: no Hessian written" % label)
            return
        check(H.shape == (3 * n_at, 3 * n_at), "%s: Hessian shape %s" % (label, H.shape))
        errs.append(rel(H, H0))
        print("%s h=%g: %d displacements (full %d), max|H - H_analytic|/max|H_analytic| = %.3e"
              % (label, h, len(names), 6 * n_at, errs[-1]))
        if h == 0.01:
            H_sym = H
            # the frames record atom, axis and sign as the core defines them
            frames = [fr["fields"] for e in m["files"] for fr in e.get("frames", [])
                      if "displacement" in fr.get("fields", {})]
            check(all(("axis" in fr or "direction" in fr) and fr.get("sign") in (1, -1) and "atom" in fr
                      for fr in frames), "%s: frame fields %r" % (label, frames))
            check([fr["sign"] for fr in frames] == [1, -1] * (expect_count // 2),
                  "%s: + before - per direction: %r" % (label, frames))
    # O(h^2): the error of h = 0.02 is about four times that of 0.01
    ratio = errs[1] / errs[0]
    print("%s: error ratio (h = 0.02 / h = 0.01) = %.3f" % (label, ratio))
    check(errs[0] < 1e-3, "%s: error %.3g at h = 0.01" % (label, errs[0]))
    check(3.5 < ratio < 4.5, "%s: error ratio %.3f, expected about 4 (O(h^2))" % (label, ratio))
    # the full stencil's collect on the same forces
    _, names_full, H_full, _, _, _ = stencil_collect(crystal, tmp, label + "-full", 0.01, False, plain)
    check(len(names_full) == 6 * n_at, "%s: full stencil wrote %d" % (label, len(names_full)))
    if H_full is not None:
        e = rel(H_sym, H_full)
        print("%s: max|H_sym - H_full|/max|H_full| = %.3e" % (label, e))
        check(e < 1e-9, "%s: symmetric and full stencils differ by %.3g" % (label, e))


def main():
    with tempfile.TemporaryDirectory() as tmp:
        fcc = Crystal(3.6, [("Ar", (0, 0, 0)), ("Ar", (0, .5, .5)), ("Ar", (.5, 0, .5)), ("Ar", (.5, .5, 0))],
                      {frozenset(["Ar"]): (0.05, 2.3)}, cutoff=3.0)
        test_crystal(tmp, "fcc", fcc, 2, plain=False)
        nacl = Crystal(5.6, [("Na", (0, 0, 0)), ("Na", (0, .5, .5)), ("Na", (.5, 0, .5)), ("Na", (.5, .5, 0)),
                             ("Cl", (.5, 0, 0)), ("Cl", (0, .5, 0)), ("Cl", (0, 0, .5)), ("Cl", (.5, .5, .5))],
                       {frozenset(["Na"]): (0.02, 3.3), frozenset(["Cl"]): (0.03, 3.5),
                        frozenset(["Na", "Cl"]): (0.1, 2.5)}, cutoff=4.5)
        test_crystal(tmp, "rocksalt", nacl, 4, plain=True)

        # a deleted result is named by collect, which then writes nothing
        geo = os.path.join(tmp, "del.xyz")
        fcc.write(geo)
        d = os.path.join(tmp, "del-fd")
        run(["stencil", geo, "--symmetric", "-o", d])
        compute(fcc, d, d, plain=False)     # results in place of the structures
        os.remove(os.path.join(d, "disp-0002.xyz"))
        out = os.path.join(tmp, "del.npy")
        p = run(["collect", d, "-o", out], expect=2)
        check("disp-0002.xyz" in p.stderr and "missing" in p.stderr, "deleted result not named: %s" % p.stderr)
        check(not os.path.exists(out), "a Hessian was written despite a missing result")

        # a molecule is refused with a usage error
        mol = os.path.join(tmp, "mol.xyz")
        with open(mol, "w") as f:
            f.write("3\ninvented water-like molecule\nO 0 0 0\nH 0.76 0.59 0\nH -0.76 0.59 0\n")
        p = run(["stencil", mol, "--symmetric", "-o", os.path.join(tmp, "mol-fd")], expect=1)
        check("periodic" in p.stderr, "molecule refusal does not say why: %s" % p.stderr)
        check(not os.path.exists(os.path.join(tmp, "mol-fd", "manifest.json")), "molecule stencil written")
    if failures:
        print("%d failure(s)" % len(failures))
        return 1
    print("all checks passed")
    return 0


if __name__ == "__main__":
    sys.exit(main())
