using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>The kind of a line before any column split: decides preamble, header, data and footer.</summary>
internal enum LineKind
{
    Blank,
    /// <summary>Starts with '#' or ';'.</summary>
    Comment,
    /// <summary>Starts like a number, a clock reading or a date (a digit, a sign or a decimal mark, maybe quoted).</summary>
    Data,
    /// <summary>Anything else: a header, a preamble or footer line, or a bad row.</summary>
    Text,
}

/// <summary>
/// Where the header is, what comes before it, and which delimiter splits the columns: the layout decisions a
/// delimited export needs before its rows can be read.
/// </summary>
internal sealed record DelimitedLayout(
    int HeaderLine,
    int HeaderStart,
    int HeaderLength,
    byte Delimiter,
    string[] Header,
    int[] HeaderColumns,
    int PreambleLines,
    int FirstDataLine)
{
    private const int SampleRows = 20;
    private const int MaxColumns = 1000;
    private const int MaxLinesBeforeData = 100_000;

    public static LineKind KindOf(ReadOnlySpan<byte> line)
    {
        var i = 0;
        while (i < line.Length && line[i] is (byte)' ' or (byte)'\t') i++;
        if (i == line.Length) return LineKind.Blank;
        var b = line[i];
        if (b is (byte)'#' or (byte)';') return LineKind.Comment;
        if (b == (byte)'"' && i + 1 < line.Length) b = line[++i];
        if ((uint)(b - '0') <= 9) return LineKind.Data;
        if (b is (byte)'+' or (byte)'-' or (byte)'.' && i + 1 < line.Length && ((uint)(line[i + 1] - '0') <= 9 || line[i + 1] == (byte)'.')) return LineKind.Data;
        return LineKind.Text;
    }

    /// <summary>
    /// Finds the header (the last text line before the first data row, or the line ingest.header_line names),
    /// collects preamble metadata, and picks the delimiter from the header and the first rows.
    /// </summary>
    public static DelimitedLayout Find(TextLines lines, string file, IngestSettings settings,
        Dictionary<string, string> metadata, Dictionary<string, int> metadataLines)
    {
        var span = lines.Text.Span;
        var before = new List<(int No, int Start, int Length, LineKind Kind)>();
        int headerNo = 0, headerStart = 0, headerLength = 0, firstData = 0;
        var samples = new List<(int No, int Start, int Length)>();
        var sawAnything = false;
        while (lines.Next(out var start, out var length))
        {
            var line = span.Slice(start, length);
            var kind = KindOf(line);
            if (kind != LineKind.Blank) sawAnything = true;
            if (headerNo == 0)
            {
                if (settings.HeaderLine is { } forced)
                {
                    if (lines.LineNumber == forced)
                    {
                        headerNo = forced;
                        headerStart = start;
                        headerLength = length;
                        if (kind == LineKind.Blank)
                            throw Fail.At(file, forced, 1, "a blank line", "the header line named by ingest.header_line", "check the line number");
                        continue;
                    }
                    before.Add((lines.LineNumber, start, length, kind));
                    continue;
                }
                if (kind == LineKind.Data)
                {
                    var h = before.FindLastIndex(l => l.Kind == LineKind.Text);
                    if (h < 0)
                        throw Fail.At(file, lines.LineNumber, 1, "a data row before any header line", "a header line naming the columns, e.g. \"time (s),A520\"",
                            "add a header line with the units, or set ingest.header_line");
                    (headerNo, headerStart, headerLength, _) = before[h];
                    before.RemoveRange(h, before.Count - h);
                    firstData = lines.LineNumber;
                    samples.Add((lines.LineNumber, start, length));
                    continue;
                }
                before.Add((lines.LineNumber, start, length, kind));
                if (before.Count > MaxLinesBeforeData)
                    throw Fail.At(file, lines.LineNumber, 1, $"more than {MaxLinesBeforeData:N0} lines without a data row", "numeric rows after a header line",
                        "this does not look like a time-course export");
                continue;
            }
            if (kind == LineKind.Data)
            {
                if (firstData == 0) firstData = lines.LineNumber;
                samples.Add((lines.LineNumber, start, length));
                if (samples.Count >= SampleRows) break;
            }
            else if (kind == LineKind.Text && firstData > 0) break;
        }

        if (!sawAnything)
            throw Fail.At(file, 1, 1, "no text (the file is empty or blank)", "a header line and data rows", "was the export saved completely?");
        if (headerNo == 0)
        {
            if (settings.HeaderLine is { } forced)
                throw Fail.At(file, lines.LineNumber, 1, $"a file of {lines.LineNumber} lines", $"line {forced} as the header (ingest.header_line)");
            var lastText = before.FindLastIndex(l => l.Kind == LineKind.Text);
            if (lastText < 0)
                throw Fail.At(file, 1, 1, "only comments and blank lines", "a header line and data rows");
            throw Fail.At(file, before[lastText].No, 1, "no data rows (only header or text lines)", "numeric rows after the header line",
                "the export may be empty or cut off");
        }
        if (firstData == 0)
            throw Fail.At(file, headerNo + 1, 1, "no data rows after the header", "numeric rows after the header line", "the export may be empty or cut off");

        // Preamble: every non-blank line before the header; key/value lines become metadata.
        var preamble = 0;
        foreach (var (no, start, length, kind) in before)
        {
            if (kind == LineKind.Blank) continue;
            var text = System.Text.Encoding.UTF8.GetString(span.Slice(start, length));
            if (PreambleLine.TryRead(text, out var key, out var value))
            {
                metadata[key] = value;
                metadataLines[key] = no;
                preamble++;
            }
            else if (kind == LineKind.Text)
            {
                metadata[$"line {no}"] = text.Trim();
                metadataLines[$"line {no}"] = no;
                preamble++;
            }
            else preamble++;
        }

        var headerLine = span.Slice(headerStart, headerLength);
        var delimiter = settings.Delimiter is { } d ? CellSplitter.FromName(d) : Detect(span, headerLine, samples, file, headerNo);
        var (header, columns) = HeaderCells(span, headerLine, delimiter, samples, file, headerNo);
        if (header.Length < 2)
            throw Fail.At(file, headerNo, 1, Fail.Quote(System.Text.Encoding.UTF8.GetString(headerLine)),
                $"a header with a time column and at least one signal column, split by {CellSplitter.DelimiterName(delimiter)}",
                settings.Delimiter is null ? "is the delimiter one of comma, semicolon, tab or blanks?" : "check ingest.delimiter");
        if (header.Length > MaxColumns)
            throw Fail.At(file, headerNo, 1, $"{header.Length} columns", $"at most {MaxColumns} columns", "is this a time-course export?");
        return new DelimitedLayout(headerNo, headerStart, headerLength, delimiter, header, columns, preamble, firstData);
    }

    private static byte Detect(ReadOnlySpan<byte> text, ReadOnlySpan<byte> header, List<(int No, int Start, int Length)> samples, string file, int headerNo)
    {
        ReadOnlySpan<byte> candidates = [(byte)'\t', (byte)';', (byte)',', CellSplitter.Whitespace];
        Span<Cell> none = [];
        var best = (byte)255;
        var bestScore = -1;
        foreach (var c in candidates)
        {
            int headerCount;
            try
            {
                headerCount = c == CellSplitter.Whitespace
                    ? WhitespaceHeader(System.Text.Encoding.UTF8.GetString(header), samples.Count > 0 ? CountCells(text, samples[0], c, file) : 0).Length
                    : CellSplitter.Split(header, c, none, file, headerNo);
            }
            catch (InputException)
            {
                continue;
            }
            if (headerCount < 2) continue;
            var agree = 0;
            foreach (var s in samples)
            {
                try
                {
                    if (CountCells(text, s, c, file) == headerCount) agree++;
                }
                catch (InputException)
                {
                    // an unclosed quote under this delimiter: it does not agree
                }
            }
            if (agree == samples.Count) return c;
            if (agree > bestScore)
            {
                best = c;
                bestScore = agree;
            }
        }
        return best == 255 ? (byte)',' : best;
    }

    private static int CountCells(ReadOnlySpan<byte> text, (int No, int Start, int Length) line, byte delimiter, string file)
    {
        Span<Cell> none = [];
        var row = text.Slice(line.Start, line.Length);
        var n = CellSplitter.Split(row, delimiter, none, file, line.No);
        // a trailing delimiter (an empty last cell) is common in spreadsheet exports
        if (n >= 2 && delimiter != CellSplitter.Whitespace)
        {
            var cells = new Cell[n];
            CellSplitter.Split(row, delimiter, cells, file, line.No);
            if (cells[^1].Length == 0 && !cells[^1].Quoted) n--;
        }
        return n;
    }

    private static (string[] Names, int[] Columns) HeaderCells(ReadOnlySpan<byte> text, ReadOnlySpan<byte> header, byte delimiter,
        List<(int No, int Start, int Length)> samples, string file, int headerNo)
    {
        if (delimiter == CellSplitter.Whitespace)
        {
            var s = System.Text.Encoding.UTF8.GetString(header);
            var names = WhitespaceHeader(s, samples.Count > 0 ? CountCells(text, samples[0], delimiter, file) : 0);
            var cols = new int[names.Length];
            var from = 0;
            for (var k = 0; k < names.Length; k++)
            {
                var at = s.IndexOf(names[k], from, StringComparison.Ordinal);
                cols[k] = at < 0 ? 1 : at + 1;
                if (at >= 0) from = at + names[k].Length;
            }
            return (names, cols);
        }
        var cells = new Cell[CellSplitter.Split(header, delimiter, [], file, headerNo)];
        CellSplitter.Split(header, delimiter, cells, file, headerNo);
        var count = cells.Length;
        if (count >= 2 && cells[^1].Length == 0 && !cells[^1].Quoted) count--;
        var result = new string[count];
        var columns = new int[count];
        for (var k = 0; k < count; k++)
        {
            result[k] = CellSplitter.Text(header, cells[k]).Trim();
            columns[k] = LineColumn.ColumnIn(header, cells[k].Start);
        }
        return (result, columns);
    }

    /// <summary>
    /// A blank-separated header: split at runs of two or more blanks when that gives as many names as the data has
    /// cells ("time (s)   A520"), else at single blanks with a bracketed unit joined to the name before it ("t (s) A520").
    /// </summary>
    private static string[] WhitespaceHeader(string header, int dataCells)
    {
        var wide = System.Text.RegularExpressions.Regex.Split(header.Trim(), @"\s{2,}|\t");
        if (wide.Length == dataCells) return wide.Select(w => w.Trim()).ToArray();
        var tokens = header.Split([' ', '\t'], StringSplitOptions.RemoveEmptyEntries);
        var names = new List<string>();
        foreach (var t in tokens)
        {
            if (names.Count > 0 && t.Length > 0 && t[0] is '(' or '[') names[^1] += " " + t;
            else names.Add(t);
        }
        return names.Select(n => n.Trim('"')).ToArray();
    }
}
