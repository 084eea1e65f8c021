using TraceKin.Traces;

namespace TraceKin.Ingest;

/// <summary>
/// Walks UTF-8 text line by line without copying: LF, CRLF and CR all end a line. A line longer than
/// <see cref="MaxLineBytes"/> is rejected, so one runaway line cannot make a reader hold or scan without bound.
/// </summary>
internal sealed class TextLines(ReadOnlyMemory<byte> text, string file)
{
    public const int MaxLineBytes = 1 << 20;

    private int _pos;

    public ReadOnlyMemory<byte> Text { get; } = text;
    /// <summary>1-based number of the line last returned by <see cref="Next"/>.</summary>
    public int LineNumber { get; private set; }
    public int Position => _pos;

    /// <summary>The next line (without its terminator), or false at the end of the text.</summary>
    public bool Next(out int start, out int length)
    {
        var span = Text.Span;
        if (_pos >= span.Length)
        {
            start = length = 0;
            return false;
        }
        start = _pos;
        var rest = span[_pos..];
        var end = rest.IndexOfAny((byte)'\n', (byte)'\r');
        LineNumber++;
        if (end < 0)
        {
            length = rest.Length;
            _pos = span.Length;
        }
        else
        {
            length = end;
            _pos += end + (rest[end] == (byte)'\r' && end + 1 < rest.Length && rest[end + 1] == (byte)'\n' ? 2 : 1);
        }
        if (length > MaxLineBytes)
            throw Fail.At(file, LineNumber, 1, $"a line of {length:N0} bytes", $"lines shorter than {MaxLineBytes:N0} bytes",
                "this is not a row-per-sample export; check the file or its line endings");
        return true;
    }

    /// <summary>A place to come back to with <see cref="Restore"/> after looking ahead.</summary>
    public (int Position, int Line) Mark() => (_pos, LineNumber);

    public void Restore((int Position, int Line) mark) => (_pos, LineNumber) = mark;

    /// <summary>Continues after lines another reader has consumed: <paramref name="position"/> is the start of the next line, <paramref name="lineNumber"/> the number of the last line read.</summary>
    public void MoveTo(int position, int lineNumber) => (_pos, LineNumber) = (position, lineNumber);

    /// <summary>Moves back to the start of the text.</summary>
    public void Reset()
    {
        _pos = 0;
        LineNumber = 0;
    }

    /// <summary>"LF", "CRLF" or "CR", from the first line break; "none" for one line.</summary>
    public static string LineEndings(ReadOnlySpan<byte> text)
    {
        var i = text.IndexOfAny((byte)'\n', (byte)'\r');
        if (i < 0) return "none (one line)";
        if (text[i] == (byte)'\n') return "LF";
        return i + 1 < text.Length && text[i + 1] == (byte)'\n' ? "CRLF" : "CR";
    }
}
