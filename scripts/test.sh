#!/usr/bin/env bash
# The whole test suite on a fresh machine with only the .NET SDK: installs what the tests need
# (Debian's chromium for the browser tests, postgresql for the multi-machine tests), starts a
# throwaway PostgreSQL cluster on 127.0.0.1, runs every test project and prints the totals.
set -euo pipefail
cd "$(dirname "$0")/.."
ROOT="$PWD"

need_install=()
command -v chromium >/dev/null 2>&1 || need_install+=(chromium)
ls /usr/lib/postgresql/*/bin/initdb >/dev/null 2>&1 || need_install+=(postgresql)
if [ ${#need_install[@]} -gt 0 ]; then
  echo "== installing ${need_install[*]} (Debian packages)"
  if [ "$(id -u)" -ne 0 ]; then SUDO=sudo; else SUDO=; fi
  $SUDO apt-get -o DPkg::Lock::Timeout=600 update -qq
  DEBIAN_FRONTEND=noninteractive $SUDO apt-get -o DPkg::Lock::Timeout=600 install -y -qq "${need_install[@]}" >/dev/null
fi

# A throwaway PostgreSQL cluster in a temporary folder, owned by the postgres user, on a free port.
PG_BIN="$(ls -d /usr/lib/postgresql/*/bin | sort -V | tail -1)"
PG_DIR="$(mktemp -d /tmp/latsweep-pg.XXXXXX)"
chown postgres:postgres "$PG_DIR" 2>/dev/null || true
free_port() {
  local p
  for _ in $(seq 1 50); do
    p=$(( 20000 + RANDOM % 40000 ))
    if ! (exec 3<>"/dev/tcp/127.0.0.1/$p") 2>/dev/null; then echo "$p"; return; fi
  done
  echo 55432
}
PG_PORT="$(free_port)"
as_pg() { if [ "$(id -u)" -eq 0 ]; then su postgres -s /bin/bash -c "$*"; else bash -c "$*"; fi; }
cleanup() {
  as_pg "'$PG_BIN/pg_ctl' -D '$PG_DIR/data' -m immediate stop" >/dev/null 2>&1 || true
  rm -rf "$PG_DIR"
}
trap cleanup EXIT
as_pg "'$PG_BIN/initdb' -D '$PG_DIR/data' -U postgres -A trust --no-sync" >/dev/null
as_pg "'$PG_BIN/pg_ctl' -D '$PG_DIR/data' -l '$PG_DIR/server.log' -w -o \"-c listen_addresses=127.0.0.1 -p $PG_PORT -k '$PG_DIR' -c fsync=off -c max_connections=200\" start" >/dev/null
"$PG_BIN/pg_isready" -h 127.0.0.1 -p "$PG_PORT" -t 30 >/dev/null
export LATSWEEP_TEST_PG="Host=127.0.0.1;Port=$PG_PORT;Username=postgres;Database=postgres"
export LATSWEEP_TEST_PG_BIN="$PG_BIN"
export LATSWEEP_TEST_PG_DATA="$PG_DIR/data"
export LATSWEEP_TEST_PG_PORT="$PG_PORT"
export LATSWEEP_TEST_CHROMIUM="$(command -v chromium)"
echo "== PostgreSQL $("$PG_BIN/postgres" --version | awk '{print $3}') on 127.0.0.1:$PG_PORT, Chromium at $LATSWEEP_TEST_CHROMIUM"

export DOTNET_CLI_TELEMETRY_OPTOUT=1 DOTNET_NOLOGO=1
LOG="$(mktemp /tmp/latsweep-test.XXXXXX.log)"
set +e
dotnet test Batch.sln -c Release 2>&1 | tee "$LOG"
status=${PIPESTATUS[0]}
set -e

# One closing line with the totals over every test project.
awk '
  /(Passed|Failed)! +- +Failed: +[0-9]+, +Passed: +[0-9]+, +Skipped: +[0-9]+/ {
    line = $0
    sub(/.*Failed: +/, "", line); split(line, a, /[^0-9]+/); f += a[1]
    line = $0; sub(/.*Passed: +/, "", line); split(line, b, /[^0-9]+/); p += b[1]
    line = $0; sub(/.*Skipped: +/, "", line); split(line, c, /[^0-9]+/); s += c[1]
  }
  END { printf "Tests: %d passed, %d failed, %d skipped\n", p, f, s }' "$LOG"

# A test project that did not build reports no totals at all, so the line above alone could read as green.
expected=$(ls tests/*/*.csproj | wc -l)
reported=$(grep -cE '(Passed|Failed)! +- +Failed: +[0-9]+' "$LOG" || true)
if [ "$reported" -lt "$expected" ]; then
  echo "Test projects: only $reported of $expected reported results; the others did not build or run (see the errors above)"
  [ "$status" -ne 0 ] || status=1
fi
if [ "$status" -ne 0 ]; then
  echo "FAILED: the test run ended with status $status"
fi
exit "$status"
