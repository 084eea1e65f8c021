using System.Globalization;
using System.Text;
using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>
/// The grid layout of a plate export: one grid of wells per reading, repeated down the file. Each reading is
/// <list type="number">
/// <item>a time line: a time name with its unit, then the reading's time ("time (s),30" or "time (min);0,5");</item>
/// <item>a grid header: an empty cell, then the column numbers 1, 2, … in order;</item>
/// <item>one line per plate row, in letter order (A, B, …): the row letter, then one value per column.</item>
/// </list>
/// Blank lines and lines starting with '#' between readings are skipped; lines before the first time line are a
/// preamble (kept as metadata when "key: value"). Every reading must have the first reading's rows and columns: a
/// missing or extra well is a located error. Each well becomes a channel named in the normal form ("A1"), its values in
/// ingest.well_unit. Delimiter: the one after the grid header's empty cell (comma, semicolon or tab); decimal commas
/// only with semicolons or tabs (or as ingest.decimal says).
/// </summary>
internal static class GridReader
{
    /// <summary>A grid header followed by a row "A": what sniffing looks for within the first 200 lines.</summary>
    public static bool Looks(ReadOnlySpan<byte> utf8)
    {
        var text = Encoding.UTF8.GetString(utf8[..Math.Min(utf8.Length, 64 * 1024)]);
        var lines = text.Replace("\r\n", "\n").Split('\n');
        for (var i = 0; i + 1 < lines.Length && i < 200; i++)
            if (GridHeader(lines[i]) is { } d && Cells(lines[i + 1], d) is [var first, ..] && first.Trim().Equals("A", StringComparison.OrdinalIgnoreCase))
                return true;
        return false;
    }

    /// <summary>The delimiter of a grid header line (empty cell, then 1, 2, … at least to 2), else null.</summary>
    private static char? GridHeader(string line)
    {
        var t = line.TrimEnd('\r');
        if (t.Length == 0 || t.TrimStart(' ').Length == 0) return null;
        var lead = t.TrimStart(' ');
        if (lead.Length == 0 || lead[0] is not (',' or ';' or '\t')) return null;
        var d = lead[0];
        var cells = Cells(t, d);
        if (cells.Length < 3 || cells[0].Trim().Length != 0) return null;
        for (var c = 1; c < cells.Length; c++)
            if (cells[c].Trim() != c.ToString(CultureInfo.InvariantCulture)) return c > 2 && cells[c..].All(x => x.Trim().Length == 0) ? d : null;
        return d;
    }

    private static string[] Cells(string line, char d) => line.TrimEnd('\r').Split(d);

    public static RunExport Read(ReadOnlyMemory<byte> utf8, string file, string encoding, IngestSettings settings)
    {
        var detected = new List<KeyValuePair<string, string>>
        {
            new("format", "delimited text"),
            new("encoding", encoding),
            new("line endings", TextLines.LineEndings(utf8.Span)),
        };
        var text = Encoding.UTF8.GetString(utf8.Span);
        var lines = text.Split('\n');
        var lastLine = text.EndsWith('\n') ? lines.Length - 1 : lines.Length;
        var metadata = new Dictionary<string, string>(StringComparer.OrdinalIgnoreCase);
        var wellUnit = Units.Find(settings.WellUnit) ?? throw Fail.Setting(file, "ingest.well_unit", Fail.Quote(settings.WellUnit), "a signal unit TraceKin knows");

        // The first grid header fixes the delimiter and the number of columns.
        var firstHeader = -1;
        char d = ',';
        for (var h = 0; h < lines.Length; h++)
            if (GridHeader(lines[h]) is { } found) { firstHeader = h; d = found; break; }
        if (firstHeader < 0)
            throw Fail.At(file, 1, 1, "no grid of wells", "a grid header line: an empty cell, then the column numbers 1, 2, 3, …",
                "ingest.layout = \"grid\" expects one grid of wells per reading, the reading's time above it");
        var culture = DecimalCulture(settings, d, lines, firstHeader);
        detected.Add(new("layout", "grid: one grid of wells per reading, the reading's time above it" + (settings.Layout == "grid" ? " (set by ingest.layout)" : "")));
        detected.Add(new("delimiter", CellSplitter.DelimiterName((byte)d) + (settings.Delimiter is null ? "" : " (set by ingest.delimiter)")));
        detected.Add(new("decimal separator", culture.Equals(CultureInfo.InvariantCulture) ? "point" : "comma"));

        int columns = -1, rows = -1;
        UnitInfo? timeUnit = null;
        var times = new List<double>();
        var values = new List<double[]>();   // one array per reading, row-major
        var readingLines = new List<int>();
        string? timeHeader = null;
        var i0 = 0;
        // preamble: "key: value" lines before the first time line are metadata
        var firstTime = TimeLineBefore(lines, firstHeader, d);
        for (; i0 < firstTime; i0++)
        {
            var l = lines[i0].TrimEnd('\r');
            var colon = l.IndexOf(':');
            if (colon > 0 && !l.StartsWith('#')) metadata[l[..colon].Trim()] = l[(colon + 1)..].Trim();
        }
        detected.Add(new("preamble", firstTime == 0 ? "none" : $"{firstTime} line{(firstTime == 1 ? "" : "s")} ({metadata.Count} metadata)"));

        var i = firstTime;
        while (i < lines.Length)
        {
            var line = lines[i].TrimEnd('\r');
            if (line.Trim().Length == 0 || line.TrimStart().StartsWith('#') || line.Split(d).All(c => c.Trim().Length == 0)) { i++; continue; }
            // time line
            var cells = line.Split(d);
            var (name, unitText) = ColumnHeader.Split(cells[0]);
            if (!ColumnHeader.IsTimeName(cells[0]) || cells.Length < 2)
                throw Fail.At(file, i + 1, 1, Fail.Quote(Short(line)), "a time line before each grid, e.g. \"time (s)" + d + "30\"", "each reading starts with its time, then the grid of wells");
            if (unitText is null || Units.Find(unitText) is not { Quantity: Quantity.Time } tu)
                throw Fail.At(file, i + 1, 1, Fail.Quote(cells[0]), "a time name with a time unit, e.g. \"time (s)\" or \"time (min)\"");
            if (timeUnit is null) { timeUnit = tu; timeHeader = cells[0].Trim(); }
            else if (tu != timeUnit)
                throw Fail.At(file, i + 1, 1, Fail.Quote(cells[0]), $"the same time unit in every reading ({Fail.Quote(timeHeader!)} on the first)");
            var tcol = cells[0].Length + 2;
            if (!double.TryParse(cells[1].Trim(), NumberStyles.Float, culture, out var tRaw) || !double.IsFinite(tRaw))
                throw Fail.At(file, i + 1, tcol, Fail.Quote(cells[1].Trim()), "the reading's time, a number");
            var t = tu.ToInternal(tRaw);
            if (times.Count > 0 && t <= times[^1])
                throw Fail.At(file, i + 1, tcol, Fail.Quote(cells[1].Trim()), $"a time after the previous reading's ({times[^1].ToString("R", CultureInfo.InvariantCulture)} s)", "readings must be in time order");
            var timeLine = i + 1;
            i++;
            while (i < lines.Length && lines[i].Trim().Length == 0) i++;
            if (i >= lines.Length || GridHeader(lines[i]) is not { } hd || hd != d)
                throw Fail.At(file, Math.Min(i + 1, lines.Length), 1, i < lines.Length ? Fail.Quote(Short(lines[i].TrimEnd('\r'))) : "the end of the file",
                    $"a grid header after the time line on line {timeLine}: an empty cell, then the column numbers 1{d}2{d}3…");
            var n = lines[i].TrimEnd('\r').Split(d).Skip(1).TakeWhile(c => c.Trim().Length > 0).Count();
            if (columns < 0) columns = n;
            else if (n != columns)
                throw Fail.At(file, i + 1, 1, $"{n} columns", $"{columns} columns, as in the first grid", n < columns ? "a column of wells is missing" : "an extra column of wells");
            i++;
            var grid = new List<double>();
            var r = 0;
            for (; i < lines.Length; i++, r++)
            {
                var rl = lines[i].TrimEnd('\r');
                var rc = rl.Split(d);
                var letter = rc[0].Trim();
                if (rl.Trim().Length == 0 || WellName.RowIndex(letter) < 0 || ColumnHeader.IsTimeName(rc[0])) break;
                if (WellName.RowIndex(letter) != r)
                    throw Fail.At(file, i + 1, 1, $"row {Fail.Quote(letter)}", $"row {WellName.RowLetters(r)} (rows in letter order from A)", "a row of wells is missing or repeated");
                if (rows >= 0 && r >= rows)
                    throw Fail.At(file, i + 1, 1, $"row {Fail.Quote(letter)}", $"{rows} rows (A–{WellName.RowLetters(rows - 1)}), as in the first grid", "an extra row of wells");
                var col = rc[0].Length + 2;
                var filled = rc.Length - 1;
                while (filled > columns && rc[filled].Trim().Length == 0) filled--;
                if (filled != columns)
                    throw Fail.At(file, i + 1, filled < columns ? rl.Length + 1 : ColumnOf(rc, columns + 1), $"{filled} wells in row {letter}",
                        $"{columns} wells, one per column of the grid header", filled < columns ? $"well {letter}{filled + 1} is missing" : $"well {letter}{columns + 1} is extra");
                for (var c = 1; c <= columns; c++)
                {
                    var cell = rc[c].Trim();
                    if (!double.TryParse(cell, NumberStyles.Float, culture, out var v) || !double.IsFinite(v) || Math.Abs(v) > RowReader.MaxMagnitude)
                        throw Fail.At(file, i + 1, ColumnOf(rc, c), Fail.Quote(cell), $"a number for well {letter}{c}" + (culture.Equals(CultureInfo.InvariantCulture) ? "" : " with a decimal comma"));
                    grid.Add(wellUnit.ToInternal(v));
                }
            }
            if (rows < 0) rows = r;
            else if (r != rows)
                throw Fail.At(file, i + 1 > lines.Length ? lines.Length : i + 1, 1, $"{r} rows of wells", $"{rows} rows (A–{WellName.RowLetters(rows - 1)}), as in the first grid", $"row {WellName.RowLetters(r)} is missing");
            if (r == 0) throw Fail.At(file, i + 1, 1, "a grid with no rows", "rows of wells A, B, … under the grid header");
            times.Add(t);
            values.Add(grid.ToArray());
            readingLines.Add(timeLine);
        }
        if (times.Count < 3)
            throw Fail.At(file, Math.Max(1, lines.Length - 1), 1, $"{times.Count} reading{(times.Count == 1 ? "" : "s")}", "at least 3 readings for a time course", "the export may be cut off");

        var zero = times[0];
        var t0 = times.Select(x => x - zero).ToArray();
        detected.Add(new("time zero", $"the first reading ({zero.ToString("R", CultureInfo.InvariantCulture)} s as written)"));
        detected.Add(new("readings", $"{times.Count} grids of {rows} × {columns} wells (lines {readingLines[0]}–{lastLine})"));
        detected.Add(new("wells", $"{rows * columns}, A1–{WellName.RowLetters(rows - 1)}{columns}, in {wellUnit.Symbol} (ingest.well_unit)"));
        var channels = new List<Trace>(rows * columns);
        var warnings = new List<Warning>();
        for (var r = 0; r < rows; r++)
            for (var c = 0; c < columns; c++)
            {
                var k = r * columns + c;
                var v = new double[times.Count];
                for (var s = 0; s < v.Length; s++) v[s] = values[s][k];
                var trace = new Trace($"{WellName.RowLetters(r)}{c + 1}", wellUnit.Quantity, DelimitedReader.InternalUnit(wellUnit.Quantity, wellUnit), t0, v, wellUnit.Symbol);
                if (wellUnit.Quantity == Quantity.Absorbance)
                    trace = SaturationCheck.Apply(trace, s => readingLines[s], settings, file, warnings);
                channels.Add(trace);
            }
        return new RunExport(file, channels, [], metadata, detected, warnings) { DataLines = (readingLines[0], lastLine) };
    }

    /// <summary>Index of the time line that heads the first grid (the nearest non-blank line above it).</summary>
    private static int TimeLineBefore(string[] lines, int header, char d)
    {
        for (var i = header - 1; i >= 0; i--)
            if (lines[i].Trim().Length > 0) return ColumnHeader.IsTimeName(lines[i].Split(d)[0]) ? i : header;
        return header;
    }

    private static CultureInfo DecimalCulture(IngestSettings settings, char d, string[] lines, int from)
    {
        if (settings.DecimalSeparator is { } forced) return forced == "comma" ? CultureInfo.GetCultureInfo("de-DE") : CultureInfo.InvariantCulture;
        if (d == ',') return CultureInfo.InvariantCulture;
        for (var i = from; i < lines.Length && i < from + 400; i++)
            foreach (var c in lines[i].Split(d))
            {
                var t = c.Trim();
                if (t.Length > 0 && char.IsDigit(t[0]) && t.Contains(',')) return CultureInfo.GetCultureInfo("de-DE");
                if (t.Length > 0 && char.IsDigit(t[0]) && t.Contains('.')) return CultureInfo.InvariantCulture;
            }
        return CultureInfo.InvariantCulture;
    }

    /// <summary>1-based character column where cell <paramref name="index"/> of a split line starts.</summary>
    private static int ColumnOf(string[] cells, int index)
    {
        var col = 1;
        for (var k = 0; k < index && k < cells.Length; k++) col += cells[k].Length + 1;
        return col;
    }

    private static string Short(string s) => s.Length > 60 ? s[..60] + "…" : s;
}
