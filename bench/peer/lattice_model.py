"""Masses on a lattice joined by springs, written the way a researcher would in NumPy.

Reads a model from bench/cases.json (the same numbers the C# harness uses), finds neighbour shells by
brute-force distance search, and builds the dynamical matrix D(q) for many wave vectors at once with
the atomic-position phase convention:
    D_{Ia,Jb}(q) = [delta_IJ sum_bonds K_ab - sum_R K_ab(I, J+R) exp(i q.(R + r_J - r_I))] / sqrt(m_I m_J).
Eigenvalues are omega^2 (rad^2/s^2). SI units; constants CODATA 2018.
"""
import numpy as np

AMU_KG = 1.66053906660e-27
HBAR = 1.054571817e-34
KB = 1.380649e-23
AVOGADRO = 6.02214076e23

PRIMITIVE = {
    "chain": [[1, 0, 0], [0, 1, 0], [0, 0, 1]],
    "sc": [[1, 0, 0], [0, 1, 0], [0, 0, 1]],
    "fcc": [[0, 0.5, 0.5], [0.5, 0, 0.5], [0.5, 0.5, 0]],
}
DIMENSION = {"chain": 1, "sc": 3, "fcc": 3}


class Model:
    def __init__(self, spec):
        a = spec["constant_nm"] * 1e-9
        self.kind = spec["lattice"]
        self.dim = DIMENSION[self.kind]
        self.vectors = np.array(PRIMITIVE[self.kind], dtype=float) * a  # rows a_i (m)
        self.reciprocal = 2 * np.pi * np.linalg.inv(self.vectors).T     # rows b_i (1/m)
        self.scalar = spec["degrees_of_freedom"] == "scalar"
        self.comp = 1 if self.scalar else 3
        sites = spec["sites"]
        self.kinds = [s["kind"] for s in sites]
        self.mass = np.array([s["mass_amu"] for s in sites]) * AMU_KG
        self.pos = np.array([s["fractional"] for s in sites], dtype=float) @ self.vectors
        self.nsite = len(sites)
        self.size = self.nsite * self.comp
        self.bonds = self._bonds(spec["springs"])

    def _bonds(self, springs):
        """Directed bonds (I, J, separation, 3x3 tensor), both directions of every spring."""
        rng = range(-3, 4)
        ranges = [rng if d < self.dim else [0] for d in range(3)]
        cells = np.array([(i, j, k) for i in ranges[0] for j in ranges[1] for k in ranges[2]], dtype=float)
        shifts = cells @ self.vectors
        undirected = {}
        for sp in springs:
            ka, kb = sp["kinds"]
            for i in range(self.nsite):
                if self.kinds[i] != ka:
                    continue
                cand = []
                for j in range(self.nsite):
                    if self.kinds[j] != kb:
                        continue
                    d = shifts + self.pos[j] - self.pos[i]
                    r = np.linalg.norm(d, axis=1)
                    for c in np.nonzero(r > 1e-12)[0]:
                        cand.append((r[c], j, tuple(cells[c].astype(int)), d[c]))
                dist = sorted({round(c[0] * 1e9, 6) for c in cand})
                target = dist[sp["shell"] - 1]
                for r, j, cell, d in cand:
                    if abs(r * 1e9 - target) > 1e-6:
                        continue
                    key = (i, j, cell)
                    rev = (j, i, tuple(-x for x in cell))
                    canon = min(key, rev)
                    sign = 1.0 if canon == key else -1.0
                    k = self._tensor(d, sp["longitudinal_n_per_m"], sp["transverse_n_per_m"])
                    undirected.setdefault(canon, [sign * d if sign > 0 else -d, {}])
                    undirected[canon][1][id(sp)] = k  # one spring counts a bond once
        out = []
        for (i, j, _), (d, per_spring) in undirected.items():
            k = sum(per_spring.values())
            out.append((i, j, d, k))
            out.append((j, i, -d, k))
        return out

    def _tensor(self, d, longitudinal, transverse):
        if self.scalar:
            return np.array([[longitudinal]])
        e = d / np.linalg.norm(d)
        return (longitudinal - transverse) * np.outer(e, e) + transverse * np.eye(3)

    def dynamical_matrices(self, q):
        """D(q) for q of shape (m, 3) in 1/m: array (m, size, size) complex."""
        c, n = self.comp, self.size
        minv = 1 / np.sqrt(self.mass)
        d = np.zeros((len(q), n, n), dtype=complex)
        for i, j, sep, k in self.bonds:
            phase = np.exp(1j * (q @ sep))
            d[:, i * c:(i + 1) * c, j * c:(j + 1) * c] -= phase[:, None, None] * (k * minv[i] * minv[j])
            d[:, i * c:(i + 1) * c, i * c:(i + 1) * c] += k * minv[i] ** 2
        return d

    def mesh_q(self, counts, reduced_only=False):
        """q = sum_i n_i b_i / N_i with n_i in [-N_i/2, N_i/2): the Born-von Karman set (1/m)."""
        axes = [(np.arange(m) - m // 2) / m for m in counts]
        g = np.stack(np.meshgrid(*axes, indexing="ij"), axis=-1).reshape(-1, 3)
        return g if reduced_only else g @ self.reciprocal


def thermal_from_modes(omega, weight, temperatures, atoms_per_cell):
    """U, F, S, Cv per mole of atoms from modes omega (rad/s) with weights (states per cell)."""
    per_mol = AVOGADRO / atoms_per_cell
    out = {"internal": [], "free": [], "entropy": [], "cv": []}
    zpe = 0.5 * HBAR * np.sum(weight * omega)
    for t in temperatures:
        x = HBAR * omega / (KB * t)
        em1 = np.expm1(x)
        n = 1 / em1
        log1m = np.log(-np.expm1(-x))
        out["internal"].append((zpe + np.sum(weight * HBAR * omega * n)) * per_mol)
        out["free"].append((zpe + KB * t * np.sum(weight * log1m)) * per_mol)
        out["entropy"].append(KB * np.sum(weight * (x * n - log1m)) * per_mol)
        out["cv"].append(KB * np.sum(weight * x * x * (em1 + 1) * n * n) * per_mol)
    return {k: np.array(v) for k, v in out.items()}, zpe * per_mol


def temperatures(cases):
    t = cases["temperatures_k"]
    return np.linspace(t["first"], t["last"], t["count"])
