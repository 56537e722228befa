"""Converged thermal numbers of six scalar lattice models of our own (invented masses and springs),
independent of the engine: each model's dynamical matrix written out here, its eigenvalues by NumPy,
and the zone average taken by nested cubes around q = 0 (each shell of cubes, halved in size level
by level down to 2^-28 of the zone, by tensor Gauss-Legendre: the integrand is smooth away from
q = 0, where sqrt of the eigenvalue has its cusp). Run: /usr/bin/python3 reference.py [n] (n Gauss
nodes per axis per cube, default 8, which the tables in docs/outside-checks.md Round 13 (mesh-signals)
use; n = 12 moves every number by less than 1e-10 relative in 2D and 3D and 3e-8 in 1D).

Thermal functions per mode: Einstein's functions of x = hbar omega / kB T (any statistical-mechanics
text, e.g. Kittel, Introduction to Solid State Physics, ch. 5; from memory). Per mole of atoms.
CODATA 2018 constants.
"""
import sys
import numpy as np

AMU = 1.66053906660e-27
HBAR = 1.054571817e-34
KB = 1.380649e-23
NA = 6.02214076e23


def model(name):
    """Sites (mass amu, reduced position), bonds (i, j, cell offset, K N/m); scalar motion."""
    if name == "chain2":  # diatomic chain, 12 / 31 amu, 22 N/m
        sites = [(12.0, [0.0]), (31.0, [0.5])]
        bonds = [(0, 1, [0], 22.0), (1, 0, [1], 22.0)]
        return 1, sites, bonds
    if name == "chain-rattler":  # A-A 20 N/m, B (50 amu) hung on A by 1 N/m on both sides
        sites = [(20.0, [0.0]), (50.0, [0.5])]
        bonds = [(0, 0, [1], 20.0), (0, 1, [0], 1.0), (1, 0, [1], 1.0)]
        return 1, sites, bonds
    if name == "square1":  # 20 amu, 10 N/m nearest neighbours
        sites = [(20.0, [0.0, 0.0])]
        bonds = [(0, 0, [1, 0], 10.0), (0, 0, [0, 1], 10.0)]
        return 2, sites, bonds
    if name == "square-rattler":  # A 20 amu, 10 N/m to A; B 60 amu at the centre, 0.5 N/m to its 4 A
        sites = [(20.0, [0.0, 0.0]), (60.0, [0.5, 0.5])]
        bonds = [(0, 0, [1, 0], 10.0), (0, 0, [0, 1], 10.0)]
        bonds += [(1, 0, c, 0.5) for c in ([0, 0], [1, 0], [0, 1], [1, 1])]
        return 2, sites, bonds
    if name == "cubic1":  # 20 amu, 10 N/m nearest neighbours
        sites = [(20.0, [0.0, 0.0, 0.0])]
        bonds = [(0, 0, [1, 0, 0], 10.0), (0, 0, [0, 1, 0], 10.0), (0, 0, [0, 0, 1], 10.0)]
        return 3, sites, bonds
    if name == "cubic-rattler":  # A 20 amu, 10 N/m to A; B 60 amu at the body centre, 0.5 N/m to its 8 A
        sites = [(20.0, [0.0, 0.0, 0.0]), (60.0, [0.5, 0.5, 0.5])]
        bonds = [(0, 0, [1, 0, 0], 10.0), (0, 0, [0, 1, 0], 10.0), (0, 0, [0, 0, 1], 10.0)]
        bonds += [(1, 0, [i, j, k], 0.5) for i in (0, 1) for j in (0, 1) for k in (0, 1)]
        return 3, sites, bonds
    raise KeyError(name)


def omegas(name, q):
    """Angular frequencies (rad/s), shape (points, branches), at reduced wave vectors q (points, d).
    D_ij(q) = (delta_ij sum_b K - sum_b K exp(2 pi i q.(R + tau_j - tau_i))) / sqrt(m_i m_j), each bond
    counted from both ends (the harmonic energy (1/2) K (u_i - u_j)^2 summed once per bond)."""
    d, sites, bonds = model(name)
    r = len(sites)
    m = np.array([s[0] for s in sites]) * AMU
    tau = np.array([s[1] for s in sites], dtype=float)
    D = np.zeros((q.shape[0], r, r), dtype=complex)
    for i, j, cell, k in bonds:
        delta = np.array(cell, dtype=float) + tau[j] - tau[i]
        phase = np.exp(2j * np.pi * (q @ delta))
        D[:, i, i] += k / m[i]
        D[:, j, j] += k / m[j]
        D[:, i, j] -= k * phase / np.sqrt(m[i] * m[j])
        D[:, j, i] -= k * np.conj(phase) / np.sqrt(m[i] * m[j])
    lam = np.linalg.eigvalsh(D)
    return np.sqrt(np.clip(lam, 0, None)), r


def nested_rule(d, n, levels=28):
    """Nodes and weights on [-1/2, 1/2]^d (weights sum to 1 minus the innermost cube)."""
    x, w = np.polynomial.legendre.leggauss(n)
    pts, wts = [], []
    for level in range(levels):
        L = 0.5 * 2.0 ** -level
        h = L / 2
        for corner in np.ndindex(*(2,) * d):
            if all(c == 0 for c in corner):
                continue  # the inner cube is the next level
            for signs in np.ndindex(*(2,) * d):
                lo = np.array([(c * h) for c in corner])
                s = np.array([1 - 2 * b for b in signs])
                grids = np.meshgrid(*[(lo[a] + h * (x + 1) / 2) * s[a] for a in range(d)], indexing="ij")
                wg = np.meshgrid(*[w * h / 2 for _ in range(d)], indexing="ij")
                pts.append(np.stack([g.ravel() for g in grids], axis=1))
                wts.append(np.prod(np.stack([g.ravel() for g in wg], axis=1), axis=1))
    return np.concatenate(pts), np.concatenate(wts)


def thermal(name, temperatures, n=8):
    d = model(name)[0]
    q, w = nested_rule(d, n)
    om, r = omegas(name, q)
    per_mol = NA / r
    zpe = per_mol * np.sum(w[:, None] * 0.5 * HBAR * om)
    rows = []
    for t in temperatures:
        x = HBAR * om / (KB * t)
        with np.errstate(over="ignore", divide="ignore", invalid="ignore"):
            nbar = np.where(x > 0, 1.0 / np.expm1(x), 0.0)
            cv = np.where(x > 0, KB * x * x * np.exp(-x) / (-np.expm1(-x)) ** 2, KB)
            log = np.where(x > 0, np.log(-np.expm1(-x)), 0.0)
            ent = np.where(x > 0, KB * (x * nbar - log), 0.0)
        u = per_mol * np.sum(w[:, None] * HBAR * om * (0.5 + nbar))
        f = per_mol * np.sum(w[:, None] * (0.5 * HBAR * om + KB * t * log))
        s = per_mol * np.sum(w[:, None] * ent)
        c = per_mol * np.sum(w[:, None] * cv)
        rows.append((t, u, f, s, c))
    return zpe, rows


if __name__ == "__main__":
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 8
    temps = [1, 3, 10, 30, 100, 300, 1000, 3000]
    for name in ["chain2", "chain-rattler", "square1", "square-rattler", "cubic1", "cubic-rattler"]:
        zpe, rows = thermal(name, temps, n)
        print(f"{name} zpe {zpe!r}")
        for t, u, f, s, c in rows:
            print(f"{name} {t} {u!r} {f!r} {s!r} {c!r}")
