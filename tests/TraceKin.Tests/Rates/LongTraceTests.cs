using TraceKin.Fitting;
using TraceKin.Rates;
using Xunit.Abstractions;

namespace TraceKin.Tests.Rates;

/// <summary>
/// Traces and early windows beyond 20,000 samples are fitted on bin means, so the memory a run needs stays a small
/// multiple of its samples (docs/methods.md, "Memory per run"). Truth: the closed-form first-order law
/// [A] = [A]0·exp(−kt) (common practice, no source), v0 = k·[A]0. Equivalence checks compare with the fit at every
/// sample on the same invented trace (a round trip, no science source needed).
/// </summary>
public sealed class LongTraceTests(ITestOutputHelper output)
{
    private const double A0 = 0.05, K = 0.01;

    [Fact]
    public void A_long_window_fitted_on_bin_means_gives_the_slope_of_the_fit_at_every_sample()
    {
        // 200,000 samples over 20 s of a first-order trace: the cubic window fit of the polynomial estimator.
        var trace = SyntheticTrace.Make(t => SyntheticTrace.FirstOrder(K, A0, t), 20, 200_000, 2e-4, 41);
        var full = LinearLeastSquares.Polynomial(trace.Times, trace.Values, 3);
        var binned = InitialRateEstimators.Polynomial(trace.Times, trace.Values, -1, trace.Times.Length)!;
        var fullSlope = -full.Parameters[1].Value;
        var fullSe = full.Parameters[1].StdError;
        output.WriteLine($"every sample {fullSlope:G8} ± {fullSe:G3}; bin means {binned.Value:G8} ± {binned.StdError:G3} (dof {binned.Dof})");
        Assert.Equal(200_000, binned.PointsUsed);
        Assert.True(binned.Dof <= InitialRateEstimators.MaxSampleFitPoints, $"dof {binned.Dof}");
        // Bins of 10 consecutive samples lose almost nothing: estimates within a tenth of a standard error, errors within 2 %.
        Assert.InRange(binned.Value, fullSlope - 0.1 * fullSe, fullSlope + 0.1 * fullSe);
        Assert.InRange(binned.StdError / fullSe, 0.98, 1.02);
        Assert.InRange(binned.Value / (K * A0), 0.99, 1.01);
        Assert.Equal(200_000, binned.Fitted.Length);
        Assert.Equal(full.Parameters[0].Value, binned.Fitted[0], 1e-6);
    }

    [Theory]
    [InlineData(1e-7, 0.0)]   // low noise: 250 bins cannot keep the curve, the fits once ran at every sample
    [InlineData(0.0, 0.0)]    // no noise at all: every k-th sample
    [InlineData(2e-4, 0.002)] // noisy, with spikes
    public void Rates_of_a_200000_sample_trace_allocate_a_small_multiple_of_the_trace(double noise, double spikes)
    {
        const int n = 200_000;
        var trace = SyntheticTrace.Make(t => SyntheticTrace.FirstOrder(K, A0, t), 400, n, noise, 43, spikes);
        RateAnalysis.Analyse(SyntheticTrace.Make(t => SyntheticTrace.FirstOrder(K, A0, t), 400, 2_000, 2e-4, 1), -1, A0, RateSettings.Default, "warm-up");
        var before = GC.GetAllocatedBytesForCurrentThread();
        var r = RateAnalysis.Analyse(trace, -1, A0, RateSettings.Default, "long");
        var allocated = GC.GetAllocatedBytesForCurrentThread() - before;
        var perSample = allocated / (8.0 * n);
        output.WriteLine($"noise {noise}, spikes {spikes}: {allocated / 1e6:F1} MB allocated = {perSample:F1} doubles per sample; " +
            $"v0 {r.Headline.Value:G6} ({r.Headline.Method}); law fit on {r.ChosenLaw?.Fit.PointCount} points");
        // Every sample once took a dozen least-squares fits of ~16 doubles per sample (over 150 doubles per sample).
        Assert.True(perSample <= 12, $"{perSample:F1} doubles allocated per sample");
        Assert.True(r.ChosenLaw!.Fit.PointCount <= IntegratedLawFitter.MaxSampleFitPoints);
        Assert.InRange(r.Headline.Value / (K * A0), 0.99, 1.01);
    }

    [Fact]
    public void A_long_trace_without_noise_is_fitted_at_every_kth_valid_sample()
    {
        // 50,001 samples, one excluded: 50,000 valid ones, every third kept (16,667 points).
        const int n = 50_001;
        var t = Enumerable.Range(0, n).Select(i => (double)i).ToArray();
        var y = t.Select(v => SyntheticTrace.FirstOrder(1e-4, A0, v)).ToArray();
        var w = Enumerable.Repeat(1.0, n).ToArray();
        w[3] = 0;
        var (tb, yb, wb, sb) = IntegratedLawFitter.LongTraceBins(t, y, w, noise: 0)!.Value;
        Assert.Equal(16_667, tb.Length);
        Assert.Equal([0.0, 4, 7, 10], tb[..4]); // the valid samples are 0, 1, 2, 4, 5, 6, 7, …: every third of them
        Assert.Equal(y[4], yb[1]);
        Assert.All(wb, v => Assert.Equal(1.0, v));
        Assert.All(sb, v => Assert.Equal(0.0, v));
        Assert.Null(IntegratedLawFitter.LongTraceBins(t[..20_000], y[..20_000], w[..20_000], noise: 0));
    }
}
