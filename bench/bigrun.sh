#!/usr/bin/env bash
# Peak memory of `tracekin analyse` on one very long run (bench/README.md, "One long run").
#
#   bench/bigrun.sh                 # 2,000,000 rows: analyse with and without plots, peak RSS against the limit
#   BIGRUN_ROWS=200000 bench/bigrun.sh
#
# Environment: BIGRUN_WORK (default $TMPDIR/tracekin-bigrun; the series and outputs, kept out of the repository),
# BIGRUN_ROWS (default 2000000), BIGRUN_BUILD=0 to skip the Release build.
set -euo pipefail

REPO=$(cd "$(dirname "$0")/.." && pwd)
WORK=${BIGRUN_WORK:-${TMPDIR:-/tmp}/tracekin-bigrun}
ROWS=${BIGRUN_ROWS:-2000000}

if [[ ! -x /usr/bin/time ]]; then
    echo "installing GNU time (apt-get)" >&2
    SUDO=""; [[ $(id -u) -ne 0 ]] && SUDO="sudo"
    $SUDO apt-get install -y time >/dev/null 2>&1 || { $SUDO apt-get update >/dev/null && $SUDO apt-get install -y time >/dev/null; }
fi

if [[ ${BIGRUN_BUILD:-1} != 0 ]]; then
    echo "building TraceKin (Release)" >&2
    dotnet build "$REPO/src/TraceKin.Cli" -c Release -v q -nologo >/dev/null
fi
TRACEKIN=(dotnet "$REPO/src/TraceKin.Cli/bin/Release/net10.0/tracekin.dll")

# An invented first-order run (A → products followed by its absorbance), one sample per second.
series="$WORK/series-$ROWS"
if [[ ! -f $series/long.csv ]]; then
    rm -rf "$series"; mkdir -p "$series"
    cat >"$series/series.toml" <<'TOML'
name = "long-run"
description = "One invented first-order run sampled every second, to measure memory on a very long export"

[signal]
kind = "absorbance"
channel = "A420"
species = "A"
coefficient = -1
molar_absorptivity = 1200
path_length = 1.0
blank = 0.02
TOML
    printf 'run,file,temperature (°C),[A]0 (mmol/L)\nlong,long.csv,25.0,0.50\n' >"$series/plan.csv"
    # k·duration = 3 (95 % conversion) whatever the length
    k=$(awk -v n="$ROWS" 'BEGIN { printf "%.6g", 3 / (n - 1) }')
    echo "simulating $ROWS rows in $series (k = $k /s)" >&2
    "${TRACEKIN[@]}" simulate "$series" -k "$k" --order A=1 --duration $((ROWS - 1)) --interval 1 --noise 0.002 --seed 11 2>/dev/null
fi
size=$(stat -c %s "$series/long.csv")
limit=$(awk -v b="$size" 'BEGIN { printf "%.0f", 3 * b / 1048576 + 150 }')

STAMP=$(date -u +%Y-%m-%dT%H:%MZ)
echo "one long run, $STAMP, $(nproc) cores, load $(cut -d' ' -f1-3 /proc/loadavg), dotnet $(dotnet --version)"
echo "export: $(wc -l <"$series/long.csv") lines, $(awk -v b="$size" 'BEGIN { printf "%.1f", b / 1048576 }') MiB; limit 3 × size + 150 MiB = $limit MiB"
STATUS=0
for mode in no-plots plots; do
    out="$WORK/out-$ROWS-$mode"
    rm -rf "$out"
    args=(analyse "$series" --out "$out")
    [[ $mode == no-plots ]] && args+=(--no-plots)
    if ! /usr/bin/time -v -o "$WORK/$mode.time" "${TRACEKIN[@]}" "${args[@]}" >"$WORK/$mode.out" 2>"$WORK/$mode.err"; then
        echo "bigrun.sh: analyse ($mode) failed; see $WORK/$mode.err" >&2; tail -5 "$WORK/$mode.err" >&2; exit 1
    fi
    peak=$(awk -F': ' '/Maximum resident set size/ { printf "%.0f", $2 / 1024 }' "$WORK/$mode.time")
    wall=$(awk -F': ' '/Elapsed \(wall clock\)/ { print $2 }' "$WORK/$mode.time")
    verdict=ok; (( peak > limit )) && { verdict="OVER"; STATUS=1; }
    printf '%-9s peak RSS %5s MiB (%.1f × file)  wall %s  %s\n' "$mode" "$peak" "$(awk -v p="$peak" -v b="$size" 'BEGIN { print p * 1048576 / b }')" "$wall" "$verdict"
done
exit $STATUS
