#!/usr/bin/env python3
"""Quasi-harmonic reference for a bulk fcc crystal of one atom bound by a Morse pair potential, outside the engine.

F(V, T) = E_static(V) + F_vib(V, T) per primitive cell; F_vib is the mode sum over a Gamma-centred M^3 mesh
(every q, the three zero modes at q = 0 left out), smooth in V because every volume uses the same q points and
weights. Springs: K = phi'' e e^T + (phi'/r)(1 - e e^T) for every pair within the cutoff at the static minimum,
kept at every volume (Born and Huang, ch. 3 and 5, from memory). V-derivatives by fitting a degree-24 Chebyshev series to
F_vib and S_vib at 97 volumes 0.25 % apart (the mode sum is smooth to round-off: common practice, no source).
B_T = V F'', alpha_V = (dS/dV)_T / B_T (Ashcroft and Mermin, ch. 25, from memory). CODATA 2018 constants.

Usage: reference.py D_EV R0_NM WIDTH_PER_NM MASS_AMU CUTOFF_NM MESH T [T ...]
Prints per T: the lattice constant (nm), B_T (GPa), alpha_V (1/K) at the minimum of F.
With mesh = 'extrapolate:M1,M2' it prints both meshes' values and the one extrapolated as 1/M^3 (the q = 0 cell's
missing share falls as the cell's volume, 1/M^3).
"""
import sys
import numpy as np

HBAR = 6.62607015e-34 / (2 * np.pi)
KB = 1.380649e-23
EV = 1.602176634e-19
AMU = 1.66053906660e-27


def morse(d_ev, r0_nm, w_per_nm):
    d, r0, a = d_ev * EV, r0_nm * 1e-9, w_per_nm * 1e9
    def phi(r):
        x = np.exp(-a * (r - r0)); return d * ((1 - x) ** 2 - 1)
    def d1(r):
        x = np.exp(-a * (r - r0)); return 2 * d * a * x * (1 - x)
    def d2(r):
        x = np.exp(-a * (r - r0)); return 2 * d * a * a * x * (2 * x - 1)
    return phi, d1, d2


def fcc_vectors(reach):
    """Lattice vectors of fcc of unit cube edge out to `reach` (in units of the cube edge)."""
    prim = 0.5 * np.array([[0, 1, 1], [1, 0, 1], [1, 1, 0]], float)
    n = int(np.ceil(reach * 2)) + 2
    rng = np.arange(-n, n + 1)
    g = np.array(np.meshgrid(rng, rng, rng, indexing="ij")).reshape(3, -1).T
    v = g @ prim
    r = np.linalg.norm(v, axis=1)
    keep = (r > 1e-9) & (r <= reach + 1e-9)
    return v[keep]


def static_minimum(pot, cutoff_m):
    phi, d1, _ = pot
    vec = fcc_vectors(3.0)
    def energy(a):
        r = np.linalg.norm(vec, axis=1) * a
        r = r[r < cutoff_m]
        return 0.5 * np.sum(phi(r) - phi(cutoff_m))
    grid = np.linspace(0.2e-9, 0.6e-9, 4001)
    e = np.array([energy(a) for a in grid])
    k = int(np.argmin(e))
    lo, hi = grid[k - 1], grid[k + 1]
    for _ in range(200):  # golden section on the (locally smooth) energy
        m1, m2 = lo + 0.382 * (hi - lo), hi - 0.382 * (hi - lo)
        if energy(m1) < energy(m2):
            hi = m2
        else:
            lo = m1
    a0 = 0.5 * (lo + hi)
    frozen = vec[np.linalg.norm(vec, axis=1) * a0 < cutoff_m]
    return a0, frozen


def mesh(m):
    k = np.arange(m) - m // 2
    g = np.array(np.meshgrid(k, k, k, indexing="ij")).reshape(3, -1).T / m
    # reduced coordinates on the reciprocal basis of the fcc primitive cell (cube edge 1): b_i . a_j = 2 pi delta
    prim = 0.5 * np.array([[0, 1, 1], [1, 0, 1], [1, 1, 0]], float)
    recip = 2 * np.pi * np.linalg.inv(prim).T
    return g @ recip, np.all(g == 0, axis=1)


def omegas(a, pot, frozen, mass, qs):
    _, d1, d2 = pot
    R = frozen * a
    r = np.linalg.norm(R, axis=1)
    e = R / r[:, None]
    kl, kt = d2(r), d1(r) / r
    K = kl[:, None, None] * e[:, :, None] * e[:, None, :] + kt[:, None, None] * (np.eye(3) - e[:, :, None] * e[:, None, :])
    phase = 1 - np.cos((qs / a) @ R.T)  # (nq, npairs); q in units of 1/cube edge
    D = 0.5 * np.einsum("qp,pij->qij", phase, K) * 2 / mass  # sum over +R and -R pairs: each listed once per direction
    w2 = np.linalg.eigvalsh(D)
    return w2


def vib(a, pot, frozen, mass, qs, gamma, temps):
    w2 = omegas(a, pot, frozen, mass, qs)
    w = np.sqrt(np.clip(w2, 0, None))
    w = w[~gamma].ravel()
    nq = len(qs)
    F, S = [], []
    for t in temps:
        x = HBAR * w / (KB * t)
        F.append(np.sum(0.5 * HBAR * w + KB * t * np.log1p(-np.exp(-x))) / nq)
        S.append(np.sum(KB * (x / np.expm1(x) - np.log1p(-np.exp(-x)))) / nq)
    return np.array(F), np.array(S)


def solve(args, m):
    d_ev, r0, w, mass_amu, cut = args
    pot = morse(d_ev, r0, w)
    cutoff = cut * 1e-9
    a0, frozen = static_minimum(pot, cutoff)
    mass = mass_amu * AMU
    qs, gamma = mesh(m)
    return pot, a0, frozen, mass, qs, gamma


def state(pot, a0, frozen, mass, qs, gamma, temps):
    phi, d1, d2 = pot
    v0 = a0 ** 3 / 4
    ys = np.linspace(-0.03, 0.21, 97)  # volumes around the static minimum (linear strain -1 % to +6.6 %)
    Fv = np.empty((len(ys), len(temps)))
    Sv = np.empty_like(Fv)
    for i, y in enumerate(ys):
        a = a0 * (1 + y) ** (1 / 3)
        Fv[i], Sv[i] = vib(a, pot, frozen, mass, qs, gamma, temps)
    r0s = np.linalg.norm(frozen, axis=1)
    def static(v):
        a = (4 * v) ** (1 / 3)
        # E = 1/2 sum phi(a r0); dE/dV and d2E/dV2 through a(V)
        da = a / (3 * v); dda = -2 * a / (9 * v * v)
        e1 = 0.5 * np.sum(r0s * d1(a * r0s)); e2 = 0.5 * np.sum(r0s ** 2 * d2(a * r0s))
        return e1 * da, e2 * da * da + e1 * dda
    out = []
    for t in range(len(temps)):
        cf = np.polynomial.Chebyshev.fit(ys, Fv[:, t], 24)
        cs = np.polynomial.Chebyshev.fit(ys, Sv[:, t], 24)
        d1f, d2f, d1s = cf.deriv(1), cf.deriv(2), cs.deriv(1)
        def slope(y):
            v = v0 * (1 + y); e1, e2 = static(v)
            return e1 + d1f(y) / v0, e2 + d2f(y) / v0 ** 2
        lo, hi = ys[0], ys[-1]
        if slope(hi)[0] < 0:
            out.append((temps[t], float("nan"), float("nan"), float("nan"))); continue
        for _ in range(200):
            mid = 0.5 * (lo + hi)
            if slope(mid)[0] > 0: hi = mid
            else: lo = mid
        y = 0.5 * (lo + hi)
        v = v0 * (1 + y)
        bt = v * slope(y)[1]
        alpha = d1s(y) / v0 / bt
        out.append((temps[t], (4 * v) ** (1 / 3) * 1e9, bt / 1e9, alpha))
    return out


def main():
    args = [float(x) for x in sys.argv[1:6]]
    meshes = sys.argv[6]
    temps = [float(x) for x in sys.argv[7:]]
    if meshes.startswith("extrapolate:"):
        m1, m2 = (int(x) for x in meshes.split(":")[1].split(","))
        r1 = state(*solve(args, m1), temps)
        r2 = state(*solve(args, m2), temps)
        for a, b in zip(r1, r2):
            ext = [(bb * m2 ** 3 - aa * m1 ** 3) / (m2 ** 3 - m1 ** 3) for aa, bb in zip(a[1:], b[1:])]
            print(f"T {a[0]:g} M{m1}: a {a[1]:.9g} B {a[2]:.9g} alpha {a[3]:.9g} | M{m2}: a {b[1]:.9g} B {b[2]:.9g} alpha {b[3]:.9g} | extrap: a {ext[0]:.9g} B {ext[1]:.9g} alpha {ext[2]:.9g}")
    else:
        for row in state(*solve(args, int(meshes)), temps):
            print(f"T {row[0]:g} a {row[1]:.9g} B {row[2]:.9g} alpha {row[3]:.9g}")


if __name__ == "__main__":
    main()
