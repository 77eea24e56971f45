#!/usr/bin/python3
"""The SVG figure (src/render/qv-svg-figure.c) read by Python's own XML
parser, xml.etree.ElementTree (stdlib).

Input: the invented five-atom molecule with a cell, arrows, a ghost and
labels that `test-figure svg FILE` writes (tests/render/test-figure.c).

Checked:
- it parses as XML; the root is <svg> in the SVG namespace
  (http://www.w3.org/2000/svg), version="1.1", width/height matching the
  viewBox (SVG 1.1 specification, W3C Recommendation 2011, chapter 7);
- only elements and attributes of SVG 1.1 are used (the element list of
  the SVG 1.1 specification's element index, from memory, restricted to
  what a figure needs; no data-* attributes, which SVG 1.1 lacks);
- ids are unique (XML 1.0: ID attributes are unique per document) and
  every url(#id) paint reference points at a gradient defined in <defs>;
- gradient stops have offsets in [0, 1], not decreasing (SVG 1.1, 13.2.4);
- one disc per atom (class "atom", ids atom-1 .. atom-5), one ghost disc
  per atom with the overlay's opacity, each label's text equal to its
  atom's <title> (element symbol and 1-based index);
- every number parses as a float and is finite.
"""
import math
import os
import re
import subprocess
import sys
import tempfile
import xml.etree.ElementTree as ET

SVG = "{http://www.w3.org/2000/svg}"
ALLOWED = {
    "svg", "title", "desc", "defs", "radialGradient", "linearGradient", "stop",
    "rect", "g", "circle", "polygon", "line", "text",
}
ALLOWED_ATTRIBUTES = {
    "version", "width", "height", "viewBox", "id", "class", "cx", "cy", "r", "fx",
    "fy", "x1", "y1", "x2", "y2", "x", "y", "offset", "stop-color", "fill",
    "stroke", "stroke-width", "stroke-linejoin", "stroke-linecap", "opacity",
    "transform", "points", "font-family", "font-size", "text-anchor",
}
NUMERIC = {"width", "height", "cx", "cy", "r", "fx", "fy", "x1", "y1", "x2", "y2",
           "x", "y", "offset", "stroke-width", "opacity", "font-size"}
N_ATOMS = 5


def main():
    exe = sys.argv[1]
    with tempfile.TemporaryDirectory() as tmp:
        path = os.path.join(tmp, "figure.svg")
        subprocess.run([exe, "svg", path], check=True)
        with open(path, "rb") as f:
            data = f.read()
    root = ET.fromstring(data)
    assert root.tag == SVG + "svg", root.tag
    assert root.get("version") == "1.1"
    w, h = float(root.get("width")), float(root.get("height"))
    assert root.get("viewBox").split() == ["0", "0", root.get("width"), root.get("height")]
    assert (w, h) == (640, 480)

    ids = {}
    refs = []
    for el in root.iter():
        assert el.tag.startswith(SVG), el.tag
        name = el.tag[len(SVG):]
        assert name in ALLOWED, name
        for key, value in el.attrib.items():
            assert key in ALLOWED_ATTRIBUTES, (name, key)
            if key in NUMERIC:
                assert math.isfinite(float(value)), (name, key, value)
            if key == "id":
                assert value not in ids, "duplicate id " + value
                ids[value] = el
            refs += re.findall(r"url\(#([^)]+)\)", value)
        if name == "polygon":
            for pair in el.get("points").split():
                x, y = (float(v) for v in pair.split(","))
                assert math.isfinite(x) and math.isfinite(y)
    defs = root.find(SVG + "defs")
    assert defs is not None
    defined = {g.get("id") for g in defs}
    assert refs, "no gradient used"
    for ref in refs:
        assert ref in defined, "url(#%s) undefined" % ref
    for gradient in defs:
        offsets = [float(s.get("offset")) for s in gradient.findall(SVG + "stop")]
        assert len(offsets) >= 2
        assert all(0.0 <= o <= 1.0 for o in offsets)
        assert offsets == sorted(offsets)

    atoms = [el for el in root.iter(SVG + "circle") if el.get("class") == "atom"]
    ghosts = [el for el in root.iter(SVG + "circle") if el.get("class") == "ghost"]
    assert sorted(a.get("id") for a in atoms) == ["atom-%d" % k for k in range(1, N_ATOMS + 1)]
    assert len(ghosts) == N_ATOMS
    assert all(abs(float(g.get("opacity")) - 0.35) < 1e-9 for g in ghosts)
    for k in range(1, N_ATOMS + 1):
        title = ids["atom-%d" % k].find(SVG + "title").text
        assert title.endswith(str(k)), title
        label = ids["label-%d" % k]
        texts = [t.text for t in label.findall(SVG + "text")]
        assert texts == [title, title], (texts, title)
        # Discs inside the picture (the camera was fitted to the atoms).
        c = ids["atom-%d" % k]
        assert 0 <= float(c.get("cx")) <= w and 0 <= float(c.get("cy")) <= h
    assert any(el.get("class") == "cell" for el in root.iter(SVG + "line"))
    assert any(el.get("class") == "arrow" for el in root.iter(SVG + "polygon"))
    print("SVG: %d bytes, %d elements, %d gradients, all checks passed"
          % (len(data), sum(1 for _ in root.iter()), len(defined)))


if __name__ == "__main__":
    main()
