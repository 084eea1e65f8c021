using TraceKin.Rates;
using Xunit.Abstractions;

namespace TraceKin.Tests.Rates;

/// <summary>
/// Dense traces (10,000 samples, as instruments log them) take the binned path of the integrated-law fits and the
/// n-dependent spike cutoff. Truth: closed-form integrated rate laws (common practice, no source); initial rate
/// v0 = k·Π[X]0^n.
/// </summary>
public sealed class DenseTraceTests(ITestOutputHelper output)
{
    private const double A0 = 0.05, B0 = 0.08, Noise = 2e-4;
    private const int Points = 10_000;

    [Theory]
    [MemberData(nameof(RateAnalysisTests.BiasCases), MemberType = typeof(RateAnalysisTests))]
    public void Headline_initial_rate_of_a_dense_trace_is_within_one_percent_of_the_truth(string law, string condition)
    {
        var (truth, rate) = law switch
        {
            "first" => ((Func<double, double>)(t => SyntheticTrace.FirstOrder(0.01, A0, t)), 0.01 * A0),
            "second" => (t => SyntheticTrace.SecondOrder(0.5, A0, t), 0.5 * A0 * A0),
            "mixed" => (t => SyntheticTrace.MixedSecondOrder(0.5, A0, B0, t), 0.5 * A0 * B0),
            _ => (t => SyntheticTrace.ZeroOrder(1e-4, A0, t), 1e-4),
        };
        var values = new List<double>();
        for (var seed = 1; seed <= 3; seed++)
        {
            var trace = SyntheticTrace.Make(truth, law == "zero" ? 800 : 400, Points, Noise, 7_000 + 10 * seed + condition.Length,
                condition == "spikes" ? 0.005 : 0, condition == "drift" ? 0.05 : 0);
            var r = RateAnalysis.Analyse(trace, -1, A0, RateSettings.Default, law, law == "mixed" ? B0 : null);
            values.Add(r.Headline.Value);
            if (condition == "spikes") Assert.InRange(r.Spikes.Count, 45, 55); // 50 inserted, each ≥ 12 noise SDs
            if (seed == 1) output.WriteLine($"{law}/{condition}: {r.Headline.Method} = {r.Headline.Value:G6} ± {r.Headline.StdError:G2}; spikes {r.Spikes.Count}; {r.HeadlineRule}");
        }
        var bias = values.Average() / rate - 1;
        output.WriteLine($"bias {bias * 100:F3} %");
        Assert.True(Math.Abs(bias) < 0.01, $"{law}/{condition}: mean {values.Average():G6} vs truth {rate:G6} ({bias * 100:F2} %)");
    }

    [Theory]
    [InlineData("first", "first order", 0.01)]
    [InlineData("second", "second order", 0.5)]
    public void Reported_95_percent_interval_for_k_of_dense_traces_covers_the_truth_in_92_to_98_percent(string law, string lawName, double k)
    {
        // 200 traces of 10,000 points: the fit is to 250 bin means, and its interval must still be honest.
        CoverageCheck.Assert92To98Percent(output, law, lawName, k, A0, traces: 200, points: Points, noise: 1e-3, firstSeed: 20_000);
    }

    [Fact]
    public void Clean_dense_traces_rarely_lose_a_sample_to_the_spike_rule()
    {
        // The cutoff is set so that a clean trace loses any sample with probability about 1 % (Bonferroni bound,
        // common practice, no source); a fixed 3.5·MAD rule would flag about 5 samples in every such trace.
        const int traces = 100;
        var flagged = 0;
        for (var seed = 0; seed < traces; seed++)
        {
            var trace = SyntheticTrace.Make(t => SyntheticTrace.FirstOrder(0.01, A0, t), 400, Points, Noise, 30_000 + seed);
            var r = RateAnalysis.Analyse(trace, -1, A0, RateSettings.Default, "clean");
            if (r.Spikes.Count > 0) flagged++;
        }
        output.WriteLine($"{flagged} of {traces} clean traces had a sample flagged");
        Assert.True(flagged <= 5, $"{flagged} of {traces} clean traces lost samples to the spike rule");
    }

    [Fact]
    public void Chosen_law_curve_is_evaluated_on_demand_at_every_sample()
    {
        // The curve is computed only when asked for (a batch without plots never needs it); when it is, it must be
        // the fitted law at every sample time: y_end + (y0 − y_end)·exp(−k·t) for first order (closed-form
        // integrated rate law, common practice, no source), and the law estimate's curve is the same one.
        var trace = SyntheticTrace.Make(t => SyntheticTrace.FirstOrder(0.01, A0, t), 400, Points, Noise, 41_000);
        var r = RateAnalysis.Analyse(trace, -1, A0, RateSettings.Default, "lazy");
        var chosen = r.ChosenLaw!;
        Assert.Equal("first order", chosen.Law);
        var p = chosen.Fit.Parameters;
        var (y0, yEnd, k) = (p[0].Value, p[1].Value, p[2].Value);
        Assert.Equal(Points, chosen.Fitted.Length);
        for (var i = 0; i < Points; i += 997)
            Assert.Equal(yEnd + (y0 - yEnd) * Math.Exp(-k * trace.Times[i]), chosen.Fitted[i], 12);
        var lawEstimate = r.Estimates.Single(e => e.Method.StartsWith("integrated law", StringComparison.Ordinal));
        Assert.Same(chosen.Fitted, lawEstimate.Fitted);
        Assert.All(r.Fits.Where(f => !f.Chosen), f => Assert.Empty(f.Fitted));
    }

    [Fact]
    public void Running_median_of_seven_equals_the_middle_of_the_sorted_seven()
    {
        // Random values with many ties and distinct values (fixed seed); reference: sorting.
        var rng = new Random(5);
        for (var i = 0; i < 3000; i++)
        {
            var v = Enumerable.Range(0, 7).Select(_ => i % 2 == 0 ? (double)rng.Next(4) : rng.NextDouble()).ToArray();
            var sorted = v.Order().ToArray();
            Assert.Equal(sorted[3], SpikeFilter.MedianOf7(v.ToArray()));
        }
    }

    [Fact]
    public void Spike_candidates_match_the_plain_running_median_rule()
    {
        // Reference: inside the trace |y_i − median of the seven-point window| > limit with the median found by
        // sorting (Hampel identifier on a running median, Hampel 1974); at the three points of each end, the distance
        // from the Theil–Sen line of the six nearest others (Sen 1968) beyond 1.5 × limit, computed here by LINQ. The
        // fast path skips the median where it cannot matter.
        var rng = new Random(11);
        for (var trial = 0; trial < 200; trial++)
        {
            var n = 7 + rng.Next(60);
            // Coarse values (many ties), steps, isolated spikes and a smooth trend.
            var y = Enumerable.Range(0, n).Select(i => Math.Round(3 * Math.Sin(i / 7.0) + rng.Next(3), trial % 2 == 0 ? 0 : 3)).ToArray();
            for (var s = 0; s < 3; s++) y[rng.Next(n)] += rng.Next(2) == 0 ? 8 : -8;
            foreach (var limit in new[] { 0.0, 0.5, 1.0, 2.0, 5.0 })
            {
                var fast = SpikeFilter.Candidates(y, limit);
                for (var i = 0; i < n; i++)
                {
                    bool expected;
                    if (i >= 3 && i < n - 3)
                        expected = Math.Abs(y[i] - y.Skip(i - 3).Take(7).Order().ElementAt(3)) > limit;
                    else
                    {
                        var from = i < 3 ? 0 : n - 7;
                        var xs = Enumerable.Range(from, 7).Where(j => j != i).ToArray();
                        var slopes = xs.SelectMany((a, ia) => xs.Skip(ia + 1).Select(b => (y[b] - y[a]) / (b - a))).Order().ToArray();
                        var slope = slopes[slopes.Length / 2];
                        var icpt = xs.Select(j => y[j] - slope * j).Order().ToArray();
                        var intercept = 0.5 * (icpt[2] + icpt[3]);
                        expected = Math.Abs(y[i] - (intercept + slope * i)) > SpikeFilter.EndFactor * limit;
                    }
                    Assert.True(expected == fast[i], $"trial {trial}, limit {limit}, point {i}");
                }
            }
        }
    }
}

/// <summary>
/// The drift screen: the score statistic for adding a drift term agrees with the drop in χ²/s² that fitting the
/// term actually brings (score and likelihood-ratio statistics agree to first order: Rao 1948, Proc. Camb. Phil.
/// Soc. 44, 50), and on traces without drift it follows χ² with 1 degree of freedom, so it rarely passes the screen.
/// </summary>
public sealed class DriftScreenTests(ITestOutputHelper output)
{
    private const double A0 = 0.05;

    private static (double Score, double Drop) ScoreAndDrop(double driftFraction, int seed)
    {
        var trace = SyntheticTrace.Make(t => SyntheticTrace.FirstOrder(0.01, A0, t), 400, 400, 2e-4, seed, 0, driftFraction);
        var w = Enumerable.Repeat(1.0, trace.Count).ToArray();
        var law = new FirstOrderLaw();
        var (model, plain) = IntegratedLawFitter.FitOne(law, trace.Times, trace.Values, w, -1, A0, null, false, null);
        var (_, withDrift) = IntegratedLawFitter.FitOne(law, trace.Times, trace.Values, w, -1, A0, null, true, null);
        Assert.True(plain.Converged && withDrift.Converged);
        var s2 = plain.ChiSquare / plain.DegreesOfFreedom;
        return (IntegratedLawFitter.DriftScore(model, plain, trace.Times, w), (plain.ChiSquare - withDrift.ChiSquare) / s2);
    }

    [Fact]
    public void Score_for_a_drift_term_matches_the_drop_in_chi_square_it_brings()
    {
        foreach (var seed in new[] { 1, 2, 3 })
        {
            var (score, drop) = ScoreAndDrop(0.03, 500 + seed);
            output.WriteLine($"seed {seed}: score {score:G4}, drop {drop:G4}");
            Assert.True(drop > 20, $"the drift should be clear (drop {drop:G3})");
            Assert.InRange(score / drop, 0.8, 1.25);
        }
    }

    [Fact]
    public void Score_on_traces_without_drift_rarely_passes_the_screen()
    {
        // Under no drift S ~ χ²(1): P(S > 4) = 4.6 % (χ² table, common practice, no source); 60 traces.
        var passed = 0;
        for (var seed = 0; seed < 60; seed++)
            if (ScoreAndDrop(0, 900 + seed).Score >= IntegratedLawFitter.DriftScreenScore) passed++;
        output.WriteLine($"{passed} of 60 clean traces passed the drift screen");
        Assert.InRange(passed, 0, 8);
    }
}
