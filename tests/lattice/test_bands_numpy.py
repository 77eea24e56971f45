#!/usr/bin/python3
"""test_bands_numpy.py — `quaver bands --format json` against an independent
NumPy dynamical matrix.

A CsCl-type crystal (simple cubic, two sites) with invented spring constants:
the supercell Hessian is built here from the springs, the supercell's atoms
shuffled and shifted by supercell vectors, and the dispersion computed here
straight from the springs of the infinite crystal,

    D_kk'(q) = sum_{springs k->k' at delta} -K(delta) e^{iq.delta} / sqrt(m_k m_k')
             + delta_kk' sum_{springs from k} K(delta) / m_k,

(the harmonic-crystal equations of motion, e.g. Ashcroft & Mermin, Solid State
Physics, ch. 22, from memory), solved by numpy.linalg.eigvalsh. Constants are
CODATA 2018 through scipy.constants.

SPDX-License-Identifier: GPL-3.0-or-later
"""
import json
import os
import subprocess
import sys
import tempfile

import numpy as np
import periodictable
import scipy.constants as sc

sys.dont_write_bytecode = True
sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from spring_crystal import SpringCrystal  # noqa: E402

QUAVER = os.environ.get("QUAVER") or os.path.join(
    os.environ.get("QV_BUILD_ROOT", "/work/main/build"), "src", "cli", "quaver")

# sqrt(eV/(A^2 u)) as a wavenumber in cm^-1 (REFERENCES.md: 521.470 898)
M_U = sc.physical_constants["atomic mass constant"][0]
CM1 = np.sqrt(sc.e / (1e-20 * M_U)) / (2 * np.pi * sc.c * 100)
# 1 kJ/mol/A^2 in eV/A^2
KJ_MOL = 1000.0 / sc.N_A / sc.e

A = 3.2                                   # cubic lattice constant, A
SPECIES = ["Cs", "Cl"]
MASSES = np.array([132.905, 35.453])      # u, written into the file
TAU = np.array([[0.0, 0.0, 0.0], [0.5, 0.5, 0.5]]) * A
CELL = np.eye(3) * A
# shells: (distance, species pair or None for any, longitudinal, transverse) eV/A^2
SHELLS = [
    (A * np.sqrt(3) / 2, None, 2.5, 0.3),
    (A, (0, 0), 1.2, 0.1),
    (A, (1, 1), 0.8, -0.05),
]

failures = []


def check(condition, message):
    if not condition:
        failures.append(message)
        print("FAIL:", message)


MODEL = SpringCrystal(CELL, TAU, MASSES, SHELLS)
d_of_q = MODEL.d_of_q       # also used by test_frozen_numpy.py
hessian = MODEL.hessian


def wavenumbers(eigenvalues):
    return np.sign(eigenvalues) * np.sqrt(np.abs(eigenvalues)) * CM1


def xyz(path, cell, species, masses, positions):
    with open(path, "w") as f:
        f.write("%d\n" % len(species))
        f.write('Lattice="%s" pbc="T T T" Properties=species:S:1:pos:R:3:masses:R:1\n'
                % " ".join("%.12f" % x for x in cell.ravel()))
        for s, m, p in zip(species, masses, positions):
            f.write("%s %.12f %.12f %.12f %.6f\n" % (s, p[0], p[1], p[2], m))


def supercell(n):
    """The n x n x n supercell in the standard order (n3 fastest, sites inside)."""
    species, masses, pos = [], [], []
    for l in np.ndindex(n, n, n):
        for k in range(2):
            species.append(SPECIES[k])
            masses.append(MASSES[k])
            pos.append(np.array(l) @ CELL + TAU[k])
    return species, np.array(masses), np.array(pos), CELL * n


def run(args, expect=0):
    p = subprocess.run([QUAVER, "bands"] + args, capture_output=True, text=True)
    check(p.returncode == expect, "exit %d (expected %d) for %s: %s" % (p.returncode, expect, args, p.stderr))
    return p


def compare(doc, what):
    recip = 2 * np.pi * np.linalg.inv(CELL).T          # rows b_i, a_i.b_j = 2 pi delta_ij
    # where the path jumps ("X|M"), the point before and the label's point
    # share one distance
    jumps = {l["index"] for l in doc["labels"] if "|" in l["label"]}
    worst = 0.0
    prev, dist = None, 0.0
    for k, point in enumerate(doc["points"]):
        q = np.array(point["q"]) @ recip
        want = np.sort(wavenumbers(np.linalg.eigvalsh(d_of_q(q))))
        got = np.sort(np.array(point["wavenumbers"]))
        # zeros at Gamma are square roots of round-off: compare omega^2
        scale = max(1.0, np.max(np.abs(want)))
        diff = np.abs(np.sign(got) * got ** 2 - np.sign(want) * want ** 2) / scale ** 2
        worst = max(worst, float(np.max(diff)))
        if prev is not None and k not in jumps:
            dist += np.linalg.norm(q - prev)
        prev = q
        check(abs(point["distance"] - dist) < 1e-9,
              "%s: point %d at distance %.9f, NumPy %.9f" % (what, k, point["distance"], dist))
    print("%s: %d q points, largest relative difference of omega^2 %.2e" % (what, len(doc["points"]), worst))
    check(worst < 1e-10, "%s: D(q) spectra differ from NumPy by %.3g" % (what, worst))


def main():
    rng = np.random.default_rng(11)
    with tempfile.TemporaryDirectory() as tmp:
        prim = os.path.join(tmp, "prim.xyz")
        xyz(prim, CELL, SPECIES, MASSES, TAU)
        species, masses, pos, scell = supercell(3)
        sites = [0 if s == "Cs" else 1 for s in species]
        h = hessian(sites, pos, scell)
        # the springs obey the sum rule: sum over atoms j of H[row, (j, beta)] = 0
        check(np.max(np.abs(h.reshape(3 * len(pos), -1, 3).sum(axis=1))) < 1e-9,
              "model Hessian obeys the sum rule")

        # standard order, --supercell 3x3x3, Hessian in kJ/mol/A^2
        hess_std = os.path.join(tmp, "std.hess")
        np.savetxt(hess_std, h / KJ_MOL)
        path = "G 0 0 0; X 0 0.5 0; M 0.5 0.5 0; G; R 0.5 0.5 0.5"
        p = run([prim, "--supercell", "3x3x3", "-H", hess_std, "-u", "kJ/mol/A^2",
                 "--path", path, "--points", "80", "-f", "json"])
        if p.returncode == 0:
            doc = json.loads(p.stdout)
            compare(doc, "standard order")
            labels = [l["label"] for l in doc["labels"]]
            check(labels == ["G", "X", "M", "G", "R"], "labels %s" % labels)
            # |G-X| = pi/a, |X-M| = pi/a, |M-G| = sqrt(2) pi/a, |G-R| = sqrt(3) pi/a (with 2 pi)
            want = np.cumsum([0, 1, 1, np.sqrt(2), np.sqrt(3)]) * np.pi / A
            got = np.array([l["distance"] for l in doc["labels"]])
            check(np.max(np.abs(got - want)) < 1e-12, "label distances %s vs %s" % (got, want))
            check(len(doc["points"][0]["wavenumbers"]) == 6, "six branches")

        # shuffled atoms, each shifted by a random supercell vector, .npy Hessian
        perm = rng.permutation(len(pos))
        shift = rng.integers(-1, 2, size=(len(pos), 3)) @ scell
        pos_s = pos[perm] + shift
        idx = np.concatenate([[3 * i, 3 * i + 1, 3 * i + 2] for i in perm])
        h_s = h[np.ix_(idx, idx)]
        sc_xyz = os.path.join(tmp, "sc.xyz")
        xyz(sc_xyz, scell, [species[i] for i in perm], masses[perm], pos_s)
        hess_npy = os.path.join(tmp, "sc.npy")
        np.save(hess_npy, h_s)
        p = run([prim, "-S", sc_xyz, "-H", hess_npy, "-u", "eV/A^2", "--points", "120", "-f", "json"])
        if p.returncode == 0:
            doc = json.loads(p.stdout)
            check(doc["lattice"] == "cP", "default path for simple cubic: %s" % doc["lattice"])
            compare(doc, "shuffled, default path")
            # ascending order instead of the overlap connection: the same
            # spectra, each q sorted
            p2 = run([prim, "-S", sc_xyz, "-H", hess_npy, "-u", "eV/A^2", "--points", "120", "-f", "json",
                      "--connect", "sort", "--threads", "1"])
            if p2.returncode == 0:
                sorted_doc = json.loads(p2.stdout)
                a = np.array([pt["wavenumbers"] for pt in sorted_doc["points"]])
                b = np.sort(np.array([pt["wavenumbers"] for pt in doc["points"]]), axis=1)
                check(np.all(np.diff(a, axis=1) >= 0), "--connect sort is ascending")
                # compared as signed omega^2 relative to the largest: the
                # acoustic zeros at Gamma are sqrt(rounding noise), a few
                # 1e-6 cm^-1 that differ with the thread count
                a2, b2 = a * np.abs(a), b * np.abs(b)
                gap = np.max(np.abs(a2 - b2)) / np.max(np.abs(b2))
                check(gap < 1e-9, "--connect sort vs overlap: %.3g of the largest omega^2" % gap)
            acoustic = doc["gamma_acoustic_before_sum_rule"]
            check(max(abs(x) for x in acoustic) < 1e-3, "acoustic before the sum rule %s" % acoustic)

        # the same cell as a CIF (CIF 1.1 syntax, Hall, Allen & Brown 1991):
        # the identical dispersion
        cif = os.path.join(tmp, "prim.cif")
        with open(cif, "w") as f:
            f.write("data_cscl_model\n# invented spring model's cell\n"
                    "_cell_length_a %.6f\n_cell_length_b %.6f\n_cell_length_c %.6f\n"
                    "_cell_angle_alpha 90\n_cell_angle_beta 90\n_cell_angle_gamma 90\n"
                    "loop_\n_symmetry_equiv_pos_as_xyz\nx,y,z\n"
                    "loop_\n_atom_site_label\n_atom_site_type_symbol\n"
                    "_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
                    "Cs1 Cs 0 0 0\nCl1 Cl 0.5 0.5 0.5\n" % (A, A, A))
        # masses: a CIF carries none, so each element's most abundant isotope
        # (Quaver's default); the XYZ cell compared with it states those
        # masses, taken here from periodictable (1995 evaluation: within
        # 4e-5 u of Quaver's table, far below the tolerance)
        prim_iso = os.path.join(tmp, "prim-iso.xyz")
        iso = [periodictable.elements.symbol(el) for el in SPECIES]
        iso_masses = [float(e[max((i for i in e if i.abundance), key=lambda i: i.abundance).isotope].mass)
                      for e in iso]
        xyz(prim_iso, CELL, SPECIES, iso_masses, TAU)
        p = run([cif, "--supercell", "3x3x3", "-H", hess_std, "-u", "kJ/mol/A^2",
                 "--path", "G 0 0 0; X 0 0.5 0", "--points", "20", "-f", "json"])
        p_xyz = run([prim_iso, "--supercell", "3x3x3", "-H", hess_std, "-u", "kJ/mol/A^2",
                     "--path", "G 0 0 0; X 0 0.5 0", "--points", "20", "-f", "json"])
        if p.returncode == 0 and p_xyz.returncode == 0:
            # each q sorted: the branch order at the degenerate Gamma point
            # depends on the eigensolver's basis, the spectra must not
            a = np.sort(np.array([pt["wavenumbers"] for pt in json.loads(p.stdout)["points"]]), axis=1)
            b = np.sort(np.array([pt["wavenumbers"] for pt in json.loads(p_xyz.stdout)["points"]]), axis=1)
            check(a.shape == b.shape and np.max(np.abs(a - b)) < 1e-5 * np.max(np.abs(b)),
                  "a CIF cell gives the XYZ cell's bands (largest difference %.3g cm^-1)"
                  % (np.max(np.abs(a - b)) if a.shape == b.shape else -1))

        # LO-TO: Born charges +-Z on Cs, Cl and eps_inf; at Gamma approached
        # along y the spectrum is that of D(0) + D_NA(y), with the rigid-ion
        # term D_NA = e^2 (q.Z_k)(q.Z_k') / (eps0 Omega q.eps.q sqrt(m_k m_k'))
        # (Cochran & Cowley 1962, the q -> 0 limit; from memory), computed
        # here in SI and converted to eV/(A^2 u). Only Gamma is compared:
        # away from it the term is interpolated (docs/methods.md), which
        # has no closed form here.
        z, eps = 1.1, 2.3
        born = os.path.join(tmp, "born.txt")
        with open(born, "w") as f:
            f.write("# invented rigid-ion charges\ndielectric\n%g 0 0\n0 %g 0\n0 0 %g\nborn\n" % (eps, eps, eps))
            for sign in (1, -1):
                f.write("%g 0 0\n0 %g 0\n0 0 %g\n" % (sign * z, sign * z, sign * z))
        p = run([prim, "--supercell", "3x3x3", "-H", hess_std, "-u", "kJ/mol/A^2",
                 "--path", "G 0 0 0; X 0 0.5 0", "--points", "20", "-f", "json", "--born", born])
        if p.returncode == 0:
            doc = json.loads(p.stdout)
            check(doc.get("born") == born, "the JSON names the Born file")
            omega = (A * 1e-10) ** 3
            qhat = np.array([0.0, 1.0, 0.0])
            charges = [z, -z]
            d_na = np.zeros((6, 6))
            for k1 in range(2):
                for k2 in range(2):
                    block = sc.e ** 2 * np.outer(charges[k1] * qhat, charges[k2] * qhat) / (
                        sc.epsilon_0 * omega * eps * np.sqrt(MASSES[k1] * MASSES[k2]) * M_U)
                    d_na[3 * k1:3 * k1 + 3, 3 * k2:3 * k2 + 3] = block * 1e-20 * M_U / sc.e
            want = np.sort(wavenumbers(np.linalg.eigvalsh(d_of_q(np.zeros(3)) + d_na)))
            got = np.sort(np.array(doc["points"][0]["wavenumbers"]))
            optical = want > 1.0
            check(np.max(np.abs(got[optical] - want[optical]) / want[optical]) < 1e-5,
                  "LO-TO at Gamma along y: %s, NumPy %s" % (got[optical], want[optical]))
            lo_minus_to = want[optical].max() - want[optical].min()
            check(lo_minus_to > 1.0, "the model splits LO from TO (%.3f cm^-1)" % lo_minus_to)
            print("LO-TO at Gamma: quaver %s, NumPy %s" % (got[optical], want[optical]))

        # a supercell with one atom missing is reported, not folded
        sc_bad = os.path.join(tmp, "bad.xyz")
        xyz(sc_bad, scell, [species[i] for i in perm][:-1], masses[perm][:-1], pos_s[:-1])
        p = run([prim, "-S", sc_bad, "-H", hess_npy, "-u", "eV/A^2"], expect=2)
        check("wrong supercell size" in p.stderr, "wrong size message: %s" % p.stderr)
        # a path without coordinates is a usage error that says what to write
        p = run([prim, "-S", sc_xyz, "-H", hess_npy, "-u", "eV/A^2", "--path", "G 0 0 0; Q"], expect=1)
        check("LABEL QA QB QC" in p.stderr or "Q QA QB QC" in p.stderr, "path message: %s" % p.stderr)
        # units are never guessed
        p = run([prim, "-S", sc_xyz, "-H", hess_npy], expect=1)

    if failures:
        print("%d check(s) failed" % len(failures))
        sys.exit(1)
    print("all checks passed")


if __name__ == "__main__":
    main()
