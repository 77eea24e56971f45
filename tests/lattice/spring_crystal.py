"""spring_crystal.py — the invented spring crystals of the lattice cross-checks
(test_bands_numpy.py, test_thermo_numpy.py, test_frozen_numpy.py): shells of
central springs, longitudinal and transverse constants in eV/A^2, between
the sites of a cell. The harmonic-crystal equations of motion (e.g.
Ashcroft & Mermin, Solid State Physics, ch. 22, from memory) give

    D_kk'(q) = sum_{springs k->k' at delta} -K(delta) e^{iq.delta} / sqrt(m_k m_k')
             + delta_kk' sum_{springs from k} K(delta) / m_k,

and the supercell Hessian is the same springs between the supercell's atoms
and their periodic images.

SPDX-License-Identifier: GPL-3.0-or-later
"""
import numpy as np


class SpringCrystal:
    def __init__(self, cell, tau, masses, shells):
        """@shells: (distance, site pair or None for any, longitudinal, transverse)."""
        self.cell = np.asarray(cell, float)
        self.tau = np.asarray(tau, float)
        self.masses = np.asarray(masses, float)
        self.shells = shells

    def spring(self, delta, k1, k2):
        """3x3 spring matrix between sites k1, k2 at separation delta, or None."""
        length = np.linalg.norm(delta)
        for dist, pair, cl, ct in self.shells:
            if abs(length - dist) > 1e-6:
                continue
            if pair is not None and tuple(sorted((k1, k2))) != pair:
                continue
            e = np.outer(delta, delta) / length ** 2
            return cl * e + ct * (np.eye(3) - e)
        return None

    def d_of_q(self, qcart):
        """Dynamical matrix of the infinite crystal at Cartesian q (1/A, with 2 pi)."""
        ns = len(self.tau)
        d = np.zeros((3 * ns, 3 * ns), complex)
        for k in range(ns):
            for k2 in range(ns):
                for n in np.ndindex(5, 5, 5):
                    delta = (np.array(n) - 2) @ self.cell + self.tau[k2] - self.tau[k]
                    if np.linalg.norm(delta) < 1e-9:
                        continue
                    kmat = self.spring(delta, k, k2)
                    if kmat is None:
                        continue
                    d[3 * k:3 * k + 3, 3 * k2:3 * k2 + 3] -= (kmat * np.exp(1j * qcart @ delta)
                                                             / np.sqrt(self.masses[k] * self.masses[k2]))
                    d[3 * k:3 * k + 3, 3 * k:3 * k + 3] += kmat / self.masses[k]
        return d

    def hessian(self, sites, pos, scell):
        """Exact Hessian (eV/A^2) of the periodic supercell @scell whose atoms
        at @pos are the cell's sites @sites."""
        n_atoms = len(pos)
        h = np.zeros((3 * n_atoms, 3 * n_atoms))
        for i in range(n_atoms):
            for j in range(i + 1, n_atoms):
                for n in np.ndindex(3, 3, 3):
                    delta = pos[j] + (np.array(n) - 1) @ scell - pos[i]
                    kmat = self.spring(delta, sites[i], sites[j])
                    if kmat is None:
                        continue
                    h[3 * i:3 * i + 3, 3 * i:3 * i + 3] += kmat
                    h[3 * j:3 * j + 3, 3 * j:3 * j + 3] += kmat
                    h[3 * i:3 * i + 3, 3 * j:3 * j + 3] -= kmat
                    h[3 * j:3 * j + 3, 3 * i:3 * i + 3] -= kmat
        return h
