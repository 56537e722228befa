#!/usr/bin/env bash
# One command for the benchmarks: builds the engine's bench harness in Release, runs each case on our
# side and on the NumPy peer with the same inputs (bench/cases.json), prints the ratios and checks that
# both agree. Usage: bench/run.sh [CASE...]   (cases: eigen bulk finite-chain finite-3d queue expansion, the
# default; run only when named: eigen-paths, which times every SIMD width and method of the eigen-solver
# per order, bulk-defaults (case (b) with partial DOS and displacements, ours alone), "cost", which calibrates the Worker's run-time estimate, and surfaces-dense surfaces-kpm
# surfaces-kpm-denser surfaces-memory (free nanocrystals), all ours alone).
# LATSWEEP_SIMD_WIDTH=256|512|scalar forces our kernels' width (DOTNET_EnableAVX512=0 makes the runtime
# behave as on a processor without AVX-512).
# Environment: REPEATS (default 5), RESULTS (default bench/results), PEER_REPEATS_FINITE (default 1),
# BULK_WARMUPS (case (b)'s untimed solves before the timed ones, on both sides; default 40),
# QUEUE_LATSWEEP (case (e)'s latsweep: r2r, the default, as README's install line; composite, the
# self-contained composite ReadyToRun publish, README's second install line; build, the plain build output).
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
root="$(dirname "$here")"
results="${RESULTS:-$here/results}"
repeats="${REPEATS:-5}"
cases=("$@")
[ ${#cases[@]} -eq 0 ] && cases=(eigen bulk finite-chain finite-3d queue expansion)
mkdir -p "$results"

# The peer is NumPy as a user of this system gets it: Debian's python3-numpy on Debian's OpenBLAS
# (libopenblas0-pthread, which takes over libblas.so.3 and liblapack.so.3 through the alternatives
# system; without it numpy runs on the slow reference BLAS/LAPACK). The system interpreter, not a
# pyenv shim. threadpoolctl reports which BLAS numpy really loaded and its kernel.
py=/usr/bin/python3
peer_packages=(python3-numpy python3-threadpoolctl libopenblas0-pthread)
missing=()
for p in "${peer_packages[@]}"; do
  dpkg-query -W -f='${Status}' "$p" 2>/dev/null | grep -q "install ok installed" || missing+=("$p")
done
if [ ${#missing[@]} -gt 0 ]; then
  echo "installing Debian's ${missing[*]} for the NumPy peer"
  apt-get update -qq && apt-get install -y -qq "${missing[@]}" >/dev/null
fi

"$py" "$here/machine_info.py" "$results/machine.json" start
# The peer's BLAS as it runs in the cases (one thread; see below for the two variables).
env -u OPENBLAS_CORETYPE -u OPENBLAS_L2_SIZE OPENBLAS_NUM_THREADS=1 OMP_NUM_THREADS=1 "$py" - "$results/peer_blas.json" <<'PYEOF'
import json, sys
import numpy as np
from threadpoolctl import threadpool_info
np.linalg.eigvalsh(np.eye(2))
pools = [{k: lib.get(k) for k in ("internal_api", "version", "architecture", "threading_layer", "num_threads", "filepath")}
         for lib in threadpool_info()]
json.dump({"numpy": np.__version__, "pools": pools}, open(sys.argv[1], "w"))
names = ", ".join(f"{p['internal_api']} {p['version']} ({p['threading_layer']}, kernel {p['architecture']}, "
                  f"{p['num_threads']} thread{'s' if p['num_threads'] != 1 else ''})" for p in pools) or "no BLAS pool found"
print(f"peer: numpy {np.__version__} on {names}")
if not any(p["internal_api"] == "openblas" for p in pools):
    print("WARNING: numpy does not run on OpenBLAS here; the peer's times are not what a NumPy user gets")
PYEOF

dotnet build "$here/LatticeSweep.Bench/LatticeSweep.Bench.csproj" -c Release -v quiet -nologo | grep -E " error |rror\(s\)" || true
dotnet build "$root/src/Worker/Worker.csproj" -c Release -v quiet -nologo | grep -E " error |rror\(s\)" || true
latsweep="$root/src/Worker/bin/Release/net10.0/latsweep"
if [[ " ${cases[*]} " == *" queue "* && "${QUEUE_LATSWEEP:-r2r}" == r2r ]]; then
  # Case (e) runs latsweep as README's install line makes it: published with ReadyToRun code, so a
  # run does not JIT its start-up (QUEUE_LATSWEEP=build runs the plain build output instead).
  rid="$(dotnet --info | sed -n 's/^ *RID: *//p' | head -1)"
  dotnet publish "$root/src/Worker/Worker.csproj" -c Release -r "$rid" --self-contained false -p:PublishReadyToRun=true \
    -o "$results/latsweep-r2r" -v quiet -nologo | grep -E " error |rror\(s\)" || true
  latsweep="$results/latsweep-r2r/latsweep"
fi
if [[ " ${cases[*]} " == *" queue "* && "${QUEUE_LATSWEEP:-r2r}" == composite ]]; then
  # README's second install line: self-contained, the runtime's libraries and latsweep's compiled
  # together into one ReadyToRun image (generic code across them precompiled too; ~130 MB, 5-8 min).
  # Its own build folders: a framework-dependent publish made later from the same obj/ folder
  # after a composite one would otherwise take the composite's stubs and abort at start.
  rid="$(dotnet --info | sed -n 's/^ *RID: *//p' | head -1)"
  dotnet publish "$root/src/Worker/Worker.csproj" -c Release -r "$rid" --self-contained true -p:PublishReadyToRun=true \
    -p:PublishReadyToRunComposite=true --artifacts-path "$results/composite-build" -o "$results/latsweep-composite" \
    -v quiet -nologo | grep -E " error |rror\(s\)" || true
  latsweep="$results/latsweep-composite/latsweep"
fi
bench="$here/LatticeSweep.Bench/bin/Release/net10.0/LatticeSweep.Bench"

for c in "${cases[@]}"; do
  echo "== $c"
  if [ "$c" = expansion ]; then
    # Ours against ours: one quasi-harmonic point against the harmonic solves it is made of.
    "$bench" expansion --cases "$here/cases.json" --out "$results" --repeats "$repeats"
    continue
  fi
  if [ "$c" = bulk-defaults ]; then
    # Ours alone: case (b)'s point with partial DOS and displacements on (the job file's defaults).
    "$bench" bulk-defaults --cases "$here/cases.json" --out "$results" --repeats "$repeats" --warmups "${BULK_WARMUPS:-40}"
    continue
  fi
  if [ "$c" = eigen-paths ]; then
    "$bench" eigen-paths --out "$results" --repeats "$repeats"
    continue
  fi
  if [ "$c" = queue ]; then
    # Ours against ours: the queue (latsweep run, embedded SQLite store) against the Engine alone.
    # --version names the Engine image a published x86-64 build loaded (avx512 or avx2 precompiled code).
    echo "latsweep: $("$latsweep" --version)"
    "$bench" queue --out "$results" --repeats "${QUEUE_REPEATS:-3}" --jobs "$here/queue" \
      --latsweep "$latsweep"
    continue
  fi
  case "$c" in surfaces-*)
    # Free nanocrystals (issue 11): ours alone, each part in its own process (its own peak memory).
    "$bench" "$c" --out "$results"
    continue ;;
  esac
  if [ "$c" = cost ]; then
    "$bench" cost --cases "$here/cases.json" --out "$results" --repeats "$repeats"
    continue
  fi
  # Case (b): both sides get the same warm-up solves (BULK_WARMUPS, default 40: see Program.cs).
  warm=()
  [ "$c" = bulk ] && warm=(--warmups "${BULK_WARMUPS:-40}")
  "$bench" "$c" --cases "$here/cases.json" --out "$results" --repeats "$repeats" "${warm[@]}"
  peer_repeats="$repeats"
  case "$c" in finite-*) peer_repeats="${PEER_REPEATS_FINITE:-1}" ;; esac
  # One core for the peer, like ours. OPENBLAS_CORETYPE/OPENBLAS_L2_SIZE are set on this machine for
  # old OpenBLAS builds; they would slow a current one, so they are unset for this command alone.
  ( cd "$here/peer" && env -u OPENBLAS_CORETYPE -u OPENBLAS_L2_SIZE OPENBLAS_NUM_THREADS=1 OMP_NUM_THREADS=1 \
      "$py" run_peer.py "$c" --cases "$here/cases.json" --out "$results" --repeats "$peer_repeats" "${warm[@]}" )
done

"$py" "$here/machine_info.py" "$results/machine.json" end
"$py" "$here/compare.py" "$results"
