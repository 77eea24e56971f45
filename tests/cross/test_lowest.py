#!/usr/bin/python3
"""--lowest K (range solver) against the full solve and against numpy.

Systems (all invented): a random stable spring network of 36 atoms; the same
network with one spring made strongly negative (one imaginary mode); a bent
triatomic with two stretch springs and no bend term (one genuine zero
vibration besides the six rigid-body motions: common practice — a bend
with no restoring force costs no energy).

- --lowest K equals the first K modes of the full solve: wavenumbers
  relative 1e-9 (abs tolerance for zero modes, see below), mass-weighted
  vectors elementwise 1e-7 (both runs print canonical signs: largest
  component positive, DESIGN.md §2); vectors of modes with no close
  neighbour are unique up to sign, so this is a real test.
- The full solve equals numpy's eigenvalues of PKP on the complement of V
  (relative 1e-9).
- A zero eigenvalue is known only to rounding (~1e-15 of the largest), so
  its wavenumber ~ +/-1e-5 cm^-1 has no meaningful relative value: there
  eigenvalues are compared with an absolute tolerance of 1e-12 times the
  largest |eigenvalue|.
- K larger than the number of vibrations behaves like the full solve.
"""
import os
import numpy as np

import sys
sys.dont_write_bytecode = True      # keep the source tree clean
import qvtest as q  # noqa: E402

chk = q.Checker("lowest")


def arrays(doc, masses):
    a = q.mode_arrays(doc, masses)
    return a["eigenvalue"], a["L"]


def check_system(label, symbols, x, H, ks, tmp):
    masses = q.masses_of(symbols)
    ref = q.reference_modes(x, masses, H)
    nvib = len(ref["lam"])
    scale = np.abs(ref["lam"]).max()
    zero = np.abs(ref["lam"]) < 1e-10 * scale
    xyz, hes = q.write_inputs(tmp, symbols, x, H, name=label.replace(" ", "_"))
    base = [xyz, "--hessian", hes, "--hessian-units", "eV/A^2", "--vectors"]
    full = q.modes_json(base)
    lam_f, L_f = arrays(full, masses)
    chk.ok(len(lam_f) == nvib, "%s: full solve gives %d modes, expected %d" % (label, len(lam_f), nvib))
    if len(lam_f) != nvib:
        return
    chk.close(lam_f, ref["lam"], "%s: full-solve eigenvalues vs numpy" % label, rtol=1e-9,
              atol=1e-12 * scale)
    nu_f = np.array([m["wavenumber"] for m in full["modes"]])
    chk.close(nu_f[~zero], ref["nu"][~zero], "%s: full-solve wavenumbers (non-zero modes) vs numpy" % label,
              rtol=1e-9)
    for K in ks:
        doc = q.modes_json(base + ["--lowest", str(K)])
        lam_k, L_k = arrays(doc, masses)
        m = min(K, nvib)
        chk.ok(len(lam_k) == m, "%s --lowest %d: %d modes, expected %d" % (label, K, len(lam_k), m))
        chk.ok(doc["n_vibrations"] == nvib, "%s --lowest %d: n_vibrations %s, expected %d"
               % (label, K, doc["n_vibrations"], nvib))
        chk.ok(doc.get("lowest") in (K, None if K >= nvib else K),
               "%s --lowest %d: JSON lowest = %r" % (label, K, doc.get("lowest")))
        if len(lam_k) != m:
            continue
        chk.close(lam_k, lam_f[:m], "%s --lowest %d: eigenvalues vs full" % (label, K), rtol=1e-9,
                  atol=1e-12 * scale)
        nu_k = np.array([mm["wavenumber"] for mm in doc["modes"]])
        chk.close(nu_k[~zero[:m]], nu_f[:m][~zero[:m]],
                  "%s --lowest %d: wavenumbers vs full" % (label, K), rtol=1e-9)
        chk.close(L_k, L_f[:, :m], "%s --lowest %d: mass-weighted vectors vs full" % (label, K),
                  atol=1e-7)
        chk.ok([mm["index"] for mm in doc["modes"]] == list(range(1, m + 1)),
               "%s --lowest %d: indices 1..%d" % (label, K, m))
        # the other columns of the table must not depend on the solver either
        for key in ("reduced_mass", "force_constant", "collectivity"):
            a = np.array([mm[key] for mm in doc["modes"]])[~zero[:m]]
            b = np.array([mm[key] for mm in full["modes"]])[:m][~zero[:m]]
            chk.close(a, b, "%s --lowest %d: %s vs full" % (label, K, key), rtol=1e-7, atol=1e-12)
    print("%s: %d vibrations, lowest %s cm^-1, %d zero, %d imaginary; K = %s"
          % (label, nvib, np.array2string(ref["nu"][:3], precision=3), int(zero.sum()),
             int((ref["lam"] < 0).sum() - (zero & (ref["lam"] < 0)).sum()), ks))
    return ref


with q.tmpdir() as tmp:
    symbols, x, pairs, k = q.random_network(36, 5)
    H = q.spring_hessian(x, pairs, k)
    ref = check_system("stable network", symbols, x, H, [1, 3, 10, 40, 101, 102, 150], tmp)
    chk.ok(ref["lam"].min() > 0, "independent side: the stable network has no negative eigenvalue")

    k2 = k.copy()
    k2[0] = -60.0                     # one strongly negative spring (invented)
    H2 = q.spring_hessian(x, pairs, k2)
    ref2 = check_system("network with a negative spring", symbols, x, H2, [1, 2, 7, 50], tmp)
    chk.ok((ref2["lam"] < 0).sum() >= 1, "independent side: the negative spring gives an imaginary mode")

    # bent triatomic, two stretch springs, no bend term
    theta = np.deg2rad(117.0)
    xt = np.array([[0.0, 0.0, 0.0], [1.2, 0.0, 0.0], [1.2 * np.cos(theta), 1.2 * np.sin(theta), 0.0]])
    xt = xt @ q.rotation_matrix([1, 1, 0.3], 0.9).T
    Ht = q.spring_hessian(xt, [(0, 1), (0, 2)], [38.0, 31.0])
    ref3 = check_system("bent triatomic without bend", ["N", "O", "O"], xt, Ht, [1, 2, 3, 20], tmp)
    nz = int((np.abs(ref3["lam"]) < 1e-10 * np.abs(ref3["lam"]).max()).sum())
    chk.ok(nz == 1, "independent side: the springs-only triatomic has exactly one zero vibration (%d)" % nz)

chk.finish("--lowest K vs the full solve (eigenvalues, wavenumbers, vectors, table columns) "
           "and the full solve vs numpy, for a stable network, one with an imaginary mode, "
           "one with a genuine zero mode, and K beyond the number of vibrations")
