using System.Text;
using CsvHelper;
using TraceKin.Traces;

namespace TraceKin.Setup;

/// <summary>One cell of a setup table: its text as read (unquoted, not trimmed) and where it starts (1-based line and
/// column numbers; the column is the character position of the cell's first character, its opening quote if quoted).</summary>
public readonly record struct SetupCell(string Text, int Line, int Column)
{
    public string Trimmed => Text.Trim();
}

/// <summary>One record of a setup table: its cells, the line it starts on, and the position just after its last
/// character (where a missing cell would start).</summary>
public sealed record SetupRecord(IReadOnlyList<SetupCell> Cells, int Line, int EndLine, int EndColumn)
{
    public int Count => Cells.Count;
    public SetupCell this[int index] => Cells[index];

    /// <summary>Where cell <paramref name="index"/> starts, or the end of the record for a cell it does not have.</summary>
    public (int Line, int Column) At(int index) => index < Cells.Count ? (Cells[index].Line, Cells[index].Column) : (EndLine, EndColumn);
}

/// <summary>
/// A small hand-edited CSV table (plan.csv, calibration standards) read with CsvHelper: RFC 4180 quoting (a quoted
/// cell may hold the delimiter, quotes written twice and line breaks), a byte order mark, comment lines starting with
/// <c>#</c> (also after blanks), blank lines skipped. The delimiter is decided from the header line: <c>;</c> when it
/// has one outside quotes, else a tab, else a comma. Every cell keeps its line and column, counted in the text as
/// written (lines inside quoted cells included), so every error about it can be located.
/// Numbers are not parsed here: the caller parses each cell with an explicit culture (a general reader's number
/// parser accepts group separators, so "0,02" would read as 2).
/// </summary>
internal sealed class SetupTable
{
    public required char Delimiter { get; init; }
    /// <summary>The first record that is not a comment or blank.</summary>
    public required SetupRecord Header { get; init; }
    /// <summary>The records after the header, comments and blank lines left out.</summary>
    public required IReadOnlyList<SetupRecord> Rows { get; init; }

    /// <summary>The table in <paramref name="text"/>, or null when it holds nothing but comments and blank lines.</summary>
    public static SetupTable? FromText(string text, string file)
    {
        // A byte order mark is not part of the first cell, nor of its column.
        if (text.Length > 0 && text[0] == '\uFEFF') text = text[1..];
        var delimiter = DelimiterOf(text);
        var utf8 = Encoding.UTF8.GetBytes(text);
        var cursor = new LineCursor(utf8);
        CsvMalformedRecord? unclosed = null;
        var options = new CsvReaderOptions
        {
            Separator = delimiter,
            HasHeader = false,
            CommentPrefix = '#',
            SkipEmptyLines = true,
            AllowLineBreaksInQuotes = true,
            DetectSeparatorHint = false,
            TrackLineNumbers = true,
            MalformedData = CsvMalformedDataHandling.Recover,
            // A stray quote inside a cell is kept as text (the cell then fails where it is used, located);
            // a quote never closed would swallow the rest of the file, so it is an error at the quote.
            OnMalformedRecord = m => { if (m.Reason == CsvMalformedReason.UnterminatedQuote) unclosed ??= m; },
        };
        var records = new List<SetupRecord>();
        using (var reader = CsvReader.Create(utf8, options))
        {
            while (reader.Read())
            {
                if (unclosed is { } m)
                {
                    var (line, column) = cursor.MoveTo(QuoteBefore(utf8, (int)m.ByteOffset));
                    throw Fail.At(file, line, column, "a quote that is never closed", "a closing quote \" for the quoted cell",
                        "write a quote inside a quoted cell twice (\"\"), or remove the stray quote");
                }
                var start = (int)reader.ByteOffset;
                var raw = reader.RawRecord;
                // Comment lines indented by blanks, and lines of blanks only, are skipped like the others.
                var rawText = Encoding.UTF8.GetString(raw);
                var lead = rawText.TrimStart();
                if (lead.Length == 0 || lead[0] == '#') continue;
                var cells = new SetupCell[reader.FieldCount];
                var offset = start;
                for (var i = 0; i < cells.Length; i++)
                {
                    var (line, column) = cursor.MoveTo(offset);
                    cells[i] = new SetupCell(Encoding.UTF8.GetString(reader.GetSpan(i)), line, column);
                    offset += reader.GetRawSpan(i).Length + 1;
                }
                var (endLine, endColumn) = cursor.MoveTo(start + raw.Length);
                records.Add(new SetupRecord(cells, cells.Length > 0 ? cells[0].Line : endLine, endLine, endColumn));
            }
        }
        if (records.Count == 0) return null;
        return new SetupTable { Delimiter = delimiter, Header = records[0], Rows = records.Skip(1).ToArray() };
    }

    /// <summary>The delimiter from the first line that is not blank or a comment: ';' outside quotes, else tab, else ','.</summary>
    private static char DelimiterOf(string text)
    {
        foreach (var line in text.Split('\n'))
        {
            var t = line.Trim();
            if (t.Length == 0 || t[0] == '#') continue;
            bool quoted = false, tab = false;
            foreach (var ch in line)
            {
                if (ch == '"') quoted = !quoted;
                else if (!quoted && ch == ';') return ';';
                else if (!quoted && ch == '\t') tab = true;
            }
            return tab ? '\t' : ',';
        }
        return ',';
    }

    /// <summary>The last opening quote at or before <paramref name="offset"/> (CsvHelper reports an unclosed quote where the input ends).</summary>
    private static int QuoteBefore(byte[] utf8, int offset)
    {
        for (var i = Math.Min(offset, utf8.Length - 1); i >= 0; i--)
            if (utf8[i] == (byte)'"') return i;
        return Math.Max(0, Math.Min(offset, utf8.Length));
    }

    /// <summary>Turns increasing byte offsets of the UTF-8 text into 1-based line and column numbers (columns count
    /// UTF-16 characters, as the text is shown; CR, LF and CR LF each end a line).</summary>
    private sealed class LineCursor(byte[] utf8)
    {
        private int _offset, _line = 1, _column = 1;

        public (int Line, int Column) MoveTo(int offset)
        {
            offset = Math.Clamp(offset, 0, utf8.Length);
            if (offset < _offset) { _offset = 0; _line = 1; _column = 1; }
            while (_offset < offset)
            {
                var b = utf8[_offset];
                if (b == (byte)'\n' || (b == (byte)'\r' && (_offset + 1 >= utf8.Length || utf8[_offset + 1] != (byte)'\n')))
                {
                    _line++;
                    _column = 1;
                }
                else if (b == (byte)'\r') { /* the LF after it ends the line */ }
                else if ((b & 0xC0) != 0x80) _column += b >= 0xF0 ? 2 : 1; // a code point beyond U+FFFF is two UTF-16 characters
                _offset++;
            }
            return (_line, _column);
        }
    }
}
