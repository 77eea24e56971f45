#!/usr/bin/python3
# make-data.py — writes the bundle reader's test files into this folder.
# Run with Debian's /usr/bin/python3 (NumPy writes the .npy files); the
# outputs are kept in the repository, so this only needs rerunning when the
# cases change.
#
# All structures, Hessians and modes here are invented for the tests; they
# are not results of any calculation.
# SPDX-License-Identifier: GPL-3.0-or-later
import json
import os

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))

# An invented bent triatomic (geometry like water's, values made up).
ATOMS = [
    {"element": "O", "position": [0.0, 0.0, 0.1173]},
    {"element": "H", "position": [0.0, 0.7572, -0.4692]},
    {"element": "H", "position": [0.0, -0.7572, -0.4692]},
]
N = 9


def matrix(n):
    """The test matrix; test-bundle.c computes the same closed form:
    H_ij = 10 δ_ij + ((i+1)(j+1) mod 7) / 4 (quarters, exact in binary)."""
    return np.array([[10.0 * (i == j) + ((i + 1) * (j + 1) % 7) / 4.0
                      for j in range(n)] for i in range(n)])


def num(x):
    """Shortest text that reads back as the same double."""
    return repr(float(x))


def rows(h, layout):
    n = h.shape[0]
    if layout == "full":
        return [[h[i, j] for j in range(n)] for i in range(n)]
    if layout == "lower":
        return [[h[i, j] for j in range(i + 1)] for i in range(n)]
    return [[h[i, j] for j in range(i, n)] for i in range(n)]


def dump(obj):
    """JSON, two-space indent, arrays of plain values on one line (so each
    matrix row and each position is one line)."""
    def scalar(x):
        return not isinstance(x, (dict, list))

    def fmt(x, indent):
        pad, inner = " " * indent, " " * (indent + 2)
        if isinstance(x, dict):
            if not x:
                return "{}"
            items = [f"{inner}{json.dumps(k, ensure_ascii=False)}: {fmt(v, indent + 2)}"
                     for k, v in x.items()]
            return "{\n" + ",\n".join(items) + "\n" + pad + "}"
        if isinstance(x, list):
            if all(scalar(v) for v in x):
                return "[" + ", ".join(fmt(v, 0) for v in x) + "]"
            return ("[\n" + ",\n".join(inner + fmt(v, indent + 2) for v in x)
                    + "\n" + pad + "]")
        return json.dumps(x, ensure_ascii=False)
    return fmt(obj, 0) + "\n"


def inline(layout, h=None, units="eV/A^2"):
    h = matrix(N) if h is None else h
    return {"units": units, "layout": layout, "data": rows(h, layout)}


def base(**extra):
    b = {
        "format": "quaver-bundle",
        "version": 1,
        "title": "Invented triatomic for the reader tests",
        "description": "Invented data; not the result of any calculation.",
        "structure": {"atoms": json.loads(json.dumps(ATOMS))},
        "hessian": inline("full"),
    }
    b.update(extra)
    return b


def write(name, obj):
    with open(os.path.join(HERE, name), "w", encoding="utf-8") as f:
        f.write(obj if isinstance(obj, str) else dump(obj))


def write_bytes(name, data):
    with open(os.path.join(HERE, name), "wb") as f:
        f.write(data)


def text_matrix(h, layout, sep=" ", header="# invented test matrix, eV/A^2\n"):
    lines = [sep.join(num(x) for x in r) for r in rows(h, layout)]
    return header + "\n".join(lines) + "\n"


def main():
    h = matrix(N)
    os.makedirs(os.path.join(HERE, "matrices"), exist_ok=True)

    # --- matrix files ---------------------------------------------------
    write("hessian-9.txt", text_matrix(h, "full"))
    write("matrices/hessian-9.lower.txt", text_matrix(h, "lower", sep=", "))
    np.save(os.path.join(HERE, "hessian-9.npy"), h)
    write("hessian-6.txt", text_matrix(matrix(6), "full"))

    # --- good bundles ---------------------------------------------------
    for layout in ("full", "lower", "upper"):
        write(f"good-inline-{layout}.quaver.json", base(hessian=inline(layout)))
    write("good-path-text.quaver.json",
          base(hessian={"units": "eV/A^2", "path": "hessian-9.txt"}))
    write("good-path-npy.quaver.json",
          base(hessian={"units": "eV/A^2", "path": "hessian-9.npy"}))
    write("good-path-subdir.quaver.json",
          base(hessian={"units": "eV/A^2", "layout": "lower",
                        "path": "./matrices/hessian-9.lower.txt"}))
    write("good-path-inner-dotdot.quaver.json",
          base(hessian={"units": "eV/A^2", "layout": "auto",
                        "path": "matrices/../hessian-9.txt"}))
    write("good-units-hartree.quaver.json",
          base(hessian=inline("full", units="hartree/bohr^2")))
    write("good-units-mdyn.quaver.json",
          base(hessian=inline("lower", units="mdyn/Å")))

    masses = base(masses="average")
    masses["structure"]["atoms"] = [
        {"element": "o", "position": ATOMS[0]["position"], "label": "O1", "isotope": 18},
        {"element": 1, "position": ATOMS[1]["position"], "label": "H1", "mass": 2.0141},
        {"element": "h", "position": ATOMS[2]["position"], "label": "H2"},
    ]
    write("good-masses.quaver.json", masses)

    isotopic = base()
    isotopic["structure"]["atoms"][0]["isotope"] = 17
    isotopic["structure"]["atoms"][1]["isotope"] = 2
    write("good-isotopes.quaver.json", isotopic)

    crystal = {
        "format": "quaver-bundle",
        "version": 1,
        "title": "Invented two-atom crystal",
        "structure": {
            "atoms": [{"element": "Na", "position": [0.0, 0.0, 0.0]},
                      {"element": "Cl", "position": [1.4, 1.4, 1.4]}],
            "cell": [[0.0, 2.8, 2.8], [2.8, 0.0, 2.8], [2.8, 2.8, 0.0]],
            "energy": -6.75,
            "forces": [[0.01, 0.0, -0.02], [-0.01, 0.0, 0.02]],
        },
        "hessian": inline("upper", matrix(6)),
    }
    write("good-crystal.quaver.json", crystal)

    slab = {
        "format": "quaver-bundle",
        "version": 1,
        "structure": {
            "atoms": [{"element": "Cu", "position": [0.0, 0.0, 5.0]}],
            "cell": [[2.55, 0.0, 0.0], [1.275, 2.2084, 0.0], [0.0, 0.0, 20.0]],
            "pbc": [True, True, False],
        },
        "hessian": inline("full", matrix(3)),
        "view": {"mode": 1, "camera": {"zoom": 1.5}},
    }
    write("good-slab.quaver.json", slab)

    # Precomputed modes: three invented vectors, wavenumbers ascending
    # with one imaginary (negative) mode.
    modes = base()
    del modes["hessian"]
    modes["masses"] = "isotopic"
    modes["modes"] = {
        "wavenumbers": [-120.5, 1595.0, 3657.0],
        "displacements": [
            [0.0, 0.0, 0.07, 0.0, -0.43, -0.56, 0.0, 0.43, -0.56],
            [0.0, 0.0, -0.05, 0.0, 0.58, 0.40, 0.0, -0.58, 0.40],
            [0.0, 0.07, 0.0, 0.0, -0.56, 0.43, 0.0, -0.56, -0.43],
        ],
    }
    modes["view"] = {"mode": 2, "free-form": ["kept", "for", "the", "app"]}
    write("good-modes.quaver.json", modes)

    # --- the examples in docs/formats.md (check_schema.py compares) -----
    co_atoms = [{"element": "C", "position": [0.0, 0.0, 0.0], "label": "C1"},
                {"element": "O", "position": [0.0, 0.0, 1.128], "label": "O1"}]
    k = 118.7  # eV/Å², an invented bond force constant
    co = np.zeros((6, 6))
    co[2, 2] = co[5, 5] = k
    co[2, 5] = co[5, 2] = -k
    write("good-docs-example.quaver.json", {
        "format": "quaver-bundle",
        "version": 1,
        "title": "Carbon monoxide (invented example)",
        "description": "A made-up Hessian for showing the format: one bond "
                       "stretch along z, nothing else.",
        "structure": {"atoms": co_atoms},
        "masses": "isotopic",
        "hessian": {"units": "eV/A^2", "layout": "lower", "data": rows(co, "lower")},
    })
    np.save(os.path.join(HERE, "co.hessian.npy"), co)
    write("good-docs-path.quaver.json", {
        "format": "quaver-bundle",
        "version": 1,
        "title": "Carbon monoxide (invented example), Hessian in a file",
        "structure": {"atoms": co_atoms},
        "hessian": {"units": "eV/A^2", "path": "co.hessian.npy"},
    })
    mc, mo = 12.0, 15.99491461957
    write("good-docs-modes.quaver.json", {
        "format": "quaver-bundle",
        "version": 1,
        "title": "Carbon monoxide (invented example), precomputed mode",
        "structure": {"atoms": co_atoms},
        "modes": {
            "wavenumbers": [2170.0],
            "displacements": [[0.0, 0.0, round(-mo / (mc + mo), 4),
                               0.0, 0.0, round(mc / (mc + mo), 4)]],
        },
    })

    # --- bad bundles ----------------------------------------------------
    def bad(name, obj):
        write(f"bad-{name}.quaver.json", obj)

    def atom_change(i, **kw):
        b = base()
        b["structure"]["atoms"][i].update(kw)
        return b

    bad("syntax-comma", '{\n  "format": "quaver-bundle",\n  "version": 1\n'
                        '  "structure": {}\n}\n')
    bad("syntax-trailing-comma", '{\n  "format": "quaver-bundle",\n  "version": 1,\n}\n')
    bad("syntax-comment", '{\n  // a comment\n  "format": "quaver-bundle"\n}\n')
    bad("syntax-single-quote", "{\n  'format': 'quaver-bundle'\n}\n")
    bad("syntax-nan", '{\n  "format": "quaver-bundle",\n  "energy": NaN\n}\n')
    bad("syntax-big-integer", '{\n  "format": "quaver-bundle",\n'
                              '  "version": 123456789012345678901\n}\n')
    bad("syntax-trailing-text", '{"format": "quaver-bundle", "version": 1}\n}\n')
    bad("syntax-unclosed", '{\n  "format": "quaver-bundle",\n  "title": "no end\n}\n')
    bad("syntax-truncated", dump(base())[:200])
    bad("syntax-escape", '{\n  "format": "quaver-bundle",\n  "title": "a \\q b"\n}\n')
    bad("syntax-surrogate", '{\n  "format": "quaver-bundle",\n  "title": "ab \\uD800"\n}\n')
    bad("syntax-surrogate-low", '{\n  "format": "quaver-bundle",\n'
                                '  "title": "\\uD83D\\uDE00 \\uDE00"\n}\n')
    write_bytes("bad-syntax-utf8.quaver.json",
                b'{\n  "format": "quaver-bundle",\n  "title": "caf\xc3\xa9 \xff"\n}\n')
    write("bad-empty.quaver.json", "\n  \n")
    bad("not-object", "[1, 2, 3]\n")

    b = base(); del b["format"]; bad("format-missing", b)
    bad("format-wrong", base(format="xyz"))
    bad("version-2", base(version=2))
    bad("version-0", base(version=0))
    bad("version-float", base(version=1.5))
    bad("version-string", base(version="1"))
    b = base(); del b["version"]; bad("version-missing", b)
    bad("title-type", base(title=5))

    bad("structure-type", base(structure=[]))
    b = base(); del b["structure"]; bad("structure-missing", b)
    b = base(); b["structure"]["atoms"] = []; bad("atoms-empty", b)
    b = base(); b["structure"]["atoms"] = {}; bad("atoms-type", b)
    b = base(); b["structure"]["atoms"][1] = 7; bad("atom-type", b)
    b = base(); b["structure"]["atom"] = b["structure"].pop("atoms"); bad("structure-key", b)
    bad("element-unknown", atom_change(1, element="Xx"))
    bad("element-deuterium", atom_change(2, element="D"))
    bad("element-z", atom_change(0, element=0))
    bad("element-bool", atom_change(0, element=True))
    b = base(); del b["structure"]["atoms"][0]["element"]; bad("element-missing", b)
    bad("position-count", atom_change(2, position=[0.0, 1.0]))
    bad("position-type", atom_change(0, position=[0.0, "0", 1.0]))
    b = atom_change(0)
    bad("position-infinite", dump(b).replace("0.1173", "1e999", 1))
    bad("label-type", atom_change(0, label=["O"]))
    bad("atom-key", atom_change(0, isotop=18))
    bad("isotope-unknown", atom_change(0, isotope=99))
    bad("isotope-type", atom_change(0, isotope="18"))
    bad("isotope-and-mass", atom_change(1, isotope=2, mass=2.014))
    bad("mass-zero", atom_change(1, mass=0))
    bad("mass-negative", atom_change(1, mass=-1.0))
    bad("masses-model", base(masses="natural"))

    b = base(); b["structure"]["cell"] = [[1.0, 0.0, 0.0], [2.0, 0.0, 0.0], [0.0, 0.0, 1.0]]
    bad("cell-singular", b)
    b = base(); b["structure"]["cell"] = [[1.0, 0.0, 0.0], [0.0, 1.0], [0.0, 0.0, 1.0]]
    bad("cell-shape", b)
    b = base(); b["structure"]["pbc"] = [True, False, False]; bad("pbc-no-cell", b)
    b = base(); b["structure"]["pbc"] = [1, 0, 0]; bad("pbc-type", b)
    b = base(); b["structure"]["energy"] = "low"; bad("energy-type", b)
    b = base(); b["structure"]["forces"] = [[0.0, 0.0, 0.0], [0.0, 0.0, 0.0]]
    bad("forces-count", b)

    b = base(); b["modes"] = {"wavenumbers": [1.0], "displacements": [[1.0] * 9]}
    bad("both", b)
    b = base(); del b["hessian"]; bad("neither", b)
    bad("hessian-type", base(hessian="hessian-9.txt"))
    hh = inline("full"); del hh["units"]; bad("units-missing", base(hessian=hh))
    bad("units-unknown", base(hessian=inline("full", units="eV/nm^2")))
    hh = inline("full"); hh["layout"] = "auto"; bad("layout-auto-inline", base(hessian=hh))
    hh = inline("full"); del hh["layout"]; bad("layout-missing", base(hessian=hh))
    hh = inline("full"); hh["layout"] = "diagonal"; bad("layout-unknown", base(hessian=hh))
    hh = inline("full"); hh["path"] = "hessian-9.txt"; bad("data-and-path", base(hessian=hh))
    hh = {"units": "eV/A^2", "layout": "full"}; bad("no-matrix", base(hessian=hh))
    hh = inline("full"); hh["unit"] = hh.pop("units"); bad("hessian-key", base(hessian=hh))
    hh = inline("lower"); hh["data"][4].append(1.0); bad("row-lower", base(hessian=hh))
    hh = inline("upper"); hh["data"][7] = hh["data"][7][1:]; bad("row-upper", base(hessian=hh))
    hh = inline("full"); hh["data"][0] = hh["data"][0][:8]; bad("row-full", base(hessian=hh))
    hh = inline("full"); hh["data"][3] = 1.0; bad("row-type", base(hessian=hh))
    hh = inline("full"); hh["data"][0][3] = True; bad("element-value-type", base(hessian=hh))
    bad("hessian-rows", base(hessian=inline("full", matrix(6))))
    hh = inline("lower", units="hartree/bohr^2"); hh["data"][5][2] = 1e307
    bad("overflow-after-units", base(hessian=hh))
    bad("path-absolute", base(hessian={"units": "eV/A^2", "path": "/etc/hostname"}))
    bad("path-dotdot", base(hessian={"units": "eV/A^2", "path": "../data/hessian-9.txt"}))
    bad("path-deep-dotdot", base(hessian={"units": "eV/A^2",
                                          "path": "matrices/../../hessian-9.txt"}))
    bad("path-folder", base(hessian={"units": "eV/A^2", "path": "matrices/.."}))
    bad("path-missing", base(hessian={"units": "eV/A^2", "path": "not-here.txt"}))
    bad("path-type", base(hessian={"units": "eV/A^2", "path": 9}))
    bad("path-size", base(hessian={"units": "eV/A^2", "path": "hessian-6.txt"}))

    def modes_bundle(w, d):
        b = base(); del b["hessian"]
        b["modes"] = {"wavenumbers": w, "displacements": d}
        return b
    v = [0.0, 0.0, 0.07, 0.0, -0.43, -0.56, 0.0, 0.43, -0.56]
    bad("modes-count", modes_bundle([1595.0, 3657.0], [v]))
    bad("modes-length", modes_bundle([1595.0], [v[:8]]))
    bad("modes-too-many", modes_bundle([float(k) for k in range(10)], [v] * 10))
    bad("modes-empty", modes_bundle([], []))
    bad("modes-zero-vector", modes_bundle([1595.0], [[0.0] * 9]))
    bad("modes-type", modes_bundle([1595.0], [v[:5] + [None] + v[6:]]))
    b = modes_bundle([1595.0], [v]); del b["modes"]["displacements"]
    bad("modes-missing-vectors", b)


if __name__ == "__main__":
    main()
