#!/usr/bin/env bash
# Batch speed of `tracekin analyse` against the scripted baseline (bench/README.md, "Batch speed").
#
#   bench/batch.sh                      # 200 x 10,000 (with and without plots), 1,000 x 10,000 and 20,000 x 200
#   BENCH_SIZES="20x2000" bench/batch.sh  # a quick smoke run
#
# Environment: BENCH_PEER (peer scripts; default ../shared/bench-peer from the repo root),
# BENCH_WORK (batches and outputs; default $TMPDIR/tracekin-bench, reused between runs),
# BENCH_SIZES (space-separated RUNSxPOINTS; the first size is also timed with plots against the baseline,
# the others with plots for TraceKin alone),
# BENCH_WORKERS (TraceKin workers; default: all cores),
# BENCH_MORE_PLOTS (0: skip TraceKin's runs with PNGs on the sizes after the first; default 1),
# BENCH_COMPARE_WITH (a folder of earlier outputs, DIR/RUNSxPOINTS/summary.json and tables, to compare with),
# BENCH_LIKE_FOR_LIKE (opt-in: integrated law names, comma-separated, e.g. "pseudo-first order": per size, TraceKin
# --no-plots is also timed on a second series folder of the same run files, hard-linked, whose series.toml imposes
# those laws with rates.drift = "off", as the baseline fits one law per run; printed as its own line, beside the
# default-settings line, never instead of it).
set -euo pipefail

REPO=$(cd "$(dirname "$0")/.." && pwd)
PEER=${BENCH_PEER:-$REPO/../shared/bench-peer}
WORK=${BENCH_WORK:-${TMPDIR:-/tmp}/tracekin-bench}
SIZES=${BENCH_SIZES:-"200x10000 1000x10000 20000x200"}
WORKERS=${BENCH_WORKERS:-$(nproc)}
PY=/usr/bin/python3

die() { echo "batch.sh: $*" >&2; exit 2; }
[[ -f $PEER/bigbench.py && -f $PEER/pipeline.py ]] || die "benchmark peer not found in $PEER (set BENCH_PEER)"

# --- tools: Debian's python3 with the baseline's packages, GNU time -------------------------------------------
if ! $PY -c 'import numpy, scipy, pandas, matplotlib' 2>/dev/null || [[ ! -x /usr/bin/time ]]; then
    echo "installing python3-numpy python3-scipy python3-pandas python3-matplotlib time (apt-get)" >&2
    SUDO=""; [[ $(id -u) -ne 0 ]] && SUDO="sudo"
    $SUDO apt-get install -y python3-numpy python3-scipy python3-pandas python3-matplotlib time >/dev/null 2>&1 ||
        { $SUDO apt-get update >/dev/null && $SUDO apt-get install -y python3-numpy python3-scipy python3-pandas python3-matplotlib time >/dev/null; }
fi
$PY -c 'import numpy, scipy, pandas, matplotlib' || die "the baseline's Python packages are not importable by $PY"

# --- TraceKin, Release ----------------------------------------------------------------------------------------------
# The release build (README, "Big batches"): self-contained and compiled ahead of time together with the runtime
# (ReadyToRun composite), so a batch does not spend its first half second compiling. About 80 s on 2 cores.
echo "publishing TraceKin (Release, self-contained, ReadyToRun composite)" >&2
RID=$(dotnet --info | awk -F': *' '/^ *RID:/ { print $2; exit }')
RELEASE=(-c Release -r "$RID" --self-contained true -p:PublishReadyToRun=true -p:PublishReadyToRunComposite=true
    -p:TieredCompilation=false -v q -nologo)
dotnet publish "$REPO/src/TraceKin.Cli" "${RELEASE[@]}" -o "$WORK/bin/cli" >/dev/null
dotnet publish "$REPO/bench/TraceKin.Bench" "${RELEASE[@]}" -o "$WORK/bin/bench" >/dev/null
TRACEKIN=("$WORK/bin/cli/tracekin")
BENCHTOOL=("$WORK/bin/bench/TraceKin.Bench")

# timed NAME CMD...: runs CMD under /usr/bin/time -v; sets WALL (s) and PEAK (MB); output in $WORK/logs/NAME.*
mkdir -p "$WORK/logs"
timed() {
    local name=$1; shift
    if ! /usr/bin/time -v -o "$WORK/logs/$name.time" "$@" >"$WORK/logs/$name.out" 2>"$WORK/logs/$name.err"; then
        echo "batch.sh: $name failed (exit status in $WORK/logs/$name.time; output in $WORK/logs/$name.err)" >&2
        tail -5 "$WORK/logs/$name.err" >&2
        return 1
    fi
    WALL=$(awk -F': ' '/Elapsed \(wall clock\)/ { n = split($2, p, ":"); s = 0; for (i = 1; i <= n; i++) s = s * 60 + p[i]; print s }' "$WORK/logs/$name.time")
    PEAK=$(awk -F': ' '/Maximum resident set size/ { printf "%.0f", $2 / 1024 }' "$WORK/logs/$name.time")
}
ratio() { awk -v a="$1" -v b="$2" 'BEGIN { printf "%.1f", a / b }'; }
rate() { awk -v n="$1" -v s="$2" 'BEGIN { printf "%.0f", n / s }'; }

STAMP=$(date -u +%Y-%m-%dT%H:%MZ)
REPORT="$WORK/report-$STAMP.txt"
{
    echo "batch speed, $STAMP, $(nproc) cores, load $(cut -d' ' -f1-3 /proc/loadavg), TraceKin workers $WORKERS"
    echo "dotnet $(dotnet --version), $($PY --version 2>&1)"
} | tee "$REPORT"

# Warm-up, untimed: both tools once with plots on a tiny batch, so that no timed step pays for loading its program
# and libraries from disk (TraceKin's PNG library is first touched by the run with plots, which otherwise pays for it
# alone: about 0.3 s of a 1 s run with a cold page cache, measured) and both start from the same warm state.
warm="$WORK/batch-warmup"
if [[ ! -f $warm/truth.json ]]; then
    rm -rf "$warm"
    $PY "$PEER/bigbench.py" --out "$warm" --runs 10 --points 1000 >/dev/null
fi
$PY "$REPO/bench/series_from_manifest.py" "$warm" 2>/dev/null
rm -rf "$WORK/out-warmup"
"${TRACEKIN[@]}" analyse "$warm" --out "$WORK/out-warmup/tracekin" --workers "$WORKERS" >/dev/null 2>&1 || die "the warm-up run of TraceKin failed"
$PY "$PEER/pipeline.py" "$warm" --out "$WORK/out-warmup/baseline" --jobs 2 >/dev/null 2>&1 || die "the warm-up run of the baseline failed"

FIRST=1
STATUS=0
for size in $SIZES; do
    runs=${size%x*}; points=${size#*x}
    batch="$WORK/batch-${runs}x${points}"
    if [[ ! -f $batch/truth.json ]]; then
        rm -rf "$batch"
        echo "generating $runs runs x $points points in $batch" >&2
        $PY "$PEER/bigbench.py" --out "$batch" --runs "$runs" --points "$points" >/dev/null
    fi
    $PY "$REPO/bench/series_from_manifest.py" "$batch" 2>/dev/null
    largest=$(find "$batch" -name 'run_*.csv' -printf '%s\n' | sort -n | tail -1)
    total=$(find "$batch" -name 'run_*.csv' -printf '%s\n' | awk '{ s += $1 } END { printf "%.1f", s / 1e6 }')
    limit=$(awk -v b="$largest" 'BEGIN { printf "%.0f", 3 * b / 1048576 + 150 }')
    out="$WORK/out-${runs}x${points}"
    rm -rf "$out"; mkdir -p "$out"
    echo | tee -a "$REPORT"
    echo "== $runs runs x $points points ($total MB; largest file $((largest / 1024)) kB; memory limit $limit MB)" | tee -a "$REPORT"

    # Every timed step reads the exports from the page cache: read them once first, or the first step to touch a
    # batch that another step pushed out of the cache (parse only, here) pays for the disk and flatters the ratios.
    cat "$batch"/*.csv >/dev/null
    # Parse only: every export read and parsed in parallel, nothing else (TraceKin.Bench, Release).
    timed "parse-$size" "${BENCHTOOL[@]}" parse "$batch" --workers "$WORKERS"
    parse=$(awk -F= '/^parse_seconds=/ { print $2 }' "$WORK/logs/parse-$size.out")
    parse_wall=$WALL
    printf '%-34s %8.2f s (%s s in-process)\n' "TraceKin parse only" "$parse_wall" "$parse" | tee -a "$REPORT"

    timed "baseline-noplots-$size" $PY "$PEER/pipeline.py" "$batch" --out "$out/baseline-noplots" --no-plots
    b_np=$WALL; b_np_mem=$PEAK
    timed "tracekin-noplots-$size" "${TRACEKIN[@]}" analyse "$batch" --out "$out/tracekin-noplots" --no-plots --workers "$WORKERS"
    t_np=$WALL; t_np_mem=$PEAK
    printf '%-34s %8.2f s %6s MB  %s runs/s, %s points/s\n' "baseline, no plots, 1 job" "$b_np" "$b_np_mem" "$(rate "$runs" "$b_np")" "$(rate $((runs * points)) "$b_np")" | tee -a "$REPORT"
    printf '%-34s %8.2f s %6s MB  %s runs/s, %s points/s\n' "TraceKin, no plots" "$t_np" "$t_np_mem" "$(rate "$runs" "$t_np")" "$(rate $((runs * points)) "$t_np")" | tee -a "$REPORT"
    printf '%-34s %8s\n' "ratio baseline/TraceKin, no plots" "$(ratio "$b_np" "$t_np")" | tee -a "$REPORT"
    printf '%-34s %8s   (diagnostic; process wall times)\n' "TraceKin no plots / parse only" "$(ratio "$t_np" "$parse_wall")" | tee -a "$REPORT"
    # Where TraceKin's time went (its log's timing line) and how big the outputs are per run.
    timing=$(sed -n 's/.*timing: //p' "$out/tracekin-noplots/tracekin.log" | tail -1)
    series_s=$(sed -n 's/.*series stage \([0-9.]*\) s.*/\1/p' <<<"$timing")
    printf '%-34s %s (series stage %s %% of the wall time)\n' "TraceKin stages" "$timing" "$(awk -v a="$series_s" -v b="$t_np" 'BEGIN { printf "%.1f", 100 * a / b }')" | tee -a "$REPORT"
    printf '%-34s %8s B/run; report.html %s kB\n' "summary.json" "$(awk -v a="$(stat -c %s "$out/tracekin-noplots/summary.json")" -v n="$runs" 'BEGIN { printf "%.0f", a / n }')" \
        "$(( $(stat -c %s "$out/tracekin-noplots/report.html") / 1024 ))" | tee -a "$REPORT"
    (( t_np_mem <= limit )) || { echo "  memory above the limit of $limit MB" | tee -a "$REPORT"; }
    $PY "$REPO/bench/compare_results.py" "$out/tracekin-noplots/summary.json" "$out/baseline-noplots/summary.csv" "$batch/truth.json" |
        sed 's/^/  /' | tee -a "$REPORT" || STATUS=1
    # Like for like (BENCH_LIKE_FOR_LIKE): the same runs with the baseline's choice of law imposed and no drift terms.
    if [[ -n ${BENCH_LIKE_FOR_LIKE:-} ]]; then
        lfl_batch="$WORK/batch-${runs}x${points}-laws"
        IFS=',' read -r -a lfl_laws <<<"$BENCH_LIKE_FOR_LIKE"
        lfl_args=()
        for law in "${lfl_laws[@]}"; do lfl_args+=(--laws "$law"); done
        $PY "$REPO/bench/series_from_manifest.py" "$batch" "${lfl_args[@]}" --drift off --out-dir "$lfl_batch" 2>/dev/null
        (( ${#lfl_laws[@]} == 1 )) && lfl_what="one law imposed" || lfl_what="laws imposed"
        lfl_what="$lfl_what ($BENCH_LIKE_FOR_LIKE), no plots"
        timed "tracekin-laws-noplots-$size" "${TRACEKIN[@]}" analyse "$lfl_batch" --out "$out/tracekin-laws-noplots" --no-plots --workers "$WORKERS"
        t_lfl=$WALL; t_lfl_mem=$PEAK
        printf '%-34s %8.2f s %6s MB  %s runs/s, %s points/s\n' "TraceKin, $lfl_what" "$t_lfl" "$t_lfl_mem" "$(rate "$runs" "$t_lfl")" "$(rate $((runs * points)) "$t_lfl")" | tee -a "$REPORT"
        printf '%-34s %8s   (same baseline run as above)\n' "ratio baseline/TraceKin, $lfl_what" "$(ratio "$b_np" "$t_lfl")" | tee -a "$REPORT"
        (( t_lfl_mem <= limit )) || { echo "  memory above the limit of $limit MB" | tee -a "$REPORT"; }
        $PY "$REPO/bench/compare_results.py" "$out/tracekin-laws-noplots/summary.json" "$out/baseline-noplots/summary.csv" "$batch/truth.json" |
            sed 's/^/  (laws imposed) /' | tee -a "$REPORT" || STATUS=1
    fi
    # Against an earlier code's outputs on the same batch (BENCH_COMPARE_WITH=DIR holding DIR/RUNSxPOINTS/summary.json
    # and its tables): every number the two share, and the per-run tables byte for byte.
    if [[ -n ${BENCH_COMPARE_WITH:-} && -f $BENCH_COMPARE_WITH/$size/summary.json ]]; then
        $PY "$REPO/bench/compare_summaries.py" "$BENCH_COMPARE_WITH/$size/summary.json" "$out/tracekin-noplots/summary.json" 2>&1 |
            tail -1 | sed 's/^/  against earlier outputs: summary.json: /' | tee -a "$REPORT" || true
        for table in runs.csv initial-rates.csv spikes.csv law-fits.csv law-parameters.csv; do
            [[ -f $BENCH_COMPARE_WITH/$size/$table ]] || continue
            cmp -s "$BENCH_COMPARE_WITH/$size/$table" "$out/tracekin-noplots/$table" && same="identical" || same="differs"
            echo "  against earlier outputs: $table $same" | tee -a "$REPORT"
        done
    fi

    if (( FIRST )); then
        timed "baseline-plots-$size" $PY "$PEER/pipeline.py" "$batch" --out "$out/baseline-plots" --jobs 2
        b_p=$WALL; b_p_mem=$PEAK
        timed "tracekin-plots-$size" "${TRACEKIN[@]}" analyse "$batch" --out "$out/tracekin-plots" --workers "$WORKERS"
        t_p=$WALL; t_p_mem=$PEAK
        printf '%-34s %8.2f s %6s MB\n' "baseline, PNGs, --jobs 2" "$b_p" "$b_p_mem" | tee -a "$REPORT"
        printf '%-34s %8.2f s %6s MB  %s runs/s\n' "TraceKin, PNGs" "$t_p" "$t_p_mem" "$(rate "$runs" "$t_p")" | tee -a "$REPORT"
        printf '%-34s %8s\n' "ratio baseline/TraceKin, PNGs" "$(ratio "$b_p" "$t_p")" | tee -a "$REPORT"
        (( t_p_mem <= limit )) || { echo "  memory above the limit of $limit MB" | tee -a "$REPORT"; }
        # The same numbers with and without plots: only runs[].plotFile may differ (null with --no-plots).
        $PY - "$out/tracekin-plots/summary.json" "$out/tracekin-noplots/summary.json" <<'CMP' ||
import json, sys
a, b = (json.load(open(f, encoding="utf-8")) for f in sys.argv[1:3])
for s in (a, b):
    for r in s.get("runs", []): r["plotFile"] = None
sys.exit(0 if a == b else 1)
CMP
            { echo "  summary.json differs between the runs with and without plots (beyond runs[].plotFile)" | tee -a "$REPORT"; STATUS=1; }
        FIRST=0
    elif [[ ${BENCH_MORE_PLOTS:-1} != 0 ]]; then
        # TraceKin alone with PNGs on the bigger batches: memory must stay bounded whatever the batch size.
        timed "tracekin-plots-$size" "${TRACEKIN[@]}" analyse "$batch" --out "$out/tracekin-plots" --workers "$WORKERS"
        printf '%-34s %8.2f s %6s MB  %s runs/s\n' "TraceKin, PNGs" "$WALL" "$PEAK" "$(rate "$runs" "$WALL")" | tee -a "$REPORT"
        (( PEAK <= limit )) || { echo "  memory above the limit of $limit MB" | tee -a "$REPORT"; }
    fi
done
echo | tee -a "$REPORT"
echo "report: $REPORT" >&2
exit $STATUS
