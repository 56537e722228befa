"""Side-by-side table of the C# engine and the NumPy peer, with the agreement checks.

usage: compare.py RESULTS_DIR   (reads ours_*.json and peer_*.json written by bench/run.sh)
Exit status 1 when a result disagrees beyond its tolerance, so the bench cannot pass on wrong numbers.
"""
import json
import os
import sys

import numpy as np

d = sys.argv[1]
failures = []


def load(name):
    path = os.path.join(d, name)
    return json.load(open(path)) if os.path.exists(path) else None


def check(label, value, limit):
    ok = value <= limit
    if not ok:
        failures.append(f"{label}: {value:.3e} > {limit:.1e}")
    return f"{value:.1e} (limit {limit:.0e}) {'ok' if ok else 'FAIL'}"


rows = []


def cpu_ratio(peer_cpu, ours_cpu):
    """The ratio of process CPU times too: on a busy machine it moves far less than the wall-clock one."""
    return f"CPU {peer_cpu / ours_cpu:.2f}x; " if peer_cpu and ours_cpu else ""

# (a) eigenvalues: same matrices, per-matrix times, values agree to 1e-12 ||A||.
ours, peer = load("ours_eigen.json"), load("peer_eigen.json")
if ours and peer:
    for n, o in ours["sizes"].items():
        p = peer["sizes"][n]
        batch, size = o["batch"], o["n"]
        a = np.fromfile(os.path.join(d, f"eig_{n}_matrices.c128"), dtype=np.complex128).reshape(batch, size, size)
        wo = np.fromfile(os.path.join(d, f"eig_{n}_values_ours.f64")).reshape(batch, size)
        wp = np.fromfile(os.path.join(d, f"eig_{n}_values_peer.f64")).reshape(batch, size)
        scale = np.abs(wp).max(axis=1)
        err = (np.abs(wo - wp).max(axis=1) / scale).max()
        rows.append((f"(a) {n}x{n} eigenvalues", f"{o['values_us_per_matrix']:.3f} us", f"{p['values_us_per_matrix']:.3f} us",
                     p["values_us_per_matrix"] / o["values_us_per_matrix"],
                     cpu_ratio(p.get("values_cpu_us_per_matrix"), o.get("values_cpu_us_per_matrix"))
                     + f"[{o.get('values_path', '?')}] max|dl|/||A|| " + check(f"eigen {n} values", err, 1e-12)))
        rows.append((f"(a) {n}x{n} with vectors", f"{o['vectors_us_per_matrix']:.3f} us", f"{p['vectors_us_per_matrix']:.3f} us",
                     p["vectors_us_per_matrix"] / o["vectors_us_per_matrix"],
                     cpu_ratio(p.get("vectors_cpu_us_per_matrix"), o.get("vectors_cpu_us_per_matrix"))
                     + f"[{o.get('vectors_path', '?')}] (residuals: unit tests)"))


def thermal_errors(o, p, tmin, label, limit):
    t = np.array(o["temperature_k"])
    mask = t >= tmin
    worst = {}
    for ok, pk in (("internal_j_per_mol", "internal"), ("entropy_j_per_mol_k", "entropy"), ("cv_j_per_mol_k", "cv"),
                   ("free_j_per_mol", "free")):
        a, b = np.array(o[ok])[mask], np.array(p[pk])[mask]
        scale = np.abs(b) if pk != "free" else p["zero_point_j_per_mol"] + np.abs(b - p["zero_point_j_per_mol"])
        worst[pk] = float((np.abs(a - b) / scale).max())
    w = max(worst.values())
    return f"thermal (T >= {tmin:g} K) worst rel " + check(label, w, limit) + " [" + ", ".join(f"{k} {v:.1e}" for k, v in worst.items()) + "]"


def warmup_note(o, p):
    """Case (b)'s warm-ups on each side, our first solve in a fresh process, and whether our JIT still ran while timed."""
    if "warmups" not in o:
        return ""
    return (f"; warm-ups ours {o['warmups']}, peer {p.get('warmups', 1)}; our first solve {o['first_s']:.3f} s (CPU {o['first_cpu_s']:.3f} s), "
            f"{o['methods_compiled_while_timed']} methods compiled while timed")


def states_below(o_freq, o_total, edges):
    """Integrated DOS of ours at the given frequencies (states per cell)."""
    f = np.array(o_freq)
    width = f[1] - f[0]
    cum = np.concatenate([[0.0], np.cumsum(np.array(o_total) * width)])
    start = f[0] - width / 2
    return np.interp(edges, start + width * np.arange(len(cum)), cum)


ours, peer = load("ours_bulk.json"), load("peer_bulk.json")
if ours and peer:
    o, p = ours["result"], peer["result"]
    e = np.array(p["dos_edges_thz"])
    po = np.concatenate([[0.0], np.cumsum(np.array(p["dos_total"]) * (e[1] - e[0]))])
    oo = states_below(o["dos_frequency_thz"], o["dos_total"], e)
    cum_err = float(np.abs(po - oo).max() / po[-1])
    rows.append(("(b) bulk 48^3 two-site fcc", f"{o['median_s']:.3f} s", f"{p['median_s']:.3f} s", p["median_s"] / o["median_s"],
                 cpu_ratio(p.get("median_cpu_s"), o.get("median_cpu_s")) + "integrated DOS max diff/3r " + check("bulk integrated DOS", cum_err, 5e-3) + "; "
                 + thermal_errors(o, p, 50.0, "bulk thermal", 2e-3) + warmup_note(o, p)))
    bulk_per_q = o["median_s"] / o["q_points_solved"]
else:
    bulk_per_q = None

for case, title in (("finite-chain", "(c) finite chain 1e7 cells"), ("finite-3d", "(d) finite 64^3 two-site fcc")):
    ours, peer = load(f"ours_{case}.json"), load(f"peer_{case}.json")
    if not ours:
        continue
    o = ours["result"]
    plain = o["plain_sum_check"]
    worst_plain = max(plain["worst_relative_error"].values())
    note = (cpu_ratio(peer["result"].get("median_cpu_s") if peer else None, o.get("median_cpu_s"))
            + f"vs plain exact sum over the same eigenvalues ({plain['temperatures_checked']} T): "
            + check(f"{case} vs plain sum", worst_plain, 1e-9))
    note += f"; peak memory {o['peak_working_set_bytes'] / 2**20:.0f} MiB"
    if case == "finite-chain":
        note += " " + ("ok" if o["peak_working_set_bytes"] < 200 * 2**20 else "FAIL (> 200 MiB)")
        if o["peak_working_set_bytes"] >= 200 * 2**20:
            failures.append("finite-chain peak memory")
    if bulk_per_q and case == "finite-3d":
        per_q = o["median_s"] / o["q_points_solved"]
        note += f"; per q-point {per_q * 1e6:.2f} us vs bulk {bulk_per_q * 1e6:.2f} us = {per_q / bulk_per_q:.2f}x"
    if peer:
        p = peer["result"]
        # Independent eigenvalues differ by ~1e-13 relative, which low-T sums feel at ~1e-9; the
        # chain's lowest eigenvalues carry the 1 - cos(qa) rounding of D(q) (relative ~1e-16 / (qa)^2), so
        # two independent builds agree to about 1e-6 there at low T; the 3D crystal has no such modes.
        limit = 1e-5 if case == "finite-chain" else 1e-8
        note += "; vs peer " + thermal_errors(o, p, 0.0, f"{case} vs peer", limit)
        rows.append((title, f"{o['median_s']:.3f} s", f"{p['median_s']:.3f} s", p["median_s"] / o["median_s"], note))
    else:
        rows.append((title, f"{o['median_s']:.3f} s", "-", float("nan"), note))

queue = load("ours_queue.json")
if queue:
    for r in queue["runs"]:
        rows.append((f"(e) queue, {r['points']} points ({r['engine_ms_per_point']:.1f} ms)", f"{r['engine_s']:.2f} s",
                     f"{r['queue_s']:.2f} s", float("nan"),
                     f"engine alone vs latsweep run --workers {r['workers']} (SQLite store): {r['queue_points_per_s']:.0f} points/s; "
                     f"CPU: engine {r.get('engine_cpu_s', float('nan')):.2f} s, run {r.get('queue_cpu_s', float('nan')):.2f} s, one-point run {r.get('fixed_cpu_s', float('nan')):.2f} s "
                     f"({r.get('fixed_s', float('nan')):.2f} s wall) -> {r.get('overhead_cpu_ms_per_point', float('nan')):.3f} ms CPU/point; "
                     f"wall overhead {r['overhead_fraction'] * 100:.1f}%, {r.get('overhead_fraction_without_fixed', float('nan')) * 100:.1f}% without the fixed cost; "
                     f"CPU overhead without the fixed cost {r.get('overhead_cpu_fraction_without_fixed', float('nan')) * 100:.1f}% over the warmed-up engine "
                     f"(against the engine settled by later passes {r.get('engine_settled_cpu_s', float('nan')):.2f} s: {r.get('overhead_settled_cpu_fraction_without_fixed', float('nan')) * 100:.1f}%, "
                     f"{r.get('overhead_settled_cpu_ms_per_point', float('nan')):.3f} ms/point), "
                     f"{r.get('overhead_fresh_cpu_fraction_without_fixed', float('nan')) * 100:.1f}% ({r.get('overhead_fresh_cpu_ms_per_point', float('nan')):.3f} ms/point) "
                     f"over the engine in a fresh process ({r.get('engine_fresh_cpu_s', float('nan')):.2f} s CPU); "
                     f"the median run: solving {r.get('queue_solve_cpu_s', float('nan')):.2f} s, merge {r.get('queue_merge_cpu_s', float('nan')):.2f} s, "
                     f"tier-1 JIT thread {r.get('queue_tier1_cpu_s', float('nan')):.2f} s CPU; load {r.get('load', '?')}"))

expansion = load("ours_expansion.json")
if expansion:
    r = expansion["result"]
    rows.append((f"(f) quasi-harmonic, {r['volumes']} volumes", f"{r['quasi_harmonic_s']:.3f} s",
                 f"{r['same_7_solves_s']:.3f} s", float("nan"),
                 f"against the same 7 harmonic solves: overhead {(r['quasi_harmonic_s'] / r['same_7_solves_s'] - 1) * 100:+.1f}% "
                 f"(cpu {(r['quasi_harmonic_cpu_s'] / r['same_7_solves_cpu_s'] - 1) * 100:+.1f}%); against 7 full harmonic points "
                 f"{(r['quasi_harmonic_s'] / r['seven_full_points_s'] - 1) * 100:+.1f}%"))

print()
print(f"{'case':34} {'ours':>12} {'numpy peer':>12} {'peer/ours':>10}  agreement / notes  ((e): engine alone | through the queue)")
for name, a, b, ratio, note in rows:
    shown = "-" if ratio != ratio else f"{ratio:.2f}x"  # NaN: a row with no peer ratio (ours against ours)
    print(f"{name:34} {a:>12} {b:>12} {shown:>10}  {note}")
paths = load("ours_eigen-paths.json")
if paths:
    print()
    print(f"eigen-solver paths (us per matrix, process CPU time; our kernels at {paths.get('simd_width')}):")
    for n, row in paths["sizes"].items():
        for kind in ("values", "vectors"):
            times = "  ".join(f"{name} {t:.3f}" for name, t in row[kind].items())
            planned, fastest = row[f"{kind}_planned"], row[f"{kind}_fastest"]
            slower = "" if planned == fastest else f" ({row[kind][planned] / row[kind][fastest]:.2f}x the fastest)"
            print(f"  {n:>2}x{n:<2} {kind:7} {times}; fastest {fastest}, planned {planned}{slower}")

print()
machine = load("machine.json")
ours_any = next((x for x in (load(f"ours_{c}.json") for c in ("eigen", "bulk", "finite-chain", "finite-3d", "eigen-paths")) if x), None)
if machine:
    print(f"machine: {machine['cpu']} ({machine.get('cpu_family_model')}), {machine['kind']}; vector extensions: "
          f"{' '.join(machine['vector_extensions'])}; {machine['cores']} cores, {machine['memory_gib']} GiB")
    if machine.get("kind_as_run"):
        print(f"as run: {machine['kind_as_run']}")
    loads = [", ".join(f"{x:.1f}" for x in machine[k]) if machine.get(k) else "?" for k in ("load_start", "load_end")]
    print(f"load average (1, 5, 15 min) at start {loads[0]}, at end {loads[1]}")
if ours_any:
    print(f"ours: {ours_any['runtime']}, batched kernels {ours_any.get('simd_width', '?')}")
blas = load("peer_blas.json")
if blas:
    pools = ", ".join(f"{p['internal_api']} {p['version']} (kernel {p['architecture']}, {p['num_threads']} thread)" for p in blas["pools"])
    print(f"peer: numpy {blas['numpy']} on {pools or 'no BLAS pool found'}; {blas['pools'][0]['filepath'] if blas['pools'] else ''}")
if failures:
    print("DISAGREEMENT: " + "; ".join(failures))
    sys.exit(1)
print("all results agree within their tolerances")
