using System.Globalization;
using TraceKin.Traces;

namespace TraceKin.Setup;

/// <summary>Where a value of a plate map was written: its file and the 1-based line and column of its cell.</summary>
public sealed record MapCell(string File, int Line, int Column);

/// <summary>A problem of a plate map that leaves the rest of the map usable, and the wells it takes out of the plan.</summary>
public sealed record MapProblem(Problem Problem, IReadOnlyList<string> Wells);

/// <summary>
/// A plate map: one or more grids, each laid out as the plate is (row letters down, column numbers across), whose
/// corner cell names the plan.csv column the grid fills, e.g. "[S]0 (mmol/L)", "role" or "temperature (°C)". Grids
/// follow one another in a file (blank lines between them are optional) and may be spread over several files; all
/// must have the same rows and columns. A well with a value in any grid is a run; an empty cell leaves that plan
/// cell empty. Two grid names are special: "file" gives a well's export (else the plate export), "channel" the
/// channel it reads (else the well itself). <see cref="ToPlanText"/> turns the map into plan.csv rows (run = the
/// well's name), and <see cref="ToPlan"/> into a <see cref="Plan"/> in memory whose every problem is located in the map.
/// <para>
/// A problem that makes the map as a whole unreadable (a grid's header, a grid given twice, a grid with another
/// number of columns) is thrown by <see cref="Read"/>. A problem confined to some wells (a row with a missing or
/// extra well, a row given twice, missing or beyond the plate, a bad value) is kept in <see cref="Problems"/>
/// and takes only those wells out of the plan; <see cref="FromTexts"/> throws the first of them.
/// </para>
/// </summary>
public sealed record PlateMap(IReadOnlyList<string> Columns, IReadOnlyList<PlateWell> Wells, int Rows, int ColumnCount)
{
    /// <summary>The first map file's delimiter; plan.csv is written with it, so decimal commas in a ';' map stay readable.</summary>
    public char Delimiter { get; init; } = ',';

    /// <summary>The values a "role" grid may hold.</summary>
    public static readonly string[] Roles = ["sample", "blank"];

    /// <summary>Problems confined to some wells, in the order met (file, then line).</summary>
    public IReadOnlyList<MapProblem> Problems { get; init; } = [];

    /// <summary>Wells taken out by <see cref="Problems"/>, with what could be read of them (see <see cref="PlateWell.Unknown"/>).</summary>
    public IReadOnlyList<PlateWell> Rejected { get; init; } = [];

    /// <summary>Each grid's corner cell, by grid name.</summary>
    public IReadOnlyDictionary<string, MapCell> Corners { get; init; } = new Dictionary<string, MapCell>();

    /// <summary>Reads the grids of each (file name, text) in order, and throws the first problem of any kind.</summary>
    public static PlateMap FromTexts(IEnumerable<(string File, string Text)> files)
    {
        var map = Read(files);
        if (map.Problems.Count > 0) throw new InputException(map.Problems[0].Problem);
        return map;
    }

    /// <summary>
    /// Reads the grids of each (file name, text) in order. Throws (located) only when the map as a whole cannot be
    /// read; a problem confined to some wells is kept in <see cref="Problems"/>.
    /// </summary>
    public static PlateMap Read(IEnumerable<(string File, string Text)> files)
    {
        var columns = new List<string>();
        var corners = new Dictionary<string, MapCell>(StringComparer.OrdinalIgnoreCase);
        var values = new Dictionary<(int Row, int Col), Dictionary<string, (string Value, MapCell Cell)>>();
        var unknown = new Dictionary<(int Row, int Col), HashSet<string>>();
        var broken = new List<(int Row, string Grid)>();
        var hinted = new HashSet<(int Row, int Col)>();
        // a problem names its wells directly, or the rows whose wells it takes out (known once every grid is read)
        var problems = new List<(Problem Problem, HashSet<(int Row, int Col)> Wells, int Row)>();
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
                if (name.Equals("run", StringComparison.OrdinalIgnoreCase))
                    throw Fail.At(file, head[0].Line, head[0].Column, "a grid of run ids", "a grid of another plan column: a mapped well's run id is its name (with the run prefix, if any)");
                var n = head.Count - 1;
                while (n > 0 && head[n].Trimmed.Length == 0) n--;
                for (var c = 1; c <= n; c++)
                    if (head[c].Trimmed != c.ToString(CultureInfo.InvariantCulture))
                        throw Fail.At(file, head[c].Line, head[c].Column, Fail.Quote(head[c].Trimmed), $"column number {c} (numbers 1, 2, … in order across the grid)");
                if (n == 0) throw Fail.At(file, head.Line, head.EndColumn, "no column numbers", "the column numbers 1, 2, … after the corner cell");
                if (cols < 0) cols = n;
                else if (n != cols)
                    throw Fail.At(file, head[n].Line, head[n].Column, $"{n} columns", $"{cols} columns, as in the first grid", n < cols ? "a column of wells is missing" : "an extra column of wells");
                if (corners.TryGetValue(name, out var first))
                    throw Fail.At(file, head[0].Line, head[0].Column, $"a second grid for {Fail.Quote(name)} (first at {first.File} line {first.Line})", "one grid per plan column");
                corners[name] = new MapCell(file, head[0].Line, head[0].Column);
                columns.Add(name);
                var isRole = name.Equals("role", StringComparison.OrdinalIgnoreCase);
                k++;
                var start = k;
                while (k < records.Count && WellName.RowIndex(records[k][0].Trimmed) >= 0) k++;
                if (k == start) throw Fail.At(file, head.Line, 1, $"grid {Fail.Quote(name)} with no rows", "rows of wells A, B, … under the grid's column numbers");
                if (rows < 0) rows = k - start;
                var seen = new Dictionary<int, int>();
                for (var i = start; i < k; i++)
                {
                    var rec = records[i];
                    var letter = rec[0].Trimmed;
                    var r = WellName.RowIndex(letter);
                    void Hint()
                    {
                        for (var c = 1; c < rec.Count && c <= cols; c++)
                            if (rec[c].Trimmed.Length > 0) hinted.Add((r, c));
                    }
                    if (r >= rows)
                    {
                        problems.Add((Fail.At(file, rec[0].Line, rec[0].Column, $"row {Fail.Quote(letter)}", $"{rows} rows (A–{WellName.RowLetters(rows - 1)}), as in the first grid", "an extra row of wells").Problem, [], -1));
                        continue;
                    }
                    if (seen.TryGetValue(r, out var firstLine))
                    {
                        problems.Add((Fail.At(file, rec[0].Line, rec[0].Column, $"row {Fail.Quote(letter)} again (first on line {firstLine})", "each plate row once in a grid",
                            "a row of wells is repeated, so which of its values hold is not known").Problem, [], r));
                        broken.Add((r, name));
                        Hint();
                        continue;
                    }
                    seen[r] = rec.Line;
                    var filled = rec.Count - 1;
                    while (filled > cols && rec[filled].Trimmed.Length == 0) filled--;
                    if (filled != cols)
                    {
                        var (l, c) = rec.At(Math.Min(filled, cols) + 1);
                        problems.Add((Fail.At(file, l, c, $"{filled} cells in row {letter}", $"{cols} cells, one per column of the grid (an empty cell for a well without a value)",
                            filled < cols ? $"well {letter}{filled + 1} is missing" : $"well {letter}{cols + 1} is extra").Problem, [], r));
                        broken.Add((r, name));
                        Hint();
                        continue;
                    }
                    for (var c = 1; c <= cols; c++)
                    {
                        var v = rec[c].Trimmed;
                        if (v.Length == 0) continue;
                        var well = $"{WellName.RowLetters(r)}{c}";
                        string? bad = v.IndexOfAny(['\r', '\n']) >= 0 ? "a value on one line"
                            : isRole && !Roles.Contains(v.ToLowerInvariant()) ? $"a role for well {well}: {string.Join(" or ", Roles)} (or empty)"
                            : null;
                        if (bad is not null)
                        {
                            problems.Add((Fail.At(file, rec[c].Line, rec[c].Column, Fail.Quote(v), bad).Problem, [(r, c)], -1));
                            (unknown.TryGetValue((r, c), out var u) ? u : unknown[(r, c)] = new(StringComparer.OrdinalIgnoreCase)).Add(name);
                            continue;
                        }
                        if (!values.TryGetValue((r, c), out var byColumn))
                            values[(r, c)] = byColumn = new Dictionary<string, (string, MapCell)>(StringComparer.OrdinalIgnoreCase);
                        byColumn[name] = (isRole ? v.ToLowerInvariant() : v, new MapCell(file, rec[c].Line, rec[c].Column));
                    }
                }
                for (var r = 0; r < rows; r++)
                {
                    if (seen.ContainsKey(r)) continue;
                    var l = k < records.Count ? records[k].Line : records[^1].EndLine + 1;
                    problems.Add((Fail.At(file, l, 1, $"{seen.Count} rows in grid {Fail.Quote(name)}", $"{rows} rows (A–{WellName.RowLetters(rows - 1)}), as in the first grid",
                        $"row {WellName.RowLetters(r)} is missing").Problem, [], r));
                    broken.Add((r, name));
                }
            }
        }
        // A row that cannot be read in one grid leaves its wells without that grid's values: they are all taken out.
        foreach (var (r, grid) in broken)
            for (var c = 1; c <= cols; c++)
            {
                (unknown.TryGetValue((r, c), out var u) ? u : unknown[(r, c)] = new(StringComparer.OrdinalIgnoreCase)).Add(grid);
                if (values.TryGetValue((r, c), out var byColumn)) byColumn.Remove(grid);
            }
        bool IsWell((int Row, int Col) at) => values.TryGetValue(at, out var v) && v.Count > 0 || hinted.Contains(at) || unknown.ContainsKey(at) && values.ContainsKey(at);
        foreach (var p in problems.Where(p => p.Row >= 0))
            for (var c = 1; c <= cols; c++)
                if (IsWell((p.Row, c))) p.Wells.Add((p.Row, c));
        var out_ = problems.SelectMany(p => p.Wells).ToHashSet();
        string Name((int Row, int Col) w) => $"{WellName.RowLetters(w.Row)}{w.Col}";
        PlateWell Well((int Row, int Col) w)
        {
            var byColumn = values.GetValueOrDefault(w) ?? [];
            return new PlateWell(Name(w), byColumn.ToDictionary(kv => kv.Key, kv => kv.Value.Value, StringComparer.OrdinalIgnoreCase))
            {
                Cells = byColumn.ToDictionary(kv => kv.Key, kv => kv.Value.Cell, StringComparer.OrdinalIgnoreCase),
                Unknown = unknown.TryGetValue(w, out var u) ? u : new HashSet<string>(),
            };
        }
        static IEnumerable<(int Row, int Col)> Ordered(IEnumerable<(int Row, int Col)> wells) => wells.OrderBy(w => w.Row).ThenBy(w => w.Col);
        var wells = Ordered(values.Where(kv => kv.Value.Count > 0 && !out_.Contains(kv.Key)).Select(kv => kv.Key)).Select(Well).ToList();
        if (wells.Count == 0 && out_.Count == 0)
            throw Fail.At(columns.Count > 0 ? corners[columns[0]].File : "plate map", 1, 1, "no filled well", "at least one well with a value");
        return new PlateMap(columns, wells, rows, cols)
        {
            Delimiter = delimiter ?? ',',
            Corners = corners,
            Problems = problems.Select(p => new MapProblem(p.Problem, Ordered(p.Wells).Select(Name).ToList())).ToList(),
            Rejected = Ordered(out_).Select(Well).ToList(),
        };
    }

    /// <summary>plan.csv text: run, file, channel, then the map's other columns in the order their grids came.</summary>
    public string ToPlanText(string? exportFile, string runPrefix = "") => PlanText(Wells, exportFile, runPrefix, null);

    private string PlanText(IReadOnlyList<PlateWell> wells, string? exportFile, string runPrefix, List<int[]>? starts)
    {
        var sb = new System.Text.StringBuilder();
        var d = Delimiter;
        var own = OwnColumns;
        var lineStart = 0;
        void Cell(List<int>? at, string text, bool first = false)
        {
            if (!first) sb.Append(d);
            at?.Add(sb.Length - lineStart + 1);
            sb.Append(text);
        }
        var header = starts is null ? null : new List<int>();
        Cell(header, "run", true);
        Cell(header, "file");
        Cell(header, "channel");
        foreach (var c in own) Cell(header, Quote(c));
        sb.Append('\n');
        if (header is not null) starts!.Add([.. header]);
        foreach (var w in wells)
        {
            lineStart = sb.Length;
            var at = starts is null ? null : new List<int>();
            Cell(at, Quote(runPrefix + w.Name), true);
            Cell(at, Quote(w.Values.GetValueOrDefault("file") ?? exportFile ?? ""));
            Cell(at, Quote(w.Values.GetValueOrDefault("channel") ?? w.Name));
            foreach (var c in own) Cell(at, Quote(w.Values.GetValueOrDefault(c, "")));
            sb.Append('\n');
            if (at is not null) starts!.Add([.. at]);
        }
        return sb.ToString();
    }

    /// <summary>The grids that become plan columns of their own (all but "file" and "channel", which fill the plan's own).</summary>
    private IReadOnlyList<string> OwnColumns => Columns.Where(c => !IsSpecial(c)).ToList();

    private static bool IsSpecial(string column) => column.Equals("file", StringComparison.OrdinalIgnoreCase) || column.Equals("channel", StringComparison.OrdinalIgnoreCase);

    /// <summary>
    /// The plan of the map's wells, built in memory as plan.csv would be read (<see cref="Plan.FromText"/>), with each
    /// problem located at the map cell it comes from. A well whose value the plan refuses, or that subtracts a well
    /// taken out, is left out with its problem; the other wells make the plan. Its <see cref="Plan.Locate"/> moves a
    /// later problem about a plan cell (an export that cannot be read, a channel it lacks) to the map cell, or to
    /// <paramref name="exportCell"/> for the plate export.
    /// </summary>
    /// <param name="label">The plan's <see cref="Plan.File"/> as messages name it (e.g. "plate map (plate-map.csv)").</param>
    /// <exception cref="InputException">A problem of the map as a whole (a grid's name that is no plan column), located at its corner cell.</exception>
    public MapPlan ToPlan(string? exportFile, string runPrefix, string label, MapCell? exportCell = null)
    {
        var problems = Problems.Select(p => Annotated(p.Problem, p.Wells)).ToList();
        var usable = Wells.ToList();
        var outOfPlan = Rejected.ToDictionary(w => w.Name, w => Problems.First(p => p.Wells.Contains(w.Name)).Problem, StringComparer.Ordinal);
        var outWells = Rejected.ToList();
        while (true)
        {
            // a well that subtracts a well taken out (or a group it may belong to) goes too: its blank would be wrong
            for (var changed = true; changed;)
            {
                changed = false;
                for (var i = 0; i < usable.Count; i++)
                {
                    var d = usable[i];
                    if (d.Values.GetValueOrDefault("subtract") is not { } what) continue;
                    if (outWells.FirstOrDefault(w => Subtracts(what, runPrefix, w)) is not { } gone) continue;
                    var cell = d.Cells["subtract"];
                    var p = new Problem(cell.File, cell.Line, cell.Column, $"well {d.Name} subtracting {Fail.Quote(what)}, which takes in well {gone.Name}, itself not analysed ({outOfPlan[gone.Name].Message})",
                        "a blank well that can be read", "fix the blank well first; this well is analysed again then") { Input = cell.File };
                    problems.Add(p);
                    outOfPlan[d.Name] = p;
                    outWells.Add(d);
                    usable.RemoveAt(i--);
                    changed = true;
                }
            }
            if (usable.Count == 0) return new MapPlan(null, problems);
            var starts = new List<int[]>();
            var text = PlanText(usable, exportFile, runPrefix, starts);
            Problem Locate(Problem p) => Relocate(p, usable, starts, exportCell);
            try
            {
                var plan = Plan.FromText(text, label);
                var rows = plan.Rows.Select((r, i) => r with
                {
                    Conditions = r.Conditions.ToDictionary(kv => kv.Key, kv => kv.Value with { Origin = usable[i].Cells.TryGetValue(kv.Value.Header, out var c) ? $"{c.File} line {c.Line}, column {c.Column}, well {usable[i].Name}" : null }, StringComparer.Ordinal),
                }).ToList();
                return new MapPlan(plan with { Rows = rows, Origin = Locate }, problems);
            }
            catch (InputException ex)
            {
                var p = ex.Problem;
                var located = Locate(p);
                // a refused value on a well's line takes that well out; anything else concerns the whole map
                if (p.Line < 2 || p.Line - 2 >= usable.Count) throw new InputException(located);
                var w = usable[p.Line - 2];
                problems.Add(Annotated(located, [w.Name]));
                outOfPlan[w.Name] = located;
                outWells.Add(w);
                usable.RemoveAt(p.Line - 2);
            }
        }
    }

    /// <summary>Does a subtract cell's text take in this well: its run id, its well, or a group it (a blank, or maybe one) is in.</summary>
    private static bool Subtracts(string what, string runPrefix, PlateWell w)
    {
        if (what == runPrefix + w.Name || WellName.Normalise(what) == w.Name) return true;
        // only blank runs make a group (Plan.ResolveBlanks): a well whose role could not be read may be one
        var role = w.Values.GetValueOrDefault("role");
        if (!(role == "blank" || role is null && w.Unknown.Contains("role"))) return false;
        return w.Unknown.Contains("group") || string.Equals(w.Values.GetValueOrDefault("group"), what, StringComparison.Ordinal);
    }

    /// <summary>A problem located in the in-memory plan text moved to the map cell (or the export's setting) it comes from.</summary>
    private Problem Relocate(Problem p, IReadOnlyList<PlateWell> wells, List<int[]> starts, MapCell? exportCell)
    {
        if (p.Line < 1 || p.Line > starts.Count) return p;
        var at = starts[p.Line - 1];
        var index = 0;
        while (index + 1 < at.Length && at[index + 1] <= p.Column) index++;
        var own = OwnColumns;
        var column = index switch { 0 => "run", 1 => "file", 2 => "channel", _ => own[index - 3] };
        if (p.Line == 1)
        {
            var corner = Corners.GetValueOrDefault(column) ?? (column == "file" ? exportCell : null) ?? Corners[Columns[0]];
            return p with { File = corner.File, Line = corner.Line, Column = corner.Column };
        }
        var w = wells[p.Line - 2];
        var cell = w.Cells.GetValueOrDefault(column) ?? (column == "file" ? exportCell : null) ?? w.Cells.Values.OrderBy(c => c.File == Corners[Columns[0]].File ? 0 : 1).ThenBy(c => c.Line).ThenBy(c => c.Column).First();
        return p with { File = cell.File, Line = cell.Line, Column = cell.Column, Found = $"well {w.Name}: {p.Found}" };
    }

    private static Problem Annotated(Problem p, IReadOnlyList<string> wells) => wells.Count == 0 ? p : p with
    {
        Hint = (string.IsNullOrWhiteSpace(p.Hint) ? "" : p.Hint + "; ") + $"not analysed: well{(wells.Count == 1 ? "" : "s")} {string.Join(", ", wells)}",
    };

    // RFC 4180 quoting for a cell holding a delimiter, quote or line break; a leading formula sign is not an issue
    // here: plan.csv is read by TraceKin, not opened as a spreadsheet.
    private static string Quote(string s) => s.IndexOfAny([',', '"', '\n', '\r', ';', '\t']) >= 0 ? "\"" + s.Replace("\"", "\"\"") + "\"" : s;
}

/// <summary>One mapped well: its normal name ("B7") and its value per plan column, as written in the map.</summary>
public sealed record PlateWell(string Name, IReadOnlyDictionary<string, string> Values)
{
    /// <summary>The map cell of each value.</summary>
    public IReadOnlyDictionary<string, MapCell> Cells { get; init; } = new Dictionary<string, MapCell>();

    /// <summary>Grids whose value for this well could not be read (a taken-out well only).</summary>
    public IReadOnlySet<string> Unknown { get; init; } = new HashSet<string>();
}

/// <summary>The plan made from a plate map (null when no well is left) and the problems of the wells left out.</summary>
public sealed record MapPlan(Plan? Plan, IReadOnlyList<Problem> Problems);
