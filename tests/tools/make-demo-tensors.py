#!/usr/bin/python3
"""Adds invented derivative tensors to the demo bundle
(data/examples/ethanol-unconverged/ethanol.quaver.json), so the app and
`quaver spectrum --demo` have an IR and a Raman spectrum to show.

Invented, like the rest of the demo: atomic polar tensors of rigid point
charges (dmu/dx_aj = q_a e_j, charges below, summing to zero) and
polarisability derivatives of a bond-polarisability model (each bond adds
alpha_perp I + (alpha_par - alpha_perp) u u^T, both growing linearly with the
bond length; bonds from covalent radii as Quaver perceives them), by central
differences.  Neither is a property of real ethanol.

    /usr/bin/python3 tests/tools/make-demo-tensors.py   (rewrites the bundle)
"""
import json
import os
import sys

import numpy as np

ROOT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..")
PATH = os.path.join(ROOT, "data", "examples", "ethanol-unconverged", "ethanol.quaver.json")

# invented partial charges (e): C1 C2 O3 H4..H8 H9
CHARGES = {"C1": -0.30, "C2": 0.10, "O3": -0.62, "H9": 0.42}
H_CHARGE = (0.0 - sum(CHARGES.values())) / 5
# invented bond-polarisability parameters: A^3 at the reference length, A^2 per A
ALPHA_PAR, ALPHA_PERP, D_PAR, D_PERP = 1.2, 0.6, 1.6, 0.35
COVALENT = {"H": 0.31, "C": 0.76, "O": 0.66}   # Cordero et al. 2008, as qv-element


def bonds(symbols, x):
    out = []
    for a in range(len(symbols)):
        for b in range(a + 1, len(symbols)):
            d = np.linalg.norm(x[a] - x[b])
            if d < (COVALENT[symbols[a]] + COVALENT[symbols[b]]) * 1.15:
                out.append((a, b, d))
    return out


def polarisability(x, bond_list):
    alpha = np.zeros((3, 3))
    for a, b, r0 in bond_list:
        v = x[b] - x[a]
        r = np.linalg.norm(v)
        u = v / r
        par = ALPHA_PAR + D_PAR * (r - r0)
        perp = ALPHA_PERP + D_PERP * (r - r0)
        alpha += perp * np.eye(3) + (par - perp) * np.outer(u, u)
    return alpha


def main():
    doc = json.load(open(PATH))
    atoms = doc["structure"]["atoms"]
    symbols = [a["element"] for a in atoms]
    x = np.array([a["position"] for a in atoms], dtype=float)
    n = len(atoms)
    labels = ["%s%d" % (s, i + 1) for i, s in enumerate(symbols)]
    q = np.array([CHARGES.get(l, H_CHARGE) for l in labels])
    assert abs(q.sum()) < 1e-12
    apt = np.zeros((3, 3 * n))
    for a in range(n):
        for j in range(3):
            apt[j, 3 * a + j] = q[a]
    bl = bonds(symbols, x)
    h = 1e-5
    dalpha = np.zeros((6, 3 * n))
    order = [(0, 0), (1, 1), (2, 2), (0, 1), (0, 2), (1, 2)]
    for c in range(3 * n):
        xp, xm = x.copy(), x.copy()
        xp.flat[c] += h
        xm.flat[c] -= h
        d = (polarisability(xp, bl) - polarisability(xm, bl)) / (2 * h)
        for row, (i, j) in enumerate(order):
            dalpha[row, c] = d[i, j]
    # appended as text in the bundle's own compact style (one row a line),
    # so the rest of the file stays byte for byte what make-demo.py wrote
    text = open(PATH).read()
    if '"dipole_derivatives"' in text:
        sys.exit("make-demo-tensors.py: %s has tensors already; run make-demo.py first" % PATH)
    body = text.rstrip()
    assert body.endswith("}")
    body = body[:-1].rstrip()

    def rows(m):
        return ",\n".join("      [" + ", ".join("%.8g" % (v + 0.0) for v in row) + "]" for row in m)

    body += (',\n  "dipole_derivatives": {"units": "e", "data": [\n%s\n  ]},\n'
             '  "polarizability_derivatives": {"units": "A^2", "data": [\n%s\n  ]}\n}\n'
             % (rows(apt), rows(dalpha)))
    with open(PATH + ".tmp", "w") as f:
        f.write(body)
    os.replace(PATH + ".tmp", PATH)
    print("wrote %s: %d bonds, charges %s" % (PATH, len(bl), np.round(q, 3)))


if __name__ == "__main__":
    sys.exit(main())
