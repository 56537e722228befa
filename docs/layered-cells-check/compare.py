#!/usr/bin/env python3
"""Relative Cv error of the engine against reference.py for layered cells (see reference.py for the model).

Usage: compare.py PROBE S MASSES MESHES TEMPS
PROBE is a program that solves the n-layer cell through the engine and prints, per mesh, a line
`mesh M ...: T=CV T=CV ...` (and with MESHCHECK set a line `change: T=REL ...`); the reference values
are cached in ./reference-cache.json. Prints one row per mesh: engine / reference - 1 per temperature.
"""
import json, os, subprocess, sys
sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import reference

probe, s, masses, meshes, temps = sys.argv[1:6]
cache_path = 'reference-cache.json'
cache = json.load(open(cache_path)) if os.path.exists(cache_path) else {}
key = f"{s}|{masses}"
T = [float(t) for t in temps.split(',')]
have = cache.get(key, {})
missing = [t for t in T if repr(t) not in have]
if missing:
    vals = reference.cv(float(s), [float(m) for m in masses.split(',')], missing)
    for t, v in zip(missing, vals):
        have[repr(t)] = float(v)
    cache[key] = have
    json.dump(cache, open(cache_path, 'w'), indent=1)
out = subprocess.run(probe.split() + [s, masses, meshes, temps], capture_output=True, text=True, check=True).stdout
print(f"s {s} masses {masses}: T " + " ".join(f"{t:>9g}" for t in T))
for line in out.splitlines():
    head, _, rest = line.partition(':')
    vals = dict(p.split('=') for p in rest.split())
    if head.startswith('mesh'):
        print(f"{head:>18}: " + " ".join(f"{float(vals[repr(t) if repr(t) in vals else f'{t:g}'])/have[repr(t)]-1:+9.1e}" for t in T))
    else:
        print(f"{head:>18}: " + " ".join(f"{float(vals[f'{t:g}']):+9.1e}" for t in T))
