#!/usr/bin/env python3
"""Engine against reference.py: ratio table of kappa_xx/yy/zz and the mean, with kappa_mesh_change and
its lower-bound flag, and of Cv, entropy and the Debye temperature.
Usage: compare.py JOBDIR RESULTSDIR [DQ]   (JOBDIR from make_jobs.py; RESULTSDIR holds the sweeps' folders;
DQ a DuckDB query tool taking --sql, default /tmp/lead19/dq/out/dq). Prints one row per point and temperature;
'UNDER' marks an error above max(1e-3, 2 x kappa_mesh_change) with the flag false."""
import glob, json, os, subprocess, sys
import numpy as np
sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import reference as R

R_GAS = R.KB * R.NA


def debye_theta(t, fraction, d):
    """Theta whose d-dimensional Debye heat capacity is `fraction` of the classical value (Kittel ch. 5)."""
    gx, gw = np.polynomial.legendre.leggauss(200)
    def frac(y):
        top = min(y, 80.0); xs = (gx + 1) * top / 2
        f = xs ** (d + 1) * np.exp(-xs) / (-np.expm1(-xs)) ** 2
        return d * np.sum(gw * f) * top / 2 / y ** d
    lo, hi = 1e-4, 1e4
    for _ in range(200):
        mid = np.sqrt(lo * hi)
        if frac(mid) > fraction: lo = mid
        else: hi = mid
    return t * np.sqrt(lo * hi)


def engine_rows(resdir, name, scat, dq):
    cols = "sample_mesh, {w}, temperature_k, kappa_xx_w_per_m_k, kappa_yy_w_per_m_k, kappa_zz_w_per_m_k, kappa_w_per_m_k, kappa_mesh_change, kappa_mesh_change_lower_bound, cv_j_per_mol_k, entropy_j_per_mol_k, debye_temperature_k"
    d = 2 if name.startswith("sheet") else 3
    sql = f"SELECT {cols.format(w=f'bonds_{d - 1}_transverse_n_per_m')} FROM read_parquet('{resdir}/kl-{name}-{scat}-*/thermal/*.parquet') ORDER BY 1, 2, 3"
    out = subprocess.run([dq, "--sql", sql], capture_output=True, text=True).stdout
    rows = []
    for line in out.splitlines():
        f = [s.strip() for s in line.split("|")]
        if len(f) != 12: continue
        num = lambda s: float(s) if s not in ("", "NULL", "null") else np.nan
        rows.append((int(f[0]), float(f[1]), float(f[2]), [num(s) for s in f[3:6]], num(f[6]), num(f[7]), f[8], num(f[9]), num(f[10]), num(f[11])))
    return rows


def reference_rows(jobdir, name, scat, weak, cache):
    path = os.path.join(jobdir, f"ref-{name}-{scat}-{weak}.json")
    if path not in cache:
        m = json.load(open(path))
        saved = path + ".reference"  # the integral takes seconds to a minute; kept beside the model file
        if os.path.exists(saved) and os.path.getmtime(saved) >= os.path.getmtime(path):
            kap, cv, s = (np.array(x) for x in json.load(open(saved)))
        else:
            kap, cv, s, _ = R.integrate(m, m["temperatures_k"])
            json.dump([kap.tolist(), cv.tolist(), s.tolist()], open(saved, "w"))
        cache[path] = (m, {t: (kap[i], cv[i], s[i]) for i, t in enumerate(m["temperatures_k"])})
    return cache[path]


if __name__ == "__main__":
    jobdir, resdir = sys.argv[1], sys.argv[2]
    dq = sys.argv[3] if len(sys.argv) > 3 else "/tmp/lead19/dq/out/dq"
    cache = {}
    print("model scat weak mesh T_K | xx yy zz mean (engine/reference) | change flag | cv s theta (engine/reference) | mark")
    for job in sorted(glob.glob(os.path.join(jobdir, "kl-*.toml"))):
        _, name, scat = os.path.basename(job)[:-5].split("-")
        for mesh, weak, t, k, kmean, change, flag, cv, s, theta in engine_rows(resdir, name, scat, dq):
            m, ref = reference_rows(jobdir, name, scat, weak, cache)
            d = m["dims"]; kr, cvr, sr = ref[t]
            ratios = [k[j] / kr[j] for j in range(d)]
            rmean = kmean / np.mean(kr)
            npol = len(m["polarisations"])
            th_ref = debye_theta(t, cvr / (npol * R_GAS), d)
            worst = max(abs(r - 1) for r in ratios + [rmean])
            mark = "UNDER" if worst > max(1e-3, 2 * (change if change == change else 0)) and flag.lower() != "true" else ""
            print(f"{name} {scat} {weak:g} {mesh} {t:g} | " + " ".join(f"{r:.5f}" for r in ratios) + f" {rmean:.5f} | {change:.1e} {flag[:1]} | "
                  f"{cv / cvr:.5f} {s / sr:.5f} {theta / th_ref:.5f} | {mark}")
