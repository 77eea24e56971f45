#!/usr/bin/python3
"""--plot of `quaver bands`, `quaver dos` and `quaver thermo`.

An invented CsCl-type crystal (the spring model of spring_crystal.py, with
constants of our own), its 3x3x3 supercell Hessian built here.

Checked:
- a PNG starts with the PNG signature and its first chunk is IHDR, 13
  bytes, with the requested width and height and a matching CRC-32
  (PNG specification, ISO/IEC 15948:2004, sections 5.2, 5.3 and 11.2.2;
  CRC by zlib.crc32, which is the same CRC);
- an SVG parses with xml.etree.ElementTree and has the requested size; the
  dispersion has one polyline per branch and continuous piece of the path
  (pieces counted from the JSON table of the same run: one more than the
  jumps, the labels written "X|M"); the DOS one line for the total and one
  per element;
- the table printed with --plot is byte for byte the table without it;
- an existing figure is kept without --force (exit 3, file unchanged) and
  replaced with it; bad --plot names and sizes are usage errors (exit 1).
A build without the renderer must refuse --plot with exit 1 and a message;
then only that is checked.

SPDX-License-Identifier: GPL-3.0-or-later
"""
import json
import os
import struct
import subprocess
import sys
import tempfile
import xml.etree.ElementTree as ET
import zlib

import numpy as np

sys.dont_write_bytecode = True
sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from spring_crystal import SpringCrystal  # noqa: E402

QUAVER = os.environ.get("QUAVER") or os.path.join(
    os.environ.get("QV_BUILD_ROOT", "/work/main/build"), "src", "cli", "quaver")
SVG = "{http://www.w3.org/2000/svg}"

A = 3.3
SPECIES = ["Rb", "I"]
MASSES = np.array([85.468, 126.904])
TAU = np.array([[0.0, 0.0, 0.0], [0.5, 0.5, 0.5]]) * A
CELL = np.eye(3) * A
SHELLS = [(A * np.sqrt(3) / 2, None, 1.7, 0.2), (A, (0, 0), 0.7, 0.06), (A, (1, 1), 0.5, 0.04)]

failures = []


def check(condition, message):
    if not condition:
        failures.append(message)
        print("FAIL:", message)


def write_inputs(tmp):
    model = SpringCrystal(CELL, TAU, MASSES, SHELLS)
    n = 3
    pos, sites = [], []
    for l in np.ndindex(n, n, n):
        for k in range(2):
            sites.append(k)
            pos.append(np.array(l) @ CELL + TAU[k])
    h = model.hessian(sites, np.array(pos), CELL * n)
    prim = os.path.join(tmp, "prim.xyz")
    with open(prim, "w") as f:
        f.write("2\nLattice=\"%s\" pbc=\"T T T\" Properties=species:S:1:pos:R:3:masses:R:1\n"
                % " ".join("%.12f" % x for x in CELL.ravel()))
        for k in range(2):
            f.write("%s %.12f %.12f %.12f %.6f\n" % (SPECIES[k], *TAU[k], MASSES[k]))
    hess = os.path.join(tmp, "sc.npy")
    np.save(hess, h)
    return [prim, "--supercell", "3x3x3", "-H", hess, "-u", "eV/A^2"]


def run(args):
    """Runs quaver; with --plot, leak checks off: Pango and fontconfig keep
    their caches until exit, which LeakSanitizer reports (not ours; as in
    tests/cross/test_spectrum.py). The table runs keep them."""
    env = os.environ.copy()
    if "--plot" in args:
        asan = env.get("ASAN_OPTIONS")
        env["ASAN_OPTIONS"] = ((asan + ":") if asan else "") + "detect_leaks=0"
    return subprocess.run([QUAVER] + args, capture_output=True, env=env)


def png_size(path):
    with open(path, "rb") as f:
        data = f.read()
    check(data[:8] == b"\x89PNG\r\n\x1a\n", "%s: PNG signature %r" % (path, data[:8]))
    length, kind = struct.unpack(">I4s", data[8:16])
    check(kind == b"IHDR" and length == 13, "%s: first chunk %r of %d bytes" % (path, kind, length))
    body = data[16:16 + 13]
    crc = struct.unpack(">I", data[29:33])[0]
    check(zlib.crc32(kind + body) & 0xffffffff == crc, "%s: IHDR CRC" % path)
    w, h = struct.unpack(">II", body[:8])
    return w, h


def points_of(d):
    tokens = d.split()
    pts, i = [], 0
    while i < len(tokens):
        if tokens[i] not in ("M", "L"):
            return None
        pts.append((float(tokens[i + 1]), float(tokens[i + 2])))
        i += 3
    return pts


def polylines(path):
    """Stroked open paths of three or more vertices outside <defs>, solid."""
    root = ET.parse(path).getroot()
    out = []

    def walk(node, in_defs):
        for child in node:
            defs = in_defs or child.tag in (SVG + "defs", SVG + "symbol", SVG + "clipPath")
            if child.tag == SVG + "path" and not defs:
                pts = points_of(child.get("d", ""))
                style = child.get("style") or ""
                if pts and len(pts) >= 3 and "stroke-dasharray" not in style and "stroke:none" not in style:
                    out.append(pts)
            walk(child, defs)
    walk(root, False)
    return root, out


def main():
    with tempfile.TemporaryDirectory() as tmp:
        base = write_inputs(tmp)
        png = os.path.join(tmp, "bands.png")
        p = run(["bands"] + base + ["--plot", png, "--plot-size", "640x360"])
        if p.returncode == 1 and b"no renderer" in p.stderr:
            print("a build without the renderer refuses --plot:", p.stderr.decode().strip())
            check(not os.path.exists(png), "nothing written without the renderer")
            return
        check(p.returncode == 0, "bands --plot exit %d: %s" % (p.returncode, p.stderr))
        plain = run(["bands"] + base)
        check(p.stdout == plain.stdout and len(plain.stdout) > 0, "bands: the table with --plot equals the table without")
        check(png_size(png) == (640, 360), "bands PNG size %s" % (png_size(png),))

        # an existing figure is kept without --force, replaced with it
        with open(png, "rb") as f:
            before = f.read()
        p = run(["bands"] + base + ["--plot", png])
        check(p.returncode == 3 and b"--force" in p.stderr, "bands over an existing PNG: exit %d %s" % (p.returncode, p.stderr))
        with open(png, "rb") as f:
            check(f.read() == before, "the existing PNG is unchanged")
        p = run(["bands"] + base + ["--plot", png, "--force"])
        check(p.returncode == 0 and png_size(png) == (900, 500), "bands --force replaces it at the default 900x500")

        # the SVG: one polyline per branch and piece
        svg = os.path.join(tmp, "bands.svg")
        table = os.path.join(tmp, "bands.json")
        p = run(["bands"] + base + ["-f", "json", "-o", table, "--plot", svg, "--plot-size", "800x450"])
        check(p.returncode == 0, "bands json + svg exit %d: %s" % (p.returncode, p.stderr))
        with open(table) as f:
            doc = json.load(f)
        root, lines = polylines(svg)
        check(root.tag == SVG + "svg" and root.get("width") in ("800px", "800")
              and root.get("height") in ("450px", "450"), "bands SVG root and size")
        pieces = 1 + sum("|" in l["label"] for l in doc["labels"])
        print("bands SVG: %d polylines for %d branches x %d pieces" % (len(lines), doc["n_branches"], pieces))
        check(len(lines) == doc["n_branches"] * pieces, "bands SVG: %d polylines, expected %d"
              % (len(lines), doc["n_branches"] * pieces))

        # DOS: the total and one line per element
        svg = os.path.join(tmp, "dos.svg")
        p = run(["dos"] + base + ["--mesh", "6x6x6", "--unit", "THz", "--plot", svg])
        check(p.returncode == 0, "dos --plot exit %d: %s" % (p.returncode, p.stderr))
        plain = run(["dos"] + base + ["--mesh", "6x6x6", "--unit", "THz"])
        check(p.stdout == plain.stdout, "dos: the table with --plot equals the table without")
        root, lines = polylines(svg)
        print("dos SVG: %d curves" % len(lines))
        check(len(lines) == 1 + len(SPECIES), "dos SVG: %d curves, expected %d" % (len(lines), 1 + len(SPECIES)))

        # thermo: PNG at its default size
        png = os.path.join(tmp, "thermo.png")
        p = run(["thermo"] + base + ["--mesh", "4x4x4", "-f", "csv", "--plot", png])
        check(p.returncode == 0, "thermo --plot exit %d: %s" % (p.returncode, p.stderr))
        plain = run(["thermo"] + base + ["--mesh", "4x4x4", "-f", "csv"])
        check(p.stdout == plain.stdout, "thermo: the table with --plot equals the table without")
        check(png_size(png) == (900, 560), "thermo PNG size %s" % (png_size(png),))

        # usage errors, nothing written
        for args in (["--plot", os.path.join(tmp, "x.pdf")],
                     ["--plot", os.path.join(tmp, "x.png"), "--plot-size", "100x100"],
                     ["--plot", os.path.join(tmp, "x.png"), "--plot-size", "wide"],
                     ["--plot-size", "800x600"],
                     ["-o", os.path.join(tmp, "same.svg"), "--plot", os.path.join(tmp, "same.svg")]):
            p = run(["bands"] + base + args)
            check(p.returncode == 1 and b"plot" in p.stderr, "bands %s: exit %d %s" % (args, p.returncode, p.stderr))
        check(not any(os.path.exists(os.path.join(tmp, n)) for n in ("x.pdf", "x.png", "same.svg")),
              "no file written on a usage error")


if __name__ == "__main__":
    main()
    if failures:
        print("%d failures" % len(failures))
        sys.exit(1)
