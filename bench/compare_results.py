#!/usr/bin/python3
"""Check that TraceKin and the scripted baseline reach the same orders and rate constant on one batch.

    /usr/bin/python3 bench/compare_results.py TRACEKIN_OUT/summary.json BASELINE_OUT/summary.csv BATCH/truth.json

Agreement means, for each order and for k: TraceKin's estimate lies inside the baseline's 95 % interval
(estimate ± 1.96 SE; the baseline reports a standard error only) or the baseline's estimate lies inside
TraceKin's 95 % interval, and both round to the same simple order (multiple of 1/2). The generator's true
values are printed beside, for information. Exit status 0 when all agree, 1 otherwise. Standard library only.
"""
import csv
import json
import sys


def main():
    if len(sys.argv) != 4:
        sys.exit(__doc__)
    with open(sys.argv[1]) as f:
        tk = json.load(f)
    with open(sys.argv[2], newline="") as f:
        base = {r["quantity"]: r for r in csv.DictReader(f)}
    with open(sys.argv[3]) as f:
        truth = json.load(f)

    ok = True
    lines = []
    tk_orders = {o["species"]: o for o in tk["orders"]}
    for sp, true_order in sorted(truth["orders"].items()):
        b = base.get(f"order_{sp}")
        t = tk_orders.get(sp)
        if b is None or t is None:
            lines.append(f"order {sp}: missing (baseline {'yes' if b else 'no'}, TraceKin {'yes' if t else 'no'})")
            ok = False
            continue
        bv = float(b["value"])
        bse = float(b["note"].split()[-1])  # "SE 0.0123"
        lo, hi = t["ci95"]
        agree = (lo <= bv <= hi or abs(t["value"] - bv) <= 1.96 * bse) and round(2 * bv) == round(2 * t["value"])
        ok &= agree
        lines.append(f"order {sp}: TraceKin {t['value']:.4f} [{lo:.4f}, {hi:.4f}]  baseline {bv:.4f} ± {1.96 * bse:.4f}"
                     f"  true {true_order}  {'agree' if agree else 'DISAGREE'}")

    k = tk.get("rateConstant")
    bk = float(base["k_mean"]["value"])
    bk_sem = float(base["k_sem"]["value"])
    bk_ir = float(base["k_from_initial_rates_mean"]["value"])
    if k is None:
        lines.append("k: TraceKin gave no rate constant")
        ok = False
    else:
        lo, hi = k["ci95"]
        agree = lo <= bk <= hi or abs(k["value"] - bk) <= 1.96 * bk_sem or lo <= bk_ir <= hi
        ok &= agree
        lines.append(f"k: TraceKin {k['value']:.4g} [{lo:.4g}, {hi:.4g}] {k['unit']}  baseline {bk:.4g} ± {1.96 * bk_sem:.2g}"
                     f" (integrated fits), {bk_ir:.4g} (initial rates)  true {truth['k']}  {'agree' if agree else 'DISAGREE'}")
    print("\n".join(lines))
    print("results agree" if ok else "RESULTS DISAGREE")
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
