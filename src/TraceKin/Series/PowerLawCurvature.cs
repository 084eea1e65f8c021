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
/// Applied Regression Analysis, 3rd ed., §2.1 and ch. 12, from memory).
/// </summary>
public static class PowerLawCurvature
{
    public static IReadOnlyList<CurvatureCheck> Check(IReadOnlyList<RunPoint> runs, double[,] lnc, IReadOnlyList<string> varied,
        TemperatureGroups groups, double[]? rateWeights, List<Warning> warnings)
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
            list.Add(new CurvatureCheck(varied[s], c.Value, c.StdError, dof, pValue, significant));
            if (significant)
                warnings.Add(new Warning("power-law-wrong-shape", varied[s], FormattableString.Invariant(
                    $"ln v0 against ln[{varied[s]}]0 is curved (c = {c.Value:G3} ± {c.StdError:G2}, p = {pValue:G2}): {(c.Value < 0 ? "the rate levels off as [" + varied[s] + "]0 grows, as in saturation" : "the rate grows faster than any single order, as with parallel paths")}; a single order n({varied[s]}) is the wrong model")));
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
