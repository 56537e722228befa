#!/usr/bin/env python3
"""Writes the engine's job files and the reference's model files for the layered-crystal check.
Every model is invented (one-site cells with bonds along the axes). Usage: make_jobs.py OUTDIR"""
import json, os, sys

TEMPS = [0.05, 0.1, 0.2, 0.5, 1, 2, 5, 10, 20, 50, 100, 300]
SCATTERING = {  # name -> (toml lines, reference dict)
    "tau": ("constant = { relaxation_time_ps = 10.0 }", {"constant_ps": 10.0}),
    "bnd": ("boundary = { length_nm = 10000.0 }", {"boundary_nm": 10000.0}),
    "umk": ("grueneisen_parameter = 1.5\nboundary = { length_nm = 10000.0 }\numklapp = { debye_temperature_k = 100.0, sound_speed_m_per_s = 1000.0 }",
            {"boundary_nm": 10000.0, "umklapp": {"gamma": 1.5, "theta": 100.0, "v": 1000.0}}),
}
# name -> lattice, motion, dims, (longitudinal, transverse) per axis, swept weak transverse values
MODELS = {
    "layered": ("simple_cubic", "3d", 3, [(18.5731, 4.3483), (34.8232, 9.3274), (2.2579, None)], [0.01, 0.05, 0.18]),
    "cubic": ("simple_cubic", "3d", 3, [(20.0, 5.0), (20.0, 5.0), (20.0, None)], [5.0]),
    "isotropic": ("simple_cubic", "3d", 3, [(10.0, 10.0), (10.0, 10.0), (10.0, None)], [10.0]),
    "sheet2": ("square", "in_plane", 2, [(18.5731, 4.3483), (2.2579, None)], [0.01, 0.18]),
    "sheet3": ("square", "3d", 2, [(18.5731, 4.3483), (2.2579, None)], [0.01, 0.18]),
}
A_NM, M_AMU, THICK_NM = 0.4596, 3.8724, 0.5


def toml(name, scat, meshes, weak):
    lat, motion, d, bonds, _ = MODELS[name]
    cells = [[1, 0, 0], [0, 1, 0], [0, 0, 1]]
    out = [f'[sweep]\nname = "kl-{name}-{scat}"\n',
           f'[[sweep.axes]]\npath = "sample.mesh"\nvalues = {meshes}\n',
           f'[[sweep.axes]]\npath = "model.bonds[{d - 1}].transverse_n_per_m"\nvalues = {weak}\n',
           f'[model]\nlattice = "{lat}"\nconstant_nm = {A_NM}\nmotion = "{motion}"\n',
           f'[[model.sites]]\nlabel = "S0"\nposition = {[0] * d}\nmass_amu = {M_AMU}\n']
    for j, (kl, kt) in enumerate(bonds):
        kt = weak[0] if kt is None else kt
        out.append(f'[[model.bonds]]\nfrom = "S0"\nto = "S0"\ncell = {cells[j][:d]}\nlongitudinal_n_per_m = {kl}\ntransverse_n_per_m = {kt}\n')
    out.append(f'[sample]\nkind = "bulk"\nmesh = {meshes[0]}\n')
    out.append(f'[output]\ntemperatures_k = {TEMPS}\nreference_temperature_k = 1\ntables = ["thermal"]\n')
    out.append('[output.conductivity]\n' + SCATTERING[scat][0] + (f'\nthickness_nm = {THICK_NM}' if d == 2 else '') + '\n')
    return "\n".join(out)


def reference_model(name, scat, weak):
    lat, motion, d, bonds, _ = MODELS[name]
    kl = [b[0] for b in bonds]; kt = [weak if b[1] is None else b[1] for b in bonds]
    pols = [0, 1, 2][: (3 if motion == "3d" else d)]
    return {"dims": d, "constant_nm": A_NM, "mass_amu": M_AMU, "longitudinal": kl, "transverse": kt,
            "polarisations": pols, "thickness_nm": THICK_NM, "scattering": SCATTERING[scat][1], "temperatures_k": TEMPS}


if __name__ == "__main__":
    outdir = sys.argv[1]; os.makedirs(outdir, exist_ok=True)
    meshes = [int(x) for x in (sys.argv[2].split(",") if len(sys.argv) > 2 else "8,12,16,24,32,40".split(","))]
    for name, spec in MODELS.items():
        for scat in SCATTERING:
            open(os.path.join(outdir, f"kl-{name}-{scat}.toml"), "w").write(toml(name, scat, meshes, spec[4]))
            for w in spec[4]:
                json.dump(reference_model(name, scat, w), open(os.path.join(outdir, f"ref-{name}-{scat}-{w}.json"), "w"))
