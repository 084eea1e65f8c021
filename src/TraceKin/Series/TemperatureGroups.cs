namespace TraceKin.Series;

/// <summary>
/// Groups runs by plan temperature: runs whose temperatures agree within <see cref="Tolerance"/> K share one k.
/// Runs without a temperature form one group of their own (name "unknown temperature").
/// </summary>
public sealed record TemperatureGroups(int[] Index, IReadOnlyList<double?> Temperatures, IReadOnlyList<string> Names)
{
    public const double Tolerance = 0.05;

    public int Count => Names.Count;

    public static TemperatureGroups Of(IReadOnlyList<RunPoint> runs)
    {
        var temps = new List<double?>();
        var index = new int[runs.Count];
        for (var i = 0; i < runs.Count; i++)
        {
            var t = runs[i].TemperatureK;
            var g = temps.FindIndex(x => x is null ? t is null : t is { } tt && Math.Abs(tt - x.Value) <= Tolerance);
            if (g < 0) { temps.Add(t); g = temps.Count - 1; }
            index[i] = g;
        }
        // Order groups by temperature (unknown last) so output does not depend on run order.
        var order = Enumerable.Range(0, temps.Count).OrderBy(g => temps[g] ?? double.MaxValue).ToArray();
        var rank = new int[order.Length];
        for (var r = 0; r < order.Length; r++) rank[order[r]] = r;
        var sorted = order.Select(g => temps[g]).ToList();
        var names = sorted.Count == 1 ? [""] : sorted.Select(t => t is { } v ? FormattableString.Invariant($"{v:0.##} K") : "unknown temperature").ToList();
        return new TemperatureGroups(index.Select(g => rank[g]).ToArray(), sorted, names);
    }
}
