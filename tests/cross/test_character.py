#!/usr/bin/python3
"""`quaver modes --character` against an independent Wilson GF calculation.

For invented molecules with invented valence force fields (the molecules of
test_gf.py, a planar one for the out-of-plane angle, a C3v one for
degenerate modes and a linear one for linear bends): the Cartesian
Hessian is H = B^T F B in the force field's own internal coordinates (exact
at the minimum: no gradient term; Wilson, Decius & Cross, Molecular
Vibrations, 1955, ch. 4), and quaver gets only H and the geometry.

The independent side here never diagonalises H.  It
  1. perceives the valence coordinates itself (bonds from Cordero's covalent
     radii in python3-periodictable, tolerance 15 %, common practice; all
     angles; dihedrals about every bond whose ends have other neighbours;
     one out-of-plane angle at a planar three-coordinate centre),
  2. solves the GF problem in the force field's coordinates, G = B M^-1 B^T,
     GF L = L Lambda (in the range of G when that set is redundant, with the
     normalisation L L^T = G), which gives each mode's change of those
     coordinates per unit normal coordinate, and its Cartesian form
     x_k = M^-1 B^T G^+ L_k (Wilson's A matrix),
  3. takes L_k in the perceived coordinates as B_perceived x_k, and the
     internal force constants H implies there as P F P, where F is the force
     field embedded in the perceived set and P = G G^+ the projector on the
     range of the perceived G (for a non-redundant set P = I and this is F
     itself; with redundancy H fixes F only up to the redundant directions),
  4. forms the normalised potential energy distribution
     share_ik = |F_ii| L_ik^2 / sum_j |F_jj| L_jk^2  (PED of Morino &
     Kuchitsu, J. Chem. Phys. 20, 1809, 1952, normalised to 1 per mode)
     and sums it over families of the same element pattern.

Tolerances: shares to 1e-6 absolute, force constants to 1e-6 relative.
What separates the two sides is rounding and masses: quaver's L comes from
LAPACK eigenvectors of the mass-weighted Hessian (residuals ~1e-15 of |K|,
mode gaps here >= 30 cm^-1, so vector errors ~1e-12); the masses here are
python3-periodictable's and quaver's NIST AME2016, which for 1H, 12C, 14N,
16O differ by < 3e-9 u (qvtest.py), moving L and F by < 1e-8 relative; the
JSON numbers are shortest round-trip doubles.  Expected agreement is ~1e-8;
any real fault (a wrong s-vector, a missing or extra coordinate, a wrong
normalisation or force constant) moves shares by far more than 1e-6.
"""
import itertools
import sys

import numpy as np
import periodictable

sys.dont_write_bytecode = True      # keep the source tree clean
import qvtest as q  # noqa: E402

chk = q.Checker("character")
DASH = "\u2013"

# ---------------------------------------------------------------------------
# Independent perception
# ---------------------------------------------------------------------------


def q_oop(x, l, j, i, k):
    """Wilson's out-of-plane angle of bond j-l against the plane i-j-k
    (WDC 4-1): sin(theta) = (e_ji x e_jk) . e_jl / sin(phi_ijk)."""
    e = [(x[a] - x[j]) / np.linalg.norm(x[a] - x[j]) for a in (l, i, k)]
    c = np.cross(e[1], e[2])
    return np.arcsin(np.dot(c, e[0]) / np.linalg.norm(c))


def q_lin(x, i, j, k, u):
    """A linear bend towards the fixed unit vector u (WDC 4-1, linear
    molecules): (e_ji + e_jk).u, to first order the deviation from 180 deg."""
    e1 = (x[i] - x[j]) / np.linalg.norm(x[i] - x[j])
    e2 = (x[k] - x[j]) / np.linalg.norm(x[k] - x[j])
    return np.dot(e1 + e2, u)


def b_rows(x, coords):
    """Analytic s-vectors of qvtest for stretches, bends and torsions; the
    out-of-plane and linear-bend rows by 4-point central differences (error
    O(h^4), ~1e-13 here) of q_oop and q_lin themselves."""
    x = np.asarray(x, float)
    B = np.zeros((len(coords), x.size))
    plain = [(r, c) for r, c in enumerate(coords) if c[0] not in ("oop", "lin")]
    if plain:
        B[[r for r, _ in plain]] = q.b_matrix(x, [c for _, c in plain])
    h = 1e-4
    for r, c in enumerate(coords):
        if c[0] not in ("oop", "lin"):
            continue
        fn = q_oop if c[0] == "oop" else q_lin
        for col in range(x.size):
            def f(d):
                y = x.copy().ravel()
                y[col] += d
                return fn(y.reshape(-1, 3), *c[1:])
            B[r, col] = (8 * (f(h) - f(-h)) - (f(2 * h) - f(-2 * h))) / (12 * h)
    return B


def perceive(symbols, x):
    n = len(symbols)
    rad = [periodictable.elements.symbol(s).covalent_radius for s in symbols]
    nbr = {a: [] for a in range(n)}
    coords = []
    for a, b in itertools.combinations(range(n), 2):
        if np.linalg.norm(x[a] - x[b]) < (rad[a] + rad[b]) * 1.15:
            nbr[a].append(b)
            nbr[b].append(a)
            coords.append(("stretch", a, b))

    def angle(i, j, k):
        return np.degrees(q.q_bend(x, i, j, k))
    for j in range(n):
        for i, k in itertools.combinations(sorted(nbr[j]), 2):
            if angle(i, j, k) <= 175:
                coords.append(("bend", i, j, k))
                continue
            # near-linear (common practice: > 175 deg): two linear bends
            # towards any two directions perpendicular to the axis and to
            # each other (the make-up of the degenerate pair they describe
            # does not depend on which)
            axis = (x[k] - x[i]) / np.linalg.norm(x[k] - x[i])
            u, w = np.linalg.svd(axis[None, :])[2][1:]
            coords.append(("lin", i, j, k, u))
            coords.append(("lin", i, j, k, w))
    for kind, j, k in [c for c in coords if c[0] == "stretch"]:
        for i in nbr[j]:
            for l in nbr[k]:
                if k in (i,) or j in (l,) or i == l:
                    continue
                if angle(i, j, k) > 175 or angle(j, k, l) > 175:
                    continue
                coords.append(("torsion", i, j, k, l))
    for j in range(n):
        if len(nbr[j]) == 3:
            a, b, c = sorted(nbr[j])
            if angle(a, j, b) + angle(b, j, c) + angle(a, j, c) >= 355:
                coords.append(("oop", a, j, b, c))
    return coords


def key(c):
    """The same coordinate however its atoms are listed."""
    kind, *a = c
    if kind == "stretch":
        return ("stretch", frozenset(a))
    if kind == "bend":
        return ("bend", a[1], frozenset((a[0], a[2])))
    if kind == "torsion":
        return ("torsion", min(tuple(a), tuple(a[::-1])))
    if kind == "lin":      # both directions of one linear angle
        return ("lin", a[1], frozenset((a[0], a[2])))
    return ("oop", a[0], a[1], frozenset(a[2:]))


def family(symbols, c):
    """Families named as chemists write them (common practice): bonds with C
    first and H last, others alphabetically ("C-H", "O-H", "C-O"); chains
    read from the end with H first, then C, then alphabetically
    ("H-C-H bend", "H-C-C-O torsion")."""
    kind, *a = c
    s = [symbols[i] for i in (a[:3] if kind == "lin" else a)]
    if kind == "stretch":
        r = lambda e: (0 if e == "C" else 2 if e == "H" else 1, e)  # noqa: E731
        return DASH.join(sorted(s, key=r)) + " stretch"
    if kind == "oop":
        return "out-of-plane at " + s[1]
    r = lambda e: (0 if e == "H" else 1 if e == "C" else 2, e)  # noqa: E731
    fw, bw = [r(e) for e in s], [r(e) for e in s[::-1]]
    use = s if fw <= bw else s[::-1]
    return DASH.join(use) + {"bend": " bend", "lin": " linear bend", "torsion": " torsion"}[kind]


# ---------------------------------------------------------------------------
# The GF side
# ---------------------------------------------------------------------------


def pinv_sym(G, rtol=1e-9):
    g, U = np.linalg.eigh(G)
    keep = g > rtol * g.max()
    return (U[:, keep] / g[keep]) @ U[:, keep].T, U[:, keep], g[keep]


def gf_modes(B, F, masses):
    """Eigenvalues and L (columns, L L^T = G) of GF in the range of G."""
    minv = 1.0 / np.repeat(masses, 3)
    G = (B * minv) @ B.T
    _, U, g = pinv_sym(G)
    Ur = U * np.sqrt(g)
    lam, C = np.linalg.eigh(Ur.T @ F @ Ur)
    return lam, Ur @ C, G


def check_molecule(name, symbols, x, ff_coords, F):
    """Runs quaver on H = B^T F B and compares its make-up with the GF side."""
    x = np.asarray(x, float)
    masses = q.masses_of(symbols)
    minv = 1.0 / np.repeat(masses, 3)
    B_ff = b_rows(x, ff_coords)
    lam, L_ff, G_ff = gf_modes(B_ff, F, masses)
    A_ff = (minv[:, None] * B_ff.T) @ pinv_sym(G_ff)[0]
    X = A_ff @ L_ff                                   # Cartesian, per unit Q

    coords = perceive(symbols, x)
    B = b_rows(x, coords)
    G = (B * minv) @ B.T
    Gp = pinv_sym(G)[0]
    P = G @ Gp
    # the force field's coordinates are among the perceived ones (a linear
    # bend of the force field is the same coordinate as the perceived one of
    # the same direction: both are written with identical u here)
    def ident(c):
        return repr(c) if c[0] == "lin" else repr(key(c))
    row_of = {ident(c): r for r, c in enumerate(coords)}
    F_emb = np.zeros((len(coords), len(coords)))
    for a, ca in enumerate(ff_coords):
        for b, cb in enumerate(ff_coords):
            F_emb[row_of[ident(ca)], row_of[ident(cb)]] = F[a, b]
    F_H = P @ F_emb @ P
    L = B @ X                                         # perceived coords x modes
    E = np.abs(np.diag(F_H))[:, None] * L ** 2
    nu = q.to_wavenumber(lam)
    # a degenerate set (here: exact by symmetry, equal to rounding) gets one
    # distribution summed over the set, as methods.md states
    share = np.zeros_like(E)
    k0 = 0
    while k0 < len(nu):
        k1 = k0 + 1
        while k1 < len(nu) and abs(nu[k1] - nu[k1 - 1]) < 1e-3:
            k1 += 1
        share[:, k0:k1] = (E[:, k0:k1].sum(axis=1) / E[:, k0:k1].sum())[:, None]
        k0 = k1
    # rows of one key (the two directions of a linear angle) are compared
    # summed: each alone depends on the direction chosen
    keys = sorted({repr(key(c)) for c in coords})
    index = {k: i for i, k in enumerate(keys)}
    S = np.zeros((len(keys), len(coords)))
    for r, c in enumerate(coords):
        S[index[repr(key(c))], r] = 1.0
    share = S @ share
    fam_of_key = {repr(key(c)): family(symbols, c) for c in coords}
    n_red = len(coords) - np.linalg.matrix_rank(G, tol=1e-9 * np.abs(G).max())
    print("%s: %d perceived coordinates, %d redundant; GF %s cm^-1"
          % (name, len(coords), n_red, np.array2string(nu, precision=1)))

    H = B_ff.T @ F @ B_ff
    with q.tmpdir() as tmp:
        xyz, hes = q.write_inputs(tmp, symbols, x, H, name=name)
        doc = q.modes_json([xyz, "--hessian", hes, "--hessian-units", "eV/A^2", "--character"])

    ic = doc["internal_coordinates"]["coordinates"]
    got_keys = []
    for c in ic:
        kind = {"out-of-plane": "oop", "linear bend": "lin"}.get(c["kind"], c["kind"])
        atoms = [int(a) - 1 for a in c["atoms"]]
        got_keys.append(repr(key((kind, *atoms))))
        if got_keys[-1] in fam_of_key:
            want = fam_of_key[got_keys[-1]]
            chk.ok(c["family"] == want, "%s: %s family %r, expected %r"
                   % (name, c["name"], c["family"], want))
    chk.ok(sorted(got_keys) == sorted(repr(key(c)) for c in coords),
           "%s: quaver's %d coordinates are the %d perceived here" % (name, len(ic), len(coords)))
    if sorted(got_keys) != sorted(repr(key(c)) for c in coords):
        return
    order = [index[k] for k in got_keys]              # quaver row -> our key
    chk.ok(doc["internal_coordinates"]["rank"] == doc["n_vibrations"] == len(lam),
           "%s: rank %s, %s vibrations, GF %d" % (name, doc["internal_coordinates"]["rank"],
                                                  doc["n_vibrations"], len(lam)))
    fc = np.zeros(len(keys))
    np.add.at(fc, order, [c["force_constant"] for c in ic])
    # internal force constants the Hessian implies: P F P (F itself when P = I)
    chk.close(fc, S @ np.diag(F_H), "%s: diagonal internal force constants" % name,
              rtol=1e-6, atol=1e-9 * np.abs(np.diag(F_H)).max())
    got_nu = np.array([m["wavenumber"] for m in doc["modes"]])
    chk.close(got_nu, nu, "%s: wavenumbers vs GF" % name, rtol=1e-7)

    worst = 0.0
    for k, m in enumerate(doc["modes"]):
        ch = m["character"]
        chk.ok(ch["method"] == "normalised potential energy distribution",
               "%s: mode %d method %r" % (name, k + 1, ch["method"]))
        got = np.zeros(len(keys))
        for c in ch["coordinates"]:
            got[order[c["index"] - 1]] += c["share"]
        shares = [c["share"] for c in ch["coordinates"]]
        chk.ok(shares == sorted(shares, reverse=True), "%s: mode %d coordinates largest first"
               % (name, k + 1))
        chk.close(got, share[:, k], "%s: mode %d coordinate shares vs GF PED" % (name, k + 1),
                  atol=1e-6)
        worst = max(worst, np.abs(got - share[:, k]).max())
        fam = {}
        for kk, r in index.items():
            fam[fam_of_key[kk]] = fam.get(fam_of_key[kk], 0.0) + share[r, k]
        got_fam = {f["name"]: f["share"] for f in ch["families"]}
        chk.ok(set(got_fam) == set(fam), "%s: mode %d families %s, expected %s"
               % (name, k + 1, sorted(got_fam), sorted(fam)))
        if set(got_fam) == set(fam):
            chk.close([got_fam[f] for f in sorted(fam)], [fam[f] for f in sorted(fam)],
                      "%s: mode %d family shares" % (name, k + 1), atol=1e-6)
        fs = [f["share"] for f in ch["families"]]
        chk.ok(fs == sorted(fs, reverse=True), "%s: mode %d families largest first" % (name, k + 1))
        # the part of the mode the coordinates describe: all of it (rank 3N-6)
        chk.close(ch["described"], 1.0, "%s: mode %d described" % (name, k + 1), atol=1e-9)
        # sum_i F_ii L_ik^2 / lambda_k with the same F and L
        chk.close(ch["diagonal_sum"], np.diag(F_H) @ L[:, k] ** 2 / lam[k],
                  "%s: mode %d diagonal sum" % (name, k + 1), rtol=1e-6)
        top = max(fam, key=fam.get)
        print("  %8.1f cm^-1  %s %.0f %%" % (nu[k], top, 100 * fam[top]))
    print("%s: largest share difference %.2g" % (name, worst))
    return doc


# (a) water-like (qvtest.water_like): 2 stretches + 1 bend, non-redundant,
# so P = I and the comparison is with the force field's own F.
symbols, x, coords, F = q.water_like()
chk.ok(len(perceive(symbols, np.asarray(x))) == 3, "water-like: 3 perceived coordinates = 3N-6")
check_molecule("water-like", symbols, x, coords, F)

# (b) hydrazine-like N2H4 of qvtest.py, as in test_gf.py (invented): its force field has one
# torsion; the perceived set has all four H-N-N-H (15 for 12 vibrations).
xh_symbols, xh, coords_h, Fh = q.hydrazine_like()
check_molecule("hydrazine-like", xh_symbols, xh, coords_h, Fh)

# (c) methylamine-like CH3NH2 of qvtest.py, as in test_gf.py (invented), its force field
# itself redundant (all six angles at C); 21 perceived coordinates.
xm_symbols, xm, coords_m, Fm = q.methylamine_like()
check_molecule("methylamine-like", xm_symbols, xm, coords_m, Fm)

# (d) formaldehyde-like H2C=O, planar, unequal C-H (invented geometry and
# constants): 3 stretches, 3 bends (one redundancy in the plane) and the
# out-of-plane angle of O at C; the force field uses all seven.
xf = np.array([[0.0, 0.0, 0.0], [0.0, 0.0, 1.21],
               [1.10 * np.sin(np.deg2rad(121.5)), 0.0, 1.10 * np.cos(np.deg2rad(121.5))],
               [-1.11 * np.sin(np.deg2rad(121.0)), 0.0, 1.11 * np.cos(np.deg2rad(121.0))]])
xf = xf @ q.rotation_matrix([0.2, 1.0, 0.4], 0.8).T
coords_f = [("stretch", 0, 1), ("stretch", 0, 2), ("stretch", 0, 3),
            ("bend", 1, 0, 2), ("bend", 1, 0, 3), ("bend", 2, 0, 3), ("oop", 1, 0, 2, 3)]
Ff = np.diag([78.0, 30.0, 29.5, 3.2, 3.3, 2.6, 2.2])
Ff[0, 1] = Ff[1, 0] = 0.9
Ff[3, 4] = Ff[4, 3] = 0.3
check_molecule("formaldehyde-like", ["C", "O", "H", "H"], xf, coords_f, Ff)

# (e) ammonia-like NH3, C3v (invented): 3 stretches + 3 bends = 3N-6, with
# two degenerate pairs (E), whose make-up is compared summed over each pair
xa = np.array([[0.0, 0.0, 0.0]] + [1.012 * q.direction(112.0, 120.0 * i + 10.0) for i in range(3)])
xa = xa @ q.rotation_matrix([0.7, -0.2, 0.5], 0.9).T
coords_a = [("stretch", 0, 1), ("stretch", 0, 2), ("stretch", 0, 3),
            ("bend", 1, 0, 2), ("bend", 1, 0, 3), ("bend", 2, 0, 3)]
Fa = np.diag([40.0, 40.0, 40.0, 3.5, 3.5, 3.5])
for i, j in itertools.combinations(range(3), 2):
    Fa[i, j] = Fa[j, i] = 0.4
    Fa[3 + i, 3 + j] = Fa[3 + j, 3 + i] = 0.25
check_molecule("ammonia-like", ["N", "H", "H", "H"], xa, coords_a, Fa)

# (f) HCN-like, linear (invented): 2 stretches + 2 linear bends = 3N-5; the
# force field's bends use the directions perceived here, any pair would do
xl = np.array([[0.0, 0.0, -1.066], [0.0, 0.0, 0.0], [0.0, 0.0, 1.156]])
xl = xl @ q.rotation_matrix([0.3, 0.9, -0.4], 1.3).T + np.array([0.2, 0.1, 0.0])
lin = [c for c in perceive(["H", "C", "N"], xl) if c[0] == "lin"]
chk.ok(len(lin) == 2, "HCN-like: two linear bends perceived")
coords_l = [("stretch", 0, 1), ("stretch", 1, 2)] + lin
Fl = np.diag([36.0, 112.0, 1.6, 1.6])
Fl[0, 1] = Fl[1, 0] = -1.2
check_molecule("HCN-like", ["H", "C", "N"], xl, coords_l, Fl)

# The text form: one line per mode under the unchanged table; the default
# output (no --character) is the table alone, byte for byte.
plain = q.run(["modes", "--demo"]).stdout_text
text = q.run(["modes", "--demo", "--character"]).stdout_text
chk.ok(text.startswith(plain), "--character keeps the table and adds below it")
extra = text[len(plain):].splitlines()
rows = [l for l in extra if l and not l.startswith("#")]
n_modes = len(q.modes_json(["--demo"])["modes"])
chk.ok(len(rows) == n_modes, "text: %d make-up lines for %d modes" % (len(rows), n_modes))
chk.ok(any("normalised potential energy distribution" in l for l in extra),
       "text caption names the method")
# an O-H stretch of an alcohol is the highest mode of the invented demo
# (its force field puts O-H above C-H: tests/tools/make-demo.py)
chk.ok(rows and "O" + DASH + "H stretch" in rows[-1], "demo: highest mode is the O-H stretch: %r"
       % (rows[-1] if rows else None))
doc = q.modes_json(["--demo"])
chk.ok("internal_coordinates" not in doc and all("character" not in m for m in doc["modes"]),
       "JSON without --character has no character keys")
# usage errors say how to fix them
p = q.run(["modes", "--demo", "--character", "--format", "csv"], expect=1)
chk.ok("--format text or json" in p.stderr_text, "csv: %r" % p.stderr_text.strip())
p = q.run(["modes", "--demo", "--character", "--lowest", "3"], expect=1)
chk.ok("--lowest" in p.stderr_text, "--lowest: %r" % p.stderr_text.strip())

chk.finish("normalised PED of quaver modes --character against an independent GF "
           "calculation on water-, hydrazine-, methylamine-, formaldehyde-, ammonia- and "
           "HCN-like force fields: coordinate sets, families, force constants, shares to 1e-6")
