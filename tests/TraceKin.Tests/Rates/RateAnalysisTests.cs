using TraceKin.Rates;
using TraceKin.Traces;
using Xunit.Abstractions;

namespace TraceKin.Tests.Rates;

/// <summary>
/// The Rates stage on synthetic traces whose truth is a closed-form integrated rate law (common practice, no source):
/// initial rate v0 = k·Π[X]0^n, coverage of the reported 95 % interval for k, spikes, drift, dead time.
/// </summary>
public sealed class RateAnalysisTests(ITestOutputHelper output)
{
    private const double A0 = 0.05, B0 = 0.08;

    private static Trace Trace(string law, int seed, string condition, int points = 400)
    {
        var spikes = condition == "spikes" ? 0.005 : 0;
        var drift = condition == "drift" ? 0.05 : 0;
        const double noise = 2e-4; // 0.4 % of [A]0
        return law switch
        {
            "first" => SyntheticTrace.Make(t => SyntheticTrace.FirstOrder(0.01, A0, t), 400, points, noise, seed, spikes, drift),
            "second" => SyntheticTrace.Make(t => SyntheticTrace.SecondOrder(0.5, A0, t), 400, points, noise, seed, spikes, drift),
            "mixed" => SyntheticTrace.Make(t => SyntheticTrace.MixedSecondOrder(0.5, A0, B0, t), 400, points, noise, seed, spikes, drift),
            "zero" => SyntheticTrace.Make(t => SyntheticTrace.ZeroOrder(1e-4, A0, t), 800, points, noise, seed, spikes, drift),
            _ => throw new ArgumentException(law),
        };
    }

    /// <summary>v0 = k·Π[X]0^n for each synthetic law.</summary>
    private static double TrueRate(string law) => law switch
    {
        "first" => 0.01 * A0,
        "second" => 0.5 * A0 * A0,
        "mixed" => 0.5 * A0 * B0,
        "zero" => 1e-4,
        _ => throw new ArgumentException(law),
    };

    public static TheoryData<string, string> BiasCases()
    {
        var d = new TheoryData<string, string>();
        foreach (var law in new[] { "first", "second", "mixed", "zero" })
            foreach (var condition in new[] { "clean", "spikes", "drift" })
                d.Add(law, condition);
        return d;
    }

    [Theory]
    [MemberData(nameof(BiasCases))]
    public void Headline_initial_rate_is_within_one_percent_of_k_times_the_product_of_starting_concentrations(string law, string condition)
    {
        // Mean over 5 noisy traces (fixed seeds), so the check is on bias, not on one trace's noise.
        var truth = TrueRate(law);
        var values = new List<double>();
        for (var seed = 1; seed <= 5; seed++)
        {
            var r = RateAnalysis.Analyse(Trace(law, 100 * seed + condition.Length, condition), -1, A0, RateSettings.Default, law,
                law == "mixed" ? B0 : null);
            values.Add(r.Headline.Value);
            if (seed == 1) output.WriteLine($"{law}/{condition}: {r.Headline.Method} = {r.Headline.Value:G6} ± {r.Headline.StdError:G2}; rule: {r.HeadlineRule}; spikes {r.Spikes.Count}");
        }
        var bias = values.Average() / truth - 1;
        output.WriteLine($"bias {bias * 100:F3} %");
        Assert.True(Math.Abs(bias) < 0.01, $"{law}/{condition}: mean initial rate {values.Average():G6} vs truth {truth:G6} ({bias * 100:F2} %)");
    }

    [Theory]
    [InlineData("first", "first order", 0.01)]
    [InlineData("second", "second order", 0.5)]
    public void Reported_95_percent_interval_for_k_covers_the_true_k_in_92_to_98_percent_of_traces(string law, string lawName, double k)
    {
        // 250 short traces (60 points) per case, Gaussian noise 0.5 % of [A]0, fixed seeds.
        CoverageCheck.Assert92To98Percent(output, law, lawName, k, A0, traces: 250, points: 60, noise: 2.5e-4, firstSeed: 10_000);
    }

    [Fact]
    public void Spikes_are_excluded_and_listed_with_their_times()
    {
        var trace = Trace("first", 7, "clean");
        var y = (double[])trace.Values.Clone();
        int[] where = [50, 200, 333];
        foreach (var i in where) y[i] += 0.01; // 20 % of [A]0, 50 noise SDs
        var r = RateAnalysis.Analyse(trace with { Values = y }, -1, A0, RateSettings.Default, "spiky");
        foreach (var i in where) Assert.Contains(r.Spikes, s => s.Index == i && s.Time == trace.Times[i]);
        Assert.Contains(r.Warnings, w => w.Code == "spikes");
        Assert.True(r.Spikes.Count <= where.Length + 2, $"{r.Spikes.Count} spikes flagged for 3 inserted");
    }

    [Fact]
    public void Drift_is_fitted_when_the_evidence_calls_for_it()
    {
        var r = RateAnalysis.Analyse(Trace("first", 3, "drift"), -1, A0, RateSettings.Default, "drifting");
        Assert.True(r.ChosenLaw?.Drift, "a law with a drift term should be chosen");
        Assert.Contains(r.Warnings, w => w.Code == "baseline-drift");
        var clean = RateAnalysis.Analyse(Trace("first", 3, "clean"), -1, A0, RateSettings.Default, "steady");
        Assert.False(clean.ChosenLaw?.Drift);
    }

    [Fact]
    public void First_order_trace_is_fitted_best_by_the_first_order_law()
    {
        var r = RateAnalysis.Analyse(Trace("first", 11, "clean"), -1, A0, RateSettings.Default, "run");
        Assert.Equal("first order", r.ChosenLaw?.Law);
        // Evidence: the other integer orders carry (almost) no Akaike weight; order n and drift variants share the rest.
        Assert.True(r.ChosenLaw!.AkaikeWeight > 0.2, $"weight {r.ChosenLaw.AkaikeWeight}");
        Assert.All(r.Fits.Where(f => f.Law is "zero order" or "second order"), f => Assert.True(f.AkaikeWeight < 1e-6));
        Assert.False(r.NoIntegerLawFits);
        Assert.Equal(Math.Log(2) / r.ChosenLaw.RateConstant, r.ChosenLaw.HalfLife, 1e-9);
    }

    [Fact]
    public void Order_three_halves_trace_is_flagged_as_fitting_no_integer_law()
    {
        // d[A]/dt = −k[A]^1.5: [A] = [A]0·(1 + 0.5·k·[A]0^0.5·t)^(−2) (closed-form integrated rate law, common practice, no source).
        var trace = SyntheticTrace.Make(t => A0 * Math.Pow(1 + 0.5 * 0.1 * Math.Sqrt(A0) * t, -2), 600, 400, 5e-5, 5);
        var r = RateAnalysis.Analyse(trace, -1, A0, RateSettings.Default with { Drift = "off" }, "run");
        Assert.True(r.NoIntegerLawFits);
        Assert.Contains(r.Warnings, w => w.Code == "no-integer-law");
        var nth = r.Fits.First(f => f.Law == "order n");
        Assert.Equal(1.5, nth.Fit.Value("n"), 0.05);
    }

    [Fact]
    public void Dead_time_before_the_first_sample_is_reported()
    {
        // Drop the first 12 samples: the run's first sample is then t[12] s after mixing.
        var full = Trace("first", 9, "clean");
        var late = full with { Times = full.Times[12..], Values = full.Values[12..] };
        var r = RateAnalysis.Analyse(late, -1, A0, RateSettings.Default, "late");
        Assert.Equal(full.Times[12], r.DeadTime);
        Assert.Contains(r.Warnings, w => w.Code == "dead-time");
        // The law fit extrapolates to the moment of mixing: v0 = k·[A]0 within 1 % (about 3 standard errors).
        Assert.Equal(0.01 * A0, r.Headline.Value, 0.01 * A0 * 0.01);
    }
}
