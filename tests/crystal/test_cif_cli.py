#!/usr/bin/python3
# test_cif_cli.py — `quaver modes X.cif --hessian …` reads a CIF.
# SPDX-License-Identifier: GPL-3.0-or-later
#
# Rock salt (Kittel, Introduction to Solid State Physics, ch. 1): 4 NaCl in
# the conventional cube, so the command must see 8 atoms, Cl4Na4, and a
# 24-row Hessian. The Hessian here is NumPy's: an invented isotropic
# Einstein model k·I, whose every vibration has ω = √(k/m) — the two
# distinct wavenumbers are checked against that closed form (SI constants
# from CODATA 2018, from memory). A bad CIF exits with status 2 and a
# file:line:column message.
import json
import os
import re
import subprocess
import sys
import tempfile

import numpy as np

QUAVER = os.environ["QUAVER"]
ROOT = os.environ["QV_SOURCE_ROOT"]
DATA = os.path.join(ROOT, "tests", "data", "cif")

# CODATA 2018 (from memory): eV, u, c.
EV = 1.602176634e-19
U = 1.66053906660e-27
C_CM = 2.99792458e10
# NIST atomic masses of 23Na and 35Cl, u (from memory).
M_NA, M_CL = 22.98976928, 34.96885268


def wavenumber(k_ev_a2, mass_u):
    omega = np.sqrt(k_ev_a2 * EV / 1e-20 / (mass_u * U))
    return omega / (2 * np.pi * C_CM)


def main():
    failures = 0
    k = 2.0
    with tempfile.TemporaryDirectory() as tmp:
        hessian = os.path.join(tmp, "h.txt")
        np.savetxt(hessian, k * np.eye(24))
        run = subprocess.run([QUAVER, "modes", os.path.join(DATA, "rocksalt.cif"),
                              "--hessian", hessian, "--hessian-units", "eV/A^2",
                              "--project", "none", "--format", "json"],
                             capture_output=True, text=True)
        if run.returncode != 0:
            print("modes failed:", run.stderr)
            return 1
        doc = json.loads(run.stdout)
        if doc["natoms"] != 8 or doc["formula"] != "Cl4Na4":
            print("expected 8 atoms, Cl4Na4:", doc["natoms"], doc["formula"])
            failures += 1
        got = sorted(m["wavenumber"] for m in doc["modes"])
        want = sorted([wavenumber(k, M_NA)] * 12 + [wavenumber(k, M_CL)] * 12)
        if len(got) != 24 or not np.allclose(got, want, rtol=1e-6):
            print("wavenumbers", got, "expected", want)
            failures += 1

        bad = os.path.join(DATA, "bad", "partial-occupancy.cif")
        run = subprocess.run([QUAVER, "modes", bad, "--hessian", hessian,
                              "--hessian-units", "eV/A^2"], capture_output=True, text=True)
        if run.returncode != 2 or (bad + ":16:20: site 'Co2' has occupancy") not in run.stderr:
            print("partial occupancy: status", run.returncode, run.stderr)
            failures += 1
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
