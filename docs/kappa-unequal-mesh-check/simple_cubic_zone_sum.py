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

HBAR = 6.62607015e-34 / (2 * np.pi)
KB = 1.380649e-23
AMU = 1.66053906660e-27

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
    m = MASS_AMU * AMU
    s = (np.arange(n) + 0.5) / n - 0.5
    qy, qz = np.meshgrid(s, s, indexing='ij')
    qy, qz = qy.ravel() * 2 * np.pi / a, qz.ravel() * 2 * np.pi / a
    totals = {t: np.zeros(3) for t in TEMPERATURES_K}
    for row in s:  # one plane of the mesh at a time (memory)
        qx = np.full(qy.shape, row * 2 * np.pi / a)
        d = np.zeros((qx.size, 3, 3))
        dd = np.zeros((3, qx.size, 3, 3))
        for r, k in bonds():
            r = np.array(r, float) * a
            u = r / np.linalg.norm(r)
            phase = qx * r[0] + qy * r[1] + qz * r[2]
            outer = np.outer(u, u)
            d += (2 * k / m) * (1 - np.cos(phase))[:, None, None] * outer
            for ax in range(3):
                dd[ax] += (2 * k / m) * (r[ax] * np.sin(phase))[:, None, None] * outer
        w2, e = np.linalg.eigh(d)
        omega = np.sqrt(np.maximum(w2, 0))
        for ax in range(3):
            proj = np.einsum('nis,nij,njs->ns', e, dd[ax], e)
            v = np.where(omega > 0, proj / (2 * np.where(omega > 0, omega, 1)), 0.0)
            for t in TEMPERATURES_K:
                x = HBAR * omega / (KB * t)
                with np.errstate(over='ignore', invalid='ignore', divide='ignore'):
                    c = np.where((x > 0) & (x < 700), KB * x * x * np.exp(x) / np.expm1(x) ** 2, 0.0)
                totals[t][ax] += np.sum(c * v * v * TAU_PS * 1e-12)
    volume = n ** 3 * a ** 3
    return {t: totals[t] / volume for t in TEMPERATURES_K}


if __name__ == '__main__':
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 96
    fine, half = kappa(n), kappa(n // 2)
    for t in TEMPERATURES_K:
        print(f"T = {t:9.3f} K  N = {n}: xx {fine[t][0]:.6f} zz {fine[t][2]:.6f} mean {fine[t].mean():.6f}; "
              f"N/2: mean {half[t].mean():.6f} W/(m K)")
