#!/usr/bin/env python3
"""Independent whole-zone heat capacity of a layered simple cubic crystal described by a cell of n layers.

The crystal (invented): simple cubic, a = 0.4596 nm, bonds along x, y, z only with (longitudinal,
transverse) springs (18.5731, 4.3483), (34.8232, 9.3274), (2.2579, s) N/m; the cell stacks n layers
along z (lattice a, a, n a; site i at z = i / n with mass m_i), each layer bonded in-plane to itself
and to the layers above and below. Bonds along the axes keep the three polarisations apart, so per
polarisation p the n x n dynamical matrix is a ring of the diatomic/polyatomic chain (Kittel ch. 4)
with the in-plane terms on its diagonal:
    D_ii = (E_p + 2 K_pz) / m_i,   E_p = 4 (K_px sin^2(q_x a / 2) + K_py sin^2(q_y a / 2)),
    D_i,i+1 = -K_pz / sqrt(m_i m_i+1),   D_n-1,0 += -K_pz exp(i q_z n a) / sqrt(m_n-1 m_0)
(the Hermitian partner below the diagonal). Cv per mole of atoms = (R / n) <sum over the 3n modes
c(hbar omega / kB T)> over the zone, c(x) = x^2 e^x / (e^x - 1)^2 (Ashcroft and Mermin ch. 23).
The eigenvalues are even in each q component (time reversal and the mirror springs), so one octant,
integrated by tensor Gauss-Legendre on panels graded geometrically towards q = 0 along every axis
(common practice, no source). Nothing of the engine's code is used.

With equal masses the n-layer cell is the one-site crystal folded, so its Cv per atom must equal the
one-site closed-form dispersion's (onesite_cv, the same quadrature on omega_p^2 = (4 / m) sum_j K_pj
sin^2(q_j a / 2)); the script prints that difference as its own check.

Usage: reference.py S MASSES T[,T...] [PANELS NODES]
   e.g. reference.py 0.01 3.8724,3.8724 0.5,2,5,10    (two layers, equal masses: the fold)
        reference.py 0.05 2.5816,5.1632,3.8724 2,5  (three layers)
Prints one line per temperature: T, Cv in J/(mol K), and for equal masses the one-site value.
"""
import sys
import numpy as np

KB = 1.380649e-23; HBAR = 1.054571817e-34; NA = 6.02214076e23; AMU = 1.66053906660e-27
A_NM = 0.4596


def springs(s):
    """K[p] = (K_px, K_py, K_pz) in N/m: the longitudinal constant where p is the bond's axis."""
    return [(18.5731, 9.3274, s), (4.3483, 34.8232, s), (4.3483, 9.3274, 2.2579)]


def panels(lo, n_pan, nodes):
    """Nodes and weights on [0, 1], panels geometric from lo to 1 plus [0, lo]."""
    x, w = np.polynomial.legendre.leggauss(nodes)
    edges = np.concatenate([[0.0], np.geomspace(lo, 1.0, n_pan)])
    X, W = [], []
    for a, b in zip(edges[:-1], edges[1:]):
        X.append((a + b) / 2 + (b - a) / 2 * x)
        W.append((b - a) / 2 * w)
    return np.concatenate(X), np.concatenate(W)


def heat(x):
    with np.errstate(over='ignore', invalid='ignore', divide='ignore'):
        xm = np.minimum(x, 700)
        return np.where(x < 1e-6, 1.0, np.where(x > 700, 0.0, xm * xm * np.exp(-xm) / (-np.expm1(-xm)) ** 2))


def eigenvalues(K, masses, E, Q):
    """Eigenvalues (rad/s)^2 of the ring matrix for in-plane E (N/m, flat) and q_z n a = Q (flat)."""
    n = len(masses); kx, ky, kz = K
    m = np.asarray(masses) * AMU
    D = np.zeros((E.size, n, n), dtype=complex)
    for i in range(n):
        D[:, i, i] = (E + 2 * kz) / m[i]
    # Bonds along z: i to i + 1 in the cell, n - 1 to the next cell's 0 (phase exp(i Q)); each adds its
    # Hermitian partner (for n = 1 the two give -2 K cos Q, for n = 2 both bonds join sites 0 and 1).
    bonds = [(i, i + 1, np.ones(E.size)) for i in range(n - 1)] + [(n - 1, 0, np.exp(1j * Q))]
    for i, j, phase in bonds:
        term = -kz * phase / np.sqrt(m[i] * m[j])
        D[:, i, j] += term
        D[:, j, i] += np.conj(term)
    return np.linalg.eigvalsh(D)


def cv(s, masses, temps, n_pan=20, nodes=8, lo=1e-5):
    n = len(masses)
    u, w = panels(lo, n_pan, nodes)
    sx = np.sin(u * np.pi / 2) ** 2          # q a / 2 = u pi / 2 in-plane: q in [0, pi / a]
    Qz = u * np.pi                            # q_z n a in [0, pi]
    Wxy = (w[:, None] * w[None, :]).ravel()
    temps = np.asarray(temps, dtype=float)
    total = np.zeros(temps.size)
    for K in springs(s):
        E = (4 * (K[0] * sx[:, None] + K[1] * sx[None, :])).ravel()
        for iz in range(u.size):
            lam = eigenvalues(K, masses, E, np.full(E.size, Qz[iz]))
            omega = np.sqrt(np.maximum(lam, 0.0))
            for it, T in enumerate(temps):
                total[it] += w[iz] * np.sum(Wxy[:, None] * heat(HBAR * omega / (KB * T)))
    return KB * NA * total / n


def onesite_cv(s, m_amu, temps, n_pan=20, nodes=8, lo=1e-5):
    return cv(s, [m_amu], temps, n_pan, nodes, lo)


if __name__ == "__main__":
    s = float(sys.argv[1])
    masses = [float(v) for v in sys.argv[2].split(',')]
    temps = [float(v) for v in sys.argv[3].split(',')]
    n_pan, nodes = (int(sys.argv[4]), int(sys.argv[5])) if len(sys.argv) > 5 else (20, 8)
    c = cv(s, masses, temps, n_pan, nodes)
    equal = max(masses) == min(masses)
    one = onesite_cv(s, masses[0], temps, n_pan, nodes) if equal else [None] * len(temps)
    for T, v, o in zip(temps, c, one):
        print(f"{T:g} {v:.12e}" + (f" onesite {o:.12e} rel {v / o - 1:+.2e}" if o is not None else ""))
