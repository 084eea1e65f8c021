using TraceKin.Fitting;
using TraceKin.Traces;

namespace TraceKin.Series;

/// <summary>
/// The global progress-curve fit: <see cref="ProgressCurveModel"/> fitted to the concentration traces of all runs at
/// once by Levenberg–Marquardt (finite-difference Jacobian, equal weights), started from the initial-rate orders and k.
/// The followed species always gets an order (its depletion shapes each curve), as does every species whose [X]0 varies.
/// Traces longer than <see cref="MaxPointsPerRun"/> are thinned to every m-th point so all runs weigh alike.
/// </summary>
internal static class GlobalFit
{
    public const int MaxPointsPerRun = 300;

    public static GlobalFitFindings? Analyse(IReadOnlyList<RunPoint> runs, IReadOnlyList<string> varied, TemperatureGroups groups,
        IReadOnlyDictionary<string, double> startOrders, FitResult? power, List<Warning> warnings)
    {
        if (runs.Any(r => r.Trace is null))
        {
            warnings.Add(new Warning("global-fit-not-done", "series", "not every run has a concentration trace; the global progress-curve fit needs them all"));
            return null;
        }
        var followed = runs.Select(r => r.Trace!.Species).Distinct().ToList();
        if (followed.Count != 1 || runs.Any(r => !r.InitialConcentrations.ContainsKey(followed[0])))
        {
            warnings.Add(new Warning("global-fit-not-done", "series", $"the global fit needs one followed species with its [X]0 in every run (found {string.Join(", ", followed)})"));
            return null;
        }
        var species = varied.Contains(followed[0]) ? varied.ToList() : varied.Append(followed[0]).ToList();
        var thinned = runs.Select(r => r with { Trace = Thin(r.Trace!) }).ToList();
        var model = new ProgressCurveModel(thinned, groups.Index, groups.Names, species);
        var start = new double[groups.Count + species.Count];
        for (var g = 0; g < groups.Count; g++)
            start[g] = power is { Converged: true } && power.Parameters.Count > g ? power.Parameters[g].Value : 1;
        for (var j = 0; j < species.Count; j++) start[groups.Count + j] = startOrders.GetValueOrDefault(species[j], 1);
        var lower = Enumerable.Repeat(double.NegativeInfinity, start.Length).ToArray();
        for (var g = 0; g < groups.Count; g++) lower[g] = 0;
        var fit = NonlinearLeastSquares.Fit(model, model.Observed, start, new FitOptions { Lower = lower, MaxIterations = 200, Tolerance = 1e-10 });
        if (!fit.Converged || fit.Parameters.Any(q => !double.IsFinite(q.StdError)))
        {
            warnings.Add(new Warning("global-fit-failed", "series", $"the global progress-curve fit did not converge ({fit.Exit}: {fit.ExitDetail})"));
            return null;
        }
        var t = fit.T95;
        var dof = fit.DegreesOfFreedom;
        var orders = species.Select((s, j) =>
        {
            var q = fit.Parameters[groups.Count + j];
            return new Order(s, q.Value, q.StdError, dof, q.Value - t * q.StdError, q.Value + t * q.StdError, "global progress-curve fit");
        }).ToArray();
        var unit = OrderAnalysis.RateConstantUnit(orders.Sum(o => o.Value));
        var ks = Enumerable.Range(0, groups.Count).Select(g =>
        {
            var q = fit.Parameters[g];
            return new KeyValuePair<string, RateConstant>(groups.Names[g],
                new RateConstant(q.Value, q.StdError, unit, dof, q.Value - t * q.StdError, q.Value + t * q.StdError, "global progress-curve fit"));
        }).ToArray();
        return new GlobalFitFindings(orders, ks, fit, runs.Count);
    }

    /// <summary>
    /// The points of a trace the global fit uses (finite, t ≥ 0, every m-th so at most <see cref="MaxPointsPerRun"/>).
    /// Idempotent: SeriesRunner applies it to each run while the full trace is still in memory, and the fit's own
    /// call then keeps every point.
    /// </summary>
    public static RunTrace Thin(RunTrace tr)
    {
        var t = tr.Times; var c = tr.Concentrations;
        var n = Math.Min(t.Length, c.Length);
        static bool Usable(double ti, double ci) => ti >= 0 && double.IsFinite(ti) && double.IsFinite(ci);
        var usable = 0;
        for (var i = 0; i < n; i++) if (Usable(t[i], c[i])) usable++;
        var stride = Math.Max(1, (int)Math.Ceiling(usable / (double)MaxPointsPerRun));
        var count = (usable + stride - 1) / stride;
        var times = new double[count]; var values = new double[count];
        if (usable == n)
        {
            // Every sample usable (the usual case): every stride-th one, without testing them again.
            for (int i = 0, k = 0; k < count; i += stride, k++) { times[k] = t[i]; values[k] = c[i]; }
        }
        else
        {
            for (int i = 0, u = 0, k = 0; i < n; i++)
            {
                if (!Usable(t[i], c[i])) continue;
                if (u++ % stride == 0) { times[k] = t[i]; values[k] = c[i]; k++; }
            }
        }
        return tr with { Times = times, Concentrations = values };
    }
}
