#!/usr/bin/python3
"""`quaver anharmonic` end to end, against NumPy/SciPy and closed forms.

`quaver displace` writes a scan along mode 1 of the bundled formaldehyde
example (data/examples/formaldehyde, invented demo data) and a grid over
modes 1 and 2.  The "electronic-structure code" is played here by analytic
potentials in the manifest's mass-weighted Q (u^1/2 A), their energies
written back as energy= on the XYZ comment lines or as a NAME ENERGY file in
hartree.  The levels Quaver reports are compared with:

- an independent finite-difference solution done here: the three-point
  second difference on 4000 and 8000 interior points between walls at the
  ends of the scan (the box the program solves in), Richardson-extrapolated,
  scipy.linalg.eigh_tridiagonal; on the same interpolant as the program
  (SciPy's natural CubicSpline, NumPy's Chebyshev least-squares fit of the
  same degree), so the two agree to far below the interpolation error;
- the Morse closed form E_v = hbar w (v+1/2) - [hbar w (v+1/2)]^2/(4D)
  (Morse, Phys. Rev. 34, 57, 1929), within the interpolation error of 41
  points (0.2 cm^-1, measured with this test), and omega_e x_e =
  (hbar w)^2/(4D);
- a symmetric double well V = B((Q/a)^2 - 1)^2: the warning, both minima at
  +-a, the barrier B and the tunnelling splitting against the finite
  difference;
- two coupled harmonic modes V = 1/2 (l1 Q1^2 + l2 Q2^2) + c Q1 Q2 on the
  grid: the coupled fundamentals are hbar sqrt(mu) with mu the eigenvalues of
  [[l1, c], [c, l2]] (small oscillations: Goldstein, Classical Mechanics,
  ch. 6);
- bad input: a missing structure, a missing/duplicate/unknown name, a NaN, a
  mismatched geometry, no energy=: a "file:line" message and exit 2; the
  unit required with --energies (exit 1); an existing output kept (exit 3).

Constants: CODATA 2018 through scipy.constants (Tiesinga et al., Rev. Mod.
Phys. 93, 025010, 2021).

SPDX-License-Identifier: GPL-3.0-or-later
"""
import json
import os
import re
import shutil
import sys
import tempfile

import numpy as np
import scipy.constants as sc
import scipy.interpolate
import scipy.linalg

sys.dont_write_bytecode = True
sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "cross"))
import qvtest as q  # noqa: E402

chk = q.Checker("anharmonic")

M_U = sc.physical_constants["atomic mass constant"][0]
HARTREE_EV = sc.physical_constants["Hartree energy in eV"][0]
EV_PER_CM1 = sc.h * sc.c * 100.0 / sc.e
KINETIC = sc.hbar ** 2 / (2.0 * M_U * 1e-20) / sc.e      # hbar^2/2 in eV u A^2
CM1_PER_ROOT_LAMBDA = np.sqrt(sc.e / (1e-20 * M_U)) / (2 * np.pi * sc.c * 100.0)
BUNDLE = os.path.join(q.SOURCE_ROOT, "data", "examples", "formaldehyde",
                      "formaldehyde.quaver.json")


def hbar_omega_ev(lam):
    """hbar * omega in eV of a curvature lam in eV/(A^2 u)."""
    return sc.hbar * np.sqrt(lam * sc.e / (1e-20 * M_U)) / sc.e


def fd_levels(v_of_q, lo, hi, k):
    """Lowest k levels (eV) of -hbar^2/2 d2/dQ2 + V between walls at lo, hi:
    3-point differences on n and 2n interior points, Richardson."""
    out = []
    for n in (4000, 8000):
        h = (hi - lo) / (n + 1)
        x = lo + h * np.arange(1, n + 1)
        d = 2.0 * KINETIC / h ** 2 + v_of_q(x)
        e = np.full(n - 1, -KINETIC / h ** 2)
        out.append(scipy.linalg.eigh_tridiagonal(d, e, eigvals_only=True,
                                                 select="i", select_range=(0, k - 1)))
    return (4.0 * out[1] - out[0]) / 3.0


def displace(tmp, name, *args):
    d = os.path.join(tmp, name)
    q.run(["displace", BUNDLE] + list(args) + ["-o", d])
    return d, json.load(open(os.path.join(d, "manifest.json")))


def structures(manifest):
    """(file name, [Q of each mode], [harmonic wavenumber of each mode])."""
    out = []
    for f in manifest["files"]:
        fr = f["frames"][0]
        out.append((f["name"], [m["Q"] for m in fr["modes"]], [m["wavenumber"] for m in fr["modes"]]))
    return out


def add_energy(path, energy_ev):
    lines = open(path).read().split("\n")
    lines[1] = lines[1] + " energy=%.15g" % energy_ev
    open(path, "w").write("\n".join(lines))


def anharmonic(args, expect=0):
    p = q.run(["anharmonic"] + [str(a) for a in args], expect=expect)
    return p


with tempfile.TemporaryDirectory(prefix="qv-anharmonic-") as tmp:
    # ------------------------------------------------------------------
    # 1-D: a Morse potential along mode 1, written back two ways
    # ------------------------------------------------------------------
    scan, man = displace(tmp, "scan", "--mode", "1", "--scan", "41", "--q", "9")
    pts = structures(man)
    lam = (pts[0][2][0] / CM1_PER_ROOT_LAMBDA) ** 2          # eV/(A^2 u) of mode 1
    D = 1.2                                                   # eV, invented
    a = np.sqrt(lam / (2 * D))                                # V''(0) = 2 D a^2 = lam
    def morse(x):
        return D * (1.0 - np.exp(-a * x)) ** 2
    Qs = np.array([p[1][0] for p in pts])
    Vs = morse(Qs)
    offset = -114.25                                          # hartree, an absolute energy
    with open(os.path.join(tmp, "scan.txt"), "w") as f:
        f.write("# invented Morse energies for the scan, hartree\n")
        for (name, qq, _), v in zip(pts, Vs):
            f.write("%s  %.15f\n" % (name[:-4], offset + v / HARTREE_EV))
    for name, qq, _ in pts:
        add_energy(os.path.join(scan, name), morse(qq[0]))

    lo, hi = Qs.min(), Qs.max()
    order = np.argsort(Qs)
    spline = scipy.interpolate.CubicSpline(Qs[order], Vs[order], bc_type="natural")
    ref_spline = (fd_levels(spline, lo, hi, 6) - spline(np.linspace(lo, hi, 200001)).min()) / EV_PER_CM1

    # the spline, energies from energy= (eV)
    p = anharmonic([scan, "--spline", "-f", "json"])
    doc = json.loads(p.stdout_text)
    got = np.array([lv["energy"] for lv in doc["levels"]])
    chk.close(got, ref_spline, "spline levels vs NumPy finite differences on SciPy's natural "
              "spline", atol=2e-3)
    hw = hbar_omega_ev(lam)
    morse_cf = np.array([hw * (v + .5) - (hw * (v + .5)) ** 2 / (4 * D) for v in range(6)]) / EV_PER_CM1
    chk.close(got[:4], morse_cf[:4], "spline levels vs the Morse closed form", atol=0.2)
    chk.close(doc["omega_e_x_e"], hw ** 2 / (4 * D) / EV_PER_CM1, "omega_e x_e vs (hbar w)^2/(4D)",
              atol=0.2)
    chk.close(doc["fundamental"], got[1] - got[0], "fundamental = E1 - E0", atol=1e-9)
    chk.close(doc["overtone"], got[2] - got[0], "overtone = E2 - E0", atol=1e-9)
    # the curvature of the interpolant at its minimum (SciPy's second derivative
    # of the same spline), and of the Morse well itself within the spline's error
    qmin = doc["minimum"]["Q"][0]
    chk.close(doc["harmonic_wavenumbers"][0], np.sqrt(spline(qmin, 2)) * CM1_PER_ROOT_LAMBDA,
              "harmonic value from the curvature vs SciPy's spline V''", rtol=1e-5)
    chk.close(doc["harmonic_wavenumbers"][0], pts[0][2][0], "harmonic value vs the manifest's "
              "wavenumber (= sqrt(2 D a^2))", rtol=5e-3)
    chk.ok(doc["convergence"]["converged"] and doc["convergence"]["steps"][-1]["max_change"] < 1e-6,
           "DVR refinement converged below 1e-6 cm^-1: %s" % doc["convergence"]["steps"][-1])
    chk.ok(doc["double_well"] is None and len(doc["minima"]) == 1, "a single well")
    chk.ok(doc["modes"][0]["mode"] == 1 and doc["points"] == 41, "mode and point count")
    for lv in doc["levels"][:4]:
        a_, b_ = lv["turning_points"]
        chk.close([spline(a_), spline(b_)], [lv["energy"] * EV_PER_CM1 + spline(np.linspace(lo, hi, 200001)).min()] * 2,
                  "V(turning points) = E_%d" % lv["v"], atol=1e-4 * EV_PER_CM1)
        chk.ok(a_ < lv["mean_Q"][0] < b_, "<Q> between the turning points, v = %d" % lv["v"])
    chk.ok(all(doc["levels"][k]["mean_Q"][0] < doc["levels"][k + 1]["mean_Q"][0] for k in range(5)),
           "<Q> grows with v on the Morse well (it is softer outwards)")
    note = " ".join(doc["notes"])
    chk.ok("torsion" in note and "small amplitude" in note, "the note on torsions")

    # the polynomial, energies from the file (hartree)
    p = anharmonic([os.path.join(scan, "manifest.json"), "--energies", os.path.join(tmp, "scan.txt"),
                    "--energy-units", "hartree", "--degree", "10", "-f", "json"])
    doc = json.loads(p.stdout_text)
    fit = np.polynomial.Chebyshev.fit(Qs, Vs, 10, domain=[lo, hi])
    ref_poly = (fd_levels(fit, lo, hi, 6) - fit(np.linspace(lo, hi, 200001)).min()) / EV_PER_CM1
    got = np.array([lv["energy"] for lv in doc["levels"]])
    chk.close(got, ref_poly, "degree-10 levels vs NumPy finite differences on NumPy's Chebyshev "
              "fit", atol=2e-3)
    resid = fit(Qs) - Vs
    chk.close([doc["potential"]["residual_rms"], doc["potential"]["residual_max"]],
              [np.sqrt(np.mean(resid ** 2)) / EV_PER_CM1, np.abs(resid).max() / EV_PER_CM1],
              "fit residual (rms, max) vs NumPy's", rtol=1e-3, atol=1e-9)
    chk.ok(doc["potential"]["degree"] == 10, "degree as asked")

    # text and CSV carry the same levels
    p = anharmonic([scan, "--spline", "-f", "csv"])
    rows = [r.split(",") for r in p.stdout_text.strip().split("\n")]
    chk.ok(rows[0][0] == "v" and len(rows) == 7, "CSV: header and 6 levels")
    chk.close([float(r[1]) for r in rows[1:]], ref_spline, "CSV levels", atol=2e-3)
    p = anharmonic([scan, "--spline", "--levels", "4"])
    lines = [l for l in p.stdout_text.split("\n") if l and not l.startswith("#")]
    chk.close([float(l.split()[1]) for l in lines], ref_spline[:4], "text levels", atol=2e-3)
    chk.ok("torsion" in p.stdout_text and "converged" in p.stdout_text, "text: note and convergence")

    # output file: written, then kept without --force (exit 3)
    out = os.path.join(tmp, "levels.json")
    anharmonic([scan, "-f", "json", "-o", out])
    before = open(out).read()
    p = anharmonic([scan, "-f", "csv", "-o", out], expect=3)
    chk.ok(open(out).read() == before and "--force" in p.stderr_text, "existing output kept (exit 3)")
    anharmonic([scan, "-f", "csv", "-o", out, "--force"])
    chk.ok(open(out).read().startswith("v,"), "--force replaces it")

    # ------------------------------------------------------------------
    # A short scan: levels above the scan and at its edge are flagged
    # ------------------------------------------------------------------
    short, man_s = displace(tmp, "short", "--mode", "1", "--scan", "11", "--q", "2")
    for name, qq, _ in structures(man_s):
        add_energy(os.path.join(short, name), morse(qq[0]))
    p = anharmonic([short, "-f", "json"])
    doc = json.loads(p.stdout_text)
    chk.ok(any("above the highest scanned energy" in w for w in doc["warnings"])
           and "above the highest scanned energy" in p.stderr_text, "short scan: level above the scan")
    chk.ok(any(lv["above_scan"] for lv in doc["levels"]), "above_scan flags")
    chk.ok(any("near the ends of the scanned range" in w for w in doc["warnings"]),
           "short scan: edge weight warned")

    # ------------------------------------------------------------------
    # A symmetric double well
    # ------------------------------------------------------------------
    dw, man_d = displace(tmp, "dw", "--mode", "1", "--scan", "61", "--Q", "0.9")
    a_w, B = 0.45, 1500 * EV_PER_CM1
    def well(x):
        return B * ((x / a_w) ** 2 - 1.0) ** 2
    Qd = np.array([p_[1][0] for p_ in structures(man_d)])
    for name, qq, _ in structures(man_d):
        add_energy(os.path.join(dw, name), well(qq[0]))
    p = anharmonic([dw, "--degree", "4", "-f", "json"])
    doc = json.loads(p.stdout_text)
    ref = fd_levels(well, Qd.min(), Qd.max(), 4) / EV_PER_CM1
    chk.ok(doc["double_well"] is not None and "multiple well" in p.stderr_text, "double well warned")
    chk.close([m["Q"] for m in doc["minima"]], [-a_w, a_w], "both minima", atol=1e-5)
    chk.close(doc["double_well"]["barrier"], 1500.0, "barrier", rtol=1e-6)
    chk.close(doc["double_well"]["splitting"], ref[1] - ref[0], "tunnelling splitting vs finite "
              "differences", rtol=1e-4, atol=1e-4)
    chk.ok(0 < doc["double_well"]["splitting"] < 0.1 * (ref[2] - ref[0]), "the lowest pair is a "
           "close doublet")

    # ------------------------------------------------------------------
    # 2-D: two coupled harmonic modes on a grid
    # ------------------------------------------------------------------
    grid, man_g = displace(tmp, "grid", "--modes", "1,2", "--grid", "9", "--q", "5")
    gp = structures(man_g)
    l1, l2 = [(w / CM1_PER_ROOT_LAMBDA) ** 2 for w in gp[0][2]]
    c = 0.3 * np.sqrt(l1 * l2)
    with open(os.path.join(tmp, "grid.txt"), "w") as f:
        for name, (x1, x2), _ in gp:
            f.write("%s %.15g\n" % (name, (0.5 * (l1 * x1 ** 2 + l2 * x2 ** 2) + c * x1 * x2) / EV_PER_CM1))
    p = anharmonic([grid, "--energies", os.path.join(tmp, "grid.txt"), "--energy-units", "cm-1",
                    "--degree", "2", "-f", "json"])
    doc = json.loads(p.stdout_text)
    mu = np.linalg.eigvalsh(np.array([[l1, c], [c, l2]]))
    want = np.sqrt(mu) * CM1_PER_ROOT_LAMBDA
    chk.close(doc["harmonic_wavenumbers"], want, "2-D harmonic values from the curvature", rtol=1e-6)
    chk.close([f_["wavenumber"] for f_ in doc["fundamentals"]], want, "coupled fundamentals vs "
              "sqrt(eig [[l1, c], [c, l2]])", atol=0.05)
    chk.close(doc["levels"][0]["energy"], want.sum() / 2, "2-D zero-point level", atol=0.05)
    chk.ok(doc["dimension"] == 2 and doc["points"] == 81, "2-D: dimension and points")

    # ------------------------------------------------------------------
    # Bad input: file:line messages and exit codes
    # ------------------------------------------------------------------
    def expect_error(args, code, pattern, what):
        p = anharmonic(args, expect=code)
        chk.ok(re.search(pattern, p.stderr_text) is not None,
               "%s: stderr %r should match %r" % (what, p.stderr_text.strip(), pattern))

    efile = os.path.join(tmp, "bad.txt")
    good = open(os.path.join(tmp, "scan.txt")).read().split("\n")
    def bad_file(lines):
        open(efile, "w").write("\n".join(lines) + "\n")
        return [scan, "--energies", efile, "--energy-units", "hartree"]

    expect_error(bad_file(good[:5] + good[6:]), 2, r"bad\.txt: no energy for 1 structure.*%s"
                 % re.escape(pts[4][0]), "missing name")
    expect_error(bad_file(good + [good[3]]), 2, r"bad\.txt:%d:1: .* second time \(first on line 4\)"
                 % (len(good) + 1), "duplicate name")
    nan_lines = list(good)
    nan_lines[7] = nan_lines[7].split()[0] + " nan"
    expect_error(bad_file(nan_lines), 2, r"bad\.txt:8:\d+: .*not a finite number", "NaN energy")
    expect_error(bad_file(good + ["mode9-scan-99 -114.0"]), 2, r"bad\.txt:%d:1: 1 name is not in "
                 r"the manifest: 'mode9-scan-99'" % (len(good) + 1), "unknown name")
    expect_error(bad_file(good[:3] + [good[3] + " extra"] + good[4:]), 2, r"bad\.txt:4:\d+: expected "
                 r"NAME ENERGY", "three fields")
    expect_error([scan, "--energies", efile], 1, r"--energy-units", "unit required")
    expect_error([scan, "--energies", efile, "--energy-units", "furlongs"], 1, r"unknown energy unit",
                 "unknown unit")

    # the structure files: missing, NaN, mismatched geometry, no energy=
    broken = os.path.join(tmp, "broken")
    def fresh():
        shutil.rmtree(broken, ignore_errors=True)
        shutil.copytree(scan, broken)
    fresh()
    os.unlink(os.path.join(broken, pts[7][0]))
    expect_error([broken], 2, r"broken/%s: missing" % re.escape(pts[7][0]), "missing structure")
    fresh()
    path = os.path.join(broken, pts[5][0])
    text = open(path).read().split("\n")
    text[1] = re.sub(r"energy=\S+", "energy=nan", text[1])
    open(path, "w").write("\n".join(text))
    expect_error([broken], 2, r"%s:2:" % re.escape(pts[5][0]), "NaN in energy=")
    fresh()
    path = os.path.join(broken, pts[9][0])
    text = open(path).read().split("\n")
    f_ = text[4].split()
    f_[2] = "%.10f" % (float(f_[2]) + 0.01)
    text[4] = "  ".join(f_)
    open(path, "w").write("\n".join(text))
    expect_error([broken], 2, r"%s:5: atom 3 is 0\.0\d+ A off the line" % re.escape(pts[9][0]),
                 "mismatched geometry")
    fresh()
    path = os.path.join(broken, pts[2][0])
    text = open(path).read().split("\n")
    text[1] = re.sub(r" energy=\S+", "", text[1])
    open(path, "w").write("\n".join(text))
    expect_error([broken], 2, r"%s:2: no energy=" % re.escape(pts[2][0]), "no energy=")
    fresh()
    path = os.path.join(broken, pts[6][0])
    text = open(path).read().split("\n")
    text[2], text[3] = text[3], text[2]          # atoms 1 and 2 swapped (C and O)
    open(path, "w").write("\n".join(text))
    expect_error([broken], 2, r"%s:3: atom 1 is element 8, in %s it is 6" % (re.escape(pts[6][0]),
                 re.escape(pts[0][0])), "atoms in another order")

    # one multi-frame file: names FILE@K, the same levels, the line of a bad frame
    single, man_1 = displace(tmp, "single", "--mode", "1", "--scan", "41", "--q", "9",
                             "--single-file")
    fname = man_1["files"][0]["name"]
    frames = man_1["files"][0]["frames"]
    with open(os.path.join(tmp, "single.txt"), "w") as f:
        for fr in frames:
            f.write("%s@%d %.15g\n" % (fname, fr["index"], morse(fr["modes"][0]["Q"])))
    p = anharmonic([single, "--energies", os.path.join(tmp, "single.txt"), "--energy-units", "eV",
                    "--spline", "-f", "json"])
    chk.close([lv["energy"] for lv in json.loads(p.stdout_text)["levels"]], ref_spline,
              "multi-frame scan, FILE@K names: the same levels", atol=2e-3)
    text = open(os.path.join(single, fname)).read().split("\n")
    n_at = int(text[0])
    for k, fr in enumerate(frames):
        if k != 12:
            text[k * (n_at + 2) + 1] += " energy=%.15g" % morse(fr["modes"][0]["Q"])
    open(os.path.join(single, fname), "w").write("\n".join(text))
    expect_error([single], 2, r"%s:%d: no energy= on the comment line of this frame"
                 % (re.escape(fname), 12 * (n_at + 2) + 2), "multi-frame: the frame without energy=")
    expect_error([os.path.join(tmp, "nowhere")], 2, r"nowhere", "no manifest")
    expect_error([scan, "--degree", "1"], 1, r"--degree", "degree too low")
    expect_error([scan, "--degree", "4", "--spline"], 1, r"not both", "degree and spline")

chk.finish("levels vs NumPy finite differences and Morse 1929, double well, coupled 2-D, read-back errors")
