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
for mode in --no-plots ""; do
  for i in 1 2 3; do
    s=$(date +%s.%N)
    $tk analyse "$series" --out "$work/out" $mode >/dev/null 2>&1 || true
    e=$(date +%s.%N)
    printf 'analyse %-10s run %d: %.2f s wall\n' "${mode:-(plots)}" "$i" "$(echo "$e - $s" | bc)"
  done
done
grep -o '"chosenLaw": *"[a-z]*"' "$work/out/summary.json" || true
