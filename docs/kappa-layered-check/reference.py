#!/usr/bin/env python3
"""Independent kinetic-theory conductivity of one-site cells with bonds along the axes only.

Such a cell's dynamical matrix is diagonal: polarisation p has
    omega_p(q)^2 = (2 / m) sum_j K_pj (1 - cos q_j a),
K_pj the longitudinal constant of the bond along j when p = j, else its transverse constant.
So every branch, its group velocity v_j = K_pj a sin(q_j a) / (m omega) and the kinetic sum
    kappa_ab = int d^d q / (2 pi)^d sum_p C v_a v_b tau / (thickness in 2D)
are closed forms, integrated here with Gauss-Legendre panels graded geometrically towards q = 0
along every axis (the integrand is even in each q_j, so one octant / quadrant times 2^d).
Relaxation rates as docs/conductivity.md defines them: constant 1/tau0; boundary |v| / L
(diffuse walls); empirical Umklapp (hbar g^2 / (M v^2 theta)) omega^2 T exp(-theta / 3T) with theta
and v given. Long-wave limit (tau0 or boundary): kappa_aa = C_p c_pa^2 tau0 / d and
L C_p <c_pa^2 n_a^2 / |v_p(n)|> over the unit sphere (circle), C_p the T^d heat capacity of the
branch with speeds c_pj = a sqrt(K_pj / m) (Ashcroft and Mermin ch. 23 for the T^3 law, Ziman,
Electrons and Phonons, ch. 8 and 11, for the kinetic form and Casimir's boundary rate;
the anisotropic speeds by the substitution q_j = k_j / c_pj: common practice, no source).
Heat capacity, entropy and Debye temperature per mole of atoms come from the same integrals.
Usage: reference.py MODEL.json  (prints JSON rows)."""
import json, sys
import numpy as np

KB = 1.380649e-23; HBAR = 1.054571817e-34; AMU = 1.66053906660e-27; NA = 6.02214076e23


def axis_nodes(panels=24, order=10):
    """Nodes and weights on [0, pi] (units of 1/a), panels halving towards 0."""
    x, w = np.polynomial.legendre.leggauss(order)
    edges = [0.0] + [np.pi * 0.5 ** k for k in range(panels - 1, -1, -1)]
    nodes, weights = [], []
    for lo, hi in zip(edges[:-1], edges[1:]):
        nodes.append(lo + (x + 1) * (hi - lo) / 2); weights.append(w * (hi - lo) / 2)
    return np.concatenate(nodes), np.concatenate(weights)


def branch_constants(model):
    """K[p][j] in N/m."""
    d = model["dims"]; kl = model["longitudinal"]; kt = model["transverse"]
    pols = model["polarisations"]  # 0 = x, 1 = y, 2 = z (out of plane for a sheet)
    return [[kl[j] if p == j else kt[j] for j in range(d)] for p in pols]


def rates(model, omega, speed, t_k):
    s = model["scattering"]; r = np.zeros_like(omega)
    if "constant_ps" in s: r = r + 1.0 / (s["constant_ps"] * 1e-12)
    if "boundary_nm" in s: r = r + speed / (s["boundary_nm"] * 1e-9)
    if "umklapp" in s:
        u = s["umklapp"]; m = model["mass_amu"] * AMU
        r = r + HBAR * u["gamma"] ** 2 / (m * u["v"] ** 2 * u["theta"]) * omega ** 2 * t_k * np.exp(-u["theta"] / (3 * t_k))
    return r


def mode_c(omega, t_k):
    x = HBAR * omega / (KB * t_k)
    with np.errstate(over="ignore", divide="ignore", invalid="ignore"):
        n = 1.0 / np.expm1(x)
        c = KB * x * x * n * (1 + n)
        s = KB * ((x * n) - np.log1p(-np.exp(-x)))
    c = np.where(x > 700, 0.0, c); s = np.where(x > 700, 0.0, s)
    return c, s


def integrate(model, temps, panels=24, order=10):
    d = model["dims"]; a = model["constant_nm"] * 1e-9; m = model["mass_amu"] * AMU
    K = branch_constants(model); nodes, weights = axis_nodes(panels, order)
    vol = a ** d * (model.get("thickness_nm", 0) * 1e-9 if d == 2 else 1.0)
    # per-point weight: d^d(qa) / (2 pi)^d for the whole zone = 2^d x octant
    kap = np.zeros((len(temps), d)); cv = np.zeros(len(temps)); ent = np.zeros(len(temps))
    grids = np.meshgrid(*([nodes] * (d - 1)), indexing="ij") if d > 1 else []
    wgrid = np.ones(1)
    if d > 1:
        wgrid = weights.copy()
        for _ in range(d - 2): wgrid = np.multiply.outer(wgrid, weights)
    for i0, (q0, w0) in enumerate(zip(nodes, weights)):
        qs = [np.full_like(grids[0], q0) if d > 1 else np.array([q0])] + list(grids)
        w = w0 * wgrid * 2 ** d / (2 * np.pi) ** d  # over (qa)
        for Kp in K:
            om2 = sum(4 * Kp[j] / m * np.sin(qs[j] / 2) ** 2 for j in range(d))  # 1 - cos loses q < 1e-8
            om = np.sqrt(om2)
            v = [Kp[j] * a * np.sin(qs[j]) / (m * om) for j in range(d)]
            sp = np.sqrt(sum(vj * vj for vj in v))
            for it, t in enumerate(temps):
                c, s = mode_c(om, t)
                tau = 1.0 / rates(model, om, sp, t)
                for j in range(d):
                    kap[it, j] += np.sum(w * c * v[j] ** 2 * tau)
                cv[it] += np.sum(w * c); ent[it] += np.sum(w * s)
    # per-volume: (1/a^d) d^d(qa)/(2pi)^d -> divide by vol
    kap /= vol
    n_modes = len(K)
    cv_mol = cv * NA; s_mol = ent * NA  # one atom per cell: per cell == per atom
    return kap, cv_mol, s_mol, n_modes


def long_wave(model, temps):
    """Closed-form low-temperature limits (constant tau or boundary only)."""
    d = model["dims"]; a = model["constant_nm"] * 1e-9; m = model["mass_amu"] * AMU
    vol = (model.get("thickness_nm", 0) * 1e-9) if d == 2 else 1.0
    K = branch_constants(model); s = model["scattering"]
    if d == 3:
        th = np.linspace(0, np.pi, 801)[:-1] + np.pi / 1600; ph = np.linspace(0, 2 * np.pi, 1601)[:-1]
        T_, P_ = np.meshgrid(th, ph, indexing="ij")
        n = [np.sin(T_) * np.cos(P_), np.sin(T_) * np.sin(P_), np.cos(T_)]
        wt = np.sin(T_) / np.sum(np.sin(T_))
    else:
        ph = np.linspace(0, 2 * np.pi, 4001)[:-1]; n = [np.cos(ph), np.sin(ph)]; wt = np.full(ph.shape, 1 / ph.size)
    out = []
    for t in temps:
        row = np.zeros(d); cvt = 0.0
        for Kp in K:
            c = [a * np.sqrt(k / m) for k in Kp]
            if d == 3:  # T^3 law per volume (Ashcroft and Mermin eq. 23.30 form)
                cp = (2 * np.pi ** 2 / 15) * KB * (KB * t / HBAR) ** 3 / np.prod(c)
            else:  # T^2 law per area: int d^2k/(2 pi)^2 C = 3 zeta(3) kB (kB T / hbar)^2 / (pi c1 c2)
                cp = 3 * 1.2020569031595942 * KB * (KB * t / HBAR) ** 2 / (np.pi * np.prod(c))
            cvt += cp
            sp = np.sqrt(sum((c[j] * n[j]) ** 2 for j in range(d)))
            for j in range(d):
                if "constant_ps" in s and "boundary_nm" not in s:
                    row[j] += cp * c[j] ** 2 * s["constant_ps"] * 1e-12 / d
                elif "boundary_nm" in s and "constant_ps" not in s:
                    row[j] += cp * s["boundary_nm"] * 1e-9 * np.sum(wt * (c[j] * n[j]) ** 2 / sp)
                else:
                    row[j] = np.nan
        out.append({"t": t, "kappa": list(row / vol), "cv_per_m3": cvt})
    return out


if __name__ == "__main__":
    model = json.load(open(sys.argv[1]))
    temps = model["temperatures_k"]
    kap, cv, s, nb = integrate(model, temps, model.get("panels", 24), model.get("order", 10))
    lw = long_wave(model, temps)
    for it, t in enumerate(temps):
        print(json.dumps({"t": t, "kappa": list(kap[it]), "cv_mol": cv[it], "s_mol": s[it], "long_wave": lw[it]["kappa"]}))
