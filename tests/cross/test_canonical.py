#!/usr/bin/python3
"""Canonical eigenvectors (DESIGN.md §2): each vector's largest-magnitude
component positive, and degenerate sets rotated to a basis fixed by the
subspace itself, so output does not depend on atom order bookkeeping, BLAS
kernels or LAPACK's internal choices.

- A linear OCS-like triatomic (invented force constants: two stretch
  springs and a linear-bend term in both perpendicular planes) on a tilted
  axis: 3N-5 = 4 vibrations, "linear": true, a doubly degenerate bend.
  Its wavenumbers vs numpy eigh of PKP (relative 1e-7: periodictable's 32S
  differs from AME2016 by ~5e-7 u, i.e. ~8e-9 relative on a wavenumber).
  The degenerate bend pair is compared with the documented canonical rule
  (src/core/qv-canonical.h: Gram–Schmidt of the projections of unit
  coordinate vectors picked greedily by largest remaining norm) applied
  here to numpy's eigenvectors, elementwise 1e-8.
- A random non-degenerate 12-atom spring molecule.
For both: the same input with the atoms permuted gives, after un-permuting,
the same vectors elementwise to 1e-8 (mass-weighted) and the same
wavenumbers to 1e-10 relative; and the same command run under
`valgrind --error-exitcode=99` (valgrind's emulated CPU makes OpenBLAS pick
other kernels) gives the same numbers to the same tolerances.
"""
import os
import shutil
import subprocess
import numpy as np

import sys
sys.dont_write_bytecode = True      # keep the source tree clean
import qvtest as q  # noqa: E402

chk = q.Checker("canonical")


def canonical_subspace(Z):
    """The documented rule, implemented from its description: rho_i =
    |P e_i|^2; repeatedly pick the coordinate with the largest remaining
    rho (ties within 1e-7 relative to the lowest index), take P e_i minus
    its part along the vectors already built, normalise."""
    n, g = Z.shape
    rho = (Z ** 2).sum(axis=1)
    out = np.zeros_like(Z)
    for b in range(g):
        pick = int(np.flatnonzero(rho >= rho.max() * (1 - 1e-7))[0])
        u = Z @ Z[pick, :] - out[:, :b] @ out[pick, :b]
        u -= out[:, :b] @ (out[:, :b].T @ u)
        u /= np.linalg.norm(u)
        out[:, b] = u
        rho = rho - u ** 2
    return out


def linear_bend_hessian(x, i, j, k, kb):
    """Linear A-B-C bend: theta_e = sum over the two end atoms of
    e.(x_end - x_B)/r_end for each unit e perpendicular to the axis; it
    vanishes for translations and, to first order, for rotations (derive:
    x_a -> x_a + phi n x x_a moves the end atoms by +/- phi r along e)."""
    axis = x[k] - x[i]
    axis /= np.linalg.norm(axis)
    e1 = np.cross(axis, [0.3, 0.5, 0.8])
    e1 /= np.linalg.norm(e1)
    e2 = np.cross(axis, e1)
    ri, rk = np.linalg.norm(x[i] - x[j]), np.linalg.norm(x[k] - x[j])
    H = np.zeros((x.size, x.size))
    for e in (e1, e2):
        b = np.zeros(x.size)
        b[3 * i:3 * i + 3] = e / ri
        b[3 * k:3 * k + 3] = e / rk
        b[3 * j:3 * j + 3] = -e * (1 / ri + 1 / rk)
        H += kb * np.outer(b, b)
    return H


def permuted_inputs(tmp, name, symbols, x, H, perm):
    """New atom a is old atom perm[a]."""
    idx = np.concatenate([[3 * p, 3 * p + 1, 3 * p + 2] for p in perm])
    return q.write_inputs(tmp, [symbols[p] for p in perm], x[perm], H[np.ix_(idx, idx)],
                          name=name + "-perm")


def vectors(doc, masses):
    a = q.mode_arrays(doc, masses)
    return a["wavenumber"], a["L"]


def unpermute(L, perm):
    out = np.empty_like(L)
    for a, p in enumerate(perm):
        out[3 * p:3 * p + 3] = L[3 * a:3 * a + 3]
    return out


def sanitized_binary():
    """An AddressSanitizer build cannot run under valgrind (both replace the
    allocator); such a build is detected from its dynamic libraries."""
    try:
        out = subprocess.run(["ldd", q.QUAVER], capture_output=True, text=True).stdout
    except OSError:
        return False
    return "libasan" in out


def have_valgrind():
    return shutil.which("valgrind") is not None and not sanitized_binary()


def check(label, symbols, x, H, perm, tmp, linear=False):
    masses = q.masses_of(symbols)
    xyz, hes = q.write_inputs(tmp, symbols, x, H, name=label)
    args = [xyz, "--hessian", hes, "--hessian-units", "eV/A^2", "--vectors"]
    doc = q.modes_json(args)
    nu, L = vectors(doc, masses)
    for k in range(L.shape[1]):
        chk.ok(np.array_equal(q.canonical_sign(L[:, k]), L[:, k]),
               "%s: mode %d's largest component is not positive" % (label, k + 1))

    xyz_p, hes_p = permuted_inputs(tmp, label, symbols, x, H, perm)
    doc_p = q.modes_json([xyz_p, "--hessian", hes_p, "--hessian-units", "eV/A^2", "--vectors"])
    nu_p, L_p = vectors(doc_p, masses[perm])
    chk.close(nu_p, nu, "%s: wavenumbers with permuted atoms" % label, rtol=1e-10)
    if L_p.shape == L.shape:
        chk.close(unpermute(L_p, perm), L, "%s: vectors with permuted atoms (un-permuted)" % label,
                  atol=1e-8)

    if have_valgrind():
        env_prefix = ["valgrind", "--error-exitcode=99", "-q"]
        try:
            doc_v = q.modes_json(args, prefix=env_prefix)
            nu_v, L_v = vectors(doc_v, masses)
            chk.close(nu_v, nu, "%s: wavenumbers under valgrind" % label, rtol=1e-10)
            chk.close(L_v, L, "%s: vectors under valgrind" % label, atol=1e-8)
        except q.QuaverError as e:
            chk.ok(False, "%s: run under valgrind failed: %s" % (label, e))
    return doc, nu, L


if shutil.which("valgrind") is None:
    print("SKIP: valgrind is not installed; the run-under-valgrind comparison is skipped")
elif sanitized_binary():
    print("SKIP: %s is an AddressSanitizer build, which cannot run under valgrind; the "
          "run-under-valgrind comparison is skipped" % q.QUAVER)

with q.tmpdir() as tmp:
    # --- linear OCS-like ------------------------------------------------------
    axis = np.array([0.36, -0.48, 0.8])
    axis /= np.linalg.norm(axis)
    origin = np.array([0.2, 0.1, -0.3])
    xl = np.array([origin - 1.16 * axis, origin, origin + 1.56 * axis])
    symbols = ["O", "C", "S"]
    Hl = q.spring_hessian(xl, [(0, 1), (1, 2)], [95.0, 45.0]) + linear_bend_hessian(xl, 0, 1, 2, 3.8)
    masses = q.masses_of(symbols)
    ref = q.reference_modes(xl, masses, Hl)
    chk.ok(ref["nr"] == 2 and len(ref["lam"]) == 4,
           "independent side: the linear molecule has 2 rotations and 4 vibrations")
    doc, nu, L = check("linear", symbols, xl, Hl, [2, 0, 1], tmp, linear=True)
    chk.ok(doc["linear"] is True and doc["n_vibrations"] == 4 and len(doc["modes"]) == 4,
           "linear: linear=%r, n_vibrations=%r, %d modes (expected true, 4, 4)"
           % (doc["linear"], doc["n_vibrations"], len(doc["modes"])))
    chk.ok(len(doc["rigid_body"]["rotations"]) == 2 and len(doc["rigid_body_residuals"]) == 5,
           "linear: %d rotation residuals (expected 2), %d residuals (expected 5)"
           % (len(doc["rigid_body"]["rotations"]), len(doc["rigid_body_residuals"])))
    if len(nu) == 4:
        chk.close(nu, ref["nu"], "linear: wavenumbers vs numpy eigh of PKP", rtol=1e-7)
        # the degenerate bend: numpy's pair, made canonical by the rule above
        bend = [g for g in q.groups(ref["lam"], 1e-6 * ref["lam"].max()) if len(g) == 2]
        chk.ok(len(bend) == 1, "independent side: one degenerate pair (%s)" % bend)
        for g in bend:
            Zc = canonical_subspace(ref["L"][:, g])
            Zc = np.column_stack([q.canonical_sign(Zc[:, c]) for c in range(len(g))])
            chk.close(L[:, g], Zc, "linear: degenerate bend pair vs the canonical rule on numpy's "
                      "vectors", atol=1e-8)
        for k in range(4):
            if all(k not in g for g in bend):
                chk.close(L[:, k], q.canonical_sign(ref["L"][:, k]),
                          "linear: stretch mode %d vs numpy (canonical sign)" % (k + 1), atol=1e-8)

    # --- random non-degenerate molecule --------------------------------------
    symbols_r, xr, pairs, kr = q.random_network(12, 31)
    Hr = q.spring_hessian(xr, pairs, kr)
    ref_r = q.reference_modes(xr, q.masses_of(symbols_r), Hr)
    gaps = np.diff(ref_r["lam"]).min() / np.abs(ref_r["lam"]).max()
    chk.ok(gaps > 1e-5, "independent side: random molecule non-degenerate (min gap %.2g)" % gaps)
    perm = list(np.random.default_rng(3).permutation(12))
    doc_r, nu_r, L_r = check("random", symbols_r, xr, Hr, perm, tmp)
    if L_r.shape == ref_r["L"].shape:
        Lc = np.column_stack([q.canonical_sign(ref_r["L"][:, k]) for k in range(L_r.shape[1])])
        chk.close(L_r, Lc, "random: vectors vs numpy with the canonical sign", atol=1e-8)

chk.finish("canonical signs and degenerate bases: linear OCS-like (3N-5, degenerate bend vs "
           "the documented rule) and a random 12-atom molecule, under atom permutation%s"
           % (" and under valgrind" if have_valgrind() else " (valgrind SKIPPED)"))
