#!/usr/bin/python3
"""The dispersion plot's SVG (src/render/qv-dispersion-plot.c) read by
Python's own XML parser, xml.etree.ElementTree (stdlib).

Input: `test-dispersion-plot svg DIR` writes plot.svg / plot.json (invented
bands, all real) and plot-imaginary.svg / .json (the lowest branch dips
below zero along Gamma-X); the JSON holds the data, the data box and the
range the plot reports.

Checked, with the pixel positions computed here from the box and the range
(the linear maps x = left + (d - d0)/(d1 - d0) (right - left),
y = bottom - (w - lo)/(hi - lo) (bottom - top)):
- it parses as XML; the root is <svg> in the SVG namespace with the
  requested width and height (SVG 1.1, W3C Recommendation 2011, ch. 7);
- one solid polyline per branch and continuous piece of the path, whose
  vertices are the samples' pixels (within 0.01 px; cairo rounds to
  1/256 px, and merges collinear segments: a sample it leaves out must lie
  on the segment drawn), and no other polyline; with imaginary values one dashed
  polyline more for every piece of a branch that goes below zero;
- one vertical line from the top to the bottom of the box at each label
  distance, and a text run below the box around each of them.
"""
import json
import os
import subprocess
import sys
import tempfile
import xml.etree.ElementTree as ET

SVG = "{http://www.w3.org/2000/svg}"
XLINK = "{http://www.w3.org/1999/xlink}"
TOL = 0.01

failures = []


def check(condition, message):
    if not condition:
        failures.append(message)
        print("FAIL:", message)


def points_of(d):
    """The vertices of a path of M/L commands, or None when it has others."""
    tokens = d.split()
    pts, i = [], 0
    while i < len(tokens):
        c = tokens[i]
        if c in ("M", "L"):
            pts.append((float(tokens[i + 1]), float(tokens[i + 2])))
            i += 3
        else:
            return None
    return pts


def near(a, b):
    return abs(a[0] - b[0]) <= TOL and abs(a[1] - b[1]) <= TOL


def off_segment(p, a, b):
    """Distance of point p from the segment a-b."""
    ax, ay, bx, by = a[0], a[1], b[0], b[1]
    l2 = (bx - ax) ** 2 + (by - ay) ** 2
    t = 0.0 if l2 == 0 else max(0.0, min(1.0, ((p[0] - ax) * (bx - ax) + (p[1] - ay) * (by - ay)) / l2))
    return ((p[0] - ax - t * (bx - ax)) ** 2 + (p[1] - ay - t * (by - ay)) ** 2) ** 0.5


def same_polyline(want, got):
    """got draws want: its vertices are want's in order, first and last
    included; cairo merges collinear segments, so a sample it left out must
    lie on the segment that replaced it."""
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
    """Stroked paths outside <defs> (glyphs and clip paths live there)."""
    out = []

    def walk(node, in_defs):
        for child in node:
            defs = in_defs or child.tag in (SVG + "defs", SVG + "symbol", SVG + "clipPath")
            if child.tag == SVG + "path" and not defs:
                out.append(child)
            walk(child, defs)
    walk(root, False)
    return out


def glyph_runs(root):
    runs = []
    for g in root.iter(SVG + "g"):
        uses = [u for u in g if u.tag == SVG + "use"]
        if uses:
            runs.append([(float(u.get("x")), float(u.get("y"))) for u in uses])
    return runs


def check_plot(svg_path, json_path):
    name = os.path.basename(svg_path)
    with open(json_path) as f:
        data = json.load(f)
    with open(svg_path, "rb") as f:
        root = ET.fromstring(f.read())
    check(root.tag == SVG + "svg", "%s: root %s" % (name, root.tag))
    check(root.get("width") in ("%dpx" % data["width"], str(data["width"]))
          and root.get("height") in ("%dpx" % data["height"], str(data["height"])),
          "%s: size %s x %s" % (name, root.get("width"), root.get("height")))

    left, top, right, bottom = data["left"], data["top"], data["right"], data["bottom"]
    lo, hi = data["y_min"], data["y_max"]
    dist, restart, w, nb = data["distance"], data["restart"], data["wavenumbers"], data["n_branches"]
    d0, d1 = dist[0], dist[-1]

    def px(d):
        return left + (d - d0) / (d1 - d0) * (right - left)

    def py(v):
        return bottom - (v - lo) / (hi - lo) * (bottom - top)

    # the expected polylines: branch b over each piece [k0, k1)
    starts = [k for k in range(len(dist)) if k == 0 or restart[k]] + [len(dist)]
    expected, dashed_expected = [], 0
    for k0, k1 in zip(starts[:-1], starts[1:]):
        for b in range(nb):
            line = [(px(dist[k]), py(w[k * nb + b])) for k in range(k0, k1)]
            expected.append(line)
            if lo < 0 and any(w[k * nb + b] < 0 for k in range(k0, k1)):
                dashed_expected += 1

    solid, dashed, stray = [0] * len(expected), 0, 0
    verticals = []
    for p in drawn_paths(root):
        pts = points_of(p.get("d", ""))
        if pts is None:
            continue                                  # closed shapes: frame, shading
        if len(pts) == 2 and abs(pts[0][0] - pts[1][0]) < 1e-9:
            verticals.append(pts)
            continue
        if len(pts) < 3:
            continue                                  # ticks, grid, the zero line
        match = [i for i, line in enumerate(expected) if same_polyline(line, pts)]
        if not match:
            stray += 1
            continue
        if "stroke-dasharray" in (p.get("style") or ""):
            dashed += 1
        else:
            for i in match:
                solid[i] += 1
    pieces = len(starts) - 1
    print("%s: %d pieces x %d branches; solid %d, dashed %d (expected %d), stray %d"
          % (name, pieces, nb, sum(solid), dashed, dashed_expected, stray))
    check(pieces >= 2, "%s: the path has a jump, so at least two pieces" % name)
    check(all(c == 1 for c in solid), "%s: one solid polyline per branch and piece: %s" % (name, solid))
    check(dashed == dashed_expected, "%s: %d dashed imaginary polylines, expected %d" % (name, dashed, dashed_expected))
    check(stray == 0, "%s: %d polylines match no branch" % (name, stray))
    if lo < 0:
        check(dashed_expected > 0, "%s: the imaginary sample has imaginary pieces" % name)

    # label lines and texts
    runs = glyph_runs(root)
    label_x = sorted({round(px(d), 9) for _, d in data["labels"]})
    for x in label_x:
        lines = [v for v in verticals if abs(v[0][0] - x) <= TOL
                 and abs(min(v[0][1], v[1][1]) - top) <= 1 and abs(max(v[0][1], v[1][1]) - bottom) <= 1]
        check(len(lines) == 1, "%s: one label line at x = %.3f (found %d)" % (name, x, len(lines)))
        below = [r for r in runs if all(bottom < y < bottom + 40 for _, y in r)
                 and r[0][0] - 1 <= x and (r[-1][0] + 12 >= x)]
        check(len(below) >= 1, "%s: a label text below the box around x = %.3f" % (name, x))
    check(len(label_x) == len({d for _, d in data["labels"]}), "%s: label distances" % name)
    print("%s: %d label lines at the label distances" % (name, len(label_x)))


def main():
    exe = sys.argv[1]
    with tempfile.TemporaryDirectory() as tmp:
        subprocess.run([exe, "svg", tmp], check=True)
        for stem in ("plot", "plot-imaginary"):
            check_plot(os.path.join(tmp, stem + ".svg"), os.path.join(tmp, stem + ".json"))
    if failures:
        print("%d failures" % len(failures))
        sys.exit(1)


if __name__ == "__main__":
    main()
