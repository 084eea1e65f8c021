using System.Globalization;
using System.Text;
using System.Text.RegularExpressions;
using TraceKin.Reports;
using TraceKin.Setup;
using TraceKin.Traces;

namespace TraceKin.Planning;

/// <summary>
/// plan.csv for the proposed runs, ready to fill in: the series plan's columns and units (run, file, temperature, one
/// [X]0 per species, its other columns left empty), run ids continuing the series' numbering, one export file name per
/// run. Without the series' plan: run,file,temperature (°C) and [X]0 (mmol/L). Written with <see cref="AtomicFile"/>.
/// </summary>
public static partial class SuggestedPlan
{
    public const string FileName = "plan.csv";

    [GeneratedRegex(@"^(?<prefix>.*?)(?<num>\d+)$")]
    private static partial Regex NumberedId();

    [GeneratedRegex(@"^\s*(?<name>[^\(\[]+?)\s*[\(\[](?<unit>[^\)\]]*)[\)\]]\s*$")]
    private static partial Regex UnitHeader();

    [GeneratedRegex(@"^\[(?<sp>[^\]]+)\]\s*0\s*[\(\[](?<unit>[^\)\]]*)[\)\]]$")]
    private static partial Regex SpeciesHeader();

    /// <summary>The text of plan.csv; <paramref name="planText"/> is the series' plan.csv (its header gives the columns).</summary>
    public static string Text(IReadOnlyList<RunConditions> runs, IReadOnlyList<string> existingIds, IReadOnlyList<string> existingFiles,
        IReadOnlyList<string> species, string? planText)
    {
        var ci = CultureInfo.InvariantCulture;
        var columns = Columns(planText, species);
        var ids = NextIds(existingIds, runs.Count);
        var files = new HashSet<string>(existingFiles, StringComparer.OrdinalIgnoreCase);
        var sb = new StringBuilder();
        sb.Append(string.Join(",", columns.Select(c => Cell(c.Header)))).Append('\n');
        for (var i = 0; i < runs.Count; i++)
        {
            // Only ASCII letters, digits, '-', '_' (and '.' after the first character) from the id: a plain file name.
            var stem = new string(ids[i].ToLowerInvariant().Select((ch, k) => ch is (>= 'a' and <= 'z') or (>= '0' and <= '9') or '-' or '_' || (ch == '.' && k > 0) ? ch : '_').ToArray());
            var file = stem + ".csv";
            for (var n = 2; !files.Add(file); n++) file = $"{stem}-{n}.csv";
            var cells = columns.Select(c => c.Kind switch
            {
                Kind.Run => ids[i],
                Kind.File => file,
                Kind.Temperature => runs[i].TemperatureK is { } t ? Format(c.Unit!.FromInternal(t)) : "",
                Kind.Species => runs[i].Concentrations.TryGetValue(c.Species!, out var x) ? Format(c.Unit!.FromInternal(x)) : "",
                _ => "",
            });
            sb.Append(string.Join(",", cells.Select(Cell))).Append('\n');
        }
        return sb.ToString();

        static string Format(double v) => v.ToString("G4", CultureInfo.InvariantCulture);
    }

    public static void Write(string outDir, string text) => AtomicFile.WriteAllText(Path.Combine(outDir, FileName), text, outDir);

    /// <summary>Ids after the series' own: the numbered ids' prefix (the most common one) and the next numbers;
    /// "N1", "N2"… when no id is numbered. Never an id the series already has.</summary>
    public static IReadOnlyList<string> NextIds(IReadOnlyList<string> existing, int count)
    {
        var taken = new HashSet<string>(existing, StringComparer.Ordinal);
        var numbered = existing.Select(e => NumberedId().Match(e)).Where(m => m.Success).ToList();
        var prefix = numbered.GroupBy(m => m.Groups["prefix"].Value).OrderByDescending(g => g.Count()).ThenBy(g => g.Key, StringComparer.Ordinal).FirstOrDefault();
        var p = prefix?.Key ?? "N";
        var next = prefix is null ? 1 : prefix.Max(m => long.Parse(m.Groups["num"].Value, CultureInfo.InvariantCulture)) + 1;
        var ids = new List<string>();
        while (ids.Count < count)
        {
            var id = p + next.ToString(CultureInfo.InvariantCulture);
            next++;
            if (taken.Add(id)) ids.Add(id);
        }
        return ids;
    }

    /// <summary>The unit of the species' [X]0 column in the plan's header, or null when it has none (or no plan).</summary>
    public static UnitInfo? ConcentrationUnit(string? planText, string species) =>
        planText is null ? null : Columns(planText, []).FirstOrDefault(c => c.Kind == Kind.Species && c.Species == species)?.Unit;

    private enum Kind { Run, File, Temperature, Species, Other }

    private sealed record Column(string Header, Kind Kind, UnitInfo? Unit = null, string? Species = null);

    private static List<Column> Columns(string? planText, IReadOnlyList<string> species)
    {
        if (planText is null)
        {
            var mm = Units.Find("mmol/L")!;
            return new List<Column> { new("run", Kind.Run), new("file", Kind.File), new("temperature (°C)", Kind.Temperature, Units.Find("°C")) }
                .Concat(species.Select(s => new Column($"[{s}]0 (mmol/L)", Kind.Species, mm, s))).ToList();
        }
        var header = planText.Replace("\r\n", "\n").Split('\n').Select(l => l.TrimStart('\uFEFF')).First(l => l.Trim().Length > 0 && !l.TrimStart().StartsWith('#'));
        var delimiter = header.Contains(';') ? ';' : header.Contains('\t') ? '\t' : ',';
        var list = new List<Column>();
        foreach (var raw in header.Split(delimiter))
        {
            var h = raw.Trim().Trim('"');
            var sm = SpeciesHeader().Match(h);
            if (sm.Success && Units.Find(sm.Groups["unit"].Value) is { Quantity: Quantity.Concentration } su)
            {
                list.Add(new(h, Kind.Species, su, sm.Groups["sp"].Value.Trim()));
                continue;
            }
            var m = UnitHeader().Match(h);
            var name = (m.Success ? m.Groups["name"].Value : h).Trim();
            var unit = m.Success ? Units.Find(m.Groups["unit"].Value) : null;
            if (name.Equals("run", StringComparison.OrdinalIgnoreCase)) list.Add(new(h, Kind.Run));
            else if (name.Equals("file", StringComparison.OrdinalIgnoreCase)) list.Add(new(h, Kind.File));
            else if (name.ToLowerInvariant() is "temperature" or "t" or "temp" && unit is { Quantity: Quantity.Temperature }) list.Add(new(h, Kind.Temperature, unit));
            else list.Add(new(h, Kind.Other));
        }
        return list;
    }

    /// <summary>A CSV cell, quoted when it holds the delimiter, a quote or a line break (RFC 4180 §2).</summary>
    private static string Cell(string s) => s.IndexOfAny([',', '"', '\n', '\r']) >= 0 ? "\"" + s.Replace("\"", "\"\"") + "\"" : s;
}
