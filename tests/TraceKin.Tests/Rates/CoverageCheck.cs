using TraceKin.Rates;
using Xunit.Abstractions;

namespace TraceKin.Tests.Rates;

/// <summary>
/// Coverage of the reported 95 % interval for k over synthetic first- or second-order traces with a known k
/// (closed-form integrated rate laws, common practice, no source): fixed seeds, drift term off. A correct interval
/// covers the truth in 95 % of traces, with binomial SD √(0.95·0.05/N), so 92–98 % is about a ±2 SD band for N = 200–250.
/// </summary>
internal static class CoverageCheck
{
    public static void Assert92To98Percent(ITestOutputHelper output, string law, string lawName, double k, double a0,
        int traces, int points, double noise, int firstSeed)
    {
        var covered = 0; var fitted = 0;
        for (var seed = 0; seed < traces; seed++)
        {
            Func<double, double> truth = law == "first" ? t => SyntheticTrace.FirstOrder(k, a0, t) : t => SyntheticTrace.SecondOrder(k, a0, t);
            var trace = SyntheticTrace.Make(truth, 300, points, noise, firstSeed + seed);
            var r = RateAnalysis.Analyse(trace, -1, a0, RateSettings.Default with { Drift = "off" }, law);
            var f = r.Fits.First(x => x.Law == lawName);
            if (!f.Fit.Converged) continue;
            fitted++;
            if (f.Ci95Low <= k && k <= f.Ci95High) covered++;
        }
        var coverage = (double)covered / fitted;
        output.WriteLine($"{law}, {points} points: {covered} of {fitted} intervals cover k = {k} ({coverage * 100:F1} %)");
        Assert.True(fitted >= traces - 2, $"only {fitted} of {traces} fits converged");
        Assert.InRange(coverage, 0.92, 0.98);
    }
}
