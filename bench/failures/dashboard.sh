#!/usr/bin/env bash
# Round 17 (failures): the dashboard's sweep page over a sweep with 10^5 failed points.
# Usage: bench/failures/dashboard.sh DIR [DASHBOARD_DLL]
# DIR holds store.db and results/ from `latsweep run bench/failures/dashboard-failed.toml --store store.db
# --out results` (2 x 10^5 points, 10^5 of them failed, one reason traced to a swept key). Times the
# dashboard's start (a store from before this round gains the failed rows' index then), the sweep page
# three times, its JSON, a page of the failure group's points, and the process's CPU and peak RSS.
# The store is copied first, so each build times the same store as it was after the run.
set -euo pipefail
dir="$(cd "$1" && pwd)"
root="$(cd "$(dirname "$0")/../.." && pwd)"
dll="${2:-$root/src/Dashboard/bin/Release/net10.0/Dashboard.dll}"
work="$(mktemp -d "${TMPDIR:-/tmp}/latsweep-dash.XXXXXX")"
trap 'kill "${pid:-0}" 2>/dev/null || true; rm -rf "$work"' EXIT
cp "$dir/store.db" "$work/store.db"
[ -f "$dir/store.db-wal" ] && cp "$dir/store.db-wal" "$work/store.db-wal"
port=$((20000 + RANDOM % 20000))
cpu() { awk -v hz="$(getconf CLK_TCK)" '{ printf "%.2f s", ($14 + $15) / hz }' "/proc/$pid/stat"; }
start=$(date +%s.%N)
dotnet "$dll" --store "$work/store.db" --out "$dir/results" --port "$port" > "$work/dashboard.log" 2>&1 &
pid=$!
for _ in $(seq 1 240); do curl -s -o /dev/null "http://127.0.0.1:$port/" && break; sleep 0.25; done
echo "started in $(echo "$(date +%s.%N) - $start" | bc) s, process CPU $(cpu) (load $(cut -d' ' -f1 /proc/loadavg))"
id="$(ls "$dir/results" | head -1)"
for page in "sweeps/$id" "sweeps/$id" "sweeps/$id" "api/sweeps/$id" $(curl -s "http://127.0.0.1:$port/sweeps/$id" | grep -o "sweeps/$id/failures/[0-9a-f]*?offset=[0-9]*" | head -1); do
  took="$(curl -s -o /dev/null -w "/$page  %{time_total} s, %{size_download} bytes, HTTP %{http_code}" "http://127.0.0.1:$port/$page")"
  echo "$took, process CPU $(cpu)"
done
echo "peak RSS $(awk '/VmHWM/ { print int($2 / 1024) " MB" }' "/proc/$pid/status")"
