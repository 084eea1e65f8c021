#!/usr/bin/env bash
# One 384-well plate × 100 readings analysed end to end (bench/README.md, "One plate").
# Writes an invented plate series (16 substrate levels × 22 replicate wells + 32 no-enzyme blanks, every sample
# subtracting the blanks' mean) with `tracekin simulate`, then times `tracekin analyse` on it, with and without plots.
# Usage: bench/plate384.sh [TRACEKIN]   (default: dotnet run -c Release --no-build --project src/TraceKin.Cli --)
set -euo pipefail
root=$(cd "$(dirname "$0")/.." && pwd)
tk=${1:-}
if [[ -z "$tk" ]]; then
  dotnet build "$root/src/TraceKin.Cli" -c Release >/dev/null
  tk="$root/src/TraceKin.Cli/bin/Release/net10.0/tracekin"
fi
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
series="$work/plate384"
mkdir -p "$series"
cat > "$series/series.toml" <<'TOML'
[signal]
kind = "absorbance"
species = "P"
coefficient = 1
molar_absorptivity = 18000
path_length = 0.3
blank = 0

[rates]
limiting_reactant = "S"   # one P from each S: each well's end level is its [S]0 (docs/methods.md)

[model]
species = ["S"]
laws = ["power", "saturation"]
substrate = "S"
TOML
python3 - "$series/plan.csv" <<'PY'
import sys
rows = "ABCDEFGHIJKLMNOP"
levels = [0.025 * 1.4 ** i for i in range(16)]
with open(sys.argv[1], "w") as f:
    f.write("run,file,channel,[S]0 (mmol/L),role,group,subtract\n")
    for r, letter in enumerate(rows):
        for c in range(1, 25):
            well = f"{letter}{c}"
            if c in (23, 24):
                f.write(f"{well},plate.csv,{well},{levels[r]:.5g},blank,none,\n")
            else:
                f.write(f"{well},plate.csv,{well},{levels[r]:.5g},sample,,none\n")
PY
$tk simulate "$series" -k 1e-7 --saturation S=0.5 --coefficient S=-1 --coefficient P=1 --duration 198 --interval 2 \
    --noise 0.001 --plate 384 --seed 5 --force 2>/dev/null
echo "plate: $(grep -c '^time' "$series/plate.csv") readings, $(wc -c < "$series/plate.csv") bytes, $(($(wc -l < "$series/plan.csv") - 1)) runs"
# The VM is shared: the load average says how much of its two cores this process could have had, and the CPU time
# (user + sys, from /usr/bin/time when installed) what the analysis itself cost.
echo "load average before: $(cut -d' ' -f1-3 /proc/loadavg)"
for mode in --no-plots ""; do
  for i in 1 2 3; do
    s=$(date +%s.%N)
    if [[ -x /usr/bin/time ]]; then
      cpu=$(/usr/bin/time -f '%U %S' $tk analyse "$series" --out "$work/out" $mode 2>&1 >/dev/null | tail -1) || true
    else
      $tk analyse "$series" --out "$work/out" $mode >/dev/null 2>&1 || true
      cpu=""
    fi
    e=$(date +%s.%N)
    printf 'analyse %-10s run %d: %.2f s wall' "${mode:-(plots)}" "$i" "$(echo "$e - $s" | bc)"
    if [[ -n "$cpu" ]]; then printf ', %.2f s CPU' "$(echo "$cpu" | awk '{print $1 + $2}')"; fi
    printf '; %s\n' "$(grep -o 'timing: .*' "$work/out/tracekin.log" 2>/dev/null || true)"
  done
done
echo "load average after: $(cut -d' ' -f1-3 /proc/loadavg)"
grep -o '"chosenLaw": *"[a-z]*"' "$work/out/summary.json" || true
