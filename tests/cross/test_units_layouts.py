#!/usr/bin/python3
"""One Hessian (the invented water-like molecule, H = B^T F B) written in
every accepted unit and every file layout must give the same modes.

Unit factors to eV/A^2 are computed here from scipy.constants (CODATA 2018,
Tiesinga et al., Rev. Mod. Phys. 93, 025010, 2021; thermochemical calorie
4.184 J exactly; 1 mdyn/A = 1 aJ/A^2 = 100 N/m): see qvtest.UNIT_TO_EV_A2.
The matrix is written as H / factor with 17 significant digits, so each run
sees the same matrix to one rounding: wavenumbers must agree with the eV/A^2
run to 1e-10 relative (a CODATA 2014 Hartree energy, for example, differs by
8e-9 relative and would fail).  The eV/A^2 run itself is compared with numpy
(relative 1e-9; periodictable vs AME2016 masses of 1H and 16O shift the
wavenumbers by < 2e-10 relative).
"""
import os
import numpy as np

import sys
sys.dont_write_bytecode = True      # keep the source tree clean
import qvtest as q  # noqa: E402

chk = q.Checker("units-layouts")

symbols, x, coords, F = q.water_like()
B = q.b_matrix(x, coords)
H = B.T @ F @ B
masses = q.masses_of(symbols)
ref = q.reference_modes(x, masses, H)


def nu_of(doc):
    return np.array([m["wavenumber"] for m in doc["modes"]], dtype=float)


with q.tmpdir() as tmp:
    xyz = q.write_xyz(os.path.join(tmp, "w.xyz"), symbols, x)
    hes = q.write_hessian(os.path.join(tmp, "ev.hess"), H)
    base_doc = q.modes_json([xyz, "--hessian", hes, "--hessian-units", "eV/A^2"])
    base = nu_of(base_doc)
    chk.close(base, ref["nu"], "eV/A^2 run vs numpy eigh of PKP", rtol=1e-9)
    chk.ok(base_doc["hessian"]["units"] == "eV/A^2" and base_doc["hessian"]["layout"] == "full",
           "hessian block of the eV/A^2 run: %r" % (base_doc["hessian"],))

    # --- every unit ---------------------------------------------------------
    for unit, factor in q.UNIT_TO_EV_A2.items():
        path = q.write_hessian(os.path.join(tmp, "u.hess"), H / factor)
        doc = q.modes_json([xyz, "--hessian", path, "--hessian-units", unit])
        chk.close(nu_of(doc), base, "unit %s: wavenumbers vs the eV/A^2 run" % unit, rtol=1e-10)
        chk.ok(doc["hessian"]["units"].lower().replace("å", "a") == unit.lower(),
               "unit %s: JSON hessian.units is %r" % (unit, doc["hessian"]["units"]))

    # --- spellings: Å for A, any letter case --------------------------------
    for spelling, unit in (("eV/Å^2", "eV/A^2"), ("EV/A^2", "eV/A^2"), ("ev/a^2", "eV/A^2"),
                           ("HARTREE/BOHR^2", "hartree/bohr^2"), ("kcal/mol/Å^2", "kcal/mol/A^2"),
                           ("KJ/MOL/Å^2", "kJ/mol/A^2"), ("mdyn/Å", "mdyn/A"),
                           ("AJ/Å^2", "aJ/A^2"), ("n/m", "N/m")):
        path = q.write_hessian(os.path.join(tmp, "s.hess"), H / q.UNIT_TO_EV_A2[unit])
        doc = q.modes_json([xyz, "--hessian", path, "--hessian-units", spelling])
        chk.close(nu_of(doc), base, "spelling %r: wavenumbers vs the eV/A^2 run" % spelling,
                  rtol=1e-10)

    # --- layouts ------------------------------------------------------------
    n = H.shape[0]
    cases = [
        ("full", {"layout": "full"}, None, "full"),
        ("lower", {"layout": "lower"}, None, "lower"),
        ("upper", {"layout": "upper"}, None, "upper"),
        ("full, commas and a comment", {"layout": "full", "sep": ", ",
                                        "comment": "invented test matrix"}, None, "full"),
        ("full wrapped 7 per line", {"layout": "full", "per_line": 7}, "full", "full"),
        ("lower wrapped 5 per line", {"layout": "lower", "per_line": 5}, "lower", "lower"),
        ("upper wrapped 4 per line", {"layout": "upper", "per_line": 4}, "upper", "upper"),
    ]
    for label, kw, explicit, expect_layout in cases:
        path = q.write_hessian(os.path.join(tmp, "l.hess"), H, **kw)
        args = [xyz, "--hessian", path, "--hessian-units", "eV/A^2"]
        if explicit:
            args += ["--hessian-layout", explicit]
        doc = q.modes_json(args)
        chk.close(nu_of(doc), base, "layout %s: wavenumbers vs full" % label, rtol=1e-12)
        chk.ok(doc["hessian"]["layout"] == expect_layout,
               "layout %s: JSON hessian.layout %r, expected %r"
               % (label, doc["hessian"]["layout"], expect_layout))
        if explicit:
            # line breaks that match no layout: auto detection must refuse
            p = q.run(["modes", xyz, "--hessian", path, "--hessian-units", "eV/A^2"], expect=None)
            chk.ok(p.returncode == 2 and "layout" in p.stderr_text,
                   "layout %s without --hessian-layout: exit %d (expected 2), stderr %r"
                   % (label, p.returncode, p.stderr_text.strip()))

    # also: an explicit layout given for a file written row by row
    path = q.write_hessian(os.path.join(tmp, "lx.hess"), H, layout="lower")
    doc = q.modes_json([xyz, "--hessian", path, "--hessian-units", "eV/A^2",
                        "--hessian-layout", "lower"])
    chk.close(nu_of(doc), base, "explicit --hessian-layout lower on a row-by-row file", rtol=1e-12)

    for label, order, endian in (("C order", "C", "<"), ("Fortran order", "F", "<"),
                                 ("big-endian", "C", ">"), ("big-endian Fortran", "F", ">")):
        path = q.write_npy(os.path.join(tmp, "h.npy"), H, order=order, endian=endian)
        doc = q.modes_json([xyz, "--hessian", path, "--hessian-units", "eV/A^2"])
        chk.close(nu_of(doc), base, ".npy %s: wavenumbers vs text" % label, rtol=1e-12)
        chk.ok(doc["hessian"]["layout"] == "npy", ".npy %s: layout %r" % (label, doc["hessian"]["layout"]))

    # a slightly non-symmetric matrix: quaver symmetrises H first and reports
    # max|H_ij - H_ji| / max|H| (DESIGN.md §2).  (Reading a C-order file as
    # Fortran order gives H^T, which symmetrises to the same matrix, so no
    # output can tell the orders apart; the cases above check that both are
    # accepted and give the right numbers.)
    T = np.triu(np.full((n, n), 1e-3), 1)
    Hn = H + T
    asym = np.abs(Hn - Hn.T).max() / np.abs(Hn).max()
    for order, endian in (("C", "<"), ("F", ">")):
        path = q.write_npy(os.path.join(tmp, "a.npy"), Hn, order=order, endian=endian)
        doc = q.modes_json([xyz, "--hessian", path, "--hessian-units", "eV/A^2"])
        Kn = q.mass_weight(Hn, masses)          # symmetrises
        w, _ = q.vib_solve(Kn, ref["V"])
        chk.close(nu_of(doc), q.to_wavenumber(w), ".npy %s%s asymmetric: wavenumbers vs numpy of "
                  "(H + H^T)/2" % (order, endian), rtol=1e-9)
        chk.close(doc["hessian"]["asymmetry"], asym, ".npy %s%s: reported asymmetry" % (order, endian),
                  rtol=1e-9)

    # --- errors -------------------------------------------------------------
    p = q.run(["modes", xyz, "--hessian", hes, "--hessian-units", "eV/nm^2"], expect=None)
    missing = [u for u in q.UNIT_TO_EV_A2 if u.lower() not in p.stderr_text.lower()]
    chk.ok(p.returncode == 1 and not missing,
           "unknown unit: exit %d (expected 1); accepted units not listed: %s; stderr %r"
           % (p.returncode, missing, p.stderr_text.strip()))
    p = q.run(["modes", xyz, "--hessian", hes], expect=None)
    chk.ok(p.returncode == 1 and p.stderr_text.strip() != "",
           "missing --hessian-units: exit %d (expected 1), stderr %r"
           % (p.returncode, p.stderr_text.strip()))

chk.finish("7 units (factors from scipy.constants), 9 spellings, 7 text layouts, 4 .npy "
           "variants, asymmetry report, unknown unit and missing unit errors")
