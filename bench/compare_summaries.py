#!/usr/bin/python3
"""Compare two summary.json files number by number (standard library only).

    /usr/bin/python3 bench/compare_summaries.py OLD/summary.json NEW/summary.json [--rel TOL]

Everything both files carry must be equal. With --rel, numbers that differ by at most TOL relative are listed apart
(with the largest relative difference) and do not count as differences: for a change that reorders sums.
The older layout's pairRatios[] (every listed pair) is compared through its first 20, the newer pairRatiosFirst[]
(the rest is in pair-ratios.csv). Per run, the newer layout keeps the chosen law only (chosenLaw) and a
spike count; the older one listed every fit (fits[]), every estimator and every spike: those are compared through the
chosen fit and the counts, and fields only one side has are listed, not treated as differences. Exit 1 on a difference.
"""
import json
import sys


def flat(x, path="", out=None):
    out = {} if out is None else out
    if isinstance(x, dict):
        for k, v in x.items():
            flat(v, f"{path}.{k}" if path else k, out)
    elif isinstance(x, list):
        for i, v in enumerate(x):
            flat(v, f"{path}[{i}]", out)
    else:
        out[path] = x
    return out


def legacy_run(r):
    """An old-layout run in the new layout."""
    r = dict(r)
    fits = r.pop("fits", None)
    r.pop("initialRateEstimates", None)
    if fits is not None:
        chosen = next((f for f in fits if f.get("chosen")), None)
        r["chosenLaw"] = None if chosen is None else {
            "model": chosen["model"], "drift": chosen["drift"], "converged": chosen["converged"],
            "akaikeWeight": chosen["akaikeWeight"], "rateConstant": chosen["rateConstant"],
            "halfLife": chosen["halfLife"], "halfLifeStdError": chosen["halfLifeStdError"], "lackOfFit": chosen["lackOfFit"]}
    if "spikes" in r:
        r["spikeCount"] = len(r.pop("spikes"))
    return r


def relative(x, y):
    if isinstance(x, bool) or isinstance(y, bool) or not isinstance(x, (int, float)) or not isinstance(y, (int, float)):
        return None
    scale = max(abs(x), abs(y))
    return 0.0 if scale == 0 else abs(x - y) / scale


def main():
    args = sys.argv[1:]
    tol = None
    if "--rel" in args:
        i = args.index("--rel")
        tol = float(args[i + 1])
        del args[i:i + 2]
    old, new = (json.load(open(p, encoding="utf-8")) for p in args[:2])
    old["runs"] = [legacy_run(r) for r in old.get("runs", [])]
    if "pairRatios" in old and "pairRatiosFirst" in new:
        old["pairRatiosFirst"] = old.pop("pairRatios")[:len(new["pairRatiosFirst"])]
    a, b = flat(old), flat(new)
    diff = [k for k in a.keys() & b.keys() if a[k] != b[k]]
    if tol is not None:
        close = [(k, relative(a[k], b[k])) for k in diff]
        close = [(k, r) for k, r in close if r is not None and r <= tol]
        if close:
            worst = max(close, key=lambda kr: kr[1])
            print(f"{len(close)} value(s) differ by at most {tol:g} relative (largest {worst[1]:.2g}: {worst[0]})")
            for k, r in sorted(close)[:40]:
                print(f"close: {k}: {a[k]!r} -> {b[k]!r} ({r:.2g})")
        near = {k for k, _ in close}
        diff = [k for k in diff if k not in near]
    only_old = sorted(a.keys() - b.keys())
    only_new = sorted(b.keys() - a.keys())
    for k in sorted(diff)[:40]:
        print(f"differs: {k}: {a[k]!r} -> {b[k]!r}")
    if only_old: print(f"only in the first: {len(only_old)} value(s), e.g. {only_old[:5]}")
    if only_new: print(f"only in the second: {len(only_new)} value(s), e.g. {only_new[:5]}")
    print(f"{len(a.keys() & b.keys())} values in both, {len(diff)} differ")
    sys.exit(1 if diff else 0)


if __name__ == "__main__":
    main()
