using MathNet.Numerics.Statistics;
using System.Globalization;

namespace TraceKin.Series;

/// <summary>One run as the replicate grouping sees it: its id, initial rate and standard error, and its conditions.</summary>
public sealed record ReplicateRun(string Run, double Rate, double StdError, IReadOnlyDictionary<string, double> Concentrations, double? TemperatureK);

/// <summary>
/// Runs planned with the same conditions (every starting concentration and the temperature equal to 1e-9 relative)
/// and the spread of their initial rates: the sample standard deviation beside the mean of the runs' own standard
/// errors, so a spread far above the fits' errors shows variation between wells that no single fit can see.
/// <see cref="Outliers"/> are the runs whose modified z-score M = 0.6745·(v − median)/MAD exceeds 3.5 in size
/// (Iglewicz &amp; Hoaglin 1993, "How to Detect and Handle Outliers", ASQC, from memory), for groups of three or more;
/// the MAD is floored at the median standard error / 0.6745 so that runs that differ only within their own fit
/// errors are never flagged (our choice: with triplicates the MAD of two close values can be near zero).
/// </summary>
public sealed record ReplicateGroup(
    IReadOnlyList<string> Runs,
    IReadOnlyDictionary<string, double> Concentrations,
    double? TemperatureK,
    double Mean,
    double StdDev,
    double MeanStdError,
    IReadOnlyList<(string Run, double Score)> Outliers)
{
    public const double OutlierScore = 3.5;

    /// <summary>
    /// Groups of two or more runs with the same conditions, in the order of their first run. A run joins the first group
    /// whose first run has its conditions (<see cref="Same"/>). The groups are indexed by the cell of their first run's
    /// conditions, so a run is compared only with the groups in its own cells: linear in the runs, however many distinct
    /// conditions there are.
    /// </summary>
    public static IReadOnlyList<ReplicateGroup> Find(IReadOnlyList<ReplicateRun> runs)
    {
        var groups = new List<List<ReplicateRun>>();
        var cells = new Dictionary<string, List<int>>(StringComparer.Ordinal);
        foreach (var r in runs.Where(r => double.IsFinite(r.Rate)))
        {
            var near = Cells(r);
            var first = int.MaxValue;
            foreach (var cell in near)
                if (cells.TryGetValue(cell, out var list))
                    foreach (var i in list)
                        if (i < first && Same(groups[i][0], r)) first = i;
            if (first < int.MaxValue) { groups[first].Add(r); continue; }
            groups.Add([r]);
            // A condition that is not finite is the same as no other (Same): its group is never joined, so not indexed.
            if (!Finite(r)) continue;
            if (!cells.TryGetValue(near[0], out var own)) cells[near[0]] = own = [];
            own.Add(groups.Count - 1);
        }
        return groups.Where(g => g.Count >= 2).Select(Describe).ToList();
    }

    private static bool Finite(ReplicateRun r) =>
        (r.TemperatureK is not { } t || double.IsFinite(t)) && r.Concentrations.Values.All(double.IsFinite);

    private static IEnumerable<KeyValuePair<string, double>> NonZero(ReplicateRun r) =>
        r.Concentrations.Where(kv => kv.Value != 0).OrderBy(kv => kv.Key, StringComparer.Ordinal);

    /// <summary>Width of a cell in ln|x|: far wider than the 1e-9 tolerance, so two values alike lie in one cell or in neighbours.</summary>
    private const double CellWidth = 1e-6;

    /// <summary>
    /// The cells of the run's conditions: per value its sign and ⌊ln|x| / <see cref="CellWidth"/>⌋, per run the species
    /// with a non-zero concentration. Two runs alike (<see cref="Same"/>: the same species, each value within 1e-9
    /// relative, so the same sign and ln|x| within 1.0000000005e-9) are in the same cell, or, where a value lies within
    /// 1e-9 of a cell's edge, in the neighbouring one: both are given (every combination; one cell almost always), the
    /// run's own cell first.
    /// </summary>
    private static List<string> Cells(ReplicateRun r)
    {
        var values = new List<(string Name, double Value)>();
        if (r.TemperatureK is { } t) values.Add(("", t));
        values.AddRange(NonZero(r).Select(kv => (kv.Key, kv.Value)));
        var keys = new List<string> { r.TemperatureK is null ? "-" : "T" };
        foreach (var (name, v) in values)
        {
            string Cell(long c) => $"|{name.Length}:{name}{(v < 0 ? "-" : "+")}{c}";
            var x = v == 0 ? double.NegativeInfinity : Math.Log(Math.Abs(v)) / CellWidth;
            var own = double.IsFinite(x) ? (long)Math.Floor(x) : long.MinValue;
            var options = new List<string> { Cell(own) };
            if (double.IsFinite(x))
            {
                // 1e-9 in ln|x| is 1e-3 of a cell; a margin of 1e-2 leaves room for the rounding of the logarithm.
                if (x - own < 1e-2) options.Add(Cell(own - 1));
                if (own + 1 - x < 1e-2) options.Add(Cell(own + 1));
            }
            keys = keys.SelectMany(k => options.Select(o => k + o)).ToList();
        }
        return keys;
    }

    private static ReplicateGroup Describe(List<ReplicateRun> g)
    {
        var v = g.Select(r => r.Rate).ToArray();
        var mean = v.Average();
        var sd = Math.Sqrt(v.Sum(x => (x - mean) * (x - mean)) / (v.Length - 1));
        var meanSe = g.Average(r => r.StdError);
        var outliers = new List<(string, double)>();
        if (g.Count >= 3)
        {
            var median = v.Median();
            var mad = v.Select(x => Math.Abs(x - median)).Median();
            var floor = g.Select(r => r.StdError).Median() / 0.6745;
            var scale = Math.Max(mad, floor);
            if (scale > 0)
                foreach (var r in g)
                {
                    var m = 0.6745 * (r.Rate - median) / scale;
                    if (Math.Abs(m) > OutlierScore) outliers.Add((r.Run, m));
                }
        }
        return new ReplicateGroup(g.Select(r => r.Run).ToList(), g[0].Concentrations, g[0].TemperatureK, mean, sd, meanSe, outliers);
    }

    private static bool Same(ReplicateRun a, ReplicateRun b)
    {
        static bool Eq(double x, double y) => Math.Abs(x - y) <= 1e-9 * Math.Max(Math.Abs(x), Math.Abs(y));
        if (a.TemperatureK.HasValue != b.TemperatureK.HasValue || (a.TemperatureK is { } ta && !Eq(ta, b.TemperatureK!.Value))) return false;
        var keys = a.Concentrations.Where(kv => kv.Value != 0).Select(kv => kv.Key).Union(b.Concentrations.Where(kv => kv.Value != 0).Select(kv => kv.Key));
        return keys.All(k => Eq(a.Concentrations.GetValueOrDefault(k), b.Concentrations.GetValueOrDefault(k)));
    }

    /// <summary>The group's conditions as the report and warnings print them ("[S]0 = 0.0004 mol/L").</summary>
    public string Conditions() =>
        string.Join(", ", Concentrations.Where(kv => kv.Value != 0).Select(kv => string.Create(CultureInfo.InvariantCulture, $"[{kv.Key}]0 = {kv.Value:G4} mol/L"))
            .Concat(TemperatureK is { } t ? [string.Create(CultureInfo.InvariantCulture, $"T = {t:0.##} K")] : []));
}
