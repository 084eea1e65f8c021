using TraceKin.Series;

namespace TraceKin.Tests.Series;

/// <summary>Replicate runs make the pair-ratio table grow as the square of the runs; it is capped and the cap is said.</summary>
public class PairRatioLimitTests
{
    [Fact]
    public void Pair_ratio_table_of_many_replicates_is_capped_with_a_warning_and_the_orders_still_use_every_run()
    {
        // 40 replicates at each of two [A]0; v = k·[A] with k = 0.5 /s and ±1 % alternating scatter (invented).
        var runs = Enumerable.Range(0, 80).Select(i =>
        {
            var a = i < 40 ? 1e-3 : 2e-3;
            var v = 0.5 * a * (1 + (i % 2 == 0 ? 0.01 : -0.01));
            return new RunPoint($"R{i + 1}", v, v * 0.01, new Dictionary<string, double> { ["A"] = a }, 298.15);
        }).ToList();

        var f = OrderAnalysis.Analyse(runs, ModelSettings.Default);

        Assert.Equal(OrderAnalysis.MaxPairRatios, f.PairRatios.Count); // 40 × 40 = 1600 pairs differ in [A]0 only
        var warning = Assert.Single(f.Warnings, w => w.Code == "pair-table-truncated");
        Assert.Contains("1600", warning.Message);
        Assert.Equal(80, f.RunsUsed.Count);
        Assert.InRange(f.Orders.Single().Value, 0.99, 1.01);
    }
}
