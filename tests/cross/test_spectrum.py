#!/usr/bin/python3
"""`quaver spectrum` against closed forms and NumPy/SciPy.

- Rigid-charge model: point charges q_a that move with their atoms have
  dipole derivatives d mu_i / d x_aj = q_a delta_ij (the dipole is
  sum_a q_a r_a; from memory, any electrostatics text), so per mode
  d mu/dQ = sum_a q_a d_a with d_a = l_a / sqrt(m_a) the Cartesian
  displacement of unit Q.  The modes are solved here with NumPy
  (qvtest.reference_modes), independently of Quaver.
- IR intensity in the double-harmonic approximation:
  A = N_A / (12 eps0 c^2) |d mu/dQ|^2 (SI, Q mass-weighted; e.g. Wilson,
  Decius & Cross, Molecular Vibrations, 1955), constants from
  scipy.constants (CODATA 2018).  REFERENCES.md quotes the usual
  conversion 1 (D/A)^2/u = 42.2561 km/mol: recomputed here.
- A linear symmetric triatomic (invented, CO2-like) with charges
  -q, 2q, -q: the symmetric stretch is IR-inactive by symmetry; the
  antisymmetric stretch and the bends have closed forms (Goldstein, Poole &
  Safko, Classical Mechanics, 3rd ed., sec. 6.4, for the stretch patterns).
- Raman: a bond-polarizability model of our own (each bond an isotropic
  part a(r) and a traceless part g(r) (e e^T - I/3), equilibrium anisotropy
  zero) whose invariants have a closed form; the activity
  S = 45 a'^2 + 7 g'^2 (Long, The Raman Effect, 2002), the cross-section
  of Polavarapu, J. Phys. Chem. 94, 8106 (1990).  The mutual exclusion rule
  for a centrosymmetric molecule (from memory, any group-theory text) is
  checked on the linear molecule.
- The broadened spectrum integrates to the sum of the sticks, within the
  truncation of the line shapes at the grid ends (computed here with the
  scipy.stats Cauchy and normal CDFs) and the trapezoidal error bound.
- PNG (signature and IHDR, RFC 2083) and SVG (xml.etree) with the right size.
- Bad tensors: exit 2 with FILE:LINE; units missing: exit 1 on the command
  line, exit 2 with FILE:LINE:COL in a bundle.
SPDX-License-Identifier: GPL-3.0-or-later
"""
import json
import os
import re
import struct
import sys
import xml.etree.ElementTree as ET

import numpy as np
import scipy.constants as sc
import scipy.stats

sys.dont_write_bytecode = True      # keep the source tree clean
import qvtest as q  # noqa: E402

chk = q.Checker("spectrum")

# --- constants (scipy.constants, CODATA 2018) ------------------------------
E2_U = sc.e ** 2 / q.M_U                                          # C^2/kg
IR_PER_E2_U = sc.N_A / (12.0 * sc.epsilon_0 * sc.c ** 2) * E2_U / 1000.0   # km/mol
DEBYE = 1e-21 / sc.c                                              # C m
D_PER_A_IN_E = DEBYE / (sc.e * 1e-10)
IR_PER_D2_A2_U = IR_PER_E2_U * D_PER_A_IN_E ** 2
# REFERENCES.md: 1 (D/A)^2/u = 42.2561 km/mol (the usual conversion)
chk.close(IR_PER_D2_A2_U, 42.2561, "1 (D/A)^2/u in km/mol from CODATA", rtol=2e-6)


def cartesian_modes(x, masses, H):
    """Wavenumbers and Cartesian displacements d (3N x m) for unit Q, from
    NumPy (qvtest.reference_modes)."""
    ref = q.reference_modes(x, masses, H)
    nu = np.asarray(ref["nu"], dtype=float)
    L = np.asarray(ref["L"], dtype=float)
    D = L / np.sqrt(np.repeat(masses, 3))[:, None]
    return nu, D


def rigid_apt(charges):
    n = len(charges)
    apt = np.zeros((3, 3 * n))
    for a, qa in enumerate(charges):
        for j in range(3):
            apt[j, 3 * a + j] = qa
    return apt


def bond_alpha_derivatives(x, bonds, a_prime, g_prime):
    """d alpha_ab / d x_j (6 x 3N: xx yy zz xy xz yz) of the bond model."""
    x = np.asarray(x, dtype=float).reshape(-1, 3)
    n = 3 * len(x)
    out = np.zeros((6, n))
    comps = [(0, 0), (1, 1), (2, 2), (0, 1), (0, 2), (1, 2)]
    for (i, j), ap, gp in zip(bonds, a_prime, g_prime):
        u = x[j] - x[i]
        u /= np.linalg.norm(u)
        T = ap * np.eye(3) + gp * (np.outer(u, u) - np.eye(3) / 3.0)
        # dr/dx_j = u, dr/dx_i = -u
        for c, (p, r) in enumerate(comps):
            out[c, 3 * j:3 * j + 3] += T[p, r] * u
            out[c, 3 * i:3 * i + 3] -= T[p, r] * u
    return out


def bond_model_invariants(x, bonds, a_prime, g_prime, d):
    """Closed form for one mode with displacement d (3N): s_b = dr_b/dQ,
    alpha' = sum a'_b s_b, gamma'^2 = 3/2 sum_bc g'_b g'_c s_b s_c
    (cos^2 theta_bc - 1/3) (the traceless part's (3/2) tr A^2)."""
    x = np.asarray(x, dtype=float).reshape(-1, 3)
    d = np.asarray(d).reshape(-1, 3)
    us, s = [], []
    for (i, j) in bonds:
        u = x[j] - x[i]
        u /= np.linalg.norm(u)
        us.append(u)
        s.append(u @ (d[j] - d[i]))
    alpha = sum(ap * sb for ap, sb in zip(a_prime, s))
    gamma2 = 0.0
    for b in range(len(bonds)):
        for c in range(len(bonds)):
            gamma2 += 1.5 * g_prime[b] * g_prime[c] * s[b] * s[c] * ((us[b] @ us[c]) ** 2 - 1.0 / 3.0)
    return alpha, gamma2


def raman_cross_section(S, nu, nu0, T):
    """Polavarapu (1990): d sigma/d Omega = (2 pi)^4/45 (nu0 - nu)^4
    h/(8 pi^2 c nu) S / (1 - exp(-h c nu/k T)), SI; returned in 1e-30 cm^2/sr
    for S in A^4/u and wavenumbers in cm^-1."""
    nu_m, nu0_m = nu * 100.0, nu0 * 100.0
    S_si = S * 1e-40 / q.M_U
    bose = 1.0 / (1.0 - np.exp(-sc.h * sc.c * nu_m / (sc.k * T)))
    sigma = (2 * np.pi) ** 4 / 45.0 * (nu0_m - nu_m) ** 4 * sc.h / (8 * np.pi ** 2 * sc.c * nu_m) * S_si * bose
    return sigma * 1e4 / 1e-30


def write_rows(path, rows, header="invented test tensor"):
    with open(path, "w") as f:
        f.write("# %s\n" % header)
        for r in rows:
            f.write(" ".join("%.17g" % v for v in r) + "\n")


def spectrum_json(args):
    p = q.run(["spectrum"] + list(args) + ["--format", "json"])
    return json.loads(p.stdout_text), p


def masses_args(masses):
    return sum((["--mass", "%d=%.17g" % (i + 1, m)] for i, m in enumerate(masses)), [])


_tmp = q.tmpdir()
tmp = _tmp.name

# ---------------------------------------------------------------------------
# 1. Water-like triatomic, rigid charges: IR closed form per mode
# ---------------------------------------------------------------------------
sym, x, coords, F = q.water_like()
B = q.b_matrix(x, coords)
H = B.T @ F @ B
masses = q.masses_of(sym)
xyz, hess = q.write_inputs(tmp, sym, x, H, name="water")
charges = np.array([-0.82, 0.41, 0.41])       # invented; sum zero
apt = rigid_apt(charges)
write_rows(os.path.join(tmp, "water.apt"), apt, "rigid charges -0.82 0.41 0.41 (invented)")
nu_ref, D = cartesian_modes(x, masses, H)
base = [xyz, "-H", hess, "-u", "eV/A^2"] + masses_args(masses)
doc, _ = spectrum_json(base + ["--dipole-derivatives", os.path.join(tmp, "water.apt"),
                               "--dipole-units", "e"])
got_nu = np.array([m["wavenumber"] for m in doc["modes"]])
got_ir = np.array([m["ir"] for m in doc["modes"]])
chk.close(got_nu, nu_ref, "water-like wavenumbers against NumPy", rtol=1e-9)
dmu = np.array([[charges @ D[j::3, k] for j in range(3)] for k in range(D.shape[1])])
ir_ref = IR_PER_E2_U * np.sum(dmu ** 2, axis=1)
chk.close(got_ir, ir_ref, "water-like rigid-charge IR (km/mol), closed form", rtol=1e-8)
got_dmu = np.array([m["dipole_derivative"] for m in doc["modes"]])
chk.close(np.abs(np.sum(got_dmu * dmu, axis=1)), np.sum(dmu ** 2, axis=1),
          "d mu/dQ along the closed form (up to the mode's sign)", rtol=1e-8)
print("water-like IR km/mol:", np.round(got_ir, 4), "reference", np.round(ir_ref, 4))

# The same tensor in D/A and in a bundle: the same intensities.
write_rows(os.path.join(tmp, "water-d.apt"), apt / D_PER_A_IN_E)
doc_d, _ = spectrum_json(base + ["--dipole-derivatives", os.path.join(tmp, "water-d.apt"),
                                 "--dipole-units", "D/A"])
chk.close([m["ir"] for m in doc_d["modes"]], ir_ref, "D/A input (1 D = 1e-21/c C m)", rtol=1e-8)

bundle = {
    "format": "quaver-bundle", "version": 1, "title": "invented water-like test",
    "structure": {"atoms": [{"element": s, "position": list(map(float, p)), "mass": float(m)}
                            for s, p, m in zip(sym, x, masses)]},
    "hessian": {"units": "eV/A^2", "layout": "full", "data": H.tolist()},
    "dipole_derivatives": {"units": "e", "data": apt.tolist()},
}
bpath = os.path.join(tmp, "water.quaver.json")
with open(bpath, "w") as f:
    json.dump(bundle, f, indent=1)
doc_b, _ = spectrum_json([bpath])
chk.close([m["ir"] for m in doc_b["modes"]], ir_ref, "dipole derivatives from a bundle", rtol=1e-8)

# CSV stick table: columns and numbers
p = q.run(["spectrum"] + base + ["--dipole-derivatives", os.path.join(tmp, "water.apt"),
                                 "--dipole-units", "e", "--scale", "0.96"])
lines = p.stdout_text.strip().splitlines()
chk.ok(lines[0] == "mode,wavenumber_cm-1,scaled_wavenumber_cm-1,ir_km_mol,raman_activity_A4_u,"
       "raman_intensity_1e-30_cm2_sr", "CSV header: %r" % lines[0])
rows = [l.split(",") for l in lines[1:]]
chk.ok(len(rows) == 3 and all(len(r) == 6 for r in rows), "CSV: 3 rows of 6 fields")
chk.close([float(r[2]) for r in rows], 0.96 * nu_ref, "CSV scaled wavenumbers", rtol=1e-9)
chk.close([float(r[3]) for r in rows], ir_ref, "CSV IR column", rtol=1e-8)
chk.ok(all(r[4] == "" and r[5] == "" for r in rows), "CSV: no Raman columns without polarizability derivatives")

# ---------------------------------------------------------------------------
# 2. Linear symmetric triatomic, charges -q, 2q, -q
# ---------------------------------------------------------------------------
axis = np.array([0.36, -0.48, 0.8])
axis /= np.linalg.norm(axis)
r_co = 1.16
xl = np.array([-r_co * axis, 0 * axis, r_co * axis]) + np.array([0.2, 0.1, -0.3])
syml = ["O", "C", "O"]
ml = q.masses_of(syml)
k_s, k_b = 100.0, 3.0             # eV/A^2, invented
Hl = q.spring_hessian(xl, [(0, 1), (1, 2)], [k_s, k_s])
# bend term V = 1/2 k_b sum_u (u . (x_O1 + x_O2 - 2 x_C))^2 over the two
# directions u normal to the axis: invariant under translations and rotations
w = np.zeros((3, 9))
for c in range(3):
    w[c, c], w[c, 3 + c], w[c, 6 + c] = 1.0, -2.0, 1.0
P = np.eye(3) - np.outer(axis, axis)
Wp = np.kron(np.ones((1, 1)), P) @ w          # 3 x 9, perpendicular parts
Hl = Hl + k_b * Wp.T @ Wp
xyz_l, hess_l = q.write_inputs(tmp, syml, xl, Hl, name="linear")
qq = 0.35
ch_l = np.array([-qq, 2 * qq, -qq])
write_rows(os.path.join(tmp, "linear.apt"), rigid_apt(ch_l), "charges -q 2q -q (invented)")
# bond polarizability model: two equal C-O bonds
a_p, g_p = 1.7, 2.3                # A^2, invented
alpha_l = bond_alpha_derivatives(xl, [(1, 0), (1, 2)], [a_p, a_p], [g_p, g_p])
write_rows(os.path.join(tmp, "linear.pol"), alpha_l, "bond polarizability model (invented)")
base_l = [xyz_l, "-H", hess_l, "-u", "eV/A^2"] + masses_args(ml)
doc_l, _ = spectrum_json(base_l + ["--dipole-derivatives", os.path.join(tmp, "linear.apt"),
                                   "--dipole-units", "e",
                                   "--polarizability-derivatives", os.path.join(tmp, "linear.pol"),
                                   "--polarizability-units", "A^2"])
nu_l = np.array([m["wavenumber"] for m in doc_l["modes"]])
ir_l = np.array([m["ir"] for m in doc_l["modes"]])
S_l = np.array([m["raman_activity"] for m in doc_l["modes"]])
chk.ok(len(nu_l) == 4, "linear triatomic: 3N - 5 = 4 modes, got %d" % len(nu_l))
mO, mC = ml[0], ml[1]
# Goldstein: omega_s = sqrt(k/m_O), omega_a = sqrt(k/m_O (1 + 2 m_O/m_C))
nu_s = np.sqrt(k_s / mO) * q.CM1
nu_a = np.sqrt(k_s / mO * (1 + 2 * mO / mC)) * q.CM1
nu_b = np.sqrt(k_b * (w[0] @ np.diag(1 / np.repeat(ml, 3)) @ w[0])) * q.CM1
order = np.argsort([nu_b, nu_b, nu_s, nu_a])
chk.close(nu_l, np.sort([nu_b, nu_b, nu_s, nu_a]), "linear triatomic wavenumbers (Goldstein; bend from "
          "its quadratic form)", rtol=1e-8)
i_s = int(np.argmin(np.abs(nu_l - nu_s)))
i_a = int(np.argmin(np.abs(nu_l - nu_a)))
bends = [i for i in range(4) if abs(nu_l[i] - nu_b) < 1e-6 * nu_b]
# closed forms: antisymmetric stretch and bend displacements (1, -2 mO/mC, 1)
# times c, normalised by sum m d^2 = 1; d mu = -2 q c (1 + 2 mO/mC)
c_norm = 1.0 / np.sqrt(2 * mO + 4 * mO ** 2 / mC)
ir_a = IR_PER_E2_U * (2 * qq * c_norm * (1 + 2 * mO / mC)) ** 2
chk.ok(ir_l[i_s] <= 1e-20 * ir_a, "symmetric stretch IR-inactive by symmetry: %.3g km/mol" % ir_l[i_s])
chk.close(ir_l[i_a], ir_a, "antisymmetric stretch IR, closed form", rtol=1e-8)
chk.ok(len(bends) == 2, "two degenerate bends")
chk.close(sum(ir_l[i] for i in bends), 2 * ir_a, "the bend pair's IR (basis-free sum), closed form",
          rtol=1e-8)
# Raman, bond model: symmetric stretch s_b = 1/sqrt(2 mO) per bond:
# alpha' = 2 a' s, gamma'^2 = 4 g'^2 s^2 (collinear bonds), S = 45 alpha'^2 + 7 gamma'^2
s_b = 1.0 / np.sqrt(2 * mO)
S_s = 45 * (2 * a_p * s_b) ** 2 + 7 * 4 * g_p ** 2 * s_b ** 2
chk.close(S_l[i_s], S_s, "symmetric stretch Raman activity, bond model closed form", rtol=1e-8)
chk.ok(S_l[i_a] <= 1e-20 * S_s and all(S_l[i] <= 1e-20 * S_s for i in bends),
       "mutual exclusion: IR-active modes Raman-inactive (S = %s)" % S_l)
print("linear: nu", np.round(nu_l, 3), "IR", ir_l, "S", S_l)

# Raman intensity at a laser line and temperature (Polavarapu 1990)
laser, temp = 18797.0, 298.15
doc_r, _ = spectrum_json(base_l + ["--polarizability-derivatives", os.path.join(tmp, "linear.pol"),
                                   "--polarizability-units", "A^2", "--kind", "raman",
                                   "--laser", str(laser), "-T", str(temp)])
m_s = doc_r["modes"][i_s]
chk.close(m_s["raman_intensity"], raman_cross_section(S_s, nu_s, laser, temp),
          "Raman cross-section of the symmetric stretch (Polavarapu 1990)", rtol=1e-7)
chk.ok(all(doc_r["modes"][i]["raman_intensity"] == 0 or doc_r["modes"][i]["raman_intensity"] <= 1e-20
           for i in [i_a] + bends), "Raman-inactive modes have zero cross-section")
print("Raman d sigma/d Omega (1e-30 cm^2/sr):", m_s["raman_intensity"])

# ---------------------------------------------------------------------------
# 3. Water-like Raman: bond model closed form, 9-row and bohr^2 input
# ---------------------------------------------------------------------------
bonds_w = [(0, 1), (0, 2)]
ap_w, gp_w = [1.1, 1.1], [0.9, 0.9]
alpha_w = bond_alpha_derivatives(x, bonds_w, ap_w, gp_w)
write_rows(os.path.join(tmp, "water.pol"), alpha_w)
full9 = np.zeros((9, alpha_w.shape[1]))
idx = {(0, 0): 0, (1, 1): 1, (2, 2): 2, (0, 1): 3, (0, 2): 4, (1, 2): 5}
for a in range(3):
    for b in range(3):
        full9[3 * a + b] = alpha_w[idx[(min(a, b), max(a, b))]]
bohr2 = (q.A_0 / q.ANG) ** 2
write_rows(os.path.join(tmp, "water9.pol"), full9 / bohr2, "9 rows in bohr^2")
S_ref = []
for k in range(3):
    al, g2 = bond_model_invariants(x, bonds_w, ap_w, gp_w, D[:, k])
    S_ref.append(45 * al ** 2 + 7 * g2)
    # and the invariants straight from the tensor, NumPy
    A = np.zeros((3, 3))
    vals = alpha_w @ D[:, k]
    for (a, b), c in idx.items():
        A[a, b] = A[b, a] = vals[c]
    mean = np.trace(A) / 3
    aniso = A - mean * np.eye(3)
    chk.close(45 * mean ** 2 + 7 * 1.5 * np.sum(aniso ** 2), S_ref[-1],
              "bond model closed form = invariants of the tensor (mode %d)" % (k + 1), rtol=1e-10)
S_ref = np.array(S_ref)
for label, path, unit in [("6 rows, A^2", "water.pol", "A^2"), ("9 rows, bohr^2", "water9.pol", "bohr^2")]:
    d_w, _ = spectrum_json(base + ["--polarizability-derivatives", os.path.join(tmp, path),
                                   "--polarizability-units", unit, "--kind", "raman-activity"])
    chk.close([m["raman_activity"] for m in d_w["modes"]], S_ref,
              "water-like Raman activities, %s" % label, rtol=1e-8)

# ---------------------------------------------------------------------------
# 4. The envelope integrates to the sum of the sticks
# ---------------------------------------------------------------------------
apt_arg = ["--dipole-derivatives", os.path.join(tmp, "water.apt"), "--dipole-units", "e"]
for shape, fwhm, rng, step in [("lorentzian", 10.0, None, None), ("lorentzian", 25.0, "0:6000", 0.5),
                               ("gaussian", 12.0, None, None), ("gaussian", 30.0, "1000:4500", 2.0)]:
    args = base + apt_arg + ["--broadening", shape, "--width", str(fwhm)]
    if rng:
        args += ["--range", rng, "--step", str(step)]
    d_s, _ = spectrum_json(args)
    env = d_s["envelope"]
    xg = np.array(env["wavenumber"])
    yg = np.array(env["intensity"])
    h = xg[1] - xg[0]
    pos = np.array([m["scaled_wavenumber"] for m in d_s["modes"]])
    hts = np.array([m["ir"] for m in d_s["modes"]])
    if shape == "lorentzian":
        dist = scipy.stats.cauchy(scale=fwhm / 2)
        fprime_max = 9.0 / (8.0 * np.sqrt(3.0) * np.pi * (fwhm / 2) ** 2)   # max |f'| at x = HWHM/sqrt(3)
    else:
        sigma = fwhm / np.sqrt(8 * np.log(2))
        dist = scipy.stats.norm(scale=sigma)
        fprime_max = np.exp(-0.5) / (sigma ** 2 * np.sqrt(2 * np.pi))       # at x = sigma
    # the envelope itself, point by point, against scipy's pdf
    y_ref = sum(hk * dist.pdf(xg - pk) for hk, pk in zip(hts, pos))
    chk.close(yg, y_ref, "%s FWHM %g envelope against scipy.stats pdf" % (shape, fwhm),
              rtol=1e-10, atol=1e-14 * y_ref.max())
    inside = sum(hk * (dist.cdf(xg[-1] - pk) - dist.cdf(xg[0] - pk)) for hk, pk in zip(hts, pos))
    # composite trapezoid: |error| <= h^2/12 * int |f''| <= h^2/12 * 4 max|f'| per unit stick
    trap_bound = h ** 2 / 12.0 * 4.0 * fprime_max * hts.sum()
    integral = float(np.trapz(yg, xg))
    chk.close(env["integral"], integral, "%s: reported integral = trapezoid of the grid" % shape,
              rtol=1e-10)
    chk.ok(abs(integral - inside) <= trap_bound + 1e-12 * inside,
           "%s FWHM %g: integral %.10g vs sticks inside the range %.10g (bound %.3g)"
           % (shape, fwhm, integral, inside, trap_bound))
    tail = hts.sum() - inside
    chk.ok(abs(integral - hts.sum()) <= tail + trap_bound + 1e-12 * inside,
           "%s FWHM %g: integral %.8g vs sum of sticks %.8g within tails %.3g + %.3g"
           % (shape, fwhm, integral, hts.sum(), tail, trap_bound))
    chk.close(env["stick_sum"], hts.sum(), "%s: stick sum" % shape, rtol=1e-12)
    print("%s FWHM %g step %g range %g:%g: integral %.8f, sticks %.8f (inside %.8f), rel diff %.2e"
          % (shape, fwhm, h, xg[0], xg[-1], integral, hts.sum(), inside,
             (integral - hts.sum()) / hts.sum()))

# ---------------------------------------------------------------------------
# 5. PNG and SVG
# ---------------------------------------------------------------------------
png = os.path.join(tmp, "ir.png")
svg = os.path.join(tmp, "ir.svg")
# Pango and fontconfig keep caches until exit, which LeakSanitizer reports
# (not ours; tests/render/test-spectrum-plot.c checks the plot with them
# released): leak checks off for the drawing runs, as in tests/export.
_asan = os.environ.get("ASAN_OPTIONS")
os.environ["ASAN_OPTIONS"] = ((_asan + ":") if _asan else "") + "detect_leaks=0"
first = q.run(["spectrum"] + base + apt_arg + ["-o", png, "--size", "640x360"], expect=None)
if first.returncode == 1 and "no renderer" in first.stderr_text:
    # a build without the renderer (-Dgui=disabled): PNG and SVG are
    # refused with a message, CSV and JSON remain
    chk.ok(not os.path.exists(png), "no renderer: PNG refused, nothing written")
else:
    chk.ok(first.returncode == 0, "PNG written: %r" % first.stderr_text.strip())
    q.run(["spectrum"] + base + apt_arg + ["-o", svg, "--size", "700x420", "--descending"])
    with open(png, "rb") as f:
        data = f.read()
    # RFC 2083: 8-byte signature, then the IHDR chunk: length 13, width, height, depth 8, colour type
    chk.ok(data[:8] == b"\x89PNG\r\n\x1a\n", "PNG signature")
    length, ctype = struct.unpack(">I4s", data[8:16])
    wd, ht, depth, colour = struct.unpack(">IIBB", data[16:26])
    chk.ok(ctype == b"IHDR" and length == 13, "PNG: IHDR first")
    chk.ok((wd, ht) == (640, 360), "PNG size %dx%d, expected 640x360" % (wd, ht))
    chk.ok(depth == 8 and colour in (2, 6), "PNG 8-bit RGB(A): depth %d colour type %d" % (depth, colour))
    root = ET.parse(svg).getroot()
    chk.ok(root.tag == "{http://www.w3.org/2000/svg}svg", "SVG root element: %s" % root.tag)
    sw, sh = root.get("width"), root.get("height")
    chk.ok(re.fullmatch(r"700(px)?", sw or "") and re.fullmatch(r"420(px)?", sh or ""),
           "SVG size %s x %s, expected 700 x 420" % (sw, sh))
    vb = [float(v) for v in (root.get("viewBox") or "0 0 0 0").replace(",", " ").split()]
    chk.ok(vb == [0, 0, 700, 420], "SVG viewBox %s" % vb)
    n_paths = sum(1 for e in root.iter() if e.tag.endswith("path"))
    chk.ok(n_paths > 10, "SVG draws paths (%d)" % n_paths)
    # no overwrite without --force; with it, atomic replacement
    pr = q.run(["spectrum"] + base + apt_arg + ["-o", png], expect=None)
    chk.ok(pr.returncode == 3 and "--force" in pr.stderr_text, "existing output refused: exit %d %r"
           % (pr.returncode, pr.stderr_text.strip()))
    q.run(["spectrum"] + base + apt_arg + ["-o", png, "--force"])
if _asan is None:
    del os.environ["ASAN_OPTIONS"]
else:
    os.environ["ASAN_OPTIONS"] = _asan

# ---------------------------------------------------------------------------
# 6. Imaginary modes get no intensity (a warning)
# ---------------------------------------------------------------------------
Fi = F.copy()
Fi[2, 2] = -1.5                 # an invented saddle: negative bend constant
Hi = B.T @ Fi @ B
xyz_i, hess_i = q.write_inputs(tmp, sym, x, Hi, name="saddle")
d_i, p_i = spectrum_json([xyz_i, "-H", hess_i, "-u", "eV/A^2"] + apt_arg)
chk.ok(d_i["modes"][0]["imaginary"] and d_i["modes"][0]["ir"] is None,
       "imaginary mode: no IR intensity (%r)" % d_i["modes"][0])
chk.ok("imaginary" in p_i.stderr_text, "imaginary mode warned: %r" % p_i.stderr_text.strip())

# ---------------------------------------------------------------------------
# 7. Bad input
# ---------------------------------------------------------------------------


def expect_error(label, args, code, pattern):
    try:
        p = q.run(["spectrum"] + args, expect=None)
    except q.QuaverError as e:
        chk.ok(False, "%s: %s" % (label, e))
        return
    err = p.stderr_text
    chk.ok(p.returncode == code, "%s: exit %d, expected %d (%r)" % (label, p.returncode, code, err.strip()))
    chk.ok(re.search(pattern, err) is not None, "%s: message %r should match %r" % (label, err.strip(), pattern))
    chk.ok(p.stdout_text == "", "%s: nothing on stdout" % label)


def bad_file(name, text):
    path = os.path.join(tmp, name)
    with open(path, "w") as f:
        f.write(text)
    return path


good_row = " ".join("0.1" for _ in range(9))
f_two = bad_file("two-rows.apt", "# only two rows\n%s\n%s\n" % (good_row, good_row))
f_short = bad_file("short.apt", "%s\n%s\n0.1 0.2 0.3 0.4 0.5 0.6 0.7 0.8\n" % (good_row, good_row))
f_nan = bad_file("nan.apt", "%s\n0.1 0.2 nan 0.1 0.1 0.1 0.1 0.1 0.1\n%s\n" % (good_row, good_row))
f_word = bad_file("word.apt", "%s\n%s\n0.1 0.2 zero 0.1 0.1 0.1 0.1 0.1 0.1\n" % (good_row, good_row))
f_pol7 = bad_file("seven.pol", "\n".join([good_row] * 7) + "\n")
expect_error("two rows", base + ["--dipole-derivatives", f_two, "--dipole-units", "e"], 2,
             re.escape(f_two) + r":3?:? ?.*found 2 rows|" + re.escape(f_two) + r":\d+: found 2 rows")
expect_error("short row", base + ["--dipole-derivatives", f_short, "--dipole-units", "e"], 2,
             re.escape(f_short) + r":3: expected 3N = 9 numbers")
expect_error("NaN", base + ["--dipole-derivatives", f_nan, "--dipole-units", "e"], 2,
             re.escape(f_nan) + r":2:9: .*NaN")
expect_error("not a number", base + ["--dipole-derivatives", f_word, "--dipole-units", "e"], 2,
             re.escape(f_word) + r":3:9: \"zero\" is not a number")
expect_error("seven polarizability rows", base + ["--polarizability-derivatives", f_pol7,
                                                  "--polarizability-units", "A^2", "--kind", "raman"],
             2, re.escape(f_pol7) + r":\d+: found 7 rows")
expect_error("units missing", base + ["--dipole-derivatives", os.path.join(tmp, "water.apt")], 1,
             r"--dipole-units")
expect_error("unknown unit", base + ["--dipole-derivatives", os.path.join(tmp, "water.apt"),
                                     "--dipole-units", "C*m"], 1, r"unknown unit")
expect_error("missing file", base + ["--dipole-derivatives", os.path.join(tmp, "none.apt"),
                                     "--dipole-units", "e"], 2, re.escape(os.path.join(tmp, "none.apt")) + ":")
expect_error("no tensors", base, 1, r"no derivative tensors")
expect_error("raman without polarizability", base + apt_arg + ["--kind", "raman"], 1, r"polarizability")
expect_error("bad range", base + apt_arg + ["--range", "4000:400"], 1, r"--range")
expect_error("bad width", base + apt_arg + ["--width", "0"], 1, r"--width")

# bundle: units missing, wrong row count, row too short, NaN-like value out of range
def bad_bundle(name, key, value):
    b = dict(bundle)
    b.pop("dipole_derivatives")
    b[key] = value
    path = os.path.join(tmp, name)
    with open(path, "w") as f:
        json.dump(b, f, indent=1)
    return path


bb = bad_bundle("b-units.quaver.json", "dipole_derivatives", {"data": apt.tolist()})
expect_error("bundle units missing", [bb], 2, re.escape(bb) + r":\d+:\d+: dipole_derivatives.units: missing")
bb = bad_bundle("b-rows.quaver.json", "dipole_derivatives", {"units": "e", "data": apt[:2].tolist()})
expect_error("bundle two rows", [bb], 2, re.escape(bb) + r":\d+:\d+: dipole_derivatives.data: expected 3 rows")
bb = bad_bundle("b-short.quaver.json", "polarizability_derivatives",
                {"units": "A^2", "data": [r[:8] for r in alpha_w.tolist()]})
expect_error("bundle short row", [bb], 2,
             re.escape(bb) + r":\d+:\d+: polarizability_derivatives.data\[0\]: expected 9 numbers")
bb = bad_bundle("b-unit.quaver.json", "dipole_derivatives", {"units": "coulomb", "data": apt.tolist()})
expect_error("bundle unknown unit", [bb], 2, re.escape(bb) + r":\d+:\d+: dipole_derivatives.units: unknown unit")
bb = os.path.join(tmp, "b-nan.quaver.json")
with open(bb, "w") as f:
    f.write(json.dumps(bundle, indent=1).replace('"units": "e"', '"units": "e", "data0": NaN', 1))
expect_error("bundle NaN", [bb], 2, re.escape(bb) + r":\d+:\d+:")

chk.finish("rigid-charge IR, symmetry-forbidden modes, bond-model Raman, envelope integrals, "
           "PNG/SVG, bad input")
