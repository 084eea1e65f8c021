#!/usr/bin/env bash
# Packs the `tracekin` .NET tool (TraceKin.Tool), installs it into a throw-away tool path, and runs the installed
# command: --version, then analyse on the bundled sample, checking that every output file appears.
# Usage: .ci/tool-install-check.sh        (from anywhere; needs only the .NET SDK)
set -euo pipefail
cd "$(dirname "$0")/.."
export DOTNET_CLI_TELEMETRY_OPTOUT=1 DOTNET_NOLOGO=1

tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT

echo "tool check: packing"
dotnet pack src/TraceKin.Cli -c Release -nologo -v q -o "$tmp/nupkg"
pkg=$(ls "$tmp/nupkg"/TraceKin.Tool.*.nupkg | head -n 1)
version=$(basename "$pkg" .nupkg)
version=${version#TraceKin.Tool.}

echo "tool check: installing TraceKin.Tool $version into $tmp/tools"
# A private package folder, so a package of the same version cached by an earlier run is not reused.
NUGET_PACKAGES="$tmp/packages" dotnet tool install --tool-path "$tmp/tools" --add-source "$tmp/nupkg" --version "$version" TraceKin.Tool

echo "tool check: running"
reported=$("$tmp/tools/tracekin" --version)
case "$reported" in
  "$version"|"$version"+*) echo "tracekin --version: $reported" ;;
  *) echo "tool check: tracekin --version printed '$reported', expected $version" >&2; exit 1 ;;
esac
set +e
"$tmp/tools/tracekin" analyse sample-traces/violet-complex-acid --out "$tmp/out" 2>"$tmp/analyse.log"
code=$?
set -e
if [ "$code" != 0 ]; then
  cat "$tmp/analyse.log" >&2
  echo "tool check: tracekin analyse exited $code" >&2
  exit 1
fi
for f in summary.json runs.csv report.html plots/orders.png plots/run-R1.png; do
  if [ ! -s "$tmp/out/$f" ]; then echo "tool check: $f missing after analyse" >&2; exit 1; fi
done
tail -n 1 "$tmp/analyse.log"
echo "tool check: ok"
