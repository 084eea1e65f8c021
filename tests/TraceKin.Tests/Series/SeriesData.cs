using TraceKin.Series;

namespace TraceKin.Tests.Series;

/// <summary>Builds synthetic series from closed-form initial rates with seeded Gaussian noise (invented data, known truth).</summary>
internal static class SeriesData
{
    public static RunPoint Point(string id, double rate, double relSe, double? t, params (string Species, double C)[] c) =>
        new(id, rate, relSe * rate, c.ToDictionary(x => x.Species, x => x.C), t);

    /// <summary>v0 = k·Π c^n·(1 + ε), ε ~ N(0, rel²); the stated standard error is rel·v0.</summary>
    public static List<RunPoint> PowerLaw(double k, (string Species, double Order, double[] Levels)[] species, double rel, int seed, double? t = 298.15)
    {
        var rng = new Random(seed);
        var runs = new List<RunPoint>();
        var grid = new List<(string, double)[]> { Array.Empty<(string, double)>() };
        foreach (var s in species)
            grid = grid.SelectMany(g => s.Levels.Select(l => g.Append((s.Species, l)).ToArray())).ToList();
        foreach (var g in grid)
        {
            var v = k * g.Aggregate(1.0, (acc, x) => acc * Math.Pow(x.Item2, species.First(s => s.Species == x.Item1).Order));
            var noisy = v * (1 + TraceKin.Simulation.RateLawSimulator.Gaussian(rng, rel));
            runs.Add(new RunPoint($"R{runs.Count + 1}", noisy, rel * noisy, g.ToDictionary(x => x.Item1, x => x.Item2), t));
        }
        return runs;
    }
}
