using MathNet.Numerics.Distributions;
using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Series;

/// <summary>
/// Tests the shape of the power law for each varied species X with at least three distinct levels: the log–log model
/// gains a term c·(ln[X]0 − mean)², fitted by least squares with weights (v0/se)² (the delta-method variance of ln v0).
/// A power law is a straight line in these coordinates, so a c that differs from zero at the 5 % level (two-sided
/// Student t) means the power law is the wrong model: c &lt; 0 is a rate that levels off (saturation), c &gt; 0 one that
/// grows faster than any single order (parallel paths). A lack-of-fit test by added curvature (Draper &amp; Smith,
/// Applied Regression Analysis, 3rd ed., §2.1 and ch. 12, from memory). With many runs a tiny curvature is
/// significant, so the warning needs the departure to matter too: the local order must change across the measured
/// range by more than the practical margin on orders.
/// </summary>
internal static class PowerLawCurvature
{
    public static IReadOnlyList<CurvatureCheck> Check(IReadOnlyList<RunPoint> runs, double[,] lnc, IReadOnlyList<string> varied,
        TemperatureGroups groups, double[]? rateWeights, List<Warning> warnings, double margin = OrderEquivalence.DefaultMargin)
    {
        int n = runs.Count, g = groups.Count, m = varied.Count;
        var list = new List<CurvatureCheck>();
        for (var s = 0; s < m; s++)
        {
            var levels = Enumerable.Range(0, n).Select(i => lnc[i, s]).ToArray();
            if (DistinctLevels(levels) < 3 || n <= g + m + 1) continue;
            var mean = levels.Average();
            var design = new double[n, g + m + 1];
            var y = new double[n];
            var w = rateWeights is null ? null : new double[n];
            for (var i = 0; i < n; i++)
            {
                design[i, groups.Index[i]] = 1;
                for (var j = 0; j < m; j++) design[i, g + j] = lnc[i, j];
                var u = lnc[i, s] - mean;
                design[i, g + m] = u * u;
                y[i] = Math.Log(runs[i].Rate);
                if (w is not null) w[i] = runs[i].Rate * runs[i].Rate * rateWeights![i];
            }
            var names = Enumerable.Range(0, g).Select(k => $"a{k}").Concat(varied.Select(v => $"n({v})")).Append("c").ToArray();
            var fit = LinearLeastSquares.Fit("ln v0 = ln k + Σ n·ln[X]0 + c·(ln[X]0 − mean)²", names, design, y, w);
            if (!fit.Converged || !double.IsFinite(fit.Parameters[^1].StdError)) continue;
            var c = fit.Parameters[^1];
            var dof = fit.DegreesOfFreedom;
            var tStat = c.StdError > 0 ? c.Value / c.StdError : double.PositiveInfinity;
            var pValue = c.StdError > 0 ? 2 * (1 - StudentT.CDF(0, 1, dof, Math.Abs(tStat))) : 0;
            var significant = pValue < 0.05;
            // The local order d ln v0/d ln[X]0 = n + 2c·(ln[X]0 − mean) at the ends of the measured range: the departure in
            // the trade's terms. Flagged only when it is both significant and larger than the practical margin.
            var order = fit.Parameters[g + s].Value;
            var (lmin, lmax) = (levels.Min(), levels.Max());
            var atLow = order + 2 * c.Value * (lmin - mean);
            var atHigh = order + 2 * c.Value * (lmax - mean);
            var relevant = significant && Math.Abs(atHigh - atLow) > margin;
            list.Add(new CurvatureCheck(varied[s], c.Value, c.StdError, dof, pValue, significant)
            {
                LocalOrderAtLowest = atLow, LocalOrderAtHighest = atHigh, Relevant = relevant,
            });
            if (relevant)
                warnings.Add(new Warning("power-law-wrong-shape", varied[s], FormattableString.Invariant(
                    $"the local order in {varied[s]} runs from {atLow:0.00} at the lowest [{varied[s]}]0 to {atHigh:0.00} at the highest (a change of {Math.Abs(atHigh - atLow):0.00}, more than the margin ±{margin:0.###}; curvature of ln v0 against ln[{varied[s]}]0 c = {c.Value:G3} ± {c.StdError:G2}, p = {pValue:G2}): {(c.Value < 0 ? "the rate levels off as [" + varied[s] + "]0 grows, as in saturation" : "the rate grows faster than any single order, as with parallel paths")}; a single order n({varied[s]}) does not describe the whole range")));
        }
        return list;
    }

    private static int DistinctLevels(double[] x)
    {
        var sorted = x.Order().ToArray();
        var count = 1;
        for (var i = 1; i < sorted.Length; i++)
            if (sorted[i] - sorted[i - 1] > 1e-9) count++;
        return count;
    }
}
