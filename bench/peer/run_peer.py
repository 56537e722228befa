"""The NumPy peer: the same cases as the C# harness, written as a researcher would, timed the same way.

usage: run_peer.py CASE --cases bench/cases.json --out DIR [--repeats K] [--warmups W]
Writes DIR/peer_CASE.json. One core: run it with OPENBLAS_NUM_THREADS=1 (bench/run.sh does).
"""
import argparse
import json
import os
import re
import statistics
import time

import numpy as np

from lattice_model import HBAR, KB, Model, temperatures, thermal_from_modes


CPU = {}  # median process CPU seconds of the last measure() (less disturbed by other work on the machine)


def measure(run, warmups, repeats, min_seconds=0.0):
    for _ in range(warmups):
        run()
    samples = []
    cpu = []
    start = time.perf_counter()
    while len(samples) < repeats or (time.perf_counter() - start < min_seconds and len(samples) < 1000):
        t0 = time.perf_counter()
        c0 = time.process_time()
        run()
        samples.append(time.perf_counter() - t0)
        cpu.append(time.process_time() - c0)
    CPU["last"] = statistics.median(cpu)
    return statistics.median(samples), samples


def blas_info():
    """Which BLAS/LAPACK numpy really loaded: threadpoolctl's view (OpenBLAS kernel and threads) and the mapped files."""
    np.linalg.eigvalsh(np.eye(2))
    try:
        from threadpoolctl import threadpool_info
        pools = [{k: v for k, v in lib.items() if k in ("internal_api", "version", "architecture", "num_threads")}
                 for lib in threadpool_info()]
    except ImportError:
        pools = "threadpoolctl not installed"
    with open("/proc/self/maps") as fh:
        libs = sorted({os.path.realpath(line.split()[-1]) for line in fh
                       if re.search(r"(blas|lapack)[^/]*\.so", line.split()[-1])})
    return {"threadpoolctl": pools, "libraries": libs}


def thz(lam):
    return np.sign(lam) * np.sqrt(np.abs(lam)) / (2 * np.pi) / 1e12


def eigen_case(cases, out, repeats):
    sec = cases["eigen"]
    res = {}
    for n in sec["sizes"]:
        batch = sec["batch"][str(n)]
        a = np.fromfile(os.path.join(out, f"eig_{n}_matrices.c128"), dtype=np.complex128).reshape(batch, n, n)
        box = {}

        def values():
            box["w"] = np.linalg.eigvalsh(a)

        def vectors():
            box["wv"] = np.linalg.eigh(a)

        tv, sv = measure(values, 2, repeats, 0.5)
        cv = CPU["last"]
        te, se = measure(vectors, 2, repeats, 0.5)
        ce = CPU["last"]
        box["w"].astype(np.float64).tofile(os.path.join(out, f"eig_{n}_values_peer.f64"))
        res[str(n)] = {"n": n, "batch": batch, "values_us_per_matrix": tv / batch * 1e6,
                       "vectors_us_per_matrix": te / batch * 1e6, "values_runs": len(sv), "vectors_runs": len(se),
                       "values_cpu_us_per_matrix": cv / batch * 1e6, "vectors_cpu_us_per_matrix": ce / batch * 1e6}
        print(f"  peer eigen {n}x{n}: eigvalsh {tv / batch * 1e6:.3f} us, eigh {te / batch * 1e6:.3f} us per matrix", flush=True)
    return res


def solve_mesh(model, counts, chunk=32768):
    """Eigenvalues omega^2 on every point of the mesh (no symmetry used): array (points, branches)."""
    q = model.mesh_q(counts)
    lam = np.empty((len(q), model.size))
    for s in range(0, len(q), chunk):
        lam[s:s + chunk] = np.linalg.eigvalsh(model.dynamical_matrices(q[s:s + chunk]))
    return lam


def bulk_case(cases, out, repeats, warmups):
    sec = cases["bulk"]
    model = Model(cases["models"][sec["model"]])
    temps = temperatures(cases)
    counts = sec["mesh"]
    bins = sec["dos_bins"]
    box = {}

    def run():
        lam = solve_mesh(model, counts)
        f = thz(lam).ravel()
        cells = lam.shape[0]
        top = f.max()
        # DOS: histogram of the mesh frequencies, states per THz per cell.
        hist, edges = np.histogram(f, bins=bins, range=(0.0, top * (1 + 1e-9)))
        dos = hist / cells / (edges[1] - edges[0])
        # Thermal functions: integrals over a fine histogram DOS (bin centres), the same formulas.
        fine, fedges = np.histogram(f, bins=4096, range=(0.0, top * (1 + 1e-9)))
        centres = 0.5 * (fedges[1:] + fedges[:-1])
        keep = (fine > 0) & (centres > 0)
        omega = 2 * np.pi * 1e12 * centres[keep]
        thermal, zpe = thermal_from_modes(omega, fine[keep] / cells, temps, model.nsite)
        box.update(dos=dos, edges=edges, thermal=thermal, zpe=zpe, f=f, cells=cells)

    med, samples = measure(run, warmups, repeats)
    print(f"  peer bulk: {med:.3f} s median of {len(samples)} after {warmups} warm-ups", flush=True)
    return {"median_s": med, "median_cpu_s": CPU["last"], "runs": len(samples), "warmups": warmups, "dos_edges_thz": box["edges"].tolist(), "dos_total": box["dos"].tolist(),
            "cumulative_at": cumulative_at(box["f"], box["cells"]),
            "temperature_k": temps.tolist(), **{k: v.tolist() for k, v in box["thermal"].items()},
            "zero_point_j_per_mol": box["zpe"], "method": "full-mesh eigvalsh, histogram DOS, thermal from a 4096-bin histogram"}


def cumulative_at(f, cells):
    """Sorted frequencies, so the comparison can count states below any frequency."""
    return {"sorted_thz_sample": np.sort(f).tolist() if f.size <= 4_000_000 else None, "cells": int(cells)}


def finite_case(cases, out, repeats, section):
    sec = cases[section]
    model = Model(cases["models"][sec["model"]])
    temps = temperatures(cases)
    counts = sec["cells"]
    box = {}

    def run():
        lam = solve_mesh(model, counts, chunk=1 << 20 if model.size == 1 else 32768)
        reduced = model.mesh_q(counts, reduced_only=True)
        gamma = np.nonzero(np.all(reduced == 0, axis=1))[0][0]
        lam[gamma, :model.comp] = 0.0  # rigid translations: out of the sums
        lam = lam.ravel()
        keep = lam > 0
        omega = np.sqrt(lam[keep])
        cells = len(reduced)
        thermal, zpe = thermal_from_modes(omega, np.full(omega.size, 1.0 / cells), temps, model.nsite)
        box.update(thermal=thermal, zpe=zpe, f=thz(lam), cells=cells)

    med, samples = measure(run, 0, repeats)
    print(f"  peer {section}: {med:.3f} s median of {len(samples)}", flush=True)
    f = np.sort(box["f"])
    return {"median_s": med, "median_cpu_s": CPU["last"], "runs": len(samples), "temperature_k": temps.tolist(),
            **{k: v.tolist() for k, v in box["thermal"].items()}, "zero_point_j_per_mol": box["zpe"],
            "cells": box["cells"], "sorted_thz": f.tolist() if f.size <= 4_000_000 else None,
            "method": "full set of allowed q, eigvalsh, plain vectorised mode sum per temperature"}


def main():
    p = argparse.ArgumentParser()
    p.add_argument("case")
    p.add_argument("--cases", default="bench/cases.json")
    p.add_argument("--out", default="bench/results")
    p.add_argument("--repeats", type=int, default=5)
    p.add_argument("--warmups", type=int, default=40, help="case bulk: untimed runs first, as many as ours (bench/run.sh passes BULK_WARMUPS)")
    a = p.parse_args()
    with open(a.cases) as fh:
        cases = json.load(fh)
    report = {"case": a.case, "numpy": np.__version__, "blas": blas_info(),
              "openblas_coretype": os.environ.get("OPENBLAS_CORETYPE", "(unset)")}
    if a.case == "eigen":
        report["sizes"] = eigen_case(cases, a.out, a.repeats)
    elif a.case == "bulk":
        report["result"] = bulk_case(cases, a.out, a.repeats, a.warmups)
    elif a.case == "finite-chain":
        report["result"] = finite_case(cases, a.out, a.repeats, "finite_chain")
    elif a.case == "finite-3d":
        report["result"] = finite_case(cases, a.out, a.repeats, "finite_3d")
    else:
        raise SystemExit(f"unknown case {a.case}")
    with open(os.path.join(a.out, f"peer_{a.case}.json"), "w") as fh:
        json.dump(report, fh)


if __name__ == "__main__":
    main()
