using System.Globalization;
using TraceKin.Traces;

namespace TraceKin.Setup;

/// <summary>
/// A plate map: one or more grids, each laid out as the plate is (row letters down, column numbers across), whose
/// corner cell names the plan.csv column the grid fills, e.g. "[S]0 (mmol/L)", "role" or "temperature (°C)". Grids
/// follow one another in a file (blank lines between them are optional) and may be spread over several files; all
/// must have the same rows and columns. A well with a value in any grid is a run; an empty cell leaves that plan
/// cell empty. <see cref="ToPlanText"/> turns the map into plan.csv rows (run = the well's name, channel = the well,
/// file = the plate export), so nobody types 96 plan rows.
/// </summary>
public sealed record PlateMap(IReadOnlyList<string> Columns, IReadOnlyList<PlateWell> Wells, int Rows, int ColumnCount)
{
    /// <summary>The first map file's delimiter; plan.csv is written with it, so decimal commas in a ';' map stay readable.</summary>
    public char Delimiter { get; init; } = ',';

    /// <summary>The values a "role" grid may hold.</summary>
    public static readonly string[] Roles = ["sample", "blank"];

    /// <summary>Reads the grids of each (file name, text) in order.</summary>
    public static PlateMap FromTexts(IEnumerable<(string File, string Text)> files)
    {
        var columns = new List<string>();
        var where = new Dictionary<string, (string File, int Line, int Column)>(StringComparer.OrdinalIgnoreCase);
        var values = new Dictionary<string, Dictionary<string, string>>(StringComparer.Ordinal);
        var order = new List<(int Row, int Col)>();
        int rows = -1, cols = -1;
        char? delimiter = null;
        foreach (var (file, text) in files)
        {
            var table = SetupTable.FromText(text, file) ?? throw Fail.At(file, 1, 1, "an empty file", "a grid: a corner cell naming a plan column, then the column numbers 1, 2, …");
            delimiter ??= table.Delimiter;
            var records = new[] { table.Header }.Concat(table.Rows).ToList();
            var k = 0;
            while (k < records.Count)
            {
                // grid header: the plan column's name, then 1, 2, … n
                var head = records[k];
                var name = head[0].Trimmed;
                if (name.Length == 0 || WellName.RowIndex(name) >= 0)
                    throw Fail.At(file, head[0].Line, head[0].Column, name.Length == 0 ? "an empty corner cell" : $"row {Fail.Quote(name)} where a grid begins",
                        "the name of the plan column this grid fills, e.g. \"[S]0 (mmol/L)\" or \"role\", then the column numbers 1, 2, …");
                var n = head.Count - 1;
                while (n > 0 && head[n].Trimmed.Length == 0) n--;
                for (var c = 1; c <= n; c++)
                    if (head[c].Trimmed != c.ToString(CultureInfo.InvariantCulture))
                        throw Fail.At(file, head[c].Line, head[c].Column, Fail.Quote(head[c].Trimmed), $"column number {c} (numbers 1, 2, … in order across the grid)");
                if (n == 0) throw Fail.At(file, head.Line, head.EndColumn, "no column numbers", "the column numbers 1, 2, … after the corner cell");
                if (cols < 0) cols = n;
                else if (n != cols)
                    throw Fail.At(file, head[n].Line, head[n].Column, $"{n} columns", $"{cols} columns, as in the first grid", n < cols ? "a column of wells is missing" : "an extra column of wells");
                if (where.TryGetValue(name, out var first))
                    throw Fail.At(file, head[0].Line, head[0].Column, $"a second grid for {Fail.Quote(name)} (first at {first.File} line {first.Line})", "one grid per plan column");
                where[name] = (file, head[0].Line, head[0].Column);
                columns.Add(name);
                var isRole = name.Equals("role", StringComparison.OrdinalIgnoreCase);
                k++;
                var r = 0;
                for (; k < records.Count && WellName.RowIndex(records[k][0].Trimmed) >= 0; k++, r++)
                {
                    var rec = records[k];
                    var letter = rec[0].Trimmed;
                    if (WellName.RowIndex(letter) != r)
                        throw Fail.At(file, rec[0].Line, rec[0].Column, $"row {Fail.Quote(letter)}",
                            rows >= 0 && r >= rows ? $"{rows} rows (A–{WellName.RowLetters(rows - 1)}), as in the first grid" : $"row {WellName.RowLetters(r)} (rows in letter order from A)",
                            "a row of wells is missing, repeated or extra");
                    if (rows >= 0 && r >= rows)
                        throw Fail.At(file, rec[0].Line, rec[0].Column, $"row {Fail.Quote(letter)}", $"{rows} rows (A–{WellName.RowLetters(rows - 1)}), as in the first grid", "an extra row of wells");
                    var filled = rec.Count - 1;
                    while (filled > cols && rec[filled].Trimmed.Length == 0) filled--;
                    if (filled != cols)
                    {
                        var (l, c) = rec.At(Math.Min(filled, cols) + 1);
                        throw Fail.At(file, l, c, $"{filled} cells in row {letter}", $"{cols} cells, one per column of the grid (an empty cell for a well without a value)",
                            filled < cols ? $"well {letter}{filled + 1} is missing" : $"well {letter}{cols + 1} is extra");
                    }
                    for (var c = 1; c <= cols; c++)
                    {
                        var v = rec[c].Trimmed;
                        if (v.Length == 0) continue;
                        if (isRole && !Roles.Contains(v.ToLowerInvariant()))
                            throw Fail.At(file, rec[c].Line, rec[c].Column, Fail.Quote(v), $"a role for well {letter}{c}: {string.Join(" or ", Roles)} (or empty)");
                        var well = $"{letter.ToUpperInvariant()}{c}";
                        if (!values.TryGetValue(well, out var byColumn))
                        {
                            values[well] = byColumn = new Dictionary<string, string>(StringComparer.Ordinal);
                            order.Add((r, c));
                        }
                        byColumn[name] = isRole ? v.ToLowerInvariant() : v;
                    }
                }
                if (r == 0) throw Fail.At(file, head.Line, 1, $"grid {Fail.Quote(name)} with no rows", "rows of wells A, B, … under the grid's column numbers");
                if (rows < 0) rows = r;
                else if (r != rows)
                {
                    var (l, _) = k < records.Count ? (records[k].Line, 1) : (records[^1].EndLine + 1, 1);
                    throw Fail.At(file, l, 1, $"{r} rows in grid {Fail.Quote(name)}", $"{rows} rows (A–{WellName.RowLetters(rows - 1)}), as in the first grid", $"row {WellName.RowLetters(r)} is missing");
                }
            }
        }
        var wells = order.OrderBy(w => w.Row).ThenBy(w => w.Col)
            .Select(w => $"{WellName.RowLetters(w.Row)}{w.Col}")
            .Select(name => new PlateWell(name, values[name])).ToList();
        if (wells.Count == 0) throw Fail.At(columns.Count > 0 ? where[columns[0]].File : "plate map", 1, 1, "no filled well", "at least one well with a value");
        return new PlateMap(columns, wells, rows, cols) { Delimiter = delimiter ?? ',' };
    }

    /// <summary>plan.csv text: run, file, channel, then the map's columns in the order their grids came.</summary>
    public string ToPlanText(string exportFile, string runPrefix = "")
    {
        var sb = new System.Text.StringBuilder();
        var d = Delimiter;
        sb.Append($"run{d}file{d}channel");
        foreach (var c in Columns) sb.Append(d).Append(Quote(c));
        sb.Append('\n');
        foreach (var w in Wells)
        {
            sb.Append(Quote(runPrefix + w.Name)).Append(d).Append(Quote(exportFile)).Append(d).Append(w.Name);
            foreach (var c in Columns) sb.Append(d).Append(Quote(w.Values.GetValueOrDefault(c, "")));
            sb.Append('\n');
        }
        return sb.ToString();
    }

    // RFC 4180 quoting for a cell holding a delimiter, quote or line break; a leading formula sign is not an issue
    // here: plan.csv is read by TraceKin, not opened as a spreadsheet.
    private static string Quote(string s) => s.IndexOfAny([',', '"', '\n', '\r', ';']) >= 0 ? "\"" + s.Replace("\"", "\"\"") + "\"" : s;
}

/// <summary>One mapped well: its normal name ("B7") and its value per plan column, as written in the map.</summary>
public sealed record PlateWell(string Name, IReadOnlyDictionary<string, string> Values);
