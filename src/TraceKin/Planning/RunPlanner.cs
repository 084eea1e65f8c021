using System.Globalization;
using TraceKin.Fitting;
using TraceKin.Reports;
using TraceKin.Series;

namespace TraceKin.Planning;

/// <summary>Everything the planner needs: the law at its planning parameters, the noise, the runs already made, where
/// new runs may go, how many, and what to optimise.</summary>
public sealed record PlanningRequest(
    DesignLaw Law,
    double[] Theta,
    RateNoise Noise,
    IReadOnlyList<RunPoint> Existing,
    DesignSpace Space,
    int NewRuns,
    DesignCriterion Criterion)
{
    /// <summary>Identical runs per proposed condition (the new runs come in groups of this size).</summary>
    public int Replicates { get; init; } = 1;
    /// <summary>Settings of the series fit the simulation check runs (as the series' [model] table).</summary>
    public ModelSettings Settings { get; init; } = ModelSettings.Default;
    public int Draws { get; init; } = 200;
    public int Seed { get; init; } = 1;
    /// <summary>False skips the simulation check (the design alone).</summary>
    public bool Simulate { get; init; } = true;
}

/// <summary>One parameter's expected standard error from the Fisher information under the three designs (NaN where the
/// design cannot estimate it).</summary>
public sealed record PredictedError(string Parameter, string Unit, double Value, double Now, double Proposed, double Replicated);

/// <summary>The planner's answer: the proposed conditions, the expected errors and the simulation check, the current
/// design's weaknesses and a few sentences on why these levels.</summary>
public sealed record RunSuggestion(
    PlanningRequest Request,
    IReadOnlyList<DesignPoint> Points,
    IReadOnlyList<PredictedError> Predicted,
    IReadOnlyList<SimulatedDesign> Simulated,
    IReadOnlyList<string> Weaknesses,
    IReadOnlyList<string> Explanation)
{
    /// <summary>The new runs, one per run (a point with 3 runs appears 3 times), in the order they are listed.</summary>
    public IReadOnlyList<RunConditions> NewRuns => Points.SelectMany(p => Enumerable.Repeat(p.Conditions, p.Runs)).ToList();
}

/// <summary>
/// The planning front door: proposes new runs by optimal design on the law (<see cref="DesignSearch"/> on the
/// <see cref="FisherInformation"/> of the existing runs plus the new ones), predicts the standard errors, and checks the
/// proposal by simulation against the same number of replicates of the current design (<see cref="DesignSimulation"/>).
/// The design is only as good as the law and parameters it assumes: it is optimal for that model, not for another.
/// </summary>
public static class RunPlanner
{
    public static RunSuggestion Suggest(PlanningRequest q)
    {
        var law = q.Law;
        var existing = q.Existing.Select(r => new RunConditions(r.InitialConcentrations, r.TemperatureK)).ToList();
        var points = DesignSearch.Find(law, q.Theta, q.Noise, existing, q.Space, q.NewRuns, q.Replicates, q.Criterion);
        var proposed = points.SelectMany(p => Enumerable.Repeat(p.Conditions, p.Runs)).ToList();
        var replicated = Enumerable.Range(0, existing.Count == 0 ? 0 : q.NewRuns).Select(i => existing[i % existing.Count]).ToList();

        var now = FisherInformation.Covariance(FisherInformation.Of(law, q.Theta, existing, q.Noise));
        var after = FisherInformation.Covariance(FisherInformation.Of(law, q.Theta, existing.Concat(proposed), q.Noise));
        var rep = existing.Count == 0 ? null : FisherInformation.Covariance(FisherInformation.Of(law, q.Theta, existing.Concat(replicated), q.Noise));
        double Se(MathNet.Numerics.LinearAlgebra.Matrix<double>? c, int j) => c is null ? double.NaN : law.Shown(j, Math.Sqrt(c[j, j]));
        var predicted = law.ParameterNames.Select((name, j) =>
            new PredictedError(name, law.ParameterUnits[j], law.Shown(j, q.Theta[j]), Se(now, j), Se(after, j), Se(rep, j))).ToList();

        var sims = new List<SimulatedDesign>();
        if (q.Simulate)
        {
            if (existing.Count > 0) sims.Add(DesignSimulation.Run("now", law, q.Theta, q.Noise, existing, q.Settings, q.Draws, q.Seed));
            sims.Add(DesignSimulation.Run("with the proposed runs", law, q.Theta, q.Noise, existing.Concat(proposed).ToList(), q.Settings, q.Draws, q.Seed));
            if (existing.Count > 0) sims.Add(DesignSimulation.Run("with as many replicates", law, q.Theta, q.Noise, existing.Concat(replicated).ToList(), q.Settings, q.Draws, q.Seed));
        }
        var weaknesses = DesignWeaknesses.Of(q.Existing, law, q.Theta);
        return new RunSuggestion(q, points, predicted, sims, weaknesses, Explain(q, points, predicted));
    }

    private static IReadOnlyList<string> Explain(PlanningRequest q, IReadOnlyList<DesignPoint> points, IReadOnlyList<PredictedError> predicted)
    {
        var ci = CultureInfo.InvariantCulture;
        var lines = new List<string>
        {
            $"Criterion: {q.Criterion.Describe()} of the weighted fit of {Describe(q.Law)}, existing runs included; noise: {q.Noise.Describe()}.",
        };
        foreach (var p in points)
        {
            var where = new List<string>();
            foreach (var r in q.Space.Ranges)
            {
                var c = p.Conditions.Concentrations[r.Species];
                var pos = Near(c, r.High) ? "at the upper limit" : Near(c, r.Low) ? "at the lower limit" : "inside the range";
                where.Add(string.Format(ci, "[{0}]0 = {1:G4} mmol/L {2}", r.Species, c * 1000, pos));
            }
            if (q.Space.MovesTemperature && p.Conditions.TemperatureK is { } t)
                where.Add(string.Format(ci, "T = {0:0.##} K {1}", t, Near(t, q.Space.TemperatureHighK!.Value) ? "at the upper limit" : Near(t, q.Space.TemperatureLowK!.Value) ? "at the lower limit" : "inside the range"));
            lines.Add($"{p.Runs} run(s): {string.Join(", ", where)}.");
        }
        if (q.Law is SaturationDesign s && q.Space.Ranges.FirstOrDefault(r => r.Species == s.Substrate) is { } sr)
        {
            var km = q.Theta[1];
            lines.Add(string.Format(ci, "For comparison: with a constant error and no earlier runs the D-optimal levels are the largest [{0}]0 and Km·Smax/(2·Km + Smax) = {1:G4} mmol/L at Km = {2:G4} mmol/L (Duggleby 1979); earlier runs and a rate-dependent error move them.",
                s.Substrate, 1000 * km * sr.High / (2 * km + sr.High), 1000 * km));
        }
        if (q.Law is SaturationDesign sl)
        {
            var levels = q.Existing.Select(r => r.InitialConcentrations.GetValueOrDefault(sl.Substrate))
                .Concat(points.Select(p => p.Conditions.Concentrations[sl.Substrate])).Distinct().Count();
            if (levels < 3)
                lines.Add($"These runs give {levels} distinct [{sl.Substrate}]0 levels; TraceKin's report fits the saturation law only on three or more (the simulation fitted it directly), and a third level also shows whether the hyperbola is the right shape: add a run between the two.");
        }
        if (q.Law.HasTemperature)
        {
            var levels = q.Existing.Where(r => r.TemperatureK is not null).Select(r => r.TemperatureK!.Value)
                .Concat(points.Where(p => p.Conditions.TemperatureK is not null).Select(p => p.Conditions.TemperatureK!.Value))
                .Select(t => Math.Round(t / 0.05)).Distinct().Count();
            if (levels < 3)
                lines.Add($"These runs give {levels} temperature level(s); TraceKin's Arrhenius fit needs at least 3 (k per temperature, then Ea), so the simulation could not fit Ea: add runs at a temperature in between (it also shows whether ln k is straight in 1/T).");
        }
        if (q.Law.HasTemperature)
            lines.Add("Runs at the ends of the temperature range spread 1/T most and pin Ea; before running hotter than before, check the reaction's thermal safety (onset of decomposition, gas evolution, pressure) with calorimetry and defer to local codes and licensed practice.");
        foreach (var e in predicted.Where(e => double.IsFinite(e.Now) && double.IsFinite(e.Proposed)))
            lines.Add($"Expected standard error of {e.Parameter}: {ReportNumber.Plain(e.Now, 3)} now, {ReportNumber.Plain(e.Proposed, 3)} with the proposed runs" +
                (double.IsFinite(e.Replicated) ? $", {ReportNumber.Plain(e.Replicated, 3)} with as many replicates of the current runs." : "."));
        lines.Add("The design is optimal only if the law and its parameters are right; a run that does not fit it is worth more than any design.");
        return lines;
    }

    private static bool Near(double a, double b) => Math.Abs(a - b) <= 1e-4 * Math.Abs(b);

    private static string Describe(DesignLaw law) => law switch
    {
        SaturationDesign s => s.CoReactants.Count == 0 ? $"v0 = Vmax·[{s.Substrate}]0/(Km + [{s.Substrate}]0)" : $"v0 = Vmax·[{s.Substrate}]0/(Km + [{s.Substrate}]0)·Π[Y]0^n",
        PowerLawDesign p => "v0 = k·" + string.Join("·", p.Species.Select(x => $"[{x}]0^n")) + (p.HasTemperature ? " with k = k_ref·exp(−Ea/R·(1/T − 1/T_ref))" : ""),
        _ => law.Law,
    };

    /// <summary>Two-sided 95 % width for a standard error at the given degrees of freedom (Student t).</summary>
    public static double Width(double se, int dof) => 2 * FitResult.StudentT95(dof) * se;
}
