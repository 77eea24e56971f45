#!/usr/bin/python3
"""A 55-atom Lennard-Jones cluster (Mackay icosahedron; argon atoms with
invented argon-like eps = 0.0104 eV, sigma = 3.40 A), minimised here with
scipy.optimize and Newton steps, analytic Hessian of the pair potential.

quaver modes --vectors is compared with numpy.linalg.eigh of the projected
mass-weighted matrix built here: rigid-body basis from numpy/scipy QR,
P = I - V V^T, eigenpairs of PKP on the complement of V.

- Minimiser: LJ13 E = -44.326801 eps and LJ55 E = -279.248470 eps (Wales &
  Doye, J. Phys. Chem. A 101, 5111, 1997) (from memory), to 1e-5 eps.
- Wavenumbers: |diff| <= 1e-6 cm^-1 + 1e-9 relative.  Both sides solve the
  same 165 x 165 matrix to backward error ~ n eps |K|; the 40Ar masses of
  periodictable and AME2016 differ by < 1e-9 u (2e-11 relative).
- Residuals |r| < 1e-2 cm^-1 (gradient < 1e-9 eV/A here).
- Vectors: modes whose eigenvalue is separated from both neighbours by more
  than 1e-5 of the largest one are compared one by one, |overlap| >
  1 - 1e-8 (eigenvector error ~ eps|K|/gap ~ 1e-11); closer groups
  (icosahedral degeneracies) are compared as subspaces (sine of the largest
  principal angle < 1e-9; error bound ~ eps|K|/gap ~ 2e-11), since any basis of a degenerate subspace is right.
- LAPACK Working Note 41 acceptance ratios of quaver's vectors and
  eigenvalues against PKP: both < 30 (on runs where every mass is passed
  with --mass, so that l = d sqrt(m) uses quaver's own masses).  quaver solves PKP + sigma V V^T; on
  the vibrational subspace this equals PKP.
"""
import numpy as np

import sys
sys.dont_write_bytecode = True      # keep the source tree clean
import qvtest as q  # noqa: E402

chk = q.Checker("lj-cluster")

# --- the minimiser, against published minima (from memory) ----------------
x13, e13, g13 = q.lj_minimise(q.icosahedral_cluster(1))
chk.ok(abs(e13 - (-44.326801)) < 1e-5,
       "LJ13 minimum %.7f eps, expected -44.326801 (Wales & Doye 1997, from memory)" % e13)
x55, e55, g55 = q.lj_minimise(q.icosahedral_cluster(2))
chk.ok(abs(e55 - (-279.248470)) < 1e-5,
       "LJ55 minimum %.7f eps, expected -279.248470 (Wales & Doye 1997, from memory)" % e55)

eps, sigma = q.LJ_EPS, q.LJ_SIGMA
symbols, x, _ = q.lj55_argon()
n_at = len(symbols)
grad = q.lj_gradient(x, eps, sigma)
chk.ok(np.linalg.norm(grad) < 1e-9, "LJ55 gradient norm %.3g eV/A < 1e-9" % np.linalg.norm(grad))
H = q.lj_hessian(x, eps, sigma)

# invented isotope masses for a few atoms (atoms count from 1), so that the
# mass weighting really matters and the icosahedral degeneracies split
overrides = {1: 60.0, 3: 36.0, 17: 38.5, 40: 45.0, 55: 20.0, 23: 39.0}


def compare(label, doc, masses, vectors=True, lapack=True):
    ref = q.reference_modes(x, masses, H)
    lam, L, K, V = ref["lam"], ref["L"], ref["K"], ref["V"]
    nvib = 3 * n_at - 6
    got = q.mode_arrays(doc, masses)
    chk.ok(doc["n_vibrations"] == nvib and len(doc["modes"]) == nvib,
           "%s: %s vibrations and %d modes, expected %d"
           % (label, doc["n_vibrations"], len(doc["modes"]), nvib))
    if len(doc["modes"]) != nvib:
        return
    chk.close(got["wavenumber"], ref["nu"], "%s: wavenumbers vs numpy eigh of PKP" % label,
              rtol=1e-9, atol=1e-6)
    chk.close(got["eigenvalue"], lam, "%s: eigenvalues vs numpy" % label,
              rtol=1e-9, atol=1e-12 * np.abs(lam).max())
    res = np.array(doc["rigid_body_residuals"], dtype=float)
    t_ref, r_ref = q.residuals(K, V, ref["nt"])
    chk.ok(res.size == 6 and np.abs(res).max() < 1e-2,
           "%s: rigid-body residuals %s cm^-1, expected 6 with |r| < 1e-2" % (label, res))
    print("%s: residuals (cm^-1) quaver %s; numpy translations %s rotations %s"
          % (label, np.array2string(res, precision=6), np.array2string(t_ref, precision=6),
             np.array2string(r_ref, precision=6)))
    if not vectors:
        return
    Lq = got["L"]
    # canonical sign (DESIGN.md §2): the largest-magnitude component is positive
    bad_sign = [k + 1 for k in range(nvib)
                if not np.allclose(q.canonical_sign(Lq[:, k]), Lq[:, k], rtol=0, atol=0)]
    chk.ok(not bad_sign, "%s: modes %s do not have their largest component positive"
           % (label, bad_sign[:10]))
    gtol = 1e-5 * np.abs(lam).max()
    worst_single, worst_sub, n_single, n_group = 1.0, 0.0, 0, 0
    for g in q.groups(lam, gtol):
        if len(g) == 1:
            k = g[0]
            ov = abs(float(Lq[:, k] @ L[:, k])) / np.linalg.norm(Lq[:, k])
            worst_single = min(worst_single, ov)
            n_single += 1
            chk.ok(ov > 1 - 1e-8, "%s: mode %d (%.4f cm^-1): |overlap| with numpy %.12f"
                   % (label, k + 1, ref["nu"][k], ov))
        else:
            Qq, _ = np.linalg.qr(Lq[:, g])
            dist = q.subspace_distance(Qq, L[:, g])
            worst_sub = max(worst_sub, dist)
            n_group += 1
            chk.ok(dist < 1e-9, "%s: degenerate modes %d-%d (%.4f cm^-1): subspace angle sine %.3g"
                   % (label, g[0] + 1, g[-1] + 1, ref["nu"][g[0]], dist))
    if not lapack:
        print("%s: %d single modes (worst |overlap| 1-%.2g), %d degenerate groups (worst sine %.2g)"
              % (label, n_single, 1 - worst_single, n_group, worst_sub))
        return
    A = q.projected(K, V)
    r_res, r_orth = q.lapack_ratios(A, Lq, got["eigenvalue"])
    chk.ok(r_res < 30 and r_orth < 30,
           "%s: LAPACK ratios ||AZ-ZL||/(n|A|eps) = %.3g, ||Z'Z-I||/(n eps) = %.3g, expected < 30"
           % (label, r_res, r_orth))
    print("%s: %d single modes (worst |overlap| 1-%.2g), %d degenerate groups (worst sine %.2g); "
          "LAPACK ratios %.3g, %.3g" % (label, n_single, 1 - worst_single, n_group, worst_sub,
                                       r_res, r_orth))


with q.tmpdir() as tmp:
    xyz, hes = q.write_inputs(tmp, symbols, x, H, name="lj55")
    base = [xyz, "--hessian", hes, "--hessian-units", "eV/A^2", "--vectors"]

    # default masses: quaver's 40Ar (AME2016) and periodictable's differ by
    # ~1e-9 u, which is invisible in the wavenumbers at 1e-9 but shows in
    # d sqrt(m) at the 1e-11 level, i.e. far above the n eps scale of the
    # LAPACK ratios; so those are computed on runs where every mass is given
    # with --mass and both sides use the same numbers
    masses = q.masses_of(symbols)
    compare("LJ55 40Ar (default masses)", q.modes_json(base), masses, lapack=False)
    args = list(base)
    for atom in range(1, n_at + 1):
        args += ["--mass", "%d=%r" % (atom, masses[atom - 1])]
    compare("LJ55 40Ar (all masses given)", q.modes_json(args), masses)

    masses_mix = masses.copy()
    args = list(base)
    for atom in range(1, n_at + 1):
        masses_mix[atom - 1] = overrides.get(atom, masses[atom - 1])
        args += ["--mass", "%d=%r" % (atom, masses_mix[atom - 1])]
    compare("LJ55 mixed masses", q.modes_json(args), masses_mix)

    # --project translations / none on LJ13: 3N-3 and 3N modes; the
    # rotations (or all six rigid-body motions) stay in as near-zero modes,
    # so compare eigenvalues with an absolute tolerance there
    x13a = (x13 - x13.mean(axis=0)) * sigma
    H13 = q.lj_hessian(x13a, eps, sigma)
    s13 = ["Ar"] * 13
    xyz13, hes13 = q.write_inputs(tmp, s13, x13a, H13, name="lj13")
    m13 = q.masses_of(s13)
    for project, nr in (("translations", 3), ("none", 0)):
        doc = q.modes_json([xyz13, "--hessian", hes13, "--hessian-units", "eV/A^2",
                            "--project", project])
        V, nt, _ = q.rigid_basis(x13a, m13, project)
        w, _ = q.vib_solve(q.mass_weight(H13, m13), V)
        lam_q = np.array([m["eigenvalue"] for m in doc["modes"]])
        chk.ok(doc["projection"] == project and len(lam_q) == 39 - nr,
               "LJ13 --project %s: projection %r, %d modes, expected %d"
               % (project, doc["projection"], len(lam_q), 39 - nr))
        if len(lam_q) == len(w):
            chk.close(lam_q, w, "LJ13 --project %s: eigenvalues vs numpy" % project,
                      rtol=1e-9, atol=1e-12 * np.abs(w).max())

chk.finish("LJ13/LJ55 minima vs Wales & Doye; LJ55 quaver vs numpy for 40Ar and a mixed "
           "mass set: wavenumbers, residuals, vectors (single and degenerate), LAPACK ratios; "
           "LJ13 with --project translations/none")
