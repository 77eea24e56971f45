#!/usr/bin/python3
"""test_thermo_numpy.py — `quaver thermo` and `quaver dos` against an
independent NumPy/SciPy computation on the same mesh.

An invented CsCl-type crystal (simple cubic, two sites, spring constants of
our own): the supercell Hessian is built here from the springs, and D(q) of
the infinite crystal straight from the same springs (harmonic-crystal
equations of motion, Ashcroft & Mermin ch. 22, from memory), diagonalised by
numpy.linalg.eigh on the Gamma-centred mesh. Thermal sums (McQuarrie,
Statistical Mechanics, ch. 11, from memory) with CODATA 2018 constants from
scipy.constants:
    F = sum [hw/2 + kT ln(1 - e^-x)],  S = k sum [x/(e^x-1) - ln(1-e^-x)],
    Cv = k sum x^2 e^x/(e^x-1)^2,  U_k = sum hbar/(2 N m_k w) coth(x/2) Re(e e^+),
each mesh point weighing 1/N_q, the three acoustic modes at Gamma left out.

With --born (invented rigid-ion charges +-Z, eps_inf), D(q) gains the
non-analytic term of Cochran & Cowley (J. Phys. Chem. Solids 23, 447, 1962,
the q -> 0 limit; from memory), spread over the supercell as Wang et al.,
J. Phys.: Condens. Matter 22, 202201 (2010) (from memory), rebuilt here in
SI from scipy.constants with its own Wigner-Seitz images
(docs/methods.md, "Non-analytic correction"), and left out at Gamma itself.

SPDX-License-Identifier: GPL-3.0-or-later
"""
import json
import os
import subprocess
import sys
import tempfile

import numpy as np
import scipy.constants as sc

sys.dont_write_bytecode = True
sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from spring_crystal import SpringCrystal  # noqa: E402

QUAVER = os.environ.get("QUAVER") or os.path.join(
    os.environ.get("QV_BUILD_ROOT", "/work/main/build"), "src", "cli", "quaver")

M_U = sc.physical_constants["atomic mass constant"][0]
CM1 = np.sqrt(sc.e / (1e-20 * M_U)) / (2 * np.pi * sc.c * 100)   # sqrt(eV/(A^2 u)) in cm^-1

A = 3.4
SPECIES = ["K", "Br"]
MASSES = np.array([39.0983, 79.904])
TAU = np.array([[0.0, 0.0, 0.0], [0.5, 0.5, 0.5]]) * A
CELL = np.eye(3) * A
SHELLS = [(A * np.sqrt(3) / 2, None, 1.9, 0.25), (A, (0, 0), 0.9, 0.08), (A, (1, 1), 0.6, 0.05)]
MESH = (6, 6, 6)

failures = []


def check(condition, message):
    if not condition:
        failures.append(message)
        print("FAIL:", message)


MODEL = SpringCrystal(CELL, TAU, MASSES, SHELLS)
d_of_q = MODEL.d_of_q


def write_inputs(tmp):
    n = 3
    species, masses, pos, sites = [], [], [], []
    for l in np.ndindex(n, n, n):
        for k in range(2):
            species.append(SPECIES[k]); masses.append(MASSES[k]); sites.append(k)
            pos.append(np.array(l) @ CELL + TAU[k])
    pos = np.array(pos)
    scell = CELL * n
    h = MODEL.hessian(sites, pos, scell)
    prim = os.path.join(tmp, "prim.xyz")
    with open(prim, "w") as f:
        f.write("2\nLattice=\"%s\" pbc=\"T T T\" Properties=species:S:1:pos:R:3:masses:R:1\n"
                % " ".join("%.12f" % x for x in CELL.ravel()))
        for k in range(2):
            f.write("%s %.12f %.12f %.12f %.6f\n" % (SPECIES[k], *TAU[k], MASSES[k]))
    hess = os.path.join(tmp, "sc.npy")
    np.save(hess, h)
    mol = os.path.join(tmp, "mol.xyz")
    with open(mol, "w") as f:
        f.write("2\ninvented diatomic\nH 0 0 0\nH 0 0 0.74\n")
    return prim, hess, mol


SUPERCELL = 3            # the 3x3x3 supercell of write_inputs
WS_TOLERANCE = 1e-5      # images kept within this relative length of the shortest (docs/methods.md)


def ws_images(r0):
    """Shortest images of r0 modulo the supercell lattice, each weighing 1/count."""
    scell = CELL * SUPERCELL
    cands = np.array([r0 + np.array(t) @ scell for t in np.ndindex(5, 5, 5)]) - 2 * scell.sum(axis=0)
    lens = np.linalg.norm(cands, axis=1)
    keep = cands[lens <= lens.min() * (1 + WS_TOLERANCE) + 1e-12]
    return keep, 1.0 / len(keep)


def nonanalytic(qcart, charges, eps):
    """D_NA(q) in eV/(A^2 u) for isotropic charges Z_k (rigid ions) and eps_inf (3x3):
    e^2 (q^.Z_k)(q^.Z_k') / (eps0 Omega q^.eps.q^ sqrt(m m')) times
    (1/N_c) sum_L sum_images w exp(i q.(R_L + T + tau_k' - tau_k)); zero at q = 0."""
    d = np.zeros((6, 6), complex)
    qlen = np.linalg.norm(qcart)
    if qlen == 0:
        return d
    qhat = qcart / qlen
    omega = abs(np.linalg.det(CELL)) * 1e-30          # m^3
    nc = SUPERCELL ** 3
    for k1 in range(2):
        for k2 in range(2):
            phase = 0
            for l in np.ndindex(SUPERCELL, SUPERCELL, SUPERCELL):
                images, w = ws_images(np.array(l) @ CELL + TAU[k2] - TAU[k1])
                phase += w * np.exp(1j * images @ qcart).sum()
            block = sc.e ** 2 * np.outer(charges[k1] * qhat, charges[k2] * qhat) / (
                sc.epsilon_0 * omega * (qhat @ eps @ qhat) * np.sqrt(MASSES[k1] * MASSES[k2]) * M_U)
            d[3 * k1:3 * k1 + 3, 3 * k2:3 * k2 + 3] = block * 1e-20 * M_U / sc.e * phase / nc
    return d


def mesh_modes(extra=None):
    recip = 2 * np.pi * np.linalg.inv(CELL).T
    qs, ws, vs = [], [], []
    for i, j, k in np.ndindex(*MESH):
        f = np.array([i, j, k], float) / MESH
        f = np.where(2 * np.array([i, j, k]) > np.array(MESH), f - 1, f)
        d = d_of_q(f @ recip)
        if extra is not None:
            d = d + extra(f @ recip)
        lam, vec = np.linalg.eigh(d)
        qs.append(f); ws.append(np.sign(lam) * np.sqrt(np.abs(lam)) * CM1); vs.append(vec)
    return np.array(qs), np.array(ws), np.array(vs)


def thermal(qs, ws, vs, temps):
    hw = sc.h * sc.c * 100 * ws              # J
    use = ws > 0
    g = np.where(np.all(qs == 0, axis=1))[0][0]
    use[g, np.argsort(np.abs(ws[g]))[:3]] = False
    nq = len(qs)
    out = {"F": [], "S": [], "Cv": [], "ZPE": [], "U": []}
    adp = []
    for t in temps:
        e = hw[use]
        zpe = 0.5 * e.sum() / nq
        if t == 0:
            f, s, cv = zpe, 0.0, 0.0
            coth = np.ones_like(hw)
        else:
            x = e / (sc.k * t)
            f = zpe + sc.k * t * np.log(-np.expm1(-x)).sum() / nq
            s = sc.k * (x / np.expm1(x) - np.log(-np.expm1(-x))).sum() / nq
            cv = sc.k * (x * x * np.exp(x) / np.expm1(x) ** 2).sum() / nq
            with np.errstate(divide="ignore", over="ignore"):
                coth = 1 / np.tanh(hw / (2 * sc.k * t))
        for key, v in (("F", f), ("S", s), ("Cv", cv), ("ZPE", zpe), ("U", f + t * s)):
            out[key].append(v / sc.e)        # eV, eV/K per cell
        omega = 2 * np.pi * sc.c * 100 * ws
        u = np.zeros((2, 3, 3))
        for q in range(nq):
            for b in range(6):
                if not use[q, b]:
                    continue
                for k in range(2):
                    e_k = vs[q][3 * k:3 * k + 3, b]
                    u[k] += (sc.hbar / (2 * nq * MASSES[k] * M_U * omega[q, b]) * coth[q, b]
                             * np.real(np.outer(e_k, e_k.conj()))) * 1e20
        adp.append(u)
    return out, adp


def born_checks(tmp, base, plain, ws_plain):
    """--born for thermo and dos: against NumPy sums over eig(D(q) + D_NA(q))."""
    z, eps = 1.1, 2.3
    charges = [z, -z]
    born = os.path.join(tmp, "born.txt")
    with open(born, "w") as f:
        f.write("# invented rigid-ion charges\ndielectric\n%g 0 0\n0 %g 0\n0 0 %g\nborn\n" % (eps, eps, eps))
        for c in charges:
            f.write("%g 0 0\n0 %g 0\n0 0 %g\n" % (c, c, c))
    tflags = ["--t-min", "0", "--t-max", "900", "--t-step", "150", "--adp"]
    p = subprocess.run([QUAVER, "thermo"] + base + tflags + ["-f", "json", "--born", born],
                       capture_output=True, text=True)
    check(p.returncode == 0, "thermo --born exit %d: %s" % (p.returncode, p.stderr))
    if p.returncode != 0:
        return
    got = json.loads(p.stdout)
    check(got.get("born") == born and "left out" in got.get("nonanalytic_at_gamma", ""),
          "thermo JSON names the Born file and the Gamma rule")
    temps = np.array(got["T"])
    qs, ws, vs = mesh_modes(lambda q: nonanalytic(q, charges, np.eye(3) * eps))
    want, adp = thermal(qs, ws, vs, temps)
    for key in ("F", "S", "Cv", "ZPE", "U"):
        g = np.array(got["per_cell"][key]); w = np.array(want[key]); p0 = np.array(plain["per_cell"][key])
        err = np.max(np.abs(g - w)) / np.max(np.abs(w))
        shift = np.max(np.abs(w - p0)) / np.max(np.abs(w))
        print("--born %s per cell: largest relative difference %.2e (the term moves it by %.2e)"
              % (key, err, shift))
        check(err < 1e-8, "--born %s per cell: %s vs NumPy %s" % (key, g, w))
        if key in ("F", "ZPE"):
            check(shift > 1e-5, "--born changes %s (%.3g), so the check can fail" % (key, shift))
    uerr = 0
    for s in range(2):
        for i in range(len(temps)):
            g = np.array(got["adp"][s]["U"][i]).reshape(3, 3)
            uerr = max(uerr, np.max(np.abs(g - adp[i][s])) / np.max(np.abs(adp[i][s])))
    print("--born U tensors: largest relative difference %.2e" % uerr)
    check(uerr < 1e-8, "--born U tensors differ by %.3g" % uerr)
    # the LO branch lies above every mode of the analytic D(q) near Gamma
    print("--born highest mesh mode %.4f cm^-1 (without: %.4f)" % (ws.max(), ws_plain.max()))
    check(ws.max() > ws_plain.max() + 1, "the term raises the highest mode")

    p = subprocess.run([QUAVER, "thermo"] + base + tflags + ["-f", "text", "--born", born],
                       capture_output=True, text=True)
    check(p.returncode == 0 and "except Gamma itself" in p.stdout, "thermo text notes Gamma: %s" % p.stderr)

    for method in ("tetrahedron", "gaussian"):
        p = subprocess.run([QUAVER, "dos"] + base + ["--method", method, "-f", "json", "--born", born],
                           capture_output=True, text=True)
        check(p.returncode == 0, "dos --born exit %d: %s" % (p.returncode, p.stderr))
        if p.returncode != 0:
            continue
        d = json.loads(p.stdout)
        tot = np.sum(d["total"]) * d["step"]
        parts = {k: np.sum(v) * d["step"] for k, v in d["partial"].items()}
        print("dos --born %s: integral %.8f, partial %s, top of grid %.3f" % (method, tot, parts, d["frequency"][-1]))
        check(abs(tot - 6) < 1e-5, "dos --born %s integral %.8f (3n = 6)" % (method, tot))
        for k in ("K", "Br"):
            check(abs(parts[k] - 3) < 1e-5, "dos --born partial %s %s %.8f" % (method, k, parts[k]))
        if method == "gaussian":
            x = np.array(d["frequency"])
            sig = d["sigma"]
            g = np.exp(-0.5 * ((x[:, None] - ws.ravel()[None, :]) / sig) ** 2).sum(axis=1)
            g /= sig * np.sqrt(2 * np.pi) * len(qs)
            err = np.max(np.abs(np.array(d["total"]) - g)) / np.max(g)
            print("gaussian DOS --born against NumPy: %.2e" % err)
            check(err < 1e-6, "gaussian DOS --born against NumPy %.3g" % err)
    p = subprocess.run([QUAVER, "dos"] + base + ["--born", born], capture_output=True, text=True)
    check(p.returncode == 0 and "except Gamma itself" in p.stdout, "dos text notes Gamma: %s" % p.stderr)

    # charges for three atoms in a two-site cell: input error naming the file
    bad = os.path.join(tmp, "born3.txt")
    with open(bad, "w") as f:
        f.write("dielectric\n1 0 0\n0 1 0\n0 0 1\nborn\n" + "1 0 0\n0 1 0\n0 0 1\n" * 3)
    for cmd in ("dos", "thermo"):
        p = subprocess.run([QUAVER, cmd] + base + ["--born", bad], capture_output=True, text=True)
        check(p.returncode == 2 and bad in p.stderr and "primitive cell has 2" in p.stderr,
              "%s --born with 3 atoms: exit %d, %s" % (cmd, p.returncode, p.stderr))


def main():
    with tempfile.TemporaryDirectory() as tmp:
        prim, hess, mol = write_inputs(tmp)
        base = [prim, "--supercell", "3x3x3", "-H", hess, "-u", "eV/A^2", "--mesh", "6x6x6"]
        p = subprocess.run([QUAVER, "thermo"] + base + ["--t-min", "0", "--t-max", "900", "--t-step", "150",
                                                        "--adp", "--sound", "1 0 0; 1 1 1", "-f", "json"],
                           capture_output=True, text=True)
        check(p.returncode == 0, "thermo exit %d: %s" % (p.returncode, p.stderr))
        if p.returncode != 0:
            return
        got = json.loads(p.stdout)
        temps = np.array(got["T"])
        qs, ws, vs = mesh_modes()
        want, adp = thermal(qs, ws, vs, temps)
        for key in ("F", "S", "Cv", "ZPE", "U"):
            g = np.array(got["per_cell"][key]); w = np.array(want[key])
            err = np.max(np.abs(g - w)) / np.max(np.abs(w))
            print("%s per cell: largest relative difference %.2e" % (key, err))
            check(err < 1e-8, "%s per cell: %s vs %s" % (key, g, w))
            # per mole of formula units: KBr, one formula unit per cell
            conv = sc.e * sc.N_A / (1000 if key in ("F", "ZPE", "U") else 1)
            gm = np.array(got[key])
            check(np.max(np.abs(gm - w * conv)) <= 1e-8 * np.max(np.abs(w * conv)), "%s per mole" % key)
        check(got["formula_unit"] == "KBr" and got["formula_units_per_cell"] == 1, "formula %s" % got["formula_unit"])
        check(got["gamma_acoustic_left_out"] == 3 and got["imaginary_left_out"] == 0, "modes left out")
        uerr = 0
        for s in range(2):
            for i, t in enumerate(temps):
                g = np.array(got["adp"][s]["U"][i]).reshape(3, 3)
                uerr = max(uerr, np.max(np.abs(g - adp[i][s])) / np.max(np.abs(adp[i][s])))
        print("U tensors: largest relative difference %.2e (U_iso of K at 300 K: %.5f A^2)"
              % (uerr, got["adp"][0]["U_iso"][2]))
        check(uerr < 1e-8, "U tensors differ by %.3g" % uerr)
        # sound velocities: slope of the NumPy branches at small q along [100]
        recip = 2 * np.pi * np.linalg.inv(CELL).T
        for d, sv in zip(([1, 0, 0], [1, 1, 1]), got["sound"]):
            u = np.array(d, float) @ recip
            u /= np.linalg.norm(u)
            dq = 1e-4
            lam = np.linalg.eigvalsh(d_of_q(u * dq))[:3]
            v = np.sqrt(lam) * np.sqrt(sc.e / (1e-20 * M_U)) / (dq * 1e10)
            err = np.max(np.abs(np.array(sv["velocity"]) - v) / v)
            print("sound along %s: %s m/s (NumPy at q = 1e-4: %s), relative %.2e" % (d, sv["velocity"], v, err))
            check(err < 1e-5, "sound velocity along %s" % d)

        # DOS: both methods integrate to 3n = 6; each element's partial to 3 (completeness)
        for method in ("tetrahedron", "gaussian"):
            for unit in ("cm-1", "THz"):
                p = subprocess.run([QUAVER, "dos"] + base + ["--method", method, "--unit", unit, "-f", "json"],
                                   capture_output=True, text=True)
                check(p.returncode == 0, "dos exit %d: %s" % (p.returncode, p.stderr))
                if p.returncode != 0:
                    continue
                d = json.loads(p.stdout)
                step = d["step"]
                tot = np.sum(d["total"]) * step
                parts = {k: np.sum(v) * step for k, v in d["partial"].items()}
                print("dos %s %s: integral %.8f, partial %s" % (method, unit, tot, parts))
                check(abs(tot - 6) < 1e-5, "dos %s %s integral %.8f" % (method, unit, tot))
                for k in ("K", "Br"):
                    check(abs(parts[k] - 3) < 1e-5, "partial %s %s %.8f" % (method, k, parts[k]))
                if method == "gaussian" and unit == "cm-1":
                    # NumPy Gaussian DOS at the same grid points
                    x = np.array(d["frequency"])
                    sig = d["sigma"]
                    g = np.exp(-0.5 * ((x[:, None] - ws.ravel()[None, :]) / sig) ** 2).sum(axis=1)
                    g /= sig * np.sqrt(2 * np.pi) * len(qs)
                    err = np.max(np.abs(np.array(d["total"]) - g)) / np.max(g)
                    print("gaussian DOS against NumPy: %.2e" % err)
                    check(err < 1e-6, "gaussian DOS against NumPy %.3g" % err)

        # the CSV and text tables carry the same numbers as the JSON (printed to 8 digits)
        for fmt in ("csv", "text"):
            p = subprocess.run([QUAVER, "thermo"] + base + ["--t-min", "0", "--t-max", "900", "--t-step", "150",
                                                            "-f", fmt], capture_output=True, text=True)
            check(p.returncode == 0, "thermo %s exit %d: %s" % (fmt, p.returncode, p.stderr))
            lines = [l for l in p.stdout.splitlines() if l and not l.startswith("#")]
            if fmt == "csv":
                header = lines[0].split(",")
                check(header[:6] == ["T_K", "F_kJ/mol", "U_kJ/mol", "S_J/(K.mol)", "Cv_J/(K.mol)", "ZPE_kJ/mol"],
                      "csv header %s" % header)
                lines = lines[1:]
            rows = np.array([[float(x) for x in l.replace(",", " ").split()] for l in lines])
            check(rows.shape == (7, 10), "%s table shape %s" % (fmt, rows.shape))
            if rows.shape == (7, 10):
                for c, key in enumerate(("F", "U", "S", "Cv", "ZPE")):
                    ref = np.array(got[key])
                    check(np.allclose(rows[:, 1 + c], ref, rtol=1e-7, atol=1e-9), "%s %s column" % (fmt, key))
        p = subprocess.run([QUAVER, "thermo"] + base + ["--sound", "1 0 0", "-f", "csv"], capture_output=True, text=True)
        check(p.returncode == 1 and "--sound" in p.stderr, "--sound with csv: %d %s" % (p.returncode, p.stderr))

        born_checks(tmp, base, got, ws)

        # a molecule is refused with exit 1 and says why
        p = subprocess.run([QUAVER, "thermo", mol, "-H", hess, "-u", "eV/A^2", "--supercell", "1x1x1"],
                           capture_output=True, text=True)
        check(p.returncode == 1 and "gas-phase thermochemistry" in p.stderr,
              "molecule: exit %d, %s" % (p.returncode, p.stderr))
        # bad mesh: usage error
        p = subprocess.run([QUAVER, "dos"] + base[:-1] + ["4x4"], capture_output=True, text=True)
        check(p.returncode == 1 and "NxMxL" in p.stderr, "bad mesh: %d %s" % (p.returncode, p.stderr))


main()
if failures:
    print("%d failure(s)" % len(failures))
    sys.exit(1)
print("all checks passed")
