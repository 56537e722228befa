"""Shared by square_sheet_zone_sum.py and simple_cubic_zone_sum.py: the kinetic-theory terms of one block of wave vectors.

D(q) = (1/m) sum_r K_r (1 - cos q.r) r^ r^T over all neighbours of a one-site crystal with central springs (each bond r
and -r; Ashcroft and Mermin ch. 22), omega^2 its eigenvalues, v_a = e^T (dD/dq_a) e / (2 omega) (Hellmann-Feynman) and
C = kB x^2 e^x / (e^x - 1)^2 (Ashcroft and Mermin ch. 23); adds sum C v_a^2 tau per temperature and axis.
"""
import numpy as np

HBAR = 6.62607015e-34 / (2 * np.pi)
KB = 1.380649e-23
AMU = 1.66053906660e-27


def add_kinetic_terms(q, bonds, mass_kg, tau_s, totals):
    """q: one array per axis (1/m); bonds: (r in m, K in N/m), one of each +- pair; totals: {T: array per axis}."""
    dim, count = len(q), q[0].size
    d = np.zeros((count, dim, dim))
    dd = np.zeros((dim, count, dim, dim))
    for r, k in bonds:
        u = r / np.linalg.norm(r)
        phase = sum(q[i] * r[i] for i in range(dim))
        outer = np.outer(u, u)
        d += (2 * k / mass_kg) * (1 - np.cos(phase))[:, None, None] * outer
        for ax in range(dim):
            dd[ax] += (2 * k / mass_kg) * (r[ax] * np.sin(phase))[:, None, None] * outer
    w2, e = np.linalg.eigh(d)
    omega = np.sqrt(np.maximum(w2, 0))
    for ax in range(dim):
        proj = np.einsum('nis,nij,njs->ns', e, dd[ax], e)
        v = np.where(omega > 0, proj / (2 * np.where(omega > 0, omega, 1)), 0.0)
        for t in totals:
            x = HBAR * omega / (KB * t)
            with np.errstate(over='ignore', invalid='ignore', divide='ignore'):
                c = np.where((x > 0) & (x < 700), KB * x * x * np.exp(x) / np.expm1(x) ** 2, 0.0)
            totals[t][ax] += np.sum(c * v * v * tau_s)
