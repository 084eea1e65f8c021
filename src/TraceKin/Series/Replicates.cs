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
    /// whose first run has its conditions. Runs whose conditions are exactly equal join the same group, so the groups are
    /// searched once per distinct set of conditions (an assay campaign has thousands of runs and a few dozen), not per run.
    /// </summary>
    public static IReadOnlyList<ReplicateGroup> Find(IReadOnlyList<ReplicateRun> runs)
    {
        var groups = new List<List<ReplicateRun>>();
        var seen = new Dictionary<string, List<ReplicateRun>>(StringComparer.Ordinal);
        foreach (var r in runs.Where(r => double.IsFinite(r.Rate)))
        {
            var key = ExactKey(r);
            if (key is null || !seen.TryGetValue(key, out var g))
            {
                g = groups.FirstOrDefault(g => Same(g[0], r));
                if (g is null) groups.Add(g = []);
                if (key is not null) seen[key] = g;
            }
            g.Add(r);
        }
        return groups.Where(g => g.Count >= 2).Select(Describe).ToList();
    }

    /// <summary>
    /// The run's conditions as <see cref="Same"/> compares them, exactly (the temperature, and each non-zero
    /// concentration by species): equal keys compare alike with every other run. Null when a value is NaN (never the same).
    /// </summary>
    private static string? ExactKey(ReplicateRun r)
    {
        var sb = new System.Text.StringBuilder();
        if (r.TemperatureK is { } t)
        {
            if (double.IsNaN(t)) return null;
            sb.Append(BitConverter.DoubleToInt64Bits(t == 0 ? 0 : t));
        }
        else sb.Append('-');
        foreach (var (species, c) in r.Concentrations.Where(kv => kv.Value != 0).OrderBy(kv => kv.Key, StringComparer.Ordinal))
        {
            if (double.IsNaN(c)) return null;
            sb.Append('|').Append(species.Length).Append(':').Append(species).Append('=').Append(BitConverter.DoubleToInt64Bits(c));
        }
        return sb.ToString();
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
