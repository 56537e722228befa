#!/usr/bin/env bash
# One command for the benchmarks: builds the engine's bench harness in Release, runs each case on our
# side and on the NumPy peer with the same inputs (bench/cases.json), prints the ratios and checks that
# both agree. Usage: bench/run.sh [CASE...]   (cases: eigen bulk finite-chain finite-3d queue; default all;
# "cost" calibrates the Worker's run-time estimate, ours alone, and is run only when named)
# Environment: REPEATS (default 5), RESULTS (default bench/results), PEER_REPEATS_FINITE (default 1).
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
root="$(dirname "$here")"
results="${RESULTS:-$here/results}"
repeats="${REPEATS:-5}"
cases=("$@")
[ ${#cases[@]} -eq 0 ] && cases=(eigen bulk finite-chain finite-3d queue)
mkdir -p "$results"

# The peer is Debian's NumPy: the system interpreter, not a pyenv shim.
py=/usr/bin/python3
if ! "$py" -c "import numpy" 2>/dev/null; then
  echo "installing Debian's python3-numpy (and threadpoolctl to report the BLAS kernel)"
  apt-get update -qq && apt-get install -y -qq python3-numpy python3-threadpoolctl >/dev/null
fi
"$py" -c "import threadpoolctl" 2>/dev/null || apt-get install -y -qq python3-threadpoolctl >/dev/null || true

echo "machine: $(lscpu | sed -n 's/^Model name: *//p'), $(nproc) cores; load: $(cut -d' ' -f1-3 /proc/loadavg)"
dotnet build "$here/LatticeSweep.Bench/LatticeSweep.Bench.csproj" -c Release -v quiet -nologo | grep -E " error |rror\(s\)" || true
dotnet build "$root/src/Worker/Worker.csproj" -c Release -v quiet -nologo | grep -E " error |rror\(s\)" || true
bench="$here/LatticeSweep.Bench/bin/Release/net10.0/LatticeSweep.Bench"

for c in "${cases[@]}"; do
  echo "== $c"
  if [ "$c" = queue ]; then
    # Ours against ours: the queue (latsweep run, embedded SQLite store) against the Engine alone.
    "$bench" queue --out "$results" --repeats "${QUEUE_REPEATS:-3}" --jobs "$here/queue" \
      --latsweep "$root/src/Worker/bin/Release/net10.0/latsweep"
    continue
  fi
  if [ "$c" = cost ]; then
    "$bench" cost --cases "$here/cases.json" --out "$results" --repeats "$repeats"
    continue
  fi
  "$bench" "$c" --cases "$here/cases.json" --out "$results" --repeats "$repeats"
  peer_repeats="$repeats"
  case "$c" in finite-*) peer_repeats="${PEER_REPEATS_FINITE:-1}" ;; esac
  # One core for the peer, like ours. OPENBLAS_CORETYPE/OPENBLAS_L2_SIZE are set on this machine for
  # old OpenBLAS builds; they would slow a current one, so they are unset for this command alone.
  ( cd "$here/peer" && env -u OPENBLAS_CORETYPE -u OPENBLAS_L2_SIZE OPENBLAS_NUM_THREADS=1 OMP_NUM_THREADS=1 \
      "$py" run_peer.py "$c" --cases "$here/cases.json" --out "$results" --repeats "$peer_repeats" )
done

"$py" "$here/compare.py" "$results"
