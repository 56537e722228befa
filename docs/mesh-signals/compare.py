"""Beside each engine number, its true error against reference.py and the mesh-change indicator.
Usage: /usr/bin/python3 compare.py REF.txt DIR  (DIR holds MODEL-thermal.csv and MODEL-points.csv,
written by bench/same-columns/same-columns.cs csv from a run of MODEL.toml)."""
import csv
import sys

ref = {}
zpe = {}
for line in open(sys.argv[1]):
    p = line.split()
    if p[1] == "zpe":
        zpe[p[0]] = float(p[2])
    else:
        ref[(p[0], float(p[1]))] = tuple(float(v) for v in p[2:])

models = sorted({k[0] for k in ref}, key=lambda n: ["chain2", "chain-rattler", "square1", "square-rattler", "cubic1", "cubic-rattler"].index(n))
quantity = sys.argv[3] if len(sys.argv) > 3 else "cv"
col = {"u": ("internal_energy_j_per_mol", 0), "f": ("free_energy_j_per_mol", 1), "s": ("entropy_j_per_mol_k", 2), "cv": ("cv_j_per_mol_k", 3)}[quantity]
change = {"u": "internal_energy_mesh_change_j_per_mol", "f": "free_energy_mesh_change_j_per_mol", "s": "entropy_mesh_change_j_per_mol_k", "cv": "cv_mesh_change_j_per_mol_k"}[quantity]
for name in models:
    rows = list(csv.DictReader(open(f"{sys.argv[2]}/{name}-thermal.csv")))
    pts = {r["point_id"]: r for r in csv.DictReader(open(f"{sys.argv[2]}/{name}-points.csv"))}
    meshes = sorted({int(pts[r["point_id"]]["cells_or_mesh_points"]) for r in rows})
    print(f"## {name} {quantity}: relative error / relative change (value on mesh minus half mesh, over value)")
    temps = sorted({float(r["temperature_k"]) for r in rows})
    print("mesh M (points) | " + " | ".join(f"{t:g} K" for t in temps))
    by = {}
    for r in rows:
        by[(int(pts[r["point_id"]]["cells_or_mesh_points"]), float(r["temperature_k"]))] = r
    for m in meshes:
        cells = []
        for t in temps:
            r = by[(m, t)]
            v = float(r[col[0]])
            true = ref[(name, t)][col[1]]
            c = r[change]
            cells.append(f"{(v - true) / abs(true):.1e} / {float(c) / abs(v):.1e}" if c else f"{(v - true) / abs(true):.1e} / -")
        print(f"{m} | " + " | ".join(cells))
    if quantity == "cv":
        cells = []
        for m in meshes:
            p = [q for q in pts.values() if int(q["cells_or_mesh_points"]) == m][0]
            v = float(p["zero_point_energy_j_per_mol"])
            c = p["zero_point_energy_mesh_change_j_per_mol"]
            cells.append(f"{m}: {(v - zpe[name]) / zpe[name]:.1e} / {float(c) / v if c else float('nan'):.1e} (dos {p['dos_mesh_change'] or '-'})")
        print("zero-point energy: " + "; ".join(cells))
    print()
