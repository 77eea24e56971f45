#!/usr/bin/python3
"""The LJ55 cluster of test_lj_cluster.py displaced off its minimum (random
displacements of 0.05 A rms per coordinate, fixed seed, then a random rigid rotation), with
the analytic Hessian and forces there.

At a non-stationary geometry the Hessian of a rotation-invariant potential
is no longer invariant under infinitesimal rotations (the gradient term), so
the rotation block of V^T K V is far from zero, while translational
invariance holds at any geometry (common practice; Eckart, Phys. Rev. 47,
552, 1935 for the separation).

Checks against numpy on the same matrix:
- rotation residuals: |r| > 1 cm^-1 and equal to the eigenvalues of the
  rotation block of V^T K V computed here (as signed wavenumbers), relative
  1e-6 (both sides compute the same 3 x 3 block to rounding);
- translation residuals |r| < 1e-3 cm^-1 (rounding level ~1e-5 cm^-1);
- gradient_norm from the forces column of the extended XYZ = ||F||, relative
  1e-9 (forces written with 17 significant digits);
- a "warnings" entry mentions rotation (also for a 100x stiffer variant
  whose rotation residuals are ~19 cm^-1);
- vibrational wavenumbers equal numpy's eigenvalues of PKP on the
  complement of V (abs 1e-6 cm^-1 + rel 1e-9): here the projection really
  changes the spectrum, so this tests the projection itself.
"""
import numpy as np
from scipy.spatial.transform import Rotation

import sys
sys.dont_write_bytecode = True      # keep the source tree clean
import qvtest as q  # noqa: E402

chk = q.Checker("off-minimum")

eps, sigma = q.LJ_EPS, q.LJ_SIGMA
symbols, x0, _ = q.lj55_argon()
rng = np.random.default_rng(20240607)
x = x0 + rng.normal(scale=0.05, size=x0.shape)       # 0.05 A rms per coordinate
x = x @ Rotation.random(random_state=11).as_matrix().T + np.array([0.7, -1.3, 2.1])
H = q.lj_hessian(x, eps, sigma)
forces = -q.lj_gradient(x, eps, sigma).reshape(-1, 3)
fnorm = float(np.linalg.norm(forces))
masses = q.masses_of(symbols)
ref = q.reference_modes(x, masses, H)
t_ref, r_ref = q.residuals(ref["K"], ref["V"], ref["nt"])
# the independent side must itself show the effect the test is about
chk.ok(np.abs(r_ref).min() > 1.0, "numpy rotation residuals %s all exceed 1 cm^-1" % r_ref)
chk.ok(np.abs(t_ref).max() < 1e-3, "numpy translation residuals %s below 1e-3 cm^-1" % t_ref)
chk.ok(fnorm > 1e-3, "the displaced cluster has a real force (|F| = %.3g eV/A)" % fnorm)

with q.tmpdir() as tmp:
    xyz = q.write_xyz(tmp + "/off.xyz", symbols, x, forces=forces)
    hes = q.write_hessian(tmp + "/off.hess", H)
    doc = q.modes_json([xyz, "--hessian", hes, "--hessian-units", "eV/A^2"])
    xyz_plain = q.write_xyz(tmp + "/plain.xyz", symbols, x)
    doc_plain = q.modes_json([xyz_plain, "--hessian", hes, "--hessian-units", "eV/A^2"])

rb = doc.get("rigid_body", {})
tr = np.sort(np.array(rb.get("translations", []), dtype=float))
ro = np.sort(np.array(rb.get("rotations", []), dtype=float))
chk.ok(tr.size == 3 and np.abs(tr).max() < 1e-3,
       "translation residuals %s, expected 3 with |r| < 1e-3 cm^-1" % tr)
chk.ok(ro.size == 3 and np.abs(ro).min() > 1.0,
       "rotation residuals %s, expected 3 with |r| > 1 cm^-1" % ro)
if ro.size == 3:
    chk.close(ro, r_ref, "rotation residuals vs eigenvalues of the rotation block of V^T K V",
              rtol=1e-6)
flat = np.array(doc.get("rigid_body_residuals", []), dtype=float)
chk.ok(flat.size == 6 and np.allclose(np.sort(flat[:3]), tr, rtol=0, atol=0)
       and np.allclose(np.sort(flat[3:]), ro, rtol=0, atol=0),
       "rigid_body_residuals %s lists the translations then the rotations" % flat)

chk.ok("gradient_norm" in doc, "gradient_norm present when the XYZ has forces")
if "gradient_norm" in doc:
    chk.close(doc["gradient_norm"], fnorm, "gradient_norm vs ||F||", rtol=1e-9)
chk.ok("gradient_norm" not in doc_plain, "no gradient_norm without forces")

warnings = doc.get("warnings")
chk.ok(isinstance(warnings, list) and any("rotation" in str(w).lower() for w in warnings),
       "a \"warnings\" entry mentions rotation; got %r" % (warnings,))

# The same displaced cluster with an invented 100x stiffer eps: the Hessian
# and forces scale by 100, the residuals by 10 (to ~19 cm^-1), above the
# "tens of cm^-1 mean not converged" level (REFERENCES.md, common practice):
# the rotation warning must be there too.
with q.tmpdir() as tmp:
    xyz_s = q.write_xyz(tmp + "/stiff.xyz", symbols, x, forces=100 * forces)
    hes_s = q.write_hessian(tmp + "/stiff.hess", 100 * H)
    doc_s = q.modes_json([xyz_s, "--hessian", hes_s, "--hessian-units", "eV/A^2"])
ro_s = np.sort(np.array(doc_s["rigid_body"]["rotations"], dtype=float))
chk.close(ro_s, 10 * r_ref, "stiff variant: rotation residuals = 10 x the argon-like ones", rtol=1e-6)
warnings_s = doc_s.get("warnings")
chk.ok(isinstance(warnings_s, list) and any("rotation" in str(w).lower() for w in warnings_s),
       "stiff variant (rotation residuals %s cm^-1): a \"warnings\" entry mentions rotation; got %r"
       % (ro_s, warnings_s))

got = q.mode_arrays(doc)
chk.ok(len(got["wavenumber"]) == 159, "%d modes, expected 159" % len(got["wavenumber"]))
if len(got["wavenumber"]) == 159:
    chk.close(got["wavenumber"], ref["nu"], "vibrational wavenumbers vs numpy PKP", rtol=1e-9,
              atol=1e-6)
    imag = [m["imaginary"] for m in doc["modes"]]
    chk.ok(imag == list(ref["lam"] < 0), "imaginary flags follow the sign of the eigenvalue")
print("off-minimum: |F| = %.4g eV/A (largest atomic force %.4g eV/A), rotation residuals numpy %s, quaver %s; translations %s; "
      "%d imaginary modes" % (fnorm, np.linalg.norm(forces, axis=1).max(), np.array2string(r_ref, precision=4),
                              np.array2string(ro, precision=4), np.array2string(tr, precision=6),
                              int((ref["lam"] < 0).sum())))
chk.finish("rotation residuals vs numpy V^T K V blocks, translation residuals ~0, "
           "gradient_norm vs ||F||, rotation warning, projected spectrum vs numpy")
