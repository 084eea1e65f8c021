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

    [Theory]
    [InlineData(3)]
    [InlineData(17)]
    public void Grouping_many_runs_by_their_exact_conditions_gives_the_groups_of_comparing_each_run_with_every_group(int seed)
    {
        // Invented: 600 runs over about 15 conditions, some written with a difference within the 1e-9 tolerance, some at
        // another temperature, some without a concentration of B (the same as [B]0 = 0). The reference is the rule
        // as stated: a run joins the first group whose first run has its conditions.
        var rng = new Random(seed);
        var runs = new List<ReplicateRun>();
        for (var i = 0; i < 600; i++)
        {
            var a = 1e-4 * (1 + rng.Next(4)) * (rng.Next(5) == 0 ? 1 + 1e-12 : 1);
            // ln a on an edge of the grouping's cells (1e-6 wide in ln), then moved 4e-10 either way: alike, in neighbouring cells.
            if (rng.Next(4) == 0) a = Math.Exp(1e-6 * -9_210_340) * (1 + (rng.Next(3) - 1) * 4e-10);
            var conc = new Dictionary<string, double> { ["A"] = a };
            var b = rng.Next(3);
            if (b == 1) conc["B"] = 2e-3;
            else if (b == 2 && rng.Next(2) == 0) conc["B"] = 0;
            double? t = rng.Next(10) == 0 ? null : 298.15 + (rng.Next(6) == 0 ? 1e-8 : 0);
            runs.Add(new ReplicateRun($"r{i}", 1e-7 * (1 + 0.01 * rng.NextDouble()), 1e-9, conc, t));
        }
        var reference = new List<List<ReplicateRun>>();
        foreach (var r in runs)
        {
            var g = reference.FirstOrDefault(g => Alike(g[0], r));
            if (g is null) reference.Add([r]);
            else g.Add(r);
        }
        var expected = reference.Where(g => g.Count >= 2).Select(g => g.Select(r => r.Run).ToList()).ToList();
        Assert.Equal(expected, ReplicateGroup.Find(runs).Select(g => g.Runs.ToList()).ToList());
    }

    private static bool Alike(ReplicateRun a, ReplicateRun b)
    {
        static bool Eq(double x, double y) => Math.Abs(x - y) <= 1e-9 * Math.Max(Math.Abs(x), Math.Abs(y));
        if (a.TemperatureK.HasValue != b.TemperatureK.HasValue || (a.TemperatureK is { } ta && !Eq(ta, b.TemperatureK!.Value))) return false;
        return new[] { "A", "B" }.All(k => Eq(a.Concentrations.GetValueOrDefault(k), b.Concentrations.GetValueOrDefault(k)));
    }

    [Fact]
    public void Runs_at_conditions_that_are_not_finite_are_never_grouped_and_distinct_conditions_make_no_groups()
    {
        // Same as no other run, not even an identical one (the comparison of ∞ with ∞ within a tolerance is false).
        var inf = new Dictionary<string, double> { ["S"] = double.PositiveInfinity };
        Assert.Empty(ReplicateGroup.Find([new("a", 1e-7, 1e-9, inf, 298.15), new("b", 1e-7, 1e-9, inf, 298.15)]));
        Assert.Empty(ReplicateGroup.Find([new("a", 1e-7, 1e-9, new Dictionary<string, double> { ["S"] = 1e-4 }, double.NaN),
            new("b", 1e-7, 1e-9, new Dictionary<string, double> { ["S"] = 1e-4 }, double.NaN)]));
        // 20,000 runs at 20,000 conditions: no group, found without comparing each run with every group.
        var runs = Enumerable.Range(0, 20_000).Select(i => Run($"r{i}", 1e-7, 1e-4 * (1 + i * 1e-4))).ToList();
        Assert.Empty(ReplicateGroup.Find(runs));
    }
}
