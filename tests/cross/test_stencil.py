"""test_stencil.py — `quaver stencil` and `quaver collect` on an analytic
potential: the Lennard-Jones pair potential of qvtest.py (energy, gradient
and Hessian in closed form), forces computed here in NumPy.

Sources:
- Central differences of the gradient, H_ij = -(F_j(+h e_i) - F_j(-h e_i))/(2h),
  have an error (h^2/6) d^3 F_j / dx_i^3 + O(h^4) (Taylor expansion; any
  numerical-analysis text, e.g. Press et al., Numerical Recipes, §5.7), so
  halving h divides the error by 4: the ratio is checked, with the exact
  Hessian from qvtest.lj_hessian.
- Constants (force units): CODATA 2018 through scipy.constants.
- NumPy's own .npy reader (numpy.load) and text reader (numpy.loadtxt) read
  what collect writes.
- The mode table of the assembled Hessian is compared with an independent
  NumPy solve (qvtest.reference_modes).

SPDX-License-Identifier: GPL-3.0-or-later
"""
import json
import os
import shutil
import sys

import numpy as np
import scipy.constants as sc

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import qvtest as qt  # noqa: E402

check = qt.Checker("stencil")
EPS, SIGMA = qt.LJ_EPS, qt.LJ_SIGMA
HARTREE_BOHR = (qt.E_H / sc.e) / (qt.A_0 / qt.ANG)     # eV/A per hartree/bohr


def cluster():
    """A 7-atom argon-like LJ cluster (invented): the 13-atom icosahedron's
    centre and six of its vertices, scaled to sigma, moved off the minimum
    by a fixed random jiggle so no force or coupling is special."""
    x = qt.icosahedral_cluster(1)[:7] * SIGMA * 1.12
    rng = np.random.default_rng(5)
    x = x + rng.uniform(-0.08, 0.08, size=x.shape)
    return ["Ar"] * len(x), x


def forces(x):
    return -qt.lj_gradient(x, EPS, SIGMA).reshape(-1, 3)


def read_xyz(path):
    with open(path) as f:
        lines = f.read().splitlines()
    n = int(lines[0])
    rows = [l.split() for l in lines[2:2 + n]]
    return lines[1], [r[0] for r in rows], np.array([[float(v) for v in r[1:4]] for r in rows])


def manifest(d):
    with open(os.path.join(d, "manifest.json")) as f:
        return json.load(f)


def displacement_files(d):
    """(file name, displacement, atom, axis, sign) from the manifest."""
    out = []
    for f in manifest(d)["files"]:
        fr = f["frames"][0]["fields"]
        if "displacement" in fr:
            out.append((f["name"], fr["displacement"], fr["atom"], fr["axis"], fr["sign"]))
    return sorted(out, key=lambda t: t[1])


def fill_results(d, symbols, mode="mixed", unit=1.0, gradient=False):
    """Writes the analytic forces of every displaced structure: as extended
    XYZ with a forces column in place (even displacements) and as a plain
    .forces file beside the untouched structure (odd ones), or all one way."""
    for k, (name, disp, atom, axis, sign) in enumerate(displacement_files(d)):
        path = os.path.join(d, name)
        _, sym, x = read_xyz(path)
        f = forces(x) / unit
        if gradient:
            f = -f
        use_xyz = mode == "xyz" or (mode == "mixed" and k % 2 == 0)
        if use_xyz:
            qt.write_xyz(path, sym, x, forces=f, comment="result")
        else:
            with open(path[:-4] + ".forces", "w") as fh:
                fh.write("# forces of %s (invented LJ cluster)\n" % name)
                for row in f:
                    fh.write(" ".join(qt.fmt(v) for v in row) + "\n")


def stencil_and_collect(tmp, xyz, symbols, step, name, extra_collect=(), extra_stencil=()):
    d = os.path.join(tmp, name)
    qt.run(["stencil", xyz, "--step", step, "-o", d] + list(extra_stencil))
    fill_results(d, symbols)
    npy = os.path.join(tmp, name + ".npy")
    txt = os.path.join(tmp, name + ".hess")
    p = qt.run(["collect", d, "-o", npy, "-o", txt] + list(extra_collect))
    return d, np.load(npy), np.loadtxt(txt), p


def main():
    symbols, x = cluster()
    n = x.size
    H_exact = qt.lj_hessian(x, EPS, SIGMA)
    with qt.tmpdir() as tmp:
        xyz = qt.write_xyz(os.path.join(tmp, "lj7.xyz"), symbols, x)

        # Layout of the stencil: 6 structures per atom, reference, manifest.
        d1, H1, H1t, p1 = stencil_and_collect(tmp, xyz, symbols, 0.02, "h020")
        files = displacement_files(d1)
        check.ok(len(files) == 6 * len(symbols), "6 displaced structures per atom (%d)" % len(files))
        man = manifest(d1)
        check.ok(man["command"] == "stencil" and man["parameters"]["step"] == 0.02
                 and man["parameters"]["complete"] is True, "manifest: command, step, complete")
        name, disp, atom, axis, sign = files[9]      # atom 2, y, -
        _, _, xd = read_xyz(os.path.join(d1, name))
        exp = x.copy()
        exp[atom - 1, "xyz".index(axis)] += sign * 0.02
        check.ok((atom, axis, sign) == (2, "y", -1), "displacement 10 is atom 2, y, minus (order: atom, x y z, + then -)")
        check.close(xd, exp, "displaced positions as the manifest says", atol=1e-12)

        # Accuracy: O(h^2), ratio 4 between h and h/2.
        d2, H2, H2t, p2 = stencil_and_collect(tmp, xyz, symbols, 0.01, "h010")
        e1 = np.max(np.abs(H1 - H_exact))
        e2 = np.max(np.abs(H2 - H_exact))
        scale = np.max(np.abs(H_exact))
        check.ok(e2 < 1e-3 * scale, "h = 0.01 A: max error %.3g of max|H| %.3g" % (e2, scale))
        check.ok(3.6 < e1 / e2 < 4.4, "error ratio between h = 0.02 and 0.01 A: %.3f (h^2: 4)" % (e1 / e2))
        check.close(H2, H2.T, "assembled Hessian symmetric", atol=0.0)
        check.close(H2t, H2, "text and .npy outputs hold the same numbers", atol=0.0)
        # The asymmetry before symmetrising, as reported, recomputed here from
        # the one-sided rows.
        asym = float(p2.stderr_text.split("asymmetry max|H_ij - H_ji|/max|H| = ")[1].split()[0])
        rows = np.zeros((n, n))
        for i in range(n):
            xp = x.copy().ravel()
            xm = x.copy().ravel()
            xp[i] += 0.01
            xm[i] -= 0.01
            rows[i] = -(forces(xp.reshape(-1, 3)).ravel() - forces(xm.reshape(-1, 3)).ravel()) / 0.02
        asym_ref = np.max(np.abs(rows - rows.T)) / np.max(np.abs(rows))
        check.close(asym, asym_ref, "reported asymmetry", rtol=2e-3)

        # Units and signs: the same forces in hartree/bohr, and as gradients.
        d3 = os.path.join(tmp, "units")
        qt.run(["stencil", xyz, "--step", 0.01, "-o", d3])
        fill_results(d3, symbols, mode="forces", unit=HARTREE_BOHR, gradient=True)
        p3 = qt.run(["collect", d3, "--force-units", "hartree/bohr", "--gradient",
                     "-o", os.path.join(tmp, "units.npy")])
        check.close(np.load(os.path.join(tmp, "units.npy")), H2, "hartree/bohr gradients give the same Hessian",
                    rtol=1e-12, atol=1e-12 * scale)

        # Straight on to the modes: the table of the assembled Hessian.
        p4 = qt.run(["collect", d2, "--modes", "--format", "json"])
        doc = json.loads(p4.stdout_text)
        ref = qt.reference_modes(x, qt.masses_of(symbols), H2)
        got = np.array([m["wavenumber"] for m in doc["modes"]])
        check.close(got, ref["nu"], "--modes: wavenumbers of the assembled Hessian (NumPy eigh)",
                    rtol=1e-8, atol=1e-6)
        # ... and `quaver modes` reads the text Hessian collect wrote.
        p5 = qt.run(["modes", os.path.join(d2, "reference.xyz"), "-H", os.path.join(tmp, "h010.hess"),
                     "-u", "eV/A^2", "--format", "json"])
        got5 = np.array([m["wavenumber"] for m in json.loads(p5.stdout_text)["modes"]])
        check.close(got5, got, "quaver modes on the written text Hessian gives the same table", rtol=1e-12,
                    atol=1e-9)

        # A subset of atoms: the block of those atoms, O(h^2) as well.
        sel = [0, 2, 3, 4]                    # atoms 1,3-5
        idx = np.array([3 * a + c for a in sel for c in range(3)])
        d6, H6, _, p6 = stencil_and_collect(tmp, xyz, symbols, 0.01, "part",
                                            extra_stencil=["--atoms", "1,3-5"])
        check.ok(len(displacement_files(d6)) == 24, "--atoms 1,3-5: 24 displaced structures")
        check.ok(H6.shape == (12, 12), "partial Hessian is the 12x12 block of the selected atoms")
        check.close(H6, H2[np.ix_(idx, idx)], "partial block equals the same block of the full assembly",
                    rtol=1e-12, atol=1e-12 * scale)
        check.ok("partial" in p6.stderr_text, "partial Hessian said on stderr")
        p7 = qt.run(["collect", d6, "--modes", "--format", "json"])
        doc7 = json.loads(p7.stdout_text)
        check.ok(doc7["projection"] == "none" and len(doc7["modes"]) == 12,
                 "partial Hessian solved without projection: 12 modes")

        # ---------------- bad input: named one by one, exit 2 -------------
        def bad_copy(name):
            d = os.path.join(tmp, name)
            shutil.copytree(d2, d)
            return d

        names = [f[0] for f in displacement_files(d2)]
        # a deleted result (and its force file) and an altered one
        d = bad_copy("bad1")
        for suffix in (".xyz", ".forces"):
            p = os.path.join(d, names[3][:-4] + suffix)
            if os.path.exists(p):
                os.remove(p)
        _, sym, xx = read_xyz(os.path.join(d, names[10]))
        xx[4, 2] += 0.003
        qt.write_xyz(os.path.join(d, names[10]), sym, xx, forces=forces(xx))
        p = qt.run(["collect", d, "-o", os.path.join(tmp, "bad1.npy")], expect=2)
        check.ok(names[3] in p.stderr_text and "missing" in p.stderr_text,
                 "deleted result named: %r" % p.stderr_text)
        check.ok(names[10] in p.stderr_text and "atom 5 z" in p.stderr_text,
                 "moved atom named with its file: %r" % p.stderr_text)
        check.ok("2 of 42" in p.stderr_text, "count of unusable results")
        check.ok(not os.path.exists(os.path.join(tmp, "bad1.npy")), "no Hessian written on bad input")

        # forces missing: a structure with neither forces column nor .forces
        d = bad_copy("bad2")
        os.remove(os.path.join(d, names[1][:-4] + ".forces"))
        p = qt.run(["collect", d], expect=2)
        check.ok(names[1] in p.stderr_text and "no forces" in p.stderr_text,
                 "missing forces named: %r" % p.stderr_text)

        # non-finite force in a plain force file: file and line
        d = bad_copy("bad3")
        fpath = os.path.join(d, names[5][:-4] + ".forces")
        with open(fpath) as f:
            lines = f.read().splitlines()
        lines[3] = "0.1 nan 0.2"
        with open(fpath, "w") as f:
            f.write("\n".join(lines) + "\n")
        p = qt.run(["collect", d], expect=2)
        check.ok(os.path.basename(fpath) + ":4:" in p.stderr_text and "finite" in p.stderr_text,
                 "non-finite force: file:line named: %r" % p.stderr_text)

        # non-finite force in an extended XYZ forces column
        d = bad_copy("bad4")
        _, sym, xx = read_xyz(os.path.join(d, names[0]))
        ff = forces(xx)
        ff[2, 0] = np.inf
        qt.write_xyz(os.path.join(d, names[0]), sym, xx, forces=ff)
        p = qt.run(["collect", d], expect=2)
        check.ok(names[0] in p.stderr_text, "non-finite force in extended XYZ named: %r" % p.stderr_text)

        # wrong atom count, wrong element, a force file with a short line
        d = bad_copy("bad5")
        _, sym, xx = read_xyz(os.path.join(d, names[2]))
        qt.write_xyz(os.path.join(d, names[2]), sym[:-1], xx[:-1], forces=forces(xx)[:-1])
        _, sym, xx = read_xyz(os.path.join(d, names[4]))
        qt.write_xyz(os.path.join(d, names[4]), ["Ne"] + sym[1:], xx, forces=forces(xx))
        fpath = os.path.join(d, names[7][:-4] + ".forces")
        with open(fpath, "a") as f:
            f.write("1.0 2.0\n")
        p = qt.run(["collect", d], expect=2)
        check.ok(names[2] in p.stderr_text and "6 atoms" in p.stderr_text, "atom count mismatch named")
        check.ok(names[4] in p.stderr_text and "atom 1" in p.stderr_text, "element mismatch named")
        check.ok(os.path.basename(fpath) + ":" in p.stderr_text, "malformed force file named: %r" % p.stderr_text)
        check.ok("3 of 42" in p.stderr_text, "three problems, each named")

        # the reference altered, a manifest from another command, no manifest
        d = bad_copy("bad6")
        with open(os.path.join(d, "reference.xyz"), "a") as f:
            f.write("\n")
        p = qt.run(["collect", d], expect=2)
        check.ok("reference.xyz" in p.stderr_text and "SHA-256" in p.stderr_text,
                 "altered reference named: %r" % p.stderr_text)
        d = os.path.join(tmp, "ens")
        qt.run(["ensemble", xyz, "-H", os.path.join(tmp, "h010.hess"), "-u", "eV/A^2", "-n", 1,
                "--seed", 1, "-o", d])
        p = qt.run(["collect", d], expect=2)
        check.ok("manifest.json" in p.stderr_text and "ensemble" in p.stderr_text,
                 "manifest of another command refused: %r" % p.stderr_text)
        p = qt.run(["collect", tmp], expect=2)
        check.ok("manifest.json" in p.stderr_text, "no manifest: named: %r" % p.stderr_text)

        # ---------------- refusals and usage errors ----------------------
        p = qt.run(["stencil", xyz, "-o", d2], expect=3)
        check.ok("--force" in p.stderr_text, "stencil into a non-empty directory refused")
        p = qt.run(["collect", d2, "-o", os.path.join(tmp, "h010.npy")], expect=3)
        check.ok("--force" in p.stderr_text, "collect does not overwrite an existing Hessian")
        for bad in (["--step", "0"], ["--step", "-0.01"], ["--step", "2"], ["--atoms", "0"],
                    ["--atoms", "3-1"], ["--atoms", "8"], ["--atoms", "1,x"], ["--format", "pdb"]):
            p = qt.run(["stencil", xyz, "-o", os.path.join(tmp, "never")] + bad, expect=1)
            check.ok(p.stderr_text.startswith("quaver: "), "stencil usage error %s: %r"
                     % (bad, p.stderr_text.strip()))
        check.ok(not os.path.exists(os.path.join(tmp, "never")), "nothing created on a usage error")
        for bad in (["--force-units", "furlong"], ["--tolerance", "0.006"], ["--tolerance", "-1"]):
            p = qt.run(["collect", d2] + bad, expect=1)
            check.ok(p.stderr_text.startswith("quaver: "), "collect usage error %s: %r"
                     % (bad, p.stderr_text.strip()))

    check.finish("LJ7 Hessian from forces: errors %.3g and %.3g eV/A^2 at h = 0.02 and 0.01 A (ratio %.2f)"
                 % (e1, e2, e1 / e2))


if __name__ == "__main__":
    try:
        main()
    except qt.QuaverError as e:
        print("FAIL:", e, file=sys.stderr)
        sys.exit(1)
