using System.Globalization;
using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>
/// The row pass of a delimited export: splits each data line into cell ranges, parses the time and every kept column
/// from the bytes, checks that times increase, decides the decimal separator from the first fraction it sees and
/// then holds every later cell to it. Stops at a footer; a repeated header or any bad cell is a located error.
/// </summary>
internal sealed class RowReader
{
    private readonly ReadOnlyMemory<byte> _text;
    private readonly string _file;
    private readonly DelimitedLayout _layout;
    private readonly int _timeIndex;
    private readonly ColumnSpec[] _columns;
    private readonly IngestSettings _settings;
    private readonly Dictionary<string, string> _metadata;
    private readonly Dictionary<string, int> _metadataLines;
    private readonly bool _decimalForced;
    private TimeCells? _time;
    private List<int>? _duplicateLines;
    private Dictionary<int, int>? _merged;
    // the single-pass reader for plain numeric rows, set up once the time form and decimal separator are known
    private readonly bool _fastRows;
    private int[]? _fastTargets;

    /// <param name="fastRows">Read plain numeric rows by <see cref="FastRow"/> (the default); false reads every row by the general path, which gives the same numbers.</param>
    public RowReader(ReadOnlyMemory<byte> text, string file, DelimitedLayout layout, int timeIndex, ColumnSpec[] columns, IngestSettings settings,
        Dictionary<string, string> metadata, Dictionary<string, int> metadataLines, bool fastRows = true)
    {
        _fastRows = fastRows;
        _text = text;
        _file = file;
        _layout = layout;
        _timeIndex = timeIndex;
        _columns = columns;
        _settings = settings;
        _metadata = metadata;
        _metadataLines = metadataLines;
        _decimalForced = settings.DecimalSeparator is not null;
        Decimal = settings.DecimalSeparator == "comma" ? (byte)',' : (byte)'.';
        if (_decimalForced && Decimal == ',' && layout.Delimiter == ',')
            throw Fail.Setting(file, "ingest.decimal", "decimal comma with a comma delimiter", "a semicolon, tab or blank delimiter when numbers use decimal commas",
                "unquoted \"0,02\" cannot be told from two cells");
        Times = [];
        Values = [];
    }

    public double[] Times { get; private set; }
    public double[][] Values { get; private set; }
    /// <summary>1-based line number of every kept row.</summary>
    public RowLineMap RowLines { get; } = new();
    public int Count { get; private set; }
    public int FirstLine { get; private set; }
    public int LastLine { get; private set; }
    public byte Decimal { get; private set; }
    /// <summary>Line on which the decimal separator was first seen (0 when forced or never seen).</summary>
    public int DecimalLine { get; private set; }
    public int FooterLines { get; private set; }
    public int FooterStart { get; private set; }
    public List<Warning> Warnings { get; } = [];
    public TimeCells Time => _time ?? throw new InvalidOperationException("no rows read");

    public void ReadAll(TextLines lines)
    {
        var span = _text.Span;
        lines.Reset();
        while (lines.LineNumber < _layout.HeaderLine && lines.Next(out _, out _)) { }
        var rest = span[lines.Position..];
        // one row per line break at most, plus a last line without one: sized once, trimmed only when lines were not rows
        var breaks = rest.Count((byte)'\n');
        if (breaks == 0) breaks = rest.Count((byte)'\r');
        var capacity = breaks + (rest.Length > 0 && rest[^1] is (byte)'\n' or (byte)'\r' ? 0 : 1);
        // not zeroed: only the first Count entries are ever read, and Finish trims the arrays to them
        Times = GC.AllocateUninitializedArray<double>(capacity);
        Values = new double[_columns.Length][];
        for (var k = 0; k < _columns.Length; k++) Values[k] = GC.AllocateUninitializedArray<double>(capacity);

        var headerCount = _layout.Header.Length;
        var cellBuffer = new Cell[headerCount + 2];
        var header = span.Slice(_layout.HeaderStart, _layout.HeaderLength);
        while (true)
        {
            if (_fastTargets is not null) ReadFast(span, lines);
            if (!lines.Next(out var start, out var length)) break;
            var line = span.Slice(start, length);
            var kind = DelimitedLayout.KindOf(line);
            if (kind is LineKind.Blank or LineKind.Comment) continue;
            if (kind == LineKind.Text)
            {
                if (line.Trim((byte)' ').SequenceEqual(header.Trim((byte)' ')))
                    throw Fail.At(_file, lines.LineNumber, 1, $"the header again on line {lines.LineNumber} (first on line {_layout.HeaderLine})",
                        "one header line, then data rows", "two exports pasted into one file? split them into one file per run");
                if (!DataFollows(lines))
                {
                    ReadFooter(lines, start, length);
                    break;
                }
            }
            // a line that ends the text has no line break after it: it may be an export cut off while being written
            ReadRow(line, lines.LineNumber, cellBuffer, headerCount, lines, unterminated: start + length == span.Length);
        }
        if (_time is null)
            throw Fail.At(_file, _layout.HeaderLine + 1, 1, "no data rows after the header", "numeric rows", "the export may be empty or cut off");
        Finish();
    }

    private bool DataFollows(TextLines lines)
    {
        var mark = lines.Mark();
        try
        {
            var span = _text.Span;
            while (lines.Next(out var s, out var l))
                if (DelimitedLayout.KindOf(span.Slice(s, l)) == LineKind.Data) return true;
            return false;
        }
        finally
        {
            lines.Restore(mark);
        }
    }

    private void ReadFooter(TextLines lines, int start, int length)
    {
        var span = _text.Span;
        FooterStart = lines.LineNumber;
        do
        {
            var line = span.Slice(start, length);
            if (DelimitedLayout.KindOf(line) == LineKind.Blank) continue;
            FooterLines++;
            var text = System.Text.Encoding.UTF8.GetString(line);
            if (PreambleLine.TryRead(text, out var key, out var value))
            {
                _metadata[key] = value;
                _metadataLines[key] = lines.LineNumber;
            }
        }
        while (lines.Next(out start, out length));
    }

    /// <summary>
    /// Plain numeric rows whose times follow the last one, read in one pass from where <paramref name="lines"/> stands;
    /// the first line that is anything else is left to the general path (blank, comment, text, quoted or odd cells,
    /// repeated or earlier times), which also reports errors.
    /// </summary>
    private void ReadFast(ReadOnlySpan<byte> span, TextLines lines)
    {
        var (position, lineNumber) = lines.Mark();
        var count = Count;
        var firstLine = lineNumber + 1;
        var read = FastRow.ReadRows(span, ref position, ref lineNumber, _layout.Delimiter, Decimal, _fastTargets!, _time!.Unit!, Times, Values, ref count);
        if (read == 0) return;
        RowLines.AddRun(firstLine, read);
        Count = count;
        LastLine = lineNumber;
        lines.MoveTo(position, lineNumber);
    }

    private void ReadRow(ReadOnlySpan<byte> line, int lineNumber, Cell[] cells, int headerCount, TextLines lines, bool unterminated)
    {
        var n = CellSplitter.Split(line, _layout.Delimiter, cells, _file, lineNumber);
        if (n == headerCount + 1 && cells[headerCount].Length == 0 && !cells[headerCount].Quoted) n = headerCount;
        if (n < headerCount && OnlyBlankLinesFollow(lines))
        {
            if (CutLastRow(lineNumber, LineColumn.ColumnIn(line, line.Length), $"a last row of {n} cell{(n == 1 ? "" : "s")}{(unterminated ? " with no line break after it" : "")}",
                $"{headerCount} cells, as in the header on line {_layout.HeaderLine}")) return;
        }
        if (n != headerCount) Ragged(line, lineNumber, n, cells, headerCount);
        if (unterminated && !cells[n - 1].Quoted && IsCutNumber(line.Slice(cells[n - 1].Start, cells[n - 1].Length)))
        {
            var cut = line.Slice(cells[n - 1].Start, cells[n - 1].Length);
            if (CutLastRow(lineNumber, LineColumn.ColumnIn(line, cells[n - 1].Start),
                cut.IsEmpty ? "an empty last cell at the very end of the file (no line break after it)"
                    : $"{Fail.Quote(System.Text.Encoding.UTF8.GetString(cut))} at the very end of the file (no line break after it), a number cut short",
                "a complete number in the last cell")) return;
        }
        if (Count == 0) FirstLine = lineNumber;
        if (!_decimalForced && DecimalLine == 0) DecideDecimal(line, lineNumber, cells, headerCount);

        var timeCell = cells[_timeIndex];
        var timeBytes = line.Slice(timeCell.Start, timeCell.Length);
        _time ??= TimeFormFor(timeBytes, lineNumber, LineColumn.ColumnIn(line, timeCell.Start));
        if (!_time.TryRead(timeBytes, Decimal, out var t))
            BadTime(line, lineNumber, timeCell);
        if (!(Math.Abs(t) <= MaxMagnitude)) throw TooLarge(lineNumber, LineColumn.ColumnIn(line, timeCell.Start), timeBytes);

        if (Count > 0)
        {
            var previous = Times[Count - 1];
            if (t < previous)
                throw Fail.At(_file, lineNumber, LineColumn.ColumnIn(line, timeCell.Start),
                    $"time {Fail.Quote(timeBytes.Length > 0 ? System.Text.Encoding.UTF8.GetString(timeBytes) : "")} ({Seconds(t)} s), earlier than line {RowLines[Count - 1]} ({Seconds(previous)} s)",
                    "times that increase down the file", "rows out of order, or a clock that was reset? sort or split the export");
            if (t == previous && Duplicate(line, lineNumber, timeCell, cells)) return;
        }
        if (Count == Times.Length) Grow();
        var row = Count;
        Times[row] = t;
        RowLines.Add(lineNumber);
        for (var k = 0; k < _columns.Length; k++)
            Values[k][row] = Value(line, lineNumber, cells[_columns[k].Index]);
        Count++;
        LastLine = lineNumber;
        if (_fastRows && _fastTargets is null && _time.Form == TimeForm.Number && _layout.Delimiter != CellSplitter.Whitespace && (_decimalForced || DecimalLine > 0))
        {
            var targets = new int[headerCount];
            Array.Fill(targets, FastRow.Skip);
            targets[_timeIndex] = FastRow.Time;
            for (var k = 0; k < _columns.Length; k++) targets[_columns[k].Index] = k;
            _fastTargets = targets;
        }
    }

    /// <summary>True when the row was consumed (dropped or merged into the row before).</summary>
    private bool Duplicate(ReadOnlySpan<byte> line, int lineNumber, Cell timeCell, Cell[] cells)
    {
        var previousLine = RowLines[Count - 1];
        switch (_settings.DuplicateTimes)
        {
            case "first":
                (_duplicateLines ??= []).Add(lineNumber);
                return true;
            case "average":
                (_duplicateLines ??= []).Add(lineNumber);
                _merged ??= [];
                _merged[Count - 1] = _merged.GetValueOrDefault(Count - 1, 1) + 1;
                for (var k = 0; k < _columns.Length; k++)
                    Values[k][Count - 1] += Value(line, lineNumber, cells[_columns[k].Index]);
                return true;
            default:
                throw Fail.At(_file, lineNumber, LineColumn.ColumnIn(line, timeCell.Start),
                    $"the same time as line {previousLine} ({Fail.Quote(System.Text.Encoding.UTF8.GetString(line.Slice(timeCell.Start, timeCell.Length)))})",
                    "each time once, increasing down the file",
                    "set ingest.duplicate_times = \"average\" or \"first\" to repair (the repair is listed as a warning)");
        }
    }

    private double Value(ReadOnlySpan<byte> line, int lineNumber, Cell cell)
    {
        var bytes = line.Slice(cell.Start, cell.Length);
        var status = NumberCell.TryParse(bytes, Decimal, out var v);
        var column = LineColumn.ColumnIn(line, cell.Start);
        if (status == NumberStatus.Ok)
        {
            if (Math.Abs(v) <= MaxMagnitude) return v;
            throw TooLarge(lineNumber, column, bytes);
        }
        var found = Fail.Quote(System.Text.Encoding.UTF8.GetString(bytes));
        var sep = Decimal == (byte)',' ? "comma" : "point";
        throw status switch
        {
            NumberStatus.Empty => Fail.At(_file, lineNumber, column, "an empty cell", "a number", "TraceKin does not fill in missing readings; remove the row or the gap"),
            NumberStatus.NonFinite => Fail.At(_file, lineNumber, column, found, "a finite number", "the instrument wrote a not-a-number or infinity; remove the row"),
            NumberStatus.OtherSeparator => Fail.At(_file, lineNumber, column, $"{found}, written with a decimal {(Decimal == (byte)',' ? "point" : "comma")}",
                $"a decimal {sep}, as {(DecimalLine > 0 ? $"on line {DecimalLine}" : "ingest.decimal says")}",
                "the file mixes decimal separators; re-export it with one (TraceKin will not guess which is meant)"),
            _ => Fail.At(_file, lineNumber, column, found, $"a number with a decimal {sep}", "thousands separators and units inside cells are not accepted"),
        };
    }

    private void DecideDecimal(ReadOnlySpan<byte> line, int lineNumber, Cell[] cells, int headerCount)
    {
        for (var c = 0; c < headerCount; c++)
        {
            var cell = line.Slice(cells[c].Start, cells[c].Length);
            if (cell.Contains((byte)':') || (cell.Length >= 5 && cell[4] == (byte)'-')) continue; // clock readings and dates decide nothing
            var point = cell.Contains((byte)'.');
            var comma = cell.Contains((byte)',');
            if (point && comma)
                throw Fail.At(_file, lineNumber, LineColumn.ColumnIn(line, cells[c].Start), $"{Fail.Quote(System.Text.Encoding.UTF8.GetString(cell))}, with both '.' and ','",
                    "one decimal separator and no thousands separator", "re-export without digit grouping");
            if (!point && !comma) continue;
            Decimal = point ? (byte)'.' : (byte)',';
            DecimalLine = lineNumber;
            return;
        }
    }

    private TimeCells TimeFormFor(ReadOnlySpan<byte> first, int lineNumber, int column)
    {
        var header = _layout.Header[_timeIndex];
        var (_, unitText) = ColumnHeader.Split(header);
        var headerColumn = _layout.HeaderColumns[_timeIndex];
        if (TimeCells.FormOfUnit(unitText) is { } f) return new TimeCells(f, null);
        if (unitText is not null)
        {
            var unit = Units.Find(unitText);
            if (unit is null)
                throw Fail.At(_file, _layout.HeaderLine, headerColumn, $"the unknown time unit {Fail.Quote(unitText)}",
                    "a time unit: s, ms, min, h, mm:ss or hh:mm:ss", "TraceKin does not guess units");
            return new TimeCells(TimeForm.Number, Units.Require(unitText, Quantity.Time, _file, _layout.HeaderLine, headerColumn));
        }
        if (TimeCells.FormOfCell(first) is { } g) return new TimeCells(g, null);
        throw Fail.At(_file, _layout.HeaderLine, headerColumn, $"the time column {Fail.Quote(header)} without a unit",
            "a unit in the header, e.g. \"time (s)\", \"t [min]\", \"Time/ms\", or clock readings (mm:ss, hh:mm:ss) or ISO 8601 date-times",
            $"numbers alone (\"{System.Text.Encoding.UTF8.GetString(first)}\" on line {lineNumber}, column {column}) could be seconds or minutes");
    }

    private void BadTime(ReadOnlySpan<byte> line, int lineNumber, Cell cell)
    {
        var bytes = line.Slice(cell.Start, cell.Length);
        var column = LineColumn.ColumnIn(line, cell.Start);
        if (bytes.IsEmpty) throw Fail.At(_file, lineNumber, column, "an empty time cell", "a time", "remove the row");
        var found = Fail.Quote(System.Text.Encoding.UTF8.GetString(bytes));
        var expected = _time!.Form switch
        {
            TimeForm.Number => $"a time as a number with a decimal {(Decimal == (byte)',' ? "comma" : "point")}",
            TimeForm.MinutesSeconds => "minutes:seconds, e.g. 12:05.5 (seconds below 60)",
            TimeForm.HoursMinutesSeconds => "hours:minutes:seconds, e.g. 1:02:05.5 (minutes and seconds below 60)",
            _ => "an ISO 8601 date-time, e.g. 2026-03-01T14:05:00.5+01:00",
        };
        if (_time.Form == TimeForm.Number && NumberCell.TryParse(bytes, Decimal, out _) is var status && status == NumberStatus.OtherSeparator)
            throw Fail.At(_file, lineNumber, column, $"{found}, written with the other decimal separator",
                $"a decimal {(Decimal == (byte)',' ? "comma" : "point")}, as {(DecimalLine > 0 ? $"on line {DecimalLine}" : "ingest.decimal says")}",
                "the file mixes decimal separators; re-export it with one");
        throw Fail.At(_file, lineNumber, column, found, expected, "every row needs its time in the same form");
    }

    private void Ragged(ReadOnlySpan<byte> line, int lineNumber, int n, Cell[] cells, int headerCount)
    {
        var column = n < headerCount ? LineColumn.ColumnIn(line, line.Length) : LineColumn.ColumnIn(line, cells[Math.Min(headerCount, cells.Length - 1)].Start);
        var hint = n < headerCount
            ? "the row is short: a truncated last row, or a missing value?"
            : _layout.Delimiter == (byte)',' && line.Contains((byte)'.') is false
                ? "decimal commas in a comma-delimited file must be quoted (\"0,02\"); or export with ; as delimiter"
                : "an extra delimiter in the row? quote cells that contain the delimiter";
        throw Fail.At(_file, lineNumber, column, $"{n} cell{(n == 1 ? "" : "s")}", $"{headerCount} cells, as in the header on line {_layout.HeaderLine}", hint);
    }

    /// <summary>
    /// Largest magnitude accepted in a cell (and of a time in seconds). No instrument reads 1e100 of anything, and the
    /// fits square and sum values: numbers near the double limit (~1.8e308) would overflow to infinity there, far from
    /// any line number. The fast path cannot produce such numbers (its largest is below 1e38), so it needs no check.
    /// </summary>
    public const double MaxMagnitude = 1e100;

    private InputException TooLarge(int lineNumber, int column, ReadOnlySpan<byte> bytes) =>
        Fail.At(_file, lineNumber, column, $"{Fail.Quote(System.Text.Encoding.UTF8.GetString(bytes))}, a number beyond ±1e100", "a reading of magnitude at most 1e100",
            "no instrument reads such a value; is the cell damaged, or the unit in the header wrong?");

    /// <summary>True when every line after the current one is blank: the current row is the export's last.</summary>
    private bool OnlyBlankLinesFollow(TextLines lines)
    {
        var mark = lines.Mark();
        try
        {
            var span = _text.Span;
            while (lines.Next(out var s, out var l))
                if (DelimitedLayout.KindOf(span.Slice(s, l)) != LineKind.Blank) return false;
            return true;
        }
        finally
        {
            lines.Restore(mark);
        }
    }

    /// <summary>
    /// A cell that ends the file in the middle of a number: empty, a sign alone, or digits followed by a decimal
    /// separator or an exponent mark with no digits after it ("12.", "12,", "1.2e", "1.2e-").
    /// </summary>
    internal static bool IsCutNumber(ReadOnlySpan<byte> cell)
    {
        if (cell.IsEmpty) return true;
        var body = cell[0] is (byte)'+' or (byte)'-' ? cell[1..] : cell;
        if (body.IsEmpty) return true; // a sign alone
        if (body[^1] is (byte)'+' or (byte)'-')
        {
            // an exponent sign with nothing after it: "1.2e-"
            body = body[..^1];
            if (body.IsEmpty || (body[^1] | 0x20) != (byte)'e') return false;
        }
        var last = body[^1];
        var separator = last is (byte)'.' or (byte)',';
        if (!separator && (last | 0x20) != (byte)'e') return false;
        int digits = 0, separators = 0;
        foreach (var b in body[..^1])
        {
            if ((uint)(b - '0') <= 9) digits++;
            else if (b is (byte)'.' or (byte)',') separators++;
            else return false;
        }
        return digits > 0 && separators <= (separator ? 0 : 1);
    }

    /// <summary>
    /// The export's last row is incomplete: a located error, or, with ingest.cut_last_row = "drop", a located
    /// warning and the row left out (true).
    /// </summary>
    private bool CutLastRow(int lineNumber, int column, string found, string expected)
    {
        if (_settings.CutLastRow == "drop")
        {
            Warnings.Add(new Warning("cut-last-row", $"{_file}:{lineNumber}:{column}",
                $"found {found}, expected {expected}; the row on line {lineNumber} was left out (ingest.cut_last_row = \"drop\")"));
            return true;
        }
        throw Fail.At(_file, lineNumber, column, found, expected,
            "the export looks cut off (saved or copied while it was still being written?); export it again, or set ingest.cut_last_row = \"drop\" to analyse it without its last row");
    }

    private void Grow()
    {
        var size = Math.Max(16, Times.Length + Times.Length / 2);
        var times = Times;
        Array.Resize(ref times, size);
        Times = times;
        for (var k = 0; k < Values.Length; k++) Array.Resize(ref Values[k], size);
    }

    private void Finish()
    {
        if (_merged is not null)
            foreach (var (row, count) in _merged)
                for (var k = 0; k < Values.Length; k++) Values[k][row] /= count;
        if (_duplicateLines is { Count: > 0 } dups)
        {
            var shown = string.Join(", ", dups.Take(20)) + (dups.Count > 20 ? $" and {dups.Count - 20} more" : "");
            var repair = _settings.DuplicateTimes == "average" ? "averaged with the row before" : "dropped (the first row of each time kept)";
            Warnings.Add(new Warning("duplicate-times", $"{_file}:{dups[0]}", $"{dups.Count} row{(dups.Count == 1 ? "" : "s")} repeating the time of the row before, {repair}: line{(dups.Count == 1 ? "" : "s")} {shown}"));
        }
        if (Count < Times.Length)
        {
            var times = Times;
            Array.Resize(ref times, Count);
            Times = times;
            for (var k = 0; k < Values.Length; k++) Array.Resize(ref Values[k], Count);
        }
    }

    private static string Seconds(double s) => s.ToString("G6", CultureInfo.InvariantCulture);
}
