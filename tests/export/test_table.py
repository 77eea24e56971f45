#!/usr/bin/python3
"""`quaver table` against NumPy and the formats' own parsers.

The 13-atom Lennard-Jones cluster of test_displace.py (invented argon-like
parameters, analytic Hessian).  Checks:
- CSV parses with Python's csv module: one row per mode; the wavenumber
  column equals the `quaver modes --format json` wavenumbers times --scale,
  and the header says the scale; reduced masses recomputed from the vectors
  (mu = 1/sum(l^2/m), DESIGN.md section 2); the top atom equals NumPy's
  argmax of the participation |l_a|^2.
- JSON parses (json module); "scale" is the factor; wavenumbers scaled.
- Markdown: header + separator + one row per mode, same cell count each.
- LaTeX: booktabs structure (\\toprule, \\midrule, \\bottomrule once each, in
  that order), one row per mode between \\midrule and \\bottomrule with
  n_columns - 1 unescaped '&', no unescaped '%' (LaTeX specials escaped),
  the caption states the scale.
- thermal-rms against hbar/(2 omega) coth(hbar omega / 2 k_B T) (McQuarrie,
  Statistical Mechanics) with CODATA 2018 constants from scipy.constants.
- `quaver modes --format latex` gives the booktabs table; its other formats
  are covered, unchanged, by tests/cross (test_json.py).
- Bad column names and scale factors: exit 1 with the accepted values.
"""
import csv
import io
import json
import os
import re
import sys

import numpy as np
import scipy.constants as sc

sys.dont_write_bytecode = True
sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "cross"))
import qvtest as q  # noqa: E402

chk = q.Checker("table")

eps, sigma = q.LJ_EPS, q.LJ_SIGMA
x13, _, _ = q.lj_minimise(q.icosahedral_cluster(1))
x = (x13 - x13.mean(axis=0)) * sigma
symbols = ["Ar"] * len(x)
H = q.lj_hessian(x, eps, sigma)
masses = q.masses_of(symbols)
masses[0] = 60.0
masses[4] = 36.0

with q.tmpdir() as tmp:
    xyz, hes = q.write_inputs(tmp, symbols, x, H, name="lj13")
    base = [xyz, "--hessian", hes, "--hessian-units", "eV/A^2", "--mass", "1=60", "--mass", "5=36"]
    doc = q.modes_json(base + ["--vectors"])
    arr = q.mode_arrays(doc, masses)
    nu, L, lam = arr["wavenumber"], arr["L"], arr["eigenvalue"]
    n = len(nu)
    S = 0.97
    cols = "index,wavenumber,reduced-mass,force-constant,turning-q,turning-displacement,thermal-rms,collectivity,top-atoms"
    ncol = len(cols.split(","))

    # CSV
    p = q.run(["table"] + base + ["--format", "csv", "--scale", str(S), "--columns", cols, "--top", "2"])
    rows = list(csv.reader(io.StringIO(p.stdout_text)))
    head, body = rows[0], rows[1:]
    chk.ok(len(body) == n, "csv: %d rows, expected %d" % (len(body), n))
    wcol = [h for h in head if h.startswith("wavenumber")][0]
    chk.ok("scaled_0.97" in wcol, "csv header states the scale: %s" % wcol)
    get = lambda name: np.array([float(r[head.index(name)]) for r in body])
    chk.close(get(wcol), nu * S, "csv: wavenumbers = modes x 0.97", rtol=1e-6, atol=1e-6)
    mu = 1.0 / np.sum(L ** 2 / np.repeat(masses, 3)[:, None], axis=0)
    chk.close(get("reduced_mass_u"), mu, "csv: reduced mass vs numpy 1/sum(l^2/m)", rtol=1e-6)
    # thermal RMS: McQuarrie; hbar/omega in u A^2
    omega = np.sqrt(lam) * np.sqrt(sc.e / (1e-20 * sc.physical_constants["atomic mass constant"][0]))
    hw = sc.hbar / omega / (sc.physical_constants["atomic mass constant"][0] * 1e-20)
    q2 = 0.5 * hw / np.tanh(sc.hbar * omega / (2 * sc.k * 298.15))
    D = arr["D"]
    dmax = np.array([np.max(np.linalg.norm(D[:, k].reshape(-1, 3), axis=1)) for k in range(n)])
    tcol = [h for h in head if h.startswith("thermal")][0]
    chk.close(get(tcol), np.sqrt(q2) * dmax, "csv: thermal RMS vs closed form", rtol=1e-6)
    part = (L ** 2).reshape(len(x), 3, n).sum(axis=1)
    top = [r[head.index("top_atoms")] for r in body]
    chk.ok(all(t.startswith("Ar%d " % (int(np.argmax(part[:, k])) + 1)) for k, t in enumerate(top)),
           "csv: top atom = numpy argmax of the participation")
    chk.ok(all(t.count(",") == 1 for t in top), "csv: --top 2 lists two atoms")

    # JSON
    p = q.run(["table"] + base + ["--format", "json", "--scale", str(S), "--columns", cols])
    j = json.loads(p.stdout_text)
    chk.ok(j["scale"] == S and "scaled by 0.97" in j["caption"], "json: scale and caption")
    chk.close([m["wavenumber"] for m in j["modes"]], nu * S, "json: scaled wavenumbers", rtol=1e-12)
    chk.ok(j["columns"] == cols.split(","), "json: columns as asked")

    # Markdown
    p = q.run(["table"] + base + ["--format", "markdown", "--scale", str(S)])
    lines = [l for l in p.stdout_text.splitlines() if l.startswith("|")]
    chk.ok(len(lines) == n + 2, "markdown: %d table lines, expected %d" % (len(lines), n + 2))
    chk.ok(len({l.count("|") for l in lines}) == 1, "markdown: same cell count on every line")
    chk.ok("scaled by 0.97" in p.stdout_text, "markdown: caption states the scale")

    # LaTeX
    p = q.run(["table"] + base + ["--format", "latex", "--scale", str(S), "--columns", cols])
    t = p.stdout_text
    pos = [t.find(w) for w in ("\\toprule", "\\midrule", "\\bottomrule")]
    chk.ok(all(t.count(w) == 1 for w in ("\\toprule", "\\midrule", "\\bottomrule")) and pos == sorted(pos)
           and min(pos) > 0, "latex: booktabs rules once each, in order")
    body = t[pos[1]:pos[2]].splitlines()[1:]
    body = [l for l in body if l.strip()]
    chk.ok(len(body) == n, "latex: %d rows, expected %d" % (len(body), n))
    chk.ok(all(len(re.findall(r"(?<!\\)&", l)) == ncol - 1 and l.rstrip().endswith("\\\\") for l in body),
           "latex: %d cells per row, each row ends with \\\\" % ncol)
    chk.ok(not any(re.search(r"(?<!\\)%", l) for l in t[pos[0]:].splitlines()),
           "latex: no unescaped %% in the table")
    chk.ok("\\begin{tabular}" in t and "\\end{table}" in t and "\\caption{" in t
           and "scaled by 0.97" in t, "latex: tabular, caption with the scale")

    # text
    p = q.run(["table"] + base + ["--scale", str(S)])
    chk.ok("scaled by 0.97" in p.stdout_text.splitlines()[0], "text: header states the scale")
    p = q.run(["table"] + base)
    chk.ok("wavenumbers unscaled" in p.stdout_text, "text: says when unscaled")

    # modes: unchanged text format, and latex available there too
    p = q.run(["modes"] + base + ["--format", "latex"])
    chk.ok("\\toprule" in p.stdout_text, "modes --format latex gives the booktabs table")

    # bad input
    for args, words in ((["--columns", "index,colour"], "accepted"),
                        (["--columns", "index,index"], "twice"),
                        (["--scale", "-1"], "--scale"),
                        (["--format", "docx"], "latex")):
        p = q.run(["table"] + base + args, expect=1)
        chk.ok(words in p.stderr_text, "%s: exit 1, %r" % (" ".join(args), p.stderr_text.strip()))
    out = os.path.join(tmp, "t.tex")
    q.run(["table"] + base + ["--format", "latex", "-o", out])
    p = q.run(["table"] + base + ["--format", "latex", "-o", out], expect=3)
    chk.ok("--force" in p.stderr_text, "existing -o file: exit 3, names --force")

chk.finish("csv/json/markdown/latex/text tables: rows, structure, scale, numbers vs numpy")
