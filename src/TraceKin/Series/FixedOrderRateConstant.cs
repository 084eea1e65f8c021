using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Series;

/// <summary>
/// k at fixed orders by weighted least squares on the untransformed rates, v_i = k·x_i with x_i = Π[X]0^n and weights
/// 1/se(v_i)² (relative; the error is scaled by the reduced chi-square), a straight line through the origin
/// (Draper &amp; Smith, Applied Regression Analysis, 3rd ed., §5.2). A single run gives k = v/x with se(v)/x and no
/// interval (0 degrees of freedom).
/// </summary>
internal static class FixedOrderRateConstant
{
    public static RateConstant? Fit(IReadOnlyList<RunPoint> runs, IReadOnlyDictionary<string, double> orders, List<Warning> warnings, string kind = "rounded", string where = "series")
    {
        var unit = OrderAnalysis.RateConstantUnit(orders.Values.Sum());
        var label = string.Join(", ", orders.OrderBy(o => o.Key, StringComparer.Ordinal).Select(o => FormattableString.Invariant($"{o.Key} {o.Value:0.###}")));
        double X(RunPoint r) => orders.Aggregate(1.0, (acc, o) => acc * Math.Pow(r.InitialConcentrations[o.Key], o.Value));
        if (runs.Count == 1)
        {
            var x = X(runs[0]);
            return new RateConstant(runs[0].Rate / x, runs[0].RateStdError / x, unit, 0, double.NaN, double.NaN, $"one run: v0 / Π[X]0^n ({label})");
        }
        var design = new double[runs.Count, 1];
        var v = new double[runs.Count];
        var w = OrderAnalysis.RateWeights(runs);
        for (var i = 0; i < runs.Count; i++)
        {
            design[i, 0] = X(runs[i]);
            v[i] = runs[i].Rate;
        }
        var fit = LinearLeastSquares.Fit("v0 = k·Π[X]0^n", ["k"], design, v, w);
        if (!fit.Converged)
        {
            warnings.Add(new Warning("rate-constant-fit-failed", where, fit.ExitDetail));
            return null;
        }
        var k = fit.Parameters[0];
        var h = fit.T95 * k.StdError;
        var result = new RateConstant(k.Value, k.StdError, unit, fit.DegreesOfFreedom, k.Value - h, k.Value + h,
            $"{(w is null ? "" : "weighted ")}least squares at {kind} orders ({label})");
        // The per-run uncertainty of which integrated law holds, carried as a systematic part (LawChoiceUncertainty).
        var jac = new double[runs.Count];
        for (var i = 0; i < runs.Count; i++) jac[i] = design[i, 0];
        var sys = LawChoiceUncertainty.Propagate(jac, runs.Count, 1, w, runs.Select(r => r.RateSystematicError).ToArray());
        return sys is null ? result : OrderAnalysis.Widen(result, sys[0], fit.T95);
    }
}
