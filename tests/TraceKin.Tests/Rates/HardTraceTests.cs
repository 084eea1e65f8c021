using TraceKin.Rates;
using TraceKin.Series;
using TraceKin.Traces;
using Xunit.Abstractions;

namespace TraceKin.Tests.Rates;

/// <summary>
/// The Rates stage on the seeded battery of short, awkward traces (<see cref="HardTraces"/>): the truths are
/// closed-form or exactly solved rate laws (common practice, no source; Michaelis–Menten integrated form, Schnell &amp;
/// Maini 2003, from memory), so every expected value is computed, not recorded.
/// </summary>
public sealed class HardTraceTests(ITestOutputHelper output)
{
    private static bool Flagged(RunRates r) => r.Warnings.Any(w => w.Code is "rate-unresolved" or "rate-imprecise");

    [Fact]
    public void Initial_rates_on_the_hard_battery_have_a_median_error_below_two_percent_and_no_silent_outlier()
    {
        var errors = new List<double>();
        var silentOutliers = new List<string>();
        var wrongSign = 0; var flagged = 0;
        foreach (var c in HardTraces.Battery(draws: 12))
        {
            var r = RateAnalysis.Analyse(c.Trace, c.Coefficient, c.Reference, RateSettings.Default, c.Name);
            var err = r.Headline.Value / c.TrueRate - 1;
            errors.Add(Math.Abs(err));
            if (Flagged(r)) flagged++;
            if (Math.Abs(err) > 0.10 && !Flagged(r)) silentOutliers.Add($"{c.Name}: {err:P1} ({r.Headline.Method})");
            if (r.Headline.Value <= 0 && !r.Warnings.Any(w => w.Code == "rate-wrong-sign")) wrongSign++;
            if (r.Headline.Value <= 0) Assert.False(r.IsResolved, $"{c.Name}: a non-positive rate was reported as resolved");
        }
        errors.Sort();
        var median = errors[errors.Count / 2];
        output.WriteLine($"{errors.Count} traces: median |error| {median:P2}, 90th percentile {errors[(int)(0.9 * (errors.Count - 1))]:P2}, " +
                         $"largest {errors[^1]:P1}, flagged {flagged}, unflagged beyond 10 %: {silentOutliers.Count}");
        foreach (var s in silentOutliers) output.WriteLine("  " + s);
        Assert.True(median < 0.02, $"median error {median:P2}");
        Assert.Equal(0, wrongSign);
        // A run worse than 10 % must carry a flag; allow 1 % of the battery as the chance tail of honest ±3σ errors.
        Assert.True(silentOutliers.Count <= errors.Count / 100, string.Join("; ", silentOutliers));
    }

    [Fact]
    public void A_drift_term_does_not_absorb_the_reaction_of_a_partly_converted_product_curve()
    {
        // The failure this guards against: on a short product curve a "zero order + drift" fit put the kink early and
        // let the drift carry the reaction, so the headline was 60–95 % low.
        foreach (var seed in Enumerable.Range(1, 20))
        {
            var c = HardTraces.Make("product-mm", "clean", 7000 + seed);
            var r = RateAnalysis.Analyse(c.Trace, c.Coefficient, c.Reference, RateSettings.Default, c.Name);
            Assert.False(r.ChosenLaw?.Drift ?? false, $"{c.Name}: a drift term was chosen at {c.Conversion:P0} conversion");
            Assert.True(Math.Abs(r.Headline.Value / c.TrueRate - 1) < 0.12 || Flagged(r), $"{c.Name}: {r.Headline.Value / c.TrueRate - 1:P1}");
        }
    }

    [Fact]
    public void Clean_short_traces_lose_no_reading_at_their_ends_to_the_spike_screen()
    {
        var endFlags = 0; var traces = 0;
        foreach (var c in HardTraces.Battery(draws: 12).Where(c => c.Artefact is "clean" or "drift" or "dead-time"))
        {
            var r = RateAnalysis.Analyse(c.Trace, c.Coefficient, c.Reference, RateSettings.Default, c.Name);
            traces++;
            endFlags += r.Spikes.Count(s => s.Index < 3 || s.Index >= c.Trace.Count - 3);
        }
        output.WriteLine($"{endFlags} end readings flagged in {traces} clean traces");
        // The screen is set for a 1 % family-wise false-flag rate per trace (SpikeFilter.FalseFlagRate).
        Assert.True(endFlags <= Math.Max(1, traces / 50), $"{endFlags} end readings flagged in {traces} clean traces");
    }

    [Fact]
    public void A_burst_of_three_consecutive_spikes_is_excluded_whole()
    {
        var c = HardTraces.Make("reactant-first", "clean", 4242);
        var y = (double[])c.Trace.Values.Clone();
        var range = y.Max() - y.Min();
        var at = y.Length / 3;
        for (var i = at; i < at + 3; i++) y[i] += 0.5 * range;
        var r = RateAnalysis.Analyse(c.Trace with { Values = y }, c.Coefficient, c.Reference, RateSettings.Default, "burst");
        for (var i = at; i < at + 3; i++) Assert.Contains(r.Spikes, s => s.Index == i);
        Assert.True(Math.Abs(r.Headline.Value / c.TrueRate - 1) < 0.10, $"{r.Headline.Value / c.TrueRate - 1:P1}");
    }

    [Fact]
    public void A_trace_running_against_its_coefficient_is_flagged_and_unresolved_not_reported_as_a_rate()
    {
        // A reactant (ν = −1) whose concentration rises: the rate of reaction would be negative.
        var c = HardTraces.Make("product-first", "clean", 99);
        var r = RateAnalysis.Analyse(c.Trace, -1, null, RateSettings.Default, "backwards");
        Assert.True(r.Headline.Value < 0);
        Assert.Contains(r.Warnings, w => w.Code == "rate-wrong-sign");
        Assert.Contains(r.Warnings, w => w.Code == "rate-unresolved");
        Assert.False(r.IsResolved);
    }

    [Fact]
    public void A_saturation_series_of_short_product_curves_recovers_Vmax_within_3_percent_and_Km_within_10_percent()
    {
        // Eight substrate levels from 0.2 to 10 Km (the span an assay is usually designed over: common practice, no
        // source), in triplicate, each a 40–80-reading product curve at 10–60 % conversion with 0.5–2 % noise
        // (HardTraces); truth Vmax = 2e-7 mol/(L·s), Km = 5e-4 mol/L. Several draws.
        const double vmax = 2e-7, km = 5e-4;
        foreach (var draw in new[] { 1, 2, 3 })
        {
            var runs = new List<RunPoint>();
            var levels = Enumerable.Range(0, 8).Select(i => km * 0.2 * Math.Pow(50, i / 7.0)).ToArray();
            var seed = 50_000 * draw;
            foreach (var s0 in levels)
                for (var rep = 0; rep < 3; rep++)
                {
                    var c = HardTraces.MakeProductCurve(vmax, km, s0, ++seed);
                    var r = RateAnalysis.Analyse(c.Trace, 1, null, RateSettings.Default, c.Name);
                    if (Math.Abs(r.Headline.Value / c.TrueRate - 1) > 0.05)
                        output.WriteLine($"  {c.Name}: {r.Headline.Value / c.TrueRate - 1:P1} ± {r.Headline.RelativeError:P1} {(r.IsResolved ? "" : "(unresolved)")} {r.Headline.Method}");
                    if (!r.IsResolved) continue;
                    runs.Add(new RunPoint(c.Name, r.Headline.Value, r.Headline.StdError, new Dictionary<string, double> { ["S"] = s0 }, 298.15));
                }
            var f = OrderAnalysis.Analyse(runs, ModelSettings.Default);
            var sat = f.Saturation!;
            output.WriteLine($"draw {draw}: {runs.Count} runs, Vmax {sat.Vmax.Value:G4} ({sat.Vmax.Value / vmax - 1:P1}), Km {sat.Km.Value:G4} ({sat.Km.Value / km - 1:P1}), chosen {f.ChosenLaw}");
            Assert.True(runs.Count >= 21, $"only {runs.Count} of 24 runs resolved");
            Assert.InRange(sat.Vmax.Value / vmax, 0.97, 1.03);
            Assert.InRange(sat.Km.Value / km, 0.90, 1.10);
        }
    }
}
