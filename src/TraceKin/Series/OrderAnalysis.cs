using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Series;

/// <summary>
/// Reaction orders from initial rates: ln v0 = ln k + Σ n_X·ln[X]0, least squares over the runs
/// (the "method of initial rates"; Espenson, Chemical Kinetics and Reaction Mechanisms, 2nd ed., §1.3, from memory).
/// Only species whose starting concentration varies get an order; the others are folded into k and said so.
/// </summary>
public static class OrderAnalysis
{
    public static SeriesFindings Analyse(IReadOnlyList<RunPoint> runs, ModelSettings settings)
    {
        var warnings = new List<Warning>();
        var usable = new List<RunPoint>();
        foreach (var r in runs)
        {
            if (!(r.Rate > 0) || !double.IsFinite(r.Rate))
                warnings.Add(new Warning("rate-not-positive", r.RunId, $"initial rate {r.Rate:G4} is not positive; run left out of the order fit"));
            else usable.Add(r);
        }

        var allSpecies = usable.SelectMany(r => r.InitialConcentrations.Keys).Distinct().OrderBy(s => s, StringComparer.Ordinal).ToList();
        var candidates = settings.Species ?? allSpecies.ToArray();
        var varied = new List<string>();
        foreach (var sp in candidates)
        {
            var missing = usable.Where(r => !r.InitialConcentrations.TryGetValue(sp, out var v) || !(v > 0)).Select(r => r.RunId).ToList();
            if (missing.Count > 0)
            {
                warnings.Add(new Warning("species-missing", sp, $"no positive [{sp}]0 for run(s) {string.Join(", ", missing)}; no order fitted for {sp}"));
                continue;
            }
            var values = usable.Select(r => r.InitialConcentrations[sp]).ToArray();
            if (values.Max() / values.Min() - 1 < 1e-9)
            {
                warnings.Add(new Warning("species-constant", sp, $"[{sp}]0 is the same in every run; its order cannot be found and k includes [{sp}]0^n"));
                continue;
            }
            varied.Add(sp);
        }

        var pairs = PairRatios(usable, varied);
        var p = varied.Count + 1;
        if (usable.Count < p + 1 || varied.Count == 0)
        {
            warnings.Add(new Warning("too-few-runs", "series", $"{usable.Count} usable runs for {varied.Count} order(s) and k; need at least {p + 1}"));
            return new SeriesFindings([], null, null, null, [], pairs, null, usable.Select(r => r.RunId).ToArray(), warnings);
        }

        var design = new double[usable.Count, p];
        var y = new double[usable.Count];
        for (var i = 0; i < usable.Count; i++)
        {
            design[i, 0] = 1;
            for (var j = 0; j < varied.Count; j++) design[i, j + 1] = Math.Log(usable[i].InitialConcentrations[varied[j]]);
            y[i] = Math.Log(usable[i].Rate);
        }
        var names = new[] { "ln k" }.Concat(varied.Select(s => $"n({s})")).ToArray();
        var fit = LinearLeastSquares.Fit("ln v0 = ln k + Σ n·ln[X]0", names, design, y);
        if (!fit.Converged)
        {
            warnings.Add(new Warning("orders-not-separable", "series", fit.ExitDetail + "; vary each species independently of the others"));
            return new SeriesFindings([], null, null, null, [], pairs, fit, usable.Select(r => r.RunId).ToArray(), warnings);
        }

        var t = fit.T95;
        var orders = varied.Select((sp, j) =>
        {
            var prm = fit.Parameters[j + 1];
            return new Order(sp, prm.Value, prm.StdError, fit.DegreesOfFreedom, prm.Value - t * prm.StdError, prm.Value + t * prm.StdError, "log-log least squares");
        }).ToArray();
        var lnk = fit.Parameters[0];
        var k = Math.Exp(lnk.Value);
        var total = orders.Sum(o => o.Value);
        // The interval of k is the exponential of ln k's symmetric interval; its standard error by the delta method.
        var free = new RateConstant(k, k * lnk.StdError, RateConstantUnit(total), fit.DegreesOfFreedom,
            Math.Exp(lnk.Value - t * lnk.StdError), Math.Exp(lnk.Value + t * lnk.StdError), "log-log least squares (fitted orders)");

        // k extrapolated to [X]0 = 1 mol/L through free orders carries their uncertainty. When every order's interval
        // holds a simple value (a multiple of 1/2), k is refitted at those orders, as chemists report it.
        var rounded = orders.ToDictionary(o => o.Species, o => Math.Round(o.Value * 2, MidpointRounding.AwayFromZero) / 2);
        var useRounded = orders.All(o => o.Ci95Low <= rounded[o.Species] && rounded[o.Species] <= o.Ci95High);
        var atOrders = useRounded ? rounded : orders.ToDictionary(o => o.Species, o => o.Value);
        var headline = useRounded ? AtFixedOrders(usable, rounded, warnings) ?? free : free;
        if (!useRounded)
            warnings.Add(new Warning("orders-not-simple", "series", "not every order's 95 % interval contains a simple value (0, ½, 1, 3/2, 2…); k is given at the fitted orders"));

        var perRun = usable.Select(r =>
        {
            var denom = atOrders.Aggregate(1.0, (acc, o) => acc * Math.Pow(r.InitialConcentrations[o.Key], o.Value));
            return new RunRateConstant(r.RunId, r.Rate / denom, r.RateStdError / denom);
        }).ToArray();
        return new SeriesFindings(orders, headline, free, useRounded ? rounded : null, perRun, pairs, fit, usable.Select(r => r.RunId).ToArray(), warnings);
    }

    /// <summary>
    /// k at fixed orders by weighted least squares on the untransformed rates, v_i = k·x_i with x_i = Π[X]0^n and weights
    /// 1/se(v_i)² (relative; the error is scaled by the reduced chi-square), a straight line through the origin.
    /// </summary>
    private static RateConstant? AtFixedOrders(IReadOnlyList<RunPoint> runs, IReadOnlyDictionary<string, double> orders, List<Warning> warnings)
    {
        var design = new double[runs.Count, 1];
        var v = new double[runs.Count];
        var w = new double[runs.Count];
        for (var i = 0; i < runs.Count; i++)
        {
            design[i, 0] = orders.Aggregate(1.0, (acc, o) => acc * Math.Pow(runs[i].InitialConcentrations[o.Key], o.Value));
            v[i] = runs[i].Rate;
            w[i] = runs[i].RateStdError > 0 ? 1 / (runs[i].RateStdError * runs[i].RateStdError) : 1;
        }
        var fit = LinearLeastSquares.Fit("v0 = k·Π[X]0^n", ["k"], design, v, w);
        if (!fit.Converged)
        {
            warnings.Add(new Warning("rate-constant-fit-failed", "series", fit.ExitDetail));
            return null;
        }
        var k = fit.Parameters[0];
        var h = fit.T95 * k.StdError;
        var label = string.Join(", ", orders.Select(o => $"{o.Key} {o.Value:0.#}"));
        return new RateConstant(k.Value, k.StdError, RateConstantUnit(orders.Values.Sum()), fit.DegreesOfFreedom, k.Value - h, k.Value + h,
            $"weighted least squares at rounded orders ({label})");
    }

    /// <summary>Unit of k for a total order n: (mol/L)^(1−n)·s⁻¹, written plainly.</summary>
    public static string RateConstantUnit(double totalOrder)
    {
        var m = Math.Round(totalOrder * 2) / 2;
        var e = 1 - m;
        if (Math.Abs(totalOrder - m) > 0.25) return $"(mol/L)^{e:0.##}/s";
        return e switch
        {
            0 => "1/s",
            1 => "mol/(L·s)",
            -1 => "L/(mol·s)",
            _ when e < 0 => $"L^{-e:0.#}/(mol^{-e:0.#}·s)",
            _ => $"mol^{e:0.#}/(L^{e:0.#}·s)",
        };
    }

    /// <summary>Pairs of runs that differ only in one varied species: n = ln(v2/v1)/ln(c2/c1), error propagated from both rates.</summary>
    private static IReadOnlyList<PairRatio> PairRatios(IReadOnlyList<RunPoint> runs, IReadOnlyList<string> varied)
    {
        var list = new List<PairRatio>();
        for (var a = 0; a < runs.Count; a++)
            for (var b = a + 1; b < runs.Count; b++)
            {
                string? differing = null;
                var ok = true;
                foreach (var sp in varied)
                {
                    var ca = runs[a].InitialConcentrations[sp];
                    var cb = runs[b].InitialConcentrations[sp];
                    if (Math.Abs(ca - cb) <= 1e-9 * Math.Max(ca, cb)) continue;
                    if (differing is not null) { ok = false; break; }
                    differing = sp;
                }
                if (!ok || differing is null) continue;
                if (runs[a].TemperatureK is { } ta && runs[b].TemperatureK is { } tb && Math.Abs(ta - tb) > 0.05) continue;
                var cr = runs[b].InitialConcentrations[differing] / runs[a].InitialConcentrations[differing];
                var rr = runs[b].Rate / runs[a].Rate;
                var lnc = Math.Log(cr);
                var rel = Math.Sqrt(Math.Pow(runs[a].RateStdError / runs[a].Rate, 2) + Math.Pow(runs[b].RateStdError / runs[b].Rate, 2));
                list.Add(new PairRatio(runs[a].RunId, runs[b].RunId, differing, cr, rr, Math.Log(rr) / lnc, rel / Math.Abs(lnc)));
            }
        return list;
    }
}
