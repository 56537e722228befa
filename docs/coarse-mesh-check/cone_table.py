"""The cone error table of src/Engine/Thermal/PeriodicMeshSums.cs (ConeErrorTable), recomputed.

Relative error of the plain (trapezoid) sum of an isotropic cone's heat capacity over a cubic (d = 3) or square (d = 2)
lattice of wave vectors of step dy = hbar c dq / kT, against its integral: sum_n c(|n| dy) dy^d over the integral of
c(y) over all y, c(x) = x^2 e^x / (e^x - 1)^2 (c(0) = 1), n over |n| dy <= 80. The integral is done radially
(4 pi y^2 or 2 pi y) with Gauss-Legendre on panels. Common practice, no source (Poisson summation: the error is the sum of
the integrand's Fourier transform at the nonzero reciprocal points).

Usage: /usr/bin/python3 docs/coarse-mesh-check/cone_table.py [d]
"""
import sys
import numpy as np

def c(x):
    x = np.asarray(x, dtype=float)
    out = np.ones_like(x)
    m = x > 1e-8
    xm = x[m]
    em = np.exp(-xm)
    out[m] = xm * xm * em / (1.0 - em) ** 2
    return out

def radial_integral(d, ymax=80.0):
    nodes, weights = np.polynomial.legendre.leggauss(20)
    total = 0.0
    edges = np.linspace(0.0, ymax, 801)
    for a, b in zip(edges[:-1], edges[1:]):
        y = 0.5 * (b - a) * nodes + 0.5 * (b + a)
        w = 0.5 * (b - a) * weights
        shell = 4 * np.pi * y * y if d == 3 else 2 * np.pi * y
        total += np.sum(w * shell * c(y))
    return total

def lattice_sum(d, dy, ymax=80.0):
    n = int(np.ceil(ymax / dy))
    r = np.arange(-n, n + 1, dtype=float)
    if d == 3:
        g = np.sqrt(r[:, None, None] ** 2 + r[None, :, None] ** 2 + r[None, None, :] ** 2) * dy
    else:
        g = np.sqrt(r[:, None] ** 2 + r[None, :] ** 2) * dy
    g = g[g <= ymax]
    return np.sum(c(g)) * dy ** d

d = int(sys.argv[1]) if len(sys.argv) > 1 else 3
exact = radial_integral(d)
for dy in [1.5, 2.0, 2.25, 2.5, 2.75, 3.0, 3.25, 3.5, 3.75, 4.0, 4.5, 5.0, 6.0]:
    s = lattice_sum(d, dy)
    print(f"d={d} dy={dy:5.2f} relative error {abs(s - exact) / exact:.2e}")
