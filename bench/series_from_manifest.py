#!/usr/bin/python3
"""Write TraceKin's plan.csv and series.toml for a benchmark batch folder.

    /usr/bin/python3 bench/series_from_manifest.py BATCH_DIR
    /usr/bin/python3 bench/series_from_manifest.py BATCH_DIR --laws "pseudo-first order" --drift off --out-dir DIR

Reads BATCH_DIR/manifest.csv (file, c0_A_M, c0_B_M, temperature_C, epsilon_L_per_mol_cm, path_length_cm,
wavelength_nm) and writes BATCH_DIR/plan.csv and BATCH_DIR/series.toml so that `tracekin analyse BATCH_DIR`
sees the same runs. The absorbing species is A (consumed, coefficient -1); its concentration follows from
Beer-Lambert with the molar absorptivity and path length the generator wrote into the manifest, which must be
the same for every run because series.toml holds one value of each. Standard library only.

With --out-dir, the batch itself is left as it is: DIR gets its own plan.csv and series.toml, and each run file of
the batch as a hard link (same bytes, no copy; DIR must be on the batch's file system). --laws (repeatable, or
comma-separated) writes `[rates] laws = [...]` and --drift writes `[rates] drift`, so the same runs can be
analysed with one integrated law imposed (a like-for-like comparison with a baseline that fits one law per run).
"""
import argparse
import csv
import json
import os
import sys


def toml_string(text):
    # A TOML basic string: JSON's escapes are valid TOML escapes for the characters used here.
    return json.dumps(text, ensure_ascii=False)


def write_atomic(path, text):
    with open(path + ".tmp", "w", newline="") as f:
        f.write(text)
    os.replace(path + ".tmp", path)


def link_runs(batch, rows, out_dir):
    """Hard-link every run file of the batch into out_dir (an existing link to the same file is kept)."""
    for r in rows:
        src = os.path.join(batch, r["file"])
        dst = os.path.join(out_dir, r["file"])
        if os.path.lexists(dst):
            if os.path.samefile(src, dst):
                continue
            os.remove(dst)
        os.link(src, dst)


def main():
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0],
                                     formatter_class=argparse.RawDescriptionHelpFormatter, epilog=__doc__)
    parser.add_argument("batch")
    parser.add_argument("--laws", action="append", default=[],
                        help='integrated laws to impose, by their law-fits.csv names (e.g. "pseudo-first order")')
    parser.add_argument("--drift", choices=["auto", "off", "on"], help="rates.drift for the written series")
    parser.add_argument("--out-dir", help="write a second series folder here (run files hard-linked)")
    args = parser.parse_args()
    batch = args.batch
    laws = [law.strip() for item in args.laws for law in item.split(",") if law.strip()]
    if (laws or args.drift) and not args.out_dir:
        sys.exit("--laws and --drift need --out-dir: the batch's own series.toml keeps the default settings")
    with open(os.path.join(batch, "manifest.csv"), newline="") as f:
        rows = list(csv.DictReader(f))
    if not rows:
        sys.exit(f"{batch}/manifest.csv has no runs")
    need = {"file", "c0_A_M", "c0_B_M", "temperature_C", "epsilon_L_per_mol_cm", "path_length_cm"}
    missing = need - set(rows[0])
    if missing:
        sys.exit(f"{batch}/manifest.csv lacks column(s): {', '.join(sorted(missing))}")
    for key in ("epsilon_L_per_mol_cm", "path_length_cm"):
        values = {r[key] for r in rows}
        if len(values) != 1:
            sys.exit(f"{key} differs between runs ({', '.join(sorted(values))}); series.toml holds one value")
    eps = float(rows[0]["epsilon_L_per_mol_cm"])
    path = float(rows[0]["path_length_cm"])

    target = batch
    if args.out_dir:
        target = args.out_dir
        os.makedirs(target, exist_ok=True)
        if os.path.samefile(target, batch):
            sys.exit("--out-dir must be another folder than the batch")
        link_runs(batch, rows, target)

    lines = []
    w = csv.writer(_Collect(lines), lineterminator="\n")
    w.writerow(["run", "file", "temperature (°C)", "[A]0 (mol/L)", "[B]0 (mol/L)"])
    for r in rows:
        run = os.path.splitext(r["file"])[0]
        w.writerow([run, r["file"], r["temperature_C"], r["c0_A_M"], r["c0_B_M"]])
    write_atomic(os.path.join(target, "plan.csv"), "".join(lines))

    rates = ""
    if laws or args.drift:
        rates = "\n[rates]\n"
        if laws:
            rates += f"laws = [{', '.join(toml_string(law) for law in laws)}]\n"
        if args.drift:
            rates += f"drift = {toml_string(args.drift)}\n"
    write_atomic(os.path.join(target, "series.toml"), f"""# Written by bench/series_from_manifest.py from manifest.csv (simulated benchmark batch).
name = "{os.path.basename(os.path.normpath(target))}"

[signal]
kind = "absorbance"
channel = "absorbance"
species = "A"
coefficient = -1
molar_absorptivity = {eps!r}
path_length = {path!r}
blank = 0.0
{rates}
[model]
species = ["A", "B"]
""")
    linked = f", run files hard-linked from {batch}" if args.out_dir else ""
    print(f"plan.csv ({len(rows)} runs) and series.toml written in {target}{linked}", file=sys.stderr)


class _Collect:
    """A file-like sink for csv.writer that keeps what is written."""

    def __init__(self, parts):
        self.parts = parts

    def write(self, text):
        self.parts.append(text)


if __name__ == "__main__":
    main()
