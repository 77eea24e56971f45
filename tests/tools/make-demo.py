#!/usr/bin/python3
# Usage: /usr/bin/python3 tests/tools/make-demo.py data/examples
# SPDX-License-Identifier: GPL-3.0-or-later
"""Write Quaver's bundled demo data (invented, from a toy force field).

Usage: /usr/bin/python3 tests/tools/make-demo.py data/examples

Everything this script writes is INVENTED demo data.  No quantum-chemistry
program was run; the numbers come from the small valence force field below,
whose parameters are our own round numbers, chosen only so that the
wavenumbers land in realistic ranges (C-H stretches near 2900-3000 cm^-1,
C=O near 1750, O-H near 3650).  It is not fitted to anything and must not be
quoted as data about real molecules.

Output (below the folder given on the command line):
  README.md                                   index of the examples
  ethanol-unconverged/ethanol.xyz             extended XYZ with forces, energy
  ethanol-unconverged/ethanol.hessian.txt     27x27 Hessian, eV/A^2
  ethanol-unconverged/ethanol.quaver.json     bundle, inline lower Hessian
  ethanol-unconverged/README.md
  formaldehyde/formaldehyde.xyz
  formaldehyde/formaldehyde.hessian.txt       12x12 Hessian, hartree/bohr^2
  formaldehyde/formaldehyde.quaver.json
  formaldehyde/README.md
The script is deterministic (no random numbers): running it twice writes
identical files.

The force field (energies in eV, lengths in A, angles in rad)
--------------------------------------------------------------
  E = sum_bonds     k_b (r - r0)^2
    + sum_angles    k_t (theta - theta0)^2
    + sum_torsions  V_n/2 (1 + cos(n phi - delta))
    + sum_impropers k_w chi^2                           (planar centres only)
No non-bonded terms.  Note the prefactor: k (q - q0)^2 without 1/2, so the
curvature of a bond term is 2 k_b (C-H: 2 x 14.5 = 29 eV/A^2).  The
improper chi of a planar centre C with neighbours A, B, D is the dihedral
C-A-B-D, i.e. the angle between the planes (C, A, B) and (A, B, D); it is 0
when C lies in the plane of its neighbours.  Bonds, angles, torsions and
impropers are generated from the bond list: every pair of bonds sharing an
atom is an angle, every chain of three bonds a torsion.

Atom types: C3 (sp3 carbon), C2 (sp2 carbon), O3 (hydroxyl oxygen),
O2 (carbonyl oxygen), H.  Parameters: see BOND, ANGLE, TORSION, IMPROPER.
The out-of-plane constant is not small next to the angle constants: bond
angle terms alone give a planar centre no restoring force against
pyramidalisation to second order, so this term sets the wag by itself.

The gradient is analytic (bond, angle and dihedral derivatives; the
dihedral derivative in the form of Blondel & Karplus, J. Comput. Chem. 17,
1132 (1996), from memory, and checked numerically below).  The Hessian is
made of central finite differences of the analytic gradient with steps of
1e-4 and 2e-4 A, Richardson-extrapolated (the h^2 error cancels), then
symmetrised.  Checks that stop the script with an error: the analytic
gradient of every internal coordinate and of the energy against central
differences of the values (at a distorted geometry and at each final
geometry); the Hessian's asymmetry before symmetrising <= 1e-8 relative to
max |H|; the extrapolated Hessian against the plain step-1e-4 one; its row
sums (translation invariance); the constants against scipy.constants and
the wavenumber conversion against REFERENCES.md; and the physics stated
below for each example.

Example 1: ethanol-unconverged (the "suspicious mode" case)
  Invented scenario: one point of a relaxed scan of the hydroxyl torsion,
  with the H-O-C-C dihedral held 3 degrees past eclipsed (123 degrees; the
  torsion terms have their maxima at 0 and +-120 degrees), and the
  optimisation of the rest stopped early at a loose threshold.  Someone ran
  a frequency calculation on that point anyway.  Here: the dihedral is held
  by a stiff harmonic restraint (not part of the force field, so it appears
  in the forces written out), and a plain steepest-descent optimiser with a
  fixed step stops when the gradient norm of force field + restraint drops
  below 1e-2 eV/A.  Checked: exactly one negative eigenvalue of the
  projected mass-weighted Hessian, its eigenvector dominated by the
  hydroxyl hydrogen, the residual gradient norm near 1e-2 eV/A, and
  rotational residuals of some cm^-1 (the geometry is not stationary).

Example 2: formaldehyde (a stable small molecule)
  H2CO fully optimised with scipy.optimize (gradient <= 1e-8 eV/A).  The
  parameters are strain-free at a planar geometry (116 + 2 x 122 = 360
  degrees), so the minimum must have exactly r0 and theta0: checked.
  Also checked: 3N-6 = 6 positive modes, residuals near 0.  The Hessian is
  written in hartree/bohr^2 to exercise unit conversion.

Units and constants: CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93,
025010 (2021)); isotope masses from NIST "Atomic Weights and Isotopic
Compositions" (AME 2016): 1H 1.00782503223, 12C 12 (exact), 16O
15.99491461957 (as in REFERENCES.md).
"""

import json
import math
import os
import sys

import numpy as np
import scipy.constants
import scipy.optimize

# ---------------------------------------------------------------- constants
# CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93, 025010, 2021).
C_LIGHT = 299792458.0              # m/s, exact
E_CHARGE = 1.602176634e-19         # C, exact (1 eV = this many J)
M_U = 1.66053906660e-27            # kg, atomic mass constant
HARTREE_EV = 27.211386245988       # eV
BOHR_A = 0.529177210903            # A

# sqrt(eV / (A^2 u)) in rad/s, then as a wavenumber in cm^-1.
WAVENUMBER = math.sqrt(E_CHARGE / (1e-20 * M_U)) / (2.0 * math.pi * C_LIGHT * 100.0)
# 1 hartree/bohr^2 in eV/A^2.
HARTREE_BOHR2 = HARTREE_EV / BOHR_A ** 2

# Isotope masses, u: NIST "Atomic Weights and Isotopic Compositions" (AME 2016).
MASS = {"H": 1.00782503223, "C": 12.0, "O": 15.99491461957}

# ---------------------------------------------------------------- parameters
# All invented round numbers (see the docstring).  k in eV/A^2 or eV/rad^2,
# r0 in A, theta0 in degrees, V in eV, delta in degrees.
BOND = {
    ("C3", "H"): (14.5, 1.090),
    ("C3", "C3"): (14.0, 1.520),
    ("C3", "O3"): (15.5, 1.425),
    ("H", "O3"): (23.5, 0.960),
    ("C2", "H"): (14.0, 1.100),
    ("C2", "O2"): (36.0, 1.205),
}
ANGLE = {  # key (end, centre, end) with the ends sorted
    ("H", "C3", "H"): (1.6, 108.0),
    ("C3", "C3", "H"): (1.7, 110.5),
    ("H", "C3", "O3"): (1.8, 109.5),
    ("C3", "C3", "O3"): (3.0, 108.5),
    ("C3", "O3", "H"): (2.0, 108.5),
    ("H", "C2", "H"): (1.5, 116.0),
    ("H", "C2", "O2"): (1.9, 122.0),
}
TORSION = {  # key (a, b, c, d), looked up in both directions: (n, V, delta)
    ("H", "C3", "C3", "H"): (3, 0.014, 0.0),
    ("H", "C3", "C3", "O3"): (3, 0.016, 0.0),
    ("C3", "C3", "O3", "H"): (3, 0.020, 0.0),
    ("H", "C3", "O3", "H"): (3, 0.015, 0.0),
}
IMPROPER = {  # planar centre type: k_w in eV/rad^2; minimum at chi = 0
    "C2": 2.5,
}


def die(message):
    sys.stderr.write("make-demo.py: check failed: %s\n" % message)
    sys.exit(1)


# ---------------------------------------------------------- internal coordinates
# Each returns (value, {atom: gradient 3-vector}).

def bond_coord(x, i, j):
    d = x[i] - x[j]
    r = float(np.linalg.norm(d))
    u = d / r
    return r, {i: u, j: -u}


def angle_coord(x, i, j, k):
    a = x[i] - x[j]
    b = x[k] - x[j]
    la = float(np.linalg.norm(a))
    lb = float(np.linalg.norm(b))
    ua, ub = a / la, b / lb
    c = float(np.dot(ua, ub))
    s = float(np.linalg.norm(np.cross(ua, ub)))
    theta = math.atan2(s, c)
    gi = (c * ua - ub) / (la * s)
    gk = (c * ub - ua) / (lb * s)
    return theta, {i: gi, k: gk, j: -(gi + gk)}


def dihedral_coord(x, i, j, k, l):
    """Dihedral i-j-k-l in (-pi, pi]; Blondel & Karplus (1996) gradient."""
    f = x[i] - x[j]
    g = x[j] - x[k]
    h = x[l] - x[k]
    a = np.cross(f, g)
    b = np.cross(h, g)
    lg = float(np.linalg.norm(g))
    a2 = float(np.dot(a, a))
    b2 = float(np.dot(b, b))
    phi = math.atan2(float(np.dot(np.cross(b, a), g)) / lg, float(np.dot(a, b)))
    fg = float(np.dot(f, g))
    hg = float(np.dot(h, g))
    gi = -lg / a2 * a
    gl = lg / b2 * b
    gj = lg / a2 * a + fg / (a2 * lg) * a - hg / (b2 * lg) * b
    gk = hg / (b2 * lg) * b - fg / (a2 * lg) * a - lg / b2 * b
    return phi, {i: gi, j: gj, k: gk, l: gl}


# ---------------------------------------------------------------- force field

class ForceField:
    def __init__(self, types, bonds, impropers=()):
        self.types = list(types)
        self.n = len(types)
        nbr = [set() for _ in range(self.n)]
        self.bonds = []
        for i, j in bonds:
            key = tuple(sorted((types[i], types[j])))
            k, r0 = BOND[key]
            self.bonds.append((i, j, k, r0))
            nbr[i].add(j)
            nbr[j].add(i)
        self.angles = []
        for j in range(self.n):
            ns = sorted(nbr[j])
            for p in range(len(ns)):
                for q in range(p + 1, len(ns)):
                    i, k = ns[p], ns[q]
                    ends = sorted((types[i], types[k]))
                    k_t, t0 = ANGLE[(ends[0], types[j], ends[1])]
                    self.angles.append((i, j, k, k_t, math.radians(t0)))
        self.torsions = []
        for j, k, _, _ in self.bonds:
            for i in sorted(nbr[j] - {k}):
                for l in sorted(nbr[k] - {j}):
                    key = (types[i], types[j], types[k], types[l])
                    par = TORSION.get(key) or TORSION.get(key[::-1])
                    if par is None:
                        raise KeyError("no torsion parameters for %s" % (key,))
                    n, v, dl = par
                    self.torsions.append((i, j, k, l, n, v, math.radians(dl)))
        self.impropers = []
        for c, a, b, d in impropers:
            self.impropers.append((c, a, b, d, IMPROPER[types[c]]))
        self.restraints = []   # (i, j, k, l, k_r, target): k_r (phi - target)^2

    def internal_coords(self):
        """Every internal coordinate as (kind, atoms), for the checks."""
        out = [("bond", t[:2]) for t in self.bonds]
        out += [("angle", t[:3]) for t in self.angles]
        out += [("dihedral", t[:4]) for t in self.torsions + self.impropers]
        return out

    def energy_gradient(self, x, restrained=False):
        x = np.asarray(x, dtype=float).reshape(self.n, 3)
        e = 0.0
        grad = np.zeros((self.n, 3))

        def add(de, parts):
            for atom, gvec in parts.items():
                grad[atom] += de * gvec

        for i, j, k, r0 in self.bonds:
            r, parts = bond_coord(x, i, j)
            e += k * (r - r0) ** 2
            add(2.0 * k * (r - r0), parts)
        for i, j, k, k_t, t0 in self.angles:
            t, parts = angle_coord(x, i, j, k)
            e += k_t * (t - t0) ** 2
            add(2.0 * k_t * (t - t0), parts)
        for i, j, k, l, n, v, dl in self.torsions:
            p, parts = dihedral_coord(x, i, j, k, l)
            e += 0.5 * v * (1.0 + math.cos(n * p - dl))
            add(-0.5 * v * n * math.sin(n * p - dl), parts)
        for i, j, k, l, k_w in self.impropers:
            chi, parts = dihedral_coord(x, i, j, k, l)
            e += k_w * chi ** 2
            add(2.0 * k_w * chi, parts)
        if restrained:
            for i, j, k, l, k_r, target in self.restraints:
                p, parts = dihedral_coord(x, i, j, k, l)
                dp = math.remainder(p - target, 2.0 * math.pi)
                e += k_r * dp ** 2
                add(2.0 * k_r * dp, parts)
        return e, grad.reshape(-1)

    def energy(self, x, restrained=False):
        return self.energy_gradient(x, restrained)[0]

    def gradient(self, x, restrained=False):
        return self.energy_gradient(x, restrained)[1]

    def hessian(self, x, step=1e-4):
        """Central differences of the analytic gradient (not symmetrised)."""
        x = np.asarray(x, dtype=float).reshape(-1)
        m = x.size
        h = np.zeros((m, m))
        for c in range(m):
            xp = x.copy()
            xm = x.copy()
            xp[c] += step
            xm[c] -= step
            h[:, c] = (self.gradient(xp) - self.gradient(xm)) / (2.0 * step)
        return h


COORD_FUNCS = {"bond": bond_coord, "angle": angle_coord, "dihedral": dihedral_coord}


def check_gradients(ff, x, what, restrained=False):
    """Analytic gradients against central differences of the values.

    Central difference f'(x) ~ (f(x+h) - f(x-h)) / 2h, error ~ h^2 f'''/6
    (common practice); h = 1e-5 A gives errors near 1e-9 here."""
    x = np.asarray(x, dtype=float).reshape(ff.n, 3)
    hstep = 1e-5
    coords = ff.internal_coords()
    if restrained:
        coords += [("dihedral", t[:4]) for t in ff.restraints]
    for kind, atoms in coords:
        func = COORD_FUNCS[kind]
        _, parts = func(x, *atoms)
        for atom in set(atoms):
            for c in range(3):
                xp = x.copy()
                xm = x.copy()
                xp[atom, c] += hstep
                xm[atom, c] -= hstep
                d = math.remainder(func(xp, *atoms)[0] - func(xm, *atoms)[0], 2 * math.pi)
                fd = d / (2 * hstep)
                an = parts.get(atom, np.zeros(3))[c]
                if abs(fd - an) > 1e-6 * max(1.0, abs(fd)):
                    die("%s: d%s%s/dx[%d,%d] analytic %.9g, finite difference %.9g"
                        % (what, kind, atoms, atom, c, an, fd))
    g = ff.gradient(x, restrained)
    flat = x.reshape(-1)
    worst = 0.0
    for c in range(flat.size):
        xp = flat.copy()
        xm = flat.copy()
        xp[c] += hstep
        xm[c] -= hstep
        fd = (ff.energy(xp, restrained) - ff.energy(xm, restrained)) / (2 * hstep)
        worst = max(worst, abs(fd - g[c]))
    if worst > 1e-7:
        die("%s: energy gradient differs from finite differences by %.3g eV/A" % (what, worst))
    print("  %s: gradient check passed (max |analytic - finite difference| = %.1e eV/A)"
          % (what, worst))


def checked_hessian(ff, x, what):
    """Central differences of the analytic gradient with steps h = 1e-4 A and
    2h, Richardson-extrapolated: H = (4 H_h - H_2h)/3 cancels the h^2 error
    term (common practice), so the finite-difference error does not show up
    as spurious rigid-body residuals."""
    h1 = ff.hessian(x, 1e-4)
    h2 = ff.hessian(x, 2e-4)
    h = (4.0 * h1 - h2) / 3.0
    scale = float(np.max(np.abs(h)))
    asym = float(np.max(np.abs(h - h.T))) / scale
    if asym > 1e-8:
        die("%s: Hessian asymmetry %.3g relative to max |H| (limit 1e-8)" % (what, asym))
    asym1 = float(np.max(np.abs(h1 - h1.T))) / scale
    if asym1 > 1e-8:
        die("%s: Hessian (step 1e-4) asymmetry %.3g relative to max |H|" % (what, asym1))
    # The plain central difference agrees with the extrapolated value to
    # O(h^2), i.e. about 1e-8 relative here.
    diff = float(np.max(np.abs(h1 - h))) / scale
    if diff > 1e-6:
        die("%s: Hessian depends on the finite-difference step (%.3g relative)" % (what, diff))
    # Translation invariance: each row of H sums to zero over the atoms, per
    # Cartesian direction (the energy does not change under a rigid shift).
    tsum = float(np.max(np.abs(h.reshape(-1, ff.n, 3).sum(axis=1)))) / scale
    if tsum > 1e-8:
        die("%s: Hessian rows do not sum to zero (%.3g relative)" % (what, tsum))
    print("  %s: Hessian asymmetry %.1e (step 1e-4 alone: %.1e), extrapolation change %.1e,"
          " row sums %.1e (relative to max |H|)" % (what, asym, asym1, diff, tsum))
    return 0.5 * (h + h.T)


# ---------------------------------------------------------------- mode analysis

def rigid_body_basis(x, masses):
    """Mass-weighted translations (3) and rotations about the centre of mass
    (3), each block orthonormalised (Eckart, Phys. Rev. 47, 552 (1935))."""
    x = x.reshape(-1, 3)
    n = len(masses)
    sm = np.sqrt(masses)
    com = (masses[:, None] * x).sum(axis=0) / masses.sum()
    r = x - com
    t = np.zeros((3 * n, 3))
    rot = np.zeros((3 * n, 3))
    for a in range(3):
        e = np.zeros(3)
        e[a] = 1.0
        t[:, a] = (sm[:, None] * e).reshape(-1)
        rot[:, a] = (sm[:, None] * np.cross(e, r)).reshape(-1)
    t, _ = np.linalg.qr(t)
    rot -= t @ (t.T @ rot)
    u, s, _ = np.linalg.svd(rot, full_matrices=False)
    if s[-1] < 1e-6 * s[0]:
        die("molecule is linear or degenerate: not expected for these examples")
    return t, u


def signed_wavenumber(lam):
    return math.copysign(math.sqrt(abs(lam)), lam) * WAVENUMBER


def analyse(x, masses, hess):
    """Wavenumbers of the projected mass-weighted Hessian, by an orthonormal
    basis D of the vibrational space: eig(D^T K D).  (Quaver itself uses a
    shifted projection; this is an independent route to the same numbers.)"""
    n3 = hess.shape[0]
    msq = np.repeat(np.sqrt(masses), 3)
    k = hess / np.outer(msq, msq)
    t, rot = rigid_body_basis(x, masses)
    v = np.hstack([t, rot])
    # Complete v to an orthonormal basis; the last columns span the vibrations.
    q, _ = np.linalg.qr(np.hstack([v, np.eye(n3)]))
    d = q[:, v.shape[1]:n3]
    if np.max(np.abs(v.T @ d)) > 1e-12:
        die("vibrational basis not orthogonal to the rigid-body space")
    lam, vec = np.linalg.eigh(d.T @ k @ d)
    modes = d @ vec                      # mass-weighted unit eigenvectors l
    res_t = np.linalg.eigvalsh(t.T @ k @ t)
    res_r = np.linalg.eigvalsh(rot.T @ k @ rot)
    return {
        "eigenvalues": lam,
        "wavenumbers": [signed_wavenumber(x_) for x_ in lam],
        "vectors": modes,
        "res_t": [signed_wavenumber(x_) for x_ in res_t],
        "res_r": [signed_wavenumber(x_) for x_ in res_r],
        "natoms": len(masses),
    }


def participation(l, natoms):
    return (l.reshape(natoms, 3) ** 2).sum(axis=1)


# ---------------------------------------------------------------- geometry tools

def place(a, b, c, bond, angle, dihedral):
    """Position of atom d with |d-c| = bond, angle b-c-d and dihedral a-b-c-d
    (degrees) — the usual Z-matrix construction (common practice)."""
    bc = c - b
    bc /= np.linalg.norm(bc)
    nrm = np.cross(b - a, bc)
    nrm /= np.linalg.norm(nrm)
    m = np.array([bc, np.cross(nrm, bc), nrm]).T
    th = math.radians(angle)
    ph = math.radians(dihedral)
    d2 = np.array([-bond * math.cos(th), bond * math.sin(th) * math.cos(ph),
                   bond * math.sin(th) * math.sin(ph)])
    return c + m @ d2


def standard_orientation(x, masses):
    """Centre of mass at the origin, principal axes along x, y, z (smallest
    moment first).  Signs: the first atom with |projection| > 1e-3 A on x and
    on y is positive; z = x cross y."""
    x = x.reshape(-1, 3)
    com = (masses[:, None] * x).sum(axis=0) / masses.sum()
    r = x - com
    inertia = np.zeros((3, 3))
    for m, p in zip(masses, r):
        inertia += m * (np.dot(p, p) * np.eye(3) - np.outer(p, p))
    w, axes = np.linalg.eigh(inertia)
    if min(w[1] - w[0], w[2] - w[1]) < 1e-3 * w[2]:
        die("principal moments nearly degenerate: orientation not unique")
    ex, ey = axes[:, 0], axes[:, 1]
    for e in (ex, ey):
        proj = r @ e
        first = next(p for p in proj if abs(p) > 1e-3)
        if first < 0:
            e *= -1.0
    ez = np.cross(ex, ey)
    return r @ np.array([ex, ey, ez]).T


def rounded(x, decimals=10):
    """Round to what the files store (and turn -0.0 into 0.0)."""
    return np.array([float("%.*f" % (decimals, v)) + 0.0 for v in np.ravel(x)])


def fmt_e(v):
    return "%.10e" % v


def stored(v):
    """The float a reader gets back from '%.10e' text."""
    return float(fmt_e(v)) + 0.0


# ---------------------------------------------------------------- writers

def write_text(path, text):
    with open(path, "w", encoding="utf-8", newline="\n") as f:
        f.write(text)
    print("  wrote %s" % path)


def xyz_text(symbols, x, forces, energy, note):
    lines = ["%d" % len(symbols),
             'Properties=species:S:1:pos:R:3:forces:R:3 energy=%.10f pbc="F F F" note="%s"'
             % (energy, note)]
    x = x.reshape(-1, 3)
    f = forces.reshape(-1, 3)
    for s, p, g in zip(symbols, x, f):
        lines.append("%-2s %16.10f %16.10f %16.10f %18.10e %18.10e %18.10e"
                     % (s, p[0], p[1], p[2], g[0] + 0.0, g[1] + 0.0, g[2] + 0.0))
    return "\n".join(lines) + "\n"


def hessian_text(h, header):
    lines = ["# " + s if s else "#" for s in header]
    for row in h:
        lines.append(" ".join(fmt_e(v) for v in row))
    return "\n".join(lines) + "\n"


def js(v):
    """JSON text of a number as stored (shortest repr of the stored float)."""
    return json.dumps(v)


def bundle_text(title, description, symbols, labels, x, forces, energy, hunits, h):
    n = len(symbols)
    x = x.reshape(-1, 3)
    f = forces.reshape(-1, 3)
    out = ["{",
           '  "format": "quaver-bundle",',
           '  "version": 1,',
           '  "title": %s,' % json.dumps(title),
           '  "description": %s,' % json.dumps(description),
           '  "structure": {',
           '    "atoms": [']
    for a in range(n):
        out.append('      {"element": %s, "label": %s, "position": [%s]}%s'
                   % (json.dumps(symbols[a]), json.dumps(labels[a]),
                      ", ".join(js(float(v)) for v in x[a]), "," if a < n - 1 else ""))
    out.append("    ],")
    out.append('    "energy": %s,' % js(energy))
    out.append('    "forces": [')
    for a in range(n):
        out.append("      [%s]%s" % (", ".join(js(stored(v)) for v in f[a]),
                                    "," if a < n - 1 else ""))
    out.append("    ]")
    out.append("  },")
    out.append('  "masses": "isotopic",')
    out.append('  "hessian": {')
    out.append('    "units": %s,' % json.dumps(hunits))
    out.append('    "layout": "lower",')
    out.append('    "data": [')
    m = h.shape[0]
    for i in range(m):
        out.append("      [%s]%s" % (", ".join(js(stored(h[i, j])) for j in range(i + 1)),
                                    "," if i < m - 1 else ""))
    out.append("    ]")
    out.append("  }")
    out.append("}")
    text = "\n".join(out) + "\n"
    json.loads(text)   # must be valid JSON
    return text


def mode_table(an, symbols, labels, top=2):
    rows = ["| # | wavenumber / cm^-1 | most moving atoms (participation) |",
            "| ---: | ---: | --- |"]
    for idx, (w, l) in enumerate(zip(an["wavenumbers"], an["vectors"].T), start=1):
        p = participation(l, an["natoms"])
        order = sorted(range(len(p)), key=lambda a: (-round(p[a], 6), a))[:top]
        who = ", ".join("%s %.2f" % (labels[a], p[a]) for a in order)
        rows.append("| %d | %s | %s |" % (idx, fmt_signed(w), who))
    return "\n".join(rows)


def fmt_residuals(values):
    if max(abs(v) for v in values) < 0.01:
        return "all below 0.01 in magnitude"
    return ", ".join(fmt_signed(v) for v in values)


def fmt_signed(w):
    if abs(w) < 0.005:
        return "0.00"
    return "%.2fi" % -w if w < 0 else "%.2f" % w


def print_modes(name, an, labels):
    print("  %s wavenumbers / cm^-1 (negative = imaginary):" % name)
    for idx, (w, l) in enumerate(zip(an["wavenumbers"], an["vectors"].T), start=1):
        p = participation(l, an["natoms"])
        a = int(np.argmax(p))
        print("    %2d %12.4f   largest participation %s %.3f" % (idx, w, labels[a], p[a]))
    print("  %s residuals / cm^-1: translations %s, rotations %s"
          % (name, " ".join("%.4f" % v for v in an["res_t"]),
             " ".join("%.4f" % v for v in an["res_r"])))


# ---------------------------------------------------------------- constants check

def check_constants():
    pc = scipy.constants.physical_constants
    # scipy 1.10 carries CODATA 2018: the typed values must equal it.
    for name, ours in (("atomic mass constant", M_U),
                       ("Hartree energy in eV", HARTREE_EV),
                       ("Bohr radius", BOHR_A * 1e-10),
                       ("elementary charge", E_CHARGE),
                       ("speed of light in vacuum", C_LIGHT)):
        if abs(pc[name][0] - ours) > 1e-12 * abs(ours):
            die("constant %r: ours %.12g, scipy %.12g" % (name, ours, pc[name][0]))
    # REFERENCES.md quotes the derived value 521.470 898 cm^-1.
    if abs(WAVENUMBER - 521.470898) > 1e-6:
        die("wavenumber conversion %.9f, expected 521.470898" % WAVENUMBER)
    print("constants: sqrt(eV/(A^2 u)) = %.7f cm^-1, 1 hartree/bohr^2 = %.9f eV/A^2"
          % (WAVENUMBER, HARTREE_BOHR2))


# ---------------------------------------------------------------- ethanol

ETH_SYMBOLS = ["C", "C", "O", "H", "H", "H", "H", "H", "H"]
ETH_TYPES = ["C3", "C3", "O3", "H", "H", "H", "H", "H", "H"]
ETH_LABELS = ["C1", "C2", "O3", "H4", "H5", "H6", "H7", "H8", "H9"]
ETH_BONDS = [(0, 1), (1, 2), (2, 8), (0, 3), (0, 4), (0, 5), (1, 6), (1, 7)]
ETH_HOCC = (8, 2, 1, 0)              # the hydroxyl torsion H9-O3-C2-C1
ETH_HOLD_DEG = 123.0                 # 3 degrees past eclipsed (120)
ETH_RESTRAINT_K = 10.0               # eV/rad^2, stiff next to the barrier 0.05 eV
ETH_STOP = 1e-2                      # eV/A, the loose threshold
ETH_STEP = 0.005                     # A^2/eV, fixed steepest-descent step


def ethanol_start():
    """A rough starting geometry from a Z-matrix (degrees, A)."""
    c1 = np.array([0.0, 0.0, 0.0])
    c2 = np.array([1.50, 0.0, 0.0])
    o3 = c2 + 1.45 * np.array([math.cos(math.radians(180 - 107.0)),
                               math.sin(math.radians(180 - 107.0)), 0.0])
    h9 = place(c1, c2, o3, 0.97, 107.0, ETH_HOLD_DEG)
    h7 = place(o3, c1, c2, 1.10, 111.0, 118.0)
    h8 = place(o3, c1, c2, 1.10, 111.0, -118.0)
    h4 = place(o3, c2, c1, 1.08, 111.0, 178.0)
    h5 = place(o3, c2, c1, 1.08, 110.0, 62.0)
    h6 = place(o3, c2, c1, 1.08, 110.0, -58.0)
    return np.array([c1, c2, o3, h4, h5, h6, h7, h8, h9])


def make_ethanol(outdir):
    print("ethanol-unconverged:")
    ff = ForceField(ETH_TYPES, ETH_BONDS)
    ff.restraints.append(ETH_HOCC + (ETH_RESTRAINT_K, math.radians(ETH_HOLD_DEG)))
    masses = np.array([MASS[s] for s in ETH_SYMBOLS])
    x0 = ethanol_start()
    check_gradients(ff, x0, "ethanol start", restrained=True)
    phi0 = math.degrees(dihedral_coord(x0, *ETH_HOCC)[0])
    if abs(phi0 - ETH_HOLD_DEG) > 1e-9:
        die("Z-matrix dihedral %.6f, wanted %.6f" % (phi0, ETH_HOLD_DEG))

    # Steepest descent with a fixed step on force field + restraint; stop at
    # the loose threshold (the "stopped early" optimisation).
    x = x0.reshape(-1).copy()
    steps = 0
    while True:
        g = ff.gradient(x, restrained=True)
        if np.linalg.norm(g) < ETH_STOP:
            break
        x = x - ETH_STEP * g
        steps += 1
        if steps > 200000:
            die("steepest descent did not reach the loose threshold")
    print("  steepest descent stopped after %d steps (|grad(E + restraint)| = %.4f eV/A)"
          % (steps, np.linalg.norm(g)))
    # For comparison: the same restrained problem converged tightly.
    tight = scipy.optimize.minimize(ff.energy, x, jac=ff.gradient, args=(True,),
                                    method="BFGS", options={"gtol": 1e-9, "maxiter": 10000})
    xt = standard_orientation(tight.x, masses)
    xs = standard_orientation(x, masses)
    rms = math.sqrt(float(np.mean(np.sum((xt - xs) ** 2, axis=1))))
    print("  distance from the tightly converged restrained point: RMS %.4f A" % rms)

    x = rounded(standard_orientation(x, masses))
    e, g = ff.energy_gradient(x)
    gnorm = float(np.linalg.norm(g))
    phi = math.degrees(dihedral_coord(x.reshape(-1, 3), *ETH_HOCC)[0])
    print("  H9-O3-C2-C1 = %.3f deg, E = %.6f eV, |gradient| = %.5f eV/A" % (phi, e, gnorm))
    if not 0.5e-2 <= gnorm <= 3e-2:
        die("ethanol residual gradient %.4g eV/A is not near 1e-2" % gnorm)
    check_gradients(ff, x, "ethanol final")
    h = checked_hessian(ff, x, "ethanol")
    hs = np.array([[stored(v) for v in row] for row in h])   # as written
    an = analyse(x, masses, hs)
    print_modes("ethanol", an, ETH_LABELS)

    lam = an["eigenvalues"]
    nneg = int(np.sum(lam < 0))
    if nneg != 1:
        die("ethanol: %d negative eigenvalues, expected exactly 1" % nneg)
    p = participation(an["vectors"][:, 0], 9)
    if int(np.argmax(p)) != 8 or p[8] < 0.5:
        die("ethanol: imaginary mode not dominated by the hydroxyl H (p = %s)" % p)
    if len(lam) != 21:
        die("ethanol: %d vibrations, expected 3N-6 = 21" % len(lam))
    rmax = max(abs(v) for v in an["res_r"])
    tmax = max(abs(v) for v in an["res_t"])
    if not 2.0 <= rmax <= 80.0:
        die("ethanol: largest rotational residual %.3f cm^-1 not in 2..80" % rmax)
    if tmax > 0.1:
        die("ethanol: translational residual %.3f cm^-1 (Hessian not translation-invariant)"
            % tmax)
    print("  imaginary mode %.2fi cm^-1, hydroxyl H participation %.3f"
          % (-an["wavenumbers"][0], p[8]))

    sub = os.path.join(outdir, "ethanol-unconverged")
    os.makedirs(sub, exist_ok=True)
    note = "invented demo data (Quaver toy force field), not a real calculation"
    write_text(os.path.join(sub, "ethanol.xyz"),
               xyz_text(ETH_SYMBOLS, x, -g, e, note))
    write_text(os.path.join(sub, "ethanol.hessian.txt"), hessian_text(h, [
        "Ethanol, CH3CH2OH: Cartesian Hessian (second derivatives of the energy),",
        "27 x 27, coordinate order x1 y1 z1 x2 ... in the atom order of ethanol.xyz.",
        "Units: eV/A^2.",
        "INVENTED demo data from Quaver's toy force field (tests/tools/make-demo.py),",
        "at a deliberately non-stationary geometry; not a real calculation.",
    ]))
    desc = ("Invented demo data, not a real calculation: ethanol from Quaver's toy "
            "force field (tests/tools/make-demo.py) at a made-up relaxed-scan point, "
            "with the H-O-C-C dihedral held 3 degrees past eclipsed and the "
            "optimisation stopped early. Expect one imaginary mode (the hydroxyl "
            "torsion) and rotational residuals of some cm^-1.")
    write_text(os.path.join(sub, "ethanol.quaver.json"), bundle_text(
        "Ethanol, unconverged scan point (invented demo data)", desc,
        ETH_SYMBOLS, ETH_LABELS, x, -g, float("%.10f" % e), "eV/A^2", h))
    write_text(os.path.join(sub, "README.md"), ethanol_readme(an, phi, e, gnorm, p[8]))
    return an


def ethanol_readme(an, phi, e, gnorm, p9):
    res = an["res_r"]
    return f"""# Ethanol, an unconverged scan point (invented demo data)

**Everything here is invented.** No quantum-chemistry program was run. The
geometry, forces and Hessian come from Quaver's own toy valence force field
(bond, angle and torsion terms with made-up round-number parameters), written
by `tests/tools/make-demo.py`. Do not quote these numbers as data about
ethanol.

## The made-up scenario

Someone scanned the hydroxyl torsion of ethanol, CH3CH2OH. At one scan point
the H9-O3-C2-C1 dihedral was held at {phi:.1f} degrees, 3 degrees past the
eclipsed conformation at the top of the torsion barrier, and the optimisation
of everything else was stopped early at a loose threshold. A frequency
calculation was then run at that point anyway. This is the "suspicious mode"
case:

- one imaginary mode, {fmt_signed(an["wavenumbers"][0])} cm^-1, almost only
  the hydroxyl hydrogen H9 moving (participation {p9:.2f}): the torsion sits
  near a maximum, not a minimum;
- the geometry is not stationary (gradient norm {gnorm:.4f} eV/A, energy
  {e:.4f} eV above the strain-free reference of the force field), so the
  rotational residuals are clearly non-zero: {", ".join(fmt_signed(v) for v in res)}
  cm^-1 (translations stay near zero: the Hessian itself is fine).

## Files

| file | content |
| --- | --- |
| `ethanol.xyz` | extended XYZ: positions (A), forces (eV/A), energy (eV) |
| `ethanol.hessian.txt` | Cartesian Hessian, full 27 x 27, eV/A^2 |
| `ethanol.quaver.json` | the same as a Quaver bundle (Hessian inline, lower triangle); built into Quaver as the `--demo` example |

## Run it

    quaver modes data/examples/ethanol-unconverged/ethanol.quaver.json
    quaver modes data/examples/ethanol-unconverged/ethanol.xyz \\
        --hessian data/examples/ethanol-unconverged/ethanol.hessian.txt \\
        --hessian-units eV/A^2
    quaver modes --demo

## What the generator computed (NumPy, projected mass-weighted Hessian)

Masses: most abundant isotopes (NIST). Wavenumbers in cm^-1, "i" = imaginary;
participation is the share of the mode's mass-weighted norm on an atom.
Atoms: C1 methyl carbon, C2 methylene carbon, O3, H4-H6 methyl, H7-H8
methylene, H9 hydroxyl.

{mode_table(an, ETH_SYMBOLS, ETH_LABELS)}

Rigid-body residuals (cm^-1, "i" = imaginary): translations {fmt_residuals(an["res_t"])},
rotations {fmt_residuals(res)}.

Regenerate with `/usr/bin/python3 tests/tools/make-demo.py data/examples`.
"""


# ---------------------------------------------------------------- formaldehyde

FOR_SYMBOLS = ["C", "O", "H", "H"]
FOR_TYPES = ["C2", "O2", "H", "H"]
FOR_LABELS = ["C1", "O2", "H3", "H4"]
FOR_BONDS = [(0, 1), (0, 2), (0, 3)]
FOR_IMPROPERS = [(0, 2, 3, 1)]       # C1-H3-H4-O2


def make_formaldehyde(outdir):
    print("formaldehyde:")
    ff = ForceField(FOR_TYPES, FOR_BONDS, FOR_IMPROPERS)
    masses = np.array([MASS[s] for s in FOR_SYMBOLS])
    # A distorted, non-planar start.
    c = np.array([0.0, 0.0, 0.0])
    o = np.array([1.25, 0.0, 0.0])
    h3 = place(np.array([0.0, 1.0, 0.0]), o, c, 1.05, 118.0, 15.0)
    h4 = place(h3, o, c, 1.13, 125.0, 160.0)
    x0 = np.array([c, o, h3, h4])
    check_gradients(ff, x0, "formaldehyde start")

    res = scipy.optimize.minimize(ff.energy, x0.reshape(-1), jac=ff.gradient,
                                  method="BFGS", options={"gtol": 1e-10, "maxiter": 10000})
    x = res.x
    for _ in range(3):   # polish with Newton steps on the vibrational space
        hh = ff.hessian(x)
        hh = 0.5 * (hh + hh.T)
        w, u = np.linalg.eigh(hh)
        keep = w > 1e-3
        g = ff.gradient(x)
        x = x - u[:, keep] @ ((u[:, keep].T @ g) / w[keep])
    x = rounded(standard_orientation(x, masses), 12)
    e, g = ff.energy_gradient(x)
    gnorm = float(np.linalg.norm(g))
    print("  optimised: E = %.3e eV, |gradient| = %.2e eV/A" % (e, gnorm))
    if gnorm > 1e-8:
        die("formaldehyde gradient %.3g eV/A above 1e-8" % gnorm)
    # Strain-free parameters: the minimum has r = r0 and theta = theta0.
    xr = x.reshape(-1, 3)
    for i, j, _, r0 in ff.bonds:
        r = bond_coord(xr, i, j)[0]
        if abs(r - r0) > 1e-9:
            die("formaldehyde bond %d-%d = %.12f, expected r0 = %.6f" % (i, j, r, r0))
    for i, j, k, _, t0 in ff.angles:
        t = angle_coord(xr, i, j, k)[0]
        if abs(t - t0) > 1e-8:
            die("formaldehyde angle %d-%d-%d = %.10f, expected %.6f"
                % (i, j, k, math.degrees(t), math.degrees(t0)))
    if np.max(np.abs(xr[:, 2])) > 1e-11:
        die("formaldehyde not planar in the xy plane")
    check_gradients(ff, x, "formaldehyde final")
    h = checked_hessian(ff, x, "formaldehyde")
    h_au = h / HARTREE_BOHR2
    hs = np.array([[stored(v) for v in row] for row in h_au]) * HARTREE_BOHR2
    an = analyse(x, masses, hs)
    print_modes("formaldehyde", an, FOR_LABELS)
    lam = an["eigenvalues"]
    if len(lam) != 6 or np.min(lam) <= 0:
        die("formaldehyde: expected 6 positive eigenvalues, got %s" % lam)
    rmax = max(abs(v) for v in an["res_r"] + an["res_t"])
    if rmax > 0.1:
        die("formaldehyde: rigid-body residual %.3g cm^-1, expected ~0" % rmax)

    sub = os.path.join(outdir, "formaldehyde")
    os.makedirs(sub, exist_ok=True)
    note = "invented demo data (Quaver toy force field), not a real calculation"
    e_out = float("%.10f" % e) + 0.0
    write_text(os.path.join(sub, "formaldehyde.xyz"),
               xyz_text(FOR_SYMBOLS, x, -g, e_out, note))
    write_text(os.path.join(sub, "formaldehyde.hessian.txt"), hessian_text(h_au, [
        "Formaldehyde, H2CO: Cartesian Hessian (second derivatives of the energy),",
        "12 x 12, coordinate order x1 y1 z1 x2 ... in the atom order of formaldehyde.xyz.",
        "Units: hartree/bohr^2 (CODATA 2018: E_h = 27.211386245988 eV, a0 = 0.529177210903 A).",
        "INVENTED demo data from Quaver's toy force field (tests/tools/make-demo.py),",
        "at the force field's minimum; not a real calculation.",
    ]))
    desc = ("Invented demo data, not a real calculation: formaldehyde at the minimum "
            "of Quaver's toy force field (tests/tools/make-demo.py). A stable "
            "molecule: six real modes, rigid-body residuals near zero. The Hessian "
            "is stored in hartree/bohr^2.")
    write_text(os.path.join(sub, "formaldehyde.quaver.json"), bundle_text(
        "Formaldehyde (invented demo data)", desc, FOR_SYMBOLS, FOR_LABELS,
        x, -g, e_out, "hartree/bohr^2", h_au))
    write_text(os.path.join(sub, "README.md"), formaldehyde_readme(an, gnorm))
    return an


def formaldehyde_readme(an, gnorm):
    return f"""# Formaldehyde, a stable small molecule (invented demo data)

**Everything here is invented.** No quantum-chemistry program was run. The
geometry and Hessian come from Quaver's own toy valence force field (bond,
angle and one out-of-plane term with made-up round-number parameters),
written by `tests/tools/make-demo.py`. Do not quote these numbers as data
about formaldehyde.

## The made-up scenario

H2CO fully optimised with the toy force field (gradient norm
{gnorm:.1e} eV/A): a planar C2v minimum with C=O 1.205 A, C-H 1.100 A and
H-C-H 116 degrees. The counter-example to the ethanol case: six real modes
and rigid-body residuals close to zero. The Hessian is stored in
hartree/bohr^2, so reading it exercises unit conversion.

## Files

| file | content |
| --- | --- |
| `formaldehyde.xyz` | extended XYZ: positions (A), forces (eV/A, zero to rounding), energy (eV) |
| `formaldehyde.hessian.txt` | Cartesian Hessian, full 12 x 12, hartree/bohr^2 |
| `formaldehyde.quaver.json` | the same as a Quaver bundle (Hessian inline, lower triangle, hartree/bohr^2) |

## Run it

    quaver modes data/examples/formaldehyde/formaldehyde.quaver.json
    quaver modes data/examples/formaldehyde/formaldehyde.xyz \\
        --hessian data/examples/formaldehyde/formaldehyde.hessian.txt \\
        --hessian-units hartree/bohr^2

## What the generator computed (NumPy, projected mass-weighted Hessian)

Masses: most abundant isotopes (NIST). Wavenumbers in cm^-1; participation is
the share of the mode's mass-weighted norm on an atom. The molecule lies in
the xy plane, C=O along x.

{mode_table(an, FOR_SYMBOLS, FOR_LABELS)}

Rigid-body residuals (cm^-1, "i" = imaginary): translations {fmt_residuals(an["res_t"])},
rotations {fmt_residuals(an["res_r"])}.

Regenerate with `/usr/bin/python3 tests/tools/make-demo.py data/examples`.
"""


# ---------------------------------------------------------------- index

def index_readme(eth, form):
    return f"""# Example data

**All examples here are invented demo data.** They come from a small toy
force field of Quaver's own (harmonic bonds and angles, cosine torsions, an
out-of-plane term; no non-bonded terms; made-up round-number parameters),
not from any quantum-chemistry program, and they are not measurements or
results about real molecules. The generator is `tests/tools/make-demo.py`;
each folder's README.md tells the scenario and lists the numbers the
generator computed with NumPy.

| folder | molecule | what it shows |
| --- | --- | --- |
| `ethanol-unconverged/` | ethanol, 9 atoms | the "suspicious mode" case: a made-up scan point near the top of the hydroxyl torsion barrier, optimisation stopped early; one imaginary mode ({fmt_signed(eth["wavenumbers"][0])} cm^-1) on the hydroxyl H, rotational residuals up to {max(abs(v) for v in eth["res_r"]):.0f} cm^-1. Built into Quaver as the `--demo` example. |
| `formaldehyde/` | formaldehyde, 4 atoms | a stable molecule at the force field's minimum: six real modes ({form["wavenumbers"][0]:.0f} to {form["wavenumbers"][-1]:.0f} cm^-1), residuals near zero; Hessian in hartree/bohr^2. |

Each folder holds the same data three ways: an extended XYZ file (positions,
forces, energy), a plain-text Hessian, and a Quaver bundle
(`*.quaver.json`) with the Hessian inline. Run, for example:

    quaver modes data/examples/ethanol-unconverged/ethanol.quaver.json
    quaver modes data/examples/formaldehyde/formaldehyde.xyz \\
        --hessian data/examples/formaldehyde/formaldehyde.hessian.txt \\
        --hessian-units hartree/bohr^2
    quaver modes --demo

Regenerate all files (deterministic, identical output every run):

    /usr/bin/python3 tests/tools/make-demo.py data/examples
"""


def main(argv):
    if len(argv) != 2:
        sys.stderr.write("usage: /usr/bin/python3 tests/tools/make-demo.py data/examples\n")
        return 1
    outdir = argv[1]
    os.makedirs(outdir, exist_ok=True)
    check_constants()
    eth = make_ethanol(outdir)
    form = make_formaldehyde(outdir)
    write_text(os.path.join(outdir, "README.md"), index_readme(eth, form))
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
