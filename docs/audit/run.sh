#!/usr/bin/env bash
# Random-case audit of the engine's numbers: bash docs/audit/run.sh WORKDIR SEED NCASES
# Builds latsweep (Release) and the audit kit into WORKDIR, writes NCASES random job files
# (WORKDIR/audit-SEED-NNNN/job.toml), runs each through `latsweep run`, compares the results with
# the kit's own references and prints the summary (also WORKDIR/summary.txt; every number in
# WORKDIR/comparisons.csv). Exit 0: every number within tolerance; 1: some beyond or missing; 2: usage.
set -euo pipefail
if [ $# -ne 3 ] || ! [[ "$2" =~ ^[0-9]+$ ]] || ! [[ "$3" =~ ^[0-9]+$ ]] || [ "$3" -lt 1 ]; then
  echo "usage: bash docs/audit/run.sh WORKDIR SEED NCASES   (SEED >= 0 and NCASES >= 1 whole numbers)" >&2
  exit 2
fi
ROOT="$(cd "$(dirname "$0")/../.." && pwd)"
mkdir -p "$1"
WORK="$(cd "$1" && pwd)"
echo "== building latsweep and the audit kit into $WORK" >&2
dotnet build "$ROOT/src/Worker" -c Release -o "$WORK/bin" -nologo -v q >"$WORK/build.log" 2>&1 \
  || { echo "latsweep did not build; see $WORK/build.log" >&2; exit 1; }
dotnet build "$ROOT/docs/audit/AuditKit" -c Release -o "$WORK/kit" -nologo -v q >>"$WORK/build.log" 2>&1 \
  || { echo "the audit kit did not build; see $WORK/build.log" >&2; exit 1; }
exec dotnet "$WORK/kit/audit-kit.dll" "$WORK/bin/latsweep.dll" "$WORK" "$2" "$3"
