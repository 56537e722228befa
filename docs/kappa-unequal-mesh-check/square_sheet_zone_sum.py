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

HBAR = 6.62607015e-34 / (2 * np.pi)
KB = 1.380649e-23
AMU = 1.66053906660e-27

A_NM, MASS_AMU, K1, K2 = 0.3267, 3.6473, 28.689, 14.1606
TAU_PS, THICKNESS_NM = 7.6575, 0.4156
TEMPERATURES_K = [14.691, 187.183, 1000.0]


def kappa(n):
    a = A_NM * 1e-9
    m = MASS_AMU * AMU
    bonds = [((1, 0), K1), ((0, 1), K1), ((1, 1), K2), ((1, -1), K2)]  # one of each +- pair
    s = (np.arange(n) + 0.5) / n - 0.5
    totals = {t: np.zeros(2) for t in TEMPERATURES_K}
    for row in s:  # one row of the mesh at a time (memory)
        qx = 2 * np.pi / a * np.full(n, row)
        qy = 2 * np.pi / a * s
        d = np.zeros((n, 2, 2))
        dd = np.zeros((2, n, 2, 2))
        for (i, j), k in bonds:
            r = np.array([i, j], float) * a
            u = r / np.linalg.norm(r)
            phase = qx * r[0] + qy * r[1]
            outer = np.outer(u, u)
            # +r and -r: 2 K (1 - cos q.r) and the derivative 2 K r_a sin q.r
            d += (2 * k / m) * (1 - np.cos(phase))[:, None, None] * outer
            for ax in range(2):
                dd[ax] += (2 * k / m) * (r[ax] * np.sin(phase))[:, None, None] * outer
        w2, e = np.linalg.eigh(d)
        omega = np.sqrt(np.maximum(w2, 0))
        for ax in range(2):
            proj = np.einsum('nis,nij,njs->ns', e, dd[ax], e)
            v = np.where(omega > 0, proj / (2 * np.where(omega > 0, omega, 1)), 0.0)
            for t in TEMPERATURES_K:
                x = HBAR * omega / (KB * t)
                with np.errstate(over='ignore', invalid='ignore', divide='ignore'):
                    c = np.where((x > 0) & (x < 700), KB * x * x * np.exp(x) / np.expm1(x) ** 2, 0.0)
                totals[t][ax] += np.sum(c * v * v * TAU_PS * 1e-12)
    volume = n * n * a * a * THICKNESS_NM * 1e-9
    return {t: totals[t] / volume for t in TEMPERATURES_K}


if __name__ == '__main__':
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 1600
    fine, half = kappa(n), kappa(n // 2)
    for t in TEMPERATURES_K:
        extrapolated = fine[t] + (fine[t] - half[t]) / 3
        print(f"T = {t:9.3f} K  N = {n}: xx {fine[t][0]:.6f} yy {fine[t][1]:.6f}; N/2: {half[t][0]:.6f}; "
              f"extrapolated xx {extrapolated[0]:.6f} yy {extrapolated[1]:.6f} W/(m K)")
