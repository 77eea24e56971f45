#!/usr/bin/python3
"""test_distributed_refused.py — a build without MPI refuses --distributed
with a message that says how to get it (a usage error, exit 1), and still
refuses options that belong to it when it is not asked for.
SPDX-License-Identifier: GPL-3.0-or-later
"""
import os
import sys
import tempfile

import numpy as np
import qvtest as q

failures = []


def check(ok, what):
    print(("ok    " if ok else "FAIL  ") + what)
    if not ok:
        failures.append(what)


with tempfile.TemporaryDirectory(prefix="qv-nompi-") as tmp:
    # invented: a water-like triatomic with a diagonal Hessian
    x = np.array([[0.0, 0.0, 0.0], [0.96, 0.0, 0.0], [-0.24, 0.93, 0.0]])
    q.write_xyz(os.path.join(tmp, "w.xyz"), ["O", "H", "H"], x)
    q.write_npy(os.path.join(tmp, "w.npy"), np.eye(9) * 10.0)
    args = ["modes", os.path.join(tmp, "w.xyz"), "--hessian", os.path.join(tmp, "w.npy"),
            "--hessian-units", "eV/A^2"]
    p = q.run(args + ["--distributed"], expect=1)
    check("without MPI" in p.stderr_text and "-Dmpi=enabled" in p.stderr_text
          and "leave out --distributed" in p.stderr_text,
          "--distributed refused, naming -Dmpi=enabled: %r" % p.stderr_text.strip()[:160])
    check(p.stdout_text == "", "nothing on standard output")
    p = q.run(args + ["--block-size", "32"], expect=1)
    check("--block-size goes with --distributed" in p.stderr_text,
          "--block-size alone refused: %r" % p.stderr_text.strip()[:120])
    q.run(args)   # and the serial solve still works

sys.exit(1 if failures else 0)
