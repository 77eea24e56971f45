#!/usr/bin/python3
"""`quaver displace` against the outside world.

System: a 13-atom Lennard-Jones cluster (argon atoms with the invented
argon-like eps = 0.0104 eV, sigma = 3.40 A of qvtest.py), minimised here, its
analytic Hessian written to a text file; a few atoms get invented masses so
the mass weighting matters.  The mode vectors come from `quaver modes
--format json --vectors`; everything else is recomputed here with NumPy:

- Round trip, every amplitude unit: the displacement read back from each
  file (parsed here, not with Quaver's reader) equals Q x d_k, d = l/sqrt(m),
  with Q from q = Q sqrt(omega/hbar), from the largest atomic displacement,
  or from M x Q_tp, Q_tp = sqrt((2v+1) hbar/omega) (textbook harmonic
  oscillator: Griffiths, Introduction to Quantum Mechanics, ch. 2); CODATA
  2018 constants typed below (Tiesinga et al., Rev. Mod. Phys. 93, 025010,
  2021).
- The manifest lists exactly the files written, their SHA-256 (hashlib), the
  SHA-256 of the inputs, and the amplitudes in all units.
- Energy on the analytic potential: E(+-Q) - E0 = 1/2 omega^2 Q^2 + O(Q^3)
  (Taylor expansion of the potential about its minimum, common practice):
  the error's log-log slope over Q, Q/2, Q/4, Q/8 is >= 2.8.
- Turning points of level v: E - E0 = hbar omega (v + 1/2) + O(Q^3): with
  the amplitude scaled by M = 1, 1/2, 1/4, 1/8 the relative error of
  (E - E0)/M^2 against hbar omega (v+1/2) falls at least like M^0.8.
- Scan (0 included and equal to the input), grid (sum of two modes),
  escape along an imaginary mode (default 0.1 A, note in the manifest),
  periodic input keeps its Lattice and pbc.
- Refusal to overwrite (exit 3, nothing changed), an injected failure in the
  middle of an export (exit 3, no partial or temporary file, no manifest),
  bad input (exit 1 with a message that says what to do).
"""
import csv
import hashlib
import json
import os
import sys

import numpy as np

sys.dont_write_bytecode = True
sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "cross"))
import qvtest as q  # noqa: E402

chk = q.Checker("displace")

# CODATA 2018 (Tiesinga et al. 2021), typed here
H_PLANCK = 6.62607015e-34          # J s, exact
HBAR = H_PLANCK / (2 * np.pi)
E_CHARGE = 1.602176634e-19         # C, exact
M_U = 1.66053906660e-27            # kg
OMEGA_UNIT = np.sqrt(E_CHARGE / (1e-20 * M_U))   # rad/s per sqrt(eV/(A^2 u))


def hbar_over_omega(lam):
    """hbar/omega in u A^2 for an eigenvalue lam in eV/(A^2 u)."""
    return HBAR / (np.sqrt(lam) * OMEGA_UNIT) / (M_U * 1e-20)


def read_xyz(path):
    """Frames of an (extended) XYZ file, parsed here: (symbols, x, pairs)."""
    frames = []
    with open(path) as f:
        lines = f.read().splitlines()
    i = 0
    while i < len(lines) and lines[i].strip():
        n = int(lines[i])
        comment = lines[i + 1]
        pairs = {}
        for tok in shlex_split(comment):
            if "=" in tok:
                k, v = tok.split("=", 1)
                pairs[k] = v
        rows = [lines[i + 2 + a].split() for a in range(n)]
        sym = [r[0] for r in rows]
        x = np.array([[float(v) for v in r[1:4]] for r in rows])
        frames.append((sym, x, pairs))
        i += n + 2
    return frames


def shlex_split(text):
    import shlex
    return shlex.split(text)


def sha256(path):
    with open(path, "rb") as f:
        return hashlib.sha256(f.read()).hexdigest()


def listing(d):
    return sorted(os.listdir(d))


def snapshot(d):
    return {n: sha256(os.path.join(d, n)) for n in listing(d)}


# --- the system -----------------------------------------------------------
eps, sigma = q.LJ_EPS, q.LJ_SIGMA
x13, _, _ = q.lj_minimise(q.icosahedral_cluster(1))
x = (x13 - x13.mean(axis=0)) * sigma
symbols = ["Ar"] * len(x)
H = q.lj_hessian(x, eps, sigma)
E0 = q.lj_energy(x, eps, sigma)
overrides = {1: 60.0, 4: 36.0, 9: 45.0}          # invented masses (atoms from 1)
masses = q.masses_of(symbols)
for a, m in overrides.items():
    masses[a - 1] = m
mass_args = []
for a, m in overrides.items():
    mass_args += ["--mass", "%d=%r" % (a, m)]

with q.tmpdir() as tmp:
    xyz, hes = q.write_inputs(tmp, symbols, x, H, name="lj13")
    base = [xyz, "--hessian", hes, "--hessian-units", "eV/A^2"] + mass_args
    doc = q.modes_json(base + ["--vectors"])
    arr = q.mode_arrays(doc, masses)
    D, lam = arr["D"], arr["eigenvalue"]
    n_modes = len(lam)
    print("modes: %d, wavenumbers %.2f .. %.2f cm^-1" % (n_modes, arr["wavenumber"][0], arr["wavenumber"][-1]))

    def run_displace(args, outdir, expect=0, env=None):
        cmd = ["displace"] + base + list(args) + ["-o", outdir]
        if env:
            old = dict(os.environ)
            os.environ.update(env)
            try:
                return q.run(cmd, expect=expect)
            finally:
                os.environ.clear()
                os.environ.update(old)
        return q.run(cmd, expect=expect)

    def frames_of(outdir):
        man = json.load(open(os.path.join(outdir, "manifest.json")))
        out = []
        for f in man["files"]:
            fr = read_xyz(os.path.join(outdir, f["name"]))
            for e, (s, xx, pairs) in zip(f["frames"], fr):
                out.append((f["name"], e, xx, pairs))
        return man, out

    def check_manifest(label, outdir, man):
        names = [f["name"] for f in man["files"]]
        chk.ok(sorted(names + ["manifest.json"]) == listing(outdir),
               "%s: manifest lists exactly the files in the directory (%s)" % (label, listing(outdir)))
        for f in man["files"]:
            chk.ok(f["sha256"] == sha256(os.path.join(outdir, f["name"])),
                   "%s: SHA-256 of %s matches hashlib" % (label, f["name"]))
        ins = {i["role"]: i for i in man["inputs"]}
        chk.ok(ins.get("geometry", {}).get("sha256") == sha256(xyz)
               and ins.get("hessian", {}).get("sha256") == sha256(hes),
               "%s: input SHA-256 (geometry, Hessian) match hashlib" % label)
        chk.ok(man["format"] == "quaver-manifest" and man["version"] == 1,
               "%s: format and version" % label)

    # --- round trip in every unit (mode 10, and the lowest mode 1) ---------
    for k in (1, 10):
        d = D[:, k - 1]
        dmax = np.max(np.linalg.norm(d.reshape(-1, 3), axis=1))
        hw = hbar_over_omega(lam[k - 1])
        cases = [
            ("--Q", ["--Q", "0.3"], 0.3),
            ("--q", ["--q", "1.7"], 1.7 * np.sqrt(hw)),
            ("--max-displacement", ["--max-displacement", "0.05"], 0.05 / dmax),
            ("--turning-point=2 --level 1", ["--turning-point=2", "--level", "1"], 2 * np.sqrt(3 * hw)),
            ("default (1 turning point, v=0)", [], np.sqrt(hw)),
        ]
        for label, args, Qexp in cases:
            outdir = os.path.join(tmp, "rt-%d-%s" % (k, "".join(c for c in label if c.isalnum())))
            run_displace(["--mode", str(k), "--exact"] + args, outdir)
            man, frames = frames_of(outdir)
            tag = "mode %d %s" % (k, label)
            check_manifest(tag, outdir, man)
            chk.ok(len(frames) == 2, "%s: a pair, got %d structures" % (tag, len(frames)))
            for sign, (name, e, xx, pairs) in zip((-1, 1), frames):
                Q = sign * Qexp
                chk.close(xx - x, (Q * d).reshape(-1, 3), "%s %s: displacement = Q d_k" % (tag, name),
                          atol=1e-12)
                a = e["modes"][0]
                chk.close([a["Q"], a["q"], a["max_displacement"]],
                          [Q, Q / np.sqrt(hw), sign * Qexp * dmax],
                          "%s %s: manifest Q, q, max displacement" % (tag, name), rtol=1e-12)
                lv = a["level"]
                chk.close(a["turning_point_multiple"], Q / np.sqrt((2 * lv + 1) * hw),
                          "%s %s: manifest turning-point multiple at v=%d" % (tag, name, lv), rtol=1e-12)
                chk.close([float(pairs["Q"]), float(pairs["q"]), float(pairs["max_displacement"])],
                          [Q, Q / np.sqrt(hw), sign * Qexp * dmax],
                          "%s %s: comment line Q, q, max displacement" % (tag, name), rtol=1e-12)
                chk.ok(int(pairs["mode"]) == k and "level" in pairs,
                       "%s %s: comment line names mode and level" % (tag, name))

    # default precision (%.10f): the same to 1e-10 A
    outdir = os.path.join(tmp, "fixed")
    run_displace(["--mode", "5", "--Q", "0.2"], outdir)
    man, frames = frames_of(outdir)
    chk.close(frames[1][2] - x, (0.2 * D[:, 4]).reshape(-1, 3), "10-decimal output: displacement",
              atol=1e-10 + 1e-12)

    # --- energy on the analytic potential: 1/2 omega^2 Q^2 + O(Q^3) --------
    # A 17-point scan from -0.2 to +0.2 u^1/2 A; E(Q) - E0 is fitted with a
    # polynomial of degree 8 in t = Q/0.2: the constant and linear terms must
    # vanish and the quadratic one equal 1/2 lambda (that is the statement
    # "1/2 omega^2 Q^2 to third order"); a displacement with a wrong length or
    # direction changes the quadratic coefficient at first order.  And the
    # error itself, per sign, at Q = 0.2, 0.1, 0.05, 0.025 is below
    # C |Q|^3 with C taken from the largest Q (x 2 for the higher terms).
    for k in (1, 7, n_modes):
        Qmax = 0.2
        outdir = os.path.join(tmp, "energy-%d" % k)
        run_displace(["--mode", str(k), "--scan", "17", "--Q", repr(Qmax), "--exact", "--single-file"],
                     outdir)
        man, frames = frames_of(outdir)
        Qv = np.array([e["modes"][0]["Q"] for _, e, _, _ in frames])
        chk.close(Qv, np.linspace(-Qmax, Qmax, 17), "mode %d: scan amplitudes" % k, atol=1e-15)
        dE = np.array([q.lj_energy(fr[2], eps, sigma) - E0 for fr in frames])
        c = np.polynomial.polynomial.polyfit(Qv / Qmax, dE, 8)
        half = 0.5 * lam[k - 1]
        c2 = c[2] / Qmax ** 2
        print("mode %d: fit of E - E0: c0 %.2g eV, c1 %.2g eV/(u^1/2 A), c2 %.12g vs lambda/2 %.12g"
              % (k, c[0], c[1] / Qmax, c2, half))
        scale = half * Qmax ** 2
        chk.ok(abs(c[0]) < 1e-9 * scale and abs(c[1]) < 1e-6 * scale,
               "mode %d: no constant or linear term (%.2g, %.2g eV at Q = 0.2)" % (k, c[0], c[1]))
        chk.ok(abs(c2 - half) < 1e-6 * half,
               "mode %d: quadratic coefficient %.12g = lambda/2 = %.12g (relative %.2g)"
               % (k, c2, half, abs(c2 - half) / half))
        err = np.abs(dE - half * Qv ** 2)
        for sign, idx in ((-1, [0, 4, 6, 7]), (1, [16, 12, 10, 9])):
            Cq = 2 * err[idx[0]] / Qmax ** 3
            ok = all(err[i] <= Cq * abs(Qv[i]) ** 3 for i in idx)
            chk.ok(ok, "mode %d sign %+d: |E - E0 - lambda Q^2/2| = %s <= C |Q|^3"
                   % (k, sign, np.array2string(err[idx], precision=3)))

    # --- turning points of levels 0..2: hbar omega (v + 1/2) ----------------
    k = n_modes
    hw_ev = HBAR * np.sqrt(lam[k - 1]) * OMEGA_UNIT / E_CHARGE
    Ms = [1.0, 0.5, 0.25, 0.125]
    rel = {v: [] for v in range(3)}
    for M in Ms:
        outdir = os.path.join(tmp, "levels-%g" % M)
        run_displace(["--mode", str(k), "--levels", "--level", "2", "--turning-point=%r" % M,
                      "--exact"], outdir)
        man, frames = frames_of(outdir)
        chk.ok(len(frames) == 6, "levels 0..2: 6 structures, got %d" % len(frames))
        for name, e, xx, pairs in frames:
            v = e["modes"][0]["level"]
            dE = q.lj_energy(xx, eps, sigma) - E0
            rel[v].append(abs(dE / M ** 2 - hw_ev * (v + 0.5)) / (hw_ev * (v + 0.5)))
    for v in range(3):
        r = np.array(rel[v]).reshape(len(Ms), 2).max(axis=1)
        slope = np.polyfit(np.log(Ms), np.log(r), 1)[0]
        print("level %d: relative error of E/M^2 vs hbar w (v+1/2) = %s, slope %.2f"
              % (v, np.array2string(r, precision=3), slope))
        chk.ok(slope >= 0.8, "level %d: relative error falls like M^%.2f, expected >= M^0.8" % (v, slope))
        chk.ok(r[0] < 0.2 and r[-1] < 0.02,
               "level %d: relative error %.3g at the turning point, %.3g at 1/8 of it" % (v, r[0], r[-1]))

    # --- scan and grid -------------------------------------------------------
    outdir = os.path.join(tmp, "scan")
    run_displace(["--mode", "4", "--scan", "5", "--Q", "0.1", "--exact"], outdir)
    man, frames = frames_of(outdir)
    Qs = [e["modes"][0]["Q"] for _, e, _, _ in frames]
    chk.close(Qs, [-0.1, -0.05, 0.0, 0.05, 0.1], "scan: 5 amplitudes -A..+A", atol=1e-15)
    chk.ok(np.array_equal(frames[2][2], x), "scan: the middle structure is the input exactly")
    check_manifest("scan", outdir, man)

    outdir = os.path.join(tmp, "grid")
    run_displace(["--modes", "7,8", "--grid", "3", "--Q", "0.1", "--exact", "--single-file"], outdir)
    man, frames = frames_of(outdir)
    chk.ok(len(frames) == 9, "grid 3x3: 9 structures, got %d" % len(frames))
    for name, e, xx, pairs in frames:
        q7, q8 = e["modes"][0]["Q"], e["modes"][1]["Q"]
        chk.close(xx - x, (q7 * D[:, 6] + q8 * D[:, 7]).reshape(-1, 3),
                  "grid (%g, %g): Q7 d7 + Q8 d8" % (q7, q8), atol=1e-12)
    check_manifest("grid", outdir, man)

    # --- refusal to overwrite --------------------------------------------------
    before = snapshot(os.path.join(tmp, "scan"))
    p = run_displace(["--mode", "4", "--pair"], os.path.join(tmp, "scan"), expect=3)
    chk.ok("not empty" in p.stderr_text and "--force" in p.stderr_text,
           "non-empty directory: message says so and names --force: %r" % p.stderr_text.strip())
    chk.ok(snapshot(os.path.join(tmp, "scan")) == before, "non-empty directory: nothing changed")
    run_displace(["--mode", "4", "--scan", "5", "--Q", "0.2", "--exact", "--force"], os.path.join(tmp, "scan"))
    man, frames = frames_of(os.path.join(tmp, "scan"))
    chk.close(frames[4][1]["modes"][0]["Q"], 0.2, "--force replaces the files")

    # --- an injected failure in the middle of an export ---------------------------
    outdir = os.path.join(tmp, "interrupted")
    p = run_displace(["--mode", "4", "--scan", "5", "--Q", "0.1", "--exact"], outdir, expect=3,
                     env={"QV_TEST_FAIL_AFTER_WRITES": "2"})
    left = listing(outdir)
    chk.ok(left == ["mode4-scan-00.xyz", "mode4-scan-01.xyz"],
           "interrupted export: only the 2 finished files remain (no temporary, no manifest): %s" % left)
    for n in left:
        fr = read_xyz(os.path.join(outdir, n))
        chk.ok(len(fr) == 1 and fr[0][1].shape == x.shape, "interrupted export: %s is whole" % n)
    chk.ok("incomplete" in p.stderr_text, "interrupted export: the user is told: %r" % p.stderr_text.strip())

    # --- periodic input keeps its cell ------------------------------------------
    pxyz = os.path.join(tmp, "cell.xyz")
    with open(pxyz, "w") as f:
        f.write("%d\nLattice=\"20 0 0 0 21 0 0 0 22\" pbc=\"T T T\"\n" % len(x))
        for r in x:
            f.write("Ar %r %r %r\n" % tuple(r))
    outdir = os.path.join(tmp, "periodic")
    q.run(["displace", pxyz, "--hessian", hes, "--hessian-units", "eV/A^2", "--project", "translations",
           "--mode", "1", "--Q", "0.1", "-o", outdir])
    fr = read_xyz(os.path.join(outdir, "mode1-plus.xyz"))
    chk.close([float(v) for v in fr[0][2]["Lattice"].split()], [20, 0, 0, 0, 21, 0, 0, 0, 22],
              "periodic: Lattice kept")
    chk.ok(fr[0][2].get("pbc") == "T T T", "periodic: pbc kept")
    p = q.run(["displace", pxyz, "--hessian", hes, "--hessian-units", "eV/A^2", "--project",
               "translations", "--mode", "1", "--Q", "0.1", "--format", "xyz", "-o", outdir + "2"], expect=1)
    chk.ok("extxyz" in p.stderr_text, "periodic + plain xyz refused, says to use extxyz: %r" % p.stderr_text)

    # --- an imaginary mode: escape pair ----------------------------------------------
    # H' = H - (lam_1 + delta) M^1/2 l l^T M^1/2 turns mode 1 (l = its mass-
    # weighted vector) imaginary with eigenvalue -delta, leaving the others.
    L = arr["L"]
    Mh = np.sqrt(np.repeat(masses, 3))
    delta = 0.02
    Hn = H - (lam[0] + delta) * np.outer(Mh * L[:, 0], Mh * L[:, 0])
    nhes = q.write_hessian(os.path.join(tmp, "neg.hess"), Hn)
    nbase = [xyz, "--hessian", nhes, "--hessian-units", "eV/A^2"] + mass_args
    ndoc = q.modes_json(nbase + ["--vectors"])
    narr = q.mode_arrays(ndoc, masses)
    chk.ok(ndoc["modes"][0]["imaginary"], "the altered Hessian has an imaginary mode 1")
    outdir = os.path.join(tmp, "escape")
    p = q.run(["displace"] + nbase + ["--mode", "1", "--escape", "--exact", "-o", outdir])
    man, frames = frames_of(outdir)
    dn = narr["D"][:, 0]
    for sign, (name, e, xx, pairs) in zip((-1, 1), frames):
        disp = np.linalg.norm((xx - x), axis=1)
        chk.close(disp.max(), 0.1, "escape %s: largest atomic displacement 0.1 A" % name, rtol=1e-12)
        Q = e["modes"][0]["Q"]
        chk.close(xx - x, (Q * dn).reshape(-1, 3), "escape %s: along the imaginary mode" % name, atol=1e-12)
        chk.ok(e["modes"][0]["q"] is None and e["modes"][0]["level"] is None
               and "q" not in pairs, "escape %s: q undefined (null, not on the comment line)" % name)
    chk.ok(any("0.1" in n and "saddle" in n for n in man["notes"]), "escape: the note is in the manifest")
    chk.ok("note:" in p.stderr_text, "escape: the note is shown to the user")
    p = q.run(["displace"] + nbase + ["--mode", "1", "--q", "1", "-o", os.path.join(tmp, "x1")], expect=1)
    chk.ok("imaginary" in p.stderr_text and "--Q" in p.stderr_text and "--max-displacement" in p.stderr_text,
           "--q on an imaginary mode: exit 1, says to use --Q or --max-displacement: %r" % p.stderr_text.strip())
    p = q.run(["displace"] + nbase + ["--mode", "1", "--turning-point", "-o", os.path.join(tmp, "x1")], expect=1)
    chk.ok("imaginary" in p.stderr_text, "--turning-point on an imaginary mode: exit 1")
    p = q.run(["displace"] + base + ["--mode", "3", "--escape", "-o", os.path.join(tmp, "x1")], expect=1)
    chk.ok("not imaginary" in p.stderr_text, "--escape on a real mode: exit 1")

    # --- bad input ------------------------------------------------------------------
    bad = [
        (["--mode", "99"], "no mode 99", 1),
        (["--mode", "0"], "from 1", 1),
        (["--mode", "2", "--q", "1", "--Q", "1"], "one amplitude", 1),
        (["--mode", "2", "--scan", "1"], "at least 3", 1),
        (["--mode", "2", "--scan", "4"], "odd", 1),
        (["--mode", "2", "--grid", "3"], "two modes", 1),
        (["--modes", "2,2", "--grid", "3"], "two different modes", 1),
        (["--mode", "2", "--Q", "-1"], "0 or more", 1),
        (["--mode", "2", "--pair", "--scan", "3"], "one kind", 1),
        (["--mode", "2", "--levels", "--Q", "0.1"], "turning", 1),
    ]
    for args, words, code in bad:
        p = q.run(["displace"] + base + args + ["-o", os.path.join(tmp, "bad")], expect=code)
        chk.ok(words in p.stderr_text and "quaver displace --help" in p.stderr_text,
               "%s: exit %d, message %r" % (" ".join(args), code, p.stderr_text.strip()))
        chk.ok(not os.path.exists(os.path.join(tmp, "bad")), "%s: nothing written" % " ".join(args))
    p = q.run(["displace"] + base + ["--mode", "2"], expect=1)
    chk.ok("-o DIR" in p.stderr_text, "no -o: exit 1, asks for -o DIR")
    p = q.run(["displace", os.path.join(tmp, "missing.xyz"), "--hessian", hes, "--hessian-units",
               "eV/A^2", "--mode", "1", "-o", os.path.join(tmp, "bad")], expect=2)
    chk.ok("missing.xyz" in p.stderr_text, "missing geometry: exit 2 naming the file")
    p = q.run(["displace", "--help"])
    chk.ok("Examples" in p.stdout_text and "--escape" in p.stdout_text and "Exit status" in p.stdout_text,
           "--help teaches, with examples and exit codes")

chk.finish("round trip in 5 amplitude units, manifest vs hashlib, energies to O(Q^3), "
           "turning-point levels, scan/grid/escape/periodic, refusal, interrupted export, bad input")
