"""qvtest.py — shared helpers for Quaver's cross-check tests.

The tests run the real `quaver modes` command and compare what it prints with
calculations done here, independently, in NumPy/SciPy, and with textbook
closed forms.  Nothing in this module reads Quaver's sources or reuses its
numbers: masses come from python3-periodictable, constants from
scipy.constants (CODATA 2018 in SciPy 1.10), the rigid-body basis and the
projection are built here from their definitions.

SPDX-License-Identifier: GPL-3.0-or-later
"""
import json
import os
import subprocess
import sys
import tempfile

import numpy as np
import scipy.constants as sc
import scipy.linalg
import periodictable

# --------------------------------------------------------------------------
# The command under test
# --------------------------------------------------------------------------

QUAVER = os.environ.get("QUAVER") or os.path.join(
    os.environ.get("QV_BUILD_ROOT", "/work/main/build"), "src", "cli", "quaver")
SOURCE_ROOT = os.environ.get("QV_SOURCE_ROOT") or os.path.abspath(
    os.path.join(os.path.dirname(__file__), "..", ".."))
DATA = os.path.join(os.path.dirname(os.path.abspath(__file__)), "data")

# --------------------------------------------------------------------------
# Constants, CODATA 2018 through scipy.constants (Tiesinga et al., Rev. Mod.
# Phys. 93, 025010, 2021)
# --------------------------------------------------------------------------

M_U = sc.physical_constants["atomic mass constant"][0]        # kg
E_H = sc.physical_constants["Hartree energy"][0]               # J
A_0 = sc.physical_constants["Bohr radius"][0]                  # m
ANG = 1e-10                                                    # m
# sqrt(eV / (A^2 u)) is an angular frequency in rad/s ...
OMEGA_UNIT = np.sqrt(sc.e / (ANG ** 2 * M_U))
# ... and as a wavenumber nu~ = omega / (2 pi c), in cm^-1 (c in cm/s).
# REFERENCES.md quotes 521.470 898 cm^-1 for it (derived from CODATA 2018).
CM1 = OMEGA_UNIT / (2.0 * np.pi * sc.c * 100.0)
# 1 mdyn/A = 1e-8 N / 1e-10 m = 100 N/m = 100 J/m^2 = 1e-18 J/A^2, in eV/A^2
MDYN_PER_A = 1e-8 / ANG / sc.e * ANG ** 2

# Hessian units accepted by `quaver modes`, as factors to eV/A^2.
UNIT_TO_EV_A2 = {
    "eV/A^2": 1.0,
    "hartree/bohr^2": (E_H / sc.e) / (A_0 / ANG) ** 2,
    "kcal/mol/A^2": 4184.0 / sc.N_A / sc.e,   # thermochemical calorie, 4.184 J exactly
    "kJ/mol/A^2": 1000.0 / sc.N_A / sc.e,
    "mdyn/A": MDYN_PER_A,
    "aJ/A^2": 1e-18 / sc.e,                   # 1 aJ/A^2 = 1 mdyn/A
    "N/m": ANG ** 2 / sc.e,                   # 1 J/m^2 = 1e-20 J/A^2
}

# --------------------------------------------------------------------------
# Masses: python3-periodictable, most abundant isotope.  Quaver's table is
# NIST AME2016; periodictable 1.6 carries older values that differ by up to
# 8e-7 u (REFERENCES.md).  A wavenumber scales as m^-1/2, so a relative mass
# difference delta shifts it by at most delta/2: 8e-7 u / 1 u / 2 = 4e-7 in
# the worst case (18O in an extreme light-atom mode); for the isotopes used
# here (1H, 12C, 14N, 16O, 32S, 40Ar) the differences are below 3e-9 u, i.e.
# below 2e-9 relative on a wavenumber.  Tests needing tighter agreement pass
# every mass explicitly with --mass.
# --------------------------------------------------------------------------


def most_abundant(symbol):
    el = periodictable.elements.symbol(symbol)
    best = max((iso for iso in el if iso.abundance), key=lambda iso: iso.abundance)
    return best.isotope


def isotope_mass(symbol, mass_number=None):
    el = periodictable.elements.symbol(symbol)
    if mass_number is None:
        mass_number = most_abundant(symbol)
    return float(el[mass_number].mass)


def masses_of(symbols):
    return np.array([isotope_mass(s) for s in symbols])


# --------------------------------------------------------------------------
# Reporting
# --------------------------------------------------------------------------


class Checker:
    """Collects failures so one run reports every disagreement, not just the
    first.  finish() prints the summary and exits non-zero on failure."""

    def __init__(self, name):
        self.name = name
        self.failures = []
        self.count = 0

    def ok(self, condition, message):
        self.count += 1
        if not condition:
            self.failures.append(message)
            print("FAIL: " + message, file=sys.stderr, flush=True)
        return bool(condition)

    def close(self, got, expected, what, rtol=0.0, atol=0.0):
        """Elementwise |got - expected| <= atol + rtol |expected|."""
        got = np.asarray(got, dtype=float)
        expected = np.asarray(expected, dtype=float)
        if got.shape != expected.shape:
            return self.ok(False, "%s: shape %s, expected %s" % (what, got.shape, expected.shape))
        err = np.abs(got - expected)
        bound = atol + rtol * np.abs(expected)
        bad = ~(err <= bound)
        if bad.any():
            k = np.flatnonzero(bad.ravel())
            worst = int(np.argmax((err - bound).ravel()))
            lines = ["%s: %d of %d values differ (rtol %g, atol %g); worst at flat index %d: "
                     "got %.17g, expected %.17g, |diff| %.3g"
                     % (what, k.size, err.size, rtol, atol, worst, got.ravel()[worst],
                        expected.ravel()[worst], err.ravel()[worst])]
            for i in k[:6]:
                lines.append("    [%d] got %.17g expected %.17g" % (i, got.ravel()[i], expected.ravel()[i]))
            return self.ok(False, "\n".join(lines))
        return self.ok(True, what)

    def finish(self, summary):
        if self.failures:
            print("%s: FAILED %d of %d checks (%s)" % (self.name, len(self.failures), self.count,
                                                     summary), flush=True)
            sys.exit(1)
        print("%s: ok, %d checks: %s" % (self.name, self.count, summary), flush=True)
        sys.exit(0)


# --------------------------------------------------------------------------
# Running quaver
# --------------------------------------------------------------------------


class QuaverError(Exception):
    pass


def run(args, expect=0, prefix=(), timeout=300, cwd=None):
    """Runs quaver with @args.  Raises QuaverError when the exit code is not
    @expect (None accepts any), or on a crash: a negative exit code (signal)
    or a sanitizer report.  Returns the CompletedProcess."""
    cmd = list(prefix) + [QUAVER] + [str(a) for a in args]
    try:
        p = subprocess.run(cmd, capture_output=True, timeout=timeout, cwd=cwd)
    except subprocess.TimeoutExpired:
        raise QuaverError("timed out after %d s (hang?): %s" % (timeout, " ".join(cmd)))
    p.stdout_text = p.stdout.decode("utf-8", "replace")
    p.stderr_text = p.stderr.decode("utf-8", "replace")
    crash = None
    if p.returncode < 0:
        crash = "killed by signal %d" % -p.returncode
    elif "AddressSanitizer" in p.stderr_text or "runtime error:" in p.stderr_text \
            or "LeakSanitizer" in p.stderr_text:
        crash = "sanitizer report"
    if crash:
        raise QuaverError("%s: %s\nstderr:\n%s" % (crash, " ".join(cmd), p.stderr_text[-3000:]))
    if expect is not None and p.returncode != expect:
        raise QuaverError("exit code %d, expected %d: %s\nstderr:\n%s"
                          % (p.returncode, expect, " ".join(cmd), p.stderr_text[-3000:]))
    return p


def modes_json(args, prefix=()):
    """`quaver modes ARGS --format json`, parsed."""
    p = run(["modes"] + list(args) + ["--format", "json"], prefix=prefix)
    try:
        return json.loads(p.stdout_text)
    except json.JSONDecodeError as e:
        raise QuaverError("stdout is not JSON (%s): %r" % (e, p.stdout_text[:400]))


def mode_arrays(doc, masses=None):
    """Wavenumbers, eigenvalues and (with --vectors) the displacement matrix
    D (3N x m) and the mass-weighted vectors L = D sqrt(m) from a JSON doc."""
    modes = doc["modes"]
    nu = np.array([m["wavenumber"] for m in modes], dtype=float)
    lam = np.array([m["eigenvalue"] for m in modes], dtype=float)
    out = {"wavenumber": nu, "eigenvalue": lam}
    if modes and "displacement" in modes[0]:
        D = np.array([m["displacement"] for m in modes], dtype=float).T
        out["D"] = D
        if masses is not None:
            out["L"] = D * np.sqrt(np.repeat(masses, 3))[:, None]
    return out


# --------------------------------------------------------------------------
# Writing inputs
# --------------------------------------------------------------------------


def fmt(x):
    return repr(float(x))            # shortest round-trip form: exact


def write_xyz(path, symbols, x, comment="invented test geometry", forces=None):
    x = np.asarray(x, dtype=float).reshape(-1, 3)
    lines = [str(len(symbols))]
    if forces is not None:
        forces = np.asarray(forces, dtype=float).reshape(-1, 3)
        lines.append('Properties=species:S:1:pos:R:3:forces:R:3 comment="%s"' % comment)
        for s, r, f in zip(symbols, x, forces):
            lines.append(" ".join([s] + [fmt(v) for v in r] + [fmt(v) for v in f]))
    else:
        lines.append(comment)
        for s, r in zip(symbols, x):
            lines.append(" ".join([s] + [fmt(v) for v in r]))
    with open(path, "w") as f:
        f.write("\n".join(lines) + "\n")
    return path


def hessian_text(H, layout="full", per_line=None, sep=" ", comment=None):
    """Text Hessian: full rows, or the lower (row i: columns 0..i) or upper
    (row i: columns i..n-1) triangle; @per_line wraps the number stream."""
    n = H.shape[0]
    rows = []
    for i in range(n):
        if layout == "full":
            rows.append(H[i, :])
        elif layout == "lower":
            rows.append(H[i, :i + 1])
        elif layout == "upper":
            rows.append(H[i, i:])
        else:
            raise ValueError(layout)
    out = []
    if comment:
        out.append("# " + comment)
    if per_line is None:
        out += [sep.join(fmt(v) for v in r) for r in rows]
    else:
        stream = [fmt(v) for r in rows for v in r]
        out += [sep.join(stream[k:k + per_line]) for k in range(0, len(stream), per_line)]
    return "\n".join(out) + "\n"


def write_hessian(path, H, **kw):
    with open(path, "w") as f:
        f.write(hessian_text(H, **kw))
    return path


def write_npy(path, H, order="C", endian="<"):
    a = np.array(H, dtype=endian + "f8", order=order)
    np.save(path, a)
    return path


def write_inputs(tmp, symbols, x, H, name="mol", units="eV/A^2", forces=None):
    """xyz + full text Hessian (H given in eV/A^2, written in @units)."""
    xyz = write_xyz(os.path.join(tmp, name + ".xyz"), symbols, x, forces=forces)
    hes = write_hessian(os.path.join(tmp, name + ".hess"), H / UNIT_TO_EV_A2[units])
    return xyz, hes


# --------------------------------------------------------------------------
# Independent side: rigid-body basis, projection, eigenpairs
# --------------------------------------------------------------------------


def rigid_basis(x, masses, project="full", rank_tol=1e-7):
    """Mass-weighted rigid-body basis V (3N x r), orthonormal columns:
    3 translations, then (project == "full") the rotations about the centre
    of mass (Eckart, Phys. Rev. 47, 552, 1935), orthonormalised with
    numpy/scipy QR (column pivoting), dropping directions whose R diagonal is
    below @rank_tol times the largest (linear molecules: 2 rotations).
    Returns (V, n_translations, n_rotations)."""
    x = np.asarray(x, dtype=float).reshape(-1, 3)
    m = np.asarray(masses, dtype=float)
    n_at = len(m)
    sm = np.sqrt(m)
    if project == "none":
        return np.zeros((3 * n_at, 0)), 0, 0
    T = np.zeros((3 * n_at, 3))
    for k in range(3):
        T[k::3, k] = sm
    QT, _ = np.linalg.qr(T)
    if project == "translations" or n_at == 1:
        return QT, 3, 0
    com = (m[:, None] * x).sum(axis=0) / m.sum()
    r = x - com
    R = np.zeros((3 * n_at, 3))
    for k in range(3):
        e = np.zeros(3)
        e[k] = 1.0
        R[:, k] = (np.cross(e, r) * sm[:, None]).ravel()
    R -= QT @ (QT.T @ R)
    Q, Rr, _ = scipy.linalg.qr(R, mode="economic", pivoting=True)
    d = np.abs(np.diag(Rr))
    keep = d > rank_tol * d[0]
    V = np.hstack([QT, Q[:, keep]])
    return V, 3, int(keep.sum())


def mass_weight(H, masses):
    w = 1.0 / np.sqrt(np.repeat(np.asarray(masses, dtype=float), 3))
    K = H * w[:, None] * w[None, :]
    return 0.5 * (K + K.T)


def projected(K, V):
    """PKP with P = I - V V^T (dense; fine at test sizes)."""
    P = np.eye(K.shape[0]) - V @ V.T
    return P @ K @ P


def vib_solve(K, V):
    """Vibrational eigenpairs of K on the orthogonal complement of V:
    eigh(U^T K U), U an orthonormal complement from numpy's complete QR.
    These are the eigenpairs of PKP on the vibrational subspace, without
    having to guess which near-zero eigenvalues of PKP are rigid-body ones."""
    n = K.shape[0]
    r = V.shape[1]
    if r:
        Qc, _ = np.linalg.qr(V, mode="complete")
        U = Qc[:, r:]
    else:
        U = np.eye(n)
    w, y = np.linalg.eigh(U.T @ K @ U)
    return w, U @ y


def to_wavenumber(lam):
    lam = np.asarray(lam, dtype=float)
    return np.sign(lam) * np.sqrt(np.abs(lam)) * CM1


def residuals(K, V, nt):
    """Eigenvalues of the translation and rotation blocks of V^T K V, as
    signed wavenumbers, each sorted ascending."""
    B = V.T @ K @ V
    t = np.linalg.eigvalsh(B[:nt, :nt]) if nt else np.zeros(0)
    r = np.linalg.eigvalsh(B[nt:, nt:]) if B.shape[0] > nt else np.zeros(0)
    return to_wavenumber(t), to_wavenumber(r)


def reference_modes(x, masses, H, project="full"):
    V, nt, nr = rigid_basis(x, masses, project)
    K = mass_weight(H, masses)
    w, L = vib_solve(K, V)
    return {"V": V, "nt": nt, "nr": nr, "K": K, "lam": w, "L": L,
            "nu": to_wavenumber(w)}


def lapack_ratios(A, Z, lam):
    """LAPACK Working Note 41 acceptance ratios for a (partial) symmetric
    eigendecomposition: ||A Z - Z Lambda||_1 / (n ||A||_1 eps) and
    ||Z^T Z - I||_1 / (n eps)."""
    n = A.shape[0]
    eps = np.finfo(float).eps
    res = np.linalg.norm(A @ Z - Z * np.asarray(lam)[None, :], 1) / (n * np.linalg.norm(A, 1) * eps)
    orth = np.linalg.norm(Z.T @ Z - np.eye(Z.shape[1]), 1) / (n * eps)
    return res, orth


def canonical_sign(v, tie=1e-7):
    """Largest-magnitude component positive, ties (within @tie relative) to
    the lowest index (DESIGN.md §2, canonical output)."""
    a = np.abs(v)
    pick = int(np.flatnonzero(a >= a.max() * (1.0 - tie))[0])
    return -v if v[pick] < 0 else v


def groups(values, tol):
    """Runs of sorted values whose neighbours differ by at most @tol."""
    out = []
    start = 0
    for k in range(1, len(values) + 1):
        if k == len(values) or values[k] - values[k - 1] > tol:
            out.append(list(range(start, k)))
            start = k
    return out


def subspace_distance(A, B):
    """Sine of the largest principal angle between span(A) and span(B)
    (both with orthonormal columns)."""
    # ||(I - A A^T) B||_2, not sqrt(1 - cos^2), which loses half the digits
    return float(np.linalg.norm(B - A @ (A.T @ B), 2))


# --------------------------------------------------------------------------
# Internal coordinates and Wilson s-vectors (Wilson, Decius & Cross,
# Molecular Vibrations, 1955, ch. 4) — used by the GF test and to build
# Hessians of invented molecules: H = B^T F B is the exact Cartesian Hessian
# of V = 1/2 dq^T F dq at its minimum (no gradient term).
# --------------------------------------------------------------------------


def q_stretch(x, i, j):
    return np.linalg.norm(x[j] - x[i])


def q_bend(x, i, j, k):
    a = x[i] - x[j]
    b = x[k] - x[j]
    return np.arccos(np.dot(a, b) / (np.linalg.norm(a) * np.linalg.norm(b)))


def q_torsion(x, i, j, k, l):
    b1 = x[j] - x[i]
    b2 = x[k] - x[j]
    b3 = x[l] - x[k]
    n1 = np.cross(b1, b2)
    n2 = np.cross(b2, b3)
    return np.arctan2(np.linalg.norm(b2) * np.dot(b1, n2), np.dot(n1, n2))


def s_stretch(x, i, j):
    e = (x[j] - x[i]) / np.linalg.norm(x[j] - x[i])
    return {i: -e, j: e}


def s_bend(x, i, j, k):
    # WDC §4-1: s_1 = (cos(phi) e_31 - e_32)/(r_31 sin(phi)), apex atom 3 = j here
    r1 = np.linalg.norm(x[i] - x[j])
    r2 = np.linalg.norm(x[k] - x[j])
    e1 = (x[i] - x[j]) / r1
    e2 = (x[k] - x[j]) / r2
    c = np.dot(e1, e2)
    s = np.sqrt(1.0 - c * c)
    si = (c * e1 - e2) / (r1 * s)
    sk = (c * e2 - e1) / (r2 * s)
    return {i: si, k: sk, j: -si - sk}


def s_torsion(x, i, j, k, l):
    # gradient of q_torsion (same sign convention); checked numerically below
    b1 = x[j] - x[i]
    b2 = x[k] - x[j]
    b3 = x[l] - x[k]
    n1 = np.cross(b1, b2)
    n2 = np.cross(b2, b3)
    lb2 = np.linalg.norm(b2)
    gi = -lb2 / np.dot(n1, n1) * n1
    gl = lb2 / np.dot(n2, n2) * n2
    f1 = np.dot(b1, b2) / lb2 ** 2
    f3 = np.dot(b3, b2) / lb2 ** 2
    # Bekker's form: with r_ij = x_i - x_j, d(phi)/dx_j =
    # (r_ij.r_kj/|r_kj|^2 - 1) g_i - (r_kl.r_kj/|r_kj|^2) g_l, and j<->k, i<->l
    gj = (-f1 - 1.0) * gi + f3 * gl
    gk = (-f3 - 1.0) * gl + f1 * gi
    return {i: gi, j: gj, k: gk, l: gl}


Q_FUNCS = {"stretch": q_stretch, "bend": q_bend, "torsion": q_torsion}
S_FUNCS = {"stretch": s_stretch, "bend": s_bend, "torsion": s_torsion}


def b_matrix(x, coords):
    """coords: list of (kind, atoms...).  B (n_internal x 3N), analytic."""
    x = np.asarray(x, dtype=float).reshape(-1, 3)
    B = np.zeros((len(coords), x.size))
    for row, (kind, *atoms) in enumerate(coords):
        for a, v in S_FUNCS[kind](x, *atoms).items():
            B[row, 3 * a:3 * a + 3] += v
    return B


def b_matrix_numeric(x, coords, h=1e-4):
    """B by 4-point central differences (error O(h^4)) of the internal
    coordinates themselves, as a check on the analytic s-vectors."""
    x = np.asarray(x, dtype=float).reshape(-1, 3)
    B = np.zeros((len(coords), x.size))
    for c in range(x.size):
        def q_at(d):
            y = x.copy().ravel()
            y[c] += d
            y = y.reshape(-1, 3)
            return np.array([Q_FUNCS[kind](y, *atoms) for kind, *atoms in coords])
        B[:, c] = (8 * (q_at(h) - q_at(-h)) - (q_at(2 * h) - q_at(-2 * h))) / (12 * h)
    return B


# --------------------------------------------------------------------------
# Invented molecules
# --------------------------------------------------------------------------


def water_like():
    """Bent symmetric triatomic (invented numbers): O-H 0.96 A, angle 104.5
    deg, tilted out of the coordinate planes so no coordinate is special.
    F in eV/A^2 (stretches), eV/rad^2 (bend), eV/(A rad) (coupling)."""
    theta = np.deg2rad(104.5)
    r = 0.96
    x = np.array([[0.0, 0.0, 0.0],
                  [r * np.sin(theta / 2), 0.0, r * np.cos(theta / 2)],
                  [-r * np.sin(theta / 2), 0.0, r * np.cos(theta / 2)]])
    rot = rotation_matrix([0.3, -0.5, 0.8], 0.7)
    x = x @ rot.T + np.array([0.1, -0.2, 0.3])
    coords = [("stretch", 0, 1), ("stretch", 0, 2), ("bend", 1, 0, 2)]
    F = np.array([[48.0, -0.6, 1.1],
                  [-0.6, 48.0, 1.1],
                  [1.1, 1.1, 4.4]])
    return ["O", "H", "H"], x, coords, F


def rotation_matrix(axis, angle):
    a = np.asarray(axis, dtype=float)
    a = a / np.linalg.norm(a)
    K = np.array([[0, -a[2], a[1]], [a[2], 0, -a[0]], [-a[1], a[0], 0]])
    return np.eye(3) + np.sin(angle) * K + (1 - np.cos(angle)) * K @ K


def spring_hessian(x, pairs, k):
    """Central springs V = sum 1/2 k_ab (|r_ab| - |r_ab|_0)^2 at their rest
    lengths: H blocks k u u^T.  Exactly invariant under translations and
    (to first order) rotations (common practice)."""
    x = np.asarray(x, dtype=float).reshape(-1, 3)
    n = x.size
    H = np.zeros((n, n))
    for (a, b), kk in zip(pairs, k):
        u = x[b] - x[a]
        u /= np.linalg.norm(u)
        blk = kk * np.outer(u, u)
        ia, ib = slice(3 * a, 3 * a + 3), slice(3 * b, 3 * b + 3)
        H[ia, ia] += blk
        H[ib, ib] += blk
        H[ia, ib] -= blk
        H[ib, ia] -= blk
    return H


def random_network(n_atoms, seed, neighbours=7, elements=("C", "N", "O", "H")):
    """Random non-symmetric molecule-like point set with springs to the
    nearest @neighbours of every atom; random spring constants 5..40 eV/A^2."""
    rng = np.random.default_rng(seed)
    x = rng.uniform(-1.0, 1.0, size=(n_atoms, 3)) * (n_atoms ** (1 / 3)) * 0.9
    d = np.linalg.norm(x[:, None, :] - x[None, :, :], axis=2)
    pairs = set()
    for a in range(n_atoms):
        for b in np.argsort(d[a])[1:neighbours + 1]:
            pairs.add((min(a, int(b)), max(a, int(b))))
    pairs = sorted(pairs)
    k = rng.uniform(5.0, 40.0, size=len(pairs))
    symbols = [elements[i] for i in rng.integers(0, len(elements), size=n_atoms)]
    return symbols, x, pairs, k


def tmpdir():
    return tempfile.TemporaryDirectory(prefix="qv-cross-")


# --------------------------------------------------------------------------
# Lennard-Jones clusters: V = sum_{i<j} 4 eps [(sigma/r)^12 - (sigma/r)^6]
# (energy, analytic gradient and Hessian of the pair potential)
# --------------------------------------------------------------------------

# An argon-like set of invented parameters (eV, A); the element is argon.
LJ_EPS = 0.0104
LJ_SIGMA = 3.40


def _pairs(x):
    x = np.asarray(x, dtype=float).reshape(-1, 3)
    i, j = np.triu_indices(len(x), 1)
    d = x[j] - x[i]
    r = np.linalg.norm(d, axis=1)
    return x, i, j, d, r


def lj_energy(x, eps=1.0, sigma=1.0):
    _, _, _, _, r = _pairs(x)
    s6 = (sigma / r) ** 6
    return float(np.sum(4 * eps * (s6 * s6 - s6)))


def lj_gradient(x, eps=1.0, sigma=1.0):
    x, i, j, d, r = _pairs(x)
    s6 = (sigma / r) ** 6
    dphi = 4 * eps * (-12 * s6 * s6 + 6 * s6) / r          # phi'(r)
    f = (dphi / r)[:, None] * d                             # d phi / d x_j
    g = np.zeros_like(x)
    np.add.at(g, j, f)
    np.add.at(g, i, -f)
    return g.ravel()


def lj_hessian(x, eps=1.0, sigma=1.0):
    """Pair block: phi'' u u^T + (phi'/r)(I - u u^T) on (j,j) and (i,i),
    minus it on (i,j) and (j,i)."""
    x, i, j, d, r = _pairs(x)
    n = len(x)
    s6 = (sigma / r) ** 6
    d1 = 4 * eps * (-12 * s6 * s6 + 6 * s6) / r
    d2 = 4 * eps * (156 * s6 * s6 - 42 * s6) / r ** 2
    u = d / r[:, None]
    uu = u[:, :, None] * u[:, None, :]
    blocks = d2[:, None, None] * uu + (d1 / r)[:, None, None] * (np.eye(3)[None] - uu)
    H = np.zeros((n, 3, n, 3))
    for p in range(len(r)):
        a, b = i[p], j[p]
        H[a, :, a, :] += blocks[p]
        H[b, :, b, :] += blocks[p]
        H[a, :, b, :] -= blocks[p]
        H[b, :, a, :] -= blocks[p]
    return H.reshape(3 * n, 3 * n)


def icosahedral_cluster(shells, spacing=1.1):
    """Mackay icosahedron with @shells shells: 13 (1) or 55 (2) points."""
    phi = (1 + np.sqrt(5)) / 2
    v = []
    for a in (-1, 1):
        for b in (-phi, phi):
            v += [(0, a, b), (a, b, 0), (b, 0, a)]
    v = np.array(v, dtype=float)
    v /= np.linalg.norm(v[0])
    d = np.linalg.norm(v[:, None] - v[None], axis=2)
    emin = d[d > 0].min()
    edges = [(a, b) for a in range(12) for b in range(a + 1, 12) if abs(d[a, b] - emin) < 1e-9]
    assert len(edges) == 30
    pts = [np.zeros(3)]
    pts += list(v)
    if shells >= 2:
        pts += list(2 * v)
        pts += [v[a] + v[b] for a, b in edges]
    if shells >= 3:
        raise ValueError("only 13 and 55")
    return np.array(pts) * spacing


def lj_minimise(x0, gtol=1e-12):
    """Minimise the LJ energy in reduced units (eps = sigma = 1): BFGS with
    the analytic gradient, then Newton steps with the analytic Hessian on the
    complement of its six near-zero (rigid-body) eigenvalues until the
    gradient norm is below @gtol.  Returns (x, E, |g|)."""
    import scipy.optimize
    res = scipy.optimize.minimize(lj_energy, np.ravel(x0), jac=lj_gradient, method="BFGS",
                                  options={"gtol": 1e-8, "maxiter": 20000})
    x = res.x.copy()
    for _ in range(20):
        g = lj_gradient(x)
        if np.linalg.norm(g) < gtol:
            break
        w, U = np.linalg.eigh(lj_hessian(x))
        keep = np.abs(w) > 1e-6 * np.abs(w).max()
        x = x - U[:, keep] @ ((U[:, keep].T @ g) / w[keep])
    return x.reshape(-1, 3), lj_energy(x), float(np.linalg.norm(lj_gradient(x)))


def lj55_argon():
    """LJ55 Mackay icosahedron of argon-like atoms (eV, A), minimised; the
    gradient norm in eV/A is checked by the callers."""
    x, e, _ = lj_minimise(icosahedral_cluster(2))
    x = x - x.mean(axis=0)
    x = x * LJ_SIGMA
    return ["Ar"] * len(x), x, e


def direction(alpha_deg, beta_deg):
    """Unit vector at polar angle alpha and azimuth beta (degrees)."""
    a, b = np.deg2rad(alpha_deg), np.deg2rad(beta_deg)
    return np.array([np.sin(a) * np.cos(b), np.sin(a) * np.sin(b), np.cos(a)])


def hydrazine_like():
    """N2H4-like (invented geometry and force field), 6 atoms: 5 stretches,
    6 bends and 1 torsion for 12 vibrations. Returns symbols, x, coords, F."""
    n1 = np.zeros(3)
    n2 = np.array([0.0, 0.0, 1.45])
    x = np.array([n1, n2,
                  n1 + 1.02 * direction(109.0, 0.0),
                  n1 + 1.015 * direction(108.0, 112.0),
                  n2 + 1.02 * direction(73.0, 95.0),
                  n2 + 1.025 * direction(70.0, 205.0)])
    x = x @ rotation_matrix([1.0, 2.0, -0.5], 1.1).T
    coords = [("stretch", 0, 1), ("stretch", 0, 2), ("stretch", 0, 3),
              ("stretch", 1, 4), ("stretch", 1, 5),
              ("bend", 2, 0, 1), ("bend", 3, 0, 1), ("bend", 2, 0, 3),
              ("bend", 4, 1, 0), ("bend", 5, 1, 0), ("bend", 4, 1, 5),
              ("torsion", 2, 0, 1, 4)]
    F = np.diag([26.0, 40.0, 39.0, 40.5, 41.0, 3.6, 3.4, 3.0, 3.5, 3.7, 2.9, 0.25])
    for i, j, v in [(0, 1, 0.8), (0, 3, 0.7), (1, 2, 0.3), (3, 4, 0.35),
                    (5, 6, 0.2), (8, 9, 0.25), (1, 5, 0.4), (4, 8, -0.3), (11, 5, 0.05)]:
        F[i, j] = F[j, i] = v
    return ["N", "N", "H", "H", "H", "H"], x, coords, F


def methylamine_like():
    """CH3NH2-like (invented geometry and force field), 7 atoms, with the
    redundant set of all six bends at the tetrahedral carbon: 6 stretches,
    6 + 3 bends, 1 torsion = 16 coordinates for 15 vibrations. Returns
    symbols, x, coords, F (its couplings from a seeded generator)."""
    c = np.zeros(3)
    nn = np.array([0.0, 0.0, 1.47])
    x = np.array([c, nn,
                  c + 1.09 * direction(110.0, 0.0),
                  c + 1.095 * direction(109.0, 121.0),
                  c + 1.092 * direction(111.0, 238.0),
                  nn + 1.015 * direction(68.0, 60.0),
                  nn + 1.017 * direction(70.0, 175.0)])
    x = x @ rotation_matrix([-0.3, 0.2, 1.0], 0.4).T + np.array([1.0, 0.5, -0.7])
    coords = [("stretch", 0, 1), ("stretch", 0, 2), ("stretch", 0, 3), ("stretch", 0, 4),
              ("stretch", 1, 5), ("stretch", 1, 6),
              ("bend", 1, 0, 2), ("bend", 1, 0, 3), ("bend", 1, 0, 4),
              ("bend", 2, 0, 3), ("bend", 2, 0, 4), ("bend", 3, 0, 4),
              ("bend", 5, 1, 0), ("bend", 6, 1, 0), ("bend", 5, 1, 6),
              ("torsion", 2, 0, 1, 5)]
    rng = np.random.default_rng(7)
    F = np.diag([28.0, 31.0, 30.5, 31.5, 40.0, 40.5,
                 4.0, 4.1, 3.9, 3.3, 3.4, 3.2, 3.6, 3.5, 3.0, 0.2])
    C = rng.uniform(-0.15, 0.15, size=F.shape)
    F += 0.5 * (C + C.T) * (np.abs(np.subtract.outer(np.arange(16), np.arange(16))) < 4)
    return ["C", "N", "H", "H", "H", "H", "H"], x, coords, F
