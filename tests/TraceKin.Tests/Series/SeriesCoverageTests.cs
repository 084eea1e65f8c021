using Xunit.Abstractions;

namespace TraceKin.Tests.Series;

/// <summary>
/// Coverage of the series' 95 % intervals (SeriesCoverage: full traces through the Rates and Series stages, known
/// truth, fixed seeds). With S series the observed coverage of a correct 95 % interval has a binomial SD of
/// √(0.95·0.05/S): 2.2 % at S = 100, so these CI-sized checks accept 90–99.5 %; bench/TraceKin.Bench.Coverage runs the
/// same study at N = 200 runs per series with 200 series (figures in bench/README.md).
/// </summary>
public sealed class SeriesCoverageTests(ITestOutputHelper output)
{
    [Theory]
    [InlineData("first", 8, 100, "clean")]
    [InlineData("mixed", 8, 100, "clean")]
    [InlineData("first", 40, 80, "clean")]
    public void The_95_percent_intervals_of_the_orders_and_of_k_cover_the_truth(string law, int runs, int series, string condition)
    {
        var r = SeriesCoverage.Run(law, runs, series, condition, firstSeed: 5_000);
        output.WriteLine(r.ToString());
        Assert.True(r.Series >= series - 2, $"only {r.Series} of {series} series gave orders and k");
        // 100 series: 90–99.5 %; 80 series (SD 2.4 %, and 0.95^80 = 1.7 % chance of a clean sweep): 89–100 %.
        var (low, high) = series >= 100 ? (0.90, 0.995) : (0.89, 1.0);
        Assert.InRange(r.OrderA, low, high);
        Assert.InRange(r.OrderB, low, high);
        Assert.InRange(r.RateConstantFree, low, high);
        // The headline k (at the rounded orders) carries the systematic law-choice part: it may cover more often.
        Assert.InRange(r.RateConstant, low, 1.0);
        // And the rates themselves carry no bias worth the name: mean run error within ±0.2 %.
        Assert.InRange(r.MeanRunError, -0.002, 0.002);
    }
}
