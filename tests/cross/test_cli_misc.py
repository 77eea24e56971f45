#!/usr/bin/env python3
"""Small end-to-end checks of `quaver modes` not covered elsewhere.

- A bundle's "masses": "average" reaches the report, and the masses used are
  the IUPAC CIAAW standard atomic weights (H 1.008, C 12.011, O 15.999;
  conventional values, from memory per REFERENCES.md), checked through the
  reduced mass of a diatomic stretch, which the definition
  mu' = 1/sum(l^2/m) fixes to mu*M^2/(m1^2+m2^2) (derived in
  tests/unit/test-solver.c).
- The exit code and message for the all-modes size limit come before the
  Hessian is read (no file needed).
- --version and --help exit 0.
"""
import json
import os
import subprocess
import sys
import tempfile

QUAVER = os.environ["QUAVER"]
failures = []


def run(*args):
    return subprocess.run([QUAVER, *args], capture_output=True, text=True)


def check(cond, what):
    if not cond:
        failures.append(what)


with tempfile.TemporaryDirectory(prefix="qv-misc-") as tmp:
    k = 100.0  # eV/A^2, invented
    bundle = {
        "format": "quaver-bundle", "version": 1,
        "title": "invented diatomic for a test",
        "structure": {"atoms": [
            {"element": "C", "position": [0, 0, 0]},
            {"element": "O", "position": [0, 0, 1.13]}]},
        "masses": "average",
        "hessian": {"units": "eV/A^2", "layout": "full", "data": [
            [0, 0, 0, 0, 0, 0], [0, 0, 0, 0, 0, 0], [0, 0, k, 0, 0, -k],
            [0, 0, 0, 0, 0, 0], [0, 0, 0, 0, 0, 0], [0, 0, -k, 0, 0, k]]},
    }
    path = os.path.join(tmp, "co.quaver.json")
    with open(path, "w") as f:
        json.dump(bundle, f)
    r = run("modes", path, "--format", "json")
    check(r.returncode == 0, f"average-mass bundle failed: {r.stderr}")
    if r.returncode == 0:
        doc = json.loads(r.stdout)
        check(doc["masses"] == "average", f"masses reported as {doc['masses']}")
        m1, m2 = 12.011, 15.999
        mu = m1 * m2 / (m1 + m2)
        expected = mu * (m1 + m2) ** 2 / (m1 * m1 + m2 * m2)
        got = doc["modes"][0]["reduced_mass"]
        check(abs(got - expected) < 1e-9 * expected,
              f"reduced mass {got}, expected {expected} from standard weights")

    # 10 923 atoms: 3N = 32 769 > 32 766, the dsyevd workspace limit
    # (LAPACK dsyevd docs: LWORK = 1 + 6n + 2n^2 in a 32-bit integer).
    big = os.path.join(tmp, "big.xyz")
    with open(big, "w") as f:
        n = 10923
        f.write(f"{n}\ninvented test geometry\n")
        for i in range(n):
            f.write(f"Ar {i * 4.0:.1f} 0 0\n")
    r = run("modes", big, "--hessian", os.path.join(tmp, "absent.txt"),
            "--hessian-units", "eV/A^2")
    check(r.returncode == 2 and "--lowest" in r.stderr,
          f"size limit: exit {r.returncode}, stderr {r.stderr!r}")

    # Output strings are escaped: a Hessian file name with a quote, a
    # backslash and a tab must come back verbatim (RFC 8259 escaping).
    odd = os.path.join(tmp, 'we"ird\\na\tme.txt')
    with open(odd, "w") as f:
        for row in bundle["hessian"]["data"]:
            f.write(" ".join(str(x) for x in row) + "\n")
    xyz = os.path.join(tmp, "co.xyz")
    with open(xyz, "w") as f:
        f.write("2\ninvented\nC 0 0 0\nO 0 0 1.13\n")
    r = run("modes", xyz, "--hessian", odd, "--hessian-units", "eV/A^2", "--format", "json")
    check(r.returncode == 0, f"odd file name: {r.stderr}")
    if r.returncode == 0:
        check(json.loads(r.stdout)["hessian"]["source"] == odd, "file name not escaped verbatim")

    # Forces from extended XYZ: gradient_norm = |F| and max_force = the
    # largest atomic |F_a| (definitions, checked with NumPy), and a force
    # above 0.025 eV/A (common practice for a converged optimisation) warns.
    import numpy as np
    forces = np.array([[0.03, -0.04, 0.0], [-0.03, 0.04, 0.0]])
    fx = os.path.join(tmp, "co-forces.xyz")
    with open(fx, "w") as f:
        f.write("2\nProperties=species:S:1:pos:R:3:forces:R:3 note=invented\n")
        f.write("C 0 0 0 %r %r %r\n" % tuple(forces[0]))
        f.write("O 0 0 1.13 %r %r %r\n" % tuple(forces[1]))
    r = run("modes", fx, "--hessian", odd, "--hessian-units", "eV/A^2", "--format", "json")
    check(r.returncode == 0, f"forces: {r.stderr}")
    if r.returncode == 0:
        doc = json.loads(r.stdout)
        check(abs(doc["gradient_norm"] - np.linalg.norm(forces)) < 1e-12, "gradient_norm")
        check(abs(doc["max_force"] - np.linalg.norm(forces, axis=1).max()) < 1e-12, "max_force")
        check(any("force" in w for w in doc["warnings"]), f"no force warning: {doc['warnings']}")

for args in (["--version"], ["--help"], ["modes", "--help"], ["help", "modes"]):
    r = run(*args)
    check(r.returncode == 0 and r.stdout, f"{args}: exit {r.returncode}")

for f in failures:
    print("FAIL:", f, file=sys.stderr)
print(f"cli-misc: {'FAILED ' + str(len(failures)) if failures else 'all'} checks "
      "(bundle mass model, size limit before reading, string escaping, forces, help/version)")
sys.exit(1 if failures else 0)
