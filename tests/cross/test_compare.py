#!/usr/bin/python3
"""test_compare.py — `quaver compare` against an independent NumPy/SciPy
calculation: overlap matrices of mode sets solved here with numpy.linalg.eigh
(qvtest.reference_modes), the best matching against
scipy.optimize.linear_sum_assignment (SciPy's own implementation of the
assignment problem), the alignment against a Kabsch fit done here with
numpy.linalg.svd (Kabsch, Acta Cryst. A32, 922, 1976), and the Duschinsky
matrix and displacement (Duschinsky, Acta Physicochim. URSS 7, 551, 1937;
K = L_A^T M^1/2 (x_B - x_A), Sharp & Rosenstock, J. Chem. Phys. 41, 3453,
1964) from their definitions.

The molecules are invented spring networks (qvtest.random_network) and an
equilateral triangle of springs; nothing here comes from Quaver's sources.

SPDX-License-Identifier: GPL-3.0-or-later
"""
import json
import os
import sys

import numpy as np
import scipy.constants as sc
from scipy.optimize import linear_sum_assignment

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import qvtest as qt  # noqa: E402

chk = qt.Checker("compare")


def compare(args, expect=0):
    p = qt.run(["compare"] + [str(a) for a in args], expect=expect)
    return p


def compare_json(args):
    p = compare(list(args) + ["--format", "json"])
    return json.loads(p.stdout_text)


def network(seed, n_atoms=8):
    _, x, pairs, k = qt.random_network(n_atoms, seed)
    # elements chosen here so the isotopologue has a hydrogen to deuterate
    symbols = ["H", "C", "N", "O", "C", "H", "O", "N", "C", "H"][:n_atoms]
    return symbols, x, qt.spring_hessian(x, pairs, k), pairs, k


def sign_fixed(L):
    """Columns with the sign rule Quaver documents for its output (largest
    component positive, DESIGN.md §2), so signed J and K can be compared."""
    return np.column_stack([qt.canonical_sign(L[:, k]) for k in range(L.shape[1])])


def kabsch(x_a, x_b, w):
    """Weighted Kabsch fit of B onto A (Kabsch, Acta Cryst. A32, 922, 1976):
    R minimising sum w |R (x_b - c_b) - (x_a - c_a)|^2, via numpy SVD."""
    ca = (w[:, None] * x_a).sum(0) / w.sum()
    cb = (w[:, None] * x_b).sum(0) / w.sum()
    p, q = x_b - cb, x_a - ca
    H = (w[:, None, None] * p[:, :, None] * q[:, None, :]).sum(0)
    U, S, Vt = np.linalg.svd(H)
    d = np.sign(np.linalg.det(Vt.T @ U.T))
    R = Vt.T @ np.diag([1.0, 1.0, d]) @ U.T
    return R, (p @ R.T) + ca


def rotate_vectors(L, R):
    n = L.shape[0] // 3
    return np.einsum("ij,ajk->aik", R, L.reshape(n, 3, -1)).reshape(3 * n, -1)


def unit_columns(U):
    return U / np.linalg.norm(U, axis=0)[None, :]


with qt.tmpdir() as tmp:
    symbols, x, H, pairs, kk = network(11)
    n_at = len(symbols)
    xyz_a, hes_a = qt.write_inputs(tmp, symbols, x, H, name="a")
    m = qt.masses_of(symbols)
    ref = qt.reference_modes(x, m, H)
    n_vib = ref["L"].shape[1]

    # ---------------------------------------------------------------- self
    doc = compare_json([xyz_a, xyz_a, "--hessian-a", hes_a, "--hessian-b", hes_a,
                        "-u", "eV/A^2", "--duschinsky"])
    O = np.array(doc["overlap"])
    # a set against itself: the overlap is the identity (orthonormal modes)
    chk.close(O, np.eye(n_vib), "self: overlap = identity", atol=1e-9)
    chk.ok([(p["mode_a"], p["mode_b"]) for p in doc["matching"]]
           == [(i + 1, i + 1) for i in range(n_vib)], "self: identity matching")
    chk.close([p["shift"] for p in doc["matching"]], np.zeros(n_vib), "self: shifts 0", atol=1e-9)
    chk.close(doc["mean_overlap"], 1.0, "self: mean overlap 1", atol=1e-9)
    chk.close(np.array(doc["duschinsky"]["J"]), np.eye(n_vib), "self: Duschinsky J = I", atol=1e-9)
    chk.close(doc["duschinsky"]["K"], np.zeros(n_vib), "self: Duschinsky K = 0", atol=1e-9)
    chk.ok(doc["unmatched_a"] == [] and doc["unmatched_b"] == [], "self: nothing unmatched")

    # text and CSV say the same as the JSON
    p = compare([xyz_a, xyz_a, "--hessian-a", hes_a, "--hessian-b", hes_a, "-u", "eV/A^2"])
    chk.ok("summary: %d pairs, mean overlap 1.0000" % n_vib in p.stdout_text,
           "self: text summary gives %d pairs with mean overlap 1" % n_vib)

    # ------------------------------------------------------- isotopologue
    d_atom = symbols.index("H")               # 0-based
    m_b = m.copy()
    m_b[d_atom] = qt.isotope_mass("H", 2)
    ref_b = qt.reference_modes(x, m_b, H)
    L_a, L_b = ref["L"], ref_b["L"]
    sm_a, sm_b = np.sqrt(np.repeat(m, 3)), np.sqrt(np.repeat(m_b, 3))
    conventions = {
        # B's Cartesian displacements L_B/sqrt(m_B) weighted with A's masses
        "common-mass": (L_a, unit_columns(L_b / sm_b[:, None] * sm_a[:, None])),
        # each set's own mass-weighted vectors
        "own-masses": (L_a, L_b),
        # Cartesian displacement directions
        "cartesian": (unit_columns(L_a / sm_a[:, None]), unit_columns(L_b / sm_b[:, None])),
    }
    base = [xyz_a, xyz_a, "--hessian-a", hes_a, "--hessian-b", hes_a, "-u", "eV/A^2",
            "--isotope-b", "%d=2" % (d_atom + 1)]
    for name, (ua, ub) in conventions.items():
        doc = compare_json(base + ["--overlap", name])
        O = np.array(doc["overlap"])
        O_ref = np.abs(ua.T @ ub)
        # masses: Quaver's isotope table against periodictable; the
        # difference is below 3e-9 u for 1H, 2H, 12C, 14N, 16O (qvtest.py)
        chk.close(O, O_ref, "isotopologue, %s: overlap matrix against NumPy" % name, atol=2e-8)
        # best matching: SciPy's linear_sum_assignment maximising sum O^2
        rows, cols = linear_sum_assignment(O_ref ** 2, maximize=True)
        got = sorted((p["mode_a"] - 1, p["mode_b"] - 1) for p in doc["matching"])
        chk.ok(got == sorted(zip(rows.tolist(), cols.tolist())),
               "isotopologue, %s: matching %s equals SciPy's %s"
               % (name, got, sorted(zip(rows.tolist(), cols.tolist()))))
        total = sum(p["overlap"] ** 2 for p in doc["matching"])
        chk.close(total, (O_ref[rows, cols] ** 2).sum(), "isotopologue, %s: total O^2 of the matching" % name,
                  rtol=1e-8)
        nu_a, nu_b = qt.to_wavenumber(ref["lam"]), qt.to_wavenumber(ref_b["lam"])
        chk.close([p["shift"] for p in doc["matching"]],
                  [nu_b[p["mode_b"] - 1] - nu_a[p["mode_a"] - 1] for p in doc["matching"]],
                  "isotopologue, %s: wavenumber shifts against NumPy" % name, atol=1e-5)
    # an H -> D substitution must move at least one mode well away from the
    # identity (otherwise the test above could not tell)
    chk.ok(np.abs(np.diag(O_ref)).min() < 0.99, "isotopologue: the overlap is not the identity")
    # the Duschinsky matrix needs one set of masses
    p = compare(base + ["--duschinsky"], expect=2)
    chk.ok("same masses" in p.stderr_text and "atom %d" % (d_atom + 1) in p.stderr_text,
           "isotopologue: --duschinsky refused with a message naming the atom: %r" % p.stderr_text)
    # rectangular: B is a bundle of precomputed modes (formats.md), a subset
    # of the deuterated set's modes solved here, every other one from 1
    sub = list(range(1, n_vib, 2))
    D_b = ref_b["L"][:, sub] / sm_b[:, None]
    bundle = {
        "format": "quaver-bundle", "version": 1,
        "title": "invented spring network, deuterated, some modes (test)",
        "structure": {"atoms": [dict(element=s_, position=list(map(float, r)),
                                     **({"isotope": 2} if k == d_atom else {}))
                                for k, (s_, r) in enumerate(zip(symbols, x))]},
        "modes": {"wavenumbers": [float(v) for v in qt.to_wavenumber(ref_b["lam"][sub])],
                  "displacements": [list(map(float, D_b[:, k])) for k in range(len(sub))]},
    }
    bpath = os.path.join(tmp, "sub.quaver.json")
    with open(bpath, "w") as f:
        json.dump(bundle, f)
    doc = compare_json([xyz_a, bpath, "--hessian-a", hes_a, "-u", "eV/A^2"])
    ua, ub = conventions["common-mass"]
    O_s = np.abs(ua.T @ ub[:, sub])
    chk.ok(doc["b"]["n_modes"] == len(sub) and np.allclose(doc["b"]["masses"][d_atom], m_b[d_atom], rtol=1e-8),
           "precomputed subset: B has %d modes and the deuterium mass" % len(sub))
    chk.close(np.array(doc["overlap"]), O_s, "precomputed subset: %d x %d overlap against NumPy"
              % O_s.shape, atol=1e-7)
    rows, cols = linear_sum_assignment(O_s ** 2, maximize=True)
    got = sorted((p["mode_a"] - 1, p["mode_b"] - 1) for p in doc["matching"])
    chk.ok(got == sorted(zip(rows.tolist(), cols.tolist())),
           "precomputed subset: rectangular matching equals SciPy's")
    chk.ok(doc["unmatched_a"] == sorted(set(range(1, n_vib + 1)) - set((rows + 1).tolist()))
           and doc["unmatched_b"] == [], "precomputed subset: the unmatched modes of A are SciPy's leftovers")

    # the CSV carries the same matrix (default convention: common-mass)
    ua, ub = conventions["common-mass"]
    O_ref = np.abs(ua.T @ ub)
    p = compare(base + ["--format", "csv"])
    lines = p.stdout_text.strip().split("\n")
    header = lines[0].split(",")
    k0 = header.index("overlap_b1")
    O_csv = np.array([[float(v) for v in ln.split(",")[k0:]] for ln in lines[1:]])
    chk.close(O_csv, O_ref, "isotopologue: CSV overlap matrix against NumPy", atol=2e-8)

    # ------------------------------------------------ rotated + translated
    R0 = qt.rotation_matrix([0.4, 0.9, -0.2], 1.1)
    t0 = np.array([3.0, -1.5, 0.7])
    x_rot = x @ R0.T + t0
    R_big = np.kron(np.eye(n_at), R0)
    H_rot = R_big @ H @ R_big.T                 # the Hessian in the rotated frame
    xyz_r, hes_r = qt.write_inputs(tmp, symbols, x_rot, H_rot, name="r")
    doc = compare_json([xyz_a, xyz_r, "--hessian-a", hes_a, "--hessian-b", hes_r, "-u", "eV/A^2",
                        "--duschinsky"])
    chk.close(np.array(doc["overlap"]), np.eye(n_vib), "rotated copy: overlap = identity after the fit",
              atol=1e-8)
    chk.ok([(p["mode_a"], p["mode_b"]) for p in doc["matching"]]
           == [(i + 1, i + 1) for i in range(n_vib)], "rotated copy: identity matching")
    chk.close(doc["alignment"]["rmsd"], 0.0, "rotated copy: RMSD 0 after the fit", atol=1e-9)
    # the fit undoes the rotation: R_fit = R0^T
    chk.close(np.array(doc["alignment"]["rotation"]), R0.T, "rotated copy: fitted rotation = R0^T",
              atol=1e-10)
    chk.close(doc["duschinsky"]["K"], np.zeros(n_vib), "rotated copy: K = 0", atol=1e-8)
    # without the fit the same pair is far from the identity
    doc = compare_json([xyz_a, xyz_r, "--hessian-a", hes_a, "--hessian-b", hes_r, "-u", "eV/A^2",
                        "--no-align"])
    chk.ok(np.diag(np.array(doc["overlap"])).min() < 0.9, "rotated copy: --no-align is not the identity")

    # ------------------------------------ two "methods" at one geometry
    rng = np.random.default_rng(5)
    E = rng.normal(size=H.shape) * 0.3
    H2 = H + 0.5 * (E + E.T)
    xyz_m, hes_m = qt.write_inputs(tmp, symbols, x, H2, name="m")
    doc = compare_json([xyz_a, xyz_m, "--hessian-a", hes_a, "--hessian-b", hes_m, "-u", "eV/A^2",
                        "--duschinsky"])
    J = np.array(doc["duschinsky"]["J"])
    # same geometry and masses: both sets span the same vibrational space,
    # so J is orthogonal (Duschinsky 1937)
    chk.close(J @ J.T, np.eye(n_vib), "two methods: J J^T = I", atol=1e-9)
    ref_m = qt.reference_modes(x, m, H2)
    J_ref = sign_fixed(ref["L"]).T @ sign_fixed(ref_m["L"])
    chk.close(J, J_ref, "two methods: J against NumPy", atol=1e-8)

    # ------------------------------------------ displaced geometry: K
    delta = rng.normal(size=x.shape) * 0.02
    x_d = (x + delta) @ qt.rotation_matrix([1.0, 0.2, 0.3], 0.4).T + np.array([0.5, 0.0, -2.0])
    H_d = qt.spring_hessian(x_d, pairs, kk)
    xyz_d, hes_d = qt.write_inputs(tmp, symbols, x_d, H_d, name="d")
    doc = compare_json([xyz_a, xyz_d, "--hessian-a", hes_a, "--hessian-b", hes_d, "-u", "eV/A^2",
                        "--duschinsky"])
    R_fit, x_d_fit = kabsch(x, x_d, m)
    chk.close(np.array(doc["alignment"]["rotation"]), R_fit, "displaced: rotation against NumPy Kabsch",
              atol=1e-9)
    chk.close(doc["alignment"]["rmsd"], np.sqrt((m * ((x_d_fit - x) ** 2).sum(1)).sum() / m.sum()),
              "displaced: RMSD against NumPy", rtol=1e-8)
    La = sign_fixed(ref["L"])
    ref_d = qt.reference_modes(x_d, m, H_d)
    Ld = rotate_vectors(sign_fixed(ref_d["L"]), R_fit)
    K_ref = La.T @ (sm_a * (x_d_fit - x).ravel())
    chk.close(doc["duschinsky"]["K"], K_ref, "displaced: K against NumPy (u^1/2 A)", atol=1e-8)
    chk.ok(np.abs(K_ref).max() > 1e-2, "displaced: K is not trivially zero (max %.3g)" % np.abs(K_ref).max())
    chk.close(np.array(doc["duschinsky"]["J"]), La.T @ Ld, "displaced: J against NumPy", atol=1e-8)
    # dimensionless: K sqrt(omega/hbar), omega of A's mode, SI units
    omega = np.sqrt(ref["lam"]) * qt.OMEGA_UNIT
    K_dim = K_ref * np.sqrt(qt.M_U) * qt.ANG * np.sqrt(omega / sc.hbar)
    chk.close(doc["duschinsky"]["K_dimensionless"], K_dim, "displaced: dimensionless K", rtol=1e-8,
              atol=1e-8)
    # J is orthogonal only up to the small change of the rigid-body space
    chk.close(np.array(doc["duschinsky"]["J"]) @ np.array(doc["duschinsky"]["J"]).T, np.eye(n_vib),
              "displaced: J nearly orthogonal", atol=5e-3)

    # ------------------------------------------------- degenerate pair
    # an equilateral triangle of equal springs: E' pair + A1' (common
    # practice: D3h); B is the same triangle turned 40 deg in its plane, so
    # after the fit its degenerate basis differs from A's by a rotation
    # inside the pair
    s3 = np.sqrt(3.0)
    tri = np.array([[0.0, 0.0, 0.0], [1.2, 0.0, 0.0], [0.6, 0.6 * s3, 0.0]])
    tsym = ["C", "C", "C"]
    tpairs = [(0, 1), (1, 2), (0, 2)]
    H_t = qt.spring_hessian(tri, tpairs, [30.0, 30.0, 30.0])
    Rz = qt.rotation_matrix([0.0, 0.0, 1.0], np.deg2rad(40.0))
    tri_b = tri @ Rz.T
    H_tb = np.kron(np.eye(3), Rz) @ H_t @ np.kron(np.eye(3), Rz).T
    xa, ha = qt.write_inputs(tmp, tsym, tri, H_t, name="ta")
    xb, hb = qt.write_inputs(tmp, tsym, tri_b, H_tb, name="tb")
    doc = compare_json([xa, xb, "--hessian-a", ha, "--hessian-b", hb, "-u", "eV/A^2"])
    O = np.array(doc["overlap"])
    blocks = doc["blocks_a"]
    pair = [k for k in range(len(blocks)) if blocks.count(blocks[k]) == 2]
    chk.ok(len(pair) == 2, "triangle: one degenerate pair found (blocks %s)" % blocks)
    if len(pair) == 2:
        # the subspace overlap of the pair: sum of O^2 over the block is 2
        # whatever the basis (NumPy: the same sum from our own vectors)
        ref_ta = qt.reference_modes(tri, qt.masses_of(tsym), H_t)
        ref_tb = qt.reference_modes(tri_b, qt.masses_of(tsym), H_tb)
        R_t, _ = kabsch(tri, tri_b, qt.masses_of(tsym))
        Ot = np.abs(ref_ta["L"].T @ rotate_vectors(ref_tb["L"], R_t))
        blk = np.ix_(pair, pair)
        chk.close((O[blk] ** 2).sum(), (Ot[blk] ** 2).sum(), "triangle: block sum of O^2 against NumPy",
                  atol=1e-9)
        chk.close((O[blk] ** 2).sum(), 2.0, "triangle: block sum of O^2 = 2", atol=1e-9)
        # the raw overlaps inside the pair depend on the two bases, so the
        # subspace overlap below is what the matching must use
        chk.ok(O[blk].max() < 0.99, "triangle: raw overlaps inside the pair are basis-dependent (max %.4f)"
               % O[blk].max())
        doc0 = compare_json([xa, xb, "--hessian-a", ha, "--hessian-b", hb, "-u", "eV/A^2",
                             "--degeneracy", "0"])
        chk.ok(all(not p["degenerate"] and p["subspace_overlap"] == p["overlap"] for p in doc0["matching"]),
               "triangle: --degeneracy 0 treats every mode alone")
        for p in doc["matching"]:
            if p["mode_a"] - 1 in pair:
                chk.ok(p["degenerate"], "triangle: pair %d-%d marked degenerate" % (p["mode_a"], p["mode_b"]))
                chk.close(p["subspace_overlap"], 1.0, "triangle: subspace overlap of the pair", atol=1e-9)

    # ------------------------------------------------ linear molecule
    # collinear atoms leave the fitted rotation about the axis free; the
    # degenerate bends (zero here: springs give no bending stiffness) are
    # then compared by their subspace (common practice: linear molecules
    # have doubly degenerate bends)
    lin = np.array([[0.0, 0.0, -1.16], [0.0, 0.0, 0.0], [0.0, 0.0, 1.16]])
    H_l = qt.spring_hessian(lin, [(0, 1), (1, 2), (0, 2)], [100.0, 100.0, 5.0])
    R_l = qt.rotation_matrix([0.3, 0.4, 0.5], 0.9)
    lin_b = lin @ R_l.T + 1.0
    H_lb = np.kron(np.eye(3), R_l) @ H_l @ np.kron(np.eye(3), R_l).T
    la, hla = qt.write_inputs(tmp, ["O", "C", "O"], lin, H_l, name="la")
    lb, hlb = qt.write_inputs(tmp, ["O", "C", "O"], lin_b, H_lb, name="lb")
    doc = compare_json([la, lb, "--hessian-a", hla, "--hessian-b", hlb, "-u", "eV/A^2"])
    chk.ok(doc["a"]["n_modes"] == 4, "linear: 3N - 5 = 4 modes")
    chk.close(doc["alignment"]["rmsd"], 0.0, "linear: RMSD 0 after the fit", atol=1e-9)
    chk.close([p["subspace_overlap"] for p in doc["matching"]], np.ones(4),
              "linear: every pair (bends by their subspace) has overlap 1", atol=1e-8)

    # ------------------------------------------------------- bad input
    other = list(symbols)
    other[2] = "S"
    xyz_o = qt.write_xyz(os.path.join(tmp, "o.xyz"), other, x)
    p = compare([xyz_a, xyz_o, "--hessian-a", hes_a, "--hessian-b", hes_a, "-u", "eV/A^2"], expect=2)
    chk.ok("atom 3 is N in A but S in B" in p.stderr_text,
           "mismatched element: exit 2 naming the atom: %r" % p.stderr_text)
    p = compare([xyz_a, xa, "--hessian-a", hes_a, "--hessian-b", ha, "-u", "eV/A^2"], expect=2)
    chk.ok("8 atoms and B has 3" in p.stderr_text, "different atom counts: exit 2: %r" % p.stderr_text)
    p = compare([xyz_a], expect=1)
    chk.ok("two inputs" in p.stderr_text, "one input: usage error: %r" % p.stderr_text)
    p = compare([xyz_a, xyz_a, "--hessian-a", hes_a, "--hessian-b", hes_a, "-u", "eV/A^2",
                 "--overlap", "sideways"], expect=1)
    chk.ok("common-mass" in p.stderr_text, "unknown convention: usage error listing them")
    p = compare(["--demo", "--isotope-a", "99=2"], expect=1)
    chk.ok("A: --isotope-a 99=2" in p.stderr_text, "bad --isotope-a: named as given: %r" % p.stderr_text)
    p = compare([xyz_a, xyz_a, "--hessian-a", hes_a, "-u", "eV/A^2"], expect=1)
    chk.ok("--hessian-b" in p.stderr_text, "B without a Hessian: usage error naming --hessian-b: %r"
           % p.stderr_text)
    # -o is atomic and does not overwrite without --force
    out = os.path.join(tmp, "cmp.json")
    compare(base + ["--format", "json", "-o", out])
    chk.ok(json.load(open(out))["kind"] == "mode comparison", "-o writes the JSON")
    p = compare(base + ["--format", "json", "-o", out], expect=3)
    chk.ok("--force" in p.stderr_text, "-o refuses to overwrite without --force")
    compare(base + ["--format", "json", "-o", out, "--force"])

chk.finish("%d vibrations; isotopologue, rotated copy, two methods, displaced, degenerate pair" % n_vib)
