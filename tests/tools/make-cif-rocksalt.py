#!/usr/bin/python3
# make-cif-rocksalt.py — writes tests/data/cif/rocksalt.cif, the rock-salt
# test structure with the full operator list of Fm-3m (No. 225).
# SPDX-License-Identifier: GPL-3.0-or-later
#
# The 192 operators are the 48 point operations of m-3m (every signed
# permutation of x, y, z: the full cubic group, common practice) times the
# four F-centring translations 0,0,0; 0,1/2,1/2; 1/2,0,1/2; 1/2,1/2,0
# (International Tables for Crystallography Vol. A, No. 225, origin at m-3m;
# from memory). Rerun: /usr/bin/python3 tests/tools/make-cif-rocksalt.py
import itertools
import os
import sys

AXES = "xyz"
CENTRING = [(0, 0, 0), (0, 1, 1), (1, 0, 1), (1, 1, 0)]   # in halves


def component(axis, sign, half):
    text = ("-" if sign < 0 else "") + AXES[axis]
    return text + ("+1/2" if half else "")


def operators():
    ops = []
    for t in CENTRING:
        for perm in itertools.permutations(range(3)):
            for signs in itertools.product((1, -1), repeat=3):
                ops.append(",".join(component(perm[i], signs[i], t[i]) for i in range(3)))
    return ops


def main():
    root = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "data", "cif")
    path = sys.argv[1] if len(sys.argv) > 1 else os.path.join(root, "rocksalt.cif")
    ops = operators()
    assert len(ops) == 192 and len(set(ops)) == 192
    lines = [
        "# Rock salt, NaCl: the textbook structure (Kittel, Introduction to Solid",
        "# State Physics, ch. 1: Na at 0,0,0 and Cl at 1/2,1/2,1/2 of a cubic",
        "# F lattice, a = 5.64 A). Written by tests/tools/make-cif-rocksalt.py.",
        "data_rocksalt",
        "_chemical_formula_sum 'Cl Na'",
        "_cell_length_a 5.64",
        "_cell_length_b 5.64",
        "_cell_length_c 5.64",
        "_cell_angle_alpha 90",
        "_cell_angle_beta 90",
        "_cell_angle_gamma 90",
        "_space_group_name_H-M_alt 'F m -3 m'",
        "_space_group_IT_number 225",
        "loop_",
        "_space_group_symop_id",
        "_space_group_symop_operation_xyz",
    ]
    lines += ["%d '%s'" % (i + 1, op) for i, op in enumerate(ops)]
    lines += [
        "loop_",
        "_atom_site_label",
        "_atom_site_type_symbol",
        "_atom_site_fract_x",
        "_atom_site_fract_y",
        "_atom_site_fract_z",
        "_atom_site_occupancy",
        "Na1 Na1+ 0 0 0 1",
        "Cl1 Cl1- 0.5 0.5 0.5 1",
    ]
    with open(path, "w") as f:
        f.write("\n".join(lines) + "\n")


if __name__ == "__main__":
    main()
