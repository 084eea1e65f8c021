using TraceKin.Series;

namespace TraceKin.Planning;

/// <summary>One parameter's interval under one design, from simulation: how often the series fit gave it, the median
/// width of its 95 % interval, and the spread (standard deviation) of the estimates across draws.</summary>
public sealed record SimulatedInterval(string Parameter, int Fitted, int Draws, double MedianWidth, double Spread);

/// <summary>What the simulated series of one design gave.</summary>
public sealed record SimulatedDesign(string Name, int Runs, IReadOnlyList<SimulatedInterval> Intervals, double? Distinguishable);

/// <summary>
/// Checks a design by simulation: every draw gives each run the rate of the law at the planning parameters plus
/// Gaussian noise of the run's expected standard error (<see cref="RateNoise"/>), and analyses the series with the
/// Series stage itself (<see cref="OrderAnalysis.Analyse"/>, the fit TraceKin reports: same weights, rounding rules,
/// temperature groups and law comparison). The intervals collected are those the report would print. Draws are seeded
/// one by one (seed + draw number), so the result does not depend on how many threads ran them.
/// Where both laws are in play, <see cref="SimulatedDesign.Distinguishable"/> is the fraction of draws in which the law
/// that generated the rates is preferred by more than 2 AICc units (Burnham &amp; Anderson 2002, §2.6: within 2 units both
/// laws have substantial support), a power law counting as preferred also when the saturation fit runs away.
/// </summary>
internal static class DesignSimulation
{
    public static SimulatedDesign Run(string name, DesignLaw law, double[] theta, RateNoise noise, IReadOnlyList<RunConditions> runs,
        ModelSettings settings, int draws, int seed)
    {
        var targets = Targets(law);
        var values = new double[draws][];
        var widths = new double[draws][];
        var distinct = new bool?[draws];
        var lawsInPlay = BothLawsInPlay(law, runs, settings);
        Parallel.For(0, draws, new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, Math.Min(Environment.ProcessorCount, 4)) }, d =>
        {
            var rng = new Random(unchecked(seed * 7919 + d));
            var points = new List<RunPoint>(runs.Count);
            for (var i = 0; i < runs.Count; i++)
            {
                var v = law.Rate(runs[i], theta);
                var se = noise.StdError(v);
                points.Add(new RunPoint($"S{i + 1}", v + se * Gaussian(rng), se, runs[i].Concentrations, runs[i].TemperatureK));
            }
            var f = OrderAnalysis.Analyse(points, settings);
            values[d] = new double[targets.Count];
            widths[d] = new double[targets.Count];
            for (var j = 0; j < targets.Count; j++) (values[d][j], widths[d][j]) = Read(f, targets[j]);
            if (law is SaturationDesign sd && f.Saturation is null)
            {
                // The Series stage fits the saturation law only on three or more [S]0 levels; a two-level design is
                // then checked by the same weighted fit of the same model, done here directly.
                var direct = DirectSaturation(sd, points, theta);
                if (direct is not null)
                    for (var j = 0; j < targets.Count; j++)
                    {
                        var q = direct.Parameters[j];
                        (values[d][j], widths[d][j]) = (q.Value, 2 * direct.T95 * q.StdError);
                    }
            }
            if (lawsInPlay)
            {
                var sat = f.Saturation;
                distinct[d] = law.Law == ModelSettings.Saturation
                    ? sat is not null && sat.AiccPowerLaw - sat.AiccSaturation > 2
                    : sat is null ? f.Orders.Count > 0 : sat.AiccSaturation - sat.AiccPowerLaw > 2;
            }
        });
        var intervals = targets.Select((t, j) =>
        {
            var ok = Enumerable.Range(0, draws).Where(d => double.IsFinite(values[d][j]) && double.IsFinite(widths[d][j])).ToArray();
            if (ok.Length == 0) return new SimulatedInterval(t, 0, draws, double.NaN, double.NaN);
            var w = ok.Select(d => widths[d][j]).Order().ToArray();
            var median = w.Length % 2 == 1 ? w[w.Length / 2] : (w[w.Length / 2 - 1] + w[w.Length / 2]) / 2;
            var v = ok.Select(d => values[d][j]).ToArray();
            var mean = v.Average();
            var sd = v.Length > 1 ? Math.Sqrt(v.Sum(x => (x - mean) * (x - mean)) / (v.Length - 1)) : double.NaN;
            return new SimulatedInterval(t, ok.Length, draws, median, sd);
        }).ToList();
        double? dist = lawsInPlay ? distinct.Count(b => b == true) / (double)draws : null;
        return new SimulatedDesign(name, runs.Count, intervals, dist);
    }

    /// <summary>The parameters whose intervals the report prints for this law: orders, k at one temperature or Ea
    /// across temperatures, Vmax and Km for the saturation law.</summary>
    public static IReadOnlyList<string> Targets(DesignLaw law) => law switch
    {
        SaturationDesign s => new[] { "Vmax", "Km" }.Concat(s.CoReactants.Select(c => $"n({c})")).ToList(),
        _ => law.Species.Select(s => $"n({s})").Concat(law.HasTemperature ? ["Ea"] : ["k"]).ToList(),
    };

    /// <summary>Both laws are compared by the Series stage only at one temperature with saturation among the laws.</summary>
    public static bool BothLawsInPlay(DesignLaw law, IReadOnlyList<RunConditions> runs, ModelSettings settings) =>
        settings.Fits(ModelSettings.Saturation) && !law.HasTemperature &&
        runs.Select(r => r.TemperatureK).Distinct().Count() <= 1 && law.Species.Count > 0;

    private static (double Value, double Width) Read(SeriesFindings f, string target)
    {
        if (target.StartsWith("n(", StringComparison.Ordinal))
        {
            var sp = target[2..^1];
            var o = f.Orders.FirstOrDefault(x => x.Species == sp) ?? f.Saturation?.CoReactantOrders.FirstOrDefault(x => x.Species == sp);
            if (f.Saturation is { } s0 && s0.Preferred == ModelSettings.Saturation && s0.CoReactantOrders.FirstOrDefault(x => x.Species == sp) is { } so) o = so;
            return o is null ? (double.NaN, double.NaN) : (o.Value, o.Ci95High - o.Ci95Low);
        }
        switch (target)
        {
            case "k":
                return f.RateConstantAtFittedOrders is { } k ? (k.Value, k.Ci95High - k.Ci95Low) : (double.NaN, double.NaN);
            case "Ea":
                return f.Temperature?.Arrhenius?.ActivationEnergy is { } ea ? (ea.Value, ea.Ci95High - ea.Ci95Low) : (double.NaN, double.NaN);
            case "Vmax":
                return f.Saturation?.Vmax is { } vm ? (vm.Value, vm.Ci95High - vm.Ci95Low) : (double.NaN, double.NaN);
            case "Km":
                return f.Saturation?.Km is { } km ? (km.Value, km.Ci95High - km.Ci95Low) : (double.NaN, double.NaN);
        }
        return (double.NaN, double.NaN);
    }

    /// <summary>The saturation law fitted as <see cref="SaturationAnalysis"/> fits it (untransformed rates, weights
    /// 1/se², Vmax and Km bounded below by 0), started at the planning parameters; null unless it converged with finite errors.</summary>
    private static Fitting.FitResult? DirectSaturation(SaturationDesign law, IReadOnlyList<RunPoint> runs, double[] theta)
    {
        var x = runs.Select(r => r.InitialConcentrations[law.Substrate]).ToArray();
        var lny = new double[runs.Count, law.CoReactants.Count];
        for (var i = 0; i < runs.Count; i++)
            for (var j = 0; j < law.CoReactants.Count; j++) lny[i, j] = Math.Log(runs[i].InitialConcentrations[law.CoReactants[j]]);
        var model = new SaturationModel(x, lny, law.CoReactants);
        var lower = Enumerable.Repeat(double.NegativeInfinity, theta.Length).ToArray();
        lower[0] = 0;
        lower[1] = 0;
        var fit = Fitting.NonlinearLeastSquares.Fit(model, runs.Select(r => r.Rate).ToArray(), (double[])theta.Clone(),
            new Fitting.FitOptions { Weights = OrderAnalysis.RateWeights(runs), Lower = lower });
        return fit.HasUsableErrors ? fit : null;
    }

    /// <summary>Standard normal deviate by the Box–Muller transform (Box &amp; Muller 1958).</summary>
    private static double Gaussian(Random rng)
    {
        var u1 = 1.0 - rng.NextDouble();
        var u2 = rng.NextDouble();
        return Math.Sqrt(-2 * Math.Log(u1)) * Math.Cos(2 * Math.PI * u2);
    }
}
