using TraceKin.Analysis;
using TraceKin.Series;
using TraceKin.Tests.Support;

namespace TraceKin.Tests.Series;

/// <summary>The stiff-safe integrator and the global progress-curve fit against closed forms and known truths.</summary>
public class GlobalFitTests
{
    [Fact]
    public void Rosenbrock_solution_of_first_order_decay_matches_the_exponential()
    {
        // Closed form y = y0·exp(−k·t) (common practice, no source).
        double[] t = [0.5, 1, 2, 5, 10];
        var y = new double[t.Length];
        Assert.True(Rosenbrock2.Solve(v => -0.3 * v, _ => -0.3, 2.0, t, y));
        // Within the default relative tolerance (1e-6) of the step control.
        for (var i = 0; i < t.Length; i++) Assert.Equal(2.0 * Math.Exp(-0.3 * t[i]), y[i], 2.0 * 1e-6);
    }

    [Fact]
    public void Rosenbrock_follows_a_stiff_second_order_decay_in_few_steps()
    {
        // y' = −k·y² with k·y0·t up to 1e7: closed form y = y0/(1 + k·y0·t) (common practice, no source).
        // An explicit method would need steps below 1/(k·y0) = 1e-7 s at the start.
        double[] t = [1e-6, 1e-3, 1, 10];
        var y = new double[t.Length];
        var calls = 0;
        Assert.True(Rosenbrock2.Solve(v => { calls++; return -1e6 * v * v; }, v => -2e6 * v, 10, t, y));
        for (var i = 0; i < t.Length; i++) Assert.Equal(10 / (1 + 1e7 * t[i]), y[i], 10 / (1 + 1e7 * t[i]) * 1e-5);
        Assert.True(calls < 100_000, $"{calls} evaluations");
    }

    [Fact]
    public void Global_fit_of_second_order_curves_recovers_k_and_order_within_their_intervals()
    {
        // Closed form for 2A → products followed as A (ν = −1 per extent): [A] = c0/(1 + k·c0·t) (common practice,
        // no source). Truth k = 2.5 L/(mol·s), four runs, 0.3 % relative Gaussian noise, seed 9 (invented data).
        var rng = new Random(9);
        var runs = new List<RunPoint>();
        foreach (var c0 in new[] { 0.002, 0.004, 0.006, 0.008 })
        {
            var times = Enumerable.Range(0, 120).Select(i => i * 5.0).ToArray();
            var c = times.Select(x => c0 / (1 + 2.5 * c0 * x) * (1 + TraceKin.Simulation.RateLawSimulator.Gaussian(rng, 0.003))).ToArray();
            var v0 = 2.5 * c0 * c0;
            runs.Add(new RunPoint($"R{runs.Count + 1}", v0, 0.01 * v0, new Dictionary<string, double> { ["A"] = c0 }, 298.15)
            {
                Trace = new RunTrace("A", -1, times, c),
            });
        }
        var f = OrderAnalysis.Analyse(runs, ModelSettings.Default with { GlobalFit = true, Laws = ["power"] });
        var g = f.GlobalFit!;
        var n = g.Orders.Single();
        Assert.InRange(2.0, n.Ci95Low, n.Ci95High);
        Assert.Equal(2.0, n.Value, 0.05);
        var k = g.RateConstants.Single().Value;
        Assert.InRange(2.5, k.Ci95Low, k.Ci95High);
        Assert.Equal("global progress-curve fit", k.Method);
    }

    [Fact]
    public void Global_fit_of_the_sample_series_agrees_with_its_truth()
    {
        // sample-traces/violet-complex-acid/truth.json: orders complex 1, H+ 1, k = 0.35 L/(mol·s), both consumed 1:1.
        var result = SeriesRunner.Analyse(RepoPaths.Sample("violet-complex-acid"), new AnalysisOptions { Workers = 2 });
        var points = result.Runs.Select(r => new RunPoint(r.Id, r.Rates.Headline.Value, r.Rates.Headline.StdError, r.Plan.InitialConcentrations, r.Plan.TemperatureK)
        {
            Trace = new RunTrace(r.Converted.Species, r.Converted.Coefficient, r.Converted.Concentration.Times, r.Converted.Concentration.Values),
        }).ToList();
        var f = OrderAnalysis.Analyse(points, result.Config!.Model with { GlobalFit = true });
        var g = f.GlobalFit!;
        foreach (var o in g.Orders) Assert.InRange(1.0, o.Ci95Low, o.Ci95High);
        var k = g.RateConstants.Single().Value;
        Assert.InRange(0.35, k.Ci95Low, k.Ci95High);

        // summary.json carries it in its own block.
        using var ms = new MemoryStream();
        TraceKin.Reports.SummaryJson.WriteTo(result with { Findings = f }, ms);
        using var doc = System.Text.Json.JsonDocument.Parse(ms.ToArray());
        var block = doc.RootElement.GetProperty("globalFit");
        Assert.Equal(2, block.GetProperty("orders").GetArrayLength());
        Assert.Equal(k.Value, block.GetProperty("rateConstants")[0].GetProperty("rateConstant").GetProperty("value").GetDouble());
    }

    [Theory]
    [InlineData(250, false)]
    [InlineData(10_000, false)]
    [InlineData(10_000, true)]
    [InlineData(901, true)]
    public void Thinning_keeps_every_mth_usable_sample(int n, bool withUnusable)
    {
        // Reference: the usable samples (finite, t ≥ 0) in order, every m-th from the first, with
        // m = ⌈usable / MaxPointsPerRun⌉ (common practice, no source).
        var t = Enumerable.Range(0, n).Select(i => i * 0.5 - (withUnusable ? 3 : 0)).ToArray();
        var c = t.Select(x => Math.Exp(-x / 100)).ToArray();
        if (withUnusable) { c[10] = double.NaN; c[n / 2] = double.PositiveInfinity; t[n - 3] = double.NaN; }
        var usable = Enumerable.Range(0, n).Where(i => t[i] >= 0 && double.IsFinite(t[i]) && double.IsFinite(c[i])).ToArray();
        var m = Math.Max(1, (int)Math.Ceiling(usable.Length / (double)GlobalFit.MaxPointsPerRun));
        var expected = usable.Where((_, k) => k % m == 0).ToArray();
        var thin = GlobalFit.Thin(new RunTrace("A", -1, t, c));
        Assert.Equal(expected.Select(i => t[i]), thin.Times);
        Assert.Equal(expected.Select(i => c[i]), thin.Concentrations);
        Assert.True(thin.Times.Length <= GlobalFit.MaxPointsPerRun);
    }
}
