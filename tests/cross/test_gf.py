#!/usr/bin/python3
"""Wilson GF method (Wilson, Decius & Cross, Molecular Vibrations, 1955,
ch. 4) as an independent route to the vibrational wavenumbers.

For invented molecules with invented internal force constants F: build the
Wilson B matrix at the reference geometry from analytic s-vectors (checked
against numerical differentiation of the coordinates themselves),
G = B M^-1 B^T, and the eigenvalues of GF give the wavenumbers.  The
Cartesian Hessian of the same quadratic potential is H = B^T F B, exact at
its minimum because there is no gradient term; quaver gets only H and the
geometry.

Tolerances: wavenumbers relative 1e-7.  The masses here are
python3-periodictable's, Quaver's are NIST AME2016; for 1H, 2H, 12C, 14N, 16O
they differ by < 3e-9 u, which moves a wavenumber by < 2e-9 relative.  The
rest is rounding (~1e-14).  Rigid-body residuals: |r| < 1e-3 cm^-1; H has
exact translational and rotational invariance to rounding, which gives
residuals of order sqrt(1e-16 |K|) * 521 ~ 1e-5 cm^-1.
"""
import os
import numpy as np
import scipy.linalg

import sys
sys.dont_write_bytecode = True      # keep the source tree clean
import qvtest as q  # noqa: E402

chk = q.Checker("gf-method")


def gf_eigenvalues(B, F, masses):
    """Eigenvalues of GF, G = B M^-1 B^T.  If the internal coordinates are
    redundant (rank B < rows), G is singular and GF has exact zero
    eigenvalues from the redundancy: work in the range of G instead
    (G = U g U^T, keep g > 0): eigenvalues of g^1/2 U^T F U g^1/2."""
    minv = 1.0 / np.repeat(masses, 3)
    G = (B * minv[None, :]) @ B.T
    g, U = np.linalg.eigh(G)
    keep = g > 1e-10 * g.max()
    if keep.all():
        # the textbook route: the non-symmetric product GF
        lam = scipy.linalg.eigvals(G @ F)
        chk.ok(np.abs(lam.imag).max() <= 1e-10 * np.abs(lam.real).max(),
               "GF eigenvalues are real (independent side)")
        return np.sort(lam.real), 0
    Ur = U[:, keep] * np.sqrt(g[keep])[None, :]
    return np.sort(np.linalg.eigvalsh(Ur.T @ F @ Ur)), int((~keep).sum())


def check_molecule(name, symbols, x, coords, F, extra_args=(), masses=None, n_redundant=0):
    x = np.asarray(x, dtype=float)
    n_at = len(symbols)
    if masses is None:
        masses = q.masses_of(symbols)
    B = q.b_matrix(x, coords)
    # independent side's own checks
    Bn = q.b_matrix_numeric(x, coords)
    chk.ok(np.abs(B - Bn).max() < 1e-8,
           "%s: analytic s-vectors vs numerical B differ by %.3g" % (name, np.abs(B - Bn).max()))
    chk.ok(np.linalg.eigvalsh(F).min() > 0, "%s: invented F positive definite" % name)
    rank = np.linalg.matrix_rank(B, tol=1e-8 * np.abs(B).max())
    chk.ok(rank == 3 * n_at - 6, "%s: internal coordinates span 3N-6 = %d (rank %d)"
           % (name, 3 * n_at - 6, rank))
    lam_gf, dropped = gf_eigenvalues(B, F, masses)
    chk.ok(dropped == n_redundant, "%s: %d redundancy zero(s) dropped, expected %d"
           % (name, dropped, n_redundant))
    nu_gf = q.to_wavenumber(lam_gf)

    H = B.T @ F @ B
    with q.tmpdir() as tmp:
        xyz, hes = q.write_inputs(tmp, symbols, x, H, name=name)
        doc = q.modes_json([xyz, "--hessian", hes, "--hessian-units", "eV/A^2"] + list(extra_args))
    got = q.mode_arrays(doc)
    chk.ok(doc["n_vibrations"] == 3 * n_at - 6 and len(doc["modes"]) == 3 * n_at - 6,
           "%s: n_vibrations %s, %d modes; expected 3N-6 = %d"
           % (name, doc["n_vibrations"], len(doc["modes"]), 3 * n_at - 6))
    chk.ok(doc["linear"] is False, "%s: linear is false" % name)
    if len(got["wavenumber"]) == len(nu_gf):
        # Wilson, Decius & Cross (1955): |GF - lambda E| = 0
        chk.close(np.sort(got["wavenumber"]), nu_gf, "%s: wavenumbers vs GF method" % name, rtol=1e-7)
        chk.close(np.sort(got["eigenvalue"]), lam_gf, "%s: eigenvalues vs GF method" % name, rtol=1e-7)
    res = np.array(doc["rigid_body_residuals"], dtype=float)
    chk.ok(res.size == 6 and np.abs(res).max() < 1e-3,
           "%s: rigid-body residuals %s, expected 6 values with |r| < 1e-3 cm^-1" % (name, res))
    print("%s: GF %s cm^-1; residuals max %.2g cm^-1"
          % (name, np.array2string(nu_gf, precision=2), np.abs(res).max() if res.size else -1))


# (a) bent symmetric triatomic, water-like, with stretch-stretch and
# stretch-bend couplings (invented force constants)
symbols, x, coords, F = q.water_like()
check_molecule("water-like", symbols, x, coords, F)

# same molecule, both hydrogens given mass number 2 with --isotope: the GF
# side uses 2H from periodictable
m_d = q.masses_of(symbols)
m_d[1] = m_d[2] = q.isotope_mass("H", 2)
check_molecule("water-like-d2", symbols, x, coords, F,
               extra_args=["--isotope", "2=2", "--isotope", "3=2"], masses=m_d)

# (b) hydrazine-like N2H4, gauche, non-planar, no symmetry (invented
# geometry): 5 stretches, 6 bends, 1 torsion = 12 = 3N-6, non-redundant
symbols_h, xh, coords_h, Fh = q.hydrazine_like()
check_molecule("hydrazine-like", symbols_h, xh, coords_h, Fh)

# (c) methylamine-like CH3NH2 (invented geometry), 7 atoms, with the
# redundant set of all six bends at the tetrahedral carbon: 6 stretches,
# 6 + 3 bends, 1 torsion = 16 coordinates for 15 vibrations (one redundancy)
symbols_m, xm, coords_m, Fm = q.methylamine_like()
check_molecule("methylamine-like", symbols_m, xm, coords_m, Fm,
               n_redundant=1)

chk.finish("GF eigenvalues vs quaver for a bent triatomic (and its d2 isotopologue), "
           "a 6-atom non-planar molecule with a torsion, and a 7-atom one with a redundant "
           "coordinate set; mode counts 3N-6; rigid-body residuals < 1e-3 cm^-1")
