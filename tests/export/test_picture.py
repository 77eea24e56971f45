#!/usr/bin/python3
"""`quaver picture` against the outside world, on the built-in demo
(invented data).

- Multi-frame XYZ: frame k of N is r0 + Q cos(2 pi k/N) d, d = l/sqrt(m)
  from `quaver modes --format json --vectors`, with Q the turning point
  Q_tp = sqrt(hbar/omega) of v = 0 (textbook harmonic oscillator:
  Griffiths, Introduction to Quantum Mechanics, ch. 2), or the Q that moves
  the atom that moves most by --max-displacement; CODATA 2018 constants
  typed below (Tiesinga et al., Rev. Mod. Phys. 93, 025010, 2021).
- PNG: parsed here by the PNG specification (ISO/IEC 15948 / RFC 2083):
  signature, chunk CRCs (zlib.crc32), IHDR size and colour type, IDAT
  inflated (zlib) and unfiltered here; the text chunks name the mode and
  the view; a transparent picture has alpha 0 in its corners and 255 on
  the molecule; the orientation a PNG records, given back with
  --orientation, gives the same pixels.
- SVG: parses as XML (xml.etree), one <circle class="atom"> per atom, the
  document's size is --size.
- GIF: parsed here by the GIF89a specification (CompuServe 1990): size,
  the NETSCAPE2.0 loop extension, N image descriptors, delays >= 2 cs that
  add up to --period.
- Refusal to overwrite (exit 3, file unchanged) and bad options (exit 1).
"""
import json
import os
import struct
import sys
import tempfile
import xml.etree.ElementTree as ET
import zlib

import numpy as np

sys.dont_write_bytecode = True
sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "cross"))
import qvtest as q  # noqa: E402

chk = q.Checker("picture")

# CODATA 2018 (Tiesinga et al. 2021), typed here
HBAR = 6.62607015e-34 / (2 * np.pi)
E_CHARGE = 1.602176634e-19
M_U = 1.66053906660e-27
OMEGA_UNIT = np.sqrt(E_CHARGE / (1e-20 * M_U))   # rad/s per sqrt(eV/(A^2 u))


def read_png(path):
    """(width, height, colour type, rows as an array, text dict)."""
    data = open(path, "rb").read()
    assert data[:8] == b"\x89PNG\r\n\x1a\n", "PNG signature"
    pos, idat, text, ihdr = 8, b"", {}, None
    while pos < len(data):
        (length,) = struct.unpack(">I", data[pos:pos + 4])
        kind = data[pos + 4:pos + 8]
        body = data[pos + 8:pos + 8 + length]
        (crc,) = struct.unpack(">I", data[pos + 8 + length:pos + 12 + length])
        chk.ok(zlib.crc32(kind + body) & 0xffffffff == crc, "PNG chunk %r CRC" % kind)
        if kind == b"IHDR":
            ihdr = struct.unpack(">IIBBBBB", body)
        elif kind == b"IDAT":
            idat += body
        elif kind == b"iTXt":
            key, rest = body.split(b"\0", 1)
            # compression flag, method, language\0, translated key\0, text
            rest = rest[2:]
            _lang, rest = rest.split(b"\0", 1)
            _tkey, value = rest.split(b"\0", 1)
            text[key.decode("latin-1")] = value.decode("utf-8")
        elif kind == b"tEXt":
            key, value = body.split(b"\0", 1)
            text[key.decode("latin-1")] = value.decode("latin-1")
        pos += 12 + length
    w, h, depth, ctype = ihdr[0], ihdr[1], ihdr[2], ihdr[3]
    assert depth == 8
    bpp = {2: 3, 6: 4}[ctype]
    raw = zlib.decompress(idat)
    stride = w * bpp
    out = np.zeros((h, stride), dtype=np.int32)
    prev = np.zeros(stride, dtype=np.int32)
    for y in range(h):
        f = raw[y * (stride + 1)]
        line = np.frombuffer(raw[y * (stride + 1) + 1:(y + 1) * (stride + 1)], dtype=np.uint8).astype(np.int32)
        cur = np.zeros(stride, dtype=np.int32)
        for x in range(stride):
            a = cur[x - bpp] if x >= bpp else 0
            b = prev[x]
            c = prev[x - bpp] if x >= bpp else 0
            if f == 0:
                p = 0
            elif f == 1:
                p = a
            elif f == 2:
                p = b
            elif f == 3:
                p = (a + b) // 2
            else:
                pa, pb, pc = abs(b - c), abs(a - c), abs(a + b - 2 * c)
                p = a if pa <= pb and pa <= pc else (b if pb <= pc else c)
            cur[x] = (line[x] + p) & 0xff
        out[y] = cur
        prev = cur
    return w, h, ctype, out.reshape(h, w, bpp), text


def read_gif(path):
    """(width, height, loop extension seen, delays in cs, image count)."""
    d = open(path, "rb").read()
    chk.ok(d[:6] == b"GIF89a", "GIF89a signature")
    w, h, flags = struct.unpack("<HHB", d[6:11])
    pos = 13 + (3 * 2 ** ((flags & 7) + 1) if flags & 0x80 else 0)
    loop, delays, images = False, [], 0

    def skip_blocks(p):
        while d[p] != 0:
            p += d[p] + 1
        return p + 1

    while d[pos] != 0x3B:
        if d[pos] == 0x21:
            label = d[pos + 1]
            if label == 0xF9:
                delays.append(struct.unpack("<H", d[pos + 4:pos + 6])[0])
            elif label == 0xFF and d[pos + 3:pos + 14] == b"NETSCAPE2.0":
                loop = True
            pos = skip_blocks(pos + 2)
        elif d[pos] == 0x2C:
            images += 1
            lflags = d[pos + 9]
            pos += 10 + (3 * 2 ** ((lflags & 7) + 1) if lflags & 0x80 else 0)
            pos = skip_blocks(pos + 1)   # LZW minimum code size, then data
        else:
            raise AssertionError("unexpected GIF block 0x%02x at %d" % (d[pos], pos))
    return w, h, loop, delays, images


tmp = tempfile.mkdtemp(prefix="qv-picture-")
first = q.run(["picture", "--demo", "--mode", "7", "-o", os.path.join(tmp, "probe.png")], expect=None)
if first.returncode != 0 and ("EGL" in first.stderr_text or "GL" in first.stderr_text):
    print("skipped: no offscreen GL here: " + first.stderr_text.strip())
    sys.exit(77)
chk.ok(first.returncode == 0, "picture --demo writes a PNG: %r" % first.stderr_text)

doc = q.modes_json(["--demo", "--vectors"])
x0 = np.array([[a["x"], a["y"], a["z"]] for a in doc["atoms"]], dtype=float) if "atoms" in doc else None
arr = q.mode_arrays(doc)
natoms = doc["natoms"]

# --- XYZ frames against numpy ---------------------------------------------
k = 6                                          # mode 7
xyz = os.path.join(tmp, "m7.xyz")
q.run(["picture", "--demo", "--mode", "7", "--frames", "12", "-o", xyz])
lines = open(xyz).read().splitlines()
frames = [lines[i:i + natoms + 2] for i in range(0, len(lines), natoms + 2)]
chk.ok(len(frames) == 12, "XYZ has --frames frames: %d" % len(frames))
pos = np.array([[[float(t) for t in l.split()[1:4]] for l in f[2:]] for f in frames])
d = arr["D"][:, k].reshape(natoms, 3)
Q_tp = np.sqrt(HBAR / (np.sqrt(arr["eigenvalue"][k]) * OMEGA_UNIT) / (M_U * 1e-20))
rest = pos[3]                                  # phase 90 deg: at rest
for j in range(12):
    chk.close(pos[j], rest + Q_tp * np.cos(2 * np.pi * j / 12) * d, "frame %d = r0 + Q_tp cos(phi) d" % j,
              atol=2e-10)
chk.ok("phase_deg=90" in frames[3][1] or "phase_deg=90.0000" in frames[3][1],
       "frame 3 of 12 says phase 90: %r" % frames[3][1])
xyz2 = os.path.join(tmp, "m7b.xyz")
q.run(["picture", "--demo", "--mode", "7", "--frames", "4", "--max-displacement", "0.2", "-o", xyz2])
lines = open(xyz2).read().splitlines()
p0 = np.array([[float(t) for t in l.split()[1:4]] for l in lines[2:natoms + 2]])
p1 = np.array([[float(t) for t in l.split()[1:4]] for l in lines[natoms + 4:2 * natoms + 4]])
chk.close(np.max(np.linalg.norm(p0 - p1, axis=1)), 0.2, "--max-displacement 0.2: largest atom moves 0.2 A",
          atol=2e-9)

# --- PNG -------------------------------------------------------------------
png = os.path.join(tmp, "a.png")
q.run(["picture", "--demo", "--mode", "7", "--size", "320x200", "--view", "x", "--rotate", "10,20,30",
       "-o", png])
w, h, ctype, px, text = read_png(png)
chk.ok((w, h, ctype) == (320, 200, 2), "PNG 320x200 RGB: %r" % ((w, h, ctype),))
chk.ok("mode 7" in text.get("Description", ""), "PNG text names the mode: %r" % text.get("Description"))
chk.ok("quaver:orientation" in text, "PNG records the orientation")
again = os.path.join(tmp, "b.png")
q.run(["picture", "--demo", "--mode", "7", "--size", "320x200", "--orientation",
       text.get("quaver:orientation", "0,0,0,1"), "-o", again])
_, _, _, px2, _ = read_png(again)
diff = np.abs(px - px2)
chk.ok(diff.max() <= 2, "the recorded orientation gives the same picture (max diff %d)" % diff.max())

# a bundle's "view" (docs/formats.md) stands in for --mode and --orientation
src = os.path.join(os.environ["QV_SOURCE_ROOT"], "data", "examples", "ethanol-unconverged",
                   "ethanol.quaver.json")
bundle = json.load(open(src))
bundle["view"] = {"mode": 7, "orientation": [float(t) for t in
                                             text.get("quaver:orientation", "0,0,0,1").split(",")]}
bpath = os.path.join(tmp, "viewed.quaver.json")
json.dump(bundle, open(bpath, "w"))
vpng = os.path.join(tmp, "v.png")
q.run(["picture", bpath, "--size", "320x200", "-o", vpng])
_, _, _, px3, text3 = read_png(vpng)
chk.ok("mode 7" in text3.get("Description", ""), "the bundle's view names the mode")
chk.ok(np.abs(px - px3).max() <= 2, "the bundle's view gives the same picture (max diff %d)"
       % np.abs(px - px3).max())
bundle["view"] = {"orientation": [0, 0, 0, 0]}
json.dump(bundle, open(bpath, "w"))
p = q.run(["picture", bpath, "--mode", "7", "-o", os.path.join(tmp, "w.png")], expect=2)
chk.ok("view.orientation" in p.stderr_text, "a zero quaternion in the bundle: exit 2, names "
       "view.orientation: %r" % p.stderr_text.strip())

tpng = os.path.join(tmp, "t.png")
q.run(["picture", "--demo", "--mode", "7", "--size", "160x120", "--transparent", "-o", tpng])
w, h, ctype, px, _ = read_png(tpng)
chk.ok(ctype == 6, "--transparent: RGBA")
chk.ok(all(px[y, x, 3] == 0 for y, x in [(0, 0), (0, w - 1), (h - 1, 0), (h - 1, w - 1)]),
       "transparent corners")
chk.ok(int((px[:, :, 3] == 255).sum()) > 200, "the molecule is opaque")

# --- SVG -------------------------------------------------------------------
svg = os.path.join(tmp, "a.svg")
q.run(["picture", "--demo", "--mode", "7", "--size", "640x480", "-o", svg])
root = ET.parse(svg).getroot()
ns = "{http://www.w3.org/2000/svg}"
atoms = [c for c in root.iter(ns + "circle") if "atom" in c.get("class", "").split()]
chk.ok(len(atoms) == natoms, "SVG: one atom disc per atom: %d of %d" % (len(atoms), natoms))
chk.ok(root.get("width", "").startswith("640") and root.get("height", "").startswith("480"),
       "SVG size: %r x %r" % (root.get("width"), root.get("height")))

# --- GIF -------------------------------------------------------------------
gif = os.path.join(tmp, "a.gif")
q.run(["picture", "--demo", "--mode", "7", "--size", "200x150", "--frames", "16", "--period", "1.5",
       "-o", gif])
w, h, loop, delays, images = read_gif(gif)
chk.ok((w, h) == (200, 150), "GIF size %r" % ((w, h),))
chk.ok(loop, "GIF loops (NETSCAPE2.0)")
chk.ok(images == 16, "GIF has 16 frames: %d" % images)
chk.ok(len(delays) == 16 and min(delays) >= 2 and sum(delays) == 150,
       "GIF delays >= 2 cs adding up to 1.5 s: %r" % delays)

# --- refusals ----------------------------------------------------------------
before = open(png, "rb").read()
p = q.run(["picture", "--demo", "--mode", "7", "-o", png], expect=3)
chk.ok(open(png, "rb").read() == before and "--force" in p.stderr_text,
       "existing file: exit 3, unchanged, names --force")
for args, words in [(["--size", "10x10"], "--size"), (["--mode", "0"], "--mode"),
                    (["--supersample", "9"], "--supersample"), (["--view", "w"], "--view")]:
    p = q.run(["picture", "--demo", "-o", os.path.join(tmp, "x.png")] + (["--mode", "7"] if "--mode" not in args else []) + args, expect=1)
    chk.ok(words in p.stderr_text, "%s: exit 1, says %s: %r" % (args, words, p.stderr_text.strip()))
p = q.run(["picture", "--demo", "--mode", "7", "-o", os.path.join(tmp, "x.bmp")], expect=1)
chk.ok(".png" in p.stderr_text, "unknown extension: exit 1 naming the formats")

chk.finish("XYZ frames, PNG, SVG, GIF and refusals on the demo")
