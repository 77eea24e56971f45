#!/usr/bin/python3
"""The JSON mode table of `quaver modes`, parsed back and recomputed.

Inputs: an invented 8-atom spring molecule with one negative spring (so it
has an imaginary mode), run with --vectors at --level 0, 1, 5 and
--temperature 0, 300, 3000; the example bundle
data/examples/ethanol-unconverged/ethanol.quaver.json; and --demo.

Checked against the CLI spec and independent formulas:
- every key of the spec present with the right type; units strings;
- modes sorted by eigenvalue, imaginary first with negative wavenumbers,
  wavenumber = sign(l) sqrt|l| x 521.47... cm^-1 (CODATA 2018 via
  scipy.constants), index and max_atom counting from 1;
- participation p_a = m_a |d_a|^2 (masses from periodictable for our own
  input) sums to 1 within 1e-12; collectivity = exp(-sum p ln p)/N;
- reduced mass = 1/sum(l^2/m) = 1/sum d^2 (u); force constant = mu omega^2 in
  mdyn/A (1 mdyn/A = 6.241509 eV/A^2, recomputed from scipy.constants), and
  negative for imaginary modes;
- turning point of level v: Q = sqrt((2v+1) hbar/omega), 1/2 l Q^2 = E_v =
  hbar omega (v + 1/2) (Griffiths, Introduction to Quantum Mechanics,
  harmonic oscillator), max_displacement = Q max_a |d_a|; null for
  imaginary modes;
- thermal Q_rms^2 = hbar/(2 omega) coth(hbar omega / 2 k T) (McQuarrie,
  Statistical Mechanics), T = 0 (coth -> 1), 300, 3000 K;
- csv and markdown outputs: one row per mode, parse with the csv module;
  text output: units in the header and the imaginary mode marked "i".
Tolerances: relative 1e-9 on recomputed quantities (the JSON carries the
numbers to full double precision or this fails visibly), 1e-12 absolute on
sums of participations.
"""
import csv
import io
import json
import math
import os
import re
import numpy as np
import scipy.constants as sc

import sys
sys.dont_write_bytecode = True      # keep the source tree clean
import qvtest as q  # noqa: E402

chk = q.Checker("json")
HB = sc.hbar
KB = sc.k
QUNIT = q.M_U * q.ANG ** 2          # 1 u A^2 in kg m^2
NUM = (int, float)


def hill_formula(symbols):
    """Hill system (common practice): C first, then H, then the rest
    alphabetically; without carbon, everything alphabetically."""
    counts = {}
    for s in symbols:
        counts[s] = counts.get(s, 0) + 1
    order = sorted(counts)
    if "C" in counts:
        order = ["C"] + (["H"] if "H" in counts else []) + [s for s in order if s not in ("C", "H")]
    return "".join(s + (str(counts[s]) if counts[s] > 1 else "") for s in order)


def is_num(v):
    return isinstance(v, NUM) and not isinstance(v, bool)


def check_types(label, doc, vectors, bundle_modes=False):
    t = chk.ok
    t(isinstance(doc.get("program"), str) and doc["program"].startswith("quaver "),
      "%s: program %r" % (label, doc.get("program")))
    units = doc.get("units", {})
    want = {"wavenumber": None, "reduced_mass": "u", "force_constant": "mdyn/A", "Q": "u^1/2 A",
            "displacement": "A", "energy": "eV", "temperature": "K"}
    for k, v in want.items():
        t(k in units and (v is None or units[k] == v), "%s: units.%s = %r, expected %r"
          % (label, k, units.get(k), v))
    t(isinstance(doc.get("natoms"), int), "%s: natoms int" % label)
    t(isinstance(doc.get("formula"), str), "%s: formula str" % label)
    t(doc.get("projection") in ("full", "translations", "none"), "%s: projection %r"
      % (label, doc.get("projection")))
    t(isinstance(doc.get("linear"), bool), "%s: linear bool" % label)
    t(doc.get("masses") in ("isotopic", "average"), "%s: masses %r" % (label, doc.get("masses")))
    if not bundle_modes:
        h = doc.get("hessian")
        t(isinstance(h, dict) and isinstance(h.get("source"), str)
          and h.get("layout") in ("full", "lower", "upper", "npy", "inline")
          and isinstance(h.get("units"), str) and is_num(h.get("asymmetry")),
          "%s: hessian block %r" % (label, h))
    rr = doc.get("rigid_body_residuals")
    t(isinstance(rr, list) and all(is_num(v) for v in rr), "%s: rigid_body_residuals list" % label)
    rb = doc.get("rigid_body", {})
    t(isinstance(rb.get("translations"), list) and len(rb["translations"]) == 3
      and isinstance(rb.get("rotations"), list) and len(rb["rotations"]) <= 3,
      "%s: rigid_body %r" % (label, rb))
    t(isinstance(doc.get("level"), int), "%s: level int" % label)
    t(is_num(doc.get("temperature")), "%s: temperature number" % label)
    t(isinstance(doc.get("n_vibrations"), int), "%s: n_vibrations int" % label)
    t("lowest" in doc and (doc["lowest"] is None or isinstance(doc["lowest"], int)),
      "%s: lowest int or null" % label)
    modes = doc.get("modes")
    t(isinstance(modes, list) and len(modes) > 0, "%s: modes list" % label)
    n = doc.get("natoms", 0)
    for m in modes or []:
        ok = (isinstance(m.get("index"), int) and is_num(m.get("wavenumber"))
              and isinstance(m.get("imaginary"), bool) and is_num(m.get("eigenvalue"))
              and is_num(m.get("reduced_mass")) and is_num(m.get("force_constant"))
              and is_num(m.get("collectivity"))
              and isinstance(m.get("participation"), list) and len(m["participation"]) == n
              and isinstance(m.get("turning_point"), dict) and isinstance(m.get("thermal"), dict))
        tp = m.get("turning_point", {})
        th = m.get("thermal", {})
        ok = ok and all(k in tp for k in ("v", "Q", "max_displacement", "max_atom", "energy"))
        ok = ok and all(k in th for k in ("T", "Q_rms", "max_rms_displacement", "max_atom"))
        if vectors:
            ok = ok and isinstance(m.get("displacement"), list) and len(m["displacement"]) == 3 * n
        else:
            ok = ok and "displacement" not in m
        if not t(ok, "%s: mode %r has the keys and types of the spec: %s"
                 % (label, m.get("index"), json.dumps({k: v for k, v in m.items()
                                                       if k not in ("participation", "displacement")}))):
            break


def check_values(label, doc, masses=None, level=None, temperature=None):
    """Recomputes every derived number of every mode.  With @masses (our own
    inputs) also participation from the displacement vectors."""
    modes = doc["modes"]
    n = doc["natoms"]
    lam = np.array([m["eigenvalue"] for m in modes])
    chk.ok(np.all(np.diff(lam) >= 0), "%s: modes sorted by eigenvalue" % label)
    chk.ok([m["index"] for m in modes] == list(range(1, len(modes) + 1)),
           "%s: index counts 1..%d" % (label, len(modes)))
    nu = np.array([m["wavenumber"] for m in modes])
    if doc["units"]["wavenumber"] == "cm^-1":
        chk.close(nu, q.to_wavenumber(lam), "%s: wavenumber = sign(l) sqrt|l| x %.6f" % (label, q.CM1),
                  rtol=1e-9)
    chk.ok([m["imaginary"] for m in modes] == list(lam < 0) and np.all((nu < 0) == (lam < 0)),
           "%s: imaginary flag and negative wavenumber follow the eigenvalue sign" % label)
    v = doc["level"] if level is None else level
    T = doc["temperature"] if temperature is None else temperature
    chk.ok(doc["level"] == v and doc["temperature"] == T, "%s: level %r temperature %r, expected %r %r"
           % (label, doc["level"], doc["temperature"], v, T))
    for m in modes:
        k = m["index"]
        tag = "%s mode %d" % (label, k)
        p = np.array(m["participation"], dtype=float)
        chk.ok(abs(p.sum() - 1.0) < 1e-12, "%s: participation sums to %.17g" % (tag, p.sum()))
        pp = p[p > 0]
        chk.close(m["collectivity"], math.exp(-float(np.sum(pp * np.log(pp)))) / n,
                  "%s: collectivity = exp(-sum p ln p)/N" % tag, rtol=1e-9)
        lmb = m["eigenvalue"]
        mu = m["reduced_mass"]
        chk.close(m["force_constant"], mu * lmb / q.MDYN_PER_A,
                  "%s: force_constant = mu omega^2 in mdyn/A" % tag, rtol=1e-9)
        tp, th = m["turning_point"], m["thermal"]
        chk.ok(tp["v"] == v and th["T"] == T, "%s: turning_point.v %r, thermal.T %r" % (tag, tp["v"], th["T"]))
        if "displacement" in m:
            d = np.array(m["displacement"], dtype=float).reshape(n, 3)
            chk.close(mu, 1.0 / np.sum(d ** 2), "%s: reduced_mass = 1/sum(l^2/m) = 1/sum d^2" % tag,
                      rtol=1e-9)
            da = np.linalg.norm(d, axis=1)
            if masses is not None:
                chk.close(p, masses * da ** 2, "%s: participation = m_a |d_a|^2" % tag, rtol=1e-8,
                          atol=1e-12)
        if lmb < 0:
            chk.ok(all(tp[key] is None for key in ("Q", "max_displacement", "max_atom", "energy"))
                   and all(th[key] is None for key in ("Q_rms", "max_rms_displacement", "max_atom")),
                   "%s (imaginary): turning point and thermal values are null: %r %r" % (tag, tp, th))
            chk.ok(m["force_constant"] < 0, "%s (imaginary): negative force constant" % tag)
            continue
        omega = math.sqrt(lmb) * q.OMEGA_UNIT                       # rad/s
        # Griffiths: E_v = hbar omega (v + 1/2); turning point where 1/2 l Q^2 = E_v
        e_v = HB * omega * (v + 0.5) / sc.e                         # eV
        q_tp = math.sqrt((2 * v + 1) * HB / omega / QUNIT)          # u^1/2 A
        if tp["Q"] is None or tp["energy"] is None:
            chk.ok(False, "%s: turning point missing for a real mode: %r" % (tag, tp))
            continue
        chk.close(tp["energy"], e_v, "%s: E_v = hbar omega (v+1/2), v=%d" % (tag, v), rtol=1e-9)
        chk.close(tp["Q"], q_tp, "%s: Q_tp = sqrt((2v+1) hbar/omega)" % tag, rtol=1e-9)
        chk.close(0.5 * lmb * tp["Q"] ** 2, tp["energy"], "%s: 1/2 l Q^2 = E_v" % tag, rtol=1e-9)
        # McQuarrie: <Q^2> = hbar/(2 omega) coth(hbar omega / 2kT); T = 0: coth -> 1
        x = HB * omega / (2 * KB * T) if T > 0 else math.inf
        coth = 1.0 if x > 350 else 1.0 / math.tanh(x)
        q_rms = math.sqrt(HB / (2 * omega) * coth / QUNIT)
        chk.close(th["Q_rms"], q_rms, "%s: thermal Q_rms at %g K" % (tag, T), rtol=1e-9)
        if "displacement" in m:
            a = int(np.argmax(da))
            chk.close(tp["max_displacement"], tp["Q"] * da[a], "%s: max_displacement = Q max|d_a|" % tag,
                      rtol=1e-9)
            chk.ok(tp["max_atom"] == a + 1 and th["max_atom"] == a + 1,
                   "%s: max_atom %r / %r, expected %d (from 1)" % (tag, tp["max_atom"], th["max_atom"], a + 1))
            chk.close(th["max_rms_displacement"], th["Q_rms"] * da[a],
                      "%s: max_rms_displacement = Q_rms max|d_a|" % tag, rtol=1e-9)


def parse_number(cell):
    c = cell.strip().replace("−", "-")
    if c.endswith("i"):
        return -float(c[:-1])
    return float(c)


def check_tables(label, args, doc):
    modes = doc["modes"]
    nu = [m["wavenumber"] for m in modes]
    # csv
    p = q.run(["modes"] + args + ["--format", "csv"])
    rows = [r for r in csv.reader(io.StringIO(p.stdout_text)) if r and not r[0].startswith("#")]
    chk.ok(len(rows) == len(modes) + 1, "%s csv: %d rows, expected a header and %d modes"
           % (label, len(rows), len(modes)))
    col = [i for i, h in enumerate(rows[0]) if "wavenumber" in h.lower() or "cm" in h.lower()] if rows else []
    chk.ok(bool(col), "%s csv: a wavenumber column in the header %r" % (label, rows[0] if rows else None))
    if col and len(rows) == len(modes) + 1:
        got = [parse_number(r[col[0]]) for r in rows[1:]]
        chk.close(got, nu, "%s csv: wavenumber column vs JSON" % label, rtol=1e-6, atol=0.006)
        # the other numeric columns, recognised by name, vs the JSON values
        # at the printed precision (relative 1e-6 or the last printed digit)
        fields = (("reduced_mass", lambda m: m["reduced_mass"]),
                  ("force_constant", lambda m: m["force_constant"]),
                  ("turning_point_q", lambda m: m["turning_point"]["Q"]),
                  ("max_displacement", lambda m: m["turning_point"]["max_displacement"]),
                  ("thermal_q_rms", lambda m: m["thermal"]["Q_rms"]),
                  ("thermal_max_rms", lambda m: m["thermal"]["max_rms_displacement"]),
                  ("collectivity", lambda m: m["collectivity"]))
        header = [h.lower() for h in rows[0]]
        matched = 0
        for key, get in fields:
            cols = [i for i, h in enumerate(header) if h.startswith(key)]
            if not cols:
                continue
            matched += 1
            for r, m in zip(rows[1:], modes):
                cell, want = r[cols[0]].strip(), get(m)
                if want is None:
                    chk.ok(cell == "", "%s csv: %s of mode %d empty for null, got %r"
                           % (label, key, m["index"], cell))
                    continue
                decimals = len(cell.split(".")[1]) if "." in cell else 0
                chk.close(float(cell), want, "%s csv: %s of mode %d vs JSON" % (label, key, m["index"]),
                          rtol=1e-6, atol=0.51 * 10.0 ** -decimals)
        chk.ok(matched >= 5, "%s csv: %d of the table's numeric columns recognised by name (%s)"
               % (label, matched, rows[0]))
    # markdown
    p = q.run(["modes"] + args + ["--format", "markdown"])
    lines = [l for l in p.stdout_text.splitlines() if l.strip().startswith("|")]
    sep = [l for l in lines if re.fullmatch(r"\s*\|(\s*:?-{3,}:?\s*\|)+\s*", l)]
    chk.ok(len(sep) == 1 and len(lines) == len(modes) + 2,
           "%s markdown: %d table lines, %d separator lines; expected %d and 1"
           % (label, len(lines), len(sep), len(modes) + 2))
    body = [l for l in lines if l not in sep][1:]
    md = list(csv.reader(io.StringIO("\n".join(l.strip().strip("|") for l in body)), delimiter="|"))
    chk.ok(len(md) == len(modes) and all(len(r) == len(md[0]) for r in md),
           "%s markdown: rows parse with the same number of cells" % label)
    # text
    p = q.run(["modes"] + args)
    head = "\n".join(p.stdout_text.splitlines()[:12])
    chk.ok(("cm^-1" in head or "cm⁻¹" in head or "cm-1" in head) and "mdyn/A" in head.replace("Å", "A"),
           "%s text: units in the header: %r" % (label, head))
    n_imag = sum(m["imaginary"] for m in modes)
    marked = re.findall(r"(?<![\w.])\d+(?:\.\d+)?i(?!\w)", p.stdout_text)
    chk.ok(len(marked) >= n_imag, "%s text: %d imaginary mode(s), %d numbers marked 'i'"
           % (label, n_imag, len(marked)))
    for m in modes:
        if m["imaginary"]:
            chk.ok(any(abs(float(s[:-1]) - abs(m["wavenumber"])) <= 0.51
                       for s in marked),
                   "%s text: imaginary mode %d shown as %.1fi" % (label, m["index"], abs(m["wavenumber"])))


with q.tmpdir() as tmp:
    symbols, x, pairs, k = q.random_network(8, 42, neighbours=5)
    k = k.copy()
    k[2] = -45.0                                       # invented negative spring
    H = q.spring_hessian(x, pairs, k)
    masses = q.masses_of(symbols)
    ref = q.reference_modes(x, masses, H)
    chk.ok((ref["lam"] < 0).sum() >= 1, "independent side: the input has an imaginary mode")
    xyz, hes = q.write_inputs(tmp, symbols, x, H, name="net8")
    base = [xyz, "--hessian", hes, "--hessian-units", "eV/A^2"]
    for v, T in ((0, 0), (1, 300), (5, 3000)):
        label = "net8 v=%d T=%g" % (v, T)
        doc = q.modes_json(base + ["--vectors", "--level", str(v), "--temperature", str(T)])
        check_types(label, doc, vectors=True)
        chk.ok(doc["formula"] == hill_formula(symbols), "%s: formula %r, expected %r (Hill order)"
               % (label, doc["formula"], hill_formula(symbols)))
        chk.ok(doc["natoms"] == 8 and doc["n_vibrations"] == 18, "%s: natoms %r n_vibrations %r"
               % (label, doc["natoms"], doc["n_vibrations"]))
        chk.close([m["wavenumber"] for m in doc["modes"]], ref["nu"], "%s: wavenumbers vs numpy" % label,
                  rtol=1e-9)
        check_values(label, doc, masses=masses, level=v, temperature=T)
    doc = q.modes_json(base)
    check_types("net8 no --vectors", doc, vectors=False)
    check_tables("net8", base, doc)

    # --unit: the numbers must follow the unit the JSON names
    for unit, factor in (("THz", sc.c * 100 / 1e12), ("meV", sc.h * sc.c * 100 / sc.e * 1e3)):
        d_u = q.modes_json(base + ["--unit", unit])
        name = d_u["units"]["wavenumber"]
        got = np.array([m["wavenumber"] for m in d_u["modes"]])
        if name == "cm^-1":
            chk.close(got, ref["nu"], "--unit %s, JSON in cm^-1: wavenumbers" % unit, rtol=1e-9)
        else:
            # nu = c nu~ (THz); E = h c nu~ (meV)
            chk.ok(name == unit, "--unit %s: units.wavenumber %r" % (unit, name))
            chk.close(got, ref["nu"] * factor, "--unit %s: values = converted wavenumbers" % unit,
                      rtol=1e-9)

    # --unit in the text table: the frequency column in THz (nu = c nu~) or
    # meV (E = h c nu~), imaginary ones still marked "i"
    for unit, factor in (("THz", sc.c * 100 / 1e12), ("meV", sc.h * sc.c * 100 / sc.e * 1e3)):
        p = q.run(["modes"] + base + ["--unit", unit])
        head = [l for l in p.stdout_text.splitlines() if unit in l]
        chk.ok(bool(head), "text --unit %s: the unit appears in the output" % unit)
        rows = [l.split() for l in p.stdout_text.splitlines() if re.match(r"\s*\d+\s", l)]
        chk.ok(len(rows) == len(ref["nu"]), "text --unit %s: %d rows, expected %d" % (unit, len(rows), len(ref["nu"])))
        for r, nu in zip(rows, ref["nu"]):
            cell = r[1]
            decimals = len(cell.rstrip("i").split(".")[1]) if "." in cell else 0
            chk.close(parse_number(cell), nu * factor, "text --unit %s: mode %s frequency" % (unit, r[0]),
                      rtol=1e-6, atol=0.51 * 10.0 ** -decimals)

    # the example bundle and the built-in demo: spec keys and internal
    # consistency (masses are the bundle's, not known here: mass-free checks)
    ex = os.path.join(q.SOURCE_ROOT, "data", "examples", "ethanol-unconverged", "ethanol.quaver.json")
    for label, args in (("ethanol example", [ex]), ("demo", ["--demo"])):
        try:
            doc = q.modes_json(args + ["--vectors"])
        except q.QuaverError as e:
            chk.ok(False, "%s: %s" % (label, e))
            continue
        check_types(label, doc, vectors=True, bundle_modes="hessian" not in doc)
        check_values(label, doc)
        check_tables(label, args, doc)
        if label.startswith("ethanol"):
            chk.ok(doc["formula"] == "C2H6O", "ethanol: formula %r" % doc["formula"])
        print("%s: %d atoms, %d modes, lowest %.2f cm^-1, residuals %s"
              % (label, doc["natoms"], len(doc["modes"]), doc["modes"][0]["wavenumber"],
                 np.array2string(np.array(doc["rigid_body_residuals"]), precision=3)))

# --- the committed examples, recomputed here from their own numbers -------
# Each example bundle carries its structure and Hessian inline; the numpy
# side reads them (units converted with the CODATA 2018 factors of qvtest,
# masses from periodictable: relative 1e-7, see qvtest) and must give the
# same modes, residuals and gradient norm; the xyz + text Hessian beside
# the bundle must give the bundle's modes.
for name, stem, text_units in (("ethanol-unconverged", "ethanol", "eV/A^2"),
                               ("formaldehyde", "formaldehyde", "hartree/bohr^2")):
    folder = os.path.join(q.SOURCE_ROOT, "data", "examples", name)
    path = os.path.join(folder, stem + ".quaver.json")
    try:
        with open(path) as f:
            b = json.load(f)
        atoms = b["structure"]["atoms"]
        syms = [a["element"] for a in atoms]
        xb = np.array([a["position"] for a in atoms], dtype=float)
        mb = np.array([a["mass"] if "mass" in a else q.isotope_mass(a["element"], a.get("isotope"))
                       for a in atoms])
        hb = b["hessian"]
        n = 3 * len(atoms)
        Hb = np.zeros((n, n))
        for i, row in enumerate(hb["data"]):
            if hb["layout"] == "lower":
                Hb[i, :i + 1] = row
                Hb[:i + 1, i] = row
            elif hb["layout"] == "upper":
                Hb[i, i:] = row
                Hb[i:, i] = row
            else:
                Hb[i, :] = row
        factor = [f for u, f in q.UNIT_TO_EV_A2.items() if u.lower() == hb["units"].lower()][0]
        Hb = Hb * factor
    except (OSError, KeyError, ValueError, IndexError) as e:
        chk.ok(False, "example %s: cannot read it here: %r" % (name, e))
        continue
    refb = q.reference_modes(xb, mb, Hb)
    tb, rb_ = q.residuals(refb["K"], refb["V"], refb["nt"])
    doc = q.modes_json([path])
    chk.close([m["wavenumber"] for m in doc["modes"]], refb["nu"],
              "example %s: wavenumbers vs numpy from the bundle's own numbers" % name, rtol=1e-7)
    chk.close(np.sort(doc["rigid_body"]["rotations"]), rb_,
              "example %s: rotation residuals vs numpy" % name, rtol=1e-6, atol=1e-4)
    chk.close(np.sort(doc["rigid_body"]["translations"]), tb,
              "example %s: translation residuals vs numpy" % name, rtol=1e-6, atol=1e-4)
    if "forces" in b["structure"]:
        chk.close(doc.get("gradient_norm", np.nan),
                  np.linalg.norm(np.array(b["structure"]["forces"], dtype=float)),
                  "example %s: gradient_norm vs ||forces||" % name, rtol=1e-9)
    xyz_path = os.path.join(folder, stem + ".xyz")
    hes_path = os.path.join(folder, stem + ".hessian.txt")
    if os.path.exists(xyz_path) and os.path.exists(hes_path):
        doc2 = q.modes_json([xyz_path, "--hessian", hes_path, "--hessian-units", text_units])
        chk.close([m["wavenumber"] for m in doc2["modes"]], [m["wavenumber"] for m in doc["modes"]],
                  "example %s: xyz + text Hessian vs the bundle" % name, rtol=1e-9)
    print("example %s: %d modes (%d imaginary), rotation residuals numpy %s"
          % (name, len(refb["nu"]), int((refb["lam"] < 0).sum()), np.array2string(rb_, precision=3)))

chk.finish("JSON keys/types, ordering, wavenumbers, reduced mass, force constant, participation, "
           "collectivity, turning points (v = 0, 1, 5) and thermal amplitudes (0, 300, 3000 K) "
           "recomputed; csv/markdown/text tables; --unit; example bundles (also vs numpy) and --demo")
