#!/usr/bin/python3
"""Check that TraceKin and the scripted baseline reach the same orders and rate constant on one batch.

    /usr/bin/python3 bench/compare_results.py TRACEKIN_OUT/summary.json BASELINE_OUT/summary.csv BATCH/truth.json

Agreement means, for each order and for k: TraceKin's estimate lies inside the baseline's 95 % interval
(estimate ± 1.96 SE; the baseline reports a standard error only) or the baseline's estimate lies inside
TraceKin's 95 % interval; orders must also round to the same simple order (multiple of 1/2). With thousands of
runs the intervals become so narrow that the two methods' small systematic differences (TraceKin: local
polynomial initial rates; baseline: integrated-law fits with an offset) exceed them; such a result is reported as
"agree within 1 %, intervals apart" rather than hidden. The generator's true values are printed beside.
Exit status 0 when all agree (either way), 1 otherwise. Standard library only.
"""
import csv
import json
import sys


def main():
    if len(sys.argv) != 4:
        sys.exit(__doc__)
    with open(sys.argv[1], encoding="utf-8") as f:
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
        within = lo <= bv <= hi or abs(t["value"] - bv) <= 1.96 * bse
        close = abs(t["value"] - bv) <= 0.01 * max(abs(bv), 1e-300)
        same_simple = round(2 * bv) == round(2 * t["value"])
        verdict = ("agree" if within else "agree within 1 %, intervals apart" if close else "DISAGREE") if same_simple else "DISAGREE"
        ok &= verdict != "DISAGREE"
        covers = "covers the truth" if lo <= true_order <= hi else "MISSES the truth"
        lines.append(f"order {sp}: TraceKin {t['value']:.4f} [{lo:.4f}, {hi:.4f}] ({covers})  baseline {bv:.4f} ± {1.96 * bse:.4f}"
                     f"  true {true_order}  {verdict}")

    k = tk.get("rateConstant")
    bk = float(base["k_mean"]["value"])
    bk_sem = float(base["k_sem"]["value"])
    bk_ir = float(base["k_from_initial_rates_mean"]["value"])
    if k is None:
        lines.append("k: TraceKin gave no rate constant")
        ok = False
    else:
        lo, hi = k["ci95"]
        within = lo <= bk <= hi or abs(k["value"] - bk) <= 1.96 * bk_sem
        close = abs(k["value"] - bk) <= 0.01 * abs(bk)
        verdict = "agree" if within else "agree within 1 %, intervals apart" if close else "DISAGREE"
        ok &= verdict != "DISAGREE"
        covers = "covers the true k" if lo <= truth["k"] <= hi else "MISSES the true k"
        lines.append(f"k: TraceKin {k['value']:.6g} [{lo:.6g}, {hi:.6g}] {k['unit']} ({covers}; law-choice part {k.get('lawChoiceStdError', 0):.2g})"
                     f"  baseline {bk:.4g} ± {1.96 * bk_sem:.2g}"
                     f" (integrated fits; {bk_ir:.4g} from its initial rates)  true {truth['k']}  {verdict}")
    for v in (tk.get("powerLaw") or {}).get("orderVerdicts", []):
        lines.append(f"verdict: {v['text']}")
    flagged = sorted({w["code"] for w in tk.get("warnings", []) if w["code"] in ("power-law-wrong-shape", "orders-not-simple")})
    lines.append("law-adequacy warnings: " + (", ".join(flagged) if flagged else "none"))
    print("\n".join(lines))
    print("results agree" if ok else "RESULTS DISAGREE")
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
