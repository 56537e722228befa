#!/usr/bin/env python3
"""Whole-zone reference for the conductivity of an invented square sheet (Round 29, unequal meshes).

One site per cell on a square lattice, in-plane motion, central springs on shell 1 (the four bonds
along the axes) and shell 2 (the four diagonals). Kinetic theory in the relaxation-time approximation
(Ziman, Electrons and Phonons, ch. 8), kappa_aa = 1 / (N A t) sum_q sum_s C v_a^2 tau, written out here
independently of the engine:

  D(q) = (1/m) sum_r K_r (1 - cos q.r) r^ r^T over all 8 neighbours (central springs; Ashcroft and
  Mermin ch. 22), omega^2 its eigenvalues, v_a = e^T (dD/dq_a) e / (2 omega) (Hellmann-Feynman), and
  C = kB x^2 e^x / (e^x - 1)^2 (Ashcroft and Mermin ch. 23).

The sum is a plain one-point-per-cell sum on an N x N mesh shifted by half a spacing (no point at
q = 0, where the integrand has no value), on two meshes, and Richardson-extrapolated in 1/N^2 (the
error of the cone's direction-dependent integrand at q = 0 is one cell's worth; common practice, no
source). Prints kappa_xx, kappa_yy in W/(m K) per temperature.

usage: python3 square_sheet_zone_sum.py [N]   (default 1600; NumPy only)
"""
import sys
import numpy as np

from kinetic_terms import AMU, add_kinetic_terms

A_NM, MASS_AMU, K1, K2 = 0.3267, 3.6473, 28.689, 14.1606
TAU_PS, THICKNESS_NM = 7.6575, 0.4156
TEMPERATURES_K = [14.691, 187.183, 1000.0]


def kappa(n):
    a = A_NM * 1e-9
    springs = [(np.array(r, float) * a, k) for r, k in [((1, 0), K1), ((0, 1), K1), ((1, 1), K2), ((1, -1), K2)]]
    s = (np.arange(n) + 0.5) / n - 0.5
    totals = {t: np.zeros(2) for t in TEMPERATURES_K}
    for row in s:  # one row of the mesh at a time (memory)
        qx = 2 * np.pi / a * np.full(n, row)
        qy = 2 * np.pi / a * s
        add_kinetic_terms([qx, qy], springs, MASS_AMU * AMU, TAU_PS * 1e-12, totals)
    volume = n * n * a * a * THICKNESS_NM * 1e-9
    return {t: totals[t] / volume for t in TEMPERATURES_K}


if __name__ == '__main__':
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 1600
    fine, half = kappa(n), kappa(n // 2)
    for t in TEMPERATURES_K:
        extrapolated = fine[t] + (fine[t] - half[t]) / 3
        print(f"T = {t:9.3f} K  N = {n}: xx {fine[t][0]:.6f} yy {fine[t][1]:.6f}; N/2: {half[t][0]:.6f}; "
              f"extrapolated xx {extrapolated[0]:.6f} yy {extrapolated[1]:.6f} W/(m K)")
