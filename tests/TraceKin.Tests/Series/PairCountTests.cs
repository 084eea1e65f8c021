using TraceKin.Series;

namespace TraceKin.Tests.Series;

/// <summary>Counting pairs of runs that differ in one species arithmetically gives the same count and the same listed
/// pairs, in the same order, as visiting every pair (the reference; invented series, fixed seeds).</summary>
public sealed class PairCountTests
{
    [Theory]
    [InlineData(1, 60, 2)]
    [InlineData(2, 300, 3)]
    [InlineData(3, 1500, 2)]
    [InlineData(4, 40, 1)]
    public void Arithmetic_pair_count_and_listing_match_visiting_every_pair(int seed, int runs, int species)
    {
        var rng = new Random(seed);
        var names = Enumerable.Range(0, species).Select(j => $"X{j}").ToArray();
        double[] levels = [0.001, 0.002, 0.004, 0.008];
        double[] temps = [288.15, 298.15, 298.17, 308.15]; // 298.15 and 298.17 share a class (within 0.05 K)
        var points = Enumerable.Range(0, runs).Select(i => new RunPoint($"R{i}", 1e-6 * (1 + rng.NextDouble()), 1e-8,
            names.ToDictionary(n => n, _ => levels[rng.Next(levels.Length)]), temps[rng.Next(temps.Length)])).ToList();
        var fast = OrderAnalysis.PairRatios(points, names);
        var conc = new double[runs * species];
        for (var r = 0; r < runs; r++)
            for (var j = 0; j < species; j++) conc[r * species + j] = points[r].InitialConcentrations[names[j]];
        var slow = OrderAnalysis.AllPairs(points, names, conc);
        Assert.Equal(slow.Count, fast.Count);
        Assert.Equal(slow.Pairs.Count, fast.Pairs.Count);
        for (var i = 0; i < slow.Pairs.Count; i++) Assert.Equal(slow.Pairs[i], fast.Pairs[i]);
    }

    [Fact]
    public void Temperatures_that_chain_across_the_tolerance_fall_back_to_visiting_every_pair()
    {
        // 298.10, 298.14, 298.18: each within 0.05 K of its neighbour, not of both: the pairwise rule decides.
        var points = new[] { 298.10, 298.14, 298.18, 298.10 }.Select((t, i) =>
            new RunPoint($"R{i}", 1e-6 * (i + 1), 1e-8, new Dictionary<string, double> { ["A"] = 0.001 * (i + 1) }, t)).ToList();
        var conc = points.Select(p => p.InitialConcentrations["A"]).ToArray();
        Assert.Equal(OrderAnalysis.AllPairs(points, ["A"], conc).Count, OrderAnalysis.PairRatios(points, ["A"]).Count);
    }
}
