#!/usr/bin/python3
"""The thermochemistry plot's SVG (src/render/qv-thermochem-plot.c) read by
Python's own XML parser, xml.etree.ElementTree (stdlib).

Input: `test-thermochem-plot svg DIR` writes plot.svg and plot.json: the
two panels' boxes and ranges, the sweep as drawn (T, H, G, ZPE in kJ/mol;
S, S_vib, Cp in J/(K mol)) and the invented molecule's wavenumbers.

Checked:
- it parses as XML; the root is <svg> in the SVG namespace with the
  requested width and height (SVG 1.1, W3C Recommendation 2011, ch. 7);
- the vibrational parts are the textbook harmonic-oscillator sums
  (McQuarrie, Statistical Mechanics, ch. 8, from memory), evaluated here
  with SciPy's CODATA constants: ZPE = N_A h c sum(nu)/2,
  S_vib = R sum[x/(e^x - 1) - ln(1 - e^-x)], and for a nonlinear rigid
  rotor Cp = 4R + R sum x^2 e^x/(e^x - 1)^2, x = h c nu/(k T);
- each of the six curves is one polyline whose vertices are the pixels of
  the values computed here, mapped with x = left + (T - T0)/(T1 - T0)
  (right - left), y = bottom - (v - v0)/(v1 - v0) (bottom - top) (within
  0.01 px; cairo merges collinear segments, so a sample it leaves out must
  lie on the segment drawn); ZPE and S_vib dashed, the others solid;
- the marker: one dashed vertical line at the marker temperature spanning
  each panel's box.
"""
import json
import math
import os
import subprocess
import sys
import tempfile
import xml.etree.ElementTree as ET

from scipy import constants as C

SVG = "{http://www.w3.org/2000/svg}"
TOL = 0.01
failures = []


def check(condition, message):
    if not condition:
        failures.append(message)
        print("FAIL:", message)


def points_of(d):
    tokens = d.split()
    pts, i = [], 0
    while i < len(tokens):
        if tokens[i] in ("M", "L"):
            pts.append((float(tokens[i + 1]), float(tokens[i + 2])))
            i += 3
        else:
            return None
    return pts


def near(a, b):
    return abs(a[0] - b[0]) <= TOL and abs(a[1] - b[1]) <= TOL


def off_segment(p, a, b):
    ax, ay, bx, by = a[0], a[1], b[0], b[1]
    l2 = (bx - ax) ** 2 + (by - ay) ** 2
    t = 0.0 if l2 == 0 else max(0.0, min(1.0, ((p[0] - ax) * (bx - ax) + (p[1] - ay) * (by - ay)) / l2))
    return math.hypot(p[0] - ax - t * (bx - ax), p[1] - ay - t * (by - ay))


def same_polyline(want, got):
    if len(got) < 2 or not near(want[0], got[0]) or not near(want[-1], got[-1]):
        return False
    j = 0
    for p in want:
        if near(p, got[j]):
            continue
        if j + 1 < len(got) and near(p, got[j + 1]):
            j += 1
            continue
        if j + 1 >= len(got) or off_segment(p, got[j], got[j + 1]) > TOL:
            return False
    return j == len(got) - 1


def drawn_paths(root):
    out = []

    def walk(node, in_defs):
        for child in node:
            defs = in_defs or child.tag in (SVG + "defs", SVG + "symbol", SVG + "clipPath")
            if child.tag == SVG + "path" and not defs:
                out.append(child)
            walk(child, defs)
    walk(root, False)
    return out


def dashed(path):
    return path.get("stroke-dasharray") is not None or "stroke-dasharray" in (path.get("style") or "")


def textbook(wavenumbers, t):
    """ZPE (kJ/mol), S_vib and Cp (J/(K mol)) of a nonlinear rigid rotor
    with harmonic vibrations, from the closed forms."""
    R = C.R
    zpe = C.N_A * C.h * C.c * sum(100.0 * w for w in wavenumbers) / 2 / 1000
    s_vib, cv_vib = 0.0, 0.0
    for w in wavenumbers:
        x = C.h * C.c * 100.0 * w / (C.k * t)
        s_vib += R * (x / math.expm1(x) - math.log(-math.expm1(-x)))
        cv_vib += R * x * x * math.exp(x) / math.expm1(x) ** 2
    return zpe, s_vib, 4 * R + cv_vib


def main():
    exe = sys.argv[1]
    with tempfile.TemporaryDirectory() as tmp:
        subprocess.run([exe, "svg", tmp], check=True)
        with open(os.path.join(tmp, "plot.json")) as f:
            data = json.load(f)
        with open(os.path.join(tmp, "plot.svg"), "rb") as f:
            root = ET.fromstring(f.read())

    check(root.tag == SVG + "svg", "root %s" % root.tag)
    check(root.get("width") in ("%dpx" % data["width"], str(data["width"]))
          and root.get("height") in ("%dpx" % data["height"], str(data["height"])),
          "size %s x %s" % (root.get("width"), root.get("height")))

    rows = data["rows"]
    # the values drawn against the closed forms
    worst = 0.0
    for row in rows:
        zpe, s_vib, cp = textbook(data["wavenumbers"], row[0])
        worst = max(worst, abs(row[3] - zpe) / zpe, abs(row[5] - s_vib) / max(s_vib, 1e-300),
                    abs(row[6] - cp) / cp)
    print("largest relative difference from the closed forms: %.2e" % worst)
    check(worst < 1e-9, "ZPE, S_vib and Cp against the closed forms: %.2e" % worst)

    def mapper(panel):
        p = data[panel]

        def to_px(t, v):
            return (p["left"] + (t - p["t_min"]) / (p["t_max"] - p["t_min"]) * (p["right"] - p["left"]),
                    p["bottom"] - (v - p["v_min"]) / (p["v_max"] - p["v_min"]) * (p["bottom"] - p["top"]))
        return to_px

    energy, entropy = mapper("energy"), mapper("entropy")
    # column of the row, panel, dashed; Cp, S_vib and ZPE from the closed forms
    curves = {
        "H": [energy(r[0], r[1]) for r in rows],
        "G": [energy(r[0], r[2]) for r in rows],
        "ZPE": [energy(r[0], textbook(data["wavenumbers"], r[0])[0]) for r in rows],
        "S": [entropy(r[0], r[4]) for r in rows],
        "S_vib": [entropy(r[0], textbook(data["wavenumbers"], r[0])[1]) for r in rows],
        "Cp": [entropy(r[0], textbook(data["wavenumbers"], r[0])[2]) for r in rows],
    }
    want_dashed = {"ZPE": True, "S_vib": True}
    found = {name: [] for name in curves}
    verticals = []
    for path in drawn_paths(root):
        pts = points_of(path.get("d", ""))
        if pts is None:
            continue
        if len(pts) == 2 and abs(pts[0][0] - pts[1][0]) < 1e-9:
            verticals.append((pts, dashed(path)))
        for name, line in curves.items():
            if same_polyline(line, pts):
                found[name].append(dashed(path))
    for name in curves:
        print("%s: %d polylines %s" % (name, len(found[name]), found[name]))
        check(len(found[name]) == 1, "%s: one polyline through its %d values, found %d"
              % (name, len(rows), len(found[name])))
        if found[name]:
            check(found[name][0] == want_dashed.get(name, False),
                  "%s: %s" % (name, "dashed" if want_dashed.get(name) else "solid"))

    for panel in ("energy", "entropy"):
        p = data[panel]
        x = mapper(panel)(data["marker_t"], p["v_min"])[0]
        lines = [v for v, d in verticals if d and abs(v[0][0] - x) <= TOL
                 and abs(min(v[0][1], v[1][1]) - p["top"]) <= 1
                 and abs(max(v[0][1], v[1][1]) - p["bottom"]) <= 1]
        check(len(lines) == 1, "%s: one dashed marker line at %.3f K (x = %.3f), found %d"
              % (panel, data["marker_t"], x, len(lines)))
    if failures:
        print("%d failures" % len(failures))
        sys.exit(1)
    print("ok")


if __name__ == "__main__":
    main()
