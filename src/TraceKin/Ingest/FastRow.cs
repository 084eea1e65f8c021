namespace TraceKin.Ingest;

/// <summary>
/// The common case of a data row — unquoted plain decimal numbers split by one delimiter byte — read in a single pass
/// that splits and parses at once. Anything else (quotes, blanks, long mantissas, a malformed cell, a short row) returns
/// false and the row is read again by the general path, which also produces the located error. Numbers use Clinger's
/// exact fast path (W. D. Clinger, PLDI 1990): at most 15 significant digits and a power of ten up to 10^22.
/// </summary>
internal static class FastRow
{
    public const int Time = -1;
    public const int Skip = -2;

    private static readonly double[] Pow10 =
    [
        1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
    ];

    /// <param name="targets">For each header column: <see cref="Time"/>, <see cref="Skip"/> or the slot in <paramref name="values"/>.</param>
    public static bool TryRead(ReadOnlySpan<byte> line, byte delimiter, byte separator, int[] targets, Span<double> values, out double time)
    {
        time = 0;
        var len = line.Length;
        var i = 0;
        var c = 0;
        while (true)
        {
            if (c >= targets.Length) return false;
            var target = targets[c];
            if (target == Skip)
            {
                var rel = line[i..].IndexOf(delimiter);
                i = rel < 0 ? len : i + rel;
            }
            else
            {
                var negative = false;
                if (i < len && line[i] is (byte)'-' or (byte)'+')
                {
                    negative = line[i] == (byte)'-';
                    i++;
                }
                ulong mantissa = 0;
                var significant = 0;
                var exponent = 0;
                var digits = 0;
                while (i < len)
                {
                    var d = (uint)(line[i] - '0');
                    if (d > 9) break;
                    if (mantissa != 0 || d != 0)
                    {
                        if (++significant > 15) return false;
                        mantissa = mantissa * 10 + d;
                    }
                    digits++;
                    i++;
                }
                if (i < len && line[i] == separator)
                {
                    i++;
                    while (i < len)
                    {
                        var d = (uint)(line[i] - '0');
                        if (d > 9) break;
                        if (mantissa != 0 || d != 0)
                        {
                            if (++significant > 15) return false;
                            mantissa = mantissa * 10 + d;
                        }
                        exponent--;
                        digits++;
                        i++;
                    }
                }
                if (digits == 0) return false;
                if (i < len && (line[i] | 0x20) == (byte)'e')
                {
                    i++;
                    var expNegative = false;
                    if (i < len && line[i] is (byte)'-' or (byte)'+')
                    {
                        expNegative = line[i] == (byte)'-';
                        i++;
                    }
                    var e = 0;
                    var expDigits = 0;
                    while (i < len)
                    {
                        var d = (uint)(line[i] - '0');
                        if (d > 9) break;
                        if (e < 1000) e = e * 10 + (int)d;
                        expDigits++;
                        i++;
                    }
                    if (expDigits == 0) return false;
                    exponent += expNegative ? -e : e;
                }
                if (i < len && line[i] != delimiter) return false;
                if (exponent is < -22 or > 22) return false;
                double v = mantissa;
                v = exponent >= 0 ? v * Pow10[exponent] : v / Pow10[-exponent];
                if (negative) v = -v;
                if (target == Time) time = v;
                else values[target] = v;
            }
            c++;
            if (i >= len) return c == targets.Length;
            i++; // past the delimiter
        }
    }
}
