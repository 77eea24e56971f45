#!/usr/bin/python3
# test_symmetry.py — point groups and mode species through the command line.
#
# Invented models (ours, for this test): an ammonia-like C3v molecule and a
# CO2-like linear one, with Hessians from a pair potential of our own
# (V = sum 1/2 k (r - 0.8 r0)^2 over all pairs at r = r0, so every direction
# is stiff; k depends only on the elements and r0, so the Hessian has the
# geometry's symmetry).  Checks:
# - `modes --format json`: top-level point_group {name, tolerance,
#   symmetry_number}, per-mode symmetry {label, ir_active, raman_active}.
# - Each set's label against characters computed here with NumPy from the
#   displacement vectors (trace of the operation on the set's mass-weighted
#   vectors with the atom permutation): C3v (Cotton's table, from memory):
#   A1 (chi(C3), chi(sv)) = (1, 1), E = (-1, 0).
# - Γvib = 2A1 + 2E for C3v and Σg+ + Σu+ + Πu for D∞h (hand reductions in
#   tests/unit/test-point-group.c); σ = 3 and 2 (common practice).
# - Text "sym" column, `table --columns ...,symmetry`, --symmetrize on a
#   Hessian with broken symmetry, --lowest cutting a degenerate set, and a
#   bad --symmetry-tolerance (exit 1).
# SPDX-License-Identifier: GPL-3.0-or-later
import os
import sys

import numpy as np

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import qvtest as q  # noqa: E402

chk = q.Checker("symmetry")
Z = {"H": 1, "N": 7, "C": 6, "O": 8}


def pair_hessian(symbols, x):
    x = np.asarray(x, float)
    n = len(x)
    H = np.zeros((3 * n, 3 * n))
    for i in range(n):
        for j in range(i + 1, n):
            d = x[j] - x[i]
            r = np.linalg.norm(d)
            u = d / r
            k = (10 + 0.37 * (Z[symbols[i]] + Z[symbols[j]]) + 0.11 * Z[symbols[i]] * Z[symbols[j]]) * np.exp(-r)
            blk = k * np.outer(u, u) + 0.2 * k * (np.eye(3) - np.outer(u, u))
            a, b = slice(3 * i, 3 * i + 3), slice(3 * j, 3 * j + 3)
            H[a, a] += blk
            H[b, b] += blk
            H[a, b] -= blk
            H[b, a] -= blk
    return H


def rot(axis, angle):
    return q.rotation_matrix(axis, angle)


# ammonia-like, then turned and moved so that nothing lies on the axes
sym_nh3 = ["N", "H", "H", "H"]
x0 = np.array([[0, 0, 0.38]] + [[0.94 * np.cos(a), 0.94 * np.sin(a), 0] for a in
                                 (0, 2 * np.pi / 3, 4 * np.pi / 3)])
R = rot([0.3, -0.5, 0.8], 0.7)
x_nh3 = x0 @ R.T + np.array([1.2, -0.4, 2.0])
axis = R @ np.array([0, 0, 1.0])             # the C3 axis, input frame
plane_n = R @ np.array([0, 1.0, 0])          # a σv through H1 (normal y)
centre = x_nh3[0] - 0.38 * axis               # on the axis at the H plane

with q.tmpdir() as tmp:
    xyz, hes = q.write_inputs(tmp, sym_nh3, x_nh3, pair_hessian(sym_nh3, x_nh3), name="nh3")
    doc = q.modes_json([xyz, "--hessian", hes, "--hessian-units", "eV/A^2", "--vectors"])
    pg = doc.get("point_group")
    chk.ok(isinstance(pg, dict) and pg.get("name") == "C3v" and pg.get("symmetry_number") == 3
           and abs(pg.get("tolerance", 0) - 0.01) < 1e-12,
           "NH3-like: point_group %r (C3v, σ 3, tolerance 0.01)" % pg)
    modes = doc["modes"]
    chk.ok(all(isinstance(m.get("symmetry"), dict) and isinstance(m["symmetry"].get("label"), str)
               and isinstance(m["symmetry"].get("ir_active"), bool)
               and isinstance(m["symmetry"].get("raman_active"), bool) for m in modes),
           "every mode has symmetry {label, ir_active, raman_active}")
    labels = [m["symmetry"]["label"] for m in modes]
    chk.ok(sorted(labels) == ["A1", "A1", "E", "E", "E", "E"], "Γvib = 2A1 + 2E: %r" % labels)
    chk.ok(all(m["symmetry"]["ir_active"] and m["symmetry"]["raman_active"] for m in modes),
           "C3v: A1 and E are IR and Raman active (Cotton's table)")

    # characters with NumPy: operations in the input frame about the centre
    masses = np.array(q.masses_of(sym_nh3))
    c3 = rot(axis, 2 * np.pi / 3)
    sv = np.eye(3) - 2 * np.outer(plane_n, plane_n)

    def perm_of(op):
        img = (x_nh3 - centre) @ op.T + centre
        return [int(np.argmin(np.linalg.norm(x_nh3 - p, axis=1))) for p in img]

    def character(op, vecs):
        p = perm_of(op)
        chi = 0.0
        for v in vecs:
            l = (np.array(v).reshape(-1, 3)) * np.sqrt(masses)[:, None]
            l /= np.linalg.norm(l)
            t = np.zeros_like(l)
            for a in range(len(l)):
                t[p[a]] = op @ l[a]
            chi += float(np.sum(t * l))
        return chi

    want = {"A1": (1, 1), "E": (-1, 0)}
    k = 0
    while k < len(modes):
        s = modes[k]["symmetry"]
        n = s["set_size"]
        vecs = [modes[j]["displacement"] for j in range(k, k + n)]
        got = (character(c3, vecs), character(sv, vecs))
        chk.close(got, want[s["label"]], "mode %d (%s): χ(C3), χ(σv) with NumPy" % (k + 1, s["label"]),
                  atol=1e-6)
        k += n

    # the text table has a sym column and the point group in its header
    p = q.run(["modes", xyz, "--hessian", hes, "--hessian-units", "eV/A^2"])
    lines = p.stdout_text.splitlines()
    chk.ok(any(l.startswith("# point group: C3v") for l in lines), "text header names C3v")
    head = [l for l in lines if l.lstrip().startswith("mode ")]
    chk.ok(head and head[0].split()[-1] == "sym", "text table has a sym column")
    rows = [l.split() for l in lines if l[:5].strip().isdigit()]
    chk.ok(sorted(r[-1] for r in rows) == sorted(labels), "text sym column = JSON labels")

    # quaver table: the symmetry column in CSV and JSON
    p = q.run(["table", xyz, "--hessian", hes, "--hessian-units", "eV/A^2", "--format", "csv",
               "--columns", "index,wavenumber,symmetry"])
    csv = [l.split(",") for l in p.stdout_text.splitlines()]
    chk.ok(csv[0][-1] == "symmetry" and sorted(r[-1] for r in csv[1:]) == sorted(labels),
           "table csv symmetry column: %r" % csv[:2])
    p = q.run(["table", xyz, "--hessian", hes, "--hessian-units", "eV/A^2", "--format", "json",
               "--columns", "index,symmetry"])
    tj = __import__("json").loads(p.stdout_text)
    chk.ok([m["symmetry"] for m in tj["modes"]] == labels and "C3v" in tj["caption"],
           "table json symmetry and caption")

    # a Hessian with its symmetry broken: "?" and a warning; --symmetrize fixes it
    rng = np.random.default_rng(3)
    H = pair_hessian(sym_nh3, x_nh3)
    E = rng.uniform(-1, 1, H.shape) * 0.02 * np.abs(H).max()
    xyz2, hes2 = q.write_inputs(tmp, sym_nh3, x_nh3, H + E + E.T, name="broken")
    d2 = q.modes_json([xyz2, "--hessian", hes2, "--hessian-units", "eV/A^2"])
    chk.ok(any(m["symmetry"]["label"] == "?" for m in d2["modes"])
           and any("broken" in w for w in d2["point_group"]["warnings"]),
           "broken Hessian: some '?' with a warning")
    d3 = q.modes_json([xyz2, "--hessian", hes2, "--hessian-units", "eV/A^2", "--symmetrize"])
    chk.ok(sorted(m["symmetry"]["label"] for m in d3["modes"]) == sorted(labels),
           "--symmetrize: every species back")
    # --lowest may cut a degenerate set: "?" with its own warning, not "broken"
    lab = {}
    for k in (2, 3):
        d = q.modes_json([xyz, "--hessian", hes, "--hessian-units", "eV/A^2", "--lowest", str(k)])
        lab[k] = ([m["symmetry"]["label"] for m in d["modes"]], d["point_group"]["warnings"])
    chk.ok(lab[2][0][-1] == "?" and any("cut off" in w for w in lab[2][1])
           and not any("broken" in w for w in lab[2][1]), "--lowest 2 cuts an E: %r" % (lab[2],))
    chk.ok("?" not in lab[3][0] and lab[3][1] == [], "--lowest 3 keeps whole sets: %r" % (lab[3],))
    # a looser tolerance is reported; a bad one is a usage error
    d4 = q.modes_json([xyz, "--hessian", hes, "--hessian-units", "eV/A^2", "--symmetry-tolerance", "0.05"])
    chk.ok(abs(d4["point_group"]["tolerance"] - 0.05) < 1e-12, "tolerance reported")
    p = q.run(["modes", xyz, "--hessian", hes, "--hessian-units", "eV/A^2", "--symmetry-tolerance", "-1"],
              expect=1)
    chk.ok("--symmetry-tolerance" in p.stderr_text, "bad tolerance: exit 1 naming the option")

    # CO2-like: D∞h through D2h
    sym_co2 = ["C", "O", "O"]
    x_co2 = np.array([[0, 0, 0], [0, 0, 1.16], [0, 0, -1.16]]) @ R.T
    xyz, hes = q.write_inputs(tmp, sym_co2, x_co2, pair_hessian(sym_co2, x_co2), name="co2")
    doc = q.modes_json([xyz, "--hessian", hes, "--hessian-units", "eV/A^2"])
    pg = doc["point_group"]
    chk.ok(pg["name"] == "Dinfh" and pg["symmetry_number"] == 2, "CO2-like: %r" % pg)
    got = sorted(m["symmetry"]["label"] for m in doc["modes"])
    chk.ok(got == ["Pi_u", "Pi_u", "Sigma_g+", "Sigma_u+"], "Γvib = Σg+ + Σu+ + Πu: %r" % got)
    act = {m["symmetry"]["label"]: (m["symmetry"]["ir_active"], m["symmetry"]["raman_active"])
           for m in doc["modes"]}
    chk.ok(act == {"Pi_u": (True, False), "Sigma_g+": (False, True), "Sigma_u+": (True, False)},
           "D∞h selection rules (mutual exclusion): %r" % act)

chk.finish("point group, species against NumPy characters, sym columns, --symmetrize")
