"""Relative error of the plain Gamma-centred mesh sum of Cv on M^3 meshes, for the invented simple cubic crystal of
simple_cubic_sums.py (a = 0.3 nm, 20 amu, nearest-neighbour springs longitudinal 10 N/m, transverse 2 N/m), against the
sum on a shifted 128^3 mesh (converged: it agrees with 192^3 to 1e-15 at these temperatures). The checks of Round 30 (low-
temperature coarse meshes) in docs/outside-checks.md compare src/Engine/Thermal/PeriodicMeshSums.EstimatedError with it.
Common practice, no source. Also prints the plain sum itself per cell (J/K), which the engine's estimate divides by.

Usage: /usr/bin/python3 docs/coarse-mesh-check/plain_sum_error.py T M...
"""
import sys
import numpy as np

hbar = 1.054571817e-34; kB = 1.380649e-23; amu = 1.66053906660e-27
a = 0.3e-9; m = 20 * amu; L = 10.0; Tk = 2.0

def cv_per_cell(T, N, shift):
    f = (np.arange(N) + shift) / N
    cx, cy, cz = [1 - np.cos(2 * np.pi * g) for g in np.meshgrid(f, f, f, indexing='ij')]
    total = 0.0
    for lam in (2 / m * (L * cx + Tk * cy + Tk * cz), 2 / m * (L * cy + Tk * cz + Tk * cx), 2 / m * (L * cz + Tk * cx + Tk * cy)):
        x = hbar * np.sqrt(np.maximum(lam, 0.0)) / (kB * T)
        safe = np.where(x > 1e-8, x, 1.0)
        c = np.where(x > 1e-8, safe * safe * np.exp(-safe) / (-np.expm1(-safe)) ** 2, 1.0)  # the rigid modes' kB at q = 0
        total += c.sum()
    return kB * total / N ** 3

T = float(sys.argv[1])
reference = cv_per_cell(T, 128, 0.5)
for M in map(int, sys.argv[2:]):
    plain = cv_per_cell(T, M, 0.0)
    print(f"T={T} M={M} plain={plain!r} relative_error={plain / reference - 1:.6e}")
