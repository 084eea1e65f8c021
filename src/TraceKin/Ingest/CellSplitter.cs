using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>One cell of a line: byte offset and length of its content (quotes and surrounding blanks removed).</summary>
internal readonly record struct Cell(int Start, int Length, bool Quoted);

/// <summary>
/// Splits one line into cells at a delimiter byte (or at runs of blanks when <see cref="Whitespace"/>), honouring
/// double-quoted cells with "" as an escaped quote (RFC 4180 §2, rules 5–7). Writes into a caller's buffer; never allocates.
/// </summary>
internal static class CellSplitter
{
    public const byte Whitespace = 0;

    /// <summary>
    /// Number of cells on the line (it may exceed <paramref name="cells"/>.Length; only that many are stored).
    /// An unclosed quote or text after a closing quote is a located error.
    /// </summary>
    public static int Split(ReadOnlySpan<byte> line, byte delimiter, Span<Cell> cells, string file, int lineNumber)
    {
        return delimiter == Whitespace ? SplitBlanks(line, cells, file, lineNumber) : SplitAt(line, delimiter, cells, file, lineNumber);
    }

    private static int SplitAt(ReadOnlySpan<byte> line, byte delimiter, Span<Cell> cells, string file, int lineNumber)
    {
        var count = 0;
        var i = 0;
        while (true)
        {
            // skip leading blanks (a tab is a blank only when it is not the delimiter)
            while (i < line.Length && (line[i] == (byte)' ' || (line[i] == (byte)'\t' && delimiter != (byte)'\t'))) i++;
            Cell cell;
            if (i < line.Length && line[i] == (byte)'"')
            {
                var open = i;
                var close = ClosingQuote(line, i + 1);
                if (close < 0)
                    throw Fail.At(file, lineNumber, LineColumn.ColumnIn(line, open), "a quote that is never closed", "a closing \" before the end of the line",
                        "quoted cells cannot span lines in an export");
                cell = new Cell(open + 1, close - open - 1, true);
                i = close + 1;
                while (i < line.Length && (line[i] == (byte)' ' || (line[i] == (byte)'\t' && delimiter != (byte)'\t'))) i++;
                if (i < line.Length && line[i] != delimiter)
                    throw Fail.At(file, lineNumber, LineColumn.ColumnIn(line, i), $"text after a closing quote", "a delimiter after a quoted cell");
            }
            else
            {
                var rel = line[i..].IndexOf(delimiter);
                var end = rel < 0 ? line.Length : i + rel;
                var e = end;
                while (e > i && (line[e - 1] == (byte)' ' || (line[e - 1] == (byte)'\t' && delimiter != (byte)'\t'))) e--;
                cell = new Cell(i, e - i, false);
                i = end;
            }
            if (count < cells.Length) cells[count] = cell;
            count++;
            if (i >= line.Length) return count;
            i++; // past the delimiter
        }
    }

    private static int ClosingQuote(ReadOnlySpan<byte> line, int from)
    {
        var i = from;
        while (i < line.Length)
        {
            var rel = line[i..].IndexOf((byte)'"');
            if (rel < 0) return -1;
            var q = i + rel;
            if (q + 1 < line.Length && line[q + 1] == (byte)'"')
            {
                i = q + 2;
                continue;
            }
            return q;
        }
        return -1;
    }

    private static int SplitBlanks(ReadOnlySpan<byte> line, Span<Cell> cells, string file, int lineNumber)
    {
        var count = 0;
        var i = 0;
        while (true)
        {
            while (i < line.Length && (line[i] == (byte)' ' || line[i] == (byte)'\t')) i++;
            if (i >= line.Length) return count;
            Cell cell;
            if (line[i] == (byte)'"')
            {
                var close = ClosingQuote(line, i + 1);
                if (close < 0)
                    throw Fail.At(file, lineNumber, LineColumn.ColumnIn(line, i), "a quote that is never closed", "a closing \" before the end of the line");
                cell = new Cell(i + 1, close - i - 1, true);
                i = close + 1;
            }
            else
            {
                var s = i;
                while (i < line.Length && line[i] != (byte)' ' && line[i] != (byte)'\t') i++;
                cell = new Cell(s, i - s, false);
            }
            if (count < cells.Length) cells[count] = cell;
            count++;
        }
    }

    /// <summary>Cell text as a string, with "" unescaped in quoted cells (for headers and messages, not for numbers).</summary>
    public static string Text(ReadOnlySpan<byte> line, Cell cell)
    {
        var s = System.Text.Encoding.UTF8.GetString(line.Slice(cell.Start, cell.Length));
        return cell.Quoted ? s.Replace("\"\"", "\"") : s;
    }

    public static string DelimiterName(byte delimiter) => delimiter switch
    {
        (byte)',' => "comma",
        (byte)';' => "semicolon",
        (byte)'\t' => "tab",
        _ => "whitespace",
    };

    public static byte FromName(string name) => name switch
    {
        "comma" => (byte)',',
        "semicolon" => (byte)';',
        "tab" => (byte)'\t',
        _ => Whitespace,
    };
}
