#!/usr/bin/env bash
# Sweeps of millions of points (issue 13 item 3), ours alone: `check`, `submit` and `status` of a
# 10^6-point sweep of trivial points (bench/queue/million-points.toml), the dashboard's sweep page
# and its JSON for it, and `run` of 10^4 and 10^5 trivial points side by side (peak memory should not
# grow with the number of points). Each command runs as a user runs it, in its own process, under
# /usr/bin/time -v (wall, user + system CPU, peak RSS); `LATSWEEP_TIMINGS=1` adds the stages.
# `merge` times `latsweep merge` of the submitted sweep's points/ table given as MERGE_PARTS part
# files of MERGE_ROWS rows in all (row groups of 4,096 rows, as chunks of the planner's cap write them).
# Usage: bench/million.sh [check submit status dashboard run merge]   (default: all but merge; run takes minutes)
# Environment: RESULTS (default bench/results/million), RUN_POINTS (default "10000 100000"; "1000000" takes ~10 min), WORKERS (default 2),
# POINTS_ROWS (rows of points/ for the dashboard step, default 10^6; 0: use the points/ there, e.g. merged by `merge`),
# DASHBOARD_TABLES (the states of points/ the dashboard step meets, each with a fresh dashboard: default "parts merged", also "single"),
# DASHBOARD_DLL (the dashboard build to time), LATSWEEP (the latsweep build to time; default: published with ReadyToRun code
# into RESULTS/latsweep-r2r as README's install line makes it, or with MILLION_LATSWEEP=build the plain `dotnet build` output), MERGE_ROWS (default 10^6), MERGE_PARTS (default 128),
# KEEP_RESULTS=1 (keep RESULTS: time another build on the data of an earlier run). The dashboard step also asks for the
# plots' fragment the sweep page's script fetches (/sweeps/ID/plots), the page of a waiting point (index 600,000, read from the store's chunk rows with python3's sqlite3) when it can find one,
# then a filter that keeps about half the rows of the merged bench data (sorted, and its page at row 300,000 with its
# plots) and a far page of another sort: requests no footer fact answers, which read and sort their columns;
# last, another page of that filter (its plots kept from the far page: the dashboard keeps a filter's plots across requests).
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
root="$(dirname "$here")"
results="${RESULTS:-$here/results/million}"
steps=("$@")
[ ${#steps[@]} -eq 0 ] && steps=(check submit status dashboard run)
workers="${WORKERS:-2}"
[ -n "${KEEP_RESULTS:-}" ] || rm -rf "$results"; mkdir -p "$results"

dotnet build "$root/src/Dashboard/Dashboard.csproj" -c Release -v quiet -nologo | grep -E " error |rror\(s\)" || true
if [ -n "${LATSWEEP:-}" ]; then
  latsweep="$LATSWEEP"
elif [ "${MILLION_LATSWEEP:-r2r}" = build ]; then
  dotnet build "$root/src/Worker/Worker.csproj" -c Release -v quiet -nologo | grep -E " error |rror\(s\)" || true
  latsweep="$root/src/Worker/bin/Release/net10.0/latsweep"
else
  # latsweep as users run it: published with ReadyToRun code by README's install line (as case (e) of
  # run.sh); the plain build output JITs its start-up in every command (~0.4 s of CPU more).
  rid="$(dotnet --info | sed -n 's/^ *RID: *//p' | head -1)"
  dotnet publish "$root/src/Worker/Worker.csproj" -c Release -r "$rid" --self-contained false -p:PublishReadyToRun=true \
    -o "$results/latsweep-r2r" -v quiet -nologo | grep -E " error |rror\(s\)" || true
  latsweep="$results/latsweep-r2r/latsweep"
fi
job="$here/queue/million-points.toml"
store="$results/store.db"
out="$results/results"

# One line per measured command: label, wall s, user s, system s, peak RSS MB, load average.
measure() {
  local label="$1"; shift
  local log="$results/$label.time"
  local load; load="$(cut -d' ' -f1 /proc/loadavg)"
  ( cd "$results" && LATSWEEP_TIMINGS=1 /usr/bin/time -v "$@" > "$results/$label.out" 2> "$log" ) || echo "$label: exit code $?"
  awk -v l="$label" -v load="$load" '
    /Elapsed \(wall clock\)/ { n = split($NF, t, ":"); w = (n == 3) ? t[1] * 3600 + t[2] * 60 + t[3] : t[1] * 60 + t[2] }
    /User time/ { u = $NF } /System time/ { s = $NF } /Maximum resident/ { m = $NF / 1024 }
    END { printf "%-28s %8.2f s wall %7.2f s user %6.2f s sys %7.0f MB peak  (load %s)\n", l, w, u, s, m, load }' "$log" | tee -a "$results/summary.txt"
  grep -E "^timings:" "$log" | sed 's/^/    /' || true
}

# A real points/ file: `latsweep run` of 1,000 of the million-point sweep's points (one value of the second axis).
template() {
  [ -d "$results/template" ] && return
  awk '/steps = 1000/ && !done { sub(/steps = 1000/, "steps = 1"); done = 1 } { print }' "$job" \
    | sed 's/name = "bench-million-points"/name = "bench-points-template"/' > "$results/template.toml"
  ( cd "$results" && "$latsweep" run "$results/template.toml" --store "$results/template.db" --out "$results/template" --workers "$workers" > "$results/template.out" 2>&1 )
}

for step in "${steps[@]}"; do
  case "$step" in
    check) measure check-1e6 "$latsweep" check "$job" ;;
    submit) measure submit-1e6 "$latsweep" submit "$job" --store "$store" --out "$out" ;;
    status)
      measure status-list "$latsweep" status --store "$store"
      measure status-1e6 "$latsweep" status bench-million-points --store "$store" ;;
    dashboard)
      # The sweep page and its JSON for the sweep just submitted, with a points/ table of POINTS_ROWS
      # (default 10^6) rows made from a real points/ file (`latsweep run` of 1,000 of its points, one value
      # of the second axis) tiled by bench/points-table/points-table.cs (the catalog still says queued),
      # in each state of DASHBOARD_TABLES (default "parts merged"), each met by a fresh dashboard process:
      #   parts   MERGE_PARTS (default 128) part files laid out as the Worker writes them: a running sweep
      #           (each part's footer summary and first rows as the Worker writes them, no .first-load.json);
      #   merged  the same parts after `latsweep merge` (as at the end of `latsweep run`): the merged
      #           files' footer summaries and the first load's facts (.first-load.json);
      #   single  one file of every row without either (what this step measured before round 18).
      # POINTS_ROWS=0: the points/ there as it is (e.g. merged by the merge step), one state "as-is".
      # DASHBOARD_DLL runs another build of the dashboard (a before figure) on the same data.
      id="$(ls "$out" | head -1)"
      tables="${DASHBOARD_TABLES:-parts merged}"
      [ "${POINTS_ROWS:-1000000}" -gt 0 ] || tables="as-is"
      for table in $tables; do
        if [ "$table" != as-is ]; then
          template
          rm -rf "$out/$id/points" && mkdir -p "$out/$id/points"
          tpl="$(ls "$results"/template/*/points/*.parquet | head -1)"
          case "$table" in
            single) ( cd "$here/points-table" && dotnet run points-table.cs "$tpl" "$out/$id/points/single-00000.parquet" "${POINTS_ROWS:-1000000}" ) | tee -a "$results/summary.txt" ;;
            parts|merged)
              ( cd "$here/points-table" && dotnet run points-table.cs "$tpl" "$out/$id/points" "${POINTS_ROWS:-1000000}" 4096 "${MERGE_PARTS:-128}" ) | tee -a "$results/summary.txt"
              if [ "$table" = merged ]; then
                ( cd "$results" && LATSWEEP_TIMINGS=1 "$latsweep" merge "$id" --store "$store" > "$results/dashboard-merge.out" 2>&1 ) || echo "merge: exit code $?"
                grep -E "^timings: (process CPU|merge: first-load facts|merge: facts)" "$results/dashboard-merge.out" | sed "s/^/    [$table] /" | tee -a "$results/summary.txt" || true
              fi ;;
            *) echo "unknown table state $table (parts, merged, single)"; exit 2 ;;
          esac
        fi
        ls -A "$out/$id/points" | awk -v t="$table" '/parquet$/ { n++ } /^\.first-load\.json$/ { f = "with" } END { printf "dashboard, points/ %s: %d Parquet files, %s .first-load.json\n", t, n, f ? f : "without" }' | tee -a "$results/summary.txt"
        port=$((20000 + RANDOM % 20000))
        LATSWEEP_TIMINGS=1 dotnet "${DASHBOARD_DLL:-$root/src/Dashboard/bin/Release/net10.0/Dashboard.dll}" --store "$store" --out "$out" --port "$port" > "$results/dashboard-$table.log" 2>&1 &
        pid=$!
        for _ in $(seq 1 120); do curl -s -o /dev/null "http://127.0.0.1:$port/" && break; sleep 0.5; done
        echo "dashboard [$table] $(cut -d' ' -f1 /proc/loadavg) load average, process CPU at start $(awk -v hz="$(getconf CLK_TCK)" '{ printf "%.2f s", ($14 + $15) / hz }' /proc/$pid/stat)" | tee -a "$results/summary.txt"
        # A point of a chunk no worker has claimed (index 600,000): its page looks it up in the catalog.
        waiting="$(python3 -c 'import json, sqlite3, sys
c = sqlite3.connect(sys.argv[1]).execute("SELECT points_json FROM latsweep_chunks WHERE first_index <= 600000 AND last_index >= 600000 AND points_json IS NOT NULL").fetchone()
print(next((p[0] for p in json.loads(c[0]) if isinstance(p, list) and p[1] == 600000), "") if c else "")' "$store" 2>/dev/null || true)"
        # After the first load, the plots' fragment as the page's script asks for it (a table not merged yet: the page answers
        # without its plots; a build without the fragment answers 404 quickly), then a second load.
        for page in "sweeps/$id" "sweeps/$id/plots" "sweeps/$id" "api/sweeps/$id" "api/sweeps/$id/results" "api/sweeps/$id/plots" \
            "api/sweeps/$id/results?stable=1&sort=max_freq_thz&dir=desc" "sweeps/$id?range=max_freq_thz:0:1e9&offset=500000" \
            ${waiting:+"sweeps/$id/points/$waiting"} \
            "api/sweeps/$id/results?range=debye_temperature_from_cv_k:0:749.7&sort=cv_j_per_kg_k&dir=desc" \
            "sweeps/$id?range=debye_temperature_from_cv_k:0:749.7&offset=300000" "api/sweeps/$id/results?sort=cv_j_per_mol_k&offset=700000" \
            "sweeps/$id?range=debye_temperature_from_cv_k:0:749.7&offset=100"; do
          # Beside each request's wall time, the dashboard process's CPU so far (user + system; steadier than wall on a shared machine).
          took="$(curl -s -H "X-LatticeSweep-Fragment: 1" -o /dev/null -w "dashboard [$table] /$page  %{time_total} s, %{size_download} bytes, HTTP %{http_code}" "http://127.0.0.1:$port/$page")"
          echo "$took, process CPU $(awk -v hz="$(getconf CLK_TCK)" '{ printf "%.2f s", ($14 + $15) / hz }' /proc/$pid/stat)" | tee -a "$results/summary.txt"
        done
        echo "dashboard [$table] peak RSS $(awk '/VmHWM/ { print int($2 / 1024) " MB" }' /proc/$pid/status)" | tee -a "$results/summary.txt"
        kill "$pid"; wait "$pid" 2>/dev/null || true
        # The first load's own stages (LATSWEEP_TIMINGS=1: the totals printed after the first request).
        awk '/^timings: request \/sweeps\// { if (f) exit; f = 1; print; next } f && /^timings: request / { exit } f && /^timings: (process CPU|sweep page|detail: stability|table: |plots: |points: )/' "$results/dashboard-$table.log" \
          | sed "s/^/    [$table] first load /" | tee -a "$results/summary.txt"
      done ;;
    run)
      # `latsweep run` of RUN_POINTS trivial points (the first axis cut to n/1000 values). A sampler
      # writes one line a second to run-N.samples (seconds since start, RSS and its high-water mark in
      # MB, part files written, the store's size in MB, the load average), so memory over time shows
      # whether it grows with the points; the summary line gives the peak before the end-of-sweep merge
      # (the solving phase's peak from LATSWEEP_TIMINGS; without it, the sampler's high-water mark when
      # the merge's staging folder first appears), the whole run's peak, the
      # RSS in the last quarter of the solving time, the store's and the results' size on disk, and
      # (run-N.memory, LATSWEEP_MEMORY_TRACE) the process's own line a second: RSS anonymous and file-backed, the GC's
      # heap, committed bytes and collections, glibc's arenas, threads and SQLite's memory; and
      # each table's files at the end, the points/ table read back by DuckDB (bench/count-rows: rows,
      # distinct ids, points per state) and `status` of the sweep.
      for n in ${RUN_POINTS:-10000 100000}; do
        small=$(( n / 1000 ))
        awk -v s=$small '/steps = 1000/ && !done { sub(/steps = 1000/, "steps = " s); done = 1 } { print }' "$job" \
          | sed "s/name = \"bench-million-points\"/name = \"bench-run-$n\"/" > "$results/run-$n.toml"
        load="$(cut -d' ' -f1 /proc/loadavg)"
        rm -rf "$results/run-$n" "$results/run-$n.db"* 
        ( cd "$results" && LATSWEEP_TIMINGS=1 LATSWEEP_MEMORY_TRACE="$results/run-$n.memory" exec /usr/bin/time -v "$latsweep" run "$results/run-$n.toml" --store "$results/run-$n.db" \
            --out "$results/run-$n" --workers "$workers" > "$results/run-$n.out" 2> "$results/run-$n.time" ) &
        timer=$!
        solving_kb=0; child=""; start=$(date +%s.%N); samples="$results/run-$n.samples"
        echo "# s rss_mb hwm_mb parts store_mb merging load" > "$samples"
        while kill -0 "$timer" 2>/dev/null; do
          [ -z "$child" ] && child="$(cat /proc/$timer/task/$timer/children 2>/dev/null | awk '{print $1}')"
          if [ -n "$child" ] && [ -r "/proc/$child/status" ]; then
            merging=0; ls -d "$results/run-$n"/*/.merging >/dev/null 2>&1 && merging=1
            read -r rss hwm < <(awk '/VmRSS/ {r = $2} /VmHWM/ {h = $2} END {print r + 0, h + 0}' /proc/$child/status 2>/dev/null || echo "0 0")
            [ "$merging" = 0 ] && [ "${hwm:-0}" -gt "$solving_kb" ] && solving_kb="$hwm"
            parts="$(ls "$results/run-$n"/*/points 2>/dev/null | grep -c '^part' || true)"
            store_mb="$(du -cm "$results/run-$n.db"* 2>/dev/null | awk 'END {print $1}' || true)"
            awk -v t="$(date +%s.%N)" -v s0="$start" -v r="$rss" -v h="$hwm" -v p="$parts" -v st="$store_mb" -v m="$merging" -v l="$(cut -d' ' -f1 /proc/loadavg)" \
              'BEGIN { printf "%.0f %.0f %.0f %s %s %s %s\n", t - s0, r / 1024, h / 1024, p, st, m, l }' >> "$samples"
          fi
          sleep 1
        done
        wait "$timer" || echo "run-$n: exit code $?"
        # RSS over the last quarter of the solving samples (before the merge): the level the run settles at.
        late="$(awk '!/^#/ && $6 == 0 { r[++k] = $2 } END { if (k == 0) { print "-"; exit } lo = 1e9; hi = 0; for (i = int(k * 3 / 4) + 1; i <= k; i++) { if (r[i] < lo) lo = r[i]; if (r[i] > hi) hi = r[i] } print lo "-" hi }' "$samples")"
        # The solving phase's own peak from LATSWEEP_TIMINGS ("run: work the queue", sampled every 5 ms by
        # the process); the 1 s sampler's high-water mark before it sees the staging folder can include
        # the start of the merge, so it is only the fallback.
        timed_kb="$(awk '/^timings: run: work the queue/ && match($0, /peak RSS [0-9]+ MiB/) { split(substr($0, RSTART, RLENGTH), w, " "); print w[3] * 1024 }' "$results/run-$n.time")"
        [ -n "$timed_kb" ] && solving_kb="$timed_kb"
        awk -v l="run-$n" -v load="$load" -v solving="$solving_kb" -v late="$late" '
          /Elapsed \(wall clock\)/ { k = split($NF, t, ":"); w = (k == 3) ? t[1] * 3600 + t[2] * 60 + t[3] : t[1] * 60 + t[2] }
          /User time/ { u = $NF } /System time/ { s = $NF } /Maximum resident/ { m = $NF / 1024 }
          END { printf "%-28s %8.2f s wall %7.2f s user %6.2f s sys %7.0f MB peak, %.0f MB peak before the merge, late RSS while solving %s MB  (load %s)\n", l, w, u, s, m, solving / 1024, late, load }' \
          "$results/run-$n.time" | tee -a "$results/summary.txt"
        grep -E "^timings: (process|solve|catalog|write|merge|run)" "$results/run-$n.time" | sed 's/^/    /' || true
        du -cm "$results/run-$n.db"* | awk -v l="run-$n" 'END { printf "    %s store on disk: %d MB\n", l, $1 }' | tee -a "$results/summary.txt"
        for table in "$results/run-$n"/*/*/; do
          [ -d "$table" ] || continue
          ls -l "$table" | awk -v t="$(basename "$table")" 'NR > 1 && $NF ~ /parquet$/ { n++; b += $5; if ($NF ~ /^merged/) m++ } END { printf "    %s: %d files (%d merged), %.1f MB\n", t, n, m, b / 1e6 }' | tee -a "$results/summary.txt"
        done
        for sweep in "$results/run-$n"/*/; do
          ( cd "$here/count-rows" && dotnet run count-rows.cs "$sweep" 2>&1 || true ) | sed 's/^/    /' | tee -a "$results/summary.txt"
        done
        tail -2 "$results/run-$n.out" | sed 's/^/    /' | tee -a "$results/summary.txt"
        ( cd "$results" && "$latsweep" status "bench-run-$n" --store "$results/run-$n.db" || true ) | awk 'NR <= 3' | sed 's/^/    status: /' | tee -a "$results/summary.txt"
      done ;;
    merge)
      # The submitted sweep's points/ as parts laid out as the Worker writes them, then merged by `latsweep merge`.
      id="$(ls "$out" | head -1)"
      template
      rm -rf "$out/$id/points" && mkdir -p "$out/$id/points"
      ( cd "$here/points-table" && dotnet run points-table.cs "$(ls "$results"/template/*/points/*.parquet | head -1)" \
          "$out/$id/points" "${MERGE_ROWS:-1000000}" 4096 "${MERGE_PARTS:-128}" ) | tee -a "$results/summary.txt"
      measure "merge-${MERGE_ROWS:-1000000}" "$latsweep" merge "$id" --store "$store"
      ls -l "$out/$id/points" | awk 'NR > 1 { n++; b += $5 } END { printf "    points/ after the merge: %d files, %.1f MB\n", n, b / 1e6 }' | tee -a "$results/summary.txt" ;;
    *) echo "unknown step $step"; exit 2 ;;
  esac
done
echo "summary in $results/summary.txt"
