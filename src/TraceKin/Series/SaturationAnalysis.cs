using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Series;

/// <summary>
/// Fits the saturation law (<see cref="SaturationModel"/>) on the untransformed initial rates with the same weights as the
/// power law, and compares the two by AICc (Burnham &amp; Anderson, Model Selection and Multimodel Inference, 2nd ed.,
/// 2002, §2.4 and §2.9: evidence ratio exp(ΔAICc/2)). Both fits see the same rates and weights, so their AICc compare.
/// The substrate is the configured one, or each varied species with ≥ 3 levels in turn (the best AICc is kept).
/// </summary>
internal static class SaturationAnalysis
{
    /// <summary>Km beyond this multiple of the largest [S]0 means saturation was never approached in the series.</summary>
    public const double KmBeyondRange = 10;

    /// <summary>The plain hyperbola v = Vmax·x/(Km + x), fitted by (weighted) Levenberg–Marquardt from the data's own start.</summary>
    public static FitResult FitHyperbola(double[] x, double[] v, double[]? weights = null)
    {
        var model = SaturationModel.Hyperbola(x);
        return NonlinearLeastSquares.Fit(model, v, model.Guess(v, []), new FitOptions { Weights = weights });
    }

    public static SaturationFindings? Analyse(IReadOnlyList<RunPoint> runs, IReadOnlyList<string> varied, IReadOnlyDictionary<string, double> powerOrders,
        FitResult power, double[]? weights, ModelSettings settings, List<Warning> warnings)
    {
        var rates = runs.Select(r => r.Rate).ToArray();
        IEnumerable<string> substrates;
        if (settings.Substrate is { } chosen)
        {
            if (!varied.Contains(chosen))
            {
                warnings.Add(new Warning("saturation-not-fitted", chosen, $"[model] substrate = \"{chosen}\" is not a species whose starting concentration varies in this series"));
                return null;
            }
            substrates = [chosen];
        }
        else substrates = varied;

        (string S, FitResult Fit, string[] Co)? best = null;
        var failures = new List<string>();
        var runaway = 0;
        foreach (var s in substrates)
        {
            var x = runs.Select(r => r.InitialConcentrations[s]).ToArray();
            if (x.Distinct().Count() < 3)
            {
                failures.Add($"{s}: fewer than three distinct [{s}]0 levels");
                continue;
            }
            var co = varied.Where(v => v != s).ToArray();
            var lny = new double[runs.Count, co.Length];
            for (var i = 0; i < runs.Count; i++)
                for (var j = 0; j < co.Length; j++) lny[i, j] = Math.Log(runs[i].InitialConcentrations[co[j]]);
            var model = new SaturationModel(x, lny, co);
            var start = model.Guess(rates, co.Select(c => powerOrders[c]).ToArray());
            var lower = new double[start.Length];
            Array.Fill(lower, double.NegativeInfinity);
            lower[0] = 0;
            lower[1] = 0;
            // Replicate runs (equal [S]0 and co-reactant levels) fitted as one point each: the same fit, exactly (GroupedLeastSquares).
            var fit = GroupedLeastSquares.Fit(model, rates, start, new FitOptions { Weights = weights, Lower = lower });
            if (!fit.Converged || fit.Parameters.Any(q => !double.IsFinite(q.StdError)))
            {
                // Km running off beyond the data is what a series without saturation does: no sign of saturation.
                if (fit.Parameters[1].Value > KmBeyondRange * x.Max()) runaway++;
                failures.Add($"{s}: {fit.Exit} ({fit.ExitDetail})");
                continue;
            }
            if (best is null || fit.AicC < best.Value.Fit.AicC) best = (s, fit, co);
        }
        if (best is not { } b)
        {
            if (runaway == failures.Count && settings.Substrate is null) return null;
            warnings.Add(new Warning("saturation-fit-failed", "series", "the saturation law could not be fitted: " + string.Join("; ", failures)));
            return null;
        }

        var f = b.Fit;
        var dof = f.DegreesOfFreedom;
        var vUnit = OrderAnalysis.RateConstantUnit(b.Co.Sum(c => f.Value($"n({c})")));
        var vmax = Estimate.Symmetric("Vmax", f.Parameters[0].Value, f.Parameters[0].StdError, vUnit, dof, "nonlinear least squares on v0");
        var km = Estimate.Symmetric("Km", f.Parameters[1].Value, f.Parameters[1].StdError, "mol/L", dof, "nonlinear least squares on v0");
        var t = f.T95;
        var coOrders = b.Co.Select((c, j) =>
        {
            var q = f.Parameters[2 + j];
            return new Order(c, q.Value, q.StdError, dof, q.Value - t * q.StdError, q.Value + t * q.StdError, "saturation law, power in the co-reactant");
        }).ToArray();

        var delta = power.AicC - f.AicC;
        var preferred = delta > 0 ? ModelSettings.Saturation : ModelSettings.Power;
        var ratio = Math.Exp(Math.Abs(delta) / 2);
        var maxS = runs.Max(r => r.InitialConcentrations[b.S]);
        if (km.Value > KmBeyondRange * maxS)
        {
            // Only worth a warning when AICc alone would have picked the saturation law by a margin that counts:
            // models within 2 AICc units of each other both have substantial support (Burnham & Anderson 2002, §2.6).
            if (preferred == ModelSettings.Saturation && delta > 2)
                warnings.Add(new Warning("saturation-beyond-range", b.S, FormattableString.Invariant(
                    $"the fitted Km ({km.Value:G3} mol/L) lies far above the largest [{b.S}]0 ({maxS:G3} mol/L): the series never approaches saturation, so Vmax and Km are not determined; the power law is kept")));
            preferred = ModelSettings.Power;
        }
        else if (preferred == ModelSettings.Saturation)
            warnings.Add(new Warning("saturation-preferred", b.S, FormattableString.Invariant(
                $"the saturation law in [{b.S}]0 fits better than the power law (AICc {f.AicC:F2} against {power.AicC:F2}; evidence ratio {ratio:G3}); the power-law orders are shown for comparison only")));

        return new SaturationFindings(b.S, vmax, km, coOrders, f, power.AicC, f.AicC, ratio, preferred, DoubleReciprocalLine(runs, b.S, b.Co, coOrders));
    }

    /// <summary>1/v' = 1/Vmax + (Km/Vmax)·(1/[S]0) with v' the rate divided by the co-reactant terms; unweighted, display only.</summary>
    private static DoubleReciprocal? DoubleReciprocalLine(IReadOnlyList<RunPoint> runs, string s, string[] co, Order[] coOrders)
    {
        var x = new double[runs.Count];
        var y = new double[runs.Count];
        for (var i = 0; i < runs.Count; i++)
        {
            var adj = 1.0;
            for (var j = 0; j < co.Length; j++) adj *= Math.Pow(runs[i].InitialConcentrations[co[j]], coOrders[j].Value);
            x[i] = 1 / runs[i].InitialConcentrations[s];
            y[i] = adj / runs[i].Rate;
        }
        var line = LinearLeastSquares.Line(x, y);
        if (!line.Converged || !(line.Parameters[0].Value > 0)) return null;
        var vmax = 1 / line.Parameters[0].Value;
        return new DoubleReciprocal(vmax, line.Parameters[1].Value * vmax, line);
    }
}
