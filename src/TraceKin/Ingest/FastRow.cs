using System.Runtime.CompilerServices;

namespace TraceKin.Ingest;

/// <summary>
/// The common case of data rows — unquoted plain decimal numbers split by one delimiter byte, times that increase —
/// read in a single pass over the text that finds line ends, splits cells and parses numbers at once
/// (<see cref="PlainNumber"/>). It stops at the first line that is anything else (a blank or comment line, quotes,
/// blanks around cells, long mantissas, a repeated or earlier time, a malformed or missing cell, a full buffer), and
/// that line is read by the general path, which also produces the located error.
/// </summary>
internal static class FastRow
{
    public const int Time = -1;
    public const int Skip = -2;

    /// <summary>
    /// Reads rows from byte <paramref name="position"/> (the start of line <paramref name="lineNumber"/> + 1) while
    /// they take the fast path; returns how many, with <paramref name="position"/> and <paramref name="lineNumber"/>
    /// moved past them.
    /// </summary>
    /// <param name="targets">For each header column: <see cref="Time"/>, <see cref="Skip"/> or the index in <paramref name="values"/>.</param>
    /// <param name="timeUnit">Raw time → seconds.</param>
    /// <param name="count">Rows stored so far (at least one: the general path reads the first row); rows go after them while there is room.</param>
    /// <remarks>The rows read lie on the lines after <paramref name="lineNumber"/>'s value on entry, one row per line.</remarks>
    public static int ReadRows(ReadOnlySpan<byte> text, ref int position, ref int lineNumber, byte delimiter, byte separator, int[] targets,
        Traces.UnitInfo timeUnit, double[] times, double[][] values, ref int count)
    {
        if (targets is [Time, 0]) return ReadPairs(text, ref position, ref lineNumber, delimiter, separator, timeUnit, times, values[0], ref count);
        var capacity = times.Length;
        var previous = times[count - 1];
        var len = text.Length;
        var pos = position;
        var line = lineNumber;
        var last = targets.Length - 1;
        var read = 0;
        while (pos < len && count < capacity)
        {
            if (!StartsDataRow(text, pos)) break;
            var i = pos;
            double raw = 0;
            var ok = true;
            for (var c = 0; c <= last; c++)
            {
                var target = targets[c];
                if (target == Skip)
                {
                    // an ignored cell: anything up to the delimiter, except a quote (a quoted cell may hold the delimiter)
                    while (i < len && text[i] is var b && b != delimiter && b != (byte)'\n' && b != (byte)'\r')
                    {
                        if (b == (byte)'"' || i - pos > TextLines.MaxLineBytes)
                        {
                            ok = false;
                            break;
                        }
                        i++;
                    }
                    if (!ok) break;
                }
                else
                {
                    if (!PlainNumber.TryRead(text, ref i, separator, out var v))
                    {
                        ok = false;
                        break;
                    }
                    if (target == Time) raw = v;
                    else values[target][count] = v;
                }
                if (c < last)
                {
                    if (i >= len || text[i] != delimiter)
                    {
                        ok = false;
                        break;
                    }
                    i++;
                }
                // a row that ends the text without a line break goes to the general path, which checks for a cut-off number
                else if (i >= len || (text[i] != (byte)'\n' && text[i] != (byte)'\r'))
                    ok = false;
            }
            if (!ok) break;
            var time = timeUnit.ToInternal(raw);
            if (!(time > previous)) break;
            times[count] = time;
            line++;
            count++;
            read++;
            previous = time;
            pos = PastLineEnd(text, i);
        }
        position = pos;
        lineNumber = line;
        return read;
    }

    /// <summary>
    /// <see cref="ReadRows"/> for the usual single-channel export, a time column and then one value column: the same
    /// rules without the per-cell dispatch.
    /// </summary>
    private static int ReadPairs(ReadOnlySpan<byte> text, ref int position, ref int lineNumber, byte delimiter, byte separator,
        Traces.UnitInfo timeUnit, double[] times, double[] values, ref int count)
    {
        var capacity = Math.Min(times.Length, values.Length);
        var previous = times[count - 1];
        var len = text.Length;
        var pos = position;
        var line = lineNumber;
        var n = count;
        while (pos < len && n < capacity)
        {
            if (!StartsDataRow(text, pos)) break;
            var i = pos;
            if (!PlainNumber.TryRead(text, ref i, separator, out var raw) || i >= len || text[i] != delimiter) break;
            i++;
            // a row that ends the text without a line break goes to the general path, which checks for a cut-off number
            if (!PlainNumber.TryRead(text, ref i, separator, out var value) || i >= len || (text[i] != (byte)'\n' && text[i] != (byte)'\r')) break;
            var time = timeUnit.ToInternal(raw);
            if (!(time > previous)) break;
            times[n] = time;
            values[n] = value;
            line++;
            n++;
            previous = time;
            pos = PastLineEnd(text, i);
        }
        var read = n - count;
        count = n;
        position = pos;
        lineNumber = line;
        return read;
    }

    /// <summary>
    /// Only a line the general path would call a data row (<see cref="DelimitedLayout.KindOf"/>) may take the fast path:
    /// it starts with a digit, or a sign or decimal point before a digit or point. Blank, comment and text lines
    /// (headers, footers) go to the general path.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static bool StartsDataRow(ReadOnlySpan<byte> text, int pos)
    {
        var first = text[pos];
        return (uint)(first - '0') <= 9 ||
            (first is (byte)'+' or (byte)'-' or (byte)'.' && pos + 1 < text.Length && ((uint)(text[pos + 1] - '0') <= 9 || text[pos + 1] == (byte)'.'));
    }

    /// <summary>The start of the next line after a line end at <paramref name="i"/> (LF, CRLF or CR, as <see cref="TextLines"/> reads them), or the end of the text.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static int PastLineEnd(ReadOnlySpan<byte> text, int i) =>
        i >= text.Length ? i : i + (text[i] == (byte)'\r' && i + 1 < text.Length && text[i + 1] == (byte)'\n' ? 2 : 1);
}
