#!/usr/bin/python3
"""`quaver convert`: every Hessian form Quaver reads, rewritten as one .npy.

NumPy is the reference reader and writer throughout: the inputs are written
here (text with repr(), the shortest spelling that reads back to the same
double, so the numbers are exact; .npy with np.save in C and Fortran order
and both byte orders), and the output is read back with np.load and
np.lib.format (the .npy format description, NEP 1) and compared bit for bit
(np.array_equal) with the matrix written.  A full matrix is asymmetric, so a
transposed output cannot pass; a triangle stands for the symmetric matrix
it describes.  Unit factors: scipy.constants (CODATA 2018), through
qvtest.UNIT_TO_EV_A2.
"""
import os
import subprocess
import numpy as np

import sys
sys.dont_write_bytecode = True      # keep the source tree clean
import qvtest as q  # noqa: E402

chk = q.Checker("convert")

N_ATOMS = 5
n = 3 * N_ATOMS
rng = np.random.default_rng(20261203)
# Asymmetric, elements of many magnitudes and both signs (invented).
A = rng.standard_normal((n, n)) * 10.0 ** rng.uniform(-4, 4, (n, n))
S = np.triu(A) + np.triu(A, 1).T                  # symmetric, from A's upper triangle
assert not np.array_equal(A, A.T)


def header_of(path):
    """Version and header of a .npy file, by NumPy's own format module."""
    with open(path, "rb") as f:
        version = np.lib.format.read_magic(f)
        read = (np.lib.format.read_array_header_1_0 if version == (1, 0)
                else np.lib.format.read_array_header_2_0)
        shape, fortran, dtype = read(f)
    return version, shape, fortran, dtype


def converted(tmp, source, extra=(), what=""):
    out = os.path.join(tmp, "out.npy")
    if os.path.exists(out):
        os.unlink(out)
    p = q.run(["convert", source, "-o", out] + list(extra), expect=None)
    if not chk.ok(p.returncode == 0, "%s: exit %d, stderr %r" % (what, p.returncode,
                                                                 p.stderr_text.strip())):
        return None, p
    version, shape, fortran, dtype = header_of(out)
    # The promised form: .npy 1.0, '<f8', C order, (n, n) (NumPy's reading
    # of the header).
    chk.ok(version == (1, 0) and shape == (n, n) and fortran is False and dtype.str == "<f8",
           "%s: header version %r shape %r fortran_order %r dtype %r" % (what, version, shape,
                                                                         fortran, dtype.str))
    return np.load(out), p


def same(got, expected, what):
    """Bit for bit: np.array_equal, plus the transpose named on failure."""
    if got is None:
        return
    chk.ok(np.array_equal(got, expected),
           "%s: np.load of the output differs from the matrix written%s" %
           (what, " (it is its transpose)" if np.array_equal(got, expected.T) else ""))


with q.tmpdir() as tmp:
    # --- text, every layout (NumPy/repr as the writer) ------------------------
    full = q.write_hessian(os.path.join(tmp, "full.hess"), A)
    got, p = converted(tmp, full, what="full text")
    same(got, A, "full text (asymmetric)")
    chk.ok("values unchanged" in p.stderr_text and "out.npy" in p.stderr_text
           and "%d×%d" % (n, n) in p.stderr_text,
           "full text: stderr states what was written, unchanged: %r" % p.stderr_text.strip())
    got, _ = converted(tmp, full, ["--hessian-layout", "full"], what="full text, --hessian-layout full")
    same(got, A, "full text, --hessian-layout full")
    commas = q.write_hessian(os.path.join(tmp, "commas.hess"), A, sep=", ",
                             comment="invented matrix")
    got, _ = converted(tmp, commas, what="full text with commas and a comment")
    same(got, A, "full text with commas and a comment")
    for layout in ("lower", "upper"):
        path = q.write_hessian(os.path.join(tmp, layout + ".hess"), S, layout=layout)
        got, _ = converted(tmp, path, what="%s triangle, detected" % layout)
        same(got, S, "%s triangle, detected: the symmetric matrix" % layout)
        path = q.write_hessian(os.path.join(tmp, layout + "-w.hess"), S, layout=layout, per_line=7)
        got, _ = converted(tmp, path, ["--hessian-layout", layout],
                           what="%s triangle wrapped 7 per line, explicit" % layout)
        same(got, S, "%s triangle wrapped, --hessian-layout %s" % (layout, layout))

    # --- .npy in both orders and byte orders (np.save as the writer) ----------
    for order in ("C", "F"):
        for endian in ("<", ">"):
            path = q.write_npy(os.path.join(tmp, "in-%s%s.npy" % (order, "le" if endian == "<"
                                                                  else "be")), A, order, endian)
            got, _ = converted(tmp, path, what=".npy %s order %sf8" % (order, endian))
            same(got, A, ".npy %s order %sf8 (asymmetric)" % (order, endian))

    # --- the size checks, as quaver modes makes them --------------------------
    xyz = q.write_xyz(os.path.join(tmp, "g.xyz"), ["C"] * N_ATOMS,
                      np.arange(3.0 * N_ATOMS).reshape(-1, 3))
    xyz_small = q.write_xyz(os.path.join(tmp, "g4.xyz"), ["C"] * (N_ATOMS - 1),
                            np.arange(3.0 * (N_ATOMS - 1)).reshape(-1, 3))
    npy = os.path.join(tmp, "in-Cle.npy")
    for source in (full, npy):
        got, _ = converted(tmp, source, ["--atoms", str(N_ATOMS)], what="--atoms %d" % N_ATOMS)
        same(got, A, "%s with --atoms %d" % (os.path.basename(source), N_ATOMS))
        got, _ = converted(tmp, source, ["--geometry", xyz], what="--geometry (5 atoms)")
        same(got, A, "%s with --geometry of %d atoms" % (os.path.basename(source), N_ATOMS))
        for extra in (["--atoms", str(N_ATOMS - 1)], ["--geometry", xyz_small]):
            out = os.path.join(tmp, "mismatch.npy")
            p = q.run(["convert", source, "-o", out] + extra, expect=None)
            chk.ok(p.returncode == 2 and source in p.stderr_text and "%d" % n in p.stderr_text
                   and not os.path.exists(out),
                   "%s %s: exit %d (expected 2), message naming the file and its %d rows, "
                   "no output: %r" % (os.path.basename(source), " ".join(extra), p.returncode, n,
                                      p.stderr_text.strip()))

    # --- malformed text: a letter on line 4 -----------------------------------
    lines = q.hessian_text(A).splitlines()
    words = lines[3].split(" ")
    words[2] = "x" + words[2]
    lines[3] = " ".join(words)
    bad = os.path.join(tmp, "bad.hess")
    with open(bad, "w") as f:
        f.write("\n".join(lines) + "\n")
    out = os.path.join(tmp, "bad.npy")
    p = q.run(["convert", bad, "-o", out], expect=None)
    chk.ok(p.returncode == 2 and (bad + ":4:") in p.stderr_text and not os.path.exists(out),
           "letter on line 4: exit %d (expected 2), message with %r, no output: %r"
           % (p.returncode, bad + ":4:", p.stderr_text.strip()))

    # --- an existing output: refused (3) unless --force -----------------------
    out = os.path.join(tmp, "kept.npy")
    with open(out, "wb") as f:
        f.write(b"not to be replaced\n")
    p = q.run(["convert", full, "-o", out], expect=None)
    with open(out, "rb") as f:
        kept = f.read()
    chk.ok(p.returncode == 3 and kept == b"not to be replaced\n" and out in p.stderr_text
           and "--force" in p.stderr_text,
           "existing output without --force: exit %d (expected 3), file unchanged %r, "
           "stderr %r" % (p.returncode, kept == b"not to be replaced\n", p.stderr_text.strip()))
    p = q.run(["convert", full, "-o", out, "--force"], expect=None)
    chk.ok(p.returncode == 0, "--force: exit %d, stderr %r" % (p.returncode, p.stderr_text.strip()))
    same(np.load(out), A, "--force: the replaced file")

    # --- unit conversion (factors from scipy.constants, CODATA 2018) ----------
    factor = q.UNIT_TO_EV_A2["hartree/bohr^2"] / q.UNIT_TO_EV_A2["kcal/mol/A^2"]
    got, p = converted(tmp, full, ["--hessian-units", "hartree/bohr^2", "--to-units", "kcal/mol/A^2"],
                       what="hartree/bohr^2 to kcal/mol/A^2")
    if got is not None:
        # The factor, computed in another order of operations, differs by a
        # few units in the last place (1e-15 relative seen); another CODATA
        # edition would differ by ~1e-8 (CODATA 2014's Hartree energy: 8e-9).
        chk.close(got, A * factor, "hartree/bohr^2 to kcal/mol/A^2 vs scipy.constants", rtol=1e-14)
        chk.ok("kcal/mol/A^2" in p.stderr_text,
               "conversion: stderr names the new unit: %r" % p.stderr_text.strip())

    # --- usage errors (1) ------------------------------------------------------
    for args, label in (
            (["convert", full, "-o", os.path.join(tmp, "u.npy"), "--no-such-option"], "unknown option"),
            (["convert", full], "no -o"),
            (["convert", "-o", os.path.join(tmp, "u.npy")], "no HESSIAN"),
            (["convert", full, "-o", os.path.join(tmp, "u.txt")], "output not named .npy"),
            (["convert", full, "-o", os.path.join(tmp, "u.npy"), "--hessian-units", "eV/A^2"],
             "--hessian-units without --to-units"),
            (["convert", full, "-o", os.path.join(tmp, "u.npy"), "--atoms", "5", "--geometry", xyz],
             "--atoms with --geometry"),
            (["convert", full, "-o", os.path.join(tmp, "u.npy"), "--hessian-layout", "diagonal"],
             "unknown layout")):
        p = q.run(args, expect=None)
        chk.ok(p.returncode == 1 and p.stderr_text.strip() != "" and not os.path.exists(
            os.path.join(tmp, "u.npy")) and not os.path.exists(os.path.join(tmp, "u.txt")),
            "%s: exit %d (expected 1), stderr %r" % (label, p.returncode, p.stderr_text.strip()))

    # --- a size beyond the machine is refused, not attempted ------------------
    # (QV_TEST_PHYSICAL_MEMORY plays a 64 MiB machine in builds with tests;
    # 3000 rows need 2 × 8 × 3000² bytes = 137 MiB.)
    env = dict(os.environ, QV_TEST_PHYSICAL_MEMORY=str(64 << 20))
    out = os.path.join(tmp, "big.npy")
    r = subprocess.run([q.QUAVER, "convert", full, "-o", out, "--atoms", "1000"],
                       capture_output=True, env=env, timeout=60)
    err = r.stderr.decode("utf-8", "replace")
    chk.ok(r.returncode == 2 and "too large" in err and not os.path.exists(out),
           "--atoms 1000 on a 64 MiB machine: exit %d (expected 2), stderr %r"
           % (r.returncode, err.strip()))

chk.finish("full text (asymmetric), commas, lower/upper detected and wrapped, 4 .npy variants, "
           "bit for bit against NumPy; .npy 1.0 <f8 C-order header; --atoms/--geometry "
           "checks; line of a malformed number; --force; a unit conversion; usage errors; "
           "memory refusal")
