"""What the table's figures were measured on: processor, its vector extensions, cores, memory, load.

usage: machine_info.py OUT.json [start|end]   (bench/run.sh calls it before and after the cases)
The machine kind (x86-64 with AVX-512, x86-64 with AVX2 and no AVX-512, ...) decides which table of
bench/README.md a run belongs to.
"""
import json
import os
import platform
import sys

# The extensions that decide our kernels' width and the peer's BLAS kernels, in the order printed.
VECTOR_FLAGS = ["sse4_2", "avx", "avx2", "fma", "avx512f", "avx512dq", "avx512vl", "avx512bw", "avx512_bf16",
                "avx512_vp2intersect", "avx_vnni", "asimd", "sve", "sve2"]


def cpuinfo():
    info = {}
    try:
        with open("/proc/cpuinfo") as fh:
            for line in fh:
                if ":" not in line:
                    if info:
                        break  # the first processor is enough
                    continue
                key, value = (part.strip() for part in line.split(":", 1))
                info.setdefault(key, value)
    except OSError:
        pass
    return info


def kind(flags, arch):
    if "avx512f" in flags:
        return f"{arch} with AVX-512"
    if "avx2" in flags:
        return f"{arch} with AVX2, no AVX-512"
    if "asimd" in flags:
        return f"{arch} with NEON"
    return f"{arch} without AVX2"


def main():
    out, moment = sys.argv[1], (sys.argv[2] if len(sys.argv) > 2 else "start")
    data = json.load(open(out)) if os.path.exists(out) and moment != "start" else {}
    if moment == "start":
        cpu = cpuinfo()
        flags = set((cpu.get("flags") or cpu.get("Features") or "").split())
        family, model = cpu.get("cpu family"), cpu.get("model")
        data.update({
            "cpu": cpu.get("model name", platform.processor() or "unknown"),
            "cpu_family_model": f"family {family}, model {model}" if family else None,
            "arch": platform.machine(),
            "kind": kind(flags, platform.machine()),
            "vector_extensions": [f for f in VECTOR_FLAGS if f in flags],
            "cores": os.cpu_count(),
            "memory_gib": round(os.sysconf("SC_PAGE_SIZE") * os.sysconf("SC_PHYS_PAGES") / 2**30, 1),
        })
    # Settings that change what our side runs: the runtime can hide AVX-512 or AVX2 from .NET (the way
    # to measure the narrower paths on a wider processor), and LATSWEEP_SIMD_WIDTH forces our width.
    settings = {k: v for k, v in os.environ.items() if k in ("DOTNET_EnableAVX512", "DOTNET_EnableAVX2", "DOTNET_EnableHWIntrinsic", "LATSWEEP_SIMD_WIDTH")}
    data["settings"] = settings
    if settings.get("DOTNET_EnableAVX512") == "0" and "avx512f" in data.get("vector_extensions", []):
        data["kind_as_run"] = "AVX-512 hidden from .NET (DOTNET_EnableAVX512=0): our side runs as on an AVX2 processor"
    data[f"load_{moment}"] = list(os.getloadavg())
    with open(out, "w") as fh:
        json.dump(data, fh)
    print(f"machine: {data['cpu']} ({data.get('cpu_family_model')}), {data['kind']}: "
          f"{' '.join(data['vector_extensions'])}; {data['cores']} cores, {data['memory_gib']} GiB; "
          f"load average at {moment}: {' '.join(f'{x:.1f}' for x in data[f'load_{moment}'])}"
          + (f"; {data['kind_as_run']}" if data.get("kind_as_run") else "")
          + (f"; settings {settings}" if settings else ""))


if __name__ == "__main__":
    main()
