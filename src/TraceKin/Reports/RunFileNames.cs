using System.Runtime.CompilerServices;
using System.Security.Cryptography;
using System.Text;
using TraceKin.Setup;

namespace TraceKin.Reports;

/// <summary>
/// The file names of a series' per-run outputs (plots/run-&lt;name&gt;.png), derived from the run ids of the plan:
/// only ASCII letters, digits, '-', '_' and '.' (anything else becomes '_', and a leading '.' too, so no name is
/// hidden or special); at most <see cref="MaxStem"/> characters; an id that had to be changed or cut gets '-' and the
/// first 8 hex digits of the SHA-256 of its UTF-8 bytes appended, so two long ids with the same beginning part
/// ways; and unique across the series even where file names are compared without regard to case: a name already
/// given to an earlier run of the plan gets '-2', '-3', … The same plan always gives the same names (plan order).
/// </summary>
public sealed class RunFileNames
{
    /// <summary>Longest name part derived from a run id (the file name adds "run-" and ".png": at most 88 characters).</summary>
    public const int MaxStem = 80;

    private const int HashDigits = 8;
    private static readonly ConditionalWeakTable<Plan, RunFileNames> Cache = new();
    private readonly Dictionary<string, string> _stems;

    private RunFileNames(Dictionary<string, string> stems) => _stems = stems;

    /// <summary>The names for a plan's runs (computed once per plan object).</summary>
    public static RunFileNames For(Plan plan) => Cache.GetValue(plan, p => For(p.Rows.Select(r => r.Run)));

    /// <summary>The names for run ids in plan order (ids are unique within a plan).</summary>
    public static RunFileNames For(IEnumerable<string> runIds)
    {
        var stems = new Dictionary<string, string>(StringComparer.Ordinal);
        var taken = new HashSet<string>(StringComparer.OrdinalIgnoreCase);
        foreach (var id in runIds)
        {
            if (stems.ContainsKey(id)) continue;
            var stem = Stem(id);
            for (var k = 2; !taken.Add(stem); k++)
            {
                var suffix = "-" + k.ToString(System.Globalization.CultureInfo.InvariantCulture);
                var baseStem = Stem(id);
                stem = baseStem[..Math.Min(baseStem.Length, MaxStem - suffix.Length)] + suffix;
            }
            stems[id] = stem;
        }
        return new RunFileNames(stems);
    }

    /// <summary>The plot file name of a run of this plan (e.g. "run-R1.png"); an id outside the plan gets its own stem.</summary>
    public string PlotFile(string runId) => $"run-{(_stems.TryGetValue(runId, out var s) ? s : Stem(runId))}.png";

    /// <summary>Every run id of the plan with its plot file name, in plan order.</summary>
    public IEnumerable<(string RunId, string PlotFile)> All => _stems.Select(kv => (kv.Key, $"run-{kv.Value}.png"));

    /// <summary>The safe, bounded name part for one id on its own (no uniqueness across a series).</summary>
    public static string Stem(string id)
    {
        var sb = new StringBuilder(Math.Min(id.Length, MaxStem));
        foreach (var ch in id)
            sb.Append(ch is (>= 'a' and <= 'z') or (>= 'A' and <= 'Z') or (>= '0' and <= '9') or '-' or '_' or '.' ? ch : '_');
        if (sb.Length > 0 && sb[0] == '.') sb[0] = '_';
        var changed = sb.Length == 0 || !sb.ToString().Equals(id, StringComparison.Ordinal) || sb.Length > MaxStem;
        if (!changed) return id;
        var hash = Convert.ToHexStringLower(SHA256.HashData(Encoding.UTF8.GetBytes(id)))[..HashDigits];
        var keep = Math.Min(sb.Length, MaxStem - HashDigits - 1);
        return (keep > 0 ? sb.ToString(0, keep) + "-" : "") + hash;
    }
}
