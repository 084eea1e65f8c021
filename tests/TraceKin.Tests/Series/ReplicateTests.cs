using TraceKin.Series;

namespace TraceKin.Tests.Series;

/// <summary>
/// Replicate groups and the modified z-score M = 0.6745·(v − median)/MAD, |M| &gt; 3.5 flagged (Iglewicz &amp; Hoaglin
/// 1993, from memory). Invented rates.
/// </summary>
public class ReplicateTests
{
    private static ReplicateRun Run(string id, double rate, double s0, double se = 1e-9) =>
        new(id, rate, se, new Dictionary<string, double> { ["S"] = s0 }, 298.15);

    [Fact]
    public void Runs_with_the_same_conditions_are_grouped_with_their_spread()
    {
        var groups = ReplicateGroup.Find([Run("a", 1.0e-7, 1e-4), Run("b", 1.2e-7, 1e-4), Run("c", 3e-7, 5e-4), Run("d", 1.1e-7, 1e-4)]);

        var g = Assert.Single(groups);
        Assert.Equal(["a", "b", "d"], g.Runs);
        Assert.Equal(1.1e-7, g.Mean, 1e-20);
        Assert.Equal(1e-8, g.StdDev, 1e-20);   // sample standard deviation of 1.0, 1.2, 1.1 (× 1e-7) is 0.1 × 1e-7
        Assert.Equal(1e-9, g.MeanStdError, 1e-20);
        Assert.Empty(g.Outliers);
    }

    [Fact]
    public void A_replicate_far_from_the_others_is_flagged_and_one_within_its_fit_error_is_not()
    {
        // median 1.01, MAD 0.01 (× 1e-7; above the floor 1e-10 / 0.6745): the run at 1.30 has M = 0.6745·0.29/0.01 ≈ 19.6
        var far = Assert.Single(ReplicateGroup.Find([Run("a", 1.00e-7, 1e-4, 1e-10), Run("b", 1.01e-7, 1e-4, 1e-10), Run("c", 1.30e-7, 1e-4, 1e-10)]));
        var (id, score) = Assert.Single(far.Outliers);
        Assert.Equal("c", id);
        Assert.Equal(0.6745 * 0.29 / 0.01, score, 1e-6);

        // two identical rates make the MAD zero; the floor (median standard error 5e-9 / 0.6745) keeps a run
        // 1e-8 away (M = 2) from being flagged
        var close = Assert.Single(ReplicateGroup.Find([Run("a", 1.00e-7, 1e-4, 5e-9), Run("b", 1.00e-7, 1e-4, 5e-9), Run("c", 1.10e-7, 1e-4, 5e-9)]));
        Assert.Empty(close.Outliers);
    }
}
