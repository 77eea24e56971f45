#!/usr/bin/python3
"""test_gas_thermo_cli.py — `quaver thermo MOLECULE` end to end, against an
independent NumPy/SciPy evaluation of the ideal-gas, rigid-rotor,
harmonic-oscillator formulas (McQuarrie, Statistical Mechanics, chs. 5, 6, 8
and 10 — from memory), the soft-mode treatments as their papers define them
(Ribeiro, Marenich, Cramer & Truhlar, J. Phys. Chem. B 115, 14556 (2011);
Grimme, Chem. Eur. J. 18, 9955 (2012): w = 1/(1+(w0/w)^a), B_av = 1e-44
kg m^2 — from memory, as in REFERENCES.md), and the published standard
entropy of argon.

Inputs: the bundled ethanol demo (invented data, data/examples/), and small
invented molecules written here (an argon atom, diatomics with chosen
springs). Only the printed wavenumbers and the input geometry are taken from
Quaver; masses come from python3-periodictable (most abundant isotope, or the
standard atomic weight with --masses average), constants from
scipy.constants (CODATA 2018).

SPDX-License-Identifier: GPL-3.0-or-later
"""
import json
import math
import os
import subprocess
import sys
import tempfile

import numpy as np
import scipy.constants as sc
import periodictable

QUAVER = os.environ.get("QUAVER") or "quaver"
ROOT = os.environ.get("QV_SOURCE_ROOT") or os.path.abspath(
    os.path.join(os.path.dirname(__file__), "..", ".."))
ETHANOL = os.path.join(ROOT, "data", "examples", "ethanol-unconverged", "ethanol.quaver.json")

H, KB, C, NA = sc.h, sc.k, sc.c, sc.N_A
R = KB * NA    # exact in SI 2019 (scipy's sc.R is rounded to 10 digits)
M_U = sc.physical_constants["atomic mass constant"][0]
HARTREE_KJ = sc.physical_constants["Hartree energy"][0] * NA / 1000
# sqrt(eV/(A^2 u)) as a wavenumber in cm^-1 (REFERENCES.md: 521.470898)
CM1 = math.sqrt(sc.e / (1e-20 * M_U)) / (2 * math.pi * C * 100)

failures = []


def check(ok, what):
    if not ok:
        failures.append(what)
        print("FAIL:", what)


def close(got, want, rtol, atol, what):
    check(abs(got - want) <= atol + rtol * abs(want), "%s: got %.12g, want %.12g" % (what, got, want))


def run(args, expect=0):
    p = subprocess.run([QUAVER, "thermo"] + args, capture_output=True, text=True)
    check(p.returncode == expect, "thermo %s: exit %d (want %d): %s" % (" ".join(args), p.returncode,
                                                                      expect, p.stderr[-500:]))
    return p


def thermo_json(args):
    p = run(args + ["-f", "json"])
    return json.loads(p.stdout) if p.returncode == 0 else None


# --- the formulas, written out here -----------------------------------------

def isotope_mass(symbol):
    el = periodictable.elements.symbol(symbol)
    best = max(el, key=lambda iso: iso.abundance)   # the most abundant isotope
    return best.mass


def s_ho(nu, t):
    """harmonic oscillator, J/(K mol): S/R = x/(e^x-1) - ln(1-e^-x)"""
    x = H * C * 100 * nu / (KB * t)
    return R * (x / math.expm1(x) - math.log(-math.expm1(-x)))


def u_ho_thermal(nu, t):
    x = H * C * 100 * nu / (KB * t)
    return R * t * x / math.expm1(x) / 1000     # kJ/mol


def cv_ho(nu, t):
    x = H * C * 100 * nu / (KB * t)
    return R * x * x * math.exp(x) / math.expm1(x) ** 2


def zpe(nu):
    return 0.5 * H * C * 100 * nu * NA / 1000    # kJ/mol


def s_free_rotor(nu, t, b_av=1e-44):
    """Grimme 2012: mu = h/(8 pi^2 nu), mu' = mu B/(mu+B), S = R[1/2 + ln sqrt(8 pi^3 mu' k T/h^2)]"""
    mu = H / (8 * math.pi ** 2 * C * 100 * nu)
    mup = mu * b_av / (mu + b_av)
    return R * (0.5 + 0.5 * math.log(8 * math.pi ** 3 * mup * KB * t / H ** 2))


def grimme_w(nu, w0=100.0, alpha=4.0):
    return 1 / (1 + (w0 / nu) ** alpha)


def s_trans(mass_u, t, p):
    m = mass_u * M_U
    return R * (math.log((2 * math.pi * m * KB * t / H ** 2) ** 1.5 * KB * t / p) + 2.5)


def moments(pos, masses):
    pos = np.asarray(pos, float)
    m = np.asarray(masses, float)
    d = pos - (m[:, None] * pos).sum(0) / m.sum()
    tensor = sum(mi * (np.dot(r, r) * np.eye(3) - np.outer(r, r)) for mi, r in zip(m, d))
    return np.linalg.eigvalsh(tensor)   # u A^2, ascending


def theta(i_ua2):
    return H ** 2 / (8 * math.pi ** 2 * i_ua2 * M_U * 1e-20 * KB)


def reference(pos, masses, nus, t, p, sigma, soft="none", cutoff=100.0, scale=1.0, zscale=None):
    """totals in kJ/mol and J/(K mol) for the vibrations nus (cm^-1, real)"""
    mass = sum(masses)
    out = {}
    st = s_trans(mass, t, p)
    ii = moments(pos, masses)
    if len(masses) == 1:
        sr, ur, cvr = 0.0, 0.0, 0.0
    elif ii[0] < 1e-10 * ii[2]:
        sr = R * (math.log(t / (sigma * theta(0.5 * (ii[1] + ii[2])))) + 1)
        ur, cvr = R * t / 1000, R
    else:
        th = [theta(i) for i in ii]
        sr = R * (math.log(math.sqrt(math.pi) / sigma * math.sqrt(t ** 3 / (th[0] * th[1] * th[2]))) + 1.5)
        ur, cvr = 1.5 * R * t / 1000, 1.5 * R
    zs = zscale if zscale else scale
    sv = uv = cvv = z = 0.0
    for nu0 in nus:
        nu = nu0 * scale
        nt = max(nu, cutoff) if soft == "raise" else nu
        s = s_ho(nt, t)
        if soft == "quasi-rrho":
            w = grimme_w(nu)
            s = w * s + (1 - w) * s_free_rotor(nu, t)
        z += zpe(nu0 * zs)
        sv += s
        uv += zpe(nu0 * zs) + u_ho_thermal(nt, t)
        cvv += cv_ho(nt, t)
    out["S_trans"], out["S_rot"], out["S_vib"] = st, sr, sv
    out["ZPE"] = z
    out["U"] = 1.5 * R * t / 1000 + ur + uv
    out["H"] = out["U"] + R * t / 1000
    out["S"] = st + sr + sv
    out["Cv"] = 1.5 * R + cvr + cvv
    out["G"] = out["H"] - t * out["S"] / 1000
    return out


def compare_totals(got, ref, what, rtol=1e-8):
    tot = got["total"]
    for key in ("ZPE", "U", "H", "S", "Cv", "G"):
        close(tot[key], ref[key], rtol, 1e-9, "%s: total %s" % (what, key))
    close(got["translation"]["S"], ref["S_trans"], rtol, 1e-9, what + ": S_trans")
    close(got["rotation"]["S"], ref["S_rot"], rtol, 1e-9, what + ": S_rot")
    close(got["vibration"]["S"], ref["S_vib"], rtol, 1e-9, what + ": S_vib")


# --- ethanol (invented demo data) -------------------------------------------

def ethanol_checks():
    bundle = json.load(open(ETHANOL))
    atoms = bundle["structure"]["atoms"]
    pos = [a["position"] for a in atoms]
    masses = [isotope_mass(a["element"]) for a in atoms]
    t = 298.15
    cases = [
        ([], dict()),
        (["--soft-modes", "raise"], dict(soft="raise")),
        (["--soft-modes", "raise", "--cutoff", "300"], dict(soft="raise", cutoff=300.0)),
        (["--soft-modes", "quasi-rrho"], dict(soft="quasi-rrho")),
        (["--scale", "0.97"], dict(scale=0.97)),
        (["--scale", "0.97", "--zpe-scale", "0.985"], dict(scale=0.97, zscale=0.985)),
    ]
    first = None
    for extra, kw in cases:
        got = thermo_json([ETHANOL, "--per-mode"] + extra)
        if got is None:
            continue
        first = first or got
        modes = got["modes"]
        check(len(modes) == 21, "ethanol: 21 modes (3N-6), got %d" % len(modes))
        imag = [m for m in modes if m["imaginary"]]
        check(len(imag) == 1 and not imag[0]["used"] and got["imaginary_left_out"] == 1,
              "ethanol: the imaginary torsion is left out and counted")
        nus = [m["wavenumber"] for m in modes if m["used"]]
        check(got["symmetry_number"] == 1, "ethanol: C1, sigma 1")
        ref = reference(pos, masses, nus, t, 1e5, 1, **kw)
        compare_totals(got["temperatures"][0], ref, "ethanol %s" % " ".join(extra))
        close(got["mass"], sum(masses), 0, 1e-5, "ethanol mass")
        ii = moments(pos, masses)
        for k in range(3):
            close(got["moments"][k], ii[k], 1e-6, 1e-6, "ethanol moment %d" % k)
        # per-mode rows: each vibration's S, ZPE, Cv and G
        scale = kw.get("scale", 1.0)
        for m in modes:
            if not m["used"]:
                continue
            nu = m["wavenumber"] * scale
            nt = max(nu, kw.get("cutoff", 100.0)) if kw.get("soft") == "raise" else nu
            s = s_ho(nt, t)
            if kw.get("soft") == "quasi-rrho":
                s = grimme_w(nu) * s + (1 - grimme_w(nu)) * s_free_rotor(nu, t)
            z = zpe(m["wavenumber"] * (kw.get("zscale") or scale))
            u = z + u_ho_thermal(nt, t)
            close(m["S"], s, 1e-8, 1e-10, "ethanol mode %d S" % m["index"])
            close(m["ZPE"], z, 1e-9, 1e-10, "ethanol mode %d ZPE" % m["index"])
            close(m["Cv"], cv_ho(nt, t), 1e-8, 1e-10, "ethanol mode %d Cv" % m["index"])
            close(m["G"], u - t * s / 1000, 1e-8, 1e-9, "ethanol mode %d G" % m["index"])
        share = sum(m.get("S_fraction", 0) for m in modes)
        close(share, 1.0, 1e-12, 0, "ethanol: S shares add up to 1")
    # the wavenumbers thermo prints are those `quaver modes` prints
    p = subprocess.run([QUAVER, "modes", ETHANOL, "-f", "json"], capture_output=True, text=True)
    if p.returncode == 0 and first:
        ws = [m["wavenumber"] * (-1 if m["imaginary"] else 1) for m in json.loads(p.stdout)["modes"]]
        got_ws = [m["wavenumber"] for m in first["modes"]]
        check(np.allclose(np.abs(ws), np.abs(got_ws), rtol=1e-12, atol=1e-9),
              "thermo and modes print the same wavenumbers")

    # standard states, pressure, temperature, electronic energy
    nus = [m["wavenumber"] for m in first["modes"] if m["used"]] if first else []
    for extra, t, p in ((["--standard-state", "1atm"], 298.15, 101325.0),
                        (["--pressure", "2.5 bar", "-T", "500"], 500.0, 2.5e5),
                        (["--pressure", "300kPa", "-T", "400"], 400.0, 3e5),
                        (["--standard-state", "1M", "-T", "310"], 310.0, 1000 * R * 310.0)):
        got = thermo_json([ETHANOL] + extra)
        if got:
            ref = reference(pos, masses, nus, t, p, 1)
            compare_totals(got["temperatures"][0], ref, "ethanol %s" % " ".join(extra))
            close(got["temperatures"][0]["pressure"], p, 1e-12, 0, "pressure used")
    got = thermo_json([ETHANOL, "--electronic-energy", "-154.75 hartree"])
    if got:
        tt = got["temperatures"][0]
        close(tt["E_el+G"], -154.75 + tt["total"]["G"] / HARTREE_KJ, 1e-13, 1e-10, "E_el + G")
        close(tt["E_el+ZPE"], -154.75 + tt["total"]["ZPE"] / HARTREE_KJ, 1e-13, 1e-10, "E_el + ZPE")
    got2 = thermo_json([ETHANOL, "--electronic-energy", "%.12f kJ/mol" % (-154.75 * HARTREE_KJ)])
    if got and got2:
        close(got2["temperatures"][0]["E_el+G"], got["temperatures"][0]["E_el+G"], 1e-12, 0,
              "electronic energy in kJ/mol")

    # a sweep: JSON rows against the single-temperature results and the CSV
    got = thermo_json([ETHANOL, "--t-min", "100", "--t-max", "1000", "--t-step", "100"])
    if got:
        ts = [row["T"] for row in got["temperatures"]]
        check(ts == [100.0 * k for k in range(1, 11)], "sweep temperatures %s" % ts)
        for row in got["temperatures"][::3]:
            ref = reference(pos, masses, nus, row["T"], 1e5, 1)
            compare_totals(row, ref, "sweep T=%g" % row["T"])
        p = run([ETHANOL, "--t-min", "100", "--t-max", "1000", "--t-step", "100", "-f", "csv"])
        lines = p.stdout.strip().splitlines()
        header = lines[0].split(",")
        check(header[:3] == ["T_K", "p_Pa", "ZPE_kJ/mol"] and len(lines) == 11, "sweep csv shape")
        col = {h: i for i, h in enumerate(header)}
        for line, row in zip(lines[1:], got["temperatures"]):
            v = [float(x) for x in line.split(",")]
            close(v[col["G_kJ/mol"]], row["total"]["G"], 0, 2e-6, "csv G at %g" % row["T"])
            close(v[col["S_J/(K.mol)"]], row["total"]["S"], 0, 2e-6, "csv S at %g" % row["T"])


# --- invented small molecules -----------------------------------------------

def write(path, text):
    with open(path, "w") as f:
        f.write(text)


def diatomic(tmp, name, el1, el2, d, nu, masses=None):
    """two atoms on z with a spring of wavenumber nu (cm^-1) along the bond"""
    m1 = masses[0] if masses else isotope_mass(el1)
    m2 = masses[1] if masses else isotope_mass(el2)
    lam = (nu / CM1) ** 2                      # eV/(A^2 u)
    k = lam / (1 / m1 + 1 / m2)                # eV/A^2
    xyz = os.path.join(tmp, name + ".xyz")
    hess = os.path.join(tmp, name + ".hess")
    write(xyz, "2\ninvented diatomic for the thermochemistry test\n%s 0 0 0\n%s 0 0 %.10f\n" % (el1, el2, d))
    hm = np.zeros((6, 6))
    hm[2, 2] = hm[5, 5] = k
    hm[2, 5] = hm[5, 2] = -k
    write(hess, "\n".join(" ".join("%.15g" % x for x in row) for row in hm) + "\n")
    return xyz, hess, (m1, m2)


def small_molecule_checks(tmp):
    t = 298.15
    # argon: Sackur-Tetrode and the published S(298.15 K, 1 bar) = 154.846
    # J/(K mol) (CODATA Key Values for Thermodynamics, Cox, Wagman & Medvedev
    # 1989, and NIST-JANAF — from memory), with the standard atomic weight
    ar = os.path.join(tmp, "ar.xyz")
    ar_h = os.path.join(tmp, "ar.hess")
    write(ar, "1\ninvented: one argon atom\nAr 0 0 0\n")
    write(ar_h, "0 0 0\n0 0 0\n0 0 0\n")
    got = thermo_json([ar, "-H", ar_h, "-u", "eV/A^2", "--masses", "average"])
    if got:
        tt = got["temperatures"][0]
        # periodictable has 39.948; CIAAW's abridged value since 2017 is
        # 39.95 (from memory): either is a standard atomic weight of argon
        m_ar = got["mass"]
        close(m_ar, periodictable.elements.symbol("Ar").mass, 0, 0.005, "argon: standard atomic weight")
        close(tt["total"]["S"], s_trans(m_ar, t, 1e5), 1e-9, 0, "argon: Sackur-Tetrode")
        close(tt["total"]["S"], 154.846, 0, 0.003, "argon: published standard entropy")
        close(tt["total"]["Cv"], 1.5 * R, 1e-12, 0, "argon: Cv = 3R/2")
        check(got["rotor"] == "atom" and got["vibrations_summed"] == 0, "argon: an atom")

    # a heteronuclear and a homonuclear diatomic: linear rotor, sigma 1 and 2
    # found from C_inf_v and D_inf_h, and the R ln 2 between them
    co, co_h, m_co = diatomic(tmp, "co", "C", "O", 1.128, 2143.0)
    got = thermo_json([co, "-H", co_h, "-u", "eV/A^2", "--per-mode"])
    if got:
        nu = got["modes"][0]["wavenumber"]
        close(nu, 2143.0, 1e-9, 0, "CO-like: the stretch as built")
        check(got["rotor"] == "linear" and got["symmetry_number"] == 1, "CO-like: linear, sigma 1")
        ref = reference([[0, 0, 0], [0, 0, 1.128]], m_co, [nu], t, 1e5, 1)
        compare_totals(got["temperatures"][0], ref, "CO-like")
        # stiff mode: both soft-mode treatments reduce to the harmonic result
        for soft in ("raise", "quasi-rrho"):
            g2 = thermo_json([co, "-H", co_h, "-u", "eV/A^2", "--soft-modes", soft])
            if g2:
                for key in ("S", "G", "H", "Cv"):
                    close(g2["temperatures"][0]["total"][key], got["temperatures"][0]["total"][key],
                          1e-7, 1e-9, "stiff mode, %s: %s unchanged" % (soft, key))
    n2, n2_h, m_n2 = diatomic(tmp, "n2", "N", "N", 1.0977, 2358.6)
    g_auto = thermo_json([n2, "-H", n2_h, "-u", "eV/A^2"])
    g_one = thermo_json([n2, "-H", n2_h, "-u", "eV/A^2", "--symmetry-number", "1"])
    if g_auto and g_one:
        check(g_auto["symmetry_number"] == 2 and "Dinfh" in g_auto["symmetry_number_from"],
              "N2-like: sigma 2 from D_inf_h (%s)" % g_auto["symmetry_number_from"])
        close(g_one["temperatures"][0]["rotation"]["S"] - g_auto["temperatures"][0]["rotation"]["S"],
              R * math.log(2), 1e-9, 0, "sigma 2 lowers S_rot by R ln 2")
        ii = 0.5 * m_n2[0] * 1.0977 ** 2
        close(g_one["temperatures"][0]["rotation"]["S"], R * (math.log(t / theta(ii)) + 1), 1e-9, 0,
              "N2-like: S_rot = R(ln(T/Theta) + 1)")
        close(g_one["temperatures"][0]["rotation"]["U"], R * t / 1000, 1e-12, 0, "linear U_rot = RT")

    # a 50 cm^-1 mode at 298.15 K under each treatment, and Grimme's weight
    # 0.5 at 100 cm^-1, 0.0588 at 50 cm^-1 (alpha 4)
    soft, soft_h, _ = diatomic(tmp, "soft", "Xe", "Xe", 4.4, 50.0)
    results = {}
    for how in ("none", "raise", "quasi-rrho"):
        got = thermo_json([soft, "-H", soft_h, "-u", "eV/A^2", "--per-mode", "--soft-modes", how])
        if got:
            results[how] = got["modes"][0]
    if len(results) == 3:
        nu = results["none"]["wavenumber"]
        close(nu, 50.0, 1e-7, 0, "the soft mode as built")
        close(results["none"]["S"], s_ho(nu, t), 1e-9, 0, "50 cm^-1, harmonic S")
        close(results["raise"]["S"], s_ho(100.0, t), 1e-9, 0, "50 cm^-1, raised to 100: S")
        close(results["raise"]["ZPE"], results["none"]["ZPE"], 0, 0, "raise keeps the ZPE")
        w = grimme_w(nu)
        close(results["quasi-rrho"]["weight"], 0.0588, 0, 5e-5, "Grimme weight at 50 cm^-1")
        close(results["quasi-rrho"]["S"], w * s_ho(nu, t) + (1 - w) * s_free_rotor(nu, t), 1e-9, 0,
              "50 cm^-1, quasi-RRHO S")
        close(results["quasi-rrho"]["U"], results["none"]["U"], 0, 0, "quasi-rrho keeps U")
        print("S(50 cm^-1, 298.15 K): harmonic %.4f, raise %.4f, quasi-rrho %.4f J/(K mol)"
              % (results["none"]["S"], results["raise"]["S"], results["quasi-rrho"]["S"]))
    hund, hund_h, _ = diatomic(tmp, "w100", "Xe", "Xe", 4.4, 100.0)
    got = thermo_json([hund, "-H", hund_h, "-u", "eV/A^2", "--per-mode", "--soft-modes", "quasi-rrho"])
    if got:
        close(got["modes"][0]["weight"], 0.5, 0, 1e-7, "Grimme weight at 100 cm^-1 (the mode is 100 to 1e-9)")
    got = thermo_json([hund, "-H", hund_h, "-u", "eV/A^2", "--per-mode", "--soft-modes", "quasi-rrho",
                       "--omega0", "200", "--alpha", "2", "--b-av", "2e-44"])
    if got:
        nu = got["modes"][0]["wavenumber"]
        w = grimme_w(nu, 200.0, 2.0)
        close(got["modes"][0]["weight"], w, 1e-12, 0, "weight with omega0 200, alpha 2")
        close(got["modes"][0]["S"], w * s_ho(nu, t) + (1 - w) * s_free_rotor(nu, t, 2e-44), 1e-9, 0,
              "quasi-RRHO S with omega0 200, alpha 2, B_av 2e-44")


def precomputed_checks(tmp):
    """A bundle with precomputed modes (invented water-like triatomic): nine
    modes, six of them near-zero rigid-body motion left out; sigma 2 from C2v."""
    pos = [[0.0, 0.0, 0.1173], [0.0, 0.7572, -0.4692], [0.0, -0.7572, -0.4692]]
    ws = [0.3, -0.8, 1.1, 2.0, -4.5, 6.0, 1595.0, 3657.0, 3756.0]
    vecs = []
    rng = np.random.default_rng(7)
    for k in range(9):
        vecs.append(list(rng.normal(size=9)))
    bundle = {"format": "quaver-bundle", "version": 1,
              "title": "invented water-like triatomic with precomputed modes",
              "description": "Invented data for the thermochemistry test, not a calculation.",
              "structure": {"atoms": [{"element": e, "position": p} for e, p in zip("OHH", pos)]},
              "masses": "isotopic",
              "modes": {"wavenumbers": ws, "displacements": vecs}}
    path = os.path.join(tmp, "water-modes.quaver.json")
    write(path, json.dumps(bundle))
    got = thermo_json([path, "-T", "400"])
    if got:
        check(got["rigid_left_out"] == 6 and got["vibrations_summed"] == 3,
              "precomputed: 6 rigid left out, 3 summed (%d, %d)" % (got["rigid_left_out"], got["vibrations_summed"]))
        check(got["symmetry_number"] == 2, "water-like: sigma 2 from C2v")
        masses = [isotope_mass(e) for e in "OHH"]
        ref = reference(pos, masses, [1595.0, 3657.0, 3756.0], 400.0, 1e5, 2)
        compare_totals(got["temperatures"][0], ref, "water-like, precomputed modes")
        p = run([path])
        check("rigid-body motion" in p.stdout, "precomputed: the note on rigid-body modes")


def format_checks():
    """The text and CSV tables say what the JSON says."""
    got = thermo_json([ETHANOL, "--per-mode", "--soft-modes", "quasi-rrho"])
    if not got:
        return
    text = run([ETHANOL, "--per-mode", "--soft-modes", "quasi-rrho"]).stdout.splitlines()
    rows = {l.split()[0]: [float(x) for x in l.split()[1:]] for l in text
            if l.split() and l.split()[0] in ("translation", "rotation", "vibration", "electronic", "total")}
    for term in ("translation", "rotation", "vibration", "total"):
        for c, key in enumerate(("ZPE", "U", "H", "S", "Cv", "G")):
            close(rows[term][c], got["temperatures"][0][term][key], 0, 2e-6, "text %s %s" % (term, key))
    csv = run([ETHANOL, "--per-mode", "--soft-modes", "quasi-rrho", "-f", "csv"]).stdout.splitlines()
    header = csv[0].split(",")
    check(header[:3] == ["mode", "wavenumber_cm-1", "thermal_cm-1"], "per-mode csv header %s" % header[:3])
    col = {h: i for i, h in enumerate(header)}
    for line, m in zip(csv[1:], got["modes"]):
        v = line.split(",")
        check(int(v[0]) == m["index"], "csv mode index")
        if m["used"]:
            close(float(v[col["S_J/(K.mol)"]]), m["S"], 0, 2e-6, "csv mode %d S" % m["index"])
            close(float(v[col["G_kJ/mol"]]), m["G"], 0, 2e-6, "csv mode %d G" % m["index"])
            close(float(v[col["weight"]]), m["weight"], 0, 1e-4, "csv mode %d weight" % m["index"])
        else:
            check(v[1].endswith("i") and v[2] == "", "csv: the imaginary mode is marked and empty")
    terms = run([ETHANOL, "-f", "csv"]).stdout.splitlines()
    check(terms[0].startswith("term,T_K,p_Pa,ZPE_kJ/mol") and len(terms) == 6, "term csv shape")


def error_checks(tmp):
    out = os.path.join(tmp, "out.txt")
    write(out, "keep me\n")
    for args, code, words in (
        ([ETHANOL, "--pressure", "2"], 1, "unit"),
        ([ETHANOL, "--soft-modes", "grimme"], 1, "quasi-rrho"),
        ([ETHANOL, "--cutoff", "50"], 1, "raise"),
        ([ETHANOL, "--per-mode", "--t-max", "500"], 1, "one temperature"),
        ([ETHANOL, "-T", "0"], 1, "above 0 K"),
        ([ETHANOL, "--project", "none"], 1, "full"),
        ([ETHANOL, "--pressure", "1bar", "--standard-state", "1atm"], 1, "one of them"),
        ([ETHANOL, "--electronic-energy", "-154.2"], 1, "unit"),
        ([ETHANOL, "--symmetry-number", "0"], 1, "symmetry-number"),
        ([ETHANOL, "--mesh", "4x4x4"], 1, "gas-phase"),
        ([os.path.join(tmp, "missing.quaver.json"), "--molecule"], 2, "missing"),
        ([ETHANOL, "-o", out], 3, "--force"),
    ):
        p = run(args, code)
        check(words in p.stderr, "%s: message should say '%s': %s" % (" ".join(args), words, p.stderr[-300:]))
    check(open(out).read() == "keep me\n", "an existing output is not replaced without --force")
    run([ETHANOL, "-o", out, "--force"])
    check(open(out).read().startswith("# quaver thermo (molecule)"), "--force replaces the output")
    p = run([ETHANOL])
    check("WARNING" in p.stderr and "imaginary" in p.stderr, "the imaginary mode is warned about loudly")
    p = run(["--molecule", "--help"])
    for words in ("Ribeiro", "Grimme", "Sackur-Tetrode", "Exit status", "approximation", "Examples"):
        check(words in p.stdout, "molecule --help mentions %s" % words)
    p = run(["--help"])
    check("--molecule --help" in p.stdout, "crystal --help points at the molecule's")


def main():
    with tempfile.TemporaryDirectory() as tmp:
        ethanol_checks()
        small_molecule_checks(tmp)
        precomputed_checks(tmp)
        format_checks()
        error_checks(tmp)
    if failures:
        print("%d failure(s)" % len(failures))
        sys.exit(1)
    print("all gas-phase thermochemistry checks passed")


main()
