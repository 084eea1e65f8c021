#!/usr/bin/env bash
# watch latency: the time from the moment a 10,000-point export has settled in the inbox to the moment its series'
# refreshed summary.json (and, written before it, the run's PNG) is on disk. Prints every drop and p50/p95.
#   bash bench/watch-latency.sh            (DROPS=20 SETTLE_MS=500 by default)
set -euo pipefail
cd "$(dirname "$0")/.."
DROPS=${DROPS:-20}
SETTLE_MS=${SETTLE_MS:-500}
dotnet build src/TraceKin.Cli -c Release -nologo -v q >/dev/null
cli=(dotnet src/TraceKin.Cli/bin/Release/net10.0/tracekin.dll)

work=$(mktemp -d)
[ -z "${KEEP:-}" ] || echo "work folder (kept): $work"
inbox=$work/inbox; out=$work/out; stage=$work/stage
mkdir -p "$inbox/bench" "$stage"
trap 'kill "$watcher" 2>/dev/null || true; wait 2>/dev/null || true; [ -n "${KEEP:-}" ] || rm -rf "$work"' EXIT

# The demo series' plan and settings; exports simulated at 0.1 s for 999.9 s = 10,000 points each.
cp sample-traces/violet-complex-acid/{plan.csv,series.toml} "$stage/"
cp sample-traces/violet-complex-acid/{plan.csv,series.toml} "$inbox/bench/"
simulate() { "${cli[@]}" simulate "$stage" -k 0.35 --order complex=1 --order H+=1 --duration 999.9 --interval 0.1 --seed "$1" 2>/dev/null; }
simulate 1
cp "$stage"/r*.csv "$inbox/bench/"
points=$(grep -c '^[0-9]' "$stage/r1.csv")

"${cli[@]}" watch "$inbox" --out "$out" --settle-ms "$SETTLE_MS" 2>"$work/watch.err" &
watcher=$!
until [ -s "$out/.tracekin-ledger.jsonl" ]; do sleep 0.1; done

cpu() { awk '{print $14 + $15}' "/proc/$watcher/stat" 2>/dev/null || echo 0; }   # watcher's CPU time, clock ticks
cpu_start=$(cpu)
lat=()
for i in $(seq 1 "$DROPS"); do
  simulate $((i + 1))                                   # new content for every run, made outside the inbox
  f=r$(( (i - 1) % 8 + 1 )).csv
  sha=$(sha256sum "$stage/$f" | cut -d' ' -f1)
  cp "$stage/$f" "$inbox/bench/.$f.part"
  mv "$inbox/bench/.$f.part" "$inbox/bench/$f"           # the instrument's write-then-rename
  t_written=$(date +%s%N)
  until grep -q "$sha" "$out/bench/summary.json" 2>/dev/null; do sleep 0.005; done
  t_done=$(date +%s%N)
  ms=$(( (t_done - t_written) / 1000000 - SETTLE_MS ))   # settled = written + settle interval
  lat+=("$ms")
  echo "drop $i ($f, $points points): ${ms} ms after it settled"
done

cpu_ms=$(( ($(cpu) - cpu_start) * 1000 / $(getconf CLK_TCK) / DROPS ))
sorted=($(printf '%s\n' "${lat[@]}" | sort -n))
n=${#sorted[@]}
rank() { local r=$(( ($1 * n + 99) / 100 )); echo "${sorted[$((r - 1))]}"; }   # nearest-rank percentile
echo "watch latency over $n drops of $points-point exports (settle $SETTLE_MS ms): p50 $(rank 50) ms, p95 $(rank 95) ms, max ${sorted[$((n - 1))]} ms; watcher CPU ${cpu_ms} ms per drop; load average $(cut -d' ' -f1 /proc/loadavg)"
