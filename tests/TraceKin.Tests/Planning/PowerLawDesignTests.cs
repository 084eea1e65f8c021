using TraceKin.Planning;
using TraceKin.Series;
using Xunit;
using Xunit.Abstractions;

namespace TraceKin.Tests.Planning;

/// <summary>
/// A first series whose [A]0 spans only 1.5× pins n(A) poorly: the variance of an order falls with the spread of
/// ln[X]0 (Draper &amp; Smith, Applied Regression Analysis, 3rd ed., §2.4, from memory: var(slope) = σ²/Σ(x − x̄)²),
/// so runs at the ends of the allowed range are worth far more than repeats. Checked by simulation with the Series
/// stage's own fit (200 draws, fixed seed). The series is invented (v0 = 0.5·[A]0·[B]0 L/(mol·s), 2 % noise).
/// </summary>
public class PowerLawDesignTests(ITestOutputHelper output)
{
    private static List<RunPoint> NarrowSeries()
    {
        var rng = new Random(19);
        var runs = new List<RunPoint>();
        var i = 0;
        foreach (var a in new[] { 1.0e-3, 1.2e-3, 1.5e-3 })
            foreach (var b in new[] { 1e-3, 2e-3, 4e-3 })
            {
                var v = 0.5 * a * b;
                var se = 0.02 * v;
                var noisy = v + se * (rng.NextDouble() * 2 - 1);
                runs.Add(new RunPoint($"R{++i}", noisy, se, new Dictionary<string, double> { ["A"] = a, ["B"] = b }, 298.15));
            }
        return runs;
    }

    [Fact]
    public void Suggested_runs_shrink_the_narrow_orders_interval_at_least_twice_as_much_as_replicates()
    {
        var runs = NarrowSeries();
        var settings = new ModelSettings { Laws = [ModelSettings.Power] };
        var series = new AnalysedSeries("narrow", runs, OrderAnalysis.Analyse(runs, settings), settings, null);
        var (law, theta) = PlanningSetup.FromSeries(series, null, new Dictionary<string, double>(), false, "summary.json");
        var limits = new PlanningLimits([new ConcentrationRange("A", 0.2e-3, 5e-3), new ConcentrationRange("B", 0.5e-3, 5e-3)], null, null, 4);
        var space = PlanningSetup.Space(limits, law, runs, null);
        var request = new PlanningRequest(law, theta, RateNoise.FromRuns(runs), runs, space, 4, DesignCriterion.D) { Settings = settings, Draws = 200, Seed = 7 };
        var s = RunPlanner.Suggest(request);

        var now = Width(s, "now", "n(A)");
        var proposed = Width(s, "with the proposed runs", "n(A)");
        var replicated = Width(s, "with as many replicates", "n(A)");
        output.WriteLine($"n(A) median 95 % width: now {now:G4}, proposed {proposed:G4}, replicates {replicated:G4}");
        foreach (var r in s.NewRuns) output.WriteLine($"  [A]0 {r.Concentrations["A"]:G4}  [B]0 {r.Concentrations["B"]:G4}");
        // Measured when written (seed 7, 200 draws): median width of n(A)'s 95 % interval 0.191 now, 0.0275 with the four
        // proposed runs ([A]0 at 0.2 and 5 mmol/L), 0.152 with four replicates: a shrink of 0.163 against 0.039.
        Assert.True(now - proposed >= 2 * (now - replicated), $"shrink {now - proposed:G3} against {now - replicated:G3}");
        Assert.True(proposed < 0.5 * replicated);
        Assert.Contains(s.NewRuns, r => r.Concentrations["A"] < 0.21e-3);
        Assert.Contains(s.NewRuns, r => r.Concentrations["A"] > 4.9e-3);
        Assert.Contains(s.Weaknesses, w => w.Contains("[A]0 spans only 1.5×"));

        // The Fisher prediction and the simulated spread of n(A) agree within 25 % (first-order theory against the fit).
        var se = s.Predicted.Single(p => p.Parameter == "n(A)");
        var sim = s.Simulated.Single(d => d.Name == "with the proposed runs").Intervals.Single(x => x.Parameter == "n(A)");
        output.WriteLine($"se(n(A)) predicted {se.Proposed:G3}, simulated spread {sim.Spread:G3}"); // 0.0061 and 0.0059 when written
        Assert.InRange(sim.Spread / se.Proposed, 0.75, 1.25);
    }

    [Fact]
    public void Variance_criterion_for_one_order_does_no_worse_on_that_order_than_the_D_optimum()
    {
        var runs = NarrowSeries();
        var settings = ModelSettings.Default;
        var series = new AnalysedSeries("narrow", runs, OrderAnalysis.Analyse(runs, settings), settings, null);
        var (law, theta) = PlanningSetup.FromSeries(series, null, new Dictionary<string, double>(), false, "summary.json");
        var limits = new PlanningLimits([new ConcentrationRange("A", 0.2e-3, 5e-3), new ConcentrationRange("B", 0.5e-3, 5e-3)], null, null, 4);
        var space = PlanningSetup.Space(limits, law, runs, null);
        var d = RunPlanner.Suggest(new PlanningRequest(law, theta, RateNoise.FromRuns(runs), runs, space, 4, DesignCriterion.D) { Simulate = false });
        var v = RunPlanner.Suggest(new PlanningRequest(law, theta, RateNoise.FromRuns(runs), runs, space, 4, DesignCriterion.Parse("variance:n(A)")!) { Simulate = false });
        var seD = d.Predicted.Single(p => p.Parameter == "n(A)").Proposed;
        var seV = v.Predicted.Single(p => p.Parameter == "n(A)").Proposed;
        // The single-variance criterion cannot do worse on its own parameter than the D-optimum.
        Assert.True(seV <= seD * (1 + 1e-9), $"{seV} against {seD}");
    }

    private static double Width(RunSuggestion s, string design, string parameter) =>
        s.Simulated.Single(d => d.Name == design).Intervals.Single(x => x.Parameter == parameter).MedianWidth;
}
