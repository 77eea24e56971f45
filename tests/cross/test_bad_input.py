#!/usr/bin/python3
"""Bad input, usage errors and output refusals of `quaver modes`.

Contract (DESIGN.md §5 and the CLI spec): exit 1 on a usage error, 2 on bad
input (including a missing or unreadable file), 3 when the output cannot be
written (also: it exists and --force is not given); messages on stderr as
"quaver: FILE:LINE:COL: message"; never a crash (negative exit code = a
signal) or a sanitizer report; never a half-written output.

What the message must contain:
- errors inside a text file (XYZ, text Hessian, bundle JSON): "FILE:LINE"
  (and where the offending token is known, that exact line);
- a file that does not exist, a directory, or a binary .npy, which have no
  line to point at: "FILE:" (the path followed by a colon).
The committed bad files are in tests/cross/data (invented contents, see
data/README).
"""
import json
import os
import re
import numpy as np

import sys
sys.dont_write_bytecode = True      # keep the source tree clean
import qvtest as q  # noqa: E402

chk = q.Checker("bad-input")
D = q.DATA
WATER = os.path.join(D, "water.xyz")


def water_hessian():
    s, x, c, F = q.water_like()
    B = q.b_matrix(x, c)
    return B.T @ F @ B


def expect_error(label, args, code, where=None, line=None, column=False):
    """Runs quaver modes ARGS; wants exit @code and, when @where is given,
    "WHERE:" (line None and not column), "WHERE:<line>" (line True: any
    line; an int: that line), optionally followed by ":<column>"."""
    try:
        p = q.run(["modes"] + args, expect=None)
    except q.QuaverError as e:          # crash, sanitizer report or hang
        chk.ok(False, "%s: %s" % (label, e))
        return None
    err = p.stderr_text
    chk.ok(p.returncode == code, "%s: exit %d, expected %d; stderr %r"
           % (label, p.returncode, code, err.strip()))
    chk.ok(err.strip() != "", "%s: a message on stderr" % label)
    chk.ok(p.stdout_text.strip() == "", "%s: nothing on stdout, got %r" % (label, p.stdout_text[:200]))
    if where is not None:
        pat = re.escape(where) + ":"
        if line is None:
            pat += r"(\d+:)*(\s|$)"       # a line (and column) may follow
        else:
            pat += r"\d+" if line is True else str(line)
            if column:
                pat += r":\d+"
            pat += ":"
        chk.ok(re.search(pat, err) is not None,
               "%s: stderr should name %s; got %r"
               % (label, where + (":LINE" if line else ":") + (":COL" if column else ""), err.strip()))
    return p


def data(name):
    return os.path.join(D, name)


with q.tmpdir() as tmp:
    H = water_hessian()
    good_hes = q.write_hessian(os.path.join(tmp, "water.hess"), H)
    hopt = ["--hessian-units", "eV/A^2"]
    # the good pair works (so every failure below is due to its one defect)
    q.run(["modes", WATER, "--hessian", good_hes] + hopt)

    # --- files that cannot be read -------------------------------------------
    missing = os.path.join(tmp, "no-such.xyz")
    expect_error("missing geometry", [missing, "--hessian", good_hes] + hopt, 2, missing)
    missing_h = os.path.join(tmp, "no-such.hess")
    expect_error("missing Hessian", [WATER, "--hessian", missing_h] + hopt, 2, missing_h)
    expect_error("directory as geometry", [tmp, "--hessian", good_hes] + hopt, 2, tmp)
    expect_error("directory as Hessian", [WATER, "--hessian", tmp] + hopt, 2, tmp)

    # --- XYZ ------------------------------------------------------------------
    for name, line, col in (("xyz-truncated.xyz", True, False),
                            ("xyz-bad-count.xyz", 1, True),
                            ("xyz-count-mismatch.xyz", True, False),
                            ("xyz-unknown-element.xyz", 4, True),
                            ("xyz-nan.xyz", 5, True)):
        expect_error(name, [data(name), "--hessian", good_hes] + hopt, 2, data(name), line, col)

    # --- text Hessian ----------------------------------------------------------
    for name, line, col in (("hess-rows.hess", True, False),
                            ("hess-token.hess", 2, True),
                            ("hess-nan.hess", 4, True),
                            ("hess-6x6.hess", True, False)):
        expect_error(name, [WATER, "--hessian", data(name)] + hopt, 2, data(name), line, col)
    # an empty file has no line 1 worth pointing at in every reader; the
    # message must still name the file
    expect_error("hess-empty.hess", [WATER, "--hessian", data("hess-empty.hess")] + hopt, 2,
                 data("hess-empty.hess"))

    # --- .npy -----------------------------------------------------------------
    for name in ("hess-f4.npy", "hess-trunc.npy"):
        expect_error(name, [WATER, "--hessian", data(name)] + hopt, 2, data(name))
    wrong_shape = os.path.join(tmp, "shape.npy")
    np.save(wrong_shape, H[:, :8])
    expect_error(".npy of shape (9, 8)", [WATER, "--hessian", wrong_shape] + hopt, 2, wrong_shape)

    # --- bundles --------------------------------------------------------------
    s, x, _, _ = q.water_like()
    bundle = {"format": "quaver-bundle", "version": 1,
              "title": "invented water-like test molecule",
              "structure": {"atoms": [{"element": e, "position": list(map(float, r))}
                                      for e, r in zip(s, x)]},
              "hessian": {"units": "eV/A^2", "layout": "full", "data": H.tolist()}}
    ok_path = os.path.join(tmp, "ok.quaver.json")
    with open(ok_path, "w") as f:
        json.dump(bundle, f, indent=1)
    doc_b = q.modes_json([ok_path])
    doc_x = q.modes_json([WATER, "--hessian", good_hes] + hopt)
    chk.close([m["wavenumber"] for m in doc_b["modes"]], [m["wavenumber"] for m in doc_x["modes"]],
              "a valid bundle gives the modes of the same xyz + Hessian", rtol=1e-12)

    expect_error("bundle with bad JSON", [data("bundle-bad-json.quaver.json")], 2,
                 data("bundle-bad-json.quaver.json"), 4, True)
    deep = os.path.join(tmp, "deep.quaver.json")
    with open(deep, "w") as f:
        f.write("[" * 100000 + "]" * 100000 + "\n")
    expect_error("bundle nested 100 000 deep", [deep], 2, deep, 1, True)
    bundle["version"] = 99
    v_path = os.path.join(tmp, "v99.quaver.json")
    with open(v_path, "w") as f:
        json.dump(bundle, f, indent=1)
    p = expect_error("bundle version 99", [v_path], 2, v_path, True)
    if p is not None:
        chk.ok("99" in p.stderr_text and "version" in p.stderr_text.lower(),
               "bundle version 99: message names the version; got %r" % p.stderr_text.strip())

    # --- usage errors (exit 1) ------------------------------------------------
    base = [WATER, "--hessian", good_hes] + hopt
    expect_error("unknown option", base + ["--frobnicate"], 1)
    expect_error("--lowest -1", base + ["--lowest", "-1"], 1)
    expect_error("--lowest not a number", base + ["--lowest", "many"], 1)
    expect_error("--isotope 99=2 on a 3-atom molecule", base + ["--isotope", "99=2"], 1)
    expect_error("--mass 0=1.0 (atoms count from 1)", base + ["--mass", "0=1.0"], 1)
    expect_error("no geometry", ["--hessian", good_hes] + hopt, 1)

    # --- output ---------------------------------------------------------------
    out = os.path.join(tmp, "out.json")
    with open(out, "w") as f:
        f.write("keep me\n")
    expect_error("--output to an existing file without --force", base + ["--format", "json",
                                                                          "--output", out], 3)
    with open(out) as f:
        chk.ok(f.read() == "keep me\n", "the existing output file is left unchanged")
    p = q.run(["modes"] + base + ["--format", "json", "--output", out, "--force"], expect=None)
    chk.ok(p.returncode == 0, "--force: exit %d, stderr %r" % (p.returncode, p.stderr_text.strip()))
    try:
        with open(out) as f:
            replaced = json.load(f)
        chk.close([m["wavenumber"] for m in replaced["modes"]],
                  [m["wavenumber"] for m in doc_x["modes"]], "--force replaced the file with the "
                  "JSON table", rtol=0)
    except (ValueError, KeyError) as e:
        chk.ok(False, "--force: the output file is not the JSON table: %s" % e)
    chk.ok(p.stdout_text.strip() == "", "--output: nothing on stdout")
    nodir = os.path.join(tmp, "no-such-dir", "out.json")
    expect_error("--output into a missing directory", base + ["--output", nodir], 3)
    chk.ok(not os.path.exists(os.path.dirname(nodir)), "the missing directory was not created")
    # bad input with --output: nothing written
    new_out = os.path.join(tmp, "new.json")
    expect_error("bad input with --output", [data("xyz-nan.xyz"), "--hessian", good_hes] + hopt
                 + ["--output", new_out], 2)
    chk.ok(not os.path.exists(new_out), "no output file written after bad input")
    leftovers = [f for f in os.listdir(tmp) if f not in ("water.hess", "shape.npy", "ok.quaver.json",
                                                         "deep.quaver.json", "v99.quaver.json",
                                                         "out.json")]
    chk.ok(not leftovers, "no temporary files left behind: %s" % leftovers)

chk.finish("unreadable files, 5 bad XYZ, 5 bad text Hessians, 3 bad .npy, 3 bad bundles "
           "(exit 2 with FILE:LINE or FILE:), 6 usage errors (exit 1), output refusals (exit 3) "
           "and --force")
