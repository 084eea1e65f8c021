#!/usr/bin/env bash
# Peak memory of `tracekin analyse` on one very long run (bench/README.md, "One long run").
#
#   bench/bigrun.sh                          # 2,000,000 rows, four cases, with and without plots, against the limit
#   BIGRUN_ROWS=200000 BIGRUN_CASES=noisy bench/bigrun.sh
#
# Environment: BIGRUN_WORK (default $TMPDIR/tracekin-bigrun; series and outputs, kept out of the repository),
# BIGRUN_ROWS (default 2000000), BIGRUN_CASES (default "noisy quiet spikes slow"), BIGRUN_BUILD=0 to skip the
# Release build. Exit status 1 when a peak exceeds 3 × the export's size + 150 MiB.
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

# Invented first-order runs (A → products followed by its absorbance), one sample per second, in four cases:
#   noisy  σ = 0.002, 95 % conversion        quiet  σ = 0.0001 (too little noise for 250 bins to keep the curve)
#   spikes noisy + a spike every 997 rows    slow   σ = 0.002, 10 % conversion (the early window is the whole run)
CASES=${BIGRUN_CASES:-"noisy quiet spikes slow"}
make_case() {
    local name=$1 series="$WORK/$1-$ROWS" noise=0.002 kt=3
    [[ -f $series/long.csv ]] && return
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
    case $name in quiet) noise=0.0001 ;; slow) kt=0.1 ;; esac
    local k; k=$(awk -v n="$ROWS" -v kt="$kt" 'BEGIN { printf "%.6g", kt / (n - 1) }')
    echo "simulating $name: $ROWS rows in $series (k = $k /s, noise $noise)" >&2
    "${TRACEKIN[@]}" simulate "$series" -k "$k" --order A=1 --duration $((ROWS - 1)) --interval 1 --noise "$noise" --seed 11 2>/dev/null
    if [[ $name == spikes ]]; then
        awk -F, 'NR > 4 && NR % 997 == 0 { printf "%s,%.6f\n", $1, $2 + 0.05; next } { print }' "$series/long.csv" >"$series/long.tmp"
        mv "$series/long.tmp" "$series/long.csv"
    fi
}

STAMP=$(date -u +%Y-%m-%dT%H:%MZ)
echo "one long run, $STAMP, $(nproc) cores, load $(cut -d' ' -f1-3 /proc/loadavg), dotnet $(dotnet --version), $ROWS rows"
STATUS=0
for name in $CASES; do
    make_case "$name"
    series="$WORK/$name-$ROWS"
    size=$(stat -c %s "$series/long.csv")
    limit=$(awk -v b="$size" 'BEGIN { printf "%.0f", 3 * b / 1048576 + 150 }')
    for mode in no-plots plots; do
        out="$WORK/out-$name-$ROWS-$mode"
        rm -rf "$out"
        args=(analyse "$series" --out "$out")
        [[ $mode == no-plots ]] && args+=(--no-plots)
        log="$WORK/$name-$mode"
        if ! /usr/bin/time -v -o "$log.time" "${TRACEKIN[@]}" "${args[@]}" >"$log.out" 2>"$log.err"; then
            echo "bigrun.sh: analyse ($name, $mode) failed; see $log.err" >&2; tail -5 "$log.err" >&2; exit 1
        fi
        peak=$(awk -F': ' '/Maximum resident set size/ { printf "%.0f", $2 / 1024 }' "$log.time")
        wall=$(awk -F': ' '/Elapsed \(wall clock\)/ { print $2 }' "$log.time")
        verdict=ok; (( peak > limit )) && { verdict="OVER"; STATUS=1; }
        printf '%-7s %-9s file %5.1f MiB  peak RSS %5s MiB (%.1f × file; limit %s MiB)  wall %s  %s\n' "$name" "$mode" \
            "$(awk -v b="$size" 'BEGIN { print b / 1048576 }')" "$peak" "$(awk -v p="$peak" -v b="$size" 'BEGIN { print p * 1048576 / b }')" "$limit" "$wall" "$verdict"
    done
done
exit $STATUS
