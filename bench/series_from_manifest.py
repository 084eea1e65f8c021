#!/usr/bin/python3
"""Write TraceKin's plan.csv and series.toml for a benchmark batch folder.

    /usr/bin/python3 bench/series_from_manifest.py BATCH_DIR

Reads BATCH_DIR/manifest.csv (file, c0_A_M, c0_B_M, temperature_C, epsilon_L_per_mol_cm, path_length_cm,
wavelength_nm) and writes BATCH_DIR/plan.csv and BATCH_DIR/series.toml so that `tracekin analyse BATCH_DIR`
sees the same runs. The absorbing species is A (consumed, coefficient -1); its concentration follows from
Beer-Lambert with the molar absorptivity and path length the generator wrote into the manifest, which must be
the same for every run because series.toml holds one value of each. Standard library only.
"""
import csv
import os
import sys


def main():
    if len(sys.argv) != 2:
        sys.exit(__doc__)
    batch = sys.argv[1]
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

    plan = os.path.join(batch, "plan.csv")
    with open(plan + ".tmp", "w", newline="") as f:
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["run", "file", "temperature (°C)", "[A]0 (mol/L)", "[B]0 (mol/L)"])
        for r in rows:
            run = os.path.splitext(r["file"])[0]
            w.writerow([run, r["file"], r["temperature_C"], r["c0_A_M"], r["c0_B_M"]])
    os.replace(plan + ".tmp", plan)

    toml = os.path.join(batch, "series.toml")
    with open(toml + ".tmp", "w") as f:
        f.write(f"""# Written by bench/series_from_manifest.py from manifest.csv (simulated benchmark batch).
name = "{os.path.basename(os.path.normpath(batch))}"

[signal]
kind = "absorbance"
channel = "absorbance"
species = "A"
coefficient = -1
molar_absorptivity = {eps!r}
path_length = {path!r}
blank = 0.0

[model]
species = ["A", "B"]
""")
    os.replace(toml + ".tmp", toml)
    print(f"plan.csv ({len(rows)} runs) and series.toml written in {batch}", file=sys.stderr)


if __name__ == "__main__":
    main()
