#!/usr/bin/env python3
"""Whole-zone reference for the conductivity of an invented simple cubic crystal (Round 29, unequal meshes).

The 3D analogue of square_sheet_zone_sum.py: one site per cell, 3D motion, central springs on shell 1
(6 neighbours along the axes) and shell 2 (12 face diagonals). kappa_aa = 1 / (N V_cell) sum_q sum_s
C v_a^2 tau (Ziman, Electrons and Phonons, ch. 8) with D(q) = (1/m) sum_r K_r (1 - cos q.r) r^ r^T
(Ashcroft and Mermin ch. 22), Hellmann-Feynman velocities and C = kB x^2 e^x / (e^x - 1)^2 (Ashcroft and
Mermin ch. 23), written out here independently of the engine. A plain one-point-per-cell sum on an
N^3 mesh shifted by half a spacing, on N and N/2, Richardson-extrapolated in 1/N^3 (the cone's
direction-dependent integrand at q = 0 leaves about one cell's worth; common practice, no source).
The mesh's points on the body diagonals, where two branches are degenerate, take whatever eigenvectors
the solver returns, which splits xx, yy and zz by O(1 / N^2) (1.4e-4 at N = 32); the printed mean
(trace / 3) is what the crystal's cubic symmetry makes every diagonal component.

usage: python3 simple_cubic_zone_sum.py [N]   (default 96; NumPy only)
"""
import sys
import numpy as np

from kinetic_terms import AMU, add_kinetic_terms

A_NM, MASS_AMU, K1, K2 = 0.3267, 3.6473, 28.689, 14.1606
TAU_PS = 7.6575
TEMPERATURES_K = [14.691, 187.183, 1000.0]


def bonds():
    """One of each +- pair: 3 axes (K1), 6 face diagonals (K2)."""
    out = [((1, 0, 0), K1), ((0, 1, 0), K1), ((0, 0, 1), K1)]
    for i, j in [(0, 1), (0, 2), (1, 2)]:
        for sign in (1, -1):
            r = [0, 0, 0]
            r[i], r[j] = 1, sign
            out.append((tuple(r), K2))
    return out


def kappa(n):
    a = A_NM * 1e-9
    s = (np.arange(n) + 0.5) / n - 0.5
    qy, qz = np.meshgrid(s, s, indexing='ij')
    qy, qz = qy.ravel() * 2 * np.pi / a, qz.ravel() * 2 * np.pi / a
    springs = [(np.array(r, float) * a, k) for r, k in bonds()]
    totals = {t: np.zeros(3) for t in TEMPERATURES_K}
    for row in s:  # one plane of the mesh at a time (memory)
        qx = np.full(qy.shape, row * 2 * np.pi / a)
        add_kinetic_terms([qx, qy, qz], springs, MASS_AMU * AMU, TAU_PS * 1e-12, totals)
    volume = n ** 3 * a ** 3
    return {t: totals[t] / volume for t in TEMPERATURES_K}


if __name__ == '__main__':
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 96
    fine, half = kappa(n), kappa(n // 2)
    for t in TEMPERATURES_K:
        print(f"T = {t:9.3f} K  N = {n}: xx {fine[t][0]:.6f} zz {fine[t][2]:.6f} mean {fine[t].mean():.6f}; "
              f"N/2: mean {half[t].mean():.6f} W/(m K)")
