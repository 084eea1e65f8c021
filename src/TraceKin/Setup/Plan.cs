using System.Globalization;
using System.Text.RegularExpressions;
using TraceKin.Traces;

namespace TraceKin.Setup;

/// <summary>One run of the plan. Concentrations in mol/L keyed by species name ("A" for a column "[A]0 (mmol/L)").</summary>
public sealed record PlanRow(
    string Run,
    string File,
    double? TemperatureK,
    IReadOnlyDictionary<string, double> InitialConcentrations,
    IReadOnlyDictionary<string, string> Extra,
    int Line)
{
    /// <summary>1-based column number where the row's file cell starts (for messages about the file it names).</summary>
    public int FileColumn { get; init; } = 1;
}

/// <summary>
/// plan.csv: the series' run table. Columns `run`, `file`, `temperature (unit)` and one `[X]0 (unit)` per species;
/// other columns are kept as text. Comma or semicolon delimited; decimal point, or decimal comma with semicolons.
/// </summary>
public sealed partial record Plan(string File, IReadOnlyList<PlanRow> Rows, IReadOnlyList<string> Species)
{
    [GeneratedRegex(@"^\[(?<sp>[^\]]+)\]\s*0\s*(?:[\(\[](?<unit>[^\)\]]*)[\)\]])?$")]
    private static partial Regex SpeciesHeader();

    [GeneratedRegex(@"^(?<name>[^\(\[]+?)\s*(?:[\(\[](?<unit>[^\)\]]*)[\)\]])?$")]
    private static partial Regex UnitHeader();

    public static Plan FromFile(string path) =>
        FromText(System.IO.File.ReadAllText(path), System.IO.Path.GetFileName(path));

    public static Plan FromText(string text, string file)
    {
        var lines = text.Replace("\r\n", "\n").Replace('\r', '\n').Split('\n');
        var headerIndex = Array.FindIndex(lines, l => l.Trim().Length > 0 && !l.TrimStart().StartsWith('#'));
        if (headerIndex < 0)
            throw Fail.At(file, 1, 1, "an empty file", "a header line: run,file,temperature (°C),[A]0 (mmol/L)", "see docs/formats.md");
        var headerLine = lines[headerIndex].TrimStart('\uFEFF');
        var delimiter = headerLine.Contains(';') ? ';' : headerLine.Contains('\t') ? '\t' : ',';
        var header = Split(headerLine, delimiter);

        int runCol = -1, fileCol = -1, tempCol = -1;
        UnitInfo? tempUnit = null;
        var species = new List<(string Name, int Col, UnitInfo Unit)>();
        var extra = new List<(string Name, int Col)>();
        for (var c = 0; c < header.Length; c++)
        {
            var h = header[c].Trim();
            var sm = SpeciesHeader().Match(h);
            if (sm.Success)
            {
                var unitText = sm.Groups["unit"].Success ? sm.Groups["unit"].Value : "";
                if (unitText.Length == 0)
                    throw Fail.At(file, headerIndex + 1, Col(headerLine, delimiter, c), Fail.Quote(h), "a concentration unit in the header, e.g. \"[A]0 (mmol/L)\"");
                species.Add((sm.Groups["sp"].Value.Trim(), c, Units.Require(unitText, Quantity.Concentration, file, headerIndex + 1, Col(headerLine, delimiter, c))));
                continue;
            }
            var um = UnitHeader().Match(h);
            var name = um.Success ? um.Groups["name"].Value.Trim().ToLowerInvariant() : h.ToLowerInvariant();
            switch (name)
            {
                case "run": runCol = c; break;
                case "file": fileCol = c; break;
                case "temperature" or "t" or "temp":
                    tempCol = c;
                    var u = um.Groups["unit"].Success ? um.Groups["unit"].Value : "";
                    if (u.Length == 0)
                        throw Fail.At(file, headerIndex + 1, Col(headerLine, delimiter, c), Fail.Quote(h), "a temperature unit in the header, e.g. \"temperature (°C)\" or \"temperature (K)\"");
                    tempUnit = Units.Require(u, Quantity.Temperature, file, headerIndex + 1, Col(headerLine, delimiter, c));
                    break;
                default: extra.Add((h, c)); break;
            }
        }
        if (runCol < 0) throw Fail.At(file, headerIndex + 1, 1, Fail.Quote(headerLine), "a column named \"run\"");
        if (fileCol < 0) throw Fail.At(file, headerIndex + 1, 1, Fail.Quote(headerLine), "a column named \"file\"");

        // A semicolon-delimited plan may use decimal commas; a comma-delimited one cannot.
        var culture = delimiter == ';' && LooksDecimalComma(lines, headerIndex + 1, delimiter) ? CultureInfo.GetCultureInfo("de-DE") : CultureInfo.InvariantCulture;
        var rows = new List<PlanRow>();
        var seenRuns = new Dictionary<string, int>(StringComparer.Ordinal);
        for (var i = headerIndex + 1; i < lines.Length; i++)
        {
            var line = lines[i];
            if (line.Trim().Length == 0 || line.TrimStart().StartsWith('#')) continue;
            var cells = Split(line, delimiter);
            if (cells.Length != header.Length)
                throw Fail.At(file, i + 1, Col(line, delimiter, Math.Min(cells.Length, header.Length)), $"{cells.Length} cells", $"{header.Length} cells, as in the header", "check for a missing or extra delimiter");
            var run = cells[runCol].Trim();
            if (run.Length == 0) throw Fail.At(file, i + 1, Col(line, delimiter, runCol), "an empty run id", "a run id");
            if (seenRuns.TryGetValue(run, out var firstLine))
                throw Fail.At(file, i + 1, Col(line, delimiter, runCol), $"run id {Fail.Quote(run)} again (first on line {firstLine})", "a unique run id per row");
            seenRuns[run] = i + 1;
            var fileName = cells[fileCol].Trim();
            if (fileName.Length == 0) throw Fail.At(file, i + 1, Col(line, delimiter, fileCol), "an empty file name", "the export's file name");
            double? temp = null;
            if (tempCol >= 0 && cells[tempCol].Trim().Length > 0)
            {
                var t = tempUnit!.ToInternal(Number(cells[tempCol], culture, file, i + 1, Col(line, delimiter, tempCol)));
                if (!(t > 0 && t < 1000))
                    throw Fail.At(file, i + 1, Col(line, delimiter, tempCol), Fail.Quote(cells[tempCol]), "a temperature between 0 K and 1000 K");
                temp = t;
            }
            var conc = new Dictionary<string, double>(StringComparer.Ordinal);
            foreach (var (sp, col, unit) in species)
            {
                if (cells[col].Trim().Length == 0) continue;
                var v = unit.ToInternal(Number(cells[col], culture, file, i + 1, Col(line, delimiter, col)));
                if (v < 0) throw Fail.At(file, i + 1, Col(line, delimiter, col), Fail.Quote(cells[col]), "a concentration ≥ 0");
                conc[sp] = v;
            }
            var ex = extra.ToDictionary(e => e.Name, e => cells[e.Col].Trim(), StringComparer.Ordinal);
            rows.Add(new PlanRow(run, fileName, temp, conc, ex, i + 1) { FileColumn = Col(line, delimiter, fileCol) });
        }
        if (rows.Count == 0)
            throw Fail.At(file, headerIndex + 2, 1, "no run rows", "one row per run under the header");
        return new Plan(file, rows, species.Select(s => s.Name).ToArray());
    }

    private static bool LooksDecimalComma(string[] lines, int from, char delimiter)
    {
        for (var i = from; i < lines.Length; i++)
            foreach (var cell in Split(lines[i], delimiter))
            {
                var t = cell.Trim();
                if (t.Length > 0 && (char.IsDigit(t[0]) || t[0] == '-') && t.Contains(',') && !t.Contains('.')) return true;
                if (t.Length > 0 && char.IsDigit(t[0]) && t.Contains('.') && !t.Contains(',')) return false;
            }
        return false;
    }

    /// <summary>1-based character position where cell <paramref name="index"/> starts (quotes ignored: plan cells rarely hold delimiters).</summary>
    private static int Col(string line, char delimiter, int index)
    {
        var pos = 0;
        for (var k = 0; k < index; k++)
        {
            var next = line.IndexOf(delimiter, pos);
            if (next < 0) return line.Length + 1;
            pos = next + 1;
        }
        return pos + 1;
    }

    private static double Number(string cell, CultureInfo culture, string file, int line, int col)
    {
        var t = cell.Trim();
        if (double.TryParse(t, NumberStyles.Float, culture, out var v) && double.IsFinite(v)) return v;
        throw Fail.At(file, line, col, Fail.Quote(t), culture == CultureInfo.InvariantCulture ? "a number with a decimal point" : "a number with a decimal comma");
    }

    /// <summary>Split one line on the delimiter, honouring double quotes ("" inside quotes is a quote).</summary>
    internal static string[] Split(string line, char delimiter)
    {
        var cells = new List<string>();
        var sb = new System.Text.StringBuilder();
        var quoted = false;
        for (var i = 0; i < line.Length; i++)
        {
            var ch = line[i];
            if (quoted)
            {
                if (ch == '"' && i + 1 < line.Length && line[i + 1] == '"') { sb.Append('"'); i++; }
                else if (ch == '"') quoted = false;
                else sb.Append(ch);
            }
            else if (ch == '"') quoted = true;
            else if (ch == delimiter) { cells.Add(sb.ToString()); sb.Clear(); }
            else sb.Append(ch);
        }
        cells.Add(sb.ToString());
        return cells.ToArray();
    }
}
